/* error.h - the error record every library call fills on failure.
 *
 * Library code never prints or exits: a failing call returns a non-zero
 * br_status and describes the failure here.  The CLI turns the record into
 * one line "FILE:LINE: field: message" and an exit status. */
#ifndef BR_ERROR_H
#define BR_ERROR_H

#include "bootrung/bootrung.h"

/* Fill err (may be NULL) and return code.  file may be NULL, line 0 when
 * unknown, field NULL or "" when the failure is not tied to one field. */
int br_error_set(br_error *err, int code, const char *file, int line, const char *field,
                 const char *fmt, ...) __attribute__((format(printf, 6, 7)));

#endif

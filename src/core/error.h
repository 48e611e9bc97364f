/* error.h - the error record every library call fills on failure.
 *
 * Library code never prints or exits: a failing call returns a non-zero
 * br_status and describes the failure here.  The CLI turns the record into
 * one line "FILE:LINE: field: message" and an exit status. */
#ifndef BR_ERROR_H
#define BR_ERROR_H

#include "bootrung/bootrung.h"

/* br_error_set is public: bootrung.h. */

/* Return the status of x when it is not BR_OK. */
#define BR_TRY(x)                                                                                  \
    do {                                                                                           \
        int br_try_rc_ = (x);                                                                      \
        if (br_try_rc_ != BR_OK)                                                                   \
            return br_try_rc_;                                                                     \
    } while (0)

#endif

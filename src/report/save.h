/* save.h - writing a rendered report to a file, all or nothing.
 *
 * The text goes to a temporary file in the target's directory, which is
 * flushed to disk and then renamed over the target.  A reader therefore
 * sees the old file or the complete new one, never a half-written one, and
 * a failure leaves no temporary file behind. */
#ifndef BR_REPORT_SAVE_H
#define BR_REPORT_SAVE_H

#include "bootrung/bootrung.h"

/* Write t to path.  Returns BR_OK, or BR_EIO with err naming the path and
 * the system's reason; the target is then unchanged. */
int br_text_save(const br_text *t, const char *path, br_error *err);

/* Several files all or nothing: each is first written whole to its
 * temporary file (br_text_stage), and only when every one is ready are
 * they renamed into place (br_staged_commit); a failure on the way drops
 * the temporaries (br_staged_discard). */
typedef struct br_staged {
    const br_text *text; /* kept by pointer until committed */
    char path[4096];     /* the target */
    char tmp[4096 + 64]; /* its temporary file, "" when none */
    int special;         /* the target is a device or FIFO: written in place at commit */
} br_staged;

/* Write t to a temporary file beside path.  BR_OK, or BR_EIO with err
 * naming the path and the reason (nothing is left behind). */
int br_text_stage(const br_text *t, const char *path, br_staged *s, br_error *err);
/* Rename the temporary file over the target (or write a special file).
 * BR_OK, or BR_EIO with err; the temporary file is gone either way. */
int br_staged_commit(br_staged *s, br_error *err);
/* Remove the temporary file of a staged file not committed. */
void br_staged_discard(br_staged *s);

#endif

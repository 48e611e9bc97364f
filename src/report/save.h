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

#endif

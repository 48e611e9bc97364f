/* caution.h - the closing caution every report carries. */
#ifndef BR_REPORT_CAUTION_H
#define BR_REPORT_CAUTION_H

#include "bootrung/bootrung.h"

/* Append the caution paragraph (with a blank line before it) to out.
 * Returns BR_OK or BR_ENOMEM. */
int br_report_caution(br_text *out);

#endif

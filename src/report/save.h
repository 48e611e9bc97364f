/* save.h - writing a rendered report to a file, all or nothing: public
 * (bootrung/report.h), declared there. */
#ifndef BR_REPORT_SAVE_H
#define BR_REPORT_SAVE_H

#include "bootrung/report.h"

#endif

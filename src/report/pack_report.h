/* pack_report.h - the index page and the lists of a sign-off pack.
 *
 * A pack (`bootrung analyze --pack DIR`) is one folder that holds every
 * verb's pages and result files for one design, the design itself and
 * what a reviewer needs to reproduce every number: the tool's version,
 * the exact command lines, the checksums, the model's assumptions and
 * where each part's values come from.  The command-line layer runs the
 * verbs; this renders what it found. */
#ifndef BR_REPORT_PACK_REPORT_H
#define BR_REPORT_PACK_REPORT_H

#include "bootrung/report.h"
#include "model/chain.h"

/* The pack's steps, its index page and lists are public:
 * bootrung/report.h. */

#endif

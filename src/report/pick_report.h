/* pick_report.h - the part-pick report, as text and as XML. */
#ifndef BR_REPORT_PICK_REPORT_H
#define BR_REPORT_PICK_REPORT_H

#include "analyses/pick.h"

/* The text report of pick p of chain c (the design as given), ending
 * with the caution. */
int br_pick_text(const br_chain *c, const br_pick *p, br_text *out);

/* The same as an XML document; version is the program's. */
int br_pick_xml(const br_chain *c, const br_pick *p, const char *version, br_text *out,
                br_error *err);

#endif

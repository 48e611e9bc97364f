/* verdict_report.h - the verdict table as text and as XML.
 *
 * One row per criterion: its title, pass / FAIL / n/a, the figure, the
 * limit, the margin, the rail or link that binds it and the current
 * direction where it binds; notes (why a criterion does not apply, why it
 * fails) follow the table; a last line gives the overall verdict. */
#ifndef BR_REPORT_VERDICT_REPORT_H
#define BR_REPORT_VERDICT_REPORT_H

#include "analyses/figures.h"
#include "io/xml_write.h"

/* Bit of criterion `crit` in a row mask. */
#define BR_CRIT_BIT(crit) (1u << (crit))
#define BR_CRIT_ALL ((1u << BR_CRIT_COUNT) - 1u)

/* The verdict table of the rows in mask.  su (may be NULL) lets a failed
 * start-up say why. */
int br_verdict_text(const br_chain *c, const br_verdict *v, unsigned mask, const br_startup *su,
                    br_text *out);

/* The <verdict> element of the rows in mask. */
void br_verdict_xml(br_xmlw *w, const br_chain *c, const br_verdict *v, unsigned mask);

#endif

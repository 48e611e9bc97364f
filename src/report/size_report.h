/* size_report.h - the answers of `bootrung size` as text, and the comment
 * the sized design file carries. */
#ifndef BR_REPORT_SIZE_REPORT_H
#define BR_REPORT_SIZE_REPORT_H

#include "analyses/size.h"

/* The report of sizing design c (the design as given), ending with its
 * verdict line and the caution.  catalog names the catalog file (NULL:
 * continuous values). */
int br_size_text(const br_chain *c, const br_size *z, const char *catalog, br_text *out);

/* What was sized and to what target, for the comment of the design file
 * written (several lines, no markup). */
int br_size_comment(const br_chain *c, const br_size *z, const char *catalog, br_text *out);

/* "what fails there" for a judgement, into buf. */
const char *br_size_why(const br_chain *c, const br_size_verdict *v, double target, char *buf,
                        size_t cap);

#endif

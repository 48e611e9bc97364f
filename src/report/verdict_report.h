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

/* "pass", "WARN", "FAIL", "n/a" or "UNDETERMINED" for a row. */
const char *br_verdict_word(const br_verdict_row *r);

/* A figure, limit or margin v of criterion crit for a table cell: in the
 * criterion's unit, a count as a whole number, a rail that never starts
 * as "never starts", a junction that runs away as "runaway". */
const char *br_crit_fmt(char *buf, size_t cap, int crit, double v);

/* The same for a figure or limit (not a margin): a temperature in degC
 * (its margin stays a difference, in kelvin). */
const char *br_crit_fmt_value(char *buf, size_t cap, int crit, double v);

/* The rows in mask: judged (applies, decided), failed, passing with a
 * warning, not applicable and undetermined. */
typedef struct br_verdict_count {
    int judged, failed, warned, na, undetermined;
} br_verdict_count;
void br_verdict_count_rows(const br_verdict *v, unsigned mask, br_verdict_count *n);

/* Why row i failed, does not apply or is undetermined, appended to why
 * (nothing when there is nothing to say); su (may be NULL) explains a
 * start-up that did not complete. */
int br_verdict_why(const br_chain *c, const br_verdict *v, int i, const br_startup *su,
                   br_text *why);

/* The verdict table of the rows in mask.  su (may be NULL) lets a failed
 * start-up say why. */
int br_verdict_text(const br_chain *c, const br_verdict *v, unsigned mask, const br_startup *su,
                    br_text *out);

/* The <verdict> element of the rows in mask; each row's note in the words
 * of br_verdict_why (su may be NULL). */
void br_verdict_xml(br_xmlw *w, const br_chain *c, const br_verdict *v, unsigned mask,
                    const br_startup *su);

#endif

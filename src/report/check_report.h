/* check_report.h - the chain as a readable table plus the design rules.
 *
 * What `bootrung check` prints: the design's operating point, one row per
 * stage (parts, return switch, charging windows, blocking voltage of the
 * link diode), the findings of the design rules, and the caution. */
#ifndef BR_REPORT_CHECK_REPORT_H
#define BR_REPORT_CHECK_REPORT_H

#include "analyses/rules.h"
#include "model/chain.h"

/* Run the design rules on c and render the whole report into out.
 * *nwarn (may be NULL) receives the number of findings, *nfatal (may be
 * NULL) how many of them mean the chain cannot work at all.  Returns
 * BR_OK, or BR_ENOMEM with err filled (out then holds a truncated
 * report). */
int br_check_report(const br_chain *c, br_text *out, int *nwarn, int *nfatal, br_error *err);

/* Render with findings computed by the caller (tests, other reports). */
int br_check_render(const br_chain *c, const br_rule_list *rules, br_text *out);

/* One finding as a sentence, without a trailing newline. */
int br_rule_describe(const br_chain *c, const br_rule_hit *h, br_text *out);

#endif

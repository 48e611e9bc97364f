/* supply_window_report.h - the answers of `bootrung supply` as text and
 * as XML: the smallest current limit and the supply voltage window at
 * the design's worst corners, with what fails beyond each. */
#ifndef BR_REPORT_SUPPLY_WINDOW_REPORT_H
#define BR_REPORT_SUPPLY_WINDOW_REPORT_H

#include "analyses/supply_window.h"

/* The outcome at the design's own supply (its voltage and limit, every
 * worst corner): a br_outcome. */
int br_supply_window_outcome(const br_supply_window *w);

/* One answer (a br_sw_answer) as a wrapped paragraph. */
int br_supply_window_answer_text(const br_chain *c, const br_supply_window *w, int ans,
                                 br_text *out);

/* The report, ending with its verdict line and the caution. */
int br_supply_window_text(const br_chain *c, const br_supply_window *w, br_text *out);

/* The XML document. */
int br_supply_window_xml(const br_chain *c, const br_supply_window *w, const char *version,
                         br_text *out, br_error *err);

#endif

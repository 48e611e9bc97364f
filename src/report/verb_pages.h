/* verb_pages.h - the HTML reports of `map`, `yield`, `window`, and of
 * the verbs whose report is a text (`check`, `corners`, `pick`,
 * `supply`).
 *
 * Each page puts the judgement first (does the design point hold, what
 * is the yield), then the verb's plot, then the terminal report in full
 * for the numbers, and the caution last. */
#ifndef BR_REPORT_VERB_PAGES_H
#define BR_REPORT_VERB_PAGES_H

#include "analyses/map.h"
#include "analyses/window.h"
#include "analyses/yield.h"

/* text is the verb's terminal report (its caution is left out here; the
 * page ends with its own). */
int br_map_html(const br_chain *c, const br_map *m, const br_text *text, br_text *out,
                br_error *err);
int br_yield_html(const br_chain *c, const br_yield *y, double min_yield, const br_text *text,
                  br_text *out, br_error *err);
int br_window_html(const br_chain *c, const br_window *w, const br_text *text, br_text *out,
                   br_error *err);

/* The page of a verb whose report is its text: what it is (`what`, e.g.
 * "worst-case corners"), the judgement as a badge (outcome, a
 * br_outcome) with the report's verdict line (the first line starting
 * with one of `prefixes`, NULL-terminated, and with join set its
 * indented continuation lines), then the report in full. */
int br_text_html(const br_chain *c, const char *what, int outcome, const char *const *prefixes,
                 int join, const br_text *text, br_text *out, br_error *err);

#endif

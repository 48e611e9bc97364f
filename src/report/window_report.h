/* window_report.h - rendering the hold window (`bootrung window`): the
 * duty and frequency limits, hold-up time and start-up window, as text
 * and as XML. */
#ifndef BR_REPORT_WINDOW_REPORT_H
#define BR_REPORT_WINDOW_REPORT_H

#include "analyses/window.h"

#include <stddef.h>

/* What fails (or binds) at a judged point, in words:
 * "minimum drive, rail A1, step-up", "no periodic steady state found". */
const char *br_hold_words(const br_chain *c, const br_hold_point *pt, char *buf, size_t cap);

/* Short name of the binding criterion for tables and files: "uvlo",
 * "drive", "gate", "steady-state" or "no-on-time". */
const char *br_hold_crit_name(const br_hold_point *pt);

/* The text report of window w of chain c (the design point), ending with
 * the caution. */
int br_window_text(const br_chain *c, const br_window *w, br_text *out, br_error *err);

/* The same as an XML document; version is the program's. */
int br_window_xml(const br_chain *c, const br_window *w, const char *version, br_text *out,
                  br_error *err);

#endif

/* yield_report.h - the Monte Carlo yield report as text, XML and CSV. */
#ifndef BR_REPORT_YIELD_REPORT_H
#define BR_REPORT_YIELD_REPORT_H

#include "analyses/yield.h"

/* min_yield when no minimum was asked for: then every sample must pass.
 * Any min_yield >= 0 (0 included) is a minimum for the lower confidence
 * bound. */
#define BR_MIN_YIELD_NONE (-1.0)

/* The text report of yield y of chain c (the design at its nominal
 * values), ending with the caution.  min_yield >= 0 adds the judgement
 * against that minimum (on the lower confidence bound). */
int br_yield_text(const br_chain *c, const br_yield *y, double min_yield, br_text *out);

/* The same as an XML document; version is the program's. */
int br_yield_xml(const br_chain *c, const br_yield *y, double min_yield, const char *version,
                 br_text *out, br_error *err);

/* One row per sample: its number, its result (pass, fail, undetermined),
 * every parameter's value, every margin criterion's margin (empty where
 * it does not apply or is undetermined) and every status criterion's
 * result (pass, fail, undetermined, empty where it does not apply), SI
 * units. */
int br_yield_csv(const br_yield *y, br_text *out);

#endif

/* steady_report.h - a periodic steady state as text and as XML.
 *
 * How the state was found and whether it holds; per rail its voltages,
 * ripple and margins; per diode its blocking stress, currents and
 * recovery; per capacitor its effective capacitance and stress; the load
 * on the supply. */
#ifndef BR_REPORT_STEADY_REPORT_H
#define BR_REPORT_STEADY_REPORT_H

#include "analyses/figures.h"
#include "io/xml_write.h"

/* The full section for one direction. */
int br_steady_text(const br_chain *c, const br_steady_figs *f, br_text *out);

/* A compact section over ndir directions: one line per direction saying
 * how it was found, then one line per stage with the worst case of every
 * direction. */
int br_steady_summary_text(const br_chain *c, const br_steady_figs *f, int ndir, br_text *out);

/* The <steady> element of one direction. */
void br_steady_xml(br_xmlw *w, const br_chain *c, const br_steady_figs *f);

#endif

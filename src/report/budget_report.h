/* budget_report.h - where the chain's power goes, and how hot its parts
 * run, as text and as XML.
 *
 * Per rail: its driver's running, isolator and standby current, its gate
 * charge, its regulator or clamp, its capacitor's ESR.  Per link: its
 * diode's conduction, recovery, leakage and junction capacitance, its
 * resistor, and the share of its current in the return switch; the
 * junction temperature.  Then the balance: what the supply delivers and
 * what the power stage gives equal the losses. */
#ifndef BR_REPORT_BUDGET_REPORT_H
#define BR_REPORT_BUDGET_REPORT_H

#include "analyses/figures.h"
#include "io/xml_write.h"

/* The loss tables of one direction, with the balance and the heat. */
int br_budget_text(const br_chain *c, const br_steady_figs *f, br_text *out);

/* One line per direction: delivered, lost by kind, the hottest junction. */
int br_budget_summary_text(const br_chain *c, const br_steady_figs *f, int ndir, br_text *out);

/* The <losses> element of one direction (inside <steady>). */
void br_budget_xml(br_xmlw *w, const br_chain *c, const br_steady_figs *f);

/* The losses of every rail and link by kind, summed, W: drivers (running
 * and standby), isolators, gate charge, regulators and clamps, ESR,
 * diodes (conduction, recovery, leakage, junction capacitance), link
 * resistors and return switches. */
typedef struct br_budget_kinds {
    double driver, iso, gate, aux, esr, diode, resistor, sw;
} br_budget_kinds;
void br_budget_kinds_of(const br_chain *c, const br_budget *b, br_budget_kinds *out);

#endif

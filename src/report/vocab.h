/* vocab.h - the words every report uses, each thing under one name.
 *
 * docs/glossary.md lists the terms; test_report_glossary holds the help
 * texts, the result files and the reports to it.  A report that names a
 * current direction, a place of the chain, a limit or a temperature asks
 * here rather than spelling it itself, so that a new report (or verb)
 * speaks the same language. */
#ifndef BR_REPORT_VOCAB_H
#define BR_REPORT_VOCAB_H

#include "model/chain.h"

#include <stddef.h>

/* The current direction of a br_dir_index: "step-down", "step-up",
 * "line-cycle" (the steady state over a line cycle, both directions in
 * it) or "idealised" (a design without a load current). */
const char *br_dir_label(int dir);

/* Temperatures are degrees Celsius written "degC" everywhere (text, HTML,
 * plots, notes: one ASCII spelling); differences and margins of
 * temperatures are kelvin ("K"). */
#define BR_DEGC "degC"

/* "59.0 degC" for a temperature in kelvin, with `decimals` decimals;
 * "n/a" when it is not a number.  Returns buf. */
const char *br_fmt_temp(char *buf, size_t cap, double kelvin, int decimals);

/* The limits a rail's driver supply is judged against in steady state,
 * and the regulator's own. */
typedef enum br_rail_lim {
    BR_LIM_UVLO_RISE = 0, /* the driver's UVLO rising threshold */
    BR_LIM_UVLO_FALL,     /* its UVLO falling threshold */
    BR_LIM_DRIVE,         /* the design's minimum drive */
    BR_LIM_GATE,          /* the switch's gate maximum (absolute maximum rating) */
    BR_LIM_HEADROOM,      /* a regulated rail: the regulator's output plus its dropout */
    BR_LIM_COUNT
} br_rail_lim;

/* "UVLO rising", "UVLO falling", "minimum drive", "gate maximum",
 * "regulator output + dropout". */
const char *br_limit_name(int lim);

/* Where limit `lim` of stage k's driver supply sits on rail k itself:
 * the driver sees its rail less the regulator's dropout, held at most at
 * the regulator's output, so on a regulated rail a lower limit sits a
 * dropout higher (HUGE_VAL when it lies above the output: no rail
 * voltage meets it) and the gate maximum, a dropout higher, only when the
 * output lies above it (NaN otherwise: never reached); elsewhere the
 * driver supply is the rail.  NaN for a limit the design does not give
 * (no minimum drive, no gate maximum, no regulator for
 * BR_LIM_HEADROOM). */
double br_rail_limit(const br_chain *c, int k, int lim);

/* Rail k's floor: the highest of its lower limits at the rail (UVLO
 * rising, the minimum drive, a regulator's output plus dropout), the
 * lowest voltage the rail may reach in steady state with every criterion
 * of its driver passing.  *lim (may be NULL) is the limit that sets it. */
double br_rail_floor(const br_chain *c, int k, int *lim);

/* The label of limit `lim` as drawn on rail k: its name, with "+
 * dropout" on a regulated rail (the driver's threshold raised by the
 * regulator's dropout), e.g. "UVLO falling + dropout".  Returns buf. */
const char *br_rail_limit_label(const br_chain *c, int k, int lim, char *buf, size_t cap);

/* Places of the chain a figure belongs to. */
enum { BR_PLACE_RAIL = 0, BR_PLACE_LINK, BR_PLACE_AUX };

/* "rail A1", "link A1", "regulator A1" or "clamp A1" (the rail's
 * regulator or clamp), or "-" when stage is not one of c's.  Returns
 * buf. */
const char *br_place(const br_chain *c, int stage, int kind, char *buf, size_t cap);

/* The place criterion crit binds at stage (aux: the rail's regulator or
 * clamp binds): a link for the diodes' criteria and the inrush, a rail
 * otherwise.  Returns buf. */
const char *br_crit_place(const br_chain *c, int crit, int stage, int aux, char *buf, size_t cap);

#endif

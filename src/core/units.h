/* units.h - reading quantities with SI units ("4.7 uF", "85 C") into SI doubles.
 *
 * The caller says which kind of quantity it expects; the text may then give
 * the value with an SI prefix only ("4.7u", "10 m") or with prefix and unit
 * ("4.7 uF", "200 kHz", "10 mohm").  Only plain numbers and fractions may be
 * bare ("0.8", "1.5"), and 0 in any kind: a bare "62" for a charge is
 * refused, not read as 62 C.  Prefixes: f p n u (also the micro sign) m k M
 * G.  A unit that does not fit the kind is an error that says what was
 * expected, and so is a magnitude beyond the kind's sane limit (1 MV,
 * 1 F, ...).  Temperatures need a unit (C or K) and come out in kelvin.
 *
 * Toleranced form (br_qty_parse), for any numeric attribute:
 *   "2.2 uF +-10%"        symmetric, relative (also "±"); "12 V +-0.5 V" absolute
 *   "2.2 uF +10%/-20%"    asymmetric
 *   "0.6 V / 0.7 V / 0.8 V" or "0.6/0.7/0.8 V"   min / typ / max
 * optionally followed by a distribution word, "uniform" (default) or
 * "normal" (the limits are then +-3 sigma). */
#ifndef BR_CORE_UNITS_H
#define BR_CORE_UNITS_H

#include "bootrung/report.h"

struct br_qty; /* model/design.h: a toleranced quantity */

/* br_kind, what the caller expects, is public: bootrung/report.h. */

/* Sigma distance of the limits of a "normal" quantity. */
#define BR_QTY_NSIG 3.0

/* br_unit_parse, one plain quantity, is public: bootrung/report.h. */

/* Parse a quantity with optional tolerance and distribution into q (q->line
 * is set to 0).  Same error contract as br_unit_parse. */
int br_qty_parse(const char *text, br_kind kind, struct br_qty *q, br_error *err);

/* Words for messages: "a voltage like '12 V'". */
const char *br_kind_expected(br_kind kind);

/* Short name of the SI unit of a kind ("V", "ohm", "K", "" for numbers). */
const char *br_kind_unit(br_kind kind);

#endif

/* fmt.h - quantities for people: engineering prefixes at the edge.
 *
 * Inside bootrung every value is an SI double; only a report chooses how
 * to show it.  One helper for every report, so that "12.3 mA" reads the
 * same everywhere: a single value with its own prefix (br_fmt_si), or a
 * table column whose prefix is chosen once from its largest entry
 * (br_scale_for) so that the numbers line up. */
#ifndef BR_REPORT_FMT_H
#define BR_REPORT_FMT_H

#include <stddef.h>

/* A display scale: show v as v * factor followed by unit ("mA"). */
typedef struct br_scale {
    double factor; /* multiplier from SI to the display unit */
    char unit[16]; /* prefixed unit, e.g. "mV", "us", "nC" */
} br_scale;

/* The engineering prefix (a power of 1000 from femto to giga) that puts
 * |v| in [1, 1000); v = 0 or non-finite keeps the plain unit.  A charge
 * ("C") always has a prefix, milli at most and nano for 0: a bare "C"
 * would read as degrees Celsius. */
br_scale br_scale_for(double v, const char *unit);

/* The scale for a column whose largest magnitude is vmax, never finer
 * than `finest` (an SI value such as 1e-3: "at least milli"), so a column
 * of small numbers does not jump to pico. */
br_scale br_scale_column(double vmax, double finest, const char *unit);

/* "4.7 uF": v with its own prefix and `digits` significant digits (the
 * unit may be "" for a plain number); "n/a" for NaN or an infinity, which
 * is never printed as a result.  Returns buf. */
const char *br_fmt_si(char *buf, size_t cap, double v, int digits, const char *unit);

/* v in scale sc with `decimals` decimals, without the unit; a value of a
 * million or more in that scale (past the largest prefix) with four
 * significant digits and an exponent.  Returns buf. */
const char *br_fmt_in(char *buf, size_t cap, double v, const br_scale *sc, int decimals);

/* A time such as "1.234 ms", or "-" when t < 0 (an event that did not
 * happen).  Returns buf. */
const char *br_fmt_time(char *buf, size_t cap, double t);

#endif

/* fmt.c - engineering prefixes for display. */
#include "report/fmt.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

/* Prefixes from 1e-15 to 1e9; index PREFIX_ZERO is no prefix. */
static const char *const prefix[] = {"f", "p", "n", "u", "m", "", "k", "M", "G"};
#define PREFIX_ZERO 5
#define PREFIX_MIN (-5)
#define PREFIX_MAX 3

/* A charge always carries a prefix (nC, uC, mC): a bare "C" reads as
 * degrees Celsius next to a temperature. */
static int is_charge(const char *unit)
{
    return strcmp(unit, "C") == 0;
}

static br_scale scale_of(int e, const char *unit)
{
    br_scale sc;
    e = e < PREFIX_MIN ? PREFIX_MIN : e > PREFIX_MAX ? PREFIX_MAX : e;
    if (is_charge(unit) && e > -1)
        e = -1;
    sc.factor = pow(10.0, -3.0 * e);
    snprintf(sc.unit, sizeof sc.unit, "%s%s", prefix[e + PREFIX_ZERO], unit);
    return sc;
}

/* The power of 1000 that brings |v| into [1, 1000). */
static int exponent3(double v)
{
    if (v == 0 || !isfinite(v))
        return 0;
    /* the bias keeps an exact 1e-3 from landing one prefix too low */
    return (int)floor(log10(fabs(v)) / 3.0 + 1e-12);
}

br_scale br_scale_for(double v, const char *unit)
{
    return scale_of(exponent3(v), unit);
}

br_scale br_scale_column(double vmax, double finest, const char *unit)
{
    int e = exponent3(vmax), lo = exponent3(finest);
    if (vmax == 0 || !isfinite(vmax) || e < lo)
        e = lo;
    return scale_of(e, unit);
}

const char *br_fmt_si(char *buf, size_t cap, double v, int digits, const char *unit)
{
    if (!isfinite(v)) { /* never a result: a number that is not one */
        snprintf(buf, cap, "n/a");
        return buf;
    }
    int e = v == 0.0 && is_charge(unit) ? -3 : exponent3(v); /* "0 nC" */
    br_scale sc = scale_of(e, unit);
    char num[40];
    snprintf(num, sizeof num, "%.*g", digits, v * sc.factor);
    /* rounding may carry into the next prefix: 999.96 mV -> "1000" */
    if (fabs(strtod(num, NULL)) >= 1000.0 && e < PREFIX_MAX) {
        sc = scale_of(e + 1, unit);
        snprintf(num, sizeof num, "%.*g", digits, v * sc.factor);
    }
    snprintf(buf, cap, "%s%s%s", num, sc.unit[0] ? " " : "", sc.unit);
    return buf;
}

const char *br_fmt_in(char *buf, size_t cap, double v, const br_scale *sc, int decimals)
{
    if (!isfinite(v))
        snprintf(buf, cap, "n/a");
    else {
        double x = v * sc->factor;
        if (fabs(x) < 0.5 * pow(10.0, -decimals))
            x = 0.0; /* no "-0.000" */
        /* beyond the largest prefix a fixed-point number grows without
         * bound (1e300 V would print 292 digits): an exponent instead */
        if (fabs(x) >= 1e6)
            snprintf(buf, cap, "%.4g", x);
        else
            snprintf(buf, cap, "%.*f", decimals, x);
    }
    return buf;
}

const char *br_fmt_time(char *buf, size_t cap, double t)
{
    if (t < 0 || !isfinite(t)) {
        snprintf(buf, cap, "-");
        return buf;
    }
    return br_fmt_si(buf, cap, t, 4, "s");
}

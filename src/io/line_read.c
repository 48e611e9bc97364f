/* line_read.c - an AC line cycle at the operating point: <line-cycle>
 * with its frequency, peak current, phase and modulation (a sine depth
 * or a duty table), and the checks that tie it to the rest of the
 * design. */
#include "core/error.h"
#include "io/xml_read.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#define DEG (3.14159265358979323846 / 180.0)

static const br_range r_phase = {-180.0 * DEG, 180.0 * DEG, 0, 0,
                                 "an angle from -180 deg to 180 deg"};
static const br_range r_depth = {0.0, 1.0, 0, 1, "a depth from 0 to below 1"};
static const br_range r_at = {0.0, 360.0 * DEG, 0, 1, "a line phase from 0 deg to below 360 deg"};
static const br_range r_duty = {0.0, 1.0, 1, 1, "a duty strictly between 0 and 1"};

/* The <duty> points: line phases strictly ascending. */
static int read_table(br_rd *r, xmlNode *n, br_line_spec *ac)
{
    int k = 0;
    for (xmlNode *c = br_xml_child(n, "duty"); c; c = br_xml_next(c, "duty"), k++) {
        if (k == BR_MAX_DUTY_POINTS)
            return br_rd_fail(r, c, NULL, "more than %d <duty> points, expected at most %d",
                              BR_MAX_DUTY_POINTS, BR_MAX_DUTY_POINTS);
        BR_TRY(br_rd_value(r, c, "at", BR_KIND_ANGLE, &r_at, &ac->tab_at[k], NULL));
        BR_TRY(br_rd_value(r, c, "value", BR_KIND_FRACTION, &r_duty, &ac->tab_duty[k], NULL));
        if (k > 0 && !(ac->tab_at[k] > ac->tab_at[k - 1]))
            return br_rd_fail(r, c, "at",
                              "%.6g deg does not follow %.6g deg, expected line phases in "
                              "ascending order",
                              ac->tab_at[k] / DEG, ac->tab_at[k - 1] / DEG);
    }
    ac->ntab = k;
    return BR_OK;
}

/* The modulation: a sine of some depth, or a table of at least two
 * points, not both. */
static int read_modulation(br_rd *r, xmlNode *n, br_line_spec *ac)
{
    int depth = 0;
    BR_TRY(br_rd_qty(r, n, "depth", BR_KIND_FRACTION, &r_depth, &ac->depth, &depth));
    BR_TRY(read_table(r, n, ac));
    if (depth && ac->ntab > 0)
        return br_rd_fail(r, n, "depth",
                          "given together with <duty> points, expected either a sine "
                          "modulation depth or a duty table, not both");
    if (!depth && ac->ntab == 0)
        return br_rd_fail(r, n, NULL,
                          "no modulation, expected depth=\"...\" (sine modulation) or <duty> "
                          "points over the line period");
    if (!depth && ac->ntab < 2)
        return br_rd_fail(r, br_xml_child(n, "duty"), NULL,
                          "one <duty> point, expected at least 2 over the line period");
    return BR_OK;
}

/* Attributes of the operating point that a line cycle replaces. */
static int refuse_dc(br_rd *r, xmlNode *op)
{
    static const struct {
        const char *attr, *why;
    } clash[] = {
        {"load-current", "a DC load current together with a line cycle, expected one of them "
                         "(the line cycle gives the current of every switching period)"},
        {"duty", "a fixed duty together with a line cycle, expected no duty (the modulation "
                 "gives the duty of every switching period)"},
        {"current", "a fixed current direction together with a line cycle, expected no "
                    "current attribute (the line cycle's current sets the direction period by "
                    "period; \"none\" would carry no current at all)"},
    };
    char v[64];
    for (size_t i = 0; i < sizeof clash / sizeof clash[0]; i++)
        if (br_xml_attr(op, clash[i].attr, v, sizeof v) != 0)
            return br_rd_fail(r, op, clash[i].attr, "%s", clash[i].why);
    return BR_OK;
}

int br_rd_line_cycle(br_rd *r, xmlNode *op)
{
    xmlNode *n = op ? br_xml_child(op, "line-cycle") : NULL;
    if (!n)
        return BR_OK;
    br_line_spec *ac = &r->d->ac;
    BR_TRY(refuse_dc(r, op));
    ac->on = 1;
    ac->line = br_rd_line(r, n);
    BR_TRY(br_rd_qty(r, n, "frequency", BR_KIND_FREQUENCY, &br_range_pos, &ac->freq, NULL));
    BR_TRY(br_rd_qty(r, n, "peak-current", BR_KIND_CURRENT, &br_range_nonneg, &ac->ipk, NULL));
    BR_TRY(br_rd_qty(r, n, "phase", BR_KIND_ANGLE, &r_phase, &ac->phase, NULL));
    BR_TRY(read_modulation(r, n, ac));
    /* the direction alternates: every switch's reverse conduction and
     * on-state drop follow the current of the period in progress */
    r->d->direction = BR_DIR_BOTH;
    return BR_OK;
}

/* Lowest and highest duty the modulation gives over the line period (the
 * sampled duties lie between). */
static void duty_span(const br_line_spec *ac, double *lo, double *hi)
{
    if (ac->ntab == 0) {
        *lo = 0.5 * (1.0 - ac->depth.max);
        *hi = 0.5 * (1.0 + ac->depth.max);
        return;
    }
    *lo = *hi = ac->tab_duty[0];
    for (int k = 1; k < ac->ntab; k++) {
        *lo = fmin(*lo, ac->tab_duty[k]);
        *hi = fmax(*hi, ac->tab_duty[k]);
    }
}

int br_rd_line_check(br_rd *r, xmlNode *op)
{
    const br_design *d = r->d;
    const br_line_spec *ac = &d->ac;
    xmlNode *n = op ? br_xml_child(op, "line-cycle") : NULL;
    if (!ac->on || !n)
        return BR_OK;
    if (d->topology != BR_TOPO_FCML)
        return br_rd_fail(r, n, NULL,
                          "a line cycle on an explicit <string>, expected an <fcml> leg (the "
                          "modulation moves the duty of its pairs; a string's on-intervals are "
                          "fixed)");
    /* at every tolerance corner, a line period of BR_LINE_MIN_PERIODS to
     * BR_LINE_MAX_PERIODS switching periods */
    double few = d->fsw.min / ac->freq.max, many = d->fsw.max / ac->freq.min;
    if (few < BR_LINE_MIN_PERIODS)
        return br_rd_fail(r, n, "frequency",
                          "%g Hz holds only %.3g switching periods of %g Hz, expected a line "
                          "frequency far below the switching frequency (at most fsw/%d)",
                          ac->freq.max, few, d->fsw.min, BR_LINE_MIN_PERIODS);
    if (many > BR_LINE_MAX_PERIODS)
        return br_rd_fail(r, n, "frequency",
                          "%g Hz holds %.3g switching periods of %g Hz, more than one line cycle "
                          "can be simulated in reasonable time; expected at least fsw/%d",
                          ac->freq.min, many, d->fsw.max, BR_LINE_MAX_PERIODS);
    /* the dead times must fit in the shortest bottom on-time of the cycle */
    double lo, hi;
    duty_span(ac, &lo, &hi);
    double on = fmin(lo, 1.0 - hi) / d->fsw.max;
    if (2.0 * d->deadtime.max < on)
        return BR_OK;
    return br_rd_fail(r, op, "dead-time",
                      "two dead times (2 x %g s) use up the shortest on-time of the line cycle "
                      "(%g s at duty %g..%g and %g Hz), expected dead-time < %g s",
                      d->deadtime.max, on, lo, hi, d->fsw.max, on / 2.0);
}

/* test_examples_heat.c - the junction temperatures of the points of a
 * search over tolerances (analyses/spread.h): taken from the prediction
 * and checked, they judge every point as the full loop of shooting passes
 * at each point does, on both examples (their link diodes have a thermal
 * resistance). */
#include "analyses/spread.h"
#include "bootrung/bootrung.h"
#include "testkit.h"

#include <gsl/gsl_errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define NPTS 24

static br_design *load(const char *file)
{
    char path[1024];
    snprintf(path, sizeof path, "%s/%s", BR_SOURCE_DIR, file);
    br_design *d = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(path, &d, &err), BR_OK);
    return d;
}

static br_spread *spread(const br_design *d, int thermal_loop)
{
    br_spread_opts so;
    br_spread_opts_default(&so);
    so.threads = 2;
    so.thermal_loop = thermal_loop;
    br_spread *s = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_spread_create(d, &so, &s, &err), BR_OK);
    return s;
}

/* NPTS corners: every parameter at its minimum, at its maximum, then
 * each at a limit or its nominal value drawn by a fixed linear
 * congruential sequence (the same every run). */
static double *corners(const br_spread *s)
{
    int n = s->tl.n;
    double *v = malloc(sizeof(double) * (size_t)(NPTS * n + 1));
    signed char level[BR_TOL_MAX];
    unsigned long r = 12345;
    for (int p = 0; v && p < NPTS; p++) {
        for (int j = 0; j < n; j++) {
            r = (r * 1103515245ul + 12345ul) & 0x7ffffffful;
            level[j] = (signed char)(p == 0 ? -1 : p == 1 ? 1 : (int)((r >> 16) % 3) - 1);
        }
        br_spread_levels(s, level, v + (size_t)p * (size_t)n);
    }
    return v;
}

/* How far a margin of the predicted point may lie from the full loop's.
 * Each stops within BR_THERMAL_TOL (0.05 K) of the junction temperatures
 * its own period's losses give, but not at the same ones: the loop's last
 * pass ran at the temperatures of the pass before, the prediction at its
 * own.  A diode's forward drop moves by (Vf - Eg - XTI Vt) / T at a fixed
 * current (from is(T) of the Shockley law with its usual temperature
 * terms): for the 3-level example's SiC diodes (Eg 3.26 eV, XTI 2) at
 * 0.8 V and 315 K, -8 mV/K, so 0.4 mV for 0.05 K, plus 100 uV from each
 * steady state (its `accept`): 1 mV on the rails (by hand; measured 0.54
 * mV at worst).  The currents, powers and temperatures follow the rails
 * by far less (measured: under 0.05 % of the figure, 0.2 mK): 0.1 % of
 * the figure, 0.01 K.  The cold start does not see the junctions: the
 * start-up rows are the same bit for bit. */
static double tolerance(int r, double figure)
{
    switch (r) {
    case BR_CRIT_STARTUP:
    case BR_CRIT_INRUSH:
    case BR_CRIT_DROPOUTS:
    case BR_CRIT_SUPPLY_START:
        return 0.0;
    case BR_CRIT_SUPPLY:
    case BR_CRIT_AUX_POWER:
    case BR_CRIT_DIODE_IAVG:
    case BR_CRIT_CAP_RIPPLE:
        return 1e-3 * fabs(figure);
    case BR_CRIT_TJ:
        return 0.01;
    default:
        return 1e-3;
    }
}

/* Point a (predicted temperatures) against point b (the full loop): the
 * same outcome and rows, the margins within tolerance(). */
static void same_point(const br_pt *a, const br_pt *b)
{
    CU_ASSERT_EQUAL(a->status, b->status);
    CU_ASSERT_EQUAL(a->outcome, b->outcome);
    CU_ASSERT_EQUAL(a->unsettled, b->unsettled);
    for (int r = 0; r < BR_CRIT_COUNT; r++) {
        const br_pt_row *x = &a->row[r], *y = &b->row[r];
        CU_ASSERT_EQUAL(x->applies, y->applies);
        CU_ASSERT_EQUAL(x->pass, y->pass);
        CU_ASSERT_EQUAL(x->warn, y->warn);
        CU_ASSERT_EQUAL(x->undetermined, y->undetermined);
        if (x->applies && !x->undetermined && r != BR_CRIT_STEADY)
            BR_ASSERT_NEAR(x->margin, y->margin, tolerance(r, y->figure));
    }
}

/* NPTS corners judged both ways, with their cold starts (with_startup),
 * agree point by point, and the prediction saves periods.  blind: the
 * prediction is told no parameter moves a junction (every point starts at
 * the nominal temperatures, 20 K off where the ambient is at a limit), so
 * the check of each point's temperatures must catch it. */
static void compare(const char *file, int with_startup, int blind)
{
    br_design *d = load(file);
    br_spread *hot = spread(d, 0), *loop = spread(d, 1);
    if (blind)
        memset(hot->dtj, 0, sizeof(double) * (size_t)(2 * hot->tl.n + 1) * 2 * BR_MAX_SWITCHES);
    CU_ASSERT_EQUAL_FATAL(hot->tl.n, loop->tl.n);
    double *v = corners(hot);
    br_pt *a = calloc(NPTS, sizeof *a), *b = calloc(NPTS, sizeof *b);
    br_error err;
    CU_ASSERT_PTR_NOT_NULL_FATAL(v && a && b);
    CU_ASSERT_EQUAL_FATAL(br_spread_eval(hot, NPTS, v, with_startup, a, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_spread_eval(loop, NPTS, v, with_startup, b, &err), BR_OK);
    long pa = 0, pb = 0;
    for (int p = 0; p < NPTS; p++) {
        same_point(&a[p], &b[p]);
        CU_ASSERT_TRUE(a[p].row[BR_CRIT_TJ].applies);
        pa += a[p].periods;
        pb += b[p].periods;
    }
    CU_ASSERT_TRUE(blind || pa < pb);
    free(a);
    free(b);
    free(v);
    br_spread_free(hot);
    br_spread_free(loop);
    br_design_free(d);
}

static void test_leg(void)
{
    compare("examples/leg-7level.xml", 0, 0);
}

static void test_demo(void)
{
    compare("examples/demo-3level.xml", 1, 0);
}

static void test_blind(void)
{
    compare("examples/leg-7level.xml", 0, 1);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"11-link example: predicted junctions judge as the full loop", test_leg},
        {"3-level example, with cold starts: the same", test_demo},
        {"a prediction that misses the junctions is caught", test_blind},
        {NULL, NULL},
    };
    gsl_set_error_handler_off(); /* the library checks every GSL status itself */
    return br_test_main("examples_heat", cases);
}

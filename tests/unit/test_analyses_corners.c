/* test_analyses_corners.c - the worst-corner search on chains whose worst
 * corner is known, exhaustive and guided. */
#include "analyses/corners.h"
#include "analyses/evaluate.h"
#include "testdesign.h"
#include "testkit.h"

#include <gsl/gsl_errno.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

static br_qty tol(double nom, double rel)
{
    br_qty q = br_qty_fixed(nom);
    q.min = nom * (1.0 - rel);
    q.max = nom * (1.0 + rel);
    return q;
}

/* One link: the supply charges rail 1 through the diode while B1 is on.
 * Parameters, in list order: supply voltage, capacitance, driver
 * quiescent current, gate charge. */
static br_design *one_link(void)
{
    br_design *d = br_test_fcml(2, 400.0, 100e3, 0.5, 50e-9);
    d->vsupply = tol(12.0, 0.10);
    d->caps[0].c = tol(1e-6, 0.20);
    d->drivers[0].iq_on = tol(2e-3, 0.25);
    d->switches[0].qg = tol(10e-9, 0.20);
    return d;
}

/* The margin of crit at the corner given by levels, judged on its own. */
static double margin_at(const br_design *d, const br_tol_list *tl, const signed char *level,
                        int crit)
{
    br_design *c = br_design_copy(d);
    br_chain ch;
    br_error err;
    br_evaluation *e = malloc(sizeof *e);
    double v[BR_TOL_MAX];
    for (int j = 0; j < tl->n; j++)
        v[j] = br_tol_level(&tl->p[j], level[j]);
    br_tol_apply(c, tl, v);
    CU_ASSERT_EQUAL_FATAL(br_chain_build_nominal(c, &ch, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_evaluate(&ch, 0, NULL, e, &err), BR_OK);
    double m = e->v.row[crit].margin;
    free(e);
    br_design_free(c);
    return m;
}

/* The rail of a one-link chain sits a diode drop below the supply and
 * droops by the charge its driver takes between refreshes: with the
 * charge budget dV = (Iq T + Qg) / C (International Rectifier design tip
 * DT98-2; TI SLUA887) every term is monotonic, so its lowest point, and
 * the UVLO and drive margins with it, are worst with the supply and the
 * capacitance at their minimum and the quiescent current and gate charge
 * at their maximum.  The search must find exactly that corner. */
static void check_uvlo_corner(const br_corners *k, const br_design *d)
{
    static const signed char expect[4] = {-1, -1, 1, 1};
    const br_corner_worst *w = &k->w[BR_CRIT_UVLO];
    CU_ASSERT_EQUAL_FATAL(k->s->tl.n, 4);
    CU_ASSERT_TRUE_FATAL(w->applies);
    CU_ASSERT_EQUAL(memcmp(w->level, expect, 4), 0);
    CU_ASSERT_EQUAL(w->worst.stage, 1);
    /* its margin is what that corner gives when judged on its own */
    BR_ASSERT_NEAR(w->worst.margin, margin_at(d, &k->s->tl, expect, BR_CRIT_UVLO), 2e-4);
    /* the rail follows the supply one for one: the worst margin is the
     * nominal one less the supply's 1.2 V, less a few mV more of droop
     * and diode drop (dV = 30 mV nominal by the budget above) */
    double fall = w->nominal.margin - w->worst.margin;
    CU_ASSERT_TRUE(fall > 1.2 && fall < 1.23);
}

/* The gate maximum binds where the rail is highest: supply at its maximum. */
static void check_gate_corner(const br_corners *k)
{
    const br_corner_worst *w = &k->w[BR_CRIT_GATE];
    CU_ASSERT_TRUE_FATAL(w->applies);
    CU_ASSERT_EQUAL(w->level[0], 1);
    CU_ASSERT_TRUE(w->nominal.margin - w->worst.margin > 1.15);
}

static void test_exhaustive_one_link(void)
{
    br_design *d = one_link();
    br_corners_opts o;
    br_corners_opts_default(&o);
    o.startup = 0;
    br_corners *k;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_corners_run(d, &o, &k, &err), BR_OK);
    CU_ASSERT_EQUAL(k->method, BR_CORNERS_EXHAUSTIVE);
    CU_ASSERT_EQUAL(k->steady_points, 16);
    CU_ASSERT_EQUAL(k->su_method, BR_CORNERS_SKIPPED);
    CU_ASSERT_FALSE(k->w[BR_CRIT_STARTUP].applies);
    check_uvlo_corner(k, d);
    check_gate_corner(k);
    CU_ASSERT_TRUE(k->all_pass);
    br_corners_free(k);
    br_design_free(d);
}

/* With no exhaustive budget the sensitivity-guided search must land on
 * the same corner, with fewer points. */
static void test_guided_one_link(void)
{
    br_design *d = one_link();
    br_corners_opts o;
    br_corners_opts_default(&o);
    o.startup = 0;
    o.max_exhaustive = 0;
    br_corners *k;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_corners_run(d, &o, &k, &err), BR_OK);
    CU_ASSERT_EQUAL(k->method, BR_CORNERS_GUIDED);
    CU_ASSERT_TRUE(k->steady_points < 16);
    check_uvlo_corner(k, d);
    check_gate_corner(k);
    /* the sensitivities say the same: supply and capacitance low, loads high */
    signed char level[BR_TOL_MAX];
    br_corner_sensitivity(k->s, BR_CRIT_UVLO, level, NULL);
    CU_ASSERT_TRUE(level[0] == -1 && level[1] == -1 && level[2] == 1 && level[3] == 1);
    br_corners_free(k);
    br_design_free(d);
}

/* A limit the worst corner breaks: with the minimum drive set 50 mV
 * under the nominal rail, the drive criterion passes at the nominal point
 * and fails at the supply's minimum. */
static void test_failing_corner(void)
{
    br_design *d = one_link();
    br_corners_opts o;
    br_corners_opts_default(&o);
    o.startup = 0;
    br_corners *k;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_corners_run(d, &o, &k, &err), BR_OK);
    double vmin = k->w[BR_CRIT_UVLO].nominal.figure;
    br_corners_free(k);
    d->min_drive = br_qty_fixed(vmin - 0.05);
    CU_ASSERT_EQUAL_FATAL(br_corners_run(d, &o, &k, &err), BR_OK);
    const br_corner_worst *w = &k->w[BR_CRIT_DRIVE];
    CU_ASSERT_TRUE(w->nominal.pass);
    CU_ASSERT_FALSE(w->worst.pass);
    CU_ASSERT_EQUAL(w->level[0], -1);
    CU_ASSERT_FALSE(k->all_pass);
    br_corners_free(k);
    br_design_free(d);
}

/* The start-up criteria get corners with a cold start: a larger
 * capacitance and a lower supply start the chain later. */
static void test_startup_corners(void)
{
    br_design *d = one_link();
    d->tramp = br_qty_fixed(50e-6);
    br_corners_opts o;
    br_corners_opts_default(&o);
    br_corners *k;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_corners_run(d, &o, &k, &err), BR_OK);
    const br_corner_worst *w = &k->w[BR_CRIT_STARTUP];
    CU_ASSERT_EQUAL(k->su_method, BR_CORNERS_EXHAUSTIVE);
    CU_ASSERT_EQUAL(k->startup_points, 16);
    CU_ASSERT_TRUE_FATAL(w->applies);
    CU_ASSERT_TRUE(w->worst.figure >= w->nominal.figure);
    CU_ASSERT_EQUAL(w->level[0], -1);
    br_corners_free(k);
    br_design_free(d);
}

/* Without any tolerance the nominal point is the only corner. */
static void test_no_tolerance(void)
{
    br_design *d = br_test_fcml(2, 400.0, 100e3, 0.5, 50e-9);
    br_corners_opts o;
    br_corners_opts_default(&o);
    o.startup = 0;
    br_corners *k;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_corners_run(d, &o, &k, &err), BR_OK);
    CU_ASSERT_EQUAL(k->s->tl.n, 0);
    CU_ASSERT_EQUAL(k->steady_points, 0);
    CU_ASSERT_TRUE(k->w[BR_CRIT_UVLO].applies);
    BR_ASSERT_NEAR(k->w[BR_CRIT_UVLO].worst.margin, k->w[BR_CRIT_UVLO].nominal.margin, 0.0);
    br_corners_free(k);
    br_design_free(d);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"one link, every corner: the known worst corner", test_exhaustive_one_link},
        {"one link, guided: the same corner", test_guided_one_link},
        {"a corner that breaks a limit", test_failing_corner},
        {"start-up corners with a cold start", test_startup_corners},
        {"no tolerance: the nominal point only", test_no_tolerance},
        {NULL, NULL},
    };
    gsl_set_error_handler_off(); /* the library checks every GSL status itself */
    return br_test_main("analyses_corners", cases);
}

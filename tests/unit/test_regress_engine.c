/* test_regress_engine.c - engine failures found by scans, kept as
 * regression tests (they need a design file, hence this layer). */
#include "analyses/probe.h"
#include "analyses/steady.h"
#include "bootrung/bootrung.h"
#include "testkit.h"

#include <math.h>
#include <stdio.h>

/* A step that ends its interval must land on the interval end exactly:
 * t + (tb - t) can fall one rounding unit short, and the next step of
 * 1e-22 s then looked like a step-size underflow.  Found by `map` on the
 * 3-level demo with the drivers kept running below UVLO. */
static void check_point(double duty, double fsw)
{
    br_design *d;
    br_chain *c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(BR_SOURCE_DIR "/examples/demo-3level.xml", &d, &err),
                          BR_OK);
    d->duty.nom = duty;
    d->fsw.nom = fsw;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    for (int k = 0; k < c->n; k++) {
        c->st[k].drv.uvlo_fall = -1e6;
        c->st[k].drv.uvlo_rise = -1e6 + 1.0;
    }
    br_steady ss;
    int rc = br_steady_solve(c, BR_DIRI_DOWN, NULL, &ss, &err);
    if (rc != BR_OK)
        fprintf(stderr, "duty %.17g fsw %.17g: %s\n", duty, fsw, err.msg);
    CU_ASSERT_EQUAL(rc, BR_OK);
    CU_ASSERT_TRUE(ss.converged);
    br_chain_free(c);
    br_design_free(d);
}

static void test_interval_end_rounding(void)
{
    check_point(0.26615384615384613, 80683.70422596642);
    check_point(0.46307692307692305, 398256.1523694008);
}

/* Diodes with stored charge: the recovery charge of link 1 returns into
 * the bypass capacitor of rail 0, whose capacitance the engine took from
 * the (empty) stage-0 capacitor slot, giving NaN rails that a NaN-blind
 * convergence test then accepted.  Found with the part-picking search. */
static void test_stored_charge_with_bypass(void)
{
    br_design *d;
    br_chain *c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(BR_SOURCE_DIR "/examples/demo-3level.xml", &d, &err),
                          BR_OK);
    CU_ASSERT_TRUE_FATAL(d->csupply.nom > 0);
    for (int i = 0; i < d->ndiodes; i++)
        d->diodes[i].tau = br_qty_fixed(100e-9);
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_steady ss;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, BR_DIRI_DOWN, NULL, &ss, &err), BR_OK);
    CU_ASSERT_TRUE(ss.converged && ss.holds);
    double dt = ss.stats.t1 - ss.stats.t0;
    for (int k = 0; k < c->n; k++) {
        CU_ASSERT_TRUE(isfinite(ss.stats.rail[k].vint / dt));
        CU_ASSERT_TRUE(ss.stats.rail[k].vmin > 5.0);
    }
    CU_ASSERT_TRUE(ss.stats.link[1].qrr > 0);
    br_chain_free(c);
    br_design_free(d);
}

/* Regression: on the 12-switch example two points used to come out as
 * "no periodic steady state": one cold-started with the warm-start
 * budget, one where Newton stalls against a jump of the period map of a
 * few tens of uV (an edge changing order).  Both settle and hold; the
 * window analysis of the same design holds over the whole range between
 * them. */
static void test_map_hard_points(void)
{
    br_design *d;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(BR_SOURCE_DIR "/examples/leg-7level.xml", &d, &err),
                          BR_OK);
    static const double pts[][2] = {{0.377272727, 110e3}, {0.396153846, 148139.954}};
    for (int i = 0; i < 2; i++) {
        br_probe *p;
        CU_ASSERT_EQUAL_FATAL(br_probe_create(d, &p, &err), BR_OK);
        br_hold_point hp;
        CU_ASSERT_EQUAL(br_probe_eval(p, pts[i][0], pts[i][1], &hp, &err), BR_OK);
        CU_ASSERT_TRUE(isfinite(hp.margin));
        CU_ASSERT_TRUE(hp.holds);
        br_probe_free(p);
    }
    br_design_free(d);
}

/* Ideal 11 V clamps (rz = 0) on rails the links would charge higher: the
 * shooting solver converges from its start estimate (which once put the
 * rails above the clamps, where the links stay blocked and the period map
 * is a translation with no fixed point nearby), and the scans' probe,
 * which has no plain fallback, finds the design point's steady state. */
static void test_ideal_clamp_shooting(void)
{
    br_design *d;
    br_chain *c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(BR_SOURCE_DIR "/tests/extreme/clamp-ideal.xml", &d, &err),
                          BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    for (int dir = BR_DIRI_DOWN; dir <= BR_DIRI_UP; dir++) {
        br_steady ss;
        CU_ASSERT_EQUAL(br_steady_solve(c, dir, NULL, &ss, &err), BR_OK);
        CU_ASSERT_TRUE(ss.converged);
        CU_ASSERT_EQUAL(ss.method, BR_STEADY_SHOOTING);
    }
    br_probe *p;
    CU_ASSERT_EQUAL_FATAL(br_probe_create(d, &p, &err), BR_OK);
    br_hold_point hp;
    CU_ASSERT_EQUAL(br_probe_eval(p, c->duty, c->fsw, &hp, &err), BR_OK);
    CU_ASSERT_TRUE(isfinite(hp.margin));
    br_probe_free(p);
    br_chain_free(c);
    br_design_free(d);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"a step lands on its interval end", test_interval_end_rounding},
        {"stored charge with a bypass capacitor", test_stored_charge_with_bypass},
        {"map points that used to stall", test_map_hard_points},
        {"ideal clamps: shooting and the probe settle", test_ideal_clamp_shooting},
        {NULL, NULL}};
    return br_test_main("regress/engine", cases);
}

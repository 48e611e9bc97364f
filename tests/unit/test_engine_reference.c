/* test_engine_reference.c - the engine against chains computed by an
 * independent general-purpose circuit simulator on the same model
 * (reference transient of the same model, ngspice 39; the files and the
 * model they follow are described in tests/data/reference/README.md).
 * Tolerances are those the project set for this check: steady rails within
 * 20 mV, final start-up times within 5 %, dropout counts within 2, link
 * mean currents within 1 %; the diodes' peak reverse voltage, like the
 * rails, within 20 mV (link 1 excepted: rail 0's edge spikes through the
 * supply resistance set it, as they set rail 0's extremes).
 *
 * c6 and c8 carry a load current: they start at no load (the reference
 * switches the load on at current_from, after every driver has started),
 * and their steady state is with the load current flowing.  They are
 * checked three ways: the start-up against the no-load figures, the
 * shooting solver's steady state, and the reference's own procedure (a
 * plain transient from cold with the load switched on at current_from).
 *
 * Where the engine's model differs from the reference on purpose:
 * - a driver that starts in the middle of its switch's on-interval draws
 *   its gate charge (the gate must be charged to turn the switch on); the
 *   reference draws none then.  The 10 nC taken from a 2.2 uF rail is
 *   4.5 mV, far inside the 0.5 V UVLO hysteresis.
 * - the junction capacitance is placed across the whole link and its
 *   displacement current follows the junction voltage quasi-statically;
 *   the reference places it across the junction inside rs.  This moves
 *   charge only during the 10 ns edges and changes no steady figure by
 *   more than about 1 mV.
 * - the bootstrap current flows through the return switch too, so the
 *   engine puts the switch's Rds(on) in the link's path while it is on;
 *   the reference counts only the load current's drop there.  In c8 (25
 *   mOhm) this costs the rails up to 4 mV in steady state and, through
 *   the inrush peaks of several amperes, delays the enable times by up
 *   to 3 % (0.8 % with Rds(on) left out of the path). */
#include "analyses/startup.h"
#include "analyses/steady.h"
#include "testdesign.h"
#include "testkit.h"

#include <stdlib.h>
#include <string.h>

static char *load_json(const char *name)
{
    char path[1024];
    snprintf(path, sizeof path, "%s/%s", BR_REFERENCE_DIR, name);
    char *j = br_test_slurp(path, NULL);
    CU_ASSERT_PTR_NOT_NULL(j);
    return j;
}

/* Pointer to the stage object "stage": k in the reference json. */
static const char *stage_at(const char *json, int k)
{
    const char *p = strstr(json, "\"stages\"");
    for (int i = 0; p && i <= k; i++) {
        p = strstr(p + 1, "\"stage\":");
    }
    return p;
}

typedef struct ref_case {
    br_design *d;
    br_chain *c;
    char *json;
} ref_case;

static int open_case(ref_case *rc, const char *name)
{
    br_error err;
    rc->json = load_json(name);
    if (!rc->json)
        return 0;
    rc->d = br_test_reference_design(rc->json);
    CU_ASSERT_PTR_NOT_NULL_FATAL(rc->d);
    CU_ASSERT_EQUAL_FATAL(br_chain_build(rc->d, &rc->c, &err), BR_OK);
    return 1;
}

static void close_case(ref_case *rc)
{
    br_chain_free(rc->c);
    br_design_free(rc->d);
    free(rc->json);
}

static void check_startup(ref_case *rc)
{
    br_startup su;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_startup_run(rc->c, NULL, &su, &err), BR_OK);
    CU_ASSERT_TRUE(su.complete);
    for (int k = 1; k < rc->c->n; k++) {
        const char *s = stage_at(rc->json, k);
        double fin = br_json_number(rc->json, s, "final_enable_time_s", NULL);
        double first = br_json_number(rc->json, s, "enable_time_s", NULL);
        double ndis = br_json_number(rc->json, s, "n_disable_events", NULL);
        BR_ASSERT_REL(su.st[k].final_enable, fin, 0.05);
        BR_ASSERT_REL(su.st[k].first_enable, first, 0.05);
        BR_ASSERT_NEAR((double)su.st[k].ndropouts, ndis, 2.0);
    }
}

/* Start-up by envelope following (the default) against every period
 * integrated (--startup-method periods, the reference path) and, with
 * against_ref, against the reference transient of the same model
 * (ngspice 39, the json): every stage's first and final start within 2 %
 * of both, its dropouts within 2 of both, its rail at the end within 5 mV
 * and its link's inrush peak and I2t within 1 % of every period
 * integrated (the tolerances issue 17 set for the envelope).  It must
 * have stepped over periods, and the two must have covered the same
 * periods.  (On c6 and c8 the engine itself differs from the reference by
 * up to 3.2 %, see the top of this file: they are held to every period
 * integrated, and to the reference by check_startup's 5 %.) */
static void check_methods(ref_case *rc, int against_ref)
{
    br_startup su[2];
    br_error err;
    for (int m = 0; m < 2; m++) {
        rc->c->startup_method = m ? BR_SU_PERIODS : BR_SU_ENVELOPE;
        CU_ASSERT_EQUAL_FATAL(br_startup_run(rc->c, NULL, &su[m], &err), BR_OK);
        CU_ASSERT_TRUE_FATAL(su[m].complete);
        CU_ASSERT_EQUAL(su[m].method, rc->c->startup_method);
    }
    rc->c->startup_method = BR_SU_ENVELOPE;
    const br_startup *e = &su[0], *p = &su[1];
    CU_ASSERT_TRUE(e->periods_stepped > 0);
    CU_ASSERT_EQUAL(p->periods_stepped, 0);
    CU_ASSERT_EQUAL(e->periods_integrated + e->periods_stepped, p->periods_integrated);
    BR_ASSERT_REL(e->t_simulated, p->t_simulated, 1e-9);
    for (int k = 1; k < rc->c->n; k++) {
        const char *s = stage_at(rc->json, k);
        double fin = br_json_number(rc->json, s, "final_enable_time_s", NULL);
        double first = br_json_number(rc->json, s, "enable_time_s", NULL);
        double ndis = br_json_number(rc->json, s, "n_disable_events", NULL);
        BR_ASSERT_REL(e->st[k].first_enable, p->st[k].first_enable, 0.02);
        BR_ASSERT_REL(e->st[k].final_enable, p->st[k].final_enable, 0.02);
        if (against_ref) {
            BR_ASSERT_REL(e->st[k].first_enable, first, 0.02);
            BR_ASSERT_REL(e->st[k].final_enable, fin, 0.02);
        }
        BR_ASSERT_NEAR((double)e->st[k].ndropouts, (double)p->st[k].ndropouts, 2.0);
        BR_ASSERT_NEAR((double)e->st[k].ndropouts, ndis, 2.0);
        BR_ASSERT_NEAR(e->st[k].vend, p->st[k].vend, 5e-3);
        BR_ASSERT_REL(e->st[k].ipeak, p->st[k].ipeak, 0.01);
        BR_ASSERT_REL(e->st[k].i2t, p->st[k].i2t, 0.01);
    }
}

/* The direction a case is analysed in: its own, or none. */
static int case_dir(const ref_case *rc)
{
    return rc->c->direction == BR_DIR_STEP_UP     ? BR_DIRI_UP
           : rc->c->direction == BR_DIR_STEP_DOWN ? BR_DIRI_DOWN
                                                  : BR_DIRI_NONE;
}

static void check_steady(ref_case *rc)
{
    br_steady ss;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(rc->c, case_dir(rc), NULL, &ss, &err), BR_OK);
    CU_ASSERT_TRUE(ss.converged);
    CU_ASSERT_TRUE(ss.holds);
    CU_ASSERT_EQUAL(ss.method, BR_STEADY_SHOOTING);
    double dt = ss.stats.t1 - ss.stats.t0;
    for (int k = 0; k < rc->c->n; k++) {
        const char *s = stage_at(rc->json, k);
        const br_rail_stats *r = &ss.stats.rail[k];
        BR_ASSERT_NEAR(r->vint / dt, br_json_number(rc->json, s, "vrail_mean_ss_V", NULL), 0.020);
        if (k == 0)
            continue; /* rail 0's extremes are edge spikes through Rsrc: mean only */
        BR_ASSERT_NEAR(r->vmin, br_json_number(rc->json, s, "vrail_min_ss_V", NULL), 0.020);
        BR_ASSERT_NEAR(r->vmax, br_json_number(rc->json, s, "vrail_max_ss_V", NULL), 0.020);
        BR_ASSERT_REL(ss.stats.link[k].q / dt,
                      br_json_number(rc->json, s, "diode_mean_current_ss_A", NULL), 0.01);
        if (k >= 2)
            BR_ASSERT_NEAR(ss.stats.link[k].vrev_peak,
                           br_json_number(rc->json, s, "diode_peak_reverse_voltage_ss_V", NULL),
                           0.020);
    }
}

static void test_c1_startup(void)
{
    ref_case rc;
    if (open_case(&rc, "c1.json")) {
        check_startup(&rc);
        close_case(&rc);
    }
}

static void test_c1_steady(void)
{
    ref_case rc;
    if (open_case(&rc, "c1.json")) {
        check_steady(&rc);
        close_case(&rc);
    }
}

static void test_c2_startup(void)
{
    ref_case rc;
    if (open_case(&rc, "c2.json")) {
        check_startup(&rc);
        close_case(&rc);
    }
}

static void test_c2_steady(void)
{
    ref_case rc;
    if (open_case(&rc, "c2.json")) {
        check_steady(&rc);
        close_case(&rc);
    }
}

/* The hand check the reference itself states: in steady state link k
 * carries the charge of stages k..top, (iq_on + qg fsw) each. */
static void test_c2_link_charge_by_hand(void)
{
    ref_case rc;
    if (!open_case(&rc, "c2.json"))
        return;
    br_steady ss;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(rc.c, BR_DIRI_NONE, NULL, &ss, &err), BR_OK);
    double dt = ss.stats.t1 - ss.stats.t0, per = 2e-3 + 10e-9 * 200e3;
    for (int k = 1; k < rc.c->n; k++)
        BR_ASSERT_REL(ss.stats.link[k].q / dt, (rc.c->n - k) * per, 1e-3);
    close_case(&rc);
}

/* The reference's own procedure: a cold start at no load, the load
 * current from the first period boundary after current_from, plain
 * simulation for periods_simulated periods, figures of the last five. */
static void check_transient(ref_case *rc)
{
    br_sim *s;
    br_error err;
    double periods = br_json_number(rc->json, NULL, "periods_simulated", NULL), T = rc->c->T;
    CU_ASSERT_EQUAL_FATAL(br_sim_create(rc->c, case_dir(rc), BR_INTEG_FAST, &s, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_sim_run_until(s, (periods - 5) * T, &err), BR_OK);
    br_sim_stats_start(s);
    CU_ASSERT_EQUAL_FATAL(br_sim_run_until(s, periods * T, &err), BR_OK);
    const br_stats *st = br_sim_stats(s);
    double dt = st->t1 - st->t0;
    for (int k = 1; k < rc->c->n; k++) {
        const char *j = stage_at(rc->json, k);
        BR_ASSERT_NEAR(st->rail[k].vint / dt, br_json_number(rc->json, j, "vrail_mean_ss_V", NULL),
                       0.020);
        BR_ASSERT_NEAR(st->rail[k].vmin, br_json_number(rc->json, j, "vrail_min_ss_V", NULL),
                       0.020);
        BR_ASSERT_NEAR(st->rail[k].vmax, br_json_number(rc->json, j, "vrail_max_ss_V", NULL),
                       0.020);
    }
    br_sim_free(s);
}

static void test_c6_startup(void)
{
    ref_case rc;
    if (open_case(&rc, "c6.json")) {
        check_startup(&rc);
        close_case(&rc);
    }
}

static void test_c6_steady(void)
{
    ref_case rc;
    if (open_case(&rc, "c6.json")) {
        check_steady(&rc);
        close_case(&rc);
    }
}

static void test_c6_transient(void)
{
    ref_case rc;
    if (open_case(&rc, "c6.json")) {
        check_transient(&rc);
        close_case(&rc);
    }
}

static void test_c8_startup(void)
{
    ref_case rc;
    if (open_case(&rc, "c8.json")) {
        check_startup(&rc);
        close_case(&rc);
    }
}

static void test_c8_steady(void)
{
    ref_case rc;
    if (open_case(&rc, "c8.json")) {
        check_steady(&rc);
        close_case(&rc);
    }
}

static void test_c8_transient(void)
{
    ref_case rc;
    if (open_case(&rc, "c8.json")) {
        check_transient(&rc);
        close_case(&rc);
    }
}

static void methods_case(const char *name, int against_ref)
{
    ref_case rc;
    if (open_case(&rc, name)) {
        check_methods(&rc, against_ref);
        close_case(&rc);
    }
}

static void test_c1_envelope(void)
{
    methods_case("c1.json", 1);
}

static void test_c2_envelope(void)
{
    methods_case("c2.json", 1);
}

static void test_c6_envelope(void)
{
    methods_case("c6.json", 0);
}

static void test_c8_envelope(void)
{
    methods_case("c8.json", 0);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"c1 single bootstrap: start-up", test_c1_startup},
        {"c1 single bootstrap: steady state", test_c1_steady},
        {"c2 4-level leg: start-up with dropouts", test_c2_startup},
        {"c2 4-level leg: steady state", test_c2_steady},
        {"c2 link charge by hand", test_c2_link_charge_by_hand},
        {"c6 4-level leg stepping up: start-up at no load", test_c6_startup},
        {"c6 4-level leg stepping up: steady state", test_c6_steady},
        {"c6 4-level leg stepping up: the reference's transient", test_c6_transient},
        {"c8 5-level leg at 20 A: start-up at no load", test_c8_startup},
        {"c8 5-level leg at 20 A: steady state", test_c8_steady},
        {"c8 5-level leg at 20 A: the reference's transient", test_c8_transient},
        {"c1: start-up by envelope against every period and the reference", test_c1_envelope},
        {"c2: start-up by envelope against every period and the reference", test_c2_envelope},
        {"c6: start-up by envelope against every period", test_c6_envelope},
        {"c8: start-up by envelope against every period", test_c8_envelope},
        {NULL, NULL}};
    return br_test_main("engine/reference", cases);
}

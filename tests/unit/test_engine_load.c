/* test_engine_load.c - the power stage under load: the on-state drop and
 * its temperature law, reverse conduction with current, the flying
 * capacitors' ripple, the rails' shift, and when the load current flows.
 * Each check names its source beside it. */
#include "analyses/figures.h"
#include "analyses/rules.h"
#include "analyses/startup.h"
#include "analyses/steady.h"
#include "testdesign.h"
#include "testkit.h"

#include <math.h>
#include <string.h>

#define KELVIN 273.15

/* A 3-level leg at 100 kHz (T = 10 us), duty 0.5 (the test parts of
 * testdesign.c): A1 on [0, 5) us, A2 on [5, 10) us, the bottoms their
 * complements less the dead time; stages B1, B2, A2, A1 from the bottom. */
static br_design *leg3(int direction, double iload, double rds, double deadtime)
{
    br_design *d = br_test_fcml(3, 400.0, 100e3, 0.5, deadtime);
    CU_ASSERT_PTR_NOT_NULL_FATAL(d);
    d->direction = direction;
    d->iload = br_qty_fixed(iload);
    d->switches[0].rds_on = br_qty_fixed(rds);
    return d;
}

static br_chain *build(const br_design *d)
{
    br_chain *c = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    return c;
}

/* A running chain from the period start with the given rails. */
static br_sim *running(const br_chain *c, int dir, double v1, double v2, double v3)
{
    br_sim *s = NULL;
    br_error err;
    double vc[BR_MAX_SWITCHES] = {0, v1, v2, v3};
    CU_ASSERT_EQUAL_FATAL(br_sim_create(c, dir, BR_INTEG_FAST, &s, &err), BR_OK);
    br_sim_reset_running(s, vc);
    return s;
}

/* Voltage across switch k once the simulator has reached t. */
static double sw_at(br_sim *s, int k, double t)
{
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_sim_run_until(s, t, &err), BR_OK);
    return br_sim_switch_v(s, k, t);
}

enum { B1, B2, A2, A1 };

/* ---- the on-state drop ---------------------------------------------------- */

/* An on MOSFET is a resistance: v = i Rds(on) (Mohan, Undeland & Robbins,
 * Power Electronics: Converters, Applications, and Design, Wiley, ch. on
 * power MOSFETs).  10 A through 50 mOhm: 0.5 V.  Every conducting switch
 * of the leg carries the whole current; stepping up (current into the
 * switch node) the top switches carry it in reverse (-0.5 V), the bottoms
 * forward (+0.5 V); stepping down the other way round (common practice,
 * the cell relations of Meynard & Foch, IEEE PESC 1992). */
static void test_on_drop_by_direction(void)
{
    br_design *d = leg3(BR_DIR_BOTH, 10.0, 0.05, 100e-9);
    br_chain *c = build(d);
    br_sim *up = running(c, BR_DIRI_UP, 11.0, 10.0, 9.0);
    BR_ASSERT_NEAR(sw_at(up, B2, 2.5e-6), 0.5, 1e-12); /* B2 on [0.1, 4.9) us */
    BR_ASSERT_NEAR(br_sim_switch_v(up, A1, 2.5e-6), -0.5, 1e-12);
    BR_ASSERT_NEAR(sw_at(up, B1, 7.5e-6), 0.5, 1e-12); /* B1 on [5.1, 9.9) us */
    BR_ASSERT_NEAR(br_sim_switch_v(up, A2, 7.5e-6), -0.5, 1e-12);
    br_sim *down = running(c, BR_DIRI_DOWN, 11.0, 10.0, 9.0);
    BR_ASSERT_NEAR(sw_at(down, B2, 2.5e-6), -0.5, 1e-12);
    BR_ASSERT_NEAR(br_sim_switch_v(down, A1, 2.5e-6), 0.5, 1e-12);
    /* no direction, no load current: 0 */
    br_sim *none = running(c, BR_DIRI_NONE, 11.0, 10.0, 9.0);
    BR_ASSERT_NEAR(sw_at(none, B2, 2.5e-6), 0.0, 1e-15);
    br_sim_free(up);
    br_sim_free(down);
    br_sim_free(none);
    br_chain_free(c);
    br_design_free(d);
}

/* A switch whose driver is in UVLO is not on: it blocks and drops
 * nothing (rail 1 at 5 V is below UVLO falling 7 V, and its link cannot
 * charge it while B1 is off in the first half period). */
static void test_uvlo_switch_blocks(void)
{
    br_design *d = leg3(BR_DIR_STEP_UP, 10.0, 0.05, 100e-9);
    br_chain *c = build(d);
    br_sim *s = running(c, BR_DIRI_UP, 5.0, 10.0, 9.0);
    CU_ASSERT_FALSE(br_sim_enabled(s, 1));
    BR_ASSERT_NEAR(sw_at(s, B2, 2.5e-6), 200.0, 1e-9); /* Vin / 2 */
    br_sim_free(s);
    br_chain_free(c);
    br_design_free(d);
}

/* An explicit string says how each switch carries the current. */
static void test_string_conducts(void)
{
    br_design *d = br_test_fcml(2, 400.0, 100e3, 0.5, 0.0);
    CU_ASSERT_PTR_NOT_NULL_FATAL(d);
    d->topology = BR_TOPO_STRING;
    d->nswitch = 2;
    d->direction = BR_DIR_STEP_DOWN;
    d->iload = br_qty_fixed(4.0);
    d->switches[0].rds_on = br_qty_fixed(0.1);
    const double on[2][2] = {{0.55, 0.95}, {0.05, 0.45}};
    for (int k = 0; k < 2; k++) {
        br_switch_spec *w = &d->sw[k];
        snprintf(w->name, sizeof w->name, "%s", k ? "hi" : "lo");
        w->nwin = 1;
        w->on[0][0] = on[k][0];
        w->on[0][1] = on[k][1];
        w->vblock = br_qty_fixed(400.0);
        w->carry = k ? BR_CARRY_REVERSE : BR_CARRY_FORWARD;
    }
    br_chain *c = build(d);
    br_sim *s = running(c, BR_DIRI_DOWN, 11.0, 0.0, 0.0);
    BR_ASSERT_NEAR(sw_at(s, 1, 2.5e-6), -0.4, 1e-12); /* hi: 4 A in reverse through 0.1 ohm */
    BR_ASSERT_NEAR(sw_at(s, 0, 7.5e-6), 0.4, 1e-12);  /* lo: forward */
    br_sim_free(s);
    br_chain_free(c);
    /* under load every string switch must say it */
    br_error err;
    d->sw[1].carry = BR_CARRY_UNSET;
    CU_ASSERT_EQUAL(br_chain_build(d, &c, &err), BR_EINPUT);
    CU_ASSERT_STRING_EQUAL(err.field, "switch hi: conducts");
    br_design_free(d);
}

/* Idealised commutation carries no current: a load current with
 * current="none" is refused. */
static void test_none_with_current_refused(void)
{
    br_design *d = leg3(BR_DIR_NONE, 1.0, 0.05, 100e-9);
    br_chain *c = NULL;
    br_error err;
    CU_ASSERT_EQUAL(br_chain_build(d, &c, &err), BR_EINPUT);
    CU_ASSERT_PTR_NOT_NULL(strstr(err.msg, "current=\"none\""));
    br_design_free(d);
}

/* ---- the temperature law of Rds(on) ---------------------------------------- */

/* The drift region dominates a power MOSFET's on-resistance and its
 * electron mobility falls as T^-2.42 (Baliga, Fundamentals of Power
 * Semiconductor Devices, Springer 2008; the exponent from memory), so from
 * 25 C to 125 C Rds(on) rises by (398.15 / 298.15)^2.42 = exp(2.42 *
 * 0.289224) = 2.0136: about doubling, as silicon MOSFET data show (common
 * practice). */
static void test_rds_temperature_law(void)
{
    br_design *d = leg3(BR_DIR_STEP_UP, 10.0, 0.010, 100e-9);
    d->switches[0].rds_exp = br_qty_fixed(2.42);
    d->tamb = br_qty_fixed(125.0 + KELVIN); /* the junction follows the ambient */
    br_chain *c = build(d);
    BR_ASSERT_REL(c->st[0].sw.rds_on, 0.010 * 2.0136353, 1e-6);
    BR_ASSERT_REL(br_sw_on_drop(&c->st[0], BR_DIRI_UP, c->iload), 10.0 * 0.020136353, 1e-6);
    br_chain_free(c);
    /* an own junction temperature: at the reference temperature, rds-on */
    d->tj = br_qty_fixed(25.0 + KELVIN);
    d->tj_given = 1;
    c = build(d);
    BR_ASSERT_REL(c->st[0].sw.rds_on, 0.010, 1e-12);
    br_chain_free(c);
    br_design_free(d);
}

/* ---- reverse conduction with current ----------------------------------------- */

/* Without a body diode a GaN transistor conducts in reverse through its
 * channel once the gate-drain voltage reaches the threshold: with the gate
 * held at Vgs,off the drop is Vth + |Vgs,off| + I R at first order (A.
 * Lidow, J. Strydom, M. de Rooij, D. Reusch, GaN Transistors for Efficient
 * Power Conversion, Wiley, the chapter on the device's third quadrant;
 * from memory).  1.5 V + 3 V + 10 A x 10 mOhm = 4.6 V; a volt more of
 * negative gate drive, a volt more of drop. */
static void test_third_quadrant(void)
{
    br_design *d = leg3(BR_DIR_STEP_UP, 10.0, 0.010, 100e-9);
    br_switch_part *q = &d->switches[0];
    q->reverse = BR_REV_CHANNEL;
    q->vth = br_qty_fixed(1.5);
    d->drivers[0].vgs_off = br_qty_fixed(-3.0);
    br_chain *c = build(d);
    BR_ASSERT_REL(br_sw_rev_drop(&c->st[A1].sw, c->iload), 4.6, 1e-12);
    /* in the simulator: stepping up, A1 conducts in pair 1's dead time
     * [5.0, 5.1) us */
    br_sim *s = running(c, BR_DIRI_UP, 11.0, 10.0, 9.0);
    BR_ASSERT_NEAR(sw_at(s, A1, 5.05e-6), -4.6, 1e-9);
    br_sim_free(s);
    br_chain_free(c);
    d->drivers[0].vgs_off = br_qty_fixed(-4.0);
    c = build(d);
    BR_ASSERT_REL(br_sw_rev_drop(&c->st[A1].sw, c->iload), 5.6, 1e-12);
    br_chain_free(c);
    /* a body diode: vsd plus its resistance times the current, 0.8 V + 10 A
     * x 20 mOhm (common practice) */
    q->reverse = BR_REV_DIODE;
    q->vsd = br_qty_fixed(0.8);
    q->rsd = br_qty_fixed(0.020);
    q->rsd_given = 1;
    c = build(d);
    BR_ASSERT_REL(br_sw_rev_drop(&c->st[A1].sw, c->iload), 1.0, 1e-12);
    br_chain_free(c);
    br_design_free(d);
}

/* ---- the flying capacitor's ripple ------------------------------------------ */

/* A 3-level leg, no dead time, D = 0.5: pair 1 (A1) conducts on top for
 * [0, T/2), pair 2 (A2) for [T/2, T).  A current I entering the switch
 * node meets the flying capacitor on its B side (B2 on) and must leave on
 * the A side (A1 on) in the first half: it flows through the capacitor
 * from its bottom plate to its top one and discharges it, dV/dt = -I/C;
 * in the second half it charges it, +I/C (Meynard & Foch, "Multi-level
 * conversion: high voltage choppers and voltage-source inverters", IEEE
 * PESC 1992: dV(k)/dt = (I/C)(S(k+1) - S(k))).  A triangle of I T / (2C)
 * peak to peak about its mean: per ampere, with T = 10 us and C = 1 uF,
 * +2.5 V at 0, 0 at T/4, -2.5 V at T/2, 0 at 3T/4. */
static void test_ripple_cell_relation(void)
{
    br_design *d = leg3(BR_DIR_STEP_UP, 10.0, 0.0, 0.0);
    d->cfly = br_qty_fixed(1e-6);
    br_chain *c = build(d);
    br_timing tm;
    double fly[BR_MAX_FLY + 1], sl[BR_MAX_FLY + 1], pp[BR_MAX_FLY + 1];
    br_timing_build(c, BR_DIRI_UP, &tm);
    CU_ASSERT_EQUAL(tm.npairs, 2);
    const double t[4] = {0.0, 2.5e-6, 5e-6, 7.5e-6}, want[4] = {2.5, 0.0, -2.5, 0.0};
    for (int i = 0; i < 4; i++) {
        br_timing_fly_at(&tm, t[i], fly, sl);
        BR_ASSERT_NEAR(fly[1], want[i], 1e-9);
        BR_ASSERT_NEAR(sl[1], i < 2 ? -1e6 : 1e6, 1e-3);
    }
    br_timing_fly_swing(&tm, pp);
    BR_ASSERT_NEAR(pp[1], 5.0, 1e-9);
    /* in the simulator at 10 A: pair 1 blocks Vin - V1, pair 2 V1, so at
     * 4.5 us (ripple 2.5 - 4.5 = -2 V/A) B1 blocks 200 + 20 V and A2
     * 200 - 20 V */
    br_sim *s = running(c, BR_DIRI_UP, 11.0, 10.0, 9.0);
    BR_ASSERT_NEAR(sw_at(s, B1, 4.5e-6), 220.0, 1e-6);
    BR_ASSERT_NEAR(br_sim_switch_v(s, A2, 4.5e-6), 180.0, 1e-6);
    br_sim_free(s);
    /* stepping down the current and the ripple change sign */
    s = running(c, BR_DIRI_DOWN, 11.0, 10.0, 9.0);
    BR_ASSERT_NEAR(sw_at(s, B1, 4.5e-6), 180.0, 1e-6);
    br_sim_free(s);
    br_chain_free(c);
    br_design_free(d);
}

/* The link diodes block what their return switches block: with the
 * ripple, link 1's peak reverse voltage (B1 off for the first half
 * period, its ripple peaking at +25 V just before T/2) rises by about
 * the 25 V of the triangle's half swing at 10 A. */
static void test_ripple_reaches_the_diode(void)
{
    double peak[2];
    for (int with = 0; with < 2; with++) {
        br_design *d = leg3(BR_DIR_STEP_UP, 10.0, 0.0, 0.0);
        d->cfly = br_qty_fixed(with ? 1e-6 : 0.0);
        br_chain *c = build(d);
        br_steady ss;
        br_error err;
        CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, BR_DIRI_UP, NULL, &ss, &err), BR_OK);
        CU_ASSERT_TRUE(ss.converged);
        peak[with] = ss.stats.link[1].vrev_peak;
        br_chain_free(c);
        br_design_free(d);
    }
    BR_ASSERT_NEAR(peak[1] - peak[0], 25.0, 0.05);
}

/* The same leg with 0.1 uF: the triangle is 25 V/A peak, 250 V at 10 A,
 * more than the 200 V a cell holds: the cells collapse (the lowest
 * blocking voltage 200 - 250 = -50 V).  The design rules say so, the
 * simulator refuses to run such a period rather than report its rails, and
 * the verdict fails the steady state. */
static void test_ripple_collapse(void)
{
    br_design *d = leg3(BR_DIR_STEP_UP, 10.0, 0.0, 0.0);
    d->cfly = br_qty_fixed(0.1e-6);
    br_chain *c = build(d);
    br_rule_list rules;
    br_error err;
    CU_ASSERT_EQUAL(br_rules_check(c, &rules, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(rules.n, 1);
    CU_ASSERT_EQUAL(rules.hit[0].kind, BR_RULE_FLY_COLLAPSE);
    CU_ASSERT_TRUE(rules.hit[0].fatal);
    BR_ASSERT_NEAR(rules.hit[0].figure, -50.0, 1e-6);
    br_sim *s = running(c, BR_DIRI_UP, 11.0, 10.0, 9.0);
    CU_ASSERT_EQUAL(br_sim_run_until(s, 1e-6, &err), BR_ENUMERIC);
    CU_ASSERT_STRING_EQUAL(err.field, "fcml: cfly");
    br_sim_free(s);
    /* and the verdict: the leg cannot work, a failure, never undetermined
     * (a solver matter) and never a pass */
    br_steady ss;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, BR_DIRI_UP, NULL, &ss, &err), BR_OK);
    CU_ASSERT_TRUE(ss.collapsed && !ss.failed && !ss.holds);
    CU_ASSERT_FALSE(br_steady_has_period(&ss));
    br_steady_figs f;
    br_steady_figures(c, &ss, &f);
    br_verdict v;
    br_verdict_make(c, NULL, &f, 1, &v);
    const br_verdict_row *r = &v.row[BR_CRIT_STEADY];
    CU_ASSERT_TRUE(r->applies && !r->pass && !r->undetermined);
    CU_ASSERT_PTR_NOT_NULL(strstr(r->note, "cells collapse"));
    CU_ASSERT_TRUE(v.nfail >= 1);
    br_chain_free(c);
    /* at 1 uF (175 V left) neither */
    d->cfly = br_qty_fixed(1e-6);
    c = build(d);
    CU_ASSERT_EQUAL(br_rules_check(c, &rules, &err), BR_OK);
    CU_ASSERT_EQUAL(rules.n, 0);
    br_chain_free(c);
    br_design_free(d);
}

/* Zero mean over the period, and a period that closes, with dead times
 * and an uneven duty (4 levels, D = 0.3, 50 ns). */
static void test_ripple_zero_mean(void)
{
    br_design *d = br_test_fcml(4, 600.0, 100e3, 0.3, 50e-9);
    CU_ASSERT_PTR_NOT_NULL_FATAL(d);
    d->direction = BR_DIR_STEP_DOWN;
    d->cfly = br_qty_fixed(2e-6);
    br_chain *c = build(d);
    br_timing tm;
    double fly[BR_MAX_FLY + 1], sl[BR_MAX_FLY + 1], mean[BR_MAX_FLY + 1] = {0};
    br_timing_build(c, BR_DIRI_DOWN, &tm);
    const int m = 20000; /* midpoint rule over pieces of T/m: exact for lines */
    for (int i = 0; i < m; i++) {
        br_timing_fly_at(&tm, (i + 0.5) * c->T / m, fly, sl);
        for (int k = 1; k < 3; k++)
            mean[k] += fly[k] / m;
    }
    for (int k = 1; k < 3; k++)
        BR_ASSERT_NEAR(mean[k], 0.0, 2e-4); /* of swings about 1.7 V/A */
    br_timing_fly_at(&tm, c->T * (1.0 - 1e-12), fly, sl);
    BR_ASSERT_NEAR(fly[1], tm.fly_start[1], 1e-9);
    BR_ASSERT_NEAR(fly[2], tm.fly_start[2], 1e-9);
    br_chain_free(c);
    br_design_free(d);
}

/* ---- the rails' shift: a hand check ------------------------------------------ */

/* Link k charges rail k through its return switch k-1: with the load
 * current that switch stands at u(k-1) = +-I Rds(on) while on instead of
 * 0, so the link passes the same charge when rail k sits u(k-1) lower.
 * Down the chain the shifts add: rail k moves by -(u(0) + ... + u(k-1)).
 * A 4-level leg at 20 A through 25 mOhm (u = 0.5 V), no dead time (links
 * conduct only while their return switch is on), flat capacitors, no
 * junction capacitance, no recovery: stepping up B1..B3 carry the current
 * forward and A3..A1 in reverse, so rails 1..5 move by -0.5, -1.0, -1.5,
 * -1.0, -0.5 V; stepping down by the opposite.  Within 1 mV. */
static void test_rail_shift_by_hand(void)
{
    br_design *d = br_test_fcml(4, 400.0, 200e3, 0.5, 0.0);
    CU_ASSERT_PTR_NOT_NULL_FATAL(d);
    d->direction = BR_DIR_BOTH;
    d->switches[0].rds_on = br_qty_fixed(0.025);
    const double want[2][6] = {{0, 0.5, 1.0, 1.5, 1.0, 0.5}, {0, -0.5, -1.0, -1.5, -1.0, -0.5}};
    for (int dir = BR_DIRI_DOWN; dir <= BR_DIRI_UP; dir++) {
        double mean[2][BR_MAX_SWITCHES];
        for (int loaded = 0; loaded < 2; loaded++) {
            d->iload = br_qty_fixed(loaded ? 20.0 : 0.0);
            br_chain *c = build(d);
            br_steady ss;
            br_error err;
            CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, dir, NULL, &ss, &err), BR_OK);
            CU_ASSERT_TRUE(ss.converged && ss.holds);
            double dt = ss.stats.t1 - ss.stats.t0;
            for (int k = 0; k < c->n; k++)
                mean[loaded][k] = ss.stats.rail[k].vint / dt;
            br_chain_free(c);
        }
        for (int k = 1; k < 6; k++)
            BR_ASSERT_NEAR(mean[1][k] - mean[0][k], want[dir][k], 1e-3);
    }
    br_design_free(d);
}

/* ---- when the load current flows ----------------------------------------------- */

/* From the first period boundary at or after load-from: 2.3 periods in,
 * the load starts at 3 T.  B1 (powered by the supply, on [5.1, 9.9) us
 * of each period) drops nothing at 2.75 T and 0.5 V at 3.75 T. */
static void test_load_starts_at_a_boundary(void)
{
    br_design *d = leg3(BR_DIR_STEP_UP, 10.0, 0.05, 100e-9);
    d->load_from = 2.3 * 10e-6;
    br_chain *c = build(d);
    br_sim *s = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_sim_create(c, BR_DIRI_UP, BR_INTEG_FAST, &s, &err), BR_OK);
    CU_ASSERT_TRUE(br_sim_enabled(s, 0) || sw_at(s, B1, 1e-9) > -1.0); /* settles UVLO */
    BR_ASSERT_NEAR(sw_at(s, B1, 27.5e-6), 0.0, 1e-12);
    BR_ASSERT_NEAR(sw_at(s, B1, 37.5e-6), 0.5, 1e-12);
    br_sim_free(s);
    br_chain_free(c);
    br_design_free(d);
}

/* A design that starts under load starts in each direction it carries
 * and keeps the later start; without load-from the start-up runs at no
 * load whatever the direction. */
static void test_startup_under_load(void)
{
    br_design *d = leg3(BR_DIR_STEP_UP, 10.0, 0.1, 100e-9);
    br_startup su[3], both, idle;
    br_error err;
    d->load_from = 0.0;
    for (int i = 0; i < 2; i++) {
        d->direction = i ? BR_DIR_STEP_UP : BR_DIR_STEP_DOWN;
        br_chain *c = build(d);
        CU_ASSERT_EQUAL_FATAL(br_startup_run(c, NULL, &su[i], &err), BR_OK);
        CU_ASSERT_EQUAL(su[i].dir, i ? BR_DIRI_UP : BR_DIRI_DOWN);
        CU_ASSERT_TRUE(su[i].complete);
        br_chain_free(c);
    }
    d->direction = BR_DIR_BOTH;
    br_chain *c = build(d);
    CU_ASSERT_EQUAL_FATAL(br_startup_run(c, NULL, &both, &err), BR_OK);
    int later = su[1].t_total > su[0].t_total;
    CU_ASSERT_EQUAL(both.dir, later ? BR_DIRI_UP : BR_DIRI_DOWN);
    BR_ASSERT_NEAR(both.t_total, su[later].t_total, 1e-15);
    CU_ASSERT_TRUE(fabs(su[1].t_total - su[0].t_total) > 1e-7); /* the load matters */
    br_chain_free(c);
    d->load_from = HUGE_VAL;
    c = build(d);
    CU_ASSERT_EQUAL_FATAL(br_startup_run(c, NULL, &idle, &err), BR_OK);
    CU_ASSERT_EQUAL(idle.dir, BR_DIRI_NONE);
    d->direction = BR_DIR_NONE;
    d->iload = br_qty_fixed(0.0);
    br_chain_free(c);
    c = build(d);
    CU_ASSERT_EQUAL_FATAL(br_startup_run(c, NULL, &su[2], &err), BR_OK);
    BR_ASSERT_NEAR(idle.t_total, su[2].t_total, 1e-15); /* no load: no direction */
    br_chain_free(c);
    br_design_free(d);
}

/* Once switching stops the load current stops too. */
static void test_freeze_drops_the_load(void)
{
    br_design *d = leg3(BR_DIR_STEP_UP, 10.0, 0.05, 100e-9);
    br_chain *c = build(d);
    br_sim *s = running(c, BR_DIRI_UP, 11.0, 10.0, 9.0);
    BR_ASSERT_NEAR(sw_at(s, B1, 7.5e-6), 0.5, 1e-12);
    br_sim_freeze(s, 1ULL << B1);
    BR_ASSERT_NEAR(sw_at(s, B1, 8e-6), 0.0, 1e-12);
    br_sim_free(s);
    br_chain_free(c);
    br_design_free(d);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"on-state drop by direction", test_on_drop_by_direction},
        {"a switch in UVLO blocks", test_uvlo_switch_blocks},
        {"string switches say how they conduct", test_string_conducts},
        {"current none refuses a load current", test_none_with_current_refused},
        {"Rds(on) temperature law", test_rds_temperature_law},
        {"third-quadrant and body-diode drops", test_third_quadrant},
        {"flying-capacitor ripple: the cell relation", test_ripple_cell_relation},
        {"flying-capacitor ripple reaches the diode", test_ripple_reaches_the_diode},
        {"flying-capacitor ripple: zero mean, closed period", test_ripple_zero_mean},
        {"flying-capacitor ripple: cells that collapse", test_ripple_collapse},
        {"rail shift by the on-state drops, by hand", test_rail_shift_by_hand},
        {"the load starts at a period boundary", test_load_starts_at_a_boundary},
        {"start-up under load", test_startup_under_load},
        {"no load once switching stops", test_freeze_drops_the_load},
        {NULL, NULL}};
    return br_test_main("engine/load", cases);
}

/* test_engine_line.c - the chain on an AC line cycle: its periodic steady
 * state over the line period against the fixed-duty and no-load states,
 * against long plain simulation, the current's direction period by
 * period, and where in the cycle a rail droops.  Each check names its
 * source beside it. */
#include "analyses/figures.h"
#include "analyses/steady.h"
#include "testdesign.h"
#include "testkit.h"

#include <math.h>
#include <string.h>

#define PI 3.14159265358979323846

/* A 3-level leg of the test parts at 100 kHz (T = 10 us), switches of
 * 50 mOhm with a 0.7 V body diode; with ac the line cycle of the given
 * frequency, peak current, phase (deg) and depth replaces duty 0.5. */
static br_design *leg(int levels, int ac, double fline, double ipk, double phase_deg, double depth,
                      double deadtime)
{
    br_design *d = br_test_fcml(levels, 400.0, 100e3, 0.5, deadtime);
    CU_ASSERT_PTR_NOT_NULL_FATAL(d);
    d->switches[0].rds_on = br_qty_fixed(0.05);
    d->switches[0].vsd = br_qty_fixed(0.7);
    d->caps[0].c = br_qty_fixed(4.7e-6);
    if (!ac)
        return d;
    d->direction = BR_DIR_BOTH;
    d->ac.on = 1;
    d->ac.freq = br_qty_fixed(fline);
    d->ac.ipk = br_qty_fixed(ipk);
    d->ac.phase = br_qty_fixed(phase_deg * PI / 180.0);
    d->ac.depth = br_qty_fixed(depth);
    return d;
}

static br_chain *build(const br_design *d)
{
    br_chain *c = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    return c;
}

static void solve(const br_chain *c, int dir, br_steady *ss, br_steady_figs *f)
{
    br_error err;
    br_error_clear(&err);
    int rc = br_steady_solve(c, dir, NULL, ss, &err);
    if (rc != BR_OK)
        fprintf(stderr, "steady state: %s\n", err.msg);
    CU_ASSERT_EQUAL_FATAL(rc, BR_OK);
    CU_ASSERT_TRUE_FATAL(ss->converged);
    CU_ASSERT_TRUE(ss->holds);
    br_steady_figures(c, ss, f);
}

/* Every rail's state and extremes within tol of the other state's. */
static void same_rails(const br_chain *c, const br_steady *a, const br_steady_figs *fa,
                       const br_steady *b, const br_steady_figs *fb, double tol)
{
    for (int k = 1; k < c->n; k++) {
        BR_ASSERT_NEAR(a->x[k], b->x[k], tol);
        BR_ASSERT_NEAR(fa->rail[k].vmin, fb->rail[k].vmin, tol);
        BR_ASSERT_NEAR(fa->rail[k].vmax, fb->rail[k].vmax, tol);
    }
}

/* ---- limits: no line, no current ------------------------------------------ */

/* A line cycle whose amplitude vanishes is the fixed-duty chain: a duty
 * table that moves the duty by 1e-5 about 0.4 and a peak current of
 * 1 mA through 50 mOhm (50 uV); without dead times the current's
 * direction moves nothing else.  The line cycle's periodic state and its
 * extremes are the DC steady state's at duty 0.4 and no current (the same
 * chain), within the solvers' tolerance and those few tens of microvolts.
 * (Duty 0.5 of a 3-level leg without dead times puts four edges on one
 * instant, where a part in 1e5 of duty reorders them.) */
static void test_tiny_line_is_dc(void)
{
    br_design *da = leg(3, 1, 1000.0, 1e-3, 0.0, 0.0, 0.0);
    da->ac.ntab = 2;
    da->ac.tab_at[0] = 0.0;
    da->ac.tab_duty[0] = 0.4;
    da->ac.tab_at[1] = PI;
    da->ac.tab_duty[1] = 0.4 + 1e-5;
    br_design *dd = leg(3, 0, 0, 0, 0, 0, 0.0);
    dd->duty = br_qty_fixed(0.4);
    dd->direction = BR_DIR_STEP_DOWN;
    br_chain *ca = build(da), *cd = build(dd);
    br_steady sa, sd;
    br_steady_figs fa, fd;
    solve(ca, BR_DIRI_LINE, &sa, &fa);
    solve(cd, BR_DIRI_DOWN, &sd, &fd);
    CU_ASSERT_EQUAL(sa.dir, BR_DIRI_LINE);
    BR_ASSERT_NEAR(sa.phase, sd.phase, 1e-12); /* the same quiet instant */
    same_rails(ca, &sa, &fa, &sd, &fd, 1e-4);
    br_chain_free(ca);
    br_chain_free(cd);
    br_design_free(da);
    br_design_free(dd);
}

/* With no current at all nothing conducts in reverse in the dead times
 * and no switch drops anything: the line cycle is the chain at no load
 * (current="none"), whatever the dead time (a small depth keeps the duty
 * at 0.5 within 5e-6). */
static void test_zero_current_is_no_load(void)
{
    br_design *da = leg(3, 1, 1000.0, 0.0, 30.0, 1e-5, 100e-9);
    br_design *dn = leg(3, 0, 0, 0, 0, 0, 100e-9);
    br_chain *ca = build(da), *cn = build(dn);
    br_steady sa, sn;
    br_steady_figs fa, fn;
    solve(ca, BR_DIRI_LINE, &sa, &fa);
    solve(cn, BR_DIRI_NONE, &sn, &fn);
    same_rails(ca, &sa, &fa, &sn, &fn, 1e-4);
    br_chain_free(ca);
    br_chain_free(cn);
    br_design_free(da);
    br_design_free(dn);
}

/* ---- against plain simulation ---------------------------------------------- */

/* The rails of a simulator at time t. */
static void rails_at(br_sim *s, double t, double *x)
{
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_sim_run_until(s, t, &err), BR_OK);
    br_sim_state(s, x);
}

/* The periodic state over the line period is what plain simulation
 * settles to: from a cold start under load (empty capacitors, drivers
 * off, the load from the first period) after 25 line periods, and from
 * the quasi-static state of the line's first switching period after 8,
 * every rail at the solver's instant (its quiet phase in line period 0)
 * within 1 mV of the solver's state, and one line period apart within
 * 0.1 mV of itself (settled). */
static void test_matches_plain(void)
{
    br_design *d = leg(3, 1, 1000.0, 10.0, 30.0, 0.8, 100e-9); /* K = 100 */
    d->load_from = 0.0;
    br_chain *c = build(d);
    br_steady ss;
    br_steady_figs f;
    solve(c, BR_DIRI_LINE, &ss, &f);
    br_sim *s;
    br_error err;
    double L = c->line.K * c->T, a[2 * BR_MAX_SWITCHES], b[2 * BR_MAX_SWITCHES];
    CU_ASSERT_EQUAL_FATAL(br_sim_create(c, BR_DIRI_LINE, BR_INTEG_FAST, &s, &err), BR_OK);
    br_sim_reset_cold(s); /* the line cycle's period 0 starts with the PWM */
    double t0 = br_sim_pwm_start(s) + ss.phase;
    rails_at(s, t0 + 24 * L, a);
    rails_at(s, t0 + 25 * L, b);
    for (int k = 1; k < c->n; k++) {
        BR_ASSERT_NEAR(b[k], ss.x[k], 1e-3);
        BR_ASSERT_NEAR(b[k], a[k], 1e-4);
    }
    br_steady_opts o;
    br_steady held;
    br_steady_opts_default(&o);
    o.line_hold = 0;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, BR_DIRI_LINE, &o, &held, &err), BR_OK);
    br_sim_reset_running_at(s, held.x, ss.phase);
    rails_at(s, 8 * L, b);
    for (int k = 1; k < c->n; k++)
        BR_ASSERT_NEAR(b[k], ss.x[k], 1e-3);
    br_sim_free(s);
    br_chain_free(c);
    br_design_free(d);
}

/* ---- the direction, period by period ---------------------------------------- */

/* In each switching period the switch that conducts the current in
 * reverse in pair 1's dead time after A1 turns off is the one the
 * current's direction picks: B1 when the current leaves the switch node
 * (step-down), A1 when it enters (step-up); it stands at minus its body
 * diode's drop, 0.7 V plus nothing from its zero reverse resistance
 * (common practice for a freewheeling pair).  So the direction changes
 * exactly at the current's zero crossings, here 30 deg and 210 deg. */
static void test_direction_by_period(void)
{
    br_design *d = leg(3, 1, 1000.0, 10.0, 30.0, 0.5, 100e-9);
    br_chain *c = build(d);
    br_sim *s;
    br_error err;
    double x[2 * BR_MAX_SWITCHES] = {0, 11.0, 10.0, 9.0};
    CU_ASSERT_EQUAL_FATAL(br_sim_create(c, BR_DIRI_LINE, BR_INTEG_FAST, &s, &err), BR_OK);
    br_sim_reset_running_at(s, x, 0.0);
    int changes = 0, last = -1;
    enum { B1 = 0, A1 = 3 };
    for (long m = 0; m < c->line.K; m++) {
        /* the middle of pair 1's dead time after A1's pulse of D T */
        double t = m * c->T + br_line_duty(&c->line, m) * c->T + 50e-9;
        CU_ASSERT_EQUAL_FATAL(br_sim_run_until(s, t, &err), BR_OK);
        double i = br_line_current(&c->line, m);
        int down = i > 0;
        BR_ASSERT_NEAR(br_sim_switch_v(s, down ? B1 : A1, t), -0.7, 1e-9);
        CU_ASSERT(br_sim_switch_v(s, down ? A1 : B1, t) > 100.0); /* its partner blocks */
        changes += last >= 0 && down != last;
        last = down;
        double th = br_line_theta(&c->line, m) * 180.0 / PI;
        CU_ASSERT_EQUAL(down, th > 30.0 && th < 210.0);
    }
    CU_ASSERT_EQUAL(changes, 2);
    br_sim_free(s);
    br_chain_free(c);
    br_design_free(d);
}

/* ---- where the rail droops -------------------------------------------------- */

/* A hand check.  In a 2-level leg rail A1 charges through link 1 while B1
 * is on, so its charge voltage is the supply less the link's drop less
 * B1's on-state voltage.  B1 carries the current i (+ out of the switch
 * node) in reverse when i > 0 and forward when i < 0, so it stands at
 * -i Rds(on) (Mohan, Undeland & Robbins: an on MOSFET is a resistance)
 * and rail A1 follows V0 + i(theta) Rds(on), V0 the rail at no current:
 * with i = 10 A sin(theta - 40 deg) through 50 mOhm its lowest point is
 * 0.5 V below the no-load rail's, where the current is most negative, at
 * theta = 40 + 270 = 310 deg, and its highest 0.5 V above, at 130 deg
 * (no dead time, a constant duty: nothing else moves; the rail tracks the
 * current within a few switching periods, a few tenths of a degree at
 * 50 Hz). */
static void test_droop_follows_current(void)
{
    br_design *da = leg(2, 1, 50.0, 10.0, 40.0, 0.0, 0.0); /* K = 2000 */
    br_design *dn = leg(2, 0, 0, 0, 0, 0, 0.0);
    br_chain *ca = build(da), *cn = build(dn);
    br_steady sa, sn;
    br_steady_figs fa, fn;
    solve(ca, BR_DIRI_LINE, &sa, &fa);
    solve(cn, BR_DIRI_NONE, &sn, &fn);
    BR_ASSERT_NEAR(fa.rail[1].vmin, fn.rail[1].vmin - 0.5, 5e-3);
    BR_ASSERT_NEAR(fa.rail[1].vmax, fn.rail[1].vmax + 0.5, 5e-3);
    double th;
    long m;
    br_line_window(&ca->line, ca->T, sa.phase, sa.at_dmin[1], &th, &m);
    BR_ASSERT_NEAR(th * 180.0 / PI, 310.0, 3.0);
    br_line_window(&ca->line, ca->T, sa.phase, sa.at_dmax[1], &th, &m);
    BR_ASSERT_NEAR(th * 180.0 / PI, 130.0, 3.0);
    /* the verdict's UVLO row binds there too, and says so */
    br_verdict v;
    br_verdict_make(ca, NULL, &fa, 1, &v);
    const br_verdict_row *r = &v.row[BR_CRIT_UVLO];
    CU_ASSERT_EQUAL(r->stage, 1);
    CU_ASSERT_EQUAL(r->dir, BR_DIRI_LINE);
    BR_ASSERT_NEAR(r->line_theta * 180.0 / PI, 310.0, 3.0);
    CU_ASSERT_PTR_NOT_NULL(strstr(r->note, "binds at line phase 3"));
    br_chain_free(ca);
    br_chain_free(cn);
    br_design_free(da);
    br_design_free(dn);
}

/* A solver held to one map cannot settle a line cycle: the state is
 * undetermined, never a pass or a failure, and the figures shown are
 * those of the last map, not an empty record. */
static void test_unsettled_is_undetermined(void)
{
    br_design *d = leg(3, 1, 1000.0, 10.0, 30.0, 0.8, 100e-9);
    br_chain *c = build(d);
    br_steady_opts o;
    br_steady ss;
    br_steady_figs f;
    br_error err;
    br_steady_opts_default(&o);
    o.max_iter = 1;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, BR_DIRI_LINE, &o, &ss, &err), BR_OK);
    CU_ASSERT_FALSE(ss.converged);
    CU_ASSERT_EQUAL(ss.iterations, 1);
    br_steady_figures(c, &ss, &f);
    for (int k = 1; k < c->n; k++)
        CU_ASSERT(f.rail[k].vmin > 5.0 && f.rail[k].vmax < 13.0);
    br_verdict v;
    br_verdict_make(c, NULL, &f, 1, &v);
    CU_ASSERT_TRUE(v.row[BR_CRIT_STEADY].undetermined);
    CU_ASSERT_TRUE(v.row[BR_CRIT_UVLO].undetermined && !v.row[BR_CRIT_UVLO].pass);
    CU_ASSERT_FALSE(v.all_pass);
    CU_ASSERT_EQUAL(v.nfail, 0);
    CU_ASSERT_PTR_NOT_NULL(strstr(v.row[BR_CRIT_STEADY].note, "per line period"));
    br_chain_free(c);
    br_design_free(d);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"an unsettled line cycle is undetermined", test_unsettled_is_undetermined},
        {"a vanishing line cycle is the DC steady state", test_tiny_line_is_dc},
        {"no current is the chain at no load", test_zero_current_is_no_load},
        {"the line cycle's state matches plain simulation", test_matches_plain},
        {"reverse conduction follows the current period by period", test_direction_by_period},
        {"the rail's droop follows i(theta) Rds(on)", test_droop_follows_current},
        {NULL, NULL},
    };
    return br_test_main("engine_line", cases);
}

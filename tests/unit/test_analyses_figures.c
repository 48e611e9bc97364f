/* test_analyses_figures.c - margins, stresses and the verdict table. */
#include "analyses/figures.h"
#include "testdesign.h"
#include "testkit.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

static br_chain *chain_of(br_design *d)
{
    br_chain *c = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    return c;
}

static void solve(const br_chain *c, int dir, br_steady *ss, br_steady_figs *f)
{
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, dir, NULL, ss, &err), BR_OK);
    br_steady_figures(c, ss, f);
}

/* The figures restate the simulated period: the average current of link k
 * is the charge of the rails above it (the charge balance of a cascade,
 * common practice), and the derived margins follow their definitions. */
static void test_figures_consistent(void)
{
    br_design *d = br_test_fcml(3, 600.0, 100e3, 0.5, 50e-9);
    br_chain *c = chain_of(d);
    br_steady ss;
    br_steady_figs f;
    solve(c, BR_DIRI_NONE, &ss, &f);
    double per = 2e-3 + 10e-9 * 100e3; /* iq_on + Qg fsw of the test parts */
    for (int k = 1; k < c->n; k++) {
        BR_ASSERT_REL(f.link[k].iavg, (c->n - k) * per, 2e-3);
        CU_ASSERT_TRUE(f.link[k].irms >= f.link[k].iavg);
        CU_ASSERT_TRUE(f.link[k].ipeak >= f.link[k].irms);
        BR_ASSERT_NEAR(f.rail[k].m_uvlo, f.rail[k].vdrv_min - 7.0, 1e-12);
        BR_ASSERT_NEAR(f.rail[k].m_gate, 20.0 - f.rail[k].vdrv_max, 1e-12);
        BR_ASSERT_NEAR(f.link[k].share, f.link[k].vrev_stress / 600.0, 1e-12);
        /* the blocking voltage 600/2 less the rail difference */
        BR_ASSERT_NEAR(f.link[k].vrev_sim, 300.0 - (f.rail[k - 1].vavg - f.rail[k].vavg), 0.1);
    }
    BR_ASSERT_REL(f.supply_iavg, f.link[1].iavg + per, 2e-3);
    br_chain_free(c);
    br_design_free(d);
}

/* Reverse conduction in dead time over-charges the rail above the
 * conducting switch: stepping up, the top switches conduct, so a rail they
 * return rises above the rail below it by more than when stepping down,
 * and the other way round for the bottom switches (domain primer, sec. 2). */
static void test_direction_overcharge(void)
{
    br_design *d = br_test_fcml(3, 600.0, 100e3, 0.5, 100e-9);
    d->switches[0].vsd = br_qty_fixed(2.5);
    d->direction = BR_DIR_BOTH;
    br_chain *c = chain_of(d);
    int dirs[2];
    CU_ASSERT_EQUAL(br_design_directions(c, dirs), 2);
    br_steady sd, su;
    br_steady_figs fd, fu;
    solve(c, dirs[0], &sd, &fd);
    solve(c, dirs[1], &su, &fu);
    /* link 3 returns through A2, a top switch */
    double up3 = fu.rail[3].vavg - fu.rail[2].vavg, down3 = fd.rail[3].vavg - fd.rail[2].vavg;
    CU_ASSERT_TRUE(up3 > down3 + 1.0);
    CU_ASSERT_TRUE(up3 > 0.0); /* above the rail that feeds it */
    /* link 1 returns through B1, a bottom switch */
    double up1 = fu.rail[1].vavg - fu.rail[0].vavg, down1 = fd.rail[1].vavg - fd.rail[0].vavg;
    CU_ASSERT_TRUE(down1 > up1 + 1.0);
    CU_ASSERT_TRUE(down1 > 0.0);
    br_chain_free(c);
    br_design_free(d);
}

/* A gate maximum below the rail fails the gate row, names the rail and
 * the direction, and fails the verdict; raising it passes. */
static void test_verdict_gate(void)
{
    br_design *d = br_test_fcml(3, 600.0, 100e3, 0.5, 50e-9);
    d->switches[0].vgs_max = br_qty_fixed(11.0);
    br_chain *c = chain_of(d);
    br_steady ss;
    br_steady_figs f;
    solve(c, BR_DIRI_NONE, &ss, &f);
    br_verdict v;
    br_verdict_make(c, NULL, &f, 1, &v);
    const br_verdict_row *g = &v.row[BR_CRIT_GATE];
    CU_ASSERT_TRUE(g->applies);
    CU_ASSERT_FALSE(g->pass);
    CU_ASSERT_EQUAL(g->stage, 0); /* rail 0, the supply at 12 V, is highest */
    BR_ASSERT_NEAR(g->margin, 11.0 - f.rail[0].vdrv_max, 1e-12);
    CU_ASSERT_FALSE(v.all_pass);
    CU_ASSERT_FALSE(v.row[BR_CRIT_DRIVE].applies); /* no minimum drive set */
    br_chain_free(c);
    d->switches[0].vgs_max = br_qty_fixed(20.0);
    c = chain_of(d);
    solve(c, BR_DIRI_NONE, &ss, &f);
    br_verdict_make(c, NULL, &f, 1, &v);
    CU_ASSERT_TRUE(v.row[BR_CRIT_GATE].pass);
    br_chain_free(c);
    br_design_free(d);
}

/* A rail whose steady state sits between UVLO falling and rising runs on
 * hysteresis only: the restart row fails while the UVLO row passes. */
static void test_verdict_hysteresis_only(void)
{
    br_design *d = br_test_fcml(3, 600.0, 100e3, 0.5, 50e-9);
    br_chain *c = chain_of(d);
    br_steady ss;
    br_steady_figs f;
    solve(c, BR_DIRI_NONE, &ss, &f);
    double top = f.rail[c->n - 1].vdrv_min;
    br_chain_free(c);
    d->drivers[0].uvlo_rise = br_qty_fixed(top + 0.2);
    d->drivers[0].uvlo_fall = br_qty_fixed(top - 0.5);
    c = chain_of(d);
    br_verdict v;
    solve(c, BR_DIRI_NONE, &ss, &f);
    br_verdict_make(c, NULL, &f, 1, &v);
    CU_ASSERT_TRUE(v.row[BR_CRIT_UVLO].pass);
    CU_ASSERT_FALSE(v.row[BR_CRIT_RESTART].pass);
    CU_ASSERT_EQUAL(v.row[BR_CRIT_RESTART].stage, c->n - 1);
    br_chain_free(c);
    br_design_free(d);
}

/* A Zener clamp holds its rail near the knee: the current through it is
 * (v - Vz) / rz, so the rail settles where that current takes what the
 * link brings beyond the driver's needs (circuit theory). */
static void test_zener_clamp(void)
{
    br_design *d = br_test_fcml(3, 600.0, 100e3, 0.5, 50e-9);
    d->switches[0].vsd = br_qty_fixed(3.0);
    d->direction = BR_DIR_STEP_DOWN; /* rails 1 and 2 over-charge */
    br_aux_part *z = &d->aux[d->naux++];
    br_aux_part_defaults(z);
    snprintf(z->id, sizeof z->id, "clamp");
    z->kind = BR_AUX_ZENER;
    z->vout = br_qty_fixed(12.5);
    z->rz = br_qty_fixed(2.0);
    d->def.aux = 0;
    br_chain *c = chain_of(d);
    br_steady ss;
    br_steady_figs f;
    solve(c, BR_DIRI_DOWN, &ss, &f);
    double dt = ss.stats.t1 - ss.stats.t0;
    for (int k = 1; k < c->n; k++) {
        CU_ASSERT_TRUE(f.rail[k].vavg < 12.5 + 0.5);
        /* the clamp's share of the rail's load charge is its current */
        double iclamp = ss.stats.rail[k].qload / dt - 2e-3 - 10e-9 * 100e3;
        if (f.rail[k].vavg > 12.5)
            BR_ASSERT_NEAR(iclamp, (f.rail[k].vavg - 12.5) / 2.0, 2e-3);
    }
    CU_ASSERT_TRUE(f.rail[2].vavg > 12.5); /* it did clamp something */
    br_chain_free(c);
    br_design_free(d);
}

/* A linear regulator feeds the driver min(vout, rail - dropout): the
 * drive voltage never exceeds vout, and UVLO is judged on it. */
static void test_regulator(void)
{
    br_design *d = br_test_fcml(3, 600.0, 100e3, 0.5, 50e-9);
    br_aux_part *r = &d->aux[d->naux++];
    br_aux_part_defaults(r);
    snprintf(r->id, sizeof r->id, "ldo");
    r->kind = BR_AUX_LDO;
    r->vout = br_qty_fixed(10.0);
    r->dropout = br_qty_fixed(0.4);
    r->iq = br_qty_fixed(100e-6);
    d->def.aux = 0;
    br_chain *c = chain_of(d);
    br_steady ss;
    br_steady_figs f;
    solve(c, BR_DIRI_NONE, &ss, &f);
    for (int k = 0; k < c->n; k++) {
        double want = fmin(10.0, f.rail[k].vmin - 0.4);
        BR_ASSERT_NEAR(f.rail[k].vdrv_min, want, 1e-9);
        CU_ASSERT_TRUE(f.rail[k].vdrv_max <= 10.0 + 1e-12);
        BR_ASSERT_NEAR(f.rail[k].m_uvlo, f.rail[k].vdrv_min - 7.0, 1e-12);
    }
    /* the regulator's own current rides on every rail */
    double per = 2e-3 + 100e-6 + 10e-9 * 100e3;
    BR_ASSERT_REL(f.link[1].iavg, (c->n - 1) * per, 2e-3);
    br_chain_free(c);
    br_design_free(d);
}

/* A steady state the solver could not settle decides nothing: its rows
 * are undetermined, never pass, and the steady row names the rail, the
 * periods and the residual.  A start-up the integrator could not finish
 * likewise.  A row failing on trustworthy data still fails. */
static void test_verdict_undetermined(void)
{
    br_design *d = br_test_fcml(3, 600.0, 100e3, 0.5, 50e-9);
    d->switches[0].vgs_max = br_qty_fixed(20.0);
    br_chain *c = chain_of(d);
    br_steady ss;
    br_steady_figs f;
    br_steady_opts o;
    br_error err;
    br_steady_opts_default(&o);
    o.max_iter = 1;
    o.max_plain = 1;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, BR_DIRI_NONE, &o, &ss, &err), BR_OK);
    br_steady_figures(c, &ss, &f);
    CU_ASSERT_FALSE(ss.converged);
    br_startup su;
    memset(&su, 0, sizeof su);
    su.n = c->n;
    su.failed = 1;
    snprintf(su.why, sizeof su.why, "the start-up simulation stopped at t = 1e-05 s: test");
    br_verdict v;
    br_verdict_make(c, &su, &f, 1, &v);
    for (int i = 0; i < BR_CRIT_COUNT; i++) {
        const br_verdict_row *r = &v.row[i];
        if (i == BR_CRIT_DRIVE) { /* no minimum drive: not applicable stays so */
            CU_ASSERT_FALSE(r->applies);
            CU_ASSERT_FALSE(r->undetermined);
            continue;
        }
        CU_ASSERT_TRUE(r->applies);
        CU_ASSERT_TRUE(r->undetermined);
        CU_ASSERT_FALSE(r->pass);
    }
    CU_ASSERT_FALSE(v.all_pass);
    CU_ASSERT_EQUAL(v.nfail, 0);
    CU_ASSERT_EQUAL(v.nundetermined, BR_CRIT_COUNT - 1);
    char want[64];
    snprintf(want, sizeof want, "rail %d (%s)", ss.resid_rail, c->st[ss.resid_rail].name);
    CU_ASSERT_PTR_NOT_NULL(strstr(v.row[BR_CRIT_STEADY].note, want));
    CU_ASSERT_PTR_NOT_NULL(strstr(v.row[BR_CRIT_STEADY].note, "periods"));
    CU_ASSERT_PTR_NOT_NULL(strstr(v.row[BR_CRIT_STARTUP].note, "stopped at t ="));
    CU_ASSERT_TRUE(isnan(v.row[BR_CRIT_UVLO].margin));
    /* the same chain settled: everything decided */
    solve(c, BR_DIRI_NONE, &ss, &f);
    br_verdict_make(c, NULL, &f, 1, &v);
    CU_ASSERT_EQUAL(v.nundetermined, 0);
    CU_ASSERT_FALSE(v.row[BR_CRIT_UVLO].undetermined);
    br_chain_free(c);
    br_design_free(d);
}

/* An ideal clamp (rz = 0, the part's default) is a hard limit: the rail
 * it clamps sits at the knee and never above it, the steady state
 * converges, and it is the limit of clamps ever stiffer (rz of 10 mohm
 * and 1 mohm let the rail rise above the knee by rz times the clamp's
 * peak current, about 1.5 A here: 15 mV and 1.5 mV).  An rz of 0 once gave
 * an infinite clamp current and a step-size underflow. */
static void test_ideal_clamp(void)
{
    const double rz[] = {0.0, 10e-3, 1e-3};
    double vmax[3], vmin[3];
    for (int i = 0; i < 3; i++) {
        br_design *d = br_test_fcml(3, 600.0, 100e3, 0.5, 50e-9);
        d->switches[0].vsd = br_qty_fixed(3.0);
        d->direction = BR_DIR_STEP_DOWN; /* rails 1 and 2 over-charge */
        br_aux_part *z = &d->aux[d->naux++];
        br_aux_part_defaults(z);
        snprintf(z->id, sizeof z->id, "clamp");
        z->kind = BR_AUX_ZENER;
        z->vout = br_qty_fixed(11.0);
        z->rz = br_qty_fixed(rz[i]);
        d->def.aux = 0;
        br_chain *c = chain_of(d);
        br_steady ss;
        br_steady_figs f;
        solve(c, BR_DIRI_DOWN, &ss, &f);
        CU_ASSERT_TRUE(ss.converged);
        vmax[i] = f.rail[2].vcap_peak;
        vmin[i] = f.rail[2].vmin;
        br_startup su;
        br_error err;
        CU_ASSERT_EQUAL(br_startup_run(c, NULL, &su, &err), BR_OK);
        CU_ASSERT_FALSE(su.failed);
        CU_ASSERT_TRUE(su.complete);
        br_chain_free(c);
        br_design_free(d);
    }
    BR_ASSERT_NEAR(vmax[0], 11.0, 1e-9); /* at the knee: it did clamp, not above */
    BR_ASSERT_NEAR(vmax[1], 11.0, 20e-3);
    BR_ASSERT_NEAR(vmax[2], 11.0, 2e-3);
    BR_ASSERT_NEAR(vmin[1], vmin[0], 10e-3);
    BR_ASSERT_NEAR(vmin[2], vmin[0], 1e-3);
    CU_ASSERT_TRUE(vmax[2] - 11.0 < vmax[1] - 11.0); /* converging on the knee */
}

/* A period whose figures contradict each other decides nothing: a rail
 * averaging above its own maximum (as a period that ran past its events
 * once gave, 27 V between 14.8 V and 15 V) makes the steady rows
 * undetermined, never a pass. */
static void test_average_outside_extremes(void)
{
    br_design *d = br_test_fcml(3, 600.0, 100e3, 0.5, 50e-9);
    d->switches[0].vgs_max = br_qty_fixed(20.0);
    br_chain *c = chain_of(d);
    br_steady ss;
    br_steady_figs f;
    solve(c, BR_DIRI_NONE, &ss, &f);
    br_verdict v;
    br_verdict_make(c, NULL, &f, 1, &v);
    CU_ASSERT_TRUE(v.all_pass); /* as solved */
    ss.stats.rail[1].vint *= 1.8;
    br_steady_figures(c, &ss, &f);
    br_verdict_make(c, NULL, &f, 1, &v);
    CU_ASSERT_FALSE(v.all_pass);
    CU_ASSERT_TRUE(v.row[BR_CRIT_STEADY].undetermined);
    CU_ASSERT_TRUE(v.row[BR_CRIT_UVLO].undetermined);
    CU_ASSERT_FALSE(v.row[BR_CRIT_UVLO].pass);
    CU_ASSERT_EQUAL(v.nfail, 0);
    CU_ASSERT_PTR_NOT_NULL(strstr(v.row[BR_CRIT_STEADY].note, "rail 1"));
    br_chain_free(c);
    br_design_free(d);
}

/* The check itself: inside the extremes up to rounding, NaN never. */
static void test_avg_within(void)
{
    CU_ASSERT_TRUE(br_avg_within(14.9, 14.8, 15.0));
    CU_ASSERT_TRUE(br_avg_within(15.0 + 1e-9, 14.8, 15.0));
    CU_ASSERT_TRUE(br_avg_within(12.0, 12.0, 12.0));
    CU_ASSERT_FALSE(br_avg_within(27.015, 14.824, 15.004));
    CU_ASSERT_FALSE(br_avg_within(14.7, 14.8, 15.0));
    CU_ASSERT_FALSE(br_avg_within(NAN, 14.8, 15.0));
}

/* A steady state whose simulation failed (step-size underflow, the work
 * limit) has no figures: every steady row is undetermined and the steady
 * row says why. */
static void test_verdict_failed_simulation(void)
{
    br_design *d = br_test_fcml(3, 600.0, 100e3, 0.5, 50e-9);
    br_chain *c = chain_of(d);
    br_steady ss;
    br_steady_figs f;
    memset(&ss, 0, sizeof ss);
    ss.dir = BR_DIRI_NONE;
    ss.failed = 1;
    ss.holds = 1;
    snprintf(ss.why, sizeof ss.why, "the steady-state simulation failed: a test");
    br_steady_figures(c, &ss, &f);
    CU_ASSERT_TRUE(isnan(f.rail[1].vmin) && isnan(f.link[1].iavg));
    br_verdict v;
    br_verdict_make(c, NULL, &f, 1, &v);
    CU_ASSERT_EQUAL(v.nfail, 0);
    CU_ASSERT_TRUE(v.row[BR_CRIT_STEADY].undetermined);
    CU_ASSERT_TRUE(v.row[BR_CRIT_UVLO].undetermined);
    CU_ASSERT_PTR_NOT_NULL(strstr(v.row[BR_CRIT_STEADY].note, "a test"));
    br_chain_free(c);
    br_design_free(d);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"figures consistent with the period", test_figures_consistent},
        {"dead-time reverse conduction over-charges", test_direction_overcharge},
        {"verdict: gate maximum", test_verdict_gate},
        {"verdict: rail on hysteresis only", test_verdict_hysteresis_only},
        {"Zener clamp", test_zener_clamp},
        {"linear regulator", test_regulator},
        {"verdict: undetermined when not converged", test_verdict_undetermined},
        {"an ideal clamp is a hard limit", test_ideal_clamp},
        {"verdict: an average outside its extremes", test_average_outside_extremes},
        {"the average-within check", test_avg_within},
        {"verdict: a failed simulation", test_verdict_failed_simulation},
        {NULL, NULL}};
    return br_test_main("analyses/figures", cases);
}

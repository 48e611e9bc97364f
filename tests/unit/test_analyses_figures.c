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
        /* no minimum drive, no ratings of the supply, diodes or capacitors, no
         * regulator, no thermal resistance: not applicable stays so */
        if (i == BR_CRIT_DRIVE || i == BR_CRIT_SUPPLY_START || i >= BR_CRIT_SUPPLY) {
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
    CU_ASSERT_EQUAL(v.nundetermined, BR_CRIT_SUPPLY - 2); /* the rows before, but drive */
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

/* A rail that never starts has no start-up time: the row fails with an
 * infinite figure (never), no margin (minus infinity, below any late
 * start), names the rail and says where it settles against what its
 * driver needs.  The test parts (testdesign.c) lose about half a volt per
 * link from the 12 V supply, so rail 3 settles near 10.7 V, short of a
 * UVLO rising of 11 V. */
static void test_verdict_never_starts(void)
{
    br_design *d = br_test_fcml(3, 600.0, 100e3, 0.5, 50e-9);
    d->drivers[0].uvlo_rise = br_qty_fixed(11.0);
    d->drivers[0].uvlo_fall = br_qty_fixed(10.4);
    d->startup_max = br_qty_fixed(2e-3);
    br_chain *c = chain_of(d);
    br_startup su;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_startup_run(c, NULL, &su, &err), BR_OK);
    CU_ASSERT_FALSE_FATAL(su.complete);
    CU_ASSERT_TRUE_FATAL(su.first_stalled > 0);
    br_verdict v;
    br_verdict_make(c, &su, NULL, 0, &v);
    const br_verdict_row *r = &v.row[BR_CRIT_STARTUP];
    CU_ASSERT_TRUE(r->applies);
    CU_ASSERT_FALSE(r->pass);
    CU_ASSERT_FALSE(r->undetermined);
    /* before: the time simulated (2 ms and a period) against 2 ms, a
     * margin of minus one period, a near miss */
    CU_ASSERT_TRUE(isinf(r->figure) && r->figure > 0);
    CU_ASSERT_TRUE(isinf(r->margin) && r->margin < 0);
    BR_ASSERT_NEAR(r->limit, 2e-3, 1e-15);
    CU_ASSERT_EQUAL(r->stage, su.first_stalled);
    char want[96];
    snprintf(want, sizeof want, "rail %d (%s) never starts", su.first_stalled,
             c->st[su.first_stalled].name);
    CU_ASSERT_PTR_NOT_NULL(strstr(r->note, want));
    snprintf(want, sizeof want, "settles at %.3f V", su.st[su.first_stalled].vend);
    CU_ASSERT_PTR_NOT_NULL(strstr(r->note, want));
    CU_ASSERT_PTR_NOT_NULL(strstr(r->note, "11.000 V its driver needs"));
    CU_ASSERT_EQUAL(v.nfail, 1 + (v.row[BR_CRIT_INRUSH].applies && !v.row[BR_CRIT_INRUSH].pass));
    br_chain_free(c);
    br_design_free(d);
}

/* A finished start-up whose stages dropped out 0, 2, 9 and 1 times. */
static void dropouts_startup(const br_chain *c, br_startup *su, const int *drops)
{
    memset(su, 0, sizeof *su);
    su->n = c->n;
    su->complete = 1;
    su->first_stalled = -1;
    for (int k = 0; k < c->n; k++) {
        su->st[k].first_enable = 1e-5 * (k + 1);
        su->st[k].final_enable = 2e-5 * (k + 1);
        su->st[k].ndropouts = drops[k];
        su->st[k].running = 1;
        su->st[k].vend = 11.0;
    }
    su->t_total = su->st[c->n - 1].final_enable;
    su->t_simulated = 1e-3;
}

/* Start-up dropouts: the stage with the most sets the row.  Without a
 * limit in the design, more than BR_DROPOUTS_WARN only warn (pass, exit
 * 0); a stated limit fails above it and is the row's limit then. */
static void test_verdict_dropouts(void)
{
    br_design *d = br_test_fcml(3, 600.0, 100e3, 0.5, 50e-9);
    br_chain *c = chain_of(d);
    CU_ASSERT_EQUAL_FATAL(c->n, 4);
    CU_ASSERT_EQUAL(c->max_dropouts, -1);
    const int drops[4] = {0, 2, 9, 1};
    br_startup su;
    dropouts_startup(c, &su, drops);
    br_verdict v;
    br_verdict_make(c, &su, NULL, 0, &v);
    const br_verdict_row *r = &v.row[BR_CRIT_DROPOUTS];
    CU_ASSERT_TRUE(r->applies && r->pass && r->warn && !r->undetermined);
    BR_ASSERT_NEAR(r->figure, 9.0, 0.0);
    BR_ASSERT_NEAR(r->limit, BR_DROPOUTS_WARN, 0.0);
    BR_ASSERT_NEAR(r->margin, BR_DROPOUTS_WARN - 9.0, 0.0);
    CU_ASSERT_EQUAL(r->stage, 2);
    CU_ASSERT_PTR_NOT_NULL(strstr(r->note, "rail 2 (A2) dropped out 9 times"));
    CU_ASSERT_EQUAL(v.nfail, 0);
    CU_ASSERT_EQUAL(v.nwarn, 1);
    CU_ASSERT_TRUE(br_crit_is_startup(BR_CRIT_DROPOUTS));
    CU_ASSERT_STRING_EQUAL(br_crit_unit(BR_CRIT_DROPOUTS), "");
    /* a stated limit below the count fails */
    c->max_dropouts = 5;
    br_verdict_make(c, &su, NULL, 0, &v);
    CU_ASSERT_TRUE(r->applies && !r->pass && !r->warn);
    BR_ASSERT_NEAR(r->limit, 5.0, 0.0);
    BR_ASSERT_NEAR(r->margin, -4.0, 0.0);
    CU_ASSERT_EQUAL(v.nfail, 1);
    /* at the limit it passes, and the designer's limit replaces the warning */
    c->max_dropouts = 9;
    br_verdict_make(c, &su, NULL, 0, &v);
    CU_ASSERT_TRUE(r->pass && !r->warn);
    CU_ASSERT_EQUAL(v.nfail + v.nwarn, 0);
    /* a few per stage: no finding */
    c->max_dropouts = -1;
    const int few[4] = {0, 3, 1, 0};
    dropouts_startup(c, &su, few);
    br_verdict_make(c, &su, NULL, 0, &v);
    CU_ASSERT_TRUE(r->pass && !r->warn);
    BR_ASSERT_NEAR(r->figure, 3.0, 0.0);
    /* the steady-state verbs do not judge it */
    br_verdict_make(c, NULL, NULL, 0, &v);
    CU_ASSERT_FALSE(r->applies);
    br_chain_free(c);
    br_design_free(d);
}

/* The steady-state row is a status, not a design margin: it holds with
 * the solver's cross-check drift as its figure (information) and no
 * margin.  A state the solver reports converged whose cross-check periods
 * still move the rails by more than 100 uV a period is not trusted: the
 * row is undetermined and so is every row read off that state, none
 * fails. */
static void test_steady_status(void)
{
    br_design *d = br_test_fcml(3, 600.0, 100e3, 0.5, 50e-9);
    br_chain *c = chain_of(d);
    br_steady ss;
    br_steady_figs f;
    solve(c, BR_DIRI_NONE, &ss, &f);
    br_verdict v;
    br_verdict_make(c, NULL, &f, 1, &v);
    const br_verdict_row *r = &v.row[BR_CRIT_STEADY];
    CU_ASSERT_TRUE(r->applies && r->pass && !r->undetermined);
    CU_ASSERT_TRUE(isnan(r->margin));
    BR_ASSERT_NEAR(r->figure, ss.drift, 0.0);
    BR_ASSERT_NEAR(r->limit, 1e-4, 0.0);
    CU_ASSERT_FALSE(br_crit_has_margin(BR_CRIT_STEADY));
    CU_ASSERT_TRUE(br_crit_has_margin(BR_CRIT_UVLO));
    ss.drift = 5e-4; /* converged, yet drifting: not a periodic state */
    br_steady_figures(c, &ss, &f);
    br_verdict_make(c, NULL, &f, 1, &v);
    CU_ASSERT_TRUE(r->undetermined);
    CU_ASSERT_FALSE(r->pass);
    CU_ASSERT_PTR_NOT_NULL(strstr(r->note, "cross-check"));
    CU_ASSERT_TRUE(v.row[BR_CRIT_UVLO].undetermined);
    CU_ASSERT_EQUAL(v.nfail, 0);
    CU_ASSERT_FALSE(v.all_pass);
    br_chain_free(c);
    br_design_free(d);
}

/* A start-up written by hand: every driver started at 1 ms, each link
 * peaking at ipeak with i^2 integral i2t. */
static void fake_startup(const br_chain *c, double ipeak, double i2t, br_startup *su)
{
    memset(su, 0, sizeof *su);
    su->n = c->n;
    su->complete = 1;
    su->first_stalled = -1;
    su->t_total = su->t_simulated = 1e-3;
    for (int k = 0; k < c->n; k++) {
        su->st[k].first_enable = su->st[k].final_enable = 1e-3;
        su->st[k].running = 1;
        su->st[k].ipeak = k > 0 ? ipeak : 0.0;
        su->st[k].i2t = k > 0 ? i2t : 0.0;
    }
}

/* The checks of one link, by hand: a 4 A peak and 0.01 A^2 s against
 * IFRM 5 A (margin 1 A), IFSM 30 A (26 A) and I2t 0.04 A^2 s, which the
 * start-up would reach with every current doubled: sqrt(0.04 / 0.01) = 2,
 * a limit of 8 A (margin 4 A). */
static void test_inrush_checks(void)
{
    br_design *d = br_test_fcml(3, 600.0, 100e3, 0.5, 50e-9);
    d->diodes[0].ifrm = br_qty_fixed(5.0);
    d->diodes[0].ifsm = br_qty_fixed(30.0);
    d->diodes[0].i2t = br_qty_fixed(0.04);
    br_chain *c = chain_of(d);
    br_startup su;
    fake_startup(c, 4.0, 0.01, &su);
    br_inrush_check ck[BR_RATING_COUNT];
    int b = -1;
    CU_ASSERT_EQUAL_FATAL(br_inrush_link(c, &su, 1, ck, &b), 3);
    CU_ASSERT_EQUAL(ck[0].rating, BR_RATING_IFRM);
    BR_ASSERT_NEAR(ck[0].margin, 1.0, 1e-12);
    CU_ASSERT_EQUAL(ck[1].rating, BR_RATING_IFSM);
    BR_ASSERT_NEAR(ck[1].margin, 26.0, 1e-12);
    CU_ASSERT_EQUAL(ck[2].rating, BR_RATING_I2T);
    BR_ASSERT_NEAR(ck[2].limit, 8.0, 1e-12);
    CU_ASSERT_EQUAL(b, 0);
    CU_ASSERT_STRING_EQUAL(br_rating_name(ck[b].rating), "IFRM");
    /* a tighter I2t binds: 0.0025 A^2 s gives 4 A * sqrt(0.25) = 2 A */
    br_chain_free(c);
    d->diodes[0].i2t = br_qty_fixed(0.0025);
    c = chain_of(d);
    CU_ASSERT_EQUAL_FATAL(br_inrush_link(c, &su, 2, ck, &b), 3);
    CU_ASSERT_EQUAL(ck[b].rating, BR_RATING_I2T);
    BR_ASSERT_NEAR(ck[b].margin, -2.0, 1e-12);
    br_chain_free(c);
    br_design_free(d);
}

/* Start-up pulses repeat: a 12 A peak passes a 30 A surge rating (IFSM,
 * one pulse) but fails an 8 A repetitive rating (IFRM), and the verdict
 * says which rating it used.  With only IFSM given it says so. */
static void test_inrush_verdict(void)
{
    br_design *d = br_test_fcml(3, 600.0, 100e3, 0.5, 50e-9);
    d->diodes[0].ifsm = br_qty_fixed(30.0);
    d->diodes[0].ifrm = br_qty_fixed(8.0);
    br_chain *c = chain_of(d);
    br_steady ss;
    br_steady_figs f;
    solve(c, BR_DIRI_NONE, &ss, &f);
    br_startup su;
    fake_startup(c, 12.0, 1e-3, &su);
    br_verdict v;
    br_verdict_make(c, &su, &f, 1, &v);
    const br_verdict_row *r = &v.row[BR_CRIT_INRUSH];
    CU_ASSERT_TRUE(r->applies);
    CU_ASSERT_FALSE(r->pass);
    BR_ASSERT_NEAR(r->limit, 8.0, 1e-12);
    BR_ASSERT_NEAR(r->margin, -4.0, 1e-12);
    CU_ASSERT_PTR_NOT_NULL(strstr(r->note, "IFRM (every pulse)"));
    CU_ASSERT_PTR_NOT_NULL(strstr(r->note, "IFSM (the largest pulse)"));
    CU_ASSERT_PTR_NOT_NULL(strstr(r->note, "binds: IFRM of diode"));
    br_chain_free(c);
    d->diodes[0].ifrm = br_qty_fixed(0.0);
    c = chain_of(d);
    br_verdict_make(c, &su, &f, 1, &v);
    r = &v.row[BR_CRIT_INRUSH];
    CU_ASSERT_TRUE(r->pass);
    BR_ASSERT_NEAR(r->limit, 30.0, 1e-12);
    CU_ASSERT_PTR_NOT_NULL(strstr(r->note, "no IFRM given"));
    br_chain_free(c);
    br_design_free(d);
}

/* The I2t of a real cold start: by the Cauchy-Schwarz inequality the
 * integral of i^2 over the run is at least (integral of i)^2 / run time,
 * and the top link carries at least the charge its rail ends with
 * (C * V at the end, C at zero bias: the test part has no DC-bias table);
 * and it is at most the peak squared times the run time. */
static void test_startup_i2t(void)
{
    br_design *d = br_test_fcml(3, 600.0, 100e3, 0.5, 50e-9);
    br_chain *c = chain_of(d);
    br_startup su;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_startup_run(c, NULL, &su, &err), BR_OK);
    int k = c->n - 1;
    double q = c->st[k].cap.c * su.st[k].vend;
    CU_ASSERT_TRUE(su.st[k].i2t >= q * q / su.t_simulated);
    CU_ASSERT_TRUE(su.st[k].i2t <= su.st[k].ipeak * su.st[k].ipeak * su.t_simulated);
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
        {"verdict: a rail that never starts", test_verdict_never_starts},
        {"verdict: start-up dropouts", test_verdict_dropouts},
        {"verdict: the steady state is a status", test_steady_status},
        {"inrush checks of a link: IFRM, IFSM, I2t", test_inrush_checks},
        {"inrush verdict: repetitive rating, which rating", test_inrush_verdict},
        {"start-up I2t bounds", test_startup_i2t},
        {"an ideal clamp is a hard limit", test_ideal_clamp},
        {"verdict: an average outside its extremes", test_average_outside_extremes},
        {"the average-within check", test_avg_within},
        {"verdict: a failed simulation", test_verdict_failed_simulation},
        {NULL, NULL}};
    return br_test_main("analyses/figures", cases);
}

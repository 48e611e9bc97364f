/* test_engine_physics.c - the simulator against closed forms, against a
 * reference integration of the same equations, and its bookkeeping. */
#include "analyses/startup.h"
#include "analyses/steady.h"
#include "testdesign.h"
#include "testkit.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

/* A 2-switch string: switch 0 on for the first `frac` of the period, the
 * top switch never driven (its UVLO is out of reach). */
static br_design *one_link(double fsw, double frac)
{
    br_design *d = br_test_fcml(2, 400.0, fsw, 0.5, 0.0);
    d->topology = BR_TOPO_STRING;
    d->nswitch = 2;
    for (int s = 0; s < 2; s++) {
        snprintf(d->sw[s].name, sizeof d->sw[s].name, "S%d", s);
        d->sw[s].vblock = br_qty_fixed(400.0);
        d->sw[s].nwin = s == 0 ? 1 : 0;
        d->sw[s].on[0][0] = 0.0;
        d->sw[s].on[0][1] = frac;
    }
    d->tedge = br_qty_fixed(0.0);
    d->rsupply = br_qty_fixed(0.0);
    d->caps[0].esr = br_qty_fixed(0.0);
    return d;
}

/* RC charging V(t) = Vinf (1 - exp(-t/RC)) (circuit theory).  A diode with
 * a very large Is is a small linear resistance n Vt / Is at these
 * currents, so the link is R + n Vt/Is. */
static void test_rc_charging(void)
{
    br_design *d = one_link(1e3, 0.9);
    d->diodes[0].is = br_qty_fixed(10.0);
    d->diodes[0].n = br_qty_fixed(1.0);
    d->diodes[0].rs = br_qty_fixed(0.0);
    d->def.r_link = br_qty_fixed(100.0);
    d->drivers[0].uvlo_rise = br_qty_fixed(5.0);
    d->drivers[0].uvlo_fall = br_qty_fixed(4.0);
    d->drivers[0].iq_on = br_qty_fixed(0.0);
    d->drivers[0].iq_off = br_qty_fixed(0.0);
    d->switches[0].qg = br_qty_fixed(0.0);
    br_design *d2 = d;
    /* the top driver must never start: give stage 1 its own driver */
    br_driver_part *hi = &d2->drivers[d2->ndrivers++];
    *hi = d2->drivers[0];
    hi->uvlo_rise = br_qty_fixed(100.0);
    hi->uvlo_fall = br_qty_fixed(99.0);
    d2->has_override[1] = 1;
    d2->stage[1] = d2->def;
    d2->stage[1].driver = 1;
    br_chain *c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_sim *s;
    CU_ASSERT_EQUAL_FATAL(br_sim_create(c, BR_DIRI_NONE, BR_INTEG_FAST, &s, &err), BR_OK);
    double R = 100.0 + c->st[1].diode.n * c->st[1].diode.vt / c->st[1].diode.is;
    double RC = R * 1e-6, vc[BR_MAX_SWITCHES];
    const double ts[] = {20e-6, 50e-6, 100e-6, 300e-6, 800e-6};
    for (int i = 0; i < 5; i++) {
        CU_ASSERT_EQUAL(br_sim_run_until(s, ts[i], &err), BR_OK);
        br_sim_vc(s, vc);
        BR_ASSERT_NEAR(vc[1], 12.0 * (1.0 - exp(-ts[i] / RC)), 1e-5);
    }
    br_sim_free(s);
    br_chain_free(c);
    br_design_free(d);
}

/* A bypass capacitor on rail 0 charges through the supply resistance:
 * V(t) = Vs (1 - exp(-t / Rs C)) (circuit theory), on the closed-form
 * path (no link conducts, no load). */
static void test_bypass_charging(void)
{
    br_design *d = br_test_fcml(2, 400.0, 100e3, 0.5, 50e-9);
    d->csupply = br_qty_fixed(47e-6);
    d->rsupply = br_qty_fixed(0.5);
    d->drivers[0].uvlo_rise = br_qty_fixed(100.0);
    d->drivers[0].uvlo_fall = br_qty_fixed(99.0);
    d->drivers[0].iq_off = br_qty_fixed(0.0);
    br_chain *c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_sim *s;
    CU_ASSERT_EQUAL_FATAL(br_sim_create(c, BR_DIRI_NONE, BR_INTEG_FAST, &s, &err), BR_OK);
    double vc[BR_MAX_SWITCHES], tau = 0.5 * 47e-6;
    const double ts[] = {3e-6, 10e-6, 30e-6, 100e-6};
    for (int i = 0; i < 4; i++) {
        CU_ASSERT_EQUAL(br_sim_run_until(s, ts[i], &err), BR_OK);
        br_sim_vc(s, vc);
        BR_ASSERT_NEAR(vc[0], 12.0 * (1.0 - exp(-ts[i] / tau)), 1e-9);
    }
    br_sim_free(s);
    br_chain_free(c);
    br_design_free(d);
}

/* Outside its window a rail only feeds its driver: V falls by I t / C
 * (circuit theory), exactly, on the closed-form path. */
static void test_linear_discharge(void)
{
    br_design *d = br_test_fcml(2, 400.0, 10e3, 0.5, 100e-9);
    d->tedge = br_qty_fixed(0.0);
    d->switches[0].qg = br_qty_fixed(0.0);
    br_chain *c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_sim *s;
    CU_ASSERT_EQUAL_FATAL(br_sim_create(c, BR_DIRI_NONE, BR_INTEG_FAST, &s, &err), BR_OK);
    double vc0[BR_MAX_SWITCHES] = {0, 11.0}, vc[BR_MAX_SWITCHES];
    br_sim_reset_running(s, vc0);
    /* A1 is on during [0, DT): its driver runs, link 1 is blocked */
    CU_ASSERT_EQUAL(br_sim_run_until(s, 40e-6, &err), BR_OK);
    br_sim_vc(s, vc);
    BR_ASSERT_NEAR(vc[1], 11.0 - 2e-3 * 40e-6 / 1e-6, 1e-12);
    br_sim_free(s);
    br_chain_free(c);
    br_design_free(d);
}

/* The fast path (closed forms + Dormand-Prince) against GSL's rk8pd at a
 * 1e-10 tolerance on the same equations (GSL odeiv2 as the reference
 * library): every rail within 1 mV, through the single bootstrap's cold
 * start and over periods of the 4-level leg from its steady state.  (In a
 * start-up with hiccups the instants of the dropouts are sensitive to the
 * last digits, as the reference chains' own notes say, so rails are not
 * compared there sample by sample.) */
static void compare_paths(const br_chain *c, const double *x0, int periods)
{
    br_sim *f, *g;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_sim_create(c, BR_DIRI_NONE, BR_INTEG_FAST, &f, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_sim_create(c, BR_DIRI_NONE, BR_INTEG_REFERENCE, &g, &err), BR_OK);
    if (x0) {
        br_sim_reset_running_at(f, x0, 0.0);
        br_sim_reset_running_at(g, x0, 0.0);
    }
    double vf[BR_MAX_SWITCHES], vg[BR_MAX_SWITCHES];
    for (int p = 1; p <= periods; p++) {
        CU_ASSERT_EQUAL(br_sim_run_until(f, p * c->T, &err), BR_OK);
        CU_ASSERT_EQUAL(br_sim_run_until(g, p * c->T, &err), BR_OK);
        br_sim_vc(f, vf);
        br_sim_vc(g, vg);
        for (int k = 1; k < c->n; k++)
            BR_ASSERT_NEAR(vf[k], vg[k], 1e-3);
    }
    br_sim_free(f);
    br_sim_free(g);
}

static br_design *reference_case(const char *name)
{
    char path[1024];
    snprintf(path, sizeof path, "%s/%s", BR_REFERENCE_DIR, name);
    char *json = br_test_slurp(path, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(json);
    br_design *d = br_test_reference_design(json);
    free(json);
    return d;
}

static void test_fast_vs_gsl(void)
{
    br_design *d = reference_case("c1.json");
    br_chain *c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    compare_paths(c, NULL, 40);
    br_chain_free(c);
    br_design_free(d);
    d = reference_case("c2.json");
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_steady ss;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, BR_DIRI_NONE, NULL, &ss, &err), BR_OK);
    double x[2 * BR_MAX_SWITCHES];
    memcpy(x, ss.x, sizeof x);
    for (int k = 1; k < c->n; k++)
        x[k] -= 0.05 * k; /* off the steady state, so the rails move */
    compare_paths(c, x, 5);
    br_chain_free(c);
    br_design_free(d);
}

/* Stored charge much shorter-lived than a step is taken by exponential
 * quadrature on the fast path; rk8pd (GSL odeiv2, the reference library)
 * integrates dq/dt = i - q/tau directly at 1e-10.  With lifetimes 10 and 100
 * times shorter than the fast path's steps, every rail stays within 1 mV
 * and the recovery charge of every link within 0.5 % over a steady period. */
static void test_fast_vs_gsl_stored_charge(void)
{
    static const double taus[] = {25e-9, 150e-9};
    for (int t = 0; t < 2; t++) {
        br_design *d = reference_case("c2.json");
        for (int i = 0; i < d->ndiodes; i++)
            d->diodes[i].tau = br_qty_fixed(taus[t]);
        br_chain *c;
        br_error err;
        CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
        br_steady ss;
        CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, BR_DIRI_NONE, NULL, &ss, &err), BR_OK);
        br_sim *f, *g;
        CU_ASSERT_EQUAL_FATAL(br_sim_create(c, BR_DIRI_NONE, BR_INTEG_FAST, &f, &err), BR_OK);
        CU_ASSERT_EQUAL_FATAL(br_sim_create(c, BR_DIRI_NONE, BR_INTEG_REFERENCE, &g, &err), BR_OK);
        br_sim_reset_running_at(f, ss.x, ss.phase);
        br_sim_reset_running_at(g, ss.x, ss.phase);
        br_sim_stats_start(f);
        br_sim_stats_start(g);
        CU_ASSERT_EQUAL(br_sim_run_until(f, ss.phase + c->T, &err), BR_OK);
        CU_ASSERT_EQUAL(br_sim_run_until(g, ss.phase + c->T, &err), BR_OK);
        double vf[BR_MAX_SWITCHES], vg[BR_MAX_SWITCHES];
        br_sim_vc(f, vf);
        br_sim_vc(g, vg);
        const br_stats *sf = br_sim_stats(f), *sg = br_sim_stats(g);
        int recovered = 0;
        for (int k = 1; k < c->n; k++) {
            BR_ASSERT_NEAR(vf[k], vg[k], 1e-3);
            BR_ASSERT_NEAR(sf->link[k].qrr, sg->link[k].qrr, 0.005 * sg->link[k].qrr + 1e-12);
            recovered += sg->link[k].qrr > 1e-10;
        }
        CU_ASSERT_TRUE(recovered > 0); /* the stored charge matters here */
        br_sim_free(f);
        br_sim_free(g);
        br_chain_free(c);
        br_design_free(d);
    }
}

/* Charge conservation: over a steady period the supply delivers exactly
 * what the drivers consume (junction-capacitance charge only circulates). */
static void test_charge_conservation(void)
{
    br_design *d = br_test_fcml(5, 800.0, 150e3, 0.4, 40e-9);
    br_chain *c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_steady ss;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, BR_DIRI_NONE, NULL, &ss, &err), BR_OK);
    double used = 0.0;
    for (int k = 0; k < c->n; k++)
        used += ss.stats.rail[k].qload;
    BR_ASSERT_REL(ss.stats.qsupply, used, 1e-3);
    br_chain_free(c);
    br_design_free(d);
}

/* Shooting and a long plain simulation agree within 0.5 mV on every rail
 * (mean over one steady period). */
static void test_shooting_vs_plain(void)
{
    br_design *d = br_test_fcml(4, 400.0, 200e3, 0.5, 50e-9);
    d->caps[0].c = br_qty_fixed(0.47e-6); /* settles within a few hundred periods */
    br_chain *c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_steady ss;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, BR_DIRI_NONE, NULL, &ss, &err), BR_OK);
    CU_ASSERT_EQUAL(ss.method, BR_STEADY_SHOOTING);
    br_sim *s;
    CU_ASSERT_EQUAL_FATAL(br_sim_create(c, BR_DIRI_NONE, BR_INTEG_FAST, &s, &err), BR_OK);
    CU_ASSERT_EQUAL(br_sim_run_until(s, 1500 * c->T, &err), BR_OK);
    br_sim_stats_start(s);
    CU_ASSERT_EQUAL(br_sim_run_until(s, 1501 * c->T, &err), BR_OK);
    const br_stats *p = br_sim_stats(s);
    double dt = c->T;
    for (int k = 1; k < c->n; k++)
        BR_ASSERT_NEAR(ss.stats.rail[k].vint / dt, p->rail[k].vint / dt, 0.5e-3);
    br_sim_free(s);
    br_chain_free(c);
    br_design_free(d);
}

/* Single-bootstrap charge budget (International Rectifier design tip
 * DT98-2; Texas Instruments SLUA887): with a near-ideal diode and a long
 * window the rail droops by (Qg + Iq t_off) / C between refreshes, t_off
 * the time the link cannot charge (D T plus the two dead times). */
static void test_charge_budget(void)
{
    double fsw = 20e3, D = 0.3, td = 200e-9;
    br_design *d = br_test_fcml(2, 400.0, fsw, D, td);
    d->diodes[0].is = br_qty_fixed(1e-3);
    d->diodes[0].n = br_qty_fixed(1.0);
    d->diodes[0].rs = br_qty_fixed(0.0);
    d->def.r_link = br_qty_fixed(0.2);
    d->caps[0].c = br_qty_fixed(10e-6);
    d->caps[0].esr = br_qty_fixed(0.0);
    d->rsupply = br_qty_fixed(0.0);
    d->switches[0].qg = br_qty_fixed(50e-9);
    d->switches[0].tg = br_qty_fixed(10e-9);
    d->diodes[0].cj0 = br_qty_fixed(0.0);
    br_chain *c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_steady ss;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, BR_DIRI_NONE, NULL, &ss, &err), BR_OK);
    double budget = (50e-9 + 2e-3 * (D / fsw + 2 * td)) / 10e-6;
    const br_rail_stats *r = &ss.stats.rail[1];
    BR_ASSERT_REL(r->vmax - r->vmin, budget, 0.02);
    br_chain_free(c);
    br_design_free(d);
}

/* UVLO hysteresis holds in the simulation: the toggles of one driver
 * alternate and never come at the same instant (no numerical chatter). */
typedef struct toggles {
    double last_t[BR_MAX_SWITCHES];
    int last_state[BR_MAX_SWITCHES];
    int bad;
} toggles;

static void on_toggle(void *ctx, const br_uvlo_event *e)
{
    toggles *tg = ctx;
    if (e->enabled == tg->last_state[e->stage] || e->t - tg->last_t[e->stage] < 50e-9)
        tg->bad++;
    tg->last_t[e->stage] = e->t;
    tg->last_state[e->stage] = e->enabled;
}

static void test_no_chatter(void)
{
    char path[1024];
    snprintf(path, sizeof path, "%s/c2.json", BR_REFERENCE_DIR);
    char *json = br_test_slurp(path, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(json);
    br_design *d = br_test_reference_design(json);
    br_chain *c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    toggles tg;
    memset(&tg, 0, sizeof tg);
    for (int k = 0; k < BR_MAX_SWITCHES; k++)
        tg.last_t[k] = -1.0;
    br_sim_observer obs = {&tg, on_toggle, NULL};
    br_startup_opts o = {0, 0, &obs, NULL};
    br_startup su;
    CU_ASSERT_EQUAL(br_startup_run(c, &o, &su, &err), BR_OK);
    CU_ASSERT_EQUAL(tg.bad, 0);
    CU_ASSERT_TRUE(su.st[2].ndropouts > 0); /* the physical hiccups are there */
    br_chain_free(c);
    br_design_free(d);
    free(json);
}

/* A driver whose own load step across the ESR (50 mA x 1 ohm = 50 mV)
 * exceeds its UVLO hysteresis (10 mV) cannot settle at the instant its
 * rail crosses UVLO rising: enabling it pulls the rail node below UVLO
 * falling at once.  It is held off until the next edge and tries again
 * there, so at most four toggles fall on one instant
 * instead of piling up there; with thresholds just above where the loaded
 * rail settles this goes on period after period. */
typedef struct chatter {
    long n;         /* toggles */
    double t;       /* instant of the last one */
    int here, most; /* toggles at that instant; most at any one instant */
} chatter;

static void count_toggle(void *ctx, const br_uvlo_event *e)
{
    chatter *ch = ctx;
    ch->here = ch->n > 0 && e->t == ch->t ? ch->here + 1 : 1;
    ch->most = ch->here > ch->most ? ch->here : ch->most;
    ch->t = e->t;
    ch->n++;
}

static void test_chatter_held(void)
{
    br_design *d = br_test_fcml(2, 100.0, 20e3, 0.5, 50e-9);
    d->caps[0].esr = br_qty_fixed(1.0);
    d->drivers[0].iq_on = br_qty_fixed(50e-3);
    br_chain *c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_steady ss;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, BR_DIRI_NONE, NULL, &ss, &err), BR_OK);
    /* thresholds just above where the loaded rail settles: the driver
     * starts, its load pulls the node under UVLO falling, it stops, the
     * rail recovers past UVLO rising, and so on for good */
    double vrise = ss.stats.rail[1].vdrv_min + 0.02;
    c->st[1].drv.uvlo_rise = vrise;
    c->st[1].drv.uvlo_fall = vrise - 0.01;
    br_sim *s;
    CU_ASSERT_EQUAL_FATAL(br_sim_create(c, BR_DIRI_NONE, BR_INTEG_FAST, &s, &err), BR_OK);
    chatter ch = {0};
    br_sim_observer obs = {&ch, count_toggle, NULL};
    br_sim_set_observer(s, &obs);
    const int periods = 100;
    CU_ASSERT_EQUAL(br_sim_run_until(s, periods * c->T, &err), BR_OK);
    CU_ASSERT_TRUE(ch.n > periods); /* it chatters period after period */
    /* the crossing the integrator stops at, then on, off and held off:
     * no pile-up at one instant (without the hold: 9 here, 4n in general) */
    CU_ASSERT_TRUE(ch.most <= 4);
    /* its periodic state has the driver dropping out every period: plain
     * simulation finds it (or gives up after 20 periods in a row with a
     * driver toggling), and it does not hold */
    br_steady_opts o;
    br_steady_opts_default(&o);
    o.max_iter = 0;
    br_steady hic;
    CU_ASSERT_EQUAL(br_steady_solve(c, BR_DIRI_NONE, &o, &hic, &err), BR_OK);
    CU_ASSERT_FALSE(hic.holds);
    CU_ASSERT_TRUE(hic.periods < 40);
    br_sim_free(s);
    br_chain_free(c);
    br_design_free(d);
}

/* Charge-control recovery (Lauritzen & Ma 1991): with a stored-charge time
 * constant tau much shorter than the current's own decay, the charge
 * still stored when the return switch turns off is about tau times the
 * current then, and it is what returns down the chain each period.  The
 * current at turn-off is read from the reference integration, whose short
 * steps sample it densely (the fast path's steps may span the whole
 * conduction interval). */
typedef struct last_sample {
    double t_off, i;
} last_sample;

static void keep_before(void *ctx, const br_sim *s, double t, const double *vr, const double *il,
                        int n)
{
    last_sample *ls = ctx;
    (void)s;
    (void)vr;
    (void)n;
    if (t <= ls->t_off)
        ls->i = il[1];
}

static void test_recovery_charge(void)
{
    double fsw = 50e3, td = 100e-9, tau = 30e-9;
    br_design *d = br_test_fcml(2, 400.0, fsw, 0.5, td);
    d->diodes[0].tau = br_qty_fixed(tau);
    d->diodes[0].cj0 = br_qty_fixed(0.0);
    br_chain *c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_steady ss;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, BR_DIRI_NONE, NULL, &ss, &err), BR_OK);
    CU_ASSERT_TRUE(ss.stats.link[1].qrr > 0);
    br_sim *s;
    CU_ASSERT_EQUAL_FATAL(br_sim_create(c, BR_DIRI_NONE, BR_INTEG_REFERENCE, &s, &err), BR_OK);
    double T = 1.0 / fsw;
    last_sample ls = {fmod(T - td - ss.phase + T, T), 0.0};
    br_sim_observer obs = {&ls, NULL, keep_before};
    br_sim_set_observer(s, &obs);
    br_sim_reset_running_at(s, ss.x, ss.phase);
    CU_ASSERT_EQUAL(br_sim_run_until(s, T, &err), BR_OK);
    CU_ASSERT_TRUE(ls.i > 0);
    BR_ASSERT_REL(ss.stats.link[1].qrr, tau * ls.i, 0.1);
    br_sim_free(s);
    br_chain_free(c);
    br_design_free(d);
}

/* The sensitivity integrated with the variational equation is the
 * Jacobian of the period map: it agrees with finite differences of whole
 * simulated periods (central differences, 1 mV steps). */
static void test_sensitivity(void)
{
    br_design *d = reference_case("c2.json");
    br_chain *c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_steady ss;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, BR_DIRI_NONE, NULL, &ss, &err), BR_OK);
    br_sim *s;
    CU_ASSERT_EQUAL_FATAL(br_sim_create(c, BR_DIRI_NONE, BR_INTEG_FAST, &s, &err), BR_OK);
    int n = c->n;
    double phi[BR_MAX_SWITCHES * BR_MAX_SWITCHES], yp[2 * BR_MAX_SWITCHES], ym[2 * BR_MAX_SWITCHES];
    br_sim_set_variational(s, 1);
    br_sim_reset_running_at(s, ss.x, ss.phase);
    CU_ASSERT_EQUAL(br_sim_run_until(s, c->T, &err), BR_OK);
    br_sim_sensitivity(s, phi);
    br_sim_set_variational(s, 0);
    for (int j = 1; j < n; j++) {
        double x[2 * BR_MAX_SWITCHES], h = 1e-3;
        memcpy(x, ss.x, sizeof x);
        x[j] += h;
        br_sim_reset_running_at(s, x, ss.phase);
        br_sim_run_until(s, c->T, &err);
        br_sim_state(s, yp);
        x[j] -= 2 * h;
        br_sim_reset_running_at(s, x, ss.phase);
        br_sim_run_until(s, c->T, &err);
        br_sim_state(s, ym);
        for (int i = 1; i < n; i++)
            BR_ASSERT_NEAR(phi[i * n + j], (yp[i] - ym[i]) / (2 * h), 2e-3);
    }
    br_sim_free(s);
    br_chain_free(c);
    br_design_free(d);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"RC charging against the closed form", test_rc_charging},
        {"linear discharge I t / C", test_linear_discharge},
        {"bypass capacitor RC charging", test_bypass_charging},
        {"fast path against GSL rk8pd", test_fast_vs_gsl},
        {"stored charge: exponential quadrature against rk8pd", test_fast_vs_gsl_stored_charge},
        {"charge conservation", test_charge_conservation},
        {"shooting against plain simulation", test_shooting_vs_plain},
        {"single-bootstrap charge budget", test_charge_budget},
        {"UVLO without chatter, hiccups kept", test_no_chatter},
        {"a driver chattering against its ESR is held to the next edge", test_chatter_held},
        {"charge-control recovery charge", test_recovery_charge},
        {"period-map sensitivity against finite differences", test_sensitivity},
        {NULL, NULL}};
    return br_test_main("engine/physics", cases);
}

/* test_analyses_window.c - duty and frequency limits, hold-up time, the
 * start-up window and the hold map, on small hand-built chains. */
#include "analyses/map.h"
#include "analyses/window.h"
#include "testdesign.h"
#include "testkit.h"

#include <gsl/gsl_errno.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

/* Boltzmann constant over the elementary charge, V/K (CODATA 2018, exact
 * in the SI since 2019). */
#define K_OVER_Q (1.380649e-23 / 1.602176634e-19)

/* One link, B1 returning A1's rail, and a purely quiescent load: the
 * driver's 2 mA, no gate charge.  Test parts of testdesign.c: diode
 * Is 100 nA, n 1.5, Rs 0.5 ohm; link resistor 1 ohm; rail 1 uF with
 * 10 mohm ESR; UVLO falling 7 V; supply 12 V behind 0.2 ohm; 27 C. */
static br_design *one_link(void)
{
    br_design *d = br_test_fcml(2, 100.0, 2e3, 0.5, 10e-9);
    CU_ASSERT_PTR_NOT_NULL_FATAL(d);
    d->switches[0].qg = br_qty_fixed(0.0);
    return d;
}

/* A three-level leg (three links) with a minimum drive that gives limits
 * on both sides of the design point on both axes. */
static br_design *three_level(double min_drive)
{
    br_design *d = br_test_fcml(3, 600.0, 20e3, 0.5, 50e-9);
    CU_ASSERT_PTR_NOT_NULL_FATAL(d);
    d->min_drive = br_qty_fixed(min_drive);
    return d;
}

static void run_window(const br_design *d, int startup, br_window *w)
{
    br_window_opts o;
    br_window_opts_default(&o);
    o.startup = startup;
    br_error err;
    br_error_clear(&err);
    CU_ASSERT_EQUAL_FATAL(br_window_run(d, &o, w, &err), BR_OK);
}

/* ---- the closed form of the minimum frequency -------------------------- */

/* Circuit theory: between refreshes rail 1 carries only its constant load
 * I, so it falls linearly by I * T_off / C, T_off = D T + 2 td being the
 * time its return switch B1 is off.  At the end of the long charging
 * window the rail has settled where the diode carries just I:
 *   Vmax = Vs - Rsup (I + I0) - I (Rlink + Rs) - n Vt ln(1 + I / Is)
 * (Shockley; I0 the 2 mA of driver 0 on the supply rail), and the driver
 * sees the rail less I * ESR.  The limit is where the low point meets
 * UVLO falling:  C (Vmax - I ESR - Vfall) / I = D / f + 2 td. */
static void test_fmin_closed_form(void)
{
    br_design *d = one_link();
    br_window *w = malloc(sizeof *w);
    CU_ASSERT_PTR_NOT_NULL_FATAL(w);
    run_window(d, 0, w);
    const double I = 2e-3, I0 = 2e-3, C = 1e-6, D = 0.5, td = 10e-9;
    double vt = K_OVER_Q * 300.15;
    double vmax = 12.0 - 0.2 * (I + I0) - I * (1.0 + 0.5) - 1.5 * vt * log1p(I / 1e-7);
    double fmin = D / (C * (vmax - I * 0.01 - 7.0) / I - 2.0 * td);
    CU_ASSERT_EQUAL_FATAL(w->fsw.home, 0);
    const br_limit *lo = &w->fsw.span[0].lo;
    CU_ASSERT_EQUAL_FATAL(lo->kind, BR_LIMIT_FOUND);
    /* the limit lies between the last holding and the first failing
     * frequency found, which are within the stated 0.5 % of each other */
    CU_ASSERT_TRUE(lo->value / lo->outside - 1.0 <= BR_RES_FSW + 1e-12);
    CU_ASSERT_TRUE(fmin >= lo->outside * (1.0 - 1e-4) && fmin <= lo->value * (1.0 + 1e-4));
    BR_ASSERT_REL(lo->value, fmin, BR_RES_FSW);
    CU_ASSERT_EQUAL(lo->out.stage, 1);
    CU_ASSERT_EQUAL(lo->out.crit, BR_CRIT_UVLO);
    /* no gate charge: faster switching only refreshes the rail more often */
    CU_ASSERT_EQUAL(w->fsw.span[0].hi.kind, BR_LIMIT_RANGE_END);
    free(w);
    br_design_free(d);
}

/* The same chain along duty: B1 is off for D T + 2 td, at most one period
 * (0.5 ms at 2 kHz, a droop of 1 V against 4.6 V of room), so every duty
 * the dead time allows holds: "holds across the whole range". */
static void test_whole_range(void)
{
    br_design *d = one_link();
    br_window *w = malloc(sizeof *w);
    CU_ASSERT_PTR_NOT_NULL_FATAL(w);
    run_window(d, 0, w);
    CU_ASSERT_EQUAL_FATAL(w->duty.nspans, 1);
    CU_ASSERT_EQUAL(w->duty.span[0].lo.kind, BR_LIMIT_RANGE_END);
    CU_ASSERT_EQUAL(w->duty.span[0].hi.kind, BR_LIMIT_RANGE_END);
    BR_ASSERT_NEAR(w->duty.lo, BR_RES_DUTY, 1e-12);
    /* both on-times positive: D < 1 - 2 td f */
    BR_ASSERT_NEAR(w->duty.hi, 1.0 - 2.0 * 10e-9 * 2e3 - BR_RES_DUTY, 1e-12);
    CU_ASSERT_TRUE(w->design.holds);
    free(w);
    br_design_free(d);
}

/* ---- limits checked with the verdict's own solver -------------------- */

/* Does the real chain (drivers with their UVLO) hold at (duty, fsw)?
 * Every direction's steady state found and holding, and the UVLO, drive
 * and gate rows of the verdict passing. */
static int holds_at(const br_design *d0, double duty, double fsw)
{
    br_design *d = malloc(sizeof *d);
    CU_ASSERT_PTR_NOT_NULL_FATAL(d);
    memcpy(d, d0, sizeof *d);
    d->duty.nom = duty;
    d->fsw.nom = fsw;
    br_chain c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build_nominal(d, &c, &err), BR_OK);
    int dirs[2], nd = br_design_directions(&c, dirs), ok = 1;
    br_steady ss[2];
    br_steady_figs f[2];
    for (int i = 0; i < nd; i++) {
        CU_ASSERT_EQUAL_FATAL(br_steady_solve(&c, dirs[i], NULL, &ss[i], &err), BR_OK);
        br_steady_figures(&c, &ss[i], &f[i]);
    }
    br_verdict v;
    br_verdict_make(&c, NULL, f, nd, &v);
    ok = v.row[BR_CRIT_STEADY].pass;
    for (int crit = BR_CRIT_UVLO; crit <= BR_CRIT_GATE; crit++)
        ok = ok && (!v.row[crit].applies || v.row[crit].pass);
    free(d);
    return ok;
}

/* Half a resolution step further in than the last holding value, and
 * half a step further out than the first failing one: the crossing lies
 * between the two reported values, so the first must hold and the second
 * fail (the half step keeps both clear of the solver's last microvolts). */
static void check_limit(const br_design *d, const br_sweep *s, const br_limit *l, int upper)
{
    if (l->kind != BR_LIMIT_FOUND)
        return;
    double out = upper ? 1.0 : -1.0;
    double vin, vout;
    if (s->axis == BR_AXIS_DUTY) {
        vin = l->value - out * 0.5 * BR_RES_DUTY;
        vout = l->outside + out * 0.5 * BR_RES_DUTY;
        CU_ASSERT_TRUE(fabs(l->outside - l->value) <= BR_RES_DUTY + 1e-12);
        CU_ASSERT_TRUE(holds_at(d, vin, s->fixed));
        CU_ASSERT_FALSE(holds_at(d, vout, s->fixed));
    } else {
        vin = l->value * pow(1.0 + BR_RES_FSW, -0.5 * out);
        vout = l->outside * pow(1.0 + BR_RES_FSW, 0.5 * out);
        CU_ASSERT_TRUE(fabs(log(l->outside / l->value)) <= log1p(BR_RES_FSW) + 1e-12);
        CU_ASSERT_TRUE(holds_at(d, s->fixed, vin));
        CU_ASSERT_FALSE(holds_at(d, s->fixed, vout));
    }
}

static void check_sweep(const br_design *d, const br_sweep *s, int nspans)
{
    CU_ASSERT_EQUAL_FATAL(s->nspans, nspans);
    for (int i = 0; i < s->nspans; i++) {
        check_limit(d, s, &s->span[i].lo, 0);
        check_limit(d, s, &s->span[i].hi, 1);
    }
}

/* A minimum drive of 10.3 V leaves the top rail little room: duty and
 * frequency limits on both sides, all bound by the top rail's drive. */
static void test_limits_inside_outside(void)
{
    br_design *d = three_level(10.3);
    br_window *w = malloc(sizeof *w);
    CU_ASSERT_PTR_NOT_NULL_FATAL(w);
    run_window(d, 0, w);
    CU_ASSERT_TRUE(w->design.holds);
    CU_ASSERT_EQUAL(w->duty.home, 0);
    CU_ASSERT_EQUAL(w->fsw.home, 0);
    check_sweep(d, &w->duty, 1);
    check_sweep(d, &w->fsw, 1);
    for (int axis = 0; axis < 2; axis++) {
        const br_span *sp = &(axis ? &w->fsw : &w->duty)->span[0];
        CU_ASSERT_EQUAL(sp->lo.kind, BR_LIMIT_FOUND);
        CU_ASSERT_EQUAL(sp->hi.kind, BR_LIMIT_FOUND);
        CU_ASSERT_EQUAL(sp->lo.out.stage, 3);
        CU_ASSERT_EQUAL(sp->lo.out.crit, BR_CRIT_DRIVE);
    }
    free(w);
    br_design_free(d);
}

/* With 10.5 V the design point itself fails but a band of lower duty
 * holds: the report must say so rather than invent limits around the
 * design point; with 11 V nothing holds anywhere. */
static void test_design_fails_and_never(void)
{
    br_design *d = three_level(10.5);
    br_window *w = malloc(sizeof *w);
    CU_ASSERT_PTR_NOT_NULL_FATAL(w);
    run_window(d, 0, w);
    CU_ASSERT_FALSE(w->design.holds);
    CU_ASSERT_TRUE(w->design.margin < 0);
    CU_ASSERT_EQUAL(w->duty.home, -1);
    check_sweep(d, &w->duty, 1);
    CU_ASSERT_TRUE(w->duty.span[0].hi.value < 0.5);
    br_design_free(d);
    d = three_level(11.0);
    run_window(d, 0, w);
    CU_ASSERT_EQUAL(w->duty.nspans, 0);
    CU_ASSERT_EQUAL(w->fsw.nspans, 0);
    CU_ASSERT_EQUAL(w->duty.home, -1);
    free(w);
    br_design_free(d);
}

/* ---- hold-up ------------------------------------------------------------ */

/* Circuit theory: with every switch off the rail only feeds its driver,
 * a constant 2 mA, so it falls linearly, dV/dt = -I/C, from the capacitor
 * voltage at the stop to UVLO falling (7 V) plus the ESR drop:
 *   t = C (Vc0 - I ESR - 7 V) / I. */
static void test_holdup_closed_form(void)
{
    br_design *d = one_link();
    br_window *w = malloc(sizeof *w);
    CU_ASSERT_PTR_NOT_NULL_FATAL(w);
    run_window(d, 0, w);
    CU_ASSERT_EQUAL_FATAL(w->nholdup, 1);
    const br_holdup *h = &w->holdup[0];
    CU_ASSERT_TRUE_FATAL(h->dropped);
    CU_ASSERT_EQUAL(h->stage, 1);
    double t = 1e-6 * (h->vc0[1] - 2e-3 * 0.01 - 7.0) / 2e-3;
    BR_ASSERT_REL(h->t, t, 1e-4);
    BR_ASSERT_NEAR(h->v_at, 7.0, 1e-6);
    /* the rail starts near its steady level, well above UVLO */
    CU_ASSERT_TRUE(h->vc0[1] > 11.0);
    free(w);
    br_design_free(d);
}

/* A rail with no load at all never drops: reported as such, with the
 * time that was simulated. */
static void test_holdup_none(void)
{
    br_design *d = one_link();
    d->drivers[0].iq_on = br_qty_fixed(0.0);
    br_chain *c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_steady ss;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, BR_DIRI_NONE, NULL, &ss, &err), BR_OK);
    br_holdup h;
    CU_ASSERT_EQUAL_FATAL(br_holdup_run(c, &ss, 0, 1e-3, &h, &err), BR_OK);
    CU_ASSERT_FALSE(h.dropped);
    CU_ASSERT_EQUAL(h.stage, -1);
    BR_ASSERT_NEAR(h.t_max, 1e-3, 1e-15);
    br_chain_free(c);
    br_design_free(d);
}

/* A stop that holds the return switch B1 on (the design's hold-on) leaves
 * link 1 conducting: rail 1 keeps being recharged from the supply and
 * outlasts ten times the hold-up of the stop with every switch off. */
static void test_holdup_named_state(void)
{
    br_design *d = one_link();
    br_chain *c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_steady ss;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, BR_DIRI_NONE, NULL, &ss, &err), BR_OK);
    br_holdup off, held;
    CU_ASSERT_EQUAL_FATAL(br_holdup_run(c, &ss, 0, 0.0, &off, &err), BR_OK);
    CU_ASSERT_TRUE_FATAL(off.dropped);
    CU_ASSERT_STRING_EQUAL(c->st[0].name, "B1");
    CU_ASSERT_EQUAL_FATAL(br_holdup_run(c, &ss, 1ULL << 0, 10.0 * off.t, &held, &err), BR_OK);
    CU_ASSERT_FALSE(held.dropped);
    CU_ASSERT_EQUAL(held.hold_on, 1ULL << 0);
    /* the window analysis uses the design's hold-on */
    d->hold_on = 1ULL << 0;
    br_window *w = malloc(sizeof *w);
    CU_ASSERT_PTR_NOT_NULL_FATAL(w);
    run_window(d, 0, w);
    CU_ASSERT_EQUAL(w->holdup[0].hold_on, 1ULL << 0);
    CU_ASSERT_FALSE(w->holdup[0].dropped);
    free(w);
    br_chain_free(c);
    br_design_free(d);
}

/* ---- start-up window ---------------------------------------------------- */

static int starts_at(const br_design *d0, double duty, double fsw)
{
    br_design *d = malloc(sizeof *d);
    CU_ASSERT_PTR_NOT_NULL_FATAL(d);
    memcpy(d, d0, sizeof *d);
    d->duty.nom = duty;
    d->fsw.nom = fsw;
    br_chain c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build_nominal(d, &c, &err), BR_OK);
    br_startup su;
    CU_ASSERT_EQUAL_FATAL(br_startup_run(&c, NULL, &su, &err), BR_OK);
    free(d);
    return su.complete && su.t_total <= c.startup_max;
}

/* The lowest frequency found starts, the value below it does not, the two
 * within the resolution; and start-up takes longer toward the limit. */
static void test_startup_window(void)
{
    br_design *d = three_level(10.3);
    br_window *w = malloc(sizeof *w);
    CU_ASSERT_PTR_NOT_NULL_FATAL(w);
    run_window(d, 1, w);
    const br_su_window *s = &w->su_fsw;
    CU_ASSERT_TRUE_FATAL(s->design_starts);
    CU_ASSERT_EQUAL_FATAL(s->low.kind, BR_LIMIT_FOUND);
    CU_ASSERT_TRUE(s->low.value / s->low.failing - 1.0 <= BR_RES_FSW + 1e-12);
    CU_ASSERT_TRUE(starts_at(d, 0.5, s->low.value));
    CU_ASSERT_FALSE(starts_at(d, 0.5, s->low.failing));
    /* the runs come sorted; the design point is one of them, and start-up
     * takes longer toward the limit */
    const br_su_point *at = NULL;
    double t_lowest = -1.0;
    for (int i = 0; i < s->npts; i++) {
        if (i > 0)
            CU_ASSERT_TRUE(s->pt[i].value > s->pt[i - 1].value);
        if (s->pt[i].value == s->low.value)
            t_lowest = s->pt[i].t_total;
        if (fabs(s->pt[i].value / 20e3 - 1.0) < 1e-12)
            at = &s->pt[i];
    }
    CU_ASSERT_PTR_NOT_NULL_FATAL(at);
    CU_ASSERT_TRUE(at->complete && t_lowest > at->t_total);
    /* the top end: with no gate-charge limit in reach, the range end */
    CU_ASSERT_EQUAL(s->high.kind, BR_LIMIT_RANGE_END);
    BR_ASSERT_REL(s->high.value, s->hi, 1e-12);
    CU_ASSERT_TRUE(s->hi > 20e3);
    CU_ASSERT_TRUE(w->su_duty.design_starts);
    free(w);
    br_design_free(d);
}

/* A high duty starves the charging windows of the bottom switches (each
 * about (1 - D) T, common practice), through which every rail above them
 * is charged: the start-up window has a highest duty too.  The highest
 * duty found starts, the value above it does not, the two within the
 * resolution, and the report names the rail that never starts there. */
static void test_startup_window_high_duty(void)
{
    br_design *d = three_level(10.3);
    br_window *w = malloc(sizeof *w);
    CU_ASSERT_PTR_NOT_NULL_FATAL(w);
    run_window(d, 1, w);
    const br_su_window *s = &w->su_duty;
    CU_ASSERT_TRUE_FATAL(s->design_starts);
    /* some cold start above the design duty, and one of them fails */
    int above = 0, above_fails = 0;
    for (int i = 0; i < s->npts; i++) {
        above += s->pt[i].value > 0.5;
        above_fails += s->pt[i].value > 0.5 && !s->pt[i].complete;
    }
    CU_ASSERT_TRUE(above >= 5 && above_fails >= 1);
    CU_ASSERT_EQUAL_FATAL(s->high.kind, BR_LIMIT_FOUND);
    CU_ASSERT_TRUE(s->high.value > 0.5 && s->high.value < s->high.failing);
    CU_ASSERT_TRUE(s->high.failing - s->high.value <= BR_RES_DUTY + 1e-12);
    CU_ASSERT_TRUE(starts_at(d, s->high.value, 20e3));
    CU_ASSERT_FALSE(starts_at(d, s->high.failing, 20e3));
    CU_ASSERT_TRUE(s->high.stalled > 0 && s->high.stalled < 4);
    BR_ASSERT_REL(s->hi, w->duty.hi, 1e-12);
    /* the bottom end is searched as before, down to the range's end */
    CU_ASSERT_TRUE(s->low.value < 0.5);
    free(w);
    br_design_free(d);
}

/* ---- the map -------------------------------------------------------------- */

static br_map *run_map(const br_design *d, int threads)
{
    /* 9 x 9 through the design point: duty 0.5 is column 4, 20 kHz row 4 */
    br_map_opts o = {0.1, 0.9, 9, 500.0, 800e3, 9, threads, NULL, 0, 0, NULL};
    br_map *m;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_map_run(d, &o, &m, &err), BR_OK);
    return m;
}

/* Where a grid point is clear of a limit by more than the resolution, the
 * map and the window must agree on whether it holds. */
static void expect(const br_hold_point *pt, double v, const br_span *sp, double res, int logscale)
{
    double lo = logscale ? log(sp->lo.value) : sp->lo.value;
    double hi = logscale ? log(sp->hi.value) : sp->hi.value;
    double x = logscale ? log(v) : v;
    if (x > lo + res && x < hi - res)
        CU_ASSERT_TRUE(pt->holds);
    if (x < lo - 2 * res || x > hi + 2 * res)
        CU_ASSERT_FALSE(pt->holds);
}

static void test_map_agrees_with_window(void)
{
    br_design *d = three_level(10.3);
    br_window *w = malloc(sizeof *w);
    CU_ASSERT_PTR_NOT_NULL_FATAL(w);
    run_window(d, 0, w);
    br_map *m = run_map(d, 2);
    CU_ASSERT_EQUAL_FATAL(m->col0, 4);
    CU_ASSERT_EQUAL_FATAL(m->row0, 4);
    BR_ASSERT_REL(m->fsw[m->row0], 20e3, 1e-12);
    int holds = 0, fails = 0;
    for (int i = 0; i < m->nduty; i++) {
        const br_hold_point *pt = br_map_at(m, i, m->row0);
        expect(pt, m->duty[i], &w->duty.span[0], BR_RES_DUTY, 0);
        holds += pt->holds;
        fails += !pt->holds;
    }
    for (int j = 0; j < m->nfsw; j++) {
        const br_hold_point *pt = br_map_at(m, m->col0, j);
        expect(pt, m->fsw[j], &w->fsw.span[0], log1p(BR_RES_FSW), 1);
        holds += pt->holds;
        fails += !pt->holds;
    }
    /* the lines cross limits: both kinds of points are there */
    CU_ASSERT_TRUE(holds > 4 && fails > 2);
    CU_ASSERT_EQUAL(m->design.holds, w->design.holds);
    BR_ASSERT_NEAR(m->design.margin, w->design.margin, 1e-3);
    br_map_free(m);
    free(w);
    br_design_free(d);
}

/* Rows are seeded the same way whichever thread takes them: one thread
 * and three give the same numbers, bit for bit. */
static void test_map_threads(void)
{
    br_design *d = three_level(10.3);
    br_map *a = run_map(d, 1), *b = run_map(d, 3);
    int same = 1;
    for (int k = 0; k < a->nduty * a->nfsw; k++) {
        const br_hold_point *p = &a->pt[k], *q = &b->pt[k];
        same = same && p->holds == q->holds && p->stage == q->stage && p->crit == q->crit &&
               (memcmp(&p->margin, &q->margin, sizeof p->margin) == 0);
    }
    CU_ASSERT_TRUE(same);
    CU_ASSERT_EQUAL(a->periods, b->periods);
    CU_ASSERT_EQUAL(b->threads, 3);
    br_map_free(a);
    br_map_free(b);
    br_design_free(d);
}

/* The window sweeps its two axes side by side; run one after the other
 * they give the same limits, bit for bit. */
static void test_window_threads(void)
{
    br_design *d = three_level(10.3);
    br_window *a = malloc(sizeof *a), *b = malloc(sizeof *b);
    CU_ASSERT_PTR_NOT_NULL_FATAL(a);
    CU_ASSERT_PTR_NOT_NULL_FATAL(b);
    br_window_opts o;
    br_window_opts_default(&o);
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_window_run(d, &o, a, &err), BR_OK);
    o.threads = 1;
    CU_ASSERT_EQUAL_FATAL(br_window_run(d, &o, b, &err), BR_OK);
    const br_sweep *sa[2] = {&a->duty, &a->fsw}, *sb[2] = {&b->duty, &b->fsw};
    for (int k = 0; k < 2; k++) {
        CU_ASSERT_EQUAL_FATAL(sa[k]->nspans, sb[k]->nspans);
        CU_ASSERT_EQUAL(sa[k]->evals, sb[k]->evals);
        for (int i = 0; i < sa[k]->nspans; i++) {
            CU_ASSERT_TRUE(
                memcmp(&sa[k]->span[i].lo.value, &sb[k]->span[i].lo.value, sizeof(double)) == 0);
            CU_ASSERT_TRUE(
                memcmp(&sa[k]->span[i].hi.value, &sb[k]->span[i].hi.value, sizeof(double)) == 0);
        }
    }
    free(a);
    free(b);
    br_design_free(d);
}

/* Grid points where the dead time leaves no on-time are marked, not
 * simulated: D >= 1 - 2 td f, with td = 50 ns at 800 kHz: D >= 0.92. */
static void test_map_no_ontime(void)
{
    br_design *d = three_level(0.0);
    br_map_opts o = {0.5, 0.95, 2, 20e3, 800e3, 2, 1, NULL, 0, 0, NULL};
    br_map *m;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_map_run(d, &o, &m, &err), BR_OK);
    CU_ASSERT_EQUAL(br_map_at(m, 1, 1)->crit, BR_MAP_NO_ONTIME);
    CU_ASSERT_FALSE(br_map_at(m, 1, 1)->holds);
    CU_ASSERT_TRUE(isnan(br_map_at(m, 1, 1)->margin));
    CU_ASSERT_TRUE(br_map_at(m, 0, 0)->holds);
    CU_ASSERT_TRUE(br_map_at(m, 1, 0)->crit != BR_MAP_NO_ONTIME);
    br_map_free(m);
    br_design_free(d);
}

/* ---- bad input ------------------------------------------------------------ */

static void test_bad_options(void)
{
    br_error err;
    br_map_opts o = {0.1, 0.9, 0, 1e3, 1e4, 3, 2, NULL, 0, 0, NULL};
    CU_ASSERT_EQUAL(br_map_opts_check(&o, &err), BR_EINPUT);
    o.nduty = 3;
    o.duty_to = 1.2;
    CU_ASSERT_EQUAL(br_map_opts_check(&o, &err), BR_EINPUT);
    CU_ASSERT_STRING_EQUAL(err.field, "duty");
    o.duty_to = 0.9;
    o.fsw_from = 2e4;
    CU_ASSERT_EQUAL(br_map_opts_check(&o, &err), BR_EINPUT);
    CU_ASSERT_STRING_EQUAL(err.field, "freq");
    o.fsw_from = 1e3;
    o.threads = 0;
    CU_ASSERT_EQUAL(br_map_opts_check(&o, &err), BR_EINPUT);
    o.threads = 2;
    CU_ASSERT_EQUAL(br_map_opts_check(&o, &err), BR_OK);
    /* a frequency range that leaves out the design point */
    br_design *d = one_link();
    br_window_opts wo;
    br_window_opts_default(&wo);
    wo.fmin = 5e3;
    br_window *w = malloc(sizeof *w);
    CU_ASSERT_PTR_NOT_NULL_FATAL(w);
    /* a fault of the options, not of the design */
    CU_ASSERT_EQUAL(br_window_run(d, &wo, w, &err), BR_EUSAGE);
    CU_ASSERT_TRUE(strstr(err.msg, "fmin < fsw < fmax") != NULL);
    free(w);
    br_design_free(d);
}

int main(void)
{
    /* as in bootrung's main(): the library checks every GSL status */
    gsl_set_error_handler_off();
    static const br_test_case cases[] = {
        {"minimum frequency against the droop closed form", test_fmin_closed_form},
        {"holds across the whole duty range", test_whole_range},
        {"just inside each limit holds, just outside fails", test_limits_inside_outside},
        {"design point fails; never holds", test_design_fails_and_never},
        {"hold-up time against C dV / I", test_holdup_closed_form},
        {"hold-up without a load", test_holdup_none},
        {"hold-up with the design's hold-on state", test_holdup_named_state},
        {"start-up window", test_startup_window},
        {"start-up window: the highest duty", test_startup_window_high_duty},
        {"map agrees with window through the design point", test_map_agrees_with_window},
        {"map independent of the thread count", test_map_threads},
        {"window independent of the thread count", test_window_threads},
        {"map marks points without on-time", test_map_no_ontime},
        {"bad options", test_bad_options},
        {NULL, NULL},
    };
    return br_test_main("analyses_window", cases);
}

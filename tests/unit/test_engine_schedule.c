/* test_engine_schedule.c - the events of a period as the simulator walks
 * them: on-intervals that cross the period end, and a running state taken
 * at a phase after every event of the period, where the next event is the
 * first of the next period. */
#include "analyses/figures.h"
#include "analyses/steady.h"
#include "testdesign.h"
#include "testkit.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

/* A half-bridge as an explicit string (invented values): the low switch
 * on from 0.55 to 0.05 of the period, across the period end, and in
 * reverse from 0.5 to 0.55 (the dead time before it turns on); the high
 * switch on from 0.05 to 0.5.  With split = 1 the low window is written
 * as two, 0.55 to 1 and 0 to 0.05: the same switching. */
static br_design *half_bridge(int split)
{
    br_design *d = br_test_fcml(2, 400.0, 100e3, 0.5, 0.0);
    d->topology = BR_TOPO_STRING;
    d->nswitch = 2;
    d->direction = BR_DIR_STEP_DOWN;
    d->vsupply = br_qty_fixed(15.0);
    d->tedge = br_qty_fixed(10e-9);
    br_switch_spec *lo = &d->sw[0], *hi = &d->sw[1];
    snprintf(lo->name, sizeof lo->name, "lo");
    snprintf(hi->name, sizeof hi->name, "hi");
    lo->vblock = hi->vblock = br_qty_fixed(200.0);
    lo->nwin = split ? 2 : 1;
    lo->on[0][0] = 0.55;
    lo->on[0][1] = split ? 1.0 : 0.05;
    lo->on[1][0] = 0.0;
    lo->on[1][1] = 0.05;
    lo->nrev = 1;
    lo->rev[0][0] = 0.5;
    lo->rev[0][1] = 0.55;
    hi->nwin = 1;
    hi->on[0][0] = 0.05;
    hi->on[0][1] = 0.5;
    return d;
}

/* Every rail's average lies between its minimum and maximum. */
static void averages_inside(const br_steady_figs *f)
{
    for (int k = 0; k < f->n; k++) {
        const br_rail_fig *r = &f->rail[k];
        if (!br_avg_within(r->vavg, r->vmin, r->vmax))
            fprintf(stderr, "\nrail %d: min %.6g max %.6g avg %.6g\n", k, r->vmin, r->vmax,
                    r->vavg);
        CU_ASSERT_TRUE(br_avg_within(r->vavg, r->vmin, r->vmax));
    }
    CU_ASSERT_EQUAL(f->bad_rail, -1);
}

/* The steady state of the wrapping window converges, charges the high
 * rail through the link, and is the steady state of the same switching
 * written without a wrap.  The wrapping chain's quiet phase lies after its
 * last event, which once left the simulator reading past the events (a
 * rail averaging 21 V between 11.84 V and 11.87 V, a link that never
 * conducted). */
static void test_wrapping_window(void)
{
    br_steady ss[2];
    br_steady_figs f[2];
    br_error err;
    for (int split = 0; split < 2; split++) {
        br_design *d = half_bridge(split);
        br_chain *c;
        CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
        CU_ASSERT_EQUAL(br_steady_solve(c, BR_DIRI_DOWN, NULL, &ss[split], &err), BR_OK);
        br_steady_figures(c, &ss[split], &f[split]);
        CU_ASSERT_TRUE(ss[split].converged);
        CU_ASSERT_TRUE(ss[split].holds);
        averages_inside(&f[split]);
        /* the link carries the high driver's supply, about 2 mA (its
         * running current plus the gate charge at 100 kHz, 1 nC / 10 us) */
        CU_ASSERT_TRUE(f[split].link[1].iavg > 1e-3);
        br_chain_free(c);
        br_design_free(d);
    }
    BR_ASSERT_NEAR(f[0].rail[1].vavg, f[1].rail[1].vavg, 1e-3);
    BR_ASSERT_NEAR(f[0].rail[1].vmin, f[1].rail[1].vmin, 1e-3);
}

typedef struct first_off {
    double t; /* first sample with the low switch blocking, s (-1: none) */
} first_off;

static void on_sample(void *ctx, const br_sim *s, double t, const double *vr, const double *il,
                      int n)
{
    (void)vr;
    (void)il;
    (void)n;
    first_off *w = ctx;
    if (w->t < 0 && s && br_sim_switch_v(s, 0, t) > 1.0)
        w->t = t;
}

/* From a phase after every event (0.9 T: the low switch on, its window
 * wrapping), the next event is the low switch turning off at 0.05 T of the
 * next period, 0.15 T on: not at once (a zeroed slot past the events was
 * taken as "switch 0 off now") and the run stays within the period's
 * events. */
static void test_phase_after_every_event(void)
{
    br_design *d = half_bridge(0);
    br_chain *c;
    br_sim *s;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_sim_create(c, BR_DIRI_DOWN, BR_INTEG_FAST, &s, &err), BR_OK);
    first_off w = {-1.0};
    br_sim_observer obs = {&w, NULL, on_sample};
    br_sim_set_observer(s, &obs);
    double x[2 * BR_MAX_SWITCHES] = {0};
    x[1] = 14.0;
    br_sim_reset_running_at(s, x, 0.9 * c->T);
    CU_ASSERT_EQUAL(br_sim_run_until(s, c->T, &err), BR_OK);
    /* off once its edge has begun: between 0.15 T and one edge time on */
    CU_ASSERT_TRUE(w.t >= 0.15 * c->T - 1e-12);
    CU_ASSERT_TRUE(w.t <= 0.15 * c->T + c->tedge + 1e-12);
    br_sim_free(s);
    br_chain_free(c);
    br_design_free(d);
}

/* The half-bridge leg of the design-file guide with no dead time and a
 * duty of 0.2: the longest quiet stretch (the bottom switch's 0.8 T) puts
 * the quiet phase after every event of the period.  It converges, passes
 * every steady criterion and its averages lie within its extremes. */
static void test_half_bridge_short_duty(void)
{
    br_design *d = br_test_fcml(2, 400.0, 200e3, 0.2, 0.0);
    d->direction = BR_DIR_BOTH;
    br_chain *c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_timing tm;
    br_timing_build(c, BR_DIRI_DOWN, &tm);
    CU_ASSERT_TRUE(br_steady_quiet_phase(c, &tm) > tm.ev[tm.nev - 1].t); /* the case meant */
    br_steady ss[2];
    br_steady_figs f[2];
    int dirs[2], nd = br_design_directions(c, dirs);
    for (int i = 0; i < nd; i++) {
        CU_ASSERT_EQUAL(br_steady_solve(c, dirs[i], NULL, &ss[i], &err), BR_OK);
        CU_ASSERT_TRUE(ss[i].converged);
        br_steady_figures(c, &ss[i], &f[i]);
        averages_inside(&f[i]);
    }
    br_verdict v;
    br_verdict_make(c, NULL, f, nd, &v);
    CU_ASSERT_TRUE(v.row[BR_CRIT_STEADY].pass);
    CU_ASSERT_TRUE(v.row[BR_CRIT_UVLO].pass);
    CU_ASSERT_EQUAL(v.nundetermined, 0);
    br_chain_free(c);
    br_design_free(d);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"an on-window across the period end", test_wrapping_window},
        {"from a phase after every event", test_phase_after_every_event},
        {"half-bridge, duty 0.2, no dead time", test_half_bridge_short_duty},
        {NULL, NULL}};
    return br_test_main("engine/schedule", cases);
}

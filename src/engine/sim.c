/* sim.c - the simulator's event loop: schedule, switch voltages, UVLO,
 * closed-form intervals and bookkeeping. */
#include "engine/sim_impl.h"

#include "core/error.h"
#include "engine/diode.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

int br_sim_create(const br_chain *c, int dir, int integrator, br_sim **out, br_error *err)
{
    *out = NULL;
    br_sim *s = calloc(1, sizeof *s);
    if (!s)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory for the simulator");
    s->c = c;
    s->n = c->n;
    for (int k = 1; k < c->n; k++) /* the hot loops read a mask, not the stages */
        s->injm |= (br_mask)(c->st[k].inject != 0) << k;
    for (int k = 1; k < c->n; k++)
        s->injlimm |= (br_mask)(c->st[k].inject && c->st[k].inj_lim.mode != BR_SUPPLY_UNLIMITED)
                      << k;
    s->nx = s->phi0 = c->n * NF;
    s->bypass = c->csupply > 0 && c->rsupply > 0;
    br_sim_cache_esr(s);
    for (int k = 1; k < s->n; k++) {
        s->stored |= c->st[k].diode.tau > 0;
        s->zeners |= c->st[k].aux.kind == BR_AUX_ZENER;
    }
    s->dir = s->dir0 = dir;
    s->ac = c->line.on;
    s->ac_hold = -1;
    s->integ = integrator;
    br_timing_build(c, dir, &s->tm);
    if (integrator == BR_INTEG_REFERENCE) {
        s->gsl_step = br_sim_gsl_alloc(s->nx);
        if (!s->gsl_step) {
            free(s);
            return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory for GSL");
        }
        br_sim_set_tolerance(s, 1e-10, 1e-10);
    } else {
        br_sim_set_tolerance(s, 1e-6, 1e-6);
    }
    br_sim_reset_cold(s);
    *out = s;
    return BR_OK;
}

void br_sim_free(br_sim *s)
{
    if (!s)
        return;
    br_sim_gsl_free(s->gsl_step);
    free(s);
}

void br_sim_set_tolerance(br_sim *s, double rtol, double atol_v)
{
    s->rtol = rtol;
    s->atol_v = atol_v;
    s->atol_q = atol_v * 1e-8; /* stored charges are ~1e-8 of the rail volts */
}

void br_sim_set_variational(br_sim *s, int on)
{
    s->var = on && s->integ != BR_INTEG_REFERENCE;
    s->nx = s->phi0 + (s->var ? s->n * s->n : 0);
    br_sim_live_rebuild(s);
}

/* Is entry f of stage k advanced by the Runge-Kutta steps?  Quadratures
 * are only read as differences from br_sim_stats_start on, so they need
 * advancing only while statistics are kept.  A state whose derivative is
 * always zero stays as it is without: the supply's capacitor voltage
 * without a bypass capacitor, and the stored charge of a link without
 * any (and of link 0, which does not exist). */
static int live_entry(const br_sim *s, int k, int f)
{
    if (f == F_VC)
        return k > 0 || br_sim_bypass(s);
    if (f == F_Q)
        return k > 0 && s->c->st[k].diode.tau > 0;
    return s->stats_on && br_sim_quad_kept(s, k, f);
}

void br_sim_live_rebuild(br_sim *s)
{
    s->nlive = 0;
    for (int k = 0; k < s->n; k++)
        for (int f = 0; f < NF; f++)
            if (live_entry(s, k, f))
                s->live[s->nlive++] = XI(k, f);
    for (int i = s->phi0; i < s->nx; i++)
        s->live[s->nlive++] = i;
}

void br_sim_sensitivity(const br_sim *s, double *phi)
{
    for (int i = 0; i < s->n * s->n; i++)
        phi[i] = s->var ? s->x[s->phi0 + i] : (i % (s->n + 1) == 0);
}

static void phi_identity(br_sim *s)
{
    if (!s->var)
        return;
    for (int i = 0; i < s->n; i++)
        for (int j = 0; j < s->n; j++)
            s->x[s->phi0 + i * s->n + j] = i == j;
}

void br_sim_set_observer(br_sim *s, const br_sim_observer *obs)
{
    if (obs)
        s->obs = *obs;
    else
        memset(&s->obs, 0, sizeof s->obs);
}

double br_sim_time(const br_sim *s)
{
    return s->t;
}
double br_sim_pwm_start(const br_sim *s)
{
    return s->pwm_t0;
}
int br_sim_enabled(const br_sim *s, int k)
{
    return s->en[k];
}
unsigned long br_sim_evals(const br_sim *s)
{
    return s->evals;
}
unsigned long br_sim_work(const br_sim *s)
{
    return s->work;
}
void br_sim_set_stop(br_sim *s, const br_progress *p)
{
    s->stop = p;
}

int br_sim_spend(br_sim *s, unsigned long n)
{
    if (s->halt)
        return s->halt;
    s->work += n;
    if (s->work - s->polled < BR_SIM_POLL_EVERY)
        return 0;
    s->polled = s->work;
    double periods = (s->past + s->t) / s->tm.T;
    if (br_progress_stopped(s->stop))
        s->halt = BR_ECANCEL;
    else if (s->work > BR_SIM_WORK_MAX || s->work > BR_SIM_WORK_PER_PERIOD * (1.0 + periods))
        s->halt = BR_ENUMERIC;
    s->halt_t = s->t;
    s->halt_periods = periods;
    return s->halt;
}

/* The error of a simulator that stopped on its work limit or a stop. */
static int halted(const br_sim *s, br_error *err)
{
    if (s->halt == BR_ECANCEL)
        return br_progress_cancelled(err);
    return br_error_set(err, BR_ENUMERIC, NULL, 0, NULL,
                        "work limit reached: %lu integrator steps in %.3g periods (limit %.0f "
                        "a period, %lu in all) at t = %.6g s",
                        s->work, s->halt_periods, BR_SIM_WORK_PER_PERIOD, BR_SIM_WORK_MAX,
                        s->halt_t);
}

int br_sim_charge(br_sim *s, unsigned long units, br_error *err)
{
    return br_sim_spend(s, units) ? halted(s, err) : BR_OK;
}

void br_sim_vc(const br_sim *s, double *vc)
{
    for (int k = 0; k < s->n; k++)
        vc[k] = s->x[XI(k, F_VC)];
}

void br_sim_state(const br_sim *s, double *x)
{
    for (int k = 0; k < s->n; k++) {
        x[k] = s->x[XI(k, F_VC)];
        x[s->n + k] = s->x[XI(k, F_Q)];
    }
}

void br_sim_sample_stress(const br_sim *s, double t, const double *vrail, int n, double *vdrv,
                          double *vrev)
{
    for (int k = 0; k < n; k++) {
        vdrv[k] = s ? br_sim_vdrv(s, k, vrail[k]) : vrail[k];
        vrev[k] = s && k > 0 ? br_sim_link_vrev(s, vrail, k, t) : NAN;
    }
}

double br_sim_switch_v(const br_sim *s, int k, double t)
{
    if (t < s->send[k])
        return s->sv0[k] + s->sslope[k] * (t - s->st0[k]);
    return s->tv[k] + s->tsl[k] * (t - s->tt0[k]);
}

/* ---- switch voltages -----------------------------------------------------
 * Each switch's voltage follows its own state alone: on, its on-state drop
 * at the load current (+I Rds(on) carrying it forward, -I Rds(on) in
 * reverse); off and conducting the load current in reverse in a dead
 * time, minus its reverse drop; otherwise its blocking voltage, which the
 * flying capacitors' ripple moves linearly between switching events.  A
 * change of target ramps at the slope Vblock / tedge. */

/* Ripple of flying capacitor k at t, V/A. */
static double fly_at(const br_sim *s, int k, double t)
{
    return s->fly[k] + s->flysl[k] * (t - s->fly_t);
}

/* Blocking voltage of switch k at t and its slope, V and V/s. */
static double block_line(const br_sim *s, int k, double t, double *sl)
{
    const br_stage *st = &s->c->st[k];
    *sl = 0.0;
    if (s->tm.npairs == 0 || s->iamp == 0.0)
        return st->vblock;
    /* cell j lies between flying capacitors j-1 and j */
    int j = st->pair;
    double i = s->isgn * s->iamp;
    *sl = i * (s->flysl[j - 1] - s->flysl[j]);
    return st->vblock + i * (fly_at(s, j - 1, t) - fly_at(s, j, t));
}

/* The mode of switch k now and the line its voltage heads for at t. */
static inline int switch_target(const br_sim *s, int k, double t, double *v, double *sl)
{
    *sl = 0.0;
    if ((s->cmd >> k & 1) && s->en[k]) {
        *v = s->von[k];
        return BR_SW_ON;
    }
    if (s->loaded && (s->rev >> k & 1)) {
        *v = s->vrv[k];
        return BR_SW_REV;
    }
    *v = block_line(s, k, t, sl);
    return BR_SW_BLOCK;
}

/* Each switch's voltage on and in reverse at the load current in force
 * (kept: they change only with the current). */
void br_sim_load_drops(br_sim *s)
{
    for (int k = 0; k < s->n; k++) {
        const br_stage *st = &s->c->st[k];
        s->von[k] = br_sw_on_drop(st, s->dir, s->iamp);
        s->vrv[k] = -br_sw_rev_drop(&st->sw, s->iamp);
    }
    s->redo = ~0ULL >> (64 - s->n);
}

/* Two lines closer than this at an update are the same line (the ripple
 * carried from event to event, against the line extended). */
#define BR_SW_SAME 1e-9 /* V */

/* Switch k heads for the line v + sl (t' - t): a ramp from its present
 * voltage at the slope Vblock / tedge (a swing in tedge when it blocks
 * nothing), ending where it meets the line. */
static void head_for(br_sim *s, int k, double t, double v, double sl)
{
    const br_chain *c = s->c;
    double cur = br_sim_switch_v(s, k, t), dv = v - cur;
    double vb = c->st[k].vblock;
    double rate = c->tedge > 0 ? (vb > 0 ? vb : fabs(dv)) / c->tedge : HUGE_VAL;
    s->tv[k] = v;
    s->tt0[k] = t;
    s->tsl[k] = sl;
    s->send[k] = -HUGE_VAL;
    if (fabs(dv) <= BR_SW_SAME || !(rate < HUGE_VAL))
        return;
    double sg = dv > 0 ? rate : -rate, dur = dv / (sg - sl);
    if (!(dur > 0))
        return;
    s->sv0[k] = cur;
    s->st0[k] = t;
    s->sslope[k] = sg;
    s->send[k] = t + dur;
}

/* Settle every switch at its target with no ramp or pulse in progress. */
static void settle_switches(br_sim *s, double t)
{
    for (int k = 0; k < s->n; k++) {
        double v, sl;
        s->smode[k] = switch_target(s, k, t, &v, &sl);
        s->tv[k] = s->sv0[k] = v;
        s->tt0[k] = s->st0[k] = t;
        s->tsl[k] = sl;
        s->sslope[k] = 0.0;
        s->send[k] = s->pulse_end[k] = -HUGE_VAL;
        s->pulse_i[k] = 0.0;
        if (s->smode[k] == BR_SW_ON)
            s->driven |= 1ULL << k;
    }
    s->on_prev = s->cmd & s->enm;
    s->rv_prev = s->loaded ? s->rev & ~s->on_prev : 0;
    s->redo = 0;
}

/* The ripple carried to time t (an event time); at the period's first
 * event it is set afresh, so that rounding never accumulates. */
static void fly_to(br_sim *s, double t, int first)
{
    for (int k = 1; k < s->tm.npairs; k++)
        s->fly[k] = first ? s->tm.fly_ev0[k] : fly_at(s, k, t);
    s->fly_t = t;
}

/* The ripple at phase ph of the period, at sim time t. */
static void fly_reset(br_sim *s, double ph, double t)
{
    memset(s->fly, 0, sizeof s->fly);
    memset(s->flysl, 0, sizeof s->flysl);
    s->fly_t = t;
    if (s->tm.npairs > 0)
        br_timing_fly_at(&s->tm, ph, s->fly, s->flysl);
}

/* The load current starts: for a DC load at the design's magnitude, and
 * it stays (a load that changes from period to period would set iamp and
 * isgn, and the drops with them, at each period boundary).  The
 * flying capacitors' ripple at that current must leave every switch a
 * blocking voltage; beyond, the cells collapse and the model does not
 * apply (br_sim_run_until refuses to go on). */
static void start_load(br_sim *s)
{
    s->loaded = 1;
    s->iamp = s->ac ? fabs(s->ac_i) : s->c->iload;
    br_sim_load_drops(s);
    s->cell_low = br_timing_cell_min(&s->tm, s->c, s->isgn * s->iamp, &s->cell_stage);
}

static int cells_collapse(const br_sim *s, br_error *err)
{
    const br_chain *c = s->c;
    const char *name = c->st[s->cell_stage].name;
    return br_error_set(err, BR_ENUMERIC, c->design ? c->design->path : NULL, 0, "fcml: cfly",
                        "the flying capacitors' ripple at %g A takes the voltage %s blocks "
                        "down to %.3g V of its %.4g V: the cells cannot hold and the model does "
                        "not apply; expected a larger cfly (or a higher fsw)",
                        s->iamp, name, s->cell_low, c->st[s->cell_stage].vblock);
}

static void clear_state(br_sim *s)
{
    /* every entry this chain can use, sensitivity included (the rest of
     * x is never touched; br_sim_create zeroed it) */
    memset(s->x, 0, sizeof(double) * (size_t)(s->phi0 + s->n * s->n));
    memset(s->en, 0, sizeof s->en);
    s->enm = 0;
    memset(s->held, 0, sizeof s->held);
    memset(s->il, 0, sizeof s->il);
    memset(s->vr, 0, sizeof s->vr);
    memset(s->sweep_i, 0, sizeof s->sweep_i);
    /* the link solve's warm starts too: a run from a reset does not
     * depend on what the simulator ran before (a replay of a period
     * samples it as the first run did) */
    memset(s->dw, 0, sizeof s->dw);
    memset(s->ul, 0, sizeof s->ul);
    memset(s->gl, 0, sizeof s->gl);
    memset(s->icj, 0, sizeof s->icj);
    s->past += s->t; /* the work limit counts every period simulated */
    s->t = 0.0;
    s->cmd = s->rev = s->driven = 0;
    s->loaded = 0;
    s->iamp = 0.0;
    br_sim_load_drops(s);
    s->load_at = HUGE_VAL;
    s->cell_low = HUGE_VAL;
    s->cell_stage = -1;
    s->isgn = s->dir == BR_DIRI_UP ? 1.0 : -1.0;
    s->per = 0;
    s->ev_idx = 0;
    s->hlast = 0.0;
    memset(s->hmem, 0, sizeof s->hmem);
    s->iv = 0;
    for (int k = 0; k < BR_N; k++)
        s->capseg[k] = (br_capseg){.lo = 1.0, .hi = 0.0};
    s->toggles = 0;
    s->stats_on = 0;
    s->frozen = 0;
    br_sim_supply_reset(s, 0);
    br_sim_live_rebuild(s);
}

void br_sim_reset_cold(br_sim *s)
{
    const br_chain *c = s->c;
    clear_state(s);
    s->npre = c->nprecharge;
    double t = 0.0;
    for (int i = 0; i < s->npre; i++) {
        t += c->precharge[i].duration;
        s->pre_end[i] = t;
    }
    s->pre_idx = 0;
    s->pwm_t0 = t;
    s->tramp_end = c->tramp;
    br_sim_supply_reset(s, 1);
    if (s->ac)
        br_sim_line_reset(s);
    /* start-up runs at no load unless the design starts under load: then
     * from the first period boundary at or after its start time */
    if (s->dir0 >= 0 && c->load_from < HUGE_VAL) {
        double m = ceil((c->load_from - t) / c->T - 1e-9);
        s->load_at = t + (m > 0 ? m : 0.0) * c->T;
    }
    fly_reset(s, 0.0, t);
    if (s->npre > 0) {
        s->cmd = c->precharge[0].mask;
    } else {
        s->cmd = s->tm.on0;
        s->rev = s->tm.rev0; /* it counts once the load current flows */
    }
    settle_switches(s, 0.0);
    s->driven = 0;
}

/* Sim time 0 sits at `phase` into the PWM period; the state given is a
 * running chain (no ramp or pulse in progress at that instant). */
void br_sim_reset_running_at(br_sim *s, const double *x, double phase)
{
    const br_chain *c = s->c;
    clear_state(s);
    s->npre = s->pre_idx = 0;
    s->tramp_end = -HUGE_VAL;
    s->pwm_t0 = -phase;
    if (s->ac)
        br_sim_line_reset(s);
    while (s->ev_idx < s->tm.nev && s->tm.ev[s->ev_idx].t <= phase)
        s->ev_idx++;
    /* every event lies behind: the next is the first of the next period */
    if (s->ev_idx == s->tm.nev) {
        s->ev_idx = 0;
        s->per = 1;
    }
    for (int k = 1; k < s->n; k++) {
        s->x[XI(k, F_VC)] = x[k];
        s->x[XI(k, F_Q)] = x[s->n + k];
    }
    s->x[XI(0, F_VC)] = br_sim_bypass(s) ? x[0] : 0.0;
    s->en[0] = (br_sim_bypass(s) ? x[0] : c->vsupply) > c->st[0].drv.uvlo_fall;
    for (int k = 1; k < s->n; k++)
        s->en[k] = br_sim_vdrv(s, k, x[k]) > c->st[k].drv.uvlo_fall;
    for (int k = 0; k < s->n; k++)
        s->enm |= (br_mask)(s->en[k] != 0) << k;
    br_timing_state_at(&s->tm, phase, &s->cmd, &s->rev);
    if (s->dir0 >= 0) { /* a running chain carries its load */
        s->load_at = -HUGE_VAL;
        start_load(s);
    }
    fly_reset(s, phase, 0.0);
    settle_switches(s, 0.0);
    s->hlast = c->T / 32; /* a fixed first step keeps the period map deterministic */
    phi_identity(s);
}

void br_sim_reset_running(br_sim *s, const double *vc)
{
    double x[2 * BR_N] = {0};
    for (int k = 1; k < s->n; k++)
        x[k] = vc[k];
    br_sim_reset_running_at(s, x, 0.0);
}

/* ---- schedule ----------------------------------------------------------- */

static double event_time(const br_sim *s)
{
    if (s->tm.nev == 0)
        return HUGE_VAL;
    return s->pwm_t0 + (double)s->per * s->tm.T + s->tm.ev[s->ev_idx].t;
}

static int in_precharge(const br_sim *s)
{
    return s->pre_idx < s->npre;
}

static void update_targets(br_sim *s, double t);

void br_sim_freeze(br_sim *s, br_mask on)
{
    s->frozen = 1;
    s->npre = s->pre_idx = 0;
    s->cmd = on;
    s->rev = 0; /* no load current once switching stops */
    s->loaded = 0;
    s->iamp = 0.0;
    br_sim_load_drops(s);
    s->load_at = HUGE_VAL;
    update_targets(s, s->t);
    s->k1_valid = 0;
}

static double next_time(const br_sim *s, double t_end)
{
    double tn = t_end;
    if (in_precharge(s))
        tn = fmin(tn, s->pre_end[s->pre_idx]);
    else if (!s->frozen)
        tn = fmin(tn, event_time(s));
    tn = fmin(tn, br_sim_supply_next(s)); /* ramps, hiccups */
    if (!s->loaded && s->load_at > s->t)
        tn = fmin(tn, s->load_at);
    for (int k = 0; k < s->n; k++) {
        if (s->send[k] > s->t)
            tn = fmin(tn, s->send[k]);
        if (s->pulse_end[k] > s->t)
            tn = fmin(tn, s->pulse_end[k]);
    }
    return tn;
}

static void recover_link(br_sim *s, int k);

/* Bring switch k toward its target at t. */
static void update_switch(br_sim *s, int k, double t)
{
    double v, sl;
    int mode = switch_target(s, k, t, &v, &sl);
    /* the switch starts blocking: the link it returns recovers */
    if (mode == BR_SW_BLOCK && s->smode[k] != BR_SW_BLOCK && s->c->st[k].vblock > 0 && k + 1 < s->n)
        recover_link(s, k + 1);
    /* a switch that keeps its constant target has nothing to do */
    if (mode != s->smode[k] || t < s->send[k] || sl != 0.0 || s->tsl[k] != 0.0 || v != s->tv[k])
        head_for(s, k, t, v, sl);
    s->smode[k] = mode;
}

/* A gate pulse for switch k, driven on now. */
static void gate_pulse(br_sim *s, int k, double t)
{
    const br_sw *sw = &s->c->st[k].sw;
    double q = br_sw_qg_at(sw, br_sim_vdrv(s, k, s->vr[k]));
    if (sw->tg > 0) {
        s->pulse_i[k] = q / sw->tg;
        s->pulse_end[k] = t + sw->tg;
    } else if (k > 0) {
        double v0 = s->x[XI(k, F_VC)];
        s->x[XI(k, F_VC)] -= q / br_sim_cap(s, k, v0);
        double vm = 0.5 * (v0 + s->x[XI(k, F_VC)]); /* the energy the rail gives */
        s->x[XI(k, F_RP)] += q * vm;
        s->x[XI(k, F_RG)] += q * br_sim_vdrv(s, k, vm);
    }
}

/* Bring the switches whose state changed toward their new targets (with
 * the ripple every switch: the lines turn at every event); start gate
 * pulses of the switches that are now driven on. */
static void update_targets(br_sim *s, double t)
{
    br_mask on = s->cmd & s->enm, rv = s->loaded ? s->rev & ~on : 0;
    br_mask todo = (on ^ s->on_prev) | (rv ^ s->rv_prev) | s->redo;
    if (s->tm.npairs > 0 && s->iamp != 0.0)
        todo = ~0ULL >> (64 - s->n);
    for (; todo; todo &= todo - 1)
        update_switch(s, __builtin_ctzll(todo), t);
    for (br_mask fresh = on & ~s->driven; fresh; fresh &= fresh - 1)
        gate_pulse(s, __builtin_ctzll(fresh), t);
    s->driven = on;
    s->on_prev = on;
    s->rv_prev = rv;
    s->redo = 0;
}

static void apply_pwm_events(br_sim *s, double t)
{
    int moved = 0;
    while (s->tm.nev > 0 && event_time(s) <= t) {
        if (s->ac && s->ev_idx == 0)
            br_sim_line_enter(s);
        if (s->tm.npairs > 0)
            fly_to(s, event_time(s), s->ev_idx == 0);
        br_event_apply(&s->tm.ev[s->ev_idx], &s->cmd, &s->rev);
        moved = 1;
        if (++s->ev_idx >= s->tm.nev) {
            s->ev_idx = 0;
            s->per++;
            s->iv = 0;
            if (s->ac)
                br_sim_line_build(s, s->per);
        }
    }
    if (moved && s->tm.npairs > 0)
        br_timing_fly_slopes(&s->tm, s->cmd | s->rev, s->flysl);
}

static void apply_schedule(br_sim *s, double t)
{
    if (in_precharge(s) && t >= s->pre_end[s->pre_idx]) {
        s->pre_idx++;
        if (in_precharge(s)) {
            s->cmd = s->c->precharge[s->pre_idx].mask;
        } else {
            s->cmd = s->tm.on0;
            s->rev = s->tm.rev0;
            fly_reset(s, 0.0, t);
        }
    }
    if (!in_precharge(s) && !s->frozen)
        apply_pwm_events(s, t);
    if (!s->loaded && t >= s->load_at)
        start_load(s);
    for (int k = 0; k < s->n; k++) {
        if (s->send[k] > -HUGE_VAL && s->send[k] <= t)
            s->send[k] = -HUGE_VAL; /* the ramp has met its line */
        if (s->pulse_end[k] > -HUGE_VAL && s->pulse_end[k] <= t) {
            s->pulse_i[k] = 0.0;
            s->pulse_end[k] = -HUGE_VAL;
        }
    }
    memset(s->held, 0, sizeof s->held);
    update_targets(s, t);
}

/* ---- one interval -------------------------------------------------------- */

/* What rail k's loads draw over the interval from t, by kind. */
static void stage_load(br_sim *s, int k, double t)
{
    const br_stage *st = &s->c->st[k];
    br_seg *g = &s->seg;
    /* a driver held in UVLO draws its standby current only from a charged
     * rail: an empty capacitor is not driven negative */
    g->irun[k] = s->en[k] ? st->drv.iq_on + st->drv.i_iso : 0.0;
    g->istb[k] = !s->en[k] && (k == 0 || s->x[XI(k, F_VC)] > 0) ? st->drv.iq_off : 0.0;
    g->igate[k] = s->pulse_end[k] > t ? s->pulse_i[k] : 0.0;
    g->iload[k] = g->irun[k] + g->istb[k] + g->igate[k];
    if (st->aux.kind == BR_AUX_LDO)
        g->iload[k] += st->aux.iq;
}

static double left_rail(const br_sim *s, int k, double t)
{
    if (s->c->st[k].inject)
        return 0.0; /* the isolated supply's return: its voltage is in d */
    return k == 1 && !br_sim_bypass(s) ? br_sim_supply_v(s, t) : s->x[XI(k - 1, F_VC)];
}

/* Blocked link: leakage plus the mean junction-capacitance current of the
 * ramp over [ta, tb] (exact: the charge moved is Qj(vrev_b) - Qj(vrev_a)). */
static double blocked_current(const br_sim *s, int k, double ta, double tb, double fa, double fb,
                              double *leak)
{
    const br_diode *d = &s->c->st[k].diode;
    *leak = br_diode_leak(d, -0.5 * (fa + fb));
    double i = -*leak;
    if (d->cj0 > 0 && tb > ta && fa != fb)
        i -= (br_diode_qj(d, -fb) - br_diode_qj(d, -fa)) / (tb - ta);
    return i;
}

/* Resistance switch k puts in the path of the link it returns: the
 * bootstrap current adds to or takes from the load current the switch
 * carries, so it sees the slope of the switch's own law: Rds(on) while on
 * (and, for the charge a turn-off edge sweeps, while it starts to block),
 * the reverse law's resistance while it conducts in reverse. */
static double return_r(const br_sim *s, int k)
{
    const br_sw *sw = &s->c->st[k].sw;
    return s->smode[k] == BR_SW_REV ? sw->rsd : sw->rds_on;
}

static void build_seg(br_sim *s, double ta, double tb)
{
    br_seg *g = &s->seg;
    const br_chain *c = s->c;
    g->t0 = ta;
    g->vs0 = br_sim_supply_v(s, ta);
    /* the supply's law is linear between its breaks (next_time) */
    g->vs_slope = tb > ta ? (br_sim_supply_v(s, tb) - g->vs0) / (tb - ta) : 0.0;
    g->nactive = 0;
    /* a bypass capacitor charging from a ramping supply has no closed form here */
    g->zener = br_sim_bypass(s) && g->vs_slope != 0.0;
    for (int k = 0; k < s->n; k++) {
        stage_load(s, k, ta);
        g->ileak[k] = 0.0;
        if (k == 0)
            continue;
        const br_stage *st = &c->st[k];
        g->d0[k] = br_sim_link_d(s, k, ta);
        /* an injection steps on only at an interval's start (next_time) */
        double db = st->inject ? g->d0[k] : br_sim_link_d(s, k, tb);
        g->dslope[k] = tb > ta ? (db - g->d0[k]) / (tb - ta) : 0.0;
        g->rpath[k] = st->r_link + (st->inject ? 0.0 : return_r(s, k - 1));
        double fa = left_rail(s, k, ta) - s->x[XI(k, F_VC)] - g->d0[k];
        double fb = left_rail(s, k, tb) - s->x[XI(k, F_VC)] - db;
        g->active[k] = fa > -BR_VBLOCKED || fb > -BR_VBLOCKED;
        g->edge[k] = g->active[k] && !st->inject
                         ? br_sim_edge_kind(s, k, ta, tb, fa, fb, &g->iblk[k], &g->ileak[k])
                         : BR_EDGE_NONE;
        if (g->edge[k] != BR_EDGE_NONE)
            g->active[k] = 0; /* blocked over it, iblk set */
        else if (!g->active[k])
            g->iblk[k] = blocked_current(s, k, ta, tb, fa, fb, &g->ileak[k]);
        else
            g->iblk[k] = 0.0;
        if (g->active[k])
            g->act[g->nactive++] = k;
        if (st->aux.kind == BR_AUX_ZENER && s->x[XI(k, F_VC)] > st->aux.vout - 0.5)
            g->zener = 1;
    }
    if (br_sim_bypass(s) && !g->zener) { /* the closed form holds off the supply's limit */
        double i0 = br_sim_up(s, g->iblk, 0) + g->iload[0], rs = c->rsupply;
        double ia = (g->vs0 - s->x[XI(0, F_VC)]) / rs;
        g->zener = br_sim_supply_needs_rk(s, ia, i0, g->vs0 - rs * i0);
    }
}

/* The charge still stored in the diode of link k recovers: it flows back
 * from rail k to rail k-1 (charge-control model, Lauritzen & Ma 1991). */
static void recover_link(br_sim *s, int k)
{
    const br_chain *c = s->c;
    double q = s->x[XI(k, F_Q)];
    if (q <= 0)
        return;
    s->x[XI(k, F_Q)] = 0.0;
    s->k1_valid = 0;
    /* the rails lose q times the difference of their mean voltages; the
     * power stage drives the recovery against the blocking voltage */
    const br_stage *st = &c->st[k];
    int inj = st->inject; /* an injection's charge goes back into its supply */
    double vk = s->x[XI(k, F_VC)], vl = left_rail(s, k, s->t);
    s->x[XI(k, F_VC)] -= q / br_sim_cap(s, k, s->x[XI(k, F_VC)]);
    if (!inj && (k > 1 || br_sim_bypass(s)))
        s->x[XI(k - 1, F_VC)] += q / br_sim_cap(s, k - 1, s->x[XI(k - 1, F_VC)]);
    if (!inj && k == 1)
        s->x[X_SQ] -= q; /* returned toward the supply */
    if (!inj && k == 1 && !br_sim_bypass(s))
        s->x[X_SE] -= q * vl; /* into the supply itself */
    double e_rails = q * (0.5 * (vk + s->x[XI(k, F_VC)]) - 0.5 * (vl + left_rail(s, k, s->t)));
    double vsw = inj ? -br_sim_inj_v(s, k, s->t) : c->st[k - 1].vblock;
    s->x[XI(k, F_LD)] -= q * vsw;
    if (!s->stats_on)
        return;
    br_link_stats *ls = &s->st.link[k];
    double rp = st->diode.rs + st->r_link + (inj ? 0.0 : c->st[k - 1].sw.rds_on);
    /* the forward current is cut at the rate the edge drives through the
     * link's resistance */
    double didt = c->tedge > 0 && rp > 0 ? st->vblock / (c->tedge * rp) : HUGE_VAL;
    br_recovery r = {0};
    if (isfinite(didt))
        br_diode_recovery(q, didt, BR_DIODE_SOFTNESS, &r);
    ls->qrr += q;
    ls->e_rr += q * vsw + e_rails;
    ls->irrm = fmax(ls->irrm, r.irrm);
}

/* A link found blocked still holding charge (its rails moved apart
 * rather than its switch turning off) recovers too. */
static void recover(br_sim *s)
{
    for (int k = 1; k < s->n; k++)
        if (!s->seg.active[k])
            recover_link(s, k);
}

int br_sim_uvlo_due(const br_sim *s, const double *vr)
{
    for (int k = 0; k < s->n; k++) {
        if (s->held[k])
            continue;
        const br_driver *d = &s->c->st[k].drv;
        double v = br_sim_vdrv_at(s, k, vr[k]);
        if (s->en[k] ? v < d->uvlo_fall : v > d->uvlo_rise)
            return k;
    }
    return -1;
}

/* Rail voltage at which driver k toggles from its present state. */
static double rail_threshold(const br_sim *s, int k)
{
    const br_stage *st = &s->c->st[k];
    double thr = s->en[k] ? st->drv.uvlo_fall : st->drv.uvlo_rise;
    if (st->aux.kind == BR_AUX_LDO)
        return thr < st->aux.vout ? thr + st->aux.dropout : HUGE_VAL;
    return thr;
}

/* Rail 0 with a bypass capacitor relaxes toward Vs - Rs I0 with time
 * constant Rs C0 (I0 what link 1 and driver 0 draw). */
typedef struct bypass_cf {
    double vinf, tau, v0;
} bypass_cf;

static double bypass_at(const bypass_cf *b, double dt)
{
    return b->vinf + (b->v0 - b->vinf) * exp(-dt / b->tau);
}

/* Rs times the integral of the square of the current through it over dt:
 * the current is i0 + a exp(-t/tau), a = (vinf - v0)/Rs, as the bypass
 * capacitor relaxes toward vinf = Vs - Rs i0 (i0 what the rail draws). */
static double bypass_loss(const bypass_cf *b, double rs, double i0, double dt)
{
    double a = (b->vinf - b->v0) / rs, e1 = -expm1(-dt / b->tau), e2 = -expm1(-2.0 * dt / b->tau);
    return rs * (i0 * i0 * dt + 2.0 * i0 * a * b->tau * e1 + a * a * 0.5 * b->tau * e2);
}

/* Earliest crossing of thr by rail 0 after ta, or HUGE_VAL. */
static double bypass_cross(const bypass_cf *b, double thr)
{
    double a = b->v0 - b->vinf, c = thr - b->vinf;
    if (a == 0.0 || c / a <= 0.0 || c / a >= 1.0)
        return HUGE_VAL;
    return b->tau * log(a / c);
}

/* When the node of rail k (k >= 1), carrying the constant capacitor
 * current ic, reaches thr: the charge between the capacitor voltage now
 * and the one that puts the node on thr, over ic (exact on the DC-bias
 * line); HUGE_VAL when it moves away from thr. */
static double rail_cross(const br_sim *s, int k, double ic, double thr)
{
    double v0 = s->vr[k], vc = s->x[XI(k, F_VC)];
    int toward = s->en[k] ? ic < 0 : ic > 0;
    if (ic == 0.0 || !toward)
        return HUGE_VAL;
    return br_cap_charge(&s->c->st[k].cap, vc, vc + (thr - v0)) / ic;
}

/* Rail k's capacitor takes charge dq along its DC-bias line; its row of
 * the sensitivity matrix scales by C(v0) / C(v1), since the charge moved
 * does not depend on the start: C(v1) dv1 = C(v0) dv0. */
static void rail_charge(br_sim *s, int k, double dq)
{
    const br_cap *cap = &s->c->st[k].cap;
    double v0 = s->x[XI(k, F_VC)];
    double v1 = br_cap_after_charge(cap, v0, dq);
    s->x[XI(k, F_VC)] = v1;
    if (!s->var || cap->nbias == 0)
        return;
    double r = br_cap_at(cap, v0) / br_cap_at(cap, v1);
    for (int j = 0; j < s->n; j++)
        s->x[s->phi0 + k * s->n + j] *= r;
}

/* The energy budget of a closed-form interval of dt: every rail's loads
 * by kind at its mean voltage (the rails move linearly in charge), and
 * every link (all blocked) at its mean drive, with the voltage across its
 * return switch, which ramps linearly. */
static void closed_budget(br_sim *s, const double *va, const double *vb, double dt)
{
    const br_seg *g = &s->seg;
    for (int k = 0; k < s->n; k++) {
        double vm = 0.5 * (va[k] + vb[k]) * dt;
        double dm = 0.5 * (br_sim_vdrv(s, k, va[k]) + br_sim_vdrv(s, k, vb[k])) * dt;
        s->x[XI(k, F_RP)] += g->iload[k] * vm;
        s->x[XI(k, F_RD)] += g->irun[k] * dm;
        s->x[XI(k, F_RS)] += g->istb[k] * dm;
        s->x[XI(k, F_RG)] += g->igate[k] * dm;
        if (k == 0)
            continue;
        double sw = (g->d0[k] + 0.5 * g->dslope[k] * dt) * dt; /* integral of its voltage */
        double vd = 0.5 * (br_sim_low(s, va, k) - va[k] + br_sim_low(s, vb, k) - vb[k]) * dt - sw;
        s->x[XI(k, F_LX)] += g->iblk[k] * vd;
        s->x[XI(k, F_LL)] -= g->ileak[k] * vd;
        s->x[XI(k, F_LD)] += g->iblk[k] * sw;
    }
}

/* No link conducts: every floating rail's capacitor carries a constant
 * current, so its charge moves linearly and its voltage follows the
 * DC-bias line exactly (br_cap_after_charge); rail 0 follows the supply
 * ramp, or with a bypass capacitor relaxes exponentially.  Returns the
 * stage whose UVLO threshold is crossed first (then *te is the
 * crossing), or -1. */
static int closed_form(br_sim *s, double tb, double *te)
{
    const br_seg *g = &s->seg;
    double ta = s->t, ic[BR_N];
    int first = -1, bp = br_sim_bypass(s);
    double i0 = br_sim_up(s, g->iblk, 0) + g->iload[0];
    bypass_cf b = {g->vs0 - s->c->rsupply * i0, s->c->rsupply * s->c->csupply, s->x[XI(0, F_VC)]};
    *te = tb;
    for (int k = 0; k < s->n; k++) {
        double iout = br_sim_up(s, g->iblk, k);
        ic[k] = k == 0 ? 0.0 : g->iblk[k] - iout - g->iload[k];
        double v0 = s->vr[k], thr = rail_threshold(s, k), tc = HUGE_VAL;
        if (!isfinite(thr) || s->held[k])
            continue;
        if (k == 0 && bp) {
            tc = ta + bypass_cross(&b, thr);
        } else if (k == 0 && g->vs_slope != 0.0) {
            int toward = s->en[k] ? g->vs_slope < 0 : g->vs_slope > 0;
            tc = toward ? ta + (thr - v0) / g->vs_slope : HUGE_VAL;
        } else if (k > 0) {
            tc = ta + rail_cross(s, k, ic[k], thr);
        }
        if (tc > ta && tc <= *te) {
            *te = tc;
            first = k;
        }
    }
    double dt = *te - ta, vs_a = br_sim_supply_v(s, ta), va[BR_N], vb[BR_N];
    double isup = i0, q0 = 0.0;
    s->x[X_SR] += s->c->rsupply * i0 * i0 * dt;
    if (bp) { /* charge through Rs: (Vs dt - integral of v) / Rs */
        double vint = b.vinf * dt + (b.v0 - b.vinf) * b.tau * (1.0 - exp(-dt / b.tau));
        q0 = (g->vs0 * dt - vint) / s->c->rsupply;
        isup = dt > 0 ? q0 / dt : 0.0;
        s->x[X_SR] += bypass_loss(&b, s->c->rsupply, i0, dt) - s->c->rsupply * i0 * i0 * dt;
        s->x[XI(0, F_VC)] = bypass_at(&b, dt);
        for (int j = 0; s->var && j < s->n; j++)
            s->x[s->phi0 + j] *= exp(-dt / b.tau);
    }
    for (int k = 0; k < s->n; k++) {
        va[k] = s->vr[k];
        if (k > 0) {
            rail_charge(s, k, ic[k] * dt);
            s->x[XI(k, F_LQ)] += g->iblk[k] * dt;
            s->x[XI(k, F_RI2)] += ic[k] * ic[k] * dt;
        }
        vb[k] = k > 0 ? s->x[XI(k, F_VC)] + s->c->st[k].cap.esr * ic[k]
                : bp  ? s->x[XI(0, F_VC)]
                      : br_sim_supply_v(s, *te) - s->c->rsupply * isup;
        s->x[XI(k, F_RV)] += 0.5 * (va[k] + vb[k]) * dt;
        s->x[XI(k, F_RQL)] += g->iload[k] * dt;
        s->vr[k] = vb[k];
        s->ic[k] = ic[k];
        s->il[k] = k > 0 ? g->iblk[k] : 0.0;
    }
    closed_budget(s, va, vb, dt);
    s->x[X_SQ] += isup * dt;
    s->x[X_SE] += isup * 0.5 * (vs_a + br_sim_supply_v(s, *te)) * dt;
    s->isup = s->il[0] = bp ? (g->vs0 - s->x[XI(0, F_VC)]) / s->c->rsupply : i0;
    s->sup.lim = 0; /* the closed form holds only off the limit */
    for (int k = 1; s->injlimm && k < s->n; k++)
        s->inj[k].lim = 0; /* every link blocked: no injection gives current */
    s->t = *te;
    return first;
}

static void toggle(br_sim *s, int k)
{
    s->win.toggles++;
    s->en[k] = !s->en[k];
    s->enm ^= 1ULL << k;
    if (s->obs.uvlo) {
        br_uvlo_event e = {s->t, k, s->en[k], br_sim_vdrv(s, k, s->vr[k])};
        s->obs.uvlo(s->obs.ctx, &e);
    }
    update_targets(s, s->t);
}

/* Fill the workspace (currents, rail voltages) for the state at s->t. */
static void evaluate_now(br_sim *s, double tb)
{
    build_seg(s, s->t, tb);
    br_sim_rhs(s, s->t, s->x, s->k1);
    s->k1_valid = 1; /* the integrator starts from it */
}

/* Settle UVLO states at the present instant.  A driver due to toggle a
 * third time at one instant chatters: its own load step across the ESR
 * is larger than the UVLO hysteresis, so enabling it disables it again at
 * once.  A real comparator would oscillate there at its own response
 * speed; the driver is held off (the pessimistic side: it drives
 * nothing) until the next scheduled edge, where it may try again. */
static void settle_uvlo(br_sim *s, double tb)
{
    int count[BR_N] = {0};
    for (int guard = 0; guard < 4 * s->n; guard++) {
        evaluate_now(s, tb);
        int k = br_sim_uvlo_due(s, s->vr);
        if (k < 0)
            return;
        if (++count[k] > 2) {
            s->held[k] = 1;
            if (!s->en[k])
                continue;
        }
        toggle(s, k);
    }
    evaluate_now(s, tb);
}

/* Every rail a finite number: an overflow (a bus near the largest
 * double) would otherwise run on as NaN, which no test below catches. */
static int finite_state(const br_sim *s)
{
    for (int k = 0; k < s->n; k++)
        if (!isfinite(s->x[XI(k, F_VC)]) || !isfinite(s->vr[k]))
            return 0;
    return 1;
}

int br_sim_run_until(br_sim *s, double t_end, br_error *err)
{
    while (s->t < t_end) {
        if (s->loaded && !(s->cell_low > 0.0))
            return cells_collapse(s, err);
        if (br_sim_spend(s, 1))
            return halted(s, err);
        if (br_sim_supply_step(s))
            s->k1_valid = 0; /* a hiccup turned the supply off or on */
        double tb = next_time(s, t_end);
        br_sim_clamp_limit(s); /* a reset or a gate charge may have left a rail past it */
        settle_uvlo(s, tb);
        if (br_sim_edge_start(s)) {
            /* the rails moved by the sweep's charge: the interval stays
             * as built, its start is evaluated again */
            br_sim_rhs(s, s->t, s->x, s->k1);
            s->k1_valid = 1;
            if (br_sim_uvlo_due(s, s->vr) >= 0)
                settle_uvlo(s, tb);
        }
        recover(s);
        br_sim_clamp_limit(s); /* a charge moved at an edge may push a rail past it */
        br_sim_track_extremes(s, s->t);
        int due = -1, status = 0;
        s->nintervals++;
        if (s->seg.nactive == 0 && !s->seg.zener) {
            s->nclosed++;
            double te;
            due = closed_form(s, tb, &te);
            /* the corner at the end of a linear stretch, before an edge
             * at its end moves charge (the integrator tracks its own
             * steps) */
            br_sim_track_extremes(s, s->t);
        } else {
            br_sim_integrate(s, tb, &status);
            if (status == -2)
                return halted(s, err);
            if (status < 0)
                return br_error_set(err, BR_ENUMERIC, NULL, 0, NULL,
                                    "step size underflow at t = %.9g s", s->t);
            if (status > 0)
                due = br_sim_uvlo_due(s, s->vr);
        }
        if (s->t >= tb)
            br_sim_edge_end(s, tb);
        br_sim_clamp_limit(s);
        if (!finite_state(s))
            return br_error_set(err, BR_ENUMERIC, NULL, 0, NULL,
                                "the rails are no longer finite numbers at t = %.9g s (values "
                                "beyond what the arithmetic holds)",
                                s->t);
        br_sim_track_extremes(s, s->t);
        if (due >= 0)
            toggle(s, due);
        else if (s->t >= tb)
            apply_schedule(s, tb);
    }
    return BR_OK;
}

/* ---- statistics ------------------------------------------------------------ */

void br_sim_stats_start(br_sim *s)
{
    memset(&s->st, 0, sizeof s->st);
    memcpy(s->quad0, s->x, sizeof s->x);
    s->st.t0 = s->t;
    for (int k = 0; k < s->n; k++) {
        s->st.rail[k].vmin = s->st.rail[k].vdrv_min = HUGE_VAL;
        s->st.rail[k].vmax = s->st.rail[k].vdrv_max = s->st.rail[k].vc_max = -HUGE_VAL;
        s->st.link[k].vrev_peak = -HUGE_VAL;
    }
    s->st.isup_peak = s->isup;
    s->lim_t0 = s->sup.lim ? s->t : HUGE_VAL;
    s->trips0 = s->sup.trips;
    s->stats_on = 1;
    br_sim_live_rebuild(s);
}

void br_sim_stats_select(br_sim *s, br_stats_set set)
{
    s->stats_set = set;
}

/* fmin and fmax, inlined (they are library calls), and like them passing
 * over a NaN in b. */
static inline double lower(double a, double b)
{
    return b < a ? b : a;
}
static inline double higher(double a, double b)
{
    return b > a ? b : a;
}

/* Each link's forward and displacement current at this track point: an
 * active link's from the last evaluation, a blocked one's displacement is
 * its current less its leakage; a sweep moved at this instant shows its
 * peak.  The sweeps are then done with. */
static void track_links(br_sim *s)
{
    const br_seg *g = &s->seg;
    for (int k = 1; k < s->n; k++) {
        s->tr_fwd[k] = higher(br_sim_forward(s, k), s->sweep_i[k]);
        s->tr_disp[k] = g->active[k] ? s->icj[k] : s->il[k] + g->ileak[k];
        s->sweep_i[k] = 0.0;
    }
}

void br_sim_sample_links(const br_sim *s, const double *ilink, int n, double *fwd, double *disp)
{
    for (int k = 1; k < n; k++) {
        fwd[k] = s ? s->tr_fwd[k] : ilink[k];
        disp[k] = s ? s->tr_disp[k] : NAN;
    }
}

static void track_stats(br_sim *s, double t)
{
    for (int k = 1; s->stats_set == BR_STATS_STARTUP && k < s->n; k++)
        s->st.link[k].ipeak = higher(s->st.link[k].ipeak, s->tr_fwd[k]);
    for (int k = 0; s->stats_set != BR_STATS_STARTUP && k < s->n; k++) {
        br_rail_stats *r = &s->st.rail[k];
        double vd = br_sim_vdrv_at(s, k, s->vr[k]);
        r->vmin = lower(r->vmin, s->vr[k]);
        r->vmax = higher(r->vmax, s->vr[k]);
        r->vdrv_min = lower(r->vdrv_min, vd);
        r->vdrv_max = higher(r->vdrv_max, vd);
        r->vc_max = higher(r->vc_max, k > 0 ? s->x[XI(k, F_VC)] : s->vr[0]);
        if (k == 0)
            continue;
        br_link_stats *l = &s->st.link[k];
        l->ipeak = higher(l->ipeak, s->tr_fwd[k]);
        l->dpeak = higher(l->dpeak, fabs(s->tr_disp[k]));
        l->vrev_peak = higher(l->vrev_peak, br_sim_link_vrev(s, s->vr, k, t));
    }
    s->st.isup_peak = higher(s->st.isup_peak, s->isup);
    if (!s->sup.lim)
        s->lim_t0 = HUGE_VAL;
    else if (s->lim_t0 == HUGE_VAL)
        s->lim_t0 = t;
    else
        s->st.lim_stretch = higher(s->st.lim_stretch, t - s->lim_t0);
}

/* Every point the statistics see is a sample for the observer, so that
 * what an observer plots reaches the extremes the figures report. */
void br_sim_track_extremes(br_sim *s, double t)
{
    track_links(s);
    if (s->win.on)
        br_sim_window_track(s);
    if (s->stats_on)
        track_stats(s, t);
    if (s->obs.sample)
        s->obs.sample(s->obs.ctx, s, t, s->vr, s->il, s->n);
}

/* Energy held by the rail capacitors (and the bypass) in state x, J. */
static double stored_energy(const br_sim *s, const double *x)
{
    double e = br_sim_bypass(s) ? 0.5 * s->c->csupply * x[XI(0, F_VC)] * x[XI(0, F_VC)] : 0.0;
    for (int k = 1; k < s->n; k++)
        e += br_cap_energy(&s->c->st[k].cap, x[XI(k, F_VC)]);
    return e;
}

/* The rails' energies and the links' beyond their conduction. */
static void budget_stats(br_sim *s)
{
    const double *q0 = s->quad0, *x = s->x;
    for (int k = 0; k < s->n; k++) {
        br_rail_stats *r = &s->st.rail[k];
        r->e_load = x[XI(k, F_RP)] - q0[XI(k, F_RP)];
        r->e_run = x[XI(k, F_RD)] - q0[XI(k, F_RD)];
        r->e_standby = x[XI(k, F_RS)] - q0[XI(k, F_RS)];
        r->e_gate = x[XI(k, F_RG)] - q0[XI(k, F_RG)];
        r->e_clamp = x[XI(k, F_RZ)] - q0[XI(k, F_RZ)];
        if (k == 0)
            continue;
        br_link_stats *l = &s->st.link[k];
        l->e_other = x[XI(k, F_LX)] - q0[XI(k, F_LX)];
        l->e_leak = x[XI(k, F_LL)] - q0[XI(k, F_LL)];
        l->e_res = x[XI(k, F_LR)] - q0[XI(k, F_LR)];
        l->e_sw = x[XI(k, F_LS)] - q0[XI(k, F_LS)];
        l->e_stage = x[XI(k, F_LD)] - q0[XI(k, F_LD)];
    }
    s->st.e_rsupply = x[X_SR] - q0[X_SR];
    s->st.t_limit = x[X_SL] - q0[X_SL];
    s->st.sup_trips = s->sup.trips - s->trips0;
    s->st.e_stored = stored_energy(s, x) - stored_energy(s, q0);
}

/* The figures a start-up's statistics do not keep (BR_STATS_STARTUP)
 * read NaN: whatever reads one by mistake shows it. */
/* A field added to either struct must be named here too. */
_Static_assert(sizeof(br_link_stats) == 14 * sizeof(double), "unkept() names every link field");
_Static_assert(sizeof(br_rail_stats) == 13 * sizeof(double), "unkept() names every rail field");
static void unkept(const br_sim *s, br_stats *st)
{
    for (int k = 0; k < s->n; k++) {
        br_rail_stats *r = &st->rail[k];
        br_link_stats *l = &st->link[k];
        *r = (br_rail_stats){NAN, NAN, NAN, NAN, NAN, NAN, NAN, NAN, NAN, NAN, NAN, NAN, NAN};
        *l = (br_link_stats){.q = NAN,
                             .i2 = l->i2,
                             .ipeak = l->ipeak,
                             .vrev_peak = NAN,
                             .qrr = NAN,
                             .irrm = NAN,
                             .dpeak = NAN,
                             .e_cond = NAN,
                             .e_rr = NAN,
                             .e_leak = NAN,
                             .e_other = NAN,
                             .e_res = NAN,
                             .e_sw = NAN,
                             .e_stage = NAN};
    }
    st->e_rsupply = st->e_stored = NAN;
}

const br_stats *br_sim_stats(br_sim *s)
{
    br_stats *st = &s->st;
    const double *q0 = s->quad0, *x = s->x;
    st->t1 = s->t;
    for (int k = 0; k < s->n; k++) {
        br_rail_stats *r = &st->rail[k];
        r->vint = x[XI(k, F_RV)] - q0[XI(k, F_RV)];
        r->icap2 = x[XI(k, F_RI2)] - q0[XI(k, F_RI2)];
        r->qload = x[XI(k, F_RQL)] - q0[XI(k, F_RQL)];
        br_link_stats *l = &st->link[k];
        l->q = x[XI(k, F_LQ)] - q0[XI(k, F_LQ)];
        l->i2 = x[XI(k, F_LI2)] - q0[XI(k, F_LI2)];
        l->e_cond = x[XI(k, F_LE)] - q0[XI(k, F_LE)];
    }
    st->qsupply = x[X_SQ] - q0[X_SQ];
    st->esupply = x[X_SE] - q0[X_SE];
    budget_stats(s);
    if (s->stats_set == BR_STATS_STARTUP)
        unkept(s, st);
    return st;
}

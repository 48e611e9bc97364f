/* sim_env.c - what the envelope driver asks of the simulator: a window
 * over one stretch of simulation, whether anything discrete is about to
 * change, a leap of whole periods and copies of the state.
 *
 * The envelope driver (envelope.c) integrates some periods and steps over
 * others along the rails' envelope.  It may do so only where the period
 * map is a smooth function of the rails: no driver toggles, no step of the
 * start-up pattern ends, the supply does not ramp, turn off or enter or
 * leave its current limit, the load does not start.  Every such discrete
 * change is answered for here, in br_sim_discrete_ahead, so that a new
 * kind (a schedule that changes from period to period) plugs in at one
 * place.  A period spent wholly in the current limit (or wholly out of
 * it) is a period of a smooth map: the supply's current is the limit's
 * function of the bypass voltage; only the periods where it enters or
 * leaves the limit are not.  A current-limited injection is held to
 * the stricter rule: no leap over a window in which it was at its limit,
 * turned off or retried, nor where its rail may come near enough for its
 * current to reach the limit (inj_limit_near). */
#include "engine/sim_impl.h"

#include "core/error.h"

#include <math.h>
#include <stddef.h>
#include <stdlib.h>
#include <string.h>

int br_sim_stages(const br_sim *s)
{
    return s->n;
}

double br_sim_period(const br_sim *s)
{
    return s->tm.T;
}

double br_sim_longest_lifetime(const br_sim *s)
{
    double tau = 0.0;
    for (int k = 1; k < s->n; k++)
        tau = fmax(tau, s->c->st[k].diode.tau);
    return tau;
}

/* The quadratures are the entries F_LQ .. NF-1 of each stage. */
#define QPER (NF - F_LQ)
_Static_assert(QPER *BR_N <= BR_SIM_QUAD_MAX, "BR_SIM_QUAD_MAX too small for the quadratures");

int br_sim_quad_count(const br_sim *s)
{
    return s->n * QPER;
}

void br_sim_quad(const br_sim *s, double *q)
{
    for (int k = 0; k < s->n; k++)
        memcpy(q + k * QPER, s->x + XI(k, F_LQ), sizeof(double) * QPER);
}

void br_sim_window_quad(const br_sim *s, double *dq)
{
    br_sim_quad(s, dq);
    for (int i = 0; i < s->n * QPER; i++)
        dq[i] -= s->winq[i];
}

/* With the variational equation on, the sensitivity starts again from
 * the identity: one period from here gives the period map's Jacobian. */
static void sensitivity_restart(br_sim *s)
{
    if (!s->var)
        return;
    for (int i = 0; i < s->n; i++)
        for (int j = 0; j < s->n; j++)
            s->x[s->phi0 + i * s->n + j] = i == j;
    s->k1_valid = 0;
}

static int ramping(const br_sim *s, double t)
{
    return t < s->tramp_end && s->c->tramp > 0;
}

/* The injections' hiccups so far, and how many are off now. */
static int inj_trips(const br_sim *s)
{
    int n = 0;
    for (int k = 1; s->injlimm && k < s->n; k++)
        n += s->inj[k].trips;
    return n;
}

static int inj_off(const br_sim *s)
{
    int n = 0;
    for (int k = 1; s->injlimm && k < s->n; k++)
        n += s->inj[k].off;
    return n;
}

static int inj_at_limit(const br_sim *s)
{
    for (int k = 1; s->injlimm && k < s->n; k++)
        if (s->inj[k].lim)
            return 1;
    return 0;
}

void br_sim_window_begin(br_sim *s)
{
    br_sim_win *w = &s->win;
    w->on = 1;
    w->t0 = s->t;
    w->toggles = 0;
    w->pre_idx = s->pre_idx;
    w->loaded = s->loaded;
    w->lim = 0;
    w->trips = s->sup.trips;
    w->off = s->sup.off;
    w->ilim = 0;
    w->itrips = inj_trips(s);
    w->ioff = inj_off(s);
    for (int k = 0; k < s->n; k++) {
        w->vmin[k] = HUGE_VAL;
        w->vmax[k] = -HUGE_VAL;
    }
    br_sim_quad(s, s->winq);
    sensitivity_restart(s);
}

void br_sim_window_track(br_sim *s)
{
    br_sim_win *w = &s->win;
    for (int k = 0; k < s->n; k++) {
        double v = s->vr[k];
        w->vmin[k] = v < w->vmin[k] ? v : w->vmin[k];
        w->vmax[k] = v > w->vmax[k] ? v : w->vmax[k];
    }
    w->lim |= s->sup.lim ? 1 : 2; /* as the statistics' stretch in the limit reads it */
    if (s->injlimm)
        w->ilim |= inj_at_limit(s) ? 1 : 2;
}

/* Did the supply change its law inside the window: into or out of its
 * current limit, off or on (a hiccup)? */
static int supply_moved(const br_sim *s)
{
    const br_sim_win *w = &s->win;
    if (w->lim == 3 || w->trips != s->sup.trips || w->off || s->sup.off)
        return 1;
    return s->injlimm && ((w->ilim & 1) || w->itrips != inj_trips(s) || w->ioff || inj_off(s));
}

int br_sim_window_quiet(const br_sim *s)
{
    const br_sim_win *w = &s->win;
    return w->on && w->toggles == 0 && w->pre_idx == s->pre_idx && w->loaded == s->loaded &&
           !ramping(s, w->t0) && !s->frozen && !supply_moved(s);
}

/* The earliest scheduled change of the pattern, the supply or the load
 * after now, s (HUGE_VAL: none). */
static double next_scheduled(const br_sim *s)
{
    double t = HUGE_VAL;
    if (s->pre_idx < s->npre)
        t = s->pre_end[s->pre_idx];
    if (ramping(s, s->t))
        t = fmin(t, s->t); /* the supply moves the period map all along */
    if (!s->loaded && s->load_at < HUGE_VAL)
        t = fmin(t, s->load_at);
    /* the supply's own law: a soft-start, a hiccup's timers (the
     * delay in the limit among them); while it is off its state is not
     * the rails' alone.  Its current limit is the rails' (limit_near) */
    t = fmin(t, br_sim_supply_next(s));
    if (s->sup.off)
        t = fmin(t, s->t);
    /* a loaded line cycle changes duty and current every period: no two
     * periods share a map */
    if (s->ac && s->loaded)
        t = fmin(t, s->t);
    return t;
}

int br_sim_window_why(const br_sim *s)
{
    const br_sim_win *w = &s->win;
    if (w->toggles > 0)
        return BR_WIN_UVLO;
    if (ramping(s, w->t0) || next_scheduled(s) <= s->t || supply_moved(s))
        return BR_WIN_SUPPLY;
    if (!w->on || w->pre_idx != s->pre_idx || w->loaded != s->loaded || s->frozen)
        return BR_WIN_SCHEDULE;
    return BR_WIN_QUIET;
}

/* Does driver k come within guard of its threshold with its rail's
 * extremes over the window moved by dv?  A running driver toggles at the
 * falling threshold, one held in UVLO at the rising one. */
static int uvlo_near(const br_sim *s, int k, double dv, double guard)
{
    const br_sim_win *w = &s->win;
    const br_driver *d = &s->c->st[k].drv;
    if (!(w->vmin[k] <= w->vmax[k]))
        return 1; /* nothing seen: nothing known */
    if (s->en[k])
        return !(br_sim_vdrv(s, k, w->vmin[k] + dv - guard) > d->uvlo_fall);
    return !(br_sim_vdrv(s, k, w->vmax[k] + dv + guard) < d->uvlo_rise);
}

/* Is the supply's current limit binding at bypass voltage v0 (open-
 * circuit voltage vs)? */
static int limit_binds(const br_sim *s, double vs, double v0)
{
    return (vs - v0) / s->c->rsupply > br_sim_supply_limit(s, v0);
}

/* Does the supply come within guard of entering or leaving its current
 * limit with the bypass voltage's extremes over the window moved by dv?
 * The current it would give, (Vs - v0) / Rs, falls as v0 rises and the
 * limit stays or rises (fold-back), so the limit binds below one bypass
 * voltage and not above: a window wholly in the limit keeps its highest
 * v0 below it, one wholly out of it its lowest above. */
static int limit_near(const br_sim *s, double dv, double guard)
{
    const br_sim_win *w = &s->win;
    if (s->c->limit_mode == BR_SUPPLY_UNLIMITED || !br_sim_bypass(s))
        return 0;
    if ((w->lim != 1 && w->lim != 2) || !(w->vmin[0] <= w->vmax[0]))
        return 1; /* both, or nothing seen */
    double vs = br_sim_supply_v(s, s->t);
    if (w->lim == 1)
        return !limit_binds(s, vs, w->vmax[0] + dv + guard);
    return limit_binds(s, vs, w->vmin[0] + dv - guard);
}

/* Could a current-limited injection reach its limit with its rail's
 * lowest voltage over the window moved by dv?  What its diode and
 * resistance would pass falls as the rail rises and its limit stays or
 * rises (fold-back), so it binds below one rail voltage and not above:
 * the window's lowest voltage less the guard decides. */
static int inj_limit_near(const br_sim *s, const double *dv, const double *guard)
{
    const br_sim_win *w = &s->win;
    for (int k = 1; s->injlimm && k < s->n; k++) {
        if (!br_sim_inj_limited(s, k))
            continue;
        const br_stage *st = &s->c->st[k];
        double v = w->vmin[k] + dv[k] - guard[k];
        if (!(w->vmin[k] <= w->vmax[k]))
            return 1;                           /* nothing seen: nothing known */
        double vinj = br_sim_inj_v(s, k, s->t); /* its start is a break of the schedule */
        if (!(br_diode_current(&st->diode, st->r_link, vinj - v) < br_sim_inj_limit(s, k, v)))
            return 1;
    }
    return 0;
}

int br_sim_discrete_ahead(const br_sim *s, const double *dvc, const double *guard, double t_end)
{
    if (!s->win.on || s->frozen || next_scheduled(s) <= t_end || supply_moved(s) ||
        limit_near(s, dvc[0], guard[0]) || inj_limit_near(s, dvc, guard))
        return 1;
    for (int k = 0; k < s->n; k++) {
        if (s->held[k] || uvlo_near(s, k, dvc[k], guard[k]))
            return 1;
    }
    return 0;
}

/* A time stamp moved on by dt (those at -HUGE_VAL mean none). */
static void shift(double *t, double dt)
{
    if (*t > -HUGE_VAL && *t < HUGE_VAL)
        *t += dt;
}

int br_sim_leap(br_sim *s, long m, const double *vc, const double *dq)
{
    double dt = (double)m * s->tm.T;
    if (m < 0 || (m > 0 && next_scheduled(s) < s->t + dt) || s->frozen)
        return BR_EUSAGE;
    s->t += dt;
    s->past -= dt;             /* the work limit allows for the periods simulated, not these */
    if (s->pre_idx >= s->npre) /* the PWM runs: its clock moves on with the rest */
        s->per += m;
    shift(&s->fly_t, dt);
    shift(&s->win.t0, dt);
    for (int k = 0; k < s->n; k++) {
        shift(&s->st0[k], dt);
        shift(&s->send[k], dt);
        shift(&s->tt0[k], dt);
        shift(&s->pulse_end[k], dt);
    }
    int k0 = br_sim_bypass(s) ? 0 : 1;
    for (int k = k0; vc && k < s->n; k++)
        s->x[XI(k, F_VC)] = vc[k];
    for (int k = 0; dq && k < s->n; k++)
        for (int f = 0; f < QPER; f++)
            s->x[XI(k, F_LQ + f)] += dq[k * QPER + f];
    s->k1_valid = 0;
    return BR_OK;
}

/* A part of the simulator that a copy leaves out or shortens: at byte
 * `at`, `len` long, of which the first `keep` bytes are copied. */
typedef struct hole {
    size_t at, len, keep;
} hole;

#define NHOLES 6

/* The parts a copy of s leaves out or shortens, by place in the struct:
 * the timing (built once by br_sim_create), the Runge-Kutta workspace
 * (rebuilt at every interval's start), and beyond the entries in use,
 * the state, the statistics' origin and the live list.  nx and nlive are
 * the entries in use (s->nx and s->nlive for a copy of s as it stands). */
static void holes(hole *h, int nx, int nlive)
{
    size_t bx = sizeof(double) * (size_t)nx;
    const br_sim *s = NULL;
    hole all[NHOLES] = {
        {offsetof(br_sim, tm), sizeof s->tm, 0},
        {offsetof(br_sim, live), sizeof s->live, sizeof(int) * (size_t)nlive},
        {offsetof(br_sim, x), sizeof s->x, bx},
        {offsetof(br_sim, k1), sizeof s->k1, 0},
        {offsetof(br_sim, rk), sizeof s->rk, 0},
        {offsetof(br_sim, quad0), sizeof s->quad0, bx},
    };
    memcpy(h, all, sizeof all);
    for (int i = 1; i < NHOLES; i++)
        for (int j = i; j > 0 && h[j].at < h[j - 1].at; j--) {
            hole tmp = h[j];
            h[j] = h[j - 1];
            h[j - 1] = tmp;
        }
}

/* Walk the parts a copy takes: fn(ctx, offset in the struct, length). */
static void walk_parts(int nx, int nlive, void (*fn)(void *, size_t, size_t), void *ctx)
{
    hole h[NHOLES];
    holes(h, nx, nlive);
    size_t at = 0;
    for (int i = 0; i < NHOLES; i++) {
        fn(ctx, at, h[i].at - at);
        fn(ctx, h[i].at, h[i].keep);
        at = h[i].at + h[i].len;
    }
    fn(ctx, at, sizeof(br_sim) - at);
}

typedef struct copier {
    char *dst;
    const char *src;
    size_t n; /* bytes so far (of a snapshot) */
    int mode; /* 0: struct to struct, 1: struct to snapshot, 2: snapshot to struct, 3: count */
} copier;

static void copy_part(void *ctx, size_t at, size_t len)
{
    copier *c = ctx;
    if (c->mode == 0)
        memcpy(c->dst + at, c->src + at, len);
    else if (c->mode == 1)
        memcpy(c->dst + c->n, c->src + at, len);
    else if (c->mode == 2)
        memcpy(c->dst + at, c->src + c->n, len);
    c->n += len;
}

/* dst becomes src (two simulators of one chain), copying only what
 * changes as it runs: a tenth of the struct on a 12-switch chain. */
static void copy_state(br_sim *dst, const br_sim *src)
{
    copier c = {(char *)dst, (const char *)src, 0, 0};
    walk_parts(src->nx, src->nlive, copy_part, &c);
    dst->k1_valid = 0;
}

struct br_sim_snap {
    int nx, nlive; /* entries in use when saved */
    size_t cap;    /* bytes data holds */
    char data[];
};

int br_sim_snap_create(const br_sim *s, br_sim_snap **out, br_error *err)
{
    int most = s->n * NF + s->n * s->n; /* state and sensitivity, at most */
    copier c = {NULL, NULL, 0, 3};
    walk_parts(most, most, copy_part, &c);
    *out = malloc(sizeof **out + c.n);
    if (!*out)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory for a simulator copy");
    (*out)->cap = c.n;
    (*out)->nx = (*out)->nlive = 0;
    return BR_OK;
}

void br_sim_snap_free(br_sim_snap *p)
{
    free(p);
}

void br_sim_save(const br_sim *s, br_sim_snap *p)
{
    copier c = {p->data, (const char *)s, 0, 1};
    p->nx = s->nx;
    p->nlive = s->nlive;
    walk_parts(s->nx, s->nlive, copy_part, &c);
}

/* The work a simulator has counted, kept across a restore or a copy. */
typedef struct work_count {
    unsigned long work, polled, evals, nsteps, nrejects;
    int halt;
    double halt_t, halt_periods;
} work_count;

static work_count work_get(const br_sim *s)
{
    work_count w = {s->work,     s->polled, s->evals,  s->nsteps,
                    s->nrejects, s->halt,   s->halt_t, s->halt_periods};
    return w;
}

static void work_put(br_sim *s, const work_count *w)
{
    s->work = w->work;
    s->polled = w->polled;
    s->evals = w->evals;
    s->nsteps = w->nsteps;
    s->nrejects = w->nrejects;
    if (w->halt && !s->halt) {
        s->halt = w->halt;
        s->halt_t = w->halt_t;
        s->halt_periods = w->halt_periods;
    }
}

void br_sim_restore(br_sim *s, const br_sim_snap *p)
{
    br_sim_observer obs = s->obs;
    void *gsl = s->gsl_step;
    work_count w = work_get(s);
    copier c = {(char *)s, p->data, 0, 2};
    walk_parts(p->nx, p->nlive, copy_part, &c);
    s->obs = obs;
    s->gsl_step = gsl;
    s->halt = 0;
    work_put(s, &w);
    s->k1_valid = 0;
}

int br_sim_clone(const br_sim *s, br_sim **out, br_error *err)
{
    *out = NULL;
    /* what copy_state leaves out is written before it is read (the
     * workspace) or never read (the unused tails), so the copy touches a
     * tenth of the struct's pages and needs no zeroing */
    br_sim *c = malloc(sizeof *c);
    if (!c)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory for a simulator copy");
    c->tm = s->tm;
    copy_state(c, s);
    memset(&c->obs, 0, sizeof c->obs);
    c->gsl_step = NULL; /* the reference stepper is not shared */
    if (s->gsl_step) {
        c->gsl_step = br_sim_gsl_alloc(s->nx);
        if (!c->gsl_step) {
            free(c);
            return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory for GSL");
        }
    }
    *out = c;
    return BR_OK;
}

void br_sim_assign(br_sim *dst, const br_sim *src)
{
    br_sim_observer obs = dst->obs;
    void *gsl = dst->gsl_step;
    copy_state(dst, src);
    dst->obs = obs;
    dst->gsl_step = gsl;
}

br_sim_observer br_sim_observer_get(const br_sim *s)
{
    return s->obs;
}

void br_sim_take_work(br_sim *dst, const br_sim *src)
{
    work_count w = work_get(src);
    work_put(dst, &w);
}

double br_sim_uvlo_excess(const br_sim *s, const double *vr)
{
    double worst = -HUGE_VAL;
    for (int k = 0; k < s->n; k++) {
        if (s->held[k])
            continue;
        const br_driver *d = &s->c->st[k].drv;
        double v = br_sim_vdrv_at(s, k, vr[k]);
        double ex = s->en[k] ? d->uvlo_fall - v : v - d->uvlo_rise;
        worst = ex > worst ? ex : worst;
    }
    return worst;
}

void br_sim_set_locator(br_sim *s, int secant)
{
    s->secant_locate = secant != 0;
}

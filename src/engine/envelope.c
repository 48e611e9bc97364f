/* envelope.c - stepping a simulator along the envelope of its rails
 * (envelope.h says what and why). */
#include "engine/envelope.h"

#include "core/error.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

#define N BR_MAX_SWITCHES
#define NQ BR_SIM_QUAD_MAX /* at least br_sim_quad_count */

/* The first step of a fresh model: the error control sets the next. */
#define BR_ENV_K0 16
/* Longest step, periods: the model is followed period by period, so a
 * step costs K n^2 multiplications, three times over. */
#define BR_ENV_KMAX 4096L
#define BR_ENV_FLOPS (1L << 22) /* K n^2 at most */
/* Steps tried from one boundary before a period is integrated instead. */
#define BR_ENV_TRIES 3
/* Margin kept from every UVLO threshold besides the rails' change over
 * two periods (the window's extremes lie somewhere in the last one), V. */
#define BR_ENV_GUARD 2e-3
/* A rail whose change per period is below this is standing still, V. */
#define BR_ENV_STILL 1e-7
/* Differences of the rails below this are the integrator's noise (it
 * holds each period to about 1e-6 of the rails), V. */
#define BR_ENV_NOISE 1e-4
/* The model's change per period may grow along a step to this many times
 * its first (a cascade passes a change upward, growing for a while); a
 * path growing beyond is a model gone wrong. */
#define BR_ENV_GROWTH 4.0
/* Stored charges are carried over a step as they stand: only where they
 * forget within a small part of the period (as the shooting solver takes
 * them). */
#define BR_ENV_MEMORY (1.0 / 50)

struct br_envelope {
    br_sim *s;         /* the simulator driven */
    br_sim *trial;     /* with replay: a copy that tries the steps */
    br_sim_snap *snap; /* without: where a step began, to go back to */
    int n, nq, replay;
    int may_step; /* no stored charge outlives BR_ENV_MEMORY periods */
    double T;
    /* the last integrated period: from rails a to pa (= P(a)), its
     * quadratures' increments h; valid when it was quiet and whole */
    double a[N], pa[N], h[NQ];
    int have_last;
    double B[N * N]; /* model of the Jacobian of the period map */
    int have_B;
    int var_next; /* the next period integrates the variational equation */
    long kmax;    /* longest next step the error control allows */
    int refused;  /* a step was thrown away since the last one kept */
    br_env_count count;
};

int br_envelope_create(br_sim *s, int replay, br_envelope **out, br_error *err)
{
    *out = NULL;
    br_envelope *e = calloc(1, sizeof *e);
    if (!e)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory for the envelope");
    int rc = replay ? br_sim_clone(s, &e->trial, err) : br_sim_snap_create(s, &e->snap, err);
    if (rc != BR_OK) {
        free(e);
        return rc;
    }
    e->s = s;
    br_sim_set_locator(s, 1); /* periods with events cost less (engine/sim.h) */
    e->n = br_sim_stages(s);
    e->nq = br_sim_quad_count(s);
    e->replay = replay;
    e->T = br_sim_period(s);
    e->may_step = br_sim_longest_lifetime(s) <= BR_ENV_MEMORY * e->T;
    e->kmax = BR_ENV_K0;
    *out = e;
    return BR_OK;
}

void br_envelope_free(br_envelope *e)
{
    if (!e)
        return;
    br_sim_free(e->trial);
    br_sim_snap_free(e->snap);
    free(e);
}

const br_env_count *br_envelope_count(const br_envelope *e)
{
    return &e->count;
}

/* ---- small dense algebra ------------------------------------------------ */

static void matvec(const double *A, const double *x, double *y, int n)
{
    for (int i = 0; i < n; i++) {
        double acc = 0.0;
        for (int j = 0; j < n; j++)
            acc += A[i * n + j] * x[j];
        y[i] = acc;
    }
}

/* Broyden's update: B dx = dp afterwards, B changed only along dx.  A dx
 * within the integrator's noise says nothing about the map's slope: then
 * B stays. */
static void broyden(double *B, const double *dx, const double *dp, int n)
{
    double bdx[N], dd = 0.0;
    matvec(B, dx, bdx, n);
    for (int j = 0; j < n; j++)
        dd += dx[j] * dx[j];
    if (!(dd > BR_ENV_NOISE * BR_ENV_NOISE))
        return;
    for (int i = 0; i < n; i++)
        for (int j = 0; j < n; j++)
            B[i * n + j] += (dp[i] - bdx[i]) * dx[j] / dd;
}

/* Largest magnitude; a NaN counts as infinite. */
static double max_abs(const double *v, int n)
{
    double m = 0.0;
    for (int i = 0; i < n; i++)
        m = !(fabs(v[i]) <= m) ? (isnan(v[i]) ? HUGE_VAL : fabs(v[i])) : m;
    return m;
}

/* ---- the predicted path ---------------------------------------------------
 * From the rails now (pa, the end of the last integrated period a -> pa)
 * the model P(x) = pa + B (x - a) gives the next periods' rails:
 * g_1 = B (pa - a), x_j = x_{j-1} + g_j, g_{j+1} = B g_j. */

typedef struct path {
    double x[N], g[N]; /* rails at the j-th boundary ahead, the change into it */
    double prev[N];    /* rails at the boundary before */
    long j;
} path;

static void path_start(const br_envelope *e, path *p)
{
    double ga[N];
    for (int k = 0; k < e->n; k++)
        ga[k] = e->pa[k] - e->a[k];
    matvec(e->B, ga, p->g, e->n);
    for (int k = 0; k < e->n; k++) {
        p->prev[k] = e->pa[k];
        p->x[k] = e->pa[k] + p->g[k];
    }
    p->j = 1;
}

static void path_next(const br_envelope *e, path *p)
{
    double g[N];
    matvec(e->B, p->g, g, e->n);
    for (int k = 0; k < e->n; k++) {
        p->g[k] = g[k];
        p->prev[k] = p->x[k];
        p->x[k] += g[k];
    }
    p->j++;
}

/* Is the boundary the path has reached, and the period into it, free of
 * anything discrete (t_end: the boundary's time)?  Also, does every rail
 * keep its direction (g0: the first change)?  A rail turning inside a
 * step would have its extremes inside it, where no period is integrated;
 * and a change growing far beyond the first is a model gone wrong. */
static int path_clear(const br_envelope *e, const path *p, const double *g0, double t_end)
{
    double dv[N], guard[N];
    if (max_abs(p->g, e->n) > BR_ENV_GROWTH * max_abs(g0, e->n) + BR_ENV_STILL)
        return 0;
    for (int k = 0; k < e->n; k++) {
        if (fabs(g0[k]) > BR_ENV_STILL && p->g[k] * g0[k] < 0.0)
            return 0;
        dv[k] = p->x[k] - e->pa[k];
        guard[k] = fabs(p->g[k]) + fabs(e->pa[k] - e->a[k]) + BR_ENV_GUARD;
    }
    return !br_sim_discrete_ahead(e->s, dv, guard, t_end);
}

/* Periods that fit between time t (a boundary) and t_goal with the
 * landing period after them. */
static long room(const br_envelope *e, double t, double t_goal)
{
    return (long)floor((t_goal - t) / e->T + 1e-6) - 1;
}

/* Longest step from time t (a boundary) that leaves its landing period
 * before t_goal and the path clear of anything discrete up to the end of
 * the landing period; 0 when no step of two periods or more fits. */
static long plan(const br_envelope *e, double t, double t_goal)
{
    long k = room(e, t, t_goal), flops = BR_ENV_FLOPS / ((long)e->n * e->n);
    k = k < e->kmax ? k : e->kmax;
    k = k < BR_ENV_KMAX ? k : BR_ENV_KMAX;
    k = k < flops ? k : flops;
    if (k < 2)
        return 0;
    path p;
    path_start(e, &p);
    double g0[N];
    memcpy(g0, p.g, sizeof g0);
    for (; p.j <= k + 1; path_next(e, &p)) /* periods 1 .. k, and the landing one */
        if (!path_clear(e, &p, g0, t + (double)p.j * e->T))
            return p.j - 2 >= 2 ? p.j - 2 : 0;
    return k;
}

/* A step of k periods: where it lands, the change the model predicts over
 * the landing period, and how far each stepped period has gone from the
 * last integrated period toward the landing one. */
typedef struct step_plan {
    long k;
    double y[N];    /* rails at the landing boundary */
    double gl[N];   /* predicted change over the landing period */
    double mid0[N]; /* midpoint of the last integrated period's rails */
    double dmid[N]; /* the landing period's midpoint less mid0 */
    double dd;      /* |dmid|^2 */
    double sig_sum; /* the progress summed over the stepped periods */
} step_plan;

/* Progress of stepped period j of sp (on path p, at its j-th boundary):
 * 0 at the last integrated period, 1 at the landing period, by the
 * rails' midpoints (by the period count where the rails stand still). */
static double progress(const br_envelope *e, const step_plan *sp, const path *p)
{
    if (!(sp->dd > 0.0))
        return (double)p->j / (double)(sp->k + 1);
    double num = 0.0;
    for (int i = 0; i < e->n; i++)
        num += (0.5 * (p->prev[i] + p->x[i]) - sp->mid0[i]) * sp->dmid[i];
    return num / sp->dd;
}

static void plan_fill(const br_envelope *e, long k, step_plan *sp)
{
    path p;
    path_start(e, &p);
    sp->k = k;
    while (p.j < k)
        path_next(e, &p);
    memcpy(sp->y, p.x, sizeof sp->y);
    path_next(e, &p); /* the landing period */
    memcpy(sp->gl, p.g, sizeof sp->gl);
    sp->dd = 0.0;
    for (int i = 0; i < e->n; i++) {
        sp->mid0[i] = 0.5 * (e->a[i] + e->pa[i]);
        sp->dmid[i] = sp->y[i] + 0.5 * sp->gl[i] - sp->mid0[i];
        sp->dd += sp->dmid[i] * sp->dmid[i];
    }
    sp->sig_sum = 0.0;
    for (path_start(e, &p); p.j <= k; path_next(e, &p))
        sp->sig_sum += progress(e, sp, &p);
}

/* The step's error: the landing period changed the rails by d more than
 * the model said.  Taking the model's miss to grow with the progress over
 * the step, the rails' error at the landing boundary is the sum of
 * e_j = B e_{j-1} + sig_j d (into err); returns its largest entry. */
static double step_error(const br_envelope *e, const step_plan *sp, const double *d, double *err)
{
    double tmp[N];
    path p;
    memset(err, 0, sizeof(double) * (size_t)e->n);
    for (path_start(e, &p); p.j <= sp->k; path_next(e, &p)) {
        double sig = progress(e, sp, &p);
        matvec(e->B, err, tmp, e->n);
        for (int i = 0; i < e->n; i++)
            err[i] = tmp[i] + sig * d[i];
    }
    return max_abs(err, e->n);
}

/* ---- integrated periods ------------------------------------------------- */

/* Does a step promise enough periods to pay for the variational equation
 * (about 1 + n/4 plain periods)?  Judged on the path the last period's
 * change continued in a straight line. */
static int worth_variational(const br_envelope *e, double t, double t_goal)
{
    long need = (long)ceil(1.0 + e->n / 4.0) + 4;
    if (!e->may_step || room(e, t, t_goal) < need)
        return 0;
    path p;
    for (int k = 0; k < e->n; k++) {
        p.g[k] = e->pa[k] - e->a[k];
        p.x[k] = e->pa[k] + p.g[k];
    }
    for (p.j = 1; p.j <= need + 1; p.j++) {
        if (!path_clear(e, &p, p.g, t + (double)p.j * e->T))
            return 0;
        for (int k = 0; k < e->n; k++)
            p.x[k] += p.g[k];
    }
    return 1;
}

/* A period a -> pa integrated after the last one: the model learns its
 * secant, and the next step's length follows from how far the model
 * missed it (d1): a step of k periods misses by about k^2 d1 / 2, the
 * miss growing along it. */
static void learn(br_envelope *e, const double *a, const double *pa)
{
    double dx[N] = {0}, dp[N] = {0}, bdx[N] = {0}, d1 = 0.0;
    for (int k = 0; k < e->n; k++) {
        dx[k] = a[k] - e->a[k];
        dp[k] = pa[k] - e->pa[k];
    }
    matvec(e->B, dx, bdx, e->n);
    for (int k = 0; k < e->n; k++)
        d1 = fmax(d1, fabs(dp[k] - bdx[k]));
    broyden(e->B, dx, dp, e->n);
    double k = d1 > 0.0 ? sqrt(2.0 * BR_ENV_TOL / d1) : (double)BR_ENV_KMAX;
    e->kmax = (long)fmin((double)BR_ENV_KMAX, floor(1.5 * k));
}

/* What an integrated period a -> pa (quadratures' increments h) teaches:
 * a quiet one the model, with the variational equation its Jacobian
 * afresh; any other, that the model no longer holds. */
static void remember(br_envelope *e, int quiet, int var, const double *a, const double *pa,
                     const double *h)
{
    if (!quiet) {
        e->have_last = e->have_B = 0;
        return;
    }
    if (var) {
        br_sim_sensitivity(e->s, e->B);
        e->have_B = 1;
        e->kmax = BR_ENV_K0;
    } else if (e->have_B && e->have_last) {
        learn(e, a, pa);
    }
    memcpy(e->a, a, sizeof(double) * (size_t)e->n);
    memcpy(e->pa, pa, sizeof(double) * (size_t)e->n);
    memcpy(e->h, h, sizeof(double) * (size_t)e->nq);
    e->have_last = 1;
}

/* Integrate one period (or what is left to t_goal) and learn from it;
 * why: what kept it from being stepped over, unless the period itself
 * saw something discrete. */
static int integrate(br_envelope *e, double t_goal, int why, br_error *err)
{
    br_sim *s = e->s;
    double t = br_sim_time(s), tn = fmin(t + e->T, t_goal);
    int whole = tn >= t + e->T * (1.0 - 1e-9), var = e->var_next && whole;
    double a[N], pa[N], h[NQ];
    br_sim_set_variational(s, var);
    br_sim_window_begin(s);
    br_sim_vc(s, a);
    int rc = br_sim_run_until(s, tn, err);
    e->count.integrated++;
    e->var_next = 0;
    if (rc != BR_OK)
        return rc;
    br_sim_vc(s, pa);
    br_sim_window_quad(s, h);
    int seen = br_sim_window_why(s);
    e->count.why[seen != BR_WIN_QUIET ? seen : var ? BR_ENV_WHY_MODEL : why]++;
    remember(e, whole && br_sim_window_quiet(s), var, a, pa, h);
    br_sim_set_variational(s, 0);
    e->var_next = e->have_last && !e->have_B && worth_variational(e, tn, t_goal);
    return BR_OK;
}

/* ---- a step along the envelope ------------------------------------------ */

/* Leap sim by the plan and integrate the landing period on it; the leap
 * credits each stepped period with the last integrated period's
 * increments of the quadratures. */
static int leap_and_land(br_envelope *e, br_sim *sim, const step_plan *sp, double t, br_error *err)
{
    double dq[NQ];
    for (int i = 0; i < e->nq; i++)
        dq[i] = (double)sp->k * e->h[i];
    if (br_sim_leap(sim, sp->k, sp->y, dq) != BR_OK)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "envelope step across a scheduled change (internal error)");
    br_sim_set_variational(sim, 0);
    br_sim_window_begin(sim);
    return br_sim_run_until(sim, t + (double)(sp->k + 1) * e->T, err);
}

/* Run the step's trial: on the simulator itself, its observer set aside
 * and its state saved to go back to; with replay on the copy. */
static int trial(br_envelope *e, const step_plan *sp, double t, br_error *err)
{
    br_sim *s = e->s;
    if (e->replay) {
        br_sim_assign(e->trial, s);
        int rc = leap_and_land(e, e->trial, sp, t, err);
        br_sim_take_work(s, e->trial); /* its work counts all the same */
        return rc;
    }
    br_sim_save(s, e->snap);
    br_sim_observer obs = br_sim_observer_get(s);
    br_sim_set_observer(s, NULL);
    int rc = leap_and_land(e, s, sp, t, err);
    br_sim_set_observer(s, &obs);
    return rc;
}

/* Keep a step that landed at pl with the error estimate err (rails) and
 * the landing period's increments hb.  Local extrapolation: the estimate
 * is also the correction, the landing boundary moved by err and the
 * rails after the landing period by B err (the period map's response);
 * each stepped period's quadratures move from the last integrated
 * period's increments toward the landing period's by its progress. */
static int keep(br_envelope *e, const step_plan *sp, double t, const double *pl, const double *errv,
                const double *hb, br_error *err)
{
    br_sim *s = e->s;
    if (e->replay) {
        int rc = leap_and_land(e, s, sp, t, err); /* again, for the observer */
        if (rc != BR_OK)
            return rc;
    }
    double fix[NQ], be[N], ya[N], pc[N];
    for (int i = 0; i < e->nq; i++)
        fix[i] = sp->sig_sum * (hb[i] - e->h[i]);
    matvec(e->B, errv, be, e->n);
    for (int k = 0; k < e->n; k++) {
        ya[k] = sp->y[k] + errv[k];
        pc[k] = pl[k] + be[k];
    }
    br_sim_leap(s, 0, pc, fix);
    memcpy(e->a, ya, sizeof(double) * (size_t)e->n);
    memcpy(e->pa, pc, sizeof(double) * (size_t)e->n);
    memcpy(e->h, hb, sizeof(double) * (size_t)e->nq);
    e->count.stepped += sp->k;
    e->count.integrated++;
    e->count.why[BR_ENV_WHY_LANDING]++;
    e->count.steps++;
    return BR_OK;
}

/* Try a step of sp->k periods and its landing period; keep it when the
 * landing period was quiet and the error within the tolerance (*kept
 * says which), else go back to where it began.  Either way the model
 * learns from the landing period, and the next step's length follows the
 * error as a Runge-Kutta step's does. */
static int try_step(br_envelope *e, const step_plan *sp, int *kept, br_error *err)
{
    br_sim *s = e->s, *run = e->replay ? e->trial : e->s;
    double t = br_sim_time(s), pl[N], d[N], dx[N], dp[N], errv[N], hb[NQ];
    *kept = 0;
    int rc = trial(e, sp, t, err);
    if (rc != BR_OK) {
        /* a trial that failed (a step size underflow from where the leap
         * landed, the work limit, a stop) decides nothing: back to where
         * it began, and the period is integrated; a limit or a stop holds
         * there too (the simulator keeps it) */
        if (!e->replay)
            br_sim_restore(s, e->snap);
        br_error_clear(err);
        e->count.rejected++;
        e->refused = 1;
        e->kmax = (long)fmax(1.0, floor(0.25 * (double)sp->k));
        return BR_OK;
    }
    br_sim_vc(run, pl);
    br_sim_window_quad(run, hb);
    int quiet = br_sim_window_quiet(run);
    for (int k = 0; k < e->n; k++) {
        d[k] = (pl[k] - sp->y[k]) - sp->gl[k];
        dx[k] = sp->y[k] - e->a[k];
        dp[k] = pl[k] - e->pa[k];
    }
    double est = step_error(e, sp, d, errv);
    /* the arithmetic's work: three walks of k steps of n^2 */
    if ((rc = br_sim_charge(s, (unsigned long)(3 * sp->k * e->n * e->n / 4096 + 1), err)))
        return rc;
    double f = est > 0.0 ? 0.9 * sqrt(BR_ENV_TOL / est) : 4.0;
    if (quiet) /* the landing period is a period of the same map */
        broyden(e->B, dx, dp, e->n);
    if (!quiet || !(est <= BR_ENV_TOL)) {
        e->count.rejected++;
        e->refused = 1;
        e->kmax = (long)fmax(1.0, floor(sp->k * (quiet ? fmin(f, 0.5) : 0.25)));
        if (!e->replay) /* back to where the step began, the work counted */
            br_sim_restore(s, e->snap);
        return BR_OK;
    }
    /* the first step kept after one thrown away does not grow: the
     * estimate just failed to see the error coming (as after a rejected
     * Runge-Kutta step: Hairer, Norsett and Wanner, Solving Ordinary
     * Differential Equations I, section II.4); growing again at once
     * threw every other step away in the tail of reference c2 */
    double grow = e->refused ? 1.0 : 4.0;
    e->refused = 0;
    e->kmax = (long)fmin((double)BR_ENV_KMAX, floor(sp->k * fmin(f, grow)));
    *kept = 1;
    return keep(e, sp, t, pl, errv, hb, err);
}

int br_envelope_advance(br_envelope *e, double t_goal, br_error *err)
{
    /* a quiet last period with no model and none coming: a step would
     * not get far enough to pay for it (worth_variational) */
    int building = !e->have_last || (!e->have_B && e->var_next);
    int why = building                   ? BR_ENV_WHY_MODEL
              : e->have_B && e->kmax < 2 ? BR_ENV_WHY_REJECTED /* the error control's */
                                         : BR_ENV_WHY_AHEAD;
    for (int tries = 0; e->have_last && e->have_B && tries < BR_ENV_TRIES; tries++) {
        long k = plan(e, br_sim_time(e->s), t_goal);
        if (k < 2)
            break;
        step_plan sp;
        plan_fill(e, k, &sp);
        int kept, rc = try_step(e, &sp, &kept, err);
        if (rc != BR_OK || kept)
            return rc;
        why = BR_ENV_WHY_REJECTED;
    }
    return integrate(e, t_goal, why, err);
}

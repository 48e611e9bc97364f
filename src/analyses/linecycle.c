/* linecycle.c - the periodic steady state over an AC line cycle.
 *
 * With a line cycle the chain is periodic in the line period, K switching
 * periods, not in one of them.  The unknowns are the rail voltages (and a
 * bypass capacitor) at a quiet instant of the line period's first
 * switching period; the map P_L simulates the whole line period from
 * them.  The periodic state solves P_L(x) = x by Newton's method with a
 * secant (Broyden) Jacobian started from P_L' = 0:
 *
 *  - the first step is the plain one, x <- P_L(x): over thousands of
 *    switching periods every rail forgets where it started (on the
 *    examples the map contracts by a factor of 1e-2 or less), so the
 *    plain step lands within microvolts of the periodic state;
 *  - Broyden's updates learn the slow modes where the map contracts less;
 *    when the residual stops falling tenfold a map, the exact Jacobian of
 *    P_L, the product of every switching period's sensitivity, is
 *    integrated with the variational equation over one line period (it
 *    costs about five plain maps, so only then);
 *  - converged when the Newton step, the distance to the periodic state,
 *    is below the tolerance and no driver dropped out; the figures are
 *    those of the map from that state, and its change over the line
 *    period is the drift the verdict checks (as one period's is at DC;
 *    check_periods above one simulate more line periods).
 *
 * The start is the quasi-static state of the line period's first
 * switching period: that period repeated for ever (one-period shooting,
 * br_steady_solve with line_hold).  Stored charges forget their start
 * within a switching period and are carried from map to map.
 *
 * Bounded: at most BR_LINE_MAPS maps (fewer with the options' max_iter),
 * each map with the exact Jacobian about five maps' work; cancellable through the progress hook,
 * called every BR_LINE_PROGRESS_EVERY switching periods.  Deterministic: every map starts from a
 * reset simulator. */
#include "analyses/steady.h"

#include "core/error.h"

#include <gsl/gsl_linalg.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#define NX (2 * BR_MAX_SWITCHES)
#define BR_LINE_MAPS 8            /* line periods the Newton iteration may simulate */
#define BR_LINE_PROGRESS_EVERY 64 /* switching periods between progress calls */

/* ---- the envelope ---------------------------------------------------------------- */

br_line_env *br_line_env_create(long K, int n)
{
    br_line_env *e = calloc(1, sizeof *e);
    if (!e || K <= 0 || n <= 0) {
        free(e);
        return NULL;
    }
    e->K = K;
    e->n = n;
    e->rows = K < BR_ENV_ROWS ? (int)K : BR_ENV_ROWS;
    size_t cells = (size_t)e->rows * (size_t)n;
    double **arr[] = {&e->vmin, &e->vmax, &e->dmin, &e->dmax, &e->vrev, &e->q};
    for (size_t i = 0; i < sizeof arr / sizeof arr[0]; i++)
        if (!(*arr[i] = malloc(sizeof(double) * cells))) {
            br_line_env_free(e);
            return NULL;
        }
    return e;
}

void br_line_env_free(br_line_env *e)
{
    if (!e)
        return;
    free(e->vmin);
    free(e->vmax);
    free(e->dmin);
    free(e->dmax);
    free(e->vrev);
    free(e->q);
    free(e);
}

long br_line_env_first(const br_line_env *e, int r)
{
    return (long)((double)r * (double)e->K / e->rows + 0.5);
}

static int env_row(const br_line_env *e, long m)
{
    int r = (int)((double)m * e->rows / (double)e->K);
    while (r + 1 < e->rows && br_line_env_first(e, r + 1) <= m)
        r++;
    while (r > 0 && br_line_env_first(e, r) > m)
        r--;
    return r;
}

static void env_clear(br_line_env *e)
{
    size_t cells = (size_t)e->rows * (size_t)e->n;
    for (size_t i = 0; i < cells; i++) {
        e->vmin[i] = e->dmin[i] = HUGE_VAL;
        e->vmax[i] = e->dmax[i] = e->vrev[i] = -HUGE_VAL;
        e->q[i] = 0.0;
    }
}

static void env_take(br_line_env *e, long m, const br_stats *p)
{
    int r = env_row(e, m);
    for (int k = 0; k < e->n; k++) {
        size_t i = (size_t)r * (size_t)e->n + (size_t)k;
        const br_rail_stats *rs = &p->rail[k];
        e->vmin[i] = fmin(e->vmin[i], rs->vmin);
        e->vmax[i] = fmax(e->vmax[i], rs->vmax);
        e->dmin[i] = fmin(e->dmin[i], rs->vdrv_min);
        e->dmax[i] = fmax(e->dmax[i], rs->vdrv_max);
        e->vrev[i] = k > 0 ? fmax(e->vrev[i], p->link[k].vrev_peak) : NAN;
        e->q[i] += k > 0 ? p->link[k].q : 0.0;
    }
}

/* ---- one line period ---------------------------------------------------------------- */

typedef struct line_run {
    const br_chain *c;
    const br_steady_opts *o;
    br_sim *sim;
    double phase;
    long K;
    int m, mv;       /* unknowns, of which rail voltages */
    int idx[NX];     /* their places in the full state */
    double base[NX]; /* the full state the unknowns are written into */
    int dropped;     /* a driver toggled during the map */
    long periods;    /* switching periods simulated */
    double work;     /* the progress estimate, switching periods */
    br_stats total;  /* the last recorded map over the line period */
    long at_dmin[BR_MAX_SWITCHES], at_dmax[BR_MAX_SWITCHES];
    long at_vcap[BR_MAX_SWITCHES], at_vrev[BR_MAX_SWITCHES];
    /* the rail's own extreme in the window of the driver supply's, which
     * decides between windows where a regulator holds the supply flat */
    double tie_min[BR_MAX_SWITCHES], tie_max[BR_MAX_SWITCHES];
    br_line_env *env; /* NULL: none asked for */
} line_run;

static void on_uvlo(void *ctx, const br_uvlo_event *e)
{
    (void)e;
    ((line_run *)ctx)->dropped = 1;
}

static void map_unknowns(line_run *lr)
{
    const br_chain *c = lr->c;
    lr->m = 0;
    if (c->csupply > 0 && c->rsupply > 0)
        lr->idx[lr->m++] = 0;
    for (int k = 1; k < c->n; k++)
        lr->idx[lr->m++] = k;
    lr->mv = lr->m;
}

/* Keep the extreme and the window it came from. */
static void keep_max(double *v, long *at, double x, long m)
{
    if (x > *v) {
        *v = x;
        *at = m;
    }
}

/* The window of the lowest (sign 1) or highest (sign -1) driver supply;
 * among windows where it is just as low (a regulator holding it flat),
 * the one where the rail itself is. */
static void keep_drv(double *v, double *tie, long *at, double x, double rail, long m, double sign)
{
    if (sign * x < sign * *v || (x == *v && sign * rail < sign * *tie)) {
        *v = x;
        *tie = rail;
        *at = m;
    }
}

/* Window m's statistics into the line period's: sums of the integrals,
 * extremes of the extremes (and where they came from). */
static void stats_merge(line_run *lr, const br_stats *p, long m)
{
    br_stats *t = &lr->total;
    if (m == 0) {
        *t = *p;
        for (int k = 0; k < lr->c->n; k++) {
            lr->at_dmin[k] = lr->at_dmax[k] = lr->at_vcap[k] = lr->at_vrev[k] = 0;
            lr->tie_min[k] = p->rail[k].vmin;
            lr->tie_max[k] = p->rail[k].vmax;
        }
        return;
    }
    t->t1 = p->t1;
    for (int k = 0; k < lr->c->n; k++) {
        br_rail_stats *r = &t->rail[k];
        const br_rail_stats *q = &p->rail[k];
        r->vint += q->vint;
        keep_drv(&r->vdrv_min, &lr->tie_min[k], &lr->at_dmin[k], q->vdrv_min, q->vmin, m, 1.0);
        keep_drv(&r->vdrv_max, &lr->tie_max[k], &lr->at_dmax[k], q->vdrv_max, q->vmax, m, -1.0);
        r->vmin = fmin(r->vmin, q->vmin);
        r->vmax = fmax(r->vmax, q->vmax);
        r->icap2 += q->icap2;
        r->qload += q->qload;
        r->e_load += q->e_load;
        r->e_run += q->e_run;
        r->e_standby += q->e_standby;
        r->e_gate += q->e_gate;
        r->e_clamp += q->e_clamp;
        keep_max(&r->vc_max, &lr->at_vcap[k], q->vc_max, m);
        br_link_stats *l = &t->link[k];
        const br_link_stats *b = &p->link[k];
        l->q += b->q;
        l->i2 += b->i2;
        l->ipeak = fmax(l->ipeak, b->ipeak);
        keep_max(&l->vrev_peak, &lr->at_vrev[k], b->vrev_peak, m);
        l->qrr += b->qrr;
        l->irrm = fmax(l->irrm, b->irrm);
        l->dpeak = fmax(l->dpeak, b->dpeak);
        l->e_cond += b->e_cond;
        l->e_rr += b->e_rr;
        l->e_leak += b->e_leak;
        l->e_other += b->e_other;
        l->e_res += b->e_res;
        l->e_sw += b->e_sw;
        l->e_stage += b->e_stage;
    }
    /* every energy of the budget is a sum over the line period, so that
     * the losses balance what the supply and the power stage deliver */
    t->qsupply += p->qsupply;
    t->esupply += p->esupply;
    t->e_rsupply += p->e_rsupply;
    t->isup_peak = fmax(t->isup_peak, p->isup_peak);
    t->t_limit += p->t_limit;
    t->lim_stretch = fmax(t->lim_stretch, p->lim_stretch);
    t->sup_trips += p->sup_trips;
    t->e_stored += p->e_stored;
}

/* The next switching period of a map, recorded when asked. */
static int window(line_run *lr, long m, int record, br_error *err)
{
    if (record)
        br_sim_stats_start(lr->sim);
    int rc = br_sim_run_until(lr->sim, (double)(m + 1) * lr->c->T, err);
    lr->periods++;
    if (rc == BR_OK && record) {
        const br_stats *p = br_sim_stats(lr->sim);
        stats_merge(lr, p, m);
        if (lr->env)
            env_take(lr->env, m, p);
    }
    if (rc == BR_OK && (m + 1) % BR_LINE_PROGRESS_EVERY == 0 && lr->o->progress)
        rc = br_progress_call(lr->o->progress, (double)lr->periods, fmax(lr->work, lr->periods),
                              err);
    return rc;
}

/* pz = P_L(z): one line period from z; recorded (figures, where, the
 * envelope) when asked. */
static int line_map(line_run *lr, const double *z, double *pz, int record, br_error *err)
{
    double x[NX], out[NX];
    memcpy(x, lr->base, sizeof x);
    for (int i = 0; i < lr->m; i++)
        x[lr->idx[i]] = z[i];
    br_sim_reset_running_at(lr->sim, x, lr->phase);
    lr->dropped = 0;
    if (record && lr->env)
        env_clear(lr->env);
    int rc = BR_OK;
    for (long m = 0; m < lr->K && rc == BR_OK; m++)
        rc = window(lr, m, record, err);
    if (rc != BR_OK)
        return rc;
    br_sim_state(lr->sim, out);
    for (int i = 0; i < lr->m; i++)
        pz[i] = out[lr->idx[i]];
    for (int k = 1; k < lr->c->n; k++) /* stored charges carry over */
        lr->base[lr->c->n + k] = out[lr->c->n + k];
    return BR_OK;
}

/* ---- Newton with a secant Jacobian ---------------------------------------------------- */

/* dz solves B dz = -F; returns 0, or -1 when B is singular. */
static int solve_step(const gsl_matrix *B, gsl_matrix *LU, gsl_permutation *p, const double *F,
                      double *dz, int m)
{
    int sign;
    gsl_matrix_memcpy(LU, B);
    if (gsl_linalg_LU_decomp(LU, p, &sign) != GSL_SUCCESS || !isfinite(gsl_linalg_LU_lndet(LU)))
        return -1;
    gsl_vector_view v = gsl_vector_view_array(dz, (size_t)m);
    for (int i = 0; i < m; i++)
        dz[i] = -F[i];
    if (gsl_linalg_LU_svx(LU, p, &v.vector) != GSL_SUCCESS)
        return -1;
    for (int i = 0; i < m; i++)
        if (!isfinite(dz[i]))
            return -1;
    return 0;
}

/* Broyden's rank-one update of B after step dz changed F by dF. */
static void secant(gsl_matrix *B, const double *dz, const double *dF, int m)
{
    double dd = 0.0, bdz[NX];
    for (int i = 0; i < m; i++) {
        dd += dz[i] * dz[i];
        bdz[i] = 0.0;
        for (int j = 0; j < m; j++)
            bdz[i] += gsl_matrix_get(B, (size_t)i, (size_t)j) * dz[j];
    }
    if (!(dd > 0.0))
        return;
    for (int i = 0; i < m; i++)
        for (int j = 0; j < m; j++)
            gsl_matrix_set(B, (size_t)i, (size_t)j,
                           gsl_matrix_get(B, (size_t)i, (size_t)j) + (dF[i] - bdz[i]) * dz[j] / dd);
}

/* B = Phi_L - I from the sensitivity integrated over the last map. */
static void exact_jacobian(const line_run *lr, gsl_matrix *B)
{
    int n = lr->c->n;
    double phi[BR_MAX_SWITCHES * BR_MAX_SWITCHES];
    br_sim_sensitivity(lr->sim, phi);
    for (int i = 0; i < lr->m; i++)
        for (int j = 0; j < lr->m; j++)
            gsl_matrix_set(B, (size_t)i, (size_t)j,
                           phi[lr->idx[i] * n + lr->idx[j]] - (i == j ? 1.0 : 0.0));
}

/* No rail moves by more than about the supply: a longer step (a map
 * bending at a UVLO crossing) is cut to half the supply. */
static void limit_step(const line_run *lr, double *dz)
{
    double cap = 0.5 * lr->c->vsupply, big = 0.0;
    for (int i = 0; i < lr->m; i++)
        big = fmax(big, fabs(dz[i]));
    if (cap > 0 && big > cap)
        for (int i = 0; i < lr->m; i++)
            dz[i] *= cap / big;
}

static double largest(const double *v, int m)
{
    double w = 0.0;
    for (int i = 0; i < m; i++)
        w = isnan(v[i]) ? HUGE_VAL : fmax(w, fabs(v[i]));
    return w;
}

/* The rail that moved most in F (an index into the chain's rails). */
static int moving_most(const line_run *lr, const double *F)
{
    int most = lr->idx[0];
    double w = -1.0;
    for (int i = 0; i < lr->mv; i++)
        if (fabs(F[i]) > w || isnan(F[i])) {
            w = isnan(F[i]) ? HUGE_VAL : fabs(F[i]);
            most = lr->idx[i];
        }
    return most;
}

typedef struct newton {
    gsl_matrix *B, *LU;
    gsl_permutation *p;
} newton;

static void newton_free(newton *nw)
{
    gsl_matrix_free(nw->B);
    gsl_matrix_free(nw->LU);
    gsl_permutation_free(nw->p);
}

static int newton_alloc(newton *nw, int m, br_error *err)
{
    nw->B = gsl_matrix_alloc((size_t)m, (size_t)m);
    nw->LU = gsl_matrix_alloc((size_t)m, (size_t)m);
    nw->p = gsl_permutation_alloc((size_t)m);
    if (nw->B && nw->LU && nw->p) {
        gsl_matrix_set_identity(nw->B);
        gsl_matrix_scale(nw->B, -1.0); /* P_L' = 0: the plain step */
        return BR_OK;
    }
    newton_free(nw);
    return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory in the line-cycle solver");
}

/* Newton on P_L(z) = z from z (in/out).  Returns 1 when converged. */
static int iterate(line_run *lr, double *z, br_steady *out, int maps, br_error *err, int *rc)
{
    newton nw;
    int m = lr->m, ok = 0, exact = 0;
    double pz[NX], F[NX], Fp[NX] = {0}, dz[NX] = {0}, dF[NX], last = HUGE_VAL;
    if ((*rc = newton_alloc(&nw, m, err)) != BR_OK)
        return 0;
    for (int it = 0; it < maps && *rc == BR_OK; it++) {
        /* the figures of a map are kept when it may be the answer (not
         * the first one from the quasi-static start, a quarter volt away)
         * and from the last one, which an unsettled state reports */
        int record = it > 0 || lr->o->guess || it == maps - 1;
        br_sim_set_variational(lr->sim, exact);
        if ((*rc = line_map(lr, z, pz, record, err)) != BR_OK)
            break;
        out->iterations = it + 1;
        for (int i = 0; i < m; i++) {
            F[i] = pz[i] - z[i];
            dF[i] = F[i] - Fp[i];
        }
        out->residual = largest(F, lr->mv);
        out->resid_rail = moving_most(lr, F);
        if (exact)
            exact_jacobian(lr, nw.B);
        else if (it > 0)
            secant(nw.B, dz, dF, m);
        if (solve_step(nw.B, nw.LU, nw.p, F, dz, m) != 0)
            memcpy(dz, F, sizeof(double) * (size_t)m); /* the plain step */
        double step = largest(dz, lr->mv);
        if ((ok = step <= lr->o->tol && !lr->dropped)) {
            if (!record) /* the same map again, for its figures */
                *rc = line_map(lr, z, pz, 1, err);
            break;
        }
        limit_step(lr, dz);
        for (int i = 0; i < m; i++)
            z[i] += dz[i];
        memcpy(Fp, F, sizeof Fp);
        /* the exact Jacobian when the residual no longer falls tenfold a
         * map (a slow mode), but not twice running */
        exact = it > 0 && out->residual > 0.1 * last && !exact;
        last = out->residual;
    }
    br_sim_set_variational(lr->sim, 0);
    newton_free(&nw);
    return ok;
}

/* ---- the whole solve ---------------------------------------------------------------- */

/* The quasi-static state of the line period's first switching period
 * (that period repeated), or the cold estimate when it is not found. */
static int start_state(const br_chain *c, const br_steady_opts *o, double *x, br_error *err)
{
    if (o->guess) {
        memcpy(x, o->guess, sizeof(double) * NX);
        return BR_OK;
    }
    br_steady_opts so;
    br_steady held;
    br_steady_opts_default(&so);
    so.line_hold = 0;
    so.check_periods = 0;
    int rc = br_steady_solve(c, BR_DIRI_LINE, &so, &held, err);
    if (rc == BR_ENUMERIC) {
        br_error_clear(err);
        rc = BR_OK;
    }
    if (rc == BR_OK && held.converged)
        memcpy(x, held.x, sizeof(double) * NX);
    else if (rc == BR_OK)
        br_steady_estimate(c, BR_DIRI_LINE, x);
    return rc;
}

/* The cross-check, as for one switching period (steady.c): how far the
 * line period from z moves the rails, and whether every driver keeps
 * running.  The converged map is the first line period; check_periods
 * above one continue from where it ended. */
static int cross_check(line_run *lr, const double *z, br_steady *out, br_error *err)
{
    double b[NX];
    int checks = lr->o->check_periods > 1 ? lr->o->check_periods : 1, rc = BR_OK;
    double t0 = br_sim_time(lr->sim);
    for (long p = 1; p <= (checks - 1) * lr->K && rc == BR_OK; p++) {
        rc = br_sim_run_until(lr->sim, t0 + (double)p * lr->c->T, err);
        lr->periods++;
        if (rc == BR_OK && p % BR_LINE_PROGRESS_EVERY == 0 && lr->o->progress)
            rc = br_progress_call(lr->o->progress, (double)lr->periods, fmax(lr->work, lr->periods),
                                  err);
    }
    if (rc != BR_OK)
        return rc;
    br_sim_state(lr->sim, b);
    double w = 0.0;
    for (int i = 0; i < lr->mv; i++)
        w = fmax(w, fabs(b[lr->idx[i]] - z[i]));
    out->drift = w / checks;
    out->holds = !lr->dropped;
    for (int k = 1; k < lr->c->n; k++)
        out->holds = out->holds && br_sim_enabled(lr->sim, k);
    return BR_OK;
}

static void take_results(const line_run *lr, const double *z, br_steady *out)
{
    memcpy(out->x, lr->base, sizeof out->x);
    for (int i = 0; i < lr->m; i++)
        out->x[lr->idx[i]] = z[i];
    out->stats = lr->total;
    memcpy(out->at_dmin, lr->at_dmin, sizeof out->at_dmin);
    memcpy(out->at_dmax, lr->at_dmax, sizeof out->at_dmax);
    memcpy(out->at_vcap, lr->at_vcap, sizeof out->at_vcap);
    memcpy(out->at_vrev, lr->at_vrev, sizeof out->at_vrev);
}

static int solve(line_run *lr, const double *x0, br_steady *out, br_error *err)
{
    double z[NX];
    memcpy(lr->base, x0, sizeof lr->base);
    map_unknowns(lr);
    for (int i = 0; i < lr->m; i++)
        z[i] = x0[lr->idx[i]];
    int maps =
        lr->o->max_iter > 0 && lr->o->max_iter < BR_LINE_MAPS ? lr->o->max_iter : BR_LINE_MAPS;
    lr->work = 3.0 * (double)lr->K; /* usually three maps */
    int rc = BR_OK;
    out->converged = iterate(lr, z, out, maps, err, &rc);
    if (rc != BR_OK)
        return rc;
    take_results(lr, z, out);
    if (!out->converged) { /* the last map's figures; its change is the drift */
        out->drift = out->residual;
        out->holds = !lr->dropped;
        return BR_OK;
    }
    return cross_check(lr, z, out, err);
}

int br_line_solve(const br_chain *c, const br_steady_opts *o, br_steady *out, br_error *err)
{
    br_steady_opts def;
    if (!o) {
        br_steady_opts_default(&def);
        o = &def;
    }
    memset(out, 0, sizeof *out);
    out->dir = BR_DIRI_LINE;
    out->method = BR_STEADY_SHOOTING;
    line_run lr = {.c = c, .o = o, .K = c->line.K, .env = o->envelope};
    double x0[NX];
    int rc = start_state(c, o, x0, err);
    if (rc == BR_OK)
        rc = br_sim_create(c, BR_DIRI_LINE, BR_INTEG_FAST, &lr.sim, err);
    if (rc != BR_OK)
        return rc;
    br_sim_observer obs = {&lr, on_uvlo, NULL};
    br_sim_set_observer(lr.sim, &obs);
    br_timing tm;
    br_timing_build(c, BR_DIRI_LINE, &tm);
    lr.phase = out->phase = br_steady_quiet_phase(c, &tm);
    if (lr.env)
        lr.env->phase = lr.phase;
    rc = solve(&lr, x0, out, err);
    out->periods = lr.periods;
    br_sim_free(lr.sim);
    return rc;
}

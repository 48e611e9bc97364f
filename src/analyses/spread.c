/* spread.c - judging points of a design's tolerance space, in parallel,
 * each steady state started from a prediction. */
#include "analyses/spread.h"

#include "analyses/thermal.h"

#include "core/error.h"

#include <gsl/gsl_linalg.h>
#include <math.h>
#include <pthread.h>
#include <stddef.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#define NX BR_SPREAD_NX
#define NT BR_MAX_SWITCHES  /* junction temperatures, one per link */
#define ACCEPT_DEFAULT 1e-4 /* V: distance to the steady state accepted by default */
#define DRIFT_LIMIT 1e-4    /* V: the change per period the verdict allows a steady state */

int br_cpu_count(void)
{
    long n = sysconf(_SC_NPROCESSORS_ONLN);
    return n < 1 ? 1 : n > BR_SPREAD_MAX_THREADS ? BR_SPREAD_MAX_THREADS : (int)n;
}

const char *br_outcome_name(int outcome)
{
    return outcome == BR_OUTCOME_PASS   ? "pass"
           : outcome == BR_OUTCOME_FAIL ? "fail"
                                        : "undetermined";
}

void br_spread_opts_default(br_spread_opts *o)
{
    /* every field, also those added later, starts at zero (a field left
     * out here once made a run depend on the stack's leftovers) */
    *o = (br_spread_opts){0};
    o->meter_weight = 1.0;
}

/* ---- a batch of points ------------------------------------------------------- */

typedef struct job {
    const br_spread *s;
    int npts;
    const double *values; /* npts rows of tl.n */
    int with_startup;
    br_pt *out;
    double *xout;  /* NULL, or npts * 2 * NX: the steady states found */
    double *tjout; /* NULL, or npts * 2 * NT: their junction temperatures */
    int predict;   /* start from the prediction and try it as it is */
    const double
        *start[2]; /* otherwise the state each direction starts from (NULL: cold estimate) */
    const double *start_tj[2]; /* and the junction temperatures its loop starts from (NULL:
                                  the ambient) */
    pthread_mutex_t lock;
    int next;       /* next point to take */
    br_error fatal; /* the first failure that ends the run (out of memory, a stop) */
    int nfatal;
} job;

/* A point's failure that ends the whole run; the others are recorded in
 * the point, which is then undetermined. */
static int fatal(int code)
{
    return code == BR_ENOMEM || code == BR_ECANCEL;
}

/* rc of a run of jb, or the failure of one of its points that ends it. */
static int job_status(const job *jb, int rc, br_error *err)
{
    if (rc != BR_OK || !jb->nfatal)
        return rc;
    *err = jb->fatal;
    return jb->fatal.code;
}

/* A quantity of n values predicted at values v for direction i: its
 * nominal plus, per toleranced parameter, the one-sided sensitivity d
 * (held per parameter, side and direction) scaled to how far toward its
 * limit the parameter sits. */
static void interpolate(const br_spread *s, const double *nom, const double *d, int n,
                        const double *v, int i, double *out)
{
    memcpy(out, nom, sizeof(double) * (size_t)n);
    for (int j = 0; j < s->tl.n; j++) {
        const br_tol_param *p = &s->tl.p[j];
        int e = v[j] > p->nom;
        double lim = e ? p->max : p->min, dv = v[j] - p->nom;
        if (dv == 0.0 || lim == p->nom)
            continue;
        const double *dj = d + ((size_t)(2 * j + e) * 2 + (size_t)i) * (size_t)n;
        double t = dv / (lim - p->nom);
        for (int k = 0; k < n; k++)
            out[k] += t * dj[k];
    }
}

/* The predicted steady state of direction i at values v. */
static void predict(const br_spread *s, const double *v, int i, double *x)
{
    interpolate(s, s->xnom[i], s->dx, NX, v, i, x);
}

/* The predicted junction temperatures of direction i at values v (never
 * below the point's ambient: losses only heat). */
static void predict_tj(const br_spread *s, const double *v, int i, double ta, double *tj)
{
    interpolate(s, s->tjnom[i], s->dtj, NT, v, i, tj);
    for (int k = 0; k < NT; k++)
        tj[k] = fmax(tj[k], ta);
}

#define QN_STEPS 8   /* quasi-Newton steps from one Jacobian */
#define QN_TRUST 0.1 /* V: longest quasi-Newton step */
#define QN_REFRESH 2 /* fresh Jacobians before handing over to the shooting solver */

/* One point and direction: a simulator reset at the quiet phase for each
 * period tried. */
typedef struct trial {
    const br_chain *c;
    br_sim *sim;
    int dir;      /* br_dir_index */
    double phase; /* s */
    int dropped;  /* a driver toggled during the last period */
} trial;

static void on_uvlo(void *ctx, const br_uvlo_event *e)
{
    (void)e;
    ((trial *)ctx)->dropped = 1;
}

static int trial_open(trial *t, const br_chain *c, int dir, const br_progress *stop, br_error *err)
{
    memset(t, 0, sizeof *t);
    t->c = c;
    t->dir = dir;
    int rc = br_sim_create(c, dir, BR_INTEG_FAST, &t->sim, err);
    if (rc != BR_OK)
        return rc;
    br_sim_set_stop(t->sim, stop);
    br_sim_observer obs = {t, on_uvlo, NULL};
    br_sim_set_observer(t->sim, &obs);
    br_timing tm;
    br_timing_build(c, dir, &tm);
    t->phase = br_steady_quiet_phase(c, &tm);
    return BR_OK;
}

/* One period from x: y the state after it, *res the largest change of a
 * rail, *holds 1 when every driver ran throughout. */
static int trial_period(trial *t, const double *x, double *y, double *res, int *holds,
                        br_error *err)
{
    br_sim_reset_running_at(t->sim, x, t->phase);
    br_sim_stats_start(t->sim);
    t->dropped = 0;
    int rc = br_sim_run_until(t->sim, t->c->T, err);
    if (rc != BR_OK)
        return rc;
    br_sim_state(t->sim, y);
    *res = 0.0;
    *holds = !t->dropped;
    for (int k = 0; k < t->c->n; k++) {
        double dk = fabs(y[k] - x[k]);
        /* fmax would skip a NaN: a state that is no number is no answer */
        *res = isfinite(dk) ? fmax(*res, dk) : HUGE_VAL;
    }
    *holds = *holds && *res < HUGE_VAL;
    for (int k = 1; k < t->c->n; k++)
        *holds = *holds && br_sim_enabled(t->sim, k);
    return BR_OK;
}

/* The period just simulated from x, taken as the steady state. */
static void trial_take(const trial *t, const double *x, double res, int periods, br_steady *out)
{
    memset(out, 0, sizeof *out);
    out->dir = t->dir;
    out->method = BR_STEADY_SHOOTING;
    out->converged = out->holds = 1;
    out->periods = periods;
    out->residual = out->drift = res;
    out->phase = t->phase;
    memcpy(out->x, x, sizeof out->x);
    out->stats = *br_sim_stats(t->sim);
}

/* F = y - x over the unknowns of direction i. */
static void residual(const br_spread *s, int i, const double *x, const double *y, double *f)
{
    for (int r = 0; r < s->m[i]; r++)
        f[r] = y[s->idx[i][r]] - x[s->idx[i][r]];
}

/* dz = -H f; returns max |dz|. */
static double newton_step(const double *h, const double *f, int m, double *dz)
{
    double big = 0.0;
    for (int r = 0; r < m; r++) {
        double acc = 0.0;
        for (int c = 0; c < m; c++)
            acc -= h[r * m + c] * f[c];
        dz[r] = acc;
        big = fmax(big, fabs(acc));
    }
    return big;
}

/* Broyden's update of the inverse H of J - I after the step dz changed
 * F by df (C. G. Broyden, Math. Comp. 19, 1965, the "good" update in its
 * inverse form through Sherman-Morrison): H += (dz - H df) dz^T H / (dz^T H df). */
static void broyden_inverse(double *h, const double *dz, const double *df, int m)
{
    double hdf[NX], zth[NX], den = 0.0;
    for (int r = 0; r < m; r++) {
        hdf[r] = 0.0;
        for (int c = 0; c < m; c++)
            hdf[r] += h[r * m + c] * df[c];
        den += dz[r] * hdf[r];
    }
    if (!(fabs(den) > 1e-300))
        return;
    for (int c = 0; c < m; c++) {
        zth[c] = 0.0;
        for (int r = 0; r < m; r++)
            zth[c] += dz[r] * h[r * m + c];
    }
    for (int r = 0; r < m; r++)
        for (int c = 0; c < m; c++)
            h[r * m + c] += (dz[r] - hdf[r]) * zth[c] / den;
}

/* Inverse of J - I at x by finite differences of the period map over the
 * unknowns idx[0..m-1] (y = P(x) given); b and perm are scratch of m*m
 * and m.  Leaves the simulator after a perturbed period.  *ok = 0 when
 * the matrix is singular. */
static int fd_inverse(trial *t, const double *x, const double *y, const int *idx, int m,
                      double *hinv, double *b, size_t *perm, int *ok, br_error *err)
{
    double yp[NX], xp[NX], res;
    int holds, sign, rc = BR_OK;
    *ok = 0;
    for (int j = 0; rc == BR_OK && j < m; j++) {
        memcpy(xp, x, sizeof xp);
        /* 1 mV: far above the integrator's noise (slow modes need J - I to a
         * fraction of a percent), well inside the diode's exponential */
        double step = 1e-3;
        xp[idx[j]] += step;
        rc = trial_period(t, xp, yp, &res, &holds, err);
        for (int r = 0; rc == BR_OK && r < m; r++)
            b[r * m + j] = (yp[idx[r]] - y[idx[r]]) / step - (r == j ? 1.0 : 0.0);
    }
    if (rc != BR_OK || m == 0)
        return rc;
    gsl_matrix_view bv = gsl_matrix_view_array(b, (size_t)m, (size_t)m);
    gsl_matrix_view hv = gsl_matrix_view_array(hinv, (size_t)m, (size_t)m);
    gsl_permutation p = {(size_t)m, perm};
    /* a singular matrix is refused before GSL's inversion would report
     * it through its error handler */
    *ok = gsl_linalg_LU_decomp(&bv.matrix, &p, &sign) == GSL_SUCCESS &&
          isfinite(gsl_linalg_LU_lndet(&bv.matrix)) &&
          gsl_linalg_LU_invert(&bv.matrix, &p, &hv.matrix) == GSL_SUCCESS;
    for (int r = 0; *ok && r < m * m; r++)
        *ok = isfinite(hinv[r]);
    return BR_OK;
}

/* One point and direction being solved: the state tried last, and the
 * best one so far (the smallest change per period with every driver
 * running). */
typedef struct qn {
    const br_spread *s;
    trial *t;
    int i;               /* direction index */
    int m;               /* unknowns */
    double x[NX], y[NX]; /* last state tried and one period later */
    double res;          /* its largest rail change, V */
    int holds;
    double bx[NX], by[NX], bres; /* the best state */
    long periods;
} qn;

/* Simulate one period from q->x. */
static int qn_period(qn *q, br_error *err)
{
    int rc = trial_period(q->t, q->x, q->y, &q->res, &q->holds, err);
    q->periods++;
    if (rc == BR_OK && q->holds && q->res < q->bres) {
        memcpy(q->bx, q->x, sizeof q->bx);
        memcpy(q->by, q->y, sizeof q->by);
        q->bres = q->res;
    }
    return rc;
}

/* ---- one worker's memory --------------------------------------------------- */

typedef struct workspace {
    const br_spread *s;
    br_design *d; /* its own copy of the design, values moved */
    br_chain c;   /* built from d at each point */
    br_chain hot; /* c with its link diodes at the junction temperatures assumed */
    br_startup su;
    br_steady ss[2];
    br_steady_figs figs[2]; /* figs[i].ss points at ss[i] */
    br_verdict v;
    double h[NX * NX]; /* the quasi-Newton inverse Jacobian of the point */
    double b[NX * NX]; /* scratch for a fresh Jacobian */
    size_t perm[NX];
    qn q;
    const double *tj_first; /* the temperatures the next shooting run starts its loop from,
                               taken by that run (NULL: the ambient) */
} workspace;

static void workspace_free(workspace *w)
{
    if (w)
        br_design_free(w->d);
    free(w);
}

static workspace *workspace_create(const br_spread *s)
{
    workspace *w = calloc(1, sizeof *w);
    if (w)
        w->s = s;
    if (w && !(w->d = br_design_copy(s->d))) {
        free(w);
        w = NULL;
    }
    return w;
}

enum { QN_TAKEN = 1, QN_STUCK = 2 };

/* Quasi-Newton steps per round, within the solver limit. */
static int qn_steps(const br_spread *s)
{
    return s->solver_limit > 0 && s->solver_limit < QN_STEPS ? s->solver_limit : QN_STEPS;
}

/* Quasi-Newton steps from q->x (whose period was the last simulated)
 * with inverse Jacobian h, updated by Broyden.  The period from x is
 * taken as the steady state when it moves no rail by more than the
 * verdict's drift limit, every driver runs, and the next step (the
 * distance to the fixed point the Jacobian sees, slow modes included,
 * which a small change per period can hide) is no longer than `accept`. */
static int qn_iterate(qn *q, double *h, int *outcome, br_error *err)
{
    double f[NX], fn[NX], dz[NX], last = HUGE_VAL, shrink = 0.9;
    const br_spread *s = q->s;
    *outcome = QN_STUCK;
    residual(s, q->i, q->x, q->y, f);
    for (int step = 0; q->holds; step++) {
        double big = newton_step(h, f, q->m, dz);
        if (q->res <= DRIFT_LIMIT && big <= s->accept) {
            *outcome = QN_TAKEN;
            return BR_OK;
        }
        /* full steps that do not shrink the distance will not converge
         * soon; cut steps need only not lose ground */
        if (step == qn_steps(s) || !isfinite(big) || big > shrink * last)
            return BR_OK;
        last = big;
        /* a step longer than the trust radius is cut to it: far from the
         * fixed point a link may change between conducting and not, where
         * the map has a kink the Jacobian cannot see */
        double cut = big > QN_TRUST ? QN_TRUST / big : 1.0;
        shrink = cut < 1.0 ? 1.0 : 0.9;
        for (int r = 0; r < q->m; r++) {
            dz[r] *= cut;
            q->x[s->idx[q->i][r]] += dz[r];
        }
        /* stored charges relax within a period (tau << T): take them where
         * the last period left them rather than solving for them */
        int n = q->t->c->n;
        memcpy(q->x + n, q->y + n, sizeof(double) * (size_t)n);
        int rc = qn_period(q, err);
        if (rc != BR_OK)
            return rc;
        residual(s, q->i, q->x, q->y, fn);
        for (int r = 0; r < q->m; r++) {
            double d = fn[r] - f[r];
            f[r] = fn[r];
            fn[r] = d;
        }
        broyden_inverse(h, dz, fn, q->m);
    }
    return BR_OK;
}

/* Go back to the best state and take a fresh Jacobian there. */
static int qn_refresh(qn *q, workspace *w, int *ok, br_error *err)
{
    *ok = 0;
    if (!(q->bres < HUGE_VAL))
        return BR_OK;
    memcpy(q->x, q->bx, sizeof q->x);
    int rc = fd_inverse(q->t, q->x, q->by, q->s->idx[q->i], q->m, w->h, w->b, w->perm, ok, err);
    q->periods += q->m;
    /* the simulator's last period must be the one from x again */
    if (rc == BR_OK && *ok)
        rc = qn_period(q, err);
    return rc;
}

/* Start solving direction i from x: its first period simulated. */
static int qn_start(workspace *w, trial *t, int i, const double *x, br_error *err)
{
    qn *q = &w->q;
    q->s = w->s;
    q->t = t;
    q->i = i;
    q->m = w->s->m[i];
    q->bres = HUGE_VAL;
    q->periods = 0;
    memcpy(q->x, x, sizeof q->x);
    if (q->m > 0) /* a design without tolerances prepares no chord (hinv NULL) */
        memcpy(w->h, w->s->hinv[i], sizeof(double) * (size_t)(q->m * q->m));
    return qn_period(q, err);
}

/* One round of quasi-Newton steps: from the nominal Jacobian (fresh = 0)
 * or a fresh one at the best state.  *taken when a period was taken as
 * the steady state (out holds it). */
static int qn_round(workspace *w, int fresh, br_steady *out, int *taken, br_error *err)
{
    qn *q = &w->q;
    int ok = 1, outcome = QN_STUCK, rc = BR_OK;
    *taken = 0;
    if (q->m == 0)
        return BR_OK;
    /* with fresh Jacobians: a new one each time Broyden's updates stall */
    for (int round = 0;
         rc == BR_OK && ok && outcome != QN_TAKEN && round <= (fresh ? QN_REFRESH : 0); round++) {
        if (fresh)
            rc = qn_refresh(q, w, &ok, err);
        if (rc == BR_OK && ok)
            rc = qn_iterate(q, w->h, &outcome, err);
    }
    if (rc == BR_OK && outcome == QN_TAKEN) {
        trial_take(q->t, q->x, q->res, (int)q->periods, out);
        *taken = 1;
    }
    return rc;
}

/* One run of the shooting solver from guess (NULL: its own estimate);
 * the result replaces w->ss[i] when it converged or when keep is set. */
static int shoot_once(workspace *w, int dir, int i, const double *guess, long max_plain, int keep,
                      br_pt *out, br_error *err)
{
    br_steady_opts o;
    br_steady again;
    br_steady_opts_default(&o);
    o.guess = guess;
    o.tj = w->tj_first;
    w->tj_first = NULL; /* a later run starts again from the ambient, as a solve does */
    if (max_plain >= 0)
        o.max_plain = max_plain;
    long lim = w->s->solver_limit;
    if (lim > 0) {
        o.max_iter = lim < o.max_iter ? (int)lim : o.max_iter;
        o.max_plain = lim < o.max_plain ? lim : o.max_plain;
    }
    /* the meter's poller: its stop poll reaches the simulations, and a
     * line cycle (seconds) reports through it */
    br_progress poll = br_meter_poller(w->s->meter);
    o.progress = w->s->meter ? &poll : NULL;
    int rc = br_steady_solve(&w->c, dir, &o, &again, err);
    out->periods += again.periods;
    if (rc == BR_OK && (keep || again.converged))
        w->ss[i] = again;
    return rc;
}

/* A state whose rails are all numbers. */
static int finite_rails(const br_chain *c, const double *x)
{
    for (int k = 0; k < c->n; k++)
        if (!isfinite(x[k]))
            return 0;
    return 1;
}

/* The shooting solver from guess (max_plain < 0: its default plain
 * fallback).  A guess can lead Newton astray where the solver's own
 * estimate does not (a link that conducts only in the dead time at one
 * point and in its window at the other), so with `retry` a failure from
 * a guess is tried again from the estimate.  A run that ends in the
 * plain fallback without settling has still come close to a periodic
 * state that holds, when there is one (a slow mode makes the rails creep
 * by a few uV a period for hundreds of periods); Newton from where it
 * ended is then tried once more: its Jacobian there is the fixed point's,
 * whereas from afar a link that does not conduct at all leaves the
 * Jacobian singular and its step wild. */
static int solve(workspace *w, int dir, int i, const double *guess, long max_plain, int retry,
                 br_pt *out, br_error *err)
{
    int rc = shoot_once(w, dir, i, guess, max_plain, 1, out, err);
    if (rc == BR_OK && !w->ss[i].converged && guess && retry)
        rc = shoot_once(w, dir, i, NULL, max_plain, 0, out, err);
    if (rc == BR_OK && !w->ss[i].converged && w->ss[i].holds && finite_rails(&w->c, w->ss[i].x)) {
        double end[NX];
        memcpy(end, w->ss[i].x, sizeof end);
        rc = shoot_once(w, dir, i, end, 0, 0, out, err);
    }
    return rc;
}

/* Plain periods the shooting solver's fallback may simulate here (its
 * default is 400): a point that got this far has defeated every Newton
 * and quasi-Newton stage, and is most likely one without a steady state
 * that holds (a driver that sags into UVLO over many periods); when no
 * state tried kept every driver running, fewer still.  A point whose
 * steady state is not found, and whose drivers keep running, is
 * undetermined: neither a pass nor a failure. */
#define PLAIN_LAST 150
#define PLAIN_HOPELESS 100

/* Junction temperatures come with the prediction (spread.h): the chain
 * has link diodes with a thermal resistance, the nominal point settled
 * them, and the options do not ask for the full loop at every point. */
static int predicts_heat(const workspace *w)
{
    return br_chain_thermal(&w->c) && !w->s->thermal_loop;
}

/* w->hot: the point's chain with every link diode that has a thermal
 * resistance at its predicted junction temperature (direction i). */
static int hot_chain(workspace *w, const double *v, int i, br_error *err)
{
    double tj[NT];
    w->hot = w->c;
    predict_tj(w->s, v, i, w->c.tamb, tj);
    for (int k = 1; k < w->c.n; k++) {
        int rc = w->c.st[k].diode.rth > 0 ? br_chain_diode_at(&w->hot, k, tj[k], err) : BR_OK;
        if (rc != BR_OK)
            return rc;
    }
    return BR_OK;
}

/* The period taken at the assumed junction temperatures (w->hot) passes
 * as the loop of steady.c passes: the temperatures its losses give lie
 * within BR_THERMAL_TOL of those assumed (w->ss[i].thermal is then set).
 * Otherwise the quasi-Newton steps go on from it at the temperatures
 * found, a pass each, up to BR_THERMAL_PASSES.  A state that does not
 * pass keeps thermal at 0 (a link that runs away, steps that do not
 * settle, temperatures that keep moving). */
static int qn_thermal(workspace *w, int i, br_error *err)
{
    br_steady *ss = &w->ss[i];
    int rc = BR_OK, taken = 1;
    for (int pass = 1; rc == BR_OK && taken && pass <= BR_THERMAL_PASSES; pass++) {
        double moved;
        if ((rc = br_steady_temperatures(&w->hot, ss, &moved, err)) != BR_OK)
            break;
        int runaway = 0;
        for (int k = 1; k < w->c.n; k++)
            runaway |= ss->runaway[k];
        if (runaway)
            break;
        if (moved < BR_THERMAL_TOL) {
            ss->thermal = pass;
            ss->thermal_settled = 1;
            break;
        }
        /* the diodes of w->hot are at the new temperatures, and the
         * simulator reads them there: the steps again, their Jacobian
         * kept, from the state just taken; the best state so far was
         * at other temperatures, so it is forgotten */
        w->q.bres = HUGE_VAL;
        memcpy(w->q.x, ss->x, sizeof w->q.x);
        if ((rc = qn_period(&w->q, err)) == BR_OK)
            rc = qn_round(w, 0, ss, &taken, err);
    }
    return rc;
}

/* The quick way where junction temperatures come with the prediction
 * (spread.h): quasi-Newton steps from the nominal Jacobian with the link
 * diodes at their predicted temperatures, and the state taken checked by
 * qn_thermal.  *passed when it passed (w->ss[i] holds it); otherwise
 * nothing of it is kept, and the point goes the way the full loop
 * takes. */
static int from_heat(workspace *w, const double *v, int i, int dir, int *passed, br_pt *out,
                     br_error *err)
{
    trial t = {0};
    double x[NX];
    int taken = 0, rc;
    w->q.periods = 0;
    predict(w->s, v, i, x);
    if ((rc = hot_chain(w, v, i, err)) == BR_OK &&
        (rc = trial_open(&t, &w->hot, dir, br_meter_poll(w->s->meter), err)) == BR_OK &&
        (rc = qn_start(w, &t, i, x, err)) == BR_OK)
        rc = qn_round(w, 0, &w->ss[i], &taken, err);
    if (rc == BR_OK && taken)
        rc = qn_thermal(w, i, err);
    *passed = rc == BR_OK && taken && w->ss[i].thermal;
    out->fast += *passed;
    out->periods += w->q.periods;
    br_sim_free(t.sim);
    return rc;
}

/* From the prediction: quasi-Newton steps from the nominal Jacobian; the
 * shooting solver's Newton from the best state, and from its own
 * estimate; quasi-Newton steps from a fresh Jacobian at the best state;
 * last, the shooting solver with its plain simulation fallback.  Each
 * stage runs only when the ones before it did not converge, so a point
 * costs what its difficulty asks; a point where no state tried kept every
 * driver running gets the shooting solver with a short plain fallback. */
static int from_prediction(workspace *w, const double *v, int i, int dir, br_pt *out, br_error *err)
{
    trial t;
    double x[NX];
    int taken = 0, rc;
    w->q.periods = 0;
    predict(w->s, v, i, x);
    if ((rc = trial_open(&t, &w->c, dir, br_meter_poll(w->s->meter), err)) == BR_OK &&
        (rc = qn_start(w, &t, i, x, err)) == BR_OK)
        rc = qn_round(w, 0, &w->ss[i], &taken, err);
    if (rc == BR_OK && taken)
        out->fast++;
    int held = w->q.bres < HUGE_VAL;
    const double *best = held ? w->q.bx : w->q.x;
    if (rc == BR_OK && !taken && !held) /* one cheap try where nothing ever held */
        rc = solve(w, dir, i, best, PLAIN_HOPELESS, 0, out, err), taken = 1;
    if (rc == BR_OK && !taken) {
        rc = solve(w, dir, i, best, 0, 1, out, err);
        taken = rc == BR_OK && w->ss[i].converged;
    }
    if (rc == BR_OK && !taken)
        rc = qn_round(w, 1, &w->ss[i], &taken, err);
    if (rc == BR_OK && !taken)
        rc = solve(w, dir, i, w->q.bx, PLAIN_LAST, 0, out, err);
    out->periods += w->q.periods;
    br_sim_free(t.sim);
    return rc;
}

/* The steady state of direction i (a br_dir_index dir) at values v. */
static int steady(workspace *w, const job *jb, const double *v, int i, int dir, br_pt *out,
                  br_error *err)
{
    if (w->c.line.on && jb->predict) { /* the line cycle's own solver, from the prediction */
        double x[NX];
        predict(w->s, v, i, x);
        return solve(w, dir, i, x, -1, 1, out, err);
    }
    if (!jb->predict) {
        w->tj_first = jb->start_tj[i];
        return solve(w, dir, i, jb->start[i], -1, 1, out, err);
    }
    int passed = 0, rc = predicts_heat(w) ? from_heat(w, v, i, dir, &passed, out, err) : BR_OK;
    if (rc == BR_OK && !passed)
        rc = from_prediction(w, v, i, dir, out, err);
    /* a state taken from the quasi-Newton steps at the ambient: the
     * shooting solver's loop finds its junction temperatures from it */
    if (rc == BR_OK && br_chain_thermal(&w->c) && !w->ss[i].thermal && w->ss[i].converged) {
        double x[NX];
        memcpy(x, w->ss[i].x, sizeof x);
        rc = shoot_once(w, dir, i, x, -1, 1, out, err);
    }
    return rc;
}

/* A steady state whose rails are no numbers cannot be judged (the
 * solvers' own tests pass over a NaN). */
static int finite_state(const br_chain *c, const br_steady *ss, br_error *err)
{
    for (int k = 0; k < c->n; k++)
        if (!isfinite(ss->x[k]) || !isfinite(ss->stats.rail[k].vmin))
            return br_error_set(err, BR_ENUMERIC, c->design ? c->design->path : NULL, 0, NULL,
                                "the simulation of rail %d gave no number (NaN), so the point "
                                "cannot be judged",
                                k);
    return BR_OK;
}

/* Headroom of the rails of one steady state (see br_pt). */
static double headroom(const br_chain *c, const br_steady_figs *f)
{
    double h = HUGE_VAL;
    for (int k = 1; k < c->n; k++) {
        const br_stage *st = &c->st[k];
        double need =
            st->aux.kind == BR_AUX_LDO ? st->aux.vout + st->aux.dropout : st->drv.uvlo_fall;
        h = fmin(h, f->rail[k].vmin - need);
    }
    return h;
}

static void compact(const br_verdict *v, br_pt *out)
{
    int failed = 0, undetermined = 0;
    for (int r = 0; r < BR_CRIT_COUNT; r++) {
        const br_verdict_row *vr = &v->row[r];
        br_pt_row *pr = &out->row[r];
        pr->applies = (signed char)vr->applies;
        pr->pass = (signed char)vr->pass;
        pr->warn = (signed char)vr->warn;
        pr->undetermined = (signed char)vr->undetermined;
        pr->dir = (signed char)vr->dir;
        pr->aux = (signed char)vr->aux;
        pr->stage = (short)vr->stage;
        pr->figure = vr->figure;
        pr->limit = vr->limit;
        pr->margin = vr->margin;
        undetermined |= vr->undetermined;
        failed |= vr->applies && !vr->pass && !vr->undetermined;
    }
    out->outcome = failed         ? BR_OUTCOME_FAIL
                   : undetermined ? BR_OUTCOME_UNDETERMINED
                                  : BR_OUTCOME_PASS;
    out->pass = out->outcome == BR_OUTCOME_PASS;
}

/* A steady state that is a trusted periodic state that holds: the only
 * kind worth predicting others from. */
static int settled_state(const br_steady *ss)
{
    return ss->converged && ss->holds && ss->drift <= DRIFT_LIMIT;
}

/* The cold start of the point in w (with the stop poll: the bar is the
 * meter's). */
static int cold_start(workspace *w, const job *jb, br_pt *out, br_error *err)
{
    br_progress only = br_progress_stop_only(br_meter_poll(jb->s->meter));
    br_startup_opts so = {.progress = &only};
    int rc = br_startup_run(&w->c, &so, &w->su, err);
    out->su_integrated = w->su.periods_integrated;
    out->su_stepped = w->su.periods_stepped;
    return rc;
}

/* The steady state of every direction of point i at values v, with its
 * figures (w->figs) and headroom; *ndir directions. */
static int steady_dirs(workspace *w, const job *jb, int i, const double *v, br_pt *out, int *ndir,
                       br_error *err)
{
    int dirs[2], rc = BR_OK;
    *ndir = br_design_directions(&w->c, dirs);
    for (int d = 0; rc == BR_OK && d < *ndir; d++) {
        rc = steady(w, jb, v, d, dirs[d], out, err);
        if (rc == BR_OK && br_steady_has_period(&w->ss[d])) /* a failed one has no figures */
            rc = finite_state(&w->c, &w->ss[d], err);
        if (rc != BR_OK)
            break;
        out->unsettled |= w->ss[d].holds && !settled_state(&w->ss[d]) ? 1 << d : 0;
        br_steady_figures(&w->c, &w->ss[d], &w->figs[d]);
        out->headroom = d == 0 ? headroom(&w->c, &w->figs[d])
                               : fmin(out->headroom, headroom(&w->c, &w->figs[d]));
        if (jb->xout)
            memcpy(jb->xout + ((size_t)i * 2 + (size_t)d) * NX, w->ss[d].x, sizeof(double) * NX);
        if (jb->tjout)
            memcpy(jb->tjout + ((size_t)i * 2 + (size_t)d) * NT, w->ss[d].tj, sizeof(double) * NT);
    }
    return rc;
}

/* With lazy_startup (spread.h): whether the steady-state verdict v
 * already rules the point out, a row failing or a decided margin in
 * volts short of lazy_target, so that no cold start can make it pass. */
static int ruled_out(const br_spread *s, const br_verdict *v)
{
    for (int c = 0; c < BR_CRIT_COUNT; c++) {
        const br_verdict_row *r = &v->row[c];
        if (!r->applies || r->undetermined)
            continue;
        if (!r->pass || (br_crit_has_margin(c) && strcmp(br_crit_unit(c), "V") == 0 &&
                         r->margin < s->lazy_target))
            return 1;
    }
    return 0;
}

/* Judge point i of the job in workspace w: the cold start first, or with
 * lazy_startup last and only when the steady state leaves the point in
 * the running (the two do not depend on each other). */
static int judge(workspace *w, const job *jb, int i, br_error *err)
{
    const double *v = jb->values + (size_t)i * (size_t)jb->s->tl.n;
    br_pt *out = &jb->out[i];
    memset(out, 0, sizeof *out);
    out->with_startup = jb->with_startup;
    br_tol_apply(w->d, &jb->s->tl, v);
    int rc = br_chain_build_nominal(w->d, &w->c, err), ndir = 0;
    int lazy = jb->with_startup && jb->s->lazy_startup;
    if (rc == BR_OK && jb->with_startup && !lazy)
        rc = cold_start(w, jb, out, err);
    if (rc == BR_OK)
        rc = steady_dirs(w, jb, i, v, out, &ndir, err);
    if (rc == BR_OK && lazy) {
        br_verdict_make(&w->c, NULL, w->figs, ndir, &w->v);
        out->with_startup = !ruled_out(jb->s, &w->v);
        if (out->with_startup)
            rc = cold_start(w, jb, out, err);
    }
    if (rc == BR_OK) {
        br_verdict_make(&w->c, out->with_startup ? &w->su : NULL, w->figs, ndir, &w->v);
        compact(&w->v, out);
    }
    out->status = rc;
    if (rc != BR_OK) /* a point that could not be judged decides nothing */
        out->outcome = BR_OUTCOME_UNDETERMINED;
    return rc;
}

static void *worker(void *arg)
{
    void **a = arg;
    job *jb = a[0];
    workspace *w = a[1];
    while (!br_meter_stopped(jb->s->meter)) {
        pthread_mutex_lock(&jb->lock);
        int i = jb->next++;
        pthread_mutex_unlock(&jb->lock);
        if (i >= jb->npts)
            break;
        br_error err;
        br_error_clear(&err);
        /* any other failure stays in the point, which is undetermined */
        if (judge(w, jb, i, &err) != BR_OK && fatal(err.code)) {
            pthread_mutex_lock(&jb->lock);
            if (!jb->nfatal++)
                jb->fatal = err;
            pthread_mutex_unlock(&jb->lock);
        }
        br_meter_add(jb->s->meter, jb->s->meter_weight);
    }
    return NULL;
}

/* Run the job on up to s->threads workers (the calling thread is one). */
static int run(job *jb, br_error *err)
{
    int nw = jb->s->threads < jb->npts ? jb->s->threads : jb->npts;
    workspace *ws[BR_SPREAD_MAX_THREADS] = {0};
    void *args[BR_SPREAD_MAX_THREADS][2];
    pthread_t tid[BR_SPREAD_MAX_THREADS];
    int started = 0, rc = BR_OK;
    nw = nw < 1 ? 1 : nw;
    for (int t = 0; t < nw && rc == BR_OK; t++)
        if (!(ws[t] = workspace_create(jb->s)))
            rc = br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory for the workers");
    if (rc == BR_OK && pthread_mutex_init(&jb->lock, NULL) != 0)
        rc = br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "cannot create a lock for the workers");
    if (rc == BR_OK) {
        jb->next = 0;
        jb->nfatal = 0;
        for (int t = 0; t < nw; t++) {
            args[t][0] = jb;
            args[t][1] = ws[t];
        }
        /* a thread that cannot start leaves its share to the others */
        for (int t = 1; t < nw; t++)
            if (pthread_create(&tid[started + 1], NULL, worker, args[t]) == 0)
                started++;
        worker(args[0]);
        for (int t = 1; t <= started; t++)
            pthread_join(tid[t], NULL);
        pthread_mutex_destroy(&jb->lock);
    }
    for (int t = 0; t < nw; t++)
        workspace_free(ws[t]);
    return br_meter_status(jb->s->meter, rc, err);
}

static void tally(br_spread *s, const br_pt *pts, int n)
{
    for (int i = 0; i < n; i++) {
        s->periods += pts[i].periods;
        s->fast += pts[i].fast;
    }
    s->points += n;
}

int br_spread_eval(br_spread *s, int npts, const double *values, int with_startup, br_pt *out,
                   br_error *err)
{
    job jb = {.s = s,
              .npts = npts,
              .values = values,
              .with_startup = with_startup,
              .out = out,
              .predict = s->predict};
    int rc = job_status(&jb, run(&jb, err), err);
    if (rc == BR_OK)
        tally(s, out, npts);
    return rc;
}

void br_spread_levels(const br_spread *s, const signed char *level, double *v)
{
    for (int j = 0; j < s->tl.n; j++)
        v[j] = br_tol_level(&s->tl.p[j], level[j]);
}

/* ---- the nominal point and the one-at-a-time points ----------------------------- */

static int nominal_values(const br_spread *s, double **out, br_error *err)
{
    *out = malloc(sizeof(double) * (size_t)(s->tl.n > 0 ? s->tl.n : 1));
    if (!*out)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    for (int j = 0; j < s->tl.n; j++)
        (*out)[j] = s->tl.p[j].nom;
    return BR_OK;
}

/* The nominal point; start (may be NULL) is a state to start each
 * direction's steady state from, tj (may be NULL) the junction
 * temperatures to start its loop from. */
static int judge_nominal(br_spread *s, const double (*start)[NX], const double (*tj0)[NT],
                         br_error *err)
{
    double *v, x[2 * NX], tj[2 * NT];
    int rc = nominal_values(s, &v, err);
    if (rc != BR_OK)
        return rc;
    job jb = {.s = s,
              .npts = 1,
              .values = v,
              .with_startup = s->startup,
              .out = &s->nominal,
              .xout = x,
              .tjout = tj};
    jb.start[0] = start ? start[0] : NULL;
    jb.start[1] = start ? start[1] : NULL;
    jb.start_tj[0] = tj0 ? tj0[0] : NULL;
    jb.start_tj[1] = tj0 ? tj0[1] : NULL;
    rc = job_status(&jb, run(&jb, err), err);
    free(v);
    if (rc == BR_OK) {
        memcpy(s->xnom[0], x, sizeof s->xnom[0]);
        memcpy(s->xnom[1], x + NX, sizeof s->xnom[1]);
        memcpy(s->tjnom[0], tj, sizeof s->tjnom[0]);
        memcpy(s->tjnom[1], tj + NT, sizeof s->tjnom[1]);
        tally(s, &s->nominal, 1);
        /* predictions from a nominal state that is no periodic state would
         * start every point astray: they start from the estimate instead */
        s->predict = s->nominal.status == BR_OK && s->nominal.row[BR_CRIT_STEADY].pass;
    }
    return rc;
}

/* Values of the one-at-a-time points that `todo` marks (2 per parameter). */
static double *oat_values(const br_spread *s, const int *todo, int *npts, int *map)
{
    int k = s->tl.n, n = 0;
    double *v = malloc(sizeof(double) * (size_t)(2 * k) * (size_t)(k > 0 ? k : 1));
    if (!v)
        return NULL;
    for (int r = 0; r < 2 * k; r++) {
        if (!todo[r / 2])
            continue;
        for (int j = 0; j < k; j++)
            v[(size_t)n * (size_t)k + (size_t)j] = s->tl.p[j].nom;
        v[(size_t)n * (size_t)k + (size_t)(r / 2)] = br_tol_level(&s->tl.p[r / 2], r % 2 ? 1 : -1);
        map[n++] = r;
    }
    *npts = n;
    return v;
}

/* The change one-at-a-time point r made to direction i: its steady state
 * x (NULL: none known) and junction temperatures tj less the nominal. */
static void oat_change(br_spread *s, int r, int i, const double *x, const double *tj)
{
    double *d = s->dx + ((size_t)r * 2 + (size_t)i) * NX;
    double *dt = s->dtj + ((size_t)r * 2 + (size_t)i) * NT;
    for (int q = 0; q < NX; q++)
        d[q] = x ? x[q] - s->xnom[i][q] : 0.0;
    for (int k = 0; k < NT; k++)
        dt[k] = x ? tj[k] - s->tjnom[i][k] : 0.0;
}

/* Judge the one-at-a-time points of the parameters todo marks. */
static int judge_oat(br_spread *s, const int *todo, br_error *err)
{
    int k = s->tl.n, npts = 0, *map = malloc(sizeof(int) * (size_t)(2 * k + 1));
    double *v = map ? oat_values(s, todo, &npts, map) : NULL;
    br_pt *pts = malloc(sizeof(br_pt) * (size_t)(npts + 1));
    double *x = malloc(sizeof(double) * 2 * NX * (size_t)(npts + 1));
    double *tj = malloc(sizeof(double) * 2 * NT * (size_t)(npts + 1));
    int rc = (map && v && pts && x && tj)
                 ? BR_OK
                 : br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    if (rc == BR_OK && npts > 0) {
        /* from the solver's own estimate, as analyze starts: the nominal
         * state can sit on the wrong side of a link's conduction (a rail
         * above a lowered supply), where Newton's first step goes wild */
        job jb = {.s = s,
                  .npts = npts,
                  .values = v,
                  .with_startup = s->startup,
                  .out = pts,
                  .xout = x,
                  .tjout = tj};
        rc = job_status(&jb, run(&jb, err), err);
    }
    for (int n = 0; rc == BR_OK && n < npts; n++) {
        int r = map[n];
        s->oat[r] = pts[n];
        for (int i = 0; i < 2; i++) {
            /* a state not settled is no sensitivity */
            int known = s->predict && pts[n].status == BR_OK && !(pts[n].unsettled & (1 << i));
            oat_change(s, r, i, known ? x + ((size_t)n * 2 + (size_t)i) * NX : NULL,
                       tj + ((size_t)n * 2 + (size_t)i) * NT);
        }
    }
    if (rc == BR_OK)
        tally(s, pts, npts);
    free(map);
    free(v);
    free(pts);
    free(x);
    free(tj);
    return rc;
}

/* ---- the chord Jacobian ----------------------------------------------------------- */

/* The unknowns the shooting solver uses too: the bypass capacitor of rail
 * 0 when it is a state, and every rail above. */
static int chord_unknowns(const br_chain *c, int *idx)
{
    int m = 0;
    if (c->csupply > 0 && c->rsupply > 0)
        idx[m++] = 0;
    for (int k = 1; k < c->n; k++)
        idx[m++] = k;
    return m;
}

/* c's link diodes at the nominal junction temperatures of direction i,
 * where the points' quasi-Newton steps take their temperatures from the
 * prediction (spread.h): the chord Jacobian is then the one they need. */
static int nominal_heat(const br_spread *s, br_chain *c, int i, br_error *err)
{
    int rc = BR_OK;
    for (int k = 1; rc == BR_OK && k < c->n && !s->thermal_loop; k++)
        if (c->st[k].diode.rth > 0)
            rc = br_chain_diode_at(c, k, fmax(s->tjnom[i][k], c->tamb), err);
    return rc;
}

/* The inverse of J - I at the nominal steady state of direction i, by
 * finite differences.  m = 0 when that fails (the points then go
 * straight to the shooting solver). */
static int chord_jacobian(br_spread *s, br_chain *c, int i, int dir, br_error *err)
{
    trial t;
    int m = chord_unknowns(c, s->idx[i]), holds, ok = 0;
    double y0[NX], res;
    double *b = malloc(sizeof(double) * (size_t)(m * m + 1));
    size_t *perm = malloc(sizeof(size_t) * (size_t)(m + 1));
    s->hinv[i] = malloc(sizeof(double) * (size_t)(m * m + 1));
    int rc = b && perm && s->hinv[i] ? nominal_heat(s, c, i, err)
                                     : br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    if (rc == BR_OK)
        rc = trial_open(&t, c, dir, br_meter_poll(s->meter), err);
    if (rc == BR_OK) {
        rc = trial_period(&t, s->xnom[i], y0, &res, &holds, err);
        if (rc == BR_OK)
            rc = fd_inverse(&t, s->xnom[i], y0, s->idx[i], m, s->hinv[i], b, perm, &ok, err);
        br_sim_free(t.sim);
    }
    s->periods += m + 1;
    s->m[i] = ok ? m : 0;
    free(b);
    free(perm);
    return rc;
}

static int chord_prepare(br_spread *s, br_error *err)
{
    br_chain *c = malloc(sizeof *c);
    if (!c)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    int dirs[2], rc = br_chain_build_nominal(s->d, c, err);
    int ndir = rc == BR_OK ? br_design_directions(c, dirs) : 0;
    /* a line cycle has no one-period map to take chord steps on: its
     * points go to its own solver from the prediction */
    for (int i = 0; rc == BR_OK && i < ndir && !c->line.on; i++)
        rc = chord_jacobian(s, c, i, dirs[i], err);
    free(c);
    return rc;
}

static int alloc_spread(const br_design *d, const br_spread_opts *o, br_spread **out, br_error *err)
{
    br_spread_opts def;
    if (!o) {
        br_spread_opts_default(&def);
        o = &def;
    }
    br_spread *s = calloc(1, sizeof *s);
    *out = NULL;
    if (!s)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    s->d = d;
    s->threads = o->threads > 0 ? o->threads : br_cpu_count();
    if (s->threads > BR_SPREAD_MAX_THREADS)
        s->threads = BR_SPREAD_MAX_THREADS;
    s->startup = o->startup;
    s->stop_failed = o->stop_failed;
    s->accept = o->accept > 0 ? o->accept : ACCEPT_DEFAULT;
    s->meter = o->meter;
    s->meter_weight = o->meter_weight;
    s->solver_limit = o->solver_limit > 0 ? o->solver_limit : 0;
    s->thermal_loop = o->thermal_loop;
    s->lazy_startup = o->lazy_startup;
    s->lazy_target = o->lazy_target;
    int rc = br_tol_list_build(d, &s->tl, err);
    size_t k = (size_t)s->tl.n;
    if (rc == BR_OK) {
        s->oat = calloc(2 * k + 1, sizeof *s->oat);
        s->borrowed = calloc(2 * k + 1, sizeof *s->borrowed);
        s->dx = calloc((2 * k + 1) * 2 * NX, sizeof *s->dx);
        s->dtj = calloc((2 * k + 1) * 2 * NT, sizeof *s->dtj);
        if (!s->oat || !s->borrowed || !s->dx || !s->dtj)
            rc = br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    }
    if (rc != BR_OK) {
        br_spread_free(s);
        return rc;
    }
    *out = s;
    return BR_OK;
}

void br_spread_free(br_spread *s)
{
    if (!s)
        return;
    free(s->oat);
    free(s->borrowed);
    free(s->dx);
    free(s->dtj);
    for (int i = 0; i < 2; i++) {
        free(s->hinv[i]);
    }
    free(s);
}

static int finish_create(br_spread *s, const double (*start)[NX], const double (*tj0)[NT],
                         const int *todo, br_error *err)
{
    int rc = judge_nominal(s, start, tj0, err);
    if (rc == BR_OK && s->stop_failed && s->nominal.outcome == BR_OUTCOME_FAIL) {
        s->stopped = 1;
        return BR_OK;
    }
    /* the chord steps serve the points around the nominal one: a design
     * without tolerances has none to judge */
    if (rc == BR_OK && s->predict && s->tl.n > 0)
        rc = chord_prepare(s, err);
    if (rc == BR_OK)
        rc = judge_oat(s, todo, err);
    return rc;
}

int br_spread_create(const br_design *d, const br_spread_opts *o, br_spread **out, br_error *err)
{
    br_spread *s;
    int rc = alloc_spread(d, o, &s, err);
    if (rc != BR_OK)
        return rc;
    int *todo = malloc(sizeof(int) * (size_t)(s->tl.n + 1));
    if (!todo)
        rc = br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    for (int j = 0; todo && j < s->tl.n; j++)
        todo[j] = 1;
    br_meter_grow(s->meter, s->meter_weight * (1.0 + 2.0 * s->tl.n));
    if (rc == BR_OK)
        rc = finish_create(s, NULL, NULL, todo, err);
    free(todo);
    if (rc != BR_OK) {
        br_spread_free(s);
        return rc;
    }
    s->ndir = s->d->direction == BR_DIR_BOTH && !s->d->ac.on ? 2 : 1;
    *out = s;
    return BR_OK;
}

/* Parameter j of s is base's parameter b: same place, same limits. */
static int same_param(const br_tol_param *a, const br_tol_param *b)
{
    return a->offset == b->offset && a->nom == b->nom && a->min == b->min && a->max == b->max;
}

/* The part array a byte offset of br_design falls in (0: none, else 1 +
 * which) and the offset inside that part's struct. */
static int part_field(size_t off, size_t *field)
{
    static const struct {
        size_t at, size;
    } arr[] = {{offsetof(br_design, diodes), sizeof(br_diode_part)},
               {offsetof(br_design, caps), sizeof(br_cap_part)},
               {offsetof(br_design, drivers), sizeof(br_driver_part)},
               {offsetof(br_design, switches), sizeof(br_switch_part)},
               {offsetof(br_design, aux), sizeof(br_aux_part)}};
    for (int a = 0; a < (int)(sizeof arr / sizeof arr[0]); a++)
        if (off >= arr[a].at && off < arr[a].at + BR_MAX_PARTS * arr[a].size) {
            *field = (off - arr[a].at) % arr[a].size;
            return a + 1;
        }
    return 0;
}

/* A parameter of base on the same attribute of the same kind of part. */
static int similar_param(const br_spread *base, size_t off)
{
    size_t f, g;
    int kind = part_field(off, &f);
    for (int b = 0; kind && b < base->tl.n; b++)
        if (part_field(base->tl.p[b].offset, &g) == kind && g == f)
            return b;
    return -1;
}

static void borrow(br_spread *s, const br_spread *base, int similar, int *todo)
{
    for (int j = 0; j < s->tl.n; j++) {
        int b = br_tol_find(&base->tl, s->tl.p[j].offset);
        int same = b >= 0 && same_param(&s->tl.p[j], &base->tl.p[b]);
        if (!same && similar)
            b = similar_param(base, s->tl.p[j].offset);
        /* base's points serve when they judged at least what d needs */
        todo[j] = b < 0 || (s->startup && !base->startup);
        if (todo[j])
            continue;
        for (int e = 0; e < 2; e++) {
            s->oat[2 * j + e] = base->oat[2 * b + e];
            s->borrowed[2 * j + e] = 1;
            /* a similar part's states say nothing about this one's */
            if (same) {
                memcpy(s->dx + (size_t)(2 * j + e) * 2 * NX,
                       base->dx + (size_t)(2 * b + e) * 2 * NX, sizeof(double) * 2 * NX);
                memcpy(s->dtj + (size_t)(2 * j + e) * 2 * NT,
                       base->dtj + (size_t)(2 * b + e) * 2 * NT, sizeof(double) * 2 * NT);
            }
        }
    }
}

int br_spread_derive(const br_spread *base, const br_design *d, const br_spread_opts *o,
                     br_spread **out, br_error *err)
{
    br_spread *s;
    int rc = alloc_spread(d, o, &s, err);
    if (rc != BR_OK)
        return rc;
    int *todo = malloc(sizeof(int) * (size_t)(s->tl.n + 1));
    if (!todo)
        rc = br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    else
        borrow(s, base, o && o->similar, todo);
    s->base_nominal = base->nominal;
    const double(*start)[NX] = o && o->warm && base->nominal.status == BR_OK ? base->xnom : NULL;
    /* temperatures from a nominal state that settled and held (no runaway) */
    const double(*tj0)[NT] = start && base->predict ? base->tjnom : NULL;
    if (start && o->warm_x) {
        start = o->warm_x;
        tj0 = o->warm_tj;
    }
    if (rc == BR_OK)
        rc = finish_create(s, start, tj0, todo, err);
    free(todo);
    if (rc != BR_OK) {
        br_spread_free(s);
        return rc;
    }
    s->ndir = base->ndir;
    *out = s;
    return BR_OK;
}

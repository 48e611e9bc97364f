/* probe.c - judging operating points with warm-started steady states. */
#include "analyses/probe.h"

#include "core/error.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

#define NX (2 * BR_MAX_SWITCHES)
#define NJAC (NX * NX)
/* States kept for the predictor along a scan: two, a linear one, since
 * converged states carry solver noise that a higher order amplifies. */
#define HIST 2

/* Residual of the period map a scan point is solved to, V: coarser than
 * a verdict's 10 uV, which is cheaper and stays above the integrator's
 * noise that at some operating points keeps Newton from ever reaching
 * 10 uV.  Far from a limit only the sign of the margin matters. */
#define BR_SCAN_TOL 1e-4

/* Near a limit the margin must be right to millivolts, and where the
 * chain settles slowly (a short charging window: the period map
 * contracts by 0.998 a period) a residual of 0.1 mV hides tens of them.
 * A direction whose worst margin is within this band of zero, V, is
 * solved again to the verdict's residual, BR_FINE_TOL. */
#define BR_POLISH_BAND 0.25
#define BR_FINE_TOL 1e-5

/* A driver threshold no rail reaches: the probe's drivers keep running. */
#define BR_NEVER_OFF (-1e6)

/* The Newton matrix of the shooting solver has one row per unknown: the
 * rail voltages, the bypass capacitor and the diode stored charges, at
 * most 2n of them; a kept copy needs only that corner of the buffer. */
struct br_warm {
    int nj;        /* doubles kept of each matrix: (2n)^2 */
    int have_x[2]; /* per analysed direction */
    int jac_valid[2];
    double x[2][NX]; /* steady state, V and C */
    double *jac[2];  /* nj doubles each */
};

struct br_probe {
    br_design *d;  /* copy; its duty and fsw move */
    br_chain real; /* the design point with its real thresholds */
    br_chain c;    /* the point being judged, drivers kept running */
    int ndir;
    int dirs[2];                       /* br_dir_index of each analysed direction */
    double uvlo_fall[BR_MAX_SWITCHES]; /* real thresholds, V */
    double vgs_max[BR_MAX_SWITCHES];   /* V, 0 when not given */
    double min_drive;                  /* V, 0 when not set */
    int have_x[2];
    int jac_valid[2];
    double x[2][NX];         /* warm start: the last steady state found */
    double *jac[2];          /* NJAC doubles each, the solver's working matrix */
    int stalled;             /* the integrator failed at the point being judged */
    const br_progress *stop; /* polled inside the simulations (NULL: none) */
    /* the last points found, oldest first, for a predictor along a scan */
    int nhist[2];
    double hu[2][HIST][2];       /* (duty, ln fsw), or (ipk, ln fline) */
    double hx[2][HIST][NX];      /* their steady states */
    const br_progress *progress; /* for the solves of a line cycle (NULL: none) */
};

void br_probe_free(br_probe *p)
{
    if (!p)
        return;
    free(p->jac[0]);
    free(p->jac[1]);
    free(p->d);
    free(p);
}

static void keep_limits(br_probe *p)
{
    const br_chain *r = &p->real;
    p->ndir = br_design_directions(r, p->dirs);
    p->min_drive = r->min_drive;
    for (int k = 0; k < r->n; k++) {
        p->uvlo_fall[k] = r->st[k].drv.uvlo_fall;
        p->vgs_max[k] = r->st[k].sw.vgs_max;
    }
}

int br_probe_create(const br_design *d, br_probe **out, br_error *err)
{
    *out = NULL;
    br_probe *p = calloc(1, sizeof *p);
    if (p) {
        p->d = malloc(sizeof *p->d);
        p->jac[0] = malloc(sizeof(double) * NJAC);
        p->jac[1] = malloc(sizeof(double) * NJAC);
    }
    if (!p || !p->d || !p->jac[0] || !p->jac[1]) {
        br_probe_free(p);
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory for a probe");
    }
    memcpy(p->d, d, sizeof *p->d);
    int rc = br_chain_build_nominal(p->d, &p->real, err);
    if (rc != BR_OK) {
        br_probe_free(p);
        return rc;
    }
    keep_limits(p);
    *out = p;
    return BR_OK;
}

void br_probe_set_stop(br_probe *p, const br_progress *stop)
{
    p->stop = stop;
}

const br_chain *br_probe_design_chain(const br_probe *p)
{
    return &p->real;
}

void br_probe_forget(br_probe *p)
{
    p->have_x[0] = p->have_x[1] = 0;
    p->nhist[0] = p->nhist[1] = 0;
    p->jac_valid[0] = p->jac_valid[1] = 0;
}

/* ---- judging ----------------------------------------------------------- */

/* Keep the smallest margin and what it belongs to; on a line cycle the
 * line phase of window w where it occurs. */
static void consider(const br_probe *p, const br_steady *ss, br_hold_point *pt, double m, int stage,
                     int crit, long w)
{
    if (isnan(m) || m >= pt->margin)
        return;
    pt->margin = m;
    pt->stage = stage;
    pt->crit = crit;
    pt->dir = ss->dir;
    pt->theta = NAN;
    if (ss->dir == BR_DIRI_LINE && p->c.line.on) {
        long at;
        br_line_window(&p->c.line, p->c.T, ss->phase, w, &pt->theta, &at);
    }
}

/* The criteria of every rail in one direction's steady state; the same
 * definitions as the verdict's margins (figures.c). */
static void judge(const br_probe *p, const br_steady_figs *f, br_hold_point *pt)
{
    const br_steady *ss = f->ss;
    for (int k = 0; k < f->n; k++) {
        const br_rail_fig *r = &f->rail[k];
        consider(p, ss, pt, r->vdrv_min - p->uvlo_fall[k], k, BR_CRIT_UVLO, ss->at_dmin[k]);
        if (p->min_drive > 0)
            consider(p, ss, pt, r->vdrv_min - p->min_drive, k, BR_CRIT_DRIVE, ss->at_dmin[k]);
        if (p->vgs_max[k] > 0)
            consider(p, ss, pt, p->vgs_max[k] - r->vdrv_max, k, BR_CRIT_GATE, ss->at_dmax[k]);
    }
}

/* Scans need margins, not the drift check of a verdict: one period from
 * the fixed point gives them.  Budgets: see solve_dir. */
static void scan_opts(br_probe *p, int i, const double *guess, int max_iter, long max_plain,
                      br_steady_opts *o)
{
    br_steady_opts_default(o);
    o->check_periods = 0;
    o->tol = BR_SCAN_TOL;
    o->max_iter = max_iter;
    o->max_plain = max_plain;
    o->guess = guess;
    o->jac = p->jac[i];
    o->jac_valid = &p->jac_valid[i];
    /* a line cycle's solves report their progress (the meter's poller,
     * which also stops them); elsewhere the stop poll alone */
    o->progress = p->progress ? p->progress : p->stop;
}

/* Where u lies on the line through `base` along d, in units of d; 0 when
 * it is off that line. */
static int line_param(const double *u, const double *base, const double *d, double *t)
{
    double b0 = u[0] - base[0], b1 = u[1] - base[1];
    double dd = d[0] * d[0] + d[1] * d[1], bb = b0 * b0 + b1 * b1;
    if (dd == 0.0 || fabs(d[0] * b1 - d[1] * b0) > 1e-9 * sqrt(dd * bb))
        return 0;
    *t = (d[0] * b0 + d[1] * b1) / dd;
    return 1;
}

/* Along a straight scan the steady state moves smoothly: extrapolate the
 * last two states linearly to the new point u (duty, ln fsw) when u lies
 * on their line, not too far on; otherwise start from the last state. */
static const double *predict(const br_probe *p, int i, const double *u, double *buf)
{
    if (!p->have_x[i])
        return NULL;
    if (p->nhist[i] < HIST)
        return p->x[i];
    const double *u0 = p->hu[i][0], *u1 = p->hu[i][1];
    const double *x0 = p->hx[i][0], *x1 = p->hx[i][1];
    double d[2] = {u1[0] - u0[0], u1[1] - u0[1]}, t;
    if (!line_param(u, u1, d, &t) || fabs(t) > 2.0)
        return p->x[i];
    for (int j = 0; j < NX; j++)
        buf[j] = x1[j] + t * (x1[j] - x0[j]);
    for (int j = p->c.n; j < NX; j++)
        buf[j] = fmax(buf[j], 0.0); /* stored charges are not negative */
    return buf;
}

static void remember(br_probe *p, int i, const double *u, const double *x)
{
    memcpy(p->x[i], x, sizeof p->x[i]);
    p->have_x[i] = 1;
    if (p->nhist[i] == HIST) {
        memmove(p->hu[i][0], p->hu[i][1], sizeof p->hu[i][0] * (HIST - 1));
        memmove(p->hx[i][0], p->hx[i][1], sizeof p->hx[i][0] * (HIST - 1));
        p->nhist[i]--;
    }
    memcpy(p->hu[i][p->nhist[i]], u, sizeof p->hu[i][0]);
    memcpy(p->hx[i][p->nhist[i]], x, sizeof p->hx[i][0]);
    p->nhist[i]++;
}

/* One attempt; returns 1 when the steady state was found.  Numeric
 * failure is an answer here (not found), not an error; an integrator
 * failure is noted in p->stalled. */
static int attempt(br_probe *p, int i, const br_steady_opts *o, br_steady *ss, long *periods,
                   br_error *err, int *rc)
{
    *rc = br_steady_solve(&p->c, p->dirs[i], o, ss, err);
    *periods += ss->periods;
    if (*rc == BR_ECANCEL)
        return 0;
    if (*rc == BR_ENUMERIC || (*rc == BR_OK && ss->failed)) {
        br_error_clear(err);
        *rc = BR_OK;
        p->stalled = 1;
        return 0;
    }
    return *rc == BR_OK && ss->converged;
}

/* Solve ss again, from its own state, to the verdict's residual; keep
 * the coarse answer when the finer one is out of reach (integrator
 * noise). */
static int polish(br_probe *p, int i, br_steady *ss, long *periods, br_error *err, int *rc)
{
    br_steady_opts o;
    br_steady fine;
    scan_opts(p, i, ss->x, 4, 0, &o);
    o.tol = BR_FINE_TOL;
    if (attempt(p, i, &o, &fine, periods, err, rc))
        *ss = fine;
    return *rc;
}

/* Steady state of direction slot i at u, judged into pt; returns 1 when
 * found.  A warm start converges in a few Newton steps or not at all, so
 * its budget is small.  When it fails, a cold start decides, so that a
 * misleading warm start cannot pass for a limit.  No plain simulation:
 * over maps of the examples it never settled a point where shooting had
 * failed, and a fifth of the map's time went into trying. */
static int solve_dir(br_probe *p, int i, const double *u, br_hold_point *pt, br_error *err, int *rc)
{
    double buf[NX];
    br_steady_opts o;
    br_steady ss;
    const double *guess = predict(p, i, u, buf);
    scan_opts(p, i, guess, guess ? 6 : 12, 0, &o); /* no guess: the cold budget at once */
    int found = attempt(p, i, &o, &ss, &pt->periods, err, rc);
    if (!found && *rc == BR_OK && guess) {
        p->jac_valid[i] = 0;
        scan_opts(p, i, NULL, 12, 0, &o);
        found = attempt(p, i, &o, &ss, &pt->periods, err, rc);
    }
    if (!found) {
        p->have_x[i] = p->jac_valid[i] = p->nhist[i] = 0;
        return 0;
    }
    br_steady_figs f;
    br_steady_figures(&p->c, &ss, &f);
    br_hold_point own = {.margin = HUGE_VAL};
    judge(p, &f, &own);
    if (fabs(own.margin) < BR_POLISH_BAND) {
        if (polish(p, i, &ss, &pt->periods, err, rc) != BR_OK)
            return 0;
        br_steady_figures(&p->c, &ss, &f);
    }
    remember(p, i, u, ss.x);
    judge(p, &f, pt);
    return 1;
}

static void keep_running(br_chain *c)
{
    for (int k = 0; k < c->n; k++) {
        c->st[k].drv.uvlo_fall = BR_NEVER_OFF;
        c->st[k].drv.uvlo_rise = BR_NEVER_OFF + 1.0;
    }
}

/* Judge the point the design copy now describes into out, scan position
 * u. */
static int judge_point(br_probe *p, const double *u, br_hold_point *out, br_error *err)
{
    out->margin = HUGE_VAL;
    out->stage = -1;
    out->crit = 0;
    out->dir = BR_DIRI_NONE;
    out->theta = NAN;
    p->stalled = 0;
    int rc = br_chain_build_nominal(p->d, &p->c, err);
    if (rc != BR_OK)
        return rc;
    keep_running(&p->c);
    /* a direction without a steady state decides the point: the others
     * are not worth their time */
    int found = 1;
    for (int i = 0; i < p->ndir && rc == BR_OK && found; i++)
        found = solve_dir(p, i, u, out, err, &rc);
    if (rc == BR_OK && !found) {
        out->margin = NAN;
        out->crit = BR_CRIT_STEADY;
        out->stage = -1;
    }
    out->holds = found && out->margin >= 0;
    return rc;
}

/* The integrator can stall ("step size underflow") on an exact
 * coincidence of switching events at one operating point; the point
 * moved by a part in 1e9, the same operating point for every purpose,
 * is solved instead. */
#define BR_NUDGE 1e-9

int br_probe_eval(br_probe *p, double duty, double fsw, br_hold_point *out, br_error *err)
{
    memset(out, 0, sizeof *out);
    out->duty = duty;
    out->fsw = fsw;
    double u[2] = {duty, log(fsw)};
    p->d->duty.nom = duty;
    p->d->fsw.nom = fsw;
    int rc = judge_point(p, u, out, err);
    if (rc == BR_OK && isnan(out->margin) && p->stalled) {
        p->d->duty.nom = duty * (1.0 - BR_NUDGE);
        p->d->fsw.nom = fsw * (1.0 + BR_NUDGE);
        rc = judge_point(p, u, out, err);
    }
    return rc;
}

int br_probe_line(const br_probe *p)
{
    return p->real.line.on;
}

void br_probe_set_progress(br_probe *p, const br_progress *hook)
{
    p->progress = hook;
}

int br_probe_eval_line(br_probe *p, double ipk, double fline, br_hold_point *out, br_error *err)
{
    memset(out, 0, sizeof *out);
    out->duty = p->real.duty;
    out->fsw = p->real.fsw;
    out->ipk = ipk;
    out->fline = fline;
    double u[2] = {ipk, log(fline)};
    p->d->ac.ipk.nom = ipk;
    p->d->ac.freq.nom = fline;
    int rc = judge_point(p, u, out, err);
    if (rc == BR_OK && isnan(out->margin) && p->stalled) {
        p->d->ac.ipk.nom = ipk * (1.0 + BR_NUDGE);
        p->d->ac.freq.nom = fline * (1.0 + BR_NUDGE);
        rc = judge_point(p, u, out, err);
    }
    return rc;
}

/* ---- warm starts kept apart -------------------------------------------- */

br_warm *br_warm_create(const br_probe *p)
{
    br_warm *w = calloc(1, sizeof *w);
    if (!w)
        return NULL;
    w->nj = 4 * p->real.n * p->real.n;
    w->jac[0] = malloc(sizeof(double) * (size_t)w->nj);
    w->jac[1] = malloc(sizeof(double) * (size_t)w->nj);
    if (!w->jac[0] || !w->jac[1]) {
        br_warm_free(w);
        return NULL;
    }
    return w;
}

void br_warm_free(br_warm *w)
{
    if (!w)
        return;
    free(w->jac[0]);
    free(w->jac[1]);
    free(w);
}

void br_probe_save(const br_probe *p, br_warm *w)
{
    for (int i = 0; i < 2; i++) {
        w->have_x[i] = p->have_x[i];
        w->jac_valid[i] = p->jac_valid[i];
        memcpy(w->x[i], p->x[i], sizeof w->x[i]);
        if (p->jac_valid[i])
            memcpy(w->jac[i], p->jac[i], sizeof(double) * (size_t)w->nj);
    }
}

void br_probe_load(br_probe *p, const br_warm *w)
{
    for (int i = 0; i < 2; i++) {
        p->nhist[i] = 0;
        p->have_x[i] = w->have_x[i];
        p->jac_valid[i] = w->jac_valid[i];
        memcpy(p->x[i], w->x[i], sizeof p->x[i]);
        if (w->jac_valid[i])
            memcpy(p->jac[i], w->jac[i], sizeof(double) * (size_t)w->nj);
    }
}

/* ---- ranges ------------------------------------------------------------ */

int br_probe_duty_applies(const br_probe *p)
{
    return p->d->topology == BR_TOPO_FCML;
}

int br_probe_duty_range(const br_probe *p, double fsw, double guard, double *lo, double *hi)
{
    /* FCML: the top switch is on D T, the bottom (1 - D) T - 2 td */
    *lo = guard;
    *hi = 1.0 - 2.0 * p->real.deadtime * fsw - guard;
    return *hi > *lo;
}

double br_probe_fsw_ceiling(const br_probe *p, double duty, double guard)
{
    if (!(p->real.deadtime > 0))
        return HUGE_VAL;
    return (1.0 - duty) / (2.0 * p->real.deadtime) * (1.0 - guard);
}

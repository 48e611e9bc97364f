/* window.c - duty and frequency limits by scan and Brent refinement,
 * hold-up time and the start-up window. */
#include "analyses/window.h"

#include "analyses/meter.h"
#include "core/error.h"

#include <gsl/gsl_errno.h>
#include <gsl/gsl_roots.h>
#include <math.h>
#include <pthread.h>
#include <stdlib.h>
#include <string.h>

#define MEMO 128        /* points remembered during one sweep (a ring) */
#define REFINE_GUESS 12 /* points a sweep's refinements take, for the progress estimate */
#define SU_GUESS 10     /* cold starts one end of a start-up window takes, the same */

void br_window_opts_default(br_window_opts *o)
{
    memset(o, 0, sizeof *o);
    o->nscan_duty = 21;
    o->nscan_fsw = 25;
    o->nscan_line = 9;
    o->threads = 2;
}

/* ---- one sweep ----------------------------------------------------------- */

/* The axis variable u is the duty itself, or ln(fsw): Brent works on
 * log frequency so that a relative resolution is a fixed width. */
typedef struct sweep_ctx {
    br_probe *p;
    br_sweep *out;
    double res; /* resolution in u */
    br_error *err;
    br_meter *meter; /* counts points judged; may stop the sweep (NULL: none) */
    int rc;          /* first failure of a judged point */
    int nmemo;       /* points stored so far (ring of MEMO) */
    double mu[MEMO];
    br_hold_point mpt[MEMO];
} sweep_ctx;

/* Frequencies are searched on a logarithmic scale, duty and current on
 * a linear one. */
static int log_axis(int axis)
{
    return axis == BR_AXIS_FSW || axis == BR_AXIS_FLINE;
}
static double axis_value(const br_sweep *s, double u)
{
    return log_axis(s->axis) ? exp(u) : u;
}
static double axis_u(const br_sweep *s, double v)
{
    return log_axis(s->axis) ? log(v) : v;
}

/* The point at v on the sweep's axis, the other coordinate held. */
static int probe_at(br_probe *p, const br_sweep *s, double v, br_hold_point *pt, br_error *err)
{
    switch (s->axis) {
    case BR_AXIS_DUTY:
        return br_probe_eval(p, v, s->fixed, pt, err);
    case BR_AXIS_FSW:
        return br_probe_eval(p, s->fixed, v, pt, err);
    case BR_AXIS_IPK:
        return br_probe_eval_line(p, v, s->fixed, pt, err);
    default:
        return br_probe_eval_line(p, s->fixed, v, pt, err);
    }
}

/* Exact match on purpose: Brent hands back the very values it was given
 * (its bracket ends), and the scan's points are asked for again as such. */
static const br_hold_point *memo_find(const sweep_ctx *x, double u)
{
    int n = x->nmemo < MEMO ? x->nmemo : MEMO;
    for (int i = 0; i < n; i++)
        if (x->mu[i] == u)
            return &x->mpt[i];
    return NULL;
}

static void memo_put(sweep_ctx *x, double u, const br_hold_point *pt)
{
    int i = x->nmemo++ % MEMO;
    x->mu[i] = u;
    x->mpt[i] = *pt;
}

/* Judge the point at u (once: a point asked for again comes from memory). */
static int judge_at(sweep_ctx *x, double u, br_hold_point *pt)
{
    const br_hold_point *m = memo_find(x, u);
    if (m) {
        *pt = *m;
        return BR_OK;
    }
    br_sweep *s = x->out;
    int rc = probe_at(x->p, s, axis_value(s, u), pt, x->err);
    if (rc == BR_OK && br_meter_add(x->meter, 1.0))
        rc = br_progress_cancelled(x->err);
    if (rc != BR_OK)
        return rc;
    s->evals++;
    s->periods += pt->periods;
    memo_put(x, u, pt);
    return BR_OK;
}

/* The margin as Brent's method sees it: its sign always says whether the
 * point holds (a point without a periodic steady state fails whatever its
 * margin), so every bracket of a holding and a failing end straddles zero
 * and GSL never reports a bad bracket through its error handler. */
static double margin_of(const br_hold_point *pt)
{
    if (pt->holds)
        return pt->margin;
    return pt->margin < 0.0 ? pt->margin : -1e-6;
}

static double brent_fn(double u, void *ctx)
{
    sweep_ctx *x = ctx;
    br_hold_point pt;
    if (x->rc != BR_OK)
        return -1.0; /* the caller stops at the next check */
    x->rc = judge_at(x, u, &pt);
    return x->rc == BR_OK ? margin_of(&pt) : -1.0;
}

/* Put the end that holds into *ua and the one that fails into *ub. */
static int order_ends(sweep_ctx *x, double a, double b, double *ua, double *ub)
{
    br_hold_point pa, pb;
    int rc = judge_at(x, a, &pa);
    if (rc == BR_OK)
        rc = judge_at(x, b, &pb);
    if (rc != BR_OK)
        return rc;
    if (pa.holds == pb.holds)
        return BR_OK; /* an exact zero of the margin: keep the old bracket */
    *ua = pa.holds ? a : b;
    *ub = pa.holds ? b : a;
    return BR_OK;
}

/* Brent's estimate converges from one side while the far end of the
 * bracket stays put; a step of just under the resolution past the
 * estimate closes the bracket. */
static int close_bracket(sweep_ctx *x, double r, double *ua, double *ub)
{
    br_hold_point pr, py;
    int rc = judge_at(x, r, &pr);
    if (rc != BR_OK)
        return rc;
    double toward_fail = *ub > *ua ? 1.0 : -1.0;
    if ((r - *ua) * (r - *ub) < 0) { /* strictly inside: it narrows the bracket */
        if (pr.holds)
            *ua = r;
        else
            *ub = r;
    }
    double y = r + (pr.holds ? 0.9 : -0.9) * x->res * toward_fail;
    if ((y - *ua) * (y - *ub) >= 0)
        return BR_OK; /* not inside the bracket: nothing to gain */
    if ((rc = judge_at(x, y, &py)) != BR_OK)
        return rc;
    if (py.holds)
        *ua = y;
    else
        *ub = y;
    return BR_OK;
}

/* Iterate Brent on [ua, ub] until the bracket is within the resolution or
 * the estimate stops moving by more than half of it; returns the last
 * estimate in *r. */
static int brent_pass(sweep_ctx *x, gsl_root_fsolver *s, double *ua, double *ub, double *r)
{
    gsl_function F = {brent_fn, x};
    if (gsl_root_fsolver_set(s, &F, fmin(*ua, *ub), fmax(*ua, *ub)) != GSL_SUCCESS)
        return x->rc != BR_OK ? x->rc
                              : br_error_set(x->err, BR_ENUMERIC, NULL, 0, NULL,
                                             "Brent's method could not start on a bracket");
    double prev = NAN;
    *r = *ua;
    for (int it = 0; it < 50; it++) {
        int st = gsl_root_fsolver_iterate(s);
        if (x->rc != BR_OK)
            return x->rc;
        if (st != GSL_SUCCESS)
            break;
        *r = gsl_root_fsolver_root(s);
        int rc = order_ends(x, gsl_root_fsolver_x_lower(s), gsl_root_fsolver_x_upper(s), ua, ub);
        if (rc != BR_OK)
            return rc;
        if (fabs(*ub - *ua) <= x->res || fabs(*r - prev) < 0.5 * x->res)
            break;
        prev = *r;
    }
    return BR_OK;
}

/* Narrow the bracket [ua holds, ub fails] to the resolution. */
static int refine(sweep_ctx *x, double ua, double ub, br_limit *lim)
{
    gsl_root_fsolver *s = gsl_root_fsolver_alloc(gsl_root_fsolver_brent);
    if (!s)
        return br_error_set(x->err, BR_ENOMEM, NULL, 0, NULL, "out of memory for Brent's method");
    int rc = BR_OK;
    for (int pass = 0; pass < 8 && rc == BR_OK && fabs(ub - ua) > x->res; pass++) {
        double r = ua;
        rc = brent_pass(x, s, &ua, &ub, &r);
        if (rc == BR_OK && fabs(ub - ua) > x->res)
            rc = close_bracket(x, r, &ua, &ub);
    }
    gsl_root_fsolver_free(s);
    if (rc != BR_OK)
        return rc;
    lim->kind = BR_LIMIT_FOUND;
    lim->value = axis_value(x->out, ua);
    lim->outside = axis_value(x->out, ub);
    rc = judge_at(x, ua, &lim->in);
    return rc == BR_OK ? judge_at(x, ub, &lim->out) : rc;
}

/* ---- the scan ------------------------------------------------------------ */

/* Grid of n points from lo to hi in u, with the design's u0 put in place
 * of the nearest point (so the scan passes through it).  Returns the
 * index of u0. */
static int scan_grid(double ulo, double uhi, double u0, int n, double *u)
{
    int best = 0;
    for (int i = 0; i < n; i++) {
        u[i] = ulo + (uhi - ulo) * i / (n - 1);
        if (fabs(u[i] - u0) < fabs(u[best] - u0))
            best = i;
    }
    /* keep the ends: the range is what the report promises */
    if (best == 0 && n > 2)
        best = 1;
    if (best == n - 1 && n > 2)
        best = n - 2;
    u[best] = u0;
    return best;
}

/* Walk from the design point to one end (step -1 or +1), refining every
 * change between holds and fails at once while the warm start is near;
 * edge[j] is the limit between scan points j and j+1. */
static int walk(sweep_ctx *x, const double *u, int jd, int n, int step, br_limit *edge)
{
    br_sweep *s = x->out;
    for (int j = jd + step; j >= 0 && j < n; j += step) {
        int rc = judge_at(x, u[j], &s->scan[j]);
        if (rc != BR_OK)
            return rc;
        const br_hold_point *prev = &s->scan[j - step];
        if (prev->holds == s->scan[j].holds)
            continue;
        int e = step < 0 ? j : j - 1;
        double uin = prev->holds ? u[j - step] : u[j];
        double uout = prev->holds ? u[j] : u[j - step];
        if ((rc = refine(x, uin, uout, &edge[e])) != BR_OK)
            return rc;
    }
    return BR_OK;
}

static void range_end(const br_sweep *s, int j, br_limit *lim)
{
    memset(lim, 0, sizeof *lim);
    lim->kind = BR_LIMIT_RANGE_END;
    lim->value = j == 0 ? s->lo : s->hi;
    lim->in = s->scan[j];
}

/* Gather the holding runs of the scan into spans. */
static void collect_spans(br_sweep *s, const br_limit *edge, int jd)
{
    s->home = -1;
    for (int j = 0; j < s->nscan; j++) {
        if (!s->scan[j].holds || (j > 0 && s->scan[j - 1].holds))
            continue;
        int last = j;
        while (last + 1 < s->nscan && s->scan[last + 1].holds)
            last++;
        if (s->nspans == BR_MAX_SPANS) {
            s->truncated = 1;
            return;
        }
        br_span *sp = &s->span[s->nspans];
        if (j == 0)
            range_end(s, 0, &sp->lo);
        else
            sp->lo = edge[j - 1];
        if (last == s->nscan - 1)
            range_end(s, last, &sp->hi);
        else
            sp->hi = edge[last];
        if (jd >= j && jd <= last)
            s->home = s->nspans;
        s->nspans++;
    }
}

/* One sweep (br_sweep_run) counting on meter. */
typedef struct sweep_args {
    int axis;
    double fixed, lo, hi;
    const br_hold_point *at;
    const br_warm *w0;
    int nscan;
} sweep_args;

static int sweep_run(br_probe *p, const sweep_args *a, br_meter *meter, br_sweep *out,
                     br_error *err);

int br_sweep_run(br_probe *p, int axis, double fixed, double lo, double hi, const br_hold_point *at,
                 const br_warm *w0, int nscan, br_sweep *out, br_error *err)
{
    sweep_args a = {axis, fixed, lo, hi, at, w0, nscan};
    return sweep_run(p, &a, NULL, out, err);
}

static int sweep_run(br_probe *p, const sweep_args *a, br_meter *meter, br_sweep *out,
                     br_error *err)
{
    int axis = a->axis, nscan = a->nscan;
    double fixed = a->fixed, lo = a->lo, hi = a->hi;
    const br_hold_point *at = a->at;
    const br_warm *w0 = a->w0;
    memset(out, 0, sizeof *out);
    out->axis = axis;
    out->applies = 1;
    out->lo = lo;
    out->hi = hi;
    out->fixed = fixed;
    static const double res[] = {BR_RES_DUTY, BR_RES_FSW, BR_RES_IPK, BR_RES_FLINE};
    out->design = axis == BR_AXIS_FSW     ? at->fsw
                  : axis == BR_AXIS_IPK   ? at->ipk
                  : axis == BR_AXIS_FLINE ? at->fline
                                          : at->duty;
    out->resolution = res[axis];
    if (axis == BR_AXIS_IPK) /* relative to the design's current */
        out->resolution *= at->ipk > 0 ? at->ipk : 1.0;
    out->nscan = nscan < 3 ? 3 : nscan > BR_MAX_SCAN ? BR_MAX_SCAN : nscan;
    sweep_ctx *x = calloc(1, sizeof *x);
    br_limit *edge = calloc(BR_MAX_SCAN, sizeof *edge);
    if (!x || !edge) {
        free(x);
        free(edge);
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory for a sweep");
    }
    *x = (sweep_ctx){.p = p, .out = out, .err = err, .meter = meter};
    x->res = log_axis(axis) ? log1p(out->resolution) : out->resolution;
    double u[BR_MAX_SCAN];
    int jd = scan_grid(axis_u(out, lo), axis_u(out, hi), axis_u(out, out->design), out->nscan, u);
    out->scan[jd] = *at;
    memo_put(x, u[jd], at);
    br_probe_load(p, w0);
    int rc = walk(x, u, jd, out->nscan, -1, edge);
    br_probe_load(p, w0);
    if (rc == BR_OK)
        rc = walk(x, u, jd, out->nscan, +1, edge);
    if (rc == BR_OK)
        collect_spans(out, edge, jd);
    free(x);
    free(edge);
    return rc;
}

/* ---- the start-up window ---------------------------------------------------- */

static int su_point(br_design *d, int axis, double v, const br_progress *stop, br_su_point *pt,
                    br_error *err)
{
    if (axis == BR_AXIS_DUTY)
        d->duty.nom = v;
    else
        d->fsw.nom = v;
    br_chain c;
    int rc = br_chain_build_nominal(d, &c, err);
    if (rc != BR_OK)
        return rc;
    br_startup su;
    br_progress only = br_progress_stop_only(stop); /* the bar is the meter's */
    br_startup_opts so = {.progress = &only};
    rc = br_startup_run(&c, &so, &su, err);
    pt->value = v;
    pt->complete = su.complete && su.t_total <= c.startup_max;
    pt->t_total = su.t_total;
    pt->stalled = su.first_stalled;
    return rc;
}

static int su_cmp(const void *a, const void *b)
{
    double x = ((const br_su_point *)a)->value, y = ((const br_su_point *)b)->value;
    return (x > y) - (x < y);
}

/* The axis value of u: duty itself, or frequency from its logarithm. */
static double su_value(const br_su_window *w, double u)
{
    return w->axis == BR_AXIS_FSW ? exp(u) : u;
}

static int su_run_at(br_design *d, br_su_window *w, br_meter *meter, double u, br_su_point *pt,
                     br_error *err)
{
    double v = su_value(w, u);
    int rc = su_point(d, w->axis, v, br_meter_poll(meter), pt, err);
    if (rc == BR_OK && br_meter_add(meter, 1.0))
        rc = br_progress_cancelled(err);
    if (rc == BR_OK && w->npts < BR_MAX_SU_POINTS)
        w->pt[w->npts++] = *pt;
    return rc;
}

/* From the design point toward uend in a few steps to the first failure,
 * then bisection (a cold start either completes or not; there is no
 * margin to interpolate). */
static int su_search(br_design *d, br_su_window *w, br_meter *meter, double u0, double uend,
                     double res, br_su_end *end, br_error *err)
{
    br_su_point pt;
    const int steps = 5;
    double uin = u0, uout = NAN;
    int rc = BR_OK;
    for (int i = 1; i <= steps && rc == BR_OK && isnan(uout); i++) {
        double u = u0 + (uend - u0) * i / steps;
        rc = su_run_at(d, w, meter, u, &pt, err);
        if (pt.complete)
            uin = u;
        else
            uout = u;
    }
    end->kind = isnan(uout) ? BR_LIMIT_RANGE_END : BR_LIMIT_FOUND;
    while (rc == BR_OK && !isnan(uout) && fabs(uin - uout) > res) {
        double u = 0.5 * (uin + uout);
        rc = su_run_at(d, w, meter, u, &pt, err);
        if (pt.complete)
            uin = u;
        else
            uout = u;
    }
    end->value = su_value(w, uin);
    end->failing = isnan(uout) ? NAN : su_value(w, uout);
    return rc;
}

/* What stalls at an end's failing value. */
static void su_stalled(const br_su_window *w, br_su_end *end)
{
    end->stalled = -1;
    for (int i = 0; i < w->npts; i++)
        if (w->pt[i].value == end->failing)
            end->stalled = w->pt[i].stalled;
}

static void su_finish(br_su_window *w)
{
    qsort(w->pt, (size_t)w->npts, sizeof w->pt[0], su_cmp);
    su_stalled(w, &w->low);
    su_stalled(w, &w->high);
}

static int su_window_run(const br_design *d, int axis, double lo, double hi, br_meter *meter,
                         br_su_window *out, br_error *err);

int br_su_window_run(const br_design *d, int axis, double lo, double hi, br_su_window *out,
                     br_error *err)
{
    return su_window_run(d, axis, lo, hi, NULL, out, err);
}

static void su_window_init(br_su_window *out, int axis, double lo, double hi)
{
    memset(out, 0, sizeof *out);
    out->axis = axis;
    out->applies = 1;
    out->lo = lo;
    out->hi = hi;
    out->resolution = axis == BR_AXIS_FSW ? BR_RES_FSW : BR_RES_DUTY;
    out->low.failing = out->high.failing = NAN;
    out->low.stalled = out->high.stalled = -1;
}

/* The design point, then each end in turn. */
static int su_window_run(const br_design *d, int axis, double lo, double hi, br_meter *meter,
                         br_su_window *out, br_error *err)
{
    su_window_init(out, axis, lo, hi);
    br_design *dc = malloc(sizeof *dc);
    if (!dc)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory for the start-up window");
    memcpy(dc, d, sizeof *dc);
    int fsw = axis == BR_AXIS_FSW;
    double v0 = fsw ? d->fsw.nom : d->duty.nom;
    double res = fsw ? log1p(BR_RES_FSW) : BR_RES_DUTY;
    double u0 = fsw ? log(v0) : v0, ulo = fsw ? log(lo) : lo, uhi = fsw ? log(hi) : hi;
    br_su_point pt;
    int rc = su_run_at(dc, out, meter, u0, &pt, err);
    out->design_starts = rc == BR_OK && pt.complete;
    if (rc == BR_OK && out->design_starts)
        rc = su_search(dc, out, meter, u0, ulo, res, &out->low, err);
    if (rc == BR_OK && out->design_starts)
        rc = su_search(dc, out, meter, u0, uhi, res, &out->high, err);
    su_finish(out);
    free(dc);
    return rc;
}

/* ---- everything ---------------------------------------------------------- */

/* The frequency range: the options', or two decades either side of the
 * design, the top kept 1 % below where the dead time leaves no on-time. */
static int fsw_range(const br_probe *p, const br_window_opts *o, double *lo, double *hi,
                     br_error *err)
{
    const br_chain *c = br_probe_design_chain(p);
    double ceiling = br_probe_fsw_ceiling(p, c->duty, 0.0);
    *lo = o->fmin > 0 ? o->fmin : c->fsw / 100.0;
    *hi = o->fmax > 0 ? o->fmax : fmin(100.0 * c->fsw, br_probe_fsw_ceiling(p, c->duty, 0.01));
    /* an option that asks for more than the dead time allows is the
     * option's fault, not the design's */
    if (o->fmax > 0 && !(o->fmax < ceiling))
        return br_error_set(err, BR_EUSAGE, NULL, 0, "--fmax",
                            "%g Hz is not below %g Hz, where two dead times of %g s use up the "
                            "bottom switches' on-time at duty %g; expected a lower --fmax",
                            o->fmax, ceiling, c->deadtime, c->duty);
    if (!(*lo < c->fsw && c->fsw < *hi))
        return br_error_set(err, BR_EUSAGE, NULL, 0, "--fmin/--fmax",
                            "frequency range %g Hz to %g Hz does not contain the design's %g Hz; "
                            "expected fmin < fsw < fmax",
                            *lo, *hi, c->fsw);
    return BR_OK;
}

/* One axis to sweep, on a thread of its own when there are two. */
typedef struct sweep_job {
    br_probe *p; /* its own probe */
    int axis;
    double fixed, lo, hi;
    int nscan;
    const br_hold_point *at;
    const br_warm *w0;
    br_sweep *out;
    br_meter *meter;
    const br_progress *poll; /* a line cycle: stops its long solves (NULL: none) */
    br_error err;
    int rc;
} sweep_job;

static void *sweep_thread(void *arg)
{
    sweep_job *j = arg;
    br_error_clear(&j->err);
    br_probe_set_progress(j->p, j->poll);
    sweep_args a = {j->axis, j->fixed, j->lo, j->hi, j->at, j->w0, j->nscan};
    j->rc = sweep_run(j->p, &a, j->meter, j->out, &j->err);
    return NULL;
}

/* The duty sweep on a second thread (and probe) while this one sweeps the
 * frequency; both start from the design point's warm start, so the
 * result is the same with one thread. */
static int run_sweeps(const br_design *d, br_probe *p, sweep_job *jd, sweep_job *jf, int threads,
                      br_error *err)
{
    pthread_t tid;
    int rc = jd ? br_probe_create(d, &jd->p, err) : BR_OK;
    if (rc == BR_OK && jd)
        br_probe_set_stop(jd->p, br_meter_poll(jd->meter));
    int started =
        rc == BR_OK && jd && threads > 1 && pthread_create(&tid, NULL, sweep_thread, jd) == 0;
    if (rc == BR_OK) {
        jf->p = p;
        sweep_thread(jf);
        if (started)
            pthread_join(tid, NULL);
        else if (jd)
            sweep_thread(jd);
        rc = jd && jd->rc != BR_OK ? jd->rc : jf->rc;
        if (rc != BR_OK && err)
            *err = jd && jd->rc != BR_OK ? jd->err : jf->err;
    }
    if (jd)
        br_probe_free(jd->p);
    return rc;
}

static int steady_limits(const br_design *d, br_probe *p, const br_window_opts *o, br_meter *meter,
                         br_window *w, br_error *err)
{
    const br_chain *c = br_probe_design_chain(p);
    double flo, fhi, dlo = 0.0, dhi = 0.0;
    int rc = fsw_range(p, o, &flo, &fhi, err);
    if (rc != BR_OK)
        return rc;
    br_warm *w0 = br_warm_create(p);
    if (!w0)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory for a warm start");
    rc = br_probe_eval(p, c->duty, c->fsw, &w->design, err);
    if (rc == BR_OK && br_meter_add(meter, 1.0))
        rc = br_progress_cancelled(err);
    br_probe_save(p, w0);
    w->duty.axis = BR_AXIS_DUTY;
    int duty = br_probe_duty_applies(p) && br_probe_duty_range(p, c->fsw, BR_RES_DUTY, &dlo, &dhi);
    if (duty) { /* a design within a step of the end: the range keeps it inside */
        dlo = fmin(dlo, c->duty);
        dhi = fmax(dhi, c->duty);
    }
    sweep_job jd = {.axis = BR_AXIS_DUTY,
                    .fixed = c->fsw,
                    .lo = dlo,
                    .hi = dhi,
                    .nscan = o->nscan_duty,
                    .at = &w->design,
                    .w0 = w0,
                    .out = &w->duty,
                    .meter = meter};
    sweep_job jf = {.axis = BR_AXIS_FSW,
                    .fixed = c->duty,
                    .lo = flo,
                    .hi = fhi,
                    .nscan = o->nscan_fsw,
                    .at = &w->design,
                    .w0 = w0,
                    .out = &w->fsw,
                    .meter = meter};
    if (rc == BR_OK)
        rc = run_sweeps(d, p, duty ? &jd : NULL, &jf, o->threads, err);
    br_warm_free(w0);
    return rc;
}

/* A line cycle's ranges: the peak current from 0 to four times the
 * design's, the line frequency from a tenth to four times the design's
 * (or the options'), within the periods a line cycle may hold. */
static int line_ranges(const br_probe *p, const br_window_opts *o, double r[4], br_error *err)
{
    const br_chain *c = br_probe_design_chain(p);
    double ipk = c->line.ipk, f = c->line.freq_given;
    double fa = c->fsw / BR_LINE_MAX_PERIODS, fb = c->fsw / BR_LINE_MIN_PERIODS;
    r[0] = 0.0;
    r[1] = ipk > 0 ? 4.0 * ipk : 10.0;
    r[2] = o->fmin > 0 ? o->fmin : fmax(f / 10.0, fa);
    r[3] = o->fmax > 0 ? o->fmax : fmin(4.0 * f, fb);
    if (!(r[2] >= fa * (1.0 - 1e-12) && r[3] <= fb * (1.0 + 1e-12)))
        return br_error_set(err, BR_EUSAGE, NULL, 0, "--fmin/--fmax",
                            "line frequency range %g Hz to %g Hz leaves %g Hz to %g Hz, where a "
                            "line period holds %d to %d switching periods of %g Hz; expected a "
                            "range within it",
                            r[2], r[3], fa, fb, BR_LINE_MIN_PERIODS, BR_LINE_MAX_PERIODS, c->fsw);
    if (!(r[2] < f && f < r[3]))
        return br_error_set(err, BR_EUSAGE, NULL, 0, "--fmin/--fmax",
                            "line frequency range %g Hz to %g Hz does not contain the design's "
                            "%g Hz; expected fmin < line frequency < fmax",
                            r[2], r[3], f);
    return BR_OK;
}

/* A line cycle: the peak current at the design's line frequency and the
 * line frequency at the design's peak current, side by side. */
static int line_limits(const br_design *d, br_probe *p, const br_window_opts *o, br_meter *meter,
                       br_window *w, br_error *err)
{
    const br_chain *c = br_probe_design_chain(p);
    double r[4];
    int rc = line_ranges(p, o, r, err);
    if (rc != BR_OK)
        return rc;
    br_progress poll = br_meter_poller(meter);
    const br_progress *hook = meter ? &poll : NULL;
    br_warm *w0 = br_warm_create(p);
    if (!w0)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory for a warm start");
    w->line = 1;
    w->duty.axis = BR_AXIS_DUTY;
    w->fsw.axis = BR_AXIS_FSW;
    br_probe_set_progress(p, hook);
    rc = br_probe_eval_line(p, c->line.ipk, c->line.freq_given, &w->design, err);
    if (rc == BR_OK && br_meter_add(meter, 1.0))
        rc = br_progress_cancelled(err);
    br_probe_save(p, w0);
    sweep_job ji = {.axis = BR_AXIS_IPK,
                    .fixed = c->line.freq_given,
                    .lo = r[0],
                    .hi = r[1],
                    .nscan = o->nscan_line,
                    .at = &w->design,
                    .w0 = w0,
                    .out = &w->ipk,
                    .meter = meter,
                    .poll = hook};
    sweep_job jf = ji;
    jf.axis = BR_AXIS_FLINE;
    jf.fixed = c->line.ipk;
    jf.lo = r[2];
    jf.hi = r[3];
    jf.out = &w->fline;
    if (rc == BR_OK)
        rc = run_sweeps(d, p, &ji, &jf, o->threads, err);
    br_warm_free(w0);
    return rc;
}

/* Hold-up from the real chain's steady state in every direction.  A
 * steady state whose simulation failed has no state to stop from: the
 * run is undetermined (BR_ENUMERIC, with why). */
static int holdups(const br_design *d, br_window *w, const br_progress *stop, br_error *err)
{
    br_chain *c;
    int rc = br_chain_build(d, &c, err);
    if (rc != BR_OK)
        return rc;
    int dirs[2];
    br_steady_opts so;
    br_steady_opts_default(&so);
    so.progress = stop;
    w->nholdup = br_design_directions(c, dirs);
    for (int i = 0; i < w->nholdup && rc == BR_OK; i++) {
        br_steady ss;
        rc = br_steady_solve(c, dirs[i], &so, &ss, err);
        if (rc == BR_OK && !br_steady_has_period(&ss))
            rc = br_error_set(err, BR_ENUMERIC, NULL, 0, NULL, "hold-up: %s", ss.why);
        if (rc == BR_OK)
            rc = br_holdup_run(c, &ss, d->hold_on, 0.0, &w->holdup[i], err);
    }
    br_chain_free(c);
    return rc;
}

/* One axis of the start-up window, on a thread of its own when there
 * are two (each run builds its own chain). */
typedef struct su_job {
    const br_design *d;
    int axis;
    double lo, hi;
    br_su_window *out;
    br_meter *meter;
    br_error err;
    int rc;
} su_job;

static void *su_thread(void *arg)
{
    su_job *j = arg;
    br_error_clear(&j->err);
    j->rc = su_window_run(j->d, j->axis, j->lo, j->hi, j->meter, j->out, &j->err);
    return NULL;
}

/* A line cycle's switching frequencies for the start-up window: from a
 * hundredth of the design's up to where the dead time leaves no on-time
 * at the modulation's highest duty, 1 % kept off (or a hundred times the
 * design's). */
static int line_fsw_range(const br_probe *p, double *lo, double *hi)
{
    const br_chain *c = br_probe_design_chain(p);
    double top = 0.0;
    for (long m = 0; m < c->line.K; m++)
        top = fmax(top, br_line_duty(&c->line, m));
    *lo = c->fsw / 100.0;
    *hi = 100.0 * c->fsw;
    if (c->deadtime > 0)
        *hi = fmin(*hi, (1.0 - top) / (2.0 * c->deadtime) * 0.99);
    return *lo < c->fsw && c->fsw < *hi;
}

static int startup_window(const br_design *d, const br_probe *p, br_window *w, int threads,
                          br_meter *meter, br_error *err)
{
    /* the ranges the steady-state limits searched (a line cycle: its own) */
    double flo = w->fsw.lo, fhi = w->fsw.hi;
    int fsw = !w->line || line_fsw_range(p, &flo, &fhi);
    su_job jd = {d, BR_AXIS_DUTY, w->duty.lo, w->duty.hi, &w->su_duty, meter, {0}, BR_OK};
    su_job jf = {d, BR_AXIS_FSW, flo, fhi, &w->su_fsw, meter, {0}, BR_OK};
    pthread_t tid;
    w->startup = 1;
    int duty = w->duty.applies;
    int started = duty && threads > 1 && pthread_create(&tid, NULL, su_thread, &jd) == 0;
    if (fsw)
        su_thread(&jf);
    if (started)
        pthread_join(tid, NULL);
    else if (duty)
        su_thread(&jd);
    const su_job *bad = jd.rc != BR_OK ? &jd : jf.rc != BR_OK ? &jf : NULL;
    if (bad && err)
        *err = bad->err;
    return bad ? bad->rc : BR_OK;
}

/* The work the window expects, for the progress estimate. */
static double expected_points(const br_design *d, const br_window_opts *o)
{
    double n = 1.0 + 2.0 * REFINE_GUESS +
               (d->ac.on ? 2.0 * o->nscan_line : (double)(o->nscan_duty + o->nscan_fsw));
    return o->startup ? n + 4.0 * SU_GUESS : n; /* two axes, two ends each */
}

static int window_all(const br_design *d, const br_window_opts *o, br_meter *meter, br_window *out,
                      br_error *err)
{
    br_probe *p;
    int rc = br_probe_create(d, &p, err);
    if (rc != BR_OK)
        return rc;
    br_probe_set_stop(p, br_meter_poll(meter));
    rc = br_probe_line(p) ? line_limits(d, p, o, meter, out, err)
                          : steady_limits(d, p, o, meter, out, err);
    if (rc == BR_OK)
        rc = holdups(d, out, br_meter_poll(meter), err);
    if (rc == BR_OK && o->startup)
        rc = startup_window(d, p, out, o->threads, meter, err);
    br_probe_free(p);
    return rc;
}

int br_window_run(const br_design *d, const br_window_opts *o, br_window *out, br_error *err)
{
    br_window_opts def;
    if (!o) {
        br_window_opts_default(&def);
        o = &def;
    }
    memset(out, 0, sizeof *out);
    br_meter meter;
    int rc = br_meter_init(&meter, o->progress, expected_points(d, o), err);
    if (rc != BR_OK)
        return rc;
    rc = window_all(d, o, &meter, out, err);
    br_meter_destroy(&meter);
    return rc;
}

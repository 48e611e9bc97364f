/* steady.c - periodic steady state by shooting, with a plain-simulation
 * fallback and a cross-check. */
#include "analyses/steady.h"

#include "analyses/thermal.h"
#include "core/error.h"
#include "engine/diode.h"

#include <gsl/gsl_linalg.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define NX (2 * BR_MAX_SWITCHES)
/* Periods in a row with a driver toggling after which the plain fallback
 * gives up waiting for a steady state (start-up hiccups from the estimate
 * settle well within this). */
#define BR_HICCUP_PERIODS 20

void br_steady_opts_default(br_steady_opts *o)
{
    memset(o, 0, sizeof *o); /* fields added later start at zero */
    o->tol = 1e-5;
    o->max_iter = 12;
    o->max_plain = 400;
    o->check_periods = 1;
    o->guess = NULL;
    o->tj = NULL;
    o->jac = NULL;
    o->jac_valid = NULL;
    o->line_hold = -1;
    o->envelope = NULL;
    o->progress = NULL;
}

double br_steady_quiet_phase(const br_chain *c, const br_timing *tm)
{
    if (tm->nev == 0)
        return 0.0;
    double guard = c->tedge;
    for (int k = 0; k < c->n; k++)
        guard = fmax(guard, c->st[k].sw.tg);
    double best = -1.0, phase = 0.0;
    for (int i = 0; i < tm->nev; i++) {
        double a = tm->ev[i].t;
        double b = i + 1 < tm->nev ? tm->ev[i + 1].t : tm->ev[0].t + tm->T;
        double usable = b - a - guard;
        if (usable > best) {
            best = usable;
            phase = fmod(a + guard + 0.5 * usable, tm->T);
        }
    }
    return phase;
}

/* The unknowns: every rail (k >= 1) and the stored charge of every diode
 * that has one. */
typedef struct shoot {
    const br_chain *c;
    br_sim *sim;
    double phase;
    int m;           /* unknowns */
    int mv;          /* of which rail voltages (they come first) */
    int idx[NX];     /* position in the full x of unknown i */
    double base[NX]; /* full x the unknowns are written into */
    long periods;
    int dropped; /* a driver toggled during the last map */
} shoot;

static void on_uvlo(void *ctx, const br_uvlo_event *e)
{
    (void)e;
    ((shoot *)ctx)->dropped = 1;
}

static void map_unknowns(shoot *sh)
{
    int n = sh->c->n;
    sh->m = 0;
    if (sh->c->csupply > 0 && sh->c->rsupply > 0)
        sh->idx[sh->m++] = 0; /* the bypass capacitor on rail 0 */
    for (int k = 1; k < n; k++)
        sh->idx[sh->m++] = k;
    sh->mv = sh->m;
    /* A stored charge that settles within a small part of the period
     * forgets where it started: it is carried from one map to the next
     * instead of being solved for (and the exact variational Jacobian of
     * the rails applies).  Only slow ones are unknowns. */
    for (int k = 1; k < n; k++)
        if (sh->c->st[k].diode.tau > sh->c->T / 50)
            sh->idx[sh->m++] = n + k;
}

/* y = P(z): one period from z at the quiet phase. */
static int period_map(shoot *sh, const double *z, double *y, br_error *err)
{
    double x[NX], out[NX];
    memcpy(x, sh->base, sizeof x);
    for (int i = 0; i < sh->m; i++)
        x[sh->idx[i]] = z[i];
    br_sim_reset_running_at(sh->sim, x, sh->phase);
    sh->dropped = 0;
    br_sim_stats_start(sh->sim); /* the last map's period is the one reported */
    int rc = br_sim_run_until(sh->sim, sh->c->T, err);
    sh->periods++;
    br_sim_state(sh->sim, out);
    for (int i = 0; i < sh->m; i++)
        y[i] = out[sh->idx[i]];
    for (int k = 1; k < sh->c->n; k++) /* fast stored charges carry over */
        sh->base[sh->c->n + k] = out[sh->c->n + k];
    return rc;
}

/* The rail that moved most from b to a, and by how much (*w): rails
 * 1..n-1, and rail 0 when its bypass capacitor makes it a state. */
static int rail_moving_most(const br_chain *c, const double *a, const double *b, double *w)
{
    int k0 = c->csupply > 0 && c->rsupply > 0 ? 0 : 1, most = k0;
    *w = 0.0;
    for (int k = k0; k < c->n; k++) {
        double d = fabs(a[k] - b[k]);
        if (d > *w || isnan(d)) {
            *w = isnan(d) ? HUGE_VAL : d; /* NaN never converges */
            most = k;
        }
    }
    return most;
}

/* Largest change of a rail state. */
static double rail_change(const br_chain *c, const double *a, const double *b)
{
    double w;
    rail_moving_most(c, a, b, &w);
    return w;
}

static double max_abs_diff(const double *a, const double *b, int m)
{
    double w = 0.0;
    for (int i = 0; i < m; i++) {
        double d = fabs(a[i] - b[i]);
        if (isnan(d))
            return HUGE_VAL; /* NaN never converges */
        w = d > w ? d : w;
    }
    return w;
}

/* Finite-difference Jacobian of F(z) = P(z) - z, into B (m x m). */
static int jacobian(shoot *sh, const double *z, const double *pz, gsl_matrix *B, br_error *err)
{
    double zp[NX], yp[NX];
    for (int j = 0; j < sh->m; j++) {
        memcpy(zp, z, sizeof(double) * (size_t)sh->m);
        int is_q = sh->idx[j] >= sh->c->n;
        /* well above the integrator's noise (~1e-6 V a period), well inside
         * the range where the map is linear */
        double h = is_q ? 1e-12 + 1e-3 * fabs(z[j]) : 1e-4 * fmax(1.0, fabs(z[j]));
        zp[j] += h;
        int rc = period_map(sh, zp, yp, err);
        if (rc != BR_OK)
            return rc;
        for (int i = 0; i < sh->m; i++)
            gsl_matrix_set(B, i, j, (yp[i] - pz[i]) / h - (i == j ? 1.0 : 0.0));
    }
    return BR_OK;
}

/* Solve B dz = -F; returns 0 on success. */
static int newton_step(gsl_matrix *B, gsl_matrix *LU, gsl_permutation *p, const double *F,
                       double *dz, int m)
{
    int sign;
    gsl_matrix_memcpy(LU, B);
    /* a zero or non-finite pivot is refused here, before GSL's solve
     * would report it through its error handler */
    if (gsl_linalg_LU_decomp(LU, p, &sign) != GSL_SUCCESS || !isfinite(gsl_linalg_LU_lndet(LU)))
        return -1;
    gsl_vector_view bv = gsl_vector_view_array(dz, (size_t)m);
    for (int i = 0; i < m; i++)
        dz[i] = -F[i];
    if (gsl_linalg_LU_svx(LU, p, &bv.vector) != GSL_SUCCESS)
        return -1;
    for (int i = 0; i < m; i++)
        if (!isfinite(dz[i]))
            return -1;
    return 0;
}

/* Newton's step can overshoot wildly where the period map bends (a rail
 * crossing its UVLO, a link starting to conduct): no rail can move by more
 * than about the supply, so a longer step is cut to half the supply along
 * its own direction. */
static void limit_step(const shoot *sh, double *dz)
{
    double cap = 0.5 * sh->c->vsupply, big = 0.0;
    for (int i = 0; i < sh->m; i++)
        big = fmax(big, fabs(dz[i]));
    if (!(cap > 0) || !(big > cap))
        return;
    for (int i = 0; i < sh->m; i++)
        dz[i] *= cap / big;
}

/* Broyden's rank-one update of B after the step dz changed F by dF. */
static void broyden(gsl_matrix *B, const double *dz, const double *dF, int m)
{
    double dd = 0.0, bdz[NX];
    for (int i = 0; i < m; i++) {
        dd += dz[i] * dz[i];
        bdz[i] = 0.0;
        for (int j = 0; j < m; j++)
            bdz[i] += gsl_matrix_get(B, i, j) * dz[j];
    }
    if (dd == 0.0)
        return;
    for (int i = 0; i < m; i++)
        for (int j = 0; j < m; j++)
            gsl_matrix_set(B, i, j, gsl_matrix_get(B, i, j) + (dF[i] - bdz[i]) * dz[j] / dd);
}

/* The Newton matrix B = J - I of the period map and its LU factors. */
typedef struct linsys {
    gsl_matrix *B, *LU;
    gsl_permutation *p;
} linsys;

static void linsys_free(linsys *ls)
{
    gsl_matrix_free(ls->B);
    gsl_matrix_free(ls->LU);
    gsl_permutation_free(ls->p);
}

static int linsys_alloc(linsys *ls, int m, br_error *err)
{
    ls->B = gsl_matrix_alloc((size_t)m, (size_t)m);
    ls->LU = gsl_matrix_alloc((size_t)m, (size_t)m);
    ls->p = gsl_permutation_alloc((size_t)m);
    if (ls->B && ls->LU && ls->p)
        return BR_OK;
    linsys_free(ls);
    ls->B = ls->LU = NULL;
    ls->p = NULL;
    return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory in the shooting solver");
}

/* B = Phi - I over the unknowns, from the sensitivity the simulator
 * integrated along the last period map. */
static void jacobian_from_sensitivity(shoot *sh, gsl_matrix *B)
{
    int n = sh->c->n;
    double phi[BR_MAX_SWITCHES * BR_MAX_SWITCHES];
    br_sim_sensitivity(sh->sim, phi);
    for (int i = 0; i < sh->m; i++)
        for (int j = 0; j < sh->m; j++)
            gsl_matrix_set(B, (size_t)i, (size_t)j,
                           phi[sh->idx[i] * n + sh->idx[j]] - (i == j ? 1.0 : 0.0));
}

static void matrix_load(gsl_matrix *B, const double *a, int m)
{
    for (int i = 0; i < m; i++)
        for (int j = 0; j < m; j++)
            gsl_matrix_set(B, (size_t)i, (size_t)j, a[i * m + j]);
}

static void matrix_store(const gsl_matrix *B, double *a, int m)
{
    for (int i = 0; i < m; i++)
        for (int j = 0; j < m; j++)
            a[i * m + j] = gsl_matrix_get(B, (size_t)i, (size_t)j);
}

/* Newton on the period map with its exact Jacobian from the variational
 * equation, integrated only when needed: a period map with the sensitivity
 * costs more than one without, so a good matrix (the caller's warm start,
 * or the last exact one) is kept with Broyden updates while the steps
 * shrink fast.  Converged when the Newton step itself, the distance to the
 * fixed point, is below the tolerance: near a slow mode a small residual
 * can hide a large distance. */
static int shoot_variational(shoot *sh, double *z, const br_steady_opts *o, br_steady *out,
                             br_error *err)
{
    int m = sh->m, ok = 0;
    linsys ls;
    double pz[NX], F[NX] = {0}, dz[NX] = {0}, dF[NX], last_step = HUGE_VAL;
    int rc = linsys_alloc(&ls, m, err);
    int warm = o->jac && o->jac_valid && *o->jac_valid, exact = !warm;
    if (rc == BR_OK && warm)
        matrix_load(ls.B, o->jac, m);
    for (int it = 0; rc == BR_OK && it <= o->max_iter; it++) {
        br_sim_set_variational(sh->sim, exact);
        if ((rc = period_map(sh, z, pz, err)) != BR_OK)
            break;
        for (int i = 0; i < m; i++) {
            dF[i] = pz[i] - z[i] - F[i];
            F[i] = pz[i] - z[i];
        }
        out->residual = max_abs_diff(pz, z, sh->mv);
        if (exact)
            jacobian_from_sensitivity(sh, ls.B);
        else if (it > 0)
            broyden(ls.B, dz, dF, m);
        if (newton_step(ls.B, ls.LU, ls.p, F, dz, m) != 0)
            break;
        double step = 0.0;
        for (int i = 0; i < sh->mv; i++)
            step = isnan(dz[i]) ? HUGE_VAL : fmax(step, fabs(dz[i]));
        /* Where an edge changes order between neighbouring states the
         * period map jumps by a few tens of uV and Newton stalls there,
         * stepping back and forth; a state that already repeats within
         * the tolerance is then the answer. */
        int stalled = it >= 3 && step > 0.5 * last_step && out->residual <= o->tol;
        if ((ok = (step <= o->tol || stalled) && !sh->dropped))
            break;
        out->iterations = it + 1;
        limit_step(sh, dz);
        for (int i = 0; i < m; i++)
            z[i] += dz[i];
        /* the exact matrix again when the steps stop shrinking fast, but
         * not twice running: where it misses a coupling (the stored charge
         * a link recovers depends on the rails) Broyden's updates learn it */
        exact = step > 0.1 * last_step && !exact;
        last_step = step;
    }
    if (rc == BR_OK && ok && o->jac && o->jac_valid) {
        matrix_store(ls.B, o->jac, m);
        *o->jac_valid = 1;
    }
    br_sim_set_variational(sh->sim, 0);
    linsys_free(&ls);
    if (rc == BR_OK && !ok)
        rc = BR_ENUMERIC;
    return rc;
}

/* Newton (finite-difference Jacobian once, then Broyden).  z in/out. */
static int shoot_newton(shoot *sh, double *z, const br_steady_opts *o, br_steady *out,
                        br_error *err)
{
    int m = sh->m, ok = 0;
    linsys ls;
    double pz[NX], F[NX], dz[NX], Fn[NX], dF[NX];
    int rc = linsys_alloc(&ls, m, err);
    gsl_matrix *B = ls.B, *LU = ls.LU;
    gsl_permutation *p = ls.p;
    if (rc != BR_OK)
        return rc;
    if ((rc = period_map(sh, z, pz, err)) != BR_OK)
        goto done;
    for (int i = 0; i < m; i++)
        F[i] = pz[i] - z[i];
    out->residual = max_abs_diff(pz, z, sh->mv);
    ok = out->residual <= o->tol && !sh->dropped; /* the guess may already be it */
    int warm = o->jac && o->jac_valid && *o->jac_valid;
    if (warm) {
        matrix_load(B, o->jac, m);
    } else if (!ok && (rc = jacobian(sh, z, pz, B, err)) != BR_OK) {
        goto done;
    }
    double last = HUGE_VAL;
    for (int it = 0; it < o->max_iter && !ok; it++) {
        out->iterations = it + 1;
        if (newton_step(B, LU, p, F, dz, m) != 0)
            break;
        limit_step(sh, dz);
        for (int i = 0; i < m; i++)
            z[i] += dz[i];
        if ((rc = period_map(sh, z, pz, err)) != BR_OK)
            goto done;
        for (int i = 0; i < m; i++) {
            Fn[i] = pz[i] - z[i];
            dF[i] = Fn[i] - F[i];
            F[i] = Fn[i];
        }
        out->residual = max_abs_diff(pz, z, sh->mv);
        ok = out->residual <= o->tol && !sh->dropped;
        /* Broyden while it converges fast; a fresh Jacobian when the map
         * here differs from where the last one was taken */
        if (out->residual > 0.25 * last && !ok) {
            if ((rc = jacobian(sh, z, pz, B, err)) != BR_OK)
                goto done;
        } else {
            broyden(B, dz, dF, m);
        }
        last = out->residual;
    }
    if (o->jac && o->jac_valid && rc == BR_OK && (warm || out->iterations > 0)) {
        matrix_store(B, o->jac, m);
        *o->jac_valid = 1;
    }
done:
    linsys_free(&ls);
    if (rc == BR_OK && !ok)
        rc = BR_ENUMERIC;
    return rc;
}

/* A start close enough for Newton: each rail one diode drop (at the
 * charge it must pass on) below the rail beneath, and the on-state drop of
 * the return switch at the load current (which takes from the link's drive
 * or, carried in reverse, adds to it). */
void br_steady_estimate(const br_chain *c, int dir, double *x)
{
    memset(x, 0, sizeof(double) * NX);
    double iabove = 0.0;
    double ilink[BR_MAX_SWITCHES] = {0};
    for (int k = c->n - 1; k >= 1; k--) {
        const br_stage *st = &c->st[k];
        iabove += st->drv.iq_on + st->drv.i_iso + st->aux.iq + br_sw_qg_at(&st->sw, 6.0) * c->fsw;
        ilink[k] = iabove;
        if (st->inject) /* the rails from here up draw on the injection */
            iabove = 0.0;
    }
    double v = c->vsupply;
    x[0] = c->csupply > 0 && c->rsupply > 0 ? v : 0.0; /* the bypass capacitor, if any */
    for (int k = 1; k < c->n; k++) {
        const br_diode *d = &c->st[k].diode;
        double ipk = 2.0 * ilink[k] + 1e-6; /* windows are about half the period */
        if (c->st[k].inject)                /* it conducts all period, from its own supply */
            v = c->st[k].vinj - br_diode_vjunction(d, ilink[k] + 1e-6) -
                ilink[k] * (d->rs + c->st[k].r_link);
        else
            v -= br_diode_vjunction(d, ipk) + ipk * (d->rs + c->st[k].r_link) +
                 br_sw_on_drop(&c->st[k - 1], dir, c->iload);
        const br_aux *a = &c->st[k].aux;
        if (a->kind == BR_AUX_ZENER && v > a->vout)
            v = a->vout; /* a clamp holds its rail, and the rails above start from there */
        x[k] = v;
    }
}

/* Plain simulation from x until the rails move less than tol per period. */
static int plain(shoot *sh, double *x, const br_steady_opts *o, br_steady *out, br_error *err)
{
    double prev[NX] = {0}, now[NX] = {0}; /* br_sim_state fills 2 n of them */
    br_sim_reset_running_at(sh->sim, x, sh->phase);
    br_sim_state(sh->sim, prev);
    out->method = BR_STEADY_PLAIN;
    int hiccups = 0; /* periods in a row in which a driver toggled */
    for (long p = 1; p <= o->max_plain; p++) {
        sh->dropped = 0;
        int rc = br_sim_run_until(sh->sim, p * sh->c->T, err);
        if (rc != BR_OK)
            return rc;
        sh->periods++;
        /* a chain whose drivers drop out period after period has no
         * periodic steady state to wait for: it fails as it stands */
        hiccups = sh->dropped ? hiccups + 1 : 0;
        if (hiccups >= BR_HICCUP_PERIODS)
            break;
        br_sim_state(sh->sim, now);
        double d;
        out->resid_rail = rail_moving_most(sh->c, now, prev, &d);
        memcpy(prev, now, sizeof now);
        if (d <= o->tol) {
            out->residual = d;
            out->converged = 1;
            break;
        }
        out->residual = d;
    }
    memcpy(x, prev, sizeof prev);
    return BR_OK;
}

/* Simulate from x: the period's figures, and the drift over more periods.
 * The figures' period is simulated as br_steady_replay simulates it (no
 * sensitivities, a fresh start at the quiet phase), so that a replay for
 * the samples of a plot or a file reaches the same extremes. */
static int finish(shoot *sh, const double *x, const br_steady_opts *o, br_steady *out,
                  br_error *err)
{
    double after[NX];
    int checks = 1 + (o->check_periods > 0 ? o->check_periods : 1), rc;
    br_sim_set_variational(sh->sim, 0);
    br_sim_reset_running_at(sh->sim, x, sh->phase);
    sh->dropped = 0;
    br_sim_stats_start(sh->sim);
    rc = br_sim_run_until(sh->sim, sh->c->T, err);
    out->stats = *br_sim_stats(sh->sim);
    sh->periods++;
    for (int k = 1; k < sh->c->n; k++)
        out->tj_run[k] = sh->c->st[k].diode.tj;
    if (rc == BR_OK)
        rc = br_sim_run_until(sh->sim, checks * sh->c->T, err);
    sh->periods += o->check_periods > 0 ? o->check_periods : 1;
    out->holds = !sh->dropped;
    for (int k = 1; k < sh->c->n; k++)
        out->holds = out->holds && br_sim_enabled(sh->sim, k);
    br_sim_state(sh->sim, after);
    out->drift = rail_change(sh->c, after, x) / checks;
    memcpy(out->x, x, sizeof out->x);
    return rc;
}

/* A state or period that is no number is a failure of the simulation
 * (overflowing values), not a steady state: the solvers' own tests pass
 * over a NaN. */
static int finite_check(const br_chain *c, const br_steady *out, br_error *err)
{
    for (int k = 0; k < c->n; k++) {
        const br_rail_stats *r = &out->stats.rail[k];
        if (!isfinite(out->x[k]) || !isfinite(r->vmin) || !isfinite(r->vmax) || !isfinite(r->vint))
            return br_error_set(err, BR_ENUMERIC, NULL, 0, NULL,
                                "rail %d (%s) is not a finite number over the period", k,
                                c->st[k].name);
    }
    return BR_OK;
}

/* The simulation failed: keep why for the verdict; nothing converged and
 * nothing is known to drop out. */
static int record_failure(br_steady *out, const double *x, br_error *err)
{
    out->failed = 1;
    out->converged = 0;
    out->holds = 1;
    out->resid_rail = -1;
    out->residual = out->drift = NAN;
    snprintf(out->why, sizeof out->why, "the steady-state simulation failed: %.280s",
             err->msg[0] ? err->msg : "numerical failure");
    memcpy(out->x, x, sizeof out->x);
    br_error_clear(err);
    return BR_OK;
}

/* The load current's ripple on the flying capacitors leaves some switch
 * no blocking voltage: no steady state of the leg to look for.  Returns 1
 * (and fills out) when so. */
static int cells_collapse(const br_chain *c, const br_timing *tm, br_steady *out)
{
    if (out->dir < 0 || !(c->iload > 0))
        return 0;
    int k = -1;
    double low = br_timing_cell_min(tm, c, (out->dir == BR_DIRI_UP ? 1.0 : -1.0) * c->iload, &k);
    if (low > 0.0 || k < 0)
        return 0;
    out->collapsed = 1;
    out->holds = 0;
    out->resid_rail = -1;
    out->residual = out->drift = NAN;
    snprintf(out->why, sizeof out->why,
             "the flying capacitors' ripple at %.4g A takes the voltage %s blocks down to %.3g V "
             "of its %.4g V: the cells collapse and the leg cannot work (a larger cfly or a "
             "higher fsw would hold them)",
             c->iload, c->st[k].name, low, c->st[k].vblock);
    return 1;
}

static int solve_electrical(const br_chain *c, int dir, const br_steady_opts *o, br_steady *out,
                            br_error *err)
{
    br_steady_opts def;
    if (!o) {
        br_steady_opts_default(&def);
        o = &def;
    }
    if (dir == BR_DIRI_LINE && !c->line.on)
        return br_error_set(err, BR_EINPUT, NULL, 0, NULL,
                            "a line cycle's steady state asked of a chain without one");
    if (dir == BR_DIRI_LINE && o->line_hold < 0)
        return br_line_solve(c, o, out, err);
    memset(out, 0, sizeof *out);
    out->dir = dir;
    shoot sh = {.c = c};
    int rc = br_sim_create(c, dir, BR_INTEG_FAST, &sh.sim, err);
    if (rc != BR_OK)
        return rc;
    br_sim_set_stop(sh.sim, o->progress);
    br_sim_observer obs = {&sh, on_uvlo, NULL};
    br_sim_set_observer(sh.sim, &obs);
    br_timing tm;
    if (c->line.on && o->line_hold >= 0) { /* one switching period, repeated */
        br_sim_line_hold(sh.sim, o->line_hold);
        br_timing_line(c, o->line_hold,
                       dir == BR_DIRI_NONE ? dir : br_line_dir(&c->line, o->line_hold), 1, &tm);
    } else {
        br_timing_build(c, dir, &tm);
    }
    sh.phase = out->phase = br_steady_quiet_phase(c, &tm);
    if (cells_collapse(c, &tm, out)) {
        br_sim_free(sh.sim);
        return BR_OK;
    }
    double x[NX], z[NX];
    if (o->guess)
        memcpy(x, o->guess, sizeof x);
    else
        br_steady_estimate(c, dir, x);
    memcpy(sh.base, x, sizeof x);
    map_unknowns(&sh);
    for (int i = 0; i < sh.m; i++)
        z[i] = x[sh.idx[i]];
    /* the sensitivity covers the rail voltages; stored charges need the
     * finite-difference Jacobian */
    rc = sh.m == sh.mv ? shoot_variational(&sh, z, o, out, err) : shoot_newton(&sh, z, o, out, err);
    if (rc == BR_OK) {
        out->method = BR_STEADY_SHOOTING;
        out->converged = 1;
        for (int k = 1; k < c->n; k++) /* the carried stored charges */
            x[c->n + k] = sh.base[c->n + k];
        for (int i = 0; i < sh.m; i++)
            x[sh.idx[i]] = z[i];
    } else if (rc == BR_ENUMERIC) {
        br_error_clear(err);
        rc = plain(&sh, x, o, out, err);
    }
    if (rc == BR_OK)
        rc = finish(&sh, x, o, out, err);
    if (rc == BR_OK)
        rc = finite_check(c, out, err);
    out->periods = sh.periods;
    br_sim_free(sh.sim);
    if (rc == BR_ENUMERIC)
        rc = record_failure(out, x, err);
    return rc;
}

/* ---- junction temperatures ------------------------------------------------- */

/* Link k's junction temperature from the period just simulated at its
 * present temperature: the losses other than leakage held, the leakage
 * following its law through the mean reverse voltage the period showed. */
static void link_heat(const br_chain *hot, const br_steady *ss, int k, br_thermal *th)
{
    const br_link_stats *l = &ss->stats.link[k];
    const br_diode *d = &hot->st[k].diode;
    double dt = ss->stats.t1 - ss->stats.t0, ir, t0, td;
    double pc = fmax((l->e_cond + l->e_rr + l->e_other - l->e_leak) / dt, 0.0);
    br_link_leak_law(hot, k, &ir, &t0, &td);
    double w = d->ir > 0 ? fmax(l->e_leak / dt / d->ir, 0.0) : 0.0; /* mean blocking volts */
    if (br_thermal_solve(hot->tamb, d->rth, pc, w * ir, t0, td, th) != BR_OK)
        th->tj = hot->tamb;
}

int br_steady_temperatures(br_chain *hot, br_steady *ss, double *moved, br_error *err)
{
    *moved = 0.0;
    for (int k = 1; k < hot->n; k++) {
        br_thermal th = {0, hot->tamb, HUGE_VAL, HUGE_VAL};
        if (hot->st[k].diode.rth > 0)
            link_heat(hot, ss, k, &th);
        *moved = fmax(*moved, fabs(th.tj - hot->st[k].diode.tj));
        ss->tj[k] = th.tj;
        ss->runaway[k] = th.runaway;
        ss->onset_tj[k] = th.onset_tj;
        ss->onset_amb[k] = th.onset_amb;
        int rc = th.tj != hot->st[k].diode.tj ? br_chain_diode_at(hot, k, th.tj, err) : BR_OK;
        if (rc != BR_OK)
            return rc;
    }
    return BR_OK;
}

/* The junction temperatures as the chain holds them (a pass that did
 * not reach them). */
static void temperatures_of(const br_chain *c, br_steady *out)
{
    for (int k = 1; k < c->n; k++) {
        out->tj[k] = c->st[k].diode.tj;
        out->runaway[k] = 0;
        out->onset_tj[k] = out->onset_amb[k] = HUGE_VAL;
    }
}

/* The steady state with every link diode at the junction temperature its
 * own losses give: solved, temperatures found, solved again from the last
 * state, until they stand still (BR_THERMAL_PASSES at most). */
static int solve_thermal(const br_chain *c, int dir, const br_steady_opts *o, br_steady *out,
                         br_error *err)
{
    br_chain *hot = malloc(sizeof *hot);
    if (!hot)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory for the temperatures");
    *hot = *c;
    br_steady_opts oo;
    if (o)
        oo = *o;
    else
        br_steady_opts_default(&oo);
    double guess[NX], moved = HUGE_VAL;
    int rc = BR_OK, pass = 0;
    long periods = 0;
    for (int k = 1; oo.tj && rc == BR_OK && k < hot->n; k++)
        if (hot->st[k].diode.rth > 0 && isfinite(oo.tj[k]))
            rc = br_chain_diode_at(hot, k, oo.tj[k], err);
    while (rc == BR_OK && pass < BR_THERMAL_PASSES && !(moved < BR_THERMAL_TOL)) {
        rc = solve_electrical(hot, dir, &oo, out, err);
        pass++;
        periods += out->periods;
        if (rc != BR_OK || !out->converged) {
            temperatures_of(hot, out);
            moved = HUGE_VAL;
            break;
        }
        rc = br_steady_temperatures(hot, out, &moved, err);
        memcpy(guess, out->x, sizeof guess);
        oo.guess = guess;
    }
    out->periods = periods;
    out->thermal = pass;
    out->thermal_settled = moved < BR_THERMAL_TOL;
    free(hot);
    return rc;
}

int br_steady_solve(const br_chain *c, int dir, const br_steady_opts *o, br_steady *out,
                    br_error *err)
{
    if (br_chain_thermal(c))
        return solve_thermal(c, dir, o, out, err);
    int rc = solve_electrical(c, dir, o, out, err);
    temperatures_of(c, out);
    return rc;
}

/* ---- a replay for samples -------------------------------------------------- */

static int replay_run(const br_chain *c, const br_steady *ss, const br_sim_observer *first,
                      const br_sim_observer *then, int more, const br_progress *progress,
                      br_error *err)
{
    br_sim *sim;
    int rc = br_sim_create(c, ss->dir, BR_INTEG_FAST, &sim, err);
    if (rc != BR_OK)
        return rc;
    br_sim_set_stop(sim, progress);
    br_sim_set_observer(sim, first);
    br_sim_reset_running_at(sim, ss->x, ss->phase);
    rc = br_sim_run_until(sim, c->T, err);
    if (rc == BR_OK && then && more > 0) {
        br_sim_set_observer(sim, then);
        rc = br_sim_run_until(sim, (1 + more) * c->T, err);
    }
    br_sim_free(sim);
    return rc;
}

int br_steady_replay(const br_chain *c, const br_steady *ss, const br_sim_observer *first,
                     const br_sim_observer *then, int more, const br_progress *progress,
                     br_error *err)
{
    if (!ss->thermal)
        return replay_run(c, ss, first, then, more, progress, err);
    br_chain *hot = malloc(sizeof *hot);
    if (!hot)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory for the temperatures");
    *hot = *c;
    int rc = BR_OK;
    for (int k = 1; k < c->n && rc == BR_OK; k++)
        if (ss->tj_run[k] != hot->st[k].diode.tj)
            rc = br_chain_diode_at(hot, k, ss->tj_run[k], err);
    if (rc == BR_OK)
        rc = replay_run(hot, ss, first, then, more, progress, err);
    free(hot);
    return rc;
}

/* sim_step.c - integrating one interval with an embedded Runge-Kutta pair.
 *
 * Fast path: the Dormand-Prince 5(4) pair (J. R. Dormand and P. J. Prince,
 * "A family of embedded Runge-Kutta formulae", J. Comp. Appl. Math. 6,
 * 1980) with the usual step-size controller.  Reference path: GSL's
 * rk8pd stepper driven by the same controller at a tight tolerance.
 * UVLO crossings are located by bisection on the length of the last step
 * (on the start-up's path by regula falsi, seeded on a Dormand-Prince step
 * by its dense output). */
#include "engine/sim_impl.h"

#include <gsl/gsl_errno.h>
#include <gsl/gsl_odeiv2.h>
#include <math.h>
#include <string.h>

static const double C2 = 1.0 / 5, C3 = 3.0 / 10, C4 = 4.0 / 5, C5 = 8.0 / 9;
static const double A21 = 1.0 / 5;
static const double A31 = 3.0 / 40, A32 = 9.0 / 40;
static const double A41 = 44.0 / 45, A42 = -56.0 / 15, A43 = 32.0 / 9;
static const double A51 = 19372.0 / 6561, A52 = -25360.0 / 2187, A53 = 64448.0 / 6561,
                    A54 = -212.0 / 729;
static const double A61 = 9017.0 / 3168, A62 = -355.0 / 33, A63 = 46732.0 / 5247, A64 = 49.0 / 176,
                    A65 = -5103.0 / 18656;
static const double B1 = 35.0 / 384, B3 = 500.0 / 1113, B4 = 125.0 / 192, B5 = -2187.0 / 6784,
                    B6 = 11.0 / 84;
static const double E1 = 71.0 / 57600, E3 = -71.0 / 16695, E4 = 71.0 / 1920, E5 = -17253.0 / 339200,
                    E6 = 22.0 / 525, E7 = -1.0 / 40;

/* ---- stiff stored charges -------------------------------------------------
 * dq/dt = i(t) - q/tau is linear in q and q feeds nothing back while the
 * link conducts (it is read only when the link recovers), so a step much
 * longer than tau needs no stability from the Runge-Kutta pair: q is
 * advanced exactly for a link current interpolated by the quadratic
 * through the step start, stage 4 (c = 4/5) and the step end
 * (exponential quadrature, e.g. Hochbruck & Ostermann, "Exponential
 * integrators", Acta Numerica 19, 2010).  Below the threshold the pair
 * integrates q like every other state. */
#define BR_QEXP_LAMBDA 2.0 /* h/tau above which q is taken exponentially */

/* Intervals up to these fractions of the period take a lower order: one
 * step spans them either way, with fewer evaluations. */
#define BR_SHORT_INTERVAL (1.0 / 64) /* the 3(2) pair */
#define BR_EDGE_INTERVAL (1.0 / 256) /* the 2(1) pair */

/* Weights of the current at s = 0, ca and 1 (step fractions, 0 < ca < 1)
 * in integral_0^1 exp(-lam (1 - s)) i(s) ds: the moments of the quadratic
 * through the three nodes, for lam >= BR_QEXP_LAMBDA (no cancellation
 * there). */
static void qexp_weights(double lam, double ca, double *w0, double *wa, double *w1)
{
    double E = exp(-lam);
    double j0 = (1.0 - E) / lam;
    double j1 = (1.0 - E * (1.0 + lam)) / (lam * lam);
    double j2 = (2.0 - E * (lam * lam + 2.0 * lam + 2.0)) / (lam * lam * lam);
    double m0 = j0, m1 = j0 - j1, m2 = j0 - 2.0 * j1 + j2; /* moments of s^p */
    *w0 = (m2 - (1.0 + ca) * m1 + ca * m0) / ca;
    *wa = (m2 - m1) / (ca * (ca - 1.0));
    *w1 = (m2 - ca * m1) / (1.0 - ca);
}

/* Link k's stored charge is taken exponentially over a step of h. */
static int q_stiff(const br_sim *s, int k, double h)
{
    double tau = s->c->st[k].diode.tau;
    return tau > 0 && h > BR_QEXP_LAMBDA * tau;
}

/* Current into the stored charge of link k from its derivative entry at a
 * state with charge q: dq = i - q/tau, clamped to 0 at q <= 0 (then no
 * charge enters, which the interpolation takes as zero current). */
static double q_current(const br_sim *s, int k, double dq, double q)
{
    if (!s->seg.active[k])
        return 0.0;
    return q <= 0.0 && dq == 0.0 ? 0.0 : dq + q / s->c->st[k].diode.tau;
}

/* Replace the pair's result for the stiff stored charges of a step from
 * x over h: ia[k] is the link current at the stage at fraction ca of the
 * step, the workspace holds the end of the step.  k7 is corrected to the
 * new charges. */
static void qexp_finish(br_sim *s, double h, double ca, const double *x, const double *k1,
                        const double *ia, double *y, double *e, double *k7)
{
    for (int k = 1; k < s->n; k++) {
        if (!q_stiff(s, k, h))
            continue;
        int iq = XI(k, F_Q);
        double tau = s->c->st[k].diode.tau, lam = h / tau, w0, wa, w1;
        double i0 = q_current(s, k, k1[iq], x[iq]);
        double i1 = br_sim_stored_in(s, k);
        double q = x[iq] * exp(-lam);
        if (s->seg.active[k]) {
            qexp_weights(lam, ca, &w0, &wa, &w1);
            q += h * (w0 * i0 + wa * ia[k] + w1 * i1);
        }
        y[iq] = q > 0.0 ? q : 0.0;
        e[iq] = 0.0;
        double dq = i1 - y[iq] / tau;
        k7[iq] = y[iq] <= 0.0 && dq < 0.0 ? 0.0 : dq;
    }
}

/* dst takes src's live entries (s->live): the fast path's steps write
 * and read no others, so the rest of the state stays in s->x as it was
 * (a tenth of the entries on a start-up).  The reference path's GSL
 * stepper advances every entry. */
static void copy_live(const br_sim *s, double *dst, const double *src)
{
    if (s->integ == BR_INTEG_REFERENCE) {
        memcpy(dst, src, sizeof(double) * (size_t)s->nx);
        return;
    }
    const int nl = s->nlive, *L = s->live;
    for (int j = 0; j < nl; j++)
        dst[L[j]] = src[L[j]];
}

/* One Dormand-Prince step from (t, x) with derivative k1 at x; writes the
 * 5th-order solution to y and its error estimate to e (controlled states). */
static void dp45_step(br_sim *s, double t, double h, const double *x, const double *k1, double *y,
                      double *e, double *k7)
{
    double ia[BR_N];
    double *k2 = s->rk[0], *k3 = s->rk[1], *k4 = s->rk[2], *k5 = s->rk[3], *k6 = s->rk[4];
    double *w = s->rk[5];
    const int nl = s->nlive, *L = s->live;
    /* only the live entries of y and w are written, or read (copy_live) */
    for (int j = 0; j < nl; j++) {
        int i = L[j];
        w[i] = x[i] + h * A21 * k1[i];
    }
    br_sim_rhs(s, t + C2 * h, w, k2);
    for (int j = 0; j < nl; j++) {
        int i = L[j];
        w[i] = x[i] + h * (A31 * k1[i] + A32 * k2[i]);
    }
    br_sim_rhs(s, t + C3 * h, w, k3);
    for (int j = 0; j < nl; j++) {
        int i = L[j];
        w[i] = x[i] + h * (A41 * k1[i] + A42 * k2[i] + A43 * k3[i]);
    }
    br_sim_rhs(s, t + C4 * h, w, k4);
    for (int k = 1; s->stored && k < s->n; k++)
        ia[k] = br_sim_stored_in(s, k);
    for (int j = 0; j < nl; j++) {
        int i = L[j];
        w[i] = x[i] + h * (A51 * k1[i] + A52 * k2[i] + A53 * k3[i] + A54 * k4[i]);
    }
    br_sim_rhs(s, t + C5 * h, w, k5);
    for (int j = 0; j < nl; j++) {
        int i = L[j];
        w[i] = x[i] + h * (A61 * k1[i] + A62 * k2[i] + A63 * k3[i] + A64 * k4[i] + A65 * k5[i]);
    }
    br_sim_rhs(s, t + h, w, k6);
    for (int j = 0; j < nl; j++) {
        int i = L[j];
        y[i] = x[i] + h * (B1 * k1[i] + B3 * k3[i] + B4 * k4[i] + B5 * k5[i] + B6 * k6[i]);
    }
    br_sim_rhs(s, t + h, y, k7); /* leaves the workspace at the step end */
    for (int j = 0; j < nl; j++) {
        int i = L[j];
        e[i] = h * (E1 * k1[i] + E3 * k3[i] + E4 * k4[i] + E5 * k5[i] + E6 * k6[i] + E7 * k7[i]);
    }
    if (s->stored) /* only links with stored charge need it */
        qexp_finish(s, h, C4, x, k1, ia, y, e, k7);
}

/* One Bogacki-Shampine 3(2) step (P. Bogacki and L. F. Shampine, "A 3(2)
 * pair of Runge-Kutta formulas", Appl. Math. Lett. 2(4), 1989): three new
 * evaluations where Dormand-Prince takes six, for the short intervals
 * around the edges, which one step spans.  Same interface as dp45_step. */
static void bs23_step(br_sim *s, double t, double h, const double *x, const double *k1, double *y,
                      double *e, double *k4)
{
    double ia[BR_N];
    double *k2 = s->rk[0], *k3 = s->rk[1], *w = s->rk[5];
    const int nl = s->nlive, *L = s->live;
    for (int j = 0; j < nl; j++) {
        int i = L[j];
        w[i] = x[i] + h * 0.5 * k1[i];
    }
    br_sim_rhs(s, t + 0.5 * h, w, k2);
    for (int j = 0; j < nl; j++) {
        int i = L[j];
        w[i] = x[i] + h * 0.75 * k2[i];
    }
    br_sim_rhs(s, t + 0.75 * h, w, k3);
    for (int k = 1; s->stored && k < s->n; k++)
        ia[k] = br_sim_stored_in(s, k);
    for (int j = 0; j < nl; j++) {
        int i = L[j];
        y[i] = x[i] + h * (2.0 / 9 * k1[i] + 1.0 / 3 * k2[i] + 4.0 / 9 * k3[i]);
    }
    br_sim_rhs(s, t + h, y, k4); /* leaves the workspace at the step end */
    for (int j = 0; j < nl; j++) {
        int i = L[j];
        e[i] = h * (-5.0 / 72 * k1[i] + 1.0 / 12 * k2[i] + 1.0 / 9 * k3[i] - 1.0 / 8 * k4[i]);
    }
    if (s->stored)
        qexp_finish(s, h, 0.75, x, k1, ia, y, e, k4);
}

/* One Heun step with the Euler step as its embedded partner (the
 * Heun-Euler 2(1) pair): the difference of the two, h (k2 - k1) / 2,
 * bounds the error of the Euler step and so, with room to spare, of
 * Heun's.  Two evaluations, for the shortest intervals (the edges), where
 * the rails move along nearly straight lines.  The workspace is left at
 * the Euler end point, within the error estimate of the step's end: it
 * serves the UVLO check and the extremes.  kend is not the derivative at
 * y, so the caller evaluates it when another step follows. */
static void he21_step(br_sim *s, double t, double h, const double *x, const double *k1, double *y,
                      double *e, double *kend)
{
    const int nl = s->nlive, *L = s->live;
    double *w = s->rk[5];
    for (int j = 0; j < nl; j++) {
        int i = L[j];
        w[i] = x[i] + h * k1[i];
    }
    br_sim_rhs(s, t + h, w, kend);
    for (int j = 0; j < nl; j++) {
        int i = L[j];
        y[i] = x[i] + 0.5 * h * (k1[i] + kend[i]);
        e[i] = 0.5 * h * (kend[i] - k1[i]);
    }
}

typedef struct gsl_ctx {
    br_sim *s;
} gsl_ctx;

static int gsl_rhs(double t, const double y[], double f[], void *p)
{
    br_sim_rhs(((gsl_ctx *)p)->s, t, y, f);
    return GSL_SUCCESS;
}

void *br_sim_gsl_alloc(int nx)
{
    return gsl_odeiv2_step_alloc(gsl_odeiv2_step_rk8pd, (size_t)nx);
}
void br_sim_gsl_free(void *p)
{
    if (p)
        gsl_odeiv2_step_free(p);
}

/* One rk8pd step through GSL; error estimate for the controlled states. */
static void rk8_step(br_sim *s, double t, double h, const double *x, double *y, double *e,
                     double *kend)
{
    gsl_ctx ctx = {s};
    const int nx = s->nx;
    gsl_odeiv2_system sys = {gsl_rhs, NULL, (size_t)nx, &ctx};
    gsl_odeiv2_step *st = s->gsl_step;
    double yerr[X_SIZE];
    memcpy(y, x, sizeof(double) * (size_t)nx);
    gsl_odeiv2_step_reset(st);
    if (gsl_odeiv2_step_apply(st, t, h, y, yerr, NULL, NULL, &sys) != GSL_SUCCESS) {
        for (int i = 0; i < nx; i++)
            e[i] = HUGE_VAL;
    } else {
        memcpy(e, yerr, sizeof(double) * (size_t)nx);
    }
    br_sim_rhs(s, t + h, y, kend); /* leave the workspace at the step end */
}

/* y: solution at t + h; e: error estimate; kend: derivative at (t+h, y),
 * with the workspace (currents, rail voltages) left at the step end. */
static void take_step(br_sim *s, double t, double h, const double *x, const double *k1, double *y,
                      double *e, double *kend)
{
    switch (s->pair) {
    case BR_PAIR_RK8:
        rk8_step(s, t, h, x, y, e, kend);
        break;
    case BR_PAIR_HE21:
        he21_step(s, t, h, x, k1, y, e, kend);
        break;
    case BR_PAIR_BS23:
        bs23_step(s, t, h, x, k1, y, e, kend);
        break;
    default:
        dp45_step(s, t, h, x, k1, y, e, kend);
    }
}

/* The larger of a and b, and NaN when b is NaN: a step whose error is not
 * a number must fail (fmax would drop it); inlined, unlike fmax. */
static inline double max_nan(double a, double b)
{
    return !(b <= a) ? b : a;
}

static double error_norm(const br_sim *s, const double *x, const double *y, const double *e)
{
    double worst = 0.0;
    for (int k = br_sim_bypass(s) ? 0 : 1; k < s->n; k++) {
        double sv = s->atol_v + s->rtol * max_nan(fabs(x[XI(k, F_VC)]), fabs(y[XI(k, F_VC)]));
        worst = max_nan(worst, fabs(e[XI(k, F_VC)]) / sv);
        /* The fast path does not control the stored charges: they only
         * filter the link current, which the rails' control resolves, and
         * a short lifetime would otherwise hold every step below the
         * threshold of the exponential quadrature. */
        if (s->integ != BR_INTEG_REFERENCE)
            continue;
        double sq = s->atol_q + s->rtol * max_nan(fabs(x[XI(k, F_Q)]), fabs(y[XI(k, F_Q)]));
        worst = max_nan(worst, fabs(e[XI(k, F_Q)]) / sq);
    }
    return worst;
}

/* Step size after a step of error norm err (order p of the lower method). */
static double next_h(double h, double err, int p)
{
    double f = err > 0 ? 0.9 * pow(err, -1.0 / (p + 1)) : 5.0;
    f = f < 0.2 ? 0.2 : (f > 5.0 ? 5.0 : f);
    return h * f;
}

/* A bracket of a UVLO crossing in the length of a step: the excess
 * (br_sim_uvlo_excess) is <= 0 at lo and > 0 at hi (NaN: not known). */
typedef struct bracket {
    double lo, flo, hi, fhi;
    double vlo, vhi; /* the excess at lo and hi (Illinois halves flo and fhi) */
    int side;        /* the end the last trial moved: -1 lo, 1 hi */
    int at_hi;       /* the last trial was at hi: its state is in the workspace */
} bracket;

/* Put a trial at c with excess fc into the bracket; Illinois: the end
 * that stays counts half. */
static void bracket_put(bracket *b, double c, double fc)
{
    if (fc > 0.0) { /* due (br_sim_uvlo_due) */
        b->hi = c;
        b->fhi = b->vhi = fc;
        if (b->side == 1 && isfinite(b->flo))
            b->flo *= 0.5;
        b->side = 1;
    } else {
        b->lo = c;
        b->flo = b->vlo = fc;
        if (b->side == -1)
            b->fhi *= 0.5;
        b->side = -1;
    }
    b->at_hi = fc > 0.0;
}

/* The excess at step length c, by a trial step or by the step's dense
 * output. */
typedef double (*excess_at)(br_sim *s, void *ctx, double c);

/* Narrow b to tol by the Illinois variant of regula falsi (Dowell and
 * Jarratt, "A modified regula falsi method for computing the root of an
 * equation", BIT 11, 1971), with a bisection whenever the bracket failed
 * to halve over three trials: the same bracket as bisection's, in six or
 * seven trials instead of about twenty-five. */
static void illinois(br_sim *s, excess_at f, void *ctx, bracket *b, double tol)
{
    double width = b->hi - b->lo;
    for (int trial = 0; b->hi - b->lo > tol && trial < 200; trial++) {
        if (trial % 3 == 0)
            width = b->hi - b->lo; /* the bracket at the start of three trials */
        /* no excess known at lo yet, or the bracket failed to halve */
        int bisect = !isfinite(b->flo) || (trial % 3 == 2 && b->hi - b->lo > 0.5 * width);
        double c =
            bisect ? 0.5 * (b->lo + b->hi) : b->hi - b->fhi * (b->hi - b->lo) / (b->fhi - b->flo);
        c = fmin(fmax(c, b->lo + 0.5 * tol), b->hi - 0.5 * tol);
        s->work++; /* at most 200 trials */
        bracket_put(b, c, f(s, ctx, c));
    }
}

/* What a trial step needs: the step's start and where it leaves its end. */
typedef struct trial_ctx {
    double t;
    const double *x, *k1;
    double *y, *e, *kend;
} trial_ctx;

static double excess_by_step(br_sim *s, void *ctx, double c)
{
    trial_ctx *q = ctx;
    take_step(s, q->t, c, q->x, q->k1, q->y, q->e, q->kend);
    return br_sim_uvlo_excess(s, s->vr);
}

/* ---- the Dormand-Prince step's dense output ---------------------------------
 * Its continuous extension of order 4 (Dormand and Prince, "Runge-Kutta
 * triples", Comp. Maths. Appls. 12A, 1986; in the form of Hairer, Norsett
 * and Wanner, Solving Ordinary Differential Equations I, section II.6):
 * from the stages already taken, the state anywhere inside the step for
 * the price of its rail voltages (one link solve), where a trial step
 * costs six. */
static const double D1 = -12715105075.0 / 11282082432, D3 = 87487479700.0 / 32700410799,
                    D4 = -10690763975.0 / 1880347072, D5 = 701980252875.0 / 199316789632,
                    D6 = -1453857185.0 / 822651844, D7 = 69997945.0 / 29380423;

typedef struct dense_ctx {
    double t, h;
    const double *x, *y, *k1, *k7;
    double *r5; /* h (D1 k1 + D3 k3 + ... + D7 k7), the live entries */
    double *w;  /* the state inside the step */
    double *dx; /* scratch for the derivative */
} dense_ctx;

static double excess_by_dense(br_sim *s, void *ctx, double c)
{
    dense_ctx *q = ctx;
    double th = c / q->h, th1 = 1.0 - th;
    const int nl = s->nlive, *L = s->live;
    for (int j = 0; j < nl; j++) {
        int i = L[j];
        double dy = q->y[i] - q->x[i], bs = q->h * q->k1[i] - dy;
        double c4 = dy - q->h * q->k7[i] - bs;
        q->w[i] = q->x[i] + th * (dy + th1 * (bs + th * (c4 + th1 * q->r5[i])));
    }
    br_sim_rhs(s, q->t + c, q->w, q->dx);
    return br_sim_uvlo_excess(s, s->vr);
}

/* The dense output is searched to this fraction of the step: its own
 * error (that of the step) is larger than the trial steps' bracket, and
 * a bracket this wide gives the excess's slope well above the noise of
 * the link solve. */
#define BR_DENSE_TOL 1e-3

/* Seed the bracket b of a Dormand-Prince step from (t, x) over h, its
 * end y and k7 the derivative there, its stages still in the workspace:
 * the crossing located on the dense output, then two trial steps, at that
 * estimate and one Newton step on from it (the dense output's slope)
 * pushed half the tolerance past, which often bracket the crossing
 * within the tolerance already (on the 12-switch example 2.8 trial steps
 * a crossing and the dense output's 4.5 link solves, where regula falsi
 * from the whole step took 6.7 trial steps). */
static void seed_dense(br_sim *s, trial_ctx *q, double h, const double *k7, bracket *b, double tol)
{
    const double *k3 = s->rk[1], *k4 = s->rk[2], *k5 = s->rk[3], *k6 = s->rk[4];
    double *r5 = s->rk[0]; /* k2 is not needed by the dense output */
    const int nl = s->nlive, *L = s->live;
    for (int j = 0; j < nl; j++) {
        int i = L[j];
        r5[i] =
            h * (D1 * q->k1[i] + D3 * k3[i] + D4 * k4[i] + D5 * k5[i] + D6 * k6[i] + D7 * k7[i]);
    }
    dense_ctx d = {q->t, h, q->x, q->y, q->k1, k7, r5, s->rk[5], q->e};
    bracket on = *b;
    illinois(s, excess_by_dense, &d, &on, BR_DENSE_TOL * h);
    double slope = (on.vhi - on.vlo) / (on.hi - on.lo);
    int newton = slope > 0.0 && isfinite(slope); /* no excess known below: none */
    double c = newton ? on.hi - on.vhi / slope : on.hi;
    for (int k = 0; k < 2 && b->hi - b->lo > tol; k++) {
        c = fmin(fmax(c, b->lo + 0.5 * tol), b->hi - 0.5 * tol);
        s->work++;
        double fc = excess_by_step(s, q, c);
        bracket_put(b, c, fc);
        if (!newton)
            break;
        c -= fc / slope + (fc > 0.0 ? 0.5 * tol : -0.5 * tol);
    }
}

/* The crossing by the Illinois variant of regula falsi on how far the
 * step's end lies past the nearest threshold, seeded on a Dormand-Prince
 * step by its dense output (seed_dense).  ex_hi: the excess at h; k7: the
 * derivative at y.  Leaves y (and the workspace) at the bracket's end
 * past the crossing. */
static double locate_secant(br_sim *s, double t, double h, const double *x, const double *k1,
                            double *y, const double *k7, double ex_hi)
{
    double e[X_SIZE], kend[X_SIZE];
    double tol = fmax(1e-13, 1e-9 * h);
    trial_ctx q = {t, x, k1, y, e, kend};
    bracket b = {0.0, NAN, h, ex_hi, NAN, ex_hi, 0, 1};
    if (s->pair == BR_PAIR_DP45)
        seed_dense(s, &q, h, k7, &b, tol);
    illinois(s, excess_by_step, &q, &b, tol);
    if (!b.at_hi)
        take_step(s, t, b.hi, x, k1, y, e, kend);
    return b.hi;
}

/* Shorten an accepted step [t, t+h] that crossed a UVLO threshold to end
 * just after the crossing (bisection on the step length; on the envelope
 * path regula falsi, locate_secant). */
static double locate_uvlo(br_sim *s, double t, double h, const double *x, const double *k1,
                          double *y, const double *k7)
{
    if (s->secant_locate)
        return locate_secant(s, t, h, x, k1, y, k7, br_sim_uvlo_excess(s, s->vr));
    double e[X_SIZE], kend[X_SIZE], lo = 0.0, hi = h;
    double tol = fmax(1e-13, 1e-9 * h);
    while (hi - lo > tol) {
        double mid = 0.5 * (lo + hi);
        s->work++; /* at most about 60 trials: no limit needed here */
        take_step(s, t, mid, x, k1, y, e, kend);
        if (br_sim_uvlo_due(s, s->vr) >= 0)
            hi = mid;
        else
            lo = mid;
    }
    take_step(s, t, hi, x, k1, y, e, kend);
    return hi;
}

/* The pair for an interval of length len.  Heun-Euler has no stage inside
 * the step for the stored charges' exponential quadrature, so chains with
 * stored charge stop at Bogacki-Shampine. */
static int choose_pair(const br_sim *s, double len)
{
    if (s->integ == BR_INTEG_REFERENCE)
        return BR_PAIR_RK8;
    if (len <= BR_EDGE_INTERVAL * s->tm.T && !s->stored)
        return BR_PAIR_HE21;
    return len <= BR_SHORT_INTERVAL * s->tm.T ? BR_PAIR_BS23 : BR_PAIR_DP45;
}

double br_sim_integrate(br_sim *s, double tb, int *status)
{
    double t = s->t, k1[X_SIZE], y[X_SIZE], e[X_SIZE], kend[X_SIZE];
    /* order of each pair's error estimate, for the step-size controller */
    static const int order[] = {
        [BR_PAIR_DP45] = 4, [BR_PAIR_BS23] = 2, [BR_PAIR_HE21] = 1, [BR_PAIR_RK8] = 7};
    s->pair = choose_pair(s, tb - t);
    int p = order[s->pair];
    /* an interval starts with the step its twin of the last period began
     * with: periods repeat, and the step carried from the interval before
     * (a different stretch of the circuit) is often far off */
    int slot = s->iv < BR_HMEM ? s->iv : -1, naccepted = 0;
    s->iv++;
    double h = slot >= 0 && s->hmem[slot] > 0 ? s->hmem[slot]
               : s->hlast > 0                 ? s->hlast
                                              : (tb - t) / 8;
    *status = 0;
    if (tb - t < 1e-15) { /* an interval of rounding size: nothing moves */
        s->t = tb;
        return tb;
    }
    if (s->k1_valid)
        copy_live(s, k1, s->k1);
    else
        br_sim_rhs(s, t, s->x, k1);
    s->k1_valid = 0;
    while (t < tb) {
        int last = 0, cut = 0; /* the step ends the interval; it was shortened for that */
        if (h >= tb - t || tb - t - h < 1e-15) {
            cut = h > tb - t;
            h = tb - t;
            last = 1;
        }
        if (last && h < 1e-15) { /* a rounding-sized remainder: nothing moves */
            t = tb;
            break;
        }
        if (h < 1e-16 * fmax(1.0, fabs(t)) + 1e-18) {
            *status = -1;
            break;
        }
        if (br_sim_spend(s, 1)) { /* work limit or a stop */
            *status = -2;
            break;
        }
        take_step(s, t, h, s->x, k1, y, e, kend);
        double err = error_norm(s, s->x, y, e);
        if (!(err <= 1.0)) {
            s->nrejects++;
            h = next_h(h, isnan(err) ? 1e9 : err, p);
            continue;
        }
        if (br_sim_uvlo_due(s, s->vr) >= 0) {
            double hc = locate_uvlo(s, t, h, s->x, k1, y, kend);
            copy_live(s, s->x, y);
            br_sim_clamp_limit(s);
            t = last && hc >= h ? tb : t + hc;
            br_sim_track_extremes(s, t); /* and the observer's sample */
            *status = 1;
            break;
        }
        copy_live(s, s->x, y);
        br_sim_clamp_limit(s);
        t = last ? tb : t + h; /* t + (tb - t) need not round to tb */
        s->nsteps++;
        /* remember what the controller proposes after the first step,
         * shy of it (0.6) so that the next period's first try rarely fails
         * (measured on the 12-switch example: 58 steps and 0.2 rejections
         * a period instead of 68 and 6.6) */
        if (slot >= 0 && naccepted++ == 0)
            s->hmem[slot] = fmax(h, 0.6 * next_h(h, err, p));
        br_sim_track_extremes(s, t); /* and the observer's sample */
        /* a step cut short by the interval end says nothing about the
         * step the dynamics allow: do not let it shrink the next one */
        double hn = next_h(h, err, p);
        s->hlast = cut ? fmax(s->hlast, hn) : hn;
        h = s->hlast;
        if (s->pair == BR_PAIR_HE21 && t < tb) /* its kend is not at y */
            br_sim_rhs(s, t, s->x, k1);
        else
            copy_live(s, k1, kend);
    }
    s->t = t;
    return t;
}

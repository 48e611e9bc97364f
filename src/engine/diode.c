/* diode.c - the link diode: Shockley junction with series resistance,
 * temperature, depletion capacitance, stored charge and leakage. */
#include "engine/diode.h"

#include "core/error.h"
#include "engine/physconst.h"

#include <math.h>
#include <stddef.h>
#include <stdio.h>

/* ---- resolving a part at a temperature -------------------------------- */

/* Range rules of the part's parameters: value > 0, or >= 0 if zero_ok. */
typedef struct br_diode_rule {
    const char *name; /* attribute name, for the error field */
    size_t off;       /* offsetof the br_qty in br_diode_part */
    int zero_ok;      /* 0 allowed */
    const char *unit; /* for the message */
} br_diode_rule;

static const br_diode_rule br_diode_rules[] = {
    {"is", offsetof(br_diode_part, is), 0, "A"},
    {"n", offsetof(br_diode_part, n), 0, ""},
    {"rs", offsetof(br_diode_part, rs), 1, "ohm"},
    {"cj0", offsetof(br_diode_part, cj0), 1, "F"},
    {"vj", offsetof(br_diode_part, vj), 0, "V"},
    {"m", offsetof(br_diode_part, m), 1, ""},
    {"tau", offsetof(br_diode_part, tau), 1, "s"},
    {"eg", offsetof(br_diode_part, eg), 1, "eV"},
    {"ir", offsetof(br_diode_part, ir), 1, "A"},
    {"ir_temp", offsetof(br_diode_part, ir_temp), 0, "K"},
    {"ir_double", offsetof(br_diode_part, ir_double), 0, "K"},
    {"vrrm", offsetof(br_diode_part, vrrm), 1, "V"},
    {"ifsm", offsetof(br_diode_part, ifsm), 1, "A"},
};

static int part_error(const br_diode_part *p, const char *name, int line, br_error *err,
                      const char *what, double x, const char *unit, const char *expect)
{
    char field[BR_ID_MAX + 32];
    snprintf(field, sizeof field, "diode[%s]%s%s", p->id, name[0] ? "/" : "", name);
    return br_error_set(err, BR_EINPUT, NULL, line ? line : p->line, field,
                        "%s %g%s%s is not physical; expected %s", what, x, unit[0] ? " " : "", unit,
                        expect);
}

static int check_part(const br_diode_part *p, br_error *err)
{
    size_t nrules = sizeof br_diode_rules / sizeof br_diode_rules[0];
    for (size_t k = 0; k < nrules; k++) {
        const br_diode_rule *r = &br_diode_rules[k];
        const br_qty *q = (const br_qty *)((const char *)p + r->off);
        double x = q->nom; /* NaN fails both comparisons */
        if (!(r->zero_ok ? x >= 0.0 : x > 0.0) || !isfinite(x))
            return part_error(p, r->name, q->line, err, "value", x, r->unit,
                              r->zero_ok ? "a finite value >= 0" : "a finite value > 0");
    }
    if (!isfinite(p->xti.nom))
        return part_error(p, "xti", p->xti.line, err, "value", p->xti.nom, "",
                          "a finite temperature exponent");
    if (!(p->tnom > 0.0) || !isfinite(p->tnom))
        return part_error(p, "", 0, err, "reference temperature", p->tnom, "K",
                          "a finite temperature > 0 K");
    return BR_OK;
}

/* Is(T) = Is(Tnom) (T/Tnom)^(xti/n) exp(Eg q/(n k T) (T/Tnom - 1)), Eg in
 * eV: the junction-diode saturation-current temperature law (S. M. Sze,
 * "Physics of Semiconductor Devices": Is ~ ni^2 ~ T^3 exp(-Eg/kT)). */
static double is_at(const br_diode_part *p, double T, double vt)
{
    double n = p->n.nom, r = T / p->tnom;
    return p->is.nom * pow(r, p->xti.nom / n) * exp(p->eg.nom / (n * vt) * (r - 1.0));
}

int br_diode_resolve(const br_diode_part *p, double T, br_diode *out, br_error *err)
{
    int rc = check_part(p, err);
    if (rc)
        return rc;
    if (!(T > 0.0) || !isfinite(T))
        return part_error(p, "", 0, err, "operating temperature", T, "K",
                          "a finite temperature > 0 K");
    br_diode d; /* built aside: *out is untouched on failure */
    d.id = p->id;
    d.vt = BR_BOLTZMANN * T / BR_ECHARGE;
    d.is = is_at(p, T, d.vt);
    d.n = p->n.nom;
    d.rs = p->rs.nom;
    d.cj0 = p->cj0.nom;
    d.vj = p->vj.nom;
    d.m = p->m.nom;
    d.tau = p->tau.nom;
    d.ir = p->ir.nom * exp2((T - p->ir_temp.nom) / p->ir_double.nom);
    d.vrrm = p->vrrm.nom;
    d.ifsm = p->ifsm.nom;
    /* Extreme eg/xti/T can underflow or overflow Is(T) or ir(T). */
    if (!(d.is > 0.0) || !isfinite(d.is))
        return part_error(p, "is", p->is.line, err, "saturation current at the temperature", d.is,
                          "A", "a finite value > 0 (check is, eg, xti and T)");
    if (!isfinite(d.ir))
        return part_error(p, "ir", p->ir.line, err, "leakage at the temperature", d.ir, "A",
                          "a finite value (check ir, ir_temp, ir_double and T)");
    *out = d;
    return BR_OK;
}

/* ---- forward current with series resistance -------------------------- */

/* With a = n Vt, c = Is R / a, s = v / a and y = i R / a the circuit
 * equations i = Is (exp(vj/a) - 1), v = vj + i R reduce to
 *     w exp(w) = c exp(c + s),  w = c + y,  i.e.  w = W0(c exp(c + s)),
 * the closed form of T. C. Banwell and A. Jayakumar, "Exact analytical
 * solution for current flow through diode with series resistance",
 * Electronics Letters 36(4), 2000.  We never form the argument of W0 (it
 * overflows from v ~ 18 V at R = 1 ohm); we work with its logarithm
 * u = s + c + ln c, so that w solves w + ln w = u.  Three regimes:
 *  - deep reverse (w << c): y = c (exp(s + c) - 1) directly;
 *  - conduction (w > 1): w + ln w = u by Fritsch's iteration, then y = w - c;
 *  - in between: y itself by Halley steps on a residual free of the
 *    cancellation of w - c at small currents.
 * Each is checked against a root solve of the circuit equations and
 * against W0 in extended precision in the tests. */

/* W0 of exp(u), within ~2 % for every real u (S. Winitzki, "Uniform
 * approximations for transcendental functions", ICCSA 2003), using
 * ln(1 + x) computed in the log domain so that no exp overflows. */
static double w0_of_exp(double u)
{
    double l = u > 36.0 ? u + exp(-u) : log1p(exp(u));
    return l * (1.0 - log1p(l) / (2.0 + l));
}

/* Solve w + ln w = u for u > 1 (w > 1).  Start: Winitzki below u = 7,
 * above it the first three terms u - ln u + ln u / u of the large-argument
 * series (R. M. Corless et al., "On the Lambert W function", Adv. Comput.
 * Math. 5, 1996), within 1e-3 there and 3e-4 from u = 8 up.  Then the
 * fourth-order iteration of F. N. Fritsch, R. E. Shafer and W. P. Crowley,
 * "Algorithm 443: solution of the transcendental equation w e^w = x",
 * CACM 16(2), 1973.  Measured against W0 in 40-digit arithmetic: a step
 * that moves w by less than 3e-4 relative leaves an error below 2e-16, so
 * it ends the loop; one or two steps are taken, never three. */
static double w_of_log(double u)
{
    double w;
    if (u < 7.0) {
        w = w0_of_exp(u);
    } else {
        double lu = log(u);
        w = u - lu + lu / u;
    }
    for (int k = 0; k < 3; k++) {
        double z = u - w - log(w);
        double q = 2.0 * (1.0 + w) * (1.0 + w + z / 1.5);
        double dw = w * z / (1.0 + w) * (q - z) / (q - 2.0 * z);
        w += dw;
        if (fabs(dw) < 3e-4 * w)
            break;
    }
    return w;
}

/* One Halley step for y; sets *dy to the change.  While w < 1 the
 * residual y - c expm1(s - y) is used: both terms are of the size of y, so
 * it has no cancellation, and its exponent stays small.  From w = 1 up the
 * equivalent logarithmic residual y + log1p(y/c) - s is used, which never
 * overflows.  Their derivatives (1 + w) and (1 + w)/w, and second
 * derivatives -w and -1/w^2, give the two updates below.  In both forms
 * Halley's error constant |f'''/(6 f') - (f''/(2 f'))^2| is at most 1/6. */
static double halley_step(double c, double s, double y, double *dy)
{
    double em = expm1(s - y);
    double wl = c + c * em, wh = c + y; /* wl is only a slope here */
    if (wl < 1.0 || !(wh > 0.0)) {
        double f = y - c * em;
        *dy = -2.0 * f * (1.0 + wl) / (2.0 * (1.0 + wl) * (1.0 + wl) + f * wl);
    } else {
        double f = y + log1p(y / c) - s;
        *dy = -2.0 * f * wh * (1.0 + wh) / (2.0 * (1.0 + wh) * (1.0 + wh) + f);
    }
    return y + *dy;
}

/* Start for u <= 1: below u = -1 (x = e^u < 0.37) the [1/1] Pade form
 * x (1 + x/2) / (1 + 3x/2) of the Taylor series W0(x) = x - x^2 +
 * 3x^3/2 - ... (Corless et al. 1996), within 0.8 % and O(x^3) relative as
 * x -> 0; above, Winitzki's 2 %. */
static double w0_start(double u)
{
    if (u > -1.0)
        return w0_of_exp(u);
    double x = exp(u);
    return x * (1.0 + 0.5 * x) / (1.0 + 1.5 * x);
}

/* y by Halley steps.  With the error constant <= 1/6, a step dy leaves
 * about |dy|^3 / 6: stop when that is below 1e-16 |y|. */
static double y_by_halley(double c, double s, double u)
{
    double y = w0_start(u) - c, dy;
    for (int k = 0; k < 6; k++) {
        y = halley_step(c, s, y, &dy);
        if (fabs(dy * dy * dy) <= 6e-16 * fabs(y))
            break;
    }
    return y;
}

/* Halley steps for y from a start y0 close to it (the last solution of
 * a warm loop), with y_by_halley's stopping rule. */
static double y_halley_from(double c, double s, double y0)
{
    double y = y0, dy;
    for (int k = 0; k < 8; k++) {
        y = halley_step(c, s, y, &dy);
        if (fabs(dy * dy * dy) <= 6e-16 * fabs(y))
            break;
    }
    return y;
}

/* Solve for y; *w returns w = c + y evaluated without cancellation (it
 * sets the conductance).  R > 0, so c > 0. */
static double solve_y(double c, double s, double *w)
{
    double e = s + c;
    if (e < -700.0) { /* w < 1e-304 c: y = -c to the last digit */
        *w = 0.0;
        return -c;
    }
    if (e < -20.0) {
        /* y = c expm1(s - y) with y = -c + w: taking y = -c inside the
         * exponent errs by w^2 ~ c^2 exp(2e), below 1e-17 relative. */
        double x = exp(e);
        if (c * x * x < 1e-17) {
            double w1 = c * x;
            *w = w1 - w1 * w1; /* w = c x exp(-w), to second order */
            return c * (x - 1.0);
        }
    }
    double u = e + log(c);
    if (u > 1.0 && c < 0.5) {
        /* w > 1 > 2c: y = w - c keeps at least half of w's digits. */
        *w = w_of_log(u);
        return *w - c;
    }
    double y = y_by_halley(c, s, u);
    /* c exp(s - y) is exact where w < 1 or w < c (no cancellation of
     * c + y), and cannot overflow there. */
    *w = s - y < 0.0 || c + y < 1.0 ? c * exp(s - y) : c + y;
    return y;
}

/* log(1 + d) for |d| <= BR_LOG1P_SMALL: 2 atanh(d / (2 + d)) by its
 * series, to the last bit (the first term left out is below 1e-20 of the
 * result there), for a fifth of a library logarithm's work. */
#define BR_LOG1P_SMALL 1e-2
static double log1p_small(double d)
{
    double t = d / (2.0 + d), t2 = t * t;
    return 2.0 * t * (1.0 + t2 * (1.0 / 3 + t2 * (1.0 / 5 + t2 * (1.0 / 7 + t2 / 9))));
}

/* The Fritsch-Shafer-Crowley iteration of w_of_log from a start w > 0.
 * Fourth order: from a start a few per cent off, one or two steps.  lw:
 * log(w) of the start when known (NAN: not).  On return *lw_end is log of
 * the result: u - w, which the iteration has made exact to its own
 * accuracy (the residual after a step of relative size 3e-4 is of the
 * order of its fourth power). */
static double fsc_from(double u, double w, double lw, double *lw_end)
{
    for (int k = 0; k < 8; k++) {
        double z = u - w - (k == 0 && !isnan(lw) ? lw : log(w));
        double q = 2.0 * (1.0 + w) * (1.0 + w + z / 1.5);
        double dw = w * z / (1.0 + w) * (q - z) / (q - 2.0 * z);
        w += dw;
        if (!(w > 0.0))
            return 0.0; /* left the domain: the caller starts afresh */
        if (fabs(dw) < 3e-4 * w) {
            *lw_end = u - w;
            return w;
        }
    }
    return 0.0; /* not converged in 8 steps: likewise */
}

/* R <= 0: Shockley, continued along its tangent beyond BR_DIODE_XLIM. */
static void eval_shockley(const br_diode *d, double v, double *i, double *g)
{
    double a = d->n * d->vt, s = v / a;
    if (s <= BR_DIODE_XLIM) {
        *i = d->is * expm1(s);
        *g = d->is / a * exp(s);
        return;
    }
    double e = exp(BR_DIODE_XLIM);
    *g = d->is / a * e;
    *i = d->is * (e - 1.0) + *g * a * (s - BR_DIODE_XLIM);
}

void br_diode_eval(const br_diode *d, double r_extra, double v, double *i, double *g)
{
    double R = d->rs + r_extra, ii, gg;
    if (!(R > 0.0)) {
        eval_shockley(d, v, &ii, &gg);
    } else {
        double a = d->n * d->vt, w;
        double y = solve_y(d->is * R / a, v / a, &w);
        ii = a * y / R;
        /* di/dv = gd / (1 + R gd) with gd = (i + Is)/a = w/R. */
        gg = w / (R * (1.0 + w));
    }
    if (i)
        *i = ii;
    if (g)
        *g = gg;
}

void br_diode_eval_warm(const br_diode *d, double r_extra, double v, br_diode_warm *ws, double *i,
                        double *g)
{
    double R = d->rs + r_extra, a = d->n * d->vt;
    if (!(R > 0.0)) {
        br_diode_eval(d, r_extra, v, i, g);
        return;
    }
    if (ws->r != R || ws->a != a) { /* c is fixed by R and a: keep it, its log, 1/a, a/R */
        ws->r = R;
        ws->a = a;
        ws->c = d->is * R / a;
        ws->logc = log(ws->c);
        ws->inv_a = 1.0 / a;
        ws->a_r = a / R;
        ws->w = ws->slope = 0.0;
        ws->have_y = 0;
    }
    double c = ws->c, s = v * ws->inv_a;
    double u = s + c + ws->logc, y, w;
    /* start on the tangent of the last solution: w and y = w - c move at
     * w/(1 + w) per unit of u (or of s); a start near the last solution
     * has its logarithm from the last one's (ws->lw) */
    double lw = NAN;
    w = 0.0;
    if (u > 1.0 && c < 0.5 && ws->w > 1.0) {
        double w0 = ws->w + ws->slope * (u - ws->u), dl = (w0 - ws->w) / ws->w;
        double l0 = ws->have_lw && fabs(dl) <= BR_LOG1P_SMALL ? ws->lw + log1p_small(dl) : NAN;
        w = fsc_from(u, w0, l0, &lw);
    }
    ws->have_lw = 0;
    if (w > 1.0 && isfinite(w)) { /* a far start can leave the region */
        y = w - c;
        ws->lw = lw;
        ws->have_lw = 1;
    } else if (ws->have_y && fabs(s - ws->s) < 1.0 && s + c >= -20.0 && !(u > 1.0 && c < 0.5) &&
               isfinite(y = y_halley_from(c, s, ws->y + ws->slope * (s - ws->s)))) {
        /* the Halley region of solve_y, started near the last y (a
         * drive within n Vt of the last) instead of a fresh estimate:
         * the same stopping rule, fewer steps */
        w = s - y < 0.0 || c + y < 1.0 ? c * exp(s - y) : c + y;
        ws->y = y;
        ws->s = s;
    } else {
        y = solve_y(c, s, &w);
        ws->y = y;
        ws->s = s;
        ws->have_y = s + c >= -20.0 && !(u > 1.0 && c < 0.5);
    }
    double slope = w / (1.0 + w);
    ws->w = w;
    ws->u = u;
    ws->slope = slope;
    *i = ws->a_r * y;
    *g = slope / R; /* di/dv = gd / (1 + R gd), gd = w / R */
}

/* With a = n Vt, x = i/Is and L = ln(1 + x) the junction voltage is
 * vj = a L, and from u = 0 (i = 0):
 *   integral i du    = a i - Is vj + R i^2 / 2
 *   integral i^2 du  = a (i^2/2 - Is i + Is^2 L) + R i^3 / 3
 *   integral i vj du = a^2 Is ((1 + x) L - x - L^2/2)
 *                      + R a Is^2 (y^2 L/2 - y^2/4 - y L + y - 3/4), y = 1 + x
 * (elementary integrals of t ln(1+t)/(1+t) and t ln(1+t)).  At small x
 * the forms cancel, but the terms are then far below anything they are
 * added to. */
void br_diode_sweep_to(const br_diode *d, double r_extra, double u, br_diode_sweep *out)
{
    *out = (br_diode_sweep){0};
    double R = d->rs + r_extra;
    if (!(u > 0.0) || !(R > 0.0))
        return;
    double a = d->n * d->vt, is = d->is, i;
    br_diode_eval(d, r_extra, u, &i, NULL);
    double x = i / is, L = log1p(x), y = 1.0 + x;
    double vj = a * L;
    out->i = i;
    out->q = a * i - is * vj + 0.5 * R * i * i;
    out->i2 = a * (0.5 * i * i - is * i + is * is * L) + R * i * i * i / 3.0;
    double ivj = a * a * is * (y * L - x - 0.5 * L * L) +
                 R * a * is * is * (0.5 * y * y * L - 0.25 * y * y - y * L + y - 0.75);
    out->e = ivj + d->rs * out->i2;
}

double br_diode_current(const br_diode *d, double r_extra, double v)
{
    double i;
    br_diode_eval(d, r_extra, v, &i, NULL);
    return i;
}

double br_diode_conductance(const br_diode *d, double r_extra, double v)
{
    double g;
    br_diode_eval(d, r_extra, v, NULL, &g);
    return g;
}

double br_diode_vjunction(const br_diode *d, double i)
{
    if (!(i > -d->is))
        return -HUGE_VAL;
    return d->n * d->vt * log1p(i / d->is);
}

/* ---- depletion capacitance and charge --------------------------------- */

/* Cj = Cj0 / (1 + vr/vj)^m for vr >= -fc vj (S. M. Sze, "Physics of
 * Semiconductor Devices", depletion capacitance of a graded junction);
 * further forward it follows the tangent at vr = -fc vj, so it stays
 * finite through vr = -vj. */
double br_diode_cj(const br_diode *d, double vr)
{
    if (d->cj0 <= 0.0)
        return 0.0;
    double x = vr / d->vj, x1 = -BR_DIODE_FC;
    if (x >= x1)
        return d->cj0 * pow(1.0 + x, -d->m);
    double c1 = d->cj0 * pow(1.0 + x1, -d->m);
    return c1 * (1.0 - d->m * (x - x1) / (1.0 + x1));
}

/* Integral of Cj from 0 to vr over the power-law part (x = vr/vj >= -fc):
 * Cj0 vj ((1 + x)^(1-m) - 1) / (1 - m), written with expm1 so that m
 * near 1 loses nothing, and Cj0 vj ln(1 + x) at m == 1. */
static double qj_power(const br_diode *d, double x)
{
    double l = log1p(x), e = 1.0 - d->m;
    double f = e == 0.0 ? l : expm1(e * l) / e;
    return d->cj0 * d->vj * f;
}

double br_diode_qj(const br_diode *d, double vr)
{
    if (d->cj0 <= 0.0)
        return 0.0;
    double x = vr / d->vj, x1 = -BR_DIODE_FC;
    if (x >= x1)
        return qj_power(d, x);
    /* Beyond -fc vj: the tangent line integrated exactly. */
    double c1 = d->cj0 * pow(1.0 + x1, -d->m);
    double dx = x - x1;
    return qj_power(d, x1) + c1 * d->vj * dx * (1.0 - 0.5 * d->m * dx / (1.0 + x1));
}

/* ---- stored charge, leakage, recovery --------------------------------- */

/* dq/dt = i - q/tau with i constant: q(dt) = i tau + (q - i tau) e^(-dt/tau)
 * (charge-control model, P. O. Lauritzen and C. L. Ma, "A simple diode
 * model with reverse recovery", IEEE Trans. Power Electronics 6(2),
 * 1991), written with expm1 so that dt << tau keeps full precision. */
double br_diode_q_step(double q, double i, double tau, double dt)
{
    if (!(tau > 0.0))
        return 0.0;
    return q - (i * tau - q) * expm1(-dt / tau);
}

double br_diode_leak(const br_diode *d, double vr)
{
    if (!(vr > 0.0))
        return 0.0;
    if (vr > 37.0 * d->vt) /* exp(-37) < 1e-16: saturated to the last digit */
        return d->ir;
    return -d->ir * expm1(-vr / d->vt);
}

int br_diode_recovery(double qrr, double didt, double soft, br_recovery *out)
{
    out->irrm = out->trr = out->ta = out->tb = 0.0;
    if (!(qrr >= 0.0 && didt > 0.0 && soft >= 0.0) || !isfinite(qrr) || !isfinite(didt) ||
        !isfinite(soft))
        return BR_EUSAGE;
    out->irrm = sqrt(2.0 * qrr * didt / (1.0 + soft));
    out->ta = out->irrm / didt;
    out->tb = soft * out->ta;
    out->trr = out->ta + out->tb;
    return BR_OK;
}

/* test_engine_diode.c - the link-diode physics against published formulas,
 * GSL as a reference library, and deliberately broken parameters. */
#include "engine/diode.h"
#include "testkit.h"

#include <float.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_integration.h>
#include <gsl/gsl_roots.h>
#include <gsl/gsl_sf_lambert.h>
#include <stdio.h>
#include <string.h>

#define T_ROOM 300.15 /* 27 degC, K */

static br_diode_part part(double is, double n)
{
    br_diode_part p;
    memset(&p, 0, sizeof p);
    br_diode_part_defaults(&p);
    snprintf(p.id, sizeof p.id, "%s", "d1");
    p.line = 7;
    p.is = br_qty_fixed(is);
    p.n = br_qty_fixed(n);
    return p;
}

static br_diode resolved(double is, double n, double T)
{
    br_diode_part p = part(is, n);
    br_diode d;
    br_error err;
    br_error_clear(&err);
    CU_ASSERT_EQUAL_FATAL(br_diode_resolve(&p, T, &d, &err), BR_OK);
    return d;
}

/* ---- thermal voltage and temperature laws ----------------------------- */

static void test_thermal_voltage(void)
{
    /* Thermal voltage kT/q at 300.15 K is 25.865 mV (CODATA 2018 values of
     * k and q, exact in the SI since 2019). */
    br_diode d = resolved(1e-14, 1.0, T_ROOM);
    BR_ASSERT_REL(d.vt, 25.865e-3, 1e-5);
    /* Proportional to T. */
    br_diode h = resolved(1e-14, 1.0, 2.0 * T_ROOM);
    BR_ASSERT_REL(h.vt, 2.0 * d.vt, 1e-14);
}

/* Is(T) written out independently: Boltzmann constant in eV/K
 * (8.617333262e-5, CODATA 2018), Is(T) = Is (T/Tn)^(xti/n)
 * exp(Eg/(n k T) (T/Tn - 1)), the junction-diode temperature law. */
static double is_expected(double is, double n, double eg, double xti, double tn, double T)
{
    double k_ev = 8.617333262e-5;
    return is * pow(T / tn, xti / n) * exp(eg / (n * k_ev * T) * (T / tn - 1.0));
}

static void test_is_temperature(void)
{
    br_diode_part p = part(1e-14, 1.0); /* defaults: eg 1.11, xti 3 */
    CU_ASSERT_DOUBLE_EQUAL(p.eg.nom, 1.11, 1e-12);
    CU_ASSERT_DOUBLE_EQUAL(p.xti.nom, 3.0, 1e-12);
    br_error err;
    double prev = 0.0;
    for (double T = 230.0; T <= 450.0; T += 10.0) {
        br_diode d;
        CU_ASSERT_EQUAL_FATAL(br_diode_resolve(&p, T, &d, &err), BR_OK);
        BR_ASSERT_REL(d.is, is_expected(1e-14, 1.0, 1.11, 3.0, p.tnom, T), 1e-9);
        CU_ASSERT_TRUE(d.is > prev); /* monotonic in T */
        prev = d.is;
    }
    br_diode d0 = resolved(1e-14, 1.0, p.tnom);
    BR_ASSERT_REL(d0.is, 1e-14, 1e-15);
    /* Temperature rise that doubles Is from 300 K, by bisection.  Common
     * practice: the saturation current of a silicon junction roughly
     * doubles every ~5 K near room temperature (the law gives ~4.5 K). */
    double lo = 0.0, hi = 20.0, is300 = resolved(1e-14, 1.0, 300.0).is;
    for (int k = 0; k < 60; k++) {
        double mid = 0.5 * (lo + hi);
        if (resolved(1e-14, 1.0, 300.0 + mid).is < 2.0 * is300)
            lo = mid;
        else
            hi = mid;
    }
    CU_ASSERT_TRUE(lo > 4.0 && lo < 7.0);
}

static void test_leak_temperature(void)
{
    br_diode_part p = part(1e-14, 1.0);
    p.ir = br_qty_fixed(2e-6);
    p.ir_temp = br_qty_fixed(298.15);
    p.ir_double = br_qty_fixed(10.0);
    br_error err;
    br_diode d;
    CU_ASSERT_EQUAL_FATAL(br_diode_resolve(&p, 298.15, &d, &err), BR_OK);
    BR_ASSERT_REL(d.ir, 2e-6, 1e-14);
    CU_ASSERT_EQUAL_FATAL(br_diode_resolve(&p, 318.15, &d, &err), BR_OK);
    BR_ASSERT_REL(d.ir, 8e-6, 1e-12); /* two doublings in 20 K */
    /* Smooth onset: 0 at and below zero bias, ir (1 - e^(-vr/Vt)) above. */
    BR_ASSERT_NEAR(br_diode_leak(&d, -5.0), 0.0, 0.0);
    BR_ASSERT_NEAR(br_diode_leak(&d, 0.0), 0.0, 0.0);
    BR_ASSERT_REL(br_diode_leak(&d, 1e-9), d.ir * 1e-9 / d.vt, 1e-6);
    BR_ASSERT_REL(br_diode_leak(&d, d.vt), d.ir * (1.0 - exp(-1.0)), 1e-12);
    BR_ASSERT_REL(br_diode_leak(&d, 400.0), d.ir, 1e-14);
    double prev = 0.0;
    for (double vr = 1e-3; vr < 1.0; vr *= 1.5) {
        double l = br_diode_leak(&d, vr);
        CU_ASSERT_TRUE(l > prev && l <= d.ir);
        prev = l;
    }
}

static void test_resolve_copies(void)
{
    br_diode_part p = part(3e-12, 1.4);
    p.rs = br_qty_fixed(0.05);
    p.cj0 = br_qty_fixed(20e-12);
    p.vj = br_qty_fixed(0.8);
    p.m = br_qty_fixed(0.4);
    p.tau = br_qty_fixed(30e-9);
    p.vrrm = br_qty_fixed(600.0);
    p.ifsm = br_qty_fixed(8.0);
    br_diode d;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_diode_resolve(&p, 350.0, &d, &err), BR_OK);
    CU_ASSERT_PTR_EQUAL(d.id, p.id);
    BR_ASSERT_REL(d.n, 1.4, 0.0);
    BR_ASSERT_REL(d.rs, 0.05, 0.0);
    BR_ASSERT_REL(d.cj0, 20e-12, 0.0);
    BR_ASSERT_REL(d.vj, 0.8, 0.0);
    BR_ASSERT_REL(d.m, 0.4, 0.0);
    BR_ASSERT_REL(d.tau, 30e-9, 0.0);
    BR_ASSERT_REL(d.vrrm, 600.0, 0.0);
    BR_ASSERT_REL(d.ifsm, 8.0, 0.0);
    BR_ASSERT_REL(d.is, is_expected(3e-12, 1.4, 1.11, 3.0, p.tnom, 350.0), 1e-9);
}

/* ---- forward current with series resistance -------------------------- */

typedef struct circuit {
    double is, a, R, v; /* A, V (n Vt), ohm, V */
} circuit;

/* v = vj + R Is (exp(vj/a) - 1), as a function of vj; increasing. */
static double kvl(double vj, void *arg)
{
    const circuit *c = arg;
    return vj + c->R * c->is * expm1(vj / c->a) - c->v;
}

/* Reference current by a bracketed Brent root solve of the circuit
 * equation in vj (GSL as reference library).  Bracket: vj lies in [v, 0]
 * in reverse and in [0, a ln(1 + v/(R Is))] forward, since i <= v/R. */
static double vj_by_brent(double is, double a, double R, double v)
{
    circuit c = {is, a, R, v};
    double lo = v < 0.0 ? v : 0.0;
    double hi = v < 0.0 ? 0.0 : fmin(v, a * log1p(v / (R * is)));
    if (v == 0.0)
        return 0.0;
    gsl_function f = {kvl, &c};
    gsl_root_fsolver *s = gsl_root_fsolver_alloc(gsl_root_fsolver_brent);
    CU_ASSERT_PTR_NOT_NULL_FATAL(s);
    CU_ASSERT_EQUAL_FATAL(gsl_root_fsolver_set(s, &f, lo, hi), GSL_SUCCESS);
    for (int k = 0; k < 500; k++) {
        gsl_root_fsolver_iterate(s);
        lo = gsl_root_fsolver_x_lower(s);
        hi = gsl_root_fsolver_x_upper(s);
        if (gsl_root_test_interval(lo, hi, 0.0, 2.0 * DBL_EPSILON) == GSL_SUCCESS)
            break;
    }
    double vj = gsl_root_fsolver_root(s);
    gsl_root_fsolver_free(s);
    return vj;
}

static double current_by_brent(double is, double a, double R, double v)
{
    return is * expm1(vj_by_brent(is, a, R, v) / a);
}

static const double grid_v[] = {-1000.0, -200.0, -5.0, -2.0, -0.8, -0.56, -0.3,  -0.05, -1e-3,
                                -1e-6,   1e-6,   1e-3, 0.05, 0.2,  0.4,   0.55,  0.65,  0.75,
                                0.9,     1.2,    3.0,  18.0, 50.0, 300.0, 1000.0};
static const double grid_r[] = {1e-3, 1e-2, 0.1, 0.47, 1.0, 10.0, 100.0, 1e3};
#define NV (sizeof grid_v / sizeof grid_v[0])
#define NR (sizeof grid_r / sizeof grid_r[0])

static void test_current_vs_brent(void)
{
    /* Closed form of T. C. Banwell and A. Jayakumar, Electronics Letters
     * 36(4), 2000, checked against a direct root solve of the same circuit
     * equation; includes huge forward and reverse voltages. */
    const double iss[] = {1e-14, 1e-9};
    const double ns[] = {1.0, 1.8};
    for (int a = 0; a < 2; a++)
        for (int b = 0; b < 2; b++) {
            br_diode d = resolved(1.0, ns[b], T_ROOM);
            d.is = iss[a]; /* Is exactly, at room temperature */
            d.rs = 0.0;
            for (size_t r = 0; r < NR; r++)
                for (size_t k = 0; k < NV; k++) {
                    double ref = current_by_brent(d.is, d.n * d.vt, grid_r[r], grid_v[k]);
                    double i = br_diode_current(&d, grid_r[r], grid_v[k]);
                    BR_ASSERT_REL(i, ref, 1e-12);
                }
        }
}

static void test_current_vs_gsl_lambert(void)
{
    /* The closed form (Banwell and Jayakumar 2000) i = (a/R) W0((Is R/a)
     * exp((v + Is R)/a)) - Is evaluated literally with GSL's W0, where its
     * argument is representable and i >> Is (no cancellation). */
    br_diode d = resolved(2e-12, 1.3, T_ROOM);
    d.rs = 0.1;
    for (double v = 0.3; v < 8.0; v *= 1.17) {
        double R = d.rs + 0.5, a = d.n * d.vt;
        double w = gsl_sf_lambert_W0(d.is * R / a * exp((v + d.is * R) / a));
        BR_ASSERT_REL(br_diode_current(&d, 0.5, v), a / R * w - d.is, 1e-12);
    }
}

static void test_current_limits(void)
{
    br_diode d = resolved(1e-14, 1.0, T_ROOM);
    d.rs = 0.2;
    /* Far forward the resistor dominates: i -> (v - vj)/R with vj finite. */
    for (double v = 10.0; v <= 1e6; v *= 10.0) {
        double i = br_diode_current(&d, 0.8, v);
        CU_ASSERT_TRUE(isfinite(i));
        BR_ASSERT_REL(i, (v - br_diode_vjunction(&d, i)) / 1.0, 1e-12);
    }
    /* Far reverse: -Is. */
    BR_ASSERT_REL(br_diode_current(&d, 0.8, -1e6), -d.is, 1e-15);
    /* Zero bias, zero current; odd to first order around it. */
    BR_ASSERT_NEAR(br_diode_current(&d, 0.8, 0.0), 0.0, 1e-30);
    double ip = br_diode_current(&d, 0.8, 1e-9), in = br_diode_current(&d, 0.8, -1e-9);
    BR_ASSERT_REL(-in, ip, 1e-6);
    /* Monotonic: strictly where the change is representable (above
     * -0.5 V the reverse current differs from -Is by more than 1e-9). */
    double prev = -1.0;
    for (double v = -2.0; v < 3.0; v += 0.01) {
        double i = br_diode_current(&d, 0.8, v);
        CU_ASSERT_TRUE(v > -0.5 ? i > prev : i >= prev);
        prev = i;
    }
}

static void test_current_no_resistance(void)
{
    /* R = 0: Shockley i = Is (exp(v/a) - 1) exactly, then its tangent line
     * beyond BR_DIODE_XLIM n Vt (continuous in value and slope). */
    br_diode d = resolved(1e-14, 1.0, T_ROOM);
    d.rs = 0.0;
    double a = d.n * d.vt;
    BR_ASSERT_REL(br_diode_current(&d, 0.0, 0.6), d.is * expm1(0.6 / a), 1e-14);
    BR_ASSERT_REL(br_diode_current(&d, 0.0, -0.6), d.is * expm1(-0.6 / a), 1e-14);
    double vx = BR_DIODE_XLIM * a, h = 1e-6 * a;
    double ix = br_diode_current(&d, 0.0, vx), gx = br_diode_conductance(&d, 0.0, vx);
    BR_ASSERT_REL(ix, d.is * expm1(BR_DIODE_XLIM), 1e-14);
    BR_ASSERT_REL(gx, d.is / a * exp(BR_DIODE_XLIM), 1e-14);
    /* Just below: Shockley, matching the tangent to (h/a)^2 / 2. */
    BR_ASSERT_REL(br_diode_current(&d, 0.0, vx - h), ix - gx * h, 1e-11);
    /* Beyond: the tangent itself, with its slope. */
    BR_ASSERT_REL(br_diode_current(&d, 0.0, vx + 1.0), ix + gx * 1.0, 1e-14);
    BR_ASSERT_REL(br_diode_conductance(&d, 0.0, vx + 1.0), gx, 1e-15);
    CU_ASSERT_TRUE(isfinite(br_diode_current(&d, 0.0, 1000.0)));
}

static void test_conductance_vs_brent(void)
{
    /* di/dv = gd / (1 + R gd), gd = (Is/a) exp(vj/a), at the vj of the
     * Brent solve; large Is R / a too (Is = 1 uA at 1 kohm).  Below -5 V
     * both underflow towards 0. */
    const double iss[] = {1e-14, 1e-6};
    br_diode d = resolved(1.0, 1.0, T_ROOM);
    d.rs = 0.0;
    double a = d.n * d.vt;
    for (int k = 0; k < 2; k++)
        for (size_t r = 0; r < NR; r++)
            for (size_t j = 2; j < NV; j++) {
                double R = grid_r[r], v = grid_v[j];
                d.is = iss[k];
                double gd = d.is / a * exp(vj_by_brent(d.is, a, R, v) / a);
                BR_ASSERT_REL(br_diode_conductance(&d, R, v), gd / (1.0 + R * gd), 1e-12);
            }
}

static void test_conductance_vs_difference(void)
{
    /* Analytic di/dv against a central difference of br_diode_current. */
    const double rs[] = {0.0, 1e-3, 0.1, 1.0, 100.0, 1e3};
    br_diode d = resolved(1e-12, 1.2, T_ROOM);
    d.rs = 0.0;
    double a = d.n * d.vt, h = 1e-4 * a;
    for (size_t r = 0; r < sizeof rs / sizeof rs[0]; r++)
        for (double v = -0.3; v < 1000.0; v = v < 2.0 ? v + 0.037 : v * 1.7) {
            double fd = (br_diode_current(&d, rs[r], v + h) - br_diode_current(&d, rs[r], v - h)) /
                        (2.0 * h);
            BR_ASSERT_REL(br_diode_conductance(&d, rs[r], v), fd, 1e-6);
        }
    /* Deep reverse: non-negative and finite, tending to 0. */
    for (double v = -1000.0; v < -0.3; v *= 0.5) {
        double g = br_diode_conductance(&d, 1.0, v);
        CU_ASSERT_TRUE(g >= 0.0 && g < 1e-15);
    }
}

static void test_eval_matches(void)
{
    br_diode d = resolved(1e-13, 1.0, T_ROOM);
    for (size_t k = 0; k < NV; k++) {
        double i, g;
        br_diode_eval(&d, 0.3, grid_v[k], &i, &g);
        BR_ASSERT_REL(i, br_diode_current(&d, 0.3, grid_v[k]), 1e-15);
        BR_ASSERT_REL(g, br_diode_conductance(&d, 0.3, grid_v[k]), 1e-15);
    }
    br_diode_eval(&d, 0.3, 0.7, NULL, NULL); /* both outputs optional */
}

static void test_vjunction(void)
{
    br_diode d = resolved(1e-14, 1.1, T_ROOM);
    d.rs = 0.05;
    double a = d.n * d.vt;
    BR_ASSERT_REL(br_diode_vjunction(&d, 1.0), a * log(1.0 + 1.0 / d.is), 1e-14);
    BR_ASSERT_NEAR(br_diode_vjunction(&d, 0.0), 0.0, 0.0);
    CU_ASSERT_TRUE(br_diode_vjunction(&d, -d.is) == -HUGE_VAL);
    CU_ASSERT_TRUE(br_diode_vjunction(&d, -2.0 * d.is) == -HUGE_VAL);
    /* Round trip: the terminal voltage vj + i R drives i back. */
    for (double i = 1e-9; i < 100.0; i *= 3.0) {
        double v = br_diode_vjunction(&d, i) + i * (d.rs + 0.2);
        BR_ASSERT_REL(br_diode_current(&d, 0.2, v), i, 1e-12);
    }
}

/* ---- depletion capacitance and charge --------------------------------- */

static double cj_fn(double vr, void *arg)
{
    return br_diode_cj(arg, vr);
}

static void test_cj_shape(void)
{
    br_diode d = resolved(1e-14, 1.0, T_ROOM);
    d.cj0 = 100e-12;
    d.vj = 0.7;
    d.m = 0.5;
    /* Abrupt junction (m = 1/2): C ~ (vj + vr)^(-1/2), so C(3 vj) = Cj0/2
     * (S. M. Sze, "Physics of Semiconductor Devices"). */
    BR_ASSERT_REL(br_diode_cj(&d, 0.0), 100e-12, 1e-15);
    BR_ASSERT_REL(br_diode_cj(&d, 3.0 * 0.7), 50e-12, 1e-14);
    /* Continuous in value and slope where the tangent continuation starts. */
    double x1 = -BR_DIODE_FC * d.vj, h = 1e-7;
    BR_ASSERT_REL(br_diode_cj(&d, x1 - h), br_diode_cj(&d, x1 + h), 1e-6);
    double s_lo = (br_diode_cj(&d, x1 - h) - br_diode_cj(&d, x1 - 3.0 * h)) / (2.0 * h);
    double s_hi = (br_diode_cj(&d, x1 + 3.0 * h) - br_diode_cj(&d, x1 + h)) / (2.0 * h);
    BR_ASSERT_REL(s_lo, s_hi, 1e-4);
    /* Finite through and beyond vr = -vj. */
    CU_ASSERT_TRUE(isfinite(br_diode_cj(&d, -d.vj)) && br_diode_cj(&d, -d.vj) > 0.0);
    d.cj0 = 0.0;
    BR_ASSERT_NEAR(br_diode_cj(&d, 5.0), 0.0, 0.0);
    BR_ASSERT_NEAR(br_diode_qj(&d, 5.0), 0.0, 0.0);
}

static void test_qj_is_integral(void)
{
    /* Q(vr) is the integral of Cj from 0 to vr (Sze), checked by adaptive
     * quadrature (GSL qags) for several grading coefficients including
     * m = 1 (the logarithmic case) and forward bias past fc vj. */
    const double ms[] = {0.0, 1.0 / 3.0, 0.5, 0.999999, 1.0, 1.7};
    const double vrs[] = {-0.65, -0.5, -0.35, -0.1, 0.2, 3.0, 40.0, 800.0};
    gsl_integration_workspace *ws = gsl_integration_workspace_alloc(200);
    CU_ASSERT_PTR_NOT_NULL_FATAL(ws);
    br_diode d = resolved(1e-14, 1.0, T_ROOM);
    d.cj0 = 47e-12;
    d.vj = 0.75;
    gsl_function f = {cj_fn, &d};
    for (size_t k = 0; k < sizeof ms / sizeof ms[0]; k++) {
        d.m = ms[k];
        for (size_t j = 0; j < sizeof vrs / sizeof vrs[0]; j++) {
            double q, abserr;
            int rc = gsl_integration_qags(&f, 0.0, vrs[j], 0.0, 1e-12, 200, ws, &q, &abserr);
            CU_ASSERT_EQUAL(rc, GSL_SUCCESS);
            BR_ASSERT_REL(br_diode_qj(&d, vrs[j]), q, 1e-10);
        }
    }
    gsl_integration_workspace_free(ws);
    /* m = 1 written out: Cj0 vj ln(1 + vr/vj). */
    d.m = 1.0;
    BR_ASSERT_REL(br_diode_qj(&d, 2.0), 47e-12 * 0.75 * log(1.0 + 2.0 / 0.75), 1e-14);
}

/* ---- a drive swept through conduction ----------------------------------- */

typedef struct sweep_ctx {
    const br_diode *d;
    double r;
    int what; /* 0: i, 1: i^2, 2: i (vj + rs i) */
} sweep_ctx;

static double sweep_fn(double u, void *p)
{
    const sweep_ctx *c = p;
    double i = br_diode_current(c->d, c->r, u);
    if (c->what == 0)
        return i;
    if (c->what == 1)
        return i * i;
    return i * (br_diode_vjunction(c->d, i) + c->d->rs * i);
}

/* The closed forms of br_diode_sweep_to are the integrals over the drive
 * of the current, its square and its power in the diode: checked by
 * adaptive quadrature (GSL qags) of the Lambert W current (Banwell &
 * Jayakumar 2000) from the knee into heavy conduction. */
static void test_sweep_integrals(void)
{
    gsl_integration_workspace *ws = gsl_integration_workspace_alloc(400);
    CU_ASSERT_PTR_NOT_NULL_FATAL(ws);
    const double is[] = {5e-9, 1e-7, 1e-12}, n[] = {1.08, 1.5, 1.9}, rs[] = {0.15, 0.5, 0.02};
    const double rx[] = {1.0, 0.2, 10.0}, us[] = {0.05, 0.3, 0.6, 1.0, 2.7, 20.0};
    for (int k = 0; k < 3; k++) {
        br_diode d = resolved(is[k], n[k], T_ROOM);
        d.rs = rs[k];
        for (size_t j = 0; j < sizeof us / sizeof us[0]; j++) {
            br_diode_sweep w;
            br_diode_sweep_to(&d, rx[k], us[j], &w);
            BR_ASSERT_REL(w.i, br_diode_current(&d, rx[k], us[j]), 1e-14);
            const double got[] = {w.q, w.i2, w.e};
            for (int what = 0; what < 3; what++) {
                sweep_ctx c = {&d, rx[k], what};
                gsl_function f = {sweep_fn, &c};
                double q, abserr;
                int rc = gsl_integration_qags(&f, 0.0, us[j], 0.0, 1e-11, 400, ws, &q, &abserr);
                CU_ASSERT_EQUAL(rc, GSL_SUCCESS);
                BR_ASSERT_REL(got[what], q, 1e-8);
            }
        }
    }
    gsl_integration_workspace_free(ws);
    /* nothing below zero drive: the reverse part is the leakage model's */
    br_diode d = resolved(5e-9, 1.08, T_ROOM);
    br_diode_sweep w;
    br_diode_sweep_to(&d, 1.0, -3.0, &w);
    CU_ASSERT_TRUE(w.q == 0.0 && w.i2 == 0.0 && w.e == 0.0 && w.i == 0.0);
}

/* ---- stored charge ---------------------------------------------------- */

static void test_q_step(void)
{
    /* Charge-control model dq/dt = i - q/tau (P. O. Lauritzen and C. L. Ma,
     * IEEE Trans. Power Electronics 6(2), 1991): the exact solution for
     * constant i is i tau + (q0 - i tau) exp(-t/tau). */
    double tau = 50e-9, q0 = 3e-9, i = 0.4, dt = 70e-9;
    double exact = i * tau + (q0 - i * tau) * exp(-dt / tau);
    BR_ASSERT_REL(br_diode_q_step(q0, i, tau, dt), exact, 1e-14);
    /* Against many small explicit Euler steps (first order: error ~ h/2). */
    int nsteps = 200000;
    double q = q0, h = dt / nsteps;
    for (int k = 0; k < nsteps; k++)
        q += h * (i - q / tau);
    BR_ASSERT_REL(br_diode_q_step(q0, i, tau, dt), q, 1e-4);
    /* No current: pure decay exp(-dt/tau). */
    BR_ASSERT_REL(br_diode_q_step(q0, 0.0, tau, dt), q0 * exp(-dt / tau), 1e-14);
    /* Exact steps compose: two halves equal one whole. */
    double half = br_diode_q_step(br_diode_q_step(q0, i, tau, dt / 2), i, tau, dt / 2);
    BR_ASSERT_REL(half, br_diode_q_step(q0, i, tau, dt), 1e-14);
    /* Tiny steps keep full precision: dq ~ (i - q0/tau) dt. */
    double d1 = br_diode_q_step(q0, i, tau, 1e-18) - q0;
    BR_ASSERT_REL(d1, (i - q0 / tau) * 1e-18, 1e-6);
    /* Reverse current removes charge; tau = 0 stores none. */
    CU_ASSERT_TRUE(br_diode_q_step(q0, -1.0, tau, 1e-9) < q0);
    BR_ASSERT_NEAR(br_diode_q_step(q0, i, 0.0, dt), 0.0, 0.0);
}

static void test_recovery_triangle(void)
{
    /* Triangle of reverse current: Qrr = Irrm trr / 2 (N. Mohan,
     * T. Undeland, W. Robbins, "Power Electronics: Converters, Applications,
     * and Design"), for several softness factors tb/ta. */
    const double soft[] = {0.0, 0.5, BR_DIODE_SOFTNESS, 2.5};
    double qrr = 40e-9, didt = 200e6; /* 40 nC, 200 A/us */
    for (size_t k = 0; k < sizeof soft / sizeof soft[0]; k++) {
        br_recovery r;
        CU_ASSERT_EQUAL_FATAL(br_diode_recovery(qrr, didt, soft[k], &r), BR_OK);
        BR_ASSERT_REL(r.irrm * r.trr / 2.0, qrr, 1e-14);
        BR_ASSERT_REL(r.irrm, didt * r.ta, 1e-14); /* rising edge at didt */
        BR_ASSERT_REL(r.tb, soft[k] * r.ta, 1e-14);
        BR_ASSERT_REL(r.trr, r.ta + r.tb, 1e-14);
    }
    /* Abrupt limit (Mohan et al.): Irrm = sqrt(2 Qrr didt),
     * trr = sqrt(2 Qrr / didt). */
    br_recovery r;
    CU_ASSERT_EQUAL_FATAL(br_diode_recovery(qrr, didt, 0.0, &r), BR_OK);
    BR_ASSERT_REL(r.irrm, sqrt(2.0 * qrr * didt), 1e-14);
    BR_ASSERT_REL(r.trr, sqrt(2.0 * qrr / didt), 1e-14);
    /* Symmetric default: Irrm = sqrt(Qrr didt), trr = 2 sqrt(Qrr/didt);
     * 20 nC at 200 A/us gives 2 A and 20 ns. */
    CU_ASSERT_EQUAL_FATAL(br_diode_recovery(20e-9, didt, 1.0, &r), BR_OK);
    BR_ASSERT_REL(r.irrm, 2.0, 1e-14);
    BR_ASSERT_REL(r.trr, 20e-9, 1e-14);
    /* No charge, no recovery. */
    CU_ASSERT_EQUAL(br_diode_recovery(0.0, didt, 1.0, &r), BR_OK);
    BR_ASSERT_NEAR(r.irrm, 0.0, 0.0);
    BR_ASSERT_NEAR(r.trr, 0.0, 0.0);
}

static void test_recovery_rejects(void)
{
    br_recovery r;
    CU_ASSERT_EQUAL(br_diode_recovery(-1e-9, 1e8, 1.0, &r), BR_EUSAGE);
    BR_ASSERT_NEAR(r.irrm, 0.0, 0.0);
    CU_ASSERT_EQUAL(br_diode_recovery(1e-9, 0.0, 1.0, &r), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_diode_recovery(1e-9, -1e8, 1.0, &r), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_diode_recovery(1e-9, 1e8, -0.1, &r), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_diode_recovery(NAN, 1e8, 1.0, &r), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_diode_recovery(1e-9, INFINITY, 1.0, &r), BR_EUSAGE);
}

/* ---- broken parameters ------------------------------------------------ */

/* Resolve must fail with BR_EINPUT and name the field. */
static void expect_reject(const br_diode_part *p, double T, const char *field)
{
    br_diode d;
    br_error err;
    br_error_clear(&err);
    CU_ASSERT_EQUAL(br_diode_resolve(p, T, &d, &err), BR_EINPUT);
    CU_ASSERT_EQUAL(err.code, BR_EINPUT);
    CU_ASSERT_STRING_EQUAL(err.field, field);
    CU_ASSERT_TRUE(err.msg[0] != '\0');
    CU_ASSERT_TRUE(err.line > 0);
}

static void test_rejects(void)
{
    br_diode_part p = part(1e-14, 1.0);
    p.is = br_qty_fixed(0.0);
    expect_reject(&p, T_ROOM, "diode[d1]/is");
    p.is = br_qty_fixed(-1e-14);
    expect_reject(&p, T_ROOM, "diode[d1]/is");
    p.is = br_qty_fixed(NAN);
    expect_reject(&p, T_ROOM, "diode[d1]/is");
    p = part(1e-14, 0.0);
    expect_reject(&p, T_ROOM, "diode[d1]/n");
    p = part(1e-14, -1.0);
    expect_reject(&p, T_ROOM, "diode[d1]/n");
    p = part(1e-14, 1.0);
    expect_reject(&p, 0.0, "diode[d1]");
    expect_reject(&p, -20.0, "diode[d1]");
    expect_reject(&p, NAN, "diode[d1]");
    p.rs = br_qty_fixed(-0.1);
    expect_reject(&p, T_ROOM, "diode[d1]/rs");
    p = part(1e-14, 1.0);
    p.vj = br_qty_fixed(0.0);
    expect_reject(&p, T_ROOM, "diode[d1]/vj");
    p = part(1e-14, 1.0);
    p.ir_double = br_qty_fixed(0.0);
    expect_reject(&p, T_ROOM, "diode[d1]/ir_double");
    p = part(1e-14, 1.0);
    p.tau = br_qty_fixed(-1e-9);
    expect_reject(&p, T_ROOM, "diode[d1]/tau");
    p = part(1e-14, 1.0);
    p.tnom = 0.0;
    expect_reject(&p, T_ROOM, "diode[d1]");
    /* Is(T) that overflows is caught too. */
    p = part(1e-14, 1.0);
    p.eg = br_qty_fixed(1e6);
    expect_reject(&p, 600.0, "diode[d1]/is");
    /* The line of the offending value wins over the element's. */
    p = part(1e-14, 1.0);
    p.m = br_qty_fixed(-0.5);
    p.m.line = 12;
    br_error err;
    br_diode d;
    CU_ASSERT_EQUAL(br_diode_resolve(&p, T_ROOM, &d, &err), BR_EINPUT);
    CU_ASSERT_EQUAL(err.line, 12);
    /* NULL error record is allowed. */
    CU_ASSERT_EQUAL(br_diode_resolve(&p, T_ROOM, &d, NULL), BR_EINPUT);
}

/* The warm-started evaluation gives the closed form's results to rounding
 * along a random walk of the voltage (Banwell & Jayakumar 2000 closed form
 * as the reference, through br_diode_eval). */
static void test_eval_warm(void)
{
    br_diode_part p;
    br_diode_part_defaults(&p);
    p.is = br_qty_fixed(5e-9);
    p.n = br_qty_fixed(1.08);
    p.rs = br_qty_fixed(0.15);
    br_diode d;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_diode_resolve(&p, 323.15, &d, &err), BR_OK);
    br_diode_warm ws = {0};
    double v = -5.0;
    unsigned long x = 12345;
    for (int k = 0; k < 20000; k++) {
        x = x * 6364136223846793005UL + 1442695040888963407UL;
        double step = ((double)(x >> 11) / 9007199254740992.0 - 0.5) * (k % 97 == 0 ? 20.0 : 0.02);
        v = fmin(40.0, fmax(-50.0, v + step));
        double r = k % 500 < 250 ? 1.0 : 0.5; /* the resistance changes too */
        double i0, g0, i1, g1;
        br_diode_eval(&d, r, v, &i0, &g0);
        br_diode_eval_warm(&d, r, v, &ws, &i1, &g1);
        CU_ASSERT_TRUE(fabs(i1 - i0) <= 1e-13 * fabs(i0) + 1e-25);
        CU_ASSERT_TRUE(fabs(g1 - g0) <= 1e-12 * fabs(g0) + 1e-25);
    }
}

int main(void)
{
    gsl_set_error_handler_off();
    static const br_test_case cases[] = {
        {"warm-started evaluation matches", test_eval_warm},
        {"thermal voltage", test_thermal_voltage},
        {"Is(T) law", test_is_temperature},
        {"leakage and its temperature", test_leak_temperature},
        {"resolve copies the part", test_resolve_copies},
        {"current vs Brent root solve", test_current_vs_brent},
        {"current vs GSL Lambert W", test_current_vs_gsl_lambert},
        {"current limits", test_current_limits},
        {"current without resistance", test_current_no_resistance},
        {"conductance vs Brent root solve", test_conductance_vs_brent},
        {"conductance vs difference", test_conductance_vs_difference},
        {"eval matches current and conductance", test_eval_matches},
        {"junction voltage", test_vjunction},
        {"depletion capacitance", test_cj_shape},
        {"depletion charge is the integral", test_qj_is_integral},
        {"sweep integrals against GSL quadrature", test_sweep_integrals},
        {"charge-control step", test_q_step},
        {"recovery triangle", test_recovery_triangle},
        {"recovery rejects bad input", test_recovery_rejects},
        {"bad parameters rejected", test_rejects},
        {NULL, NULL},
    };
    return br_test_main("engine_diode", cases);
}

/* test_analyses_holdup.c - the charge of a capacitor with a DC-bias line,
 * and the hold-up time of a rail whose capacitance changes as it drains,
 * both against GSL's adaptive quadrature (QAGS) of C(v). */
#include "analyses/holdup.h"
#include "testdesign.h"
#include "testkit.h"

#include <gsl/gsl_errno.h>
#include <gsl/gsl_integration.h>
#include <stdlib.h>

/* An invented class II curve, steep enough that a capacitance frozen over
 * a volt or two is visibly wrong: 1.0 at 0 V, 0.8 at 5 V, 0.5 at 10 V,
 * 0.4 at 15 V of the 1 uF. */
static const double BIAS_V[] = {0.0, 5.0, 10.0, 15.0};
static const double BIAS_F[] = {1.0, 0.8, 0.5, 0.4};

static br_cap test_cap(void)
{
    br_cap cap = {"bias-cap", 1e-6, 0.01, 25.0, 4, BIAS_V, BIAS_F, 0.0, 1};
    return cap;
}

static double cap_fn(double v, void *p)
{
    return br_cap_at(p, v);
}

/* The charge between va and vb by GSL's QAGS (adaptive Gauss-Kronrod 21
 * with Wynn's epsilon extrapolation), a sign for vb < va. */
static double qags_charge(const br_cap *cap, double va, double vb)
{
    gsl_integration_workspace *w = gsl_integration_workspace_alloc(200);
    CU_ASSERT_PTR_NOT_NULL_FATAL(w);
    gsl_function f = {cap_fn, (void *)cap};
    double lo = va < vb ? va : vb, hi = va < vb ? vb : va, q = 0.0, abserr = 0.0;
    int rc = gsl_integration_qags(&f, lo, hi, 0.0, 1e-12, 200, w, &q, &abserr);
    gsl_integration_workspace_free(w);
    CU_ASSERT_EQUAL_FATAL(rc, GSL_SUCCESS);
    return va < vb ? q : -q;
}

/* br_cap_charge against QAGS, inside one piece, across breakpoints,
 * beyond both ends of the table (flat there), in both directions. */
static void test_charge_against_qags(void)
{
    br_cap cap = test_cap();
    const double pairs[][2] = {{6.0, 9.0},   {2.0, 13.0},  {11.0, 7.2}, {-3.0, 4.0},
                               {14.0, 21.0}, {-2.0, 30.0}, {10.0, 5.0}, {8.0, 8.0}};
    for (size_t i = 0; i < sizeof pairs / sizeof pairs[0]; i++) {
        double va = pairs[i][0], vb = pairs[i][1];
        BR_ASSERT_NEAR(br_cap_charge(&cap, va, vb), qags_charge(&cap, va, vb), 1e-15);
    }
    /* no table: C (vb - va) */
    br_cap flat = {"flat", 2.2e-6, 0.0, 0.0, 0, NULL, NULL, 0.0, 0};
    BR_ASSERT_REL(br_cap_charge(&flat, 3.0, 11.0), 2.2e-6 * 8.0, 1e-14);
}

/* br_cap_after_charge inverts br_cap_charge, whichever pieces it crosses. */
static void test_after_charge_inverts(void)
{
    br_cap cap = test_cap();
    const double pairs[][2] = {{6.0, 9.0},   {2.0, 13.0},  {11.0, 7.2}, {-3.0, 4.0},
                               {14.0, 21.0}, {-2.0, 30.0}, {10.0, 5.0}, {12.0, 10.0}};
    for (size_t i = 0; i < sizeof pairs / sizeof pairs[0]; i++) {
        double va = pairs[i][0], vb = pairs[i][1];
        double q = qags_charge(&cap, va, vb);
        BR_ASSERT_NEAR(br_cap_after_charge(&cap, va, q), vb, 1e-9);
    }
    BR_ASSERT_NEAR(br_cap_after_charge(&cap, 7.0, 0.0), 7.0, 0.0);
}

/* One link, B1 returning A1's rail, the rail's 1 uF on the bias curve
 * above, no gate charge; parts of testdesign.c: driver 2 mA running,
 * UVLO falling 7 V, ESR 10 mohm, no diode leakage or junction
 * capacitance.  With every switch off the rail gives a constant I to its
 * driver, so charge leaves it linearly in time, and it reaches UVLO
 * falling (at the node: capacitor 7 V + I ESR) after
 *   t = Q(vc0 -> 7 V + I ESR) / I,  Q the integral of C(v) (QAGS). */
static void test_holdup_dc_bias(void)
{
    br_design *d = br_test_fcml(2, 100.0, 2e3, 0.5, 10e-9);
    CU_ASSERT_PTR_NOT_NULL_FATAL(d);
    d->switches[0].qg = br_qty_fixed(0.0);
    br_cap_part *cp = &d->caps[0];
    cp->nbias = 4;
    for (int i = 0; i < 4; i++) {
        cp->bias_v[i] = BIAS_V[i];
        cp->bias_f[i] = BIAS_F[i];
    }
    br_chain *c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_steady ss;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, BR_DIRI_NONE, NULL, &ss, &err), BR_OK);
    br_holdup h;
    CU_ASSERT_EQUAL_FATAL(br_holdup_run(c, &ss, 0, 0.0, &h, &err), BR_OK);
    CU_ASSERT_TRUE_FATAL(h.dropped);
    CU_ASSERT_EQUAL(h.stage, 1);
    const double I = 2e-3;
    BR_ASSERT_NEAR(br_holdup_load(c, 1), I, 1e-15);
    /* the rail crosses the 10 V breakpoint on its way down */
    CU_ASSERT_TRUE(h.vc0[1] > 10.5);
    double t = qags_charge(&c->st[1].cap, 7.0 + I * 0.01, h.vc0[1]) / I;
    BR_ASSERT_REL(h.t, t, 1e-9);
    BR_ASSERT_NEAR(h.v_at, 7.0, 1e-9);
    br_chain_free(c);
    br_design_free(d);
}

int main(void)
{
    gsl_set_error_handler_off();
    static const br_test_case cases[] = {
        {"charge of a DC-bias line against QAGS", test_charge_against_qags},
        {"voltage after a charge inverts it", test_after_charge_inverts},
        {"hold-up with a DC-bias capacitor against QAGS", test_holdup_dc_bias},
        {NULL, NULL}};
    return br_test_main("holdup", cases);
}

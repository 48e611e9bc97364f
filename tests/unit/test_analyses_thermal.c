/* test_analyses_thermal.c - junction temperatures: the fixed point between
 * leakage power and temperature against its closed form through the
 * Lambert W function (docs/physics.md, "Junction temperature and thermal
 * runaway"), and the loop of the steady state that finds it. */
#include "analyses/figures.h"
#include "analyses/steady.h"
#include "analyses/thermal.h"
#include "testdesign.h"
#include "testkit.h"

#include <gsl/gsl_sf_lambert.h>
#include <math.h>
#include <stdio.h>

#define KELVIN 273.15

/* The closed form.  T = Ta + Rth (Pc + Pl exp(a (T - T0))), a = ln 2 /
 * Td.  With T1 = Ta + Rth Pc and u = T - T1: u = B exp(a u), B = Rth Pl
 * exp(a (T1 - T0)); so (-a u) exp(-a u) = -a B and u = -W(-a B) / a, real
 * when a B <= 1/e; the principal branch W0 is the stable root (there
 * a u = Rth dP/dT < 1).  At a B = 1/e, a u = 1: runaway starts at the
 * ambient Ta* = T0 - Rth Pc + (ln(1 / (a Rth Pl)) - 1) / a, the junction
 * then at Ta* + Rth Pc + 1/a.  (Lambert W: R. M. Corless, G. H.
 * Gonnet, D. E. G. Hare, D. J. Jeffrey and D. E. Knuth, "On the Lambert W
 * function", Advances in Computational Mathematics 5, 1996; GSL's
 * gsl_sf_lambert_W0 evaluates it.) */
static void closed_form(double ta, double rth, double pc, double pl, double t0, double td,
                        double *tj, int *runaway, double *onset_tj, double *onset_amb)
{
    double a = log(2.0) / td, t1 = ta + rth * pc, b = rth * pl * exp(a * (t1 - t0));
    *runaway = a * b > exp(-1.0);
    *tj = *runaway ? NAN : t1 - gsl_sf_lambert_W0(-a * b) / a;
    *onset_amb = t0 - rth * pc + (log(1.0 / (a * rth * pl)) - 1.0) / a;
    *onset_tj = *onset_amb + rth * pc + 1.0 / a;
}

/* Over a grid of ambients, resistances and losses, the solver's fixed
 * point, runaway verdict and onset agree with the closed form. */
static void test_against_lambert_w(void)
{
    static const double rths[] = {20.0, 60.0, 150.0, 400.0};
    static const double pcs[] = {0.0, 0.02, 0.2};
    static const double pls[] = {1e-5, 1e-4, 1e-3}; /* W at T0 */
    int stable = 0, runaway = 0;
    for (double ta = -20.0 + KELVIN; ta < 140.0 + KELVIN; ta += 20.0)
        for (int i = 0; i < 4; i++)
            for (int j = 0; j < 3; j++)
                for (int l = 0; l < 3; l++) {
                    double t0 = 25.0 + KELVIN, td = 10.0, tj, ot, oa;
                    int ru;
                    closed_form(ta, rths[i], pcs[j], pls[l], t0, td, &tj, &ru, &ot, &oa);
                    br_thermal th;
                    CU_ASSERT_EQUAL_FATAL(
                        br_thermal_solve(ta, rths[i], pcs[j], pls[l], t0, td, &th), BR_OK);
                    CU_ASSERT_EQUAL(th.runaway, ru);
                    BR_ASSERT_NEAR(th.onset_tj, ot, 1e-9);
                    BR_ASSERT_NEAR(th.onset_amb, oa, 1e-9);
                    if (!ru)
                        BR_ASSERT_NEAR(th.tj, tj, 1e-6);
                    stable += !ru;
                    runaway += ru;
                }
    CU_ASSERT_TRUE(stable > 50 && runaway > 50); /* the grid has both kinds */
}

/* The example's own leakage law (1 uA at 25 C, doubling every 10 K): at
 * 125 C it leaks 1 uA x 2^10 = 1.024 mA (by hand); at 188 V and blocking
 * half the time, 96 mW.  Behind 200 K/W that runs away at an ambient of
 * T0 + (ln(1 / (a Rth Pl)) - 1) / a with a = ln2/10 K, Pl = 94 V x 1 uA:
 * 25 C + (ln(1 / (0.069315 x 200 x 9.4e-5)) - 1) / 0.069315 = 25 C +
 * (6.6432 - 1) / 0.069315 = 106.41 C (no other loss), starting at a
 * junction of 106.41 C + 1/a = 120.84 C. */
static void test_example_leakage(void)
{
    br_diode_part p;
    br_diode_part_defaults(&p);
    p.ir = br_qty_fixed(1e-6);
    p.ir_temp = br_qty_fixed(25.0 + KELVIN);
    p.ir_double = br_qty_fixed(10.0);
    br_diode d;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_diode_at(&p, 125.0 + KELVIN, &d, &err), BR_OK);
    BR_ASSERT_REL(d.ir, 1.024e-3, 1e-12);
    BR_ASSERT_REL(d.ir * 188.0 * 0.5, 0.09626, 1e-3);
    br_thermal th;
    CU_ASSERT_EQUAL_FATAL(
        br_thermal_solve(60.0 + KELVIN, 200.0, 0.0, 94.0 * 1e-6, 25.0 + KELVIN, 10.0, &th), BR_OK);
    CU_ASSERT_FALSE(th.runaway);
    BR_ASSERT_NEAR(th.onset_amb - KELVIN, 106.41, 0.01);
    BR_ASSERT_NEAR(th.onset_tj - KELVIN, 120.84, 0.01);
    CU_ASSERT_EQUAL_FATAL(
        br_thermal_solve(110.0 + KELVIN, 200.0, 0.0, 94.0 * 1e-6, 25.0 + KELVIN, 10.0, &th), BR_OK);
    CU_ASSERT_TRUE(th.runaway);
}

/* Arguments out of range are refused, not solved. */
static void test_bad_arguments(void)
{
    br_thermal th;
    CU_ASSERT_EQUAL(br_thermal_solve(300.0, -1.0, 0.0, 0.0, 300.0, 10.0, &th), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_thermal_solve(300.0, 10.0, 0.0, 0.0, 300.0, 0.0, &th), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_thermal_solve(NAN, 10.0, 0.0, 0.0, 300.0, 10.0, &th), BR_EUSAGE);
    /* no leakage: exactly Ta + Rth Pc */
    CU_ASSERT_EQUAL_FATAL(br_thermal_solve(300.0, 50.0, 0.1, 0.0, 300.0, 10.0, &th), BR_OK);
    BR_ASSERT_REL(th.tj, 305.0, 1e-12);
    CU_ASSERT_FALSE(th.runaway);
}

/* A 3-level leg whose links leak (10 uA at 25 C, doubling every 10 K,
 * behind 200 K/W): the steady state settles where each junction's
 * temperature is what its own losses in the simulated period give
 * (checked again here with the closed form on those losses), about 2 K
 * above the 50 C ambient (by hand: about 300 V blocked half the time,
 * 1.5 mW/uA, a B = 0.118, -W0(-0.118) / a = 1.9 K).  At 120 C, past the
 * ambient of about 66 C where runaway starts, they run away. */
static void test_steady_loop(void)
{
    br_design *d = br_test_fcml(3, 600.0, 100e3, 0.5, 50e-9);
    CU_ASSERT_PTR_NOT_NULL_FATAL(d);
    d->tamb = br_qty_fixed(50.0 + KELVIN);
    d->diodes[0].ir = br_qty_fixed(10e-6);
    d->diodes[0].ir_double = br_qty_fixed(10.0);
    d->diodes[0].rth = br_qty_fixed(200.0);
    br_chain *c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_steady ss;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, BR_DIRI_NONE, NULL, &ss, &err), BR_OK);
    CU_ASSERT_TRUE(ss.converged);
    CU_ASSERT_TRUE(ss.thermal >= 2 && ss.thermal_settled);
    double dt = ss.stats.t1 - ss.stats.t0;
    for (int k = 1; k < c->n; k++) {
        const br_link_stats *l = &ss.stats.link[k];
        double tj = ss.tj[k], ir_tj = 10e-6 * pow(2.0, (tj - 25.0 - KELVIN) / 10.0);
        double pc = (l->e_cond + l->e_rr + l->e_other - l->e_leak) / dt;
        double w = l->e_leak / dt / ir_tj; /* the mean reverse voltage while blocking */
        double t, ot, oa;
        int ru;
        closed_form(c->tamb, 200.0, fmax(pc, 0.0), w * 10e-6, 25.0 + KELVIN, 10.0, &t, &ru, &ot,
                    &oa);
        CU_ASSERT_FALSE(ru);
        CU_ASSERT_FALSE(ss.runaway[k]);
        /* the last period ran within the loop's 0.05 K of the temperature
         * reported, so the leakage read back here at tj is off by up to
         * 0.35 % (a 0.05 K): a few mK */
        BR_ASSERT_NEAR(tj, t, 0.02);
        CU_ASSERT_TRUE(tj > c->tamb + 1.0);
        BR_ASSERT_NEAR(w, 300.0 * 0.5, 0.1 * 300.0); /* ~Vin/2 blocked half the time */
    }
    br_chain_free(c);
    /* at 120 C the leakage outruns any junction */
    d->tamb = br_qty_fixed(120.0 + KELVIN);
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, BR_DIRI_NONE, NULL, &ss, &err), BR_OK);
    CU_ASSERT_TRUE(ss.runaway[1] && ss.runaway[2] && ss.runaway[3]);
    CU_ASSERT_TRUE(ss.onset_amb[1] < c->tamb);
    br_chain_free(c);
    br_design_free(d);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"fixed point against the Lambert W closed form", test_against_lambert_w},
        {"the example's leakage law", test_example_leakage},
        {"arguments out of range", test_bad_arguments},
        {"the steady state at its junction temperatures", test_steady_loop},
        {NULL, NULL},
    };
    return br_test_main("analyses_thermal", cases);
}

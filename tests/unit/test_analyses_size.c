/* test_analyses_size.c - what a sizing judgement costs, held to what it
 * decides: a point whose steady state rules it out is judged without its
 * cold start, and one that it does not is judged exactly as without the
 * shortcut; a steady state whose temperature loop starts from the
 * junction temperatures found settles in one pass at the same state.
 * Designs are invented. */
#include "analyses/size.h"
#include "analyses/steady.h"
#include "testdesign.h"
#include "testkit.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define KELVIN 273.15

/* A 3-level leg at 100 kHz whose rail capacitors (own part: 47 uF) start
 * the search at the top of the catalog. */
static br_design *leg(void)
{
    br_design *d = br_test_fcml(3, 600.0, 100e3, 0.5, 50e-9);
    CU_ASSERT_PTR_NOT_NULL_FATAL(d);
    d->caps[0].c = br_qty_fixed(47e-6);
    return d;
}

/* Two spreads of design d at its nominal point with the cold start, the
 * second lazy at target. */
static void lazy_pair(const br_design *d, double target, br_spread **plain, br_spread **lazy)
{
    br_spread_opts so;
    br_spread_opts_default(&so);
    so.threads = 1;
    so.startup = 1;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_spread_create(d, &so, plain, &err), BR_OK);
    so.lazy_startup = 1;
    so.lazy_target = target;
    CU_ASSERT_EQUAL_FATAL(br_spread_create(d, &so, lazy, &err), BR_OK);
}

/* A target that no margin reaches: the steady state rules the point out,
 * no cold start is simulated and the steady-state rows are those of the
 * point judged with it.  A target every margin reaches: the point is the
 * same as without the shortcut, cold start included, bit for bit. */
static void test_lazy_startup(void)
{
    br_design *d = leg();
    br_spread *plain, *lazy;
    lazy_pair(d, 1e3, &plain, &lazy);
    CU_ASSERT_TRUE(plain->nominal.with_startup);
    CU_ASSERT_TRUE(plain->nominal.su_integrated > 0);
    CU_ASSERT_FALSE(lazy->nominal.with_startup);
    CU_ASSERT_EQUAL(lazy->nominal.su_integrated, 0);
    int steady_rows = 0;
    for (int c = 0; c < BR_CRIT_COUNT; c++) {
        const br_pt_row *a = &plain->nominal.row[c], *b = &lazy->nominal.row[c];
        if (br_crit_is_startup(c)) {
            CU_ASSERT_FALSE(b->applies);
            continue;
        }
        steady_rows += a->applies;
        CU_ASSERT_EQUAL(memcmp(a, b, sizeof *a), 0);
    }
    CU_ASSERT_TRUE(steady_rows > 3);
    br_spread_free(plain);
    br_spread_free(lazy);
    lazy_pair(d, -1e3, &plain, &lazy);
    CU_ASSERT_TRUE(lazy->nominal.with_startup);
    CU_ASSERT_EQUAL(memcmp(&plain->nominal, &lazy->nominal, sizeof plain->nominal), 0);
    br_spread_free(plain);
    br_spread_free(lazy);
    br_design_free(d);
}

/* The leaky 3-level leg of test_analyses_thermal (10 uA at 25 C doubling
 * every 10 K behind 200 K/W, 50 C ambient) solved from the ambient takes
 * at least two passes of its temperature loop; started from the state
 * and temperatures found, one pass settles, at the same temperatures
 * within the loop's 0.05 K and the same rails within 0.1 mV. */
static void test_steady_from_temperatures(void)
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
    br_steady a, b;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, BR_DIRI_NONE, NULL, &a, &err), BR_OK);
    CU_ASSERT_TRUE_FATAL(a.converged && a.thermal_settled);
    CU_ASSERT_TRUE(a.thermal >= 2);
    br_steady_opts o;
    br_steady_opts_default(&o);
    o.guess = a.x;
    o.tj = a.tj;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, BR_DIRI_NONE, &o, &b, &err), BR_OK);
    CU_ASSERT_TRUE(b.converged && b.thermal_settled);
    CU_ASSERT_EQUAL(b.thermal, 1);
    CU_ASSERT_TRUE(b.periods < a.periods);
    for (int k = 1; k < c->n; k++) {
        BR_ASSERT_NEAR(b.tj[k], a.tj[k], 0.05);
        BR_ASSERT_NEAR(b.x[k], a.x[k], 1e-4);
    }
    br_chain_free(c);
    br_design_free(d);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"the cold start only where the steady state leaves a chance", test_lazy_startup},
        {"the temperature loop from the temperatures found", test_steady_from_temperatures},
        {NULL, NULL},
    };
    return br_test_main("analyses_size", cases);
}

/* test_analyses_supply.c - the supply window: the smallest current limit
 * and the supply voltage window of a chain, against charge balance and
 * the chain's own thresholds worked out by hand. */
#include "analyses/supply_window.h"
#include "testdesign.h"
#include "testkit.h"

#include <math.h>
#include <stdio.h>

/* The no-load leg of test_engine_supply.c: a 3-level leg that draws
 * nothing (no driver currents, no gate charge, no leakage), near-ideal
 * links, flat 1 uF rails rated 25 V, a 22 uF bypass behind 0.2 ohm on
 * 12 V, drivers starting at 7.5 V and stopping at 3 V, gate maximum 20 V,
 * 5 ms allowed for the start-up; no tolerances, so the nominal point is
 * the only corner. */
static br_design *no_load_leg(void)
{
    br_design *d = br_test_fcml(3, 400.0, 100e3, 0.5, 50e-9);
    CU_ASSERT_PTR_NOT_NULL_FATAL(d);
    d->diodes[0].is = br_qty_fixed(10e-3);
    d->diodes[0].n = br_qty_fixed(1.0);
    d->diodes[0].rs = br_qty_fixed(0.0);
    d->drivers[0].iq_on = br_qty_fixed(0.0);
    d->drivers[0].iq_off = br_qty_fixed(0.0);
    d->drivers[0].uvlo_fall = br_qty_fixed(3.0);
    d->switches[0].qg = br_qty_fixed(0.0);
    d->csupply = br_qty_fixed(22e-6);
    d->startup_max = br_qty_fixed(5e-3);
    return d;
}

/* The smallest constant-current limit: the start-up must end within
 * 5 ms, and by charge balance (test_engine_supply.c) it ends when the
 * limit has delivered (22 + 3 x 1) uF x 7.5 V = 187.5 uC plus the links'
 * drops (measured 0.55 % more at 20 mA): Ilim >= 187.5 uC / 5 ms =
 * 37.5 mA.  The lowest supply voltage: with nothing drawn every rail
 * settles at the supply less a few mV, so the top driver starts once the
 * supply reaches its UVLO rising, 7.5 V (by hand).  The highest: the
 * rails follow the supply up to the gates' absolute maximum, 20 V. */
static void test_no_load_leg(void)
{
    br_design *d = no_load_leg();
    br_supply_window *w;
    br_error err;
    br_supply_window_opts o = {.threads = 2};
    CU_ASSERT_EQUAL_FATAL(br_supply_window_run(d, &o, &w, &err), BR_OK);
    CU_ASSERT_EQUAL(w->ncorner, 1);
    const br_sw_result *r = &w->r[BR_SW_LIMIT];
    CU_ASSERT_TRUE(r->applies);
    CU_ASSERT_EQUAL(r->kind, BR_SW_FOUND);
    fprintf(stderr, " (limit %.4g mA, supply %.4g V to %.4g V) ", 1e3 * r->value,
            w->r[BR_SW_VMIN].value, w->r[BR_SW_VMAX].value);
    BR_ASSERT_REL(r->value, 187.5e-6 / 5e-3, 0.03);
    CU_ASSERT_EQUAL(r->fail.crit, BR_CRIT_STARTUP);
    CU_ASSERT_TRUE(r->fail.value < r->value && r->fail.value > 0.98 * r->value);
    r = &w->r[BR_SW_VMIN];
    CU_ASSERT_EQUAL(r->kind, BR_SW_FOUND);
    BR_ASSERT_NEAR(r->value, 7.5, 0.05);
    r = &w->r[BR_SW_VMAX];
    CU_ASSERT_EQUAL(r->kind, BR_SW_FOUND);
    BR_ASSERT_NEAR(r->value, 20.0, 0.02);
    CU_ASSERT_EQUAL(r->fail.crit, BR_CRIT_GATE);
    br_supply_window_free(w);
    br_design_free(d);
}

/* Without a bypass capacitor the limit cannot be modelled: the answer
 * says so rather than guess. */
static void test_limit_needs_bypass(void)
{
    br_design *d = no_load_leg();
    d->csupply = br_qty_fixed(0.0);
    br_supply_window *w;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_supply_window_run(d, NULL, &w, &err), BR_OK);
    CU_ASSERT_FALSE(w->r[BR_SW_LIMIT].applies);
    CU_ASSERT_TRUE(w->r[BR_SW_VMIN].applies);
    br_supply_window_free(w);
    br_design_free(d);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"a leg that draws nothing, by hand", test_no_load_leg},
        {"a limit needs the bypass", test_limit_needs_bypass},
        {NULL, NULL},
    };
    return br_test_main("analyses_supply", cases);
}

/* test_model_rating.c - the series-string rule of the trade: each switch
 * of an N-level flying-capacitor leg blocks Vin/(N-1), and a part is rated
 * for that divided by its derating; the voltage class picked from it. */
#include "model/chain.h"
#include "model/rating.h"
#include "testdesign.h"
#include "testkit.h"

#include <math.h>
#include <stdlib.h>

/* Voltage classes of power switches on the market, V (common practice). */
static const double classes[] = {1700.0, 600.0, 1200.0, 650.0, 900.0};
#define NCLASS 5

/* Switches used at no more than two thirds of their rated voltage: a
 * derating of the trade against overshoot and cosmic-ray failures
 * (common practice). */
#define DERATING (2.0 / 3.0)

static void test_share(void)
{
    /* common practice, the Vin/(N-1) rule: 1000 V over three switches is
     * 333 V each, 1500 V over three is 500 V each */
    BR_ASSERT_NEAR(br_rating_share(1000.0, 3), 333.333, 1e-3);
    BR_ASSERT_NEAR(br_rating_share(1500.0, 3), 500.0, 1e-9);
    /* hand calculation: 1000 V / 3 / (2/3) = 500 V, 1500 V / 3 / (2/3) = 750 V */
    BR_ASSERT_NEAR(br_rating_needed(1000.0, 3, DERATING), 500.0, 1e-9);
    BR_ASSERT_NEAR(br_rating_needed(1500.0, 3, DERATING), 750.0, 1e-9);
    CU_ASSERT_TRUE(isnan(br_rating_share(1000.0, 0)));
    CU_ASSERT_TRUE(isnan(br_rating_share(-5.0, 3)));
    CU_ASSERT_TRUE(isnan(br_rating_needed(1000.0, 3, 0.0)));
    CU_ASSERT_TRUE(isnan(br_rating_needed(1000.0, 3, 1.5)));
}

/* Common practice: a 1000 V bus on a 4-level leg takes 600 V parts, a
 * 1500 V bus on a 4-level leg 900 V parts (500 V and 750 V needed after
 * the derating); 1500 V on a 5-level leg (375 V each, 562.5 V needed)
 * comes back to 600 V parts. */
static void test_class(void)
{
    int i = br_rating_class(classes, NCLASS, br_rating_needed(1000.0, 3, DERATING));
    CU_ASSERT_TRUE_FATAL(i >= 0);
    BR_ASSERT_NEAR(classes[i], 600.0, 0);
    i = br_rating_class(classes, NCLASS, br_rating_needed(1500.0, 3, DERATING));
    CU_ASSERT_TRUE_FATAL(i >= 0);
    BR_ASSERT_NEAR(classes[i], 900.0, 0);
    i = br_rating_class(classes, NCLASS, br_rating_needed(1500.0, 4, DERATING));
    CU_ASSERT_TRUE_FATAL(i >= 0);
    BR_ASSERT_NEAR(classes[i], 600.0, 0);
    /* a bus no class can take in one switch, and no class at all */
    CU_ASSERT_EQUAL(br_rating_class(classes, NCLASS, br_rating_needed(1500.0, 1, DERATING)), -1);
    CU_ASSERT_EQUAL(br_rating_class(classes, 0, 100.0), -1);
    CU_ASSERT_EQUAL(br_rating_class(classes, NCLASS, NAN), -1);
}

/* The FCML generator's switches block what the rule says: a 4-level leg
 * on 1000 V and on 1500 V, every switch (no flying-capacitor imbalance in
 * the test design). */
static void test_generator(void)
{
    const double bus[] = {1000.0, 1500.0};
    for (int b = 0; b < 2; b++) {
        br_design *d = br_test_fcml(4, bus[b], 100e3, 0.5, 50e-9);
        CU_ASSERT_PTR_NOT_NULL_FATAL(d);
        br_chain *c = NULL;
        br_error err;
        CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
        CU_ASSERT_EQUAL(c->n, 6); /* 2(N-1) switches, three a side */
        for (int k = 0; k < c->n; k++)
            BR_ASSERT_REL(c->st[k].vblock, br_rating_share(bus[b], 3), 1e-12);
        br_chain_free(c);
        br_design_free(d);
    }
}

int main(void)
{
    static const br_test_case cases[] = {
        {"Vin/(N-1) and the derating (common practice)", test_share},
        {"voltage class for 1000 V and 1500 V buses (common practice)", test_class},
        {"the FCML generator blocks Vin/(N-1) a switch", test_generator},
        {NULL, NULL},
    };
    return br_test_main("model_rating", cases);
}

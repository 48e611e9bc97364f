/* test_regress_engine.c - engine failures found by scans, kept as
 * regression tests (they need a design file, hence this layer). */
#include "analyses/steady.h"
#include "bootrung/bootrung.h"
#include "testkit.h"

#include <stdio.h>

/* A step that ends its interval must land on the interval end exactly:
 * t + (tb - t) can fall one rounding unit short, and the next step of
 * 1e-22 s then looked like a step-size underflow.  Found by `map` on the
 * 3-level demo with the drivers kept running below UVLO. */
static void check_point(double duty, double fsw)
{
    br_design *d;
    br_chain *c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(BR_SOURCE_DIR "/examples/demo-3level.xml", &d, &err), BR_OK);
    d->duty.nom = duty;
    d->fsw.nom = fsw;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    for (int k = 0; k < c->n; k++) {
        c->st[k].drv.uvlo_fall = -1e6;
        c->st[k].drv.uvlo_rise = -1e6 + 1.0;
    }
    br_steady ss;
    int rc = br_steady_solve(c, BR_DIRI_DOWN, NULL, &ss, &err);
    if (rc != BR_OK)
        fprintf(stderr, "duty %.17g fsw %.17g: %s\n", duty, fsw, err.msg);
    CU_ASSERT_EQUAL(rc, BR_OK);
    CU_ASSERT_TRUE(ss.converged);
    br_chain_free(c);
    br_design_free(d);
}

static void test_interval_end_rounding(void)
{
    check_point(0.26615384615384613, 80683.70422596642);
    check_point(0.46307692307692305, 398256.1523694008);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"a step lands on its interval end", test_interval_end_rounding}, {NULL, NULL}};
    return br_test_main("regress/engine", cases);
}

/* test_api_map.c - the duty-frequency map through the public API
 * (bootrung/analysis.h) is the internal map's, point for point; a bad grid
 * comes back as the library's input error; a stop is obeyed; bad
 * arguments are refused. */
#include "bootrung/analysis.h"
#include "bootrung/bootrung.h"

#include "analyses/map.h"
#include "testkit.h"

#include <gsl/gsl_errno.h>
#include <string.h>

static const char *const leg = "examples/leg-7level.xml";

static int same(double a, double b)
{
    return (isnan(a) && isnan(b)) || a == b;
}

#define ASSERT_SAME(a, b) CU_ASSERT_TRUE_FATAL_OR(same((a), (b)), (a), (b))

static void check_point(const br_map_study *m, const br_hold_point *p, int i, int j)
{
    double v;
    CU_ASSERT_EQUAL(br_map_point(m, i, j, BR_MAP_DUTY, &v), BR_OK);
    ASSERT_SAME(v, p->duty);
    CU_ASSERT_EQUAL(br_map_point(m, i, j, BR_MAP_FSW, &v), BR_OK);
    ASSERT_SAME(v, p->fsw);
    CU_ASSERT_EQUAL(br_map_point(m, i, j, BR_MAP_MARGIN, &v), BR_OK);
    ASSERT_SAME(v, p->margin);
    CU_ASSERT_EQUAL(br_map_point(m, i, j, BR_MAP_HOLDS, &v), BR_OK);
    ASSERT_SAME(v, p->holds);
    CU_ASSERT_EQUAL(br_map_point(m, i, j, BR_MAP_CRITERION, &v), BR_OK);
    ASSERT_SAME(v, p->crit);
    CU_ASSERT_EQUAL(br_map_point(m, i, j, BR_MAP_STAGE, &v), BR_OK);
    ASSERT_SAME(v, p->stage);
}

/* A grid that reaches from where the leg holds to where it does not. */
static void test_same_points(void)
{
    br_design *d = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(leg, &d, &err), BR_OK);
    br_map_opts o = {0};
    o.duty_from = 0.005, o.duty_to = 0.5, o.nduty = 5;
    o.fsw_from = 2e3, o.fsw_to = 120e3, o.nfsw = 4;
    o.threads = 2;
    br_map *r = NULL;
    CU_ASSERT_EQUAL_FATAL(br_map_run(d, &o, &r, &err), BR_OK);
    br_map_study *m = br_map_study_create();
    CU_ASSERT_EQUAL(br_map_study_set_grid(m, 0.005, 0.5, 5, 2e3, 120e3, 4), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_map_study_run(m, d, &err), BR_OK);
    br_design_free(d); /* the results outlive the design */
    int nd = 0, nf = 0, holds = 0, fails = 0;
    CU_ASSERT_EQUAL(br_map_size(m, &nd, &nf), BR_OK);
    CU_ASSERT_EQUAL_FATAL(nd, 5);
    CU_ASSERT_EQUAL_FATAL(nf, 4);
    for (int j = 0; j < nf; j++)
        for (int i = 0; i < nd; i++) {
            const br_hold_point *p = br_map_at(r, i, j);
            check_point(m, p, i, j);
            holds += p->holds;
            fails += !p->holds;
        }
    CU_ASSERT_TRUE(holds > 0 && fails > 0); /* both kinds of point compared */
    check_point(m, &r->design, -1, -1);
    br_map_study_free(m);
    br_map_free(r);
}

static int stop_now(void *ctx)
{
    (void)ctx;
    return 1;
}

static void test_errors(void)
{
    br_design *d = NULL;
    br_error err;
    double v;
    int a, b;
    CU_ASSERT_EQUAL_FATAL(br_design_load(leg, &d, &err), BR_OK);
    br_map_study *m = br_map_study_create();
    CU_ASSERT_EQUAL(br_map_study_run(m, d, &err), BR_EINPUT); /* no grid yet */
    CU_ASSERT_EQUAL(br_map_study_set_grid(m, 0.2, 1.5, 3, 50e3, 100e3, 2), BR_OK);
    CU_ASSERT_EQUAL(br_map_study_run(m, d, &err), BR_EINPUT);
    CU_ASSERT_STRING_EQUAL(err.field, "duty");
    CU_ASSERT_EQUAL(br_map_size(m, &a, &b), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_map_study_set_grid(m, 0.2, 0.8, 3, 50e3, 100e3, 2), BR_OK);
    CU_ASSERT_EQUAL(br_map_study_set_progress(m, NULL, stop_now, NULL), BR_OK);
    CU_ASSERT_EQUAL(br_map_study_run(m, d, &err), BR_ECANCEL);
    CU_ASSERT_EQUAL(br_map_point(m, 0, 0, BR_MAP_MARGIN, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_map_study_set_progress(m, NULL, NULL, NULL), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_map_study_run(m, d, &err), BR_OK);
    CU_ASSERT_EQUAL(br_map_point(m, 3, 0, BR_MAP_MARGIN, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_map_point(m, 0, 2, BR_MAP_MARGIN, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_map_point(m, -1, 0, BR_MAP_MARGIN, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_map_point(m, 0, 0, BR_MAP_KEY_COUNT, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_map_study_run(NULL, d, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_map_study_run(m, NULL, &err), BR_EUSAGE);
    br_map_study_free(m);
    br_map_study_free(NULL);
    br_design_free(d);
}

int main(void)
{
    gsl_set_error_handler_off();
    static const br_test_case cases[] = {{"the internal map's points", test_same_points},
                                         {"a bad grid, a stop, bad arguments", test_errors},
                                         {NULL, NULL}};
    return br_test_main("api_map", cases);
}

/* test_api_yield.c - Monte Carlo yield through the public API
 * (bootrung/analysis.h) is the internal run's, number for number, at the
 * same samples and seed; a stop is obeyed; bad arguments are refused. */
#include "bootrung/analysis.h"
#include "bootrung/bootrung.h"

#include "analyses/yield.h"
#include "testkit.h"

#include <gsl/gsl_errno.h>

static const char *const demo = "examples/demo-3level.xml";
#define SAMPLES 300
#define SEED 7

static int same(double a, double b)
{
    return (isnan(a) && isnan(b)) || a == b;
}

#define ASSERT_SAME(a, b) CU_ASSERT_TRUE_FATAL_OR(same((a), (b)), (a), (b))

static double get(const br_yield_study *y, int key)
{
    double v = -12345;
    CU_ASSERT_EQUAL(br_yield_get(y, key, &v), BR_OK);
    return v;
}

static void check_criteria(const br_yield_study *y, const br_yield *r)
{
    double v;
    for (int i = 0; i < BR_CRIT_COUNT; i++) {
        CU_ASSERT_EQUAL(br_yield_criterion(y, i, BR_YC_FAILS, &v), BR_OK);
        ASSERT_SAME(v, (double)r->c[i].fails);
        CU_ASSERT_EQUAL(br_yield_criterion(y, i, BR_YC_JUDGED, &v), BR_OK);
        ASSERT_SAME(v, (double)r->c[i].judged);
        CU_ASSERT_EQUAL(br_yield_criterion(y, i, BR_YC_MIN, &v), BR_OK);
        ASSERT_SAME(v, r->c[i].q[0]);
        CU_ASSERT_EQUAL(br_yield_criterion(y, i, BR_YC_MEDIAN, &v), BR_OK);
        ASSERT_SAME(v, r->c[i].q[BR_YIELD_NQ - 1]);
        for (int j = 0; j < r->s->tl.n; j++) {
            CU_ASSERT_EQUAL(br_yield_rho(y, i, j, &v), BR_OK);
            ASSERT_SAME(v, r->c[i].rho[j]);
        }
    }
}

static void check_samples(const br_yield_study *y, const br_yield *r)
{
    int n = r->s->tl.n, equal = 1, res;
    double v;
    for (long i = 0; i < r->n; i++) {
        for (int j = 0; j < n; j++)
            equal &= br_yield_sample_value(y, i, j, &v) == BR_OK && v == r->values[i * n + j];
        equal &= br_yield_sample_result(y, i, &res) == BR_OK &&
                 (res == BR_RESULT_FAIL) == (r->pts[i].outcome == BR_OUTCOME_FAIL);
    }
    CU_ASSERT_TRUE(equal);
}

static void test_same_numbers(void)
{
    br_design *d = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(demo, &d, &err), BR_OK);
    br_yield_opts o;
    br_yield_opts_default(&o);
    o.samples = SAMPLES;
    o.seed = SEED;
    br_yield *r = NULL;
    CU_ASSERT_EQUAL_FATAL(br_yield_run(d, &o, &r, &err), BR_OK);
    br_yield_study *y = br_yield_study_create();
    CU_ASSERT_EQUAL(br_yield_study_set_samples(y, SAMPLES, SEED), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_yield_study_run(y, d, &err), BR_OK);
    br_design_free(d); /* the results outlive the design */
    ASSERT_SAME(get(y, BR_YIELD_SAMPLES), SAMPLES);
    ASSERT_SAME(get(y, BR_YIELD_PASS), (double)r->pass);
    ASSERT_SAME(get(y, BR_YIELD_FAIL), (double)r->fail);
    ASSERT_SAME(get(y, BR_YIELD_YIELD), r->yield);
    ASSERT_SAME(get(y, BR_YIELD_LO), r->lo);
    ASSERT_SAME(get(y, BR_YIELD_HI), r->hi);
    /* the demo's drive margin fails at nominal, so most samples fail */
    CU_ASSERT_TRUE(r->fail > 0);
    int res = -1, np = 0;
    CU_ASSERT_EQUAL(br_yield_result(y, &res), BR_OK);
    CU_ASSERT_EQUAL(res, BR_RESULT_FAIL);
    CU_ASSERT_EQUAL(br_yield_params(y, &np), BR_OK);
    CU_ASSERT_EQUAL(np, 3);
    const char *name = NULL;
    CU_ASSERT_EQUAL(br_yield_param_name(y, 0, &name), BR_OK);
    CU_ASSERT_STRING_EQUAL(name, "supply: voltage");
    CU_ASSERT_EQUAL(br_criteria(), BR_CRIT_COUNT);
    CU_ASSERT_STRING_EQUAL(br_criterion_key(BR_CRIT_DRIVE), "drive");
    CU_ASSERT_STRING_EQUAL(br_criterion_title(BR_CRIT_DRIVE), br_crit_title(BR_CRIT_DRIVE));
    CU_ASSERT_PTR_NULL(br_criterion_key(BR_CRIT_COUNT));
    CU_ASSERT_PTR_NULL(br_criterion_key(-1));
    check_criteria(y, r);
    check_samples(y, r);
    br_yield_study_free(y);
    br_yield_free(r);
}

/* Another seed draws other samples. */
static void test_seed(void)
{
    br_design *d = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(demo, &d, &err), BR_OK);
    br_yield_study *a = br_yield_study_create(), *b = br_yield_study_create();
    CU_ASSERT_EQUAL(br_yield_study_set_samples(a, 20, 1), BR_OK);
    CU_ASSERT_EQUAL(br_yield_study_set_samples(b, 20, 2), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_yield_study_run(a, d, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_yield_study_run(b, d, &err), BR_OK);
    double va, vb;
    CU_ASSERT_EQUAL(br_yield_sample_value(a, 0, 0, &va), BR_OK);
    CU_ASSERT_EQUAL(br_yield_sample_value(b, 0, 0, &vb), BR_OK);
    CU_ASSERT_NOT_EQUAL(va, vb);
    CU_ASSERT_TRUE(va >= 11.4 && va <= 12.6); /* within the supply's 12 V +-5 % */
    br_yield_study_free(a);
    br_yield_study_free(b);
    br_design_free(d);
}

static int stop_now(void *ctx)
{
    (void)ctx;
    return 1;
}

static void test_cancel_and_bad_arguments(void)
{
    br_design *d = NULL;
    br_error err;
    double v;
    int n;
    CU_ASSERT_EQUAL_FATAL(br_design_load("examples/leg-7level.xml", &d, &err), BR_OK);
    br_yield_study *y = br_yield_study_create();
    CU_ASSERT_EQUAL(br_yield_study_set_progress(y, NULL, stop_now, NULL), BR_OK);
    CU_ASSERT_EQUAL(br_yield_study_run(y, d, &err), BR_ECANCEL);
    CU_ASSERT_EQUAL(br_yield_get(y, BR_YIELD_YIELD, &v), BR_EUSAGE); /* no results */
    CU_ASSERT_EQUAL(br_yield_study_run(NULL, d, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_yield_study_run(y, NULL, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_yield_study_set_samples(y, 0, 1), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_yield_study_set_startup(y, 2), BR_EUSAGE);
    br_design_free(d);
    CU_ASSERT_EQUAL_FATAL(br_design_load(demo, &d, &err), BR_OK);
    CU_ASSERT_EQUAL(br_yield_study_set_progress(y, NULL, NULL, NULL), BR_OK);
    CU_ASSERT_EQUAL(br_yield_study_set_samples(y, 10, 1), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_yield_study_run(y, d, &err), BR_OK);
    CU_ASSERT_EQUAL(br_yield_sample_value(y, 10, 0, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_yield_sample_value(y, 0, 3, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_yield_sample_result(y, -1, &n), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_yield_criterion(y, BR_CRIT_COUNT, BR_YC_FAILS, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_yield_criterion(y, 0, BR_YC_KEY_COUNT, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_yield_get(y, BR_YIELD_KEY_COUNT, &v), BR_EUSAGE);
    br_yield_study_free(y);
    br_yield_study_free(NULL);
    br_design_free(d);
}

int main(void)
{
    gsl_set_error_handler_off();
    static const br_test_case cases[] = {
        {"the internal run's numbers", test_same_numbers},
        {"another seed, other samples", test_seed},
        {"a stop poll stops it; bad arguments are refused", test_cancel_and_bad_arguments},
        {NULL, NULL}};
    return br_test_main("api_yield", cases);
}

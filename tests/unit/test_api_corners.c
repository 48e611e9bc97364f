/* test_api_corners.c - the worst-case corners through the public API
 * (bootrung/analysis.h) are the internal search's rows, number for
 * number; a stop is obeyed; bad arguments are refused.  On the demo only:
 * the 7-level leg's search takes seconds. */
#include "bootrung/analysis.h"
#include "bootrung/bootrung.h"

#include "analyses/corners.h"
#include "testkit.h"

#include <gsl/gsl_errno.h>
#include <string.h>

static const char *const demo = "examples/demo-3level.xml";

static int same(double a, double b)
{
    return (isnan(a) && isnan(b)) || a == b;
}

#define ASSERT_SAME(a, b) CU_ASSERT_TRUE_FATAL_OR(same((a), (b)), (a), (b))

static void check_row(const br_corner_search *s, const br_corners *k, int i)
{
    const br_corner_worst *w = &k->w[i];
    const char *key = NULL;
    double v;
    int stage = -2, res = -1;
    CU_ASSERT_EQUAL(br_corner_key(s, i, &key), BR_OK);
    CU_ASSERT_STRING_EQUAL(key, br_crit_name(i));
    CU_ASSERT_EQUAL(br_corner_value(s, i, BR_CORNER_WORST_FIGURE, &v), BR_OK);
    ASSERT_SAME(v, w->worst.figure);
    CU_ASSERT_EQUAL(br_corner_value(s, i, BR_CORNER_WORST_MARGIN, &v), BR_OK);
    ASSERT_SAME(v, w->worst.margin);
    CU_ASSERT_EQUAL(br_corner_value(s, i, BR_CORNER_NOMINAL_MARGIN, &v), BR_OK);
    ASSERT_SAME(v, w->nominal.margin);
    CU_ASSERT_EQUAL(br_corner_stage(s, i, &stage), BR_OK);
    CU_ASSERT_EQUAL(stage, w->worst.stage);
    CU_ASSERT_EQUAL(br_corner_result_of(s, i, &res), BR_OK);
    if (w->applies && w->outcome != BR_OUTCOME_UNDETERMINED)
        CU_ASSERT_EQUAL(res == BR_RESULT_FAIL, w->outcome == BR_OUTCOME_FAIL);
    for (int j = 0; j < k->s->tl.n; j++) {
        int level = 9;
        CU_ASSERT_EQUAL(br_corner_level(s, i, j, &level), BR_OK);
        CU_ASSERT_EQUAL(level, w->level[j]);
    }
}

static void test_same_rows(void)
{
    br_design *d = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(demo, &d, &err), BR_OK);
    br_corners_opts o;
    br_corners_opts_default(&o);
    br_corners *k = NULL;
    CU_ASSERT_EQUAL_FATAL(br_corners_run(d, &o, &k, &err), BR_OK);
    br_corner_search *s = br_corner_search_create();
    CU_ASSERT_EQUAL_FATAL(br_corner_search_run(s, d, &err), BR_OK);
    br_design_free(d); /* the results outlive the design */
    int n = 0, np = 0, res = -1;
    CU_ASSERT_EQUAL(br_corner_rows(s, &n), BR_OK);
    CU_ASSERT_EQUAL_FATAL(n, BR_CRIT_COUNT);
    CU_ASSERT_EQUAL(br_corner_params(s, &np), BR_OK);
    CU_ASSERT_EQUAL(np, k->s->tl.n);
    CU_ASSERT_EQUAL(np, 3); /* the demo's supply voltage and its two capacitors */
    const char *name = NULL;
    CU_ASSERT_EQUAL(br_corner_param_name(s, 0, &name), BR_OK);
    CU_ASSERT_STRING_EQUAL(name, "supply: voltage");
    CU_ASSERT_EQUAL(br_corner_param_name(s, np - 1, &name), BR_OK);
    CU_ASSERT_STRING_EQUAL(name, k->s->tl.p[np - 1].name);
    for (int i = 0; i < n; i++)
        check_row(s, k, i);
    long pts = -1;
    CU_ASSERT_EQUAL(br_corner_count_of(s, BR_CORNERS_STEADY_POINTS, &pts), BR_OK);
    CU_ASSERT_EQUAL(pts, k->steady_points);
    CU_ASSERT_EQUAL(br_corner_count_of(s, BR_CORNERS_STARTUP_POINTS, &pts), BR_OK);
    CU_ASSERT_EQUAL(pts, k->startup_points);
    CU_ASSERT_TRUE(pts > 0);
    /* the demo fails its drive margin at nominal already (README) */
    CU_ASSERT_EQUAL(br_corner_result(s, &res), BR_OK);
    CU_ASSERT_EQUAL(res, BR_RESULT_FAIL);
    CU_ASSERT_EQUAL(k->outcome, BR_OUTCOME_FAIL);
    br_corner_search_free(s);
    br_corners_free(k);
}

/* Without the start-up criteria no cold start is simulated and their rows
 * are not applicable. */
static void test_no_startup(void)
{
    br_design *d = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(demo, &d, &err), BR_OK);
    br_corner_search *s = br_corner_search_create();
    CU_ASSERT_EQUAL(br_corner_search_set_startup(s, 0), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_corner_search_run(s, d, &err), BR_OK);
    long pts = -1;
    int res = -1;
    CU_ASSERT_EQUAL(br_corner_count_of(s, BR_CORNERS_STARTUP_POINTS, &pts), BR_OK);
    CU_ASSERT_EQUAL(pts, 0);
    CU_ASSERT_EQUAL(br_corner_result_of(s, BR_CRIT_STARTUP, &res), BR_OK);
    CU_ASSERT_EQUAL(res, BR_RESULT_NOT_APPLICABLE);
    br_corner_search_free(s);
    br_design_free(d);
}

static int polls;
static int stop_now(void *ctx)
{
    (void)ctx;
    polls++;
    return 1;
}

static void test_cancel_and_bad_arguments(void)
{
    br_design *d = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load("examples/leg-7level.xml", &d, &err), BR_OK);
    br_corner_search *s = br_corner_search_create();
    CU_ASSERT_EQUAL(br_corner_search_set_progress(s, NULL, stop_now, NULL), BR_OK);
    CU_ASSERT_EQUAL(br_corner_search_run(s, d, &err), BR_ECANCEL);
    CU_ASSERT_TRUE(polls > 0);
    int n = -1;
    double v;
    CU_ASSERT_EQUAL(br_corner_rows(s, &n), BR_EUSAGE); /* no results */
    CU_ASSERT_EQUAL(br_corner_search_run(NULL, d, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_corner_search_run(s, NULL, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_corner_search_set_startup(s, 3), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_corner_value(s, 0, BR_CORNER_WORST_MARGIN, &v), BR_EUSAGE);
    br_design_free(d);
    CU_ASSERT_EQUAL_FATAL(br_design_load(demo, &d, &err), BR_OK);
    CU_ASSERT_EQUAL(br_corner_search_set_progress(s, NULL, NULL, NULL), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_corner_search_run(s, d, &err), BR_OK);
    CU_ASSERT_EQUAL(br_corner_value(s, BR_CRIT_COUNT, BR_CORNER_WORST_MARGIN, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_corner_value(s, 0, BR_CORNER_KEY_COUNT, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_corner_level(s, 0, 999, &n), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_corner_param_name(s, -1, NULL), BR_EUSAGE);
    br_corner_search_free(s);
    br_corner_search_free(NULL);
    br_design_free(d);
}

int main(void)
{
    gsl_set_error_handler_off();
    static const br_test_case cases[] = {
        {"the rows of the internal search", test_same_rows},
        {"without the start-up criteria", test_no_startup},
        {"a stop poll stops it; bad arguments are refused", test_cancel_and_bad_arguments},
        {NULL, NULL}};
    return br_test_main("api_corners", cases);
}

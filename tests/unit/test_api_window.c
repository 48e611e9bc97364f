/* test_api_window.c - the window through the public API
 * (bootrung/analysis.h) is the internal search's, number for number, on
 * the demo (which fails at its design point) and the 7-level leg (which
 * holds there); a stop is obeyed; bad arguments are refused. */
#include "bootrung/analysis.h"
#include "bootrung/bootrung.h"

#include "analyses/window.h"
#include "testkit.h"

#include <gsl/gsl_errno.h>
#include <stdlib.h>

static const char *const designs[] = {"examples/demo-3level.xml", "examples/leg-7level.xml"};

static int same(double a, double b)
{
    return (isnan(a) && isnan(b)) || a == b;
}

#define ASSERT_SAME(a, b) CU_ASSERT_TRUE_FATAL_OR(same((a), (b)), (a), (b))

static double axis_get(const br_window_study *w, int axis, int key)
{
    double v = -12345;
    CU_ASSERT_EQUAL(br_window_axis(w, axis, key, &v), BR_OK);
    return v;
}

static void check_axis(const br_window_study *w, const br_sweep *s, int axis)
{
    ASSERT_SAME(axis_get(w, axis, BR_WA_APPLIES), s->applies);
    ASSERT_SAME(axis_get(w, axis, BR_WA_LO), s->lo);
    ASSERT_SAME(axis_get(w, axis, BR_WA_HI), s->hi);
    ASSERT_SAME(axis_get(w, axis, BR_WA_DESIGN), s->design);
    ASSERT_SAME(axis_get(w, axis, BR_WA_SPANS), s->nspans);
    ASSERT_SAME(axis_get(w, axis, BR_WA_HOME), s->home);
    double v;
    for (int i = 0; i < s->nspans && i < BR_MAX_SPANS; i++) {
        CU_ASSERT_EQUAL(br_window_span(w, axis, i, BR_WS_LOW, &v), BR_OK);
        ASSERT_SAME(v, s->span[i].lo.value);
        CU_ASSERT_EQUAL(br_window_span(w, axis, i, BR_WS_HIGH, &v), BR_OK);
        ASSERT_SAME(v, s->span[i].hi.value);
        CU_ASSERT_EQUAL(br_window_span(w, axis, i, BR_WS_HIGH_OUTSIDE, &v), BR_OK);
        ASSERT_SAME(v, s->span[i].hi.kind == BR_LIMIT_FOUND ? s->span[i].hi.outside : NAN);
    }
    CU_ASSERT_EQUAL(br_window_span(w, axis, s->nspans, BR_WS_LOW, &v), BR_EUSAGE);
}

static void test_same_numbers(void)
{
    const int home[] = {-1, 0}; /* the demo fails at its design point, the leg holds */
    for (int i = 0; i < 2; i++) {
        br_design *d = NULL;
        br_error err;
        CU_ASSERT_EQUAL_FATAL(br_design_load(designs[i], &d, &err), BR_OK);
        br_window *r = calloc(1, sizeof *r);
        br_window_opts o;
        br_window_opts_default(&o);
        CU_ASSERT_EQUAL_FATAL(br_window_run(d, &o, r, &err), BR_OK);
        br_window_study *w = br_window_study_create();
        CU_ASSERT_EQUAL_FATAL(br_window_study_run(w, d, &err), BR_OK);
        br_design_free(d); /* the results outlive the design */
        check_axis(w, &r->duty, BR_WINDOW_DUTY);
        check_axis(w, &r->fsw, BR_WINDOW_FREQUENCY);
        check_axis(w, &r->ipk, BR_WINDOW_PEAK);
        CU_ASSERT_EQUAL(r->duty.applies, 1);
        CU_ASSERT_EQUAL(r->duty.home >= 0 ? 0 : -1, home[i]);
        double v;
        CU_ASSERT_EQUAL(br_window_startup(w, BR_WINDOW_DUTY, BR_WU_APPLIES, &v), BR_OK);
        ASSERT_SAME(v, 0.0); /* not asked for */
        CU_ASSERT_EQUAL(br_window_startup(w, BR_WINDOW_PEAK, BR_WU_APPLIES, &v), BR_EUSAGE);
        br_window_study_free(w);
        free(r);
    }
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
    CU_ASSERT_EQUAL_FATAL(br_design_load(designs[1], &d, &err), BR_OK);
    br_window_study *w = br_window_study_create();
    CU_ASSERT_EQUAL(br_window_study_set_progress(w, NULL, stop_now, NULL), BR_OK);
    CU_ASSERT_EQUAL(br_window_study_run(w, d, &err), BR_ECANCEL);
    CU_ASSERT_EQUAL(br_window_axis(w, BR_WINDOW_DUTY, BR_WA_LO, &v), BR_EUSAGE); /* none */
    CU_ASSERT_EQUAL(br_window_study_run(NULL, d, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_window_study_run(w, NULL, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_window_study_set_startup(w, 5), BR_EUSAGE);
    br_design_free(d);
    CU_ASSERT_EQUAL_FATAL(br_design_load(designs[0], &d, &err), BR_OK);
    CU_ASSERT_EQUAL(br_window_study_set_progress(w, NULL, NULL, NULL), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_window_study_run(w, d, &err), BR_OK);
    CU_ASSERT_EQUAL(br_window_axis(w, 4, BR_WA_LO, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_window_axis(w, BR_WINDOW_DUTY, BR_WA_KEY_COUNT, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_window_axis(w, BR_WINDOW_DUTY, BR_WA_LO, NULL), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_window_span(w, BR_WINDOW_DUTY, -1, BR_WS_LOW, &v), BR_EUSAGE);
    br_window_study_free(w);
    br_window_study_free(NULL);
    br_design_free(d);
}

int main(void)
{
    gsl_set_error_handler_off();
    static const br_test_case cases[] = {
        {"the internal search's numbers", test_same_numbers},
        {"a stop poll stops it; bad arguments are refused", test_cancel_and_bad_arguments},
        {NULL, NULL}};
    return br_test_main("api_window", cases);
}

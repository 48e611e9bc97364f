/* test_api_supply.c - the supply window through the public API
 * (bootrung/parts.h) is the internal search's, answer for answer, and its
 * reports are the ones the internal renderers write, byte for byte, after
 * the caller's design is gone; a stop is obeyed; bad arguments are
 * refused.  On the 3-level demo (a few seconds). */
#include "bootrung/bootrung.h"
#include "bootrung/parts.h"

#include "analyses/supply_window.h"
#include "report/supply_window_report.h"
#include "report/verb_pages.h"
#include "testkit.h"

#include <gsl/gsl_errno.h>
#include <math.h>
#include <string.h>

static const char *const demo = "examples/demo-3level.xml";

static int same(double a, double b)
{
    return (isnan(a) && isnan(b)) || a == b;
}

#define ASSERT_SAME(a, b) CU_ASSERT_TRUE_FATAL_OR(same((a), (b)), (a), (b))

static void check_answer(const br_supply_study *s, const br_supply_window *w, int ans)
{
    const br_sw_result *r = &w->r[ans];
    double v;
    CU_ASSERT_EQUAL(br_supply_answer(s, ans, BR_SA_APPLIES, &v), BR_OK);
    CU_ASSERT_EQUAL(v, r->applies);
    CU_ASSERT_EQUAL(br_supply_answer(s, ans, BR_SA_KIND, &v), BR_OK);
    CU_ASSERT_EQUAL(v, r->kind);
    CU_ASSERT_EQUAL(br_supply_answer(s, ans, BR_SA_FROM, &v), BR_OK);
    ASSERT_SAME(v, r->from);
    CU_ASSERT_EQUAL(br_supply_answer(s, ans, BR_SA_VALUE, &v), BR_OK);
    ASSERT_SAME(v, r->value);
    CU_ASSERT_EQUAL(br_supply_answer(s, ans, BR_SA_POINTS, &v), BR_OK);
    CU_ASSERT_EQUAL(v, r->npts);
    CU_ASSERT_EQUAL(br_supply_answer(s, ans, BR_SA_FAILING, &v), BR_OK);
    if (r->applies && r->kind == BR_SW_FOUND)
        ASSERT_SAME(v, r->fail.value);
    CU_ASSERT_EQUAL(br_supply_answer(s, ans, BR_SA_FAIL_CRITERION, &v), BR_OK);
    if (r->applies && r->kind == BR_SW_FOUND)
        CU_ASSERT_EQUAL(v, r->fail.crit);
    const char *why = NULL;
    CU_ASSERT_EQUAL(br_supply_answer_why(s, ans, &why), BR_OK);
    CU_ASSERT_STRING_EQUAL(why, r->applies ? "" : r->why);
}

static void check_render(const br_supply_study *s, int format, const br_text *want)
{
    br_error err;
    br_text *t = br_text_create();
    CU_ASSERT_EQUAL_FATAL(br_supply_study_render(s, format, t, &err), BR_OK);
    CU_ASSERT_EQUAL(br_text_len(t), br_text_len(want));
    CU_ASSERT_STRING_EQUAL(br_text_data(t), br_text_data(want));
    br_text_free(t);
}

/* The internal reports of the same search, as `supply` wrote them before
 * it was a client of the public API. */
static void reference(const br_design *d, br_text *text, br_text *xml, br_text *html,
                      br_supply_window **w)
{
    static const char *const verdict[] = {"verdict:", NULL};
    br_error err;
    br_chain *c = NULL;
    br_supply_window_opts o = {0};
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_supply_window_run(d, &o, w, &err), BR_OK);
    CU_ASSERT_EQUAL(br_supply_window_text(c, *w, text), BR_OK);
    CU_ASSERT_EQUAL(br_supply_window_xml(c, *w, br_version(), xml, &err), BR_OK);
    CU_ASSERT_EQUAL(br_text_html(c, "supply window", br_supply_window_outcome(*w), verdict, 1, text,
                                 html, &err),
                    BR_OK);
    br_chain_free(c);
}

static void test_same_answers_and_reports(void)
{
    br_design *d = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(demo, &d, &err), BR_OK);
    br_text *text = br_text_create(), *xml = br_text_create(), *html = br_text_create();
    br_supply_window *w = NULL;
    reference(d, text, xml, html, &w);
    br_supply_study *s = br_supply_study_create();
    CU_ASSERT_EQUAL_FATAL(br_supply_study_run(s, d, &err), BR_OK);
    br_design_free(d); /* the study outlives the design */
    for (int ans = BR_SUPPLY_LIMIT; ans <= BR_SUPPLY_VMAX; ans++)
        check_answer(s, w, ans);
    int res = -1;
    CU_ASSERT_EQUAL(br_supply_result(s, &res), BR_OK);
    /* the demo fails its drive margin at its own supply already (README) */
    CU_ASSERT_EQUAL(res, BR_RESULT_FAIL);
    CU_ASSERT_EQUAL(br_supply_window_outcome(w), BR_OUTCOME_FAIL);
    check_render(s, BR_FORMAT_TEXT, text);
    check_render(s, BR_FORMAT_XML, xml);
    check_render(s, BR_FORMAT_HTML, html);
    CU_ASSERT_TRUE(strstr(br_text_data(text), "verdict:") != NULL);
    br_supply_window_free(w);
    br_supply_study_free(s);
    br_text_free(text);
    br_text_free(xml);
    br_text_free(html);
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
    CU_ASSERT_EQUAL_FATAL(br_design_load(demo, &d, &err), BR_OK);
    br_supply_study *s = br_supply_study_create();
    br_text *t = br_text_create();
    double v;
    int res;
    CU_ASSERT_EQUAL(br_supply_study_render(s, BR_FORMAT_TEXT, t, &err), BR_EUSAGE); /* not run */
    CU_ASSERT_EQUAL(br_text_len(t), 0);
    CU_ASSERT_EQUAL(br_supply_study_set_progress(s, NULL, stop_now, NULL), BR_OK);
    CU_ASSERT_EQUAL(br_supply_study_run(s, d, &err), BR_ECANCEL);
    CU_ASSERT_TRUE(polls > 0);
    CU_ASSERT_EQUAL(br_supply_result(s, &res), BR_EUSAGE); /* no results */
    CU_ASSERT_EQUAL(br_supply_answer(s, BR_SUPPLY_VMIN, BR_SA_VALUE, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_supply_study_run(NULL, d, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_supply_study_run(s, NULL, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_supply_study_set_threads(s, -1), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_supply_study_set_threads(s, BR_STUDY_THREADS_MAX + 1), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_supply_study_set_threads(s, BR_STUDY_THREADS_MAX), BR_OK);
    CU_ASSERT_EQUAL(br_supply_study_set_progress(NULL, NULL, NULL, NULL), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_supply_answer(NULL, 0, 0, &v), BR_EUSAGE);
    br_supply_study_free(s);
    br_supply_study_free(NULL);
    br_text_free(t);
    br_design_free(d);
}

int main(void)
{
    gsl_set_error_handler_off();
    static const br_test_case cases[] = {
        {"the answers and reports of the internal search", test_same_answers_and_reports},
        {"a stop poll stops it; bad arguments are refused", test_cancel_and_bad_arguments},
        {NULL, NULL}};
    return br_test_main("api_supply", cases);
}

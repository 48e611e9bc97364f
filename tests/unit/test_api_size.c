/* test_api_size.c - sizing through the public API (bootrung/parts.h) is
 * the internal search's, answer for answer; its report and the sized
 * design file are the ones the internal renderers write, byte for byte,
 * after the caller's design and catalog are gone; the sized design reads
 * back; a stop is obeyed; bad arguments are refused.  On the 3-level
 * demo, continuous and from the example stock. */
#include "bootrung/bootrung.h"
#include "bootrung/parts.h"

#include "analyses/size.h"
#include "io/design_write.h"
#include "report/size_report.h"
#include "testkit.h"

#include <gsl/gsl_errno.h>
#include <math.h>
#include <string.h>

static const char *const demo = "examples/demo-3level.xml";
static const char *const stock = "examples/parts/catalog.xml";

static void check_answer(const br_size_study *s, const br_size_answer *a, int k)
{
    double v;
    int has = a->kind == BR_SIZE_FOUND || a->kind == BR_SIZE_END;
    CU_ASSERT_EQUAL(br_size_answer_get(s, k, BR_SZ_KIND, &v), BR_OK);
    CU_ASSERT_EQUAL(v, a->kind);
    CU_ASSERT_EQUAL(br_size_answer_get(s, k, BR_SZ_FROM, &v), BR_OK);
    CU_ASSERT_EQUAL(v, a->from);
    CU_ASSERT_EQUAL(br_size_answer_get(s, k, BR_SZ_VALUE, &v), BR_OK);
    CU_ASSERT_TRUE(has ? v == a->at.v : isnan(v));
    CU_ASSERT_EQUAL(br_size_answer_get(s, k, BR_SZ_PART, &v), BR_OK);
    CU_ASSERT_EQUAL(v, has ? a->at.part : -1);
    CU_ASSERT_EQUAL(br_size_answer_get(s, k, BR_SZ_TRIALS, &v), BR_OK);
    CU_ASSERT_EQUAL(v, a->trials);
}

/* The study against the internal search with the same options; cat may
 * be NULL (continuous values). */
static void compare(const char *catalog)
{
    br_design *d = NULL;
    br_catalog *cat = NULL;
    br_chain *c = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(demo, &d, &err), BR_OK);
    if (catalog)
        CU_ASSERT_EQUAL_FATAL(br_catalog_load(catalog, &cat, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_size_opts o;
    br_size_opts_default(&o);
    o.cat = cat;
    br_size *z = NULL;
    CU_ASSERT_EQUAL_FATAL(br_size_run(d, &o, &z, &err), BR_OK);
    br_text *text = br_text_create(), *file = br_text_create(), *comment = br_text_create();
    CU_ASSERT_EQUAL(br_size_text(c, z, catalog, text), BR_OK);
    CU_ASSERT_EQUAL(br_size_comment(c, z, catalog, comment), BR_OK);
    CU_ASSERT_EQUAL(br_design_write(z->d, br_text_data(comment), file, &err), BR_OK);

    br_size_study *s = br_size_study_create();
    CU_ASSERT_EQUAL_FATAL(br_size_study_run(s, d, cat, &err), BR_OK);
    br_design_free(d); /* the study outlives the design and the catalog */
    br_catalog_free(cat);
    for (int k = 1; k < z->n; k++)
        check_answer(s, &z->cap[k], k);
    check_answer(s, &z->link, 0); /* the default sizes the links */
    double v;
    int res = -1;
    CU_ASSERT_EQUAL(br_size_get(s, BR_SIZE_TARGET, &v), BR_OK);
    CU_ASSERT_EQUAL(v, z->target);
    CU_ASSERT_EQUAL(br_size_get(s, BR_SIZE_POINTS, &v), BR_OK);
    CU_ASSERT_EQUAL(v, (double)z->points);
    CU_ASSERT_EQUAL(br_size_result(s, &res), BR_OK);
    CU_ASSERT_EQUAL(res == BR_RESULT_PASS, z->outcome == BR_OUTCOME_PASS);
    br_text *t = br_text_create();
    CU_ASSERT_EQUAL(br_size_study_render(s, BR_FORMAT_TEXT, t, &err), BR_OK);
    CU_ASSERT_STRING_EQUAL(br_text_data(t), br_text_data(text));
    br_text_reset(t);
    CU_ASSERT_EQUAL(br_size_design_file(s, t, &err), BR_OK);
    CU_ASSERT_STRING_EQUAL(br_text_data(t), br_text_data(file));
    /* the sized design file reads back */
    br_design *back = NULL;
    CU_ASSERT_EQUAL(
        br_design_load_memory(br_text_data(t), br_text_len(t), "sized.xml", &back, &err), BR_OK);
    br_design_free(back);
    const br_design *sized = NULL;
    CU_ASSERT_EQUAL(br_size_design(s, &sized), BR_OK);
    CU_ASSERT_PTR_NOT_NULL(sized);
    br_size_study_free(s);
    br_size_free(z);
    br_chain_free(c);
    br_text_free(t);
    br_text_free(text);
    br_text_free(file);
    br_text_free(comment);
}

static void test_continuous(void)
{
    compare(NULL);
}

static void test_from_catalog(void)
{
    compare(stock);
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
    br_size_study *s = br_size_study_create();
    br_text *t = br_text_create();
    double v;
    CU_ASSERT_EQUAL(br_size_study_render(s, BR_FORMAT_TEXT, t, &err), BR_EUSAGE); /* not run */
    CU_ASSERT_EQUAL(br_size_design_file(s, t, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_size_study_set_progress(s, NULL, stop_now, NULL), BR_OK);
    CU_ASSERT_EQUAL(br_size_study_run(s, d, NULL, &err), BR_ECANCEL);
    CU_ASSERT_TRUE(polls > 0);
    CU_ASSERT_EQUAL(br_size_get(s, BR_SIZE_TARGET, &v), BR_EUSAGE); /* no results */
    CU_ASSERT_EQUAL(br_size_study_run(s, NULL, NULL, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_size_study_set_target(s, -1), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_size_study_set_target(s, NAN), BR_OK);
    CU_ASSERT_EQUAL(br_size_study_set_links(s, 2), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_size_study_set_supply(s, 2), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_size_study_set_solver_limit(s, 401), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_size_study_set_threads(s, BR_STUDY_THREADS_MAX + 1), BR_EUSAGE);
    /* without the links: no link answer */
    CU_ASSERT_EQUAL(br_size_study_set_progress(s, NULL, NULL, NULL), BR_OK);
    CU_ASSERT_EQUAL(br_size_study_set_links(s, 0), BR_OK);
    CU_ASSERT_EQUAL(br_size_study_set_target(s, 0.05), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_size_study_run(s, d, NULL, &err), BR_OK);
    CU_ASSERT_EQUAL(br_size_get(s, BR_SIZE_TARGET, &v), BR_OK);
    CU_ASSERT_EQUAL(v, 0.05);
    CU_ASSERT_EQUAL(br_size_answer_get(s, 0, BR_SZ_KIND, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_size_answer_get(s, 1, BR_SZ_KEY_COUNT, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_size_answer_get(s, 99, BR_SZ_KIND, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_size_study_render(s, BR_FORMAT_XML, t, &err), BR_EUSAGE);
    br_size_study_free(s);
    br_size_study_free(NULL);
    br_text_free(t);
    br_design_free(d);
}

int main(void)
{
    gsl_set_error_handler_off();
    static const br_test_case cases[] = {
        {"continuous values: the internal search's", test_continuous},
        {"from a catalog: the internal search's", test_from_catalog},
        {"a stop poll stops it; bad arguments are refused", test_cancel_and_bad_arguments},
        {NULL, NULL}};
    return br_test_main("api_size", cases);
}

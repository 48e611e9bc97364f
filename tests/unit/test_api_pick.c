/* test_api_pick.c - the part pick through the public API
 * (bootrung/parts.h) is the internal search's, choice for choice, and its
 * reports are the ones the internal renderers write, byte for byte, after
 * the caller's design and catalog are gone; a stop is obeyed; bad
 * arguments are refused.  The 3-level demo and the example stock. */
#include "bootrung/bootrung.h"
#include "bootrung/export.h"
#include "bootrung/parts.h"

#include "analyses/pick.h"
#include "report/pick_report.h"
#include "report/verb_pages.h"
#include "testkit.h"

#include <gsl/gsl_errno.h>
#include <math.h>
#include <string.h>

static const char *const demo = "examples/demo-3level.xml";
static const char *const stock = "examples/parts/catalog.xml";

static int stages; /* of the demo's chain */

static void check_choice(const br_pick_study *s, const br_pick *p, int i)
{
    const br_choice *ch = &p->choice[i];
    double v;
    CU_ASSERT_EQUAL(br_pick_choice_value(s, i, BR_CHOICE_COST, &v), BR_OK);
    CU_ASSERT_EQUAL(v, ch->cost);
    CU_ASSERT_EQUAL(br_pick_choice_value(s, i, BR_CHOICE_AREA, &v), BR_OK);
    BR_ASSERT_REL(v, ch->area * 1e-6, 1e-12);
    CU_ASSERT_EQUAL(br_pick_choice_value(s, i, BR_CHOICE_MARGIN, &v), BR_OK);
    CU_ASSERT_TRUE(ch->margin == HUGE_VAL ? isnan(v) : v == ch->margin);
    CU_ASSERT_EQUAL(br_pick_choice_value(s, i, BR_CHOICE_UNIFORM, &v), BR_OK);
    CU_ASSERT_EQUAL(v, ch->uniform);
    CU_ASSERT_EQUAL(br_pick_choice_value(s, i, BR_CHOICE_RESULT, &v), BR_OK);
    if (ch->status == BR_OK && ch->outcome == BR_OUTCOME_PASS)
        CU_ASSERT_EQUAL(v, BR_RESULT_PASS);
    if (ch->status == BR_OK && ch->outcome == BR_OUTCOME_FAIL)
        CU_ASSERT_EQUAL(v, BR_RESULT_FAIL);
    for (int k = 1; k < stages; k++) {
        int part = -9;
        CU_ASSERT_EQUAL(br_pick_choice_part(s, i, BR_CATALOG_CAPACITOR, k, &part), BR_OK);
        CU_ASSERT_EQUAL(part, ch->cap[k]);
        CU_ASSERT_EQUAL(br_pick_choice_part(s, i, BR_CATALOG_DIODE, k, &part), BR_OK);
        CU_ASSERT_EQUAL(part, ch->diode[k]);
    }
}

static void check_render(const br_pick_study *s, int format, const br_text *want)
{
    br_error err;
    br_text *t = br_text_create();
    CU_ASSERT_EQUAL_FATAL(br_pick_study_render(s, format, t, &err), BR_OK);
    CU_ASSERT_EQUAL(br_text_len(t), br_text_len(want));
    CU_ASSERT_STRING_EQUAL(br_text_data(t), br_text_data(want));
    br_text_free(t);
}

/* The internal reports of the same pick, as `pick` wrote them before it
 * was a client of the public API. */
static void reference(const br_design *d, const br_catalog *cat, const br_pick_opts *o,
                      br_text *text, br_text *xml, br_text *html, br_pick **p)
{
    static const char *const verdict[] = {"verdict:", NULL};
    br_error err;
    br_chain *c = NULL;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    stages = br_chain_stages(c);
    CU_ASSERT_TRUE(stages >= 3);
    CU_ASSERT_EQUAL_FATAL(br_pick_run(d, cat, o, p, &err), BR_OK);
    CU_ASSERT_EQUAL(br_pick_text(c, *p, text), BR_OK);
    CU_ASSERT_EQUAL(br_pick_xml(c, *p, br_version(), xml, &err), BR_OK);
    CU_ASSERT_EQUAL(br_text_html(c, "part choice", (*p)->outcome, verdict, 1, text, html, &err),
                    BR_OK);
    br_chain_free(c);
}

static void test_same_choices_and_reports(void)
{
    br_design *d = NULL;
    br_catalog *cat = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(demo, &d, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_catalog_load(stock, &cat, &err), BR_OK);
    br_pick_opts o;
    br_pick_opts_default(&o);
    o.top = 3;
    o.min_margin = 0.05;
    br_text *text = br_text_create(), *xml = br_text_create(), *html = br_text_create();
    br_pick *p = NULL;
    reference(d, cat, &o, text, xml, html, &p);
    br_pick_study *s = br_pick_study_create();
    CU_ASSERT_EQUAL(br_pick_study_set_top(s, 3), BR_OK);
    CU_ASSERT_EQUAL(br_pick_study_set_min_margin(s, 0.05), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_pick_study_run(s, d, cat, &err), BR_OK);
    br_design_free(d); /* the study outlives the design and the catalog */
    br_catalog_free(cat);
    int n = -1, r = -1, res = -1;
    CU_ASSERT_EQUAL(br_pick_choices(s, &n), BR_OK);
    CU_ASSERT_EQUAL_FATAL(n, p->nchoice);
    CU_ASSERT_TRUE(n > 1);
    for (int i = 0; i < n; i++)
        check_choice(s, p, i);
    CU_ASSERT_EQUAL(br_pick_ranked(s, &n), BR_OK);
    CU_ASSERT_EQUAL_FATAL(n, p->nranked);
    for (int i = 0; i < n; i++) {
        CU_ASSERT_EQUAL(br_pick_ranked_choice(s, i, &r), BR_OK);
        CU_ASSERT_EQUAL(r, p->ranked[i]);
    }
    CU_ASSERT_EQUAL(br_pick_rejects(s, &n), BR_OK);
    CU_ASSERT_EQUAL_FATAL(n, p->nrej);
    for (int j = 0; j < n; j++) {
        int role = -1, part = -1;
        const char *why = NULL;
        CU_ASSERT_EQUAL(br_pick_reject(s, j, &role, &part, &why), BR_OK);
        CU_ASSERT_EQUAL(role, p->rej[j].is_diode ? BR_CATALOG_DIODE : BR_CATALOG_CAPACITOR);
        CU_ASSERT_EQUAL(part, p->rej[j].part);
        CU_ASSERT_STRING_EQUAL(why, p->rej[j].why);
    }
    CU_ASSERT_EQUAL(br_pick_result(s, &res), BR_OK);
    CU_ASSERT_EQUAL(res, p->outcome == BR_OUTCOME_PASS   ? BR_RESULT_PASS
                         : p->outcome == BR_OUTCOME_FAIL ? BR_RESULT_FAIL
                                                         : BR_RESULT_UNDETERMINED);
    check_render(s, BR_FORMAT_TEXT, text);
    check_render(s, BR_FORMAT_XML, xml);
    check_render(s, BR_FORMAT_HTML, html);
    br_pick_free(p);
    br_pick_study_free(s);
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
    br_catalog *cat = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(demo, &d, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_catalog_load(stock, &cat, &err), BR_OK);
    br_pick_study *s = br_pick_study_create();
    br_text *t = br_text_create();
    int n;
    double v;
    CU_ASSERT_EQUAL(br_pick_study_render(s, BR_FORMAT_TEXT, t, &err), BR_EUSAGE); /* not run */
    CU_ASSERT_EQUAL(br_pick_study_set_progress(s, NULL, stop_now, NULL), BR_OK);
    CU_ASSERT_EQUAL(br_pick_study_run(s, d, cat, &err), BR_ECANCEL);
    CU_ASSERT_TRUE(polls > 0);
    CU_ASSERT_EQUAL(br_pick_choices(s, &n), BR_EUSAGE); /* no results */
    CU_ASSERT_EQUAL(br_pick_study_run(s, d, NULL, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_pick_study_run(s, NULL, cat, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_pick_study_set_top(s, 0), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_pick_study_set_top(s, 65), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_pick_study_set_min_margin(s, -0.1), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_pick_study_set_min_margin(s, NAN), BR_OK);
    CU_ASSERT_EQUAL(br_pick_study_set_startup(s, 2), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_pick_study_set_per_rail(s, -1), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_pick_study_set_solver_limit(s, 100001), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_pick_study_set_threads(s, -1), BR_EUSAGE);
    /* one-part choices only, no start-up: quick */
    CU_ASSERT_EQUAL(br_pick_study_set_progress(s, NULL, NULL, NULL), BR_OK);
    CU_ASSERT_EQUAL(br_pick_study_set_per_rail(s, 0), BR_OK);
    CU_ASSERT_EQUAL(br_pick_study_set_startup(s, 0), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_pick_study_run(s, d, cat, &err), BR_OK);
    CU_ASSERT_EQUAL(br_pick_study_render(s, 99, t, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_pick_choices(s, &n), BR_OK);
    CU_ASSERT_EQUAL(br_pick_choice_value(s, n, BR_CHOICE_COST, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_pick_choice_value(s, 0, BR_CHOICE_KEY_COUNT, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_pick_choice_part(s, 0, BR_CATALOG_SWITCH, 1, &n), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_pick_choice_part(s, 0, BR_CATALOG_DIODE, 0, &n), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_pick_choice_part(s, 0, BR_CATALOG_DIODE, stages, &n), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_pick_ranked_choice(s, -1, &n), BR_EUSAGE);
    br_pick_study_free(s);
    br_pick_study_free(NULL);
    br_text_free(t);
    br_catalog_free(cat);
    br_design_free(d);
}

int main(void)
{
    gsl_set_error_handler_off();
    static const br_test_case cases[] = {
        {"the choices and reports of the internal pick", test_same_choices_and_reports},
        {"a stop poll stops it; bad arguments are refused", test_cancel_and_bad_arguments},
        {NULL, NULL}};
    return br_test_main("api_pick", cases);
}

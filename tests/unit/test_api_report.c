/* test_api_report.c - the reports through the public API
 * (bootrung/report.h): a study renders the very bytes the internal
 * renderers write for the same run, after the caller's design and chain
 * are gone; forms not offered and studies not run are refused; the file
 * writing is all or nothing; br_error_set fills the record.  The API side
 * is called through the public headers; the internal renderers are the
 * reference. */
#include "bootrung/analysis.h"
#include "bootrung/bootrung.h"
#include "bootrung/export.h"
#include "bootrung/report.h"

#include "analyses/corners.h"
#include "analyses/map.h"
#include "analyses/steady.h"
#include "analyses/window.h"
#include "analyses/yield.h"
#include "model/design.h"
#include "report/charts.h"
#include "report/check_report.h"
#include "report/corners_report.h"
#include "report/map_report.h"
#include "report/results.h"
#include "report/verb_pages.h"
#include "report/window_report.h"
#include "report/yield_report.h"
#include "testkit.h"

#include <gsl/gsl_errno.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

static const char *const leg = "examples/leg-7level.xml";
static const char *const verbs[] = {"", "startup", "steady", "analyze"};

/* The reference: the internal run and renderers, as the command line
 * called them before it was a client of the public API. */
typedef struct reference {
    br_text *text, *xml, *html, *csv, *svg;
} reference;

/* The demo design and the chain built from it (a failure ends the test). */
static void demo_load(br_design **d, br_chain **c, br_error *err)
{
    CU_ASSERT_EQUAL_FATAL(br_design_load("examples/demo-3level.xml", d, err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_chain_build(*d, c, err), BR_OK);
}

static void reference_make(const char *path, int parts, const br_steady_opts *so, reference *ref)
{
    br_design *d = NULL;
    br_chain *c = NULL;
    br_error err;
    br_results *r = br_results_create();
    br_results_traces tr = {0};
    memset(ref, 0, sizeof *ref);
    ref->text = br_text_create(), ref->xml = br_text_create(), ref->html = br_text_create();
    ref->csv = br_text_create(), ref->svg = br_text_create();
    CU_ASSERT_EQUAL_FATAL(br_design_load(path, &d, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_results_run_traced(r, c, verbs[parts], parts, so, ref->csv, &tr, &err),
                          BR_OK);
    CU_ASSERT_EQUAL(br_results_text(r, ref->text, &err), BR_OK);
    CU_ASSERT_EQUAL(br_results_xml(r, br_version(), ref->xml, &err), BR_OK);
    CU_ASSERT_EQUAL(br_results_html(r, &tr, ref->html, &err), BR_OK);
    if (parts != BR_PART_ALL)
        CU_ASSERT_EQUAL(br_results_plot(r, &tr, ref->svg, &err), BR_OK);
    br_results_traces_release(&tr);
    br_results_free(r);
    br_chain_free(c);
    br_design_free(d);
}

static void reference_free(reference *ref)
{
    br_text_free(ref->text), br_text_free(ref->xml), br_text_free(ref->html);
    br_text_free(ref->csv), br_text_free(ref->svg);
}

/* The API's analysis of path, its design and chain freed before it renders. */
static br_analysis *api_run(const char *path, int parts, long limit)
{
    br_design *d = NULL;
    br_chain *c = NULL;
    br_error err;
    br_analysis *a = br_analysis_create();
    CU_ASSERT_EQUAL_FATAL(br_design_load(path, &d, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    CU_ASSERT_EQUAL(br_analysis_set_series(a, 1), BR_OK);
    CU_ASSERT_EQUAL(br_analysis_set_csv(a, 1), BR_OK);
    CU_ASSERT_EQUAL(br_analysis_set_solver_limit(a, limit), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_analysis_run(a, c, parts, &err), BR_OK);
    br_chain_free(c);
    br_design_free(d);
    return a;
}

static void assert_form(const br_analysis *a, int format, const br_text *want)
{
    br_text *got = br_text_create();
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_analysis_render(a, format, got, &err), BR_OK);
    CU_ASSERT_TRUE(br_text_len(got) > 0);
    CU_ASSERT_EQUAL(br_text_len(got), br_text_len(want));
    CU_ASSERT_STRING_EQUAL(br_text_data(got), br_text_data(want));
    br_text_free(got);
}

static void assert_text(const br_design_check *k, int format, const br_text *want)
{
    br_text *got = br_text_create();
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_check_render(k, format, got, &err), BR_OK);
    CU_ASSERT_TRUE(br_text_len(got) > 0);
    CU_ASSERT_STRING_EQUAL(br_text_data(got), br_text_data(want));
    br_text_free(got);
}

static void same_reports(int parts)
{
    reference ref;
    reference_make(leg, parts, NULL, &ref);
    br_analysis *a = api_run(leg, parts, 0);
    assert_form(a, BR_FORMAT_TEXT, ref.text);
    assert_form(a, BR_FORMAT_XML, ref.xml);
    assert_form(a, BR_FORMAT_HTML, ref.html);
    assert_form(a, BR_FORMAT_CSV, ref.csv);
    if (parts != BR_PART_ALL)
        assert_form(a, BR_FORMAT_SVG, ref.svg);
    br_analysis_free(a);
    reference_free(&ref);
}

static void test_startup_reports(void)
{
    same_reports(BR_PART_STARTUP);
}

static void test_steady_reports(void)
{
    same_reports(BR_PART_STEADY);
}

static void test_analyze_reports(void)
{
    same_reports(BR_PART_ALL);
}

/* The solver limit is the command line's --solver-limit: at most n Newton
 * iterations and n plain periods.  With 1 the leg's steady state is not
 * settled: undetermined, as the internal run with those options says. */
static void test_solver_limit(void)
{
    br_steady_opts so;
    br_steady_opts_default(&so);
    so.max_iter = 1;
    so.max_plain = 1;
    reference ref;
    reference_make(leg, BR_PART_STEADY, &so, &ref);
    br_analysis *a = api_run(leg, BR_PART_STEADY, 1);
    assert_form(a, BR_FORMAT_TEXT, ref.text);
    int res = -1;
    CU_ASSERT_EQUAL(br_verdict_result(a, &res), BR_OK);
    CU_ASSERT_EQUAL(res, BR_RESULT_UNDETERMINED);
    CU_ASSERT_EQUAL(br_analysis_set_solver_limit(a, -1), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_analysis_set_solver_limit(a, BR_SOLVER_LIMIT_MAX + 1), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_analysis_set_solver_limit(NULL, 5), BR_EUSAGE);
    br_analysis_free(a);
    reference_free(&ref);
}

/* What cannot be rendered is refused with a reason, never an empty report. */
static void test_render_refused(void)
{
    br_text *t = br_text_create();
    br_error err;
    br_analysis *a = br_analysis_create();
    CU_ASSERT_EQUAL(br_analysis_render(a, BR_FORMAT_TEXT, t, &err), BR_EUSAGE); /* not run */
    CU_ASSERT_EQUAL(br_analysis_render(NULL, BR_FORMAT_TEXT, t, &err), BR_EUSAGE);
    br_analysis_free(a);
    br_design *d = NULL;
    br_chain *c = NULL;
    demo_load(&d, &c, &err);
    a = br_analysis_create(); /* neither series nor CSV kept */
    CU_ASSERT_EQUAL_FATAL(br_analysis_run(a, c, BR_PART_ALL, &err), BR_OK);
    CU_ASSERT_EQUAL(br_analysis_render(a, BR_FORMAT_HTML, t, &err), BR_EUSAGE);
    CU_ASSERT_PTR_NOT_NULL(strstr(err.msg, "br_analysis_set_series"));
    CU_ASSERT_EQUAL(br_analysis_render(a, BR_FORMAT_CSV, t, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_analysis_render(a, BR_FORMAT_SVG, t, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_analysis_render(a, 99, t, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_text_len(t), 0);
    CU_ASSERT_EQUAL(br_analysis_render(a, BR_FORMAT_TEXT, NULL, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_analysis_render(a, BR_FORMAT_TEXT, t, &err), BR_OK);
    CU_ASSERT_PTR_NOT_NULL(strstr(br_text_data(t), "verdict"));
    br_analysis_free(a);
    br_chain_free(c);
    br_design_free(d);
    br_text_free(t);
}

/* The design check: the report and the page check_report and verb_pages
 * render for the same chain, its findings counted; --strict fails a
 * warning.  The demo has warnings and nothing fatal (check-demo-3level.txt). */
static void test_design_check(void)
{
    br_design *d = NULL;
    br_chain *c = NULL;
    br_error err;
    static const char *const verdict[] = {"design rules:", NULL};
    demo_load(&d, &c, &err);
    br_text *text = br_text_create(), *html = br_text_create();
    int nwarn = -1, nfatal = -1;
    CU_ASSERT_EQUAL(br_check_report(c, text, &nwarn, &nfatal, &err), BR_OK);
    CU_ASSERT_EQUAL(br_text_html(c, "design check", BR_OUTCOME_PASS, verdict, 0, text, html, &err),
                    BR_OK);
    br_design_check *k = br_design_check_create();
    br_text *t = br_text_create();
    int findings = -1, fatal = -1, res = -1;
    CU_ASSERT_EQUAL(br_design_check_render(k, BR_FORMAT_TEXT, t, &err), BR_EUSAGE); /* not run */
    CU_ASSERT_EQUAL(br_design_check_counts(k, &findings, &fatal), BR_EUSAGE);
    CU_ASSERT_EQUAL_FATAL(br_design_check_run(k, d, &err), BR_OK);
    br_chain_free(c);
    br_design_free(d); /* the check keeps what its reports need */
    CU_ASSERT_EQUAL(br_design_check_counts(k, &findings, &fatal), BR_OK);
    CU_ASSERT_EQUAL(findings, nwarn);
    CU_ASSERT_EQUAL(fatal, nfatal);
    CU_ASSERT_TRUE(findings > 0);
    CU_ASSERT_EQUAL(fatal, 0);
    CU_ASSERT_EQUAL(br_design_check_result(k, &res), BR_OK);
    CU_ASSERT_EQUAL(res, BR_RESULT_PASS);
    assert_text(k, BR_FORMAT_TEXT, text);
    assert_text(k, BR_FORMAT_HTML, html);
    CU_ASSERT_EQUAL(br_design_check_render(k, BR_FORMAT_XML, t, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_text_len(t), 0);
    CU_ASSERT_EQUAL(br_design_check_set_strict(k, 2), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_design_check_set_strict(k, 1), BR_OK);
    CU_ASSERT_EQUAL(br_design_check_result(k, &res), BR_OK);
    CU_ASSERT_EQUAL(res, BR_RESULT_FAIL); /* a warning fails a strict check */
    CU_ASSERT_EQUAL(br_design_check_run(k, NULL, &err), BR_EUSAGE);
    br_design_check_free(k);
    br_text_free(t), br_text_free(text), br_text_free(html);
}

/* The corners' reports are the internal renderers' for the same search and
 * settings, read after the caller's design is gone: with every start-up
 * integrated period by period the text says so from the design (it read
 * a design the search had let go). */
static void test_corners(void)
{
    static const char *const verdict[] = {"verdict at the worst corners:", NULL};
    br_design *d = NULL;
    br_chain *c = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load("examples/demo-3level.xml", &d, &err), BR_OK);
    CU_ASSERT_EQUAL(br_design_set_startup_method(d, BR_SU_PERIODS), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_corners_opts o;
    br_corners_opts_default(&o);
    o.threads = 1;
    o.max_exhaustive = 2;
    o.solver_limit = 30;
    br_corners *k = NULL;
    CU_ASSERT_EQUAL_FATAL(br_corners_run(d, &o, &k, &err), BR_OK);
    br_text *text = br_text_create(), *xml = br_text_create(), *html = br_text_create();
    CU_ASSERT_EQUAL(br_corners_text(c, k, text), BR_OK);
    CU_ASSERT_EQUAL(br_corners_xml(c, k, br_version(), xml, &err), BR_OK);
    CU_ASSERT_EQUAL(br_text_html(c, "worst-case corners", k->outcome, verdict, 1, text, html, &err),
                    BR_OK);
    br_corner_search *s = br_corner_search_create();
    br_text *t = br_text_create();
    CU_ASSERT_EQUAL(br_corner_search_render(s, BR_FORMAT_TEXT, t, &err), BR_EUSAGE); /* not run */
    CU_ASSERT_EQUAL(br_corner_search_set_threads(s, 1), BR_OK);
    CU_ASSERT_EQUAL(br_corner_search_set_exhaustive(s, 2), BR_OK);
    CU_ASSERT_EQUAL(br_corner_search_set_solver_limit(s, 30), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_corner_search_run(s, d, &err), BR_OK);
    br_chain_free(c);
    br_design_free(d);
    CU_ASSERT_EQUAL(br_corner_search_render(s, BR_FORMAT_TEXT, t, &err), BR_OK);
    CU_ASSERT_STRING_EQUAL(br_text_data(t), br_text_data(text));
    CU_ASSERT_PTR_NOT_NULL(strstr(br_text_data(t), "period"));
    br_text_reset(t);
    CU_ASSERT_EQUAL(br_corner_search_render(s, BR_FORMAT_XML, t, &err), BR_OK);
    CU_ASSERT_STRING_EQUAL(br_text_data(t), br_text_data(xml));
    br_text_reset(t);
    CU_ASSERT_EQUAL(br_corner_search_render(s, BR_FORMAT_HTML, t, &err), BR_OK);
    CU_ASSERT_STRING_EQUAL(br_text_data(t), br_text_data(html));
    br_text_reset(t);
    CU_ASSERT_EQUAL(br_corner_search_render(s, BR_FORMAT_CSV, t, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_text_len(t), 0);
    CU_ASSERT_EQUAL(br_corner_search_set_threads(s, BR_THREADS_MAX + 1), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_corner_search_set_exhaustive(s, BR_CORNERS_EXHAUSTIVE_MAX + 1), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_corner_search_set_solver_limit(s, -1), BR_EUSAGE);
    br_corner_search_free(s);
    br_corners_free(k);
    br_text_free(t), br_text_free(text), br_text_free(xml), br_text_free(html);
}

/* The window's reports are the internal renderers' for the same range;
 * its result is the design point's judgement; a range that does not fit
 * the design is the caller's error. */
static void test_window(void)
{
    br_design *d = NULL;
    br_chain *c = NULL;
    br_error err;
    demo_load(&d, &c, &err);
    br_window_opts o;
    br_window_opts_default(&o);
    o.fmin = 50e3;
    o.fmax = 300e3;
    br_window *w = calloc(1, sizeof *w);
    CU_ASSERT_EQUAL_FATAL(br_window_run(d, &o, w, &err), BR_OK);
    br_text *text = br_text_create(), *xml = br_text_create(), *html = br_text_create();
    br_text *svg = br_text_create(), *t = br_text_create();
    CU_ASSERT_EQUAL(br_window_text(c, w, text, &err), BR_OK);
    CU_ASSERT_EQUAL(br_window_xml(c, w, br_version(), xml, &err), BR_OK);
    CU_ASSERT_EQUAL(br_window_html(c, w, text, html, &err), BR_OK);
    CU_ASSERT_EQUAL(br_chart_window(w, 1, svg), BR_OK);
    br_window_study *s = br_window_study_create();
    CU_ASSERT_EQUAL(br_window_study_set_range(s, -1, 0), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_window_study_set_range(s, NAN, 0), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_window_study_set_range(s, 50e3, 300e3), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_window_study_run(s, d, &err), BR_OK);
    br_chain_free(c);
    br_design_free(d);
    const br_text *want[] = {text, xml, html, NULL, svg};
    for (int f = BR_FORMAT_TEXT; f <= BR_FORMAT_SVG; f++) {
        br_text_reset(t);
        if (!want[f]) {
            CU_ASSERT_EQUAL(br_window_study_render(s, f, t, &err), BR_EUSAGE);
            continue;
        }
        CU_ASSERT_EQUAL(br_window_study_render(s, f, t, &err), BR_OK);
        CU_ASSERT_TRUE(br_text_len(t) > 0);
        CU_ASSERT_STRING_EQUAL(br_text_data(t), br_text_data(want[f]));
    }
    int res = -1;
    CU_ASSERT_EQUAL(br_window_result(s, &res), BR_OK);
    CU_ASSERT_EQUAL(res, isnan(w->design.margin) ? BR_RESULT_UNDETERMINED
                         : w->design.holds       ? BR_RESULT_PASS
                                                 : BR_RESULT_FAIL);
    /* a range above what the dead time allows does not fit the demo */
    CU_ASSERT_EQUAL_FATAL(br_design_load("examples/demo-3level.xml", &d, &err), BR_OK);
    CU_ASSERT_EQUAL(br_window_study_set_range(s, 2e6, 1e3), BR_OK);
    CU_ASSERT_EQUAL(br_window_study_run(s, d, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_window_result(s, &res), BR_EUSAGE);
    br_design_free(d);
    br_window_study_free(s);
    free(w);
    br_text_free(t), br_text_free(text), br_text_free(xml), br_text_free(html), br_text_free(svg);
}

static br_map_study *map_study(const br_design *d, int k, int n, const void *given)
{
    br_error err;
    br_map_study *m = br_map_study_create();
    CU_ASSERT_EQUAL(br_map_study_set_grid(m, 0.2, 0.8, 5, 50e3, 200e3, 4), BR_OK);
    CU_ASSERT_EQUAL(br_map_study_set_threads(m, 3), BR_OK);
    CU_ASSERT_EQUAL(br_map_study_set_shard(m, k, n), BR_OK);
    CU_ASSERT_EQUAL(br_map_study_set_file_names(m, "m.csv", NULL), BR_OK);
    if (given)
        CU_ASSERT_EQUAL(br_map_study_set_given(m, given, br_map_record_size(), 21), BR_OK);
    CU_ASSERT_EQUAL(br_map_study_check(m, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_map_study_run(m, d, &err), BR_OK);
    return m;
}

/* The map's reports are the internal renderers' for the same grid, read
 * after the caller's design is gone; two shards' records pieced together
 * render the unsharded report; a grid out of range is named. */
static void test_map(void)
{
    br_design *d = NULL;
    br_chain *c = NULL;
    br_error err;
    demo_load(&d, &c, &err);
    br_map_opts o = {0.2, 0.8, 5, 50e3, 200e3, 4, 3, NULL, 0, 0, NULL};
    br_map *ref = NULL;
    CU_ASSERT_EQUAL_FATAL(br_map_run(d, &o, &ref, &err), BR_OK);
    br_text *want[5] = {br_text_create(), NULL, br_text_create(), br_text_create(),
                        br_text_create()};
    CU_ASSERT_EQUAL(br_map_text(c, ref, "m.csv", NULL, want[BR_FORMAT_TEXT], &err), BR_OK);
    CU_ASSERT_EQUAL(br_map_html(c, ref, want[BR_FORMAT_TEXT], want[BR_FORMAT_HTML], &err), BR_OK);
    CU_ASSERT_EQUAL(br_map_csv(c, ref, want[BR_FORMAT_CSV], &err), BR_OK);
    CU_ASSERT_EQUAL(br_map_svg(c, ref, want[BR_FORMAT_SVG], &err), BR_OK);
    br_map_study *m = map_study(d, 0, 0, NULL);
    br_map_study *m1 = map_study(d, 1, 2, NULL), *m2 = map_study(d, 2, 2, NULL);
    size_t size = br_map_record_size();
    const void *r1 = NULL, *r2 = NULL;
    long n1 = 0, n2 = 0;
    CU_ASSERT_EQUAL(br_map_records(m1, &r1, &n1), BR_OK);
    CU_ASSERT_EQUAL(br_map_records(m2, &r2, &n2), BR_OK);
    CU_ASSERT_EQUAL_FATAL(n1, 21);
    CU_ASSERT_EQUAL_FATAL(n2, 21);
    unsigned char *all = calloc(21, size);
    for (long k = 0; k < 21; k++) {
        int in1 = -1, in2 = -1;
        CU_ASSERT_EQUAL(br_map_study_judges(m1, k, &in1), BR_OK);
        CU_ASSERT_EQUAL(br_map_study_judges(m2, k, &in2), BR_OK);
        CU_ASSERT_TRUE(in1 || in2); /* every point judged somewhere */
        memcpy(all + k * size, (const unsigned char *)(in1 ? r1 : r2) + k * size, size);
    }
    br_map_study *merged = map_study(d, 0, 0, all);
    br_chain_free(c);
    br_design_free(d);
    br_text *t = br_text_create();
    for (int f = BR_FORMAT_TEXT; f <= BR_FORMAT_SVG; f++) {
        br_text_reset(t);
        if (!want[f]) {
            CU_ASSERT_EQUAL(br_map_study_render(m, f, t, &err), BR_EUSAGE);
            continue;
        }
        CU_ASSERT_EQUAL(br_map_study_render(m, f, t, &err), BR_OK);
        CU_ASSERT_TRUE(br_text_len(t) > 0);
        CU_ASSERT_STRING_EQUAL(br_text_data(t), br_text_data(want[f]));
    }
    br_text_reset(t);
    CU_ASSERT_EQUAL(br_map_study_render(merged, BR_FORMAT_TEXT, t, &err), BR_OK);
    CU_ASSERT_STRING_EQUAL(br_text_data(t), br_text_data(want[BR_FORMAT_TEXT]));
    int res = -1;
    CU_ASSERT_EQUAL(br_map_result(m, &res), BR_OK);
    CU_ASSERT_EQUAL(res, isnan(ref->design.margin) ? BR_RESULT_UNDETERMINED
                         : ref->design.holds       ? BR_RESULT_PASS
                                                   : BR_RESULT_FAIL);
    CU_ASSERT_EQUAL(br_map_study_render(m1, BR_FORMAT_TEXT, t, &err), BR_EUSAGE); /* a shard */
    CU_ASSERT_EQUAL(br_map_study_set_given(m, all, size, 20), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_map_study_set_threads(m, BR_MAP_THREADS_MAX + 1), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_map_study_set_grid(m, 0.2, 0.8, BR_MAP_POINTS_MAX + 1, 50e3, 200e3, 4),
                    BR_OK);
    CU_ASSERT_NOT_EQUAL(br_map_study_check(m, &err), BR_OK);
    CU_ASSERT_STRING_EQUAL(err.field, "duty");
    br_map_study_free(m), br_map_study_free(m1), br_map_study_free(m2);
    br_map_study_free(merged);
    br_map_free(ref);
    free(all);
    for (int f = 0; f < 5; f++)
        br_text_free(want[f]);
    br_text_free(t);
}

static br_yield_study *yield_study(const br_design *d, int k, int n, const void *given)
{
    br_error err;
    br_yield_study *s = br_yield_study_create();
    CU_ASSERT_EQUAL(br_yield_study_set_samples(s, 120, 3), BR_OK);
    CU_ASSERT_EQUAL(br_yield_study_set_threads(s, 2), BR_OK);
    CU_ASSERT_EQUAL(br_yield_study_set_min_yield(s, 0.5), BR_OK);
    CU_ASSERT_EQUAL(br_yield_study_set_shard(s, k, n), BR_OK);
    if (given)
        CU_ASSERT_EQUAL(br_yield_study_set_given(s, given, br_yield_record_size(), 120), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_yield_study_run(s, d, &err), BR_OK);
    return s;
}

/* The yield's reports are the internal renderers' for the same samples and
 * minimum yield, read after the caller's design is gone; two shards'
 * records pieced together and given back render the unsharded report. */
static void test_yield(void)
{
    br_design *d = NULL;
    br_chain *c = NULL;
    br_error err;
    demo_load(&d, &c, &err);
    br_yield_opts o;
    br_yield_opts_default(&o);
    CU_ASSERT_EQUAL(o.samples, BR_YIELD_DEFAULT_SAMPLES);
    CU_ASSERT_EQUAL(o.seed, BR_YIELD_DEFAULT_SEED);
    o.samples = 120;
    o.seed = 3;
    br_yield *y = NULL;
    CU_ASSERT_EQUAL_FATAL(br_yield_run(d, &o, &y, &err), BR_OK);
    br_text *want[5];
    for (int f = 0; f < 5; f++)
        want[f] = br_text_create();
    CU_ASSERT_EQUAL(br_yield_text(c, y, 0.5, want[BR_FORMAT_TEXT]), BR_OK);
    CU_ASSERT_EQUAL(br_yield_xml(c, y, 0.5, br_version(), want[BR_FORMAT_XML], &err), BR_OK);
    CU_ASSERT_EQUAL(br_yield_html(c, y, 0.5, want[BR_FORMAT_TEXT], want[BR_FORMAT_HTML], &err),
                    BR_OK);
    CU_ASSERT_EQUAL(br_yield_csv(y, want[BR_FORMAT_CSV]), BR_OK);
    CU_ASSERT_EQUAL(br_chart_yield(y, 1, want[BR_FORMAT_SVG]), BR_OK);
    br_yield_study *s = yield_study(d, 0, 0, NULL);
    br_yield_study *s1 = yield_study(d, 1, 2, NULL), *s2 = yield_study(d, 2, 2, NULL);
    size_t size = br_yield_record_size();
    const void *r1 = NULL, *r2 = NULL;
    long n1 = 0, n2 = 0;
    CU_ASSERT_EQUAL(br_yield_records(s1, &r1, &n1), BR_OK);
    CU_ASSERT_EQUAL(br_yield_records(s2, &r2, &n2), BR_OK);
    CU_ASSERT_EQUAL_FATAL(n1, 120);
    CU_ASSERT_EQUAL_FATAL(n2, 120);
    unsigned char *all = calloc(120, size);
    for (long i = 0; i < 120; i++) {
        int in1 = -1, in2 = -1;
        CU_ASSERT_EQUAL(br_yield_study_judges(s1, i, &in1), BR_OK);
        CU_ASSERT_EQUAL(br_yield_study_judges(s2, i, &in2), BR_OK);
        CU_ASSERT_EQUAL(in1 + in2, 1); /* every sample in one shard */
        memcpy(all + i * size, (const unsigned char *)(in1 ? r1 : r2) + i * size, size);
    }
    br_yield_study *merged = yield_study(d, 0, 0, all);
    br_chain_free(c);
    br_design_free(d);
    br_text *t = br_text_create();
    for (int f = BR_FORMAT_TEXT; f <= BR_FORMAT_SVG; f++) {
        br_text_reset(t);
        CU_ASSERT_EQUAL(br_yield_study_render(s, f, t, &err), BR_OK);
        CU_ASSERT_TRUE(br_text_len(t) > 0);
        CU_ASSERT_STRING_EQUAL(br_text_data(t), br_text_data(want[f]));
    }
    br_text_reset(t);
    CU_ASSERT_EQUAL(br_yield_study_render(merged, BR_FORMAT_TEXT, t, &err), BR_OK);
    CU_ASSERT_STRING_EQUAL(br_text_data(t), br_text_data(want[BR_FORMAT_TEXT]));
    int res = -1;
    CU_ASSERT_EQUAL(br_yield_result(s, &res), BR_OK);
    int outcome = br_yield_outcome(y, 0.5);
    CU_ASSERT_EQUAL(res, outcome == BR_OUTCOME_FAIL           ? BR_RESULT_FAIL
                         : outcome == BR_OUTCOME_UNDETERMINED ? BR_RESULT_UNDETERMINED
                                                              : BR_RESULT_PASS);
    /* a shard takes no statistics: no report */
    CU_ASSERT_EQUAL(br_yield_study_render(s1, BR_FORMAT_TEXT, t, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_yield_study_set_given(s, all, size + 1, 120), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_yield_study_set_given(s, all, size, 119), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_yield_study_set_shard(s, 3, 2), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_yield_study_set_min_yield(s, 1.5), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_yield_study_set_threads(s, BR_THREADS_MAX + 1), BR_EUSAGE);
    br_yield_study_free(s), br_yield_study_free(s1), br_yield_study_free(s2);
    br_yield_study_free(merged);
    free(all);
    br_yield_free(y);
    for (int f = 0; f < 5; f++)
        br_text_free(want[f]);
    br_text_free(t);
}

/* With the start-up judged and every start-up integrated period by period,
 * the yield's text says so from the design (it read a design the study
 * had let go). */
static void test_yield_startup(void)
{
    br_design *d = NULL;
    br_chain *c = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load("examples/demo-3level.xml", &d, &err), BR_OK);
    CU_ASSERT_EQUAL(br_design_set_startup_method(d, BR_SU_PERIODS), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_yield_opts o;
    br_yield_opts_default(&o);
    o.samples = 6;
    o.startup = 1;
    br_yield *y = NULL;
    CU_ASSERT_EQUAL_FATAL(br_yield_run(d, &o, &y, &err), BR_OK);
    br_text *want = br_text_create(), *t = br_text_create();
    CU_ASSERT_EQUAL(br_yield_text(c, y, BR_MIN_YIELD_NONE, want), BR_OK);
    br_yield_study *s = br_yield_study_create();
    CU_ASSERT_EQUAL(br_yield_study_set_samples(s, 6, BR_YIELD_DEFAULT_SEED), BR_OK);
    CU_ASSERT_EQUAL(br_yield_study_set_startup(s, 1), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_yield_study_run(s, d, &err), BR_OK);
    br_chain_free(c);
    br_design_free(d);
    CU_ASSERT_EQUAL(br_yield_study_render(s, BR_FORMAT_TEXT, t, &err), BR_OK);
    CU_ASSERT_STRING_EQUAL(br_text_data(t), br_text_data(want));
    br_yield_study_free(s);
    br_yield_free(y);
    br_text_free(want), br_text_free(t);
}

/* What the pack needs of the chain; the pack's combined status; the hash
 * its SHA256SUMS lists. */
static void test_pack_helpers(void)
{
    br_design *d = NULL;
    br_chain *c = NULL;
    br_error err;
    demo_load(&d, &c, &err);
    CU_ASSERT_DOUBLE_EQUAL(br_chain_frequency(c), 100e3, 1e-6); /* the demo's 100 kHz */
    CU_ASSERT_EQUAL(br_chain_line_cycle(c), 0);
    br_chain_free(c);
    br_design_free(d);
    CU_ASSERT_EQUAL_FATAL(br_design_load("tests/data/line-3level.xml", &d, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    CU_ASSERT_EQUAL(br_chain_line_cycle(c), 1);
    br_chain_free(c);
    br_design_free(d);
    CU_ASSERT_TRUE(isnan(br_chain_frequency(NULL)));
    CU_ASSERT_EQUAL(br_chain_line_cycle(NULL), 0);
    /* NIST FIPS 180-2, Secure Hash Standard, appendix B.1: SHA-256("abc") */
    char hex[65];
    br_sha256_hex("abc", 3, hex);
    CU_ASSERT_STRING_EQUAL(hex, "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
    br_pack *p = calloc(1, sizeof *p);
    p->nstep = 3;
    p->step[0].status = 0;
    p->step[1].status = 3;
    p->step[2].status = -1; /* not run: counts for nothing */
    CU_ASSERT_EQUAL(br_pack_status(p), 3);
    p->step[2].status = 1;
    CU_ASSERT_EQUAL(br_pack_status(p), 1);
    free(p);
}

static void test_error_set(void)
{
    br_error err;
    br_error_clear(&err);
    CU_ASSERT_EQUAL(br_error_set(&err, BR_EINPUT, "a.xml", 7, "capacitor[c1]/esr", "got %d", 3),
                    BR_EINPUT);
    CU_ASSERT_EQUAL(err.code, BR_EINPUT);
    CU_ASSERT_STRING_EQUAL(err.file, "a.xml");
    CU_ASSERT_EQUAL(err.line, 7);
    CU_ASSERT_STRING_EQUAL(err.field, "capacitor[c1]/esr");
    CU_ASSERT_STRING_EQUAL(err.msg, "got 3");
    CU_ASSERT_EQUAL(br_error_set(NULL, BR_EIO, NULL, 0, NULL, "x"), BR_EIO);
}

/* All or nothing: a staged file is not there until committed; a discarded
 * one leaves nothing; a save where it cannot be written is BR_EIO naming
 * the path and leaves the directory as it was. */
static void test_files(void)
{
    char dir[] = "/tmp/br_api_reportXXXXXX", path[256], other[256];
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(dir));
    snprintf(path, sizeof path, "%s/a.txt", dir);
    snprintf(other, sizeof other, "%s/b.txt", dir);
    br_text *t = br_text_create();
    br_text_put(t, "rails\n");
    br_error err;
    br_staged s, s2;
    CU_ASSERT_EQUAL_FATAL(br_text_stage(t, path, &s, &err), BR_OK);
    CU_ASSERT_EQUAL(access(path, F_OK), -1);
    CU_ASSERT_EQUAL(br_text_stage(t, other, &s2, &err), BR_OK);
    br_staged_discard(&s2);
    CU_ASSERT_EQUAL(br_staged_commit(&s, &err), BR_OK);
    size_t len = 0;
    char *back = br_test_slurp(path, &len);
    CU_ASSERT_PTR_NOT_NULL_FATAL(back);
    CU_ASSERT_STRING_EQUAL(back, "rails\n");
    free(back);
    CU_ASSERT_EQUAL(access(other, F_OK), -1);
    br_text_put(t, "more\n");
    CU_ASSERT_EQUAL(br_text_save(t, path, &err), BR_OK);
    back = br_test_slurp(path, &len);
    CU_ASSERT_EQUAL(len, 11);
    free(back);
    char bad[300];
    snprintf(bad, sizeof bad, "%s/no/such/dir.txt", dir);
    CU_ASSERT_EQUAL(br_text_save(t, bad, &err), BR_EIO);
    CU_ASSERT_PTR_NOT_NULL(strstr(err.file[0] ? err.file : err.msg, "no/such"));
    remove(path);
    CU_ASSERT_EQUAL(rmdir(dir), 0); /* nothing else was left in it */
    br_text_free(t);
}

int main(void)
{
    gsl_set_error_handler_off();
    static const br_test_case cases[] = {
        {"startup: text, XML, HTML, CSV, SVG as the internal renderers", test_startup_reports},
        {"steady: the same", test_steady_reports},
        {"analyze: the same", test_analyze_reports},
        {"the solver limit", test_solver_limit},
        {"forms refused", test_render_refused},
        {"the design check", test_design_check},
        {"the worst-case corners", test_corners},
        {"the window", test_window},
        {"the yield, shards merged", test_yield},
        {"the map, shards merged", test_map},
        {"the yield with every start-up integrated", test_yield_startup},
        {"what the pack needs", test_pack_helpers},
        {"br_error_set", test_error_set},
        {"files all or nothing", test_files},
        {NULL, NULL},
    };
    return br_test_main("api report", cases);
}

/* test_api_explore.c - the exploration through the public API
 * (bootrung/parts.h) is the internal one, combination for combination;
 * its report, CSV, SVG and front design files are the ones the internal
 * renderers write, byte for byte, after the template and catalog are
 * gone; two shards merged give the whole run's report; a stop is obeyed;
 * bad arguments are refused.  The 7-level leg with the example switch
 * catalog, 5 to 7 levels at 60 kHz (well under a second); sizing from the
 * example parts catalog with a yield, on 3 levels at 300 V; the split
 * design of 9 levels at 1.1 kV. */
#include "bootrung/bootrung.h"
#include "bootrung/parts.h"

#include "analyses/explore.h"
#include "io/design_write.h"
#include "report/explore_report.h"
#include "testkit.h"

#include <gsl/gsl_errno.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

static const char *const leg = "examples/leg-7level.xml";
static const char *const switches = "examples/parts/switches.xml";
static const char *const parts = "examples/parts/catalog.xml";

/* The inputs: template, catalog, a study set up as the internal options. */
typedef struct setup {
    br_design *t;
    br_catalog *cat;
    br_explore_opts o;
} setup;

static void setup_make(setup *s)
{
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(leg, &s->t, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_catalog_load(switches, &s->cat, &err), BR_OK);
    br_explore_opts_default(&s->o);
    s->o.cat = s->cat;
    s->o.vbus = s->o.vbus_max = 1100;
    s->o.lmin = 5;
    s->o.lmax = 7;
    s->o.nfsw = 1;
    s->o.fsw[0] = 60e3;
}

static br_explore_study *study_make(void)
{
    static const double fsw[] = {60e3};
    br_explore_study *x = br_explore_study_create();
    CU_ASSERT_EQUAL(br_explore_study_set_bus(x, 1100, 1100), BR_OK);
    CU_ASSERT_EQUAL(br_explore_study_set_levels(x, 5, 7), BR_OK);
    CU_ASSERT_EQUAL(br_explore_study_set_frequencies(x, fsw, 1), BR_OK);
    return x;
}

static void check_rows(const br_explore_study *x, const br_explore *ref)
{
    int n = -1;
    CU_ASSERT_EQUAL(br_explore_combinations(x, &n), BR_OK);
    CU_ASSERT_EQUAL_FATAL(n, ref->n);
    for (int i = 0; i < n; i++) {
        const br_explore_row *r = &ref->rows[i];
        double v;
        const char *note = NULL;
        CU_ASSERT_EQUAL(br_explore_value(x, i, BR_XV_LEVELS, &v), BR_OK);
        CU_ASSERT_EQUAL(v, r->levels);
        CU_ASSERT_EQUAL(br_explore_value(x, i, BR_XV_STATE, &v), BR_OK);
        CU_ASSERT_EQUAL(v, r->state);
        CU_ASSERT_EQUAL(br_explore_value(x, i, BR_XV_MARGIN, &v), BR_OK);
        CU_ASSERT_TRUE((isnan(v) && isnan(r->margin)) || v == r->margin);
        CU_ASSERT_EQUAL(br_explore_value(x, i, BR_XV_RANK, &v), BR_OK);
        CU_ASSERT_EQUAL(v, r->rank);
        CU_ASSERT_EQUAL(br_explore_value(x, i, BR_XV_FRONT, &v), BR_OK);
        CU_ASSERT_EQUAL(v, r->front);
        CU_ASSERT_EQUAL(br_explore_note(x, i, &note), BR_OK);
        CU_ASSERT_STRING_EQUAL(note, r->note);
    }
}

static void check_render(const br_explore_study *x, int format, const br_text *want)
{
    br_error err;
    br_text *t = br_text_create();
    CU_ASSERT_EQUAL_FATAL(br_explore_study_render(x, format, t, &err), BR_OK);
    CU_ASSERT_STRING_EQUAL(br_text_data(t), br_text_data(want));
    br_text_free(t);
}

/* The first front member's design file, as `explore --designs` wrote it
 * before it was a client of the public API. */
static void check_design_file(const br_explore_study *x, const setup *s, const br_explore *ref)
{
    br_error err;
    int i = 0;
    while (i < ref->n && !ref->rows[i].front)
        i++;
    CU_ASSERT_TRUE_FATAL(i < ref->n); /* the leg at 1.1 kV has a feasible combination */
    br_design *d = NULL;
    br_text *comment = br_text_create(), *want = br_text_create(), *got = br_text_create();
    CU_ASSERT_EQUAL_FATAL(br_explore_design(s->t, &s->o, &ref->rows[i], &d, &err), BR_OK);
    CU_ASSERT_EQUAL(br_explore_comment(ref, s->cat, &ref->rows[i], leg, comment), BR_OK);
    CU_ASSERT_EQUAL(br_design_write(d, br_text_data(comment), want, &err), BR_OK);
    CU_ASSERT_EQUAL(br_explore_design_file(x, i, got, &err), BR_OK);
    CU_ASSERT_STRING_EQUAL(br_text_data(got), br_text_data(want));
    br_design_free(d);
    br_text_free(comment);
    br_text_free(want);
    br_text_free(got);
}

static void test_same_rows_and_reports(void)
{
    setup s;
    setup_make(&s);
    br_error err;
    br_explore *ref = NULL;
    CU_ASSERT_EQUAL_FATAL(br_explore_run(s.t, &s.o, &ref, &err), BR_OK);
    br_text *text = br_text_create(), *csv = br_text_create(), *svg = br_text_create();
    CU_ASSERT_EQUAL(br_explore_text(ref, s.cat, leg, text), BR_OK);
    CU_ASSERT_EQUAL(br_explore_csv(ref, s.cat, csv), BR_OK);
    CU_ASSERT_EQUAL(br_explore_svg(ref, svg), BR_OK);
    br_explore_study *x = study_make();
    br_design *t = NULL;
    br_catalog *cat = NULL;
    CU_ASSERT_EQUAL_FATAL(br_design_load(leg, &t, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_catalog_load(switches, &cat, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_explore_study_run(x, t, cat, &err), BR_OK);
    br_design_free(t); /* the study outlives its inputs */
    br_catalog_free(cat);
    check_rows(x, ref);
    int res = -1;
    CU_ASSERT_EQUAL(br_explore_result(x, &res), BR_OK);
    CU_ASSERT_EQUAL(res, br_explore_outcome(ref) == BR_OUTCOME_PASS   ? BR_RESULT_PASS
                         : br_explore_outcome(ref) == BR_OUTCOME_FAIL ? BR_RESULT_FAIL
                                                                      : BR_RESULT_UNDETERMINED);
    check_render(x, BR_FORMAT_TEXT, text);
    check_render(x, BR_FORMAT_CSV, csv);
    check_render(x, BR_FORMAT_SVG, svg);
    check_design_file(x, &s, ref);
    br_explore_study_free(x);
    br_explore_free(ref);
    br_text_free(text);
    br_text_free(csv);
    br_text_free(svg);
    br_design_free(s.t);
    br_catalog_free(s.cat);
}

/* Shard k of 2: its records, the ones it judged copied into all. */
static void shard_into(const setup *s, int k, br_explore_row *all, long *n)
{
    br_error err;
    br_explore_study *x = study_make();
    CU_ASSERT_EQUAL(br_explore_study_set_shard(x, k, 2), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_explore_study_run(x, s->t, s->cat, &err), BR_OK);
    br_text *t = br_text_create();
    CU_ASSERT_EQUAL(br_explore_study_render(x, BR_FORMAT_TEXT, t, &err), BR_EUSAGE); /* a shard */
    const void *rec = NULL;
    size_t size = 0;
    CU_ASSERT_EQUAL_FATAL(br_explore_records(x, &rec, &size, n), BR_OK);
    CU_ASSERT_EQUAL_FATAL(size, br_explore_record_size());
    for (long i = 0; i < *n; i++) {
        int mine = -1;
        CU_ASSERT_EQUAL(br_explore_judged(x, (int)i, &mine), BR_OK);
        CU_ASSERT_EQUAL(mine, i % 2 == k - 1);
        if (mine)
            memcpy(&all[i], (const char *)rec + i * size, size);
    }
    br_text_free(t);
    br_explore_study_free(x);
}

static void test_shards_merged(void)
{
    setup s;
    setup_make(&s);
    br_error err;
    br_explore_row all[64];
    long n1 = 0, n2 = 0;
    shard_into(&s, 1, all, &n1);
    shard_into(&s, 2, all, &n2);
    CU_ASSERT_EQUAL_FATAL(n1, n2);
    CU_ASSERT_TRUE_FATAL(n1 > 1 && n1 <= 64);
    br_explore *ref = NULL;
    CU_ASSERT_EQUAL_FATAL(br_explore_run(s.t, &s.o, &ref, &err), BR_OK);
    br_text *text = br_text_create();
    CU_ASSERT_EQUAL(br_explore_text(ref, s.cat, leg, text), BR_OK);
    br_explore_study *x = study_make();
    CU_ASSERT_EQUAL(br_explore_study_set_given(x, all, n1, sizeof all[0] + 1), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_explore_study_set_given(x, all, n1, sizeof all[0]), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_explore_study_run(x, s.t, s.cat, &err), BR_OK);
    check_render(x, BR_FORMAT_TEXT, text);
    br_explore_study_free(x);
    br_explore_free(ref);
    br_text_free(text);
    br_design_free(s.t);
    br_catalog_free(s.cat);
}

/* --parts, --yield 2 --seed 3, --threads 1 as explore's options: 3 levels
 * at 300 V and 60 kHz, sized from the parts catalog (freed before the
 * run: the study keeps a copy), the feasible design (one: the others cost
 * more than 15 once sized) sampled twice.  The
 * rows, with their sized capacitors and yields, the reports and the
 * front's (sized) design file are the internal run's. */
static void test_parts_yield_threads(void)
{
    setup s;
    setup_make(&s);
    br_error err;
    br_catalog *pc = NULL;
    CU_ASSERT_EQUAL_FATAL(br_catalog_load(parts, &pc, &err), BR_OK);
    s.o.vbus = s.o.vbus_max = 300;
    s.o.lmin = s.o.lmax = 3;
    s.o.parts = pc;
    s.o.yield_samples = 2;
    s.o.seed = 3;
    s.o.max_cost = 15;
    br_explore *ref = NULL;
    CU_ASSERT_EQUAL_FATAL(br_explore_run(s.t, &s.o, &ref, &err), BR_OK);
    br_text *text = br_text_create(), *csv = br_text_create();
    CU_ASSERT_EQUAL(br_explore_text(ref, s.cat, leg, text), BR_OK);
    CU_ASSERT_EQUAL(br_explore_csv(ref, s.cat, csv), BR_OK);
    br_explore_study *x = br_explore_study_create();
    CU_ASSERT_EQUAL(br_explore_study_set_bus(x, 300, 300), BR_OK);
    CU_ASSERT_EQUAL(br_explore_study_set_levels(x, 3, 3), BR_OK);
    CU_ASSERT_EQUAL(br_explore_study_set_frequencies(x, s.o.fsw, 1), BR_OK);
    CU_ASSERT_EQUAL(br_explore_study_set_threads(x, 1), BR_OK);
    CU_ASSERT_EQUAL(br_explore_study_set_yield(x, 2, 3), BR_OK);
    CU_ASSERT_EQUAL(br_explore_study_set(x, BR_EXPLORE_MAX_COST, 15), BR_OK);
    br_catalog *copy = NULL;
    CU_ASSERT_EQUAL_FATAL(br_catalog_load(parts, &copy, &err), BR_OK);
    CU_ASSERT_EQUAL(br_explore_study_set_parts(x, copy), BR_OK);
    br_catalog_free(copy);
    CU_ASSERT_EQUAL_FATAL(br_explore_study_run(x, s.t, s.cat, &err), BR_OK);
    check_rows(x, ref);
    const void *rec = NULL;
    size_t size = 0;
    long n = 0;
    CU_ASSERT_EQUAL_FATAL(br_explore_records(x, &rec, &size, &n), BR_OK);
    int sampled = 0;
    for (long i = 0; i < n; i++) {
        const br_explore_row *got = (const br_explore_row *)rec + i, *want = &ref->rows[i];
        CU_ASSERT_EQUAL(memcmp(got->cap, want->cap, sizeof got->cap), 0);
        CU_ASSERT_EQUAL(got->ysamples, want->ysamples);
        CU_ASSERT_TRUE((isnan(got->yield) && isnan(want->yield)) || got->yield == want->yield);
        sampled += got->ysamples == 2;
    }
    CU_ASSERT_TRUE(sampled > 0); /* the sizing and the yield did run */
    CU_ASSERT_PTR_NOT_NULL(strstr(br_text_data(text), "sized parts of the front"));
    check_render(x, BR_FORMAT_TEXT, text);
    check_render(x, BR_FORMAT_CSV, csv);
    check_design_file(x, &s, ref);
    br_explore_study_free(x);
    br_explore_free(ref);
    br_text_free(text);
    br_text_free(csv);
    br_catalog_free(pc);
    br_design_free(s.t);
    br_catalog_free(s.cat);
}

/* 9 levels at 1.1 kV: a class whose rails from rail 8 up fall short is
 * judged split; its injection rail and split design file are the
 * internal run's, and a combination without one has no split file. */
static void test_split_file(void)
{
    setup s;
    setup_make(&s);
    br_error err;
    s.o.lmin = s.o.lmax = 9;
    br_explore *ref = NULL;
    CU_ASSERT_EQUAL_FATAL(br_explore_run(s.t, &s.o, &ref, &err), BR_OK);
    br_explore_study *x = study_make();
    CU_ASSERT_EQUAL(br_explore_study_set_levels(x, 9, 9), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_explore_study_run(x, s.t, s.cat, &err), BR_OK);
    int nsplit = 0;
    for (int i = 0; i < ref->n; i++) {
        const br_explore_row *r = &ref->rows[i];
        int judged = r->state == BR_EX_SPLIT && r->inject_rail > 0;
        double v = -1;
        CU_ASSERT_EQUAL(br_explore_value(x, i, BR_XV_INJECT_RAIL, &v), BR_OK);
        CU_ASSERT_EQUAL(v, judged ? r->inject_rail : 0);
        br_text *got = br_text_create();
        if (!judged) {
            CU_ASSERT_EQUAL(br_explore_split_file(x, i, got, &err), BR_EUSAGE);
            br_text_free(got);
            continue;
        }
        nsplit++;
        br_design *d = NULL, *sd = NULL;
        br_text *comment = br_text_create(), *want = br_text_create();
        CU_ASSERT_EQUAL_FATAL(br_explore_design(s.t, &s.o, r, &d, &err), BR_OK);
        const br_inject_spec *m = r->module >= 0 ? &ref->modules->modules[r->module] : NULL;
        CU_ASSERT_EQUAL_FATAL(br_explore_split_design(d, r->inject_rail, m, &sd, &err), BR_OK);
        CU_ASSERT_EQUAL(br_explore_split_comment(ref, s.cat, r, leg, comment), BR_OK);
        CU_ASSERT_EQUAL(br_design_write(sd, br_text_data(comment), want, &err), BR_OK);
        CU_ASSERT_EQUAL(br_explore_split_file(x, i, got, &err), BR_OK);
        CU_ASSERT_STRING_EQUAL(br_text_data(got), br_text_data(want));
        CU_ASSERT_PTR_NOT_NULL(strstr(br_text_data(got), "<injection rail="));
        br_design_free(d);
        br_design_free(sd);
        br_text_free(comment);
        br_text_free(want);
        br_text_free(got);
    }
    CU_ASSERT_TRUE(nsplit > 0); /* test_cli_explore: the 400 V class at 9 levels */
    br_explore_study_free(x);
    br_explore_free(ref);
    br_design_free(s.t);
    br_catalog_free(s.cat);
}

static int stop_now(void *ctx)
{
    (*(int *)ctx)++;
    return 1;
}

static void test_cancel_and_bad_arguments(void)
{
    setup s;
    setup_make(&s);
    br_error err;
    int polls = 0, n;
    double v;
    br_explore_study *x = study_make();
    br_text *t = br_text_create();
    CU_ASSERT_EQUAL(br_explore_study_render(x, BR_FORMAT_TEXT, t, &err), BR_EUSAGE); /* not run */
    CU_ASSERT_EQUAL(br_explore_study_set_progress(x, NULL, stop_now, &polls), BR_OK);
    CU_ASSERT_EQUAL(br_explore_study_run(x, s.t, s.cat, &err), BR_ECANCEL);
    CU_ASSERT_TRUE(polls > 0);
    CU_ASSERT_EQUAL(br_explore_combinations(x, &n), BR_EUSAGE); /* no results */
    CU_ASSERT_EQUAL(br_explore_study_run(x, s.t, NULL, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_explore_study_set_bus(x, 0, 100), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_explore_study_set_bus(x, 200, 100), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_explore_study_set_levels(x, 1, 5), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_explore_study_set_levels(x, 5, BR_EXPLORE_LEVELS_MAX + 1), BR_EUSAGE);
    double f[BR_EXPLORE_FSW_MAX + 1] = {0};
    CU_ASSERT_EQUAL(br_explore_study_set_frequencies(x, f, 1), BR_EUSAGE); /* 0 Hz */
    CU_ASSERT_EQUAL(br_explore_study_set_frequencies(x, f, BR_EXPLORE_FSW_MAX + 1), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_explore_study_set(x, BR_EXPLORE_DERATING, 0), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_explore_study_set(x, BR_EXPLORE_DERATING, 1.5), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_explore_study_set(x, BR_EXPLORE_TARGET, -1), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_explore_study_set(x, BR_EXPLORE_LIMIT_COUNT, 1), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_explore_study_set(x, BR_EXPLORE_MAX_COST, NAN), BR_OK);
    CU_ASSERT_EQUAL(br_explore_study_set_shard(x, 3, 2), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_explore_study_set_corners(x, 2), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_explore_study_set_threads(x, -1), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_explore_study_set_threads(x, BR_STUDY_THREADS_MAX + 1), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_explore_study_set_yield(x, -1, 1), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_explore_study_set_yield(x, BR_EXPLORE_YIELD_MAX + 1, 1), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_explore_study_set_yield(x, 0, 0xffffffffUL), BR_OK);
    CU_ASSERT_EQUAL(br_explore_study_set_yield(NULL, 1, 1), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_explore_study_set_parts(NULL, s.cat), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_explore_study_set_parts(x, NULL), BR_OK); /* no sizing */
    CU_ASSERT_EQUAL(br_explore_split_file(x, 0, t, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_explore_value(x, 0, BR_XV_RANK, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_explore_design_file(x, 0, t, &err), BR_EUSAGE);
    br_explore_study_free(x);
    br_explore_study_free(NULL);
    br_text_free(t);
    br_design_free(s.t);
    br_catalog_free(s.cat);
}

int main(void)
{
    gsl_set_error_handler_off();
    static const br_test_case cases[] = {
        {"the combinations and reports of the internal run", test_same_rows_and_reports},
        {"two shards merged give the whole run", test_shards_merged},
        {"sizing from a parts catalog, a yield, one thread: the internal run",
         test_parts_yield_threads},
        {"the split design's file is the internal one", test_split_file},
        {"a stop poll stops it; bad arguments are refused", test_cancel_and_bad_arguments},
        {NULL, NULL}};
    return br_test_main("api_explore", cases);
}

/* test_api_analysis.c - the public analysis API (bootrung/analysis.h)
 * hands out the very figures the internal analyses compute: the same
 * numbers, bit for bit, on the shipped examples; a stop is obeyed; bad
 * arguments are refused.  The API side is called through the public
 * headers only; the internal br_results run is the reference. */
#include "bootrung/analysis.h"
#include "bootrung/bootrung.h"

#include "analyses/holdup.h"
#include "model/chain.h"
#include "model/design.h"
#include "report/results.h"
#include "testkit.h"

#include <gsl/gsl_errno.h>
#include <stdlib.h>
#include <string.h>

static const char *const designs[] = {"examples/demo-3level.xml", "examples/leg-7level.xml"};

/* Equal as numbers, NaN equal to NaN (a figure that does not apply). */
static int same(double a, double b)
{
    return (isnan(a) && isnan(b)) || a == b;
}

#define ASSERT_SAME(a, b) CU_ASSERT_TRUE_FATAL_OR(same((a), (b)), (a), (b))

typedef struct pair {
    br_design *d;
    br_chain *c;
    br_analysis *a;       /* the API's */
    br_results *r;        /* the reference */
    br_results_traces tr; /* the reference's series */
} pair;

static void pair_open(pair *p, const char *path, int parts)
{
    br_error err;
    memset(p, 0, sizeof *p);
    CU_ASSERT_EQUAL_FATAL(br_design_load(path, &p->d, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_chain_build(p->d, &p->c, &err), BR_OK);
    p->a = br_analysis_create();
    p->r = br_results_create();
    CU_ASSERT_PTR_NOT_NULL_FATAL(p->a);
    CU_ASSERT_EQUAL(br_analysis_set_series(p->a, 1), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_analysis_run(p->a, p->c, parts, &err), BR_OK);
    static const char *const verbs[] = {"", "startup", "steady", "analyze"};
    CU_ASSERT_EQUAL_FATAL(
        br_results_run_traced(p->r, p->c, verbs[parts], parts, NULL, NULL, &p->tr, &err), BR_OK);
}

static void pair_close(pair *p)
{
    br_results_traces_release(&p->tr);
    br_results_free(p->r);
    br_analysis_free(p->a);
    br_chain_free(p->c);
    br_design_free(p->d);
}

static double su_rail(const br_analysis *a, int k, int key)
{
    double v = -12345;
    CU_ASSERT_EQUAL(br_startup_rail(a, k, key, &v), BR_OK);
    return v;
}

static void check_startup(const pair *p)
{
    const br_startup *su = &p->r->su;
    double v;
    CU_ASSERT_EQUAL(br_analysis_stages(p->a), su->n);
    CU_ASSERT_EQUAL(br_startup_get(p->a, BR_SU_COMPLETE, &v), BR_OK);
    ASSERT_SAME(v, su->complete);
    CU_ASSERT_EQUAL(br_startup_get(p->a, BR_SU_TIME, &v), BR_OK);
    ASSERT_SAME(v, su->complete ? su->t_total : INFINITY);
    CU_ASSERT_EQUAL(br_startup_get(p->a, BR_SU_SIMULATED, &v), BR_OK);
    ASSERT_SAME(v, su->t_simulated);
    for (int k = 0; k < su->n; k++) {
        const br_startup_stage *s = &su->st[k];
        ASSERT_SAME(su_rail(p->a, k, BR_SUR_START),
                    s->final_enable < 0 ? INFINITY : s->final_enable);
        ASSERT_SAME(su_rail(p->a, k, BR_SUR_DROPOUTS), s->ndropouts);
        ASSERT_SAME(su_rail(p->a, k, BR_SUR_FINAL), s->vend);
        if (k > 0)
            ASSERT_SAME(su_rail(p->a, k, BR_SUR_LINK_IPEAK), s->ipeak);
        for (int i = 0; i < s->ndropouts && i < BR_DROPOUT_TIMES; i++) {
            CU_ASSERT_EQUAL(br_startup_dropout(p->a, k, i, &v), BR_OK);
            ASSERT_SAME(v, s->dropout_t[i]);
        }
    }
    CU_ASSERT_EQUAL(br_startup_supply(p->a, BR_SUP_CHARGE, &v), BR_OK);
    ASSERT_SAME(v, su->supply.charge);
    CU_ASSERT_EQUAL(br_startup_supply(p->a, BR_SUP_IPEAK, &v), BR_OK);
    ASSERT_SAME(v, su->supply.ipeak);
}

static void check_steady(const pair *p)
{
    int nd = -1;
    double v;
    CU_ASSERT_EQUAL_FATAL(br_steady_cases(p->a, &nd), BR_OK);
    CU_ASSERT_EQUAL_FATAL(nd, p->r->ndir);
    for (int d = 0; d < nd; d++) {
        const br_steady_figs *f = &p->r->figs[d];
        CU_ASSERT_EQUAL(br_steady_get(p->a, d, BR_SS_RESIDUAL, &v), BR_OK);
        ASSERT_SAME(v, p->r->ss[d].residual);
        CU_ASSERT_EQUAL(br_steady_get(p->a, d, BR_SS_STATUS, &v), BR_OK);
        /* the shipped examples settle and hold */
        CU_ASSERT_EQUAL(v, BR_STEADY_HOLDS);
        for (int k = 0; k < f->n; k++) {
            CU_ASSERT_EQUAL(br_steady_rail(p->a, d, k, BR_RAIL_VMIN, &v), BR_OK);
            ASSERT_SAME(v, f->rail[k].vmin);
            CU_ASSERT_EQUAL(br_steady_rail(p->a, d, k, BR_RAIL_M_UVLO, &v), BR_OK);
            ASSERT_SAME(v, f->rail[k].m_uvlo);
            CU_ASSERT_EQUAL(br_steady_rail(p->a, d, k, BR_RAIL_VAVG, &v), BR_OK);
            ASSERT_SAME(v, f->rail[k].vavg);
            if (k == 0)
                continue;
            CU_ASSERT_EQUAL(br_steady_link(p->a, d, k, BR_LINK_VREV, &v), BR_OK);
            ASSERT_SAME(v, f->link[k].vrev_stress);
            CU_ASSERT_EQUAL(br_steady_link(p->a, d, k, BR_LINK_IAVG, &v), BR_OK);
            ASSERT_SAME(v, f->link[k].iavg);
        }
    }
}

static void check_verdict(const pair *p)
{
    int n = -1, res = -1, row = 0;
    CU_ASSERT_EQUAL_FATAL(br_verdict_rows(p->a, &n), BR_OK);
    CU_ASSERT_EQUAL(br_verdict_result(p->a, &res), BR_OK);
    CU_ASSERT_EQUAL(res, br_results_failed(p->r) ? BR_RESULT_FAIL : BR_RESULT_PASS);
    unsigned mask = br_results_mask(p->r);
    for (int c = 0; c < BR_CRIT_COUNT; c++) {
        if (!(mask & (1u << c)))
            continue;
        const br_verdict_row *r = &p->r->verdict.row[c];
        const char *key = NULL;
        double fig;
        CU_ASSERT_EQUAL(br_verdict_key(p->a, row, &key), BR_OK);
        CU_ASSERT_STRING_EQUAL(key, br_crit_name(c));
        CU_ASSERT_EQUAL(br_verdict_value(p->a, row, BR_VERDICT_FIGURE, &fig), BR_OK);
        ASSERT_SAME(fig, r->figure);
        CU_ASSERT_EQUAL(br_verdict_value(p->a, row, BR_VERDICT_MARGIN, &fig), BR_OK);
        ASSERT_SAME(fig, r->margin);
        CU_ASSERT_EQUAL(br_verdict_result_of(p->a, row, &res), BR_OK);
        if (r->applies && !r->undetermined)
            CU_ASSERT_EQUAL(res == BR_RESULT_FAIL, !r->pass);
        row++;
    }
    CU_ASSERT_EQUAL(row, n);
}

/* The start-up rail series equals the reference trace sample for sample. */
static void check_series(const pair *p)
{
    const br_trace *t = p->tr.startup;
    size_t len = 0;
    CU_ASSERT_EQUAL_FATAL(br_series_get(p->a, BR_SERIES_STARTUP, BR_SERIES_TIME, 0, NULL, 0, &len),
                          BR_OK);
    CU_ASSERT_EQUAL_FATAL(len, (size_t)t->len);
    CU_ASSERT_TRUE_FATAL(len > 10);
    int k = t->n - 1;
    double *buf = malloc(len * sizeof *buf);
    CU_ASSERT_EQUAL(br_series_get(p->a, BR_SERIES_STARTUP, BR_SERIES_RAIL, k, buf, len, &len),
                    BR_OK);
    int equal = 1;
    for (size_t i = 0; i < len; i++)
        equal &= buf[i] == t->v[i * t->n + k];
    CU_ASSERT_TRUE(equal);
    size_t ls = 0;
    CU_ASSERT_EQUAL(br_series_get(p->a, BR_SERIES_STEADY, BR_SERIES_RAIL, k, NULL, 0, &ls), BR_OK);
    CU_ASSERT_EQUAL(ls, (size_t)p->tr.steady[0]->len);
    free(buf);
}

static void test_same_numbers(void)
{
    for (int i = 0; i < 2; i++) {
        pair p;
        pair_open(&p, designs[i], BR_PART_ALL);
        check_startup(&p);
        check_steady(&p);
        check_verdict(&p);
        check_series(&p);
        pair_close(&p);
    }
}

/* The hold-up from each steady case is the one br_holdup_run gives from
 * the reference's steady state. */
static void test_holdup(void)
{
    for (int i = 0; i < 2; i++) {
        pair p;
        pair_open(&p, designs[i], BR_PART_ALL);
        br_error err;
        CU_ASSERT_EQUAL_FATAL(br_analysis_run(p.a, p.c, BR_PART_STEADY | BR_PART_HOLDUP, &err),
                              BR_OK);
        for (int d = 0; d < p.r->ndir; d++) {
            br_holdup h;
            CU_ASSERT_EQUAL_FATAL(br_holdup_run(p.c, &p.r->ss[d], p.d->hold_on, 0.0, &h, &err),
                                  BR_OK);
            CU_ASSERT_TRUE_FATAL(h.dropped); /* the examples drop within the bound */
            double v;
            CU_ASSERT_EQUAL(br_holdup_get(p.a, d, BR_HU_DECIDED, &v), BR_OK);
            ASSERT_SAME(v, 1.0);
            CU_ASSERT_EQUAL(br_holdup_get(p.a, d, BR_HU_TIME, &v), BR_OK);
            ASSERT_SAME(v, h.t);
            CU_ASSERT_EQUAL(br_holdup_get(p.a, d, BR_HU_STAGE, &v), BR_OK);
            ASSERT_SAME(v, h.stage);
            CU_ASSERT_EQUAL(br_holdup_get(p.a, d, BR_HU_V_AT, &v), BR_OK);
            ASSERT_SAME(v, h.v_at);
            CU_ASSERT_TRUE(h.t > 0);
        }
        double v;
        CU_ASSERT_EQUAL(br_holdup_get(p.a, p.r->ndir, BR_HU_TIME, &v), BR_EUSAGE);
        CU_ASSERT_EQUAL(br_analysis_run(p.a, p.c, BR_PART_STEADY, &err), BR_OK);
        CU_ASSERT_EQUAL(br_holdup_get(p.a, 0, BR_HU_TIME, &v), BR_EUSAGE); /* not asked for */
        pair_close(&p);
    }
}

/* The demo fails one criterion, the leg passes (the README's demo). */
static void test_verdicts(void)
{
    const int want[] = {BR_RESULT_FAIL, BR_RESULT_PASS};
    for (int i = 0; i < 2; i++) {
        pair p;
        pair_open(&p, designs[i], BR_PART_ALL);
        int res = -1;
        CU_ASSERT_EQUAL(br_verdict_result(p.a, &res), BR_OK);
        CU_ASSERT_EQUAL(res, want[i]);
        pair_close(&p);
    }
}

static int calls;
static int stop_now(void *ctx)
{
    (void)ctx;
    calls++;
    return 1;
}
static int hook_stop(void *ctx, double done, double total)
{
    (void)done;
    (void)total;
    return ++*(int *)ctx >= 2;
}

static void test_cancel(void)
{
    br_design *d = NULL;
    br_chain *c = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(designs[1], &d, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_analysis *a = br_analysis_create();
    int parts[] = {BR_PART_STARTUP, BR_PART_STEADY};
    for (int i = 0; i < 2; i++) { /* the stop poll stops either part */
        calls = 0;
        CU_ASSERT_EQUAL(br_analysis_set_progress(a, NULL, stop_now, NULL), BR_OK);
        CU_ASSERT_EQUAL(br_analysis_run(a, c, parts[i], &err), BR_ECANCEL);
        CU_ASSERT_TRUE(calls > 0);
        CU_ASSERT_EQUAL(br_analysis_parts(a), 0);
        double v;
        CU_ASSERT_EQUAL(br_startup_get(a, BR_SU_TIME, &v), BR_EUSAGE);
    }
    int n = 0; /* the hook stops the start-up at its second call */
    CU_ASSERT_EQUAL(br_analysis_set_progress(a, hook_stop, NULL, &n), BR_OK);
    CU_ASSERT_EQUAL(br_analysis_run(a, c, BR_PART_STARTUP, &err), BR_ECANCEL);
    CU_ASSERT_EQUAL(n, 2);
    CU_ASSERT_EQUAL(err.code, BR_ECANCEL);
    CU_ASSERT_EQUAL(br_analysis_set_progress(a, NULL, NULL, NULL), BR_OK);
    CU_ASSERT_EQUAL(br_analysis_run(a, c, BR_PART_STARTUP, &err), BR_OK);
    br_analysis_free(a);
    br_chain_free(c);
    br_design_free(d);
}

static void test_bad_arguments(void)
{
    br_design *d = NULL;
    br_chain *c = NULL;
    br_error err;
    double v;
    const char *s;
    size_t len;
    CU_ASSERT_EQUAL_FATAL(br_design_load(designs[0], &d, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_analysis *a = br_analysis_create();
    CU_ASSERT_EQUAL(br_analysis_run(NULL, c, BR_PART_ALL, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_analysis_run(a, NULL, BR_PART_ALL, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_analysis_run(a, c, 0, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_analysis_run(a, c, 4, &err), BR_EUSAGE);
    CU_ASSERT_TRUE(strstr(err.msg, "parts") != NULL);
    CU_ASSERT_EQUAL(br_analysis_run(a, c, BR_PART_STARTUP | BR_PART_HOLDUP, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_analysis_run(a, c, BR_PART_HOLDUP, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_analysis_run(a, c, 8 | BR_PART_STEADY, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_analysis_set_series(a, 2), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_startup_get(a, BR_SU_TIME, &v), BR_EUSAGE); /* not run yet */
    CU_ASSERT_EQUAL(br_analysis_run(a, c, BR_PART_STARTUP, &err), BR_OK);
    CU_ASSERT_EQUAL(br_steady_get(a, 0, BR_SS_STATUS, &v), BR_EUSAGE); /* not run */
    CU_ASSERT_EQUAL(br_startup_get(a, BR_SU_KEY_COUNT, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_startup_get(a, -1, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_startup_get(a, BR_SU_TIME, NULL), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_startup_rail(a, br_analysis_stages(a), BR_SUR_START, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_startup_dropout(a, 0, 99, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_series_get(a, BR_SERIES_STARTUP, BR_SERIES_TIME, 0, NULL, 0, &len),
                    BR_EUSAGE); /* series not kept */
    CU_ASSERT_EQUAL(br_verdict_key(a, 99, &s), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_analysis_run(a, c, BR_PART_STEADY, &err), BR_OK);
    CU_ASSERT_EQUAL(br_steady_link(a, 0, 0, BR_LINK_VREV, &v), BR_EUSAGE); /* rail 0 has none */
    CU_ASSERT_EQUAL(br_steady_rail(a, 5, 0, BR_RAIL_VMIN, &v), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_steady_rail(a, 0, 0, BR_RAIL_KEY_COUNT, &v), BR_EUSAGE);
    br_analysis_free(a);
    br_analysis_free(NULL);
    br_chain_free(c);
    br_design_free(d);
}

int main(void)
{
    gsl_set_error_handler_off();
    static const br_test_case cases[] = {
        {"same numbers as the internal results", test_same_numbers},
        {"the examples' verdicts", test_verdicts},
        {"hold-up as the internal one", test_holdup},
        {"a stop poll and a hook stop a run", test_cancel},
        {"bad arguments are refused", test_bad_arguments},
        {NULL, NULL}};
    return br_test_main("api_analysis", cases);
}

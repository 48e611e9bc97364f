/* yield.c - Monte Carlo yield through the public API
 * (include/bootrung/analysis.h): an opaque object over analyses/yield,
 * handing out its counts, interval, per-criterion statistics and samples
 * as they are. */
#include "bootrung/analysis.h"
#include "bootrung/report.h"

#include "kept.h"

#include "analyses/yield.h"
#include "core/error.h"
#include "core/progress.h"
#include "report/charts.h"
#include "report/verb_pages.h"
#include "report/yield_report.h"

#include <math.h>
#include <stdlib.h>

_Static_assert(BR_YC_MEDIAN - BR_YC_MIN + 1 == BR_YIELD_NQ, "one key per quantile kept");

struct br_yield_study {
    br_yield *y; /* the last run's (NULL: none) */
    long samples;
    unsigned long seed;
    int startup;
    br_progress prog;
    br_tol_list tl; /* the parameters, copied: the design may go */
    int threads, solver_limit;
    double min_yield;     /* < 0: none */
    int shard_k, shard_n; /* judge one slice of the samples (shard_n 0: all) */
    const void *given;    /* the samples as shards judged them (NULL: judge them) */
    br_kept kept;         /* the design and its chain, for the reports */
};

br_yield_study *br_yield_study_create(void)
{
    br_yield_study *y = calloc(1, sizeof *y);
    if (y) {
        br_yield_opts o;
        br_yield_opts_default(&o);
        y->samples = o.samples;
        y->seed = o.seed;
        y->startup = o.startup;
        y->min_yield = -1.0;
    }
    return y;
}

void br_yield_study_free(br_yield_study *y)
{
    if (y) {
        br_yield_free(y->y);
        br_kept_release(&y->kept);
    }
    free(y);
}

int br_yield_study_set_progress(br_yield_study *y, br_progress_hook hook, br_stop_poll stop,
                                void *ctx)
{
    if (!y)
        return BR_EUSAGE;
    y->prog = (br_progress){hook, ctx, stop};
    return BR_OK;
}

int br_yield_study_set_samples(br_yield_study *y, long samples, unsigned long seed)
{
    if (!y || samples < 1)
        return BR_EUSAGE;
    y->samples = samples;
    y->seed = seed;
    return BR_OK;
}

int br_yield_study_set_startup(br_yield_study *y, int on)
{
    if (!y || (on != 0 && on != 1))
        return BR_EUSAGE;
    y->startup = on;
    return BR_OK;
}

int br_yield_study_set_threads(br_yield_study *y, int n)
{
    if (!y || n < 0 || n > BR_THREADS_MAX)
        return BR_EUSAGE;
    y->threads = n;
    return BR_OK;
}

int br_yield_study_set_solver_limit(br_yield_study *y, long n)
{
    if (!y || n < 0 || n > BR_SOLVER_LIMIT_MAX)
        return BR_EUSAGE;
    y->solver_limit = (int)n;
    return BR_OK;
}

int br_yield_study_set_min_yield(br_yield_study *y, double p)
{
    if (!y || isnan(p) || p > 1.0)
        return BR_EUSAGE;
    y->min_yield = p < 0 ? -1.0 : p;
    return BR_OK;
}

int br_yield_study_set_shard(br_yield_study *y, int k, int n)
{
    if (!y || n < 0 || (n > 0 && (k < 1 || k > n)))
        return BR_EUSAGE;
    y->shard_k = n > 0 ? k : 0;
    y->shard_n = n;
    return BR_OK;
}

size_t br_yield_record_size(void)
{
    return sizeof(br_pt);
}

int br_yield_study_set_given(br_yield_study *y, const void *rec, size_t size, long total)
{
    if (!y || (rec && (size != sizeof(br_pt) || total != y->samples)))
        return BR_EUSAGE;
    y->given = rec;
    return BR_OK;
}

int br_yield_study_judges(const br_yield_study *y, long i, int *out)
{
    if (!y || !out || i < 0 || i >= y->samples)
        return BR_EUSAGE;
    br_yield_opts o;
    br_yield_opts_default(&o);
    o.shard_k = y->shard_k;
    o.shard_n = y->shard_n;
    *out = br_yield_shard_has(&o, i);
    return BR_OK;
}

int br_yield_records(const br_yield_study *y, const void **rec, long *count)
{
    if (!y || !y->y || !rec || !count)
        return BR_EUSAGE;
    *rec = y->y->pts;
    *count = y->y->n;
    return BR_OK;
}

int br_yield_study_run(br_yield_study *y, const br_design *d, br_error *err)
{
    if (!y || !d)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_yield_study_run: expected a study and a design");
    br_yield_free(y->y);
    y->y = NULL;
    br_yield_opts o;
    br_yield_opts_default(&o);
    o.samples = y->samples;
    o.seed = y->seed;
    o.startup = y->startup;
    o.progress = &y->prog;
    o.threads = y->threads;
    o.solver_limit = y->solver_limit;
    o.shard_k = y->shard_k;
    o.shard_n = y->shard_n;
    o.given = y->given;
    br_yield *r = NULL;
    int rc = br_kept_take(&y->kept, d, err);
    if (rc == BR_OK)
        rc = br_yield_run(d, &o, &r, err);
    if (rc != BR_OK) {
        br_yield_free(r);
        return rc;
    }
    y->tl = r->s->tl;
    r->s->d = y->kept.d; /* the caller's design may go: the report reads the copy */
    y->y = r;
    return BR_OK;
}

int br_yield_get(const br_yield_study *y, int key, double *out)
{
    if (!y || !y->y || !out || key < 0 || key >= BR_YIELD_KEY_COUNT)
        return BR_EUSAGE;
    const br_yield *r = y->y;
    const double v[BR_YIELD_KEY_COUNT] = {
        [BR_YIELD_SAMPLES] = (double)r->n,
        [BR_YIELD_PASS] = (double)r->pass,
        [BR_YIELD_FAIL] = (double)r->fail,
        [BR_YIELD_UNDETERMINED] = (double)r->undetermined,
        [BR_YIELD_YIELD] = r->yield,
        [BR_YIELD_LO] = r->lo,
        [BR_YIELD_HI] = r->hi,
    };
    *out = v[key];
    return BR_OK;
}

static int result_of(int outcome)
{
    return outcome == BR_OUTCOME_FAIL           ? BR_RESULT_FAIL
           : outcome == BR_OUTCOME_UNDETERMINED ? BR_RESULT_UNDETERMINED
                                                : BR_RESULT_PASS;
}

int br_yield_result(const br_yield_study *y, int *out)
{
    if (!y || !y->y || !out)
        return BR_EUSAGE;
    *out = result_of(br_yield_outcome(y->y, y->min_yield));
    return BR_OK;
}

int br_yield_criterion(const br_yield_study *y, int i, int key, double *out)
{
    if (!y || !y->y || !out || i < 0 || i >= BR_CRIT_COUNT || key < 0 || key >= BR_YC_KEY_COUNT)
        return BR_EUSAGE;
    const br_yield_crit *c = &y->y->c[i];
    if (key >= BR_YC_MIN) {
        *out = c->q[key - BR_YC_MIN];
        return BR_OK;
    }
    const long v[BR_YC_MIN] = {[BR_YC_JUDGED] = c->judged,
                               [BR_YC_FAILS] = c->fails,
                               [BR_YC_UNDETERMINED] = c->undetermined};
    *out = (double)v[key];
    return BR_OK;
}

int br_yield_rho(const br_yield_study *y, int i, int j, double *out)
{
    if (!y || !y->y || !out || i < 0 || i >= BR_CRIT_COUNT || j < 0 || j >= y->tl.n)
        return BR_EUSAGE;
    *out = y->y->c[i].rho[j];
    return BR_OK;
}

int br_yield_params(const br_yield_study *y, int *out)
{
    if (!y || !y->y || !out)
        return BR_EUSAGE;
    *out = y->tl.n;
    return BR_OK;
}

int br_yield_param_name(const br_yield_study *y, int j, const char **out)
{
    if (!y || !y->y || !out || j < 0 || j >= y->tl.n)
        return BR_EUSAGE;
    *out = y->tl.p[j].name;
    return BR_OK;
}

int br_yield_sample_value(const br_yield_study *y, long i, int j, double *out)
{
    if (!y || !y->y || !out || i < 0 || i >= y->y->n || j < 0 || j >= y->tl.n)
        return BR_EUSAGE;
    *out = y->y->values[i * y->tl.n + j];
    return BR_OK;
}

int br_yield_sample_result(const br_yield_study *y, long i, int *out)
{
    if (!y || !y->y || !out || i < 0 || i >= y->y->n)
        return BR_EUSAGE;
    *out = result_of(y->y->pts[i].outcome);
    return BR_OK;
}

/* ---- reports (bootrung/report.h) ---------------------------------------- */

static int html(const br_yield_study *y, br_text *out, br_error *err)
{
    br_text *text = br_text_create();
    int rc = text ? br_yield_text(y->kept.c, y->y, y->min_yield, text) : BR_ENOMEM;
    if (rc == BR_OK)
        rc = br_yield_html(y->kept.c, y->y, y->min_yield, text, out, err);
    br_text_free(text);
    return rc;
}

static int render(const br_yield_study *y, int format, br_text *out, br_error *err)
{
    switch (format) {
    case BR_FORMAT_TEXT:
        return br_yield_text(y->kept.c, y->y, y->min_yield, out);
    case BR_FORMAT_XML:
        return br_yield_xml(y->kept.c, y->y, y->min_yield, br_version(), out, err);
    case BR_FORMAT_CSV:
        return br_yield_csv(y->y, out);
    case BR_FORMAT_HTML:
        return html(y, out, err);
    case BR_FORMAT_SVG:
        return br_chart_yield(y->y, 1, out);
    default:
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_yield_study_render: expected a format of br_format");
    }
}

int br_yield_study_render(const br_yield_study *y, int format, br_text *out, br_error *err)
{
    if (!y || !y->y || !y->kept.c || !out || y->shard_n > 0)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_yield_study_render: expected a study that has run on every "
                            "sample (a shard takes no statistics), and a text");
    if (err)
        br_error_clear(err);
    int rc = render(y, format, out, err);
    if (rc == BR_ENOMEM && err && !err->msg[0])
        br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory rendering the report");
    return rc;
}

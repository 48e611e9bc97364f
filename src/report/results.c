/* results.c - running the analyses of a verb and assembling its text and
 * XML documents. */
#include "report/results.h"

#include "core/error.h"
#include "report/budget_report.h"
#include "report/caution.h"
#include "report/csv.h"
#include "report/line_report.h"
#include "report/report_common.h"
#include "report/startup_report.h"
#include "report/steady_report.h"
#include "report/verdict_report.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

/* A start-up series keeps the min/max envelope of buckets of T/10 (two
 * rows each), and over a long simulation no more than about this many
 * buckets in all. */
#define STARTUP_BUCKETS 10000
#define BUCKETS_PER_PERIOD 10

br_results *br_results_create(void)
{
    return calloc(1, sizeof(br_results));
}

void br_results_free(br_results *r)
{
    if (r)
        br_line_env_free(r->env);
    free(r);
}

static int oom(br_error *err, const char *what)
{
    return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory %s", what);
}

/* A row kept by a CSV series goes into a trace as well. */
static void trace_row(void *ctx, double t, const double *v, const double *i, const double *vd,
                      const double *vr, const double *disp)
{
    br_trace_add(ctx, t, v, i, vd, vr, disp);
}

static int run_startup(br_results *r, br_text *csv, br_trace *tr, br_error *err)
{
    const br_chain *c = r->c;
    br_csv_series s;
    br_sim_observer obs;
    br_startup_opts o = {0};
    o.progress = r->progress;
    if (csv || tr) {
        double dt = fmax(c->T / BUCKETS_PER_PERIOD, c->startup_max / STARTUP_BUCKETS);
        br_csv_series_init(&s, csv, "startup", c->n, dt, 0.0);
        if (tr) {
            s.row = trace_row;
            s.row_ctx = tr;
        }
        obs = br_csv_observer(&s);
        o.obs = &obs;
    }
    int rc = br_startup_run(c, &o, &r->su, err);
    if (rc == BR_OK && (csv || tr) && (br_csv_series_end(&s) != BR_OK || (tr && tr->failed)))
        rc = oom(err, "recording the start-up series");
    return rc;
}

/* The period the figures come from again, every sample recorded (so
 * that the file's and the plot's extremes are the figures'); a trace
 * also gets the period after it. */
static int steady_series(const br_chain *c, const br_steady *ss, const br_progress *progress,
                         br_text *csv, br_trace *tr, br_error *err)
{
    static const char *const labels[] = {"steady-step-down", "steady-step-up", "steady"};
    const char *label = labels[ss->dir == BR_DIRI_DOWN ? 0 : ss->dir == BR_DIRI_UP ? 1 : 2];
    br_csv_series s;
    br_csv_series_init(&s, csv, label, c->n, 0.0, ss->phase);
    if (tr) {
        br_trace_offset(tr, ss->phase);
        s.row = trace_row;
        s.row_ctx = tr;
    }
    br_sim_observer first = br_csv_observer(&s), then = tr ? br_trace_observer(tr) : first;
    int rc = br_steady_replay(c, ss, &first, tr ? &then : NULL, 1, progress, err);
    if (rc == BR_OK && br_csv_series_end(&s) != BR_OK)
        rc = oom(err, "recording the steady period");
    if (rc == BR_OK && tr && tr->failed)
        rc = oom(err, "recording the steady periods");
    return rc;
}

/* A line cycle: its steady state with the envelope, which is what its
 * CSV rows and plots show (a line period of waveforms would be thousands
 * of switching periods of samples). */
static int run_line(br_results *r, const br_steady_opts *so, br_text *csv, br_error *err)
{
    br_steady_opts o;
    if (so)
        o = *so;
    else
        br_steady_opts_default(&o);
    r->ndir = 1;
    if (!(r->env = br_line_env_create(r->c->line.K, r->c->n)))
        return oom(err, "keeping the line cycle's envelope");
    o.envelope = r->env;
    if (!o.progress)
        o.progress = r->progress; /* a line period is thousands of switching periods */
    int rc = br_steady_solve(r->c, BR_DIRI_LINE, &o, &r->ss[0], err);
    if (rc == BR_OK && csv && br_line_csv(r->c, r->env, csv) != BR_OK)
        rc = oom(err, "recording the line cycle's envelope");
    if (rc == BR_OK)
        br_steady_figures(r->c, &r->ss[0], &r->figs[0]);
    return rc;
}

static int run_steady(br_results *r, const br_steady_opts *so, br_text *csv, br_results_traces *tr,
                      br_error *err)
{
    if (r->c->line.on)
        return run_line(r, so, csv, err);
    int dirs[2];
    br_steady_opts o;
    if (so)
        o = *so;
    else
        br_steady_opts_default(&o);
    o.progress = r->progress;
    r->ndir = br_design_directions(r->c, dirs);
    for (int d = 0; d < r->ndir; d++) {
        int rc = br_steady_solve(r->c, dirs[d], &o, &r->ss[d], err);
        if (rc == BR_OK && br_progress_stopped(r->progress))
            rc = br_progress_cancelled(err);
        br_trace *t = NULL;
        if (tr)
            t = tr->steady[d] = br_trace_create(r->c->n);
        if (rc == BR_OK && tr && !t)
            rc = oom(err, "keeping the steady periods");
        if (rc == BR_OK && (csv || t) &&
            br_steady_has_period(&r->ss[d])) /* a failed run has no period */
            rc = steady_series(r->c, &r->ss[d], r->progress, csv, t, err);
        if (rc != BR_OK)
            return rc;
        br_steady_figures(r->c, &r->ss[d], &r->figs[d]);
    }
    return BR_OK;
}

int br_results_run(br_results *r, const br_chain *c, const char *verb, int parts,
                   const br_steady_opts *so, br_text *csv, br_error *err)
{
    return br_results_run_traced(r, c, verb, parts, so, csv, NULL, err);
}

void br_results_traces_release(br_results_traces *tr)
{
    br_trace_free(tr->startup);
    br_trace_free(tr->steady[0]);
    br_trace_free(tr->steady[1]);
    memset(tr, 0, sizeof *tr);
}

int br_results_run_traced(br_results *r, const br_chain *c, const char *verb, int parts,
                          const br_steady_opts *so, br_text *csv, br_results_traces *tr,
                          br_error *err)
{
    const br_progress *hook = r->progress; /* the caller's, set before the run */
    br_line_env_free(r->env);
    memset(r, 0, sizeof *r);
    r->progress = hook;
    r->c = c;
    r->verb = verb;
    r->parts = parts;
    if (csv && br_csv_header(c, csv) != BR_OK)
        return oom(err, "starting the CSV series");
    int rc = BR_OK;
    if ((parts & BR_RUN_STARTUP) && tr && !(tr->startup = br_trace_create(c->n)))
        rc = oom(err, "keeping the start-up series");
    if (rc == BR_OK && (parts & BR_RUN_STARTUP))
        rc = run_startup(r, csv, tr ? tr->startup : NULL, err);
    if (rc == BR_OK && (parts & BR_RUN_STEADY))
        rc = run_steady(r, so, csv, tr, err);
    if (rc == BR_OK)
        br_verdict_make(c, (parts & BR_RUN_STARTUP) ? &r->su : NULL, r->figs, r->ndir, &r->verdict);
    return rc;
}

/* The criteria a verb judges. */
unsigned br_results_mask(const br_results *r)
{
    unsigned m = 0;
    for (int i = 0; i < BR_CRIT_COUNT; i++)
        if (r->parts & (br_crit_is_startup(i) ? BR_RUN_STARTUP : BR_RUN_STEADY))
            m |= BR_CRIT_BIT(i);
    return m;
}

/* Rows of the verb's criteria that fail (undetermined ones aside). */
int br_results_failed(const br_results *r)
{
    unsigned m = br_results_mask(r);
    for (int i = 0; i < BR_CRIT_COUNT; i++) {
        const br_verdict_row *v = &r->verdict.row[i];
        if ((m & BR_CRIT_BIT(i)) && v->applies && !v->pass && !v->undetermined)
            return 1;
    }
    return 0;
}

int br_results_undetermined(const br_results *r)
{
    unsigned m = br_results_mask(r);
    for (int i = 0; i < BR_CRIT_COUNT; i++)
        if ((m & BR_CRIT_BIT(i)) && r->verdict.row[i].undetermined)
            return 1;
    return 0;
}

/* Sections are separated by one blank line; the caution brings its own. */
static int steady_sections(const br_results *r, br_text *out)
{
    int rc = BR_OK;
    for (int d = 0; d < r->ndir; d++) {
        rc |= d > 0 ? br_text_put(out, "\n") : BR_OK;
        rc |= br_steady_text(r->c, &r->figs[d], out);
    }
    return rc;
}

static const char *heading(const br_results *r)
{
    if ((r->parts & BR_RUN_ALL) == BR_RUN_ALL)
        return "analysis";
    return r->parts & BR_RUN_STARTUP ? "start-up" : "steady state";
}

int br_results_text(const br_results *r, br_text *out, br_error *err)
{
    int rc = br_report_heading(r->c, heading(r), out);
    if (r->parts & BR_RUN_STARTUP)
        rc |= br_startup_text(r->c, &r->su, !(r->parts & BR_RUN_STEADY), out);
    if ((r->parts & BR_RUN_ALL) == BR_RUN_ALL) {
        rc |= br_text_put(out, "\n");
        rc |= br_steady_summary_text(r->c, r->figs, r->ndir, out);
        rc |= br_budget_summary_text(r->c, r->figs, r->ndir, out);
    } else if (r->parts & BR_RUN_STEADY) {
        rc |= steady_sections(r, out);
    }
    /* every verb closes on its criteria, start-up alone on the start-up's */
    rc |= br_text_put(out, "\n");
    rc |= br_verdict_text(r->c, &r->verdict, br_results_mask(r),
                          (r->parts & BR_RUN_STARTUP) ? &r->su : NULL, out);
    rc |= br_report_caution(out);
    return rc ? oom(err, "rendering the report") : BR_OK;
}

int br_results_xml(const br_results *r, const char *version, br_text *out, br_error *err)
{
    br_xmlw *w;
    int rc = br_xmlw_create(&w, err);
    if (rc != BR_OK)
        return rc;
    const br_design *d = r->c->design;
    br_xmlw_start(w, "bootrung-results");
    br_xmlw_attr(w, "verb", r->verb);
    br_xmlw_attr(w, "design", d && d->name[0] ? d->name : "");
    br_xmlw_attr(w, "file", d ? d->path : "");
    br_xmlw_attr(w, "version", version ? version : "");
    br_xml_operating_point(w, r->c);
    if (r->parts & BR_RUN_STARTUP)
        br_startup_xml(w, r->c, &r->su);
    for (int i = 0; i < r->ndir; i++)
        br_steady_xml(w, r->c, &r->figs[i]);
    br_verdict_xml(w, r->c, &r->verdict, br_results_mask(r),
                   (r->parts & BR_RUN_STARTUP) ? &r->su : NULL);
    br_xml_caution(w);
    rc = br_xmlw_finish(w, out, err);
    br_xmlw_free(w);
    return rc;
}

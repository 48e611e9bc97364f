/* analysis.c - the public analysis API (include/bootrung/analysis.h): an
 * opaque object over the report layer's br_results, so a program reads the
 * very figures the command line prints.  Nothing is computed here but the
 * bookkeeping of what to hand out. */
#include "bootrung/analysis.h"

#include "bootrung/report.h"

#include "kept.h"

#include "analyses/holdup.h"
#include "core/error.h"
#include "core/progress.h"
#include "model/design.h"
#include "report/results.h"
#include "report/verdict_report.h"
#include "report/vocab.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

_Static_assert(BR_DROPOUT_TIMES == BR_MAX_DROPOUT_TIMES,
               "the public header keeps as many dropouts");

struct br_analysis {
    br_results *res;
    br_results_traces tr; /* kept when keep_series */
    int keep_series;
    int keep_csv;
    br_text *csv;      /* the time series as CSV, recorded when keep_csv */
    br_steady_opts so; /* the steady-state solver's, with its work limit */
    br_kept kept;      /* the design analysed and its chain, for the reports */
    br_progress prog;
    int parts, n;
    int ss_status[2];
    char ss_why[2][400];
    br_holdup hu[2];         /* per steady case, with BR_PART_HOLDUP */
    int hu_decided[2];       /* hu[d] was simulated */
    int nrows;               /* the criteria the run judged */
    int crit[BR_CRIT_COUNT]; /* row i's br_crit */
};

br_analysis *br_analysis_create(void)
{
    br_analysis *a = calloc(1, sizeof *a);
    if (a && !(a->res = br_results_create())) {
        free(a);
        return NULL;
    }
    if (a)
        br_steady_opts_default(&a->so);
    return a;
}

static void forget(br_analysis *a)
{
    br_results_traces_release(&a->tr);
    memset(&a->tr, 0, sizeof a->tr);
    br_chain_free(a->kept.c);
    a->kept.c = NULL;
    a->res->c = NULL;
    a->parts = 0;
    a->n = 0;
    a->nrows = 0;
}

void br_analysis_free(br_analysis *a)
{
    if (!a)
        return;
    forget(a);
    br_results_free(a->res);
    br_text_free(a->csv);
    br_kept_release(&a->kept);
    free(a);
}

int br_analysis_set_progress(br_analysis *a, br_progress_hook hook, br_stop_poll stop, void *ctx)
{
    if (!a)
        return BR_EUSAGE;
    a->prog = (br_progress){hook, ctx, stop};
    return BR_OK;
}

int br_analysis_set_series(br_analysis *a, int keep)
{
    if (!a || (keep != 0 && keep != 1))
        return BR_EUSAGE;
    a->keep_series = keep;
    return BR_OK;
}

int br_analysis_set_csv(br_analysis *a, int keep)
{
    if (!a || (keep != 0 && keep != 1))
        return BR_EUSAGE;
    a->keep_csv = keep;
    return BR_OK;
}

/* Fewer Newton iterations (never more than the default) and n plain
 * periods: what the solver cannot settle within them is undetermined. */
int br_analysis_set_solver_limit(br_analysis *a, long n)
{
    if (!a || n < 0 || n > BR_SOLVER_LIMIT_MAX)
        return BR_EUSAGE;
    br_steady_opts_default(&a->so);
    if (n > 0) {
        a->so.max_iter = n < a->so.max_iter ? (int)n : a->so.max_iter;
        a->so.max_plain = n;
    }
    return BR_OK;
}

/* Case d's status is the steady row of a verdict over that case alone:
 * the rule the full verdict applies, not a second copy of it. */
static void steady_status(br_analysis *a, const br_chain *c, int d)
{
    br_verdict v;
    br_verdict_make(c, NULL, &a->res->figs[d], 1, &v);
    const br_verdict_row *r = &v.row[BR_CRIT_STEADY];
    a->ss_status[d] = r->undetermined ? BR_STEADY_UNDETERMINED
                      : r->pass       ? BR_STEADY_HOLDS
                                      : BR_STEADY_DOES_NOT_HOLD;
    snprintf(a->ss_why[d], sizeof a->ss_why[d], "%s", r->pass ? "" : r->note);
}

static void judged_rows(br_analysis *a)
{
    unsigned m = br_results_mask(a->res);
    a->nrows = 0;
    for (int i = 0; i < BR_CRIT_COUNT; i++)
        if (m & BR_CRIT_BIT(i))
            a->crit[a->nrows++] = i;
}

/* The hold-up from every steady case that has a period to start from
 * (one without has none: its hold-up is left undecided, not guessed). */
static int holdups(br_analysis *a, const br_chain *c, br_error *err)
{
    int rc = BR_OK;
    for (int d = 0; d < a->res->ndir && rc == BR_OK; d++) {
        const br_steady *ss = &a->res->ss[d];
        a->hu_decided[d] = br_steady_has_period(ss);
        if (a->hu_decided[d] && (rc = br_progress_call(&a->prog, d, a->res->ndir, err)) == BR_OK)
            rc = br_holdup_run(c, ss, c->design->hold_on, 0.0, &a->hu[d], err);
    }
    return rc;
}

static int csv_ready(br_analysis *a, br_error *err)
{
    if (!a->csv && !(a->csv = br_text_create()))
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory for the CSV series");
    br_text_reset(a->csv);
    return BR_OK;
}

/* The reports read the chain after the caller's may be gone. */
static int keep_chain(br_analysis *a, const br_chain *c, br_error *err)
{
    if (!c->design)
        return BR_OK; /* a chain made by hand: figures, no reports */
    return br_kept_take(&a->kept, c->design, err);
}

int br_analysis_run(br_analysis *a, const br_chain *c, int parts, br_error *err)
{
    static const char *const verbs[] = {"", "startup", "steady", "analyze"};
    int base = parts & BR_PART_ALL;
    if (!a || !c || !base || (parts & ~(BR_PART_ALL | BR_PART_HOLDUP)) ||
        ((parts & BR_PART_HOLDUP) && !(parts & BR_PART_STEADY)))
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_analysis_run: expected an analysis, a chain and parts 1 to 3, "
                            "with BR_PART_HOLDUP only beside BR_PART_STEADY");
    forget(a);
    int rc = a->keep_csv ? csv_ready(a, err) : BR_OK;
    a->res->progress = &a->prog;
    if (rc == BR_OK)
        rc =
            br_results_run_traced(a->res, c, verbs[base], base, &a->so, a->keep_csv ? a->csv : NULL,
                                  a->keep_series ? &a->tr : NULL, err);
    a->res->progress = NULL;
    if (rc == BR_OK && (parts & BR_PART_HOLDUP))
        rc = holdups(a, c, err);
    if (rc == BR_OK)
        rc = keep_chain(a, c, err);
    if (rc != BR_OK) {
        forget(a);
        return rc;
    }
    for (int d = 0; d < a->res->ndir; d++)
        steady_status(a, c, d);
    judged_rows(a);
    a->res->c = a->kept.c; /* the caller may free its chain now */
    a->parts = parts;
    a->n = c->n;
    return BR_OK;
}

int br_analysis_parts(const br_analysis *a)
{
    return a ? a->parts : 0;
}

int br_analysis_stages(const br_analysis *a)
{
    return a ? a->n : 0;
}

/* ---- the cold start ---------------------------------------------------- */

static const br_startup *startup_of(const br_analysis *a)
{
    return a && (a->parts & BR_PART_STARTUP) ? &a->res->su : NULL;
}

/* -1, the engine's "never", is +inf here: a time no start can beat. */
static double when(double t)
{
    return t < 0 ? INFINITY : t;
}

int br_startup_get(const br_analysis *a, int key, double *out)
{
    const br_startup *su = startup_of(a);
    if (!su || !out || key < 0 || key >= BR_SU_KEY_COUNT)
        return BR_EUSAGE;
    const double v[BR_SU_KEY_COUNT] = {
        [BR_SU_COMPLETE] = su->complete,
        [BR_SU_TIME] = su->complete ? su->t_total : INFINITY,
        [BR_SU_SIMULATED] = su->t_simulated,
        [BR_SU_PWM_START] = su->pwm_start,
        [BR_SU_FIRST_STALLED] = su->first_stalled,
        [BR_SU_FAILED] = su->failed,
        [BR_SU_PERIODS_INTEGRATED] = (double)su->periods_integrated,
        [BR_SU_PERIODS_STEPPED] = (double)su->periods_stepped,
    };
    *out = v[key];
    return BR_OK;
}

int br_startup_why(const br_analysis *a, const char **out)
{
    const br_startup *su = startup_of(a);
    if (!su || !out)
        return BR_EUSAGE;
    *out = su->failed ? su->why : "";
    return BR_OK;
}

int br_startup_rail(const br_analysis *a, int k, int key, double *out)
{
    const br_startup *su = startup_of(a);
    if (!su || !out || k < 0 || k >= su->n || key < 0 || key >= BR_SUR_KEY_COUNT)
        return BR_EUSAGE;
    const br_startup_stage *s = &su->st[k];
    const double v[BR_SUR_KEY_COUNT] = {
        [BR_SUR_START] = when(s->final_enable), [BR_SUR_FIRST_START] = when(s->first_enable),
        [BR_SUR_DROPOUTS] = s->ndropouts,       [BR_SUR_FINAL] = s->vend,
        [BR_SUR_RUNNING] = s->running,          [BR_SUR_LINK_IPEAK] = k ? s->ipeak : NAN,
        [BR_SUR_LINK_I2T] = k ? s->i2t : NAN,
    };
    *out = v[key];
    return BR_OK;
}

int br_startup_dropout(const br_analysis *a, int k, int i, double *out)
{
    const br_startup *su = startup_of(a);
    if (!su || !out || k < 0 || k >= su->n || i < 0 || i >= su->st[k].ndropouts ||
        i >= BR_MAX_DROPOUT_TIMES)
        return BR_EUSAGE;
    *out = su->st[k].dropout_t[i];
    return BR_OK;
}

int br_startup_supply(const br_analysis *a, int key, double *out)
{
    const br_startup *su = startup_of(a);
    if (!su || !out || key < 0 || key >= BR_SUP_KEY_COUNT)
        return BR_EUSAGE;
    const br_supply_profile *p = &su->supply;
    const double v[BR_SUP_KEY_COUNT] = {
        [BR_SUP_SPAN] = p->span,       [BR_SUP_IPEAK] = p->ipeak,
        [BR_SUP_IAVG] = p->iavg,       [BR_SUP_CHARGE] = p->charge,
        [BR_SUP_ENERGY] = p->energy,   [BR_SUP_T_LIMIT] = p->t_limit,
        [BR_SUP_TRIPS] = p->trips,     [BR_SUP_FIRST_TRIP] = p->first_trip,
        [BR_SUP_LATCHED] = p->latched,
    };
    *out = v[key];
    return BR_OK;
}

/* ---- the periodic steady state ----------------------------------------- */

static const br_steady_figs *figs_of(const br_analysis *a, int d)
{
    if (!a || !(a->parts & BR_PART_STEADY) || d < 0 || d >= a->res->ndir)
        return NULL;
    return &a->res->figs[d];
}

int br_steady_cases(const br_analysis *a, int *out)
{
    if (!a || !(a->parts & BR_PART_STEADY) || !out)
        return BR_EUSAGE;
    *out = a->res->ndir;
    return BR_OK;
}

int br_steady_case_name(const br_analysis *a, int d, const char **out)
{
    const br_steady_figs *f = figs_of(a, d);
    if (!f || !out)
        return BR_EUSAGE;
    *out = br_dir_label(f->dir);
    return BR_OK;
}

int br_steady_get(const br_analysis *a, int d, int key, double *out)
{
    const br_steady_figs *f = figs_of(a, d);
    if (!f || !out || key < 0 || key >= BR_SS_KEY_COUNT)
        return BR_EUSAGE;
    const br_steady *ss = &a->res->ss[d];
    const double v[BR_SS_KEY_COUNT] = {
        [BR_SS_STATUS] = a->ss_status[d],
        [BR_SS_RESIDUAL] = ss->residual,
        [BR_SS_DRIFT] = ss->drift,
        [BR_SS_ITERATIONS] = ss->iterations,
        [BR_SS_PERIODS] = (double)ss->periods,
        [BR_SS_SHOOTING] = ss->method == BR_STEADY_SHOOTING,
        [BR_SS_SUPPLY_IAVG] = f->supply_iavg,
        [BR_SS_SUPPLY_P] = f->supply_p,
    };
    *out = v[key];
    return BR_OK;
}

int br_steady_why(const br_analysis *a, int d, const char **out)
{
    if (!figs_of(a, d) || !out)
        return BR_EUSAGE;
    *out = a->ss_why[d];
    return BR_OK;
}

int br_steady_rail(const br_analysis *a, int d, int k, int key, double *out)
{
    const br_steady_figs *f = figs_of(a, d);
    if (!f || !out || k < 0 || k >= a->n || key < 0 || key >= BR_RAIL_KEY_COUNT)
        return BR_EUSAGE;
    const br_rail_fig *r = &f->rail[k];
    const double v[BR_RAIL_KEY_COUNT] = {
        [BR_RAIL_VMIN] = r->vmin,          [BR_RAIL_VMAX] = r->vmax,
        [BR_RAIL_VAVG] = r->vavg,          [BR_RAIL_RIPPLE] = r->ripple,
        [BR_RAIL_DRV_MIN] = r->vdrv_min,   [BR_RAIL_DRV_MAX] = r->vdrv_max,
        [BR_RAIL_M_UVLO] = r->m_uvlo,      [BR_RAIL_M_RESTART] = r->m_restart,
        [BR_RAIL_M_DRIVE] = r->m_drive,    [BR_RAIL_M_GATE] = r->m_gate,
        [BR_RAIL_CAP_PEAK] = r->vcap_peak, [BR_RAIL_CAP_RMS] = r->icap_rms,
    };
    *out = v[key];
    return BR_OK;
}

int br_steady_link(const br_analysis *a, int d, int k, int key, double *out)
{
    const br_steady_figs *f = figs_of(a, d);
    if (!f || !out || k < 1 || k >= a->n || key < 0 || key >= BR_LINK_KEY_COUNT)
        return BR_EUSAGE;
    const br_link_fig *l = &f->link[k];
    const double v[BR_LINK_KEY_COUNT] = {
        [BR_LINK_VREV] = l->vrev_stress, [BR_LINK_VRRM] = l->vrrm,   [BR_LINK_IAVG] = l->iavg,
        [BR_LINK_IRMS] = l->irms,        [BR_LINK_IPEAK] = l->ipeak, [BR_LINK_QRR] = l->qrr,
        [BR_LINK_P_DIODE] = l->p_diode,  [BR_LINK_TJ] = l->tj,
    };
    *out = v[key];
    return BR_OK;
}

/* ---- the hold-up time ---------------------------------------------------- */

int br_holdup_get(const br_analysis *a, int d, int key, double *out)
{
    if (!a || !(a->parts & BR_PART_HOLDUP) || !figs_of(a, d) || !out || key < 0 ||
        key >= BR_HU_KEY_COUNT)
        return BR_EUSAGE;
    const br_holdup *h = &a->hu[d];
    int ok = a->hu_decided[d];
    const double v[BR_HU_KEY_COUNT] = {
        [BR_HU_DECIDED] = ok,
        [BR_HU_DROPPED] = ok ? h->dropped : NAN,
        [BR_HU_TIME] = !ok          ? NAN
                       : h->dropped ? h->t
                                    : INFINITY,
        [BR_HU_STAGE] = ok ? h->stage : -1,
        [BR_HU_V_AT] = ok && h->dropped ? h->v_at : NAN,
        [BR_HU_SIMULATED] = ok ? h->t_max : NAN,
    };
    *out = v[key];
    return BR_OK;
}

/* ---- time series ------------------------------------------------------- */

static const br_trace *trace_of(const br_analysis *a, int series)
{
    if (!a || !a->parts)
        return NULL;
    if (series == BR_SERIES_STARTUP)
        return a->tr.startup;
    int d = series - BR_SERIES_STEADY;
    return d >= 0 && d < a->res->ndir && d < 2 ? a->tr.steady[d] : NULL;
}

/* Column k of quantity key, row i. */
static double sample(const br_trace *t, int key, int k, long i)
{
    const double *cols[BR_SERIES_KEY_COUNT] = {
        [BR_SERIES_RAIL] = t->v,
        [BR_SERIES_LINK_I] = t->i,
        [BR_SERIES_DRIVER] = t->vd,
        [BR_SERIES_VREV] = t->vr,
    };
    return key == BR_SERIES_TIME ? t->t[i] : cols[key][i * t->n + k];
}

int br_series_get(const br_analysis *a, int series, int key, int k, double *buf, size_t cap,
                  size_t *len)
{
    const br_trace *t = trace_of(a, series);
    if (!t || !len || key < 0 || key >= BR_SERIES_KEY_COUNT || (cap && !buf))
        return BR_EUSAGE;
    if (key != BR_SERIES_TIME && (k < 0 || k >= t->n))
        return BR_EUSAGE;
    size_t n = (size_t)t->len;
    for (size_t i = 0; i < n && i < cap; i++)
        buf[i] = sample(t, key, k, (long)i);
    *len = n;
    return BR_OK;
}

/* ---- the verdict ------------------------------------------------------- */

static const br_verdict_row *row_of(const br_analysis *a, int i)
{
    if (!a || !a->parts || i < 0 || i >= a->nrows)
        return NULL;
    return &a->res->verdict.row[a->crit[i]];
}

int br_verdict_result(const br_analysis *a, int *out)
{
    if (!a || !a->parts || !out)
        return BR_EUSAGE;
    *out = br_results_failed(a->res)         ? BR_RESULT_FAIL
           : br_results_undetermined(a->res) ? BR_RESULT_UNDETERMINED
                                             : BR_RESULT_PASS;
    return BR_OK;
}

int br_verdict_rows(const br_analysis *a, int *out)
{
    if (!a || !a->parts || !out)
        return BR_EUSAGE;
    *out = a->nrows;
    return BR_OK;
}

int br_verdict_result_of(const br_analysis *a, int i, int *out)
{
    const br_verdict_row *r = row_of(a, i);
    if (!r || !out)
        return BR_EUSAGE;
    *out = r->undetermined ? BR_RESULT_UNDETERMINED
           : !r->applies   ? BR_RESULT_NOT_APPLICABLE
           : !r->pass      ? BR_RESULT_FAIL
           : r->warn       ? BR_RESULT_WARN
                           : BR_RESULT_PASS;
    return BR_OK;
}

/* Which string of row i: 0 key, 1 title, 2 unit, 3 note. */
static int row_text(const br_analysis *a, int i, int which, const char **out)
{
    const br_verdict_row *r = row_of(a, i);
    if (!r || !out)
        return BR_EUSAGE;
    int crit = a->crit[i];
    const char *s[] = {br_crit_name(crit), br_crit_title(crit), br_crit_unit(crit), r->note};
    *out = s[which];
    return BR_OK;
}

int br_verdict_key(const br_analysis *a, int i, const char **out)
{
    return row_text(a, i, 0, out);
}

int br_verdict_title(const br_analysis *a, int i, const char **out)
{
    return row_text(a, i, 1, out);
}

int br_verdict_unit(const br_analysis *a, int i, const char **out)
{
    return row_text(a, i, 2, out);
}

int br_verdict_note(const br_analysis *a, int i, const char **out)
{
    return row_text(a, i, 3, out);
}

int br_verdict_stage(const br_analysis *a, int i, int *out)
{
    const br_verdict_row *r = row_of(a, i);
    if (!r || !out)
        return BR_EUSAGE;
    *out = r->stage;
    return BR_OK;
}

int br_verdict_value(const br_analysis *a, int i, int key, double *out)
{
    const br_verdict_row *r = row_of(a, i);
    if (!r || !out || key < 0 || key >= BR_VERDICT_KEY_COUNT)
        return BR_EUSAGE;
    const double v[BR_VERDICT_KEY_COUNT] = {r->figure, r->limit, r->margin};
    *out = v[key];
    return BR_OK;
}

int br_criteria(void)
{
    return BR_CRIT_COUNT;
}

const char *br_criterion_key(int i)
{
    return i >= 0 && i < BR_CRIT_COUNT ? br_crit_name(i) : NULL;
}

const char *br_criterion_title(int i)
{
    return i >= 0 && i < BR_CRIT_COUNT ? br_crit_title(i) : NULL;
}

/* ---- reports (bootrung/report.h) ---------------------------------------- */

static int render_usage(br_error *err, const char *why)
{
    return br_error_set(err, BR_EUSAGE, NULL, 0, NULL, "br_analysis_render: %s", why);
}

int br_analysis_render(const br_analysis *a, int format, br_text *out, br_error *err)
{
    if (!a || !out || !a->parts || !a->kept.c)
        return render_usage(err, "expected an analysis that has run on a chain of a design, "
                                 "and a text");
    switch (format) {
    case BR_FORMAT_TEXT:
        return br_results_text(a->res, out, err);
    case BR_FORMAT_XML:
        return br_results_xml(a->res, br_version(), out, err);
    case BR_FORMAT_HTML:
        if (!a->keep_series)
            return render_usage(err, "the HTML report plots the series: keep them "
                                     "(br_analysis_set_series) before the run");
        return br_results_html(a->res, &a->tr, out, err);
    case BR_FORMAT_CSV:
        if (!a->keep_csv)
            return render_usage(err, "the CSV is recorded during a run: ask for it "
                                     "(br_analysis_set_csv) before the run");
        return br_text_put(out, br_text_data(a->csv));
    case BR_FORMAT_SVG:
        if (!a->keep_series || (a->parts & BR_PART_ALL) == BR_PART_ALL)
            return render_usage(err, "the plot is of a start-up or a steady state run alone, "
                                     "with the series kept (br_analysis_set_series)");
        return br_results_plot(a->res, &a->tr, out, err);
    default:
        return render_usage(err, "expected a format of br_format");
    }
}

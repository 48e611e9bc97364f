/* corners.c - the worst-case corners through the public API
 * (include/bootrung/analysis.h): an opaque object over analyses/corners,
 * handing out its rows as they are. */
#include "bootrung/analysis.h"
#include "bootrung/report.h"

#include "kept.h"

#include "analyses/corners.h"
#include "analyses/spread.h"
#include "core/error.h"
#include "core/progress.h"
#include "report/corners_report.h"
#include "report/verb_pages.h"

#include <stdlib.h>
#include <string.h>

struct br_corner_search {
    br_corners *k; /* the last run's (NULL: none) */
    int startup;
    br_progress prog;
    br_tol_list tl;                        /* the parameters, copied: the design may go */
    int threads, exhaustive, solver_limit; /* the search's settings (-1: its default) */
    br_kept kept;                          /* the design and its chain, for the reports */
};

_Static_assert(BR_THREADS_MAX == BR_SPREAD_MAX_THREADS, "the public header's thread limit");

br_corner_search *br_corner_search_create(void)
{
    br_corner_search *s = calloc(1, sizeof *s);
    if (s) {
        s->startup = 1;
        s->exhaustive = -1;
    }
    return s;
}

void br_corner_search_free(br_corner_search *s)
{
    if (s) {
        br_corners_free(s->k);
        br_kept_release(&s->kept);
    }
    free(s);
}

int br_corner_search_set_progress(br_corner_search *s, br_progress_hook hook, br_stop_poll stop,
                                  void *ctx)
{
    if (!s)
        return BR_EUSAGE;
    s->prog = (br_progress){hook, ctx, stop};
    return BR_OK;
}

int br_corner_search_set_startup(br_corner_search *s, int on)
{
    if (!s || (on != 0 && on != 1))
        return BR_EUSAGE;
    s->startup = on;
    return BR_OK;
}

int br_corner_search_set_threads(br_corner_search *s, int n)
{
    if (!s || n < 0 || n > BR_THREADS_MAX)
        return BR_EUSAGE;
    s->threads = n;
    return BR_OK;
}

int br_corner_search_set_exhaustive(br_corner_search *s, int n)
{
    if (!s || n < 0 || n > BR_CORNERS_EXHAUSTIVE_MAX)
        return BR_EUSAGE;
    s->exhaustive = n;
    return BR_OK;
}

int br_corner_search_set_solver_limit(br_corner_search *s, long n)
{
    if (!s || n < 0 || n > BR_SOLVER_LIMIT_MAX)
        return BR_EUSAGE;
    s->solver_limit = (int)n;
    return BR_OK;
}

int br_corner_search_run(br_corner_search *s, const br_design *d, br_error *err)
{
    if (!s || !d)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_corner_search_run: expected a search and a design");
    br_corners_free(s->k);
    s->k = NULL;
    br_corners_opts o;
    br_corners_opts_default(&o);
    o.startup = s->startup;
    o.progress = &s->prog;
    o.threads = s->threads;
    o.solver_limit = s->solver_limit;
    if (s->exhaustive >= 0)
        o.max_exhaustive = s->exhaustive;
    br_corners *k = NULL;
    int rc = br_kept_take(&s->kept, d, err);
    if (rc == BR_OK)
        rc = br_corners_run(d, &o, &k, err);
    if (rc != BR_OK) {
        br_corners_free(k);
        return rc;
    }
    s->tl = k->s->tl;
    k->s->d = s->kept.d; /* the caller's design may go: the report reads the copy */
    s->k = k;
    return BR_OK;
}

static const br_corner_worst *row_of(const br_corner_search *s, int i)
{
    return s && s->k && i >= 0 && i < BR_CRIT_COUNT ? &s->k->w[i] : NULL;
}

int br_corner_result(const br_corner_search *s, int *out)
{
    if (!s || !s->k || !out)
        return BR_EUSAGE;
    *out = s->k->outcome == BR_OUTCOME_FAIL           ? BR_RESULT_FAIL
           : s->k->outcome == BR_OUTCOME_UNDETERMINED ? BR_RESULT_UNDETERMINED
                                                      : BR_RESULT_PASS;
    return BR_OK;
}

int br_corner_rows(const br_corner_search *s, int *out)
{
    if (!s || !s->k || !out)
        return BR_EUSAGE;
    *out = BR_CRIT_COUNT;
    return BR_OK;
}

int br_corner_key(const br_corner_search *s, int i, const char **out)
{
    if (!row_of(s, i) || !out)
        return BR_EUSAGE;
    *out = br_crit_name(i);
    return BR_OK;
}

/* As the corners report words it: not applicable when never checked and
 * never undetermined; a pass with a warning at the worst corner warns. */
int br_corner_result_of(const br_corner_search *s, int i, int *out)
{
    const br_corner_worst *w = row_of(s, i);
    if (!w || !out)
        return BR_EUSAGE;
    int undet = w->outcome == BR_OUTCOME_UNDETERMINED;
    *out = !w->applies && !undet           ? BR_RESULT_NOT_APPLICABLE
           : undet                         ? BR_RESULT_UNDETERMINED
           : w->outcome == BR_OUTCOME_FAIL ? BR_RESULT_FAIL
           : w->worst.warn                 ? BR_RESULT_WARN
                                           : BR_RESULT_PASS;
    return BR_OK;
}

int br_corner_stage(const br_corner_search *s, int i, int *out)
{
    const br_corner_worst *w = row_of(s, i);
    if (!w || !out)
        return BR_EUSAGE;
    *out = w->worst.stage;
    return BR_OK;
}

int br_corner_value(const br_corner_search *s, int i, int key, double *out)
{
    const br_corner_worst *w = row_of(s, i);
    if (!w || !out || key < 0 || key >= BR_CORNER_KEY_COUNT)
        return BR_EUSAGE;
    const double v[BR_CORNER_KEY_COUNT] = {
        [BR_CORNER_WORST_FIGURE] = w->worst.figure,
        [BR_CORNER_WORST_LIMIT] = w->worst.limit,
        [BR_CORNER_WORST_MARGIN] = w->worst.margin,
        [BR_CORNER_NOMINAL_FIGURE] = w->nominal.figure,
        [BR_CORNER_NOMINAL_MARGIN] = w->nominal.margin,
        [BR_CORNER_UNDETERMINED] = (double)w->undetermined,
    };
    *out = v[key];
    return BR_OK;
}

int br_corner_params(const br_corner_search *s, int *out)
{
    if (!s || !s->k || !out)
        return BR_EUSAGE;
    *out = s->tl.n;
    return BR_OK;
}

int br_corner_param_name(const br_corner_search *s, int j, const char **out)
{
    if (!s || !s->k || !out || j < 0 || j >= s->tl.n)
        return BR_EUSAGE;
    *out = s->tl.p[j].name;
    return BR_OK;
}

int br_corner_level(const br_corner_search *s, int i, int j, int *out)
{
    const br_corner_worst *w = row_of(s, i);
    if (!w || !out || j < 0 || j >= s->tl.n)
        return BR_EUSAGE;
    *out = w->level[j];
    return BR_OK;
}

int br_corner_count_of(const br_corner_search *s, int key, long *out)
{
    if (!s || !s->k || !out || key < 0 || key >= BR_CORNERS_COUNT_KEYS)
        return BR_EUSAGE;
    const long v[BR_CORNERS_COUNT_KEYS] = {
        [BR_CORNERS_STEADY_POINTS] = s->k->steady_points,
        [BR_CORNERS_STARTUP_POINTS] = s->k->startup_points,
        [BR_CORNERS_UNJUDGED] = s->k->unjudged,
        [BR_CORNERS_UNDETERMINED] = s->k->undetermined,
    };
    *out = v[key];
    return BR_OK;
}

/* ---- reports (bootrung/report.h) ---------------------------------------- */

static int rendered(int rc, br_error *err)
{
    if (rc == BR_ENOMEM && err && !err->msg[0])
        br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory rendering the report");
    return rc;
}

int br_corner_search_render(const br_corner_search *s, int format, br_text *out, br_error *err)
{
    static const char *const verdict[] = {BR_CORNERS_VERDICT, NULL};
    if (!s || !s->k || !s->kept.c || !out)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_corner_search_render: expected a search that has run, and a text");
    if (err)
        br_error_clear(err);
    if (format == BR_FORMAT_TEXT)
        return rendered(br_corners_text(s->kept.c, s->k, out), err);
    if (format == BR_FORMAT_XML)
        return rendered(br_corners_xml(s->kept.c, s->k, br_version(), out, err), err);
    if (format != BR_FORMAT_HTML)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_corner_search_render: the search offers text, XML and HTML");
    br_text *text = br_text_create();
    int rc = text ? br_corners_text(s->kept.c, s->k, text) : BR_ENOMEM;
    if (rc == BR_OK)
        rc = br_text_html(s->kept.c, "worst-case corners", s->k->outcome, verdict, 1, text, out,
                          err);
    br_text_free(text);
    return rendered(rc, err);
}

/* map.c - the duty-frequency map through the public API
 * (include/bootrung/analysis.h): an opaque object over analyses/map,
 * handing out its grid points as judged. */
#include "bootrung/analysis.h"
#include "bootrung/report.h"

#include "kept.h"

#include "analyses/map.h"
#include "core/error.h"
#include "core/progress.h"
#include "report/map_report.h"
#include "report/verb_pages.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

_Static_assert(BR_MAP_THREADS_MAX == BR_MAP_MAX_THREADS && BR_MAP_POINTS_MAX == BR_MAP_MAX_N,
               "the public header's limits are the map's");

struct br_map_study {
    br_map *r; /* the last run's (NULL: none) */
    br_map_opts o;
    br_progress prog;
    br_hold_point *rec; /* the last run's points as records: the grid, then the design */
    char csv[4096];     /* the files the text report names ("": none) */
    char svg[4096];
    int csv_named, svg_named;
    br_kept kept; /* the design and its chain, for the reports */
};

br_map_study *br_map_study_create(void)
{
    br_map_study *m = calloc(1, sizeof *m);
    if (m)
        m->o.threads = 2; /* as the command line: the two axes' rows side by side */
    return m;
}

void br_map_study_free(br_map_study *m)
{
    if (m) {
        br_map_free(m->r);
        free(m->rec);
        br_kept_release(&m->kept);
    }
    free(m);
}

int br_map_study_set_progress(br_map_study *m, br_progress_hook hook, br_stop_poll stop, void *ctx)
{
    if (!m)
        return BR_EUSAGE;
    m->prog = (br_progress){hook, ctx, stop};
    return BR_OK;
}

int br_map_study_set_grid(br_map_study *m, double duty_from, double duty_to, int nduty,
                          double fsw_from, double fsw_to, int nfsw)
{
    if (!m)
        return BR_EUSAGE;
    m->o.duty_from = duty_from;
    m->o.duty_to = duty_to;
    m->o.nduty = nduty;
    m->o.fsw_from = fsw_from;
    m->o.fsw_to = fsw_to;
    m->o.nfsw = nfsw;
    return BR_OK;
}

int br_map_study_set_threads(br_map_study *m, int n)
{
    if (!m || n < 1 || n > BR_MAP_THREADS_MAX)
        return BR_EUSAGE;
    m->o.threads = n;
    return BR_OK;
}

int br_map_study_set_shard(br_map_study *m, int k, int n)
{
    if (!m || n < 0 || (n > 0 && (k < 1 || k > n)))
        return BR_EUSAGE;
    m->o.shard_k = n > 0 ? k : 0;
    m->o.shard_n = n;
    return BR_OK;
}

size_t br_map_record_size(void)
{
    return sizeof(br_hold_point);
}

int br_map_study_set_given(br_map_study *m, const void *rec, size_t size, long total)
{
    if (!m || (rec && (size != sizeof(br_hold_point) || m->o.nduty < 1 || m->o.nfsw < 1 ||
                       total != (long)m->o.nduty * m->o.nfsw + 1)))
        return BR_EUSAGE;
    m->o.given = rec;
    return BR_OK;
}

int br_map_study_check(const br_map_study *m, br_error *err)
{
    if (!m)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL, "br_map_study_check: expected a study");
    return br_map_opts_check(&m->o, err);
}

static int name(char *dst, size_t cap, int *named, const char *path)
{
    *named = path != NULL;
    return snprintf(dst, cap, "%s", path ? path : "") < (int)cap ? BR_OK : BR_EUSAGE;
}

int br_map_study_set_file_names(br_map_study *m, const char *csv, const char *svg)
{
    if (!m || name(m->csv, sizeof m->csv, &m->csv_named, csv) != BR_OK ||
        name(m->svg, sizeof m->svg, &m->svg_named, svg) != BR_OK)
        return BR_EUSAGE;
    return BR_OK;
}

/* The grid's points, then the design point, one record each. */
static int records(br_map_study *m, br_error *err)
{
    long n = (long)m->r->nduty * m->r->nfsw;
    free(m->rec);
    if (!(m->rec = malloc(sizeof *m->rec * (size_t)(n + 1))))
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    for (long k = 0; k < n; k++)
        m->rec[k] = *br_map_at(m->r, (int)(k % m->r->nduty), (int)(k / m->r->nduty));
    m->rec[n] = m->r->design;
    return BR_OK;
}

int br_map_records(const br_map_study *m, const void **rec, long *count)
{
    if (!m || !m->r || !m->rec || !rec || !count)
        return BR_EUSAGE;
    *rec = m->rec;
    *count = (long)m->r->nduty * m->r->nfsw + 1;
    return BR_OK;
}

int br_map_study_judges(const br_map_study *m, long k, int *out)
{
    long n = m && m->r ? (long)m->r->nduty * m->r->nfsw : -1;
    if (!m || !m->r || !out || k < 0 || k > n)
        return BR_EUSAGE;
    *out =
        k == n ? 1 : br_map_shard_has(m->r, &m->o, (int)(k % m->r->nduty), (int)(k / m->r->nduty));
    return BR_OK;
}

int br_map_result(const br_map_study *m, int *out)
{
    if (!m || !m->r || !out)
        return BR_EUSAGE;
    /* no steady state found at the design point decides nothing */
    *out = isnan(m->r->design.margin) ? BR_RESULT_UNDETERMINED
           : m->r->design.holds       ? BR_RESULT_PASS
                                      : BR_RESULT_FAIL;
    return BR_OK;
}

int br_map_study_run(br_map_study *m, const br_design *d, br_error *err)
{
    if (!m || !d)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_map_study_run: expected a study and a design");
    br_map_free(m->r);
    m->r = NULL;
    br_map_opts o = m->o;
    o.progress = &m->prog;
    int rc = br_map_opts_check(&o, err); /* the grid, said as the library's error */
    if (rc == BR_OK)
        rc = br_kept_take(&m->kept, d, err);
    if (rc == BR_OK)
        rc = br_map_run(d, &o, &m->r, err);
    if (rc == BR_OK)
        rc = records(m, err);
    if (rc != BR_OK) {
        br_map_free(m->r);
        m->r = NULL;
    }
    return rc;
}

int br_map_size(const br_map_study *m, int *nduty, int *nfsw)
{
    if (!m || !m->r || !nduty || !nfsw)
        return BR_EUSAGE;
    *nduty = m->r->nduty;
    *nfsw = m->r->nfsw;
    return BR_OK;
}

int br_map_point(const br_map_study *m, int i, int j, int key, double *out)
{
    if (!m || !m->r || !out || key < 0 || key >= BR_MAP_KEY_COUNT)
        return BR_EUSAGE;
    int design = i == -1 && j == -1;
    if (!design && (i < 0 || i >= m->r->nduty || j < 0 || j >= m->r->nfsw))
        return BR_EUSAGE;
    const br_hold_point *p = design ? &m->r->design : br_map_at(m->r, i, j);
    const double v[BR_MAP_KEY_COUNT] = {
        [BR_MAP_DUTY] = p->duty,   [BR_MAP_FSW] = p->fsw,     [BR_MAP_MARGIN] = p->margin,
        [BR_MAP_HOLDS] = p->holds, [BR_MAP_STAGE] = p->stage, [BR_MAP_CRITERION] = p->crit,
    };
    *out = v[key];
    return BR_OK;
}

/* ---- reports (bootrung/report.h) ---------------------------------------- */

static int html(const br_map_study *m, br_text *out, br_error *err)
{
    br_text *text = br_text_create();
    int rc = text ? BR_OK : br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    if (rc == BR_OK)
        rc = br_map_text(m->kept.c, m->r, m->csv_named ? m->csv : NULL,
                         m->svg_named ? m->svg : NULL, text, err);
    if (rc == BR_OK)
        rc = br_map_html(m->kept.c, m->r, text, out, err);
    br_text_free(text);
    return rc;
}

int br_map_study_render(const br_map_study *m, int format, br_text *out, br_error *err)
{
    if (!m || !m->r || !m->kept.c || !out || m->o.shard_n > 0)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_map_study_render: expected a study that has run on the whole "
                            "grid (a shard renders no report), and a text");
    switch (format) {
    case BR_FORMAT_TEXT:
        return br_map_text(m->kept.c, m->r, m->csv_named ? m->csv : NULL,
                           m->svg_named ? m->svg : NULL, out, err);
    case BR_FORMAT_CSV:
        return br_map_csv(m->kept.c, m->r, out, err);
    case BR_FORMAT_SVG:
        return br_map_svg(m->kept.c, m->r, out, err);
    case BR_FORMAT_HTML:
        return html(m, out, err);
    default:
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_map_study_render: the map offers text, CSV, SVG and HTML");
    }
}

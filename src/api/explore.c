/* explore.c - the exploration through the public API
 * (include/bootrung/parts.h): an opaque object over analyses/explore,
 * its combinations as they are, its reports, shard records and design
 * files as `explore` writes them. */
#include "bootrung/parts.h"

#include "analyses/explore.h"
#include "api/study.h"
#include "core/error.h"
#include "core/progress.h"
#include "io/design_write.h"
#include "model/tolerance.h"
#include "report/explore_report.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

_Static_assert(BR_EXPLORE_FSW_MAX == BR_EXPLORE_MAX_FSW, "the public bound is the analysis's");
_Static_assert(BR_EXPLORE_LEVELS_MAX == BR_MAX_SWITCHES / 2 + 1,
               "the public bound is the chain's: two switches a level");
_Static_assert((int)BR_COMBO_FEASIBLE == (int)BR_EX_FEASIBLE &&
                   (int)BR_COMBO_SPLIT == (int)BR_EX_SPLIT &&
                   (int)BR_COMBO_CORNERS == (int)BR_EX_CORNERS &&
                   (int)BR_COMBO_REFUSED == (int)BR_EX_REFUSED,
               "the public states are the analysis's");

struct br_explore_study {
    br_explore_opts o; /* as set; cat and progress filled by the run */
    br_progress prog;
    br_design *t;          /* a copy of the last run's template */
    br_catalog *cat;       /* a copy of its catalog */
    br_explore *x;         /* the last run's (NULL: none) */
    br_catalog *parts_set; /* the parts catalog as set (NULL: no sizing) */
    br_catalog *parts;     /* the last run's copy of it, which x points at */
};

br_explore_study *br_explore_study_create(void)
{
    br_explore_study *x = calloc(1, sizeof *x);
    if (x)
        br_explore_opts_default(&x->o);
    return x;
}

static void drop_run(br_explore_study *x)
{
    br_explore_free(x->x);
    br_design_free(x->t);
    free(x->cat);
    free(x->parts);
    x->x = NULL;
    x->t = NULL;
    x->cat = NULL;
    x->parts = NULL;
}

void br_explore_study_free(br_explore_study *x)
{
    if (x) {
        drop_run(x);
        free(x->parts_set);
    }
    free(x);
}

int br_explore_study_set_progress(br_explore_study *x, br_progress_hook hook, br_stop_poll stop,
                                  void *ctx)
{
    if (!x)
        return BR_EUSAGE;
    x->prog = (br_progress){hook, ctx, stop};
    return BR_OK;
}

int br_explore_study_set_threads(br_explore_study *x, int threads)
{
    if (!x || !br_study_threads_ok(threads))
        return BR_EUSAGE;
    x->o.threads = threads;
    return BR_OK;
}

int br_explore_study_set_bus(br_explore_study *x, double vbus, double vmax)
{
    if (!x || !(vbus > 0 && vbus < 1e6 && vmax >= vbus && vmax < 1e6))
        return BR_EUSAGE;
    x->o.vbus = vbus;
    x->o.vbus_max = vmax;
    return BR_OK;
}

int br_explore_study_set_levels(br_explore_study *x, int lo, int hi)
{
    if (!x || lo < 2 || hi < lo || hi > BR_EXPLORE_LEVELS_MAX)
        return BR_EUSAGE;
    x->o.lmin = lo;
    x->o.lmax = hi;
    return BR_OK;
}

int br_explore_study_set_frequencies(br_explore_study *x, const double *fsw, int n)
{
    if (!x || !fsw || n < 1 || n > BR_EXPLORE_FSW_MAX)
        return BR_EUSAGE;
    for (int i = 0; i < n; i++)
        if (!(fsw[i] > 0 && fsw[i] < 1e9))
            return BR_EUSAGE;
    memcpy(x->o.fsw, fsw, (size_t)n * sizeof *fsw);
    x->o.nfsw = n;
    return BR_OK;
}

/* NaN: the default (analyses/explore.c: br_explore_opts_default). */
int br_explore_study_set(br_explore_study *x, int which, double value)
{
    int dflt = isnan(value);
    if (!x || which < 0 || which >= BR_EXPLORE_LIMIT_COUNT || (!dflt && !(value >= 0)) ||
        (!dflt && which == BR_EXPLORE_DERATING && !(value > 0 && value <= 1)))
        return BR_EUSAGE;
    switch (which) {
    case BR_EXPLORE_LOAD_CURRENT:
        x->o.iload = dflt ? -1.0 : value;
        break;
    case BR_EXPLORE_DERATING:
        x->o.derating = dflt ? 0.0 : value;
        break;
    case BR_EXPLORE_TARGET:
        x->o.target = dflt ? -1.0 : value;
        break;
    case BR_EXPLORE_MAX_STARTUP:
        x->o.max_startup = dflt ? HUGE_VAL : value;
        break;
    default:
        x->o.max_cost = dflt ? HUGE_VAL : value;
        break;
    }
    return BR_OK;
}

int br_explore_study_set_corners(br_explore_study *x, int on)
{
    if (!x || (on != 0 && on != 1))
        return BR_EUSAGE;
    x->o.corners = on;
    return BR_OK;
}

int br_explore_study_set_scale_caps(br_explore_study *x, int on)
{
    if (!x || (on != 0 && on != 1))
        return BR_EUSAGE;
    x->o.scale_caps = on;
    return BR_OK;
}

int br_explore_study_set_shard(br_explore_study *x, int k, int n)
{
    if (!x || n < 0 || (n > 0 && (k < 1 || k > n)))
        return BR_EUSAGE;
    x->o.shard_k = n > 0 ? k : 0;
    x->o.shard_n = n;
    return BR_OK;
}

/* A copy: the run copies it again, so that a later set leaves the last
 * run's sized designs alone. */
int br_explore_study_set_parts(br_explore_study *x, const br_catalog *parts)
{
    if (!x)
        return BR_EUSAGE;
    br_catalog *copy = parts ? malloc(sizeof *copy) : NULL;
    if (parts && !copy)
        return BR_ENOMEM;
    if (copy)
        memcpy(copy, parts, sizeof *copy);
    free(x->parts_set);
    x->parts_set = copy;
    return BR_OK;
}

int br_explore_study_set_yield(br_explore_study *x, long samples, unsigned long seed)
{
    if (!x || samples < 0 || samples > BR_EXPLORE_YIELD_MAX || seed > 0xffffffffUL)
        return BR_EUSAGE;
    x->o.yield_samples = samples;
    x->o.seed = seed;
    return BR_OK;
}

int br_explore_study_set_given(br_explore_study *x, const void *records, long n, size_t size)
{
    if (!x || (records && (size != sizeof(br_explore_row) || n < 0)))
        return BR_EUSAGE;
    x->o.given = records;
    x->o.ngiven = records ? n : 0;
    return BR_OK;
}

size_t br_explore_record_size(void)
{
    return sizeof(br_explore_row);
}

int br_explore_study_run(br_explore_study *x, const br_design *t, const br_catalog *cat,
                         br_error *err)
{
    if (!x || !t || !cat)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_explore_study_run: expected a study, a template and a catalog");
    drop_run(x);
    x->t = br_design_copy(t);
    x->cat = malloc(sizeof *x->cat);
    x->parts = x->parts_set ? malloc(sizeof *x->parts) : NULL;
    if (!x->t || !x->cat || (x->parts_set && !x->parts)) {
        drop_run(x);
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory copying the inputs");
    }
    memcpy(x->cat, cat, sizeof *x->cat);
    if (x->parts)
        memcpy(x->parts, x->parts_set, sizeof *x->parts);
    x->o.cat = x->cat;
    x->o.parts = x->parts;
    x->o.progress = &x->prog;
    int rc = br_explore_run(x->t, &x->o, &x->x, err);
    x->o.given = NULL; /* the caller's records are not kept beyond the run */
    x->o.ngiven = 0;
    if (rc != BR_OK)
        drop_run(x);
    return rc;
}

int br_explore_result(const br_explore_study *x, int *out)
{
    if (!x || !x->x || !out || x->o.shard_n > 0)
        return BR_EUSAGE;
    *out = br_study_result(br_explore_outcome(x->x));
    return BR_OK;
}

int br_explore_combinations(const br_explore_study *x, int *out)
{
    if (!x || !x->x || !out)
        return BR_EUSAGE;
    *out = x->x->n;
    return BR_OK;
}

static const br_explore_row *row_of(const br_explore_study *x, int i)
{
    return x && x->x && i >= 0 && i < x->x->n ? &x->x->rows[i] : NULL;
}

int br_explore_value(const br_explore_study *x, int i, int key, double *out)
{
    const br_explore_row *r = row_of(x, i);
    if (!r || !out || key < 0 || key >= BR_XV_KEY_COUNT)
        return BR_EUSAGE;
    const double v[BR_XV_KEY_COUNT] = {
        [BR_XV_LEVELS] = r->levels,
        [BR_XV_FSW] = r->fsw,
        [BR_XV_SWITCH] = r->sw,
        [BR_XV_DIODE] = r->diode,
        [BR_XV_NEED] = r->need,
        [BR_XV_STATE] = r->state,
        [BR_XV_COST] = r->cost,
        [BR_XV_LOSS] = r->loss,
        [BR_XV_MARGIN] = r->margin,
        [BR_XV_STARTUP] = r->tstart,
        [BR_XV_CRITERION] = r->crit,
        [BR_XV_STAGE] = r->stage,
        [BR_XV_SPLIT_AT] = r->split_at,
        [BR_XV_FRONT] = r->front,
        [BR_XV_RANK] = r->rank,
        [BR_XV_INJECT_RAIL] = r->state == BR_EX_SPLIT ? r->inject_rail : 0,
    };
    *out = v[key];
    return BR_OK;
}

int br_explore_note(const br_explore_study *x, int i, const char **out)
{
    const br_explore_row *r = row_of(x, i);
    if (!r || !out)
        return BR_EUSAGE;
    *out = r->note;
    return BR_OK;
}

int br_explore_design_file(const br_explore_study *x, int i, br_text *out, br_error *err)
{
    const br_explore_row *r = row_of(x, i);
    if (!r || !out)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_explore_design_file: expected a study that was run, a "
                            "combination and a text");
    br_design *d = NULL;
    br_text *comment = br_text_create();
    int rc = comment ? br_explore_design(x->t, &x->o, r, &d, err) : BR_ENOMEM;
    if (rc == BR_OK)
        rc = br_explore_comment(x->x, x->cat, r, x->t->path, comment);
    if (rc == BR_OK)
        rc = br_design_write(d, br_text_data(comment), out, err);
    br_design_free(d);
    br_text_free(comment);
    if (rc == BR_ENOMEM && err && !err->msg[0])
        br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory rendering the design file");
    return rc;
}

int br_explore_split_file(const br_explore_study *x, int i, br_text *out, br_error *err)
{
    const br_explore_row *r = row_of(x, i);
    if (!r || !out || r->state != BR_EX_SPLIT || r->inject_rail <= 0)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_explore_split_file: expected a study that was run, a "
                            "combination whose split design was judged and a text");
    br_design *d = NULL, *s = NULL;
    br_text *comment = br_text_create();
    int rc = comment ? br_explore_design(x->t, &x->o, r, &d, err) : BR_ENOMEM;
    if (rc == BR_OK)
        rc = br_explore_split_design(
            d, r->inject_rail, r->module >= 0 ? &x->x->modules->modules[r->module] : NULL, &s, err);
    if (rc == BR_OK)
        rc = br_explore_split_comment(x->x, x->cat, r, x->t->path, comment);
    if (rc == BR_OK)
        rc = br_design_write(s, br_text_data(comment), out, err);
    br_design_free(s);
    br_design_free(d);
    br_text_free(comment);
    if (rc == BR_ENOMEM && err && !err->msg[0])
        br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory rendering the design file");
    return rc;
}

int br_explore_records(const br_explore_study *x, const void **records, size_t *size, long *n)
{
    if (!x || !x->x || !records || !size || !n)
        return BR_EUSAGE;
    *records = x->x->rows;
    *size = sizeof *x->x->rows;
    *n = x->x->n;
    return BR_OK;
}

int br_explore_judged(const br_explore_study *x, int i, int *out)
{
    if (!row_of(x, i) || !out)
        return BR_EUSAGE;
    *out = br_explore_shard_has(&x->o, i);
    return BR_OK;
}

int br_explore_study_render(const br_explore_study *x, int format, br_text *out, br_error *err)
{
    if (!x || !x->x || !out || x->o.shard_n > 0)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_explore_study_render: expected a study that was run whole and "
                            "a text");
    int rc;
    switch (format) {
    case BR_FORMAT_TEXT:
        rc = br_explore_text(x->x, x->cat, x->t->path, out);
        break;
    case BR_FORMAT_CSV:
        rc = br_explore_csv(x->x, x->cat, out);
        break;
    case BR_FORMAT_SVG:
        rc = br_explore_svg(x->x, out);
        break;
    default:
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_explore_study_render: expected BR_FORMAT_TEXT, _CSV or _SVG");
    }
    if (rc == BR_ENOMEM && err && !err->msg[0])
        br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory rendering the report");
    return rc;
}

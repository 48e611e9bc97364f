/* supply.c - the supply window through the public API
 * (include/bootrung/parts.h): an opaque object over
 * analyses/supply_window, its three answers as they are, its reports as
 * `supply` writes them. */
#include "bootrung/parts.h"

#include "analyses/supply_window.h"
#include "api/study.h"
#include "core/error.h"
#include "core/progress.h"
#include "report/supply_window_report.h"

#include <math.h>
#include <stdlib.h>

_Static_assert((int)BR_SUPPLY_LIMIT == (int)BR_SW_LIMIT && (int)BR_SUPPLY_VMIN == (int)BR_SW_VMIN &&
                   (int)BR_SUPPLY_VMAX == (int)BR_SW_VMAX,
               "the public answers are the analysis's");
_Static_assert((int)BR_ANSWER_FOUND == (int)BR_SW_FOUND &&
                   (int)BR_ANSWER_RANGE_END == (int)BR_SW_RANGE_END &&
                   (int)BR_ANSWER_NONE == (int)BR_SW_NONE &&
                   (int)BR_ANSWER_UNDETERMINED == (int)BR_SW_UNDETERMINED,
               "the public kinds are the analysis's");

struct br_supply_study {
    br_supply_window_opts o;
    br_progress prog;
    br_study_base base;
    br_supply_window *w; /* the last run's (NULL: none) */
};

br_supply_study *br_supply_study_create(void)
{
    return calloc(1, sizeof(br_supply_study));
}

static void drop_run(br_supply_study *s)
{
    br_supply_window_free(s->w);
    s->w = NULL;
    br_study_base_clear(&s->base);
}

void br_supply_study_free(br_supply_study *s)
{
    if (s)
        drop_run(s);
    free(s);
}

int br_supply_study_set_progress(br_supply_study *s, br_progress_hook hook, br_stop_poll stop,
                                 void *ctx)
{
    if (!s)
        return BR_EUSAGE;
    s->prog = (br_progress){hook, ctx, stop};
    return BR_OK;
}

int br_supply_study_set_threads(br_supply_study *s, int threads)
{
    if (!s || !br_study_threads_ok(threads))
        return BR_EUSAGE;
    s->o.threads = threads;
    return BR_OK;
}

int br_supply_study_run(br_supply_study *s, const br_design *d, br_error *err)
{
    if (!s || !d)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_supply_study_run: expected a study and a design");
    drop_run(s);
    int rc = br_study_base_set(&s->base, d, err);
    if (rc == BR_OK) {
        br_supply_window_opts o = s->o;
        o.progress = &s->prog;
        rc = br_supply_window_run(s->base.d, &o, &s->w, err);
    }
    if (rc != BR_OK)
        drop_run(s);
    return rc;
}

int br_supply_result(const br_supply_study *s, int *out)
{
    if (!s || !s->w || !out)
        return BR_EUSAGE;
    *out = br_study_result(br_supply_window_outcome(s->w));
    return BR_OK;
}

static const br_sw_result *answer_of(const br_supply_study *s, int answer)
{
    return s && s->w && answer >= 0 && answer < BR_SW_COUNT ? &s->w->r[answer] : NULL;
}

int br_supply_answer(const br_supply_study *s, int answer, int key, double *out)
{
    const br_sw_result *r = answer_of(s, answer);
    if (!r || !out || key < 0 || key >= BR_SA_KEY_COUNT)
        return BR_EUSAGE;
    int found = r->applies && r->kind != BR_SW_RANGE_END;
    const double v[BR_SA_KEY_COUNT] = {
        [BR_SA_APPLIES] = r->applies,
        [BR_SA_KIND] = r->kind,
        [BR_SA_FROM] = r->from,
        [BR_SA_LO] = r->lo,
        [BR_SA_HI] = r->hi,
        [BR_SA_VALUE] = r->value,
        [BR_SA_FAILING] = found ? r->fail.value : NAN,
        [BR_SA_FAIL_CRITERION] = found ? r->fail.crit : -1,
        [BR_SA_FAIL_STAGE] = found ? r->fail.stage : -1,
        [BR_SA_POINTS] = r->npts,
    };
    *out = v[key];
    return BR_OK;
}

int br_supply_answer_why(const br_supply_study *s, int answer, const char **out)
{
    const br_sw_result *r = answer_of(s, answer);
    if (!r || !out)
        return BR_EUSAGE;
    *out = r->applies ? "" : r->why;
    return BR_OK;
}

static int render_text(const void *study, br_text *out)
{
    const br_supply_study *s = study;
    return br_supply_window_text(s->base.c, s->w, out);
}

int br_supply_study_render(const br_supply_study *s, int format, br_text *out, br_error *err)
{
    if (!s || !s->w || !out)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_supply_study_render: expected a study that was run and a text");
    int rc;
    switch (format) {
    case BR_FORMAT_TEXT:
        rc = render_text(s, out);
        break;
    case BR_FORMAT_XML:
        rc = br_supply_window_xml(s->base.c, s->w, br_version(), out, err);
        break;
    case BR_FORMAT_HTML:
        return br_study_html(s->base.c, "supply window", br_supply_window_outcome(s->w), 1,
                             render_text, s, out, err);
    default:
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_supply_study_render: expected BR_FORMAT_TEXT, _XML or _HTML");
    }
    if (rc == BR_ENOMEM && err && !err->msg[0])
        br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory rendering the report");
    return rc;
}

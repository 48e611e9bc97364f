/* pick.c - the part pick through the public API
 * (include/bootrung/parts.h): an opaque object over analyses/pick, its
 * choices and rejections as they are, its reports as `pick` writes them. */
#include "bootrung/export.h"
#include "bootrung/parts.h"

#include "analyses/pick.h"
#include "api/study.h"
#include "core/error.h"
#include "core/progress.h"
#include "report/pick_report.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

struct br_pick_study {
    br_pick_opts o;
    br_progress prog;
    br_study_base base; /* the design and chain of the last run */
    br_catalog *cat;    /* a copy of the last run's catalog (the pick points into it) */
    br_pick *p;         /* the last run's (NULL: none) */
};

br_pick_study *br_pick_study_create(void)
{
    br_pick_study *p = calloc(1, sizeof *p);
    if (p)
        br_pick_opts_default(&p->o);
    return p;
}

static void drop_run(br_pick_study *p)
{
    br_pick_free(p->p);
    free(p->cat);
    br_study_base_clear(&p->base);
    p->p = NULL;
    p->cat = NULL;
}

void br_pick_study_free(br_pick_study *p)
{
    if (p)
        drop_run(p);
    free(p);
}

int br_pick_study_set_progress(br_pick_study *p, br_progress_hook hook, br_stop_poll stop,
                               void *ctx)
{
    if (!p)
        return BR_EUSAGE;
    p->prog = (br_progress){hook, ctx, stop};
    return BR_OK;
}

int br_pick_study_set_threads(br_pick_study *p, int threads)
{
    if (!p || !br_study_threads_ok(threads))
        return BR_EUSAGE;
    p->o.threads = threads;
    return BR_OK;
}

int br_pick_study_set_top(br_pick_study *p, int top)
{
    if (!p || top < 1 || top > 64)
        return BR_EUSAGE;
    p->o.top = top;
    return BR_OK;
}

int br_pick_study_set_min_margin(br_pick_study *p, double volts)
{
    if (!p || !(isnan(volts) || (volts >= 0 && volts < 1e6)))
        return BR_EUSAGE;
    p->o.min_margin = isnan(volts) ? -1.0 : volts;
    return BR_OK;
}

int br_pick_study_set_startup(br_pick_study *p, int on)
{
    if (!p || (on != 0 && on != 1))
        return BR_EUSAGE;
    p->o.startup = on;
    return BR_OK;
}

int br_pick_study_set_per_rail(br_pick_study *p, int on)
{
    if (!p || (on != 0 && on != 1))
        return BR_EUSAGE;
    p->o.per_rail = on;
    return BR_OK;
}

int br_pick_study_set_solver_limit(br_pick_study *p, int n)
{
    if (!p || n < 0 || n > 100000)
        return BR_EUSAGE;
    p->o.solver_limit = n;
    return BR_OK;
}

int br_pick_study_run(br_pick_study *p, const br_design *d, const br_catalog *cat, br_error *err)
{
    if (!p || !d || !cat)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_pick_study_run: expected a study, a design and a catalog");
    drop_run(p);
    int rc = br_study_base_set(&p->base, d, err);
    if (rc == BR_OK && !(p->cat = malloc(sizeof *p->cat)))
        rc = br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory copying the catalog");
    if (rc == BR_OK) {
        memcpy(p->cat, cat, sizeof *p->cat);
        br_pick_opts o = p->o;
        o.progress = &p->prog;
        rc = br_pick_run(p->base.d, p->cat, &o, &p->p, err);
    }
    if (rc != BR_OK)
        drop_run(p);
    return rc;
}

int br_pick_result(const br_pick_study *p, int *out)
{
    if (!p || !p->p || !out)
        return BR_EUSAGE;
    *out = br_study_result(p->p->outcome);
    return BR_OK;
}

int br_pick_choices(const br_pick_study *p, int *out)
{
    if (!p || !p->p || !out)
        return BR_EUSAGE;
    *out = p->p->nchoice;
    return BR_OK;
}

int br_pick_ranked(const br_pick_study *p, int *out)
{
    if (!p || !p->p || !out)
        return BR_EUSAGE;
    *out = p->p->nranked;
    return BR_OK;
}

int br_pick_ranked_choice(const br_pick_study *p, int r, int *out)
{
    if (!p || !p->p || !out || r < 0 || r >= p->p->nranked)
        return BR_EUSAGE;
    *out = p->p->ranked[r];
    return BR_OK;
}

static const br_choice *choice_of(const br_pick_study *p, int i)
{
    return p && p->p && i >= 0 && i < p->p->nchoice ? &p->p->choice[i] : NULL;
}

int br_pick_choice_value(const br_pick_study *p, int i, int key, double *out)
{
    const br_choice *ch = choice_of(p, i);
    if (!ch || !out || key < 0 || key >= BR_CHOICE_KEY_COUNT)
        return BR_EUSAGE;
    int undecided = ch->status != BR_OK;
    const double v[BR_CHOICE_KEY_COUNT] = {
        [BR_CHOICE_COST] = ch->cost,
        [BR_CHOICE_AREA] = ch->area * 1e-6, /* mm2 inside */
        [BR_CHOICE_MARGIN] = ch->margin == HUGE_VAL ? NAN : ch->margin,
        [BR_CHOICE_RESULT] = undecided ? BR_RESULT_UNDETERMINED : br_study_result(ch->outcome),
        [BR_CHOICE_UNIFORM] = ch->uniform,
        [BR_CHOICE_STARTUP] = ch->startup_checked,
        [BR_CHOICE_CRITERION] = ch->crit,
        [BR_CHOICE_STAGE] = ch->stage,
        [BR_CHOICE_UNSETTLED] = ch->unsettled,
    };
    *out = v[key];
    return BR_OK;
}

int br_pick_choice_part(const br_pick_study *p, int i, int role, int k, int *out)
{
    const br_choice *ch = choice_of(p, i);
    if (!ch || !out || (role != BR_CATALOG_CAPACITOR && role != BR_CATALOG_DIODE) || k < 1 ||
        k >= br_chain_stages(p->base.c))
        return BR_EUSAGE;
    *out = role == BR_CATALOG_CAPACITOR ? ch->cap[k] : ch->diode[k];
    return BR_OK;
}

int br_pick_rejects(const br_pick_study *p, int *out)
{
    if (!p || !p->p || !out)
        return BR_EUSAGE;
    *out = p->p->nrej;
    return BR_OK;
}

int br_pick_reject(const br_pick_study *p, int j, int *role, int *part, const char **why)
{
    if (!p || !p->p || j < 0 || j >= p->p->nrej || !role || !part || !why)
        return BR_EUSAGE;
    const br_reject *r = &p->p->rej[j];
    *role = r->is_diode ? BR_CATALOG_DIODE : BR_CATALOG_CAPACITOR;
    *part = r->part;
    *why = r->why;
    return BR_OK;
}

static int render_text(const void *study, br_text *out)
{
    const br_pick_study *p = study;
    return br_pick_text(p->base.c, p->p, out);
}

int br_pick_study_render(const br_pick_study *p, int format, br_text *out, br_error *err)
{
    if (!p || !p->p || !out)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_pick_study_render: expected a study that was run and a text");
    int rc;
    switch (format) {
    case BR_FORMAT_TEXT:
        rc = render_text(p, out);
        break;
    case BR_FORMAT_XML:
        rc = br_pick_xml(p->base.c, p->p, br_version(), out, err);
        break;
    case BR_FORMAT_HTML:
        return br_study_html(p->base.c, "part choice", p->p->outcome, 1, render_text, p, out, err);
    default:
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_pick_study_render: expected BR_FORMAT_TEXT, _XML or _HTML");
    }
    if (rc == BR_ENOMEM && err && !err->msg[0])
        br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory rendering the report");
    return rc;
}

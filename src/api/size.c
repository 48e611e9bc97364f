/* size.c - sizing to a margin target through the public API
 * (include/bootrung/parts.h): an opaque object over analyses/size, its
 * answers as they are, its report and the sized design file as `size`
 * writes them. */
#include "bootrung/parts.h"

#include "analyses/size.h"
#include "api/study.h"
#include "core/error.h"
#include "core/progress.h"
#include "io/design_write.h"
#include "report/size_report.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

_Static_assert((int)BR_SIZED_FOUND == (int)BR_SIZE_FOUND && (int)BR_SIZED_END == (int)BR_SIZE_END &&
                   (int)BR_SIZED_NONE == (int)BR_SIZE_NONE &&
                   (int)BR_SIZED_UNDETERMINED == (int)BR_SIZE_UNDETERMINED &&
                   (int)BR_SIZED_KEPT == (int)BR_SIZE_KEPT,
               "the public kinds are the analysis's");

struct br_size_study {
    br_size_opts o;
    br_progress prog;
    br_study_base base;
    int catalog;        /* the last run took its capacitors from a catalog */
    char cat_path[512]; /* that catalog's file, as the reports name it */
    br_size *z;         /* the last run's (NULL: none) */
};

br_size_study *br_size_study_create(void)
{
    br_size_study *z = calloc(1, sizeof *z);
    if (z)
        br_size_opts_default(&z->o);
    return z;
}

static void drop_run(br_size_study *z)
{
    br_size_free(z->z);
    z->z = NULL;
    br_study_base_clear(&z->base);
}

void br_size_study_free(br_size_study *z)
{
    if (z)
        drop_run(z);
    free(z);
}

int br_size_study_set_progress(br_size_study *z, br_progress_hook hook, br_stop_poll stop,
                               void *ctx)
{
    if (!z)
        return BR_EUSAGE;
    z->prog = (br_progress){hook, ctx, stop};
    return BR_OK;
}

int br_size_study_set_threads(br_size_study *z, int threads)
{
    if (!z || !br_study_threads_ok(threads))
        return BR_EUSAGE;
    z->o.threads = threads;
    return BR_OK;
}

int br_size_study_set_target(br_size_study *z, double volts)
{
    if (!z || !(isnan(volts) || (volts >= 0 && volts < 1e6)))
        return BR_EUSAGE;
    z->o.target = isnan(volts) ? -1.0 : volts;
    return BR_OK;
}

int br_size_study_set_links(br_size_study *z, int on)
{
    if (!z || (on != 0 && on != 1))
        return BR_EUSAGE;
    z->o.links = on;
    return BR_OK;
}

int br_size_study_set_supply(br_size_study *z, int on)
{
    if (!z || (on != 0 && on != 1))
        return BR_EUSAGE;
    z->o.supply = on;
    return BR_OK;
}

int br_size_study_set_solver_limit(br_size_study *z, int n)
{
    if (!z || n < 0 || n > 400)
        return BR_EUSAGE;
    z->o.solver_limit = n;
    return BR_OK;
}

int br_size_study_run(br_size_study *z, const br_design *d, const br_catalog *cat, br_error *err)
{
    if (!z || !d)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_size_study_run: expected a study and a design");
    drop_run(z);
    z->catalog = cat != NULL;
    snprintf(z->cat_path, sizeof z->cat_path, "%s", cat ? cat->path : "");
    int rc = br_study_base_set(&z->base, d, err);
    if (rc == BR_OK) {
        br_size_opts o = z->o;
        o.cat = cat; /* read during the run only: the sized design holds copies */
        o.progress = &z->prog;
        rc = br_size_run(z->base.d, &o, &z->z, err);
    }
    if (rc != BR_OK)
        drop_run(z);
    return rc;
}

int br_size_result(const br_size_study *z, int *out)
{
    if (!z || !z->z || !out)
        return BR_EUSAGE;
    *out = br_study_result(z->z->outcome);
    return BR_OK;
}

static const br_size_answer *answer_of(const br_size_study *z, int k)
{
    if (!z || !z->z)
        return NULL;
    if (k == 0)
        return z->z->links ? &z->z->link : NULL;
    return k >= 1 && k < z->z->n ? &z->z->cap[k] : NULL;
}

static double margin_of(const br_size_verdict *v)
{
    return v->margin == HUGE_VAL ? NAN : v->margin;
}

int br_size_answer_get(const br_size_study *z, int k, int key, double *out)
{
    const br_size_answer *a = answer_of(z, k);
    if (!a || !out || key < 0 || key >= BR_SZ_KEY_COUNT)
        return BR_EUSAGE;
    int has = a->kind == BR_SIZE_FOUND || a->kind == BR_SIZE_END;
    const double v[BR_SZ_KEY_COUNT] = {
        [BR_SZ_KIND] = a->kind,
        [BR_SZ_FROM] = a->from,
        [BR_SZ_VALUE] = has ? a->at.v : NAN,
        [BR_SZ_PART] = has ? a->at.part : -1,
        [BR_SZ_MARGIN] = has ? margin_of(&a->at.ver) : NAN,
        [BR_SZ_TRIALS] = a->trials,
    };
    *out = v[key];
    return BR_OK;
}

int br_size_get(const br_size_study *z, int key, double *out)
{
    if (!z || !z->z || !out || key < 0 || key >= BR_SIZE_FIGURE_COUNT)
        return BR_EUSAGE;
    const br_size *s = z->z;
    const double v[BR_SIZE_FIGURE_COUNT] = {
        [BR_SIZE_TARGET] = s->target,           [BR_SIZE_MARGIN] = margin_of(&s->final),
        [BR_SIZE_HEADROOM] = s->final.headroom, [BR_SIZE_REG_VOUT] = s->reg_vout,
        [BR_SIZE_REG_DROPOUT] = s->reg_dropout, [BR_SIZE_POINTS] = (double)s->points,
    };
    *out = v[key];
    return BR_OK;
}

int br_size_design(const br_size_study *z, const br_design **out)
{
    if (!z || !z->z || !out)
        return BR_EUSAGE;
    *out = z->z->d;
    return BR_OK;
}

static const char *catalog_of(const br_size_study *z)
{
    return z->catalog ? z->cat_path : NULL;
}

int br_size_design_file(const br_size_study *z, br_text *out, br_error *err)
{
    if (!z || !z->z || !out)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_size_design_file: expected a study that was run and a text");
    br_text *comment = br_text_create();
    int rc = comment ? br_size_comment(z->base.c, z->z, catalog_of(z), comment) : BR_ENOMEM;
    if (rc == BR_OK)
        rc = br_design_write(z->z->d, br_text_data(comment), out, err);
    br_text_free(comment);
    if (rc == BR_ENOMEM && err && !err->msg[0])
        br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory rendering the design file");
    return rc;
}

int br_size_study_render(const br_size_study *z, int format, br_text *out, br_error *err)
{
    if (!z || !z->z || !out || format != BR_FORMAT_TEXT)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_size_study_render: expected a study that was run, "
                            "BR_FORMAT_TEXT and a text");
    int rc = br_size_text(z->base.c, z->z, catalog_of(z), out);
    if (rc == BR_ENOMEM && err && !err->msg[0])
        br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory rendering the report");
    return rc;
}

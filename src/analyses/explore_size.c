/* explore_size.c - the exploration's link diodes and rail capacitors from
 * a parts catalog, and its yield option (explore_size.h). */
#include "analyses/explore_size.h"
#include "analyses/workpool.h"

#include "analyses/yield.h"
#include "core/error.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

int br_diode_as_strong(const br_diode_part *c, const br_diode_part *p)
{
    int thermal = !(p->rth.nom > 0) || (c->rth.nom > 0 && c->tj_max.nom >= p->tj_max.nom);
    return c->ifrm.nom >= p->ifrm.nom && c->ifsm.nom >= p->ifsm.nom && c->i2t.nom >= p->i2t.nom &&
           c->if_avg.nom >= p->if_avg.nom && thermal;
}

int br_explore_size_check(const br_design *t, const br_explore_opts *o, br_error *err)
{
    for (int i = 0; i < o->parts->ncaps; i++)
        if (o->parts->caps[i].vrated.nom >= t->vsupply.max)
            return BR_OK;
    return br_error_set(err, BR_EINPUT, o->parts->path, 0, "capacitor",
                        "no capacitor of the catalog is rated for the supply's highest voltage "
                        "%.4g V, expected at least one to size the rails with",
                        t->vsupply.max);
}

/* The cheapest diode of cat that meets need and is as strong as p; -1. */
static int cheapest_diode(const br_catalog *cat, double need, const br_diode_part *p)
{
    int best = -1;
    for (int i = 0; i < cat->ndiodes; i++)
        if (cat->diodes[i].vrrm.nom >= need && br_diode_as_strong(&cat->diodes[i], p) &&
            (best < 0 || cat->diode_offer[i].cost < cat->diode_offer[best].cost))
            best = i;
    return best;
}

int br_explore_size_rule(const br_design *t, const br_explore_opts *o, br_explore_row *r,
                         br_error *err)
{
    memset(r->cap, -1, sizeof r->cap);
    memset(r->ldiode, -1, sizeof r->ldiode);
    r->diode = -1; /* the switch catalog's diodes are not used when sizing */
    /* the template's diode on each link of the new chain: its design with
     * the template's parts */
    br_design *d = NULL;
    BR_TRY(br_explore_design(t, o, r, &d, err));
    int n = 2 * (r->levels - 1), all = 1;
    for (int k = 1; k < n; k++) {
        const br_diode_part *p = &d->diodes[br_design_stage(d, k)->diode];
        r->ldiode[k] = (signed char)cheapest_diode(o->parts, r->need, p);
        all &= r->ldiode[k] >= 0;
    }
    br_design_free(d);
    r->state = r->sw_ok && all ? BR_EX_FEASIBLE : BR_EX_RATING;
    return BR_OK;
}

/* ---- placing the parts ------------------------------------------------------ */

/* The index of part p (size bytes, its id first, as every part's) among
 * the *count parts of arr: the same part already there, or p added under
 * its id, or its id with a suffix when another part has that id.  -1 when
 * there is no room. */
static int part_slot(void *arr, int *count, size_t size, const void *p)
{
    unsigned char a[4096];
    memcpy(a, p, size);
    for (int s = 0; s < 100; s++) {
        if (s > 0)
            snprintf((char *)a, BR_ID_MAX, "%.40s-c%d", (const char *)p, s);
        int i = 0;
        while (i < *count && strcmp((char *)arr + (size_t)i * size, (char *)a) != 0)
            i++;
        if (i < *count && memcmp((char *)arr + (size_t)i * size, a, size) == 0)
            return i;
        if (i == *count) {
            if (*count >= BR_MAX_PARTS)
                return -1;
            memcpy((char *)arr + (size_t)i * size, a, size);
            return (*count)++;
        }
    }
    return -1;
}

_Static_assert(sizeof(br_cap_part) <= 4096 && sizeof(br_diode_part) <= 4096,
               "part_slot's scratch holds any part");

static int diode_slot(br_design *d, const br_diode_part *p)
{
    return part_slot(d->diodes, &d->ndiodes, sizeof *p, p);
}

static int cap_slot(br_design *d, const br_cap_part *p)
{
    return part_slot(d->caps, &d->ncaps, sizeof *p, p);
}

static int no_room(const br_design *d, const char *what, br_error *err)
{
    return br_error_set(err, BR_EINPUT, d->path, 0, "parts",
                        "no room for another %s: a design holds at most %d", what, BR_MAX_PARTS);
}

int br_explore_size_place(br_design *d, const br_explore_opts *o, const br_explore_row *r,
                          br_error *err)
{
    int n = 2 * (r->levels - 1);
    for (int k = 1; k < n; k++) {
        if (r->ldiode[k] < 0 && r->cap[k] < 0)
            continue;
        br_stage_spec spec = *br_design_stage(d, k);
        if (r->ldiode[k] >= 0 && (spec.diode = diode_slot(d, &o->parts->diodes[r->ldiode[k]])) < 0)
            return no_room(d, "diode", err);
        if (r->cap[k] >= 0 && (spec.cap = cap_slot(d, &o->parts->caps[r->cap[k]])) < 0)
            return no_room(d, "capacitor", err);
        d->stage[k] = spec;
        d->has_override[k] = 1;
    }
    return BR_OK;
}

double br_explore_size_cost(const br_explore_opts *o, const br_explore_row *r, int n)
{
    double sum = 0;
    for (int k = 1; o->parts && k < n; k++) {
        if (r->ldiode[k] >= 0)
            sum += o->parts->diode_offer[r->ldiode[k]].cost;
        if (r->cap[k] >= 0)
            sum += o->parts->cap_offer[r->cap[k]].cost;
    }
    return sum;
}

/* ---- sizing the rail capacitors -------------------------------------------- */

/* Each rail's answer into r: the part found, or the state of a rail the
 * search could not serve (the highest such rail). */
static void take_answers(const br_size *z, br_explore_row *r)
{
    r->sized = 1;
    r->size_trials = 0;
    for (int k = z->n - 1; k >= 1; k--) {
        const br_size_answer *a = &z->cap[k];
        r->size_trials += a->trials;
        if (a->kind == BR_SIZE_FOUND || a->kind == BR_SIZE_END) {
            r->cap[k] = (signed char)a->at.part;
            continue;
        }
        if (r->state != BR_EX_FEASIBLE)
            continue;
        r->state = a->kind == BR_SIZE_UNDETERMINED ? BR_EX_UNDETERMINED : BR_EX_UNSIZED;
        r->stage = k;
        r->crit = a->have_beyond ? a->beyond.ver.fail_crit : -1;
        if (a->kind == BR_SIZE_UNDETERMINED)
            snprintf(r->note, sizeof r->note, "sizing rail %d: a value could not be judged", k);
    }
}

int br_explore_size_caps(const br_design *d, const br_explore_opts *o, double target,
                         br_explore_row *r, br_size_verdict *final, br_error *err)
{
    br_size_opts so;
    br_size_opts_default(&so);
    so.threads = o->threads;
    so.target = target;
    so.cat = o->parts;
    so.links = 0;
    so.nominal = !o->corners;
    br_progress stop = br_progress_stop_only(o->progress);
    so.progress = &stop;
    br_size *z = NULL;
    BR_TRY(br_size_run(d, &so, &z, err));
    take_answers(z, r);
    *final = z->final;
    br_size_free(z);
    return BR_OK;
}

/* ---- the yield ---------------------------------------------------------------- */

int br_explore_yield(const br_design *d, const br_explore_opts *o, br_explore_row *r, br_error *err)
{
    br_yield_opts yo;
    br_yield_opts_default(&yo);
    yo.samples = o->yield_samples;
    yo.seed = o->seed;
    yo.threads = o->threads;
    yo.startup = 1;
    br_progress stop = br_progress_stop_only(o->progress);
    yo.progress = &stop;
    br_yield *y = NULL;
    BR_TRY(br_yield_run(d, &yo, &y, err));
    r->ysamples = y->n;
    r->ypass = y->pass;
    r->yfail = y->fail;
    r->yundet = y->undetermined;
    r->yield = y->yield;
    r->ylo = y->lo;
    r->yhi = y->hi;
    br_yield_free(y);
    return BR_OK;
}

/* ---- the rows on worker threads --------------------------------------------- */

int br_explore_pool(int n, int threads, br_work_fn judge, void *ctx, const br_progress *progress,
                    br_error *err)
{
    br_meter meter;
    BR_TRY(br_meter_init(&meter, progress, (double)n, err));
    int rc = br_work_run(n, threads, judge, ctx, &meter, 1.0, err);
    rc = br_meter_status(&meter, rc, err);
    br_meter_destroy(&meter);
    return rc;
}

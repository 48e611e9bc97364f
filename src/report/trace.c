/* trace.c - simulator samples in memory. */
#include "report/trace.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

br_trace *br_trace_create(int n)
{
    br_trace *tr = calloc(1, sizeof *tr);
    if (tr)
        tr->n = n;
    return tr;
}

void br_trace_free(br_trace *tr)
{
    if (!tr)
        return;
    free(tr->t);
    free(tr->v);
    free(tr->i);
    free(tr->vd);
    free(tr->vr);
    free(tr->j);
    free(tr);
}

void br_trace_offset(br_trace *tr, double t_offset)
{
    tr->t_offset = t_offset;
}

static int grow_one(double **a, size_t count)
{
    double *p = realloc(*a, sizeof(double) * count);
    if (!p)
        return 0;
    *a = p;
    return 1;
}

/* Room for one more row; every array grows together. */
static int reserve(br_trace *tr)
{
    if (tr->len < tr->cap)
        return 1;
    long cap = tr->cap ? 2 * tr->cap : 1024;
    size_t rows = (size_t)cap, cells = rows * (size_t)tr->n;
    if (!grow_one(&tr->t, rows) || !grow_one(&tr->v, cells) || !grow_one(&tr->i, cells) ||
        !grow_one(&tr->vd, cells) || !grow_one(&tr->vr, cells) || !grow_one(&tr->j, cells))
        return 0;
    tr->cap = cap;
    return 1;
}

void br_trace_add(br_trace *tr, double t, const double *v, const double *i, const double *vd,
                  const double *vr, const double *disp)
{
    if (tr->failed || !reserve(tr)) {
        tr->failed = 1;
        return;
    }
    size_t at = (size_t)tr->len * (size_t)tr->n, bytes = sizeof(double) * (size_t)tr->n;
    tr->t[tr->len] = t + tr->t_offset;
    memcpy(tr->v + at, v, bytes);
    memcpy(tr->i + at, i, bytes);
    memcpy(tr->vd + at, vd, bytes);
    memcpy(tr->vr + at, vr, bytes);
    memcpy(tr->j + at, disp, bytes);
    tr->len++;
}

static void on_sample(void *ctx, const br_sim *sim, double t, const double *vrail,
                      const double *ilink, int n)
{
    br_trace *tr = ctx;
    double vd[BR_MAX_SWITCHES], vr[BR_MAX_SWITCHES], fwd[BR_MAX_SWITCHES], disp[BR_MAX_SWITCHES];
    (void)n; /* the trace's n, fixed at creation */
    br_sim_sample_stress(sim, t, vrail, tr->n, vd, vr);
    br_sim_sample_links(sim, ilink, tr->n, fwd, disp);
    fwd[0] = ilink[0];
    disp[0] = NAN;
    br_trace_add(tr, t, vrail, fwd, vd, vr, disp);
}

br_sim_observer br_trace_observer(br_trace *tr)
{
    br_sim_observer o = {tr, NULL, on_sample};
    return o;
}

long br_trace_find(const br_trace *tr, double t0, double t1, long *count)
{
    long a = 0;
    while (a < tr->len && tr->t[a] < t0)
        a++;
    long b = a;
    while (b < tr->len && tr->t[b] <= t1)
        b++;
    *count = b - a;
    return a;
}

/* trace.c - simulator samples in memory. */
#include "report/trace.h"

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
    free(tr);
}

void br_trace_follow(br_trace *tr, const br_sim *sim, double t_offset)
{
    tr->sim = sim;
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
        !grow_one(&tr->vd, cells) || !grow_one(&tr->vr, cells))
        return 0;
    tr->cap = cap;
    return 1;
}

void br_trace_add(br_trace *tr, double t, const double *v, const double *i)
{
    if (tr->failed || !reserve(tr)) {
        tr->failed = 1;
        return;
    }
    size_t at = (size_t)tr->len * (size_t)tr->n, bytes = sizeof(double) * (size_t)tr->n;
    tr->t[tr->len] = t + tr->t_offset;
    memcpy(tr->v + at, v, bytes);
    memcpy(tr->i + at, i, bytes);
    for (int k = 0; k < tr->n; k++) {
        /* reverse voltage of link k: across its return switch, less the
         * difference of the rails it joins (as the simulator's stats) */
        tr->vd[at + k] = tr->sim ? br_sim_vdrv(tr->sim, k, v[k]) : v[k];
        tr->vr[at + k] =
            tr->sim && k > 0 ? br_sim_switch_v(tr->sim, k - 1, t) - (v[k - 1] - v[k]) : 0.0;
    }
    tr->len++;
}

static void on_sample(void *ctx, double t, const double *vrail, const double *ilink, int n)
{
    (void)n; /* the trace's n, fixed at creation */
    br_trace_add(ctx, t, vrail, ilink);
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

/* yield.c - Monte Carlo samples of a design, the yield with its exact
 * interval, margin quantiles and rank correlations. */
#include "analyses/yield.h"

#include "core/error.h"

#include <gsl/gsl_cdf.h>
#include <gsl/gsl_randist.h>
#include <gsl/gsl_rng.h>
#include <gsl/gsl_sort.h>
#include <gsl/gsl_statistics_double.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

const double br_yield_quantiles[BR_YIELD_NQ] = {0.0, 0.001, 0.01, 0.1, 0.5};

void br_yield_opts_default(br_yield_opts *o)
{
    memset(o, 0, sizeof *o);
    o->samples = 1000;
    o->seed = 1;
    o->threads = 0;
    o->startup = 0;
    o->accept = 1e-3;
    o->progress = NULL;
    o->solver_limit = 0;
}

/* ---- statistics ------------------------------------------------------------- */

void br_clopper_pearson(long x, long n, double conf, double *lo, double *hi)
{
    double a = 0.5 * (1.0 - conf);
    if (n <= 0) {
        *lo = 0.0;
        *hi = 1.0;
        return;
    }
    /* the bounds are the a and 1 - a quantiles of Beta(x, n - x + 1) and
     * Beta(x + 1, n - x) (Clopper & Pearson 1934) */
    *lo = x > 0 ? gsl_cdf_beta_Pinv(a, (double)x, (double)(n - x + 1)) : 0.0;
    *hi = x < n ? gsl_cdf_beta_Pinv(1.0 - a, (double)(x + 1), (double)(n - x)) : 1.0;
}

typedef struct keyed {
    double v;
    long i;
} keyed;

static int cmp_keyed(const void *a, const void *b)
{
    double x = ((const keyed *)a)->v, y = ((const keyed *)b)->v;
    return (x > y) - (x < y);
}

int br_rank(const double *v, long n, double *rank)
{
    keyed *k = malloc(sizeof *k * (size_t)(n > 0 ? n : 1));
    if (!k)
        return BR_ENOMEM;
    for (long i = 0; i < n; i++) {
        k[i].v = v[i];
        k[i].i = i;
    }
    qsort(k, (size_t)n, sizeof *k, cmp_keyed);
    for (long a = 0; a < n;) {
        long b = a;
        while (b + 1 < n && k[b + 1].v == k[a].v)
            b++;
        for (long j = a; j <= b; j++)
            rank[k[j].i] = 0.5 * (double)(a + b) + 1.0; /* ties: their average rank */
        a = b + 1;
    }
    free(k);
    return BR_OK;
}

double br_pearson(const double *a, const double *b, long n)
{
    if (n < 2)
        return NAN;
    double sa = gsl_stats_sd(a, 1, (size_t)n), sb = gsl_stats_sd(b, 1, (size_t)n);
    if (!(sa > 0) || !(sb > 0))
        return NAN;
    return gsl_stats_correlation(a, 1, b, 1, (size_t)n);
}

double br_spearman(const double *a, const double *b, long n)
{
    double *ra = malloc(sizeof(double) * (size_t)(n > 0 ? n : 1));
    double *rb = malloc(sizeof(double) * (size_t)(n > 0 ? n : 1));
    double r = NAN;
    if (ra && rb && br_rank(a, n, ra) == BR_OK && br_rank(b, n, rb) == BR_OK)
        r = br_pearson(ra, rb, n);
    free(ra);
    free(rb);
    return r;
}

/* ---- sampling ------------------------------------------------------------------- */

/* One value of p: uniform between the limits, or a normal truncated at
 * them (each side of the nominal scaled to its own limit). */
static double draw(const br_tol_param *p, gsl_rng *r)
{
    if (p->dist != BR_DIST_NORMAL)
        return p->min + gsl_rng_uniform(r) * (p->max - p->min);
    double z;
    do
        z = gsl_ran_gaussian(r, 1.0);
    while (fabs(z) > p->nsig);
    return p->nom + z / p->nsig * (z > 0 ? p->max - p->nom : p->nom - p->min);
}

int br_yield_sample(const br_tol_list *tl, unsigned long seed, long n, double *v, br_error *err)
{
    gsl_rng *r = gsl_rng_alloc(gsl_rng_mt19937);
    if (!r)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory for the generator");
    gsl_rng_set(r, seed);
    for (long i = 0; i < n; i++)
        for (int j = 0; j < tl->n; j++)
            v[i * tl->n + j] = draw(&tl->p[j], r);
    gsl_rng_free(r);
    return BR_OK;
}

/* ---- per criterion -------------------------------------------------------------- */

/* Margins of crit over the samples that decided it, into m (returns
 * their count), and their sample indexes into idx; the samples where it
 * is undetermined are counted into c. */
static long gather(const br_yield *y, int crit, br_yield_crit *c, double *m, long *idx)
{
    long k = 0;
    for (long i = 0; i < y->n; i++) {
        const br_pt *p = &y->pts[i];
        if (p->status != BR_OK) {
            /* a sample not judged at all decides no criterion the design has */
            c->undetermined += y->s->nominal.status != BR_OK || y->s->nominal.row[crit].applies;
            continue;
        }
        if (!p->row[crit].applies)
            continue;
        if (p->row[crit].undetermined) {
            c->undetermined++;
            continue;
        }
        m[k] = p->row[crit].margin;
        idx[k++] = i;
    }
    return k;
}

/* A quantile of sorted margins; one that falls on a sample without a
 * margin (-inf: a rail that never starts) is that, not the NaN that
 * interpolating toward it would give. */
static double quantile(const double *m, long k, double f)
{
    long lo = (long)floor(f * (double)(k - 1));
    if (isinf(m[lo]))
        return m[lo];
    return gsl_stats_quantile_from_sorted_data(m, 1, (size_t)k, f);
}

static void quantiles(br_yield_crit *c, double *m, long k)
{
    gsl_sort(m, 1, (size_t)k);
    for (int q = 0; q < BR_YIELD_NQ; q++)
        c->q[q] = quantile(m, k, br_yield_quantiles[q]);
}

/* Spearman's rho of every parameter with the margins m of the samples idx. */
static int correlate(const br_yield *y, br_yield_crit *c, const double *m, const long *idx, long k,
                     double *col, double *rm, double *rc)
{
    int np = y->s->tl.n;
    if (br_rank(m, k, rm) != BR_OK)
        return BR_ENOMEM;
    for (int j = 0; j < np; j++) {
        for (long a = 0; a < k; a++)
            col[a] = y->values[idx[a] * np + j];
        if (br_rank(col, k, rc) != BR_OK)
            return BR_ENOMEM;
        c->rho[j] = br_pearson(rc, rm, k);
    }
    return BR_OK;
}

static int crit_stats(br_yield *y, int crit, double *m, long *idx, double *scratch, br_error *err)
{
    br_yield_crit *c = &y->c[crit];
    long k = gather(y, crit, c, m, idx);
    c->judged = k;
    c->applies = k > 0;
    c->has_margin = br_crit_has_margin(crit);
    for (long a = 0; a < k; a++) {
        c->fails += !y->pts[idx[a]].row[crit].pass;
        c->warns += y->pts[idx[a]].row[crit].pass && y->pts[idx[a]].row[crit].warn;
    }
    for (int j = 0; j < BR_TOL_MAX; j++)
        c->rho[j] = NAN;
    for (int q = 0; q < BR_YIELD_NQ; q++)
        c->q[q] = NAN;
    /* a status (the steady state) has no margin to rank or take quantiles of */
    if (k == 0 || !c->has_margin)
        return BR_OK;
    /* ranks first: quantiles sort m in place */
    if (correlate(y, c, m, idx, k, scratch, scratch + y->n, scratch + 2 * y->n) != BR_OK)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory ranking the samples");
    quantiles(c, m, k);
    return BR_OK;
}

int br_yield_outcome(const br_yield *y, double min_yield)
{
    if (min_yield < 0)
        return y->fail > 0           ? BR_OUTCOME_FAIL
               : y->undetermined > 0 ? BR_OUTCOME_UNDETERMINED
                                     : BR_OUTCOME_PASS;
    if (y->lo >= min_yield)
        return BR_OUTCOME_PASS;
    /* the lower bound were every undetermined sample a pass */
    double best, hi;
    br_clopper_pearson(y->pass + y->undetermined, y->n, 0.95, &best, &hi);
    return best < min_yield ? BR_OUTCOME_FAIL : BR_OUTCOME_UNDETERMINED;
}

static void count(br_yield *y)
{
    for (long i = 0; i < y->n; i++) {
        const br_pt *p = &y->pts[i];
        y->pass += p->outcome == BR_OUTCOME_PASS;
        y->fail += p->outcome == BR_OUTCOME_FAIL;
        y->undetermined += p->outcome == BR_OUTCOME_UNDETERMINED;
        y->unjudged += p->status != BR_OK;
        y->unsettled +=
            p->outcome == BR_OUTCOME_UNDETERMINED && p->status == BR_OK && p->unsettled != 0;
    }
    long decided = y->pass + y->fail;
    y->yield = decided > 0 ? (double)y->pass / (double)decided : NAN;
    /* the undetermined samples are unknowns: as failures for the lower
     * bound, as passes for the upper one */
    double lo, hi;
    br_clopper_pearson(y->pass, y->n, 0.95, &y->lo, &hi);
    br_clopper_pearson(y->pass + y->undetermined, y->n, 0.95, &lo, &y->hi);
}

static int summarise(br_yield *y, br_error *err)
{
    count(y);
    double *m = malloc(sizeof(double) * (size_t)y->n * 4);
    long *idx = malloc(sizeof(long) * (size_t)y->n);
    int rc = m && idx ? BR_OK : br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    for (int crit = 0; rc == BR_OK && crit < BR_CRIT_COUNT; crit++)
        rc = crit_stats(y, crit, m, idx, m + y->n, err);
    free(m);
    free(idx);
    return rc;
}

/* ---- the run ------------------------------------------------------------------ */

int br_yield_shard_has(const br_yield_opts *o, long i)
{
    return o->shard_n <= 0 || i % o->shard_n == o->shard_k - 1;
}

static long shard_count(const br_yield_opts *o, long n)
{
    if (o->shard_n <= 0)
        return n;
    return o->shard_k - 1 < n ? (n - o->shard_k + o->shard_n) / o->shard_n : 0;
}

/* Judge the shard's samples of y (every one without a shard): gathered,
 * judged as one batch, scattered back. */
static int judge_samples(br_yield *y, const br_yield_opts *o, br_error *err)
{
    if (o->shard_n <= 0)
        return br_spread_eval(y->s, (int)y->n, y->values, o->startup, y->pts, err);
    int np = y->s->tl.n > 0 ? y->s->tl.n : 1;
    long m = shard_count(o, y->n);
    double *v = malloc(sizeof(double) * (size_t)(m > 0 ? m : 1) * (size_t)np);
    br_pt *pts = malloc(sizeof(br_pt) * (size_t)(m > 0 ? m : 1));
    int rc = v && pts ? BR_OK : br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    for (long a = 0, i = o->shard_k - 1; rc == BR_OK && a < m; a++, i += o->shard_n)
        memcpy(v + a * np, y->values + i * np, sizeof(double) * (size_t)np);
    if (rc == BR_OK && m > 0)
        rc = br_spread_eval(y->s, (int)m, v, o->startup, pts, err);
    memset(y->pts, 0, sizeof(br_pt) * (size_t)y->n);
    for (long a = 0, i = o->shard_k - 1; rc == BR_OK && a < m; a++, i += o->shard_n)
        y->pts[i] = pts[a];
    free(v);
    free(pts);
    return rc;
}

/* The spread, the samples, their verdicts and the statistics into y. */
static int yield_compute(br_yield *y, const br_design *d, const br_yield_opts *o, br_meter *meter,
                         br_error *err)
{
    br_spread_opts so;
    br_spread_opts_default(&so);
    so.threads = o->threads;
    so.startup = o->startup;
    so.accept = o->accept;
    so.meter = meter;
    so.solver_limit = o->solver_limit;
    int rc = br_spread_create(d, &so, &y->s, err);
    y->accept = rc == BR_OK ? y->s->accept : o->accept;
    if (rc == BR_OK) {
        size_t k = (size_t)(y->s->tl.n > 0 ? y->s->tl.n : 1);
        y->values = malloc(sizeof(double) * (size_t)y->n * k);
        y->pts = malloc(sizeof(br_pt) * (size_t)y->n);
        if (!y->values || !y->pts)
            rc = br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory for %ld samples", y->n);
    }
    if (rc == BR_OK)
        rc = br_yield_sample(&y->s->tl, y->seed, y->n, y->values, err);
    if (rc == BR_OK && o->given)
        memcpy(y->pts, o->given, sizeof(br_pt) * (size_t)y->n);
    else if (rc == BR_OK)
        rc = judge_samples(y, o, err);
    if (rc == BR_OK && o->shard_n <= 0)
        rc = summarise(y, err);
    return rc;
}

int br_yield_run(const br_design *d, const br_yield_opts *o, br_yield **out, br_error *err)
{
    br_yield_opts def;
    if (!o) {
        br_yield_opts_default(&def);
        o = &def;
    }
    *out = NULL;
    if (o->samples < 1 || o->samples > 100000000L)
        return br_error_set(err, BR_EINPUT, NULL, 0, "--samples",
                            "%ld samples, expected 1 to 100000000", o->samples);
    if (o->shard_n < 0 || (o->shard_n > 0 && (o->shard_k < 1 || o->shard_k > o->shard_n)))
        return br_error_set(err, BR_EINPUT, NULL, 0, "--shard",
                            "%d/%d; expected K/N with 1 <= K <= N", o->shard_k, o->shard_n);
    br_yield *y = calloc(1, sizeof *y);
    if (!y)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    y->n = o->samples;
    y->seed = o->seed;
    y->startup = o->startup;
    br_meter meter;
    int rc = br_meter_init(&meter, o->progress, o->given ? 0.0 : (double)shard_count(o, y->n), err);
    if (rc == BR_OK) {
        rc = yield_compute(y, d, o, &meter, err);
        br_meter_destroy(&meter);
        if (y->s)
            y->s->meter = NULL; /* the meter is gone; the result outlives it */
    }
    if (rc != BR_OK) {
        br_yield_free(y);
        return rc;
    }
    *out = y;
    return BR_OK;
}

void br_yield_free(br_yield *y)
{
    if (!y)
        return;
    br_spread_free(y->s);
    free(y->values);
    free(y->pts);
    free(y);
}

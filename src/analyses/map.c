/* map.c - the hold map, computed by worker threads. */
#include "analyses/map.h"

#include "analyses/meter.h"
#include "core/error.h"

#include <math.h>
#include <pthread.h>
#include <stdlib.h>
#include <string.h>

int br_map_opts_check(const br_map_opts *o, br_error *err)
{
    if (o->nduty < 1 || o->nduty > BR_MAP_MAX_N || o->nfsw < 1 || o->nfsw > BR_MAP_MAX_N)
        return br_error_set(
            err, BR_EINPUT, NULL, 0, o->nduty < 1 || o->nduty > BR_MAP_MAX_N ? "duty" : "freq",
            "%d points; expected 1 to %d",
            o->nduty < 1 || o->nduty > BR_MAP_MAX_N ? o->nduty : o->nfsw, BR_MAP_MAX_N);
    if (!(o->duty_from > 0 && o->duty_to < 1 && o->duty_from <= o->duty_to) ||
        (o->nduty > 1 && !(o->duty_from < o->duty_to)))
        return br_error_set(err, BR_EINPUT, NULL, 0, "duty",
                            "%g to %g; expected 0 < FROM < TO < 1 (FROM = TO for one point)",
                            o->duty_from, o->duty_to);
    if (!(o->fsw_from > 0 && o->fsw_from <= o->fsw_to && isfinite(o->fsw_to)) ||
        (o->nfsw > 1 && !(o->fsw_from < o->fsw_to)))
        return br_error_set(err, BR_EINPUT, NULL, 0, "freq",
                            "%g Hz to %g Hz; expected 0 < FROM < TO (FROM = TO for one point)",
                            o->fsw_from, o->fsw_to);
    if (o->shard_n < 0 || (o->shard_n > 0 && (o->shard_k < 1 || o->shard_k > o->shard_n)))
        return br_error_set(err, BR_EINPUT, NULL, 0, "shard",
                            "%d/%d; expected K/N with 1 <= K <= N", o->shard_k, o->shard_n);
    if (o->threads < 1 || o->threads > BR_MAP_MAX_THREADS)
        return br_error_set(err, BR_EINPUT, NULL, 0, "threads", "%d; expected 1 to %d", o->threads,
                            BR_MAP_MAX_THREADS);
    return BR_OK;
}

void br_map_free(br_map *m)
{
    if (!m)
        return;
    free(m->duty);
    free(m->fsw);
    free(m->pt);
    free(m);
}

const br_hold_point *br_map_at(const br_map *m, int i, int j)
{
    return &m->pt[j * m->nduty + i];
}

int br_map_shard_has(const br_map *m, const br_map_opts *o, int i, int j)
{
    return o->shard_n <= 0 || i == m->col0 || j % o->shard_n == o->shard_k - 1;
}

/* The rows shard K of N walks (all of them without a shard). */
static int shard_rows(const br_map_opts *o, int nfsw)
{
    if (o->shard_n <= 0)
        return nfsw;
    return o->shard_k - 1 < nfsw ? (nfsw - o->shard_k + o->shard_n) / o->shard_n : 0;
}

static br_hold_point *at(br_map *m, int i, int j)
{
    return &m->pt[j * m->nduty + i];
}

static int nearest(const double *v, int n, double x, int logscale)
{
    int best = 0;
    for (int i = 1; i < n; i++) {
        double di = logscale ? fabs(log(v[i] / x)) : fabs(v[i] - x);
        double db = logscale ? fabs(log(v[best] / x)) : fabs(v[best] - x);
        if (di < db)
            best = i;
    }
    return best;
}

static int map_alloc(const br_map_opts *o, br_map **out, br_error *err)
{
    br_map *m = calloc(1, sizeof *m);
    if (m) {
        m->nduty = o->nduty;
        m->nfsw = o->nfsw;
        m->duty = malloc(sizeof(double) * (size_t)o->nduty);
        m->fsw = malloc(sizeof(double) * (size_t)o->nfsw);
        m->pt = calloc((size_t)o->nduty * (size_t)o->nfsw, sizeof *m->pt);
    }
    if (!m || !m->duty || !m->fsw || !m->pt) {
        br_map_free(m);
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory for the map");
    }
    for (int i = 0; i < m->nduty; i++)
        m->duty[i] = m->nduty == 1
                         ? o->duty_from
                         : o->duty_from + (o->duty_to - o->duty_from) * i / (m->nduty - 1);
    for (int j = 0; j < m->nfsw; j++)
        m->fsw[j] = m->nfsw == 1
                        ? o->fsw_from
                        : o->fsw_from * pow(o->fsw_to / o->fsw_from, (double)j / (m->nfsw - 1));
    *out = m;
    return BR_OK;
}

/* ---- the work, shared between threads ------------------------------------ */

typedef struct map_job {
    const br_design *d;
    const br_map_opts *o;
    br_map *m;
    br_warm **seed; /* per row: the warm start at (duty[col0], fsw[j]) */
    int stage;      /* 1: the design column, 2: the rows */
    int ntasks;
    int next;     /* next task to hand out */
    int rc;       /* first failure */
    br_error err; /* its record */
    pthread_mutex_t lock;
    br_meter meter; /* grid points judged; the caller's hook */
} map_job;

static int judge_point(br_probe *p, br_map *m, int i, int j, br_error *err);

/* Judge one grid point and count it; BR_ECANCEL when the caller's hook
 * asks to stop. */
static int grid_point(map_job *job, br_probe *p, int i, int j, br_error *err)
{
    int rc = judge_point(p, job->m, i, j, err);
    if (rc == BR_OK && br_meter_add(&job->meter, 1.0))
        rc = br_progress_cancelled(err);
    return rc;
}

/* Judge one grid point; a point without on-time is marked, not judged. */
static int judge_point(br_probe *p, br_map *m, int i, int j, br_error *err)
{
    br_hold_point *pt = at(m, i, j);
    double lo, hi;
    if (br_probe_duty_applies(p) &&
        !(br_probe_duty_range(p, m->fsw[j], 0.0, &lo, &hi) && m->duty[i] > lo && m->duty[i] < hi)) {
        memset(pt, 0, sizeof *pt);
        pt->duty = m->duty[i];
        pt->fsw = m->fsw[j];
        pt->margin = NAN;
        pt->stage = -1;
        pt->crit = BR_MAP_NO_ONTIME;
        pt->dir = BR_DIRI_NONE;
        return BR_OK;
    }
    return br_probe_eval(p, m->duty[i], m->fsw[j], pt, err);
}

/* Stage 1, task 0 walks the design column up, task 1 down, from the seed
 * of the design row, leaving a seed in every row. */
static int column_task(map_job *job, br_probe *p, int task, br_error *err)
{
    br_map *m = job->m;
    int step = task == 0 ? 1 : -1;
    br_probe_load(p, job->seed[m->row0]);
    for (int j = m->row0 + step; j >= 0 && j < m->nfsw; j += step) {
        int rc = grid_point(job, p, m->col0, j, err);
        if (rc != BR_OK)
            return rc;
        br_probe_save(p, job->seed[j]);
    }
    return BR_OK;
}

/* Stage 2: task 2j walks row j right of the design column, 2j + 1 left. */
static int row_task(map_job *job, br_probe *p, int task, br_error *err)
{
    br_map *m = job->m;
    int j = task / 2, step = task % 2 == 0 ? 1 : -1;
    if (job->o->shard_n > 0)
        j = job->o->shard_k - 1 + job->o->shard_n * j;
    br_probe_load(p, job->seed[j]);
    for (int i = m->col0 + step; i >= 0 && i < m->nduty; i += step) {
        int rc = grid_point(job, p, i, j, err);
        if (rc != BR_OK)
            return rc;
    }
    return BR_OK;
}

static int take_task(map_job *job)
{
    pthread_mutex_lock(&job->lock);
    int t = job->rc == BR_OK && job->next < job->ntasks ? job->next++ : -1;
    pthread_mutex_unlock(&job->lock);
    return t;
}

static void fail(map_job *job, const br_error *err, int rc)
{
    pthread_mutex_lock(&job->lock);
    if (job->rc == BR_OK) {
        job->rc = rc;
        job->err = *err;
    }
    pthread_mutex_unlock(&job->lock);
}

static void *worker(void *arg)
{
    map_job *job = arg;
    br_error err;
    br_error_clear(&err);
    br_probe *p;
    int rc = br_probe_create(job->d, &p, &err);
    if (rc != BR_OK) {
        fail(job, &err, rc);
        return NULL;
    }
    br_probe_set_stop(p, br_meter_poll(&job->meter));
    for (int t = take_task(job); t >= 0; t = take_task(job)) {
        rc = job->stage == 1 ? column_task(job, p, t, &err) : row_task(job, p, t, &err);
        if (rc != BR_OK) {
            fail(job, &err, rc);
            break;
        }
    }
    br_probe_free(p);
    return NULL;
}

/* Run the stage's tasks on up to `threads` threads (this one included). */
static int run_stage(map_job *job, int stage, int ntasks, int threads)
{
    pthread_t tid[BR_MAP_MAX_THREADS];
    int started = 0;
    job->stage = stage;
    job->ntasks = ntasks;
    job->next = 0;
    for (int t = 1; t < threads && t < ntasks; t++)
        if (pthread_create(&tid[started], NULL, worker, job) == 0)
            started++;
    worker(job);
    for (int t = 0; t < started; t++)
        pthread_join(tid[t], NULL);
    return job->rc;
}

/* ---- the whole map ------------------------------------------------------ */

static void free_seeds(br_warm **seed, int n)
{
    if (!seed)
        return;
    for (int j = 0; j < n; j++)
        br_warm_free(seed[j]);
    free(seed);
}

static int alloc_seeds(const br_probe *p, int n, br_warm ***out, br_error *err)
{
    br_warm **seed = calloc((size_t)n, sizeof *seed);
    int ok = seed != NULL;
    for (int j = 0; ok && j < n; j++)
        ok = (seed[j] = br_warm_create(p)) != NULL;
    if (!ok) {
        free_seeds(seed, n);
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL,
                            "out of memory for the map's warm starts");
    }
    *out = seed;
    return BR_OK;
}

/* The design point, then the grid point nearest it, from a cold start. */
static int first_points(map_job *job, br_probe *p, br_map *m, br_warm *seed, br_error *err)
{
    const br_chain *c = br_probe_design_chain(p);
    m->col0 = nearest(m->duty, m->nduty, c->duty, 0);
    m->row0 = nearest(m->fsw, m->nfsw, c->fsw, 1);
    int rc = br_probe_eval(p, c->duty, c->fsw, &m->design, err);
    if (rc == BR_OK && br_meter_add(&job->meter, 1.0))
        rc = br_progress_cancelled(err);
    if (rc == BR_OK)
        rc = grid_point(job, p, m->col0, m->row0, err);
    br_probe_save(p, seed);
    return rc;
}

static long total_periods(const br_map *m)
{
    long n = m->design.periods;
    for (int k = 0; k < m->nduty * m->nfsw; k++)
        n += m->pt[k].periods;
    return n;
}

/* The two stages on the worker threads, once the first points are known. */
static int run_stages(map_job *job, int threads, br_error *err)
{
    br_map *m = job->m;
    m->threads = threads;
    if (pthread_mutex_init(&job->lock, NULL) != 0)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "cannot create a lock for the workers");
    int rc = run_stage(job, 1, 2, threads);
    if (rc == BR_OK)
        rc = run_stage(job, 2, 2 * shard_rows(job->o, m->nfsw), threads);
    pthread_mutex_destroy(&job->lock);
    if (rc != BR_OK && err)
        *err = job->err;
    return rc;
}

/* The map from its points as judged (merging shards). */
static int map_given(const br_map_opts *o, br_map **out, br_error *err)
{
    br_map *m;
    int rc = map_alloc(o, &m, err);
    if (rc != BR_OK)
        return rc;
    size_t n = (size_t)m->nduty * (size_t)m->nfsw;
    memcpy(m->pt, o->given, n * sizeof *m->pt);
    m->design = o->given[n];
    m->col0 = nearest(m->duty, m->nduty, m->design.duty, 0);
    m->row0 = nearest(m->fsw, m->nfsw, m->design.fsw, 1);
    m->threads = o->threads;
    m->periods = total_periods(m);
    *out = m;
    return BR_OK;
}

/* Points judged by the run: the design point, and the grid (its design
 * column and own rows for a shard). */
static double points_expected(const br_map_opts *o)
{
    int rows = shard_rows(o, o->nfsw);
    if (o->shard_n <= 0)
        return (double)o->nduty * o->nfsw + 1.0;
    return 1.0 + o->nfsw + (double)rows * (o->nduty - 1);
}

int br_map_run(const br_design *d, const br_map_opts *o, br_map **out, br_error *err)
{
    *out = NULL;
    br_map *m = NULL;
    br_probe *p = NULL;
    map_job job = {.d = d, .o = o, .rc = BR_OK};
    if (d->ac.on) /* its modulation sets every period's duty */
        return br_error_set(err, BR_EINPUT, d->path, d->ac.line, "operating-point: line-cycle",
                            "map moves a fixed duty and switching frequency, and a line cycle's "
                            "modulation sets the duty of every switching period; expected a "
                            "design with a DC load (window gives a line cycle's limits in peak "
                            "current and line frequency)");
    int rc = br_map_opts_check(o, err);
    if (rc != BR_OK)
        return rc;
    if (o->given)
        return map_given(o, out, err);
    rc = br_meter_init(&job.meter, o->progress, points_expected(o), err);
    if (rc != BR_OK)
        return rc;
    rc = map_alloc(o, &m, err);
    job.m = m;
    if (rc == BR_OK)
        rc = br_probe_create(d, &p, err);
    if (rc == BR_OK)
        br_probe_set_stop(p, br_meter_poll(&job.meter));
    if (rc == BR_OK)
        rc = alloc_seeds(p, o->nfsw, &job.seed, err);
    if (rc == BR_OK)
        rc = first_points(&job, p, m, job.seed[m->row0], err);
    br_probe_free(p);
    if (rc == BR_OK)
        rc = run_stages(&job, o->threads, err);
    br_meter_destroy(&job.meter);
    free_seeds(job.seed, o->nfsw);
    if (rc != BR_OK) {
        br_map_free(m);
        return rc;
    }
    m->periods = total_periods(m);
    *out = m;
    return BR_OK;
}

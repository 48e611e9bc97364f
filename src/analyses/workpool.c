/* workpool.c - items judged on worker threads (workpool.h says what). */
#include "analyses/workpool.h"

#include "analyses/spread.h"
#include "core/error.h"

#include <pthread.h>

typedef struct pool {
    int n, next;
    br_work_fn fn;
    void *ctx;
    br_meter *meter;
    double weight;
    pthread_mutex_t lock;
    int failed; /* an item returned an error: the first is in err */
    br_error err;
} pool;

static void *worker(void *arg)
{
    pool *p = arg;
    for (;;) {
        int stop = br_meter_stopped(p->meter);
        pthread_mutex_lock(&p->lock);
        int i = p->failed || stop ? p->n : p->next++;
        pthread_mutex_unlock(&p->lock);
        if (i >= p->n)
            return NULL;
        br_error err;
        br_error_clear(&err);
        if (p->fn(p->ctx, i, &err) != BR_OK) {
            pthread_mutex_lock(&p->lock);
            if (!p->failed++)
                p->err = err;
            pthread_mutex_unlock(&p->lock);
        }
        br_meter_add(p->meter, p->weight);
    }
}

int br_work_run(int n, int threads, br_work_fn fn, void *ctx, br_meter *meter, double weight,
                br_error *err)
{
    if (n <= 0)
        return BR_OK;
    pool p = {.n = n, .fn = fn, .ctx = ctx, .meter = meter, .weight = weight};
    pthread_t tid[BR_SPREAD_MAX_THREADS];
    int nt = threads > 0 ? threads : br_cpu_count(), started = 0;
    nt = nt > n ? n : nt > BR_SPREAD_MAX_THREADS ? BR_SPREAD_MAX_THREADS : nt;
    if (pthread_mutex_init(&p.lock, NULL) != 0)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "cannot create a lock");
    for (int t = 1; t < nt; t++)
        started += pthread_create(&tid[started], NULL, worker, &p) == 0;
    worker(&p);
    for (int t = 0; t < started; t++)
        pthread_join(tid[t], NULL);
    pthread_mutex_destroy(&p.lock);
    if (p.failed) {
        *err = p.err;
        return p.err.code ? p.err.code : BR_ENOMEM;
    }
    return BR_OK;
}

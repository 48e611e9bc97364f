/* meter.c - progress shared by worker threads. */
#include "analyses/meter.h"

#include "core/error.h"

int br_meter_init(br_meter *m, const br_progress *hook, double total, br_error *err)
{
    m->hook = hook && (hook->fn || hook->stop) ? hook : NULL;
    m->done = 0.0;
    m->total = total;
    m->stop = 0;
    if (pthread_mutex_init(&m->lock, NULL) != 0)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "cannot create a lock for progress");
    return BR_OK;
}

void br_meter_destroy(br_meter *m)
{
    if (m)
        pthread_mutex_destroy(&m->lock);
}

void br_meter_grow(br_meter *m, double more)
{
    if (!m)
        return;
    pthread_mutex_lock(&m->lock);
    m->total += more;
    pthread_mutex_unlock(&m->lock);
}

int br_meter_add(br_meter *m, double work)
{
    if (!m)
        return 0;
    pthread_mutex_lock(&m->lock);
    m->done += work;
    if (m->total < m->done)
        m->total = m->done; /* an estimate that fell short */
    /* the hook runs under the lock: one call at a time, counts in order */
    if (!m->stop && m->hook &&
        (br_progress_stopped(m->hook) ||
         (m->hook->fn && m->hook->fn(m->hook->ctx, m->done, m->total))))
        m->stop = 1;
    int stop = m->stop;
    pthread_mutex_unlock(&m->lock);
    return stop;
}

static int poll_meter(void *ctx, double done, double total)
{
    (void)done;
    (void)total;
    return br_meter_add(ctx, 0.0);
}

static int stop_meter(void *ctx)
{
    return br_meter_stopped(ctx);
}

br_progress br_meter_poller(br_meter *m)
{
    br_progress p = {m ? poll_meter : NULL, m, m ? stop_meter : NULL};
    return p;
}

int br_meter_stopped(br_meter *m)
{
    if (!m)
        return 0;
    pthread_mutex_lock(&m->lock);
    if (!m->stop && br_progress_stopped(m->hook))
        m->stop = 1;
    int stop = m->stop;
    pthread_mutex_unlock(&m->lock);
    return stop;
}

const br_progress *br_meter_poll(const br_meter *m)
{
    return m ? m->hook : NULL;
}

int br_meter_status(br_meter *m, int rc, br_error *err)
{
    return br_meter_stopped(m) ? br_progress_cancelled(err) : rc;
}

/* meter.h - the progress of one analysis, shared by its worker threads.
 *
 * Workers add the work they finish (points judged, runs made); the meter
 * passes the running count to the caller's hook (core/progress.h) under
 * its lock, so the hook is never called from two threads at once.  Once
 * the hook asks to stop, the meter stays stopped: workers ask
 * br_meter_stopped before taking more work and the analysis returns
 * BR_ECANCEL; a stop poll the hook carries is honoured the same way.  A
 * meter without a hook only counts. */
#ifndef BR_ANALYSES_METER_H
#define BR_ANALYSES_METER_H

#include "core/progress.h"

#include <pthread.h>

typedef struct br_meter {
    const br_progress *hook; /* the caller's (NULL: none) */
    pthread_mutex_t lock;    /* guards the fields below and the calls to the hook */
    double done;             /* work finished, in the analysis' unit */
    double total;            /* work expected in all (an estimate; it may grow) */
    int stop;                /* the hook asked to stop (sticky) */
} br_meter;

/* Start a meter expecting `total`; BR_ENOMEM (err filled) when the lock
 * cannot be made. */
int br_meter_init(br_meter *m, const br_progress *hook, double total, br_error *err);
void br_meter_destroy(br_meter *m);

/* Expect `more` work besides what was expected (m may be NULL). */
void br_meter_grow(br_meter *m, double more);

/* Count `work` more done and tell the hook; returns 1 when the run is to
 * stop (m may be NULL: returns 0). */
int br_meter_add(br_meter *m, double work);

/* A progress hook for a long step inside one piece of work (a line
 * cycle's steady state): it counts nothing, passes the meter's count to
 * the caller's hook, which may stop the run, and says whether the run is
 * to stop; its stop poll (safe from any thread) says the same without
 * calling the hook.  The hook keeps m (which must outlive it). */
br_progress br_meter_poller(br_meter *m);

/* 1 once the hook has asked to stop (m may be NULL: 0). */
int br_meter_stopped(br_meter *m);

/* The caller's hook, for the simulators of the workers to poll its stop
 * function (which any thread may call); NULL when there is none.  The
 * hook's progress function is for the meter alone. */
const br_progress *br_meter_poll(const br_meter *m);

/* BR_ECANCEL with err filled when stopped, else rc unchanged: what an
 * analysis returns after its workers have finished. */
int br_meter_status(br_meter *m, int rc, br_error *err);

#endif

/* workpool.h - items judged on worker threads: each thread takes the next
 * item until every one is taken, one fails or the meter says stop.  The
 * items are independent (a part choice, an explored combination), so
 * which thread judges which does not change any result. */
#ifndef BR_ANALYSES_WORKPOOL_H
#define BR_ANALYSES_WORKPOOL_H

#include "analyses/meter.h"
#include "bootrung/bootrung.h"

/* Judge item i; a br_status. */
typedef int (*br_work_fn)(void *ctx, int i, br_error *err);

/* fn(ctx, i) for i from 0 to n - 1 on `threads` threads, the calling one
 * among them (0: one per processor; never more than n or
 * BR_SPREAD_MAX_THREADS), each item adding `weight` to meter (may be
 * NULL) once judged.  Returns BR_OK, or the first failing item's status
 * with its error in err (BR_ENOMEM when the lock cannot be made).  A stop
 * only ends the handing out: what it means is the caller's to say
 * (br_meter_status). */
int br_work_run(int n, int threads, br_work_fn fn, void *ctx, br_meter *meter, double weight,
                br_error *err);

#endif

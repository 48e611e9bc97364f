/* progress.h - how a long analysis reports how far it has come, and how
 * its caller asks it to stop.
 *
 * The library never prints: an analysis that may run for seconds calls
 * the caller's hook now and then with the work done so far and the work
 * it expects in all (in whatever unit suits it: grid points, samples,
 * simulated seconds; `total` is an estimate and may grow).  The hook
 * returns non-zero to ask the run to stop; the analysis then stops at its
 * next check, frees everything it built and returns BR_ECANCEL.
 *
 * Threads: an analysis that uses worker threads calls the hook from
 * whichever of them finished a piece of work, but never from two at once
 * (the calls are serialised by the analysis).  The hook must not call back
 * into the analysis.  Analyses take it as `const br_progress *progress`
 * in their options; NULL means no hook. */
#ifndef BR_CORE_PROGRESS_H
#define BR_CORE_PROGRESS_H

#include "bootrung/bootrung.h"

/* done and total in the same unit, 0 <= done; returns non-zero to stop. */
typedef int (*br_progress_fn)(void *ctx, double done, double total);

typedef struct br_progress {
    br_progress_fn fn; /* the hook (NULL: none) */
    void *ctx;         /* handed back to it */
} br_progress;

/* Call p's hook (p may be NULL).  Returns BR_OK, or BR_ECANCEL with err
 * saying so when the hook asks to stop. */
int br_progress_call(const br_progress *p, double done, double total, br_error *err);

/* Fill err for a run the caller stopped; returns BR_ECANCEL. */
int br_progress_cancelled(br_error *err);

#endif

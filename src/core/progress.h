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
 * in their options; NULL means no hook.
 *
 * A piece of work can itself be long (one simulated start-up of a slow
 * design), so besides the hook a caller may give a stop poll: a cheap
 * function, safe to call from any thread at any time, that says whether
 * a stop has been asked for.  The simulator calls it every few
 * milliseconds of work, so that a stop takes effect within a blink
 * whatever the analysis is doing. */
#ifndef BR_CORE_PROGRESS_H
#define BR_CORE_PROGRESS_H

#include "bootrung/bootrung.h"

/* done and total in the same unit, 0 <= done; returns non-zero to stop. */
typedef int (*br_progress_fn)(void *ctx, double done, double total);

/* Non-zero once the run is to stop; called often, from any thread. */
typedef int (*br_stop_fn)(void *ctx);

typedef struct br_progress {
    br_progress_fn fn; /* the hook (NULL: none) */
    void *ctx;         /* handed back to it and to stop */
    br_stop_fn stop;   /* the stop poll (NULL: only fn stops a run) */
} br_progress;

/* Call p's hook (p may be NULL).  Returns BR_OK, or BR_ECANCEL with err
 * saying so when the hook asks to stop. */
int br_progress_call(const br_progress *p, double done, double total, br_error *err);

/* 1 when p has a stop poll and it asks to stop (p may be NULL). */
int br_progress_stopped(const br_progress *p);

/* p's stop poll alone (no progress function): what a worker thread hands
 * to an analysis that would otherwise call p's function itself. */
br_progress br_progress_stop_only(const br_progress *p);

/* Fill err for a run the caller stopped; returns BR_ECANCEL. */
int br_progress_cancelled(br_error *err);

#endif

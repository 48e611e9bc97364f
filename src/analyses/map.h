/* map.h - the hold map: the worst steady-state margin and what binds it
 * over a grid of duty x switching frequency.
 *
 * Duty is spaced linearly, frequency geometrically (equal ratios), both
 * ends included.  Every row (one frequency) is walked from the column
 * nearest the design duty outward, each point warm-started from its
 * neighbour; the rows' first points are found first, walking the
 * frequency column from the design point outward.  Rows then go to the
 * worker threads, each with its own probe.  A row starts from the same
 * stored warm start whichever thread takes it, so the map does not
 * depend on the number of threads. */
#ifndef BR_ANALYSES_MAP_H
#define BR_ANALYSES_MAP_H

#include "analyses/probe.h"
#include "core/progress.h"

#define BR_MAP_MAX_N 400 /* points per axis */
#define BR_MAP_MAX_THREADS 16

/* crit of a grid point where the dead time leaves the bottom switches no
 * on-time: not an operating point at all. */
#define BR_MAP_NO_ONTIME (-1)

typedef struct br_map_opts {
    double duty_from, duty_to; /* fractions */
    int nduty;
    double fsw_from, fsw_to; /* Hz */
    int nfsw;
    int threads;                 /* worker threads (default 2) */
    const br_progress *progress; /* grid points judged of nduty * nfsw + 1 (NULL: none);
                                    called from the workers one at a time */
    /* A shard (shard_n > 0): the design point and column and the rows j
     * with j % shard_n == shard_k - 1 only (br_map_shard_has); the other
     * points are left zero.  Every shard starts its rows from the same
     * column, so the shards' points are the unsharded map's. */
    int shard_k, shard_n;
    /* Merging shards: the nduty * nfsw grid points, then the design point,
     * as judged; nothing is simulated (NULL: judge them). */
    const br_hold_point *given;
} br_map_opts;

typedef struct br_map {
    int nduty, nfsw;
    double *duty;         /* nduty values, ascending as given */
    double *fsw;          /* nfsw values, Hz */
    br_hold_point *pt;    /* nfsw rows of nduty: pt[j * nduty + i] at (duty[i], fsw[j]) */
    br_hold_point design; /* the design point itself */
    int col0, row0;       /* grid column and row nearest the design point */
    int threads;          /* threads used */
    long periods;         /* periods simulated in all */
} br_map;

/* Check the options (ranges, counts); BR_EINPUT with a message naming the
 * option when they are wrong. */
int br_map_opts_check(const br_map_opts *o, br_error *err);

/* Compute the map of design d.  BR_ECANCEL when o->progress asks to stop
 * (every worker stops after its current point; nothing is returned). */
int br_map_run(const br_design *d, const br_map_opts *o, br_map **out, br_error *err);
void br_map_free(br_map *m);

/* Whether shard o->shard_k of o->shard_n judges point (i, j) of m: the
 * design column, and its own rows (every point without a shard). */
int br_map_shard_has(const br_map *m, const br_map_opts *o, int i, int j);

/* The point at column i, row j. */
const br_hold_point *br_map_at(const br_map *m, int i, int j);

#endif

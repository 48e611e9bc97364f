/* probe.h - the worst steady-state margin of a design at any operating
 * point (duty, switching frequency), for the scans of `window` and `map`.
 *
 * A probe owns a copy of the design whose duty and frequency it moves,
 * the chain built from it, and a warm start per current direction (the
 * last steady state and Newton matrix), so that a point next to the last
 * one costs a few simulated periods instead of twenty.
 *
 * The margin of a point is the smallest, over every rail, every current
 * direction the design asks for and the criteria UVLO falling, minimum
 * useful drive and gate absolute maximum, of (figure - limit) in volts;
 * it is >= 0 exactly when every one of them holds.  So that the margin
 * stays a continuous function across a limit (Brent needs one), the probe
 * simulates its chain with the drivers kept running below UVLO: where
 * every driver stays above UVLO falling that chain is the real one, and
 * past the limit the UVLO margin simply goes negative instead of the
 * driver dropping out.  The margins are measured against the design's
 * real thresholds. */
#ifndef BR_ANALYSES_PROBE_H
#define BR_ANALYSES_PROBE_H

#include "analyses/figures.h"

/* One operating point, judged. */
typedef struct br_hold_point {
    double duty;   /* top-switch duty, fraction */
    double fsw;    /* switching frequency, Hz */
    double margin; /* worst margin, V (< 0 fails); NAN when a steady state was not found */
    int holds;     /* every steady state found and margin >= 0 */
    int stage;     /* binding rail, -1 when none */
    int crit;      /* binding br_crit: UVLO, DRIVE or GATE; STEADY when not found */
    int dir;       /* binding br_dir_index */
    long periods;  /* periods simulated to judge it */
    /* a line cycle: the point's peak current (A) and line frequency (Hz),
     * and the line phase where the binding margin occurs (rad; NAN
     * without a line cycle or a binding rail) */
    double ipk, fline, theta;
} br_hold_point;

typedef struct br_probe br_probe;

/* A warm start that can be handed from one probe to another (map rows
 * seeded the same way whichever thread runs them). */
typedef struct br_warm br_warm;

/* A probe of design d (copied; d may go afterwards). */
int br_probe_create(const br_design *d, br_probe **out, br_error *err);
void br_probe_free(br_probe *p);

/* Poll stop's stop function (core/progress.h) inside every simulation of
 * the probe: a stop asked for ends br_probe_eval with BR_ECANCEL within
 * milliseconds (NULL: none; it must outlive the probe's use). */
void br_probe_set_stop(br_probe *p, const br_progress *stop);

/* The chain at the design point with its real thresholds (for reports). */
const br_chain *br_probe_design_chain(const br_probe *p);

/* Judge the point (duty, fsw), warm-started from the last point judged.
 * A point the chain model refuses (on-times that the dead time makes
 * negative) is BR_EINPUT. */
int br_probe_eval(br_probe *p, double duty, double fsw, br_hold_point *out, br_error *err);

/* A design on a line cycle: judge the point (peak current ipk, line
 * frequency fline) at the design's duty modulation and switching
 * frequency, warm-started as br_probe_eval. */
int br_probe_eval_line(br_probe *p, double ipk, double fline, br_hold_point *out, br_error *err);

/* 1 when the design runs a line cycle (br_probe_eval_line applies). */
int br_probe_line(const br_probe *p);

/* A hook the steady-state solves of a line cycle call while they run
 * (seconds each), to stop them (NULL: none). */
void br_probe_set_progress(br_probe *p, const br_progress *hook);

/* Forget the warm start: the next point starts cold. */
void br_probe_forget(br_probe *p);

/* A warm start for probes of the same design as p, kept apart from it.
 * Returns NULL when out of memory. */
br_warm *br_warm_create(const br_probe *p);
void br_warm_free(br_warm *w);
void br_probe_save(const br_probe *p, br_warm *w);
void br_probe_load(br_probe *p, const br_warm *w);

/* The duty range the dead time allows at frequency fsw (both on-times
 * positive), shrunk by `guard` at each end.  0 when it is empty. */
int br_probe_duty_range(const br_probe *p, double fsw, double guard, double *lo, double *hi);

/* The highest frequency the dead time allows at duty, times (1 - guard). */
double br_probe_fsw_ceiling(const br_probe *p, double duty, double guard);

/* 1 when the design's duty moves its switches (an FCML leg); an explicit
 * switch string has fixed on-intervals. */
int br_probe_duty_applies(const br_probe *p);

#endif

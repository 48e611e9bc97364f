/* window.h - how far a design can move from its operating point: the
 * duty and frequency limits of the periodic steady state, the hold-up
 * time once switching stops, and the start-up window.
 *
 * Steady-state limits: along one axis (duty at the design frequency, or
 * frequency at the design duty) a coarse scan from the design point
 * outward brackets every change between "holds" and "fails" of the worst
 * margin (probe.h); Brent's method (GSL) on the margin, as a function of
 * duty or of log frequency, then narrows each bracket to the resolution.
 * The margin need not be monotonic: every holding interval the scan finds
 * is reported, and the one around the design point gives the limits. */
#ifndef BR_ANALYSES_WINDOW_H
#define BR_ANALYSES_WINDOW_H

#include "analyses/holdup.h"
#include "analyses/probe.h"
#include "core/progress.h"

#define BR_MAX_SCAN 64      /* coarse scan points, the design point included */
#define BR_MAX_SPANS 8      /* holding intervals kept per axis */
#define BR_MAX_SU_POINTS 48 /* cold starts kept per axis, both ends */

typedef enum br_axis {
    BR_AXIS_DUTY = 0, /* duty at the design frequency */
    BR_AXIS_FSW = 1,  /* frequency at the design duty */
    BR_AXIS_IPK = 2,  /* a line cycle's peak current at the design line frequency */
    BR_AXIS_FLINE = 3 /* a line cycle's frequency at the design peak current */
} br_axis;

typedef enum br_limit_kind {
    BR_LIMIT_FOUND = 0,    /* the crossing lies between `value` and `outside` */
    BR_LIMIT_RANGE_END = 1 /* still holds at the end of the range scanned */
} br_limit_kind;

/* One end of an interval where the chain holds. */
typedef struct br_limit {
    int kind;          /* br_limit_kind */
    double value;      /* the last value that holds: duty, or Hz */
    double outside;    /* BR_LIMIT_FOUND: the nearest value found failing,
                          within the resolution of `value` */
    br_hold_point in;  /* the point at `value` */
    br_hold_point out; /* the point at `outside` (what binds there) */
} br_limit;

/* An interval of the axis where every criterion holds. */
typedef struct br_span {
    br_limit lo, hi;
} br_span;

typedef struct br_sweep {
    int axis;                   /* br_axis */
    int applies;                /* 0: an explicit switch string has no duty to move */
    double lo, hi;              /* range scanned: duty, or Hz */
    double design;              /* the design's value */
    double fixed;               /* the other coordinate, held: Hz, or duty */
    double resolution;          /* duty: absolute (0.001 = 0.1 % of duty);
                                   frequency: relative (0.005 = 0.5 %);
                                   peak current: absolute, A; line frequency:
                                   relative */
    int nspans;                 /* holding intervals found (0: never holds) */
    int truncated;              /* more intervals than BR_MAX_SPANS */
    br_span span[BR_MAX_SPANS]; /* ascending */
    int home;                   /* the span holding the design point, -1 when it fails */
    int nscan;                  /* coarse scan, ascending, design point included */
    br_hold_point scan[BR_MAX_SCAN];
    int evals;    /* points judged */
    long periods; /* periods simulated for them */
} br_sweep;

/* The start-up window along one axis: how far the value can go either way
 * from the design's with the cold start still completing within the
 * design's start-up limit.  Both ends matter: a low duty starves the
 * charging windows of the top switches, a high duty those of the bottom
 * switches; a low frequency lets the rails droop between windows, a high
 * one shortens the windows against the dead time and raises the gate
 * charge each started driver draws. */
typedef struct br_su_point {
    double value; /* duty, or Hz */
    int complete;
    double t_total; /* start-up time, s (when complete) */
    int stalled;    /* first stage not running at the end, -1 */
} br_su_point;

/* One end of the start-up window. */
typedef struct br_su_end {
    int kind;       /* br_limit_kind */
    double value;   /* the furthest value found starting (as `value` of a br_limit) */
    double failing; /* the nearest value found failing beyond it (NAN: none) */
    int stalled;    /* first stalled stage at `failing`, -1 (none, or it
                       starts too late) */
} br_su_end;

typedef struct br_su_window {
    int axis; /* br_axis */
    int applies;
    int design_starts; /* the cold start completes at the design point */
    br_su_end low;     /* toward lo */
    br_su_end high;    /* toward hi */
    double lo, hi;     /* the range searched */
    double resolution; /* as in br_sweep */
    int npts;          /* every run, ascending in value */
    br_su_point pt[BR_MAX_SU_POINTS];
} br_su_window;

typedef struct br_window_opts {
    double fmin, fmax;           /* frequency range, Hz; 0: the design's / 100 and * 100
                                    (the top kept below what the dead time allows); on a
                                    line cycle the line frequency's, 0: the design's / 10
                                    and * 4 (within BR_LINE_MIN_PERIODS and
                                    BR_LINE_MAX_PERIODS switching periods) */
    int nscan_duty;              /* coarse scan points (default 21) */
    int nscan_fsw;               /* default 25 */
    int nscan_line;              /* a line cycle's axes (default 9 each: a point is a whole
                                    line cycle) */
    int startup;                 /* 1: also the start-up window (a cold start per point) */
    int threads;                 /* 2 (default): duty and frequency swept side by side */
    const br_progress *progress; /* points judged of an estimate (scan points, about a
                                    dozen refinements per axis, the start-up runs); the
                                    estimate grows when the search needs more; NULL: none */
} br_window_opts;

void br_window_opts_default(br_window_opts *o);

typedef struct br_window {
    br_hold_point design; /* the design point judged */
    int line;             /* the design runs a line cycle: ipk and fline are swept, duty
                             and fsw not (applies 0) */
    br_sweep duty, fsw;
    br_sweep ipk, fline; /* a line cycle: peak current and line frequency */
    int nholdup;         /* one per direction the design asks for */
    br_holdup holdup[2];
    int startup; /* the start-up window was computed */
    br_su_window su_duty, su_fsw;
    double seconds; /* not filled here; for callers that time it */
} br_window;

/* Run every analysis of the window on design d (its chain is built here
 * and at every point; d is not changed).  BR_ECANCEL when o->progress
 * asks to stop (out then holds nothing meaningful). */
int br_window_run(const br_design *d, const br_window_opts *o, br_window *out, br_error *err);

/* One axis only, from probe p whose warm start w0 is at the design point
 * (judged as `at`).  lo/hi in the axis' unit. */
int br_sweep_run(br_probe *p, int axis, double fixed, double lo, double hi, const br_hold_point *at,
                 const br_warm *w0, int nscan, br_sweep *out, br_error *err);

/* The start-up window along one axis on the design d: from the design
 * value down to lo and up to hi. */
int br_su_window_run(const br_design *d, int axis, double lo, double hi, br_su_window *out,
                     br_error *err);

/* The resolution the limits are found to: duty absolute, frequency
 * relative; a line cycle's peak current relative to the design's (or to
 * 1 A when that is 0), its line frequency relative. */
#define BR_RES_DUTY 0.001
#define BR_RES_FSW 0.005
#define BR_RES_IPK 0.01
#define BR_RES_FLINE 0.01

#endif

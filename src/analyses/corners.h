/* corners.h - extreme-value analysis: each criterion's worst corner.
 *
 * A corner puts every toleranced parameter at its minimum or maximum
 * (model/tolerance.h).  For each criterion of the verdict the search keeps
 * the point with the smallest margin (a failing row before any passing
 * one), with the levels that make it.
 *
 * Method, steady-state criteria (each point judged without the cold
 * start, which they do not need):
 *  - exhaustive: with up to max_exhaustive parameters, every one of the
 *    2^k corners;
 *  - guided, beyond that: the one-at-a-time points (each parameter alone
 *    at each limit) give each criterion's sensitivity to each parameter
 *    and the limit that lowers its margin; then every corner of its most
 *    sensitive parameters (up to max_sensitive), the others held at the
 *    limit that lowers the margin (or nominal when neither does).
 * Start-up criteria (start-up time, inrush, dropouts) need a cold start at each
 * point, about a hundred periods, so they get their own, smaller search
 * of the same two kinds (startup_max_exhaustive, startup_max_sensitive).
 * Those points judge the steady-state criteria too and count for them.
 * Every point tried counts: the nominal and the one-at-a-time points
 * included.
 *
 * A point where a criterion cannot be decided (its steady state not
 * settled, its cold start not finished, the point not judged at all)
 * does not count towards that criterion's worst point: it is counted
 * apart, and a criterion that fails nowhere but is undetermined somewhere
 * is undetermined, never a pass. */
#ifndef BR_ANALYSES_CORNERS_H
#define BR_ANALYSES_CORNERS_H

#include "analyses/spread.h"

typedef enum br_corner_method {
    BR_CORNERS_SKIPPED = 0,    /* not searched (start-up criteria turned off) */
    BR_CORNERS_EXHAUSTIVE = 1, /* every corner */
    BR_CORNERS_GUIDED = 2      /* sensitivities, then the corners of the sensitive set */
} br_corner_method;

typedef struct br_corners_opts {
    int threads;                /* worker threads; 0: one per online processor */
    int max_exhaustive;         /* steady criteria: every corner up to this many parameters (10) */
    int max_sensitive;          /* guided: corners of up to this many parameters a criterion (8) */
    int startup;                /* search the start-up criteria too (1) */
    int startup_max_exhaustive; /* start-up criteria: every corner up to this many parameters (4) */
    int startup_max_sensitive;  /* guided: corners of up to this many parameters (3) */
    const br_progress *progress; /* points judged of those listed so far (the total grows
                                    as each pass lists its corners); NULL: none */
    int solver_limit;            /* br_spread_opts.solver_limit (0: none) */
} br_corners_opts;

/* One criterion's worst point. */
typedef struct br_corner_worst {
    int applies;                   /* the criterion was decided at some point */
    br_pt_row nominal;             /* its row at the nominal point */
    br_pt_row worst;               /* its row at the worst point found */
    signed char level[BR_TOL_MAX]; /* that point: -1 minimum, 0 nominal, +1 maximum per parameter */
    int nsens;                     /* guided: parameters whose corners were all tried */
    int outcome;                   /* br_outcome (meaningful when applies or undetermined) */
    long undetermined;             /* points where it could not be decided */
    signed char ulevel[BR_TOL_MAX]; /* the first of them */
} br_corner_worst;

typedef struct br_corners {
    br_spread *s;                      /* the design's tolerances and nominal point (owned) */
    int method;                        /* br_corner_method of the steady-state criteria */
    int su_method;                     /* br_corner_method of the start-up criteria */
    int max_exhaustive, max_sensitive; /* the options the search ran with */
    int startup_max_exhaustive, startup_max_sensitive;
    long steady_points;  /* corners judged without a cold start */
    long startup_points; /* corners judged with one */
    long unjudged;       /* points that could not be judged at all (solver or model failure) */
    long unsettled;      /* points judged where the steady state of a direction whose
                            drivers keep running did not settle */
    long undetermined;   /* points where some criterion was not decided (these and others) */
    br_corner_worst w[BR_CRIT_COUNT];
    long su_integrated, su_stepped; /* the corners' cold starts: periods integrated and
                                       stepped over along the rails' envelope */
    int all_pass; /* every criterion passes at its worst point and none is undetermined */
    int outcome;  /* br_outcome: fail when a criterion fails somewhere, else undetermined
                     when one is undetermined somewhere, else pass */
} br_corners;

void br_corners_opts_default(br_corners_opts *o);

/* Search design d (which must outlive the result).  BR_ECANCEL when
 * o->progress asks to stop (nothing is returned). */
int br_corners_run(const br_design *d, const br_corners_opts *o, br_corners **out, br_error *err);
void br_corners_free(br_corners *c);

/* The rail headroom (br_pt.headroom) as one more objective of the
 * searches, after the criteria: it finds the corners where a regulated
 * rail drops out, which the flat margins of a regulated driver hide. */
#define BR_OBJ_HEADROOM BR_CRIT_COUNT

/* Which limit of each parameter lowers objective crit (a br_crit or
 * BR_OBJ_HEADROOM), from the one-at-a-time points of s: level[j] is -1,
 * +1, or 0 when neither limit lowers it; effect[j] (may be NULL) how
 * much it lowers it. */
void br_corner_sensitivity(const br_spread *s, int crit, signed char *level, double *effect);

#endif

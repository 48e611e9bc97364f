/* spread.h - a design over its tolerances: its nominal point, the
 * one-at-a-time sensitivities, and many points judged in parallel.
 *
 * A point gives every toleranced parameter (model/tolerance.h) a value.
 * Judging it means what `analyze` does: build the chain at those values,
 * optionally the cold start, the periodic steady state of every current
 * direction the design asks for, their figures and the verdict rows.  The
 * corner search, the Monte Carlo yield and the part search all judge
 * points through here, so a point means the same to each of them.
 *
 * Speed.  Points are judged by worker threads, each with its own copy of
 * the design, chain and simulators.  A point's steady state starts from a
 * prediction: the nominal state plus, for each parameter, the change its
 * one-at-a-time point made, scaled to the point's value (piecewise linear
 * through the minimum, the nominal and the maximum).  One period is
 * simulated from it, and a chord step computed (Newton's method with the
 * Jacobian of the nominal point's period map, found once by finite
 * differences): the step is the distance to the periodic state that the
 * Jacobian predicts, which a small change per period can hide when the
 * chain has a slow mode.  The period is taken as the steady state when it
 * moves no rail by more than 100 uV (the drift the verdict allows), no
 * driver drops out and the chord step is no longer than `accept`;
 * otherwise the step is taken and the test repeated, a few times, before
 * the shooting solver takes over from the best state so far.  Every
 * figure comes from a simulated period of the point's own chain, within
 * about `accept` of its periodic steady state.
 *
 * Junction temperatures.  Where link diodes have a thermal resistance,
 * the prediction carries their temperatures too (the nominal ones plus
 * their one-at-a-time changes, scaled alike), and the quasi-Newton steps
 * run with every such diode at its predicted temperature.  The period
 * taken is checked as the loop of steady.c checks its passes: the
 * temperatures its losses give must lie within BR_THERMAL_TOL of those
 * assumed; if not, the steps go on from it at the temperatures found (a
 * pass, BR_THERMAL_PASSES at most).  So a point's figures are those of a
 * period within about `accept` of its periodic steady state at junction
 * temperatures that its own losses reproduce within BR_THERMAL_TOL: what
 * the full loop accepts.  A point where this does not settle (steps that
 * stall, a link that runs away) is solved as without the prediction:
 * quasi-Newton steps with the junctions at the ambient, then the full
 * loop of shooting passes from the state they reach.
 *
 * Reproducibility.  A point's result depends only on its values and on
 * the nominal and one-at-a-time results, never on which thread took it or
 * what that thread did before, so any number of threads gives identical
 * numbers. */
#ifndef BR_ANALYSES_SPREAD_H
#define BR_ANALYSES_SPREAD_H

#include "analyses/figures.h"
#include "analyses/meter.h"
#include "model/tolerance.h"

#define BR_SPREAD_MAX_THREADS 64
#define BR_SPREAD_NX (2 * BR_MAX_SWITCHES) /* steady-state vector length */

/* What a point, a criterion over many points, or a whole search comes
 * to.  Undetermined: nothing fails, but something could not be decided
 * (a steady state the solver did not settle, a cold start it could not
 * finish, a point it could not judge at all); never a pass, never a
 * failure. */
typedef enum br_outcome {
    BR_OUTCOME_PASS = 0,
    BR_OUTCOME_FAIL = 1,
    BR_OUTCOME_UNDETERMINED = 2
} br_outcome;

/* "pass", "fail", "undetermined". */
const char *br_outcome_name(int outcome);

/* One verdict row at one point, compactly. */
typedef struct br_pt_row {
    signed char applies; /* the criterion was checked (or is undetermined) */
    signed char pass;
    signed char warn;             /* passes with a warning (br_verdict_row.warn) */
    signed char undetermined;     /* applies, but not decided here (pass is 0): its
                                     figure and margin are NaN or from another
                                     direction, and mean nothing alone */
    signed char dir;              /* br_dir_index where it binds */
    signed char aux;              /* the binding part is rail `stage`'s regulator or clamp */
    short stage;                  /* binding rail or link, -1 when none */
    double figure, limit, margin; /* in the criterion's unit */
} br_pt_row;

/* One judged point. */
typedef struct br_pt {
    int status;       /* br_status of judging it; the rows mean nothing unless BR_OK (a
                         point that could not be judged is undetermined) */
    int with_startup; /* the cold start was simulated */
    int pass;         /* status BR_OK and every row that applies passes (none undetermined) */
    int outcome;      /* br_outcome: fail when a row fails on trustworthy figures,
                         undetermined when none fails but one is undetermined or the
                         point could not be judged, pass otherwise */
    int unsettled;    /* bit i: the steady state of direction i (0 or 1, the order
                         br_design_directions gives) was not settled, its drivers
                         running (a dropout is a failure, not this) */
    int fast;         /* steady states taken from the prediction (count of directions) */
    long periods;     /* periods simulated for the steady states */
    br_pt_row row[BR_CRIT_COUNT];
    /* The smallest headroom of a rail over what its driver needs (the
     * regulator's output plus dropout, or UVLO falling on a rail without
     * one), V, over every rail and direction.  Not a criterion: a
     * regulator hides how close its rail comes to dropping out, so the
     * UVLO and drive margins stay flat until it does; the headroom is
     * the smooth figure that searches follow to find that corner. */
    double headroom;

    /* its cold start's periods integrated and stepped over (with_startup) */
    long su_integrated, su_stepped;
} br_pt;

typedef struct br_spread_opts {
    int threads;         /* worker threads; 0: one per online processor */
    int startup;         /* the nominal and one-at-a-time points include the cold start */
    double accept;       /* V: distance to the steady state accepted; 0: 100 uV */
    int similar;         /* br_spread_derive: a new part's parameter borrows the sensitivity of
                            the same attribute of a part of the same kind in the base design */
    int stop_failed;     /* a nominal point that fails ends the preparation there */
    br_meter *meter;     /* counts every point judged, and may stop the run (NULL: none;
                            not owned); br_spread_create expects its own points there */
    double meter_weight; /* what each point counts for on the meter (default 1; 0: the
                            meter only stops the run) */
    int solver_limit;    /* > 0: every steady-state solve of a point takes at most this
                            many quasi-Newton steps per round, Newton iterations and plain
                            periods; what it cannot settle within them is undetermined
                            (0: the solvers' own bounds) */
    int thermal_loop;    /* 1: no predicted junction temperatures: every point's steady state
                            at the ambient, then the full loop of shooting passes (slower;
                            what the prediction is checked against) */
    int warm;            /* br_spread_derive: the nominal point's steady state starts from the
                            base's nominal one, and its junction temperatures from the base's
                            when that state settled (0: from the solver's own estimate and
                            the ambient) */
    const double (*warm_x)[BR_SPREAD_NX];     /* br_spread_derive with warm: the steady state of
                                                 each direction to start from instead of the
                                                 base's (a closer neighbour's; NULL: the base's) */
    const double (*warm_tj)[BR_MAX_SWITCHES]; /* and its junction temperatures (NULL: the
                                                 ambient) */
    int lazy_startup;   /* a point judged with its cold start simulates it last, and only
                           when its steady state leaves it in the running: no steady-state
                           row fails and every decided margin in volts is at least
                           lazy_target; otherwise the point is judged without it
                           (br_pt.with_startup 0), as it cannot pass at that target
                           whatever the cold start gives (the sizing's searches) */
    double lazy_target; /* V */
} br_spread_opts;

typedef struct br_spread {
    const br_design *d; /* the design (not owned; must outlive the spread) */
    br_tol_list tl;     /* its toleranced parameters */
    int threads;        /* worker threads used */
    int startup;        /* as in the options */
    int stop_failed;    /* as in the options */
    int stopped;        /* the nominal point failed: no one-at-a-time points were judged */
    int predict;        /* the nominal point settled every direction, so points start
                           from predictions around it (else from the solver's estimate) */
    int solver_limit;   /* as in the options */
    int thermal_loop;   /* as in the options */
    int lazy_startup;   /* as in the options */
    double lazy_target; /* V: as in the options */
    double accept;      /* V: as in the options */
    int ndir;           /* current directions analysed (1 or 2) */
    br_pt nominal;      /* every parameter at its nominal value */
    br_pt *oat;         /* 2 tl.n points: [2j] parameter j at its minimum, [2j+1] at its maximum */
    signed char *borrowed; /* 2 tl.n: 1 where oat[] was taken from the base design (derive) */
    br_pt base_nominal;    /* derive: the base design's nominal point, what borrowed points
                              compare with (the nominal point itself otherwise) */
    double xnom[2][BR_SPREAD_NX]; /* nominal steady state of each direction */
    double *dx; /* [(2j+e) * 2 + i]: steady-state change of direction i at oat[2j+e] */
    double tjnom[2][BR_MAX_SWITCHES]; /* nominal junction temperature of each link, K */
    double *dtj; /* [((2j+e) * 2 + i) * BR_MAX_SWITCHES + k]: its change at oat[2j+e] */
    int m[2];    /* chord unknowns of direction i (0: no chord steps) */
    int idx[2][BR_SPREAD_NX]; /* their places in the state vector */
    double *hinv[2];          /* m x m inverse of (J - I) at the nominal point, row-major */
    long periods;             /* periods simulated for steady states so far */
    long points;              /* points judged so far */
    long fast;                /* steady states taken from the prediction so far */
    br_meter *meter;          /* as in the options (not owned) */
    double meter_weight;      /* as in the options */
} br_spread;

void br_spread_opts_default(br_spread_opts *o);

/* Judge the nominal point and every parameter alone at each of its limits
 * (growing the meter's total by those 1 + 2 tl.n points).  d must outlive
 * the spread.  A point that cannot be judged or settled, the nominal one
 * included, is recorded as such (its status, its outcome) and contributes
 * no sensitivity; only running out of memory is an error.  BR_ECANCEL
 * when the meter stops the run. */
int br_spread_create(const br_design *d, const br_spread_opts *o, br_spread **out, br_error *err);

/* The same for a design that differs from base only in some parts (the
 * same topology and stages): one-at-a-time points of parameters base has
 * too (same place in the design, same limits) are taken from base instead
 * of being judged again (marked in borrowed[]: they give sensitivities,
 * but they are points of the base design, not of d).  With o->similar,
 * so do those of a new part whose kind and attribute base has toleranced
 * (a catalog capacitor's c takes the sign of the design capacitor's c):
 * what the limits do to each margin, not the states they lead to. */
int br_spread_derive(const br_spread *base, const br_design *d, const br_spread_opts *o,
                     br_spread **out, br_error *err);

void br_spread_free(br_spread *s);

/* Judge npts points: values holds npts rows of tl.n values.  out[i] gets
 * point i (a point that cannot be judged has its status set; that is not
 * an error of the call).  Returns BR_ENOMEM when workers cannot start,
 * BR_ECANCEL when the meter stopped the run (out[] is then incomplete).
 * The caller grows the meter's total by npts if it wants them counted in
 * the estimate; every judged point adds meter_weight to its count. */
int br_spread_eval(br_spread *s, int npts, const double *values, int with_startup, br_pt *out,
                   br_error *err);

/* Values of a point given by levels (-1 minimum, 0 nominal, +1 maximum)
 * into v (tl.n values). */
void br_spread_levels(const br_spread *s, const signed char *level, double *v);

/* Online processors (at least 1). */
int br_cpu_count(void);

#endif

/* steady.h - the periodic steady state of a running chain.
 *
 * Shooting: x* solves P(x) = x, P the one-period map of the rail voltages
 * (and diode stored charges) taken at a quiet instant of the period.
 * Newton's method with a finite-difference Jacobian, then Broyden updates;
 * falls back to plain simulation when Newton fails; every answer is
 * cross-checked by simulating further periods from it. */
#ifndef BR_ANALYSES_STEADY_H
#define BR_ANALYSES_STEADY_H

#include "core/progress.h"
#include "engine/sim.h"

typedef enum br_steady_method {
    BR_STEADY_SHOOTING = 0, /* Newton on the period map converged */
    BR_STEADY_PLAIN = 1     /* plain simulation until the rails stopped moving */
} br_steady_method;

typedef struct br_steady {
    int dir;         /* br_dir_index analysed */
    int method;      /* br_steady_method */
    int converged;   /* 1 when the residual met the tolerance */
    int holds;       /* 1 when no driver dropped out over the period */
    int iterations;  /* Newton/Broyden iterations */
    long periods;    /* periods simulated in all */
    double residual; /* max |P(x) - x| over the rails, V */
    int resid_rail;  /* when not converged: the rail that still moved
                        most in the last plain period */
    double drift;    /* max rail change over the cross-check periods, V */
    double phase;    /* where in the period x is taken, s */
    int failed;      /* the simulation itself failed (why says how:
                        the integrator, the work limit): converged is
                        0 and the figures decide nothing */
    int collapsed;   /* the flying capacitors' ripple at the load current
                        takes a cell's blocking voltage to zero or below:
                        the leg cannot work here (a failure of the design,
                        not of the solver); nothing is simulated, why says
                        where */
    char why[320];
    double x[2 * BR_MAX_SWITCHES]; /* [k] rail k capacitor, [n + k] stored charge */
    br_stats stats;                /* over one period from x (a line cycle: over
                                      the whole line period) */
    /* Junction temperatures, when some link diode has a thermal
     * resistance (analyses/thermal.h): the steady state is solved again
     * with every diode at the temperature its losses give, until they
     * move by less than BR_THERMAL_TOL. */
    int thermal;                       /* temperature passes run (0: junctions at the ambient) */
    int thermal_settled;               /* the last pass moved them by less than BR_THERMAL_TOL */
    double tj[BR_MAX_SWITCHES];        /* link k's junction temperature, K */
    double tj_run[BR_MAX_SWITCHES];    /* link k's junction temperature in the period
                                          the figures come from, K (the pass before
                                          the last move of the temperatures) */
    int runaway[BR_MAX_SWITCHES];      /* link k has no temperature where it holds */
    double onset_tj[BR_MAX_SWITCHES];  /* link k: junction temperature where it would run
                                          away, K (HUGE_VAL: never) */
    double onset_amb[BR_MAX_SWITCHES]; /* link k: ambient at which it would, K (HUGE_VAL) */
    /* On a line cycle (dir BR_DIRI_LINE): the window of the line period
     * (0 .. K-1, the switching period simulated from `phase` into period m
     * to `phase` into period m+1) in which each extreme of the line cycle
     * occurs, for each rail k: the lowest and the highest driver supply,
     * the capacitor's peak; for each link k: the peak reverse voltage.
     * -1 elsewhere. */
    long at_dmin[BR_MAX_SWITCHES], at_dmax[BR_MAX_SWITCHES];
    long at_vcap[BR_MAX_SWITCHES], at_vrev[BR_MAX_SWITCHES];
} br_steady;

/* Passes of the junction-temperature loop, and how little they must move
 * the temperatures at the end. */
#define BR_THERMAL_PASSES 10
#define BR_THERMAL_TOL 0.05 /* K */

/* One step of the loop: every link's junction temperature from the
 * losses of the period ss->stats, simulated with the diodes of hot at
 * their temperatures (the losses other than leakage held, the leakage
 * following its law through the period's mean reverse voltage), kept in
 * ss (tj, runaway, onsets); the diodes of hot are resolved at them.
 * *moved: the largest change of a temperature, K. */
int br_steady_temperatures(br_chain *hot, br_steady *ss, double *moved, br_error *err);

/* 1 when ss simulated a period whose figures can be read: its
 * simulation did not fail and the leg's cells did not collapse. */
static inline int br_steady_has_period(const br_steady *ss)
{
    return !ss->failed && !ss->collapsed;
}

/* The rail envelope over a line cycle: each rail's extremes per switching
 * period, for plots and the CSV.  Row r covers windows m0(r) .. m0(r+1)-1
 * of the line period (one window each while K <= BR_ENV_ROWS). */
#define BR_ENV_ROWS 4096
typedef struct br_line_env {
    long K;              /* windows in the line period */
    int rows, n;         /* rows kept, rails */
    double phase;        /* where in the switching period the windows start, s */
    double *vmin, *vmax; /* [r * n + k] rail k's extremes in row r, V */
    double *dmin, *dmax; /* the same of its driver supply, V */
    double *vrev;        /* link k's peak reverse voltage in row r (k >= 1), V */
    double *q;           /* the charge link k passed in row r (k >= 1), C */
} br_line_env;

typedef struct br_steady_opts {
    double tol;          /* residual target, V (default 1e-5) */
    int max_iter;        /* Newton iterations (default 12) */
    long max_plain;      /* periods of the plain fallback (default 400) */
    int check_periods;   /* cross-check periods after the reported one (default 1) */
    const double *guess; /* initial x, or NULL for a cold-start estimate */
    const double *tj;    /* junction temperature of each link (K, by stage; links with a
                            thermal resistance) the temperature loop starts from, or NULL
                            for the ambient (a neighbouring point's: fewer passes) */
    /* Warm start of the Newton matrix between neighbouring operating
     * points (scans, maps): a caller-owned buffer of
     * (2 BR_MAX_SWITCHES)^2 doubles, or NULL.  When *jac_valid is set the
     * solver starts from it instead of a finite-difference Jacobian; on
     * return it holds the latest matrix and *jac_valid is set. */
    double *jac;
    int *jac_valid;
    /* On a line cycle: >= 0 repeats switching period line_hold for ever
     * (every carrier at its duty, the current at its value): the
     * quasi-static state there, one switching period long; -1 (default):
     * the periodic state over the whole line period. */
    long line_hold;
    br_line_env *envelope;       /* line cycle: filled with the envelope (NULL: none) */
    const br_progress *progress; /* its stop poll ends the solve with BR_ECANCEL; on a line
                                    cycle also the switching periods simulated against an
                                    estimate (NULL: none) */
} br_steady_opts;

void br_steady_opts_default(br_steady_opts *o);

/* Solve the periodic steady state of c for current direction dir (with
 * the junction temperatures when some link diode has a thermal
 * resistance; without, every junction at the ambient).  A
 * failure of the simulation (step size underflow, the work limit of
 * engine/sim.h) is not an error here: it is recorded in out->failed and
 * out->why, out->converged is 0, and BR_OK is returned, so that the
 * verdict calls the steady state undetermined.  BR_ECANCEL when the stop
 * poll of o->progress asks to stop. */
int br_steady_solve(const br_chain *c, int dir, const br_steady_opts *o, br_steady *out,
                    br_error *err);

/* Simulate again, for the samples of a plot or a file, the period the
 * figures of ss (solved for c, not on a line cycle) come from: from ss->x
 * at its quiet phase, every link diode at the temperature that period was
 * simulated at; the observer `first` sees that period (its extremes are
 * the figures'), `then` (may be NULL) the `more` periods after it.  Time
 * 0 of the samples is ss->phase into the PWM period.  BR_ECANCEL when the
 * stop poll of progress (may be NULL) asks to stop. */
int br_steady_replay(const br_chain *c, const br_steady *ss, const br_sim_observer *first,
                     const br_sim_observer *then, int more, const br_progress *progress,
                     br_error *err);

/* A quiet instant of the period: as far as possible from every edge,
 * gate pulse and ramp. */
double br_steady_quiet_phase(const br_chain *c, const br_timing *tm);

/* A start close enough for Newton (see steady.c), into x (2 BR_MAX_SWITCHES). */
void br_steady_estimate(const br_chain *c, int dir, double *x);

/* The periodic steady state over a line cycle (linecycle.c): what
 * br_steady_solve does for dir BR_DIRI_LINE. */
int br_line_solve(const br_chain *c, const br_steady_opts *o, br_steady *out, br_error *err);

/* An envelope for K windows and n rails (rows: min(K, BR_ENV_ROWS));
 * NULL when out of memory. */
br_line_env *br_line_env_create(long K, int n);
void br_line_env_free(br_line_env *e);
/* The first window of row r. */
long br_line_env_first(const br_line_env *e, int r);

#endif

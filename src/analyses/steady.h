/* steady.h - the periodic steady state of a running chain.
 *
 * Shooting: x* solves P(x) = x, P the one-period map of the rail voltages
 * (and diode stored charges) taken at a quiet instant of the period.
 * Newton's method with a finite-difference Jacobian, then Broyden updates;
 * falls back to plain simulation when Newton fails; every answer is
 * cross-checked by simulating further periods from it. */
#ifndef BR_ANALYSES_STEADY_H
#define BR_ANALYSES_STEADY_H

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
    br_stats stats;                /* over one period from x */
    /* Junction temperatures, when some link diode has a thermal
     * resistance (analyses/thermal.h): the steady state is solved again
     * with every diode at the temperature its losses give, until they
     * move by less than BR_THERMAL_TOL. */
    int thermal;                       /* temperature passes run (0: junctions at the ambient) */
    int thermal_settled;               /* the last pass moved them by less than BR_THERMAL_TOL */
    double tj[BR_MAX_SWITCHES];        /* link k's junction temperature, K */
    int runaway[BR_MAX_SWITCHES];      /* link k has no temperature where it holds */
    double onset_tj[BR_MAX_SWITCHES];  /* link k: junction temperature where it would run
                                          away, K (HUGE_VAL: never) */
    double onset_amb[BR_MAX_SWITCHES]; /* link k: ambient at which it would, K (HUGE_VAL) */
} br_steady;

/* Passes of the junction-temperature loop, and how little they must move
 * the temperatures at the end. */
#define BR_THERMAL_PASSES 10
#define BR_THERMAL_TOL 0.05 /* K */

/* 1 when ss simulated a period whose figures can be read: its
 * simulation did not fail and the leg's cells did not collapse. */
static inline int br_steady_has_period(const br_steady *ss)
{
    return !ss->failed && !ss->collapsed;
}

typedef struct br_steady_opts {
    double tol;          /* residual target, V (default 1e-5) */
    int max_iter;        /* Newton iterations (default 12) */
    long max_plain;      /* periods of the plain fallback (default 400) */
    int check_periods;   /* cross-check periods after the reported one (default 1) */
    const double *guess; /* initial x, or NULL for a cold-start estimate */
    /* Warm start of the Newton matrix between neighbouring operating
     * points (scans, maps): a caller-owned buffer of
     * (2 BR_MAX_SWITCHES)^2 doubles, or NULL.  When *jac_valid is set the
     * solver starts from it instead of a finite-difference Jacobian; on
     * return it holds the latest matrix and *jac_valid is set. */
    double *jac;
    int *jac_valid;
    const br_progress *progress; /* its stop poll ends the solve with BR_ECANCEL
                                    (NULL: none) */
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

/* A quiet instant of the period: as far as possible from every edge,
 * gate pulse and ramp. */
double br_steady_quiet_phase(const br_chain *c, const br_timing *tm);

#endif

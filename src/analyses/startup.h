/* startup.h - cold start: when each driver starts, drops out and starts
 * for good, inrush peaks, and why a rung stalls. */
#ifndef BR_ANALYSES_STARTUP_H
#define BR_ANALYSES_STARTUP_H

#include "core/progress.h"
#include "engine/envelope.h"
#include "engine/sim.h"

#define BR_MAX_DROPOUT_TIMES 16

typedef struct br_startup_stage {
    double first_enable; /* first crossing of UVLO rising, s (-1: never) */
    double final_enable; /* the start that lasts, s (-1: not started at the end) */
    int ndropouts;       /* start-up dropouts (disable events) */
    double dropout_t[BR_MAX_DROPOUT_TIMES]; /* the first few of them, s */
    double ipeak;                           /* peak forward current of link k, A */
    double i2t;  /* integral of link k's forward current squared over the whole
                    simulated start-up, every pulse together, A^2 s */
    double vend; /* rail voltage (mean over the last period), V */
    double iend; /* link k mean current over the last period, A */
    int running; /* driver enabled at the end */
} br_startup_stage;

/* What the start-up draws from the supply: its current (through its
 * resistance, before the bypass capacitor) from power-up to the start-up
 * time (the whole simulation when the chain never starts). */
typedef struct br_supply_profile {
    double span;       /* the stretch these figures cover, s */
    double ipeak;      /* peak current, A (over the whole simulation) */
    double iavg;       /* charge / span, A */
    double charge;     /* C */
    double energy;     /* its open-circuit voltage times its current, J */
    double t_limit;    /* time in its current limit, s */
    int trips;         /* hiccups: the supply turned itself off */
    double first_trip; /* the first of them, s (-1: none) */
    int latched;       /* it has used up its retries and stays off */
} br_supply_profile;

typedef struct br_startup {
    int n;              /* stages */
    int dir;            /* br_dir_index the start-up ran in: BR_DIRI_NONE at no
                           load; a design that starts under load runs every
                           direction it carries and keeps the worse */
    int complete;       /* every driver running for good */
    double t_total;     /* start-up time: the last final start, s */
    double t_simulated; /* s */
    double pwm_start;   /* end of the pre-charge steps, s */
    int first_stalled;  /* lowest stage never running at the end, -1 */
    int failed;         /* the simulation stopped at t_simulated on a
                           numerical failure (why says what): the
                           figures are partial and decide nothing */
    char why[256];
    br_startup_stage st[BR_MAX_SWITCHES];
    br_supply_profile supply;

    /* how it was simulated: its br_su_method (the chain's), the periods
     * integrated (the last one's figures included) and those stepped over
     * along the rails' envelope */
    int method;
    long periods_integrated, periods_stepped;
    /* by envelope: its integrated periods by why (engine/envelope.h; the
     * last period, integrated for the figures, not among them) */
    long integrated_why[BR_ENV_WHY_COUNT];
} br_startup;

/* Optional time series of the cold start. */
typedef struct br_startup_opts {
    double t_max;                /* give up after this, s (default: the design's) */
    int settle_periods;          /* periods without a UVLO event that end it (default 50) */
    const br_sim_observer *obs;  /* extra observer for samples (may be NULL) */
    const br_progress *progress; /* simulated time of t_max, every
                                    BR_STARTUP_PROGRESS_EVERY periods, from the
                                    calling thread (NULL: none) */
} br_startup_opts;

/* Periods between calls of the progress hook: rare enough to cost nothing
 * next to simulating them, often enough to stop within a blink. */
#define BR_STARTUP_PROGRESS_EVERY 64

/* Simulate the cold start of c (at no load, unless c starts under load:
 * see br_startup.dir), by c->startup_method: every period integrated, or
 * (the default) by envelope following (engine/envelope.h), which
 * integrates the periods in which something discrete happens and steps
 * over the others.  The figures of a stepped-over period: no UVLO event
 * happens in it (the step is planned and checked so); the integrals (I2t,
 * link charge, the supply's charge and energy) grow by the increments of
 * the integrated periods on either side, weighted by how far the rails
 * have gone from one to the other; peaks and extremes are those of the
 * integrated periods (a step is never taken across a rail's turning
 * point, so they lie at its ends); the rail at the end and the last
 * period's figures come from an integrated period.  BR_ECANCEL when o->progress asks to stop
 * (out then holds nothing meaningful).  A numerical failure of the
 * integrator is not an error here: it is recorded in out->failed and
 * out->why (so that the verdict can call the start-up undetermined) and
 * BR_OK returned. */
int br_startup_run(const br_chain *c, const br_startup_opts *o, br_startup *out, br_error *err);

#endif

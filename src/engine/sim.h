/* sim.h - the cycle-by-cycle simulator of a chain.
 *
 * The period is cut at every switching event, ramp end, gate-pulse end,
 * UVLO crossing and the start of the load current.  Within one interval
 * every switch voltage is linear in time (the flying capacitors' ripple
 * included) and every load is constant, so:
 *  - when no link diode can conduct, every rail discharges linearly and
 *    the interval is taken in closed form (UVLO crossings solved exactly);
 *  - otherwise the rails and diode stored charges are integrated with an
 *    embedded Runge-Kutta pair, the link currents solved from the coupled
 *    diode/ESR equations at every evaluation.
 * UVLO crossings inside an interval are located by bisection on the step. */
#ifndef BR_ENGINE_SIM_H
#define BR_ENGINE_SIM_H

#include "model/chain.h"
#include "model/timing.h"

typedef enum br_integrator {
    BR_INTEG_FAST = 0,     /* closed form where possible, Dormand-Prince 5(4) */
    BR_INTEG_REFERENCE = 1 /* GSL rk8pd everywhere, tight tolerance */
} br_integrator;

typedef struct br_sim br_sim;

/* Per-rail and per-link figures accumulated while stats are on. */
typedef struct br_rail_stats {
    double vmin, vmax;         /* rail (capacitor + ESR) extremes, V */
    double vint;               /* integral of the rail voltage, V s */
    double vdrv_min, vdrv_max; /* driver supply (after LDO) extremes, V */
    double icap2;              /* integral of capacitor current squared, A^2 s */
    double qload;              /* charge drawn by the driver, LDO and clamp, C */
    double vc_max;             /* capacitor voltage peak, V */
} br_rail_stats;

typedef struct br_link_stats {
    double q;         /* charge through the link, integral of i, C */
    double i2;        /* integral of the forward current squared, A^2 s */
    double ipeak;     /* peak forward current, A */
    double vrev_peak; /* peak reverse voltage (simulated), V */
    double qrr;       /* recovery charge returned to the rail below, C */
    double irrm;      /* peak recovery current (triangle over the edge), A */
    double e_cond;    /* conduction energy, J */
    double e_rr;      /* recovery energy, J */
} br_link_stats;

typedef struct br_stats {
    double t0, t1; /* accumulation window, s */
    br_rail_stats rail[BR_MAX_SWITCHES];
    br_link_stats link[BR_MAX_SWITCHES]; /* [k] is link k, k >= 1 */
    double qsupply;                      /* charge delivered by the supply, C */
    double esupply;                      /* energy delivered by the supply, J */
} br_stats;

/* One UVLO transition, reported to an observer. */
typedef struct br_uvlo_event {
    double t;    /* s */
    int stage;   /* driver */
    int enabled; /* 1: started, 0: dropped out */
    double v;    /* driver supply at the crossing, V */
} br_uvlo_event;

typedef struct br_sim_observer {
    void *ctx;
    /* each UVLO transition */
    void (*uvlo)(void *ctx, const br_uvlo_event *e);
    /* samples of the rails (t, vrail[n], ilink[n]) at accepted steps;
     * s is the simulator at that instant, for br_sim_vdrv and
     * br_sim_switch_v (the driver supplies and the diodes' reverse
     * voltages), or NULL when the samples come from elsewhere */
    void (*sample)(void *ctx, const br_sim *s, double t, const double *vrail, const double *ilink,
                   int n);
} br_sim_observer;

/* Create a simulator for chain c (kept by pointer) analysing current
 * direction dir (a br_dir_index): with a direction the chain's load
 * current flows in it, once the load has started (br_sim_reset_cold,
 * br_sim_reset_running_at). */
int br_sim_create(const br_chain *c, int dir, int integrator, br_sim **out, br_error *err);
void br_sim_free(br_sim *s);

/* Cold start at t = 0: capacitors empty, drivers off, start-up pattern
 * (pre-charge steps, then PWM) armed, supply ramping; at no load, unless
 * the chain starts under load (load_from) and a direction is analysed:
 * then the load current flows from the first PWM period boundary at or
 * after load_from. */
void br_sim_reset_cold(br_sim *s);

/* Steady PWM running from time t = 0 (period start) with the given state:
 * x[k] rail capacitor voltages (k = 1..n-1; x[0] ignored), all drivers
 * whose rails are above UVLO falling enabled, no stored charge, the load
 * current flowing (with a direction).  A run of a loaded period whose
 * flying-capacitor ripple collapses the cells fails with BR_ENUMERIC. */
void br_sim_reset_running(br_sim *s, const double *vc);

/* Same, with sim time 0 at `phase` (s) into the PWM period and the full
 * state x: x[k] rail voltages, x[n + k] diode stored charges (k >= 1).
 * The instant must be quiet: no ramp or gate pulse in progress. */
void br_sim_reset_running_at(br_sim *s, const double *x, double phase);

/* Stop switching now: from here on the switches in `on` are held on
 * (if their drivers run) and all others off; nothing conducts in reverse.
 * For hold-up: how long the rails last once the converter pauses. */
void br_sim_freeze(br_sim *s, br_mask on);

/* Advance to absolute time t_end. */
int br_sim_run_until(br_sim *s, double t_end, br_error *err);

/* Time now, and capacitor voltages (n values, [0] is the supply rail). */
double br_sim_time(const br_sim *s);
void br_sim_vc(const br_sim *s, double *vc);
/* Full state: x[k] rail capacitor voltages, x[n + k] diode stored charges. */
void br_sim_state(const br_sim *s, double *x);
int br_sim_enabled(const br_sim *s, int k);

/* Start/stop accumulating statistics (start clears them). */
void br_sim_stats_start(br_sim *s);
const br_stats *br_sim_stats(br_sim *s);

void br_sim_set_observer(br_sim *s, const br_sim_observer *obs);

/* Integrate the sensitivity of the rail voltages to their values at the
 * last reset (variational equation) alongside the state: one simulated
 * period then gives the Jacobian of the period map.  Stored charges and
 * the DC-bias slope of the capacitors are left out of it. */
void br_sim_set_variational(br_sim *s, int on);
/* d vc_i(now) / d vc_j(reset), n x n row-major (rail 0 is the bypass
 * capacitor, or an identity row when there is none). */
void br_sim_sensitivity(const br_sim *s, double *phi);

/* Integration tolerances of the RK pair (defaults set by the integrator). */
void br_sim_set_tolerance(br_sim *s, double rtol, double atol_v);

/* Voltage across switch k at time t (within the interval in progress),
 * V: on, its on-state drop at the load current (+-I Rds(on)); conducting
 * the load current in reverse in a dead time, minus its reverse drop;
 * otherwise its blocking voltage with the flying capacitors' ripple;
 * ramps between.  For observers that plot diode stress. */
double br_sim_switch_v(const br_sim *s, int k, double t);

/* For a sample (t, vrail[n]) of simulator s: each rail's driver supply
 * vdrv[k] (after its regulator) and each link diode's reverse voltage
 * vrev[k], k >= 1 (across its return switch, less the difference of the
 * rails it joins, as the statistics take it).  With s NULL (samples from
 * elsewhere) the driver supplies are the rails and vrev is NaN. */
void br_sim_sample_stress(const br_sim *s, double t, const double *vrail, int n, double *vdrv,
                          double *vrev);

/* Driver supply of stage k for rail voltage vr (after its regulator), V. */
double br_sim_vdrv(const br_sim *s, int k, double vr);

/* On a line cycle (c->line.on): from the next reset on, repeat switching
 * period m of the line cycle for ever, every carrier at its duty and the
 * load current at its value (a quasi-static state); m < 0 runs the line
 * cycle again.  No effect on a chain without a line cycle. */
void br_sim_line_hold(br_sim *s, long m);

/* On a line cycle: the line period (0 .. K-1) of the switching period in
 * progress, or about to begin once its first event comes; -1 without. */
long br_sim_line_period(const br_sim *s);

/* The time PWM starts after the pre-charge steps, s. */
double br_sim_pwm_start(const br_sim *s);

/* Evaluations of the link equations so far (for benchmarks). */
unsigned long br_sim_evals(const br_sim *s);

#endif

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

#include "core/progress.h"
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
    /* energies, J: the rail's loads at the rail (driver, isolator, gate
     * charge, regulator: what the rail delivers to them), and at the
     * driver supply (after the regulator) the driver's running and
     * isolator current, its standby (UVLO) current and its gate charge;
     * the clamp's; the capacitor's ESR loss is esr * icap2 */
    double e_load, e_run, e_standby, e_gate, e_clamp;
} br_rail_stats;

typedef struct br_link_stats {
    double q;         /* charge through the link, integral of i, C */
    double i2;        /* integral of the forward current squared, A^2 s */
    double ipeak;     /* peak forward current, A */
    double vrev_peak; /* peak reverse voltage (simulated), V */
    double qrr;       /* recovery charge returned to the rail below, C */
    double irrm;      /* peak recovery current (triangle over the edge), A */
    double dpeak;     /* largest displacement current of the junction capacitance
                         (Cj dv/dt while the return switch's voltage ramps), either
                         sign, as a magnitude, A */
    double e_cond;    /* conduction energy, J */
    double e_rr;      /* recovery energy, J */
    double e_leak;    /* leakage energy (leakage current times reverse voltage), J */
    double e_other;   /* energy of the diode's current other than conduction
                         across it (junction capacitance and leakage), J */
    double e_res;     /* i^2 in the link resistor, J */
    double e_sw;      /* i^2 in the return switch's resistance, J */
    double e_stage;   /* the link current times its return switch's voltage,
                         J: what the power stage takes from the chain
                         (negative: what it gives, by leakage, recovery and
                         reverse conduction) */
} br_link_stats;

typedef struct br_stats {
    double t0, t1; /* accumulation window, s */
    br_rail_stats rail[BR_MAX_SWITCHES];
    br_link_stats link[BR_MAX_SWITCHES]; /* [k] is link k, k >= 1 */
    double qsupply;                      /* charge delivered by the supply, C */
    double esupply;                      /* energy delivered by the supply (its
                                            open-circuit voltage times its current), J */
    double e_rsupply;                    /* of which lost in its resistance, J */
    double isup_peak;                    /* peak supply current, A */
    double t_limit;                      /* time the supply spent in its current limit, s */
    double lim_stretch;                  /* the longest stretch of it, s */
    int sup_trips;                       /* hiccups (the supply turned itself off) */
    double e_stored;                     /* energy stored in the rail capacitors (and the
                                            bypass) at the end less at the start, J */
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
    /* samples of the rails (t, vrail[n], ilink[n]) at every point the
     * statistics are taken (accepted steps, the ends of intervals and the
     * instants where an edge moves charge), so that the extremes of the
     * samples are the statistics' extremes (ilink[0] is the supply's
     * current, through its resistance); s is the simulator at that
     * instant, for br_sim_sample_stress and br_sim_sample_links (the
     * driver supplies, the diodes' reverse voltages and the parts of the
     * link currents), or NULL when the samples come from elsewhere */
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

/* Which statistics are kept, from the next br_sim_stats_start on. */
typedef enum br_stats_set {
    BR_STATS_ALL = 0, /* every figure of br_stats (the default) */
    /* what a start-up reads over its course: each link's forward i^2 and
     * peak current, the supply's charge, energy, time in its limit and
     * peak current.  The other figures are not kept and read NaN: the
     * Runge-Kutta steps carry about a fifth of the entries on a 12-switch
     * chain, and no other extreme is tracked.  The rails, the steps and
     * the figures kept are those of every statistic kept, bit for bit. */
    BR_STATS_STARTUP = 1
} br_stats_set;
void br_sim_stats_select(br_sim *s, br_stats_set set);

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

/* The link currents of the sample s is at, split into their parts, A,
 * k >= 1: fwd[k] the forward (conduction) current through the junction,
 * of which the peak, RMS and conduction figures are taken (a sweep
 * through conduction at an edge, which moves its charge at once, shows
 * its peak at the edge's instant), and disp[k] the displacement current
 * of the junction capacitance (Cj dv/dt while the return switch's
 * voltage ramps); what is left of the link's current is its leakage.
 * With s NULL (samples from elsewhere) fwd is the link current given in
 * ilink and disp is NaN.  [0] is left alone. */
void br_sim_sample_links(const br_sim *s, const double *ilink, int n, double *fwd, double *disp);

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

/* The supply's current at the last evaluation, A, and whether it is at
 * its current limit now (*limited may be NULL). */
double br_sim_supply_current(const br_sim *s, int *limited);

/* Hiccups of the supply since the last reset, and the time of the first
 * (s, since the reset; -1 when none). */
int br_sim_supply_trips(const br_sim *s, double *first);

/* Evaluations of the link equations so far (for benchmarks). */
unsigned long br_sim_evals(const br_sim *s);

/* ---- bounded work ----------------------------------------------------------
 * Every simulator does bounded work, whatever the design.  A unit of work
 * is an interval begun, a Runge-Kutta step tried or a trial of the UVLO
 * locator: about half a microsecond on a 4-switch chain, two on a
 * 64-switch one.  Designs in their working range take 30 to 250 units a
 * period.  Over its whole life (every reset included) a simulator may
 * spend BR_SIM_WORK_PER_PERIOD units for each period it has simulated,
 * plus one period's worth, and never more than BR_SIM_WORK_MAX in all;
 * beyond either, br_sim_run_until stops with BR_ENUMERIC ("work limit
 * reached ..."), which the analyses report as undetermined.  So one
 * simulator runs for at most about 2 s (4 switches) to 12 s (64), and far
 * less where a single period runs away (steps of picoseconds in a
 * microsecond period stop after 20 000 of them).  Periods stepped over
 * along the envelope (br_sim_leap) are not simulated and allow nothing;
 * the envelope's own arithmetic counts through br_sim_charge. */
#define BR_SIM_WORK_PER_PERIOD 20000.0
#define BR_SIM_WORK_MAX 5000000UL
/* Units of work between two polls of the stop function. */
#define BR_SIM_POLL_EVERY 256UL

/* Poll p's stop function (core/progress.h) while running: once it asks to
 * stop, br_sim_run_until returns BR_ECANCEL within BR_SIM_POLL_EVERY units
 * of work.  p (NULL: none) must outlive the simulator's runs. */
void br_sim_set_stop(br_sim *s, const br_progress *p);

/* Units of work done so far, over the simulator's life. */
unsigned long br_sim_work(const br_sim *s);

/* ---- envelope following (sim_env.c) ----------------------------------------
 * What a driver that steps along the envelope of the rails needs: a
 * window that records what one stretch of simulation (normally one
 * period) saw, the one question of whether anything discrete is about to
 * change, a leap of whole periods, and copies of the whole state. */

/* Start a window at the present instant: rail extremes, UVLO transitions
 * and the quadratures from here on.  With the variational equation on
 * (br_sim_set_variational), the sensitivity starts again from the
 * identity, so the next period gives the Jacobian of the period map. */
void br_sim_window_begin(br_sim *s);

/* Whether the window was quiet: no UVLO transition, no change of the
 * start-up pattern (a pre-charge step's end, the supply ramp, the load
 * current's start) inside it or in progress (the supply still ramping),
 * the supply on throughout and wholly in its current limit or wholly out
 * of it, so that the period it spans could repeat. */
int br_sim_window_quiet(const br_sim *s);

/* What kept the window from being a period that could repeat: a driver
 * started or dropped out in it (BR_WIN_UVLO); the supply ramped, soft-
 * started, entered or left its current limit, turned off or on or was
 * off, or a loaded line cycle moved on (BR_WIN_SUPPLY); a pre-charge step ended or the load current
 * started (BR_WIN_SCHEDULE); nothing (BR_WIN_QUIET).  The first that applies. */
enum { BR_WIN_QUIET = 0, BR_WIN_UVLO, BR_WIN_SUPPLY, BR_WIN_SCHEDULE };
int br_sim_window_why(const br_sim *s);

/* Whether something discrete may change by absolute time t_end if every
 * rail (capacitor voltage) moves by dvc[k] from where it stood over the
 * window: a scheduled change (pre-charge step, supply ramp, load current)
 * at or before t_end, or a driver's supply coming within guard[k] of the
 * UVLO threshold it would toggle at, its extremes over the window moved
 * by dvc[k], or the supply coming within guard[0] of entering or leaving
 * its current limit, the bypass voltage's extremes moved by dvc[0].
 * 1: something may change (the caller integrates), 0: nothing discrete
 * lies ahead.  New kinds of discrete change answer here. */
int br_sim_discrete_ahead(const br_sim *s, const double *dvc, const double *guard, double t_end);

/* The most quadrature entries any chain has: what a caller's buffer for
 * br_sim_quad and br_sim_window_quad must hold (sim_env.c checks it
 * against the state layout at compile time). */
#define BR_SIM_QUAD_MAX (24 * BR_MAX_SWITCHES)

/* Number of quadratures (the integrals behind the statistics), and
 * their values now; and their increments since br_sim_window_begin. */
int br_sim_quad_count(const br_sim *s);
void br_sim_quad(const br_sim *s, double *q);
void br_sim_window_quad(const br_sim *s, double *dq);

/* Move on by m whole periods at once, to the same phase m periods later:
 * the rail capacitor voltages become vc[k] (k >= 1, and rail 0 where a
 * bypass capacitor makes it a state; NULL: unchanged), the quadratures
 * grow by dq (NULL: none), and the clock, the PWM schedule and every
 * edge, ramp and pulse in progress move by m T.  Only for a stretch with
 * nothing discrete in it (br_sim_discrete_ahead); returns BR_EUSAGE (and
 * changes nothing) where the leap would cross a scheduled change. */
int br_sim_leap(br_sim *s, long m, const double *vc, const double *dq);

/* A copy of s (the observer left out), and making dst a copy of src while
 * keeping dst's observer; the count of work goes with the state, so that
 * work done on a copy counts where the copy is taken back. */
int br_sim_clone(const br_sim *s, br_sim **out, br_error *err);
void br_sim_assign(br_sim *dst, const br_sim *src);

/* A saved state: what changes as a simulator runs (a tenth of it, or
 * less), to take it back to where it was.  br_sim_restore keeps the
 * observer and the work counted since (a trial thrown away still counts
 * against the work limit). */
typedef struct br_sim_snap br_sim_snap;
int br_sim_snap_create(const br_sim *s, br_sim_snap **out, br_error *err);
void br_sim_snap_free(br_sim_snap *p);
void br_sim_save(const br_sim *s, br_sim_snap *p);
void br_sim_restore(br_sim *s, const br_sim_snap *p);

/* The observer in force (br_sim_set_observer). */
br_sim_observer br_sim_observer_get(const br_sim *s);

/* dst takes over the work src has counted (src a copy of dst, run on its
 * own and thrown away): work done on a trial counts all the same. */
void br_sim_take_work(br_sim *dst, const br_sim *src);

/* Count units of work done on the simulator's behalf outside it (the
 * envelope's own arithmetic), polling the stop function as its own steps
 * do.  BR_OK, or the error of a simulator that is to stop (the work
 * limit: BR_ENUMERIC; a stop: BR_ECANCEL). */
int br_sim_charge(br_sim *s, unsigned long units, br_error *err);

/* How a UVLO crossing inside a step is located, to the same bracket
 * (1e-9 of the step): by bisection (0, the default) or by regula falsi
 * (1: every start-up, by either method), which in a Dormand-Prince step
 * starts on the step's dense output (a seventh of bisection's trial steps). */
void br_sim_set_locator(br_sim *s, int secant);

/* The longest lifetime of a link diode's stored charge, s (0: none). */
double br_sim_longest_lifetime(const br_sim *s);

/* Number of stages, and the PWM period, s. */
int br_sim_stages(const br_sim *s);
double br_sim_period(const br_sim *s);

#endif

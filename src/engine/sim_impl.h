/* sim_impl.h - the simulator's state, shared by its source files only. */
#ifndef BR_ENGINE_SIM_IMPL_H
#define BR_ENGINE_SIM_IMPL_H

#include "engine/diode.h"
#include "engine/sim.h"

#define BR_N BR_MAX_SWITCHES
/* A piece of a rail's DC-bias line: C = c0 + slope (v - at) for lo < v <=
 * hi (lo > hi: none yet). */
typedef struct br_capseg {
    double lo, hi, at, c0, slope;
} br_capseg;

/* A link whose forward voltage stays below -BR_VBLOCKED over an interval
 * carries only leakage and junction-capacitance current. */
#define BR_VBLOCKED 1.0

/* How a switch edge in an interval meets the link it returns. */
enum {
    BR_EDGE_NONE = 0, /* no edge, or the link conducts through it */
    BR_EDGE_START,    /* the edge cuts the link off at the interval start */
    BR_EDGE_END       /* the edge lets the link conduct at the interval end */
};

/* What a switch's voltage follows. */
typedef enum br_sw_mode {
    BR_SW_BLOCK = 0, /* off: its blocking voltage (with the ripple) */
    BR_SW_ON,        /* on: its on-state drop at the load current */
    BR_SW_REV        /* conducting the load current in reverse while off */
} br_sw_mode;

/* The Runge-Kutta pairs, chosen per interval (sim_step.c). */
typedef enum br_rk_pair {
    BR_PAIR_DP45 = 0, /* Dormand-Prince 5(4): the fast path's longer intervals */
    BR_PAIR_BS23,     /* Bogacki-Shampine 3(2): its short intervals */
    BR_PAIR_HE21,     /* Heun-Euler 2(1): its shortest (edges, gate pulses) */
    BR_PAIR_RK8       /* GSL rk8pd: the reference path */
} br_rk_pair;

/* Where a current-limited supply stands (sim_supply.c): the main
 * supply's or an injection's. */
typedef struct br_limstate {
    int off;       /* a hiccup turned it off */
    double until;  /* off: the time of the retry, s (HUGE_VAL: off for good) */
    double since;  /* in its limit continuously since, s (HUGE_VAL: not in it) */
    int trips;     /* hiccups so far */
    double trip_t; /* time of the first hiccup, s */
    int lim;       /* the workspace's current is at its limit */
} br_limstate;

#define BR_HMEM 512 /* intervals of one period remembered for their steps */

/* What the simulation saw since br_sim_window_begin (sim_env.c). */
typedef struct br_sim_win {
    int on;                        /* a window is open: extremes are tracked */
    double t0;                     /* its start, s */
    double vmin[BR_N], vmax[BR_N]; /* rail node extremes, V */
    int toggles;                   /* UVLO transitions */
    int pre_idx, loaded;           /* pre-charge step and load state at the start */
    int lim;                       /* the supply seen in its current limit (1), out of
                                      it (2), both (3), at the track points */
    int trips, off;                /* the supply's hiccups and its off state at the start */
    int ilim;                      /* some current-limited injection seen in its limit
                                      (1), none (2), both (3), at the track points */
    int itrips, ioff;              /* the injections' hiccups and off states at the start */
} br_sim_win;

/* Layout of the integrated vector, stage by stage so that only n * NF
 * entries are in use: rail capacitor voltage and diode stored charge
 * (controlled by the step-size error), then quadratures integrated
 * alongside.  Link 0 does not exist: its slots hold the supply's. */
enum {
    F_VC = 0, /* capacitor voltage of rail k, V */
    F_Q,      /* stored charge of link k, C */
    F_LQ,     /* link forward charge, C */
    F_LI2,    /* link integral of i^2, A^2 s */
    F_LE,     /* link conduction energy, J */
    F_RV,     /* rail voltage integral, V s */
    F_RI2,    /* capacitor current squared integral, A^2 s */
    F_RQL,    /* load charge (driver, LDO, clamp), C */
    /* the energy budget: every watt the chain takes in or gives off */
    F_LX, /* link: its current other than conduction (junction capacitance,
             leakage) times the voltage across the diode, J */
    F_LL, /* link: leakage current times reverse voltage, J */
    F_LR, /* link: i^2 through its resistor, J */
    F_LS, /* link: i^2 through its return switch's resistance, J */
    F_LD, /* link: its current times its return switch's voltage, J (what
             the power stage takes; negative: what it gives) */
    F_RP, /* rail: its loads' current times the rail voltage, J */
    F_RD, /* rail: driver running and isolator current times the driver
             supply, J */
    F_RS, /* rail: driver standby (UVLO) current times the driver supply, J */
    F_RG, /* rail: gate-charge current times the driver supply, J */
    F_RZ, /* rail: clamp current times the rail voltage, J */
    NF
};
#define XI(k, f) ((k)*NF + (f))
#define X_SQ XI(0, F_LQ)  /* supply charge, C */
#define X_SE XI(0, F_LI2) /* supply energy (its open-circuit voltage times its current), J */
#define X_SR XI(0, F_LE)  /* supply resistance loss, J */
#define X_SL XI(0, F_LR)  /* time the supply spends in its current limit, s */
/* Optionally followed, from s->phi0 on, by the n x n sensitivity matrix
 * Phi = d vc(t) / d vc(t0) (row-major), integrated with the variational
 * equation dPhi/dt = A Phi, A the Jacobian of the rail equations. */
#define X_SIZE (BR_N * NF + BR_N * BR_N)

/* What stays constant (or linear in time) over one interval. */
typedef struct br_seg {
    double t0;            /* interval start, s */
    double vs0, vs_slope; /* supply voltage Vs(t) = vs0 + slope (t - t0) */
    double iload[BR_N];   /* driver + LDO + gate-pulse current of rail k, A */
    double igate[BR_N];   /* of which gate pulse, A */
    double irun[BR_N];    /* of which running and isolator current, A */
    double istb[BR_N];    /* of which standby (UVLO) current, A */
    double ileak[BR_N];   /* a blocked link k's leakage (in iblk), A */
    int active[BR_N];     /* link k solved from the diode equation */
    int nactive;
    int act[BR_N];                 /* the active links in ascending order (nactive) */
    double iblk[BR_N];             /* constant current of a blocked link k, A */
    double d0[BR_N], dslope[BR_N]; /* voltage across the return switch of link k */
    double rpath[BR_N];            /* rs excluded: link resistor + return switch Rds(on) */
    int zener;                     /* some rail has a clamp that may conduct */
    int edge[BR_N];                /* BR_EDGE_* of link k (then taken as blocked) */
} br_seg;

struct br_sim {
    const br_chain *c;
    int n;            /* stages */
    int bypass;       /* rail 0 has a bypass capacitor (br_sim_bypass) */
    int zeners;       /* some rail has a Zener clamp: without, no rail is ever
                         clamped or pinned, and the link solve skips them */
    int nx;           /* entries of x in use: n * NF (+ n * n) */
    int var;          /* the sensitivity matrix is integrated */
    int nlive;        /* entries the Runge-Kutta steps advance: */
    int live[X_SIZE]; /* states, quadratures only while statistics
                         are kept, the sensitivity when asked */
    int phi0;         /* where it starts in x: n * NF */
    int dir;          /* br_dir_index: the direction analysed; on a line cycle
                         the direction of the period in progress */
    int dir0;         /* the direction asked for at creation (on a line
                         cycle BR_DIRI_LINE, or BR_DIRI_NONE at no load) */
    /* an AC line cycle (sim_line.c): s->tm is the timing of line period
     * ac_m; ac_i is the signed current of the period in progress (> 0
     * out of the switch node), ac_next that of the period tm describes
     * once it begins; ac_hold >= 0 repeats that period at its own duty */
    int ac;
    long ac_m, ac_hold;
    double ac_i, ac_next;
    int integ; /* br_integrator */
    br_timing tm;
    double rtol, atol_v, atol_q;
    /* time and state */
    double t;
    double x[X_SIZE];
    int en[BR_N];             /* driver enabled (out of UVLO) */
    int held[BR_N];           /* held off after chattering, until the next edge */
    br_mask cmd, rev;         /* commanded on; reverse conducting */
    br_mask driven;           /* commanded on with the driver running */
    br_mask enm;              /* drivers enabled (en as a mask) */
    br_mask on_prev, rv_prev; /* switches on, and conducting the load
                                 current in reverse, at the last update */
    br_mask redo;             /* switches whose target must be found again
                                 at the next update whatever their state */
    double tramp_end;         /* supply still ramping before this time, s */
    /* the supply's current limit and its soft-start (sim_supply.c) */
    double soft_t0;        /* the present soft-start began here, s (-HUGE_VAL: none) */
    br_limstate sup;       /* the supply's limit */
    double isup;           /* the supply current at the last evaluation, A */
    br_limstate inj[BR_N]; /* the limit of the injection into rail k */
    br_mask injlimm;       /* bit k: the injection into rail k has a current limit */
    int inj_run;           /* every injection on whatever the time (a running reset) */
    br_mask injm;          /* bit k: an injection feeds rail k (from the chain) */
    int trips0;            /* statistics: hiccups when they started */
    double lim_t0;         /* statistics: the stretch in the limit began here, s
                              (HUGE_VAL: not in it) */
    int toggles;           /* UVLO toggles at the current instant */
    int frozen;            /* switching stopped (br_sim_freeze) */
    /* the load current: it flows once loaded, from load_at (absolute, s;
     * HUGE_VAL: never), at magnitude iamp in the period in progress (A, 0
     * unless loaded), entering the switch node when isgn > 0 (step-up) */
    int loaded;
    double load_at, iamp, isgn;
    double von[BR_N]; /* switch k's voltage while on at iamp, V */
    double vrv[BR_N]; /* and while conducting it in reverse off, V */
    double cell_low;  /* lowest blocking voltage the ripple leaves a switch
                         at the load current in force, V (HUGE_VAL: none) */
    int cell_stage;   /* the switch it is at */
    /* flying-capacitor ripple per ampere (br_timing): fly[k] at fly_t,
     * moving at flysl[k] until the next switching event */
    double fly[BR_MAX_FLY + 1], flysl[BR_MAX_FLY + 1], fly_t;
    /* voltage across each switch: a linear ramp (sv0 at st0, slope
     * sslope, until send) toward its target line (tv at tt0, slope tsl),
     * the voltage of its mode smode (br_sw_mode) */
    double sv0[BR_N], st0[BR_N], sslope[BR_N], send[BR_N];
    double tv[BR_N], tt0[BR_N], tsl[BR_N];
    int smode[BR_N];
    double pulse_end[BR_N], pulse_i[BR_N];
    /* schedule */
    double pwm_t0;                    /* PWM clock origin: events at pwm_t0 + m T + ev.t */
    long per;                         /* period number m of the next timing event */
    int ev_idx;                       /* index of the next timing event */
    double pre_end[BR_MAX_PRECHARGE]; /* absolute end of each pre-charge step */
    int npre, pre_idx;
    /* workspace of the link solve */
    br_seg seg;
    double il[BR_N];           /* link currents at the last evaluation, A */
    double icj[BR_N];          /* of which junction-capacitance current, A */
    double sweep_i[BR_N];      /* peak forward current of an edge's sweep through
                                  conduction moved at the present instant, A (0:
                                  none): the next track point shows it */
    double tr_fwd[BR_N];       /* each link's forward current at the last track
                                  point (the sweep's peak included), A */
    double tr_disp[BR_N];      /* and its junction capacitance's displacement
                                  current there, A */
    double vr[BR_N];           /* rail node voltages at the last evaluation, V */
    double ic[BR_N];           /* capacitor currents at the last evaluation, A */
    double iz[BR_N];           /* clamp currents, A */
    int pin[BR_N];             /* rail k held at the knee of its ideal clamp (rz = 0) */
    double esr_now[BR_N];      /* esr[k], or 0 while pin[k]: the node is the capacitor */
    double gd[BR_N];           /* diode conductance at the last solve, S */
    double esr[BR_N];          /* rail k's series resistance (rail 0: the
                                  supply's, unless a bypass capacitor) */
    br_diode_warm dw[BR_N];    /* Lambert W warm starts, one per link */
    double ul[BR_N], gl[BR_N]; /* link drive voltage and its conductance at
                                  the last solve (the Newton predictor) */
    unsigned long evals;
    unsigned long nsteps, nrejects, nintervals, nclosed; /* counters for benchmarks */
    /* bounded work (sim.h) */
    const br_progress *stop; /* polled for a stop request (NULL: none) */
    unsigned long work;      /* units of work over the simulator's life */
    unsigned long polled;    /* work at the last poll */
    double past;             /* simulated time before the last reset, s */
    int halt;                /* BR_ENUMERIC (work limit) or BR_ECANCEL: sticky */
    double halt_t;           /* simulated time when it halted, s (since the reset then) */
    double halt_periods;     /* periods simulated in all by then */
    double k1[X_SIZE];       /* derivative at (t, x) for the seg in force */
    double rk[6][X_SIZE];    /* stages of the Runge-Kutta step */
    int k1_valid;            /* k1 matches the present state */
    double hlast;            /* last accepted RK step, s (0: none yet) */
    int pair;                /* br_rk_pair of the interval in progress */
    /* First step of each interval of the last period, by its place in the
     * period: the next period starts each interval with it (0: none) */
    double hmem[BR_HMEM];
    int iv;                 /* intervals begun in the present period */
    int stored;             /* some link stores charge (tau > 0) */
    br_capseg capseg[BR_N]; /* rail k's DC-bias piece last used */
    void *gsl_step;         /* rk8pd stepper of the reference path */
    /* results */
    int stats_on;
    int stats_set; /* br_stats_set: what they keep */
    br_stats st;
    double quad0[X_SIZE]; /* quadratures when stats started */
    br_sim_observer obs;
    int secant_locate;      /* UVLO crossings by regula falsi (br_sim_set_locator) */
    br_sim_win win;         /* the envelope driver's window */
    double winq[BR_N * NF]; /* quadratures at the window's start */
};

/* ---- the supply (sim_supply.c) ---------------------------------------------
 * Rail 0 is the supply: an open-circuit voltage Vs(t) behind Rs, ramped at
 * power-up (ramp) and at every start by its soft-start; with a current
 * limit (which needs the bypass capacitor, so that rail 0 is a state) the
 * current through Rs is min((Vs - v0)/Rs, Ilim(v0)); a hiccup supply that
 * stays in its limit for hiccup-delay turns off (no current) for
 * hiccup-off and starts again with its soft-start. */

/* The supply's state at a cold start (cold) or in steady running (0). */
void br_sim_supply_reset(br_sim *s, int cold);
/* Open-circuit voltage at t, V (0 while a hiccup holds it off). */
double br_sim_supply_v(const br_sim *s, double t);
/* The next instant after s->t at which the supply's law changes (a ramp
 * ends, a hiccup timer expires, a retry), or HUGE_VAL. */
double br_sim_supply_next(const br_sim *s);
/* The hiccup timer at s->t, from the limit state of the last evaluation:
 * may turn the supply off or on.  Returns 1 when it changed. */
int br_sim_supply_step(br_sim *s);
/* The current limit at output voltage v0, A (HUGE_VAL: none). */
double br_sim_supply_limit(const br_sim *s, double v0);
/* Current through Rs into the bypass capacitor at x0 from open-circuit
 * voltage vs; sets s->sup.lim; *didx (may be NULL) its derivative in x0. */
double br_sim_supply_bypass_i(br_sim *s, double vs, double x0, double *didx);
/* 1 when the interval from s->t, with supply current ia now and heading
 * for i0 at vinf, may meet the limit (or the supply is off): the closed
 * form does not hold, the interval is integrated. */
int br_sim_supply_needs_rk(const br_sim *s, double ia, double i0, double vinf);
/* Each switch's voltage on and in reverse at the load current in force;
 * every switch looks for its target again at the next update. */
void br_sim_load_drops(br_sim *s);

/* The line cycle (sim_line.c).  After a reset: period 0 (or the held
 * one) built and in force.  When the period counter moves on: the next
 * period's timing built.  At a period's first event (its start): its
 * current, direction and masks take over. */
void br_sim_line_reset(br_sim *s);
void br_sim_line_build(br_sim *s, long per);
void br_sim_line_enter(br_sim *s);

/* Fill s->esr from the chain. */
void br_sim_cache_esr(br_sim *s);

/* Rebuild the list of live entries after stats or sensitivity change. */
void br_sim_live_rebuild(br_sim *s);

/* Is entry f (a quadrature, f > F_Q) of stage k kept by the statistics
 * selected (br_stats_set)?  A start-up's: each link's forward i^2 and
 * the supply's charge, energy and time in its limit. */
static inline int br_sim_quad_kept(const br_sim *s, int k, int f)
{
    if (s->stats_set != BR_STATS_STARTUP)
        return 1;
    return k == 0 ? f == F_LQ || f == F_LI2 || f == F_LR : f == F_LI2;
}

/* Continuous equations of the interval seg at time t: fills dx (X_SIZE)
 * and the workspace il/vr/ic.  Shared by both integrators. */
void br_sim_rhs(br_sim *s, double t, const double *x, double *dx);

/* Driver supply of stage k for a rail voltage vr (after an LDO). */
double br_sim_vdrv(const br_sim *s, int k, double vr);

/* The same, inlined for the UVLO checks of every step. */
static inline double br_sim_vdrv_at(const br_sim *s, int k, double vr)
{
    const br_aux *a = &s->c->st[k].aux;
    if (a->kind == BR_AUX_LDO) {
        double v = vr - a->dropout;
        v = v < a->vout ? v : a->vout;
        return v > 0 ? v : 0;
    }
    return vr;
}

/* An ideal clamp (rz = 0) is a hard limit: a capacitor that a step or an
 * instantaneous charge took past the knee gives the excess to the clamp
 * and sits at the knee (a projection onto the limit, so the rail lands on
 * it exactly, period after period). */
void br_sim_clamp_limit(br_sim *s);

/* Rail k capacitance at its voltage. */
double br_sim_cap(const br_sim *s, int k, double v);

/* Integrate the current interval from s->t to tb with the RK pair, stopping
 * early at a UVLO crossing.  Returns the time reached; *status is 1 at a
 * UVLO crossing, -1 when the step size underflowed, -2 when the work
 * limit or a stop halted it (s->halt), else 0. */
double br_sim_integrate(br_sim *s, double tb, int *status);

void *br_sim_gsl_alloc(int nx);
void br_sim_gsl_free(void *p);

/* Record rail/link extremes at the current workspace (accepted points). */
void br_sim_track_extremes(br_sim *s, double t);

/* 1 when rail 0 has a bypass capacitor behind the supply resistance (then
 * its voltage is a state), 0 when it is the supply behind its resistance.
 * Fixed by the chain (br_sim_create): asked in every evaluation. */
static inline int br_sim_bypass(const br_sim *s)
{
    return s->bypass;
}

/* Does the edge in [ta, tb] sweeping link k's drive from fa to fb (V)
 * cross its conduction so fast, and the rails stay so still, that it is
 * taken in closed form?  Returns a BR_EDGE_* kind, and for an edge sets
 * *iblk to the link's current over the interval as blocked (leakage and
 * junction-capacitance charge) and *leak to the leakage in it. */
int br_sim_edge_kind(const br_sim *s, int k, double ta, double tb, double fa, double fb,
                     double *iblk, double *leak);

/* The charge links pass in the instant their edges sweep them through
 * conduction, moved between the rails at the interval's start (links cut
 * off) or end (links let on).  Return 1 when some charge moved. */
int br_sim_edge_start(br_sim *s);
int br_sim_edge_end(br_sim *s, double tb);

/* ---- injections (chain.h: an isolated supply feeding rail k in place of
 * link k).  The engine takes such a link as a link whose lower node is the
 * supply's return, 0 V in its own terms, and whose "return switch" stands
 * at minus the supply's voltage all the time: its drive is Vinj - vr_k,
 * through its diode and resistance, and rail k-1 neither feeds it nor
 * couples to it.  Its energy (the current times the switch voltage, F_LD)
 * is then minus what the isolated supply gives. */

/* 1 when rail k (1 <= k) is fed by an injection, 0 otherwise (also k >= n). */
static inline int br_sim_inj(const br_sim *s, int k)
{
    return (int)(s->injm >> k & 1);
}

/* The injection into rail k: its open-circuit voltage at t, V (0 before it
 * starts). */
static inline double br_sim_inj_v(const br_sim *s, int k, double t)
{
    const br_stage *st = &s->c->st[k];
    if (s->inj[k].off) /* a hiccup holds it off */
        return 0.0;
    return s->inj_run || t >= st->tinj ? st->vinj : 0.0;
}

/* 1 when the injection into rail k has a current limit. */
static inline int br_sim_inj_limited(const br_sim *s, int k)
{
    return (int)(s->injlimm >> k & 1);
}

/* The current of an injection into rail k that its diode's law would
 * give, f (A), held to its current limit at rail voltage vr (its
 * fold-back reads the rail for its output: the diode's and resistance's
 * drop left out, a lower limit); sets its `lim` and, where the limit
 * binds, *gd to minus the limit's slope in vr. */
double br_sim_inj_clamp(br_sim *s, int k, double vr, double f, double *gd);

/* The current limit of the injection into rail k at rail voltage vr, A
 * (HUGE_VAL: none). */
double br_sim_inj_limit(const br_sim *s, int k, double vr);

/* Node below link k among node voltages v: rail k-1's, or 0 for an
 * injection. */
static inline double br_sim_low(const br_sim *s, const double *v, int k)
{
    return br_sim_inj(s, k) ? 0.0 : v[k - 1];
}

/* The current a rail k passes up to link k+1 among link currents il (0
 * when rail k+1 is injected, or the top). */
static inline double br_sim_up(const br_sim *s, const double *il, int k)
{
    return k + 1 < s->n && !br_sim_inj(s, k + 1) ? il[k + 1] : 0.0;
}

/* Voltage in link k's loop besides the two nodes: its return switch's at
 * t, or minus the injection's voltage. */
static inline double br_sim_link_d(const br_sim *s, int k, double t)
{
    return br_sim_inj(s, k) ? -br_sim_inj_v(s, k, t) : br_sim_switch_v(s, k - 1, t);
}

/* Reverse voltage of link k at time t for rail node voltages vr: across
 * its return switch, less the difference of the rails it joins (its
 * drive is minus this). */
static inline double br_sim_link_vrev(const br_sim *s, const double *vr, int k, double t)
{
    return br_sim_link_d(s, k, t) - (br_sim_low(s, vr, k) - vr[k]);
}

/* Forward (conduction) current of link k in the workspace: an active
 * link's current less its junction-capacitance share; 0 when blocked.
 * The peak, RMS and conduction-loss figures are of this current. */
static inline double br_sim_forward(const br_sim *s, int k)
{
    return s->seg.active[k] ? s->il[k] - s->icj[k] : 0.0;
}

/* Current into link k's stored charge: its forward current, where it
 * conducts (the reverse saturation current stores nothing). */
static inline double br_sim_stored_in(const br_sim *s, int k)
{
    double f = br_sim_forward(s, k);
    return f > 0.0 ? f : 0.0;
}

/* Count n units of work; every BR_SIM_POLL_EVERY of them, poll the stop
 * function and check the work limits.  Returns non-zero (s->halt set)
 * once the simulator is to stop. */
int br_sim_spend(br_sim *s, unsigned long n);

/* Record the workspace's rail voltages in the open window. */
void br_sim_window_track(br_sim *s);

/* How far past its threshold the driver supply furthest past one lies
 * for rails vr, V: > 0 exactly when br_sim_uvlo_due finds a stage. */
double br_sim_uvlo_excess(const br_sim *s, const double *vr);

/* Index of the first stage whose driver must toggle for rails vr, or -1. */
int br_sim_uvlo_due(const br_sim *s, const double *vr);

#endif

/* chain.h - the immutable chain model built from a design.
 *
 * Stage k (0 = bottom) is switch k of the string, its driver, rail k (the
 * driver's supply, a capacitor referenced to the source of switch k) and,
 * for k >= 1, link k: the diode (plus series resistor) from rail k-1 to
 * rail k.  Link k can only conduct while switch k-1, its return switch, is
 * on.  Rail 0 is the ground-referenced supply.
 *
 * All values here are resolved doubles (SI): the design evaluated at one
 * point (nominal, a corner or a Monte Carlo sample), temperature applied. */
#ifndef BR_MODEL_CHAIN_H
#define BR_MODEL_CHAIN_H

#include "model/design.h"
#include "model/line.h"

typedef struct br_diode {
    const char *id; /* part id (points into the design) */
    double is;      /* saturation current at the operating temperature, A */
    double n;       /* emission coefficient */
    double vt;      /* thermal voltage kT/q at the operating temperature, V */
    double rs;      /* series resistance, ohm */
    double cj0;     /* zero-bias junction capacitance, F */
    double vj;      /* built-in potential, V */
    double m;       /* grading coefficient */
    double tau;     /* charge-control time constant, s */
    double ir;      /* reverse leakage at the operating temperature, A */
    double vrrm;    /* reverse voltage rating, V */
    double ifsm;    /* surge current rating, one pulse, A (0: not given) */
    double ifrm;    /* repetitive peak forward current rating, A (0: not given) */
    double i2t;     /* I2t rating, A^2 s (0: not given) */
    double if_avg;  /* average forward current rating, A (0: not given) */
    double rth;     /* thermal resistance junction to ambient on its stage, K/W
                       (0: the junction stays at the ambient) */
    double tj_max;  /* maximum junction temperature, K (0: not given) */
    double tj;      /* junction temperature it is resolved at, K */
} br_diode;

typedef struct br_cap {
    const char *id;
    double c;      /* capacitance at zero bias after tolerance, temperature
                      and aging factors, F */
    double esr;    /* ohm */
    double vrated; /* V */
    int nbias;     /* DC-bias table (from the part) */
    const double *bias_v, *bias_f;
    double iripple; /* RMS ripple current rating, A (0: not given) */
    int class2;     /* a class II ceramic (stated, or a DC-bias table without a
                       stated dielectric) */
} br_cap;

typedef struct br_driver {
    const char *id;
    double uvlo_rise, uvlo_fall; /* V */
    double iq_on, iq_off;        /* A */
    double i_iso;                /* A, drawn whenever the rail is up */
} br_driver;

typedef struct br_sw {
    const char *id;
    double rds_on;           /* on-resistance at the junction temperature, ohm */
    double qg, qg_v;         /* gate charge qg at drive voltage qg_v: C, V */
    double tg;               /* gate-charge pulse duration, s */
    double vsd0, rsd;        /* reverse-conduction drop vsd0 + |I| rsd: V, ohm
                                (vsd0 with this stage's gate-off voltage) */
    double vgs_rec, vgs_max; /* V */
} br_sw;

typedef struct br_aux {
    const char *id; /* NULL when the rail has none */
    int kind;       /* br_rail_aux */
    double vout, dropout, iq, rz;
    double pmax;   /* dissipation rating, W (0: not given) */
    double rth;    /* junction to ambient, K/W (0: not given) */
    double tj_max; /* K (0: not given) */
} br_aux;

/* A supply's current limit as the simulator reads it: the main supply's
 * (br_chain_supply_limit) or an injection's (br_stage.inj_lim). */
typedef struct br_climit {
    int mode;                        /* br_supply_limit */
    double vset;                     /* its set voltage: fold-back reaches the full
                                        limit there, V */
    double ilimit, ifold;            /* the limit, and its fold-back at 0 V, A */
    double hiccup_delay, hiccup_off; /* s */
    int hiccup_retries;              /* -1: no end */
} br_climit;

typedef struct br_stage {
    char name[BR_ID_MAX]; /* switch name, "B1" ... "A1" for an FCML leg */
    br_diode diode;       /* link k (unused for k = 0) */
    double r_link;        /* extra series resistance of link k, ohm */
    br_cap cap;           /* rail k capacitor (unused for k = 0) */
    br_driver drv;
    br_sw sw;
    br_aux aux;
    double vblock;                    /* voltage switch k blocks when off, with the
                                         design's flying-capacitor imbalance, V */
    int nwin;                         /* commanded on-intervals of switch k */
    double win[BR_MAX_WINDOWS][2];    /* [start, end) in s within [0, T);
                                         end < start means it wraps;
                                         [0, T] is on all period */
    int nrev[2];                      /* per direction (0 step-down, 1 step-up): */
    double rev[2][BR_MAX_WINDOWS][2]; /* intervals of reverse conduction */
    int is_top;                       /* FCML: 1 for an A (top) switch */
    int pair;                         /* FCML: pair number 1..P, 0 for a string */
    int inject;                       /* 1: an isolated supply feeds rail k in place
                                         of link k (diode and r_link are its own) */
    double vinj;                      /* its open-circuit voltage, V */
    double tinj;                      /* it steps on at this time from power-up, s */
    br_climit inj_lim;                /* its current limit (mode 0: none) */
    double inj_rating;                /* its rated output current, A (0: not given) */
    int carry[2];                     /* per direction: how the switch carries the
                                         load current while on, +1 forward (drops
                                         +I Rds(on)), -1 reverse (-I Rds(on)), 0 not
                                         at all */
} br_stage;

struct br_chain {
    const br_design *design; /* the source; must outlive the chain */
    int n;                   /* stages = switches */
    br_stage st[BR_MAX_SWITCHES];
    double T, fsw, duty, deadtime, tedge; /* s, Hz, -, s, s */
    double vin, tamb;                     /* V, K */
    double tj;                            /* the switches' junction temperature, K */
    double iload;                         /* load current magnitude, A */
    double load_from;                     /* s: the design starts under load from
                                             the first period boundary at or after
                                             it; HUGE_VAL: start-up at no load */
    double cfly;                          /* FCML flying capacitance, F (0: ideal) */
    br_line line;                         /* an AC line cycle instead of the DC load
                                             (line.on; then iload is 0 and duty is the
                                             modulation's centre, 0.5) */
    double overshoot;                     /* fraction of vblock */
    double vsupply, rsupply, tramp;       /* V, ohm, s */
    double csupply;                       /* rail-0 bypass capacitance, F (0: none) */
    int limit_mode;                       /* br_supply_limit */
    double ilimit, ifold;                 /* current limit, and its fold-back at 0 V, A */
    double hiccup_delay, hiccup_off;      /* s */
    int hiccup_retries;                   /* -1: no end */
    double tsoft;                         /* soft-start, s */
    double irating;                       /* supply's rated current, A (0: not given) */
    int direction;                        /* br_direction */
    int nprecharge;
    br_precharge precharge[BR_MAX_PRECHARGE];
    double min_drive, derating, startup_max;
    double cap_derating; /* class II ceramics' voltage derating (design rule) */
    int max_dropouts;    /* start-up dropouts allowed per stage, -1: not stated */

    int startup_method; /* br_su_method */
};

/* The main supply's current limit, from the chain's fields. */
static inline br_climit br_chain_supply_limit(const br_chain *c)
{
    return (br_climit){c->limit_mode,   c->vsupply,    c->ilimit,        c->ifold,
                       c->hiccup_delay, c->hiccup_off, c->hiccup_retries};
}

/* 1 when some rail is fed by an injection (an isolated supply). */
int br_chain_injected(const br_chain *c);

/* Build at explicit values: d with every br_qty read at .nom. */
int br_chain_build_nominal(const br_design *d, br_chain *c, br_error *err);

/* Rail voltage driver k needs to start (UVLO rising, plus the
 * regulator's dropout when the rail feeds the driver through one), V;
 * HUGE_VAL when a regulator's output is below UVLO rising. */
double br_rail_start_voltage(const br_chain *c, int k);

/* Thermal voltage kT/q at T (K), V. */
double br_thermal_voltage(double T);

/* Resolve a diode part at junction temperature T (K). */
int br_diode_at(const br_diode_part *p, double T, br_diode *out, br_error *err);

/* A capacitor part with its tolerance-free nominal factors applied; its
 * temperature table, when it has one, read at the ambient T (K) in place
 * of temp-factor. */
void br_cap_at_nominal(const br_cap_part *p, double T, br_cap *out);

/* Rebuild link k's diode (k >= 1) of chain c at junction temperature T
 * (K), keeping its thermal resistance.  BR_EINPUT as br_diode_at. */
int br_chain_diode_at(br_chain *c, int k, double T, br_error *err);

/* Effective capacitance of rail k at bias v (DC-bias table applied), F. */
double br_cap_at(const br_cap *cap, double v);

/* Charge a capacitor takes from va to vb: the integral of br_cap_at over
 * [va, vb], exact for the piecewise-linear DC-bias line (negative when
 * vb < va), C. */
double br_cap_charge(const br_cap *cap, double va, double vb);

/* The voltage a capacitor at v0 reaches once it has taken charge dq
 * (negative: given it): the inverse of br_cap_charge, V. */
double br_cap_after_charge(const br_cap *cap, double v0, double dq);

/* Energy a capacitor holds at v, the integral of br_cap_at(u) u du from
 * 0 to v, exact for the piecewise-linear DC-bias line, J. */
double br_cap_energy(const br_cap *cap, double v);

/* Gate charge drawn at a turn-on edge when the drive voltage is v, C. */
double br_sw_qg_at(const br_sw *sw, double v);

/* Rds(on) of a switch part at junction temperature T (K), ohm. */
double br_rds_at(const br_switch_part *p, double T);

/* Voltage across stage k's switch while on and carrying load current i
 * (A, magnitude) in direction dir (a br_dir_index), V. */
double br_sw_on_drop(const br_stage *st, int dir, double i);

/* Drop of stage k's switch conducting load current i (A, magnitude) in
 * reverse while commanded off, V (positive: the switch stands at minus
 * this). */
double br_sw_rev_drop(const br_sw *sw, double i);

#endif

/* design.h - the parsed design: every parameter of a design file, in SI.
 *
 * The io layer fills a br_design from XML; tests may fill one by hand
 * (br_design_create gives sane defaults, then set fields).  The chain
 * builder reads it and never changes it.  Every numeric parameter is a
 * br_qty so that any of them can carry a tolerance. */
#ifndef BR_MODEL_DESIGN_H
#define BR_MODEL_DESIGN_H

#include "bootrung/bootrung.h"

#define BR_ID_MAX 48       /* part ids and switch names, with NUL */
#define BR_SOURCE_MAX 160  /* a part's source attribute, with NUL */
#define BR_MAX_SWITCHES 64 /* longest string accepted (levels <= 33) */
#define BR_MAX_WINDOWS 4   /* on-intervals per switch per period */
#define BR_MAX_BIAS_POINTS 32
#define BR_MAX_PRECHARGE 16
#define BR_MAX_DUTY_POINTS 64 /* points of a line cycle's duty table */
/* A line cycle holds from BR_LINE_MIN_PERIODS to BR_LINE_MAX_PERIODS
 * switching periods: fewer make the line frequency no longer far below
 * the switching frequency (each period's duty and current are taken as
 * constant), more make one line period tens of seconds of simulation. */
#define BR_LINE_MIN_PERIODS 20
#define BR_LINE_MAX_PERIODS 100000
#define BR_MAX_PARTS 64 /* of each kind */
#define BR_MAX_INJECT 8 /* isolated injection supplies of one design */
/* Start-up dropouts (UVLO hiccups) of one stage: more than BR_DROPOUTS_WARN
 * is worth a warning when the design states no limit of its own (a chain
 * filling rung by rung may hiccup a few times per rung while the rail
 * above takes its first charge; more means the start leans on the UVLO
 * hysteresis to limit the current); a stated limit is at most
 * BR_DROPOUTS_MAX. */
#define BR_DROPOUTS_WARN 3
#define BR_DROPOUTS_MAX 10000

typedef enum br_dist { BR_DIST_UNIFORM = 0, BR_DIST_NORMAL = 1 } br_dist;

/* A toleranced quantity.  Invariant: min <= nom <= max; min == nom == max
 * when the file gives no tolerance. */
typedef struct br_qty {
    double nom;  /* nominal (typical) value, SI */
    double min;  /* lowest value the tolerance allows */
    double max;  /* highest value the tolerance allows */
    int dist;    /* br_dist for Monte Carlo */
    double nsig; /* for BR_DIST_NORMAL: the limits sit at +-nsig sigma */
    int line;    /* source line of the value, 0 when defaulted */
} br_qty;

/* Current direction(s) the leg carries; decides which switch of a pair
 * conducts in reverse during dead time.  NONE: idealised commutation
 * (every commanded-off switch blocks, nothing reverse-conducts). */
typedef enum br_direction {
    BR_DIR_NONE = 0,
    BR_DIR_STEP_DOWN = 1, /* current out of the switch node: bottoms conduct */
    BR_DIR_STEP_UP = 2,   /* current into the switch node: tops conduct */
    BR_DIR_BOTH = 3       /* analyse both */
} br_direction;

typedef struct br_diode_part {
    char id[BR_ID_MAX];
    char source[BR_SOURCE_MAX]; /* where its values come from ("": not stated) */
    int line;                   /* line of the <diode> element */
    br_qty is;                  /* Shockley saturation current at tnom, A */
    br_qty n;                   /* emission coefficient */
    br_qty rs;                  /* series (ohmic) resistance, ohm */
    br_qty cj0;                 /* zero-bias junction capacitance, F */
    br_qty vj;                  /* junction built-in potential, V */
    br_qty m;                   /* junction grading coefficient */
    br_qty tau;                 /* charge-control stored-charge time constant, s (0: none) */
    br_qty eg;                  /* bandgap for Is(T), eV (1.11 Si, 3.26 SiC) */
    br_qty xti;                 /* Is(T) temperature exponent */
    br_qty ir;                  /* reverse leakage at ir_temp, A */
    br_qty ir_temp;             /* temperature at which ir is given, K */
    br_qty ir_double;           /* temperature rise that doubles the leakage, K */
    br_qty vrrm;                /* repetitive peak reverse voltage rating, V */
    br_qty ifsm;                /* non-repetitive surge current rating (one pulse), A */
    br_qty ifrm;                /* repetitive peak forward current rating, A */
    br_qty i2t;                 /* I2t rating (integral of i^2 over a surge), A^2 s */
    br_qty if_avg;              /* average forward current rating, A (0: not given) */
    br_qty rth;                 /* thermal resistance junction to ambient, K/W (0: the
                                   junction stays at the ambient); a stage may give its own */
    br_qty tj_max;              /* maximum junction temperature, K (0: not given) */
    double tnom;                /* temperature of is/n/rs, K */
    double bv, ibv;             /* reverse breakdown voltage and its current from a SPICE
                                   .model (V, A; 0: not given): not a rating and not
                                   simulated, only written back into netlists */
} br_diode_part;

/* What a capacitor is made of, for the voltage derating rule. */
typedef enum br_dielectric {
    BR_DIEL_UNSTATED = 0, /* class II ceramic when it has a DC-bias table */
    BR_DIEL_CLASS1,       /* class I ceramic (C0G/NP0): no DC-bias loss */
    BR_DIEL_CLASS2,       /* class II ceramic (X7R, X5R, ...) */
    BR_DIEL_OTHER         /* film, electrolytic, polymer */
} br_dielectric;

typedef struct br_cap_part {
    char id[BR_ID_MAX];
    char source[BR_SOURCE_MAX]; /* where its values come from ("": not stated) */
    int line;
    br_qty c;                          /* nominal capacitance, F (tolerance lives here) */
    br_qty esr;                        /* equivalent series resistance, ohm */
    br_qty vrated;                     /* voltage rating, V */
    br_qty tfactor;                    /* capacitance factor at the operating temperature */
    br_qty aging;                      /* capacitance factor after aging (1 = none) */
    br_qty iripple;                    /* RMS ripple current rating, A (0: not given) */
    int dielectric;                    /* br_dielectric */
    int nbias;                         /* points in the DC-bias table (0: flat) */
    double bias_v[BR_MAX_BIAS_POINTS]; /* bias voltage, V, ascending */
    double bias_f[BR_MAX_BIAS_POINTS]; /* C(v)/C(0), interpolated linearly */
    int ntemp;                         /* points of the temperature table (0: none,
                                          temp-factor applies) */
    double temp_t[BR_MAX_BIAS_POINTS]; /* temperature, K, ascending */
    double temp_f[BR_MAX_BIAS_POINTS]; /* C(T)/C(25 C), interpolated linearly at
                                          the ambient, flat beyond its ends */
} br_cap_part;

typedef struct br_driver_part {
    char id[BR_ID_MAX];
    char source[BR_SOURCE_MAX]; /* where its values come from ("": not stated) */
    int line;
    br_qty uvlo_rise; /* enable threshold on a rising rail, V */
    br_qty uvlo_fall; /* disable threshold on a falling rail, V */
    br_qty iq_on;     /* quiescent current while running, A */
    br_qty iq_off;    /* quiescent current while held in UVLO, A */
    br_qty i_iso;     /* signal isolator / level shifter current, A */
    br_qty vgs_off;   /* gate voltage it applies to hold its switch off, V
                         (<= 0; a channel-law switch's reverse drop rises
                         by its magnitude) */
} br_driver_part;

/* How a switch conducts the load current in reverse while commanded off. */
typedef enum br_reverse_law {
    BR_REV_DIODE = 0,  /* a body diode: vsd + I rsd */
    BR_REV_CHANNEL = 1 /* no body diode (GaN): the channel turns on in the
                          third quadrant, vth + |vgs_off| + I rsd */
} br_reverse_law;

typedef struct br_switch_part {
    char id[BR_ID_MAX];
    char source[BR_SOURCE_MAX]; /* where its values come from ("": not stated) */
    int line;
    br_qty rds_on;   /* on-resistance at rds_temp, ohm */
    br_qty rds_temp; /* junction temperature of rds_on, K */
    br_qty rds_exp;  /* Rds(on)(Tj) = rds_on (Tj / rds_temp)^rds_exp */
    br_qty qg;       /* total gate charge at qg_v, C */
    br_qty qg_v;     /* drive voltage at which qg is stated, V */
    br_qty tg;       /* duration of the gate-charge pulse at turn-on, s */
    int reverse;     /* br_reverse_law */
    br_qty vsd;      /* BR_REV_DIODE: fixed part of the reverse drop, V */
    br_qty vth;      /* BR_REV_CHANNEL: gate threshold voltage, V */
    br_qty rsd;      /* current-dependent part of the reverse drop, ohm */
    int rsd_given;   /* 0: rsd defaults (diode 0, channel Rds(on) at Tj) */
    br_qty vgs_rec;  /* recommended gate drive, V */
    br_qty vgs_max;  /* absolute maximum gate voltage, V */
} br_switch_part;

typedef enum br_rail_aux { BR_AUX_NONE = 0, BR_AUX_LDO = 1, BR_AUX_ZENER = 2 } br_rail_aux;

/* Optional per-rail linear regulator (kind LDO) or Zener clamp (ZENER). */
typedef struct br_aux_part {
    char id[BR_ID_MAX];
    char source[BR_SOURCE_MAX]; /* where its values come from ("": not stated) */
    int line;
    int kind;       /* br_rail_aux */
    br_qty vout;    /* LDO: regulated output, V; ZENER: knee voltage, V */
    br_qty dropout; /* LDO: minimum input-output headroom, V */
    br_qty iq;      /* LDO: own quiescent current, A */
    br_qty rz;      /* ZENER: dynamic resistance above the knee, ohm */
    br_qty pmax;    /* dissipation rating, W (0: not given) */
    br_qty rth;     /* thermal resistance junction to ambient, K/W (0: not given) */
    br_qty tj_max;  /* maximum junction temperature, K (0: not given) */
} br_aux_part;

/* Which parts and extras sit on one stage (switch k, rail k, link k). */
typedef struct br_stage_spec {
    int diode;     /* index into design->diodes (link k, k >= 1) */
    int cap;       /* index into design->caps (rail k) */
    int driver;    /* index into design->drivers */
    int sw;        /* index into design->switches */
    int aux;       /* index into design->aux, -1 for none */
    br_qty r_link; /* series resistor in link k, ohm */
    br_qty rth;    /* link k's diode: thermal resistance junction to ambient on
                      this stage's board, K/W (read when rth_given) */
    int rth_given; /* 0: the diode part's own rth */
    int line;      /* line of the <stage> override, 0 for the default */
} br_stage_spec;

/* How the supply behaves at its current limit. */
typedef enum br_supply_limit {
    BR_SUPPLY_UNLIMITED = 0, /* no limit: any current at its voltage behind its resistance */
    BR_SUPPLY_CONSTANT,      /* constant current at the limit */
    BR_SUPPLY_FOLDBACK,      /* the limit folds back linearly with the output voltage */
    BR_SUPPLY_HICCUP         /* constant current, then off for a while and a retry */
} br_supply_limit;

/* An isolated supply feeding one rail directly (a second injection
 * point): a DC output referenced to the source of the rail's own switch,
 * through its series resistance and a diode, into the rail capacitor.
 * It replaces the rail's link: the chain is split there, the rail below
 * no longer feeds it, and the rails above cascade from it as usual. */
typedef struct br_inject_spec {
    int rail;     /* the rail it feeds, 1 .. switches-1 */
    br_qty v;     /* open-circuit output voltage, V (toleranced like the supply) */
    br_qty r;     /* series resistance (output and added resistor), ohm */
    int diode;    /* index into design->diodes: its series diode */
    double start; /* the output steps on at this time from power-up, s */
    int line;     /* line of the <injection> element */
    /* its current limit, with the supply's attributes and modes
     * (limit_mode 0, BR_SUPPLY_UNLIMITED: none) */
    int limit_mode;      /* br_supply_limit */
    br_qty ilimit;       /* current limit, A (with a limit) */
    br_qty ifold;        /* fold-back: the limit at 0 V output, A */
    br_qty hiccup_delay; /* hiccup: time in the limit before it shuts down, s */
    br_qty hiccup_off;   /* hiccup: time off before a retry, s */
    int hiccup_retries;  /* hiccup: retries before it stays off (-1: no end) */
    br_qty irating;      /* rated output current, A (0: not given) */
} br_inject_spec;

typedef enum br_topology { BR_TOPO_FCML = 0, BR_TOPO_STRING = 1 } br_topology;

/* How a string switch carries the load current while it is on. */
typedef enum br_carry {
    BR_CARRY_UNSET = 0, /* the file does not say (refused under load) */
    BR_CARRY_FORWARD,   /* drain to source: drops +I Rds(on) */
    BR_CARRY_REVERSE,   /* source to drain: drops -I Rds(on) */
    BR_CARRY_NONE       /* the load current does not flow through it */
} br_carry;

/* An AC line cycle at the operating point, instead of a DC load current:
 * the leg's load current is i(theta) = ipk sin(theta - phase), positive
 * out of the switch node (step-down), and each switching period takes its
 * duty from the modulation at its line phase theta: 1/2 (1 + depth sin
 * theta) (sine modulation), or the duty table interpolated linearly and
 * periodically over the line period. */
typedef struct br_line_spec {
    int on;                              /* the design gives <line-cycle> */
    int line;                            /* its source line */
    br_qty freq;                         /* line frequency, Hz */
    br_qty ipk;                          /* peak load current, A */
    br_qty phase;                        /* the current lags the modulation by this, rad */
    br_qty depth;                        /* sine modulation depth, [0, 1) (ntab == 0) */
    int ntab;                            /* points of the duty table (0: sine) */
    double tab_at[BR_MAX_DUTY_POINTS];   /* line phase, rad, ascending in [0, 2 pi) */
    double tab_duty[BR_MAX_DUTY_POINTS]; /* duty there, in (0, 1) */
} br_line_spec;

/* Explicit string: one switch, its on-intervals as fractions of T. */
typedef struct br_switch_spec {
    char name[BR_ID_MAX];
    int carry;                     /* br_carry */
    int nwin;                      /* number of on-intervals */
    double on[BR_MAX_WINDOWS][2];  /* [start, end) fractions; end may wrap */
    br_qty vblock;                 /* voltage it blocks when off, V */
    int nrev;                      /* intervals of reverse conduction */
    double rev[BR_MAX_WINDOWS][2]; /* [start, end) fractions of T, when
                                      the load current forces it to conduct
                                      in reverse while commanded off */
    int line;
} br_switch_spec;

typedef struct br_precharge {
    unsigned long long mask; /* bit s set: switch s held on */
    double duration;         /* s */
    int line;
} br_precharge;

struct br_design {
    char path[512]; /* file it came from, for messages */
    char name[128]; /* the design's name attribute */
    /* operating point */
    br_qty vin;      /* DC bus, V */
    br_qty fsw;      /* switching frequency, Hz */
    br_qty duty;     /* top-switch duty, fraction in (0,1) */
    br_qty deadtime; /* s */
    br_qty tamb;     /* ambient temperature, K */
    br_qty tj;       /* the switches' junction temperature, K (read when
                        tj_given; otherwise the ambient) */
    int tj_given;
    int direction;    /* br_direction */
    br_qty iload;     /* load current through the leg, magnitude, A */
    double load_from; /* the load current flows from the first period
                         boundary at or after this time, s; HUGE_VAL (the
                         default): start-up at no load, loaded in steady
                         state */
    br_line_spec ac;  /* an AC line cycle instead of the DC load (ac.on) */
    br_qty imbalance; /* flying-capacitor imbalance, fraction of Vin/P */
    br_qty tedge;     /* switching-node edge (ramp) time, s */
    br_qty overshoot; /* edge overshoot on blocking voltage, fraction */
    /* supply (rail 0) */
    br_qty vsupply;      /* V (its tolerance is the supply tolerance) */
    br_qty rsupply;      /* source resistance, ohm */
    br_qty tramp;        /* start-up ramp time, s (0: step) */
    br_qty csupply;      /* local bypass capacitance on rail 0, F (0: none) */
    int limit_mode;      /* br_supply_limit */
    br_qty ilimit;       /* current limit, A (with a limit) */
    br_qty ifold;        /* fold-back: the limit at 0 V output, A */
    br_qty hiccup_delay; /* hiccup: time in the limit before it shuts down, s */
    br_qty hiccup_off;   /* hiccup: time off before a retry, s */
    int hiccup_retries;  /* hiccup: retries before it stays off (-1: no end) */
    br_qty tsoft;        /* soft-start: output ramp at every start, s (0: none) */
    br_qty irating;      /* rated output current, A (0: not given) */
    /* isolated supplies feeding rails directly (the chain split there) */
    int ninject;
    br_inject_spec inject[BR_MAX_INJECT];
    /* topology */
    int topology;                       /* br_topology */
    int levels;                         /* FCML: N levels */
    br_qty cfly;                        /* FCML: flying capacitance, F (0: ideal) */
    int nswitch;                        /* STRING: number of switches */
    br_switch_spec sw[BR_MAX_SWITCHES]; /* STRING: bottom (0) to top */
    /* parts */
    int ndiodes, ncaps, ndrivers, nswitches, naux;
    br_diode_part diodes[BR_MAX_PARTS];
    br_cap_part caps[BR_MAX_PARTS];
    br_driver_part drivers[BR_MAX_PARTS];
    br_switch_part switches[BR_MAX_PARTS];
    br_aux_part aux[BR_MAX_PARTS];
    /* stage assignment: def applies to every stage without an override */
    br_stage_spec def;
    int has_override[BR_MAX_SWITCHES];
    br_stage_spec stage[BR_MAX_SWITCHES]; /* valid where has_override */
    /* start-up pattern: pre-charge steps, then plain PWM */
    int nprecharge;
    br_precharge precharge[BR_MAX_PRECHARGE];
    /* analysis settings */
    br_qty min_drive;           /* minimum useful drive voltage, V */
    br_qty derating;            /* diode reverse-voltage derating limit, fraction */
    br_qty startup_max;         /* longest start-up simulated, s */
    br_qty cap_derating;        /* class II ceramics: largest fraction of the
                                   rating a rail should reach (design rule) */
    int max_dropouts;           /* start-up dropouts allowed on any one stage
                                   (-1: not stated, then more than
                                   BR_DROPOUTS_WARN only warn) */
    unsigned long long hold_on; /* hold-up: switches held on once switching
                                   stops (bit s: switch s); 0: all off */
    int startup_method;         /* br_su_method: how every start-up is simulated
                                   (a numerical setting, from the command line) */
};

/* How a start-up is simulated: br_su_method, in bootrung/bootrung.h. */

/* A design with every optional field at its documented default and no
 * parts.  Returns NULL when out of memory. */
br_design *br_design_create(void);

/* Fill a part with the defaults of every optional attribute. */
void br_diode_part_defaults(br_diode_part *p);
void br_cap_part_defaults(br_cap_part *p);
void br_driver_part_defaults(br_driver_part *p);
void br_switch_part_defaults(br_switch_part *p);
void br_aux_part_defaults(br_aux_part *p);

/* A quantity without tolerance. */
br_qty br_qty_fixed(double v);

/* The stage spec that applies to stage k (override or default). */
const br_stage_spec *br_design_stage(const br_design *d, int k);

/* The injection feeding rail k, or NULL when link k feeds it. */
const br_inject_spec *br_design_injection(const br_design *d, int k);

/* Index of the diode part of link k (k >= 1): an injection's own diode
 * where one feeds rail k, else the stage's link diode. */
int br_design_link_diode(const br_design *d, int k);

/* Number of switches in the string (2(N-1) for FCML). */
int br_design_nswitch(const br_design *d);

#endif

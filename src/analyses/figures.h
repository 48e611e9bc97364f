/* figures.h - what an engineer reads off a steady state and a start-up:
 * per-rail margins, diode and capacitor stress, supply load, and the
 * verdict table of the main job.  Computed, never printed, here. */
#ifndef BR_ANALYSES_FIGURES_H
#define BR_ANALYSES_FIGURES_H

#include "analyses/startup.h"
#include "analyses/steady.h"

typedef struct br_rail_fig {
    double vmin, vmax, vavg;   /* rail (capacitor + ESR), V */
    double ripple;             /* vmax - vmin, V */
    double vdrv_min, vdrv_max; /* driver supply after the regulator, V */
    double m_uvlo;             /* vdrv_min - UVLO falling, V */
    double m_restart;          /* vdrv_min - UVLO rising, V (< 0: runs on hysteresis only) */
    double m_drive;            /* vdrv_min - minimum useful drive, V */
    double m_gate;             /* gate absolute maximum - vdrv_max, V */
    double c_eff;              /* capacitance at the mean bias, F */
    double vcap_peak;          /* capacitor voltage peak, V */
    double vcap_rating;        /* V (0: not given) */
    double icap_rms;           /* capacitor RMS current, A */
    double p_load;             /* power drawn from the rail by its loads, W */
    double p_aux;              /* the rail's regulator or clamp dissipation, W (0: none) */
    double tj_aux;             /* its junction temperature, K (NaN: no thermal resistance) */
} br_rail_fig;

typedef struct br_link_fig {
    double vrev_sim;          /* simulated peak reverse voltage, V */
    double vrev_stress;       /* with the design's edge overshoot, V */
    double vrrm;              /* rating, V (0: not given) */
    double share;             /* vrev_stress / vrrm (0 when unrated) */
    double iavg, irms, ipeak; /* forward current figures, A */
    double idisp;             /* largest displacement current of the junction capacitance
                                 (Cj dv/dt at the edges), either sign, A */
    double qrr;               /* recovery charge per period, C */
    double irrm;              /* peak recovery current, A */
    double p_cond, p_rr;      /* conduction and recovery power, W */
    double p_diode;           /* the diode's whole loss: conduction, recovery, leakage and
                                 junction capacitance, W */
    double tj;                /* junction temperature, K (the ambient without a thermal
                                 resistance) */
    int runaway;              /* no junction temperature balances its losses */
    double onset_amb;         /* the ambient at which it would run away, K (HUGE_VAL: never) */
} br_link_fig;

/* Where the power of a rail goes over a steady period, W: its driver's
 * running current, its isolator's and its standby (UVLO) current at the
 * driver supply, its gate charge, the regulator between rail and driver
 * (its own current and the drop across it), its clamp, and its
 * capacitor's ESR. */
typedef struct br_rail_loss {
    double run, iso, standby, gate, regulator, clamp, esr;
} br_rail_loss;

/* Where the power of a link goes, W: its diode's conduction, recovery and
 * leakage, the net of its junction capacitance, its resistor, and the
 * share of its current in the return switch's resistance; `stage` is
 * what the power stage takes from the chain through the link's return
 * switch (negative: gives it, by leakage, recovery and reverse
 * conduction), not a loss of the chain. */
typedef struct br_link_loss {
    double cond, recovery, leakage, junction, resistor, sw;
    double stage;
} br_link_loss;

/* The power balance of a steady period, W: what the supply delivers (its
 * open-circuit voltage times its current) and what the power stage gives
 * the chain equal every loss plus the change of the energy stored in the
 * rails (about 0 in a periodic state). */
typedef struct br_budget {
    double supply;  /* delivered by the supply */
    double stage;   /* given by the power stage (minus the links' `stage`) */
    double inject;  /* given by the isolated supplies that feed rails directly
                       (minus their links' `stage`: an injection's "return
                       switch" is its supply, at minus its voltage) */
    double rsupply; /* lost in the supply's resistance */
    double stored;  /* the rails' stored energy, end less start, over the period */
    double losses;  /* every loss, rsupply included */
    double balance; /* supply + stage + inject - losses - stored: rounding and the
                       integrator's error */
    br_rail_loss rail[BR_MAX_SWITCHES];
    br_link_loss link[BR_MAX_SWITCHES]; /* [k], k >= 1 */
} br_budget;

/* Rail k's and link k's total loss, W. */
double br_rail_loss_sum(const br_rail_loss *r);
double br_link_loss_sum(const br_link_loss *l);

typedef struct br_steady_figs {
    int dir;             /* br_dir_index */
    const br_steady *ss; /* the steady state they come from */
    int n;
    br_rail_fig rail[BR_MAX_SWITCHES];
    br_link_fig link[BR_MAX_SWITCHES]; /* [k], k >= 1 */
    double supply_iavg;                /* A */
    double supply_p;                   /* W */
    double supply_ipeak;               /* A */
    double supply_limited;             /* fraction of the period the supply spends in its
                                          current limit */
    double supply_stretch;             /* its longest stretch in the limit, s (the whole
                                          period: in the limit throughout) */
    br_budget budget;                  /* the power balance of the period */
    int bad_rail;                      /* the first rail whose average lies outside its minimum and
                                          maximum (the period's figures contradict each other, so
                                          they decide nothing), or -1 */
} br_steady_figs;

/* The figures of the period ss->stats.  A steady state whose simulation
 * failed (ss->failed) has none: every figure is NaN.  The figures are
 * checked against each other: a rail's average must lie between its
 * minimum and maximum (bad_rail). */
void br_steady_figures(const br_chain *c, const br_steady *ss, br_steady_figs *out);

/* The power balance of the simulated stretch st of chain c. */
void br_budget_make(const br_chain *c, const br_stats *st, br_budget *b);

/* 1 when avg lies between vmin and vmax, up to rounding and the
 * integrator's tolerance. */
int br_avg_within(double avg, double vmin, double vmax);

/* Rail k's figures at their worst over the ndir directions of f: lowest
 * minima and margins, highest maxima, ripple and stresses (a margin that
 * does not apply, NaN, gives way to one that does). */
br_rail_fig br_rail_fig_worst(const br_steady_figs *f, int ndir, int k);

/* One row of the verdict table. */
typedef enum br_crit {
    BR_CRIT_STARTUP = 0,  /* every driver starts within the allowed time */
    BR_CRIT_INRUSH,       /* link inrush within the diode's IFRM, IFSM and I2t ratings */
    BR_CRIT_DROPOUTS,     /* start-up dropouts of any one stage within the design's
                             limit (max-dropouts); without one, more than
                             BR_DROPOUTS_WARN only warn */
    BR_CRIT_SUPPLY_START, /* the supply's average current over the start-up within its
                             rating */
    BR_CRIT_STEADY,       /* a periodic steady state exists and holds (a status: its
                             figure is the solver's drift, it has no margin) */
    BR_CRIT_RESTART,      /* every rail stays above UVLO rising (restarts after a dropout) */
    BR_CRIT_UVLO,         /* every driver stays above UVLO falling */
    BR_CRIT_DRIVE,        /* every drive voltage above the minimum useful drive */
    BR_CRIT_GATE,         /* no gate above its absolute maximum */
    BR_CRIT_DIODE_VR,     /* reverse voltage within the derated diode rating */
    BR_CRIT_CAP_V,        /* capacitor peak within its rating */
    BR_CRIT_SUPPLY,       /* the supply's average current in steady state within its
                             rating, and a hiccup supply not held in its limit */
    BR_CRIT_HEADROOM,     /* every regulated rail above the regulator's output plus dropout */
    BR_CRIT_AUX_POWER,    /* regulator and clamp dissipation within their ratings */
    BR_CRIT_DIODE_IAVG,   /* diode average forward current within its rating */
    BR_CRIT_CAP_RIPPLE,   /* capacitor RMS ripple current within its rating */
    BR_CRIT_TJ,           /* junction temperatures within their maximum, and no thermal
                             runaway (figure +inf, margin -inf: see br_crit_never) */
    BR_CRIT_COUNT
} br_crit;

typedef struct br_verdict_row {
    int crit;    /* br_crit */
    int applies; /* 0: not checked (say why in note) */
    int pass;
    int warn;                     /* passes, with a finding the note states
                                     (start-up dropouts above the warning
                                     level of a design without a limit) */
    int undetermined;             /* applies, but the figures it needs are not
                                     trustworthy (a solver did not converge, a
                                     value is not finite): neither pass nor fail,
                                     and pass is 0; note says why */
    double figure, limit, margin; /* in the criterion's unit; a rail that
                                     never starts: figure +inf (no start
                                     time), margin -inf (below every late
                                     start), see br_crit_never */
    const char *unit;             /* "s", "V", "A", "" (a count) */
    int stage;                    /* binding rail/link, -1 when none */
    int aux;                      /* the binding part is rail `stage`'s regulator or clamp */
    int dir;                      /* br_dir_index of the binding case */
    /* on a line cycle (dir BR_DIRI_LINE): where in it the row binds, the
     * line phase (rad, [0, 2 pi)) and the switching period (0 .. K-1)
     * whose duty and current hold there; NaN and -1 otherwise */
    double line_theta;
    long line_period;
    char note[400];
} br_verdict_row;

typedef struct br_verdict {
    int all_pass;      /* every row that applies passes */
    int nfail;         /* rows that fail */
    int nundetermined; /* rows that are undetermined */
    int nwarn;         /* rows that pass with a warning */
    br_verdict_row row[BR_CRIT_COUNT];
} br_verdict;

/* Combine a start-up and the steady states of each analysed direction
 * (ndir of them) into the verdict table. */
void br_verdict_make(const br_chain *c, const br_startup *su, const br_steady_figs *figs, int ndir,
                     br_verdict *out);

/* 1 for a criterion judged by a margin (figure against a limit); 0 for
 * one that is a status (the steady state holds, does not hold, or is
 * undetermined), whose figure is information and which has no margin to
 * rank, histogram or correlate. */
int br_crit_has_margin(int crit);
/* The ratings the inrush of a link is judged against. */
typedef enum br_rating {
    BR_RATING_IFRM = 0, /* repetitive peak forward current: the peak of every pulse */
    BR_RATING_IFSM,     /* non-repetitive surge current: the largest single pulse */
    BR_RATING_I2T,      /* I2t: i^2 integrated over the whole start-up */
    BR_RATING_COUNT
} br_rating;

/* One check of a link's inrush against one rating, in amperes: the figure
 * is the start-up's peak current of the link; for IFRM and IFSM the limit
 * is the rating; for I2t it is the peak at which the start-up, every
 * current scaled alike, would reach the rating (peak * sqrt(rating /
 * I2t)), so that all three compare in the same unit and the margin says
 * how much more current each allows. */
typedef struct br_inrush_check {
    int rating;                   /* br_rating */
    double figure, limit, margin; /* A */
} br_inrush_check;

/* Judge the inrush of link k (k >= 1) of a finished start-up against the
 * ratings its diode gives: fills checks[] (one per rating given, at most
 * BR_RATING_COUNT) and returns their number (0: no rating).  *bind (may be
 * NULL) is the index of the check with the smallest margin. */
int br_inrush_link(const br_chain *c, const br_startup *su, int k, br_inrush_check *checks,
                   int *bind);

/* "IFRM", "IFSM", "I2t". */
const char *br_rating_name(int rating);

/* Short names of criteria, for tables and XML. */
const char *br_crit_name(int crit);
const char *br_crit_title(int crit);

/* The unit of a criterion's figure, limit and margin: "s", "A", "V", or
 * "" for a count. */
const char *br_crit_unit(int crit);

/* 1 for the criteria that need the cold start (start-up time, inrush,
 * start-up dropouts). */
int br_crit_is_startup(int crit);

/* 1 when a figure (or margin) of criterion crit stands for a rail that
 * never starts rather than a time, or a junction that runs away rather
 * than a temperature. */
int br_crit_never(int crit, double value);

/* The directions a design asks for: fills dirs (br_dir_index), returns
 * their count (1 or 2). */
int br_design_directions(const br_chain *c, int dirs[2]);

#endif

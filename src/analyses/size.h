/* size.h - sizing one design to a margin target: the smallest capacitor
 * per rail, the largest link resistance, the regulator headroom, and
 * (optionally) the supply voltage window of what comes out.
 *
 * Every value tried is judged at the design's worst corners, as `pick`
 * judges a choice: the design with the value in place gets a spread
 * derived from the original design's (its nominal point, and the
 * one-at-a-time points of any parameter the original does not have;
 * a new capacitor's tolerance borrows the sensitivity of the design's
 * capacitors), then each criterion's predicted worst corner.  A value
 * *qualifies* when every criterion passes there and every margin in
 * volts (UVLO, restart, drive, gate, regulator headroom, diode and
 * capacitor voltage) is at least the target; criteria in other units
 * (currents, times, powers, temperatures) must pass.
 *
 *  - Capacitors, rail by rail from the top (the top rail carries the least
 *    charge; each rail below carries the rails above it): from a catalog
 *    (the parts rated at least the supply's highest voltage, in order of
 *    nominal capacitance, then cost) or as a continuous value (the
 *    design's own part on that rail with its capacitance scaled, to 1 %).
 *    The search goes down from the rail's present value while values
 *    qualify and up while they do not (from a catalog galloping, 1, 2,
 *    4... parts at a time, then bisecting; continuous, halving or
 *    doubling, then bisecting), so the answer qualifies and the next
 *    smaller value (a catalog's next part down, or 1 % less) was judged
 *    and does not.  Rails sized earlier keep their values; every
 *    judgement judges every rail, the cold start included (a rail's
 *    capacitor sets the charge the rail above takes from it as it
 *    starts, and so the inrush of the links).
 *  - The link resistance: one value on every link, the largest that
 *    qualifies, the cold start included (a larger resistor tames the
 *    inrush and slows the start), doubling or halving from the design's
 *    largest and then bisection to 2 %.
 *  - Then each injection's resistance (the design's order) by the same
 *    search from its own value, never below its floor V / IFRM (the
 *    injection's highest voltage over its diode's repetitive peak
 *    current, else its surge current: the module steps on into an empty
 *    rail, the peak at most V / R), which the split designs of `explore`
 *    apply too: halving stops at the floor.
 *  - The result judged whole (cold start included); its regulator
 *    headroom: how far the regulated rails stay above the regulator's
 *    output at the worst corner, against the dropout the regulators need.
 *
 * A value whose judgement is undetermined decides nothing: the search of
 * that rail (or of the resistance) stops there and says so.  Bounded:
 * each search judges at most BR_SIZE_MAXTRY values. */
#ifndef BR_ANALYSES_SIZE_H
#define BR_ANALYSES_SIZE_H

#include "analyses/spread.h"
#include "analyses/supply_window.h"
#include "model/catalog.h"

#define BR_SIZE_MAXTRY 40   /* values judged per search */
#define BR_SIZE_RES_C 0.01  /* continuous capacitance: 1 % */
#define BR_SIZE_RES_R 0.02  /* link resistance: 2 % */
#define BR_SIZE_SPAN 1024.0 /* values searched within this factor of the design's */

/* A design judged at its worst corners. */
typedef struct br_size_verdict {
    int status;     /* br_status of judging it (not BR_OK: undetermined) */
    int outcome;    /* br_outcome of the criteria judged */
    int qualifies;  /* passes, and every voltage margin reaches the target */
    double margin;  /* smallest voltage margin, V (HUGE_VAL: none decided) */
    int crit;       /* where it binds: br_crit (-1 none) */
    int stage, dir; /* rail or link, br_dir_index */
    int fail_crit;  /* a criterion that fails, or is undetermined, or is below the target
                       (-1: none) */
    br_pt_row fail_row;
    double headroom;                /* smallest rail headroom over what its driver needs, V */
    br_pt_row worst[BR_CRIT_COUNT]; /* each criterion's worst decided row */
    int seen[BR_CRIT_COUNT];
    int points; /* corners judged */
} br_size_verdict;

typedef enum br_size_kind {
    BR_SIZE_FOUND = 0,    /* qualifies; the next smaller (larger for a resistance) does not */
    BR_SIZE_END,          /* the smallest value searched qualifies (largest, resistance) */
    BR_SIZE_NONE,         /* not even the largest value qualifies (smallest, resistance) */
    BR_SIZE_UNDETERMINED, /* a judgement on the way was undetermined */
    BR_SIZE_KEPT          /* not searched: the role has nothing to size */
} br_size_kind;

/* One value on one rail, or one link resistance. */
typedef struct br_size_value {
    double v;            /* F or ohm */
    int part;            /* catalog capacitor (-1: continuous, or a resistance) */
    char id[BR_ID_MAX];  /* the part's id in the sized design */
    br_size_verdict ver; /* the judgement */
} br_size_value;

typedef struct br_size_answer {
    int kind;    /* br_size_kind */
    double from; /* the design's own value, F or ohm */
    char from_id[BR_ID_MAX];
    br_size_value at;     /* the answer (kind FOUND or END) */
    int have_beyond;      /* beyond was judged */
    br_size_value beyond; /* the next smaller (larger) value, which does not qualify; or the
                             undetermined one */
    int trials;           /* values judged */
} br_size_answer;

typedef struct br_size_opts {
    int threads;                 /* worker threads; 0: one per processor */
    double target;               /* V; < 0: a quarter of the smallest UVLO hysteresis */
    const br_catalog *cat;       /* capacitors from here (NULL or none in it: continuous) */
    int links;                   /* size the link resistance and the injections' (1) */
    int supply;                  /* search the supply voltage window of the result (0) */
    int solver_limit;            /* br_spread_opts.solver_limit */
    int nominal;                 /* judge every value at the nominal point only: the design's
                                    tolerances and each catalog part's set aside (br_tol_fix);
                                    the sized design has none (0).  A value's cold start is
                                    then simulated only when its steady state leaves it able
                                    to qualify (br_spread_opts.lazy_startup), as the worst
                                    corners' is only when its steady-state corners qualify */
    const br_progress *progress; /* values judged (the total grows); NULL: none */
} br_size_opts;

typedef struct br_size {
    br_design *d;                        /* the sized design (owned) */
    double target;                       /* V */
    int target_default;                  /* the target is the default */
    int catalog;                         /* capacitors from the catalog */
    int n;                               /* stages */
    br_size_answer cap[BR_MAX_SWITCHES]; /* [k], k >= 1 */
    int links;                           /* the link resistance was sized, and the
                                            injections' resistances */
    br_size_answer link;
    int ninject;                          /* the design's injections */
    br_size_answer inject[BR_MAX_INJECT]; /* [i]: injection i's resistance */
    double inject_floor[BR_MAX_INJECT];   /* its floor V / IFRM, ohm (0: its diode states
                                             neither IFRM nor IFSM) */
    br_size_verdict start;                /* the design as given, steady-state criteria */
    br_size_verdict final;                /* the result, every criterion (cold start included) */
    double reg_vout; /* the highest regulator output and the largest dropout of the
                        regulators on the rails, V (0: no regulator) */
    double reg_dropout;
    br_supply_window *sw; /* the supply window of the result (opts.supply), owned */
    long points;          /* corners judged in all */
    int outcome;          /* br_outcome: pass when the result qualifies */
} br_size;

void br_size_opts_default(br_size_opts *o);

/* Size design d (not changed).  BR_ECANCEL when the progress hook asks
 * to stop; BR_ENOMEM; BR_EINPUT when the catalog leaves no capacitor
 * that may sit on a rail.  Anything a judgement meets is in the result. */
int br_size_run(const br_design *d, const br_size_opts *o, br_size **out, br_error *err);
void br_size_free(br_size *s);

/* The smallest resistance injection i of d may have: its highest
 * voltage over its diode's IFRM (else IFSM), ohm; 0 when the diode
 * states neither. */
double br_size_inject_floor(const br_design *d, int i);

/* Judge design t (d with some parts or values changed, the same topology
 * and stages) as the search judges a value: at its worst corners from d's
 * spread, cold start included when the steady-state criteria qualify,
 * against o's target (o->cat is not used); o->progress counts its points
 * and its stop poll stops it (BR_ECANCEL).  For the exploration, checks
 * and tests. */
int br_size_judge(const br_design *d, const br_design *t, const br_size_opts *o, br_size_verdict *v,
                  br_error *err);

#endif

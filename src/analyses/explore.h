/* explore.h - many designs from one: level counts, switch voltage classes
 * and switching frequencies around a template design, each judged, the
 * feasible ones ranked and their Pareto front of cost, gate-supply loss
 * and worst margin.
 *
 * The template (an FCML design) gives everything the exploration does not
 * vary: the supply, the drivers, regulators and UVLO, the timing, the
 * start-up pattern, the diodes and rail capacitors.  For each combination
 * of a level count N, a catalog switch and a switching frequency:
 *
 *  - The voltage rule of the trade (model/rating.h): each of the N - 1
 *    series switches of a side blocks the highest bus voltage over N - 1;
 *    a switch whose voltage class is below that over the derating is
 *    rejected without a simulation.  Each link diode blocks the same
 *    share: a link keeps the template's diode where its VRRM meets the
 *    rule, and otherwise takes the cheapest catalog diode that meets it
 *    and is at least as strong in current (IFRM, IFSM, I2t, IF(avg)) as
 *    the template's; none: rejected.
 *  - The chain: the template with N levels (the FCML generator builds the
 *    string), the catalog switch on every stage and its driver when the
 *    catalog names one, the template's rail capacitors and link resistors
 *    kept (its per-stage overrides stay on the stages counted from the
 *    bottom that the shorter or longer chain still has), a pre-charge
 *    step that holds every bottom switch of the template's leg holds every
 *    bottom switch of the new leg, for a time scaled by the number of
 *    pairs.
 *  - The screen: the cold start and the steady state of every direction at
 *    the nominal point, and the verdict.  A combination passes the screen
 *    when every criterion passes, its smallest margin in volts reaches the
 *    target, its start-up time and cost are within the limits given.
 *  - Survivors (opts.corners) are judged again at their worst corners as
 *    `size` judges a value (analyses/size.h): the worst-corner margin
 *    replaces the nominal one, and a survivor that does not qualify there
 *    is not feasible.
 *
 *  - Sizing (opts.parts, analyses/explore_size.h): every link of a
 *    combination takes the cheapest diode of the parts catalog rated per
 *    the rule and as strong as the template's on that link (none:
 *    rejected by the rule), and each survivor's rail capacitors are sized
 *    from the parts catalog as `size` sizes them (analyses/size.h): the
 *    smallest catalog part per rail that keeps every margin at the
 *    target, rail by rail from the top, judged at the nominal point (at
 *    the worst corners with opts.corners).  The sized design is then
 *    screened again; its figures and cost are the row's.
 *  - Yield (opts.yield_samples > 0): every feasible combination's design
 *    (sized, when sizing) sampled over its tolerances as `yield` samples a
 *    design, the cold start in every sample (explore_size.h), in the shard
 *    that judges the combination.
 *
 * A chain whose rails fail from some rail upwards (the drops of the
 * cascade add up along it) is reported as needing a second isolated
 * supply (split_at: the lowest failing rail), and the split design is
 * built and judged at its nominal point (explore_split.c): an injection
 * of the template supply's voltage into a rail, the search choosing the
 * rail (br_explore_split).  With opts.corners, the split design chosen
 * is judged at its worst corners too, as a survivor is, when every
 * criterion passes at its nominal point.  The split design stays out of
 * the ranking: the row keeps BR_EX_SPLIT and carries the split design's
 * verdict.
 *
 * Combinations are judged on worker threads (br_explore_pool), each row
 * on its own, so the rows are the same whatever the number of threads.
 *
 * Bounded: at most BR_EXPLORE_MAX combinations, each one evaluation (plus
 * one worst-corner judgement), a split one at most BR_SPLIT_TRIES more
 * (plus one worst-corner judgement); every simulation carries the stop
 * poll. */
#ifndef BR_ANALYSES_EXPLORE_H
#define BR_ANALYSES_EXPLORE_H

#include "analyses/size.h"
#include "model/catalog.h"

#define BR_EXPLORE_MAX_FSW 16 /* frequencies in one exploration */
#define BR_EXPLORE_MAX 4096   /* combinations in one exploration */

typedef enum br_explore_state {
    BR_EX_FEASIBLE = 0, /* passes the screen (and the corners when judged) */
    BR_EX_RATING,       /* no switch class or diode meets the voltage rule */
    BR_EX_FAILS,        /* a criterion fails at the nominal point */
    BR_EX_SPLIT,        /* fails because rails from some rail up fall short: needs a
                           second supply (split_at) */
    BR_EX_MARGIN,       /* passes, below the margin target */
    BR_EX_STARTUP,      /* starts later than the limit given */
    BR_EX_COST,         /* costs more than the limit given */
    BR_EX_CORNERS,      /* passes at the nominal point, not at its worst corners */
    BR_EX_UNDETERMINED, /* a criterion could not be decided */
    BR_EX_REFUSED,      /* the model refuses the design built (why: the row's note) */
    BR_EX_UNSIZED       /* sizing: no catalog capacitor keeps a rail at the target
                           (rail: stage) */
} br_explore_state;

typedef struct br_explore_row br_explore_row;

typedef struct br_explore_opts {
    const br_catalog *cat; /* switches (required), diodes, drivers */
    double vbus, vbus_max; /* nominal and highest bus voltage, V */
    int lmin, lmax;        /* level counts, 2 .. 33 */
    int nfsw;              /* switching frequencies, Hz */
    double fsw[BR_EXPLORE_MAX_FSW];
    double iload;                /* load current, A (< 0: the template's) */
    double derating;             /* fraction of a rating used (<= 0: the template's) */
    double target;               /* smallest margin, V (< 0: a quarter of the smallest
                                    UVLO hysteresis) */
    double max_startup;          /* s (HUGE_VAL: the template's limit only) */
    double max_cost;             /* currency units (HUGE_VAL: none) */
    int corners;                 /* judge survivors at their worst corners */
    int scale_caps;              /* the rail capacitors by the scaling rule (else the template's) */
    int threads;                 /* worker threads judging combinations, and of each
                                    one's corner, sizing and yield judgements (0: all) */
    const br_catalog *parts;     /* sizing: rail capacitors and link diodes from here
                                    (NULL: the template's parts, no sizing) */
    long yield_samples;          /* Monte Carlo samples per feasible combination (0: none) */
    unsigned long seed;          /* their generator's seed (default 1) */
    const br_progress *progress; /* combinations judged; stop poll */
    /* A shard (shard_n > 0): the combinations i with i % shard_n ==
     * shard_k - 1 are judged, the others get the rule only.  Merging
     * shards: `given` holds every row as the shards judged it (n of them,
     * in the order judged), and nothing is judged again. */
    int shard_k, shard_n;
    const br_explore_row *given;
    long ngiven;
} br_explore_opts;

typedef struct br_explore_row {
    int levels;
    double fsw;      /* Hz */
    int sw;          /* catalog switch */
    double need;     /* the voltage class the rule asks for, V */
    int sw_ok;       /* the switch's class meets it */
    int diode;       /* catalog diode placed where the template's falls short (-1: none) */
    int state;       /* br_explore_state */
    double cost;     /* catalog parts placed, currency units */
    double loss;     /* the supply's power in steady state, W (largest direction) */
    double margin;   /* smallest margin in volts, V (worst corners when judged) */
    double tstart;   /* start-up time, s */
    int crit, stage; /* where the margin binds, or what fails (br_crit, -1) */
    int split_at;    /* BR_EX_SPLIT: rail a second supply would feed */
    /* BR_EX_SPLIT: the split design judged (inject_rail > 0): the rail its
     * injection feeds, its state (the screen's at the nominal point, then
     * with opts.corners its worst corners' where it passes the screen's
     * criteria), its smallest margin in volts and where it binds (or what
     * fails; the worst corners' where worse), its start-up time and the
     * main supply's power (at the nominal point) */
    int inject_rail;
    int split_state;
    double split_margin, split_tstart, split_loss;
    int split_crit, split_stage;
    int split_tries;   /* split designs judged in the search */
    int split_corners; /* the split design was judged at its worst corners */
    /* BR_EX_SPLIT judged: its second supply (explore_split.c) */
    int modules;        /* isolated supply modules the catalogs list (0: none: the split
                           cost excludes the second supply) */
    int module;         /* the module chosen (br_explore_module_catalog's), -1: none */
    double inject_need; /* the current a module must carry, A (NAN: no modules) */
    double module_cost; /* the chosen module's cost (0: none) */
    double split_cost;  /* cost + module_cost */
    int module_passed;  /* cheaper modules that suit passed over: their split designs were
                           not feasible */
    int corners;        /* judged at the worst corners */
    int front;          /* on the Pareto front of the feasible rows */
    int rank;           /* 1.. among the feasible rows (0: not feasible) */
    char note[160];     /* BR_EX_REFUSED: the model's message */
    /* sizing (opts.parts) */
    int sized;                           /* the rail capacitors were sized */
    signed char cap[BR_MAX_SWITCHES];    /* parts-catalog capacitor of rail k (-1: the
                                            template's) */
    signed char ldiode[BR_MAX_SWITCHES]; /* parts-catalog diode of link k (-1: the template's) */
    int size_trials;                     /* values the sizing judged */
    /* yield (opts.yield_samples) */
    long ysamples, ypass, yfail, yundet; /* samples, and how they came out */
    double yield, ylo, yhi;              /* pass / decided (NAN: none decided), and its
                                            Clopper-Pearson 95 % interval with the undetermined
                                            samples as failures (ylo) and as passes (yhi) */
} br_explore_row;

typedef struct br_explore {
    double target; /* V */
    int corners;   /* the feasible rows were judged at their worst corners */
    double vbus, vbus_max, derating;
    int n;                /* combinations */
    br_explore_row *rows; /* n, in the order judged */
    int nfeasible, nfront;
    const br_catalog *parts;   /* opts.parts: the catalog the sizing took parts from (not
                                  owned; NULL: no sizing) */
    const br_catalog *modules; /* br_explore_module_catalog: the split's second supplies
                                  (not owned; NULL: none listed) */
    long yield_samples;        /* opts.yield_samples (0: no yield) */
    unsigned long seed;
} br_explore;

void br_explore_opts_default(br_explore_opts *o);

/* Explore around template t (an FCML design).  BR_EINPUT: a template or
 * catalog the exploration cannot use (err says why); BR_ECANCEL: stopped. */
int br_explore_run(const br_design *t, const br_explore_opts *o, br_explore **out, br_error *err);
void br_explore_free(br_explore *x);

/* The design of row r (its levels, switch, diode and frequency on
 * template t), as the exploration judged it.  BR_EINPUT when the rule
 * leaves it no switch or diode. */
int br_explore_design(const br_design *t, const br_explore_opts *o, const br_explore_row *r,
                      br_design **out, br_error *err);

/* The screen of one design d at its nominal point, as the exploration
 * judges a combination (explore.c): r's state, margin, start-up time and
 * supply power.  Its levels, switch and cost are left as they are. */
int br_explore_screen(const br_design *d, const br_explore_opts *o, double target,
                      br_explore_row *r, br_error *err);

/* Row r, which passes the screen with design d, judged at d's worst
 * corners as `size` judges a value (analyses/size.h): the worst-corner
 * margin where smaller, and BR_EX_CORNERS (BR_EX_UNDETERMINED) where d
 * does not qualify there (is undetermined there); r->corners set. */
int br_explore_corners(const br_design *d, const br_explore_opts *o, double target,
                       br_explore_row *r, br_error *err);

/* The split design of d: d with an injection into rail `rail` (1 ..
 * switches-1) of the supply's voltage (its tolerance too), or module's
 * output and limit (NULL: none), through the stage's link resistor (and
 * the module's output resistance) and its link diode, on from power-up
 * (explore_split.c).  BR_EINPUT when the rail is out of range. */
int br_explore_split_design(const br_design *d, int rail, const br_inject_spec *module,
                            br_design **out, br_error *err);

/* What a module must carry over the rails' running draw it feeds: ours,
 * a quarter more for the leakage, recovery charge and tolerances the
 * estimate leaves out. */
#define BR_MODULE_MARGIN 1.25

/* The catalog whose isolated supply modules a split takes: the parts
 * catalog's when it lists any, else the switch catalog's, else NULL. */
const br_catalog *br_explore_module_catalog(const br_explore_opts *o);

/* Dearer modules tried when the cheapest that suits does not make the
 * split design feasible. */
#define BR_MODULE_TRIES 2

/* The cheapest module of cat whose voltage tolerance holds vsupply (V)
 * and whose rated current and lowest current limit are at least need
 * (A), after module `past` in the order of cost, then of the catalog
 * (-1: from the cheapest); -1 when none does. */
int br_explore_module_choose(const br_catalog *cat, double vsupply, double need, int past);

/* Row r failed as BR_EX_SPLIT with design d: search the injection rail
 * and judge the split design (explore_split.c), with opts.corners at its
 * worst corners too. */
int br_explore_split(const br_design *d, const br_explore_opts *o, double target, br_explore_row *r,
                     br_error *err);

/* Mark the Pareto front among the feasible rows: a row is on it when no
 * other feasible row is at least as good in cost, loss (lower) and margin
 * (higher) and better in one.  Then rank the feasible rows: front first,
 * then by margin (highest first), cost, loss.  Returns the front's size. */
int br_explore_pareto(br_explore_row *rows, int n);

/* Whether shard o->shard_k of o->shard_n judges combination i (every one
 * without a shard). */
int br_explore_shard_has(const br_explore_opts *o, int i);

/* "feasible", "rating", ... */
const char *br_explore_state_name(int state);

#endif

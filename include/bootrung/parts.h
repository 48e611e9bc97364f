/* parts.h - the studies that choose and size parts: the part catalog,
 * the part pick (rail capacitors and link diodes from a catalog), the
 * sizing to a margin target, the supply window (the smallest current
 * limit and the supply voltage range) and the exploration of level
 * counts, switch classes and frequencies around a template.
 *
 * Each study is an opaque object in the style of analysis.h: create it,
 * set what it searches, optionally give it a progress hook and a stop
 * poll, run it on a design (and a catalog), read it through accessors,
 * render its reports, free it.  A run copies what it needs: the design
 * and the catalog may be freed once it returns.  Accessors return BR_OK
 * and write *out, or BR_EUSAGE (out untouched) when the object is NULL,
 * it was not run, or an index or key is out of range.  Figures are SI
 * doubles; one that does not apply is NaN.
 *
 * br_*_render appends a report in a br_format to out, exactly as the
 * command line prints or writes it; BR_EUSAGE when the study was not run
 * or does not offer that form.
 *
 * Copyright (C) 2026 the bootrung developers.  GPL-3.0-or-later. */
#ifndef BOOTRUNG_PARTS_H
#define BOOTRUNG_PARTS_H

#include "bootrung/analysis.h"
#include "bootrung/bootrung.h"

#ifdef __cplusplus
extern "C" {
#endif

/* The most worker threads a study takes (0 means one per processor). */
#define BR_STUDY_THREADS_MAX 64

/* ---- quantities with units --------------------------------------------- */

/* ---- the part catalog ------------------------------------------------- */

/* Candidate parts with what each costs and the board area it takes
 * (docs/catalog.md: our own XML). */
typedef struct br_catalog br_catalog;

/* Parse and validate the catalog at path against its embedded schema.
 * On failure *out is NULL and err says FILE:LINE: field: what is wrong. */
BR_API int br_catalog_load(const char *path, br_catalog **out, br_error *err);
/* The same from memory; name is used in messages. */
BR_API int br_catalog_load_memory(const char *buf, size_t len, const char *name, br_catalog **out,
                                  br_error *err);
BR_API void br_catalog_free(br_catalog *c);
/* The RELAX NG schema the loader enforces (NUL-terminated). */
BR_API const char *br_catalog_schema(void);

typedef enum br_catalog_role {
    BR_CATALOG_DIODE = 0,     /* link diodes */
    BR_CATALOG_CAPACITOR = 1, /* rail capacitors */
    BR_CATALOG_SWITCH = 2,    /* switches by voltage class */
    BR_CATALOG_DRIVER = 3,    /* gate drivers */
    BR_CATALOG_ROLE_COUNT
} br_catalog_role;
/* The catalog's name attribute, and the file (or name) it was read from. */
BR_API int br_catalog_name(const br_catalog *c, const char **out);
BR_API int br_catalog_path(const br_catalog *c, const char **out);
/* How many parts of a role (a br_catalog_role), and part i's id. */
BR_API int br_catalog_parts(const br_catalog *c, int role, int *out);
BR_API int br_catalog_part_id(const br_catalog *c, int role, int i, const char **out);
typedef enum br_offer_key {
    BR_OFFER_COST = 0, /* per part, in the catalog's currency unit */
    BR_OFFER_AREA,     /* board area, m2 */
    BR_OFFER_RATING,   /* the voltage rating, V: a diode's VRRM, a capacitor's rated
                          voltage, a switch's class; NaN for a driver or when not given */
    BR_OFFER_KEY_COUNT
} br_offer_key;
BR_API int br_catalog_part_value(const br_catalog *c, int role, int i, int key, double *out);

/* ---- the part pick ---------------------------------------------------- */

/* Rail capacitors and link diodes from a catalog: parts whose ratings
 * cannot carry the chain are rejected with the reason; every one-part
 * choice (one capacitor on every rail, one diode on every link) is judged
 * at its worst corners over the design's tolerances, then a greedy
 * descent looks for cheaper per-rail mixes; the passing choices with at
 * least the minimum margin are ranked by cost, area and margin, and the
 * best are checked for start-up too.  A choice that cannot be decided,
 * with nothing failing, is undetermined: never ranked, never rejected. */
typedef struct br_pick_study br_pick_study;

BR_API br_pick_study *br_pick_study_create(void);
BR_API void br_pick_study_free(br_pick_study *p);
/* The hook counts points judged of those listed so far. */
BR_API int br_pick_study_set_progress(br_pick_study *p, br_progress_hook hook, br_stop_poll stop,
                                      void *ctx);
/* Worker threads, 0 (the default: one per processor) .. BR_STUDY_THREADS_MAX. */
BR_API int br_pick_study_set_threads(br_pick_study *p, int threads);
/* Rank and verify the `top` best passing choices, 1 .. 64 (default 10). */
BR_API int br_pick_study_set_top(br_pick_study *p, int top);
/* The smallest voltage margin a ranked choice may have, V (0 .. 1e6);
 * NaN (the default): a quarter of the smallest UVLO hysteresis. */
BR_API int br_pick_study_set_min_margin(br_pick_study *p, double volts);
/* 1 (the default): check the start-up criteria of the ranked choices. */
BR_API int br_pick_study_set_startup(br_pick_study *p, int on);
/* 1 (the default): search per-rail mixes too; 0: one-part choices only. */
BR_API int br_pick_study_set_per_rail(br_pick_study *p, int on);
/* At most n Newton iterations and n plain periods per steady state
 * (1 .. 100000; 0, the default: the solver's own bound). */
BR_API int br_pick_study_set_solver_limit(br_pick_study *p, int n);
/* Pick for d from cat.  BR_ECANCEL when stopped (no results kept). */
BR_API int br_pick_study_run(br_pick_study *p, const br_design *d, const br_catalog *cat,
                             br_error *err);

/* PASS when a choice is ranked, else UNDETERMINED when a choice is
 * undetermined, else FAIL (a br_result). */
BR_API int br_pick_result(const br_pick_study *p, int *out);
/* Every choice judged (one-part choices first, then per-rail ones), and
 * the ranked ones: ranked choice r's index among them, best first. */
BR_API int br_pick_choices(const br_pick_study *p, int *out);
BR_API int br_pick_ranked(const br_pick_study *p, int *out);
BR_API int br_pick_ranked_choice(const br_pick_study *p, int r, int *out);
typedef enum br_choice_key {
    BR_CHOICE_COST = 0,  /* the catalog parts placed, currency units */
    BR_CHOICE_AREA,      /* their board area, m2 */
    BR_CHOICE_MARGIN,    /* smallest voltage margin at the worst corners, V (NaN: none
                            decided) */
    BR_CHOICE_RESULT,    /* a br_result of the criteria judged */
    BR_CHOICE_UNIFORM,   /* 1: one part on every rail and link */
    BR_CHOICE_STARTUP,   /* 1: its start-up criteria were judged too */
    BR_CHOICE_CRITERION, /* where the margin binds (br_criterion_key), -1 */
    BR_CHOICE_STAGE,     /* the binding rail or link, -1 */
    BR_CHOICE_UNSETTLED, /* corners where a steady state did not settle */
    BR_CHOICE_KEY_COUNT
} br_choice_key;
BR_API int br_pick_choice_value(const br_pick_study *p, int i, int key, double *out);
/* The catalog part (br_catalog_part_id with role BR_CATALOG_CAPACITOR
 * or BR_CATALOG_DIODE) choice i places on rail or link k (1 .. stages -
 * 1); -1: the design's own part stays. */
BR_API int br_pick_choice_part(const br_pick_study *p, int i, int role, int k, int *out);
/* Parts rejected, part j's role and catalog index, and why. */
BR_API int br_pick_rejects(const br_pick_study *p, int *out);
BR_API int br_pick_reject(const br_pick_study *p, int j, int *role, int *part, const char **why);
/* TEXT, XML or HTML. */
BR_API int br_pick_study_render(const br_pick_study *p, int format, br_text *out, br_error *err);

/* ---- the supply window ------------------------------------------------ */

/* What the chain asks of its supply, each answer judged by the whole
 * verdict (cold start included) at the design's worst corners: the
 * smallest current limit, and the lowest and the highest supply voltage.
 * Each answer names what fails just beyond it.  An undetermined corner
 * decides nothing: the search stops there and says so. */
typedef struct br_supply_study br_supply_study;

BR_API br_supply_study *br_supply_study_create(void);
BR_API void br_supply_study_free(br_supply_study *s);
/* The hook counts corners judged of an estimate. */
BR_API int br_supply_study_set_progress(br_supply_study *s, br_progress_hook hook,
                                        br_stop_poll stop, void *ctx);
BR_API int br_supply_study_set_threads(br_supply_study *s, int threads);
BR_API int br_supply_study_run(br_supply_study *s, const br_design *d, br_error *err);

/* The result at the design's own supply, every worst corner (a br_result). */
BR_API int br_supply_result(const br_supply_study *s, int *out);
enum {
    BR_SUPPLY_LIMIT = 0, /* the smallest current limit, A */
    BR_SUPPLY_VMIN = 1,  /* the lowest supply voltage, V */
    BR_SUPPLY_VMAX = 2   /* the highest, V */
};
typedef enum br_supply_answer_kind {
    BR_ANSWER_FOUND = 0,   /* passes at VALUE, fails at FAILING beyond it */
    BR_ANSWER_RANGE_END,   /* still passes at the end of the range searched */
    BR_ANSWER_NONE,        /* fails already at the value it starts from */
    BR_ANSWER_UNDETERMINED /* a value on the way could not be decided */
} br_supply_answer_kind;
typedef enum br_supply_answer_key {
    BR_SA_APPLIES = 0, /* 1: searched (else br_supply_answer_why says why) */
    BR_SA_KIND,        /* a br_supply_answer_kind */
    BR_SA_FROM,        /* the design's value, A or V */
    BR_SA_LO,          /* the range searched */
    BR_SA_HI,
    BR_SA_VALUE,          /* the furthest value that passes (NaN: none) */
    BR_SA_FAILING,        /* the nearest value failing (or undetermined) beyond it */
    BR_SA_FAIL_CRITERION, /* what fails there (br_criterion_key), -1 */
    BR_SA_FAIL_STAGE,     /* where, -1 */
    BR_SA_POINTS,         /* values judged */
    BR_SA_KEY_COUNT
} br_supply_answer_key;
BR_API int br_supply_answer(const br_supply_study *s, int answer, int key, double *out);
BR_API int br_supply_answer_why(const br_supply_study *s, int answer, const char **out);
/* TEXT, XML or HTML. */
BR_API int br_supply_study_render(const br_supply_study *s, int format, br_text *out,
                                  br_error *err);

/* ---- sizing to a margin target ---------------------------------------- */

/* Rail by rail from the top, the smallest capacitor (from a catalog, or
 * the rail's own part scaled, to 1 %) that keeps every margin in volts at
 * least the target at the worst corners, every other criterion passing;
 * then the largest link resistance (one value on every link, to 2 %); the
 * regulator headroom of the result; optionally its supply window. */
typedef struct br_size_study br_size_study;

BR_API br_size_study *br_size_study_create(void);
BR_API void br_size_study_free(br_size_study *z);
/* The hook counts values judged (the total grows). */
BR_API int br_size_study_set_progress(br_size_study *z, br_progress_hook hook, br_stop_poll stop,
                                      void *ctx);
BR_API int br_size_study_set_threads(br_size_study *z, int threads);
/* The smallest margin in volts (0 .. 1e6); NaN (the default): a quarter
 * of the smallest UVLO hysteresis. */
BR_API int br_size_study_set_target(br_size_study *z, double volts);
/* 1 (the default): size the link resistance; 0: keep the design's. */
BR_API int br_size_study_set_links(br_size_study *z, int on);
/* 1: search the supply voltage window of the result too (slow); 0 (default). */
BR_API int br_size_study_set_supply(br_size_study *z, int on);
/* 1 .. 400 (0, the default: the solver's own bound). */
BR_API int br_size_study_set_solver_limit(br_size_study *z, int n);
/* Size d; capacitors from cat (NULL: continuous values). */
BR_API int br_size_study_run(br_size_study *z, const br_design *d, const br_catalog *cat,
                             br_error *err);

/* PASS when the sized design qualifies, cold start included (a br_result). */
BR_API int br_size_result(const br_size_study *z, int *out);
typedef enum br_size_answer_kind {
    BR_SIZED_FOUND = 0,    /* qualifies; the next smaller (larger, resistance) does not */
    BR_SIZED_END,          /* the smallest value searched qualifies (largest, resistance) */
    BR_SIZED_NONE,         /* not even the largest value qualifies (smallest, resistance) */
    BR_SIZED_UNDETERMINED, /* a judgement on the way was undetermined */
    BR_SIZED_KEPT          /* not searched: nothing to size */
} br_size_answer_kind;
typedef enum br_size_key {
    BR_SZ_KIND = 0, /* a br_size_answer_kind */
    BR_SZ_FROM,     /* the design's value, F or ohm */
    BR_SZ_VALUE,    /* the answer, F or ohm (NaN unless FOUND or END) */
    BR_SZ_PART,     /* the catalog capacitor (-1: continuous, or a resistance) */
    BR_SZ_MARGIN,   /* the answer's smallest voltage margin, V */
    BR_SZ_TRIALS,   /* values judged */
    BR_SZ_KEY_COUNT
} br_size_key;
/* Rail k's capacitor (1 .. stages - 1), or the link resistance (k = 0;
 * BR_EUSAGE when it was not sized). */
BR_API int br_size_answer_get(const br_size_study *z, int k, int key, double *out);
typedef enum br_size_figure {
    BR_SIZE_TARGET = 0,  /* V */
    BR_SIZE_MARGIN,      /* the result's smallest voltage margin, V */
    BR_SIZE_HEADROOM,    /* its rails' smallest headroom over what the drivers need, V */
    BR_SIZE_REG_VOUT,    /* the highest regulator output, V (0: no regulator) */
    BR_SIZE_REG_DROPOUT, /* the largest regulator dropout, V */
    BR_SIZE_POINTS,      /* corners judged in all */
    BR_SIZE_FIGURE_COUNT
} br_size_figure;
BR_API int br_size_get(const br_size_study *z, int key, double *out);
/* The sized design (owned by the study; it may be analysed further). */
BR_API int br_size_design(const br_size_study *z, const br_design **out);
/* The sized design as a design file, with a comment saying what was
 * sized and to what target. */
BR_API int br_size_design_file(const br_size_study *z, br_text *out, br_error *err);
/* TEXT only. */
BR_API int br_size_study_render(const br_size_study *z, int format, br_text *out, br_error *err);

/* ---- the exploration -------------------------------------------------- */

/* Level counts, switch voltage classes and switching frequencies around
 * a template (an FCML leg that gives the supply, drivers, regulators,
 * timing, start-up pattern, link diodes and rail capacitors).  For each
 * combination the voltage rule of the trade first (each of the N - 1
 * series switches of a side, and each link diode, blocks the highest bus
 * voltage over N - 1, a part used up to the derating), then the chain's
 * cold start and steady state at the nominal point and the verdict;
 * optionally the survivors at their worst corners.  The feasible set is
 * ranked and its Pareto front of cost, supply power and margin marked. */
typedef struct br_explore_study br_explore_study;

#define BR_EXPLORE_LEVELS_MAX 33 /* level counts 2 .. this */
#define BR_EXPLORE_FSW_MAX 16    /* frequencies in one exploration */

BR_API br_explore_study *br_explore_study_create(void);
BR_API void br_explore_study_free(br_explore_study *x);
/* The hook counts combinations judged. */
BR_API int br_explore_study_set_progress(br_explore_study *x, br_progress_hook hook,
                                         br_stop_poll stop, void *ctx);
/* Worker threads, across combinations and within each one's corner,
 * sizing and yield judgements (0, the default: one per processor). */
BR_API int br_explore_study_set_threads(br_explore_study *x, int threads);
/* Required: the nominal and the highest bus voltage (0 < vbus <= vmax <
 * 1e6 V), the level counts (2 <= lo <= hi <= BR_EXPLORE_LEVELS_MAX), the
 * frequencies (1 .. BR_EXPLORE_FSW_MAX of them, each 0 < f < 1e9 Hz). */
BR_API int br_explore_study_set_bus(br_explore_study *x, double vbus, double vmax);
BR_API int br_explore_study_set_levels(br_explore_study *x, int lo, int hi);
BR_API int br_explore_study_set_frequencies(br_explore_study *x, const double *fsw, int n);
/* Optional, NaN for the default: the load current (A, >= 0; the
 * template's), the fraction of a voltage rating used (0 < f <= 1; the
 * template's diode derating), the margin target (V, >= 0; a quarter of
 * the smallest UVLO hysteresis), the longest start-up (s, >= 0; the
 * template's limit only) and the highest cost of the catalog parts placed
 * (>= 0; none). */
typedef enum br_explore_limit {
    BR_EXPLORE_LOAD_CURRENT = 0,
    BR_EXPLORE_DERATING,
    BR_EXPLORE_TARGET,
    BR_EXPLORE_MAX_STARTUP,
    BR_EXPLORE_MAX_COST,
    BR_EXPLORE_LIMIT_COUNT
} br_explore_limit;
BR_API int br_explore_study_set(br_explore_study *x, int which, double value);
/* 1: judge the survivors at their worst corners too (slow); 0 (default). */
BR_API int br_explore_study_set_corners(br_explore_study *x, int on);
/* 1: rail capacitors scaled by the rails each carries; 0 (default): the
 * template's. */
BR_API int br_explore_study_set_scale_caps(br_explore_study *x, int on);
/* Sizing from a parts catalog (copied; NULL, the default: none): every
 * link takes the cheapest diode of parts that the voltage rule allows and
 * that is as strong in current as the template's, and each survivor's
 * rail capacitors are sized from parts as br_size_study sizes them (rail
 * by rail from the top, the smallest that keeps every margin in volts at
 * the target; at the worst corners when judged); the sized design is
 * judged again and its parts counted in its cost. */
BR_API int br_explore_study_set_parts(br_explore_study *x, const br_catalog *parts);
/* Monte Carlo yield of every feasible combination's design: samples over
 * its tolerances (0, the default: none; at most BR_EXPLORE_YIELD_MAX),
 * start-up criteria included, each combination with the same seed (<=
 * 0xffffffff; default 1). */
#define BR_EXPLORE_YIELD_MAX 1000000L
BR_API int br_explore_study_set_yield(br_explore_study *x, long samples, unsigned long seed);
/* Judge shard k of n only (every n-th combination from the k-th, 1 <= k
 * <= n; n = 0: all): the others get the voltage rule only, and the study
 * renders no report (br_explore_records gives what it judged). */
BR_API int br_explore_study_set_shard(br_explore_study *x, int k, int n);
/* Merging shards: the records of every combination as the shards judged
 * them (n records of br_explore_record_size() bytes, kept by pointer
 * until the run); nothing is judged again.  NULL: judge. */
BR_API int br_explore_study_set_given(br_explore_study *x, const void *records, long n,
                                      size_t size);
BR_API size_t br_explore_record_size(void);
/* Explore around template t with the switches, drivers and diodes of cat.
 * BR_EINPUT: a template or catalog the exploration cannot use (err says
 * why); BR_ECANCEL: stopped. */
BR_API int br_explore_study_run(br_explore_study *x, const br_design *t, const br_catalog *cat,
                                br_error *err);

/* PASS: some combination is feasible; FAIL: none is and every one was
 * decided; UNDETERMINED: none is and some could not be decided. */
BR_API int br_explore_result(const br_explore_study *x, int *out);
/* The combinations, in the order judged. */
BR_API int br_explore_combinations(const br_explore_study *x, int *out);
typedef enum br_combination_state {
    BR_COMBO_FEASIBLE = 0, /* passes the screen (and the corners when judged) */
    BR_COMBO_RATING,       /* no switch class or diode meets the voltage rule */
    BR_COMBO_FAILS,        /* a criterion fails at the nominal point */
    BR_COMBO_SPLIT,        /* rails from some rail up fall short: needs a second supply */
    BR_COMBO_MARGIN,       /* passes, below the margin target */
    BR_COMBO_STARTUP,      /* starts later than the limit given */
    BR_COMBO_COST,         /* costs more than the limit given */
    BR_COMBO_CORNERS,      /* passes at the nominal point, not at its worst corners */
    BR_COMBO_UNDETERMINED, /* a criterion could not be decided */
    BR_COMBO_REFUSED       /* the model refuses the design built (br_explore_note) */
} br_combination_state;
typedef enum br_explore_key {
    BR_XV_LEVELS = 0,  /* the level count */
    BR_XV_FSW,         /* Hz */
    BR_XV_SWITCH,      /* the catalog switch (BR_CATALOG_SWITCH) */
    BR_XV_DIODE,       /* the catalog diode placed where the template's falls short, -1 */
    BR_XV_NEED,        /* the voltage class the rule asks for, V */
    BR_XV_STATE,       /* a br_combination_state */
    BR_XV_COST,        /* the catalog parts placed */
    BR_XV_LOSS,        /* the supply's power in steady state, W */
    BR_XV_MARGIN,      /* smallest margin in volts, V (worst corners when judged) */
    BR_XV_STARTUP,     /* start-up time, s */
    BR_XV_CRITERION,   /* where the margin binds or what fails (br_criterion_key), -1 */
    BR_XV_STAGE,       /* the rail or link, -1 */
    BR_XV_SPLIT_AT,    /* BR_COMBO_SPLIT: the rail a second supply would feed */
    BR_XV_FRONT,       /* 1: on the Pareto front */
    BR_XV_RANK,        /* 1.. among the feasible (0: not feasible) */
    BR_XV_INJECT_RAIL, /* BR_COMBO_SPLIT: the rail the judged split design's
                          second supply feeds (0: none judged) */
    BR_XV_KEY_COUNT
} br_explore_key;
BR_API int br_explore_value(const br_explore_study *x, int i, int key, double *out);
/* Why the model refused combination i ("" otherwise). */
BR_API int br_explore_note(const br_explore_study *x, int i, const char **out);
/* Combination i's design file (its levels, switch, diode and frequency
 * on the template) with a comment saying what was explored and where it
 * stands.  BR_EINPUT when the rule leaves it no switch or diode. */
BR_API int br_explore_design_file(const br_explore_study *x, int i, br_text *out, br_error *err);
/* The split design's file of combination i (BR_XV_INJECT_RAIL > 0: the
 * design with a second isolated supply injected at that rail) with a
 * comment saying what was explored and how the split design stands;
 * BR_EUSAGE for any other combination. */
BR_API int br_explore_split_file(const br_explore_study *x, int i, br_text *out, br_error *err);
/* The records of a sharded run (every combination's, as judged or as the
 * rule left it; n of *size bytes) and whether the shard judged record i. */
BR_API int br_explore_records(const br_explore_study *x, const void **records, size_t *size,
                              long *n);
BR_API int br_explore_judged(const br_explore_study *x, int i, int *out);
/* TEXT (the report), CSV (every combination) or SVG (margin and cost
 * against level count); BR_EUSAGE for a shard. */
BR_API int br_explore_study_render(const br_explore_study *x, int format, br_text *out,
                                   br_error *err);

#ifdef __cplusplus
}
#endif
#endif

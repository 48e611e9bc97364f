/* pick.h - choosing rail capacitors and link diodes from a catalog.
 *
 * A choice puts a catalog capacitor on every rail (k >= 1) and a catalog
 * diode on every link; a role the catalog offers no part for keeps the
 * design's own parts.  The search:
 *  1. screens every part on its ratings: a capacitor rated below the
 *     supply's maximum, or a diode whose derated rating is below what the
 *     links block (with the edge overshoot, at the highest bus voltage),
 *     is rejected with the reason, and never placed; a part without the
 *     rating is too;
 *  2. judges every one-part choice (one capacitor on all rails, one diode
 *     on all links, every combination) at its worst corners: the nominal
 *     point, the one-at-a-time points of the new parts' own tolerances,
 *     and for each steady-state criterion the corner its sensitivities
 *     point to (those of the design's other tolerances come from the
 *     design's own one-at-a-time points);
 *     A part none of whose one-part choices passes, all of them failing,
 *     is listed as failing on its own (as the only part of its kind):
 *     a per-rail mix may still place it where it passes;
 *  3. per-rail choices by a greedy descent from the best qualifying
 *     one-part choice: rail by rail from the top (which carries the least
 *     charge), each takes the cheapest catalog capacitor that keeps the
 *     chain qualifying; then link by link the same with the diodes;
 *  4. ranks the qualifying choices (passing with at least the minimum
 *     margin) by cost, then area, then margin (the smallest voltage margin
 *     at the worst corners, and the criterion that sets it), and checks
 *     the start-up criteria (a cold start at the nominal point and at the
 *     start-up criteria's predicted worst corners) on the best, in rank
 *     order, until `top` of them pass everything.
 * A choice where something could not be decided (a steady state the
 * solver did not settle, a point it could not judge) and nothing fails is
 * undetermined: never ranked, never counted as failing.  Choices are
 * judged in parallel, one per worker thread. */
#ifndef BR_ANALYSES_PICK_H
#define BR_ANALYSES_PICK_H

#include "analyses/spread.h"
#include "model/catalog.h"

#define BR_PICK_WHY 200

typedef struct br_pick_opts {
    int threads;                 /* worker threads; 0: one per online processor */
    int top;                     /* choices to rank and verify (default 10) */
    int startup;                 /* check the start-up criteria of the ranked choices (1) */
    int per_rail;                /* search per-rail choices too (1) */
    double min_margin;           /* V: the smallest voltage margin a ranked choice may have;
                                    < 0: the default, a quarter of the smallest UVLO
                                    hysteresis of the design's drivers */
    int solver_limit;            /* br_spread_opts.solver_limit (0: none) */
    const br_progress *progress; /* work done of the work listed so far (the base design's
                                    points, then choices, each weighing as many points as
                                    the base design has parameters plus one; the total
                                    grows as the search lists them); NULL: none */
} br_pick_opts;

typedef struct br_choice {
    short cap[BR_MAX_SWITCHES];   /* catalog capacitor on rail k (k >= 1), -1: the design's own */
    short diode[BR_MAX_SWITCHES]; /* catalog diode on link k (k >= 1), -1: the design's own */
    int uniform;                  /* one part on every rail and link */
    double cost;                  /* sum over the catalog parts placed */
    double area;                  /* mm2, the same */
    int status;                   /* br_status of judging it (BR_OK: the rest is meaningful;
                                     otherwise the choice is undetermined) */
    int pass;                     /* every criterion judged passes at its worst corners */
    int outcome;                  /* br_outcome of the criteria judged so far */
    int startup_checked;          /* the start-up criteria were judged too */
    double margin;                /* smallest voltage margin at the worst corners, V
                                     (HUGE_VAL: none decided) */
    int crit, stage, dir;         /* where it binds (br_crit, stage, br_dir_index) */
    int fail_crit;                /* the first failing criterion, -1 when none */
    br_pt_row fail_row;           /* its row */
    int undet_crit;               /* the first criterion not decided at a corner, -1: none */
    int unsettled;                /* corners where a steady state did not settle */
    int unjudged;                 /* corners that could not be judged at all */
    long points;                  /* points judged for it */
} br_choice;

typedef struct br_reject {
    int is_diode; /* 0: a capacitor */
    int part;     /* index in the catalog */
    int alone;    /* 0: rejected on its ratings, never placed; 1: fails as the only part
                     of its kind (every one-part choice with it fails), per-rail mixes
                     may still place it */
    char why[BR_PICK_WHY];
} br_reject;

typedef struct br_pick {
    const br_catalog *cat;      /* not owned */
    br_spread *base;            /* the design's tolerances and nominal point (owned) */
    int pick_caps, pick_diodes; /* the roles the catalog fills */
    int nrej;
    br_reject rej[2 * BR_MAX_PARTS];
    int nchoice;
    br_choice *choice; /* every choice judged: one-part ones first, then per-rail ones */
    int nuniform;      /* of which one-part choices */
    int greedy;        /* index of the per-rail choice, -1 when none was found */
    int greedy_tries;  /* choices the greedy descent judged */
    int nranked;
    int ranked[64]; /* qualifying choices that pass start-up too, best first (at most top) */
    int top;
    long points;       /* points judged in all */
    double min_margin; /* V: the minimum margin ranking asks for */
    double hysteresis; /* V: the smallest UVLO hysteresis of the design's drivers */
    int min_default;   /* min_margin is the default (a quarter of the hysteresis) */
    int nthin;         /* passing choices below the minimum margin (not ranked) */
    int thin;          /* the best of them (index, -1: none) */
    int nundet;        /* undetermined choices */
    int undet[8];      /* the cheapest of them (indexes) */
    int outcome;       /* br_outcome: pass when a choice is ranked, else undetermined
                          when a choice is undetermined, else fail */
} br_pick;

void br_pick_opts_default(br_pick_opts *o);

/* Search design d (which must outlive the result) with catalog cat.
 * BR_ECANCEL when o->progress asks to stop (nothing is returned). */
int br_pick_run(const br_design *d, const br_catalog *cat, const br_pick_opts *o, br_pick **out,
                br_error *err);
void br_pick_free(br_pick *p);

/* The design with choice ch placed (a new design the caller frees). */
int br_pick_apply(const br_design *d, const br_catalog *cat, const br_choice *ch, br_design **out,
                  br_error *err);

#endif

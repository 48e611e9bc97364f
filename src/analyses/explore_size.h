/* explore_size.h - what the exploration (explore.h) does with a parts
 * catalog and with the yield option: the link diodes of each combination
 * from the catalog by the rule, the rail capacitors of each survivor
 * sized from it, what they cost, and each feasible combination's Monte
 * Carlo yield.
 *
 *  - Link diodes: link k of the new chain takes the cheapest catalog diode
 *    whose VRRM meets the rule (the highest bus voltage over N - 1, over
 *    the derating) and that is at least as strong (br_diode_as_strong) as
 *    the template's diode on that link; a link none fits
 *    rejects the combination by the rule, before any simulation.
 *  - Rail capacitors: `size`'s search (analyses/size.h) on the survivor's
 *    design, capacitors only (the link resistors stay the template's):
 *    rail by rail from the top, the smallest catalog capacitor rated for
 *    the supply's highest voltage that keeps every criterion passing and
 *    every margin in volts at the target, the next smaller one judged and
 *    failing.  Every value is judged at the nominal point (the screen's
 *    point: the design's and the catalog parts' tolerances set aside), or
 *    at the worst corners when the exploration judges corners.
 *  - Yield: the design sampled over its tolerances with `yield`'s
 *    machinery (analyses/yield.h): the given seed, every criterion judged
 *    in every sample (the cold start included, as the screen judges),
 *    undetermined samples counted apart and the Clopper-Pearson interval
 *    bounding what they could have been.  Every feasible combination
 *    gets one, not only the front: a shard knows its own combinations,
 *    not the front, which only the merged rows give. */
#ifndef BR_ANALYSES_EXPLORE_SIZE_H
#define BR_ANALYSES_EXPLORE_SIZE_H

#include "analyses/explore.h"
#include "analyses/workpool.h"

/* A catalog diode c is at least as strong as part p when none of its
 * current ratings is lower (a rating p does not give asks nothing) and,
 * when p has a thermal model (rth), c has one too with a junction limit
 * at least p's: so the sized chain is judged on everything the template's
 * was. */
int br_diode_as_strong(const br_diode_part *c, const br_diode_part *p);

/* Whether o->parts can size template t's rails: some capacitor rated for
 * the supply's highest voltage (BR_EINPUT, err says why, when not). */
int br_explore_size_check(const br_design *t, const br_explore_opts *o, br_error *err);

/* The rule's link diodes of row r (levels, switch and need set) from
 * o->parts into r->ldiode; BR_EX_RATING when a link has none.  The row's
 * capacitors are cleared (the template's).  BR_ENOMEM, BR_EINPUT from
 * building its design. */
int br_explore_size_rule(const br_design *t, const br_explore_opts *o, br_explore_row *r,
                         br_error *err);

/* The parts-catalog diodes and capacitors of r placed on design d (its n
 * stages built). */
int br_explore_size_place(br_design *d, const br_explore_opts *o, const br_explore_row *r,
                          br_error *err);

/* What the parts-catalog parts of r cost (n stages). */
double br_explore_size_cost(const br_explore_opts *o, const br_explore_row *r, int n);

/* Size the rail capacitors of d (the design of row r, which passed the
 * screen) at target: r->cap, r->sized, r->size_trials, and the state
 * BR_EX_UNSIZED (r->stage: the highest rail no capacitor serves) or
 * BR_EX_UNDETERMINED when a rail's search ends so.  *final: the sized
 * design judged whole at the worst corners (o->corners; else at the
 * nominal point).  BR_ECANCEL, BR_ENOMEM. */
int br_explore_size_caps(const br_design *d, const br_explore_opts *o, double target,
                         br_explore_row *r, br_size_verdict *final, br_error *err);

/* The Monte Carlo yield of d (row r's design) into r: o->yield_samples
 * samples from o->seed, judged as `yield --startup` judges them (every
 * criterion, the cold start included).  BR_ECANCEL, BR_ENOMEM. */
int br_explore_yield(const br_design *d, const br_explore_opts *o, br_explore_row *r,
                     br_error *err);

/* Judge rows 0..n-1 with judge(ctx, i, err) on `threads` worker threads
 * (0: one per processor), each row once, taking rows from a shared
 * counter: every row's result depends on the row alone, so any number of
 * threads gives the same rows.  The meter's hook hears of every row done
 * (n in all), and a stop ends the run with BR_ECANCEL; the first error a
 * row returns ends it too. */
int br_explore_pool(int n, int threads, br_work_fn judge, void *ctx, const br_progress *progress,
                    br_error *err);

#endif

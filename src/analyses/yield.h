/* yield.h - Monte Carlo yield over the tolerance distributions.
 *
 * Each sample draws every toleranced parameter from its distribution:
 * uniform between its limits, or normal about the nominal with the limits
 * at +-nsig sigma (each side scaled to its own limit when they are not
 * symmetric), truncated at the limits by drawing again.  The draws come
 * from one GSL Mersenne Twister seeded with the seed, sample after sample,
 * before any sample is judged: sample i is the same whatever the number
 * of samples after it and whatever the number of threads that judge them.
 *
 * A sample passes when every criterion that applies passes (spread.h
 * judges it; the start-up criteria only when the cold start is asked
 * for), fails when one fails, and is undetermined when none fails but
 * one could not be decided (a steady state the solver did not settle, a
 * sample it could not judge at all).  The yield comes with its exact
 * (Clopper-Pearson) confidence interval.  Undetermined samples are
 * unknowns, not failures: the point estimate is the share of the decided
 * samples that pass, the lower bound counts every undetermined sample as
 * failing and the upper bound every one as passing, so the interval
 * covers whatever they would have been.  Per criterion with a margin,
 * quantiles of its margin over the samples that decide it and Spearman's
 * rank correlation of each parameter with that margin say how close the
 * margins come and which parameters move them. */
#ifndef BR_ANALYSES_YIELD_H
#define BR_ANALYSES_YIELD_H

#include "analyses/spread.h"

#define BR_YIELD_NQ 5 /* quantiles reported per criterion */

/* The quantiles reported: minimum, 0.1 %, 1 %, 10 %, median. */
extern const double br_yield_quantiles[BR_YIELD_NQ];

typedef struct br_yield_opts {
    long samples;                /* number of samples (default 1000) */
    unsigned long seed;          /* generator seed (default 1) */
    int threads;                 /* 0: one per online processor */
    int startup;                 /* judge the start-up criteria (a cold start per sample) */
    double accept;               /* V: steady states within this of periodic (default 1 mV) */
    int solver_limit;            /* br_spread_opts.solver_limit (0: none) */
    const br_progress *progress; /* points judged (nominal, one-at-a-time, samples) of the
                                    total expected; NULL: none; see core/progress.h */
    /* A shard (shard_n > 0): only the samples i with i % shard_n ==
     * shard_k - 1 are judged (br_yield_shard_has), the others left zero,
     * and no statistics are taken.  Every shard draws every sample. */
    int shard_k, shard_n;
    /* Merging shards: the samples' points as judged (samples of them);
     * the nominal and one-at-a-time points are judged again, not the
     * samples (NULL: judge them). */
    const br_pt *given;
} br_yield_opts;

typedef struct br_yield_crit {
    int applies;            /* decided in at least one sample */
    long judged;            /* samples where it applies and is decided */
    long fails;             /* samples where it fails */
    long warns;             /* samples where it passes with a warning */
    long undetermined;      /* samples where it could not be decided */
    int has_margin;         /* a margin criterion (else a status: no quantiles, no rho) */
    double q[BR_YIELD_NQ];  /* margin quantiles over the deciding samples, in the criterion's
                               unit (NAN without a margin) */
    double rho[BR_TOL_MAX]; /* Spearman's rho of each parameter with the margin (NAN: undefined) */
} br_yield_crit;

typedef struct br_yield {
    br_spread *s; /* tolerances and nominal point (owned) */
    long n;       /* samples */
    unsigned long seed;
    int startup;       /* the start-up criteria were judged */
    double accept;     /* V */
    double *values;    /* n rows of s->tl.n sampled values */
    br_pt *pts;        /* n judged samples */
    long pass;         /* samples that pass */
    long fail;         /* samples where a criterion fails */
    long undetermined; /* samples that neither pass nor fail */
    long unsettled;    /* of those, samples where a steady state did not settle */
    long unjudged;     /* of those, samples that could not be judged at all */
    double yield;      /* pass / (pass + fail), the decided samples (NAN when none is) */
    double lo, hi;     /* exact 95 % confidence interval of the yield: lo as if every
                          undetermined sample failed, hi as if every one passed */
    br_yield_crit c[BR_CRIT_COUNT];
} br_yield;

void br_yield_opts_default(br_yield_opts *o);

/* Whether shard o->shard_k of o->shard_n judges sample i (every sample
 * without a shard). */
int br_yield_shard_has(const br_yield_opts *o, long i);

/* The verdict on y: without a minimum yield (min_yield < 0: BR_MIN_YIELD_NONE), fail when a
 * sample fails, else undetermined when one is undetermined, else pass.
 * With one, pass when the lower bound reaches it even if every
 * undetermined sample failed, fail when it does not even if every one
 * passed, else undetermined.  A br_outcome. */
int br_yield_outcome(const br_yield *y, double min_yield);

/* Sample and judge design d (which must outlive the result).  BR_ECANCEL
 * when o->progress asks to stop (the workers stop after their current
 * sample; nothing is returned). */
int br_yield_run(const br_design *d, const br_yield_opts *o, br_yield **out, br_error *err);
void br_yield_free(br_yield *y);

/* The n x k sampled values of parameters tl from seed (into v). */
int br_yield_sample(const br_tol_list *tl, unsigned long seed, long n, double *v, br_error *err);

/* Exact two-sided confidence interval of a proportion, x successes in n
 * trials, at confidence conf (0.95): C. J. Clopper and E. S. Pearson,
 * Biometrika 26(4), 1934, through the beta distribution's quantiles. */
void br_clopper_pearson(long x, long n, double conf, double *lo, double *hi);

/* Ranks 1..n of v (ties share their average rank).  BR_ENOMEM when the
 * scratch cannot be allocated. */
int br_rank(const double *v, long n, double *rank);

/* Pearson's correlation of a and b; NAN when either does not vary. */
double br_pearson(const double *a, const double *b, long n);

/* Spearman's rank correlation: Pearson's on the ranks (C. Spearman,
 * American Journal of Psychology 15(1), 1904).  NAN when either does not
 * vary or memory runs out. */
double br_spearman(const double *a, const double *b, long n);

#endif

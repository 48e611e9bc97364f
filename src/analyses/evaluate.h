/* evaluate.h - the main job on one chain: cold start, the periodic steady
 * state of every current direction the design asks for, their figures and
 * the verdict.  What `analyze` prints, and what corner, yield and part
 * searches repeat at each point they try. */
#ifndef BR_ANALYSES_EVALUATE_H
#define BR_ANALYSES_EVALUATE_H

#include "analyses/figures.h"

typedef struct br_evaluation {
    int have_startup; /* the cold start was simulated */
    br_startup su;
    int ndir;    /* directions analysed (1 or 2) */
    int dirs[2]; /* br_dir_index of each */
    br_steady ss[2];
    br_steady_figs figs[2]; /* figs[i].ss points to ss[i]: do not copy by value */
    br_verdict v;
} br_evaluation;

/* Evaluate c; with_startup = 0 skips the cold start (its verdict rows are
 * then "not applicable").  guess/jac warm starts as in br_steady_opts may
 * be passed through opts (NULL for defaults). */
int br_evaluate(const br_chain *c, int with_startup, const br_steady_opts *opts, br_evaluation *out,
                br_error *err);

/* Smallest margin over the rows that apply, in the unit of its row, and
 * that row (a br_crit), for searches that need one number. */
double br_evaluation_worst(const br_evaluation *e, int *crit);

#endif

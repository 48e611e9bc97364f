/* evaluate.c - cold start, steady states and verdict of one chain. */
#include "analyses/evaluate.h"

#include <math.h>
#include <string.h>

int br_evaluate(const br_chain *c, int with_startup, const br_steady_opts *opts, br_evaluation *out,
                br_error *err)
{
    memset(out, 0, sizeof *out);
    int rc = BR_OK;
    if (with_startup) {
        rc = br_startup_run(c, NULL, &out->su, err);
        out->have_startup = rc == BR_OK;
    }
    out->ndir = br_design_directions(c, out->dirs);
    for (int i = 0; rc == BR_OK && i < out->ndir; i++) {
        rc = br_steady_solve(c, out->dirs[i], opts, &out->ss[i], err);
        if (rc == BR_OK)
            br_steady_figures(c, &out->ss[i], &out->figs[i]);
    }
    if (rc == BR_OK)
        br_verdict_make(c, out->have_startup ? &out->su : NULL, out->figs, out->ndir, &out->v);
    return rc;
}

double br_evaluation_worst(const br_evaluation *e, int *crit)
{
    double worst = HUGE_VAL;
    int which = -1;
    for (int i = 0; i < BR_CRIT_COUNT; i++) {
        const br_verdict_row *r = &e->v.row[i];
        if (!r->applies)
            continue;
        /* a failed row without a negative margin (a steady state that
         * does not hold) still counts as failing */
        double m = !r->pass && !(r->margin < 0) ? -HUGE_VAL : r->margin;
        if (m < worst) {
            worst = m;
            which = i;
        }
    }
    if (crit)
        *crit = which;
    return worst;
}

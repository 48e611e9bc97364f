/* bench_worstcase.c - speed of corners, yield and pick on the 11-link
 * example.  Run on demand:
 *   make bench_worstcase && ./tests/bench_worstcase [DESIGN] [CATALOG] [REPS] [SAMPLES]
 * Prints medians (wall clock and processor time) over REPS runs (default
 * 3) with every online processor; the machines are shared and noisy. */
#include "analyses/corners.h"
#include "analyses/pick.h"
#include "analyses/yield.h"
#include "bootrung/bootrung.h"

#include "benchkit.h"

#include <gsl/gsl_errno.h>
#include <stdio.h>
#include <stdlib.h>
#include <time.h>

#define MAX_REPS 16

typedef struct job {
    const br_design *d;
    const br_catalog *cat;
    long samples;
    char what[160]; /* a line about the last run */
} job;

static int run_corners(job *j, br_error *err)
{
    br_corners *k;
    int rc = br_corners_run(j->d, NULL, &k, err);
    if (rc == BR_OK)
        snprintf(j->what, sizeof j->what, "%d parameters, %ld + %ld corners, %ld points, %s",
                 k->s->tl.n, k->steady_points, k->startup_points, k->s->points,
                 k->all_pass ? "pass" : "FAIL");
    br_corners_free(k);
    return rc;
}

static int run_yield(job *j, br_error *err)
{
    br_yield_opts o;
    br_yield_opts_default(&o);
    o.samples = j->samples;
    br_yield *y;
    int rc = br_yield_run(j->d, &o, &y, err);
    if (rc == BR_OK)
        snprintf(j->what, sizeof j->what,
                 "%ld samples, yield %.4f, %.2f periods a sample, %ld of %ld steady states "
                 "from the prediction",
                 y->n, y->yield, (double)y->s->periods / (double)y->n, y->s->fast,
                 y->n * y->s->ndir);
    br_yield_free(y);
    return rc;
}

static int run_pick(job *j, br_error *err)
{
    br_pick *p;
    int rc = br_pick_run(j->d, j->cat, NULL, &p, err);
    if (rc == BR_OK)
        snprintf(j->what, sizeof j->what,
                 "%d one-part choices, %d per-rail tries, %d ranked, %ld points", p->nuniform,
                 p->greedy_tries, p->nranked, p->points);
    br_pick_free(p);
    return rc;
}

static int bench(const char *name, int (*fn)(job *, br_error *), job *j, int reps)
{
    double tw[MAX_REPS], tc[MAX_REPS];
    char buf[1024];
    br_error err;
    for (int r = 0; r < reps; r++) {
        double w0 = br_bench_wall(), c0 = br_bench_cpu();
        if (fn(j, &err) != BR_OK) {
            fprintf(stderr, "bench: %s: %s\n", name, br_error_format(&err, buf, sizeof buf));
            return 2;
        }
        tw[r] = br_bench_wall() - w0;
        tc[r] = br_bench_cpu() - c0;
    }
    printf("%-8s median %.2f s wall, %.2f s processor (%d runs): %s\n", name,
           br_bench_median(tw, reps), br_bench_median(tc, reps), reps, j->what);
    return 0;
}

int main(int argc, char **argv)
{
    const char *path = argc > 1 ? argv[1] : BR_SOURCE_DIR "/examples/leg-7level.xml";
    const char *catp = argc > 2 ? argv[2] : BR_SOURCE_DIR "/examples/parts/catalog.xml";
    int reps = argc > 3 ? atoi(argv[3]) : 3;
    job j = {.samples = argc > 4 ? atol(argv[4]) : 10000};
    br_design *d;
    br_catalog *cat;
    br_error err;
    char buf[1024];
    gsl_set_error_handler_off();
    reps = reps < 1 ? 1 : reps > MAX_REPS ? MAX_REPS : reps;
    if (br_design_load(path, &d, &err) != BR_OK || br_catalog_load(catp, &cat, &err) != BR_OK) {
        fprintf(stderr, "bench: %s\n", br_error_format(&err, buf, sizeof buf));
        return 2;
    }
    j.d = d;
    j.cat = cat;
    printf("design %s, catalog %s (%d parts), %d processors\n", path, catp,
           cat->ncaps + cat->ndiodes, br_cpu_count());
    int rc = bench("corners", run_corners, &j, reps);
    rc |= bench("yield", run_yield, &j, reps);
    rc |= bench("pick", run_pick, &j, reps);
    br_catalog_free(cat);
    br_design_free(d);
    return rc;
}

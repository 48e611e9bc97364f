/* bench_explore.c - speed of `explore` around the 7-level example: levels
 * 3 to 9, the three switch classes of examples/parts/switches.xml, five
 * frequencies (60, 90, 120, 150 and 180 kHz) on its 1.1 kV bus, the link
 * diodes and each survivor's rail capacitors sized from
 * examples/parts/catalog.xml (at the nominal point).  Run on demand: make
 * bench_explore && ./bench_explore [RUNS] [DESIGN] [YIELD].  Prints the
 * median wall and CPU time over the runs (the machines are shared and
 * noisy), the time without sizing for comparison, and one run sized with
 * a yield of YIELD samples (default 2; 0: none) per feasible combination.
 * Target: under 60 s on two cores for the sized run. */
#include "analyses/explore.h"
#include "bootrung/bootrung.h"
#include "model/catalog.h"

#include "benchkit.h"

#include <gsl/gsl_errno.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#define MAX_RUNS 16

/* Explore runs times and print the medians. */
static int timed(const br_explore_opts *o, const br_design *d, int runs, const char *what,
                 br_error *err)
{
    double tw[MAX_RUNS], tc[MAX_RUNS];
    int n = 0, feasible = 0, simulated = 0, trials = 0;
    for (int r = 0; r < runs; r++) {
        br_explore *x;
        double t0 = br_bench_wall(), c0 = br_bench_cpu();
        int rc = br_explore_run(d, o, &x, err);
        if (rc != BR_OK)
            return rc;
        tw[r] = br_bench_wall() - t0;
        tc[r] = br_bench_cpu() - c0;
        n = x->n;
        feasible = x->nfeasible;
        simulated = trials = 0;
        for (int i = 0; i < x->n; i++) {
            simulated += x->rows[i].state != BR_EX_RATING;
            trials += x->rows[i].size_trials;
        }
        br_explore_free(x);
    }
    printf("%s: %d combinations, %d simulated, %d feasible, %d capacitor values judged\n", what, n,
           simulated, feasible, trials);
    printf("  median of %d runs: %.2f s wall, %.2f s CPU%s\n", runs, br_bench_median(tw, runs),
           br_bench_median(tc, runs),
           strcmp(what, "sized") == 0 ? " (target: 60 s on two cores)" : "");
    fflush(stdout);
    return BR_OK;
}

int main(int argc, char **argv)
{
    int runs = argc > 1 ? atoi(argv[1]) : 3;
    const char *path = argc > 2 ? argv[2] : BR_SOURCE_DIR "/examples/leg-7level.xml";
    runs = runs < 1 ? 1 : runs > MAX_RUNS ? MAX_RUNS : runs;
    gsl_set_error_handler_off();
    br_design *d;
    br_catalog *cat;
    br_error err;
    br_catalog *parts;
    if (br_design_load(path, &d, &err) != BR_OK ||
        br_catalog_load(BR_SOURCE_DIR "/examples/parts/switches.xml", &cat, &err) != BR_OK ||
        br_catalog_load(BR_SOURCE_DIR "/examples/parts/catalog.xml", &parts, &err) != BR_OK)
        return br_bench_fail("bench_explore", &err);
    br_explore_opts o;
    br_explore_opts_default(&o);
    o.cat = cat;
    o.vbus = o.vbus_max = d->vin.nom;
    o.lmin = 3;
    o.lmax = 9;
    o.nfsw = 5;
    for (int i = 0; i < 5; i++)
        o.fsw[i] = 60e3 + 30e3 * i;
    if (timed(&o, d, 1, "without sizing", &err) != BR_OK)
        return br_bench_fail("bench_explore", &err);
    o.parts = parts;
    if (timed(&o, d, runs, "sized", &err) != BR_OK)
        return br_bench_fail("bench_explore", &err);
    o.yield_samples = argc > 3 ? atol(argv[3]) : 2;
    char what[64];
    snprintf(what, sizeof what, "sized, yield of %ld samples", o.yield_samples);
    if (o.yield_samples > 0 && timed(&o, d, 1, what, &err) != BR_OK)
        return br_bench_fail("bench_explore", &err);
    br_catalog_free(parts);
    br_catalog_free(cat);
    br_design_free(d);
    return 0;
}

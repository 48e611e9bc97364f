/* bench_explore.c - speed of `explore` around the 7-level example: levels
 * 3 to 9, the three switch classes of examples/parts/switches.xml, five
 * frequencies (60, 90, 120, 150 and 180 kHz) on its 1.1 kV bus, nominal
 * screen only.  Run on demand: make bench_explore && ./bench_explore
 * [RUNS] [DESIGN].  Prints the median wall and CPU time over the runs (the
 * machines are shared and noisy).  Target: under 60 s on two cores. */
#include "analyses/explore.h"
#include "bootrung/bootrung.h"
#include "model/catalog.h"

#include <gsl/gsl_errno.h>
#include <stdio.h>
#include <stdlib.h>
#include <time.h>

#define MAX_RUNS 16

static double now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return ts.tv_sec + 1e-9 * ts.tv_nsec;
}

static double cpu(void)
{
    return (double)clock() / CLOCKS_PER_SEC;
}

static int cmp(const void *a, const void *b)
{
    double x = *(const double *)a, y = *(const double *)b;
    return (x > y) - (x < y);
}

static double median(double *v, int n)
{
    qsort(v, (size_t)n, sizeof *v, cmp);
    return n % 2 ? v[n / 2] : 0.5 * (v[n / 2 - 1] + v[n / 2]);
}

static int fail(const br_error *err)
{
    char buf[2048];
    fprintf(stderr, "bench_explore: %s\n", br_error_format(err, buf, sizeof buf));
    return 2;
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
    if (br_design_load(path, &d, &err) != BR_OK ||
        br_catalog_load(BR_SOURCE_DIR "/examples/parts/switches.xml", &cat, &err) != BR_OK)
        return fail(&err);
    br_explore_opts o;
    br_explore_opts_default(&o);
    o.cat = cat;
    o.vbus = o.vbus_max = d->vin.nom;
    o.lmin = 3;
    o.lmax = 9;
    o.nfsw = 5;
    for (int i = 0; i < 5; i++)
        o.fsw[i] = 60e3 + 30e3 * i;
    double tw[MAX_RUNS], tc[MAX_RUNS];
    int n = 0, feasible = 0, simulated = 0;
    for (int r = 0; r < runs; r++) {
        br_explore *x;
        double t0 = now(), c0 = cpu();
        if (br_explore_run(d, &o, &x, &err) != BR_OK)
            return fail(&err);
        tw[r] = now() - t0;
        tc[r] = cpu() - c0;
        n = x->n;
        feasible = x->nfeasible;
        simulated = 0;
        for (int i = 0; i < x->n; i++)
            simulated += x->rows[i].state != BR_EX_RATING;
        br_explore_free(x);
    }
    printf("explore %s: %d combinations, %d simulated, %d feasible\n", path, n, simulated,
           feasible);
    printf("median of %d runs: %.2f s wall, %.2f s CPU (target: 60 s on two cores)\n", runs,
           median(tw, runs), median(tc, runs));
    br_catalog_free(cat);
    br_design_free(d);
    return 0;
}

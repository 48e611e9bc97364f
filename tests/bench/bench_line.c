/* bench_line.c - the steady state of a line cycle: the 12-switch example
 * (examples/leg-7level.xml) with its DC load replaced by an AC line of
 * 60 Hz at its 120 kHz (2000 switching periods a line period), 25 A peak
 * 20 deg behind a sine modulation of depth 0.9.  Run on demand:
 * make bench_line && ./bench_line [DESIGN] [RUNS].  One thread; prints
 * the median over the runs (the machines are shared and noisy) and the
 * work, which their load does not move: switching periods simulated and
 * link-equation evaluations. */
#include "analyses/steady.h"
#include "benchkit.h"
#include "bootrung/bootrung.h"
#include "model/chain.h"

#include <stdio.h>
#include <stdlib.h>
#include <time.h>

#define PI 3.14159265358979323846

/* The example's DC load becomes the line cycle (its fsw and parts kept). */
static void make_ac(br_design *d)
{
    d->duty = br_qty_fixed(0.5);
    d->iload = br_qty_fixed(0.0);
    d->direction = BR_DIR_BOTH;
    d->ac.on = 1;
    d->ac.freq = br_qty_fixed(60.0);
    d->ac.ipk = br_qty_fixed(25.0);
    d->ac.phase = br_qty_fixed(20.0 * PI / 180.0);
    d->ac.depth = br_qty_fixed(0.9);
}

int main(int argc, char **argv)
{
    const char *path = argc > 1 ? argv[1] : BR_SOURCE_DIR "/examples/leg-7level.xml";
    int reps = argc > 2 ? atoi(argv[2]) : 5;
    br_design *d;
    br_chain *c;
    br_error err;
    char buf[2048];
    if (br_design_load(path, &d, &err)) {
        fprintf(stderr, "bench: %s\n", br_error_format(&err, buf, sizeof buf));
        return 2;
    }
    if (!d->ac.on)
        make_ac(d);
    if (br_chain_build(d, &c, &err)) {
        fprintf(stderr, "bench: %s\n", br_error_format(&err, buf, sizeof buf));
        return 2;
    }
    double wall[32], proc[32];
    br_steady ss;
    reps = reps < 1 ? 1 : reps > 32 ? 32 : reps;
    for (int r = 0; r < reps; r++) {
        double t0 = br_bench_wall(), p0 = br_bench_cpu();
        if (br_steady_solve(c, BR_DIRI_LINE, NULL, &ss, &err) != BR_OK) {
            fprintf(stderr, "bench: %s\n", br_error_format(&err, buf, sizeof buf));
            return 2;
        }
        wall[r] = br_bench_wall() - t0;
        proc[r] = br_bench_cpu() - p0;
    }
    br_bench_median(wall, reps);
    br_bench_median(proc, reps);
    printf("design: %s (%d switches), line %.4g Hz at %.4g Hz: %ld switching periods a line\n",
           path, c->n, c->line.freq, c->fsw, c->line.K);
    printf("line-cycle steady state: median %.3f s wall, %.3f s processor over %d runs "
           "(fastest %.3f s, slowest %.3f s)\n",
           wall[reps / 2], proc[reps / 2], reps, wall[0], wall[reps - 1]);
    printf("  %s, %d line periods simulated (%ld switching periods), residual %.3g V\n",
           ss.converged ? "converged" : "NOT converged", ss.iterations, ss.periods, ss.residual);
    br_chain_free(c);
    br_design_free(d);
    return ss.converged ? 0 : 1;
}

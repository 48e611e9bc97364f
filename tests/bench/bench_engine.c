/* bench_engine.c - speed of the engine on a design file (default: the
 * 11-link example).  Run on demand: make bench_engine && ./bench_engine.
 * Prints medians over repeated runs; the machines are shared and noisy. */
#include "analyses/steady.h"
#include "benchkit.h"
#include "bootrung/bootrung.h"
#include "model/chain.h"

#include <stdio.h>
#include <stdlib.h>
#include <sys/resource.h>
#include <time.h>

int main(int argc, char **argv)
{
    const char *path = argc > 1 ? argv[1] : BR_SOURCE_DIR "/examples/leg-7level.xml";
    int reps = argc > 2 ? atoi(argv[2]) : 5;
    br_design *d;
    br_chain *c;
    br_error err;
    char buf[2048];
    if (br_design_load(path, &d, &err) || br_chain_build(d, &c, &err)) {
        fprintf(stderr, "bench: %s\n", br_error_format(&err, buf, sizeof buf));
        return 2;
    }
    double ts[32], tc[32], tp[32];
    long shoot_periods = 0, plain_periods = 0;
    unsigned long evals = 0; /* link-equation evaluations of the cold start */
    for (int r = 0; r < reps && r < 32; r++) {
        br_steady ss;
        double t0 = br_bench_wall();
        br_steady_solve(c, BR_DIRI_NONE, NULL, &ss, &err);
        ts[r] = br_bench_wall() - t0;
        shoot_periods = ss.periods;
        br_sim *s;
        br_sim_create(c, BR_DIRI_NONE, BR_INTEG_FAST, &s, &err);
        t0 = br_bench_wall();
        br_sim_run_until(s, 4000 * c->T, &err);
        tc[r] = br_bench_wall() - t0;
        evals = br_sim_evals(s);
        /* plain simulation to the same steady state: from the shooting
         * start estimate until the rails move less than 1e-7 V a period */
        br_steady_opts o;
        br_steady_opts_default(&o);
        o.max_iter = 0;
        o.max_plain = 200000;
        br_steady sp;
        t0 = br_bench_wall();
        br_steady_solve(c, BR_DIRI_NONE, &o, &sp, &err);
        tp[r] = br_bench_wall() - t0;
        plain_periods = sp.periods;
        br_sim_free(s);
    }
    double ms = br_bench_median(ts, reps), mc = br_bench_median(tc, reps),
           mp = br_bench_median(tp, reps);
    printf("design: %s (%d stages)\n", path, c->n);
    printf("steady state by shooting: median %.2f ms (%ld periods simulated)\n", 1e3 * ms,
           shoot_periods);
    printf("4000 periods of cold start: median %.3f s (%.0f link-equation evaluations a period,\n"
           "  a figure the machine's load does not move)\n",
           mc, evals / 4000.0);
    printf("plain simulation to steady state: median %.3f s (%ld periods)\n", mp, plain_periods);
    printf("speed-up of shooting over plain: %.1fx\n", mp / ms);
    struct rusage ru;
    getrusage(RUSAGE_SELF, &ru);
    printf("peak memory (max resident set): %.1f MB\n", ru.ru_maxrss / 1024.0);
    br_chain_free(c);
    br_design_free(d);
    return 0;
}

/* bench_window.c - speed of `map` and `window` on a design file (default:
 * the 11-link example).  Run on demand: make bench_window &&
 * ./bench_window [DESIGN] [RUNS] [THREADS].  The map is 40 x 40: duty 2 %
 * to 98 %, frequency a decade either side of the design's.  Prints
 * medians over the runs; the machines are shared and noisy.  Targets:
 * the map under 10 s on two cores, the window under 1 s. */
#include "analyses/map.h"
#include "analyses/window.h"
#include "bootrung/bootrung.h"

#include "benchkit.h"

#include <gsl/gsl_errno.h>
#include <stdio.h>
#include <stdlib.h>
#include <time.h>

#define MAX_RUNS 32

int main(int argc, char **argv)
{
    const char *path = argc > 1 ? argv[1] : BR_SOURCE_DIR "/examples/leg-7level.xml";
    int runs = argc > 2 ? atoi(argv[2]) : 3;
    int threads = argc > 3 ? atoi(argv[3]) : 2;
    runs = runs < 1 ? 1 : runs > MAX_RUNS ? MAX_RUNS : runs;
    gsl_set_error_handler_off();
    br_design *d;
    br_error err;
    if (br_design_load(path, &d, &err) != BR_OK)
        return br_bench_fail("bench_window", &err);
    br_map_opts mo = {.duty_from = 0.02,
                      .duty_to = 0.98,
                      .nduty = 40,
                      .fsw_from = d->fsw.nom / 10,
                      .fsw_to = d->fsw.nom * 10,
                      .nfsw = 40,
                      .threads = threads};
    br_window_opts wo;
    br_window_opts_default(&wo);
    br_window *w = malloc(sizeof *w);
    double tm[MAX_RUNS], tw[MAX_RUNS], cm[MAX_RUNS], cw[MAX_RUNS];
    long map_periods = 0, win_periods = 0;
    int holding = 0;
    for (int r = 0; r < runs && w; r++) {
        br_map *m;
        double t0 = br_bench_wall(), c0 = br_bench_cpu();
        if (br_map_run(d, &mo, &m, &err) != BR_OK)
            return br_bench_fail("bench_window", &err);
        tm[r] = br_bench_wall() - t0;
        cm[r] = br_bench_cpu() - c0;
        map_periods = m->periods;
        holding = 0;
        for (int k = 0; k < m->nduty * m->nfsw; k++)
            holding += m->pt[k].holds;
        br_map_free(m);
        t0 = br_bench_wall();
        c0 = br_bench_cpu();
        if (br_window_run(d, &wo, w, &err) != BR_OK)
            return br_bench_fail("bench_window", &err);
        tw[r] = br_bench_wall() - t0;
        cw[r] = br_bench_cpu() - c0;
        win_periods = w->duty.periods + w->fsw.periods;
    }
    printf("design: %s\n", path);
    printf("map 40 x 40 (duty 2 %% to 98 %%, %.4g Hz to %.4g Hz) on %d thread%s: median %.2f s "
           "over %d runs, CPU %.2f s (%ld periods, %d points hold)\n",
           mo.fsw_from, mo.fsw_to, threads, threads == 1 ? "" : "s", br_bench_median(tm, runs),
           runs, br_bench_median(cm, runs), map_periods, holding);
    printf("window: median %.3f s over %d runs, CPU %.3f s (%d + %d points judged, %ld "
           "periods)\n",
           br_bench_median(tw, runs), runs, br_bench_median(cw, runs), w ? w->duty.evals : 0,
           w ? w->fsw.evals : 0, win_periods);
    free(w);
    br_design_free(d);
    return 0;
}

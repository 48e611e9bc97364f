/* bench_window.c - speed of `map` and `window` on a design file (default:
 * the 11-link example).  Run on demand: make bench_window &&
 * ./bench_window [DESIGN] [RUNS] [THREADS].  The map is 40 x 40: duty 2 %
 * to 98 %, frequency a decade either side of the design's.  Prints
 * medians over the runs; the machines are shared and noisy.  Targets:
 * the map under 10 s on two cores, the window under 1 s. */
#include "analyses/map.h"
#include "analyses/window.h"
#include "bootrung/bootrung.h"

#include <gsl/gsl_errno.h>
#include <stdio.h>
#include <stdlib.h>
#include <time.h>

#define MAX_RUNS 32

static double now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return ts.tv_sec + 1e-9 * ts.tv_nsec;
}

/* CPU time of the process, every thread, s: on a shared machine the
 * wall time of two threads says little unless both cores were free. */
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
    fprintf(stderr, "bench_window: %s\n", br_error_format(err, buf, sizeof buf));
    return 2;
}

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
        return fail(&err);
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
        double t0 = now(), c0 = cpu();
        if (br_map_run(d, &mo, &m, &err) != BR_OK)
            return fail(&err);
        tm[r] = now() - t0;
        cm[r] = cpu() - c0;
        map_periods = m->periods;
        holding = 0;
        for (int k = 0; k < m->nduty * m->nfsw; k++)
            holding += m->pt[k].holds;
        br_map_free(m);
        t0 = now();
        c0 = cpu();
        if (br_window_run(d, &wo, w, &err) != BR_OK)
            return fail(&err);
        tw[r] = now() - t0;
        cw[r] = cpu() - c0;
        win_periods = w->duty.periods + w->fsw.periods;
    }
    printf("design: %s\n", path);
    printf("map 40 x 40 (duty 2 %% to 98 %%, %.4g Hz to %.4g Hz) on %d thread%s: median %.2f s "
           "over %d runs, CPU %.2f s (%ld periods, %d points hold)\n",
           mo.fsw_from, mo.fsw_to, threads, threads == 1 ? "" : "s", median(tm, runs), runs,
           median(cm, runs), map_periods, holding);
    printf("window: median %.3f s over %d runs, CPU %.3f s (%d + %d points judged, %ld "
           "periods)\n",
           median(tw, runs), runs, median(cw, runs), w ? w->duty.evals : 0, w ? w->fsw.evals : 0,
           win_periods);
    free(w);
    br_design_free(d);
    return 0;
}

/* bench_startup.c - start-ups by envelope following and with every period
 * integrated, side by side in one run.  Run on demand:
 *   make bench_startup && ./bench_startup [RUNS]
 *     every design below, RUNS runs of each method in turn (default 11): medians
 *     of wall-clock time, the periods each integrated and stepped over, and
 *     why the envelope integrated the periods it did (the events of the
 *     start-up each need theirs);
 *   ./bench_startup RUNS DESIGN METHOD
 *     one design (a path) by one method (envelope or periods), for
 *     valgrind --tool=callgrind (instruction counts, which the machine's
 *     load does not move);
 *   ./bench_startup --yield SAMPLES [THREADS] [DESIGN]
 *     yield with a cold start per sample (default: the 11-link example),
 *     by each method: wall and processor time.
 * The machines are shared and noisy: medians, and instruction counts
 * where it matters. */
#include "analyses/startup.h"
#include "analyses/yield.h"
#include "benchkit.h"
#include "bootrung/bootrung.h"
#include "model/chain.h"
#include "testdesign.h"
#include "testkit.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

/* A design file, or a reference case's json (tests/data/reference). */
static br_design *open_design(const char *path)
{
    br_design *d = NULL;
    br_error err;
    char buf[2048];
    size_t len = strlen(path);
    if (len > 5 && strcmp(path + len - 5, ".json") == 0) {
        char *json = br_test_slurp(path, NULL);
        d = json ? br_test_reference_design(json) : NULL;
        free(json);
    } else if (br_design_load(path, &d, &err) != BR_OK) {
        fprintf(stderr, "bench: %s\n", br_error_format(&err, buf, sizeof buf));
    }
    return d;
}

/* Median wall time of runs start-ups of c by method m (s); the last result in su. */
static double time_startup(br_chain *c, int m, int runs, const br_startup_opts *o, br_startup *su)
{
    double t[64];
    br_error err;
    c->startup_method = m;
    for (int r = 0; r < runs; r++) {
        double t0 = br_bench_wall();
        if (br_startup_run(c, o, su, &err) != BR_OK)
            fprintf(stderr, "bench: %s\n", err.msg);
        t[r] = br_bench_wall() - t0;
    }
    return br_bench_median(t, runs);
}

/* Both methods, their runs taken in turn (the machine's load drifts), into
 * tm[method] (medians, s) and su[method]. */
static void time_both(br_chain *c, int runs, const br_startup_opts *o, double *tm, br_startup *su)
{
    double t[2][64];
    for (int r = 0; r < runs; r++)
        for (int m = 0; m < 2; m++)
            t[m][r] = time_startup(c, m, 1, o, &su[m]);
    for (int m = 0; m < 2; m++)
        tm[m] = br_bench_median(t[m], runs);
}

/* The periods of a start-up in which a driver starts or drops out: the
 * periods envelope following must integrate whatever it does. */
typedef struct toggled {
    double T;
    long last, count; /* the last period seen with a transition, and how many */
} toggled;

static void on_toggle(void *ctx, const br_uvlo_event *e)
{
    toggled *g = ctx;
    long p = (long)floor(e->t / g->T);
    if (p != g->last)
        g->count++;
    g->last = p;
}

/* Periods with a UVLO transition in the start-up of c with every period
 * integrated (a run of its own, untimed, with an observer of the events
 * alone). */
static long toggled_periods(br_chain *c, const br_startup_opts *o)
{
    toggled g = {c->T, -1, 0};
    br_sim_observer obs = {&g, on_toggle, NULL};
    br_startup_opts oo = *o;
    oo.obs = &obs;
    br_startup su;
    br_error err;
    c->startup_method = BR_SU_PERIODS;
    if (br_startup_run(c, &oo, &su, &err) != BR_OK)
        fprintf(stderr, "bench: %s\n", err.msg);
    return g.count;
}

typedef struct bench_case {
    const char *name, *path;
    double t_max; /* s, 0: the design's */
} bench_case;

/* Why the envelope integrated the periods it did (engine/envelope.h). */
static void why_line(const char *name, const br_startup *su)
{
    const long *w = su->integrated_why;
    printf("%-34s %6ld %6ld %6ld %6ld %6ld %6ld %6ld %6ld\n", name, w[BR_WIN_UVLO],
           w[BR_WIN_SUPPLY], w[BR_WIN_SCHEDULE], w[BR_ENV_WHY_MODEL], w[BR_ENV_WHY_AHEAD],
           w[BR_ENV_WHY_REJECTED], w[BR_ENV_WHY_LANDING], su->periods_integrated);
}

static br_startup why_su[16];
static const char *why_name[16];
static int nwhy;

static void one_case(const bench_case *bc, int runs)
{
    br_design *d = open_design(bc->path);
    br_chain *c = NULL;
    br_error err;
    if (!d || br_chain_build(d, &c, &err) != BR_OK) {
        printf("%-34s could not be built\n", bc->name);
        br_design_free(d);
        return;
    }
    br_startup_opts o = {0};
    o.t_max = bc->t_max;
    br_startup su[2];
    double tm[2];
    time_both(c, runs, &o, tm, su);
    /* the envelope integrates every period with a transition and the last
     * one (for the figures): the most its count of integrated periods can
     * gain on every period integrated */
    long all = su[BR_SU_PERIODS].periods_integrated, must = toggled_periods(c, &o) + 1;
    printf("%-34s %9.2f %9.2f %6.1fx %8ld %8ld %8ld %8ld %6.1fx %6.1fx\n", bc->name,
           1e3 * tm[BR_SU_PERIODS], 1e3 * tm[BR_SU_ENVELOPE],
           tm[BR_SU_PERIODS] / tm[BR_SU_ENVELOPE], all, su[BR_SU_ENVELOPE].periods_integrated,
           su[BR_SU_ENVELOPE].periods_stepped, must,
           (double)all / (double)su[BR_SU_ENVELOPE].periods_integrated, (double)all / (double)must);
    if (nwhy < 16) {
        why_su[nwhy] = su[BR_SU_ENVELOPE];
        why_name[nwhy++] = bc->name;
    }
    br_chain_free(c);
    br_design_free(d);
}

static void all_cases(int runs)
{
    static const bench_case cases[] = {
        {"examples/leg-7level.xml (11 links)", BR_SOURCE_DIR "/examples/leg-7level.xml", 0.0},
        {"examples/demo-3level.xml", BR_SOURCE_DIR "/examples/demo-3level.xml", 0.0},
        {"reference c1 (1 link)", BR_REFERENCE_DIR "/c1.json", 0.0},
        {"reference c2 (5 links)", BR_REFERENCE_DIR "/c2.json", 0.0},
        {"reference c6 (5 links, step-up)", BR_REFERENCE_DIR "/c6.json", 0.0},
        {"reference c8 (7 links, 20 A)", BR_SOURCE_DIR "/tests/data/ref-c8.xml", 0.0},
        {"stalled rail, 1 s (slow-startup)", BR_SOURCE_DIR "/tests/data/slow-startup.xml", 0.0},
        {"hiccups, 20 ms (hiccup-startup)", BR_SOURCE_DIR "/tests/data/hiccup-startup.xml", 20e-3},
    };
    printf("start-up, median of %d runs each      periods  envelope  speed-  periods integrated  "
           "stepped  must     period   bound\n",
           runs);
    printf("%-34s %9s %9s %7s %8s %8s %8s %8s %7s %7s\n", "design", "ms", "ms", "up", "periods",
           "envelope", "envelope", "integr.", "ratio", "");
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++)
        one_case(&cases[i], runs);
    printf(
        "\nmust integr.: periods with a UVLO transition (every period integrated), and the last"
        "\none; period ratio: all periods / periods the envelope integrated; bound: all periods /"
        "\nthose it must integrate, the most its count of integrated periods can gain (the time"
        "\nratio stays below it: the periods it must integrate are the dear ones)\n");
    printf("\nwhy the envelope integrated its periods: a driver started or dropped out in it"
           "\n(uvlo); the supply ramped, entered or left its limit, or was off (supply); a "
           "pre-charge step ended or"
           "\nthe load started (sched); the model was being built after such a period (model); a"
           "\nthreshold, a scheduled change or the end lay within reach (ahead); the error control"
           "\nrefused the steps or allowed none yet (error); the landing period of a step kept"
           "\n(land); total with the last period, integrated for the figures\n");
    printf("%-34s %6s %6s %6s %6s %6s %6s %6s %6s\n", "design", "uvlo", "supply", "sched", "model",
           "ahead", "error", "land", "total");
    for (int i = 0; i < nwhy; i++)
        why_line(why_name[i], &why_su[i]);
}

/* One design by one method, for callgrind. */
static int single(int runs, const char *path, const char *method)
{
    br_design *d = open_design(path);
    br_chain *c = NULL;
    br_error err;
    if (!d || br_chain_build(d, &c, &err) != BR_OK)
        return 2;
    br_startup su;
    double t = time_startup(c, strcmp(method, "periods") == 0 ? BR_SU_PERIODS : BR_SU_ENVELOPE,
                            runs, NULL, &su);
    printf("%s by %s: median %.3f ms, %ld periods integrated, %ld stepped over\n", path, method,
           1e3 * t, su.periods_integrated, su.periods_stepped);
    br_chain_free(c);
    br_design_free(d);
    return 0;
}

/* Yield with a cold start per sample, by each method. */
static int yield(long samples, int threads, const char *path)
{
    br_design *d = open_design(path);
    if (!d)
        return 2;
    printf("yield --startup --samples %ld on %s, %d threads\n", samples, path, threads);
    for (int m = BR_SU_PERIODS; m >= BR_SU_ENVELOPE; m--) {
        br_yield_opts o;
        br_yield_opts_default(&o);
        o.samples = samples;
        o.threads = threads;
        o.startup = 1;
        d->startup_method = m;
        br_yield *y = NULL;
        br_error err;
        double w0 = br_bench_wall(), c0 = br_bench_cpu();
        int rc = br_yield_run(d, &o, &y, &err);
        double w = br_bench_wall() - w0, c = br_bench_cpu() - c0;
        printf("  %-8s %8.1f s wall %8.1f s processor  %s\n", m ? "periods" : "envelope", w, c,
               rc == BR_OK ? "" : err.msg);
        br_yield_free(y);
    }
    br_design_free(d);
    return 0;
}

int main(int argc, char **argv)
{
    if (argc > 2 && strcmp(argv[1], "--yield") == 0)
        return yield(atol(argv[2]), argc > 3 ? atoi(argv[3]) : 2,
                     argc > 4 ? argv[4] : BR_SOURCE_DIR "/examples/leg-7level.xml");
    int runs = argc > 1 ? atoi(argv[1]) : 11;
    runs = runs < 1 ? 1 : runs > 64 ? 64 : runs;
    if (argc > 3)
        return single(runs, argv[2], argv[3]);
    all_cases(runs);
    return 0;
}

/* benchkit.c - timing and medians shared by the benchmarks. */
#include "benchkit.h"

#include <stdio.h>
#include <stdlib.h>
#include <time.h>

double br_bench_wall(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

double br_bench_cpu(void)
{
    return (double)clock() / CLOCKS_PER_SEC;
}

static int cmp(const void *a, const void *b)
{
    double x = *(const double *)a, y = *(const double *)b;
    return (x > y) - (x < y);
}

double br_bench_median(double *v, int n)
{
    qsort(v, (size_t)n, sizeof *v, cmp);
    return n % 2 ? v[n / 2] : 0.5 * (v[n / 2 - 1] + v[n / 2]);
}

int br_bench_fail(const char *name, const br_error *err)
{
    char buf[2048];
    fprintf(stderr, "%s: %s\n", name, br_error_format(err, buf, sizeof buf));
    return 2;
}

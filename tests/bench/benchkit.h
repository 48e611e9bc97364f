/* benchkit.h - what every benchmark under tests/bench/ measures with. */
#ifndef BR_BENCHKIT_H
#define BR_BENCHKIT_H

#include "bootrung/bootrung.h"

/* Wall-clock time, s (monotonic). */
double br_bench_wall(void);
/* CPU time of the process, every thread, s: on a shared machine the wall
 * time of two threads says little unless both cores were free. */
double br_bench_cpu(void);
/* The median of v[0..n-1], n >= 1; sorts v in place, so v[0] and v[n-1]
 * are then the fastest and the slowest. */
double br_bench_median(double *v, int n);
/* Print "NAME: error" on stderr; returns the exit status 2. */
int br_bench_fail(const char *name, const br_error *err);

#endif

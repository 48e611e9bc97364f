/* trace.h - a simulation's samples kept in memory for plotting.
 *
 * A trace holds the rows a time series was made of: time, every rail's
 * voltage, every link diode's forward current, the driver supply behind
 * each rail's regulator, each link diode's reverse voltage and the
 * displacement current of its junction capacitance.  Fed by the CSV series
 * (br_csv_series.row) it keeps exactly the rows the CSV file gets, so a
 * plot drawn from it shows the values of the file. */
#ifndef BR_REPORT_TRACE_H
#define BR_REPORT_TRACE_H

#include "engine/sim.h"

typedef struct br_trace {
    int n;           /* stages */
    long len, cap;   /* rows kept, rows allocated */
    double *t;       /* len times, s (simulator time + t_offset) */
    double *v;       /* len x n rail voltages, V, row-major */
    double *i;       /* len x n link forward currents, A ([k], k >= 1; [0]: the supply's) */
    double *vd;      /* len x n driver supplies, V */
    double *vr;      /* len x n link reverse voltages, V ([k], k >= 1) */
    double *j;       /* len x n displacement currents of the links' junction
                        capacitances, A ([k], k >= 1) */
    double t_offset; /* added to the simulator's time, s */
    int failed;      /* out of memory at some row */
} br_trace;

/* An empty trace of n stages.  Returns NULL when out of memory. */
br_trace *br_trace_create(int n);
void br_trace_free(br_trace *tr);

/* Rows added from now on are at simulator time + t_offset. */
void br_trace_offset(br_trace *tr, double t_offset);

/* Append one row at simulator time t: rails, links' forward currents,
 * driver supplies, reverse voltages and displacement currents, n values
 * each. */
void br_trace_add(br_trace *tr, double t, const double *v, const double *i, const double *vd,
                  const double *vr, const double *disp);

/* An observer appending every sample (UVLO events ignored). */
br_sim_observer br_trace_observer(br_trace *tr);

/* Rows with t in [t0, t1]: first index and count. */
long br_trace_find(const br_trace *tr, double t0, double t1, long *count);

#endif

/* csv.h - time series of a simulation as CSV.
 *
 * One layout for every verb: a header line
 *   series,t_s,rail_<switch>_V,...,supply_A,link_<switch>_A,...,
 *   drv_<switch>_V,...,vrev_<switch>_V,...
 * (rails 0..n-1 named by their switch, the supply's current through its
 * resistance, links 1..n-1 by the switch whose rail they charge; drv is
 * the driver supply behind the rail's regulator, vrev the link diode's
 * reverse voltage), then one row per kept sample.
 * A sample fed without a simulator leaves drv equal to the rail and vrev
 * empty.  `series` says which
 * run a row belongs to ("startup", "steady-step-down", ...), so one file
 * can hold a start-up and the steady periods of each direction.
 *
 * A series is filled by a simulator observer (br_csv_observer).  It keeps
 * at most one row per min_dt of simulated time, and always the samples on
 * either side of a UVLO transition, so a long start-up stays a sane size
 * while its events stay sharp. */
#ifndef BR_REPORT_CSV_H
#define BR_REPORT_CSV_H

#include "engine/sim.h"

typedef struct br_csv_series {
    br_text *out;      /* rows are appended here */
    const char *label; /* value of the series column */
    int n;             /* stages */
    double min_dt;     /* keep at most one row per min_dt, s (0: all) */
    double t_offset;   /* added to the simulator's time, s */
    double last_t;     /* time of the last row kept, s */
    long rows;         /* rows kept */
    int force;         /* keep the next sample whatever its time */
    int held;          /* a sample was skipped and is held in ht/hv/hi */
    double ht;         /* its time, s */
    double hv[BR_MAX_SWITCHES], hi[BR_MAX_SWITCHES]; /* its rails V, links A */
    double hd[BR_MAX_SWITCHES], hr[BR_MAX_SWITCHES]; /* its driver supplies, reverse V */
    int failed;                                      /* out of memory while appending */
    /* Optional: told every row kept (simulator time, rails, links, driver
     * supplies, reverse voltages), so a plot can be drawn from exactly the
     * rows of the file. */
    void (*row)(void *ctx, double t, const double *v, const double *i, const double *vd,
                const double *vr);
    void *row_ctx;
} br_csv_series;

/* Append the header line for chain c to out. */
int br_csv_header(const br_chain *c, br_text *out);

/* Start a series of n stages into out (the header is written separately,
 * once per file; out may be NULL when only the row callback is wanted). */
void br_csv_series_init(br_csv_series *s, br_text *out, const char *label, int n, double min_dt,
                        double t_offset);

/* An observer feeding s (samples and UVLO transitions). */
br_sim_observer br_csv_observer(br_csv_series *s);

/* Keep the last held sample, so the series ends where the run ended.
 * Returns BR_OK, or BR_ENOMEM if any row could not be appended. */
int br_csv_series_end(br_csv_series *s);

#endif

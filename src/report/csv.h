/* csv.h - time series of a simulation as CSV.
 *
 * One layout for every verb: a header line
 *   series,t_s,rail_<switch>_V,...,supply_A,link_<switch>_A,...,
 *   disp_<switch>_A,...,drv_<switch>_V,...,vrev_<switch>_V,...
 * (rails 0..n-1 named by their switch, the supply's current through its
 * resistance, links 1..n-1 by the switch whose rail they charge: each
 * link diode's forward current, then the displacement current of its
 * junction capacitance; drv is the driver supply behind the rail's
 * regulator, vrev the link diode's reverse voltage), then one row per
 * kept sample.  A sample fed without a simulator leaves drv equal to the
 * rail and disp and vrev empty.  `series` says which run a row belongs to
 * ("startup", "steady-step-down", ...), so one file can hold a start-up
 * and the steady periods of each direction.
 *
 * A series is filled by a simulator observer (br_csv_observer).  Thinned
 * (min_dt > 0), it cuts the run into buckets of at least min_dt and keeps
 * of each bucket every column's lowest and highest value, in the order
 * they came, as two rows at the bucket's first and last sample time (the
 * min/max envelope: a peak the figures report is a peak of the file); a
 * bucket of one sample is that sample.  The samples on either side of a
 * UVLO transition are kept as they are.  So a long start-up stays a sane
 * size while its events and its peaks stay sharp; a row of a bucket of
 * several samples mixes instants, so read a column down, not a row
 * across. */
#ifndef BR_REPORT_CSV_H
#define BR_REPORT_CSV_H

#include "engine/sim.h"

/* Blocks of one row, BR_MAX_SWITCHES values each: rails, the supply and
 * the links' forward currents, the links' displacement currents, driver
 * supplies, reverse voltages. */
enum { BR_CSV_V, BR_CSV_I, BR_CSV_J, BR_CSV_D, BR_CSV_R, BR_CSV_BLOCKS };

typedef struct br_csv_row {
    double t;                                  /* simulator time, s */
    double x[BR_CSV_BLOCKS * BR_MAX_SWITCHES]; /* block b, stage k at b * MAX + k */
} br_csv_row;

typedef struct br_csv_series {
    br_text *out;      /* rows are appended here */
    const char *label; /* value of the series column */
    int n;             /* stages */
    double min_dt;     /* a bucket spans at least min_dt, s (0: every sample a row) */
    double t_offset;   /* added to the simulator's time, s */
    long rows;         /* rows kept */
    int force;         /* the next sample is kept as it is and starts a bucket */
    /* the bucket in progress: the envelope of its samples before the
     * last (lo, hi, and for each column whether its low came first), and
     * its last sample as it is */
    int nenv;          /* samples in the envelope */
    br_csv_row lo, hi; /* lo.t: the first sample's time */
    unsigned char lo_first[BR_CSV_BLOCKS * BR_MAX_SWITCHES];
    int held; /* the last sample is held in `last` */
    br_csv_row last;
    int failed; /* out of memory while appending */
    /* Optional: told every row kept (simulator time, rails, links'
     * forward currents ([0] the supply's), driver supplies, reverse
     * voltages, displacement currents), so a plot can be drawn from
     * exactly the rows of the file. */
    void (*row)(void *ctx, double t, const double *v, const double *i, const double *vd,
                const double *vr, const double *disp);
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

/* Keep what the last bucket holds, so the series ends where the run
 * ended.  Returns BR_OK, or BR_ENOMEM if any row could not be appended. */
int br_csv_series_end(br_csv_series *s);

#endif

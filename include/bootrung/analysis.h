/* analysis.h - the analyses of the public API: the cold start, the
 * periodic steady state and the verdict over them, run on a br_chain.
 *
 * A br_analysis is an opaque result object: create it, optionally give it
 * a progress hook and a stop poll, run it on a chain, read its figures
 * through the accessors, free it.  It owns everything it returns: strings
 * and figures stay valid until the next run or the free; the chain may be
 * freed once the run has returned.
 *
 * Accessors return BR_OK and write *out, or BR_EUSAGE (out untouched)
 * when the object is NULL, the part was not run, or an index or key is
 * out of range.  Every figure is an SI double; a figure that does not
 * apply (a margin against a rating the design does not give) is NaN.
 *
 * Copyright (C) 2026 the bootrung developers.  GPL-3.0-or-later. */
#ifndef BOOTRUNG_ANALYSIS_H
#define BOOTRUNG_ANALYSIS_H

#include "bootrung/bootrung.h"

#ifdef __cplusplus
extern "C" {
#endif

/* What a run computes (bits). */
enum {
    BR_PART_STARTUP = 1, /* the cold start */
    BR_PART_STEADY = 2,  /* the periodic steady state, per current direction */
    BR_PART_ALL = 3,     /* both, and the full verdict */
    BR_PART_HOLDUP = 4   /* with BR_PART_STEADY: the hold-up time from each steady case */
};

/* How far a run has come, in whatever unit the analysis uses (done of
 * total, total an estimate); return non-zero to stop the run.  Called
 * from the thread that runs the analysis. */
typedef int (*br_progress_hook)(void *ctx, double done, double total);
/* Non-zero once the run is to stop: cheap, safe from any thread, called
 * every few milliseconds of simulation. */
typedef int (*br_stop_poll)(void *ctx);

typedef struct br_analysis br_analysis;

/* NULL when out of memory. */
BR_API br_analysis *br_analysis_create(void);
BR_API void br_analysis_free(br_analysis *a);
/* Either may be NULL; ctx is handed back to both. */
BR_API int br_analysis_set_progress(br_analysis *a, br_progress_hook hook, br_stop_poll stop,
                                    void *ctx);
/* Keep the time series (start-up and two steady periods per direction)
 * of the next runs: 1 to keep, 0 (the default) not to. */
BR_API int br_analysis_set_series(br_analysis *a, int keep);
/* Record the time series as CSV during the next runs (1; 0, the default,
 * not to): the run's BR_FORMAT_CSV (bootrung/report.h). */
BR_API int br_analysis_set_csv(br_analysis *a, int keep);
/* The steady-state solver's work limit for the next runs: at most n
 * Newton iterations (never more than its default) and n periods of plain
 * simulation; what it cannot settle within them is undetermined, never a
 * pass.  n from 1 to BR_SOLVER_LIMIT_MAX; 0 restores the defaults. */
#define BR_SOLVER_LIMIT_MAX 100000L
BR_API int br_analysis_set_solver_limit(br_analysis *a, long n);
/* Run the parts (BR_PART_* bits; BR_PART_HOLDUP only with BR_PART_STEADY) on c.  BR_ECANCEL when
 * the hook or the stop poll stopped it (the object then holds no results); BR_EUSAGE for bad
 * arguments; a numerical failure of a solver is not an error: it makes the figures it concerns
 * undetermined. */
BR_API int br_analysis_run(br_analysis *a, const br_chain *c, int parts, br_error *err);
/* The parts the last successful run computed (0: none yet). */
BR_API int br_analysis_parts(const br_analysis *a);
/* Stages (rails) of the chain analysed; 0 before a run. */
BR_API int br_analysis_stages(const br_analysis *a);

/* ---- the cold start ---------------------------------------------------- */

typedef enum br_startup_key {
    BR_SU_COMPLETE = 0,  /* 1 when every driver runs for good at the end */
    BR_SU_TIME,          /* start-up time (the last start that lasts), s; +inf when
                            some rail never starts */
    BR_SU_SIMULATED,     /* how long was simulated, s */
    BR_SU_PWM_START,     /* end of the pre-charge steps, s */
    BR_SU_FIRST_STALLED, /* the lowest rail not running at the end, -1 */
    BR_SU_FAILED,        /* 1: the simulation failed numerically (undetermined) */
    BR_SU_PERIODS_INTEGRATED,
    BR_SU_PERIODS_STEPPED,
    BR_SU_KEY_COUNT
} br_startup_key;
BR_API int br_startup_get(const br_analysis *a, int key, double *out);
/* Why the simulation failed ("" when it did not). */
BR_API int br_startup_why(const br_analysis *a, const char **out);

typedef enum br_startup_rail_key {
    BR_SUR_START = 0,   /* when its driver starts for good, s; +inf: never starts */
    BR_SUR_FIRST_START, /* its first crossing of UVLO rising, s; +inf: never */
    BR_SUR_DROPOUTS,    /* how many times its driver dropped out */
    BR_SUR_FINAL,       /* the rail voltage at the end (mean of the last period), V */
    BR_SUR_RUNNING,     /* 1 when its driver runs at the end */
    BR_SUR_LINK_IPEAK,  /* peak forward current of link k (k >= 1; NaN for 0), A */
    BR_SUR_LINK_I2T,    /* its I2t over the whole start-up, A^2 s */
    BR_SUR_KEY_COUNT
} br_startup_rail_key;
BR_API int br_startup_rail(const br_analysis *a, int k, int key, double *out);
/* The time of rail k's i-th dropout (the first few are kept: i below
 * min(dropouts, BR_DROPOUT_TIMES)), s. */
#define BR_DROPOUT_TIMES 16
BR_API int br_startup_dropout(const br_analysis *a, int k, int i, double *out);

typedef enum br_supply_key {
    BR_SUP_SPAN = 0,   /* the stretch the figures cover, s */
    BR_SUP_IPEAK,      /* peak current, A */
    BR_SUP_IAVG,       /* charge / span, A */
    BR_SUP_CHARGE,     /* C */
    BR_SUP_ENERGY,     /* J */
    BR_SUP_T_LIMIT,    /* time in its current limit, s */
    BR_SUP_TRIPS,      /* hiccups */
    BR_SUP_FIRST_TRIP, /* s; -1: none */
    BR_SUP_LATCHED,    /* 1: it stays off */
    BR_SUP_KEY_COUNT
} br_supply_key;
/* What the start-up draws from the supply. */
BR_API int br_startup_supply(const br_analysis *a, int key, double *out);

/* ---- the periodic steady state ----------------------------------------- */

/* The current directions analysed (1 or 2; a line cycle is one). */
BR_API int br_steady_cases(const br_analysis *a, int *out);
/* Case d's direction: "step-down", "step-up", "line-cycle" or "idealised"
 * (a design without a load current). */
BR_API int br_steady_case_name(const br_analysis *a, int d, const char **out);

typedef enum br_steady_status {
    BR_STEADY_HOLDS = 0,     /* found and trusted, no driver drops out */
    BR_STEADY_DOES_NOT_HOLD, /* a driver drops out (or the leg's cells collapse) */
    BR_STEADY_UNDETERMINED   /* the solver did not settle or the simulation failed */
} br_steady_status;

typedef enum br_steady_key {
    BR_SS_STATUS = 0,  /* a br_steady_status */
    BR_SS_RESIDUAL,    /* max |P(x) - x| over the rails, V */
    BR_SS_DRIFT,       /* max rail change over the cross-check periods, V */
    BR_SS_ITERATIONS,  /* Newton/Broyden iterations */
    BR_SS_PERIODS,     /* periods simulated */
    BR_SS_SHOOTING,    /* 1: Newton converged; 0: plain simulation */
    BR_SS_SUPPLY_IAVG, /* the supply's average current, A */
    BR_SS_SUPPLY_P,    /* the power it delivers, W */
    BR_SS_KEY_COUNT
} br_steady_key;
BR_API int br_steady_get(const br_analysis *a, int d, int key, double *out);
/* Why case d is undetermined or does not hold ("" otherwise). */
BR_API int br_steady_why(const br_analysis *a, int d, const char **out);

typedef enum br_rail_key {
    BR_RAIL_VMIN = 0, /* rail (capacitor and ESR), V */
    BR_RAIL_VMAX,
    BR_RAIL_VAVG,
    BR_RAIL_RIPPLE,
    BR_RAIL_DRV_MIN, /* driver supply behind the regulator, V */
    BR_RAIL_DRV_MAX,
    BR_RAIL_M_UVLO,    /* driver supply minimum above UVLO falling, V */
    BR_RAIL_M_RESTART, /* above UVLO rising, V */
    BR_RAIL_M_DRIVE,   /* above the minimum useful drive, V */
    BR_RAIL_M_GATE,    /* gate absolute maximum above the driver supply maximum, V */
    BR_RAIL_CAP_PEAK,  /* capacitor voltage peak, V */
    BR_RAIL_CAP_RMS,   /* capacitor RMS current, A */
    BR_RAIL_KEY_COUNT
} br_rail_key;
BR_API int br_steady_rail(const br_analysis *a, int d, int k, int key, double *out);

typedef enum br_link_key {
    BR_LINK_VREV = 0, /* peak reverse voltage with the edge overshoot, V */
    BR_LINK_VRRM,     /* its rating, V (0: not given) */
    BR_LINK_IAVG,     /* forward current, A */
    BR_LINK_IRMS,
    BR_LINK_IPEAK,
    BR_LINK_QRR,     /* recovery charge per period, C */
    BR_LINK_P_DIODE, /* the diode's whole loss, W */
    BR_LINK_TJ,      /* junction temperature, K */
    BR_LINK_KEY_COUNT
} br_link_key;
/* Link k (1 <= k < stages) of case d. */
BR_API int br_steady_link(const br_analysis *a, int d, int k, int key, double *out);

/* ---- the hold-up time (BR_PART_HOLDUP) ---------------------------------- */

/* From steady case d, at its quiet instant, switching stops (the switches
 * the design's hold-on names stay on, every other turns off) and the
 * rails drain until the first driver supply crosses UVLO falling. */
typedef enum br_holdup_key {
    BR_HU_DECIDED = 0, /* 1: simulated; 0: the steady case has no period to start
                          from (br_steady_why says why), the figures are NaN */
    BR_HU_DROPPED,     /* 1: a driver crossed UVLO falling within the time simulated */
    BR_HU_TIME,        /* hold-up time, s; +inf when none dropped (see BR_HU_SIMULATED) */
    BR_HU_STAGE,       /* the driver that dropped first, -1 */
    BR_HU_V_AT,        /* its driver supply at the crossing, V */
    BR_HU_SIMULATED,   /* the time simulated when none dropped, s */
    BR_HU_KEY_COUNT
} br_holdup_key;
BR_API int br_holdup_get(const br_analysis *a, int d, int key, double *out);

/* ---- time series ------------------------------------------------------- */

/* Which series: the start-up, or steady case d as BR_SERIES_STEADY + d. */
enum { BR_SERIES_STARTUP = 0, BR_SERIES_STEADY = 1 };
typedef enum br_series_key {
    BR_SERIES_TIME = 0, /* s (k ignored) */
    BR_SERIES_RAIL,     /* rail k, V */
    BR_SERIES_LINK_I,   /* link k's forward current (k = 0: the supply's), A */
    BR_SERIES_DRIVER,   /* driver supply k, V */
    BR_SERIES_VREV,     /* link k's reverse voltage, V */
    BR_SERIES_KEY_COUNT
} br_series_key;
/* Copies up to cap samples of the series into buf (may be NULL with cap
 * 0) and sets *len to the series' length: call once to size the buffer.
 * BR_EUSAGE when the series were not kept (br_analysis_set_series). */
BR_API int br_series_get(const br_analysis *a, int series, int key, int k, double *buf, size_t cap,
                         size_t *len);

/* ---- the verdict ------------------------------------------------------- */

typedef enum br_result {
    BR_RESULT_PASS = 0,
    BR_RESULT_FAIL = 1,
    BR_RESULT_WARN = 2,         /* passes, with a finding the note states */
    BR_RESULT_UNDETERMINED = 3, /* the figures it needs could not be settled */
    BR_RESULT_NOT_APPLICABLE = 4
} br_result;

/* The run's verdict: FAIL when a criterion fails, else UNDETERMINED when
 * one is, else PASS (a warning passes). */
BR_API int br_verdict_result(const br_analysis *a, int *out);
/* The criteria the run judged. */
BR_API int br_verdict_rows(const br_analysis *a, int *out);
BR_API int br_verdict_result_of(const br_analysis *a, int i, int *out);
/* Short key (e.g. "uvlo"), title, unit ("s", "V", "A", "" for a count). */
BR_API int br_verdict_key(const br_analysis *a, int i, const char **out);
BR_API int br_verdict_title(const br_analysis *a, int i, const char **out);
BR_API int br_verdict_unit(const br_analysis *a, int i, const char **out);
/* The note: where it binds or why it is undetermined ("" when none). */
BR_API int br_verdict_note(const br_analysis *a, int i, const char **out);
/* The binding rail or link, -1 when none. */
BR_API int br_verdict_stage(const br_analysis *a, int i, int *out);
typedef enum br_verdict_value_key {
    BR_VERDICT_FIGURE = 0,
    BR_VERDICT_LIMIT,
    BR_VERDICT_MARGIN, /* NaN for a status row (the steady state) */
    BR_VERDICT_KEY_COUNT
} br_verdict_value_key;
BR_API int br_verdict_value(const br_analysis *a, int i, int key, double *out);

/* Every criterion of the verdict: how many, and criterion i's key and
 * title (NULL for i out of range).  The corners' and the yield's rows are
 * these, in this order. */
BR_API int br_criteria(void);
BR_API const char *br_criterion_key(int i);
BR_API const char *br_criterion_title(int i);

/* ---- the worst-case corners --------------------------------------------- */

/* Every toleranced value of a design at its minimum or maximum: for each
 * criterion the corner with the smallest margin (a failing one before any
 * passing one); every corner when there are few parameters, else the
 * corners of the parameters each criterion is most sensitive to.  A
 * corner where a criterion cannot be decided is counted apart: a
 * criterion that fails nowhere but is undetermined somewhere is
 * undetermined, never a pass. */
typedef struct br_corner_search br_corner_search;

BR_API br_corner_search *br_corner_search_create(void);
BR_API void br_corner_search_free(br_corner_search *s);
/* The hook counts corners judged of those listed so far. */
BR_API int br_corner_search_set_progress(br_corner_search *s, br_progress_hook hook,
                                         br_stop_poll stop, void *ctx);
/* 1 (the default): search the start-up criteria too (a cold start per
 * corner, slower); 0: the steady-state criteria alone. */
BR_API int br_corner_search_set_startup(br_corner_search *s, int on);
/* Worker threads of the studies that spread their points: 0 (the
 * default) one per online processor, else 1 .. BR_THREADS_MAX.  The
 * results do not depend on it. */
#define BR_THREADS_MAX 64
BR_API int br_corner_search_set_threads(br_corner_search *s, int n);
/* Every corner is tried up to n toleranced parameters (default 10, 0 ..
 * BR_CORNERS_EXHAUSTIVE_MAX); beyond, the search is guided by
 * one-at-a-time sensitivities. */
#define BR_CORNERS_EXHAUSTIVE_MAX 16
BR_API int br_corner_search_set_exhaustive(br_corner_search *s, int n);
/* The steady-state solver's work limit at each corner, as
 * br_analysis_set_solver_limit (0: none). */
BR_API int br_corner_search_set_solver_limit(br_corner_search *s, long n);
/* Search d (it may be freed once this returns).  BR_ECANCEL when stopped. */
BR_API int br_corner_search_run(br_corner_search *s, const br_design *d, br_error *err);

/* FAIL when a criterion fails at some corner, else UNDETERMINED when one
 * is undetermined at some corner, else PASS. */
BR_API int br_corner_result(const br_corner_search *s, int *out);
/* Rows: one per criterion of the verdict (NOT_APPLICABLE when never
 * checked). */
BR_API int br_corner_rows(const br_corner_search *s, int *out);
BR_API int br_corner_key(const br_corner_search *s, int i, const char **out);
BR_API int br_corner_result_of(const br_corner_search *s, int i, int *out);
/* The binding rail or link at the worst corner, -1. */
BR_API int br_corner_stage(const br_corner_search *s, int i, int *out);
typedef enum br_corner_key_kind {
    BR_CORNER_WORST_FIGURE = 0, /* at the worst corner, in the criterion's unit */
    BR_CORNER_WORST_LIMIT,
    BR_CORNER_WORST_MARGIN,
    BR_CORNER_NOMINAL_FIGURE, /* at the nominal point */
    BR_CORNER_NOMINAL_MARGIN,
    BR_CORNER_UNDETERMINED, /* corners where it could not be decided */
    BR_CORNER_KEY_COUNT
} br_corner_key_kind;
BR_API int br_corner_value(const br_corner_search *s, int i, int key, double *out);
/* The toleranced parameters, their names ("capacitor x7r-2u2-25v: c"),
 * and where parameter j sits at row i's worst corner: -1 its minimum, 0
 * nominal, +1 its maximum. */
BR_API int br_corner_params(const br_corner_search *s, int *out);
BR_API int br_corner_param_name(const br_corner_search *s, int j, const char **out);
BR_API int br_corner_level(const br_corner_search *s, int i, int j, int *out);
typedef enum br_corner_count {
    BR_CORNERS_STEADY_POINTS = 0, /* corners judged without a cold start */
    BR_CORNERS_STARTUP_POINTS,    /* with one */
    BR_CORNERS_UNJUDGED,          /* corners that could not be judged at all */
    BR_CORNERS_UNDETERMINED,      /* corners where some criterion was not decided */
    BR_CORNERS_COUNT_KEYS
} br_corner_count;
BR_API int br_corner_count_of(const br_corner_search *s, int key, long *out);

/* ---- the window: how far duty and frequency can move -------------------- */

/* Along each axis (duty at the design frequency, frequency at the design
 * duty; on a line cycle the peak current and the line frequency) a scan
 * from the design point outward, each change between holding and failing
 * narrowed by Brent's method: every interval where every criterion holds,
 * the one around the design point giving the limits.  Optionally the
 * start-up window: how far duty and frequency can go with the cold start
 * still completing in time (a cold start per point: slow). */
typedef struct br_window_study br_window_study;

BR_API br_window_study *br_window_study_create(void);
BR_API void br_window_study_free(br_window_study *w);
BR_API int br_window_study_set_progress(br_window_study *w, br_progress_hook hook,
                                        br_stop_poll stop, void *ctx);
/* 1: the start-up window too; 0 (the default): the steady-state limits. */
BR_API int br_window_study_set_startup(br_window_study *w, int on);
/* The frequency range searched, Hz (a line cycle's: the line frequency);
 * 0 for either end: the default (README, `window`).  A range that does
 * not fit the design makes the run return BR_EUSAGE, err saying why. */
BR_API int br_window_study_set_range(br_window_study *w, double fmin, double fmax);
/* Search d (it may be freed once this returns). */
BR_API int br_window_study_run(br_window_study *w, const br_design *d, br_error *err);

enum {
    BR_WINDOW_DUTY = 0,      /* duty (a fraction) at the design frequency */
    BR_WINDOW_FREQUENCY = 1, /* switching frequency (Hz) at the design duty */
    BR_WINDOW_PEAK = 2,      /* a line cycle's peak current (A) */
    BR_WINDOW_LINE = 3       /* a line cycle's frequency (Hz) */
};
/* The design point: BR_RESULT_PASS when it holds, FAIL when not,
 * UNDETERMINED when no periodic steady state was found there. */
BR_API int br_window_result(const br_window_study *w, int *out);
typedef enum br_window_axis_key {
    BR_WA_APPLIES = 0, /* 1: this axis was searched */
    BR_WA_LO,          /* the range searched */
    BR_WA_HI,
    BR_WA_DESIGN,     /* the design's value */
    BR_WA_FIXED,      /* the other coordinate, held */
    BR_WA_RESOLUTION, /* duty and peak current: absolute; frequencies: relative */
    BR_WA_SPANS,      /* intervals found where it holds (0: never holds) */
    BR_WA_HOME,       /* the interval holding the design point, -1 when it fails there */
    BR_WA_KEY_COUNT
} br_window_axis_key;
BR_API int br_window_axis(const br_window_study *w, int axis, int key, double *out);

typedef enum br_window_span_key {
    BR_WS_LOW = 0,     /* the lowest value that holds */
    BR_WS_LOW_FOUND,   /* 1: a failing value lies just below it (else the range ends) */
    BR_WS_LOW_OUTSIDE, /* that failing value (NaN when the range ends) */
    BR_WS_HIGH,        /* the highest value that holds */
    BR_WS_HIGH_FOUND,
    BR_WS_HIGH_OUTSIDE,
    BR_WS_KEY_COUNT
} br_window_span_key;
/* Interval s (0 .. BR_WA_SPANS - 1, ascending) of an axis. */
BR_API int br_window_span(const br_window_study *w, int axis, int s, int key, double *out);

typedef enum br_window_startup_key {
    BR_WU_APPLIES = 0,   /* 1: searched (br_window_study_set_startup) on this axis */
    BR_WU_DESIGN_STARTS, /* 1: the cold start completes at the design point */
    BR_WU_LOW,           /* the furthest value found starting, toward the low end */
    BR_WU_LOW_FAILING,   /* the nearest failing one beyond it (NaN: none found) */
    BR_WU_LOW_STALLED,   /* the first stalled rail there, -1 */
    BR_WU_HIGH,          /* the same toward the high end */
    BR_WU_HIGH_FAILING,
    BR_WU_HIGH_STALLED,
    BR_WU_KEY_COUNT
} br_window_startup_key;
/* The start-up window along BR_WINDOW_DUTY or BR_WINDOW_FREQUENCY. */
BR_API int br_window_startup(const br_window_study *w, int axis, int key, double *out);

/* ---- the map: the worst margin over a duty-frequency grid --------------- */

/* Every grid point judged as the window judges one: its steady states,
 * its worst margin (V, negative fails; NaN when a steady state was not
 * found) and what binds it. */
typedef struct br_map_study br_map_study;

BR_API br_map_study *br_map_study_create(void);
BR_API void br_map_study_free(br_map_study *m);
/* The hook counts grid points judged (called from the workers, one at a
 * time). */
BR_API int br_map_study_set_progress(br_map_study *m, br_progress_hook hook, br_stop_poll stop,
                                     void *ctx);
/* The grid: nduty duties from duty_from to duty_to (fractions) times nfsw
 * frequencies from fsw_from to fsw_to (Hz, spaced by equal ratios), each
 * count 1 .. 400.  Required before a run; checked by the run. */
BR_API int br_map_study_set_grid(br_map_study *m, double duty_from, double duty_to, int nduty,
                                 double fsw_from, double fsw_to, int nfsw);
/* The grid as the run checks it: BR_OK, or the error naming the axis
 * (field "duty" or "freq") and what is wrong. */
BR_API int br_map_study_check(const br_map_study *m, br_error *err);
/* Worker threads sharing the rows, 1 .. BR_MAP_THREADS_MAX (default 2);
 * the result does not depend on it. */
#define BR_MAP_THREADS_MAX 16
#define BR_MAP_POINTS_MAX 400 /* points per axis */
BR_API int br_map_study_set_threads(br_map_study *m, int n);
/* Shards, as for the yield: with n > 0 a run judges the design point and
 * column and the frequency rows j with j mod n = k - 1 only (1 <= k <= n),
 * and renders no report; n = 0 (the default): the whole grid. */
BR_API int br_map_study_set_shard(br_map_study *m, int k, int n);
/* The bytes of one judged point (this build's own layout), the last run's
 * points as records (the grid, duty fastest, then the design point: count
 * nduty * nfsw + 1), and whether the shard set judged record k. */
BR_API size_t br_map_record_size(void);
BR_API int br_map_records(const br_map_study *m, const void **rec, long *count);
BR_API int br_map_study_judges(const br_map_study *m, long k, int *out);
/* Merging shards: the next runs take the points from rec (total records
 * of size bytes, the grid set first) and simulate nothing; BR_EUSAGE when
 * they do not fit it; rec NULL: judge them.  rec must outlive the runs. */
BR_API int br_map_study_set_given(br_map_study *m, const void *rec, size_t size, long total);
BR_API int br_map_study_run(br_map_study *m, const br_design *d, br_error *err);
/* The design point: BR_RESULT_PASS when it holds, FAIL when not,
 * UNDETERMINED when no periodic steady state was found there. */
BR_API int br_map_result(const br_map_study *m, int *out);

/* The grid's size. */
BR_API int br_map_size(const br_map_study *m, int *nduty, int *nfsw);
typedef enum br_map_key {
    BR_MAP_DUTY = 0,  /* the point's duty (fraction) */
    BR_MAP_FSW,       /* its frequency, Hz */
    BR_MAP_MARGIN,    /* its worst margin, V (NaN: a steady state was not found) */
    BR_MAP_HOLDS,     /* 1: every steady state found and the margin >= 0 */
    BR_MAP_STAGE,     /* the binding rail, -1 */
    BR_MAP_CRITERION, /* the binding criterion (br_criterion_key); -1 where the dead
                         time leaves the bottom switches no on-time (no operating
                         point at all) */
    BR_MAP_KEY_COUNT
} br_map_key;
/* Point (i, j): duty i, frequency j; i = j = -1 is the design point. */
BR_API int br_map_point(const br_map_study *m, int i, int j, int key, double *out);

/* ---- Monte Carlo yield -------------------------------------------------- */

/* Samples draw every toleranced value from its distribution (one seeded
 * generator: sample i is the same whatever the sample count or threads);
 * a sample passes when every criterion that applies passes, fails when
 * one fails, and is undetermined otherwise.  The yield is the share of
 * the decided samples that pass, with its exact (Clopper-Pearson) 95 %
 * interval: its lower end counts every undetermined sample as failing,
 * its upper end as passing. */
typedef struct br_yield_study br_yield_study;

BR_API br_yield_study *br_yield_study_create(void);
BR_API void br_yield_study_free(br_yield_study *y);
/* The hook counts points judged (nominal, one-at-a-time, samples). */
BR_API int br_yield_study_set_progress(br_yield_study *y, br_progress_hook hook, br_stop_poll stop,
                                       void *ctx);
/* samples >= 1 (default 1000), the generator's seed (default 1). */
#define BR_YIELD_DEFAULT_SAMPLES 1000L
#define BR_YIELD_DEFAULT_SEED 1UL
BR_API int br_yield_study_set_samples(br_yield_study *y, long samples, unsigned long seed);
/* 1: judge the start-up criteria too (a cold start per sample); 0 (the
 * default): the steady-state criteria. */
BR_API int br_yield_study_set_startup(br_yield_study *y, int on);
/* Worker threads (0, the default: one per processor; the samples do not
 * depend on it), and the steady-state solver's work limit per sample as
 * br_analysis_set_solver_limit (0: none). */
BR_API int br_yield_study_set_threads(br_yield_study *y, int n);
BR_API int br_yield_study_set_solver_limit(br_yield_study *y, long n);
/* The minimum yield p (0 .. 1; negative: none, the default): with one the
 * study passes when the interval's lower end reaches p, fails when it
 * cannot even with every undetermined sample passing, else is
 * undetermined (br_yield_result, and the reports). */
BR_API int br_yield_study_set_min_yield(br_yield_study *y, double p);
/* Shards, to spread one study over processes or machines: with n > 0 a
 * run judges only the samples i with i mod n = k - 1 (1 <= k <= n; every
 * sample is still drawn), takes no statistics and renders no report; its
 * judged samples are br_yield_records.  n = 0 (the default): every sample. */
BR_API int br_yield_study_set_shard(br_yield_study *y, int k, int n);
/* Whether the shard set judges sample i (0 .. samples - 1). */
BR_API int br_yield_study_judges(const br_yield_study *y, long i, int *out);
/* The bytes of one judged sample: this build's own layout, to be given
 * back only to the same version of the library on the same kind of machine. */
BR_API size_t br_yield_record_size(void);
/* The last run's judged samples (count of br_yield_record_size bytes each;
 * a shard's other samples are zero), valid until the next run or the free. */
BR_API int br_yield_records(const br_yield_study *y, const void **rec, long *count);
/* Merging shards: the next runs take the samples from rec (total records
 * of size bytes, as the shards judged them, pieced together) instead of
 * judging them; the nominal and one-at-a-time points are judged again.
 * size must be br_yield_record_size() and total the samples set
 * (BR_EUSAGE otherwise); rec NULL: judge them.  rec must outlive the runs. */
BR_API int br_yield_study_set_given(br_yield_study *y, const void *rec, size_t size, long total);
/* Sample and judge d (it may be freed once this returns). */
BR_API int br_yield_study_run(br_yield_study *y, const br_design *d, br_error *err);

typedef enum br_yield_key {
    BR_YIELD_SAMPLES = 0,
    BR_YIELD_PASS,         /* samples that pass */
    BR_YIELD_FAIL,         /* samples where a criterion fails */
    BR_YIELD_UNDETERMINED, /* samples that neither pass nor fail */
    BR_YIELD_YIELD,        /* pass / (pass + fail); NaN when no sample is decided */
    BR_YIELD_LO,           /* the interval's ends */
    BR_YIELD_HI,
    BR_YIELD_KEY_COUNT
} br_yield_key;
BR_API int br_yield_get(const br_yield_study *y, int key, double *out);
/* Without a minimum yield: FAIL when a sample fails, else UNDETERMINED
 * when one is, else PASS; with one, as br_yield_study_set_min_yield says. */
BR_API int br_yield_result(const br_yield_study *y, int *out);

/* Per criterion i (0 .. br_criteria() - 1, as br_criterion_key names
 * them): */
typedef enum br_yield_crit_key {
    BR_YC_JUDGED = 0,   /* samples where it applies and is decided */
    BR_YC_FAILS,        /* samples where it fails */
    BR_YC_UNDETERMINED, /* samples where it could not be decided */
    BR_YC_MIN,          /* its margin over the deciding samples: the minimum, */
    BR_YC_Q001,         /* the 0.1 %, 1 %, 10 % quantiles and the median, in the */
    BR_YC_Q01,          /* criterion's unit (NaN for a status criterion) */
    BR_YC_Q10,
    BR_YC_MEDIAN,
    BR_YC_KEY_COUNT
} br_yield_crit_key;
BR_API int br_yield_criterion(const br_yield_study *y, int i, int key, double *out);
/* Spearman's rank correlation of parameter j with criterion i's margin
 * (NaN: undefined). */
BR_API int br_yield_rho(const br_yield_study *y, int i, int j, double *out);
/* The toleranced parameters, as br_corner_params gives them. */
BR_API int br_yield_params(const br_yield_study *y, int *out);
BR_API int br_yield_param_name(const br_yield_study *y, int j, const char **out);
/* Sample i: parameter j's drawn value (SI), and its result (BR_RESULT_*). */
BR_API int br_yield_sample_value(const br_yield_study *y, long i, int j, double *out);
BR_API int br_yield_sample_result(const br_yield_study *y, long i, int *out);

#ifdef __cplusplus
}
#endif
#endif

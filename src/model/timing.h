/* timing.h - one switching period cut at every event.
 *
 * The engine walks a period as a sorted list of events; between two events
 * every switch is commanded on, off, or (for the analysed current
 * direction) conducting in reverse while commanded off. */
#ifndef BR_MODEL_TIMING_H
#define BR_MODEL_TIMING_H

#include "model/chain.h"

typedef unsigned long long br_mask; /* bit s: switch s (bottom = 0) */

typedef enum br_event_kind {
    BR_EV_OFF = 0,     /* commanded off */
    BR_EV_REV_OFF = 1, /* stops conducting in reverse */
    BR_EV_ON = 2,      /* commanded on */
    BR_EV_REV_ON = 3   /* starts conducting in reverse */
} br_event_kind;

typedef struct br_event {
    double t; /* s, in [0, T) */
    int sw;   /* string position */
    int kind; /* br_event_kind */
} br_event;

#define BR_MAX_EVENTS (4 * BR_MAX_SWITCHES * BR_MAX_WINDOWS)

/* BR_DIRI_LINE: an AC line cycle, whose current changes direction period
 * by period (never an index into the per-direction tables of a stage:
 * each switching period takes BR_DIRI_DOWN or BR_DIRI_UP, br_line_dir). */
typedef enum br_dir_index {
    BR_DIRI_NONE = -1,
    BR_DIRI_DOWN = 0,
    BR_DIRI_UP = 1,
    BR_DIRI_LINE = 2
} br_dir_index;

#define BR_MAX_FLY (BR_MAX_SWITCHES / 2) /* flying capacitors 1..P-1, plus the ends */

typedef struct br_timing {
    double T;                   /* period, s */
    int n;                      /* switches */
    int nev;                    /* events in the period */
    br_event ev[BR_MAX_EVENTS]; /* sorted by t; offs before ons at a tie */
    br_mask on0;                /* commanded-on switches just after t = 0- (period start) */
    br_mask rev0;               /* reverse-conducting switches at the period start */
    /* Flying-capacitor ripple of an FCML leg, per ampere of load current
     * entering the switch node (step-up positive): capacitor k (1..P-1)
     * moves at (S(k+1) - S(k)) / Cfly, S(j) = 1 while pair j's top switch
     * conducts (commanded on, or in reverse in a dead time).  The ripple
     * is taken with zero mean over the period. */
    int npairs;                       /* P when the leg has ripple, else 0 */
    double cfly;                      /* F */
    double fly_start[BR_MAX_FLY + 1]; /* ripple of capacitor k at the period
                                         start, V/A; [0] and [P] stay 0 */
    double fly_ev0[BR_MAX_FLY + 1];   /* the same at the first event */
    double fly_pp[BR_MAX_FLY + 1];    /* its peak-to-peak swing over the period */
    double cell_lo[BR_MAX_FLY + 1];   /* extremes of cell j's ripple, fly[j-1] -
                                         fly[j], over the period (j = 1..P), V/A */
    double cell_hi[BR_MAX_FLY + 1];
} br_timing;

/* The events of one period for direction dir (a br_dir_index).  For a
 * chain on a line cycle: the first switching period of the line period
 * (br_timing_line, m = 0), its reverse conduction in the direction of its
 * own current unless dir is BR_DIRI_NONE. */
void br_timing_build(const br_chain *c, int dir, br_timing *tm);

/* The events of switching period m of c's line cycle (an FCML leg): the
 * pulses of each pair at the duty its carrier took, reverse conduction in
 * the dead times for direction dir (BR_DIRI_NONE: none).  held: every
 * carrier at period m's duty (the period repeated for ever, a
 * quasi-static state). */
void br_timing_line(const br_chain *c, long m, int dir, int held, br_timing *tm);

/* Over c's line cycle: the lowest voltage any switch blocks with the
 * flying capacitors' ripple of each period's current (HUGE_VAL without
 * ripple), the switching period *m and stage *stage where, and in *pp the
 * largest peak-to-peak ripple of a flying capacitor, V. */
double br_line_cell_min(const br_chain *c, long *m, int *stage, double *pp);

/* Sort tm's events and derive the flying capacitors' ripple from them
 * (the last step of building a timing). */
void br_timing_sort(const br_chain *c, br_timing *tm);

/* Masks in force at time t in [0, T). */
void br_timing_state_at(const br_timing *tm, double t, br_mask *on, br_mask *rev);

/* Ripple slopes, V/(A s), of every flying capacitor while the switches in
 * `conducting` conduct (sl[0] and sl[P] are 0). */
void br_timing_fly_slopes(const br_timing *tm, br_mask conducting, double *sl);

/* Ripple of every flying capacitor at time t in [0, T), V/A, and its
 * slope there (after the events at t). */
void br_timing_fly_at(const br_timing *tm, double t, double *fly, double *sl);

/* Peak-to-peak ripple of every flying capacitor over the period, V/A
 * (pp[0] and pp[P] are 0). */
void br_timing_fly_swing(const br_timing *tm, double *pp);

/* The lowest voltage any switch of c blocks over the period with the
 * ripple of load current i (A, step-up positive), and its stage in
 * *stage (-1 and HUGE_VAL without ripple).  Zero or below: the flying
 * capacitors cannot hold their cells, and the model does not apply. */
double br_timing_cell_min(const br_timing *tm, const br_chain *c, double i, int *stage);

/* Apply event e to the commanded and reverse-conducting masks. */
void br_event_apply(const br_event *e, br_mask *on, br_mask *rev);

/* 1 when t lies in the wrapped interval [a, b) of a period T. */
int br_in_interval(double t, double a, double b);

#endif

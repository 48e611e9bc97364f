/* line.h - an AC line cycle at the operating point, resolved for one
 * chain: which switching period sits where in the line period, and the
 * duty and load current each one takes.
 *
 * The line period holds K switching periods, K the whole number nearest
 * fsw / f_line, so that the chain is periodic in it: the line frequency
 * simulated is fsw / K (within 1/(2K) of the design's).  Switching period
 * m (0 .. K-1, counted from line phase 0) is taken at the line phase of
 * its centre, theta_m = 2 pi (m + 1/2) / K; its duty is the modulation's
 * value there and its load current i(theta_m), both held over the period
 * (regular sampling). */
#ifndef BR_MODEL_LINE_H
#define BR_MODEL_LINE_H

#include "model/design.h"

#define BR_PI 3.14159265358979323846

typedef struct br_line {
    int on;                 /* the chain runs an AC line cycle */
    long K;                 /* switching periods per line period */
    double freq;            /* line frequency simulated, fsw / K, Hz */
    double freq_given;      /* as the design gives it, Hz */
    double ipk;             /* peak load current, A */
    double phase;           /* the current lags the modulation by this, rad */
    double depth;           /* sine modulation depth (ntab == 0) */
    int ntab;               /* duty table points (0: sine modulation) */
    const double *tab_at;   /* line phases, rad (points into the design) */
    const double *tab_duty; /* duties there */
} br_line;

/* Resolve the design's line cycle at nominal values for switching
 * frequency fsw (ac->on == 0 leaves l->on 0). */
void br_line_resolve(const br_line_spec *ac, double fsw, br_line *l);

/* m wrapped into 0 .. K-1. */
long br_line_index(const br_line *l, long m);

/* Line phase of the centre of switching period m, rad in [0, 2 pi). */
double br_line_theta(const br_line *l, long m);

/* The modulation's duty at line phase theta: 1/2 (1 + depth sin theta),
 * or the duty table interpolated linearly and periodically. */
double br_line_duty_at(const br_line *l, double theta);

/* Duty of switching period m. */
double br_line_duty(const br_line *l, long m);

/* Load current of switching period m, A: ipk sin(theta_m - phase),
 * positive out of the switch node (step-down). */
double br_line_current(const br_line *l, long m);

/* Where window w of a line-period simulation lies: the windows are
 * switching periods long and start `offset` (s) into each switching
 * period.  *theta (rad, [0, 2 pi)) is the line phase of the window's
 * centre, *m the switching period that holds that centre. */
void br_line_window(const br_line *l, double T, double offset, long w, double *theta, long *m);

/* Direction of period m's current, a br_dir_index value: 0 (step-down)
 * for a positive current, 1 (step-up) for a negative one, -1 for none. */
int br_line_dir(const br_line *l, long m);

#endif

/* diode.h - the link diode: Shockley junction with series resistance,
 * temperature, depletion capacitance, charge-control stored charge and
 * reverse leakage.  Pure functions of a resolved br_diode (model/chain.h). */
#ifndef BR_ENGINE_DIODE_H
#define BR_ENGINE_DIODE_H

#include "model/chain.h"

/* Resolve a part at junction temperature T (K): Vt = kT/q, Is(T) by the
 * junction temperature law Is (T/Tnom)^(xti/n) exp(Eg/(n Vt) (T/Tnom - 1))
 * (Eg in eV), leakage ir * 2^((T - ir_temp)/ir_double); the rest copied.
 * Uses the .nom of every quantity.  Returns BR_EINPUT, naming the field
 * ("diode[ID]/is") and line, for a non-physical value (is, n, vj,
 * ir_temp, ir_double or tnom not > 0; rs, cj0, m, tau, eg, ir, vrrm,
 * ifsm negative; anything not finite), for T not > 0, or when Is(T)
 * over- or underflows; *out is then left untouched. */
int br_diode_resolve(const br_diode_part *p, double T, br_diode *out, br_error *err);

/* Forward current through the junction plus rs plus r_extra for a terminal
 * voltage v (may be negative): closed form through Lambert W, no iteration
 * for the caller.  Never overflows for large v.  Relative error ~1e-14
 * over |v| <= 1000 V and R from 1 mohm to 1 kohm; no allocation, about
 * 7 ns in deep reverse and 50-80 ns elsewhere.  rs + r_extra must be
 * >= 0; when it is not > 0 the plain Shockley law is used, continued as a
 * straight line (same slope) beyond v = BR_DIODE_XLIM * n * Vt so that it
 * stays finite. */
double br_diode_current(const br_diode *d, double r_extra, double v);

/* d(current)/dv of br_diode_current at v (S). */
double br_diode_conductance(const br_diode *d, double r_extra, double v);

/* Both at once, for the inner loop of a solver (one solve instead of two):
 * *i = br_diode_current(...), *g = br_diode_conductance(...).  Either
 * pointer may be NULL. */
void br_diode_eval(const br_diode *d, double r_extra, double v, double *i, double *g);

/* What br_diode_eval_warm keeps between calls on one link. */
typedef struct br_diode_warm {
    double r, a;  /* resistance (ohm, 0: none yet) and n Vt (V) of the last call */
    double c;     /* Is R / (n Vt) at those */
    double logc;  /* its logarithm */
    double inv_a; /* 1 / (n Vt) */
    double a_r;   /* n Vt / R */
    double w;     /* Lambert W value of the last call */
    double u;     /* its argument's logarithm (w + ln w = u) */
    double slope; /* dw/du there, w / (1 + w) */
    double lw;    /* ln w there, when have_lw */
    int have_lw;
    double y, s; /* y = w - c and s = v/(n Vt) of the last Halley solve */
    int have_y;  /* y and s are set (at this resistance) */
} br_diode_warm;

/* br_diode_eval for a hot loop that calls it on one link again and again
 * with slowly changing v: the iteration starts from the last solution
 * moved along its tangent (dw/du = w/(1 + w)), so one step of it, one
 * transcendental function, usually ends it.  Same results to rounding.
 * ws starts zeroed. */
void br_diode_eval_warm(const br_diode *d, double r_extra, double v, br_diode_warm *ws, double *i,
                        double *g);

/* Integrals of the diode with series resistance R = rs + r_extra (> 0)
 * over its drive voltage, from 0 up to u: with the rails still, a drive
 * swept at the rate sigma (V/s) passes the charge q / sigma, and i2 /
 * sigma and e / sigma are the integrals of i^2 and of i times the voltage
 * across the diode's own terminals (junction plus rs) over that time. */
typedef struct br_diode_sweep {
    double i;  /* current at u, A */
    double q;  /* integral of i du, A V */
    double i2; /* integral of i^2 du, A^2 V */
    double e;  /* integral of i (vj + rs i) du, A V^2 */
} br_diode_sweep;

/* Closed forms through du = (n Vt / (Is + i) + R) di; all zero for u <= 0
 * (the reverse part is the leakage model's).  For the charge passed while
 * a switch edge sweeps a link through conduction. */
void br_diode_sweep_to(const br_diode *d, double r_extra, double u, br_diode_sweep *out);

/* Where the R = 0 Shockley law turns into its tangent line, in units of
 * n*Vt (exp(700) ~ 1e304 is still finite). */
#define BR_DIODE_XLIM 700.0

/* Junction voltage at forward current i > -Is (returns -HUGE_VAL for
 * i <= -Is, where no junction voltage gives that current). */
double br_diode_vjunction(const br_diode *d, double i);

/* Depletion capacitance (F) and charge (C) at reverse voltage vr: Cj0 /
 * (1 + vr/vj)^m and its integral from 0 to vr (vr may be slightly
 * negative; forward bias beyond vj/2 is linearised as usual). */
double br_diode_cj(const br_diode *d, double vr);
double br_diode_qj(const br_diode *d, double vr);

/* Charge-control stored charge: dq/dt = i - q/tau with i constant over dt;
 * exact step.  tau = 0 means no stored charge (returns 0). */
double br_diode_q_step(double q, double i, double tau, double dt);

/* Reverse leakage current at reverse voltage vr (A, >= 0):
 * ir * (1 - exp(-vr/Vt)) for vr > 0, so it rises smoothly from 0 and
 * saturates at the resolved ir within a few Vt; 0 for vr <= 0. */
double br_diode_leak(const br_diode *d, double vr);

/* Forward-bias fraction of vj beyond which br_diode_cj is continued along
 * its tangent (common practice in junction-capacitance models). */
#define BR_DIODE_FC 0.5

/* Reverse recovery as a triangle of reverse current, Qrr = Irrm * trr / 2
 * (N. Mohan, T. Undeland, W. Robbins, "Power Electronics: Converters,
 * Applications, and Design", the chapter on power diodes).  The forward
 * current falls at the rate didt (A/s, > 0) imposed by the circuit through
 * zero; the reverse current keeps growing at that rate for ta until the
 * junction charge is gone, peaks at Irrm = didt * ta, and returns to zero
 * in tb = soft * ta.  Hence
 *     Qrr  = Irrm * (ta + tb) / 2 = Irrm^2 * (1 + soft) / (2 * didt),
 *     Irrm = sqrt(2 * Qrr * didt / (1 + soft)),
 *     trr  = (1 + soft) * Irrm / didt.
 * soft = 0 is the abrupt limit tb << ta in which Mohan et al. give
 * Irrm = sqrt(2 Qrr didt) and trr = sqrt(2 Qrr / didt) (quoted from
 * memory).  The charge-control model carries no information about the
 * shape of the tail, so the default is BR_DIODE_SOFTNESS = 1, the
 * symmetric triangle: the middle of the usual range of the softness factor
 * tb/ta (below 1 for snappy parts, above 1 for soft-recovery parts, common
 * practice).  Against soft = 0 it gives, for the same Qrr, an Irrm lower by
 * sqrt(2) and a trr longer by sqrt(2).  Qrr is taken as the charge the
 * charge-control model (br_diode_q_step) holds when the current reverses,
 * neglecting recombination during ta. */
#define BR_DIODE_SOFTNESS 1.0

typedef struct br_recovery {
    double irrm; /* peak reverse current, A (>= 0) */
    double trr;  /* reverse-recovery time ta + tb, s */
    double ta;   /* from the current zero crossing to the peak, s */
    double tb;   /* from the peak back to zero, s */
} br_recovery;

/* Fill out from qrr (C, >= 0), didt (A/s, > 0) and soft (>= 0).  Returns
 * BR_OK, or BR_EUSAGE with *out zeroed when an argument is out of range
 * or not finite.  qrr = 0 gives all zeros. */
int br_diode_recovery(double qrr, double didt, double soft, br_recovery *out);

#endif

/* forward_fit.h - Shockley parameters from measured forward points.
 *
 * A diode with series resistance obeys v = n*Vt*ln(i/Is + 1) + i*Rs.  For
 * forward points well above Is the "+1" is negligible and the law is linear
 * in three unknowns:
 *     v = a*ln(i) + b + Rs*i,   a = n*Vt,  b = -n*Vt*ln(Is).
 * Three points give an exact solve; more give a linear least-squares fit
 * (QR by modified Gram-Schmidt, columns scaled).  A fit that wants a
 * negative Rs is redone with Rs = 0 (two unknowns).  The "+1" is then put
 * back by a few fixed-point passes that subtract a*ln(1 + Is/i), taken from
 * the previous pass, from the voltages. */
#ifndef BR_IO_FORWARD_FIT_H
#define BR_IO_FORWARD_FIT_H

#include "model/chain.h" /* br_thermal_voltage */
#include <stddef.h>

#define BR_FIT_MAX 32 /* most forward points accepted */

/* i[k] > 0 (A) ascending, v[k] (V), k < npts, 3 <= npts <= BR_FIT_MAX; vt is
 * the thermal voltage at the temperature of the points.  Returns 0 and sets
 * *is (A), *n, *rs (ohm), or returns -1 with the reason in why. */
int br_forward_fit(const double *i, const double *v, int npts, double vt, double *is, double *n,
                   double *rs, char *why, size_t cap);

#endif

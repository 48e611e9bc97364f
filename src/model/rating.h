/* rating.h - the voltage class a series string's switches and link diodes
 * need, by the rule of the trade: the nser switches of one side of a leg
 * (an N-level flying-capacitor leg: nser = N - 1) each block the bus
 * voltage divided by nser, and a part is used up to a fraction `derating`
 * of its rated voltage.  The exploration of level counts and voltage
 * classes starts from this; the simulation then judges what the rule does
 * not see (imbalance, overshoot, the bootstrap rails). */
#ifndef BR_MODEL_RATING_H
#define BR_MODEL_RATING_H

/* Voltage each of nser series switches blocks on a vbus bus, V (NAN when
 * nser < 1 or vbus is not positive). */
double br_rating_share(double vbus, int nser);

/* Rated voltage a part needs there at the derating fraction (0 < derating
 * <= 1), V (NAN when an argument is out of range). */
double br_rating_needed(double vbus, int nser, double derating);

/* Index of the lowest of the n voltage classes (V, in any order) that is
 * at least need; -1 when none is. */
int br_rating_class(const double *classes, int n, double need);

#endif

/* holdup.h - hold-up time: how long the floating rails last once the
 * converter stops switching (burst-mode pause, fault, idle).
 *
 * From a periodic steady state, at its quiet instant, switching stops:
 * the switches in `hold_on` stay on (if their drivers run) and every
 * other switch turns off.  With its return switch off no link can
 * recharge its rail, so each rail drains into its driver, regulator and
 * leakage until the first driver supply crosses UVLO falling. */
#ifndef BR_ANALYSES_HOLDUP_H
#define BR_ANALYSES_HOLDUP_H

#include "analyses/steady.h"

typedef struct br_holdup {
    int dir;                     /* br_dir_index of the steady state it starts from */
    br_mask hold_on;             /* switches held on after the stop */
    int dropped;                 /* a driver crossed UVLO falling within t_max */
    double t;                    /* hold-up time: from the stop to that crossing, s */
    int stage;                   /* the driver that dropped first, -1 */
    double v_at;                 /* its driver supply at the crossing, V */
    double t_max;                /* time simulated when none dropped, s */
    double vc0[BR_MAX_SWITCHES]; /* capacitor voltages at the stop, V */
} br_holdup;

/* Simulate the stop from steady state ss of chain c (the chain's real
 * thresholds).  t_max <= 0 picks a bound from the rails' charge and
 * loads. */
int br_holdup_run(const br_chain *c, const br_steady *ss, br_mask hold_on, double t_max,
                  br_holdup *out, br_error *err);

/* Load current of rail k with switching stopped: its driver's quiescent
 * and isolator currents and its regulator's own current, A (the leakage
 * of the diodes is left out). */
double br_holdup_load(const br_chain *c, int k);

#endif

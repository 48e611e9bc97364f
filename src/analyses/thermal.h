/* thermal.h - junction temperatures from a thermal resistance to ambient.
 *
 * A part that dissipates P(T) at junction temperature T sits where
 *     T = Ta + Rth P(T).
 * For a link diode P(T) = Pc + Pl(T): conduction, recovery and junction
 * capacitance Pc (taken as constant over one solve: the steady state is
 * simulated again at the new temperature), and leakage Pl(T) =
 * W Ir 2^((T - T0)/Td), W the mean reverse voltage over the period while
 * blocking (leakage energy over leakage current).  The leakage law is
 * exponential, so the balance may have no solution: the part heats until
 * it fails (thermal runaway).  With a = ln 2 / Td,
 *     g(T) = Ta + Rth P(T) - T
 * is convex; its minimum lies at T* where Rth dP/dT = 1, and a fixed point
 * exists exactly when g(T*) <= 0: the smaller root is the stable one
 * (there Rth dP/dT < 1), T* is where the runaway starts, and the ambient
 * at which it starts is Ta* = T* - Rth P(T*).  docs/physics.md derives the
 * same in closed form with the Lambert W function. */
#ifndef BR_ANALYSES_THERMAL_H
#define BR_ANALYSES_THERMAL_H

#include "model/chain.h"

typedef struct br_thermal {
    int runaway;      /* no fixed point: the junction heats without bound */
    double tj;        /* the stable fixed point, K (runaway: onset_tj) */
    double onset_tj;  /* the junction temperature where Rth dP/dT = 1, K
                         (HUGE_VAL without leakage) */
    double onset_amb; /* the ambient at which the fixed point disappears, K
                         (HUGE_VAL without leakage) */
} br_thermal;

/* The junction temperature of a part at ambient ta (K) behind rth (K/W)
 * dissipating pc + pl 2^((T - t0)/td) (W; t0, td in K).  Solved by
 * bisection to 1e-9 K on the convex balance (no more than 200 steps).
 * Returns BR_EUSAGE for arguments out of range (negative, not finite,
 * td not > 0). */
int br_thermal_solve(double ta, double rth, double pc, double pl, double t0, double td,
                     br_thermal *out);

/* The leakage law of link k's diode part (k >= 1): its leakage ir (A) at
 * t0 (K), doubling every td (K). */
void br_link_leak_law(const br_chain *c, int k, double *ir, double *t0, double *td);

/* 1 when some link diode of c has a thermal resistance to ambient, so
 * that its junction temperature comes from its losses. */
int br_chain_thermal(const br_chain *c);

#endif

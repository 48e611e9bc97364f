/* rules.h - design rules that need no simulation.
 *
 * Each rule compares one figure of the nominal chain with a limit and, when
 * the figure breaks the limit, adds a finding.  Findings are data (kind,
 * stage, part, figure, limit); the report layer turns them into sentences.
 * Nothing here allocates or prints. */
#ifndef BR_ANALYSES_RULES_H
#define BR_ANALYSES_RULES_H

#include "model/chain.h"

typedef enum br_rule_kind {
    BR_RULE_DIODE_RATING = 0, /* vrrm < vblock (1 + overshoot) */
    BR_RULE_DIODE_DERATING,   /* vrrm * derating < vblock (1 + overshoot) */
    BR_RULE_DIODE_UNRATED,    /* the diode states no vrrm: nothing to check */
    BR_RULE_UVLO_HYSTERESIS,  /* uvlo_fall >= uvlo_rise */
    BR_RULE_SUPPLY_SHORT,     /* the supply minus the drops misses uvlo_rise */
    BR_RULE_AUX_BELOW_UVLO,   /* a clamp or regulator holds the rail below uvlo_rise */
    BR_RULE_GATE_UNPROTECTED, /* vgs_max < supply, no regulator or clamp */
    BR_RULE_AUX_ABOVE_GATE,   /* regulator or clamp output above vgs_max */
    BR_RULE_NO_WINDOW,        /* the return switch is never on: the link never charges */
    BR_RULE_FLY_COLLAPSE,     /* the flying capacitors' ripple at the load current
                                 leaves a switch no blocking voltage */
    BR_RULE_IMPLAUSIBLE,      /* a value no part of its kind has (a unit slip?) */
    BR_RULE_PRECHARGE_IDLE,   /* a pre-charge step holds switches whose drivers are in
                                 UVLO for the whole step: they never turn on in it */
    BR_RULE_CAP_DERATING,     /* a class II ceramic may reach more than cap-derating of
                                 its rating (common practice) */
    BR_RULE_INJECT_SHORT,     /* an injection's voltage less its diode and resistance drops
                                 misses its rail's start voltage: it cannot act */
    BR_RULE_INJECT_LATE,      /* an injection starts after the longest start-up simulated */
    BR_RULE_KINDS
} br_rule_kind;

/* One broken rule. */
typedef struct br_rule_hit {
    int kind;         /* br_rule_kind */
    int stage;        /* stage (rail, link) index the finding is about */
    const char *part; /* id of the part concerned (points into the design) */
    double figure;    /* the value that breaks the limit, SI (V) */
    double limit;     /* the limit it breaks, SI (V) */
    double current;   /* SUPPLY_SHORT: estimated link current used, A;
                         FLY_COLLAPSE: the load current, A */
    int fatal;        /* 1 when the chain cannot work at all */
    /* IMPLAUSIBLE: the attribute, its SI unit and the plausible range
     * [lo, limit] the figure lies outside */
    const char *what;
    const char *unit;
    double lo;
    /* PRECHARGE_IDLE: the step (0-based), the held switches that cannot
     * turn on in it (stage is the lowest of them, figure the earliest its
     * driver can leave UVLO, s, INFINITY when not before PWM; limit the
     * end of the step, s), and what bounds that time */
    int index;
    unsigned long long mask;
    int by_ramp; /* 1: the supply ramp; 0: the switch below never on before */
} br_rule_hit;

/* A handful of findings per stage, the plausibility findings (once per
 * part and attribute) and a few for the chain. */
#define BR_RULES_MAX (8 * BR_MAX_SWITCHES + 32)

typedef struct br_rule_list {
    int n;                         /* findings used */
    br_rule_hit hit[BR_RULES_MAX]; /* in stage order, then rule order */
} br_rule_list;

/* Run every rule on c.  Always succeeds on a chain that br_chain_build
 * accepted; returns BR_OK and the number of findings in out->n.
 *
 * The plausibility rule flags a nominal value outside the range any part
 * of its kind has in a gate-drive chain (a junction capacitance above
 * 10 nF, a gate charge above 10 uC, ...; the table is in rules.c and in
 * docs/design-file.md): the reader already insists on units, so such a
 * value is a slip of the prefix or the unit, not a bare number taken as SI.
 *
 * The pre-charge rule bounds from below when each driver can first leave
 * UVLO in the cold start, without simulating: a rail never exceeds the
 * supply, which ramps linearly to its highest tolerance value in the ramp
 * time, so driver k starts no earlier than ramp * need_k / supply_max
 * (need_k: the lowest UVLO rising of its part, plus the regulator's least
 * dropout); and rail k >= 1 charges only while switch k-1 is on, which
 * before PWM is only while a step holds it and its own driver runs.  The
 * charging time is taken as zero.  Every bound errs early, so a step the
 * rule flags holds switches that stay off in every corner. */
int br_rules_check(const br_chain *c, br_rule_list *out, br_error *err);

/* Reverse voltage the diode of link k (k >= 1) blocks: the blocking
 * voltage of its return switch k-1, without overshoot, V. */
double br_link_vblock(const br_chain *c, int k);

/* Average current link k carries in steady state: the consumption of
 * stages k..top (running quiescent, isolator, regulator quiescent and
 * gate charge times fsw), A.  k = 0 gives the supply's total. */
double br_link_current(const br_chain *c, int k);

/* Nominal drop of link k at its average current: junction voltage plus
 * the current through the diode's series resistance, the link resistor
 * and the return switch's on-resistance, V.  Every term is a lower bound
 * of the drop in operation (the real current flows in a window only). */
double br_link_drop(const br_chain *c, int k);

/* The lowest rail voltage at which driver k can leave UVLO over the
 * design's tolerances (UVLO rising plus a regulator's dropout), V. */
double br_rule_start_need(const br_chain *c, int k);

/* Short stable name of a rule, for machine-readable reports. */
const char *br_rule_name(int kind);

#endif

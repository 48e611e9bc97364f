/* netlist.h - a chain as a plain Berkeley SPICE3 netlist, for
 * cross-checking a rail in another circuit simulator (`bootrung netlist`;
 * docs/spice.md lists what the netlist simplifies).
 *
 * Nodes: 0 is the source of switch 0 (the leg's negative rail); sK the
 * source of switch K; rK rail K's positive side (rail K is rK - sK, rail 0
 * the supply's output).  Per stage: the link diode from rK-1 with its
 * resistance, the rail capacitor with its ESR, the driver as current
 * loads switched by a hysteretic UVLO switch, and switch K as a
 * behavioural source between sK and sK+1 that follows a piecewise-linear
 * command while its driver runs and blocks while it does not. */
#ifndef BR_REPORT_NETLIST_H
#define BR_REPORT_NETLIST_H

#include "model/chain.h"
#include "model/timing.h"

#define BR_NETLIST_MAX_PERIODS 100000L

typedef struct br_netlist_opts {
    int dir;             /* br_dir_index: the load current's direction, or
                            BR_DIRI_NONE for no load current */
    long periods;        /* switching periods in the sources and the transient,
                            1 .. BR_NETLIST_MAX_PERIODS */
    const char *version; /* the program's version, for the title */
} br_netlist_opts;

/* Render the netlist of c into out.  BR_EINPUT (err filled) for a chain
 * the netlist cannot express (an AC line cycle), a direction the design
 * does not carry or a period count out of range; BR_ENOMEM. */
int br_netlist_render(const br_chain *c, const br_netlist_opts *o, br_text *out, br_error *err);

/* The options' default direction for c: none without load current, else
 * the first the design carries (step-down when it carries both). */
int br_netlist_default_dir(const br_chain *c);

/* The default length: the design's start-up limit, in whole periods. */
long br_netlist_default_periods(const br_chain *c);

#endif

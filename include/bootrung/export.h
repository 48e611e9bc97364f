/* export.h - the chain for other tools: a plain Berkeley SPICE3 netlist
 * of a chain, what a front end needs to describe it, and the caution every
 * report ends with.
 *
 * Copyright (C) 2026 the bootrung developers.  GPL-3.0-or-later. */
#ifndef BOOTRUNG_EXPORT_H
#define BOOTRUNG_EXPORT_H

#include "bootrung/bootrung.h"

#ifdef __cplusplus
extern "C" {
#endif

/* The chain's stages (switches; links are one fewer), its switching
 * period (s), and the name its design file gives it (0, NaN and "" for
 * NULL). */
BR_API int br_chain_stages(const br_chain *c);
BR_API double br_chain_period(const br_chain *c);
BR_API const char *br_chain_name(const br_chain *c);

/* Which way the load current flows in the netlist's switch waveforms. */
enum {
    BR_CURRENT_DEFAULT = -2, /* none without a load current, else step-down */
    BR_CURRENT_NONE = -1,
    BR_CURRENT_STEP_DOWN = 0,
    BR_CURRENT_STEP_UP = 1
};
/* The most switching periods a netlist may span. */
#define BR_NETLIST_PERIODS_MAX 100000L

/* Append c's netlist to out: the load current as `current`, `periods`
 * switching periods in the sources and the transient (0: the design's
 * start-up limit, in whole periods; else 1 .. BR_NETLIST_PERIODS_MAX).
 * *used (may be NULL) gets the periods written.  BR_EINPUT (err says
 * why) for a chain the netlist cannot express; BR_EUSAGE for bad
 * arguments. */
BR_API int br_netlist_write(const br_chain *c, int current, long periods, br_text *out, long *used,
                            br_error *err);

/* Append the caution every report ends with. */
BR_API int br_text_caution(br_text *out);

#ifdef __cplusplus
}
#endif
#endif

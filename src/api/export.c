/* export.c - the netlist, the chain's description and the caution
 * through the public API (include/bootrung/export.h). */
#include "bootrung/export.h"
#include "bootrung/report.h"

#include "core/error.h"
#include "model/chain.h"
#include "report/caution.h"
#include "report/netlist.h"

#include <math.h>

_Static_assert(BR_NETLIST_PERIODS_MAX == BR_NETLIST_MAX_PERIODS, "one limit, two names");
_Static_assert((int)BR_CURRENT_NONE == (int)BR_DIRI_NONE &&
                   (int)BR_CURRENT_STEP_DOWN == (int)BR_DIRI_DOWN &&
                   (int)BR_CURRENT_STEP_UP == (int)BR_DIRI_UP,
               "the public directions are the model's");

int br_chain_stages(const br_chain *c)
{
    return c ? c->n : 0;
}

double br_chain_period(const br_chain *c)
{
    return c ? c->T : NAN;
}

double br_chain_frequency(const br_chain *c)
{
    return c ? c->fsw : NAN;
}

int br_chain_line_cycle(const br_chain *c)
{
    return c ? c->line.on != 0 : 0;
}

const char *br_chain_name(const br_chain *c)
{
    return c && c->design ? c->design->name : "";
}

int br_netlist_write(const br_chain *c, int current, long periods, br_text *out, long *used,
                     br_error *err)
{
    if (!c || !out || current < BR_CURRENT_DEFAULT || current > BR_CURRENT_STEP_UP || periods < 0 ||
        periods > BR_NETLIST_PERIODS_MAX)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_netlist_write: expected a chain, a text, a current direction "
                            "and 0 to %ld periods",
                            BR_NETLIST_PERIODS_MAX);
    br_netlist_opts o = {current == BR_CURRENT_DEFAULT ? br_netlist_default_dir(c) : current,
                         periods ? periods : br_netlist_default_periods(c), br_version()};
    if (used)
        *used = o.periods;
    return br_netlist_render(c, &o, out, err);
}

int br_text_caution(br_text *out)
{
    return out ? br_report_caution(out) : BR_EUSAGE;
}

/* vocab.c - the shared words of the reports (docs/glossary.md). */
#include "report/vocab.h"

#include "analyses/figures.h"

#include <math.h>
#include <stdio.h>

#define KELVIN 273.15

const char *br_dir_label(int dir)
{
    return dir == BR_DIRI_DOWN   ? "step-down"
           : dir == BR_DIRI_UP   ? "step-up"
           : dir == BR_DIRI_LINE ? "line-cycle"
                                 : "idealised";
}

const char *br_fmt_temp(char *buf, size_t cap, double kelvin, int decimals)
{
    if (!isfinite(kelvin))
        snprintf(buf, cap, "n/a");
    else
        snprintf(buf, cap, "%.*f " BR_DEGC, decimals, kelvin - KELVIN);
    return buf;
}

const char *br_limit_name(int lim)
{
    static const char *const name[BR_LIM_COUNT] = {"UVLO rising", "UVLO falling", "minimum drive",
                                                   "gate maximum", "regulator output + dropout"};
    return lim >= 0 && lim < BR_LIM_COUNT ? name[lim] : "?";
}

/* The limit of the driver supply itself, NaN where the design gives none. */
static double driver_limit(const br_chain *c, int k, int lim)
{
    const br_stage *st = &c->st[k];
    switch (lim) {
    case BR_LIM_UVLO_RISE:
        return st->drv.uvlo_rise;
    case BR_LIM_UVLO_FALL:
        return st->drv.uvlo_fall;
    case BR_LIM_DRIVE:
        return c->min_drive > 0 ? c->min_drive : NAN;
    case BR_LIM_GATE:
        return st->sw.vgs_max > 0 ? st->sw.vgs_max : NAN;
    default:
        return NAN;
    }
}

double br_rail_limit(const br_chain *c, int k, int lim)
{
    const br_aux *a = &c->st[k].aux;
    int ldo = a->kind == BR_AUX_LDO;
    if (lim == BR_LIM_HEADROOM)
        return ldo ? a->vout + a->dropout : NAN;
    double v = driver_limit(c, k, lim);
    if (!ldo || !isfinite(v))
        return v;
    if (lim == BR_LIM_GATE) /* the regulator holds the driver at its output */
        return a->vout > v ? v + a->dropout : NAN;
    return v > a->vout ? HUGE_VAL : v + a->dropout;
}

double br_rail_floor(const br_chain *c, int k, int *lim)
{
    static const int lower[] = {BR_LIM_UVLO_RISE, BR_LIM_DRIVE, BR_LIM_HEADROOM};
    double floor = -HUGE_VAL;
    int which = BR_LIM_UVLO_RISE;
    for (size_t i = 0; i < sizeof lower / sizeof lower[0]; i++) {
        double v = br_rail_limit(c, k, lower[i]);
        if (!isnan(v) && v > floor) {
            floor = v;
            which = lower[i];
        }
    }
    if (lim)
        *lim = which;
    return floor;
}

const char *br_rail_limit_label(const br_chain *c, int k, int lim, char *buf, size_t cap)
{
    int raised = c->st[k].aux.kind == BR_AUX_LDO && lim != BR_LIM_HEADROOM;
    snprintf(buf, cap, "%s%s", br_limit_name(lim), raised ? " + dropout" : "");
    return buf;
}

const char *br_place(const br_chain *c, int stage, int kind, char *buf, size_t cap)
{
    if (stage < 0 || stage >= c->n) {
        snprintf(buf, cap, "-");
        return buf;
    }
    const char *what = kind == BR_PLACE_LINK ? "link" : "rail";
    if (kind == BR_PLACE_AUX)
        what = c->st[stage].aux.kind == BR_AUX_LDO ? "regulator" : "clamp";
    snprintf(buf, cap, "%s %s", what, c->st[stage].name);
    return buf;
}

const char *br_crit_place(const br_chain *c, int crit, int stage, int aux, char *buf, size_t cap)
{
    int link = crit == BR_CRIT_INRUSH || crit == BR_CRIT_DIODE_VR || crit == BR_CRIT_DIODE_IAVG ||
               crit == BR_CRIT_TJ;
    aux = aux || crit == BR_CRIT_AUX_POWER; /* always a regulator's or a clamp's */
    return br_place(c, stage, aux ? BR_PLACE_AUX : link ? BR_PLACE_LINK : BR_PLACE_RAIL, buf, cap);
}

/* rules.c - design rules on the nominal chain, without simulation. */
#include "analyses/rules.h"

#include "analyses/figures.h"
#include "engine/diode.h"
#include "model/timing.h"

#include <math.h>

static void add(br_rule_list *out, int kind, int stage, const char *part, double figure,
                double limit)
{
    if (out->n >= BR_RULES_MAX)
        return; /* cannot happen: at most five findings per stage plus one */
    br_rule_hit *h = &out->hit[out->n++];
    h->kind = kind;
    h->stage = stage;
    h->part = part ? part : "";
    h->figure = figure;
    h->limit = limit;
    h->current = 0.0;
    h->fatal = 0;
}

double br_link_vblock(const br_chain *c, int k)
{
    return k >= 1 ? c->st[k - 1].vblock : 0.0;
}

/* What stage k draws from its rail while running, averaged over a period. */
static double stage_draw(const br_chain *c, int k)
{
    const br_stage *st = &c->st[k];
    double i = st->drv.iq_on + st->drv.i_iso + st->sw.qg * c->fsw;
    if (st->aux.kind == BR_AUX_LDO)
        i += st->aux.iq;
    return i;
}

double br_link_current(const br_chain *c, int k)
{
    double i = 0.0;
    for (int j = k; j < c->n; j++)
        i += stage_draw(c, j);
    return i;
}

double br_link_drop(const br_chain *c, int k)
{
    const br_stage *st = &c->st[k];
    double i = br_link_current(c, k);
    double r = st->diode.rs + st->r_link + c->st[k - 1].sw.rds_on;
    return br_diode_vjunction(&st->diode, i) + i * r;
}

/* Total time the return switch of link k is on in one period, s.  A window
 * with equal ends has no length, as in the period's event list. */
static double window_time(const br_chain *c, int k)
{
    const br_stage *ret = &c->st[k - 1];
    double t = 0.0;
    for (int i = 0; i < ret->nwin; i++) {
        double a = ret->win[i][0], b = ret->win[i][1];
        t += b >= a ? b - a : c->T - a + b;
    }
    return t;
}

/* Reverse-voltage rules for the diode of link k. */
static void diode_rules(const br_chain *c, int k, br_rule_list *out)
{
    const br_diode *d = &c->st[k].diode;
    double need = br_link_vblock(c, k) * (1.0 + c->overshoot);
    if (!(d->vrrm > 0))
        add(out, BR_RULE_DIODE_UNRATED, k, d->id, need, 0.0);
    else if (d->vrrm < need)
        add(out, BR_RULE_DIODE_RATING, k, d->id, need, d->vrrm);
    else if (d->vrrm * c->derating < need)
        add(out, BR_RULE_DIODE_DERATING, k, d->id, need, d->vrrm * c->derating);
}

/* Highest voltage rail k can sit at without a regulator or clamp: the
 * supply at the top of its tolerance (the chain only drops from there). */
static double supply_max(const br_chain *c)
{
    double v = c->vsupply;
    if (c->design && c->design->vsupply.max > v)
        v = c->design->vsupply.max;
    return v;
}

/* Gate rules and the regulator/clamp sanity rule for stage k. */
static void gate_rules(const br_chain *c, int k, br_rule_list *out)
{
    const br_stage *st = &c->st[k];
    double vmax = st->sw.vgs_max;
    if (st->aux.kind != BR_AUX_NONE) {
        if (st->aux.vout < st->drv.uvlo_rise)
            add(out, BR_RULE_AUX_BELOW_UVLO, k, st->aux.id, st->aux.vout, st->drv.uvlo_rise);
        if (vmax > 0 && st->aux.vout > vmax)
            add(out, BR_RULE_AUX_ABOVE_GATE, k, st->aux.id, st->aux.vout, vmax);
    } else if (vmax > 0 && supply_max(c) > vmax) {
        add(out, BR_RULE_GATE_UNPROTECTED, k, st->sw.id, supply_max(c), vmax);
    }
}

/* Voltage the driver of stage k sees when its raw rail sits at v. */
static double drive_from_rail(const br_stage *st, double v)
{
    if (st->aux.kind == BR_AUX_LDO)
        return fmin(st->aux.vout, v - st->aux.dropout);
    if (st->aux.kind == BR_AUX_ZENER)
        return fmin(st->aux.vout, v);
    return v;
}

/* Walk up the chain summing nominal drops; the first rail whose driver
 * cannot reach its UVLO rising stalls every rail above it. */
static void supply_rule(const br_chain *c, br_rule_list *out)
{
    double v = c->vsupply - c->rsupply * br_link_current(c, 0);
    for (int k = 0; k < c->n; k++) {
        const br_stage *st = &c->st[k];
        if (k > 0)
            v -= br_link_drop(c, k);
        if (st->aux.kind == BR_AUX_ZENER)
            v = fmin(v, st->aux.vout); /* the clamp also caps what climbs on */
        double drive = drive_from_rail(st, v);
        if (drive < st->drv.uvlo_rise) {
            add(out, BR_RULE_SUPPLY_SHORT, k, st->drv.id, drive, st->drv.uvlo_rise);
            out->hit[out->n - 1].current = br_link_current(c, k);
            out->hit[out->n - 1].fatal = 1;
            return;
        }
    }
}

/* With a finite flying capacitance the cells' voltages ripple; at the load
 * current in either direction analysed each switch must still block a
 * positive voltage, or the cells collapse (and the model with them). */
static void ripple_rule(const br_chain *c, br_rule_list *out)
{
    int dirs[2], nd = br_design_directions(c, dirs), worst = -1;
    double low = HUGE_VAL;
    for (int i = 0; i < nd && dirs[i] >= 0; i++) {
        br_timing tm;
        int k;
        br_timing_build(c, dirs[i], &tm);
        double v = br_timing_cell_min(&tm, c, (dirs[i] == BR_DIRI_UP ? 1.0 : -1.0) * c->iload, &k);
        if (v < low) {
            low = v;
            worst = k;
        }
    }
    if (worst < 0 || low > 0.0)
        return;
    add(out, BR_RULE_FLY_COLLAPSE, worst, c->st[worst].name, low, c->st[worst].vblock);
    out->hit[out->n - 1].current = c->iload;
    out->hit[out->n - 1].fatal = 1;
}

int br_rules_check(const br_chain *c, br_rule_list *out, br_error *err)
{
    (void)err; /* every rule is a comparison of resolved numbers */
    out->n = 0;
    for (int k = 0; k < c->n; k++) {
        const br_driver *drv = &c->st[k].drv;
        if (k > 0)
            diode_rules(c, k, out);
        if (k > 0 && !(window_time(c, k) > 0)) {
            add(out, BR_RULE_NO_WINDOW, k, c->st[k - 1].name, 0.0, 0.0);
            out->hit[out->n - 1].fatal = 1;
        }
        if (drv->uvlo_fall >= drv->uvlo_rise)
            add(out, BR_RULE_UVLO_HYSTERESIS, k, drv->id, drv->uvlo_fall, drv->uvlo_rise);
        gate_rules(c, k, out);
    }
    supply_rule(c, out);
    ripple_rule(c, out);
    return BR_OK;
}

const char *br_rule_name(int kind)
{
    static const char *const names[BR_RULE_KINDS] = {
        "diode-rating",   "diode-derating",   "diode-unrated",  "uvlo-hysteresis", "supply-short",
        "aux-below-uvlo", "gate-unprotected", "aux-above-gate", "no-window",       "fly-collapse",
    };
    return kind >= 0 && kind < BR_RULE_KINDS ? names[kind] : "unknown";
}

/* rules.c - design rules on the nominal chain, without simulation. */
#include "analyses/rules.h"
#include "analyses/figures.h"
#include "model/timing.h"

#include "engine/diode.h"

#include <math.h>
#include <string.h>

static void add(br_rule_list *out, int kind, int stage, const char *part, double figure,
                double limit)
{
    if (out->n >= BR_RULES_MAX)
        return; /* cannot happen: the bound counts every rule's findings */
    br_rule_hit *h = &out->hit[out->n++];
    h->kind = kind;
    h->stage = stage;
    h->part = part ? part : "";
    h->figure = figure;
    h->limit = limit;
    h->current = 0.0;
    h->fatal = 0;
    h->what = h->unit = "";
    h->lo = 0.0;
    h->index = -1;
    h->mask = 0;
    h->by_ramp = 0;
}

/* The highest voltage an injection into rail k gives (its tolerance's
 * top), V. */
static double inject_max(const br_chain *c, int k)
{
    const br_inject_spec *j = c->design ? br_design_injection(c->design, k) : NULL;
    return j ? fmax(j->v.max, c->st[k].vinj) : c->st[k].vinj;
}

double br_link_vblock(const br_chain *c, int k)
{
    if (k >= 1 && c->st[k].inject) /* a charged rail over its supply switched off */
        return inject_max(c, k);
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
    double i = 0.0; /* up to the next rail an injection feeds */
    for (int j = k; j < c->n && (j == k || !c->st[j].inject); j++)
        i += stage_draw(c, j);
    return i;
}

double br_link_drop(const br_chain *c, int k)
{
    const br_stage *st = &c->st[k];
    double i = br_link_current(c, k);
    double r = st->diode.rs + st->r_link + (st->inject ? 0.0 : c->st[k - 1].sw.rds_on);
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
    /* an injection's diode sees no switching edge, so no overshoot */
    double need = br_link_vblock(c, k) * (c->st[k].inject ? 1.0 : 1.0 + c->overshoot);
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

/* Highest voltage rail k can sit at: that of the supply or injection
 * its segment of the chain climbs from. */
static double source_max(const br_chain *c, int k)
{
    while (k > 0 && !c->st[k].inject)
        k--;
    return k > 0 ? inject_max(c, k) : supply_max(c);
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
    } else if (vmax > 0 && source_max(c, k) > vmax) {
        add(out, BR_RULE_GATE_UNPROTECTED, k, st->sw.id, source_max(c, k), vmax);
    }
}

/* Class II ceramics (X7R, X5R...) lose much of their capacitance under
 * DC bias and wear faster near their rating: common practice keeps their
 * working voltage at about half the rating (cap-derating).  A rail sits
 * below the supply's highest value, or at a clamp's knee. */
static void cap_rule(const br_chain *c, int k, br_rule_list *out)
{
    const br_stage *st = &c->st[k];
    if (!st->cap.class2 || !(st->cap.vrated > 0))
        return;
    double v = source_max(c, k), lim = c->cap_derating * st->cap.vrated;
    if (st->aux.kind == BR_AUX_ZENER && st->aux.vout < v)
        v = st->aux.vout;
    if (v > lim)
        add(out, BR_RULE_CAP_DERATING, k, st->cap.id, v, lim);
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

/* The next rail above k that an injection feeds, or n. */
static int next_injection(const br_chain *c, int k)
{
    int j = k + 1;
    while (j < c->n && !c->st[j].inject)
        j++;
    return j;
}

/* Walk up the chain summing nominal drops, from the supply and from each
 * injection; the first rail whose driver cannot reach its UVLO rising
 * stalls every rail above it up to the next injection.  An injected rail
 * that falls short is the injection rule's finding. */
static void supply_rule(const br_chain *c, br_rule_list *out)
{
    double v = c->vsupply - c->rsupply * br_link_current(c, 0);
    for (int k = 0; k < c->n; k++) {
        const br_stage *st = &c->st[k];
        if (k > 0)
            v = (st->inject ? st->vinj : v) - br_link_drop(c, k);
        if (st->aux.kind == BR_AUX_ZENER)
            v = fmin(v, st->aux.vout); /* the clamp also caps what climbs on */
        double drive = drive_from_rail(st, v);
        if (!(drive < st->drv.uvlo_rise))
            continue;
        if (st->inject) {
            add(out, BR_RULE_INJECT_SHORT, k, st->diode.id, drive, st->drv.uvlo_rise);
            out->hit[out->n - 1].lo = st->vinj;
        } else {
            add(out, BR_RULE_SUPPLY_SHORT, k, st->drv.id, drive, st->drv.uvlo_rise);
        }
        out->hit[out->n - 1].current = br_link_current(c, k);
        out->hit[out->n - 1].fatal = 1;
        out->hit[out->n - 1].index = next_injection(c, k) - 1; /* the last rail it stalls */
        k = next_injection(c, k) - 1;
    }
}

/* An injection that starts after the longest start-up simulated never
 * shows in it. */
static void inject_late_rule(const br_chain *c, br_rule_list *out)
{
    for (int k = 1; k < c->n; k++)
        if (c->st[k].inject && c->st[k].tinj >= c->startup_max)
            add(out, BR_RULE_INJECT_LATE, k, c->st[k].diode.id, c->st[k].tinj, c->startup_max);
}

/* With a finite flying capacitance the cells' voltages ripple; at the load
 * current in either direction analysed each switch must still block a
 * positive voltage, or the cells collapse (and the model with them). */
static void ripple_rule(const br_chain *c, br_rule_list *out)
{
    int dirs[2], nd = br_design_directions(c, dirs), worst = -1;
    double low = HUGE_VAL, current = c->iload;
    if (c->line.on) { /* over the line cycle, at each period's current */
        long m;
        double pp;
        low = br_line_cell_min(c, &m, &worst, &pp);
        current = m >= 0 ? fabs(br_line_current(&c->line, m)) : 0.0;
        nd = 0;
    }
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
    out->hit[out->n - 1].current = current;
    out->hit[out->n - 1].fatal = 1;
}

/* ---- pre-charge steps ---------------------------------------------------------- */

/* The driver part behind stage k's driver, for its tolerance limits. */
static const br_driver_part *driver_part(const br_chain *c, int k)
{
    const br_design *d = c->design;
    for (int i = 0; d && i < d->ndrivers; i++)
        if (d->drivers[i].id == c->st[k].drv.id)
            return &d->drivers[i];
    return NULL;
}

/* The lowest rail voltage at which driver k can leave UVLO: the least
 * UVLO rising over its tolerance, plus the least dropout of a regulator
 * in front of it (a Zener clamp takes nothing off below its knee). */
static double start_need(const br_chain *c, int k)
{
    const br_stage *st = &c->st[k];
    const br_driver_part *p = driver_part(c, k);
    double need = p ? fmin(p->uvlo_rise.min, st->drv.uvlo_rise) : st->drv.uvlo_rise;
    if (st->aux.kind == BR_AUX_LDO) {
        const br_design *d = c->design;
        double drop = st->aux.dropout;
        for (int i = 0; d && i < d->naux; i++)
            if (d->aux[i].id == st->aux.id)
                drop = fmin(drop, d->aux[i].dropout.min);
        need += fmax(drop, 0.0);
    }
    return need;
}

/* Earliest time the supply can reach v: it ramps linearly from 0 to its
 * highest value in the ramp time (INFINITY when it never does). */
static double ramp_time(const br_chain *c, double v)
{
    double vmax = supply_max(c);
    if (!(v > 0))
        return 0.0;
    if (v > vmax)
        return INFINITY;
    return c->tramp > 0 ? c->tramp * v / vmax : 0.0;
}

/* Earliest time switch s is on during the pre-charge, given the earliest
 * start of its driver: the first step holding it that has not ended by
 * then (INFINITY when none). */
static double first_on(const br_chain *c, int s, double start)
{
    double t0 = 0.0;
    for (int i = 0; i < c->nprecharge; i++) {
        double t1 = t0 + c->precharge[i].duration;
        if ((c->precharge[i].mask >> s & 1) && fmax(t0, start) < t1)
            return fmax(t0, start);
        t0 = t1;
    }
    return INFINITY;
}

/* e[k]: lower bound of when driver k can first leave UVLO before PWM;
 * ramp[k]: whether the supply ramp sets it. */
static void earliest_starts(const br_chain *c, double *e, int *ramp)
{
    for (int k = 0; k < c->n; k++) {
        const br_stage *st = &c->st[k];
        double by_supply = ramp_time(c, start_need(c, k));
        double by_chain = k == 0 ? 0.0 : first_on(c, k - 1, e[k - 1]);
        if (st->inject) { /* its own supply, charging whatever the switches do */
            by_supply = start_need(c, k) > st->vinj ? INFINITY : st->tinj;
            by_chain = 0.0;
        }
        e[k] = fmax(by_supply, by_chain);
        ramp[k] = by_supply >= by_chain;
    }
}

static void precharge_rule(const br_chain *c, br_rule_list *out)
{
    double e[BR_MAX_SWITCHES], t0 = 0.0;
    int ramp[BR_MAX_SWITCHES];
    earliest_starts(c, e, ramp);
    for (int i = 0; i < c->nprecharge; i++) {
        double t1 = t0 + c->precharge[i].duration;
        unsigned long long blocked = 0;
        int low = -1;
        for (int s = 0; s < c->n; s++)
            if ((c->precharge[i].mask >> s & 1) && !(e[s] < t1)) {
                blocked |= 1ULL << s;
                low = low < 0 ? s : low;
            }
        if (blocked) {
            add(out, BR_RULE_PRECHARGE_IDLE, low, c->st[low].drv.id, e[low], t1);
            br_rule_hit *h = &out->hit[out->n - 1];
            h->index = i;
            h->mask = blocked;
            h->by_ramp = ramp[low];
            h->lo = t0;
            h->current = start_need(c, low);
        }
        t0 = t1;
    }
}

double br_rule_start_need(const br_chain *c, int k)
{
    return start_need(c, k);
}

/* ---- plausibility ----------------------------------------------------------- */

/* One plausible range: what no part of the kind in a gate-drive chain
 * goes beyond (from memory of the trade; generous by a decade or more). */
typedef struct plausible {
    const char *what; /* the attribute, as in the design file */
    const char *unit;
    double lo, hi; /* SI */
} plausible;

static const plausible P_CJ0 = {"cj0", "F", 0.0, 10e-9};
static const plausible P_RS = {"rs", "ohm", 0.0, 100.0};
static const plausible P_TAU = {"tau", "s", 0.0, 100e-6};
static const plausible P_C = {"c", "F", 1e-9, 10e-3};
static const plausible P_ESR = {"esr", "ohm", 0.0, 10.0};
static const plausible P_RLINK = {"link-resistor", "ohm", 0.0, 100e3};
static const plausible P_QG = {"qg", "C", 0.0, 10e-6};
static const plausible P_TG = {"gate-pulse", "s", 0.0, 10e-6};
static const plausible P_RDS = {"rds-on", "ohm", 0.0, 100.0};
static const plausible P_IQ_RUN = {"iq-run", "A", 0.0, 1.0};
static const plausible P_IQ_UVLO = {"iq-uvlo", "A", 0.0, 1.0};
static const plausible P_IQ_ISO = {"iq-isolator", "A", 0.0, 1.0};
static const plausible P_UVLO = {"uvlo-rise", "V", 0.0, 100.0};
static const plausible P_VSUP = {"supply voltage", "V", 0.0, 100.0};
static const plausible P_RSUP = {"supply resistance", "ohm", 0.0, 1e3};
static const plausible P_FSW = {"fsw", "Hz", 0.0, 100e6};

/* Flag v once per part and attribute (a part sits on many stages). */
static void check_plausible(br_rule_list *out, int stage, const char *part, double v,
                            const plausible *p)
{
    if (v >= p->lo && v <= p->hi)
        return;
    for (int i = 0; i < out->n; i++)
        if (out->hit[i].kind == BR_RULE_IMPLAUSIBLE && out->hit[i].what == p->what &&
            strcmp(out->hit[i].part, part ? part : "") == 0)
            return;
    add(out, BR_RULE_IMPLAUSIBLE, stage, part, v, p->hi);
    br_rule_hit *h = &out->hit[out->n - 1];
    h->what = p->what;
    h->unit = p->unit;
    h->lo = p->lo;
}

static void plausible_stage(const br_chain *c, int k, br_rule_list *out)
{
    const br_stage *st = &c->st[k];
    if (k > 0) {
        check_plausible(out, k, st->diode.id, st->diode.cj0, &P_CJ0);
        check_plausible(out, k, st->diode.id, st->diode.rs, &P_RS);
        check_plausible(out, k, st->diode.id, st->diode.tau, &P_TAU);
        check_plausible(out, k, st->cap.id, st->cap.c, &P_C);
        check_plausible(out, k, st->cap.id, st->cap.esr, &P_ESR);
        check_plausible(out, k, NULL, st->r_link, &P_RLINK);
    }
    check_plausible(out, k, st->sw.id, st->sw.qg, &P_QG);
    check_plausible(out, k, st->sw.id, st->sw.tg, &P_TG);
    check_plausible(out, k, st->sw.id, st->sw.rds_on, &P_RDS);
    check_plausible(out, k, st->drv.id, st->drv.iq_on, &P_IQ_RUN);
    check_plausible(out, k, st->drv.id, st->drv.iq_off, &P_IQ_UVLO);
    check_plausible(out, k, st->drv.id, st->drv.i_iso, &P_IQ_ISO);
    check_plausible(out, k, st->drv.id, st->drv.uvlo_rise, &P_UVLO);
}

static void plausible_chain(const br_chain *c, br_rule_list *out)
{
    check_plausible(out, -1, NULL, c->vsupply, &P_VSUP);
    check_plausible(out, -1, NULL, c->rsupply, &P_RSUP);
    check_plausible(out, -1, NULL, c->fsw, &P_FSW);
    for (int k = 0; k < c->n; k++)
        plausible_stage(c, k, out);
}

int br_rules_check(const br_chain *c, br_rule_list *out, br_error *err)
{
    (void)err; /* every rule is a comparison of resolved numbers */
    out->n = 0;
    for (int k = 0; k < c->n; k++) {
        const br_driver *drv = &c->st[k].drv;
        if (k > 0)
            diode_rules(c, k, out);
        if (k > 0 && !c->st[k].inject && !(window_time(c, k) > 0)) {
            add(out, BR_RULE_NO_WINDOW, k, c->st[k - 1].name, 0.0, 0.0);
            out->hit[out->n - 1].fatal = 1;
        }
        if (drv->uvlo_fall >= drv->uvlo_rise)
            add(out, BR_RULE_UVLO_HYSTERESIS, k, drv->id, drv->uvlo_fall, drv->uvlo_rise);
        gate_rules(c, k, out);
        if (k > 0)
            cap_rule(c, k, out);
    }
    supply_rule(c, out);
    inject_late_rule(c, out);
    ripple_rule(c, out);
    precharge_rule(c, out);
    plausible_chain(c, out);
    return BR_OK;
}

const char *br_rule_name(int kind)
{
    static const char *const names[BR_RULE_KINDS] = {
        "diode-rating",   "diode-derating",   "diode-unrated",  "uvlo-hysteresis", "supply-short",
        "aux-below-uvlo", "gate-unprotected", "aux-above-gate", "no-window",       "fly-collapse",
        "implausible",    "precharge-idle",   "cap-derating",   "injection-short", "injection-late",
    };
    return kind >= 0 && kind < BR_RULE_KINDS ? names[kind] : "unknown";
}

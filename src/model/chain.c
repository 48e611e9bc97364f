/* chain.c - building the immutable chain model from a design. */
#include "model/chain.h"

#include "core/error.h"
#include "model/fcml.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

static void resolve_driver(const br_driver_part *p, br_driver *o)
{
    o->id = p->id;
    o->uvlo_rise = p->uvlo_rise.nom;
    o->uvlo_fall = p->uvlo_fall.nom;
    o->iq_on = p->iq_on.nom;
    o->iq_off = p->iq_off.nom;
    o->i_iso = p->i_iso.nom;
}

/* The switch at junction temperature T, driven by drv: its reverse drop
 * is a body diode's, or for a switch without one (reverse = channel) the
 * channel's third-quadrant turn-on, which the negative gate-off voltage
 * drv applies pushes further down (Vsd = Vth + |Vgs,off| + I R at first
 * order); the channel's R defaults to its own Rds(on). */
static void resolve_switch(const br_switch_part *p, const br_driver_part *drv, double T, br_sw *o)
{
    o->id = p->id;
    o->rds_on = br_rds_at(p, T);
    o->qg = p->qg.nom;
    o->qg_v = p->qg_v.nom;
    o->tg = p->tg.nom;
    if (p->reverse == BR_REV_CHANNEL) {
        o->vsd0 = p->vth.nom + fabs(drv->vgs_off.nom);
        o->rsd = p->rsd_given ? p->rsd.nom : o->rds_on;
    } else {
        o->vsd0 = p->vsd.nom;
        o->rsd = p->rsd.nom;
    }
    o->vgs_rec = p->vgs_rec.nom;
    o->vgs_max = p->vgs_max.nom;
}

static void resolve_aux(const br_design *d, int idx, br_aux *o)
{
    memset(o, 0, sizeof *o);
    if (idx < 0 || idx >= d->naux)
        return;
    const br_aux_part *p = &d->aux[idx];
    o->id = p->id;
    o->kind = p->kind;
    o->vout = p->vout.nom;
    o->dropout = p->dropout.nom;
    o->iq = p->iq.nom;
    o->rz = p->rz.nom;
    o->pmax = p->pmax.nom;
    o->rth = p->rth.nom;
    o->tj_max = p->tj_max.nom;
}

static int part_index_ok(int idx, int count)
{
    return idx >= 0 && idx < count;
}

static int resolve_parts(const br_design *d, const br_chain *c, int k, br_stage *st, br_error *err)
{
    const br_stage_spec *sp = br_design_stage(d, k);
    int line = sp->line;
    if (!part_index_ok(sp->driver, d->ndrivers) || !part_index_ok(sp->sw, d->nswitches))
        return br_error_set(err, BR_EINPUT, d->path, line, "stages",
                            "stage %d has no driver or switch part, expected both", k);
    resolve_driver(&d->drivers[sp->driver], &st->drv);
    resolve_switch(&d->switches[sp->sw], &d->drivers[sp->driver], c->tj, &st->sw);
    resolve_aux(d, sp->aux, &st->aux);
    if (k == 0)
        return BR_OK; /* rail 0 is the supply: no link, no rail capacitor */
    if (!part_index_ok(sp->diode, d->ndiodes) || !part_index_ok(sp->cap, d->ncaps))
        return br_error_set(err, BR_EINPUT, d->path, line, "stages",
                            "stage %d has no diode or capacitor part, expected both", k);
    br_cap_at_nominal(&d->caps[sp->cap], c->tamb, &st->cap);
    const br_inject_spec *j = br_design_injection(d, k);
    if (j) { /* the injection's resistor and diode take the link's place */
        if (!part_index_ok(j->diode, d->ndiodes))
            return br_error_set(err, BR_EINPUT, d->path, j->line, "injection",
                                "rail %d's injection has no diode part, expected one", k);
        st->inject = 1;
        st->vinj = j->v.nom;
        st->tinj = j->start;
        st->r_link = j->r.nom;
        /* field by field: the stage's padding stays as the chain's
         * allocation left it (chains are compared byte for byte) */
        br_climit *l = &st->inj_lim;
        l->mode = j->limit_mode;
        l->vset = j->v.nom;
        l->ilimit = j->ilimit.nom;
        l->ifold = j->ifold.nom;
        l->hiccup_delay = j->hiccup_delay.nom;
        l->hiccup_off = j->hiccup_off.nom;
        l->hiccup_retries = j->hiccup_retries;
        st->inj_rating = j->irating.nom;
        return br_diode_at(&d->diodes[j->diode], c->tamb, &st->diode, err);
    }
    st->r_link = sp->r_link.nom;
    int rc = br_diode_at(&d->diodes[sp->diode], c->tamb, &st->diode, err);
    if (rc == BR_OK && sp->rth_given)
        st->diode.rth = sp->rth.nom; /* the stage's board, not the part's */
    return rc;
}

int br_chain_injected(const br_chain *c)
{
    for (int k = 1; k < c->n; k++)
        if (c->st[k].inject)
            return 1;
    return 0;
}

int br_chain_diode_at(br_chain *c, int k, double T, br_error *err)
{
    const br_design *d = c->design;
    double rth = c->st[k].diode.rth;
    int rc = br_diode_at(&d->diodes[br_design_link_diode(d, k)], T, &c->st[k].diode, err);
    c->st[k].diode.rth = rth;
    return rc;
}

/* FCML: names, windows and dead times from the generator. */
static int fcml_timing(const br_design *d, const br_chain *c, int s, br_stage *st, br_error *err)
{
    int P = d->levels - 1;
    br_fcml_sw g;
    br_fcml_switch(P, s, c->T, c->duty, c->deadtime, &g);
    if ((1.0 - c->duty) * c->T - 2.0 * c->deadtime <= 0 || c->duty * c->T <= 0)
        return br_error_set(err, BR_EINPUT, d->path, d->deadtime.line, "operating-point: dead-time",
                            "two dead times (%.3g s) leave no on-time for the bottom switches "
                            "at duty %.4g and %.4g Hz; expected 2*dead-time < (1-duty)/fsw",
                            2.0 * c->deadtime, c->duty, c->fsw);
    snprintf(st->name, sizeof st->name, "%s", g.name);
    st->pair = g.pair;
    st->is_top = g.is_top;
    st->nwin = 1;
    memcpy(st->win[0], g.on, sizeof g.on);
    int dir = g.is_top ? 1 : 0; /* step-down: bottoms conduct; step-up: tops */
    st->nrev[dir] = c->deadtime > 0 ? 2 : 0;
    memcpy(st->rev[dir], g.dead, sizeof g.dead);
    /* every conducting switch of the leg carries the whole load current:
     * in reverse the one that conducts in the dead times, forward its
     * partner */
    st->carry[dir] = -1;
    st->carry[1 - dir] = 1;
    st->vblock = d->vin.nom / P * (1.0 + d->imbalance.nom);
    return BR_OK;
}

/* Explicit string: fractions of T from the file; reverse conduction and
 * the way each switch carries the load current apply to whichever
 * direction is analysed. */
static int string_timing(const br_design *d, const br_chain *c, int s, br_stage *st, br_error *err)
{
    const br_switch_spec *w = &d->sw[s];
    char field[BR_ID_MAX + 24];
    snprintf(field, sizeof field, "switch %s: conducts", w->name);
    if (w->carry == BR_CARRY_UNSET && d->iload.max > 0)
        return br_error_set(err, BR_EINPUT, d->path, w->line, field,
                            "missing: the design carries a %g A load current, expected "
                            "conducts=\"forward\", \"reverse\" or \"none\" (how the switch "
                            "carries it while on)",
                            d->iload.max);
    st->carry[0] = st->carry[1] = w->carry == BR_CARRY_FORWARD   ? 1
                                  : w->carry == BR_CARRY_REVERSE ? -1
                                                                 : 0;
    snprintf(st->name, sizeof st->name, "%s", w->name);
    st->nwin = w->nwin;
    for (int i = 0; i < w->nwin; i++) {
        st->win[i][0] = br_wrap(w->on[i][0] * c->T, c->T);
        st->win[i][1] = br_wrap(w->on[i][1] * c->T, c->T);
        if (w->on[i][1] - w->on[i][0] >= 1.0) { /* on all period */
            st->win[i][0] = 0.0;
            st->win[i][1] = c->T;
        }
    }
    for (int dir = 0; dir < 2; dir++) {
        st->nrev[dir] = w->nrev;
        for (int i = 0; i < w->nrev; i++) {
            st->rev[dir][i][0] = br_wrap(w->rev[i][0] * c->T, c->T);
            st->rev[dir][i][1] = br_wrap(w->rev[i][1] * c->T, c->T);
        }
    }
    st->vblock = w->vblock.nom * (1.0 + d->imbalance.nom);
    return BR_OK;
}

static void copy_operating_point(const br_design *d, br_chain *c)
{
    c->design = d;
    c->fsw = d->fsw.nom;
    c->T = 1.0 / c->fsw;
    c->duty = d->duty.nom;
    c->deadtime = d->deadtime.nom;
    c->tedge = d->tedge.nom;
    c->vin = d->vin.nom;
    c->tamb = d->tamb.nom;
    c->tj = d->tj_given ? d->tj.nom : d->tamb.nom;
    c->iload = d->iload.nom;
    c->load_from = d->load_from;
    c->cfly = d->topology == BR_TOPO_FCML ? d->cfly.nom : 0.0;
    br_line_resolve(&d->ac, c->fsw, &c->line);
    if (c->line.on) { /* the line cycle gives every period its duty and current */
        c->duty = 0.5;
        c->iload = 0.0;
    }
    c->overshoot = d->overshoot.nom;
    c->vsupply = d->vsupply.nom;
    c->rsupply = d->rsupply.nom;
    c->csupply = d->csupply.nom;
    c->limit_mode = d->limit_mode;
    c->ilimit = d->ilimit.nom;
    c->ifold = d->ifold.nom;
    c->hiccup_delay = d->hiccup_delay.nom;
    c->hiccup_off = d->hiccup_off.nom;
    c->hiccup_retries = d->hiccup_retries;
    c->tsoft = d->tsoft.nom;
    c->irating = d->irating.nom;
    c->tramp = d->tramp.nom;
    c->direction = d->direction;
    c->nprecharge = d->nprecharge;
    memcpy(c->precharge, d->precharge, sizeof c->precharge);
    c->min_drive = d->min_drive.nom;
    c->derating = d->derating.nom;
    c->startup_max = d->startup_max.nom;
    c->cap_derating = d->cap_derating.nom;
    c->max_dropouts = d->max_dropouts;
    c->startup_method = d->startup_method;
}

int br_chain_build_nominal(const br_design *d, br_chain *c, br_error *err)
{
    memset(c, 0, sizeof *c);
    copy_operating_point(d, c);
    c->n = br_design_nswitch(d);
    if (c->n < 2 || c->n > BR_MAX_SWITCHES)
        return br_error_set(err, BR_EINPUT, d->path, 0, "topology", "%d switches; expected 2 to %d",
                            c->n, BR_MAX_SWITCHES);
    if (!(c->fsw > 0) || !(c->duty > 0 && c->duty < 1))
        return br_error_set(err, BR_EINPUT, d->path, d->fsw.line, "operating-point",
                            "fsw must be > 0 and duty inside (0, 1)");
    if (d->direction == BR_DIR_NONE && d->iload.max > 0)
        return br_error_set(err, BR_EINPUT, d->path, d->iload.line, "operating-point: load-current",
                            "%g A with current=\"none\": idealised commutation carries no load "
                            "current; expected load-current=\"0 A\" or a current direction",
                            d->iload.max);
    for (int i = 0; i < d->ninject; i++) /* a template's, on a shorter leg */
        if (d->inject[i].rail < 1 || d->inject[i].rail >= c->n)
            return br_error_set(err, BR_EINPUT, d->path, d->inject[i].line, "injection: rail",
                                "rail %d is not a floating rail of this leg, expected 1 to %d",
                                d->inject[i].rail, c->n - 1);
    for (int k = 0; k < c->n; k++) {
        br_stage *st = &c->st[k];
        int rc = d->topology == BR_TOPO_FCML ? fcml_timing(d, c, k, st, err)
                                             : string_timing(d, c, k, st, err);
        if (rc == BR_OK)
            rc = resolve_parts(d, c, k, st, err);
        if (rc != BR_OK)
            return rc;
    }
    return BR_OK;
}

/* The shortest on-window of any switch, s (HUGE_VAL when none), and
 * whose it is. */
static double shortest_on(const br_chain *c, int *who)
{
    double best = HUGE_VAL;
    for (int k = 0; k < c->n; k++) {
        for (int i = 0; i < c->st[k].nwin; i++) {
            double a = c->st[k].win[i][0], b = c->st[k].win[i][1];
            double len = b >= a ? b - a : c->T - a + b;
            if (len > 0 && len < best) {
                best = len;
                *who = k;
            }
        }
    }
    return best;
}

/* A switching edge that outlasts an on-window never completes: the switch
 * would never be fully on, which is no converter and outside the model
 * (every edge a ramp that reaches its end).  Checked at the design point;
 * the scans judge other points by their own rules. */
static int edges_fit(const br_design *d, const br_chain *c, br_error *err)
{
    int who = 0;
    double on = shortest_on(c, &who);
    if (!(c->tedge >= on))
        return BR_OK;
    return br_error_set(err, BR_EINPUT, d->path, d->tedge.line ? d->tedge.line : d->fsw.line,
                        "operating-point: edge-time",
                        "a switching edge of %.3g s outlasts the shortest on-time, %.3g s of "
                        "switch %s at %.4g Hz, so no switch would finish turning on; expected an "
                        "edge-time shorter than every on-time (or a lower fsw)",
                        c->tedge, on, c->st[who].name, c->fsw);
}

int br_chain_build(const br_design *d, br_chain **out, br_error *err)
{
    *out = NULL;
    br_chain *c = malloc(sizeof *c);
    if (!c)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory building the chain");
    int rc = br_chain_build_nominal(d, c, err);
    if (rc == BR_OK)
        rc = edges_fit(d, c, err);
    if (rc != BR_OK) {
        free(c);
        return rc;
    }
    *out = c;
    return BR_OK;
}

void br_chain_free(br_chain *c)
{
    free(c);
}

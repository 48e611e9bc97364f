/* explore.c - level counts, switch classes and frequencies around a
 * template design: the rule, the screen, the corners, the front
 * (explore.h). */
#include "analyses/explore.h"

#include "analyses/evaluate.h"
#include "analyses/explore_size.h"
#include "core/error.h"
#include "model/rating.h"

#include <math.h>
#include <stddef.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

void br_explore_opts_default(br_explore_opts *o)
{
    memset(o, 0, sizeof *o);
    o->iload = -1.0;
    o->target = -1.0;
    o->max_startup = HUGE_VAL;
    o->max_cost = HUGE_VAL;
    o->lmin = o->lmax = 0;
    o->seed = 1;
}

const char *br_explore_state_name(int state)
{
    static const char *const names[] = {"feasible",     "rating",  "fails",  "split",
                                        "margin",       "startup", "cost",   "corners",
                                        "undetermined", "refused", "unsized"};
    return state >= 0 && state <= BR_EX_UNSIZED ? names[state] : "?";
}

/* ---- the rule ------------------------------------------------------------- */

static double derating_of(const br_design *t, const br_explore_opts *o)
{
    return o->derating > 0 ? o->derating : t->derating.nom;
}

/* ---- the design of a combination ----------------------------------------- */

static int add_part_room(const br_design *d, int count, const char *what, br_error *err)
{
    if (count < BR_MAX_PARTS)
        return BR_OK;
    return br_error_set(err, BR_EINPUT, d->path, 0, "parts",
                        "the template has %d %s parts already, expected fewer than %d to add "
                        "the catalog's",
                        count, what, BR_MAX_PARTS);
}

static br_qty scaled(br_qty q, double nom)
{
    double f = q.nom != 0 ? nom / q.nom : 0.0;
    if (f > 0) {
        q.min *= f;
        q.max *= f;
    } else
        q.min = q.max = nom;
    q.nom = nom;
    return q;
}

/* Every stage of d (the default and the overrides) takes part index v in
 * the field at offset off of br_stage_spec. */
static void set_stages(br_design *d, size_t off, int v)
{
    *(int *)((char *)&d->def + off) = v;
    for (int k = 0; k < BR_MAX_SWITCHES; k++)
        *(int *)((char *)&d->stage[k] + off) = v;
}

/* The links whose diode (the template's) falls short of the rule take
 * the catalog's diode (placed once, as the last diode of d). */
static int place_diodes(br_design *d, int n, const br_diode_part *cd, double need, br_error *err)
{
    BR_TRY(add_part_room(d, d->ndiodes, "diode", err));
    int at = d->ndiodes++;
    d->diodes[at] = *cd;
    if (d->diodes[d->def.diode].vrrm.nom < need)
        d->def.diode = at;
    for (int k = 1; k < n; k++)
        if (d->has_override[k] && d->diodes[d->stage[k].diode].vrrm.nom < need)
            d->stage[k].diode = at;
    return BR_OK;
}

/* The cheapest catalog diode that meets need and is as strong as every
 * diode of the template's links that falls short of it; -1 when one is
 * needed and none fits, -2 when the template's diodes all meet the rule. */
static int choose_diode(const br_design *t, const br_catalog *cat, double need)
{
    int n0 = 2 * (t->levels - 1), short_any = 0;
    for (int k = 1; k < n0; k++)
        short_any |= t->diodes[br_design_stage(t, k)->diode].vrrm.nom < need;
    if (!short_any)
        return -2;
    int best = -1;
    for (int i = 0; cat && i < cat->ndiodes; i++) {
        int ok = cat->diodes[i].vrrm.nom >= need;
        for (int k = 1; k < n0 && ok; k++) {
            const br_diode_part *q = &t->diodes[br_design_stage(t, k)->diode];
            ok = q->vrrm.nom >= need || br_diode_as_strong(&cat->diodes[i], q);
        }
        if (ok && (best < 0 || cat->diode_offer[i].cost < cat->diode_offer[best].cost))
            best = i;
    }
    return best;
}

/* The pre-charge of the template on the new string: a step holding every
 * bottom switch of the template's leg holds every bottom switch of the
 * new one, for its time scaled by the pairs; other steps keep the
 * switches the new string has. */
static void map_precharge(br_design *d, const br_design *t, int levels)
{
    int p0 = t->levels - 1, p = levels - 1, n = 2 * p;
    unsigned long long bottoms0 = p0 >= 64 ? ~0ULL : (1ULL << p0) - 1;
    unsigned long long keep = n >= 64 ? ~0ULL : (1ULL << n) - 1;
    for (int i = 0; i < d->nprecharge; i++) {
        if (t->precharge[i].mask == bottoms0) {
            d->precharge[i].mask = (1ULL << p) - 1;
            d->precharge[i].duration = t->precharge[i].duration * p / p0;
        } else
            d->precharge[i].mask &= keep;
    }
    d->hold_on &= keep;
}

static void place_switch(br_design *d, const br_explore_opts *o, int sw)
{
    d->switches[d->nswitches] = o->cat->switches[sw];
    set_stages(d, offsetof(br_stage_spec, sw), d->nswitches++);
    int drv = o->cat->switch_driver[sw];
    if (drv >= 0) {
        d->drivers[d->ndrivers] = o->cat->drivers[drv];
        set_stages(d, offsetof(br_stage_spec, driver), d->ndrivers++);
    }
}

/* ---- the rail capacitors ------------------------------------------------- */

/* Charge one rail gives its driver and switch per period, C: the gate
 * charge and the driver's running and isolator currents over a period. */
static double rail_charge(const br_design *d, const br_stage_spec *s, double fsw)
{
    const br_driver_part *drv = &d->drivers[s->driver];
    return d->switches[s->sw].qg.nom + (drv->iq_on.nom + drv->i_iso.nom) / fsw;
}

/* v rounded up to the E6 series (1, 1.5, 2.2, 3.3, 4.7, 6.8 per decade):
 * the values capacitors come in (common practice). */
static double e6_up(double v)
{
    static const double e6[] = {1.0, 1.5, 2.2, 3.3, 4.7, 6.8, 10.0};
    double dec = pow(10.0, floor(log10(v)));
    for (int i = 0; i < 7; i++)
        if (e6[i] * dec >= v * (1.0 - 1e-9))
            return e6[i] * dec;
    return 10.0 * dec;
}

/* The index in d of template capacitor `part` with its capacitance (and
 * tolerance limits) set to c: an existing scaled copy, or a new one. */
static int scaled_cap(br_design *d, const br_cap_part *part, double c, br_error *err)
{
    char id[BR_ID_MAX];
    char val[16];
    snprintf(val, sizeof val, "%.3g", c * 1e6);
    snprintf(id, sizeof id, "%.28s-%suF", part->id, val);
    for (int i = 0; i < d->ncaps; i++)
        if (strcmp(d->caps[i].id, id) == 0)
            return i;
    if (add_part_room(d, d->ncaps, "capacitor", err) != BR_OK)
        return -1;
    br_cap_part *p = &d->caps[d->ncaps];
    *p = *part;
    p->c = scaled(part->c, c);
    p->line = 0;
    snprintf(p->id, sizeof p->id, "%s", id);
    snprintf(p->source, sizeof p->source, "%s scaled by bootrung explore", part->id);
    return d->ncaps++;
}

/* Rail k of a chain of n stages carries the charge of the n - k rails
 * from it up (each rail refills the one above it).  It takes the stage of
 * the template's rail that carries as many (counted from the top: its
 * capacitor, link diode and resistor), or, below the template's bottom
 * rail, the bottom rail's. */
static int template_rail(const br_design *t, int n, int k, double *carried)
{
    int n0 = 2 * (t->levels - 1), k0 = n0 - (n - k);
    *carried = k0 < 1 ? (double)(n - k) / (n0 - 1) : 1.0;
    return k0 < 1 ? 1 : k0;
}

static void map_stages(br_design *d, const br_design *t, int n)
{
    double carried;
    for (int k = 1; k < n; k++) {
        d->stage[k] = *br_design_stage(t, template_rail(t, n, k, &carried));
        d->stage[k].line = 0;
        d->has_override[k] = 1;
    }
}

/* Each rail's capacitor: the template rail's (template_rail), scaled by
 * the rails it carries beyond that one's and by the charge a rail gives
 * per period, rounded up to the E6 series. */
static int scale_caps(br_design *d, const br_design *t, int n, br_error *err)
{
    for (int k = 1; k < n; k++) {
        double f;
        const br_stage_spec *ts = br_design_stage(t, template_rail(t, n, k, &f));
        f *= rail_charge(d, &d->stage[k], d->fsw.nom) / rail_charge(t, ts, t->fsw.nom);
        const br_cap_part *part = &t->caps[ts->cap];
        d->stage[k].cap = scaled_cap(d, part, e6_up(part->c.nom * f), err);
        if (d->stage[k].cap < 0)
            return BR_EINPUT;
    }
    return BR_OK;
}

static int build_design(const br_design *t, const br_explore_opts *o, const br_explore_row *r,
                        br_design *d, br_error *err)
{
    memcpy(d, t, sizeof *d);
    int n = 2 * (r->levels - 1);
    d->levels = r->levels;
    d->vin = scaled(t->vin, o->vbus);
    d->vin.max = fmax(d->vin.max, o->vbus_max);
    d->fsw = scaled(t->fsw, r->fsw);
    if (o->iload >= 0)
        d->iload = scaled(t->iload, o->iload);
    for (int k = n; k < BR_MAX_SWITCHES; k++)
        d->has_override[k] = 0;
    map_precharge(d, t, r->levels);
    if (o->scale_caps)
        map_stages(d, t, n);
    BR_TRY(add_part_room(d, d->nswitches, "switch", err));
    BR_TRY(add_part_room(d, d->ndrivers, "driver", err));
    place_switch(d, o, r->sw);
    if (r->diode >= 0)
        BR_TRY(place_diodes(d, n, &o->cat->diodes[r->diode], r->need, err));
    if (o->scale_caps)
        BR_TRY(scale_caps(d, t, n, err));
    if (o->parts)
        BR_TRY(br_explore_size_place(d, o, r, err));
    snprintf(d->name, sizeof d->name, "%.60s-%dL-%.40s-%.0fkHz", t->name, r->levels,
             o->cat->switches[r->sw].id, r->fsw / 1e3);
    return BR_OK;
}

int br_explore_design(const br_design *t, const br_explore_opts *o, const br_explore_row *r,
                      br_design **out, br_error *err)
{
    *out = br_design_create();
    if (!*out)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    int rc = build_design(t, o, r, *out, err);
    if (rc != BR_OK) {
        br_design_free(*out);
        *out = NULL;
    }
    return rc;
}

/* ---- the screen ------------------------------------------------------------ */

/* The criteria the margin target applies to: those with a margin in volts. */
static int in_volts(int c)
{
    return br_crit_has_margin(c) && strcmp(br_crit_unit(c), "V") == 0;
}

/* The cold start and every direction's steady state of c at its nominal
 * point, each simulation carrying the stop poll. */
static int evaluate(const br_chain *c, const br_progress *stop, br_evaluation *e, br_error *err)
{
    memset(e, 0, sizeof *e);
    br_startup_opts su = {0};
    su.progress = stop;
    int rc = br_startup_run(c, &su, &e->su, err);
    e->have_startup = rc == BR_OK;
    br_steady_opts so;
    br_steady_opts_default(&so);
    so.progress = stop;
    e->ndir = br_design_directions(c, e->dirs);
    for (int i = 0; rc == BR_OK && i < e->ndir; i++) {
        rc = br_steady_solve(c, e->dirs[i], &so, &e->ss[i], err);
        if (rc == BR_OK)
            br_steady_figures(c, &e->ss[i], &e->figs[i]);
    }
    if (rc == BR_OK)
        br_verdict_make(c, &e->su, e->figs, e->ndir, &e->v);
    return rc;
}

/* The lowest rail whose drive falls short of the target in some
 * direction (the cascade's drops add up going up, so a second supply
 * there restores every rail above it); 0 when none does. */
static int short_rail(const br_chain *c, const br_evaluation *e, double target)
{
    for (int k = 1; k < c->n; k++) {
        br_rail_fig f = br_rail_fig_worst(e->figs, e->ndir, k);
        if (fmin(fmin(f.m_uvlo, f.m_restart), f.m_drive) < target)
            return k;
    }
    return 0;
}

/* A failure that is the cascade running out of voltage: the rails do not
 * start, drop below UVLO or below the useful drive, or the regulators
 * lose their headroom. */
static int cascade_short(int crit)
{
    return crit == BR_CRIT_STARTUP || crit == BR_CRIT_UVLO || crit == BR_CRIT_RESTART ||
           crit == BR_CRIT_DRIVE || crit == BR_CRIT_HEADROOM || crit == BR_CRIT_STEADY;
}

/* The verdict's figures into r: the smallest margin in volts, the first
 * failing criterion, the start-up time, the supply's power. */
static void read_verdict(const br_evaluation *e, br_explore_row *r, int *fail, int *undet)
{
    r->margin = HUGE_VAL;
    r->crit = r->stage = -1;
    *fail = *undet = -1;
    for (int c = 0; c < BR_CRIT_COUNT; c++) {
        const br_verdict_row *v = &e->v.row[c];
        if (!v->applies)
            continue;
        if (v->undetermined && *undet < 0)
            *undet = c;
        else if (!v->undetermined && !v->pass && *fail < 0)
            *fail = c;
        if (!v->undetermined && in_volts(c) && v->margin < r->margin) {
            r->margin = v->margin;
            r->crit = c;
            r->stage = v->stage;
        }
    }
    const br_verdict_row *st = &e->v.row[BR_CRIT_STARTUP];
    r->tstart = st->applies && !st->undetermined ? st->figure : NAN;
    r->loss = 0;
    for (int i = 0; i < e->ndir; i++)
        r->loss = fmax(r->loss, e->figs[i].supply_p);
}

static void classify(const br_chain *c, const br_evaluation *e, const br_explore_opts *o,
                     double target, br_explore_row *r)
{
    int fail, undet;
    read_verdict(e, r, &fail, &undet);
    if (fail >= 0) {
        r->crit = fail;
        r->stage = e->v.row[fail].stage;
        r->split_at = cascade_short(fail) ? short_rail(c, e, target) : 0;
        r->state = r->split_at > 0 ? BR_EX_SPLIT : BR_EX_FAILS;
    } else if (undet >= 0) {
        r->crit = undet;
        r->state = BR_EX_UNDETERMINED;
    } else if (r->margin < target)
        r->state = BR_EX_MARGIN;
    else if (!(r->tstart <= o->max_startup))
        r->state = BR_EX_STARTUP;
    else if (r->cost > o->max_cost)
        r->state = BR_EX_COST;
    else
        r->state = BR_EX_FEASIBLE;
}

/* Build, simulate and classify the design of r. */
static int screen(const br_design *d, const br_explore_opts *o, double target, br_evaluation *e,
                  br_explore_row *r, br_error *err)
{
    br_chain *c = NULL;
    br_error why;
    br_error_clear(&why);
    int rc = br_chain_build(d, &c, &why);
    if (rc == BR_EINPUT) {
        r->state = BR_EX_REFUSED;
        snprintf(r->note, sizeof r->note, "%.40s: %.110s", why.field, why.msg);
        return BR_OK;
    }
    if (rc != BR_OK) {
        *err = why;
        return rc;
    }
    br_progress stop = br_progress_stop_only(o->progress);
    rc = evaluate(c, &stop, e, &why);
    if (rc == BR_OK)
        classify(c, e, o, target, r);
    else if (rc != BR_ECANCEL && rc != BR_ENOMEM) { /* a simulation that failed decides nothing */
        r->state = BR_EX_UNDETERMINED;
        snprintf(r->note, sizeof r->note, "%.150s", why.msg);
        rc = BR_OK;
    } else
        *err = why;
    br_chain_free(c);
    return rc;
}

int br_explore_screen(const br_design *d, const br_explore_opts *o, double target,
                      br_explore_row *r, br_error *err)
{
    br_evaluation *e = malloc(sizeof *e);
    if (!e)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    int rc = screen(d, o, target, e, r, err);
    free(e);
    return rc;
}

/* ---- the corners ------------------------------------------------------------ */

/* What the worst corners say of a design that passes every criterion at
 * its nominal point: their margin where smaller, not feasible where it
 * does not qualify there.  One held back at its nominal point by a limit
 * (margin, start-up, cost: a split design) keeps that state where every
 * criterion passes at the corners. */
static void take_corners(const br_size_verdict *v, br_explore_row *r)
{
    r->corners = 1;
    if (v->status == BR_OK && isfinite(v->margin) && v->margin < r->margin) {
        r->margin = v->margin;
        r->crit = v->crit;
        r->stage = v->stage;
    }
    if (v->outcome == BR_OUTCOME_UNDETERMINED) {
        r->state = BR_EX_UNDETERMINED;
        r->crit = v->fail_crit;
    } else if (!v->qualifies && (r->state == BR_EX_FEASIBLE || v->outcome != BR_OUTCOME_PASS)) {
        r->state = BR_EX_CORNERS;
        r->crit = v->fail_crit >= 0 ? v->fail_crit : r->crit;
    }
}

/* A survivor judged at its worst corners as `size` judges a value. */
int br_explore_corners(const br_design *d, const br_explore_opts *o, double target,
                       br_explore_row *r, br_error *err)
{
    br_size_opts so;
    br_size_opts_default(&so);
    so.threads = o->threads;
    so.target = target;
    br_progress stop = br_progress_stop_only(o->progress);
    so.progress = &stop;
    br_size_verdict v;
    BR_TRY(br_size_judge(d, d, &so, &v, err));
    take_corners(&v, r);
    return BR_OK;
}

/* ---- the combinations ---------------------------------------------------- */

/* What the catalog parts placed in d (a chain of n stages) cost: a switch
 * and its driver per stage, the catalog diode on each link that has it
 * (the last diode of d). */
static double cost_of(const br_design *d, const br_explore_opts *o, const br_explore_row *r, int n)
{
    const br_catalog *cat = o->cat;
    double per = cat->switch_offer[r->sw].cost;
    if (cat->switch_driver[r->sw] >= 0)
        per += cat->driver_offer[cat->switch_driver[r->sw]].cost;
    double sum = per * n;
    for (int k = 1; r->diode >= 0 && k < n; k++)
        if (br_design_stage(d, k)->diode == d->ndiodes - 1)
            sum += cat->diode_offer[r->diode].cost;
    return sum + br_explore_size_cost(o, r, n);
}

/* The rule for combination r (levels, switch and frequency set): the
 * voltage class and the diode, or BR_EX_RATING (its design is still built,
 * for its cost, but not simulated). */
static void apply_rule(const br_design *t, const br_explore_opts *o, br_explore_row *r)
{
    r->need = br_rating_needed(o->vbus_max, r->levels - 1, derating_of(t, o));
    r->diode = choose_diode(t, o->cat, r->need);
    r->state = BR_EX_FEASIBLE;
    r->margin = r->loss = r->tstart = NAN;
    r->crit = r->stage = -1;
    r->module = -1; /* no second supply chosen (explore_split.c) */
    r->inject_need = r->split_cost = NAN;
    r->sw_ok = o->cat->switch_rating[r->sw] >= r->need;
    if (!r->sw_ok || r->diode == -1)
        r->state = BR_EX_RATING;
    r->diode = r->diode < 0 ? -1 : r->diode;
}

static double default_target(const br_design *t, const br_explore_opts *o)
{
    if (o->target >= 0)
        return o->target;
    double hyst = HUGE_VAL;
    for (int i = 0; i < t->ndrivers; i++)
        hyst = fmin(hyst, t->drivers[i].uvlo_rise.nom - t->drivers[i].uvlo_fall.nom);
    for (int i = 0; i < o->cat->ndrivers; i++)
        hyst = fmin(hyst, o->cat->drivers[i].uvlo_rise.nom - o->cat->drivers[i].uvlo_fall.nom);
    return 0.25 * (hyst > 0 && isfinite(hyst) ? hyst : 0.0);
}

static int check_input(const br_design *t, const br_explore_opts *o, int count, br_error *err)
{
    if (o->parts && t->topology == BR_TOPO_FCML)
        BR_TRY(br_explore_size_check(t, o, err));
    if (t->topology != BR_TOPO_FCML)
        return br_error_set(err, BR_EINPUT, t->path, 0, "topology",
                            "the template is a switch string, expected an <fcml> leg to vary "
                            "its level count");
    if (!o->cat || o->cat->nswitches == 0)
        return br_error_set(err, BR_EINPUT, o->cat ? o->cat->path : "", 0, "switch",
                            "the catalog offers no switch, expected at least one with its "
                            "voltage class");
    if (o->lmin < 2 || o->lmax > BR_MAX_SWITCHES / 2 + 1 || o->lmin > o->lmax || o->nfsw < 1 ||
        o->nfsw > BR_EXPLORE_MAX_FSW || !(o->vbus > 0) || !(o->vbus_max >= o->vbus))
        return br_error_set(err, BR_EUSAGE, NULL, 0, "",
                            "explore: levels, frequencies or bus voltage out of range");
    if (count > BR_EXPLORE_MAX)
        return br_error_set(err, BR_EUSAGE, NULL, 0, "",
                            "explore: %d combinations, expected at most %d", count, BR_EXPLORE_MAX);
    return BR_OK;
}

/* Rows in the order levels, switch, frequency. */
static void lay_out(const br_design *t, const br_explore_opts *o, br_explore *x)
{
    int i = 0;
    for (int l = o->lmin; l <= o->lmax; l++)
        for (int s = 0; s < o->cat->nswitches; s++)
            for (int f = 0; f < o->nfsw; f++, i++) {
                br_explore_row *r = &x->rows[i];
                r->levels = l;
                r->sw = s;
                r->fsw = o->fsw[f];
                apply_rule(t, o, r);
            }
}

/* A survivor's rail capacitors sized (explore_size.h), its design *d
 * rebuilt with them, costed and screened again; with corners, the
 * sizing's verdict at the worst corners taken too. */
static int size_row(const br_design *t, const br_explore_opts *o, double target, br_evaluation *e,
                    br_explore_row *r, br_design **d, br_error *err)
{
    br_size_verdict v;
    BR_TRY(br_explore_size_caps(*d, o, target, r, &v, err));
    if (r->state != BR_EX_FEASIBLE)
        return BR_OK;
    br_design_free(*d);
    *d = NULL;
    BR_TRY(br_explore_design(t, o, r, d, err));
    r->cost = cost_of(*d, o, r, 2 * (r->levels - 1));
    BR_TRY(screen(*d, o, target, e, r, err));
    if (r->state == BR_EX_FEASIBLE && o->corners)
        take_corners(&v, r);
    return BR_OK;
}

static int judge_row(const br_design *t, const br_explore_opts *o, double target, br_evaluation *e,
                     br_explore_row *r, br_error *err)
{
    if (o->parts)
        BR_TRY(br_explore_size_rule(t, o, r, err));
    if (r->state != BR_EX_FEASIBLE)
        return BR_OK;
    br_design *d = NULL;
    BR_TRY(br_explore_design(t, o, r, &d, err));
    r->cost = cost_of(d, o, r, 2 * (r->levels - 1));
    int rc = screen(d, o, target, e, r, err);
    if (rc == BR_OK && r->state == BR_EX_FEASIBLE && o->parts)
        rc = size_row(t, o, target, e, r, &d, err);
    else if (rc == BR_OK && r->state == BR_EX_FEASIBLE && o->corners)
        rc = br_explore_corners(d, o, target, r, err);
    if (rc == BR_OK && r->state == BR_EX_SPLIT)
        rc = br_explore_split(d, o, target, r, err);
    if (rc == BR_OK && r->state == BR_EX_FEASIBLE && o->yield_samples > 0)
        rc = br_explore_yield(d, o, r, err);
    br_design_free(d);
    return rc;
}

int br_explore_shard_has(const br_explore_opts *o, int i)
{
    return o->shard_n <= 0 || i % o->shard_n == o->shard_k - 1;
}

typedef struct rows_ctx {
    const br_design *t;
    const br_explore_opts *o;
    br_explore *x;
} rows_ctx;

/* Row i, when the shard judges it (on a worker thread of br_explore_pool:
 * it writes row i alone).  Items are handed out from the last row, the
 * longest chains, which take longest to judge: the short ones then fill
 * the threads at the end rather than one long chain running alone (no
 * row depends on another, so the order changes no result). */
static int judge_one(void *ctx, int item, br_error *err)
{
    const rows_ctx *c = ctx;
    int i = c->x->n - 1 - item;
    if (!br_explore_shard_has(c->o, i))
        return BR_OK;
    br_evaluation *e = malloc(sizeof *e);
    if (!e)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    int rc = judge_row(c->t, c->o, c->x->target, e, &c->x->rows[i], err);
    free(e);
    return rc;
}

static int run_rows(const br_design *t, const br_explore_opts *o, br_explore *x, br_error *err)
{
    if (o->given) { /* merged from shards: the rows as they were judged */
        if (o->ngiven != x->n)
            return br_error_set(err, BR_EINPUT, NULL, 0, "points",
                                "the shards hold %ld combinations, expected %d", o->ngiven, x->n);
        memcpy(x->rows, o->given, sizeof *x->rows * (size_t)x->n);
        return BR_OK;
    }
    rows_ctx c = {t, o, x};
    return br_explore_pool(x->n, o->threads, judge_one, &c, o->progress, err);
}

int br_explore_run(const br_design *t, const br_explore_opts *o, br_explore **out, br_error *err)
{
    *out = NULL;
    int count = (o->lmax - o->lmin + 1) * (o->cat ? o->cat->nswitches : 0) * o->nfsw;
    BR_TRY(check_input(t, o, count, err));
    br_explore *x = calloc(1, sizeof *x);
    br_explore_row *rows = calloc((size_t)count, sizeof *rows);
    if (!x || !rows) {
        free(x);
        free(rows);
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    }
    x->rows = rows;
    x->n = count;
    x->target = default_target(t, o);
    x->vbus = o->vbus;
    x->vbus_max = o->vbus_max;
    x->derating = derating_of(t, o);
    x->corners = o->corners;
    x->parts = o->parts;
    x->modules = br_explore_module_catalog(o);
    x->yield_samples = o->yield_samples;
    x->seed = o->seed;
    lay_out(t, o, x);
    int rc = run_rows(t, o, x, err);
    if (rc != BR_OK) {
        br_explore_free(x);
        return rc;
    }
    x->nfront = br_explore_pareto(x->rows, x->n);
    for (int i = 0; i < x->n; i++)
        x->nfeasible += x->rows[i].state == BR_EX_FEASIBLE;
    *out = x;
    return BR_OK;
}

void br_explore_free(br_explore *x)
{
    if (!x)
        return;
    free(x->rows);
    free(x);
}

/* ---- the front ------------------------------------------------------------- */

/* a is at least as good as b in every objective and better in one. */
static int dominates(const br_explore_row *a, const br_explore_row *b)
{
    int ge = a->cost <= b->cost && a->loss <= b->loss && a->margin >= b->margin;
    int gt = a->cost < b->cost || a->loss < b->loss || a->margin > b->margin;
    return ge && gt;
}

/* The ranking order: the front first, then margin, cost, loss. */
static int better(const br_explore_row *a, const br_explore_row *b)
{
    if (a->front != b->front)
        return a->front > b->front;
    if (a->margin != b->margin)
        return a->margin > b->margin;
    if (a->cost != b->cost)
        return a->cost < b->cost;
    return a->loss < b->loss;
}

int br_explore_pareto(br_explore_row *rows, int n)
{
    int nfront = 0;
    for (int i = 0; i < n; i++) {
        rows[i].front = rows[i].state == BR_EX_FEASIBLE;
        rows[i].rank = 0;
        for (int j = 0; rows[i].front && j < n; j++)
            if (j != i && rows[j].state == BR_EX_FEASIBLE && dominates(&rows[j], &rows[i]))
                rows[i].front = 0;
        nfront += rows[i].front;
    }
    /* a feasible row's rank: one more than the feasible rows ahead of it
     * (better, or equal and earlier) */
    for (int i = 0; i < n; i++) {
        if (rows[i].state != BR_EX_FEASIBLE)
            continue;
        rows[i].rank = 1;
        for (int j = 0; j < n; j++)
            if (j != i && rows[j].state == BR_EX_FEASIBLE &&
                (better(&rows[j], &rows[i]) || (j < i && !better(&rows[i], &rows[j]))))
                rows[i].rank++;
    }
    return nfront;
}

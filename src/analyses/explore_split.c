/* explore_split.c - a chain too long for one supply, split: the design
 * with a second isolated supply feeding one rail directly (an injection,
 * model/design.h), the search for that rail, and its judgement.
 *
 * The injection is what a designer adds first: an isolated module of the
 * same output as the main supply (its voltage and tolerance), behind the
 * diode and resistor the link into that rail had, on from power-up; the
 * resistor raised where needed so that the module's step into the empty
 * rail stays within the diode's repetitive peak current.  The
 * rail: the screen of the one-supply chain names the lowest rail that
 * falls short (split_at); every rail below it held with the whole chain's
 * charge through it, and holds with less.  The search starts there, where
 * the upper part is shortest, and moves the injection down one rail at a
 * time while the split design's smallest margin grows (the lower part
 * gets shorter, the upper part longer: the worst margin rises and then
 * falls), at most BR_SPLIT_TRIES designs.  The best one is kept, and
 * with opts.corners judged at its worst corners as a survivor is when
 * every criterion passes at its nominal point: a split design is
 * reported holding only where it holds there too.
 *
 * With isolated supply modules in a catalog (br_explore_module_catalog),
 * the module is the cheapest that suits the rail: its voltage's tolerance
 * holds the main supply's nominal voltage, and its rated current and its
 * current limit (the lowest its tolerance allows) are at least
 * BR_MODULE_MARGIN times what the rails it feeds draw running
 * (br_link_current: drivers' running and isolator currents, gate charge
 * times the frequency, regulators' quiescent currents, up to the top).
 * The split design then takes the module's voltage, tolerance and limit,
 * its output resistance in series with the link's resistor, and its cost
 * is added to the combination's (split_cost).  None suits: the module of
 * the main supply's output is judged as without modules, not costed. */
#include "analyses/explore.h"

#include "analyses/rules.h"
#include "core/error.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#define BR_SPLIT_TRIES 3 /* split designs judged per combination at most */

/* The module's series resistance, its output's and the link resistor's. */
static br_qty series_r(const br_qty *link, const br_qty *own)
{
    br_qty q = *link;
    q.nom += own->nom;
    q.min += own->min;
    q.max += own->max;
    return q;
}

/* The highest current the module's step into the empty rail can take:
 * its limit where it has one, else its highest voltage over r. */
static double inrush(const br_inject_spec *j)
{
    double step = j->r.nom > 0 ? j->v.max / j->r.nom : HUGE_VAL;
    return j->limit_mode != BR_SUPPLY_UNLIMITED && j->ilimit.max < step ? j->ilimit.max : step;
}

int br_explore_split_design(const br_design *d, int rail, const br_inject_spec *module,
                            br_design **out, br_error *err)
{
    *out = NULL;
    if (rail < 1 || rail >= br_design_nswitch(d) || d->ninject >= BR_MAX_INJECT ||
        br_design_injection(d, rail))
        return br_error_set(err, BR_EINPUT, d->path, 0, "injection",
                            "rail %d cannot take an injection, expected a rail from 1 to %d "
                            "without one",
                            rail, br_design_nswitch(d) - 1);
    br_design *s = br_design_copy(d);
    if (!s)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    const br_stage_spec *sp = br_design_stage(d, rail);
    br_inject_spec *j = &s->inject[s->ninject++];
    memset(j, 0, sizeof *j);
    if (module)
        *j = *module; /* its output and limit */
    j->rail = rail;
    j->v = module ? module->v : d->vsupply;
    j->r = module ? series_r(&sp->r_link, &module->r) : sp->r_link;
    j->diode = sp->diode;
    j->start = 0.0;
    j->line = 0;
    /* the module steps on into an empty rail capacitor: its resistance
     * (or its limit) keeps that step within the diode's repetitive peak
     * rating (IFRM, else its surge rating), the peak being at most V / R;
     * `size` keeps the same floor (br_size_inject_floor) */
    double floor = br_size_inject_floor(s, s->ninject - 1);
    if (floor > 0 && inrush(j) > j->v.max / floor)
        j->r = br_qty_fixed(floor);
    *out = s;
    return BR_OK;
}

/* A split design's score: its smallest margin in volts where the screen
 * decided it (a failing design's margin is negative), -inf where it could
 * not be judged. */
static double score(const br_explore_row *t)
{
    if (t->state == BR_EX_UNDETERMINED || t->state == BR_EX_REFUSED || !isfinite(t->margin))
        return -HUGE_VAL;
    return t->margin;
}

const br_catalog *br_explore_module_catalog(const br_explore_opts *o)
{
    if (o->parts && o->parts->nmodules > 0)
        return o->parts;
    return o->cat && o->cat->nmodules > 0 ? o->cat : NULL;
}

/* Module i comes after module j in the order of cost (then of the
 * catalog). */
static int after(const br_catalog *cat, int i, int j)
{
    double ci = cat->module_offer[i].cost, cj = cat->module_offer[j].cost;
    return ci > cj || (ci == cj && i > j);
}

static int suits(const br_catalog *cat, int i, double vsupply, double need)
{
    const br_inject_spec *m = &cat->modules[i];
    int limited = m->limit_mode != BR_SUPPLY_UNLIMITED;
    return m->v.min <= vsupply && vsupply <= m->v.max && cat->module_rating[i] >= need &&
           (!limited || m->ilimit.min >= need);
}

int br_explore_module_choose(const br_catalog *cat, double vsupply, double need, int past)
{
    int best = -1;
    for (int i = 0; cat && i < cat->nmodules; i++) {
        if ((past >= 0 && !after(cat, i, past)) || !suits(cat, i, vsupply, need))
            continue;
        if (best < 0 || after(cat, best, i))
            best = i;
    }
    return best;
}

/* The module for rail j of design d into t->module (-1: none suits or
 * none listed) and what it must carry into t->inject_need (A). */
static int module_for(const br_design *d, const br_explore_opts *o, int j, br_explore_row *t,
                      br_error *err)
{
    const br_catalog *cat = br_explore_module_catalog(o);
    t->modules = cat ? cat->nmodules : 0;
    t->module = -1;
    t->inject_need = NAN;
    if (!cat)
        return BR_OK;
    br_chain *c = NULL;
    BR_TRY(br_chain_build(d, &c, err));
    t->inject_need = BR_MODULE_MARGIN * br_link_current(c, j);
    br_chain_free(c);
    t->module = br_explore_module_choose(cat, d->vsupply.nom, t->inject_need, -1);
    return BR_OK;
}

/* The split design of d at rail j with t's module (-1: the main
 * supply's output). */
static int split_of(const br_design *d, const br_explore_opts *o, int j, const br_explore_row *t,
                    br_design **s, br_error *err)
{
    const br_catalog *cat = br_explore_module_catalog(o);
    return br_explore_split_design(d, j, t->module >= 0 ? &cat->modules[t->module] : NULL, s, err);
}

/* Judge the split design with its injection at rail j, and its module
 * t->module, into *t: screened, or (worst) at its worst corners as a
 * survivor is (br_explore_corners). */
static int judge_split(const br_design *d, const br_explore_opts *o, double target, int j,
                       br_explore_row *t, int worst, br_error *err)
{
    br_design *s = NULL;
    int rc = split_of(d, o, j, t, &s, err);
    if (rc == BR_OK)
        rc = worst ? br_explore_corners(s, o, target, t, err)
                   : br_explore_screen(s, o, target, t, err);
    br_design_free(s);
    return rc;
}

/* The split at rail j with the cheapest module that suits it. */
static int try_rail(const br_design *d, const br_explore_opts *o, double target, int j,
                    br_explore_row *t, br_error *err)
{
    BR_TRY(module_for(d, o, j, t, err));
    return judge_split(d, o, target, j, t, 0, err);
}

static void keep(br_explore_row *r, const br_explore_row *t, int j, const br_explore_opts *o)
{
    const br_catalog *cat = br_explore_module_catalog(o);
    r->modules = t->modules;
    r->module = t->module;
    r->inject_need = t->inject_need;
    r->module_passed = 0;
    r->module_cost = t->module >= 0 ? cat->module_offer[t->module].cost : 0.0;
    r->split_cost = r->cost + r->module_cost;
    r->inject_rail = j;
    r->split_state = t->state;
    r->split_margin = t->margin;
    r->split_tstart = t->tstart;
    r->split_loss = t->loss;
    r->split_crit = t->crit;
    r->split_stage = t->stage;
    r->split_corners = t->corners;
}

/* Every criterion passes at the nominal point (the state may still be a
 * margin, start-up or cost limit). */
static int holds(int state)
{
    return state == BR_EX_FEASIBLE || state == BR_EX_MARGIN || state == BR_EX_STARTUP ||
           state == BR_EX_COST;
}

/* The cheapest module passes the rule but not the split's screen (its
 * limit or hiccup can hold the empty upper rails back at start-up, which
 * the rule does not see): the next dearer ones that suit, at most
 * BR_MODULE_TRIES more, at r's rail; the first whose split design is
 * feasible replaces *kept (*passed: the cheaper ones passed over), else
 * the cheapest's verdict stands. */
static int dearer_modules(const br_design *d, const br_explore_opts *o, double target,
                          const br_explore_row *r, br_explore_row *kept, int *passed, br_error *err)
{
    const br_catalog *cat = br_explore_module_catalog(o);
    int m = kept->module;
    *passed = 0;
    for (int n = 0; n < BR_MODULE_TRIES && m >= 0 && kept->state != BR_EX_FEASIBLE; n++) {
        m = br_explore_module_choose(cat, d->vsupply.nom, kept->inject_need, m);
        if (m < 0)
            break;
        br_explore_row t = *r;
        t.corners = 0;
        t.modules = kept->modules;
        t.inject_need = kept->inject_need;
        t.module = m;
        BR_TRY(judge_split(d, o, target, r->inject_rail, &t, 0, err));
        if (t.state == BR_EX_FEASIBLE) {
            *kept = t;
            *passed = n + 1;
        }
    }
    return BR_OK;
}

int br_explore_split(const br_design *d, const br_explore_opts *o, double target, br_explore_row *r,
                     br_error *err)
{
    double best = -HUGE_VAL;
    br_explore_row kept = *r;
    r->inject_rail = 0;
    r->split_tries = 0;
    r->split_corners = 0;
    for (int j = r->split_at; j >= 1 && r->split_tries < BR_SPLIT_TRIES; j--) {
        br_explore_row t = *r;
        t.corners = 0;
        BR_TRY(try_rail(d, o, target, j, &t, err));
        r->split_tries++;
        double sc = score(&t);
        if (r->inject_rail > 0 && !(sc > best))
            break; /* past the best: the upper part grows too long */
        r->inject_rail = j;
        kept = t;
        best = sc;
    }
    if (r->inject_rail == 0)
        return BR_OK;
    int passed = 0;
    BR_TRY(dearer_modules(d, o, target, r, &kept, &passed, err));
    if (o->corners && holds(kept.state))
        BR_TRY(judge_split(d, o, target, r->inject_rail, &kept, 1, err));
    keep(r, &kept, r->inject_rail, o);
    r->module_passed = passed;
    return BR_OK;
}

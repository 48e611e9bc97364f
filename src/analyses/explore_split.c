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
 * reported holding only where it holds there too. */
#include "analyses/explore.h"

#include "core/error.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#define BR_SPLIT_TRIES 3 /* split designs judged per combination at most */

int br_explore_split_design(const br_design *d, int rail, br_design **out, br_error *err)
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
    j->rail = rail;
    j->v = d->vsupply;
    j->r = sp->r_link;
    j->diode = sp->diode;
    j->start = 0.0;
    /* the module steps on into an empty rail capacitor: its resistance
     * keeps that step within the diode's repetitive peak rating (IFRM,
     * else its surge rating), the peak being at most V / R; `size` keeps
     * the same floor (br_size_inject_floor) */
    double floor = br_size_inject_floor(s, s->ninject - 1);
    if (floor > j->r.nom)
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

/* Judge the split design with its injection at rail j into *t. */
static int try_rail(const br_design *d, const br_explore_opts *o, double target, int j,
                    br_explore_row *t, br_error *err)
{
    br_design *s = NULL;
    int rc = br_explore_split_design(d, j, &s, err);
    if (rc == BR_OK)
        rc = br_explore_screen(s, o, target, t, err);
    br_design_free(s);
    return rc;
}

static void keep(br_explore_row *r, const br_explore_row *t, int j)
{
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

/* The split design chosen (injection at rail j, screened into *t) judged
 * at its worst corners as a survivor is (br_explore_corners). */
static int corners(const br_design *d, const br_explore_opts *o, double target, int j,
                   br_explore_row *t, br_error *err)
{
    br_design *s = NULL;
    int rc = br_explore_split_design(d, j, &s, err);
    if (rc == BR_OK)
        rc = br_explore_corners(s, o, target, t, err);
    br_design_free(s);
    return rc;
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
        int rc = try_rail(d, o, target, j, &t, err);
        if (rc != BR_OK)
            return rc;
        r->split_tries++;
        double sc = score(&t);
        if (r->inject_rail > 0 && !(sc > best))
            break; /* past the best: the upper part grows too long */
        r->inject_rail = j;
        kept = t;
        best = sc;
    }
    if (r->inject_rail > 0 && o->corners && holds(kept.state)) {
        int rc = corners(d, o, target, r->inject_rail, &kept, err);
        if (rc != BR_OK)
            return rc;
    }
    if (r->inject_rail > 0)
        keep(r, &kept, r->inject_rail);
    return BR_OK;
}

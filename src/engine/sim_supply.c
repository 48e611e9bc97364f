/* sim_supply.c - rail 0: the supply's ramps, its current limit and its
 * hiccups.
 *
 * The supply is an open-circuit voltage Vs(t) behind its resistance Rs.
 * At power-up Vs rises linearly over `ramp` (the supply's input coming
 * up) and over its own `soft-start`, whichever is slower at each instant;
 * a supply restarting after a hiccup rises over its soft-start alone.
 *
 * With a current limit the current through Rs is
 *     i = min((Vs - v0) / Rs, Ilim(v0)),
 * v0 the voltage of the bypass capacitor (the supply's output capacitance
 * and the local bypass, which the design must give with a limit: a
 * limited source's output voltage is what the current it can give makes
 * of its output capacitance).  Ilim is the limit for constant current and
 * hiccup, and for fold-back falls linearly with the output voltage, from
 * the limit at the set voltage to the fold-back current at 0 V.  The
 * supply does not sink more than it would without a limit, and gives
 * nothing while off.
 *
 * Hiccup: once the current has been at its limit for hiccup-delay
 * without a break, the supply turns off for hiccup-off, then starts again
 * through its soft-start; after hiccup-retries retries it stays off.  The
 * timer is read at every interval boundary of the simulation (every
 * switching event), so it starts at most one interval late: a fraction
 * of a switching period against delays of milliseconds.
 *
 * An injection (an isolated supply feeding one rail) may have a current
 * limit of the same modes: its limit law and its hiccup timer are this
 * file's, on a state of its own (br_sim.inj[k]).  It has no output
 * capacitance in the model, so its limit holds the link's current itself
 * (br_sim_inj_clamp, in the link solve), and off it gives nothing (its
 * voltage is 0: the link blocks). */
#include "engine/sim_impl.h"

#include <math.h>

static void limstate_reset(br_limstate *h)
{
    h->off = 0;
    h->until = -HUGE_VAL;
    h->since = HUGE_VAL;
    h->trips = 0;
    h->trip_t = -1.0;
    h->lim = 0;
}

void br_sim_supply_reset(br_sim *s, int cold)
{
    s->soft_t0 = cold ? 0.0 : -HUGE_VAL;
    limstate_reset(&s->sup);
    s->isup = 0.0;
    s->inj_run = !cold;
    for (int k = 0; k < BR_N; k++)
        limstate_reset(&s->inj[k]);
}

/* The fraction of Vs the ramps allow at t. */
static double ramp_fraction(const br_sim *s, double t)
{
    const br_chain *c = s->c;
    double f = 1.0;
    if (c->tramp > 0 && t < s->tramp_end)
        f = t > 0 ? t / c->tramp : 0.0;
    if (c->tsoft > 0 && t < s->soft_t0 + c->tsoft) {
        double g = t > s->soft_t0 ? (t - s->soft_t0) / c->tsoft : 0.0;
        f = g < f ? g : f;
    }
    return f;
}

double br_sim_supply_v(const br_sim *s, double t)
{
    return s->sup.off ? 0.0 : s->c->vsupply * ramp_fraction(s, t);
}

/* Where the power-up ramp and a soft-start that began later cross (the
 * slower of the two changes there), or HUGE_VAL. */
static double ramps_cross(const br_sim *s)
{
    const br_chain *c = s->c;
    if (!(c->tramp > c->tsoft && c->tsoft > 0 && s->soft_t0 > 0))
        return HUGE_VAL;
    return s->soft_t0 * c->tramp / (c->tramp - c->tsoft);
}

static double later(const br_sim *s, double tn, double t)
{
    return t > s->t && t < tn ? t : tn;
}

/* The next change of a limit's hiccup timers after s->t, before tn. */
static double limstate_next(const br_sim *s, const br_limstate *h, const br_climit *l, double tn)
{
    if (h->off)
        return later(s, tn, h->until);
    if (l->mode == BR_SUPPLY_HICCUP && h->since < HUGE_VAL)
        tn = later(s, tn, h->since + l->hiccup_delay);
    return tn;
}

double br_sim_supply_next(const br_sim *s)
{
    const br_chain *c = s->c;
    double tn = HUGE_VAL;
    for (int k = 1; !s->inj_run && k < s->n; k++) /* an injection that starts later */
        if (c->st[k].inject)
            tn = later(s, tn, c->st[k].tinj);
    for (int k = 1; s->injlimm && k < s->n; k++)
        if (br_sim_inj_limited(s, k))
            tn = limstate_next(s, &s->inj[k], &c->st[k].inj_lim, tn);
    br_climit l = br_chain_supply_limit(c);
    if (s->sup.off)
        return limstate_next(s, &s->sup, &l, tn);
    if (c->tramp > 0)
        tn = later(s, tn, s->tramp_end);
    if (c->tsoft > 0)
        tn = later(s, tn, s->soft_t0 + c->tsoft);
    tn = later(s, tn, ramps_cross(s));
    return limstate_next(s, &s->sup, &l, tn);
}

enum { LIM_SAME = 0, LIM_OFF, LIM_RETRY };

/* A limit's hiccup timer at t, from its limit state at the last
 * evaluation: LIM_OFF when it turns the supply off, LIM_RETRY when the
 * supply starts again. */
static int limstate_step(br_limstate *h, const br_climit *l, double t)
{
    if (h->off) {
        if (t < h->until)
            return LIM_SAME;
        h->off = 0; /* retry */
        h->since = HUGE_VAL;
        return LIM_RETRY;
    }
    if (l->mode != BR_SUPPLY_HICCUP)
        return LIM_SAME;
    if (!h->lim) {
        h->since = HUGE_VAL;
        return LIM_SAME;
    }
    if (h->since == HUGE_VAL)
        h->since = t;
    if (t - h->since < l->hiccup_delay)
        return LIM_SAME;
    h->off = 1;
    h->lim = 0;
    h->since = HUGE_VAL;
    if (h->trips++ == 0)
        h->trip_t = t;
    int last = l->hiccup_retries >= 0 && h->trips > l->hiccup_retries;
    h->until = last ? HUGE_VAL : t + l->hiccup_off;
    return LIM_OFF;
}

int br_sim_supply_step(br_sim *s)
{
    const br_chain *c = s->c;
    int moved = 0;
    for (int k = 1; s->injlimm && k < s->n; k++)
        if (br_sim_inj_limited(s, k))
            moved |= limstate_step(&s->inj[k], &c->st[k].inj_lim, s->t) != LIM_SAME;
    br_climit l = br_chain_supply_limit(c);
    int r = limstate_step(&s->sup, &l, s->t);
    if (r == LIM_RETRY)
        s->soft_t0 = s->t; /* through the soft-start again */
    return moved || r != LIM_SAME;
}

/* The limit at output voltage v, A (HUGE_VAL: none). */
static double climit_at(const br_climit *l, double v)
{
    if (l->mode == BR_SUPPLY_UNLIMITED)
        return HUGE_VAL;
    if (l->mode != BR_SUPPLY_FOLDBACK)
        return l->ilimit;
    double f = l->vset > 0 ? v / l->vset : 1.0;
    f = f < 0 ? 0.0 : f > 1 ? 1.0 : f;
    return l->ifold + (l->ilimit - l->ifold) * f;
}

/* d Ilim / d v where the limit binds (0 for a constant limit). */
static double climit_slope(const br_climit *l, double v)
{
    if (l->mode != BR_SUPPLY_FOLDBACK || !(v > 0 && v < l->vset))
        return 0.0;
    return (l->ilimit - l->ifold) / l->vset;
}

double br_sim_supply_limit(const br_sim *s, double v0)
{
    br_climit l = br_chain_supply_limit(s->c);
    return climit_at(&l, v0);
}

double br_sim_supply_bypass_i(br_sim *s, double vs, double x0, double *didx)
{
    double rs = s->c->rsupply, i = (vs - x0) / rs, d = -1.0 / rs;
    s->sup.lim = 0;
    if (s->sup.off) {
        i = d = 0.0;
    } else if (s->c->limit_mode != BR_SUPPLY_UNLIMITED) {
        br_climit l = br_chain_supply_limit(s->c);
        double lim = climit_at(&l, x0);
        if (i > lim) {
            i = lim;
            d = climit_slope(&l, x0);
            s->sup.lim = 1;
        }
    }
    if (didx)
        *didx = d;
    return i;
}

double br_sim_inj_limit(const br_sim *s, int k, double vr)
{
    return climit_at(&s->c->st[k].inj_lim, vr);
}

double br_sim_inj_clamp(br_sim *s, int k, double vr, double f, double *gd)
{
    const br_climit *l = &s->c->st[k].inj_lim;
    double lim = climit_at(l, vr);
    s->inj[k].lim = f > lim;
    if (!(f > lim))
        return f;
    *gd = -climit_slope(l, vr);
    return lim;
}

int br_sim_supply_needs_rk(const br_sim *s, double ia, double i0, double vinf)
{
    if (s->c->limit_mode == BR_SUPPLY_UNLIMITED)
        return 0;
    if (s->sup.off)
        return 1;
    /* the current decays from ia to i0 as v0 moves from its value now to
     * vinf; the limit is linear in v0 between them (or constant), so the
     * two ends decide */
    double x0 = s->x[XI(0, F_VC)];
    return ia > br_sim_supply_limit(s, x0) || i0 > br_sim_supply_limit(s, vinf);
}

double br_sim_supply_current(const br_sim *s, int *limited)
{
    if (limited)
        *limited = s->sup.lim;
    return s->isup;
}

int br_sim_supply_trips(const br_sim *s, double *first)
{
    if (first)
        *first = s->sup.trip_t;
    return s->sup.trips;
}

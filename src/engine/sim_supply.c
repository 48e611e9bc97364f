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
 * of a switching period against delays of milliseconds. */
#include "engine/sim_impl.h"

#include <math.h>

void br_sim_supply_reset(br_sim *s, int cold)
{
    s->soft_t0 = cold ? 0.0 : -HUGE_VAL;
    s->sup_off = 0;
    s->sup_until = -HUGE_VAL;
    s->lim_since = HUGE_VAL;
    s->sup_trips = 0;
    s->sup_trip_t = -1.0;
    s->sup_lim = 0;
    s->isup = 0.0;
    s->inj_run = !cold;
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
    return s->sup_off ? 0.0 : s->c->vsupply * ramp_fraction(s, t);
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

double br_sim_supply_next(const br_sim *s)
{
    const br_chain *c = s->c;
    double tn = HUGE_VAL;
    for (int k = 1; !s->inj_run && k < s->n; k++) /* an injection that starts later */
        if (c->st[k].inject)
            tn = later(s, tn, c->st[k].tinj);
    if (s->sup_off)
        return later(s, tn, s->sup_until);
    if (c->tramp > 0)
        tn = later(s, tn, s->tramp_end);
    if (c->tsoft > 0)
        tn = later(s, tn, s->soft_t0 + c->tsoft);
    tn = later(s, tn, ramps_cross(s));
    if (c->limit_mode == BR_SUPPLY_HICCUP && s->lim_since < HUGE_VAL)
        tn = later(s, tn, s->lim_since + c->hiccup_delay);
    return tn;
}

int br_sim_supply_step(br_sim *s)
{
    const br_chain *c = s->c;
    if (s->sup_off) {
        if (s->t < s->sup_until)
            return 0;
        s->sup_off = 0; /* retry: through the soft-start again */
        s->soft_t0 = s->t;
        s->lim_since = HUGE_VAL;
        return 1;
    }
    if (c->limit_mode != BR_SUPPLY_HICCUP)
        return 0;
    if (!s->sup_lim) {
        s->lim_since = HUGE_VAL;
        return 0;
    }
    if (s->lim_since == HUGE_VAL)
        s->lim_since = s->t;
    if (s->t - s->lim_since < c->hiccup_delay)
        return 0;
    s->sup_off = 1;
    s->sup_lim = 0;
    s->lim_since = HUGE_VAL;
    if (s->sup_trips++ == 0)
        s->sup_trip_t = s->t;
    int last = c->hiccup_retries >= 0 && s->sup_trips > c->hiccup_retries;
    s->sup_until = last ? HUGE_VAL : s->t + c->hiccup_off;
    return 1;
}

double br_sim_supply_limit(const br_sim *s, double v0)
{
    const br_chain *c = s->c;
    if (c->limit_mode == BR_SUPPLY_UNLIMITED)
        return HUGE_VAL;
    if (c->limit_mode != BR_SUPPLY_FOLDBACK)
        return c->ilimit;
    double f = c->vsupply > 0 ? v0 / c->vsupply : 1.0;
    f = f < 0 ? 0.0 : f > 1 ? 1.0 : f;
    return c->ifold + (c->ilimit - c->ifold) * f;
}

/* d Ilim / d v0 where the limit binds (0 for a constant limit). */
static double limit_slope(const br_sim *s, double v0)
{
    const br_chain *c = s->c;
    if (c->limit_mode != BR_SUPPLY_FOLDBACK || !(v0 > 0 && v0 < c->vsupply))
        return 0.0;
    return (c->ilimit - c->ifold) / c->vsupply;
}

double br_sim_supply_bypass_i(br_sim *s, double vs, double x0, double *didx)
{
    double rs = s->c->rsupply, i = (vs - x0) / rs, d = -1.0 / rs;
    s->sup_lim = 0;
    if (s->sup_off) {
        i = d = 0.0;
    } else if (s->c->limit_mode != BR_SUPPLY_UNLIMITED) {
        double lim = br_sim_supply_limit(s, x0);
        if (i > lim) {
            i = lim;
            d = limit_slope(s, x0);
            s->sup_lim = 1;
        }
    }
    if (didx)
        *didx = d;
    return i;
}

int br_sim_supply_needs_rk(const br_sim *s, double ia, double i0, double vinf)
{
    if (s->c->limit_mode == BR_SUPPLY_UNLIMITED)
        return 0;
    if (s->sup_off)
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
        *limited = s->sup_lim;
    return s->isup;
}

int br_sim_supply_trips(const br_sim *s, double *first)
{
    if (first)
        *first = s->sup_trip_t;
    return s->sup_trips;
}

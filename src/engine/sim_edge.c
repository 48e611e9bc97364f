/* sim_edge.c - a switch edge sweeping the link it returns through
 * conduction.
 *
 * When the return switch of link k turns off, its voltage rises by the
 * blocking voltage within the edge time, and the link's drive falls from
 * its conducting value through zero within a few hundredths of the edge;
 * when the switch turns on, the drive rises into conduction in the last
 * few hundredths.  Integrating through that corner costs the Runge-Kutta
 * pair many steps (or, taken in one, misplaces the charge), although the
 * rails hardly move while it lasts.  So the fast path takes the link as
 * blocked over the edge interval and moves the charge of the sweep
 * between the rails at once, at the interval's start (cut off) or end
 * (let on), in closed form: with the rails still, the drive u falls at
 * the rate sigma and passes the charge (integral of i du) / sigma
 * (br_diode_sweep_to).  The link's own current reaches the rails through
 * their series resistances, so these join the diode's.  The reference
 * path integrates through the corner; the tests hold the two together. */
#include "engine/sim_impl.h"

#include <math.h>

/* Largest share of the interval the sweep through conduction (from the
 * conducting end down to -BR_VBLOCKED) may take. */
#define BR_EDGE_SHARE (1.0 / 20)

/* Largest movement of the two rails over the sweep, against the drive
 * swept: the closed form holds the rails still, so its charge errs by
 * about this share (a few 1e-6 on the examples' 4-22 uF rails; 1 nF
 * rails fail it and are integrated). */
#define BR_EDGE_STILL 1e-3

/* Largest movement of the two rails by the edge's junction-capacitance
 * charge, against the whole drive swept: that charge is taken along the
 * switch's ramp alone, while the integrated path follows the rails too
 * (1 nF rails behind a 20 pF diode moved 0.3 V in a 200 V edge, and the
 * two differed by 1.4 mV). */
#define BR_EDGE_STILL_CJ 1e-4

/* 1/C of rail j for a charge moved at its node (rail 0 without a bypass
 * capacitor is the supply: no capacitance, its resistance is in R). */
static double inv_cap(const br_sim *s, int j)
{
    if (j == 0 && !br_sim_bypass(s))
        return 0.0;
    return 1.0 / br_sim_cap(s, j, s->x[XI(j, F_VC)]);
}

/* Series resistance link k's own current sees besides the diode's:
 * resistor, return switch and the two rails' (rail 0: the supply's,
 * unless bypassed). */
static double sweep_r(const br_sim *s, int k)
{
    return s->seg.rpath[k] + s->esr[k - 1] + s->esr[k];
}

int br_sim_edge_kind(const br_sim *s, int k, double ta, double tb, double fa, double fb,
                     double *iblk, double *leak)
{
    if (s->integ == BR_INTEG_REFERENCE || !(tb > ta))
        return BR_EDGE_NONE;
    double hi = fmax(fa, fb), lo = fmin(fa, fb);
    if (!(lo < -BR_VBLOCKED) || (hi + BR_VBLOCKED) > BR_EDGE_SHARE * (hi - lo))
        return BR_EDGE_NONE;
    /* how far the rails move while the drive sweeps from hi to
     * -BR_VBLOCKED: the sweep's own charge, and the currents the rails
     * carry already (from the last evaluation) over that time */
    const br_diode *d = &s->c->st[k].diode;
    double sig = (hi - lo) / (tb - ta), span = hi + BR_VBLOCKED, tsw = span / sig;
    double ca = inv_cap(s, k - 1), cb = inv_cap(s, k);
    br_diode_sweep w;
    br_diode_sweep_to(d, sweep_r(s, k), hi, &w);
    double move = w.q / sig * (ca + cb) + tsw * (fabs(s->ic[k - 1]) * ca + fabs(s->ic[k]) * cb);
    if (!(move <= BR_EDGE_STILL * span))
        return BR_EDGE_NONE;
    /* the junction charge of the edge, from the conducting end, where
     * conduction pins the junction, to the blocked end */
    double vjc = hi > 0.0 ? br_diode_vjunction(d, w.i) : hi;
    double qj = br_diode_qj(d, -lo) - br_diode_qj(d, -vjc);
    if (!(fabs(qj) * (ca + cb) <= BR_EDGE_STILL_CJ * (hi - lo)))
        return BR_EDGE_NONE;
    /* leakage over the mean drive, and the junction charge spread over
     * the interval (it goes back from rail k to rail k-1 as the drive
     * falls, and forward as it rises) */
    *leak = br_diode_leak(d, -0.5 * (vjc + lo));
    *iblk = -*leak + (fa > fb ? -qj : qj) / (tb - ta);
    return fa > fb ? BR_EDGE_START : BR_EDGE_END;
}

/* The energy budget of link k's sweep of charge q at the rate sig: with
 * the rails still, the two rails' node voltages drive it through the
 * diode, every resistance in its path and the return switch, whose share
 * is what the others leave. */
static void sweep_budget(br_sim *s, int k, const br_diode_sweep *w, double q, double sig)
{
    double rl = s->c->st[k].r_link, rsw = s->seg.rpath[k] - rl;
    s->x[XI(k, F_LR)] += w->i2 * rl / sig;
    s->x[XI(k, F_LS)] += w->i2 * rsw / sig;
    s->x[XI(k, F_LD)] += q * (s->vr[k - 1] - s->vr[k]) - (w->i2 * sweep_r(s, k) + w->e) / sig;
}

/* Move the charge of link k's sweep to drive u (its value at the
 * conducting end, from the workspace's node voltages with the link
 * blocked) from rail k-1 to rail k, with its statistics. */
static int sweep_link(br_sim *s, int k, double u, double t)
{
    const br_diode *d = &s->c->st[k].diode;
    br_diode_sweep w;
    br_diode_sweep_to(d, sweep_r(s, k), u, &w);
    double sig = fabs(s->seg.dslope[k]), q = w.q / sig; /* the rate the drive is swept at */
    if (!(q > 0.0))
        return 0;
    s->x[XI(k, F_VC)] += q / br_sim_cap(s, k, s->x[XI(k, F_VC)]);
    if (k > 1 || br_sim_bypass(s))
        s->x[XI(k - 1, F_VC)] -= q / br_sim_cap(s, k - 1, s->x[XI(k - 1, F_VC)]);
    if (k == 1 && !br_sim_bypass(s)) { /* straight from the supply, through its resistance */
        s->x[X_SQ] += q;
        s->x[X_SE] += q * (s->seg.vs0 + s->seg.vs_slope * (t - s->seg.t0));
        s->x[X_SR] += s->c->rsupply * (w.i2 / sig + 2.0 * s->isup * q);
    }
    sweep_budget(s, k, &w, q, sig);
    if (s->c->st[k].diode.tau > 0)
        s->x[XI(k, F_Q)] += q; /* the sweep lasts far less than tau */
    s->x[XI(k, F_LQ)] += q;
    s->x[XI(k, F_LI2)] += w.i2 / sig;
    s->x[XI(k, F_LE)] += w.e / sig;
    /* capacitor currents: the sweep's i^2 on both rails, plus its cross
     * term with the current each rail carries already */
    s->x[XI(k, F_RI2)] += w.i2 / sig + 2.0 * s->ic[k] * q;
    if (k > 1)
        s->x[XI(k - 1, F_RI2)] += w.i2 / sig - 2.0 * s->ic[k - 1] * q;
    s->sweep_i[k] = fmax(s->sweep_i[k], w.i); /* the next track point shows it */
    return 1;
}

int br_sim_edge_start(br_sim *s)
{
    int moved = 0;
    for (int k = 1; k < s->n; k++)
        if (s->seg.edge[k] == BR_EDGE_START)
            moved |= sweep_link(s, k, -br_sim_link_vrev(s, s->vr, k, s->t), s->t);
    if (moved)
        s->k1_valid = 0;
    return moved;
}

int br_sim_edge_end(br_sim *s, double tb)
{
    int moved = 0;
    for (int k = 1; k < s->n; k++)
        if (s->seg.edge[k] == BR_EDGE_END)
            moved |= sweep_link(s, k, -br_sim_link_vrev(s, s->vr, k, tb), tb);
    if (moved)
        s->k1_valid = 0;
    return moved;
}

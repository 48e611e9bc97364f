/* sim_links.c - the continuous equations of one interval.
 *
 * Rail k node voltage: vr_k = vc_k + esr_k * ic_k, with the capacitor
 * current ic_k = i_k - i_{k+1} - iload_k - iz_k.  Rail 0 is the supply:
 * vr_0 = Vs(t) - Rsrc * (i_1 + iload_0).  A conducting link k carries
 * i_k = f_k(vr_{k-1} - vr_k - d_k(t)) + icj_k, f_k the diode with series
 * resistance (Lambert W closed form) and icj_k the displacement current of
 * its junction capacitance while the switch voltage d_k ramps.  The ESRs
 * couple neighbouring links, so the active currents are solved together by
 * Newton's method on a tridiagonal system, warm-started from the last
 * evaluation. */
#include "engine/diode.h"
#include "engine/sim_impl.h"

#include <math.h>

double br_sim_cap(const br_sim *s, int k, double v)
{
    return k == 0 ? s->c->csupply : br_cap_at(&s->c->st[k].cap, v);
}

double br_sim_vdrv(const br_sim *s, int k, double vr)
{
    return br_sim_vdrv_at(s, k, vr);
}

/* Find the piece of rail k's DC-bias line (flat beyond its ends, as
 * br_cap_at) that holds v, and keep it. */
static void rail_cap_piece(br_sim *s, int k, double v)
{
    br_capseg *p = &s->capseg[k];
    const br_cap *cap = &s->c->st[k].cap;
    int n = cap->nbias, i = 0;
    while (i < n && v > cap->bias_v[i])
        i++;
    p->lo = i == 0 ? -HUGE_VAL : cap->bias_v[i - 1];
    p->hi = i == n ? HUGE_VAL : cap->bias_v[i];
    if (n == 0 || i == 0 || i == n) { /* flat: no table, or beyond an end */
        p->at = 0.0;
        p->slope = 0.0;
        p->c0 = n == 0 ? cap->c : cap->c * cap->bias_f[i == 0 ? 0 : n - 1];
    } else {
        p->at = p->lo;
        p->c0 = cap->c * cap->bias_f[i - 1];
        p->slope = cap->c * (cap->bias_f[i] - cap->bias_f[i - 1]) / (p->hi - p->lo);
    }
}

/* Rail k's capacitance at v for the hot loop: rails move little between
 * evaluations, so the piece of the DC-bias line last used usually holds
 * v already. */
static inline double rail_cap(br_sim *s, int k, double v)
{
    br_capseg *p = &s->capseg[k];
    if (!(v > p->lo && v <= p->hi))
        rail_cap_piece(s, k, v);
    return p->c0 + p->slope * (v - p->at);
}

/* Series resistance between rail k's node and its stored charge: the ESR,
 * or for rail 0 the supply resistance unless a bypass capacitor holds the
 * rail (then the node is the capacitor itself). */
static double esr_of(const br_sim *s, int k)
{
    if (k == 0)
        return br_sim_bypass(s) ? 0.0 : s->c->rsupply;
    return s->c->st[k].cap.esr;
}

void br_sim_cache_esr(br_sim *s)
{
    for (int k = 0; k < s->n; k++)
        s->esr_now[k] = s->esr[k] = esr_of(s, k); /* no rail pinned */
}

static double supply_at(const br_seg *g, double t)
{
    return g->vs0 + g->vs_slope * (t - g->t0);
}

/* Current the supply delivers through its resistance (kept in s->isup). */
static double supply_current(br_sim *s, double t, const double *x, double iout)
{
    if (br_sim_bypass(s))
        s->isup = br_sim_supply_bypass_i(s, supply_at(&s->seg, t), x[XI(0, F_VC)], NULL);
    else
        s->isup = iout + s->seg.iload[0];
    s->il[0] = s->isup; /* link 0 does not exist: observers read the supply there */
    return s->isup;
}

/* Rail node voltages for link currents il (capacitor voltages x). */
static void rail_voltages(br_sim *s, double t, const double *x)
{
    const br_seg *g = &s->seg;
    int n = s->n;
    for (int k = 0; k < n; k++) {
        double iout = br_sim_up(s, s->il, k);
        double iin = k > 0 ? s->il[k] : 0.0;
        if (k == 0) {
            double isup = supply_current(s, t, x, iout);
            s->ic[0] = br_sim_bypass(s) ? isup - iout - g->iload[0] : 0.0;
            s->vr[0] = br_sim_bypass(s) ? x[XI(0, F_VC)] : supply_at(g, t) - s->c->rsupply * isup;
            continue;
        }
        if (s->pin[k]) { /* the clamp takes the surplus: the capacitor holds */
            s->iz[k] = iin - iout - g->iload[k];
            s->ic[k] = 0.0;
            s->vr[k] = x[XI(k, F_VC)];
            continue;
        }
        s->ic[k] = iin - iout - g->iload[k] - s->iz[k];
        s->vr[k] = x[XI(k, F_VC)] + s->esr[k] * s->ic[k];
    }
}

/* Clamp currents from the capacitor voltages (the clamp's own dynamic
 * resistance dominates the ESR, so the capacitor voltage is used).  An
 * ideal clamp (rz = 0) is a hard limit: at its knee it takes whatever
 * would charge the capacitor further, so the rail is pinned there (its
 * current is found with the links', see pinned_clamps). */
static void clamp_currents(br_sim *s, const double *x)
{
    if (!s->zeners) /* nothing clamps: no rail pinned, esr_now is esr (br_sim_cache_esr) */
        return;
    for (int k = 1; k < s->n; k++) {
        const br_aux *a = &s->c->st[k].aux;
        double v = x[XI(k, F_VC)];
        int zener = a->kind == BR_AUX_ZENER, ideal = zener && !(a->rz > 0);
        s->pin[k] = ideal && v >= a->vout;
        s->iz[k] = zener && !ideal && v > a->vout ? (v - a->vout) / a->rz : 0.0;
        s->esr_now[k] = s->pin[k] ? 0.0 : s->esr[k];
    }
    s->esr_now[0] = s->esr[0];
}

/* Junction-capacitance displacement current of link k while the voltage
 * across its return switch ramps.  The junction voltage moves with the
 * ramp only as far as the conduction lets it: quasi-statically
 * dvj = du / (1 + R gj), gj = (f + Is)/(n Vt) the junction conductance,
 * so a reverse-biased diode passes the full Cj dV/dt and a conducting
 * one, its junction pinned, almost none. */
static double cj_current(const br_sim *s, int k, double u, double f)
{
    const br_diode *d = &s->c->st[k].diode;
    if (s->seg.dslope[k] == 0.0 || d->cj0 == 0.0)
        return 0.0;
    double r = d->rs + s->seg.rpath[k];
    double vj = u - f * r;
    double gj = (f + d->is) / (d->n * d->vt);
    return -br_diode_cj(d, -vj) * s->seg.dslope[k] / (1.0 + r * gj);
}

/* Link k's current changed by -dk: the capacitor currents and node
 * voltages of the two rails it joins follow (as rail_voltages would give
 * them, without recomputing the others). */
static void shift_link(br_sim *s, int k, double dk)
{
    if (s->pin[k]) { /* a pinned rail's clamp takes the change */
        s->iz[k] -= dk;
    } else {
        s->ic[k] -= dk;
        s->vr[k] -= s->esr[k] * dk;
    }
    if (br_sim_inj(s, k)) {
        return; /* the isolated supply gives it: no rail below takes part */
    } else if (k > 1 && s->pin[k - 1]) {
        s->iz[k - 1] += dk;
    } else if (k > 1) {
        s->ic[k - 1] += dk;
        s->vr[k - 1] += s->esr[k - 1] * dk;
    } else if (br_sim_bypass(s)) {
        s->ic[0] += dk; /* the supply's current through Rs is fixed by the node */
    } else {
        s->vr[0] += s->c->rsupply * dk; /* less drawn through the supply resistance */
    }
}

/* Newton on r_k(i) = i_k - f_k(u_k(i)) - icj_k over the active links.
 * Newton converges quadratically, so once an update is small the error
 * after it is negligible and needs no further evaluation.  The Jacobian
 * couples a link only to active neighbours (through the rail between
 * them), so the tridiagonal solve runs over the active links alone: an
 * inactive row is the identity with a zero right-hand side. */
static void solve_links(br_sim *s, double t, const double *x)
{
    const br_seg *g = &s->seg;
    const int n = s->n, na = g->nactive, *act = g->act;
    double a[BR_N], b[BR_N], cc[BR_N], r[BR_N];
    for (int k = 1; k < n; k++)
        if (!g->active[k])
            s->il[k] = g->iblk[k];
    for (int k = 1; s->injlimm && k < n; k++)
        s->inj[k].lim = 0; /* a blocked injection is off its limit */
    for (int j = 0; j < na; j++) {
        int k = act[j];
        /* predictor: move the last solution along its tangent to the
         * present drive voltage, so one Newton update usually suffices */
        double vl = br_sim_inj(s, k)            ? 0.0
                    : k > 1 || br_sim_bypass(s) ? x[XI(k - 1, F_VC)]
                                                : supply_at(g, t);
        double drive = vl - x[XI(k, F_VC)] - (g->d0[k] + g->dslope[k] * (t - g->t0));
        s->il[k] += s->gl[k] * (drive - s->ul[k]);
        s->ul[k] = drive;
    }
    rail_voltages(s, t, x);
    for (int it = 0; it < 50 && na > 0; it++) {
        for (int j = 0; j < na; j++) {
            int k = act[j];
            double dk = g->d0[k] + g->dslope[k] * (t - g->t0);
            double u = br_sim_low(s, s->vr, k) - s->vr[k] - dk, f, gd;
            br_diode_eval_warm(&s->c->st[k].diode, g->rpath[k], u, &s->dw[k], &f, &gd);
            s->evals++;
            if (br_sim_inj_limited(s, k))
                f = br_sim_inj_clamp(s, k, s->vr[k], f, &gd);
            s->gd[k] = gd;
            int inj = br_sim_inj(s, k);
            double el = inj ? 0.0 : s->esr_now[k - 1], eh = s->esr_now[k];
            s->gl[k] = gd / (1.0 + gd * (el + eh));
            s->icj[k] = cj_current(s, k, u, f);
            r[k] = s->il[k] - f - s->icj[k];
            b[k] = 1.0 + gd * (el + eh);
            a[k] = !inj && k > 1 && g->active[k - 1] ? -gd * el : 0.0;
            cc[k] = k + 1 < n && g->active[k + 1] && !br_sim_inj(s, k + 1) ? -gd * eh : 0.0;
        }
        /* Thomas algorithm on the tridiagonal Jacobian; a[k] != 0 only
         * when link k-1 is active, and then it is the entry before k */
        for (int j = 1; j < na; j++) {
            int k = act[j];
            if (a[k] == 0.0)
                continue;
            double m = a[k] / b[k - 1];
            b[k] -= m * cc[k - 1];
            r[k] -= m * r[k - 1];
        }
        double worst = 0.0;
        for (int j = na - 1; j >= 0; j--) {
            int k = act[j];
            double dk = (r[k] - (cc[k] != 0.0 ? cc[k] * r[k + 1] : 0.0)) / b[k];
            r[k] = dk;
            s->il[k] -= dk;
            shift_link(s, k, dk);
            /* after an update of relative size e the error is about e^2:
             * 1e-4 leaves the currents good to ~1e-8 */
            double rel = fabs(dk) / (1e-9 + 1e-2 * fabs(s->il[k]));
            worst = rel > worst ? rel : worst; /* fmax is a library call */
        }
        if (worst <= 1.0)
            break;
    }
}

/* The variational equation dPhi/dt = A Phi.  A = d(dvc/dt)/dvc follows
 * from the link solve by the implicit-function theorem: the Newton matrix
 * Jr gives dil/dvc_j = -Jr^-1 dr/dvc_j, where r_k depends on vc_{k-1}
 * through +gd_k and on vc_k through -gd_k. */
static void variational(br_sim *s, double t, const double *x, double *dx)
{
    const br_seg *g = &s->seg;
    int n = s->n, bp = br_sim_bypass(s);
    double a[BR_N], b[BR_N], c[BR_N], D[BR_N][BR_N], A[BR_N][BR_N], di0 = 0.0;
    if (bp) /* the supply current's slope in the bypass voltage (its limit's, when it limits) */
        br_sim_supply_bypass_i(s, supply_at(g, t), x[XI(0, F_VC)], &di0);
    for (int k = 1; k < n; k++) {
        int on = g->active[k], inj = br_sim_inj(s, k);
        double gd = on ? s->gd[k] : 0.0, el = inj ? 0.0 : s->esr_now[k - 1], eh = s->esr_now[k];
        b[k] = 1.0 + gd * (el + eh);
        a[k] = on && !inj && k > 1 && g->active[k - 1] ? -gd * el : 0.0;
        c[k] = on && k + 1 < n && g->active[k + 1] && !br_sim_inj(s, k + 1) ? -gd * eh : 0.0;
    }
    for (int k = 2; k < n; k++) { /* Thomas forward sweep, once for all columns */
        b[k] -= a[k] / b[k - 1] * c[k - 1];
    }
    for (int j = 0; j < n; j++) {
        double r[BR_N] = {0};
        if (j > 0 && g->active[j])
            r[j] = -s->gd[j];
        if (j + 1 < n && g->active[j + 1] && !br_sim_inj(s, j + 1) && (j > 0 || bp))
            r[j + 1] = s->gd[j + 1];
        for (int k = 2; k < n; k++)
            r[k] -= a[k] / b[k - 1] * r[k - 1];
        for (int k = n - 1; k >= 1; k--)
            r[k] = (r[k] - (k + 1 < n ? c[k] * r[k + 1] : 0.0)) / b[k];
        for (int k = 1; k < n; k++)
            D[k][j] = r[k];
    }
    for (int k = 0; k < n; k++) {
        double ck = k > 0 ? rail_cap(s, k, x[XI(k, F_VC)]) : 0.0;
        for (int j = 0; j < n; j++) {
            double dout = k + 1 < n && !br_sim_inj(s, k + 1) ? D[k + 1][j] : 0.0;
            if (k == 0) {
                A[0][j] = bp ? ((j == 0) * di0 - dout) / s->c->csupply : 0.0;
                continue;
            }
            const br_aux *z = &s->c->st[k].aux;
            double diz =
                (j == k && z->kind == BR_AUX_ZENER && z->rz > 0 && x[XI(k, F_VC)] > z->vout)
                    ? 1.0 / z->rz
                    : 0.0;
            A[k][j] = s->pin[k] ? 0.0 : (D[k][j] - dout - diz) / ck; /* a pinned rail holds */
        }
    }
    /* A couples a rail to its neighbours; the ESRs reach further only by
     * powers of gd*ESR (~1e-2), so two rails either side carry it */
    const double *phi = x + s->phi0;
    double *dphi = dx + s->phi0;
    for (int i = 0; i < n; i++) {
        int m0 = i > 2 ? i - 2 : 0, m1 = i + 2 < n - 1 ? i + 2 : n - 1;
        for (int j = 0; j < n; j++) {
            double acc = 0.0;
            for (int m = m0; m <= m1; m++)
                acc += A[i][m] * phi[m * n + j];
            dphi[i * n + j] = acc;
        }
    }
}

/* Derivatives of the quadratures behind the statistics and the energy
 * budget.  A link's current times the voltage across it splits into its
 * diode (conduction, and the rest: junction capacitance, leakage), its
 * resistor and return switch (i^2 R, active links only: a blocked link is
 * a current between the rails) and the power stage (the return switch's
 * voltage at the load current), exactly: u = vr[k-1] - vr[k] - d. */
static void link_quadratures(br_sim *s, int k, double t, double *dx)
{
    const br_seg *g = &s->seg;
    double i = s->il[k], fw = br_sim_forward(s, k);
    double d = g->d0[k] + g->dslope[k] * (t - g->t0);
    double u = br_sim_low(s, s->vr, k) - s->vr[k] - d;
    double vd = g->active[k] ? u - i * g->rpath[k] : u;
    double rl = g->active[k] ? s->c->st[k].r_link : 0.0;
    double rsw = g->active[k] ? g->rpath[k] - s->c->st[k].r_link : 0.0;
    dx[XI(k, F_LQ)] = i; /* all of it: the mean current */
    dx[XI(k, F_LI2)] = fw * fw;
    dx[XI(k, F_LE)] = fw * vd;
    dx[XI(k, F_LX)] = (i - fw) * vd;
    dx[XI(k, F_LL)] = g->active[k] ? 0.0 : -g->ileak[k] * u;
    dx[XI(k, F_LR)] = i * i * rl;
    dx[XI(k, F_LS)] = i * i * rsw;
    dx[XI(k, F_LD)] = i * d;
}

static void quadratures(br_sim *s, double t, const double *x, double *dx)
{
    const br_seg *g = &s->seg;
    for (int k = 0; k < s->n; k++) {
        double vd = br_sim_vdrv_at(s, k, s->vr[k]);
        dx[XI(k, F_RV)] = s->vr[k];
        dx[XI(k, F_RQL)] = g->iload[k] + s->iz[k];
        dx[XI(k, F_RP)] = g->iload[k] * s->vr[k];
        dx[XI(k, F_RD)] = g->irun[k] * vd;
        dx[XI(k, F_RS)] = g->istb[k] * vd;
        dx[XI(k, F_RG)] = g->igate[k] * vd;
        dx[XI(k, F_RZ)] = s->iz[k] * s->vr[k];
        if (k == 0)
            continue;
        link_quadratures(s, k, t, dx);
        dx[XI(k, F_RI2)] = s->ic[k] * s->ic[k];
    }
    double isup = supply_current(s, t, x, br_sim_up(s, s->il, 0));
    dx[X_SQ] = isup;
    dx[X_SE] = isup * supply_at(g, t);
    dx[X_SR] = isup * isup * s->c->rsupply;
    dx[X_SL] = s->sup.lim;
}

/* The few a start-up reads (BR_STATS_STARTUP, br_sim_quad_kept): each
 * link's forward i^2, the supply's charge, energy and time in its limit. */
static void startup_quadratures(br_sim *s, double t, const double *x, double *dx)
{
    for (int k = 1; k < s->n; k++) {
        double fw = br_sim_forward(s, k);
        dx[XI(k, F_LI2)] = fw * fw;
    }
    double isup = supply_current(s, t, x, br_sim_up(s, s->il, 0));
    dx[X_SQ] = isup;
    dx[X_SE] = isup * supply_at(&s->seg, t);
    dx[X_SL] = s->sup.lim;
}

void br_sim_clamp_limit(br_sim *s)
{
    for (int k = 1; s->zeners && k < s->n; k++) {
        const br_aux *a = &s->c->st[k].aux;
        double v = s->x[XI(k, F_VC)];
        if (a->kind != BR_AUX_ZENER || a->rz > 0 || !(v > a->vout))
            continue;
        double q = br_sim_cap(s, k, v) * (v - a->vout);
        s->x[XI(k, F_RQL)] += q; /* into the clamp */
        s->x[XI(k, F_RZ)] += q * 0.5 * (v + a->vout);
        s->x[XI(k, F_VC)] = a->vout;
        s->k1_valid = 0;
        for (int j = 0; s->var && j < s->n; j++) /* held: it forgets where it started */
            s->x[s->phi0 + k * s->n + j] = 0.0;
    }
}

/* A pinned rail whose links and load draw more than they deliver is not
 * held by its clamp (it would have to source current): release it and
 * solve again.  Returns 1 when some rail was released. */
static int release_clamps(br_sim *s)
{
    int any = 0;
    for (int k = 1; s->zeners && k < s->n; k++) {
        if (s->pin[k] && s->iz[k] < 0.0) {
            s->pin[k] = 0;
            s->iz[k] = 0.0;
            s->esr_now[k] = s->esr[k];
            any = 1;
        }
    }
    return any;
}

void br_sim_rhs(br_sim *s, double t, const double *x, double *dx)
{
    int n = s->n;
    clamp_currents(s, x);
    solve_links(s, t, x);
    if (release_clamps(s))
        solve_links(s, t, x);
    /* the variational equation writes every entry of its own; the fast
     * path's steps read only the live entries (sim_step.c, copy_live),
     * and with no statistics or a start-up's this function writes every
     * one of them: then the rest needs no zeros */
    int all = s->integ == BR_INTEG_REFERENCE || (s->stats_on && s->stats_set != BR_STATS_STARTUP);
    for (int i = 0, nz = !all ? 0 : s->var ? s->phi0 : s->nx; i < nz; i++)
        dx[i] = 0.0;
    for (int k = 1; k < n; k++) {
        const br_stage *st = &s->c->st[k];
        dx[XI(k, F_VC)] = s->ic[k] / rail_cap(s, k, x[XI(k, F_VC)]);
        if (st->diode.tau > 0) {
            /* charge-control: the conduction current stores charge, which
             * recombines with tau; a blocked link only loses it, and the
             * stored charge never goes below zero.  The junction-
             * capacitance current an edge drives through the link charges
             * the depletion layer, not the stored charge */
            double q = x[XI(k, F_Q)];
            double dq = br_sim_stored_in(s, k) - q / st->diode.tau;
            dx[XI(k, F_Q)] = q <= 0.0 && dq < 0.0 ? 0.0 : dq;
        }
    }
    if (br_sim_bypass(s))
        dx[XI(0, F_VC)] = s->ic[0] / s->c->csupply;
    if (s->integ == BR_INTEG_REFERENCE || (s->stats_on && s->stats_set != BR_STATS_STARTUP))
        quadratures(s, t, x, dx);
    else if (s->stats_on)
        startup_quadratures(s, t, x, dx);
    if (s->var)
        variational(s, t, x, dx);
}

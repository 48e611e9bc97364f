/* parts.c - resolving parts at the operating temperature, and the few
 * part laws the model itself needs (DC bias, gate charge at a drive). */
#include "core/error.h"
#include "model/chain.h"

#include <math.h>

#define BOLTZMANN 1.380649e-23      /* J/K, CODATA 2018 (exact) */
#define ELEM_CHARGE 1.602176634e-19 /* C, CODATA 2018 (exact) */

double br_thermal_voltage(double T)
{
    return BOLTZMANN * T / ELEM_CHARGE;
}

/* Is(T) = Is(Tnom) (T/Tnom)^(xti/n) exp(Eg/(n Vt(T)) (T/Tnom - 1)): the usual
 * junction-diode temperature law (Sze, Physics of Semiconductor Devices). */
static double is_at(const br_diode_part *p, double T)
{
    double n = p->n.nom, r = T / p->tnom;
    double vt = br_thermal_voltage(T);
    return p->is.nom * pow(r, p->xti.nom / n) * exp(p->eg.nom / (n * vt) * (r - 1.0));
}

int br_diode_at(const br_diode_part *p, double T, br_diode *out, br_error *err)
{
    if (!(p->is.nom > 0) || !(p->n.nom > 0) || !(T > 0))
        return br_error_set(err, BR_EINPUT, NULL, p->line, p->id,
                            "diode needs is > 0, n > 0 and a positive temperature");
    out->id = p->id;
    out->is = is_at(p, T);
    out->n = p->n.nom;
    out->vt = br_thermal_voltage(T);
    out->rs = p->rs.nom;
    out->cj0 = p->cj0.nom;
    out->vj = p->vj.nom;
    out->m = p->m.nom;
    out->tau = p->tau.nom;
    out->ir = p->ir.nom * pow(2.0, (T - p->ir_temp.nom) / p->ir_double.nom);
    out->vrrm = p->vrrm.nom;
    out->ifsm = p->ifsm.nom;
    out->ifrm = p->ifrm.nom;
    out->i2t = p->i2t.nom;
    out->if_avg = p->if_avg.nom;
    out->rth = p->rth.nom;
    out->tj_max = p->tj_max.nom;
    out->tj = T;
    return BR_OK;
}

/* C(T)/C(25 C) from a capacitor's temperature table at T, flat beyond its
 * ends; temp-factor when it has none. */
static double temp_factor(const br_cap_part *p, double T)
{
    int n = p->ntemp;
    if (n == 0)
        return p->tfactor.nom;
    if (T <= p->temp_t[0])
        return p->temp_f[0];
    for (int i = 1; i < n; i++) {
        if (T <= p->temp_t[i]) {
            double x = (T - p->temp_t[i - 1]) / (p->temp_t[i] - p->temp_t[i - 1]);
            return p->temp_f[i - 1] + x * (p->temp_f[i] - p->temp_f[i - 1]);
        }
    }
    return p->temp_f[n - 1];
}

void br_cap_at_nominal(const br_cap_part *p, double T, br_cap *out)
{
    out->id = p->id;
    out->c = p->c.nom * temp_factor(p, T) * p->aging.nom;
    out->esr = p->esr.nom;
    out->vrated = p->vrated.nom;
    out->iripple = p->iripple.nom;
    out->class2 =
        p->dielectric == BR_DIEL_CLASS2 || (p->dielectric == BR_DIEL_UNSTATED && p->nbias > 0);
    out->nbias = p->nbias;
    out->bias_v = p->bias_v;
    out->bias_f = p->bias_f;
}

/* Linear interpolation in the DC-bias table, flat beyond its ends. */
double br_cap_at(const br_cap *cap, double v)
{
    int n = cap->nbias;
    if (n == 0)
        return cap->c;
    if (v <= cap->bias_v[0])
        return cap->c * cap->bias_f[0];
    for (int i = 1; i < n; i++) {
        if (v <= cap->bias_v[i]) {
            double x = (v - cap->bias_v[i - 1]) / (cap->bias_v[i] - cap->bias_v[i - 1]);
            return cap->c * (cap->bias_f[i - 1] + x * (cap->bias_f[i] - cap->bias_f[i - 1]));
        }
    }
    return cap->c * cap->bias_f[n - 1];
}

/* The integral of (c0 + slope (u - at)) u du over [lo, hi]. */
static double piece_energy(double c0, double slope, double at, double lo, double hi)
{
    double d2 = 0.5 * (hi * hi - lo * lo), d3 = (hi * hi * hi - lo * lo * lo) / 3.0;
    return c0 * d2 + slope * (d3 - at * d2);
}

double br_cap_energy(const br_cap *cap, double v)
{
    int n = cap->nbias;
    if (n == 0 || v <= cap->bias_v[0])
        return (n == 0 ? cap->c : cap->c * cap->bias_f[0]) * 0.5 * v * v;
    double e = cap->c * cap->bias_f[0] * 0.5 * cap->bias_v[0] * cap->bias_v[0];
    for (int i = 1; i < n && v > cap->bias_v[i - 1]; i++) {
        double lo = cap->bias_v[i - 1], hi = v < cap->bias_v[i] ? v : cap->bias_v[i];
        double slope = cap->c * (cap->bias_f[i] - cap->bias_f[i - 1]) / (cap->bias_v[i] - lo);
        e += piece_energy(cap->c * cap->bias_f[i - 1], slope, lo, lo, hi);
    }
    if (v > cap->bias_v[n - 1])
        e += piece_energy(cap->c * cap->bias_f[n - 1], 0.0, 0.0, cap->bias_v[n - 1], v);
    return e;
}

double br_rail_start_voltage(const br_chain *c, int k)
{
    const br_stage *st = &c->st[k];
    if (st->aux.kind != BR_AUX_LDO)
        return st->drv.uvlo_rise;
    return st->drv.uvlo_rise < st->aux.vout ? st->drv.uvlo_rise + st->aux.dropout : HUGE_VAL;
}

/* ---- charge on the DC-bias line ------------------------------------------ */

/* The breakpoint of the table next after v in the direction dir (+1 up,
 * -1 down), or NAN beyond the last one. */
static double next_break(const br_cap *cap, double v, int dir)
{
    if (dir > 0) {
        for (int i = 0; i < cap->nbias; i++)
            if (cap->bias_v[i] > v)
                return cap->bias_v[i];
    } else {
        for (int i = cap->nbias - 1; i >= 0; i--)
            if (cap->bias_v[i] < v)
                return cap->bias_v[i];
    }
    return NAN;
}

/* C(v) is linear between breakpoints, so the trapezoid of each piece is
 * its exact integral. */
double br_cap_charge(const br_cap *cap, double va, double vb)
{
    int dir = vb > va ? 1 : -1;
    double q = 0.0, v = va;
    while (v != vb) {
        double b = next_break(cap, v, dir);
        double w = isnan(b) || (dir > 0 ? b > vb : b < vb) ? vb : b;
        q += 0.5 * (br_cap_at(cap, v) + br_cap_at(cap, w)) * (w - v);
        v = w;
    }
    return q;
}

/* Piece by piece in the direction the charge moves the voltage: a whole
 * piece when the charge covers it, otherwise the root of
 *   C(v) d + slope d^2 / 2 = dq
 * in the form without cancellation, d = 2 dq / (C + sqrt(C^2 + 2 slope dq)). */
double br_cap_after_charge(const br_cap *cap, double v0, double dq)
{
    int dir = dq > 0 ? 1 : -1;
    double v = v0;
    for (int guard = 0; dq != 0.0 && guard <= cap->nbias; guard++) {
        double b = next_break(cap, v, dir), cv = br_cap_at(cap, v);
        if (isnan(b)) /* flat beyond the table */
            return v + dq / cv;
        double qb = br_cap_charge(cap, v, b);
        if (fabs(qb) < fabs(dq)) {
            dq -= qb;
            v = b;
            continue;
        }
        double slope = (br_cap_at(cap, b) - cv) / (b - v);
        double disc = fmax(cv * cv + 2.0 * slope * dq, 0.0);
        return v + 2.0 * dq / (cv + sqrt(disc));
    }
    return dq != 0.0 ? v + dq / br_cap_at(cap, v) : v;
}

/* Above the Miller plateau the gate charge grows about linearly with the
 * drive voltage (common practice), so Qg scales with v / qg_v.  qg_v = 0
 * means the part states a fixed charge. */
double br_sw_qg_at(const br_sw *sw, double v)
{
    if (sw->qg_v <= 0)
        return sw->qg;
    return v > 0 ? sw->qg * v / sw->qg_v : 0.0;
}

/* The drift region of a power MOSFET dominates its on-resistance, and the
 * carrier mobility there falls as a power of the absolute temperature, so
 * Rds(on) rises as (T / Tref)^a (Baliga, Fundamentals of Power
 * Semiconductor Devices); the part states a, or a hot value that fixes it
 * (the reader turns that into a). */
double br_rds_at(const br_switch_part *p, double T)
{
    if (p->rds_exp.nom == 0.0 || !(T > 0) || !(p->rds_temp.nom > 0))
        return p->rds_on.nom;
    return p->rds_on.nom * pow(T / p->rds_temp.nom, p->rds_exp.nom);
}

double br_sw_on_drop(const br_stage *st, int dir, double i)
{
    if (dir < 0 || dir > 1)
        return 0.0;
    return st->carry[dir] * i * st->sw.rds_on;
}

double br_sw_rev_drop(const br_sw *sw, double i)
{
    return sw->vsd0 + fabs(i) * sw->rsd;
}

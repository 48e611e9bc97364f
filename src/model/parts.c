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
    return BR_OK;
}

void br_cap_at_nominal(const br_cap_part *p, br_cap *out)
{
    out->id = p->id;
    out->c = p->c.nom * p->tfactor.nom * p->aging.nom;
    out->esr = p->esr.nom;
    out->vrated = p->vrated.nom;
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

/* Above the Miller plateau the gate charge grows about linearly with the
 * drive voltage (common practice), so Qg scales with v / qg_v.  qg_v = 0
 * means the part states a fixed charge. */
double br_sw_qg_at(const br_sw *sw, double v)
{
    if (sw->qg_v <= 0)
        return sw->qg;
    return v > 0 ? sw->qg * v / sw->qg_v : 0.0;
}

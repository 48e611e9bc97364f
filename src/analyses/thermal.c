/* thermal.c - the junction-temperature balance of a part with an
 * exponential leakage law, and where it runs away. */
#include "analyses/thermal.h"

#include <math.h>

/* Loss at T and its slope. */
static double loss(double pc, double pl, double a, double t0, double T)
{
    return pc + pl * exp(a * (T - t0));
}

int br_thermal_solve(double ta, double rth, double pc, double pl, double t0, double td,
                     br_thermal *out)
{
    out->runaway = 0;
    out->onset_tj = out->onset_amb = HUGE_VAL;
    if (!(ta > 0 && rth >= 0 && pc >= 0 && pl >= 0 && td > 0) || !isfinite(ta + rth + pc + pl + t0))
        return BR_EUSAGE;
    double a = log(2.0) / td, lo = ta + rth * pc;
    out->tj = lo + rth * pl * exp(a * (lo - t0)); /* no leakage, or no resistance: exact */
    if (!(rth > 0 && pl > 0))
        return BR_OK;
    /* the minimum of the convex balance g(T) = ta + rth P(T) - T */
    double ts = t0 + log(1.0 / (rth * a * pl)) / a;
    out->onset_tj = ts;
    out->onset_amb = ts - rth * loss(pc, pl, a, t0, ts);
    if (!(ta <= out->onset_amb)) { /* g(ts) > 0: no fixed point */
        out->runaway = 1;
        out->tj = ts;
        return BR_OK;
    }
    /* g(lo) > 0 >= g(ts): the stable root lies between, g falls there */
    double hi = ts;
    for (int i = 0; i < 200 && hi - lo > 1e-9; i++) {
        double mid = 0.5 * (lo + hi);
        if (ta + rth * loss(pc, pl, a, t0, mid) - mid > 0)
            lo = mid;
        else
            hi = mid;
    }
    out->tj = 0.5 * (lo + hi);
    return BR_OK;
}

void br_link_leak_law(const br_chain *c, int k, double *ir, double *t0, double *td)
{
    const br_design *d = c->design;
    const br_diode_part *p = &d->diodes[br_design_link_diode(d, k)];
    *ir = p->ir.nom;
    *t0 = p->ir_temp.nom;
    *td = p->ir_double.nom;
}

int br_chain_thermal(const br_chain *c)
{
    for (int k = 1; k < c->n; k++)
        if (c->st[k].diode.rth > 0)
            return 1;
    return 0;
}

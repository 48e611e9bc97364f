/* testdesign.c - hand-built designs for tests (invented values). */
#include "testdesign.h"

#include <stdio.h>

static void one_of_each(br_design *d)
{
    br_diode_part *dp = &d->diodes[d->ndiodes++];
    br_diode_part_defaults(dp);
    snprintf(dp->id, sizeof dp->id, "test-diode");
    dp->is = br_qty_fixed(1e-7);
    dp->n = br_qty_fixed(1.5);
    dp->rs = br_qty_fixed(0.5);
    dp->vrrm = br_qty_fixed(600.0);
    br_cap_part *cp = &d->caps[d->ncaps++];
    br_cap_part_defaults(cp);
    snprintf(cp->id, sizeof cp->id, "test-cap");
    cp->c = br_qty_fixed(1e-6);
    cp->esr = br_qty_fixed(0.01);
    cp->vrated = br_qty_fixed(25.0);
    br_driver_part *rp = &d->drivers[d->ndrivers++];
    br_driver_part_defaults(rp);
    snprintf(rp->id, sizeof rp->id, "test-driver");
    rp->uvlo_rise = br_qty_fixed(7.5);
    rp->uvlo_fall = br_qty_fixed(7.0);
    rp->iq_on = br_qty_fixed(2e-3);
    rp->iq_off = br_qty_fixed(0.2e-3);
    br_switch_part *sp = &d->switches[d->nswitches++];
    br_switch_part_defaults(sp);
    snprintf(sp->id, sizeof sp->id, "test-switch");
    sp->qg = br_qty_fixed(10e-9);
    sp->tg = br_qty_fixed(20e-9);
    sp->vgs_max = br_qty_fixed(20.0);
}

br_design *br_test_fcml(int levels, double vin, double fsw, double duty, double deadtime)
{
    br_design *d = br_design_create();
    if (!d)
        return NULL;
    snprintf(d->path, sizeof d->path, "(test)");
    d->levels = levels;
    d->vin = br_qty_fixed(vin);
    d->fsw = br_qty_fixed(fsw);
    d->duty = br_qty_fixed(duty);
    d->deadtime = br_qty_fixed(deadtime);
    d->tamb = br_qty_fixed(300.15);
    d->direction = BR_DIR_NONE;
    d->vsupply = br_qty_fixed(12.0);
    d->rsupply = br_qty_fixed(0.2);
    d->def.r_link = br_qty_fixed(1.0);
    one_of_each(d);
    return d;
}

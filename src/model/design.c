/* design.c - a design's defaults and stage lookup. */
#include "model/design.h"

#include <math.h>
#include <stdlib.h>

#define KELVIN 273.15

br_qty br_qty_fixed(double v)
{
    br_qty q = {v, v, v, BR_DIST_UNIFORM, 3.0, 0};
    return q;
}

static void default_stage(br_stage_spec *s)
{
    s->diode = s->cap = s->driver = s->sw = 0;
    s->aux = -1;
    s->r_link = br_qty_fixed(0.0);
    s->rth = br_qty_fixed(0.0);
    s->rth_given = 0;
    s->line = 0;
}

/* Defaults documented in docs/design-file.md; anything without a sensible
 * default (ratings, part values) must come from the file. */
br_design *br_design_create(void)
{
    br_design *d = calloc(1, sizeof *d);
    if (!d)
        return NULL;
    d->duty = br_qty_fixed(0.5);
    d->deadtime = br_qty_fixed(0.0);
    d->tamb = br_qty_fixed(25.0 + KELVIN);
    d->tj = d->tamb;
    d->direction = BR_DIR_BOTH;
    d->iload = br_qty_fixed(0.0);
    d->load_from = HUGE_VAL;
    d->ac.freq = br_qty_fixed(0.0);
    d->ac.ipk = br_qty_fixed(0.0);
    d->ac.phase = br_qty_fixed(0.0);
    d->ac.depth = br_qty_fixed(0.0);
    d->cfly = br_qty_fixed(0.0);
    d->imbalance = br_qty_fixed(0.0);
    d->tedge = br_qty_fixed(10e-9);
    d->overshoot = br_qty_fixed(0.0);
    d->rsupply = br_qty_fixed(0.0);
    d->tramp = br_qty_fixed(0.0);
    d->csupply = br_qty_fixed(0.0);
    d->limit_mode = BR_SUPPLY_UNLIMITED;
    d->ilimit = br_qty_fixed(0.0);
    d->ifold = br_qty_fixed(0.0);
    d->hiccup_delay = br_qty_fixed(0.0);
    d->hiccup_off = br_qty_fixed(0.0);
    d->hiccup_retries = -1;
    d->tsoft = br_qty_fixed(0.0);
    d->irating = br_qty_fixed(0.0);
    d->topology = BR_TOPO_FCML;
    d->levels = 2;
    default_stage(&d->def);
    d->min_drive = br_qty_fixed(0.0);
    d->derating = br_qty_fixed(0.8); /* common practice: 80 % of VRRM */
    d->startup_max = br_qty_fixed(20e-3);
    d->cap_derating = br_qty_fixed(0.5); /* class II ceramics, common practice */
    d->max_dropouts = -1;
    return d;
}

void br_design_free(br_design *d)
{
    free(d);
}

int br_design_set_startup_method(br_design *d, int method)
{
    if (!d || (method != BR_SU_ENVELOPE && method != BR_SU_PERIODS))
        return BR_EUSAGE;
    d->startup_method = method;
    return BR_OK;
}

const br_stage_spec *br_design_stage(const br_design *d, int k)
{
    if (k >= 0 && k < BR_MAX_SWITCHES && d->has_override[k])
        return &d->stage[k];
    return &d->def;
}

const br_inject_spec *br_design_injection(const br_design *d, int k)
{
    for (int i = 0; i < d->ninject; i++)
        if (d->inject[i].rail == k)
            return &d->inject[i];
    return NULL;
}

int br_design_link_diode(const br_design *d, int k)
{
    const br_inject_spec *j = br_design_injection(d, k);
    return j ? j->diode : br_design_stage(d, k)->diode;
}

int br_design_nswitch(const br_design *d)
{
    return d->topology == BR_TOPO_FCML ? 2 * (d->levels - 1) : d->nswitch;
}

/* Part defaults: the values a part gets for every attribute the file
 * leaves out.  Ratings default to 0, meaning "not given". */
void br_diode_part_defaults(br_diode_part *p)
{
    p->is = br_qty_fixed(1e-14);
    p->n = br_qty_fixed(1.0);
    p->rs = br_qty_fixed(0.0);
    p->cj0 = br_qty_fixed(0.0);
    p->vj = br_qty_fixed(0.7);
    p->m = br_qty_fixed(0.5);
    p->tau = br_qty_fixed(0.0);
    p->eg = br_qty_fixed(1.11); /* silicon, common practice */
    p->xti = br_qty_fixed(3.0); /* junction diode, common practice */
    p->ir = br_qty_fixed(0.0);
    p->ir_temp = br_qty_fixed(25.0 + KELVIN);
    p->ir_double = br_qty_fixed(10.0); /* leakage doubles per ~10 K, common practice */
    p->vrrm = br_qty_fixed(0.0);
    p->ifsm = br_qty_fixed(0.0);
    p->ifrm = br_qty_fixed(0.0);
    p->i2t = br_qty_fixed(0.0);
    p->if_avg = br_qty_fixed(0.0);
    p->rth = br_qty_fixed(0.0);
    p->tj_max = br_qty_fixed(0.0);
    p->tnom = 27.0 + KELVIN; /* the usual reference temperature of diode models */
}

void br_cap_part_defaults(br_cap_part *p)
{
    p->c = br_qty_fixed(0.0);
    p->esr = br_qty_fixed(0.0);
    p->vrated = br_qty_fixed(0.0);
    p->tfactor = br_qty_fixed(1.0);
    p->aging = br_qty_fixed(1.0);
    p->iripple = br_qty_fixed(0.0);
    p->dielectric = BR_DIEL_UNSTATED;
    p->nbias = 0;
    p->ntemp = 0;
}

void br_driver_part_defaults(br_driver_part *p)
{
    p->uvlo_rise = br_qty_fixed(0.0);
    p->uvlo_fall = br_qty_fixed(0.0);
    p->iq_on = br_qty_fixed(0.0);
    p->iq_off = br_qty_fixed(0.0);
    p->i_iso = br_qty_fixed(0.0);
    p->vgs_off = br_qty_fixed(0.0);
}

void br_switch_part_defaults(br_switch_part *p)
{
    p->rds_on = br_qty_fixed(0.0);
    p->rds_temp = br_qty_fixed(25.0 + KELVIN); /* datasheets state it at 25 C, common practice */
    p->rds_exp = br_qty_fixed(0.0);            /* no temperature law unless the file gives one */
    p->qg = br_qty_fixed(0.0);
    p->qg_v = br_qty_fixed(0.0); /* 0: qg is taken as independent of drive */
    p->tg = br_qty_fixed(20e-9);
    p->reverse = BR_REV_DIODE;
    p->vsd = br_qty_fixed(0.0);
    p->vth = br_qty_fixed(0.0);
    p->rsd = br_qty_fixed(0.0);
    p->rsd_given = 0;
    p->vgs_rec = br_qty_fixed(0.0);
    p->vgs_max = br_qty_fixed(0.0);
}

void br_aux_part_defaults(br_aux_part *p)
{
    p->kind = BR_AUX_NONE;
    p->vout = br_qty_fixed(0.0);
    p->dropout = br_qty_fixed(0.0);
    p->iq = br_qty_fixed(0.0);
    p->rz = br_qty_fixed(0.0);
    p->pmax = br_qty_fixed(0.0);
    p->rth = br_qty_fixed(0.0);
    p->tj_max = br_qty_fixed(0.0);
}

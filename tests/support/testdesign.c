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

/* ---- reference cases ---- */

#include <math.h>
#include <stdlib.h>
#include <string.h>

double br_json_number(const char *json, const char *from, const char *key, const char **next)
{
    char pat[96];
    snprintf(pat, sizeof pat, "\"%s\"", key);
    const char *p = strstr(from ? from : json, pat);
    if (!p)
        return NAN;
    p = strchr(p + strlen(pat), ':');
    if (!p)
        return NAN;
    p++;
    while (*p == ' ')
        p++;
    char *end;
    double v = strtod(p, &end);
    if (next)
        *next = end;
    return end == p ? NAN : v;
}

static double num_in(const char *json, const char *section, const char *key)
{
    const char *s = strstr(json, section);
    return s ? br_json_number(json, s, key, NULL) : NAN;
}

/* The load-current fields of a case (absent: idealised commutation, no
 * load): the direction, the dead-time drop vsd, the load current and the
 * on-resistance that carries it, and when the load starts. */
static void reference_load(const char *json, br_design *d)
{
    const char *dir = strstr(json, "\"current\":");
    if (!dir)
        return;
    dir = strchr(dir + strlen("\"current\":"), '"'); /* the value's opening quote */
    d->direction = dir && strncmp(dir, "\"step-up\"", 9) == 0 ? BR_DIR_STEP_UP : BR_DIR_STEP_DOWN;
    double vsd = br_json_number(json, NULL, "vsd", NULL);
    double i = br_json_number(json, NULL, "i_load", NULL);
    double r = br_json_number(json, NULL, "rds_on", NULL);
    double from = br_json_number(json, NULL, "current_from", NULL);
    d->switches[0].vsd = br_qty_fixed(isnan(vsd) ? 0.0 : vsd);
    d->iload = br_qty_fixed(isnan(i) ? 0.0 : i);
    d->switches[0].rds_on = br_qty_fixed(isnan(r) ? 0.0 : r);
    d->load_from = isnan(from) ? HUGE_VAL : from;
}

br_design *br_test_reference_design(const char *json)
{
    double J = 0;
    br_design *d = br_test_fcml(
        (int)br_json_number(json, NULL, "levels", NULL), br_json_number(json, NULL, "vin", NULL),
        br_json_number(json, NULL, "fsw", NULL), br_json_number(json, NULL, "duty", NULL),
        br_json_number(json, NULL, "deadtime", NULL));
    if (!d)
        return NULL;
    d->tedge = br_qty_fixed(br_json_number(json, NULL, "tedge", NULL));
    d->vsupply = br_qty_fixed(br_json_number(json, NULL, "supply_v", NULL));
    d->rsupply = br_qty_fixed(br_json_number(json, NULL, "supply_r", NULL));
    d->def.r_link = br_qty_fixed(br_json_number(json, NULL, "rlink", NULL));
    d->tamb = br_qty_fixed(27.0 + 273.15); /* the reference runs at 27 C */
    br_diode_part *dp = &d->diodes[0];
    dp->is = br_qty_fixed(num_in(json, "\"diode\"", "is"));
    dp->n = br_qty_fixed(num_in(json, "\"diode\"", "n"));
    dp->rs = br_qty_fixed(num_in(json, "\"diode\"", "rs"));
    dp->cj0 = br_qty_fixed(num_in(json, "\"diode\"", "cjo"));
    dp->vj = br_qty_fixed(num_in(json, "\"diode\"", "vj"));
    dp->m = br_qty_fixed(num_in(json, "\"diode\"", "m"));
    dp->tau = br_qty_fixed(num_in(json, "\"diode\"", "tt"));
    d->caps[0].c = br_qty_fixed(num_in(json, "\"cap\"", "c"));
    d->caps[0].esr = br_qty_fixed(num_in(json, "\"cap\"", "esr"));
    br_driver_part *rp = &d->drivers[0];
    rp->iq_on = br_qty_fixed(num_in(json, "\"load\"", "iq_on"));
    rp->iq_off = br_qty_fixed(num_in(json, "\"load\"", "iq_off"));
    rp->uvlo_rise = br_qty_fixed(num_in(json, "\"uvlo\"", "rise"));
    rp->uvlo_fall = br_qty_fixed(num_in(json, "\"uvlo\"", "fall"));
    d->switches[0].qg = br_qty_fixed(num_in(json, "\"load\"", "qg"));
    d->switches[0].tg = br_qty_fixed(num_in(json, "\"load\"", "tg"));
    reference_load(json, d);
    J = dp->is.nom + dp->n.nom + d->caps[0].c.nom + rp->iq_on.nom + d->tedge.nom;
    if (isnan(J)) {
        br_design_free(d);
        return NULL;
    }
    return d;
}

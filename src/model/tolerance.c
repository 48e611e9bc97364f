/* tolerance.c - listing, reading and writing the toleranced values of a
 * design. */
#include "model/tolerance.h"

#include "core/error.h"

#include <stddef.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

/* One attribute of an element: its name in the file, where its br_qty
 * sits inside the element's struct, and its kind. */
typedef struct field {
    const char *attr;
    size_t offset;
    int kind;
} field;

#define F(type, member, attr, kind)                                                                \
    {                                                                                              \
        attr, offsetof(type, member), kind                                                         \
    }
#define END                                                                                        \
    {                                                                                              \
        NULL, 0, 0                                                                                 \
    }

static const field op_fields[] = {F(br_design, vin, "vin", BR_KIND_VOLTAGE),
                                  F(br_design, fsw, "fsw", BR_KIND_FREQUENCY),
                                  F(br_design, duty, "duty", BR_KIND_FRACTION),
                                  F(br_design, deadtime, "dead-time", BR_KIND_TIME),
                                  F(br_design, tamb, "ambient", BR_KIND_TEMPERATURE),
                                  F(br_design, imbalance, "imbalance", BR_KIND_FRACTION),
                                  F(br_design, tedge, "edge-time", BR_KIND_TIME),
                                  F(br_design, overshoot, "overshoot", BR_KIND_FRACTION),
                                  F(br_design, iload, "load-current", BR_KIND_CURRENT),
                                  F(br_design, tj, "switch-tj", BR_KIND_TEMPERATURE),
                                  END};

static const field line_fields[] = {F(br_design, ac.freq, "frequency", BR_KIND_FREQUENCY),
                                    F(br_design, ac.ipk, "peak-current", BR_KIND_CURRENT),
                                    F(br_design, ac.phase, "phase", BR_KIND_ANGLE),
                                    F(br_design, ac.depth, "depth", BR_KIND_FRACTION), END};

static const field fcml_fields[] = {F(br_design, cfly, "cfly", BR_KIND_CAPACITANCE), END};

static const field supply_fields[] = {F(br_design, vsupply, "voltage", BR_KIND_VOLTAGE),
                                      F(br_design, rsupply, "resistance", BR_KIND_RESISTANCE),
                                      F(br_design, tramp, "ramp", BR_KIND_TIME),
                                      F(br_design, csupply, "bypass", BR_KIND_CAPACITANCE),
                                      F(br_design, ilimit, "current-limit", BR_KIND_CURRENT),
                                      F(br_design, ifold, "foldback-current", BR_KIND_CURRENT),
                                      F(br_design, hiccup_delay, "hiccup-delay", BR_KIND_TIME),
                                      F(br_design, hiccup_off, "hiccup-off", BR_KIND_TIME),
                                      F(br_design, tsoft, "soft-start", BR_KIND_TIME),
                                      F(br_design, irating, "rating", BR_KIND_CURRENT),
                                      END};

static const field diode_fields[] = {F(br_diode_part, is, "is", BR_KIND_CURRENT),
                                     F(br_diode_part, n, "n", BR_KIND_NUMBER),
                                     F(br_diode_part, rs, "rs", BR_KIND_RESISTANCE),
                                     F(br_diode_part, cj0, "cj0", BR_KIND_CAPACITANCE),
                                     F(br_diode_part, vj, "vj", BR_KIND_VOLTAGE),
                                     F(br_diode_part, m, "m", BR_KIND_NUMBER),
                                     F(br_diode_part, tau, "tau", BR_KIND_TIME),
                                     F(br_diode_part, eg, "eg", BR_KIND_ENERGY_EV),
                                     F(br_diode_part, xti, "xti", BR_KIND_NUMBER),
                                     F(br_diode_part, ir, "ir", BR_KIND_CURRENT),
                                     F(br_diode_part, ir_temp, "ir-temp", BR_KIND_TEMPERATURE),
                                     F(br_diode_part, ir_double, "ir-doubling", BR_KIND_TEMP_DELTA),
                                     F(br_diode_part, vrrm, "vrrm", BR_KIND_VOLTAGE),
                                     F(br_diode_part, ifsm, "ifsm", BR_KIND_CURRENT),
                                     F(br_diode_part, ifrm, "ifrm", BR_KIND_CURRENT),
                                     F(br_diode_part, i2t, "i2t", BR_KIND_I2T),
                                     F(br_diode_part, if_avg, "if-avg", BR_KIND_CURRENT),
                                     F(br_diode_part, rth, "rth", BR_KIND_THERMAL_R),
                                     F(br_diode_part, tj_max, "tj-max", BR_KIND_TEMPERATURE),
                                     END};

static const field cap_fields[] = {F(br_cap_part, c, "c", BR_KIND_CAPACITANCE),
                                   F(br_cap_part, esr, "esr", BR_KIND_RESISTANCE),
                                   F(br_cap_part, vrated, "rating", BR_KIND_VOLTAGE),
                                   F(br_cap_part, tfactor, "temp-factor", BR_KIND_FRACTION),
                                   F(br_cap_part, aging, "aging", BR_KIND_FRACTION),
                                   F(br_cap_part, iripple, "ripple", BR_KIND_CURRENT),
                                   END};

static const field driver_fields[] = {F(br_driver_part, uvlo_rise, "uvlo-rise", BR_KIND_VOLTAGE),
                                      F(br_driver_part, uvlo_fall, "uvlo-fall", BR_KIND_VOLTAGE),
                                      F(br_driver_part, iq_on, "iq-run", BR_KIND_CURRENT),
                                      F(br_driver_part, iq_off, "iq-uvlo", BR_KIND_CURRENT),
                                      F(br_driver_part, i_iso, "iq-isolator", BR_KIND_CURRENT),
                                      F(br_driver_part, vgs_off, "gate-off", BR_KIND_VOLTAGE),
                                      END};

static const field switch_fields[] = {F(br_switch_part, rds_on, "rds-on", BR_KIND_RESISTANCE),
                                      F(br_switch_part, rds_exp, "rds-on-exp", BR_KIND_NUMBER),
                                      F(br_switch_part, qg, "qg", BR_KIND_CHARGE),
                                      F(br_switch_part, qg_v, "qg-at", BR_KIND_VOLTAGE),
                                      F(br_switch_part, tg, "gate-pulse", BR_KIND_TIME),
                                      F(br_switch_part, vsd, "vsd", BR_KIND_VOLTAGE),
                                      F(br_switch_part, vth, "vth", BR_KIND_VOLTAGE),
                                      F(br_switch_part, rsd, "reverse-r", BR_KIND_RESISTANCE),
                                      F(br_switch_part, vgs_rec, "vgs-rec", BR_KIND_VOLTAGE),
                                      F(br_switch_part, vgs_max, "vgs-max", BR_KIND_VOLTAGE),
                                      END};

static const field regulator_fields[] = {F(br_aux_part, vout, "vout", BR_KIND_VOLTAGE),
                                         F(br_aux_part, dropout, "dropout", BR_KIND_VOLTAGE),
                                         F(br_aux_part, iq, "iq", BR_KIND_CURRENT),
                                         F(br_aux_part, pmax, "power-rating", BR_KIND_POWER),
                                         F(br_aux_part, rth, "rth", BR_KIND_THERMAL_R),
                                         F(br_aux_part, tj_max, "tj-max", BR_KIND_TEMPERATURE),
                                         END};

static const field clamp_fields[] = {F(br_aux_part, vout, "vz", BR_KIND_VOLTAGE),
                                     F(br_aux_part, rz, "rz", BR_KIND_RESISTANCE),
                                     F(br_aux_part, pmax, "power-rating", BR_KIND_POWER),
                                     F(br_aux_part, rth, "rth", BR_KIND_THERMAL_R),
                                     F(br_aux_part, tj_max, "tj-max", BR_KIND_TEMPERATURE),
                                     END};

#undef F
#undef END

/* The parts and stage resistors the chain reads. */
typedef struct usage {
    int diode[BR_MAX_PARTS], cap[BR_MAX_PARTS], driver[BR_MAX_PARTS];
    int sw[BR_MAX_PARTS], aux[BR_MAX_PARTS];
    int def_link;                    /* some link takes the default resistor */
    int stage_link[BR_MAX_SWITCHES]; /* link k takes its override's resistor (and
                                        thermal resistance) */
} usage;

static void mark(int *used, int idx)
{
    if (idx >= 0 && idx < BR_MAX_PARTS)
        used[idx] = 1;
}

/* Stage 0 is fed by the supply: it has no link and no rail capacitor. */
static void find_usage(const br_design *d, usage *u)
{
    memset(u, 0, sizeof *u);
    int n = br_design_nswitch(d);
    for (int k = 0; k < n && k < BR_MAX_SWITCHES; k++) {
        const br_stage_spec *s = br_design_stage(d, k);
        mark(u->driver, s->driver);
        mark(u->sw, s->sw);
        mark(u->aux, s->aux);
        if (k == 0)
            continue;
        mark(u->diode, br_design_link_diode(d, k));
        mark(u->cap, s->cap);
        if (br_design_injection(d, k))
            continue; /* its own resistor, listed with it */
        if (d->has_override[k])
            u->stage_link[k] = 1;
        else
            u->def_link = 1;
    }
}

/* Name of switch s counted from the bottom, as the design file writes it. */
static void switch_name(const br_design *d, int s, char *buf, size_t cap)
{
    int p = d->levels - 1;
    if (d->topology == BR_TOPO_STRING)
        snprintf(buf, cap, "%s", d->sw[s].name);
    else if (s < p)
        snprintf(buf, cap, "B%d", s + 1);
    else
        snprintf(buf, cap, "A%d", 2 * p - s);
}

/* Append the quantity at `offset` when it is toleranced. */
static int add(const br_design *d, br_tol_list *l, size_t offset, int kind, const char *name,
               br_error *err)
{
    const br_qty *q = (const br_qty *)((const char *)d + offset);
    if (!(q->min < q->max))
        return BR_OK;
    if (l->n == BR_TOL_MAX)
        return br_error_set(err, BR_EINPUT, d->path, q->line, name,
                            "more than %d toleranced values, expected at most %d", BR_TOL_MAX,
                            BR_TOL_MAX);
    br_tol_param *p = &l->p[l->n++];
    snprintf(p->name, sizeof p->name, "%s", name);
    p->kind = kind;
    p->offset = offset;
    p->line = q->line;
    p->nom = q->nom;
    p->min = q->min;
    p->max = q->max;
    p->dist = q->dist;
    p->nsig = q->nsig > 0 ? q->nsig : BR_QTY_NSIG;
    return BR_OK;
}

/* Every field of one element whose struct starts at byte `base`. */
static int add_fields(const br_design *d, br_tol_list *l, size_t base, const field *f,
                      const char *owner, br_error *err)
{
    char name[BR_TOL_NAME];
    for (; f->attr; f++) {
        snprintf(name, sizeof name, "%s: %s", owner, f->attr);
        BR_TRY(add(d, l, base + f->offset, f->kind, name, err));
    }
    return BR_OK;
}

#define PART_BASE(array, i)                                                                        \
    (offsetof(br_design, array) + (size_t)(i) * sizeof(((br_design *)0)->array[0]))

static int add_parts(const br_design *d, const usage *u, br_tol_list *l, br_error *err)
{
    char owner[BR_TOL_NAME];
    for (int i = 0; i < d->ndiodes; i++) {
        snprintf(owner, sizeof owner, "diode %s", d->diodes[i].id);
        if (u->diode[i])
            BR_TRY(add_fields(d, l, PART_BASE(diodes, i), diode_fields, owner, err));
    }
    for (int i = 0; i < d->ncaps; i++) {
        snprintf(owner, sizeof owner, "capacitor %s", d->caps[i].id);
        if (u->cap[i])
            BR_TRY(add_fields(d, l, PART_BASE(caps, i), cap_fields, owner, err));
    }
    for (int i = 0; i < d->ndrivers; i++) {
        snprintf(owner, sizeof owner, "driver %s", d->drivers[i].id);
        if (u->driver[i])
            BR_TRY(add_fields(d, l, PART_BASE(drivers, i), driver_fields, owner, err));
    }
    for (int i = 0; i < d->nswitches; i++) {
        snprintf(owner, sizeof owner, "switch %s", d->switches[i].id);
        if (u->sw[i])
            BR_TRY(add_fields(d, l, PART_BASE(switches, i), switch_fields, owner, err));
    }
    for (int i = 0; i < d->naux; i++) {
        int ldo = d->aux[i].kind == BR_AUX_LDO;
        snprintf(owner, sizeof owner, "%s %s", ldo ? "regulator" : "clamp", d->aux[i].id);
        if (u->aux[i])
            BR_TRY(add_fields(d, l, PART_BASE(aux, i), ldo ? regulator_fields : clamp_fields, owner,
                              err));
    }
    return BR_OK;
}

/* Link resistors: the default of <stages> and each override's own. */
static int add_links(const br_design *d, const usage *u, br_tol_list *l, br_error *err)
{
    char name[BR_TOL_NAME], sw[BR_ID_MAX];
    if (u->def_link)
        BR_TRY(add(d, l, offsetof(br_design, def.r_link), BR_KIND_RESISTANCE,
                   "stages: link-resistor", err));
    if (u->def_link && d->def.rth_given)
        BR_TRY(
            add(d, l, offsetof(br_design, def.rth), BR_KIND_THERMAL_R, "stages: diode-rth", err));
    for (int k = 1; k < BR_MAX_SWITCHES; k++) {
        if (!u->stage_link[k])
            continue;
        switch_name(d, k, sw, sizeof sw);
        snprintf(name, sizeof name, "stage %d (%s): link-resistor", k, sw);
        size_t off = PART_BASE(stage, k) + offsetof(br_stage_spec, r_link);
        BR_TRY(add(d, l, off, BR_KIND_RESISTANCE, name, err));
        if (!d->stage[k].rth_given)
            continue;
        snprintf(name, sizeof name, "stage %d (%s): diode-rth", k, sw);
        BR_TRY(add(d, l, PART_BASE(stage, k) + offsetof(br_stage_spec, rth), BR_KIND_THERMAL_R,
                   name, err));
    }
    return BR_OK;
}

static int add_string(const br_design *d, br_tol_list *l, br_error *err)
{
    char name[BR_TOL_NAME];
    if (d->topology != BR_TOPO_STRING)
        return BR_OK;
    for (int s = 0; s < d->nswitch && s < BR_MAX_SWITCHES; s++) {
        snprintf(name, sizeof name, "string switch %s: vblock", d->sw[s].name);
        size_t off = PART_BASE(sw, s) + offsetof(br_switch_spec, vblock);
        BR_TRY(add(d, l, off, BR_KIND_VOLTAGE, name, err));
    }
    return BR_OK;
}

/* Each injection's voltage, resistance and current limit. */
static int add_injections(const br_design *d, br_tol_list *l, br_error *err)
{
    char name[BR_TOL_NAME];
    for (int i = 0; i < d->ninject && i < BR_MAX_INJECT; i++) {
        size_t base = PART_BASE(inject, i);
        snprintf(name, sizeof name, "injection rail %d: voltage", d->inject[i].rail);
        BR_TRY(add(d, l, base + offsetof(br_inject_spec, v), BR_KIND_VOLTAGE, name, err));
        snprintf(name, sizeof name, "injection rail %d: resistance", d->inject[i].rail);
        BR_TRY(add(d, l, base + offsetof(br_inject_spec, r), BR_KIND_RESISTANCE, name, err));
        snprintf(name, sizeof name, "injection rail %d: rating", d->inject[i].rail);
        BR_TRY(add(d, l, base + offsetof(br_inject_spec, irating), BR_KIND_CURRENT, name, err));
        if (d->inject[i].limit_mode == BR_SUPPLY_UNLIMITED)
            continue;
        snprintf(name, sizeof name, "injection rail %d: current-limit", d->inject[i].rail);
        BR_TRY(add(d, l, base + offsetof(br_inject_spec, ilimit), BR_KIND_CURRENT, name, err));
        snprintf(name, sizeof name, "injection rail %d: foldback-current", d->inject[i].rail);
        BR_TRY(add(d, l, base + offsetof(br_inject_spec, ifold), BR_KIND_CURRENT, name, err));
        snprintf(name, sizeof name, "injection rail %d: hiccup-delay", d->inject[i].rail);
        BR_TRY(add(d, l, base + offsetof(br_inject_spec, hiccup_delay), BR_KIND_TIME, name, err));
        snprintf(name, sizeof name, "injection rail %d: hiccup-off", d->inject[i].rail);
        BR_TRY(add(d, l, base + offsetof(br_inject_spec, hiccup_off), BR_KIND_TIME, name, err));
    }
    return BR_OK;
}

int br_tol_list_build(const br_design *d, br_tol_list *out, br_error *err)
{
    usage u;
    out->n = 0;
    find_usage(d, &u);
    BR_TRY(add_fields(d, out, 0, op_fields, "operating-point", err));
    if (d->ac.on)
        BR_TRY(add_fields(d, out, 0, line_fields, "line-cycle", err));
    if (d->topology == BR_TOPO_FCML)
        BR_TRY(add_fields(d, out, 0, fcml_fields, "fcml", err));
    BR_TRY(add_fields(d, out, 0, supply_fields, "supply", err));
    BR_TRY(add_injections(d, out, err));
    BR_TRY(add_parts(d, &u, out, err));
    BR_TRY(add_links(d, &u, out, err));
    return add_string(d, out, err);
}

double br_tol_get(const br_design *d, const br_tol_param *p)
{
    return ((const br_qty *)((const char *)d + p->offset))->nom;
}

void br_tol_set(br_design *d, const br_tol_param *p, double v)
{
    ((br_qty *)((char *)d + p->offset))->nom = v;
}

int br_tol_fix(br_design *d, br_error *err)
{
    br_tol_list *l = malloc(sizeof *l);
    if (!l)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    int rc = br_tol_list_build(d, l, err);
    for (int j = 0; rc == BR_OK && j < l->n; j++) {
        br_qty *q = (br_qty *)((char *)d + l->p[j].offset);
        q->min = q->max = q->nom;
    }
    free(l);
    return rc;
}

void br_tol_apply(br_design *d, const br_tol_list *l, const double *v)
{
    for (int j = 0; j < l->n; j++)
        br_tol_set(d, &l->p[j], v[j]);
}

double br_tol_level(const br_tol_param *p, int level)
{
    return level < 0 ? p->min : level > 0 ? p->max : p->nom;
}

int br_tol_find(const br_tol_list *l, size_t offset)
{
    for (int j = 0; j < l->n; j++)
        if (l->p[j].offset == offset)
            return j;
    return -1;
}

br_design *br_design_copy(const br_design *d)
{
    br_design *c = malloc(sizeof *c);
    if (c)
        memcpy(c, d, sizeof *c);
    return c;
}

/* design_read.c - the frame of a design: operating point, supply,
 * topology, stage assignment, start-up and analysis settings. */
#include "core/error.h"
#include "io/xml_read.h"

#include <ctype.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

static const br_range r_duty = {0.0, 1.0, 1, 1, "a duty strictly between 0 and 1"};
static const br_range r_ambient = {-100.0 + BR_ZERO_CELSIUS, 300.0 + BR_ZERO_CELSIUS, 0, 0,
                                   "a temperature from -100 C to 300 C"};
static const br_range r_imbalance = {0.0, 1.0, 0, 1, "a fraction from 0 to below 1"};
static const br_range r_overshoot = {0.0, 1.0, 0, 0, "a fraction from 0 to 1"};
static const br_range r_period = {0.0, 1.0, 0, 0, "a fraction of the period from 0 to 1"};
static const br_range r_derating = {0.0, 1.0, 1, 0, "a fraction in (0, 1]"};

#define LIST_MAX 1024 /* a precharge switch list */

/* ---- operating point and supply ------------------------------------------- */

static int read_current(br_rd *r, xmlNode *n)
{
    static const struct {
        const char *word;
        int dir;
    } dirs[] = {{"step-down", BR_DIR_STEP_DOWN},
                {"step-up", BR_DIR_STEP_UP},
                {"both", BR_DIR_BOTH},
                {"none", BR_DIR_NONE}};
    char v[32];
    int has = br_xml_attr(n, "current", v, sizeof v);
    if (has == 0)
        return BR_OK;
    for (size_t k = 0; has > 0 && k < sizeof dirs / sizeof dirs[0]; k++)
        if (strcmp(v, dirs[k].word) == 0) {
            r->d->direction = dirs[k].dir;
            return BR_OK;
        }
    return br_rd_fail(r, n, "current", "got '%s', expected step-down, step-up, both or none",
                      has > 0 ? v : "(too long)");
}

/* The load current, when it starts, and the switches' junction
 * temperature (the ambient unless given). */
static int read_load(br_rd *r, xmlNode *n)
{
    br_design *d = r->d;
    BR_TRY(br_rd_qty(r, n, "load-current", BR_KIND_CURRENT, &br_range_nonneg, &d->iload, NULL));
    if (d->direction == BR_DIR_NONE && d->iload.max > 0)
        return br_rd_fail(r, n, "load-current",
                          "%g A with current=\"none\": idealised commutation carries no load "
                          "current; expected load-current=\"0 A\" or a current direction",
                          d->iload.max);
    BR_TRY(br_rd_value(r, n, "load-from", BR_KIND_TIME, &br_range_nonneg, &d->load_from, NULL));
    return br_rd_qty(r, n, "switch-tj", BR_KIND_TEMPERATURE, &r_ambient, &d->tj, &d->tj_given);
}

static int read_operating_point(br_rd *r, xmlNode *n)
{
    br_design *d = r->d;
    BR_TRY(br_rd_qty(r, n, "vin", BR_KIND_VOLTAGE, &br_range_pos, &d->vin, NULL));
    BR_TRY(br_rd_qty(r, n, "fsw", BR_KIND_FREQUENCY, &br_range_pos, &d->fsw, NULL));
    BR_TRY(br_rd_qty(r, n, "duty", BR_KIND_FRACTION, &r_duty, &d->duty, NULL));
    BR_TRY(br_rd_qty(r, n, "dead-time", BR_KIND_TIME, &br_range_nonneg, &d->deadtime, NULL));
    BR_TRY(br_rd_qty(r, n, "ambient", BR_KIND_TEMPERATURE, &r_ambient, &d->tamb, NULL));
    BR_TRY(read_current(r, n));
    BR_TRY(br_rd_qty(r, n, "imbalance", BR_KIND_FRACTION, &r_imbalance, &d->imbalance, NULL));
    BR_TRY(br_rd_qty(r, n, "edge-time", BR_KIND_TIME, &br_range_nonneg, &d->tedge, NULL));
    BR_TRY(br_rd_qty(r, n, "overshoot", BR_KIND_FRACTION, &r_overshoot, &d->overshoot, NULL));
    BR_TRY(read_load(r, n));
    return br_rd_line_cycle(r, n);
}

/* Attribute attr of n belongs to one limit mode only. */
static int mode_only(br_rd *r, xmlNode *n, const char *attr, const char *mode)
{
    return br_rd_fail(r, n, attr, "read only with limit-mode=\"%s\", expected it left out here",
                      mode);
}

/* Where a current limit's fields are: the supply's or an injection's
 * (the same attributes and modes). */
typedef struct limit_ref {
    int *mode;
    br_qty *ilimit, *ifold, *delay, *off;
    int *retries;
    int bypass; /* the main supply: a limit needs its bypass (limit_needs_bypass) */
} limit_ref;

/* The mode of the current limit; the limit itself is current-limit. */
static int read_limit_mode(br_rd *r, xmlNode *n, int has_limit, const limit_ref *l)
{
    char v[16];
    int has = br_xml_attr(n, "limit-mode", v, sizeof v);
    if (has != 0 && !has_limit)
        return br_rd_fail(r, n, "limit-mode",
                          "given without current-limit, expected current-limit=\"...\" too");
    *l->mode = !has_limit                           ? BR_SUPPLY_UNLIMITED
               : has == 0 || !strcmp(v, "constant") ? BR_SUPPLY_CONSTANT
               : !strcmp(v, "foldback")             ? BR_SUPPLY_FOLDBACK
               : !strcmp(v, "hiccup")               ? BR_SUPPLY_HICCUP
                                                    : -1;
    if (*l->mode < 0)
        return br_rd_fail(r, n, "limit-mode", "got '%s', expected constant, foldback or hiccup",
                          has > 0 ? v : "(too long)");
    return BR_OK;
}

/* A limited supply's output voltage is what charges its output
 * capacitance: the model keeps it as a state, which needs a capacitor
 * behind a resistance. */
static int limit_needs_bypass(br_rd *r, xmlNode *n)
{
    const br_design *d = r->d;
    if (d->csupply.min > 0 && d->rsupply.min > 0)
        return BR_OK;
    return br_rd_fail(r, n, "current-limit",
                      "needs bypass > 0 (the supply's output capacitance and the local bypass, "
                      "which the limited current charges) and resistance > 0 (the output "
                      "resistance while it regulates), expected both, e.g. bypass=\"22 uF\" "
                      "resistance=\"50 mohm\"");
}

static int read_foldback(br_rd *r, xmlNode *n, const limit_ref *l)
{
    int has;
    const br_range fold = {0.0, l->ilimit->min, 0, 1, "a current from 0 to below current-limit"};
    BR_TRY(br_rd_qty(r, n, "foldback-current", BR_KIND_CURRENT, &fold, l->ifold, &has));
    if (has && *l->mode != BR_SUPPLY_FOLDBACK)
        return mode_only(r, n, "foldback-current", "foldback");
    if (!has && *l->mode == BR_SUPPLY_FOLDBACK)
        return br_rd_fail(r, n, "foldback-current",
                          "missing, expected the limit at 0 V output with "
                          "limit-mode=\"foldback\" (it folds back linearly from current-limit "
                          "at the set voltage)");
    return BR_OK;
}

static int read_hiccup(br_rd *r, xmlNode *n, const limit_ref *l)
{
    int hiccup = *l->mode == BR_SUPPLY_HICCUP, has_delay, has_off;
    BR_TRY(br_rd_qty(r, n, "hiccup-delay", BR_KIND_TIME, &br_range_nonneg, l->delay, &has_delay));
    BR_TRY(br_rd_qty(r, n, "hiccup-off", BR_KIND_TIME, &br_range_pos, l->off, &has_off));
    int has_retries = xmlHasProp(n, (const xmlChar *)"hiccup-retries") != NULL;
    if (has_retries)
        BR_TRY(br_rd_int(r, n, "hiccup-retries", 0, BR_DROPOUTS_MAX, l->retries));
    if (!hiccup && (has_delay || has_off || has_retries))
        return mode_only(r, n,
                         has_delay ? "hiccup-delay"
                         : has_off ? "hiccup-off"
                                   : "hiccup-retries",
                         "hiccup");
    if (hiccup && !has_off)
        return br_rd_fail(r, n, "hiccup-off",
                          "missing, expected the time the supply stays off before it retries "
                          "with limit-mode=\"hiccup\"");
    return BR_OK;
}

/* The current limit and how the supply behaves there. */
static int read_limit(br_rd *r, xmlNode *n, const limit_ref *l)
{
    int has;
    BR_TRY(br_rd_qty(r, n, "current-limit", BR_KIND_CURRENT, &br_range_pos, l->ilimit, &has));
    BR_TRY(read_limit_mode(r, n, has, l));
    if (has && l->bypass)
        BR_TRY(limit_needs_bypass(r, n));
    BR_TRY(read_foldback(r, n, l));
    return read_hiccup(r, n, l);
}

static int read_supply(br_rd *r, xmlNode *n)
{
    br_design *d = r->d;
    BR_TRY(br_rd_qty(r, n, "voltage", BR_KIND_VOLTAGE, &br_range_pos, &d->vsupply, NULL));
    BR_TRY(br_rd_qty(r, n, "resistance", BR_KIND_RESISTANCE, &br_range_nonneg, &d->rsupply, NULL));
    BR_TRY(br_rd_qty(r, n, "ramp", BR_KIND_TIME, &br_range_nonneg, &d->tramp, NULL));
    BR_TRY(br_rd_qty(r, n, "bypass", BR_KIND_CAPACITANCE, &br_range_nonneg, &d->csupply, NULL));
    BR_TRY(br_rd_qty(r, n, "soft-start", BR_KIND_TIME, &br_range_nonneg, &d->tsoft, NULL));
    BR_TRY(br_rd_qty(r, n, "rating", BR_KIND_CURRENT, &br_range_pos, &d->irating, NULL));
    const limit_ref l = {&d->limit_mode, &d->ilimit,         &d->ifold, &d->hiccup_delay,
                         &d->hiccup_off, &d->hiccup_retries, 1};
    return read_limit(r, n, &l);
}

/* ---- topology --------------------------------------------------------------- */

static int read_interval(br_rd *r, xmlNode *n, double iv[2])
{
    BR_TRY(br_rd_value(r, n, "from", BR_KIND_FRACTION, &r_period, &iv[0], NULL));
    BR_TRY(br_rd_value(r, n, "to", BR_KIND_FRACTION, &r_period, &iv[1], NULL));
    if (iv[0] == iv[1])
        return br_rd_fail(r, n, "to",
                          "equals from (an empty interval), expected to != from "
                          "(to < from wraps past the end of the period)");
    return BR_OK;
}

/* The <on> or <reverse> intervals of one string switch. */
static int read_intervals(br_rd *r, xmlNode *n, const char *what, double iv[][2], int *count)
{
    int k = 0;
    for (xmlNode *c = br_xml_child(n, what); c; c = br_xml_next(c, what), k++) {
        if (k == BR_MAX_WINDOWS)
            return br_rd_fail(r, c, NULL, "more than %d <%s> intervals, expected at most %d",
                              BR_MAX_WINDOWS, what, BR_MAX_WINDOWS);
        BR_TRY(read_interval(r, c, iv[k]));
    }
    *count = k;
    return BR_OK;
}

static int is_word(const char *s)
{
    if (!*s)
        return 0;
    for (; *s; s++)
        if (isspace((unsigned char)*s))
            return 0;
    return 1;
}

/* How a string switch carries the load current while on. */
static int read_conducts(br_rd *r, xmlNode *n, br_switch_spec *s)
{
    char v[16];
    int has = br_xml_attr(n, "conducts", v, sizeof v);
    s->carry = has == 0                           ? BR_CARRY_UNSET
               : has > 0 && !strcmp(v, "forward") ? BR_CARRY_FORWARD
               : has > 0 && !strcmp(v, "reverse") ? BR_CARRY_REVERSE
               : has > 0 && !strcmp(v, "none")    ? BR_CARRY_NONE
                                                  : -1;
    if (s->carry < 0)
        return br_rd_fail(r, n, "conducts", "got '%s', expected forward, reverse or none",
                          has > 0 ? v : "(too long)");
    if (s->carry == BR_CARRY_UNSET && r->d->iload.max > 0)
        return br_rd_fail(r, n, "conducts",
                          "missing: the design carries a %g A load current, expected "
                          "conducts=\"forward\", \"reverse\" or \"none\" (how the switch "
                          "carries it while on)",
                          r->d->iload.max);
    return BR_OK;
}

static int read_string_switch(br_rd *r, xmlNode *n, int k)
{
    br_switch_spec *s = &r->d->sw[k];
    memset(s, 0, sizeof *s);
    int has = br_xml_attr(n, "name", s->name, sizeof s->name);
    if (has <= 0 || !is_word(s->name))
        return br_rd_fail(r, n, "name", "expected one word of 1 to %d characters, no spaces",
                          BR_ID_MAX - 1);
    for (int j = 0; j < k; j++)
        if (strcmp(r->d->sw[j].name, s->name) == 0)
            return br_rd_fail(r, n, "name", "'%s' names two switches, expected unique names",
                              s->name);
    s->vblock = br_qty_fixed(0.0);
    BR_TRY(br_rd_qty(r, n, "vblock", BR_KIND_VOLTAGE, &br_range_nonneg, &s->vblock, NULL));
    BR_TRY(read_conducts(r, n, s));
    BR_TRY(read_intervals(r, n, "on", s->on, &s->nwin));
    BR_TRY(read_intervals(r, n, "reverse", s->rev, &s->nrev));
    s->line = br_rd_line(r, n);
    return BR_OK;
}

static int read_string(br_rd *r, xmlNode *n)
{
    int count = br_xml_count(n, "switch"), k = 0;
    if (count < 2 || count > BR_MAX_SWITCHES)
        return br_rd_fail(r, n, NULL, "%d switches, expected 2 to %d", count, BR_MAX_SWITCHES);
    for (xmlNode *c = br_xml_child(n, "switch"); c; c = br_xml_next(c, "switch"), k++)
        BR_TRY(read_string_switch(r, c, k));
    r->d->topology = BR_TOPO_STRING;
    r->d->nswitch = count;
    return BR_OK;
}

static int read_topology(br_rd *r, xmlNode *n)
{
    xmlNode *c = br_xml_child(n, "fcml");
    if (c) {
        r->d->topology = BR_TOPO_FCML;
        /* 33 levels: 64 switches, the widest precharge mask */
        BR_TRY(br_rd_int(r, c, "levels", 2, (BR_MAX_SWITCHES / 2) + 1, &r->d->levels));
        return br_rd_qty(r, c, "cfly", BR_KIND_CAPACITANCE, &br_range_nonneg, &r->d->cfly, NULL);
    }
    c = br_xml_child(n, "string");
    if (!c)
        return br_rd_fail(r, n, NULL, "expected <fcml> or <string>");
    return read_string(r, c);
}

/* ---- stage assignment --------------------------------------------------------- */

typedef enum part_kind { PK_DIODE, PK_CAP, PK_DRIVER, PK_SWITCH, PK_AUX } part_kind;

static const char *const kind_word[] = {"diode", "capacitor", "driver", "switch",
                                        "regulator or clamp"};

static const char *part_id(const br_design *d, part_kind k, int i)
{
    switch (k) {
    case PK_DIODE:
        return i < d->ndiodes ? d->diodes[i].id : NULL;
    case PK_CAP:
        return i < d->ncaps ? d->caps[i].id : NULL;
    case PK_DRIVER:
        return i < d->ndrivers ? d->drivers[i].id : NULL;
    case PK_SWITCH:
        return i < d->nswitches ? d->switches[i].id : NULL;
    case PK_AUX:
        return i < d->naux ? d->aux[i].id : NULL;
    }
    return NULL;
}

static int find_part(const br_design *d, part_kind k, const char *id)
{
    const char *p;
    for (int i = 0; (p = part_id(d, k, i)) != NULL; i++)
        if (strcmp(p, id) == 0)
            return i;
    return -1;
}

/* "d1, d2" (the ids of one kind), for messages. */
static void id_list(const br_design *d, part_kind k, char *buf, size_t cap)
{
    const char *p;
    size_t n = 0;
    buf[0] = '\0';
    for (int i = 0; (p = part_id(d, k, i)) != NULL && n < cap; i++)
        n += (size_t)snprintf(buf + n, cap - n, "%s%s", i ? ", " : "", p);
    if (n == 0)
        snprintf(buf, cap, "none defined");
}

static int unknown_part(br_rd *r, xmlNode *n, const char *attr, part_kind k, const char *id)
{
    char ids[256];
    for (int o = PK_DIODE; o <= PK_AUX; o++)
        if (o != (int)k && find_part(r->d, (part_kind)o, id) >= 0)
            return br_rd_fail(r, n, attr, "'%s' is a %s, expected the id of a %s", id, kind_word[o],
                              kind_word[k]);
    id_list(r->d, k, ids, sizeof ids);
    return br_rd_fail(r, n, attr,
                      "unknown part id '%s', expected the id of a %s in <parts> "
                      "(%s)",
                      id, kind_word[k], ids);
}

/* Point *idx at the part named by attribute attr (left alone if absent). */
static int resolve(br_rd *r, xmlNode *n, const char *attr, part_kind k, int *idx)
{
    char id[BR_ID_MAX];
    int has = br_xml_attr(n, attr, id, sizeof id);
    if (has == 0)
        return BR_OK;
    if (has > 0 && k == PK_AUX && strcmp(id, "none") == 0) {
        *idx = -1;
        return BR_OK;
    }
    int i = has > 0 ? find_part(r->d, k, id) : -1;
    if (i < 0)
        return unknown_part(r, n, attr, k, has > 0 ? id : "(too long)");
    *idx = i;
    return BR_OK;
}

static int read_assignment(br_rd *r, xmlNode *n, br_stage_spec *s)
{
    BR_TRY(resolve(r, n, "diode", PK_DIODE, &s->diode));
    BR_TRY(resolve(r, n, "capacitor", PK_CAP, &s->cap));
    BR_TRY(resolve(r, n, "driver", PK_DRIVER, &s->driver));
    BR_TRY(resolve(r, n, "switch", PK_SWITCH, &s->sw));
    BR_TRY(resolve(r, n, "rail-extra", PK_AUX, &s->aux));
    int has_rth;
    BR_TRY(br_rd_qty(r, n, "diode-rth", BR_KIND_THERMAL_R, &br_range_nonneg, &s->rth, &has_rth));
    s->rth_given |= has_rth; /* an override keeps the default's unless it gives its own */
    return br_rd_qty(r, n, "link-resistor", BR_KIND_RESISTANCE, &br_range_nonneg, &s->r_link, NULL);
}

static int read_override(br_rd *r, xmlNode *n)
{
    br_design *d = r->d;
    int k, nsw = br_design_nswitch(d);
    BR_TRY(br_rd_int(r, n, "index", 0, nsw - 1, &k));
    if (d->has_override[k])
        return br_rd_fail(r, n, "index",
                          "stage %d is overridden twice (first on line %d), "
                          "expected one <stage> per index",
                          k, d->stage[k].line);
    d->stage[k] = d->def;
    BR_TRY(read_assignment(r, n, &d->stage[k]));
    d->stage[k].line = br_rd_line(r, n);
    d->has_override[k] = 1;
    return BR_OK;
}

static int read_stages(br_rd *r, xmlNode *n)
{
    BR_TRY(read_assignment(r, n, &r->d->def));
    for (xmlNode *c = br_xml_child(n, "stage"); c; c = br_xml_next(c, "stage"))
        BR_TRY(read_override(r, c));
    return BR_OK;
}

/* ---- injections ------------------------------------------------------------------ */

int br_rd_supply_output(br_rd *r, xmlNode *n, br_inject_spec *j)
{
    j->v = br_qty_fixed(0.0);
    j->r = br_qty_fixed(0.0);
    BR_TRY(br_rd_qty(r, n, "voltage", BR_KIND_VOLTAGE, &br_range_pos, &j->v, NULL));
    BR_TRY(br_rd_qty(r, n, "resistance", BR_KIND_RESISTANCE, &br_range_nonneg, &j->r, NULL));
    j->irating = br_qty_fixed(0.0);
    BR_TRY(br_rd_qty(r, n, "rating", BR_KIND_CURRENT, &br_range_pos, &j->irating, NULL));
    j->ilimit = j->ifold = j->hiccup_delay = j->hiccup_off = br_qty_fixed(0.0);
    j->hiccup_retries = -1;
    const limit_ref l = {&j->limit_mode, &j->ilimit,         &j->ifold, &j->hiccup_delay,
                         &j->hiccup_off, &j->hiccup_retries, 0};
    return read_limit(r, n, &l);
}

/* One isolated supply feeding a rail: read once the stages are known, so
 * that its rail and diode can be checked against them. */
static int read_injection(br_rd *r, xmlNode *n, br_inject_spec *j)
{
    br_design *d = r->d;
    int nsw = br_design_nswitch(d);
    BR_TRY(br_rd_int(r, n, "rail", 0, BR_MAX_SWITCHES, &j->rail));
    if (j->rail == 0)
        return br_rd_fail(r, n, "rail",
                          "rail 0 is the supply itself, expected a floating rail from 1 to %d",
                          nsw - 1);
    if (j->rail >= nsw)
        return br_rd_fail(r, n, "rail",
                          "got %d, expected a floating rail from 1 to %d (the leg has %d "
                          "switches)",
                          j->rail, nsw - 1, nsw);
    const br_inject_spec *dup = br_design_injection(d, j->rail);
    if (dup && dup != j)
        return br_rd_fail(r, n, "rail",
                          "rail %d already has an injection (line %d), expected one per rail",
                          j->rail, dup->line);
    BR_TRY(br_rd_supply_output(r, n, j));
    j->start = 0.0;
    BR_TRY(br_rd_value(r, n, "start", BR_KIND_TIME, &br_range_nonneg, &j->start, NULL));
    j->diode = br_design_stage(d, j->rail)->diode; /* the rail's link diode, unless named */
    return resolve(r, n, "diode", PK_DIODE, &j->diode);
}

static int read_injections(br_rd *r, xmlNode *n)
{
    br_design *d = r->d;
    d->ninject = 0;
    for (xmlNode *c = br_xml_child(n, "injection"); c; c = br_xml_next(c, "injection")) {
        if (d->ninject == BR_MAX_INJECT)
            return br_rd_fail(r, c, NULL, "more than %d injections, expected at most %d",
                              BR_MAX_INJECT, BR_MAX_INJECT);
        br_inject_spec *j = &d->inject[d->ninject];
        memset(j, 0, sizeof *j);
        j->rail = -1;
        j->line = br_rd_line(r, c);
        d->ninject++;
        BR_TRY(read_injection(r, c, j));
    }
    return BR_OK;
}

/* ---- start-up ------------------------------------------------------------------ */

/* Name of switch s from the bottom: B1..BP then AP..A1 for an FCML leg. */
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

static int find_switch(const br_design *d, const char *name)
{
    char sn[BR_ID_MAX];
    for (int s = 0; s < br_design_nswitch(d); s++) {
        switch_name(d, s, sn, sizeof sn);
        if (strcmp(sn, name) == 0)
            return s;
    }
    return -1;
}

static int unknown_switch(br_rd *r, xmlNode *n, const char *attr, const char *name)
{
    char names[256], sn[BR_ID_MAX];
    size_t len = 0;
    names[0] = '\0';
    for (int s = 0; s < br_design_nswitch(r->d) && len < sizeof names; s++) {
        switch_name(r->d, s, sn, sizeof sn);
        len += (size_t)snprintf(names + len, sizeof names - len, "%s%s", s ? " " : "", sn);
    }
    return br_rd_fail(r, n, attr, "unknown switch '%s', expected names from: %s", name, names);
}

/* The switch names listed in attribute attr of n as a mask; an empty list
 * is an error. */
static int read_mask_attr(br_rd *r, xmlNode *n, const char *attr, unsigned long long *mask)
{
    char list[LIST_MAX];
    if (br_xml_attr(n, attr, list, sizeof list) < 0)
        return br_rd_fail(r, n, attr, "list too long");
    *mask = 0;
    for (char *save = NULL, *t = strtok_r(list, " \t\r\n", &save); t;
         t = strtok_r(NULL, " \t\r\n", &save)) {
        int s = find_switch(r->d, t);
        if (s < 0)
            return unknown_switch(r, n, attr, t);
        *mask |= 1ULL << s;
    }
    if (*mask == 0)
        return br_rd_fail(r, n, attr, "empty, expected switch names like 'B1 B2'");
    return BR_OK;
}

static int read_mask(br_rd *r, xmlNode *n, unsigned long long *mask)
{
    return read_mask_attr(r, n, "switches", mask);
}

/* Both switches of a flying-capacitor pair (Ak and Bk) on at once short
 * the capacitor between them: no state held during a stop may do that. */
static int check_hold_pairs(br_rd *r, xmlNode *n)
{
    const br_design *d = r->d;
    if (d->topology != BR_TOPO_FCML)
        return BR_OK;
    for (int j = 1; j < d->levels; j++) {
        char a[16], b[16];
        snprintf(a, sizeof a, "A%d", j);
        snprintf(b, sizeof b, "B%d", j);
        int sa = find_switch(d, a), sb = find_switch(d, b);
        if (sa >= 0 && sb >= 0 && (d->hold_on >> sa & 1) && (d->hold_on >> sb & 1))
            return br_rd_fail(r, n, "hold-on",
                              "holds both %s and %s on, which shorts the flying capacitor "
                              "between them; expected at most one switch of each pair",
                              a, b);
    }
    return BR_OK;
}

static int read_startup(br_rd *r, xmlNode *n)
{
    br_design *d = r->d;
    int k = 0;
    for (xmlNode *c = br_xml_child(n, "precharge"); c; c = br_xml_next(c, "precharge"), k++) {
        if (k == BR_MAX_PRECHARGE)
            return br_rd_fail(r, c, NULL, "more than %d precharge steps, expected at most %d",
                              BR_MAX_PRECHARGE, BR_MAX_PRECHARGE);
        br_precharge *p = &d->precharge[k];
        BR_TRY(read_mask(r, c, &p->mask));
        BR_TRY(br_rd_value(r, c, "duration", BR_KIND_TIME, &br_range_pos, &p->duration, NULL));
        p->line = br_rd_line(r, c);
    }
    d->nprecharge = k;
    return BR_OK;
}

static int read_analysis(br_rd *r, xmlNode *n)
{
    br_design *d = r->d;
    BR_TRY(br_rd_qty(r, n, "min-drive", BR_KIND_VOLTAGE, &br_range_nonneg, &d->min_drive, NULL));
    BR_TRY(br_rd_qty(r, n, "derating", BR_KIND_FRACTION, &r_derating, &d->derating, NULL));
    BR_TRY(br_rd_qty(r, n, "max-startup", BR_KIND_TIME, &br_range_pos, &d->startup_max, NULL));
    BR_TRY(br_rd_qty(r, n, "cap-derating", BR_KIND_FRACTION, &r_derating, &d->cap_derating, NULL));
    if (xmlHasProp(n, (const xmlChar *)"max-dropouts"))
        BR_TRY(br_rd_int(r, n, "max-dropouts", 0, BR_DROPOUTS_MAX, &d->max_dropouts));
    if (!xmlHasProp(n, (const xmlChar *)"hold-on"))
        return BR_OK;
    BR_TRY(read_mask_attr(r, n, "hold-on", &d->hold_on));
    return check_hold_pairs(r, n);
}

/* ---- checks across elements ------------------------------------------------------ */

/* The bottom switch of an FCML pair is on for (1-D)T minus a dead time at
 * each edge; at the worst corner that must stay positive. */
static int check_dead_time(br_rd *r, xmlNode *op)
{
    const br_design *d = r->d;
    if (d->topology != BR_TOPO_FCML || !op || d->ac.on)
        return BR_OK; /* a line cycle's duty span is checked with it */
    double tmin = 1.0 / d->fsw.max;
    double on = fmin(d->duty.min, 1.0 - d->duty.max) * tmin;
    if (2.0 * d->deadtime.max < on)
        return BR_OK;
    return br_rd_fail(r, op, "dead-time",
                      "two dead times (2 x %g s) use up the shortest on-time (%g s at duty "
                      "%g..%g and %g Hz), expected dead-time < %g s",
                      d->deadtime.max, on, d->duty.min, d->duty.max, d->fsw.max, on / 2.0);
}

/* A stage needs parts of every kind; the <stages> defaults name them. */
static int check_parts_present(br_rd *r, xmlNode *parts)
{
    static const struct {
        part_kind k;
        const char *element;
    } need[] = {
        {PK_DIODE, "diode"}, {PK_CAP, "capacitor"}, {PK_DRIVER, "driver"}, {PK_SWITCH, "switch"}};
    for (size_t i = 0; i < sizeof need / sizeof need[0]; i++)
        if (!part_id(r->d, need[i].k, 0))
            return br_rd_fail(r, parts, NULL, "no <%s> defined, expected at least one",
                              need[i].element);
    return BR_OK;
}

/* ---- the whole design --------------------------------------------------------- */

static int read_header(br_rd *r, xmlNode *root)
{
    char version[16];
    if (br_xml_attr(root, "version", version, sizeof version) <= 0 || strcmp(version, "1") != 0)
        return br_rd_fail(r, root, "version", "unsupported, expected version=\"1\"");
    if (br_xml_attr(root, "name", r->d->name, sizeof r->d->name) < 0)
        return br_rd_fail(r, root, "name", "longer than %zu characters, expected at most %zu",
                          sizeof r->d->name - 1, sizeof r->d->name - 1);
    return BR_OK;
}

int br_rd_design(br_rd *r, xmlNode *root)
{
    xmlNode *op = br_xml_child(root, "operating-point");
    xmlNode *parts = br_xml_child(root, "parts");
    xmlNode *n;
    BR_TRY(read_header(r, root));
    BR_TRY(read_operating_point(r, op));
    BR_TRY(read_supply(r, br_xml_child(root, "supply")));
    BR_TRY(read_topology(r, br_xml_child(root, "topology")));
    BR_TRY(check_dead_time(r, op));
    BR_TRY(br_rd_line_check(r, op));
    BR_TRY(br_rd_parts(r, parts));
    BR_TRY(check_parts_present(r, parts));
    BR_TRY(read_stages(r, br_xml_child(root, "stages")));
    if ((n = br_xml_child(root, "injections")) != NULL)
        BR_TRY(read_injections(r, n));
    if ((n = br_xml_child(root, "startup")) != NULL)
        BR_TRY(read_startup(r, n));
    if ((n = br_xml_child(root, "analysis")) != NULL)
        BR_TRY(read_analysis(r, n));
    return BR_OK;
}

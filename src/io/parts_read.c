/* parts_read.c - the <parts> library: diodes, capacitors, drivers,
 * switches, regulators and clamps, each defined once by id. */
#include "core/error.h"
#include "io/forward_fit.h"
#include "io/spice_model.h"
#include "io/xml_read.h"

#include <ctype.h>
#include <math.h>
#include <stddef.h>
#include <string.h>

static const br_range r_is = {0.0, 1.0, 1, 1, "a saturation current > 0 and < 1 A"};
static const br_range r_n = {0.5, 10.0, 0, 0, "an emission coefficient from 0.5 to 10"};
static const br_range r_m = {0.0, 1.0, 1, 1, "a grading coefficient strictly between 0 and 1"};
static const br_range r_eg = {0.1, 10.0, 0, 0, "a bandgap from 0.1 eV to 10 eV"};
static const br_range r_xti = {-50.0, 50.0, 0, 0, "a number from -50 to 50"};
static const br_range r_temp = {-100.0 + BR_ZERO_CELSIUS, 300.0 + BR_ZERO_CELSIUS, 0, 0,
                                "a temperature from -100 C to 300 C"};
static const br_range r_tfactor = {0.0, 2.0, 1, 0, "a factor in (0, 2]"};
static const br_range r_unit = {0.0, 1.0, 1, 0, "a factor in (0, 1]"};
static const br_range r_gate_off = {-50.0, 0.0, 0, 0, "a voltage from -50 V to 0 V"};
static const br_range r_rds_exp = {-5.0, 10.0, 0, 0, "an exponent from -5 to 10"};

/* ---- ids -------------------------------------------------------------------- */

/* Kind of part that already uses id, or NULL. */
static const char *id_owner(const br_design *d, const char *id)
{
    for (int k = 0; k < d->ndiodes; k++)
        if (strcmp(d->diodes[k].id, id) == 0)
            return "diode";
    for (int k = 0; k < d->ncaps; k++)
        if (strcmp(d->caps[k].id, id) == 0)
            return "capacitor";
    for (int k = 0; k < d->ndrivers; k++)
        if (strcmp(d->drivers[k].id, id) == 0)
            return "driver";
    for (int k = 0; k < d->nswitches; k++)
        if (strcmp(d->switches[k].id, id) == 0)
            return "switch";
    for (int k = 0; k < d->naux; k++)
        if (strcmp(d->aux[k].id, id) == 0)
            return d->aux[k].kind == BR_AUX_LDO ? "regulator" : "clamp";
    return NULL;
}

/* The part's id, and the source of its values when it states one (a
 * datasheet and its revision, a measurement: shown in a sign-off pack). */
static int read_id(br_rd *r, xmlNode *n, char id[BR_ID_MAX], char source[BR_SOURCE_MAX])
{
    source[0] = '\0';
    if (br_xml_attr(n, "source", source, BR_SOURCE_MAX) < 0)
        return br_rd_fail(r, n, "source", "too long, expected at most %d characters",
                          BR_SOURCE_MAX - 1);
    int has = br_xml_attr(n, "id", id, BR_ID_MAX);
    if (has <= 0 || id[0] == '\0')
        return br_rd_fail(r, n, "id", "%s, expected a name of 1 to %d characters",
                          has < 0 ? "too long" : "missing or empty", BR_ID_MAX - 1);
    for (const char *p = id; *p; p++)
        if (isspace((unsigned char)*p))
            return br_rd_fail(r, n, "id", "'%s' contains a space, expected one word", id);
    if (strcmp(id, "none") == 0) /* rail-extra="none" means no extra part */
        return br_rd_fail(r, n, "id", "'none' is reserved, expected another id");
    const char *owner = id_owner(r->d, id);
    if (owner)
        return br_rd_fail(r, n, "id", "'%s' is already the id of a %s, expected a new id", id,
                          owner);
    return BR_OK;
}

static int room(br_rd *r, xmlNode *n, int count, const char *what)
{
    if (count >= BR_MAX_PARTS)
        return br_rd_fail(r, n, NULL, "more than %d %s parts, expected at most %d", BR_MAX_PARTS,
                          what, BR_MAX_PARTS);
    return BR_OK;
}

/* ---- heat ------------------------------------------------------------------- */

/* Thermal resistance to ambient and the maximum junction temperature of
 * a diode, regulator or clamp. */
static int read_heat(br_rd *r, xmlNode *n, br_qty *rth, br_qty *tj_max)
{
    BR_TRY(br_rd_qty(r, n, "rth", BR_KIND_THERMAL_R, &br_range_nonneg, rth, NULL));
    return br_rd_qty(r, n, "tj-max", BR_KIND_TEMPERATURE, &r_temp, tj_max, NULL);
}

/* ---- diodes ------------------------------------------------------------------ */

/* tau directly, or from recovery figures: tau = qrr / if (charge control,
 * Lauritzen & Ma, IEEE Trans. Power Electronics 6(2), 1991). */
static int read_recovery(br_rd *r, xmlNode *n, br_diode_part *p)
{
    int has_tau, has_qrr, has_if;
    br_qty qrr = br_qty_fixed(0.0);
    double ifwd = 0.0;
    BR_TRY(br_rd_qty(r, n, "tau", BR_KIND_TIME, &br_range_nonneg, &p->tau, &has_tau));
    BR_TRY(br_rd_qty(r, n, "qrr", BR_KIND_CHARGE, &br_range_nonneg, &qrr, &has_qrr));
    BR_TRY(br_rd_value(r, n, "if", BR_KIND_CURRENT, &br_range_pos, &ifwd, &has_if));
    if (has_tau && has_qrr)
        return br_rd_fail(r, n, "qrr", "tau is given too, expected either tau or qrr with if");
    if (has_qrr != has_if)
        return br_rd_fail(r, n, has_qrr ? "if" : "qrr",
                          "qrr and if go together, expected both: the recovery charge qrr "
                          "and the forward current if it was measured after");
    if (has_qrr) {
        p->tau = qrr;
        p->tau.nom /= ifwd;
        p->tau.min /= ifwd;
        p->tau.max /= ifwd;
    }
    return BR_OK;
}

static int read_point(br_rd *r, xmlNode *f, double *i, double *v, int k)
{
    BR_TRY(br_rd_value(r, f, "i", BR_KIND_CURRENT, &br_range_pos, i, NULL));
    BR_TRY(br_rd_value(r, f, "v", BR_KIND_VOLTAGE, &br_range_pos, v, NULL));
    if (k > 0 && !(i[0] > i[-1]))
        return br_rd_fail(r, f, "i", "%g A after %g A, expected currents that ascend", i[0], i[-1]);
    if (k > 0 && !(v[0] > v[-1]))
        return br_rd_fail(r, f, "v",
                          "%g V after %g V, expected voltages that rise with the "
                          "current",
                          v[0], v[-1]);
    return BR_OK;
}

static int read_forward(br_rd *r, xmlNode *n, br_diode_part *p)
{
    static const char *const law[] = {"is", "n", "rs", NULL};
    double i[BR_FIT_MAX], v[BR_FIT_MAX], is, nn, rs;
    char why[160];
    int k = 0, npts = br_xml_count(n, "forward");
    for (int j = 0; law[j]; j++)
        if (xmlHasProp(n, BAD_CAST law[j]))
            return br_rd_fail(r, n, law[j],
                              "<forward> points are given too, expected either "
                              "is, n, rs or forward points");
    if (npts < 3 || npts > BR_FIT_MAX)
        return br_rd_fail(r, n, "forward", "%d points, expected 3 to %d to fit is, n and rs", npts,
                          BR_FIT_MAX);
    for (xmlNode *f = br_xml_child(n, "forward"); f; f = br_xml_next(f, "forward"), k++)
        BR_TRY(read_point(r, f, i + k, v + k, k));
    if (br_forward_fit(i, v, npts, br_thermal_voltage(p->tnom), &is, &nn, &rs, why, sizeof why))
        return br_rd_fail(r, n, "forward", "cannot fit a diode law: %s", why);
    if (!(nn >= r_n.lo && nn <= r_n.hi))
        return br_rd_fail(r, n, "forward", "the points fit n = %.3g, expected %s", nn, r_n.expect);
    int line = br_rd_line(r, br_xml_child(n, "forward"));
    p->is = br_qty_fixed(is);
    p->n = br_qty_fixed(nn);
    p->rs = br_qty_fixed(rs);
    p->is.line = p->n.line = p->rs.line = line;
    return BR_OK;
}

/* ---- a SPICE .model line ------------------------------------------------------ */

/* The attributes a <spice-model> line replaces: it is the diode's law. */
static const char *const spice_law[] = {"is",  "n",   "rs", "cj0", "vj",  "m",
                                        "tau", "qrr", "if", "eg",  "xti", NULL};

typedef struct spice_map {
    int param;             /* br_sp_param */
    size_t off;            /* offset of its br_qty in br_diode_part, or (size_t)-1 */
    const br_range *range; /* the values our model takes */
} spice_map;

static const br_range r_sp_fc = {0.0, 1.0, 0, 1, "a coefficient from 0 to below 1"};
static const br_range r_sp_tnom = {-100.0, 300.0, 0, 0, "a temperature from -100 to 300 (C)"};
#define SP_QTY(f) offsetof(br_diode_part, f)
#define SP_NONE ((size_t)-1)
static const spice_map spice_maps[] = {
    {BR_SP_IS, SP_QTY(is), &r_is},
    {BR_SP_N, SP_QTY(n), &r_n},
    {BR_SP_RS, SP_QTY(rs), &br_range_nonneg},
    {BR_SP_CJO, SP_QTY(cj0), &br_range_nonneg},
    {BR_SP_VJ, SP_QTY(vj), &br_range_pos},
    {BR_SP_M, SP_QTY(m), &r_m},
    {BR_SP_TT, SP_QTY(tau), &br_range_nonneg},
    {BR_SP_EG, SP_QTY(eg), &r_eg},
    {BR_SP_XTI, SP_QTY(xti), &r_xti},
    {BR_SP_BV, SP_NONE, &br_range_pos},
    {BR_SP_IBV, SP_NONE, &br_range_pos},
    {BR_SP_FC, SP_NONE, &r_sp_fc},
    {BR_SP_KF, SP_NONE, &br_range_nonneg},
    {BR_SP_AF, SP_NONE, &br_range_pos},
    {BR_SP_TNOM, SP_NONE, &r_sp_tnom},
};

static int sp_in_range(double v, const br_range *g)
{
    if (g->lo_open ? !(v > g->lo) : !(v >= g->lo))
        return 0;
    return g->hi_open ? v < g->hi : v <= g->hi;
}

/* Check each parameter the line gives and put it where our model keeps
 * it; those it leaves out take SPICE's defaults (ours, but VJ = 1 V). */
static int map_spice(br_rd *r, const char *where, const br_spice_model *m, br_diode_part *p)
{
    p->vj = br_qty_fixed(1.0);
    for (size_t i = 0; i < sizeof spice_maps / sizeof spice_maps[0]; i++) {
        const spice_map *s = &spice_maps[i];
        if (!m->given[s->param])
            continue;
        double v = m->v[s->param];
        if (!sp_in_range(v, s->range)) {
            char field[192];
            snprintf(field, sizeof field, "%s: %s", where, br_sp_param_name(s->param));
            return br_error_set(r->err, BR_EINPUT, r->file, m->line[s->param], field,
                                "got %g, expected %s", v, s->range->expect);
        }
        if (s->off != SP_NONE) {
            br_qty *q = (br_qty *)((char *)p + s->off);
            *q = br_qty_fixed(v);
            q->line = m->line[s->param];
        }
    }
    if (m->given[BR_SP_TNOM])
        p->tnom = m->v[BR_SP_TNOM] + BR_ZERO_CELSIUS;
    p->bv = m->given[BR_SP_BV] ? m->v[BR_SP_BV] : 0.0;
    p->ibv = m->given[BR_SP_IBV] ? m->v[BR_SP_IBV] : 0.0;
    return BR_OK;
}

static int read_spice(br_rd *r, xmlNode *n, xmlNode *sm, br_diode_part *p)
{
    char where[160];
    br_spice_model m;
    for (int j = 0; spice_law[j]; j++)
        if (xmlHasProp(n, BAD_CAST spice_law[j]))
            return br_rd_fail(r, n, spice_law[j],
                              "a <spice-model> line is given too, expected either the "
                              "attribute or the line's parameter");
    if (br_xml_child(n, "forward"))
        return br_rd_fail(r, n, "forward",
                          "a <spice-model> line is given too, expected either forward points "
                          "or the line");
    if (br_xml_count(n, "spice-model") > 1)
        return br_rd_fail(r, br_xml_next(sm, "spice-model"), NULL,
                          "a second <spice-model>, expected one");
    br_xml_where(n, where, sizeof where - 16);
    snprintf(where + strlen(where), 16, ": spice-model");
    xmlChar *text = xmlNodeGetContent(sm);
    if (!text)
        return br_error_set(r->err, BR_ENOMEM, r->file, br_rd_line(r, sm), where,
                            "out of memory reading the line");
    int rc =
        br_spice_model_parse((const char *)text, r->file, br_rd_line(r, sm), where, &m, r->err);
    xmlFree(text);
    BR_TRY(rc);
    if (m.given[BR_SP_TNOM] && xmlHasProp(n, BAD_CAST "ref-temp"))
        return br_rd_fail(r, n, "ref-temp",
                          "the <spice-model> line gives TNOM too, expected one of them");
    return map_spice(r, where, &m, p);
}

static int read_diode_law(br_rd *r, xmlNode *n, br_diode_part *p)
{
    BR_TRY(br_rd_value(r, n, "ref-temp", BR_KIND_TEMPERATURE, &r_temp, &p->tnom, NULL));
    xmlNode *sm = br_xml_child(n, "spice-model");
    if (sm)
        return read_spice(r, n, sm, p);
    if (br_xml_child(n, "forward"))
        return read_forward(r, n, p);
    BR_TRY(br_rd_qty(r, n, "is", BR_KIND_CURRENT, &r_is, &p->is, NULL));
    BR_TRY(br_rd_qty(r, n, "n", BR_KIND_NUMBER, &r_n, &p->n, NULL));
    return br_rd_qty(r, n, "rs", BR_KIND_RESISTANCE, &br_range_nonneg, &p->rs, NULL);
}

static int read_diode(br_rd *r, xmlNode *n)
{
    br_design *d = r->d;
    BR_TRY(room(r, n, d->ndiodes, "diode"));
    br_diode_part *p = &d->diodes[d->ndiodes];
    memset(p, 0, sizeof *p);
    br_diode_part_defaults(p);
    BR_TRY(read_id(r, n, p->id, p->source));
    p->line = br_rd_line(r, n);
    BR_TRY(read_diode_law(r, n, p));
    BR_TRY(br_rd_qty(r, n, "cj0", BR_KIND_CAPACITANCE, &br_range_nonneg, &p->cj0, NULL));
    BR_TRY(br_rd_qty(r, n, "vj", BR_KIND_VOLTAGE, &br_range_pos, &p->vj, NULL));
    BR_TRY(br_rd_qty(r, n, "m", BR_KIND_NUMBER, &r_m, &p->m, NULL));
    BR_TRY(read_recovery(r, n, p));
    BR_TRY(br_rd_qty(r, n, "eg", BR_KIND_ENERGY_EV, &r_eg, &p->eg, NULL));
    BR_TRY(br_rd_qty(r, n, "xti", BR_KIND_NUMBER, &r_xti, &p->xti, NULL));
    BR_TRY(br_rd_qty(r, n, "ir", BR_KIND_CURRENT, &br_range_nonneg, &p->ir, NULL));
    BR_TRY(br_rd_qty(r, n, "ir-temp", BR_KIND_TEMPERATURE, &r_temp, &p->ir_temp, NULL));
    BR_TRY(br_rd_qty(r, n, "ir-doubling", BR_KIND_TEMP_DELTA, &br_range_pos, &p->ir_double, NULL));
    BR_TRY(br_rd_qty(r, n, "vrrm", BR_KIND_VOLTAGE, &br_range_nonneg, &p->vrrm, NULL));
    BR_TRY(br_rd_qty(r, n, "ifsm", BR_KIND_CURRENT, &br_range_nonneg, &p->ifsm, NULL));
    BR_TRY(br_rd_qty(r, n, "ifrm", BR_KIND_CURRENT, &br_range_nonneg, &p->ifrm, NULL));
    BR_TRY(br_rd_qty(r, n, "i2t", BR_KIND_I2T, &br_range_nonneg, &p->i2t, NULL));
    BR_TRY(read_heat(r, n, &p->rth, &p->tj_max));
    BR_TRY(br_rd_qty(r, n, "if-avg", BR_KIND_CURRENT, &br_range_nonneg, &p->if_avg, NULL));
    d->ndiodes++;
    return BR_OK;
}

/* ---- capacitors ------------------------------------------------------------- */

static int read_bias(br_rd *r, xmlNode *n, br_cap_part *p)
{
    int k = 0;
    if (br_xml_count(n, "bias") > BR_MAX_BIAS_POINTS)
        return br_rd_fail(r, n, "bias", "%d points, expected at most %d", br_xml_count(n, "bias"),
                          BR_MAX_BIAS_POINTS);
    for (xmlNode *b = br_xml_child(n, "bias"); b; b = br_xml_next(b, "bias"), k++) {
        BR_TRY(br_rd_value(r, b, "v", BR_KIND_VOLTAGE, &br_range_nonneg, &p->bias_v[k], NULL));
        BR_TRY(br_rd_value(r, b, "factor", BR_KIND_FRACTION, &r_unit, &p->bias_f[k], NULL));
        if (k > 0 && !(p->bias_v[k] > p->bias_v[k - 1]))
            return br_rd_fail(r, b, "v", "%g V after %g V, expected bias points ascending in v",
                              p->bias_v[k], p->bias_v[k - 1]);
    }
    p->nbias = k;
    return BR_OK;
}

/* C(T)/C(25 C) at temperatures ascending; the ambient picks the factor,
 * so that corners and samples move it with everything else that heats. */
static int read_temp_table(br_rd *r, xmlNode *n, br_cap_part *p, int has_tfactor)
{
    int k = 0, count = br_xml_count(n, "temp");
    if (count > BR_MAX_BIAS_POINTS)
        return br_rd_fail(r, n, "temp", "%d points, expected at most %d", count,
                          BR_MAX_BIAS_POINTS);
    if (count > 0 && has_tfactor)
        return br_rd_fail(r, n, "temp-factor",
                          "a <temp> table is given too, expected either temp-factor (one "
                          "factor) or the table (read at the ambient)");
    for (xmlNode *b = br_xml_child(n, "temp"); b; b = br_xml_next(b, "temp"), k++) {
        BR_TRY(br_rd_value(r, b, "t", BR_KIND_TEMPERATURE, &r_temp, &p->temp_t[k], NULL));
        BR_TRY(br_rd_value(r, b, "factor", BR_KIND_FRACTION, &r_tfactor, &p->temp_f[k], NULL));
        if (k > 0 && !(p->temp_t[k] > p->temp_t[k - 1]))
            return br_rd_fail(r, b, "t",
                              "%.2f C after %.2f C, expected temperature points ascending in t",
                              p->temp_t[k] - BR_ZERO_CELSIUS, p->temp_t[k - 1] - BR_ZERO_CELSIUS);
    }
    p->ntemp = k;
    return BR_OK;
}

static int read_dielectric(br_rd *r, xmlNode *n, br_cap_part *p)
{
    char v[16];
    int has = br_xml_attr(n, "dielectric", v, sizeof v);
    p->dielectric = has == 0                           ? BR_DIEL_UNSTATED
                    : has > 0 && !strcmp(v, "class-1") ? BR_DIEL_CLASS1
                    : has > 0 && !strcmp(v, "class-2") ? BR_DIEL_CLASS2
                    : has > 0 && !strcmp(v, "other")   ? BR_DIEL_OTHER
                                                       : -1;
    if (p->dielectric < 0)
        return br_rd_fail(r, n, "dielectric", "got '%s', expected class-1, class-2 or other",
                          has > 0 ? v : "(too long)");
    return BR_OK;
}

static int read_capacitor(br_rd *r, xmlNode *n)
{
    static const br_range r_c = {0.0, INFINITY, 1, 1, "a capacitance > 0"};
    br_design *d = r->d;
    BR_TRY(room(r, n, d->ncaps, "capacitor"));
    br_cap_part *p = &d->caps[d->ncaps];
    memset(p, 0, sizeof *p);
    br_cap_part_defaults(p);
    BR_TRY(read_id(r, n, p->id, p->source));
    p->line = br_rd_line(r, n);
    BR_TRY(br_rd_qty(r, n, "c", BR_KIND_CAPACITANCE, &r_c, &p->c, NULL));
    BR_TRY(br_rd_qty(r, n, "esr", BR_KIND_RESISTANCE, &br_range_nonneg, &p->esr, NULL));
    BR_TRY(br_rd_qty(r, n, "rating", BR_KIND_VOLTAGE, &br_range_pos, &p->vrated, NULL));
    int has_tf;
    BR_TRY(br_rd_qty(r, n, "temp-factor", BR_KIND_FRACTION, &r_tfactor, &p->tfactor, &has_tf));
    BR_TRY(br_rd_qty(r, n, "aging", BR_KIND_FRACTION, &r_unit, &p->aging, NULL));
    BR_TRY(br_rd_qty(r, n, "ripple", BR_KIND_CURRENT, &br_range_pos, &p->iripple, NULL));
    BR_TRY(read_dielectric(r, n, p));
    BR_TRY(read_bias(r, n, p));
    BR_TRY(read_temp_table(r, n, p, has_tf));
    d->ncaps++;
    return BR_OK;
}

/* ---- drivers and switches ------------------------------------------------- */

static int read_driver(br_rd *r, xmlNode *n)
{
    br_design *d = r->d;
    BR_TRY(room(r, n, d->ndrivers, "driver"));
    br_driver_part *p = &d->drivers[d->ndrivers];
    memset(p, 0, sizeof *p);
    br_driver_part_defaults(p);
    BR_TRY(read_id(r, n, p->id, p->source));
    p->line = br_rd_line(r, n);
    BR_TRY(br_rd_qty(r, n, "uvlo-rise", BR_KIND_VOLTAGE, &br_range_nonneg, &p->uvlo_rise, NULL));
    BR_TRY(br_rd_qty(r, n, "uvlo-fall", BR_KIND_VOLTAGE, &br_range_nonneg, &p->uvlo_fall, NULL));
    BR_TRY(br_rd_qty(r, n, "iq-run", BR_KIND_CURRENT, &br_range_nonneg, &p->iq_on, NULL));
    BR_TRY(br_rd_qty(r, n, "iq-uvlo", BR_KIND_CURRENT, &br_range_nonneg, &p->iq_off, NULL));
    BR_TRY(br_rd_qty(r, n, "iq-isolator", BR_KIND_CURRENT, &br_range_nonneg, &p->i_iso, NULL));
    BR_TRY(br_rd_qty(r, n, "gate-off", BR_KIND_VOLTAGE, &r_gate_off, &p->vgs_off, NULL));
    /* no thresholds at all means no UVLO; otherwise they need hysteresis */
    if ((p->uvlo_rise.nom > 0.0 || p->uvlo_fall.nom > 0.0) &&
        !(p->uvlo_fall.nom < p->uvlo_rise.nom))
        return br_rd_fail(r, n, "uvlo-fall",
                          "%g V is not below uvlo-rise %g V, expected falling < rising",
                          p->uvlo_fall.nom, p->uvlo_rise.nom);
    d->ndrivers++;
    return BR_OK;
}

/* Rds(on)(Tj) = rds-on (Tj / rds-on-temp)^a: the exponent a given, or
 * fixed by a second point, the value rds-on-hot at rds-on-hot-temp, whose
 * tolerance becomes the exponent's (rds-on's own tolerance scales the
 * whole law). */
static int read_rds_law(br_rd *r, xmlNode *n, br_switch_part *p)
{
    int has_exp, has_hot, has_ht;
    br_qty hot = br_qty_fixed(0.0);
    double th = 0.0;
    BR_TRY(br_rd_qty(r, n, "rds-on", BR_KIND_RESISTANCE, &br_range_nonneg, &p->rds_on, NULL));
    BR_TRY(br_rd_value(r, n, "rds-on-temp", BR_KIND_TEMPERATURE, &r_temp, &p->rds_temp.nom, NULL));
    p->rds_temp.min = p->rds_temp.max = p->rds_temp.nom; /* a condition, not a spread */
    BR_TRY(br_rd_qty(r, n, "rds-on-exp", BR_KIND_NUMBER, &r_rds_exp, &p->rds_exp, &has_exp));
    BR_TRY(br_rd_qty(r, n, "rds-on-hot", BR_KIND_RESISTANCE, &br_range_pos, &hot, &has_hot));
    BR_TRY(br_rd_value(r, n, "rds-on-hot-temp", BR_KIND_TEMPERATURE, &r_temp, &th, &has_ht));
    if (has_hot != has_ht)
        return br_rd_fail(r, n, has_hot ? "rds-on-hot-temp" : "rds-on-hot",
                          "rds-on-hot and rds-on-hot-temp go together, expected both: the "
                          "on-resistance at a hot junction and that temperature");
    if (!has_hot)
        return BR_OK;
    if (has_exp)
        return br_rd_fail(r, n, "rds-on-hot",
                          "rds-on-exp is given too, expected either rds-on-exp or rds-on-hot");
    if (!(p->rds_on.nom > 0) || fabs(th - p->rds_temp.nom) < 1.0)
        return br_rd_fail(r, n, "rds-on-hot",
                          "needs rds-on > 0 and rds-on-hot-temp at least 1 K away from "
                          "rds-on-temp (%.2f C), expected a second point of the law",
                          p->rds_temp.nom - 273.15);
    double lt = log(th / p->rds_temp.nom), a = log(hot.min / p->rds_on.nom) / lt,
           b = log(hot.max / p->rds_on.nom) / lt;
    p->rds_exp = hot;
    p->rds_exp.nom = log(hot.nom / p->rds_on.nom) / lt;
    p->rds_exp.min = fmin(a, b);
    p->rds_exp.max = fmax(a, b);
    if (!(p->rds_exp.min >= r_rds_exp.lo && p->rds_exp.max <= r_rds_exp.hi))
        return br_rd_fail(r, n, "rds-on-hot", "makes the exponent %.3g, expected %s",
                          p->rds_exp.nom, r_rds_exp.expect);
    return BR_OK;
}

/* The reverse drop: a body diode's vsd, or (reverse="channel", no body
 * diode) the channel's third-quadrant turn-on at vth plus the driver's
 * off-state gate voltage; either plus reverse-r times the current. */
static int read_reverse_law(br_rd *r, xmlNode *n, br_switch_part *p)
{
    char v[16];
    int has = br_xml_attr(n, "reverse", v, sizeof v), has_vsd, has_vth;
    if (has != 0 && (has < 0 || (strcmp(v, "diode") && strcmp(v, "channel"))))
        return br_rd_fail(r, n, "reverse", "got '%s', expected diode or channel",
                          has > 0 ? v : "(too long)");
    p->reverse = has > 0 && !strcmp(v, "channel") ? BR_REV_CHANNEL : BR_REV_DIODE;
    BR_TRY(br_rd_qty(r, n, "vsd", BR_KIND_VOLTAGE, &br_range_nonneg, &p->vsd, &has_vsd));
    BR_TRY(br_rd_qty(r, n, "vth", BR_KIND_VOLTAGE, &br_range_pos, &p->vth, &has_vth));
    BR_TRY(
        br_rd_qty(r, n, "reverse-r", BR_KIND_RESISTANCE, &br_range_nonneg, &p->rsd, &p->rsd_given));
    if (p->reverse == BR_REV_CHANNEL && has_vsd)
        return br_rd_fail(r, n, "vsd",
                          "reverse=\"channel\" has no body diode, its drop is vth plus the "
                          "driver's gate-off; expected vth instead of vsd");
    if (p->reverse == BR_REV_CHANNEL && !has_vth)
        return br_rd_fail(r, n, "vth",
                          "missing, expected the gate threshold voltage for "
                          "reverse=\"channel\" (the drop is vth + |gate-off| + I reverse-r)");
    if (p->reverse == BR_REV_DIODE && has_vth)
        return br_rd_fail(r, n, "vth",
                          "read only with reverse=\"channel\", expected vsd for a body diode");
    return BR_OK;
}

static int read_switch(br_rd *r, xmlNode *n)
{
    br_design *d = r->d;
    BR_TRY(room(r, n, d->nswitches, "switch"));
    br_switch_part *p = &d->switches[d->nswitches];
    memset(p, 0, sizeof *p);
    br_switch_part_defaults(p);
    BR_TRY(read_id(r, n, p->id, p->source));
    p->line = br_rd_line(r, n);
    BR_TRY(read_rds_law(r, n, p));
    BR_TRY(br_rd_qty(r, n, "qg", BR_KIND_CHARGE, &br_range_nonneg, &p->qg, NULL));
    BR_TRY(br_rd_qty(r, n, "qg-at", BR_KIND_VOLTAGE, &br_range_nonneg, &p->qg_v, NULL));
    BR_TRY(br_rd_qty(r, n, "gate-pulse", BR_KIND_TIME, &br_range_pos, &p->tg, NULL));
    BR_TRY(read_reverse_law(r, n, p));
    BR_TRY(br_rd_qty(r, n, "vgs-rec", BR_KIND_VOLTAGE, &br_range_nonneg, &p->vgs_rec, NULL));
    BR_TRY(br_rd_qty(r, n, "vgs-max", BR_KIND_VOLTAGE, &br_range_nonneg, &p->vgs_max, NULL));
    if (p->vgs_max.nom > 0.0 && p->vgs_rec.nom > p->vgs_max.nom)
        return br_rd_fail(r, n, "vgs-rec",
                          "%g V is above vgs-max %g V, expected vgs-rec <= "
                          "vgs-max",
                          p->vgs_rec.nom, p->vgs_max.nom);
    d->nswitches++;
    return BR_OK;
}

/* ---- regulators and clamps ------------------------------------------------ */

static int read_aux(br_rd *r, xmlNode *n, int kind)
{
    br_design *d = r->d;
    BR_TRY(room(r, n, d->naux, kind == BR_AUX_LDO ? "regulator" : "clamp"));
    br_aux_part *p = &d->aux[d->naux];
    memset(p, 0, sizeof *p);
    br_aux_part_defaults(p);
    BR_TRY(read_id(r, n, p->id, p->source));
    p->line = br_rd_line(r, n);
    p->kind = kind;
    if (kind == BR_AUX_LDO) {
        BR_TRY(br_rd_qty(r, n, "vout", BR_KIND_VOLTAGE, &br_range_pos, &p->vout, NULL));
        BR_TRY(br_rd_qty(r, n, "dropout", BR_KIND_VOLTAGE, &br_range_nonneg, &p->dropout, NULL));
        BR_TRY(br_rd_qty(r, n, "iq", BR_KIND_CURRENT, &br_range_nonneg, &p->iq, NULL));
    } else {
        BR_TRY(br_rd_qty(r, n, "vz", BR_KIND_VOLTAGE, &br_range_pos, &p->vout, NULL));
        BR_TRY(br_rd_qty(r, n, "rz", BR_KIND_RESISTANCE, &br_range_nonneg, &p->rz, NULL));
    }
    BR_TRY(br_rd_qty(r, n, "power-rating", BR_KIND_POWER, &br_range_pos, &p->pmax, NULL));
    BR_TRY(read_heat(r, n, &p->rth, &p->tj_max));
    d->naux++;
    return BR_OK;
}

static int read_regulator(br_rd *r, xmlNode *n)
{
    return read_aux(r, n, BR_AUX_LDO);
}
static int read_clamp(br_rd *r, xmlNode *n)
{
    return read_aux(r, n, BR_AUX_ZENER);
}

typedef struct part_reader {
    const char *element;
    int (*read)(br_rd *r, xmlNode *n);
} part_reader;

static const part_reader readers[] = {
    {"diode", read_diode},   {"capacitor", read_capacitor}, {"driver", read_driver},
    {"switch", read_switch}, {"regulator", read_regulator}, {"clamp", read_clamp},
};

static int read_part(br_rd *r, xmlNode *n)
{
    for (size_t k = 0; k < sizeof readers / sizeof readers[0]; k++)
        if (xmlStrcmp(n->name, BAD_CAST readers[k].element) == 0)
            return readers[k].read(r, n);
    return br_rd_fail(r, n, NULL, "unknown part <%s>", (const char *)n->name); /* schema: never */
}

int br_rd_parts(br_rd *r, xmlNode *parts)
{
    for (xmlNode *n = br_xml_child(parts, NULL); n; n = br_xml_next(n, NULL))
        BR_TRY(read_part(r, n));
    return BR_OK;
}

int br_rd_part(br_rd *r, xmlNode *n)
{
    return read_part(r, n);
}

const char *br_rd_part_owner(const br_design *d, const char *id)
{
    return id_owner(d, id);
}

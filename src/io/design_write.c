/* design_write.c - a br_design as a design file (design_write.h).
 *
 * The text is built by hand rather than through a DOM: the order of the
 * elements is fixed by the schema, every attribute is a quantity or a
 * word, and the only markup to escape is in ids and names. */
#include "io/design_write.h"

#include "core/error.h"
#include "model/fcml.h"

#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define WIDTH 96 /* wrap attributes before a line grows past this */

typedef struct wr {
    br_text *t;
    int fail;
    int col;    /* column of the line being written */
    int indent; /* where a wrapped attribute starts */
} wr;

static void put(wr *w, const char *fmt, ...) __attribute__((format(printf, 2, 3)));
static void put(wr *w, const char *fmt, ...)
{
    char buf[1200];
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(buf, sizeof buf, fmt, ap);
    va_end(ap);
    if (!w->fail && br_text_put(w->t, buf) != BR_OK)
        w->fail = 1;
    const char *nl = strrchr(buf, '\n');
    w->col = nl ? (int)strlen(nl + 1) : w->col + (int)strlen(buf);
}

/* s with the five markup characters escaped, into buf. */
static const char *escaped(const char *s, char *buf, size_t cap)
{
    size_t n = 0;
    for (; *s && n + 7 < cap; s++) {
        const char *e = *s == '&'    ? "&amp;"
                        : *s == '<'  ? "&lt;"
                        : *s == '>'  ? "&gt;"
                        : *s == '"'  ? "&quot;"
                        : *s == '\'' ? "&apos;"
                                     : NULL;
        if (e)
            n += (size_t)snprintf(buf + n, cap - n, "%s", e);
        else
            buf[n++] = *s;
    }
    buf[n] = '\0';
    return buf;
}

/* One attribute, on a new line when the present one is full. */
static void attr(wr *w, const char *name, const char *value)
{
    char esc[1100];
    escaped(value, esc, sizeof esc);
    int len = (int)(strlen(name) + strlen(esc)) + 4;
    if (w->col + len > WIDTH)
        put(w, "\n%*s", w->indent, "");
    put(w, " %s=\"%s\"", name, esc);
}

static void open_el(wr *w, int depth, const char *name)
{
    put(w, "%*s<%s", 2 * depth, "", name);
    w->indent = 2 * depth + (int)strlen(name) + 1;
}

/* ---- values --------------------------------------------------------------------- */

/* How a kind of value is written: its SI unit ("" for a bare number) and
 * the factor from SI to it (angles: radians to degrees). */
typedef struct unit {
    const char *sym;
    double factor;
} unit;

static const unit U_V = {"V", 1}, U_A = {"A", 1}, U_F = {"F", 1}, U_HZ = {"Hz", 1}, U_S = {"s", 1},
                  U_OHM = {"ohm", 1}, U_C = {"C", 1}, U_K = {"K", 1}, U_BARE = {"", 1},
                  U_EV = {"eV", 1}, U_A2S = {"A2s", 1}, U_W = {"W", 1}, U_KW = {"K/W", 1},
                  U_DEG = {"deg", 57.295779513082320876798154814105};

/* The shortest of 15 to 17 significant digits that reads back as the
 * same double. */
static void number(char *buf, size_t cap, double v, const unit *u)
{
    double x = v * u->factor;
    for (int digits = 15; digits <= 17; digits++) {
        snprintf(buf, cap, "%.*g", digits, x);
        if (strtod(buf, NULL) == x)
            return;
    }
}

static void value(wr *w, const char *name, double v, const unit *u)
{
    char num[40], text[64];
    number(num, sizeof num, v, u);
    snprintf(text, sizeof text, "%s%s%s", num, u->sym[0] ? " " : "", u->sym);
    attr(w, name, text);
}

/* A quantity: its nominal alone, or min / nominal / max and a normal
 * distribution's word. */
static void qty(wr *w, const char *name, const br_qty *q, const unit *u)
{
    if (q->min == q->nom && q->max == q->nom && q->dist == BR_DIST_UNIFORM) {
        value(w, name, q->nom, u);
        return;
    }
    char a[40], b[40], c[40], text[160];
    number(a, sizeof a, q->min, u);
    number(b, sizeof b, q->nom, u);
    number(c, sizeof c, q->max, u);
    snprintf(text, sizeof text, "%s/%s/%s%s%s%s", a, b, c, u->sym[0] ? " " : "", u->sym,
             q->dist == BR_DIST_NORMAL ? " normal" : "");
    attr(w, name, text);
}

/* A quantity whose 0 means "not given" and that the reader refuses at 0. */
static void qty_given(wr *w, const char *name, const br_qty *q, const unit *u)
{
    if (q->nom != 0.0 || q->min != 0.0 || q->max != 0.0)
        qty(w, name, q, u);
}

/* ---- names ------------------------------------------------------------------------ */

static void switch_name(const br_design *d, int s, char *buf, size_t cap)
{
    if (d->topology == BR_TOPO_STRING) {
        snprintf(buf, cap, "%s", d->sw[s].name);
        return;
    }
    br_fcml_sw fs;
    br_fcml_switch(d->levels - 1, s, 1.0, 0.5, 0.0, &fs);
    snprintf(buf, cap, "%s", fs.name);
}

static void mask_attr(wr *w, const br_design *d, const char *name, unsigned long long mask)
{
    char list[BR_MAX_SWITCHES * BR_ID_MAX], sn[BR_ID_MAX];
    size_t n = 0;
    list[0] = '\0';
    for (int s = 0; s < br_design_nswitch(d) && n < sizeof list; s++)
        if (mask >> s & 1) {
            switch_name(d, s, sn, sizeof sn);
            n += (size_t)snprintf(list + n, sizeof list - n, "%s%s", n ? " " : "", sn);
        }
    attr(w, name, list);
}

/* ---- the operating point and the supply ------------------------------------------- */

static void line_cycle(wr *w, const br_line_spec *ac)
{
    open_el(w, 2, "line-cycle");
    qty(w, "frequency", &ac->freq, &U_HZ);
    qty(w, "peak-current", &ac->ipk, &U_A);
    qty(w, "phase", &ac->phase, &U_DEG);
    if (ac->ntab == 0) {
        qty(w, "depth", &ac->depth, &U_BARE);
        put(w, "/>\n");
        return;
    }
    put(w, ">\n");
    for (int i = 0; i < ac->ntab; i++) {
        open_el(w, 3, "duty");
        value(w, "at", ac->tab_at[i], &U_DEG);
        value(w, "value", ac->tab_duty[i], &U_BARE);
        put(w, "/>\n");
    }
    put(w, "    </line-cycle>\n");
}

static const char *direction_word(int dir)
{
    return dir == BR_DIR_STEP_DOWN ? "step-down"
           : dir == BR_DIR_STEP_UP ? "step-up"
           : dir == BR_DIR_NONE    ? "none"
                                   : "both";
}

static void operating_point(wr *w, const br_design *d)
{
    open_el(w, 1, "operating-point");
    qty(w, "vin", &d->vin, &U_V);
    qty(w, "fsw", &d->fsw, &U_HZ);
    if (!d->ac.on) {
        qty(w, "duty", &d->duty, &U_BARE);
        attr(w, "current", direction_word(d->direction));
        qty(w, "load-current", &d->iload, &U_A);
    }
    qty(w, "dead-time", &d->deadtime, &U_S);
    qty(w, "ambient", &d->tamb, &U_K);
    qty(w, "imbalance", &d->imbalance, &U_BARE);
    qty(w, "edge-time", &d->tedge, &U_S);
    qty(w, "overshoot", &d->overshoot, &U_BARE);
    if (isfinite(d->load_from))
        value(w, "load-from", d->load_from, &U_S);
    if (d->tj_given)
        qty(w, "switch-tj", &d->tj, &U_K);
    if (!d->ac.on) {
        put(w, "/>\n");
        return;
    }
    put(w, ">\n");
    line_cycle(w, &d->ac);
    put(w, "  </operating-point>\n");
}

static const char *limit_word(int mode)
{
    return mode == BR_SUPPLY_FOLDBACK ? "foldback"
           : mode == BR_SUPPLY_HICCUP ? "hiccup"
                                      : "constant";
}

/* A current limit's attributes: the supply's or an injection's. */
static void limit(wr *w, int mode, const br_qty *ilimit, const br_qty *ifold, const br_qty *delay,
                  const br_qty *off, int retries)
{
    if (mode != BR_SUPPLY_UNLIMITED) {
        qty(w, "current-limit", ilimit, &U_A);
        attr(w, "limit-mode", limit_word(mode));
    }
    if (mode == BR_SUPPLY_FOLDBACK)
        qty(w, "foldback-current", ifold, &U_A);
    if (mode == BR_SUPPLY_HICCUP) {
        qty(w, "hiccup-delay", delay, &U_S);
        qty(w, "hiccup-off", off, &U_S);
        if (retries >= 0) {
            char n[24];
            snprintf(n, sizeof n, "%d", retries);
            attr(w, "hiccup-retries", n);
        }
    }
}

static void supply(wr *w, const br_design *d)
{
    open_el(w, 1, "supply");
    qty(w, "voltage", &d->vsupply, &U_V);
    qty(w, "resistance", &d->rsupply, &U_OHM);
    qty(w, "ramp", &d->tramp, &U_S);
    qty(w, "bypass", &d->csupply, &U_F);
    qty(w, "soft-start", &d->tsoft, &U_S);
    qty_given(w, "rating", &d->irating, &U_A);
    limit(w, d->limit_mode, &d->ilimit, &d->ifold, &d->hiccup_delay, &d->hiccup_off,
          d->hiccup_retries);
    put(w, "/>\n");
}

static void injections(wr *w, const br_design *d)
{
    if (d->ninject == 0)
        return;
    put(w, "  <injections>\n");
    for (int i = 0; i < d->ninject; i++) {
        const br_inject_spec *j = &d->inject[i];
        char rail[24];
        snprintf(rail, sizeof rail, "%d", j->rail);
        open_el(w, 2, "injection");
        attr(w, "rail", rail);
        qty(w, "voltage", &j->v, &U_V);
        qty(w, "resistance", &j->r, &U_OHM);
        attr(w, "diode", d->diodes[j->diode].id);
        value(w, "start", j->start, &U_S);
        limit(w, j->limit_mode, &j->ilimit, &j->ifold, &j->hiccup_delay, &j->hiccup_off,
              j->hiccup_retries);
        qty_given(w, "rating", &j->irating, &U_A);
        put(w, "/>\n");
    }
    put(w, "  </injections>\n");
}

/* ---- the topology ------------------------------------------------------------------- */

static const char *carry_word(int carry)
{
    return carry == BR_CARRY_FORWARD   ? "forward"
           : carry == BR_CARRY_REVERSE ? "reverse"
           : carry == BR_CARRY_NONE    ? "none"
                                       : NULL;
}

static void intervals(wr *w, const char *name, const double (*iv)[2], int n)
{
    for (int i = 0; i < n; i++) {
        open_el(w, 4, name);
        value(w, "from", iv[i][0], &U_BARE);
        value(w, "to", iv[i][1], &U_BARE);
        put(w, "/>\n");
    }
}

static void string_switch(wr *w, const br_switch_spec *s)
{
    open_el(w, 3, "switch");
    attr(w, "name", s->name);
    qty(w, "vblock", &s->vblock, &U_V);
    if (carry_word(s->carry))
        attr(w, "conducts", carry_word(s->carry));
    put(w, ">\n");
    intervals(w, "on", s->on, s->nwin);
    intervals(w, "reverse", s->rev, s->nrev);
    put(w, "      </switch>\n");
}

static void topology(wr *w, const br_design *d)
{
    put(w, "  <topology>\n");
    if (d->topology == BR_TOPO_FCML) {
        open_el(w, 2, "fcml");
        char n[16];
        snprintf(n, sizeof n, "%d", d->levels);
        attr(w, "levels", n);
        qty(w, "cfly", &d->cfly, &U_F);
        put(w, "/>\n");
    } else {
        put(w, "    <string>\n");
        for (int k = 0; k < d->nswitch; k++)
            string_switch(w, &d->sw[k]);
        put(w, "    </string>\n");
    }
    put(w, "  </topology>\n");
}

/* ---- the parts ------------------------------------------------------------------------- */

static void diode(wr *w, const br_diode_part *p)
{
    open_el(w, 2, "diode");
    attr(w, "id", p->id);
    value(w, "ref-temp", p->tnom, &U_K);
    qty(w, "is", &p->is, &U_A);
    qty(w, "n", &p->n, &U_BARE);
    qty(w, "rs", &p->rs, &U_OHM);
    qty(w, "cj0", &p->cj0, &U_F);
    qty(w, "vj", &p->vj, &U_V);
    qty(w, "m", &p->m, &U_BARE);
    qty(w, "tau", &p->tau, &U_S);
    qty(w, "eg", &p->eg, &U_EV);
    qty(w, "xti", &p->xti, &U_BARE);
    qty(w, "ir", &p->ir, &U_A);
    qty(w, "ir-temp", &p->ir_temp, &U_K);
    qty(w, "ir-doubling", &p->ir_double, &U_K);
    qty(w, "vrrm", &p->vrrm, &U_V);
    qty(w, "ifsm", &p->ifsm, &U_A);
    qty(w, "ifrm", &p->ifrm, &U_A);
    qty(w, "i2t", &p->i2t, &U_A2S);
    qty(w, "if-avg", &p->if_avg, &U_A);
    qty(w, "rth", &p->rth, &U_KW);
    qty_given(w, "tj-max", &p->tj_max, &U_K);
    put(w, "/>\n");
}

static const char *dielectric_word(int d)
{
    return d == BR_DIEL_CLASS1   ? "class-1"
           : d == BR_DIEL_CLASS2 ? "class-2"
           : d == BR_DIEL_OTHER  ? "other"
                                 : NULL;
}

static void table(wr *w, const char *el, const char *key, const unit *u, const double *x,
                  const double *f, int n)
{
    for (int i = 0; i < n; i++) {
        open_el(w, 3, el);
        value(w, key, x[i], u);
        value(w, "factor", f[i], &U_BARE);
        put(w, "/>\n");
    }
}

static void capacitor(wr *w, const br_cap_part *p)
{
    open_el(w, 2, "capacitor");
    attr(w, "id", p->id);
    qty(w, "c", &p->c, &U_F);
    qty(w, "esr", &p->esr, &U_OHM);
    qty_given(w, "rating", &p->vrated, &U_V);
    if (p->ntemp == 0)
        qty(w, "temp-factor", &p->tfactor, &U_BARE);
    qty(w, "aging", &p->aging, &U_BARE);
    qty_given(w, "ripple", &p->iripple, &U_A);
    if (dielectric_word(p->dielectric))
        attr(w, "dielectric", dielectric_word(p->dielectric));
    if (p->nbias == 0 && p->ntemp == 0) {
        put(w, "/>\n");
        return;
    }
    put(w, ">\n");
    table(w, "bias", "v", &U_V, p->bias_v, p->bias_f, p->nbias);
    table(w, "temp", "t", &U_K, p->temp_t, p->temp_f, p->ntemp);
    put(w, "    </capacitor>\n");
}

static void driver(wr *w, const br_driver_part *p)
{
    open_el(w, 2, "driver");
    attr(w, "id", p->id);
    qty(w, "uvlo-rise", &p->uvlo_rise, &U_V);
    qty(w, "uvlo-fall", &p->uvlo_fall, &U_V);
    qty(w, "iq-run", &p->iq_on, &U_A);
    qty(w, "iq-uvlo", &p->iq_off, &U_A);
    qty(w, "iq-isolator", &p->i_iso, &U_A);
    qty(w, "gate-off", &p->vgs_off, &U_V);
    put(w, "/>\n");
}

static void switch_part(wr *w, const br_switch_part *p)
{
    open_el(w, 2, "switch");
    attr(w, "id", p->id);
    qty(w, "rds-on", &p->rds_on, &U_OHM);
    value(w, "rds-on-temp", p->rds_temp.nom, &U_K);
    qty(w, "rds-on-exp", &p->rds_exp, &U_BARE);
    qty(w, "qg", &p->qg, &U_C);
    qty(w, "qg-at", &p->qg_v, &U_V);
    qty(w, "gate-pulse", &p->tg, &U_S);
    attr(w, "reverse", p->reverse == BR_REV_CHANNEL ? "channel" : "diode");
    if (p->reverse == BR_REV_CHANNEL)
        qty(w, "vth", &p->vth, &U_V);
    else
        qty(w, "vsd", &p->vsd, &U_V);
    if (p->rsd_given)
        qty(w, "reverse-r", &p->rsd, &U_OHM);
    qty(w, "vgs-rec", &p->vgs_rec, &U_V);
    qty(w, "vgs-max", &p->vgs_max, &U_V);
    put(w, "/>\n");
}

static void aux(wr *w, const br_aux_part *p)
{
    int ldo = p->kind == BR_AUX_LDO;
    open_el(w, 2, ldo ? "regulator" : "clamp");
    attr(w, "id", p->id);
    if (ldo) {
        qty(w, "vout", &p->vout, &U_V);
        qty(w, "dropout", &p->dropout, &U_V);
        qty(w, "iq", &p->iq, &U_A);
    } else {
        qty(w, "vz", &p->vout, &U_V);
        qty(w, "rz", &p->rz, &U_OHM);
    }
    qty_given(w, "power-rating", &p->pmax, &U_W);
    qty(w, "rth", &p->rth, &U_KW);
    qty_given(w, "tj-max", &p->tj_max, &U_K);
    put(w, "/>\n");
}

static void parts(wr *w, const br_design *d)
{
    put(w, "  <parts>\n");
    for (int i = 0; i < d->ndiodes; i++)
        diode(w, &d->diodes[i]);
    for (int i = 0; i < d->ncaps; i++)
        capacitor(w, &d->caps[i]);
    for (int i = 0; i < d->ndrivers; i++)
        driver(w, &d->drivers[i]);
    for (int i = 0; i < d->nswitches; i++)
        switch_part(w, &d->switches[i]);
    for (int i = 0; i < d->naux; i++)
        aux(w, &d->aux[i]);
    put(w, "  </parts>\n");
}

/* ---- stages, start-up, analysis ----------------------------------------------------------- */

/* The parts of a stage; an override gives every one, so that it does
 * not depend on the defaults. */
static void stage_attrs(wr *w, const br_design *d, const br_stage_spec *s, int override)
{
    attr(w, "diode", d->diodes[s->diode].id);
    attr(w, "capacitor", d->caps[s->cap].id);
    attr(w, "driver", d->drivers[s->driver].id);
    attr(w, "switch", d->switches[s->sw].id);
    if (s->aux >= 0 || override)
        attr(w, "rail-extra", s->aux >= 0 ? d->aux[s->aux].id : "none");
    qty(w, "link-resistor", &s->r_link, &U_OHM);
    if (s->rth_given)
        qty(w, "diode-rth", &s->rth, &U_KW);
}

static void stages(wr *w, const br_design *d)
{
    open_el(w, 1, "stages");
    stage_attrs(w, d, &d->def, 0);
    int any = 0;
    for (int k = 0; k < br_design_nswitch(d); k++)
        any |= d->has_override[k];
    if (!any) {
        put(w, "/>\n");
        return;
    }
    put(w, ">\n");
    for (int k = 0; k < br_design_nswitch(d); k++) {
        if (!d->has_override[k])
            continue;
        open_el(w, 2, "stage");
        char n[16];
        snprintf(n, sizeof n, "%d", k);
        attr(w, "index", n);
        stage_attrs(w, d, &d->stage[k], 1);
        put(w, "/>\n");
    }
    put(w, "  </stages>\n");
}

static void startup(wr *w, const br_design *d)
{
    if (d->nprecharge == 0)
        return;
    put(w, "  <startup>\n");
    for (int i = 0; i < d->nprecharge; i++) {
        open_el(w, 2, "precharge");
        mask_attr(w, d, "switches", d->precharge[i].mask);
        value(w, "duration", d->precharge[i].duration, &U_S);
        put(w, "/>\n");
    }
    put(w, "  </startup>\n");
}

static void analysis(wr *w, const br_design *d)
{
    open_el(w, 1, "analysis");
    qty(w, "min-drive", &d->min_drive, &U_V);
    qty(w, "derating", &d->derating, &U_BARE);
    qty(w, "max-startup", &d->startup_max, &U_S);
    qty(w, "cap-derating", &d->cap_derating, &U_BARE);
    if (d->max_dropouts >= 0) {
        char n[24];
        snprintf(n, sizeof n, "%d", d->max_dropouts);
        attr(w, "max-dropouts", n);
    }
    if (d->hold_on)
        mask_attr(w, d, "hold-on", d->hold_on);
    put(w, "/>\n");
}

/* The comment, line by line, with no "--" inside. */
static void comment(wr *w, const char *text)
{
    put(w, "<!--\n");
    while (*text) {
        char line[400];
        size_t n = 0;
        for (; *text && *text != '\n' && n + 3 < sizeof line; text++) {
            line[n++] = *text;
            if (*text == '-' && text[1] == '-')
                line[n++] = ' ';
        }
        line[n] = '\0';
        text += *text == '\n';
        put(w, "  %s\n", line);
    }
    put(w, "-->\n");
}

int br_design_write(const br_design *d, const char *text, br_text *out, br_error *err)
{
    wr w = {out, 0, 0, 0};
    char name[300];
    put(&w, "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n");
    if (text && *text)
        comment(&w, text);
    put(&w, "<bootrung-design version=\"1\"");
    if (d->name[0])
        put(&w, " name=\"%s\"", escaped(d->name, name, sizeof name));
    put(&w, ">\n");
    operating_point(&w, d);
    supply(&w, d);
    injections(&w, d);
    topology(&w, d);
    parts(&w, d);
    stages(&w, d);
    startup(&w, d);
    analysis(&w, d);
    put(&w, "</bootrung-design>\n");
    if (w.fail)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory writing a design");
    return BR_OK;
}

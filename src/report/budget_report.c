/* budget_report.c - rendering the energy budget and the junction
 * temperatures of a steady state. */
#include "report/budget_report.h"

#include "report/fmt.h"
#include "report/report_common.h"
#include "report/table.h"

#include <math.h>
#include <stdio.h>

#define KELVIN 273.15

enum { R_STAGE, R_SWITCH, R_RUN, R_ISO, R_STANDBY, R_GATE, R_AUX, R_ESR, R_TOTAL, R_TJ, R_NCOL };
enum { L_LINK, L_SWITCH, L_COND, L_RR, L_LEAK, L_JCT, L_RES, L_SW, L_TOTAL, L_TJ, L_ONSET, L_NCOL };

void br_budget_kinds_of(const br_chain *c, const br_budget *b, br_budget_kinds *o)
{
    *o = (br_budget_kinds){0};
    for (int k = 0; k < c->n; k++) {
        const br_rail_loss *r = &b->rail[k];
        o->driver += r->run + r->standby;
        o->iso += r->iso;
        o->gate += r->gate;
        o->aux += r->regulator + r->clamp;
        o->esr += r->esr;
        if (k == 0)
            continue;
        const br_link_loss *l = &b->link[k];
        o->diode += l->cond + l->recovery + l->leakage + l->junction;
        o->resistor += l->resistor;
        o->sw += l->sw;
    }
}

static double largest_loss(const br_chain *c, const br_budget *b)
{
    double m = 0.0;
    for (int k = 0; k < c->n; k++) {
        m = fmax(m, br_rail_loss_sum(&b->rail[k]));
        if (k > 0)
            m = fmax(m, br_link_loss_sum(&b->link[k]));
    }
    return m;
}

static void head(br_table *t, int col, const char *what)
{
    br_table_head(t, col, what, BR_RIGHT);
}

static void cell(br_table *t, int col, double v, const br_scale *sc)
{
    char b[BR_TABLE_CELL];
    br_table_set(t, col, "%s", br_fmt_in(b, sizeof b, v, sc, 3));
}

static br_table *named_table(int ncol, int nrow, const char *first)
{
    br_table *t = br_table_create(ncol, nrow);
    if (t) {
        br_table_head(t, 0, first, BR_RIGHT);
        br_table_head(t, 1, "switch", BR_LEFT);
    }
    return t;
}

static int render(br_table *t, br_text *out)
{
    if (!t)
        return BR_ENOMEM;
    int rc = br_table_render(t, 2, out);
    br_table_free(t);
    return rc;
}

static int rails_table(const br_chain *c, const br_steady_figs *f, const br_scale *sc, br_text *out)
{
    br_table *t = named_table(R_NCOL, c->n, "stage");
    if (!t)
        return BR_ENOMEM;
    static const char *const heads[] = {"driver",          "isolator", "standby", "gate",
                                        "regulator/clamp", "ESR",      "total",   "its Tj degC"};
    for (int col = R_RUN; col < R_NCOL; col++)
        head(t, col, heads[col - R_RUN]);
    for (int k = 0; k < c->n; k++) {
        const br_rail_loss *r = &f->budget.rail[k];
        br_table_row(t);
        br_table_set(t, R_STAGE, "%d", k);
        br_table_set(t, R_SWITCH, "%s", c->st[k].name);
        double v[] = {r->run, r->iso, r->standby, r->gate, r->regulator + r->clamp, r->esr};
        for (int col = R_RUN; col < R_TOTAL; col++)
            cell(t, col, v[col - R_RUN], sc);
        cell(t, R_TOTAL, br_rail_loss_sum(r), sc);
        if (isfinite(f->rail[k].tj_aux))
            br_table_set(t, R_TJ, "%.1f", f->rail[k].tj_aux - KELVIN);
        else
            br_table_set(t, R_TJ, "-");
    }
    return render(t, out);
}

/* A link's junction temperature in degrees Celsius, "RUNAWAY", or "-"
 * when no thermal resistance heats it above the ambient; and the ambient
 * from which it would run away. */
static void tj_cell(br_table *t, const br_chain *c, const br_link_fig *l, int k)
{
    int heats = c->st[k].diode.rth > 0;
    if (!heats)
        br_table_set(t, L_TJ, "-");
    else if (l->runaway)
        br_table_set(t, L_TJ, "RUNAWAY");
    else
        br_table_set(t, L_TJ, "%.1f", l->tj - KELVIN);
    if (heats && isfinite(l->onset_amb))
        br_table_set(t, L_ONSET, "%.1f", l->onset_amb - KELVIN);
    else
        br_table_set(t, L_ONSET, "-");
}

static int links_table(const br_chain *c, const br_steady_figs *f, const br_scale *sc, br_text *out)
{
    br_table *t = named_table(L_NCOL, c->n, "link");
    if (!t)
        return BR_ENOMEM;
    static const char *const heads[] = {"conduction", "recovery", "leakage",
                                        "junction",   "resistor", "switch",
                                        "total",      "Tj degC",  "runaway degC"};
    for (int col = L_COND; col < L_NCOL; col++)
        head(t, col, heads[col - L_COND]);
    for (int k = 1; k < c->n; k++) {
        const br_link_loss *l = &f->budget.link[k];
        br_table_row(t);
        br_table_set(t, L_LINK, "%d", k);
        br_table_set(t, L_SWITCH, "%s", c->st[k].name);
        double v[] = {l->cond, l->recovery, l->leakage, l->junction, l->resistor, l->sw};
        for (int col = L_COND; col < L_TOTAL; col++)
            cell(t, col, v[col - L_COND], sc);
        cell(t, L_TOTAL, br_link_loss_sum(l), sc);
        tj_cell(t, c, &f->link[k], k);
    }
    return render(t, out);
}

static int balance_line(const br_chain *c, const br_budget *b, br_text *out)
{
    char s[32], p[32], r[32], l[32], st[32], e[32], j[32], inj[96] = "", text[480];
    if (br_chain_injected(c))
        snprintf(inj, sizeof inj, ", the isolated supplies feeding rails directly give %s",
                 br_fmt_si(j, sizeof j, b->inject, 4, "W"));
    snprintf(text, sizeof text,
             "the supply delivers %s%s and the power stage gives %s (through the return switches: "
             "reverse conduction and on-state drops, leakage, recovery); the supply's resistance "
             "takes %s; lost in all %s, stored %s over the period (balance %s)",
             br_fmt_si(s, sizeof s, b->supply, 4, "W"), inj,
             br_fmt_si(p, sizeof p, b->stage, 4, "W"), br_fmt_si(r, sizeof r, b->rsupply, 3, "W"),
             br_fmt_si(l, sizeof l, b->losses, 4, "W"), br_fmt_si(st, sizeof st, b->stored, 3, "W"),
             br_fmt_si(e, sizeof e, b->balance, 3, "W"));
    return br_report_wrap(out, "  power: ", text, 4);
}

/* A link that runs away, said in words. */
static int heat_lines(const br_chain *c, const br_steady_figs *f, br_text *out)
{
    int rc = BR_OK;
    for (int k = 1; k < c->n; k++) {
        const br_link_fig *l = &f->link[k];
        if (!(c->st[k].diode.rth > 0) || !l->runaway)
            continue;
        rc |=
            br_text_printf(out,
                           "  link %d (%s) RUNS AWAY at %.1f degC ambient: no junction temperature "
                           "balances its losses (from %.1f degC up)\n",
                           k, c->st[k].name, c->tamb - KELVIN, l->onset_amb - KELVIN);
    }
    return rc;
}

int br_budget_text(const br_chain *c, const br_steady_figs *f, br_text *out)
{
    const br_budget *b = &f->budget;
    br_scale sc = br_scale_column(largest_loss(c, b), 1e-3, "W");
    char lead[64];
    snprintf(lead, sizeof lead, "losses of the rails, %s ", sc.unit);
    int rc = br_report_wrap(out, lead,
                            "(driver: running and standby current; isolator; gate charge; "
                            "regulator or clamp, and its junction temperature; capacitor ESR)",
                            2);
    rc |= rails_table(c, f, &sc, out);
    snprintf(lead, sizeof lead, "losses of the links, %s ", sc.unit);
    rc |= br_report_wrap(out, lead,
                         "(diode: conduction, recovery, leakage, junction capacitance; resistor; "
                         "return switch), the diode's junction temperature and the ambient from "
                         "which it would run away thermally",
                         2);
    rc |= links_table(c, f, &sc, out);
    rc |= balance_line(c, b, out);
    rc |= heat_lines(c, f, out);
    return rc ? BR_ENOMEM : BR_OK;
}

/* The link diode with a thermal resistance that runs away, else the
 * hottest such one; 0 when none has one. */
static int hottest(const br_chain *c, const br_steady_figs *f)
{
    int best = 0;
    for (int k = 1; k < c->n; k++) {
        if (!(c->st[k].diode.rth > 0))
            continue;
        if (f->link[k].runaway)
            return k;
        if (best == 0 || f->link[k].tj > f->link[best].tj)
            best = k;
    }
    return best;
}

static int summary_line(const br_chain *c, const br_steady_figs *f, br_text *out)
{
    const br_budget *b = &f->budget;
    br_budget_kinds k;
    br_budget_kinds_of(c, b, &k);
    char text[720], lead[48], inj[200] = "";
    size_t m = 0;
    for (int j = 1; j < c->n && m < sizeof inj; j++) /* each isolated supply by its rail */
        if (c->st[j].inject)
            m += (size_t)snprintf(inj + m, sizeof inj - m, " + injection into %s %.1f mW",
                                  c->st[j].name, -1e3 * b->link[j].stage);
    int n = snprintf(text, sizeof text,
                     "supply %.1f mW%s + power stage %.1f mW = lost %.1f mW: drivers %.1f, "
                     "isolators %.1f, gates %.1f, regulators and clamps %.1f, diodes %.1f, link "
                     "resistors %.1f, return switches %.1f, ESR %.2f, supply resistance %.2f",
                     1e3 * b->supply, inj, 1e3 * b->stage, 1e3 * b->losses, 1e3 * k.driver,
                     1e3 * k.iso, 1e3 * k.gate, 1e3 * k.aux, 1e3 * k.diode, 1e3 * k.resistor,
                     1e3 * k.sw, 1e3 * k.esr, 1e3 * b->rsupply);
    int h = hottest(c, f);
    if (h > 0 && f->ss->thermal && !f->ss->thermal_settled)
        snprintf(text + n, sizeof text - (size_t)n, "; junction temperatures NOT settled");
    else if (h > 0 && f->link[h].runaway)
        snprintf(text + n, sizeof text - (size_t)n, "; link %s RUNS AWAY", c->st[h].name);
    else if (h > 0 && isfinite(f->link[h].onset_amb))
        snprintf(text + n, sizeof text - (size_t)n,
                 "; hottest diode link %s at %.1f degC (runaway from %.1f degC ambient)",
                 c->st[h].name, f->link[h].tj - KELVIN, f->link[h].onset_amb - KELVIN);
    else if (h > 0)
        snprintf(text + n, sizeof text - (size_t)n, "; hottest diode link %s at %.1f degC",
                 c->st[h].name, f->link[h].tj - KELVIN);
    snprintf(lead, sizeof lead, "  %s: ", br_dir_label(f->dir));
    return br_report_wrap(out, lead, text, 4);
}

int br_budget_summary_text(const br_chain *c, const br_steady_figs *f, int ndir, br_text *out)
{
    int rc = br_text_put(out, "losses and heat over the steady period, mW\n");
    for (int d = 0; d < ndir; d++)
        if (br_steady_has_period(f[d].ss))
            rc |= summary_line(c, &f[d], out);
    return rc ? BR_ENOMEM : BR_OK;
}

/* ---- XML -------------------------------------------------------------- */

static void rail_loss_xml(br_xmlw *w, const br_chain *c, const br_steady_figs *f, int k)
{
    const br_rail_loss *r = &f->budget.rail[k];
    br_xmlw_start(w, "rail-losses");
    br_xmlw_int(w, "index", k);
    br_xmlw_attr(w, "switch", c->st[k].name);
    br_xmlw_num(w, "driver-W", r->run);
    br_xmlw_num(w, "isolator-W", r->iso);
    br_xmlw_num(w, "standby-W", r->standby);
    br_xmlw_num(w, "gate-W", r->gate);
    br_xmlw_num(w, "regulator-W", r->regulator);
    br_xmlw_num(w, "clamp-W", r->clamp);
    br_xmlw_num(w, "esr-W", r->esr);
    if (isfinite(f->rail[k].tj_aux))
        br_xmlw_num(w, "aux-tj-K", f->rail[k].tj_aux);
    br_xmlw_end(w);
}

static void link_loss_xml(br_xmlw *w, const br_chain *c, const br_steady_figs *f, int k)
{
    const br_link_loss *l = &f->budget.link[k];
    const br_link_fig *lf = &f->link[k];
    br_xmlw_start(w, "link-losses");
    br_xmlw_int(w, "index", k);
    br_xmlw_attr(w, "switch", c->st[k].name);
    br_xmlw_num(w, "conduction-W", l->cond);
    br_xmlw_num(w, "recovery-W", l->recovery);
    br_xmlw_num(w, "leakage-W", l->leakage);
    br_xmlw_num(w, "junction-W", l->junction);
    br_xmlw_num(w, "resistor-W", l->resistor);
    br_xmlw_num(w, "switch-W", l->sw);
    if (c->st[k].inject)
        br_xmlw_num(w, "injection-W", -l->stage);
    else
        br_xmlw_num(w, "power-stage-W", l->stage);
    if (c->st[k].diode.rth > 0) {
        br_xmlw_bool(w, "runaway", lf->runaway);
        if (!lf->runaway)
            br_xmlw_num(w, "tj-K", lf->tj);
        if (isfinite(lf->onset_amb))
            br_xmlw_num(w, "runaway-ambient-K", lf->onset_amb);
    }
    br_xmlw_end(w);
}

void br_budget_xml(br_xmlw *w, const br_chain *c, const br_steady_figs *f)
{
    const br_budget *b = &f->budget;
    br_xmlw_start(w, "losses");
    br_xmlw_num(w, "supply-W", b->supply);
    br_xmlw_num(w, "power-stage-W", b->stage);
    if (br_chain_injected(c))
        br_xmlw_num(w, "injection-W", b->inject);
    br_xmlw_num(w, "supply-resistance-W", b->rsupply);
    br_xmlw_num(w, "total-W", b->losses);
    br_xmlw_num(w, "stored-W", b->stored);
    br_xmlw_num(w, "balance-W", b->balance);
    for (int k = 0; k < c->n; k++)
        rail_loss_xml(w, c, f, k);
    for (int k = 1; k < c->n; k++)
        link_loss_xml(w, c, f, k);
    br_xmlw_end(w);
}

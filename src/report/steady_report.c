/* steady_report.c - rendering periodic steady states. */
#include "report/steady_report.h"

#include "report/budget_report.h"
#include "report/fmt.h"
#include "report/line_report.h"
#include "report/report_common.h"
#include "report/table.h"
#include "report/vocab.h"

#include <math.h>
#include <stdio.h>

/* ---- how it was found -------------------------------------------------- */

/* Why a direction has no period to show, wrapped after lead (the
 * line's start); ends the line. */
static int no_period_line(const br_steady *ss, const char *lead, br_text *out)
{
    char text[400];
    snprintf(text, sizeof text, "%s %s",
             ss->collapsed ? "none (FAIL):" : "not found (UNDETERMINED):", ss->why);
    return br_report_wrap(out, lead, text, 4);
}

static int method_line(const br_steady *ss, br_text *out)
{
    char r[32], d[32];
    br_fmt_si(r, sizeof r, ss->residual, 3, "V");
    br_fmt_si(d, sizeof d, ss->drift, 3, "V");
    if (ss->dir == BR_DIRI_LINE)
        return br_text_printf(out,
                              "shooting over the line period, %d line period%s%s (%ld switching "
                              "periods),\n    residual %s, drift %s/line period",
                              ss->iterations, ss->iterations == 1 ? "" : "s",
                              ss->converged ? "" : " (NOT converged)", ss->periods, r, d);
    if (ss->method == BR_STEADY_SHOOTING)
        return br_text_printf(out,
                              "shooting, %d iteration%s, %ld periods, residual %s, drift %s/period",
                              ss->iterations, ss->iterations == 1 ? "" : "s", ss->periods, r, d);
    return br_text_printf(out,
                          "plain simulation (shooting failed), %ld periods, last change %s%s, "
                          "drift %s/period",
                          ss->periods, r, ss->converged ? "" : " (NOT converged)", d);
}

static int holds_line(const br_steady *ss, br_text *out)
{
    const char *over = ss->dir == BR_DIRI_LINE ? "the line cycle" : "the period";
    if (ss->holds)
        return br_text_printf(out, "  holds: every driver stays enabled over %s\n", over);
    return br_text_printf(out, "  holds: NO, a driver drops out over %s\n", over);
}

/* ---- tables ------------------------------------------------------------ */

static void name_cells(br_table *t, const br_chain *c, int k)
{
    br_table_row(t);
    br_table_set(t, 0, "%d", k);
    br_table_set(t, 1, "%s", c->st[k].name);
}

static void head_unit(br_table *t, int col, const char *what, const br_scale *sc)
{
    char h[BR_TABLE_CELL];
    snprintf(h, sizeof h, "%s %s", what, sc->unit);
    br_table_head(t, col, h, BR_RIGHT);
}

static void num(br_table *t, int col, double v, const br_scale *sc, int decimals)
{
    char b[BR_TABLE_CELL];
    br_table_set(t, col, "%s", br_fmt_in(b, sizeof b, v, sc, decimals));
}

/* A fraction as a percentage, or "-" when it does not apply. */
static void pct(br_table *t, int col, int applies, double fraction)
{
    if (applies)
        br_table_set(t, col, "%.1f", 100.0 * fraction);
    else
        br_table_set(t, col, "-");
}

static int finish_table(br_table *t, br_text *out)
{
    if (!t)
        return BR_ENOMEM;
    int rc = br_table_render(t, 2, out);
    br_table_free(t);
    return rc;
}

static br_table *stage_table(int ncol, int nrow, const char *first)
{
    br_table *t = br_table_create(ncol, nrow);
    if (!t)
        return NULL;
    br_table_head(t, 0, first, BR_RIGHT);
    br_table_head(t, 1, "switch", BR_LEFT);
    return t;
}

static int rails_table(const br_chain *c, const br_steady_figs *f, br_text *out)
{
    static const br_scale V = {1.0, "V"};
    double rmax = 0.0;
    for (int k = 0; k < f->n; k++)
        rmax = fmax(rmax, f->rail[k].ripple);
    br_scale mv = br_scale_column(rmax, 1e-3, "V");
    br_table *t = stage_table(10, f->n, "stage");
    if (!t)
        return BR_ENOMEM;
    head_unit(t, 2, "min", &V);
    head_unit(t, 3, "max", &V);
    head_unit(t, 4, "avg", &V);
    head_unit(t, 5, "ripple", &mv);
    head_unit(t, 6, "floor", &V);
    head_unit(t, 7, "above floor", &V);
    head_unit(t, 8, "driver min", &V);
    head_unit(t, 9, "driver max", &V);
    for (int k = 0; k < f->n; k++) {
        const br_rail_fig *r = &f->rail[k];
        double floor = br_rail_floor(c, k, NULL);
        name_cells(t, c, k);
        num(t, 2, r->vmin, &V, 3);
        num(t, 3, r->vmax, &V, 3);
        num(t, 4, r->vavg, &V, 3);
        num(t, 5, r->ripple, &mv, mv.factor > 1 ? 1 : 3);
        num(t, 6, floor, &V, 3);
        num(t, 7, r->vmin - floor, &V, 3);
        num(t, 8, r->vdrv_min, &V, 3);
        num(t, 9, r->vdrv_max, &V, 3);
    }
    return finish_table(t, out);
}

static int margins_table(const br_chain *c, const br_steady_figs *f, br_text *out)
{
    static const br_scale V = {1.0, "V"};
    br_table *t = stage_table(6, f->n, "stage");
    if (!t)
        return BR_ENOMEM;
    head_unit(t, 2, "to UVLO falling", &V);
    head_unit(t, 3, "to UVLO rising", &V);
    head_unit(t, 4, "to minimum drive", &V);
    head_unit(t, 5, "to gate maximum", &V);
    for (int k = 0; k < f->n; k++) {
        const br_rail_fig *r = &f->rail[k];
        name_cells(t, c, k);
        num(t, 2, r->m_uvlo, &V, 3);
        num(t, 3, r->m_restart, &V, 3);
        num(t, 4, r->m_drive, &V, 3);
        num(t, 5, r->m_gate, &V, 3);
    }
    return finish_table(t, out);
}

/* Display scales for the diode columns, from their largest entries. */
typedef struct link_scales {
    br_scale i, ipk, jd, q, irr, p;
} link_scales;

static link_scales pick_link_scales(const br_steady_figs *f)
{
    double i = 0, ipk = 0, jd = 0, q = 0, irr = 0, p = 0;
    for (int k = 1; k < f->n; k++) {
        const br_link_fig *l = &f->link[k];
        i = fmax(i, fmax(l->iavg, l->irms));
        ipk = fmax(ipk, l->ipeak);
        jd = fmax(jd, l->idisp);
        q = fmax(q, l->qrr);
        irr = fmax(irr, l->irrm);
        p = fmax(p, fmax(l->p_cond, l->p_rr));
    }
    link_scales s = {br_scale_column(i, 1e-3, "A"),   br_scale_column(ipk, 1e-3, "A"),
                     br_scale_column(jd, 1e-3, "A"),  br_scale_column(q, 1e-9, "C"),
                     br_scale_column(irr, 1e-3, "A"), br_scale_column(p, 1e-3, "W")};
    return s;
}

static int diode_stress_table(const br_chain *c, const br_steady_figs *f, const link_scales *s,
                              br_text *out)
{
    static const br_scale V = {1.0, "V"};
    br_table *t = stage_table(8, f->n, "link");
    if (!t)
        return BR_ENOMEM;
    head_unit(t, 2, "peak reverse", &V);
    head_unit(t, 3, "reverse stress", &V);
    head_unit(t, 4, "rating", &V);
    br_table_head(t, 5, "share %", BR_RIGHT);
    head_unit(t, 6, "forward average", &s->i);
    head_unit(t, 7, "forward RMS", &s->i);
    for (int k = 1; k < f->n; k++) {
        const br_link_fig *l = &f->link[k];
        name_cells(t, c, k);
        num(t, 2, l->vrev_sim, &V, 1);
        num(t, 3, l->vrev_stress, &V, 1);
        br_table_set(t, 4, "%s", l->vrrm > 0 ? "" : "-");
        if (l->vrrm > 0)
            num(t, 4, l->vrrm, &V, 0);
        pct(t, 5, l->vrrm > 0, l->share);
        num(t, 6, l->iavg, &s->i, 3);
        num(t, 7, l->irms, &s->i, 3);
    }
    return finish_table(t, out);
}

static int diode_recovery_table(const br_chain *c, const br_steady_figs *f, const link_scales *s,
                                br_text *out)
{
    br_table *t = stage_table(8, f->n, "link");
    if (!t)
        return BR_ENOMEM;
    head_unit(t, 2, "forward peak", &s->ipk);
    head_unit(t, 3, "displacement peak", &s->jd);
    head_unit(t, 4, "Qrr", &s->q);
    head_unit(t, 5, "Irrm", &s->irr);
    head_unit(t, 6, "conduction", &s->p);
    head_unit(t, 7, "recovery", &s->p);
    for (int k = 1; k < f->n; k++) {
        const br_link_fig *l = &f->link[k];
        name_cells(t, c, k);
        num(t, 2, l->ipeak, &s->ipk, 3);
        num(t, 3, l->idisp, &s->jd, 3);
        num(t, 4, l->qrr, &s->q, 3);
        num(t, 5, l->irrm, &s->irr, 3);
        num(t, 6, l->p_cond, &s->p, 3);
        num(t, 7, l->p_rr, &s->p, 3);
    }
    return finish_table(t, out);
}

static int diodes(const br_chain *c, const br_steady_figs *f, br_text *out)
{
    link_scales s = pick_link_scales(f);
    char text[400];
    snprintf(text, sizeof text,
             "(link k charges rail k; reverse stress = peak reverse voltage plus %.0f %% edge "
             "overshoot; share of the rating, derated rating %.0f %% of it; forward current "
             "through the junction)",
             100.0 * c->overshoot, 100.0 * c->derating);
    int rc = br_report_wrap(out, "diodes ", text, 2);
    rc |= diode_stress_table(c, f, &s, out);
    rc |= br_report_wrap(out, "diodes: ",
                         "forward peak; displacement peak, the junction capacitance's Cj dv/dt "
                         "at the edges (not conduction); recovery charge per period and peak "
                         "recovery current; losses",
                         2);
    return rc | diode_recovery_table(c, f, &s, out);
}

static int caps_table(const br_chain *c, const br_steady_figs *f, br_text *out)
{
    static const br_scale V = {1.0, "V"};
    double cmax = 0, imax = 0;
    for (int k = 1; k < f->n; k++) {
        cmax = fmax(cmax, f->rail[k].c_eff);
        imax = fmax(imax, f->rail[k].icap_rms);
    }
    br_scale cs = br_scale_column(cmax, 1e-9, "F"), is = br_scale_column(imax, 1e-3, "A");
    br_table *t = stage_table(7, f->n, "rail");
    if (!t)
        return BR_ENOMEM;
    br_table_head(t, 2, "part", BR_LEFT);
    head_unit(t, 3, "C at bias", &cs);
    head_unit(t, 4, "peak", &V);
    head_unit(t, 5, "rating", &V);
    head_unit(t, 6, "RMS", &is);
    for (int k = 1; k < f->n; k++) {
        const br_rail_fig *r = &f->rail[k];
        name_cells(t, c, k);
        br_table_set(t, 2, "%s", c->st[k].cap.id ? c->st[k].cap.id : "-");
        num(t, 3, r->c_eff, &cs, 3);
        num(t, 4, r->vcap_peak, &V, 3);
        br_table_set(t, 5, "%s", "-");
        if (r->vcap_rating > 0)
            num(t, 5, r->vcap_rating, &V, 0);
        num(t, 6, r->icap_rms, &is, 3);
    }
    return finish_table(t, out);
}

int br_steady_text(const br_chain *c, const br_steady_figs *f, br_text *out)
{
    char a[32], b[32], what[160];
    int line = f->dir == BR_DIRI_LINE;
    int rc = line ? br_report_wrap(out, "steady state over the line cycle: ",
                                   br_line_describe(c, what, sizeof what), 2)
                  : br_text_printf(out, "steady state, %s current\n", br_dir_label(f->dir));
    if (!br_steady_has_period(f->ss)) { /* no period to show figures of */
        rc |= no_period_line(f->ss, "  ", out);
        return rc ? BR_ENOMEM : BR_OK;
    }
    rc |= br_text_put(out, "  found by ");
    rc |= method_line(f->ss, out);
    rc |= br_text_put(out, "\n");
    rc |= holds_line(f->ss, out);
    rc |= br_report_wrap(out, line ? "rails over the line cycle " : "rails ",
                         "(rail = capacitor + ESR; driver = driver supply, after the regulator; "
                         "floor = the highest lower limit at the rail: UVLO rising and the "
                         "minimum drive, plus the regulator's dropout, or the regulator output + "
                         "dropout)",
                         2);
    rc |= rails_table(c, f, out);
    if (line)
        rc |= br_line_where_text(c, f, out);
    rc |= br_text_put(out, "margins of the driver supply (driver min - lower limit, gate maximum - "
                           "driver max)\n");
    rc |= margins_table(c, f, out);
    rc |= diodes(c, f, out);
    rc |= br_text_put(out, "capacitors\n");
    rc |= caps_table(c, f, out);
    rc |= br_text_printf(out, "supply: average current %s, power %s\n",
                         br_fmt_si(a, sizeof a, f->supply_iavg, 4, "A"),
                         br_fmt_si(b, sizeof b, f->supply_p, 4, "W"));
    rc |= br_budget_text(c, f, out);
    return rc ? BR_ENOMEM : BR_OK;
}

/* ---- the compact form ---------------------------------------------------- */

/* One row per stage of direction f: every figure of a row from it. */
static void summary_row(br_table *t, const br_chain *c, const br_steady_figs *f, int k,
                        const br_scale *mv, const br_scale *ia)
{
    static const br_scale V = {1.0, "V"};
    const br_rail_fig *r = &f->rail[k];
    double floor = br_rail_floor(c, k, NULL);
    name_cells(t, c, k);
    num(t, 2, r->ripple, mv, mv->factor > 1 ? 1 : 3);
    num(t, 3, r->vdrv_min, &V, 3);
    num(t, 4, floor, &V, 3);
    num(t, 5, r->vmin - floor, &V, 3);
    num(t, 6, r->m_gate, &V, 3);
    pct(t, 7, k > 0 && c->st[k].diode.vrrm > 0, k > 0 ? f->link[k].share : 0.0);
    br_table_set(t, 8, "-");
    if (k > 0)
        num(t, 8, f->link[k].iavg, ia, 3);
}

/* The column scales, shared by every direction's table so they line up. */
static void summary_scales(const br_chain *c, const br_steady_figs *f, int ndir, br_scale *mv,
                           br_scale *ia)
{
    double rmax = 0, imax = 0;
    for (int d = 0; d < ndir; d++)
        for (int k = 0; k < c->n && br_steady_has_period(f[d].ss); k++) {
            rmax = fmax(rmax, f[d].rail[k].ripple);
            imax = fmax(imax, k > 0 ? f[d].link[k].iavg : 0.0);
        }
    *mv = br_scale_column(rmax, 1e-3, "V");
    *ia = br_scale_column(imax, 1e-3, "A");
}

static int summary_table(const br_chain *c, const br_steady_figs *f, const br_scale *mv,
                         const br_scale *ia, br_text *out)
{
    static const br_scale V = {1.0, "V"};
    br_table *t = stage_table(9, c->n, "stage");
    if (!t)
        return BR_ENOMEM;
    head_unit(t, 2, "ripple", mv);
    head_unit(t, 3, "driver min", &V);
    head_unit(t, 4, "floor", &V);
    head_unit(t, 5, "above floor", &V);
    head_unit(t, 6, "to gate maximum", &V);
    br_table_head(t, 7, "diode %", BR_RIGHT);
    head_unit(t, 8, "link", ia);
    for (int k = 0; k < c->n; k++)
        summary_row(t, c, f, k, mv, ia);
    return finish_table(t, out);
}

int br_steady_summary_text(const br_chain *c, const br_steady_figs *f, int ndir, br_text *out)
{
    int rc = br_text_printf(out, "steady state%s\n",
                            ndir > 1 ? " (one table per current direction)" : "");
    for (int d = 0; d < ndir; d++) {
        char lead[48];
        snprintf(lead, sizeof lead, "  %s: ", br_dir_label(f[d].dir));
        if (!br_steady_has_period(f[d].ss)) {
            rc |= no_period_line(f[d].ss, lead, out);
            continue;
        }
        rc |= br_text_put(out, lead);
        rc |= method_line(f[d].ss, out);
        rc |= br_text_put(out, f[d].ss->holds ? "; holds\n" : "; DOES NOT HOLD\n");
    }
    br_scale mv, ia;
    summary_scales(c, f, ndir, &mv, &ia);
    for (int d = 0; d < ndir; d++) {
        if (!br_steady_has_period(f[d].ss))
            continue;
        if (ndir > 1)
            rc |= br_text_printf(out, "  %s\n", br_dir_label(f[d].dir));
        rc |= summary_table(c, &f[d], &mv, &ia, out);
    }
    rc |= br_report_wrap(out, "  ",
                         "(floor: the highest lower limit at the rail, UVLO rising or the minimum "
                         "drive plus a regulator's dropout, or the regulator output + dropout; "
                         "above floor: rail min - floor; to gate maximum: gate maximum - driver "
                         "max; diode %: reverse stress in % of the rating; link: forward average)",
                         3);
    if (ndir == 1 && f[0].dir == BR_DIRI_LINE && br_steady_has_period(f[0].ss))
        rc |= br_line_where_text(c, &f[0], out);
    return rc ? BR_ENOMEM : BR_OK;
}

/* ---- XML ------------------------------------------------------------------ */

static void rail_xml(br_xmlw *w, const br_chain *c, const br_steady_figs *f, int k)
{
    const br_rail_fig *r = &f->rail[k];
    br_xmlw_start(w, "rail");
    br_xmlw_int(w, "index", k);
    br_xmlw_attr(w, "switch", c->st[k].name);
    br_xmlw_num(w, "min-V", r->vmin);
    br_xmlw_num(w, "max-V", r->vmax);
    br_xmlw_num(w, "avg-V", r->vavg);
    br_xmlw_num(w, "ripple-V", r->ripple);
    br_xmlw_num(w, "driver-min-V", r->vdrv_min);
    br_xmlw_num(w, "driver-max-V", r->vdrv_max);
    br_xmlw_num(w, "margin-uvlo-V", r->m_uvlo);
    br_xmlw_num(w, "margin-restart-V", r->m_restart);
    br_xmlw_num(w, "margin-drive-V", r->m_drive);
    br_xmlw_num(w, "margin-gate-V", r->m_gate);
    double floor = br_rail_floor(c, k, NULL);
    if (isfinite(floor)) {
        br_xmlw_num(w, "floor-V", floor);
        br_xmlw_num(w, "margin-floor-V", r->vmin - floor);
    }
    br_xmlw_num(w, "load-W", r->p_load);
    if (k > 0) {
        br_xmlw_attr(w, "capacitor", c->st[k].cap.id ? c->st[k].cap.id : "");
        br_xmlw_num(w, "cap-effective-F", r->c_eff);
        br_xmlw_num(w, "cap-peak-V", r->vcap_peak);
        if (r->vcap_rating > 0)
            br_xmlw_num(w, "cap-rating-V", r->vcap_rating);
        br_xmlw_num(w, "cap-rms-A", r->icap_rms);
    }
    if (f->dir == BR_DIRI_LINE)
        br_line_xml_rail(w, c, f->ss, k);
    br_xmlw_end(w);
}

static void link_xml(br_xmlw *w, const br_chain *c, const br_steady_figs *f, int k)
{
    const br_link_fig *l = &f->link[k];
    br_xmlw_start(w, "link");
    br_xmlw_int(w, "index", k);
    br_xmlw_attr(w, "switch", c->st[k].name);
    br_xmlw_attr(w, "diode", c->st[k].diode.id ? c->st[k].diode.id : "");
    br_xmlw_num(w, "reverse-V", l->vrev_sim);
    br_xmlw_num(w, "stress-V", l->vrev_stress);
    if (l->vrrm > 0) {
        br_xmlw_num(w, "rating-V", l->vrrm);
        br_xmlw_num(w, "share", l->share);
    }
    br_xmlw_num(w, "avg-A", l->iavg);
    br_xmlw_num(w, "rms-A", l->irms);
    br_xmlw_num(w, "peak-A", l->ipeak);
    br_xmlw_num(w, "displacement-peak-A", l->idisp);
    br_xmlw_num(w, "qrr-C", l->qrr);
    br_xmlw_num(w, "irrm-A", l->irrm);
    br_xmlw_num(w, "conduction-W", l->p_cond);
    br_xmlw_num(w, "recovery-W", l->p_rr);
    if (f->dir == BR_DIRI_LINE)
        br_line_xml_link(w, c, f->ss, k);
    br_xmlw_end(w);
}

void br_steady_xml(br_xmlw *w, const br_chain *c, const br_steady_figs *f)
{
    const br_steady *ss = f->ss;
    br_xmlw_start(w, "steady");
    br_xmlw_attr(w, "direction", br_dir_label(f->dir));
    br_xmlw_attr(w, "method", ss->method == BR_STEADY_SHOOTING ? "shooting" : "plain");
    br_xmlw_bool(w, "converged", ss->converged);
    br_xmlw_bool(w, "holds", ss->holds);
    br_xmlw_int(w, "iterations", ss->iterations);
    br_xmlw_int(w, "periods", ss->periods);
    br_xmlw_num(w, "residual-V", ss->residual);
    if (!ss->converged && br_steady_has_period(ss))
        br_xmlw_int(w, "residual-rail", ss->resid_rail);
    br_xmlw_num(w, "drift-V", ss->drift);
    br_xmlw_num(w, "phase-s", ss->phase);
    if (f->dir == BR_DIRI_LINE)
        br_line_xml_steady(w, c);
    if (!br_steady_has_period(ss)) { /* no figures to trust */
        br_xmlw_bool(w, ss->collapsed ? "cells-collapse" : "undetermined", 1);
        br_xmlw_attr(w, "why", ss->why);
        br_xmlw_end(w);
        return;
    }
    for (int k = 0; k < f->n; k++)
        rail_xml(w, c, f, k);
    for (int k = 1; k < f->n; k++)
        link_xml(w, c, f, k);
    br_xmlw_start(w, "supply");
    br_xmlw_num(w, "avg-A", f->supply_iavg);
    br_xmlw_num(w, "power-W", f->supply_p);
    br_xmlw_num(w, "peak-A", f->supply_ipeak);
    br_xmlw_num(w, "limited", f->supply_limited);
    br_xmlw_end(w);
    br_budget_xml(w, c, f);
    br_xmlw_end(w);
}

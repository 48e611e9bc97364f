/* charts_heat.c - the plots of the supply and the losses: the supply's
 * current through the start-up, and a stacked bar per stage of where the
 * power goes, beside what the supply and the power stage deliver. */
#include "report/budget_report.h"
#include "report/charts.h"
#include "report/plot.h"
#include "report/report_common.h"

#include <math.h>
#include <stdio.h>

#define PANEL_W 600.0
#define PANEL_H 250.0
#define HEAD_H 44.0

static const br_style S_SUPPLY = {BR_BLUE, NULL, 2.0};
static const br_style S_LIMIT = {BR_VERMILION, "8 4", 1.6};
static const br_style S_RATING = {BR_PURPLE, "2 3", 2.0};

void br_chart_supply_panel(br_svg *s, const br_chain *c, const br_startup *su, const br_trace *tr,
                           double x, double y)
{
    br_plot p;
    char lab[64], v[32], title[96];
    double imax = 0.0, tend = tr->len ? tr->t[tr->len - 1] : su->t_simulated;
    for (long r = 0; r < tr->len; r++)
        imax = fmax(imax, tr->i[r * tr->n]);
    if (c->limit_mode != BR_SUPPLY_UNLIMITED)
        imax = fmax(imax, c->ilimit);
    if (c->irating > 0 && c->irating < 3.0 * imax)
        imax = fmax(imax, c->irating);
    br_plot_frame(&p, s, x, y, PANEL_W, PANEL_H);
    br_plot_range(&p, 0.0, tend, 0.0, 1.08 * (imax > 0 ? imax : 1e-3), 0);
    snprintf(title, sizeof title, "supply current (average %s)",
             br_plot_si(v, sizeof v, su->supply.iavg, 3, "A"));
    br_plot_axes(&p, "supply-startup", title, "time", "s", "current", "A");
    if (c->limit_mode != BR_SUPPLY_UNLIMITED) {
        snprintf(lab, sizeof lab, "limit %s", br_plot_si(v, sizeof v, c->ilimit, 3, "A"));
        br_plot_hline(&p, c->ilimit, &S_LIMIT, lab);
    }
    if (c->irating > 0) {
        snprintf(lab, sizeof lab, "rating %s", br_plot_si(v, sizeof v, c->irating, 3, "A"));
        br_plot_hline(&p, c->irating, &S_RATING, lab);
    }
    br_plot_line(&p, tr->t, tr->i, tr->len, tr->n, &S_SUPPLY, "supply_A");
    br_plot_done(&p);
}

/* ---- the loss budget ------------------------------------------------------ */

enum { K_DRIVER, K_ISO, K_GATE, K_AUX, K_ESR, K_DIODE, K_PATH, NKIND };

static const char *const KIND_NAME[NKIND] = {
    "driver", "isolator", "gate charge", "regulator/clamp", "ESR", "diode", "resistor and switch"};
static const char *const KIND_COLOUR[NKIND] = {BR_BLUE,   BR_SKY,       BR_GREEN, BR_ORANGE,
                                               "#7a8794", BR_VERMILION, BR_PURPLE};

/* Stage k's losses by kind: rail k and link k together. */
static void stage_kinds(const br_budget *b, int k, double *v)
{
    const br_rail_loss *r = &b->rail[k];
    v[K_DRIVER] = r->run + r->standby;
    v[K_ISO] = r->iso;
    v[K_GATE] = r->gate;
    v[K_AUX] = r->regulator + r->clamp;
    v[K_ESR] = r->esr;
    v[K_DIODE] = v[K_PATH] = 0.0;
    if (k > 0) {
        const br_link_loss *l = &b->link[k];
        v[K_DIODE] = l->cond + l->recovery + l->leakage + l->junction;
        v[K_PATH] = l->resistor + l->sw;
    }
}

/* A bar from 0 up through the values, stacked in order; negative parts
 * (a junction capacitance that gives back more than it takes) are not
 * drawn. */
static void stack(br_plot *p, double xc, double w, const double *v, const char *const *colours,
                  int n)
{
    double base = 0.0;
    for (int i = 0; i < n; i++) {
        if (!(v[i] > 0))
            continue;
        double y0 = br_plot_py(p, base), y1 = br_plot_py(p, base + v[i]);
        br_svg_rect(p->svg, xc - w / 2, y1, w, y0 - y1, colours[i], "none", 0);
        base += v[i];
    }
}

static void bar_label(br_plot *p, double xc, const char *name)
{
    br_svg_text_in(p->svg, xc, p->y0 + p->h + 18, BR_FONT_TICK, "middle", BR_INK, 0, name);
}

static double tallest(const br_chain *c, const br_budget *b)
{
    double m = b->supply + fmax(b->stage, 0.0) + b->inject;
    for (int k = 0; k < c->n; k++)
        m = fmax(m, br_rail_loss_sum(&b->rail[k]) + (k > 0 ? br_link_loss_sum(&b->link[k]) : 0));
    return m;
}

static void losses_panel(br_svg *s, const br_chain *c, const br_steady_figs *f, double y, double w)
{
    br_plot p;
    char title[160], key[64], a[32], l[32];
    const br_budget *b = &f->budget;
    int nbar = c->n + 1;
    br_plot_frame(&p, s, 0, y, w, PANEL_H + 20);
    p.xcat = 1;
    br_plot_range(&p, -0.5, nbar - 0.5, 0.0, 1.08 * fmax(tallest(c, b), 1e-6), 0);
    snprintf(title, sizeof title, "%s: supply %s, all losses %s", br_dir_label(f->dir),
             br_plot_si(a, sizeof a, b->supply, 4, "W"),
             br_plot_si(l, sizeof l, b->losses, 4, "W"));
    snprintf(key, sizeof key, "losses-%s", br_dir_short(f->dir));
    br_plot_axes(&p, key, title, "stage", "", "power", "W");
    double bw = 0.6 * p.w / nbar;
    double given[3] = {b->supply, b->stage, b->inject};
    static const char *const source[3] = {BR_INK, "#9aa5b1", "#5b7083"};
    stack(&p, br_plot_px(&p, 0.0), bw, given, source, 3);
    bar_label(&p, br_plot_px(&p, 0.0), "supply");
    for (int k = 0; k < c->n; k++) {
        double v[NKIND];
        stage_kinds(b, k, v);
        stack(&p, br_plot_px(&p, k + 1.0), bw, v, KIND_COLOUR, NKIND);
        bar_label(&p, br_plot_px(&p, k + 1.0), c->st[k].name);
    }
    br_plot_done(&p);
}

int br_chart_losses(const br_chain *c, const br_steady_figs *f, int ndir, int standalone,
                    br_text *out)
{
    br_svg s;
    double w = 2 * PANEL_W, ph = PANEL_H + 20;
    int n = 0;
    for (int d = 0; d < ndir; d++)
        n += br_steady_has_period(f[d].ss);
    const char *head = "Where the power goes over a steady period (stage k: rail k and link k)";
    if (standalone)
        br_svg_begin(&s, out, w, HEAD_H + 26 + ph * (n ? n : 1));
    else
        br_svg_begin_inline(&s, out, w, HEAD_H + 26 + ph * (n ? n : 1), head);
    br_svg_text_in(&s, 12, 26, 18.0, "start", BR_INK, 1, head);
    br_plot p;
    br_plot_frame(&p, &s, 0, 0, 10, 10);
    double x = 12;
    const br_style sup = {BR_INK, NULL, 6.0}, stage = {"#9aa5b1", NULL, 6.0};
    x = br_plot_key(&p, x, 56, &sup, "supply");
    x = br_plot_key(&p, x, 56, &stage, "power stage");
    for (int i = 0; i < NKIND; i++) {
        br_style st = {KIND_COLOUR[i], NULL, 6.0};
        x = br_plot_key(&p, x, 56, &st, KIND_NAME[i]);
    }
    double y = HEAD_H + 26;
    for (int d = 0; d < ndir; d++)
        if (br_steady_has_period(f[d].ss)) {
            losses_panel(&s, c, &f[d], y, w);
            y += ph;
        }
    return br_svg_end(&s);
}

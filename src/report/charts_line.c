/* charts_line.c - the rail envelope over a line cycle: the load current
 * and the duty against line phase, then every rail's lowest and highest
 * voltage per switching period, with its limits. */
#include "report/charts.h"

#include "report/line_report.h"
#include "report/plot.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>

#define PANEL_W 600.0
#define PANEL_H 250.0
#define HEAD_H 44.0

static const br_style S_LO = {BR_BLUE, NULL, 2.0};
static const br_style S_HI = {BR_SKY, "6 3", 2.0};
static const br_style S_DLO = {BR_GREEN, NULL, 1.6};
static const br_style S_DHI = {BR_GREEN, "7 4", 1.6};
static const br_style S_FALL = {BR_ORANGE, "2 3", 2.0};
static const br_style S_AT = {BR_VERMILION, NULL, 1.2};
static const br_style S_WAVE = {BR_BLUE, NULL, 2.0};

/* The line phase of each envelope row's centre, deg, and the current and
 * duty of the switching period there. */
typedef struct line_axes {
    int rows;
    double *deg, *cur, *duty;
} line_axes;

static void axes_free(line_axes *a)
{
    free(a->deg);
    free(a->cur);
    free(a->duty);
}

static int axes_make(const br_chain *c, const br_line_env *e, line_axes *a)
{
    a->rows = e->rows;
    a->deg = malloc(sizeof(double) * (size_t)e->rows);
    a->cur = malloc(sizeof(double) * (size_t)e->rows);
    a->duty = malloc(sizeof(double) * (size_t)e->rows);
    if (!a->deg || !a->cur || !a->duty) {
        axes_free(a);
        return BR_ENOMEM;
    }
    for (int r = 0; r < e->rows; r++) {
        long m0 = br_line_env_first(e, r),
             m1 = r + 1 < e->rows ? br_line_env_first(e, r + 1) : e->K;
        double th;
        long m;
        br_line_window(&c->line, c->T, e->phase, (m0 + m1 - 1) / 2, &th, &m);
        a->deg[r] = br_line_deg(th);
        a->cur[r] = br_line_current(&c->line, m);
        a->duty[r] = br_line_duty(&c->line, m);
    }
    return BR_OK;
}

static void wave_panel(br_svg *s, const line_axes *a, int which, double x, double y)
{
    br_plot p;
    const double *v = which ? a->duty : a->cur;
    double lo = HUGE_VAL, hi = -HUGE_VAL;
    for (int r = 0; r < a->rows; r++) {
        lo = fmin(lo, v[r]);
        hi = fmax(hi, v[r]);
    }
    if (which) {
        lo = 0.0;
        hi = 1.0;
    }
    br_plot_frame(&p, s, x, y, PANEL_W, PANEL_H);
    br_plot_range(&p, 0.0, 360.0, lo, hi, 1);
    br_plot_axes(&p, which ? "line-duty" : "line-current",
                 which ? "duty of each switching period"
                       : "load current (+ out of the switch node, step-down)",
                 "line phase", "deg", which ? "duty" : "current", which ? "" : "A");
    if (!which)
        br_plot_hline(&p, 0.0, &S_FALL, "step-down above, step-up below");
    br_plot_line(&p, a->deg, v, a->rows, 1, &S_WAVE, which ? "line_duty" : "line_current_A");
    br_plot_done(&p);
}

static void range_of(const br_line_env *e, const double *lo, const double *hi, int k, double *a,
                     double *b)
{
    for (int r = 0; r < e->rows; r++) {
        *a = fmin(*a, lo[(size_t)r * (size_t)e->n + (size_t)k]);
        *b = fmax(*b, hi[(size_t)r * (size_t)e->n + (size_t)k]);
    }
}

static void rail_panel(br_svg *s, const br_chain *c, const br_steady_figs *f, const br_line_env *e,
                       const line_axes *a, int k, double x, double y)
{
    br_plot p;
    char title[96], key[64];
    const br_stage *st = &c->st[k];
    double lo = HUGE_VAL, hi = -HUGE_VAL, dlo = HUGE_VAL, dhi = -HUGE_VAL;
    range_of(e, e->vmin, e->vmax, k, &lo, &hi);
    range_of(e, e->dmin, e->dmax, k, &dlo, &dhi);
    int ldo = st->aux.kind == BR_AUX_LDO;
    if (ldo) { /* the driver supply joins the plot */
        lo = fmin(lo, dlo);
        hi = fmax(hi, dhi);
    }
    br_chart_take_limits(c, k, &lo, &hi);
    br_plot_frame(&p, s, x, y, PANEL_W, PANEL_H);
    br_plot_range(&p, 0.0, 360.0, lo, hi, 1);
    snprintf(title, sizeof title, "rail %s over the line cycle", st->name);
    snprintf(key, sizeof key, "line-%s", st->name);
    br_plot_axes(&p, key, title, "line phase", "deg", "voltage", "V");
    br_chart_rail_limits(&p, c, k);
    snprintf(key, sizeof key, "rail_%s_V", st->name);
    br_plot_line(&p, a->deg, e->vmin + k, e->rows, e->n, &S_LO, key);
    br_plot_line(&p, a->deg, e->vmax + k, e->rows, e->n, &S_HI, key);
    if (ldo) {
        snprintf(key, sizeof key, "drv_%s_V", st->name);
        br_plot_line(&p, a->deg, e->dmin + k, e->rows, e->n, &S_DLO, key);
        br_plot_line(&p, a->deg, e->dmax + k, e->rows, e->n, &S_DHI, key);
    }
    double th;
    long m;
    br_line_window(&c->line, c->T, f->ss->phase, f->ss->at_dmin[k], &th, &m);
    br_plot_vline(&p, br_line_deg(th), &S_AT, "lowest");
    br_plot_done(&p);
}

int br_chart_line(const br_chain *c, const br_steady_figs *f, const br_line_env *e, int standalone,
                  br_text *out)
{
    line_axes a = {0};
    if (axes_make(c, e, &a) != BR_OK)
        return BR_ENOMEM;
    br_svg s;
    br_plot p;
    char head[200], what[160];
    int cols = 2, panels = 2 + c->n;
    snprintf(head, sizeof head, "Rail envelope over the line cycle: %s",
             br_line_describe(c, what, sizeof what));
    double h = HEAD_H + 10 + PANEL_H * ((panels + cols - 1) / cols);
    if (standalone)
        br_svg_begin(&s, out, cols * PANEL_W, h);
    else
        br_svg_begin_inline(&s, out, cols * PANEL_W, h, head);
    br_svg_text_in(&s, 12, 26, 15.0, "start", BR_INK, 1, head);
    br_plot_frame(&p, &s, 0, 0, 10, 10);
    double x = 12;
    x = br_plot_key(&p, x, 40, &S_LO, "rail lowest");
    x = br_plot_key(&p, x, 40, &S_HI, "rail highest");
    x = br_plot_key(&p, x, 40, &S_DLO, "driver supply");
    br_chart_limits_key(&p, x, 40);
    for (int i = 0; i < panels; i++) {
        double px = (i % cols) * PANEL_W, py = HEAD_H + 10 + (i / cols) * PANEL_H;
        if (i < 2)
            wave_panel(&s, &a, i, px, py);
        else
            rail_panel(&s, c, f, e, &a, i - 2, px, py);
    }
    axes_free(&a);
    return br_svg_end(&s);
}

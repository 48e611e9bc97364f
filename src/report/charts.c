/* charts.c - the plots of the reports, drawn from traces and results. */
#include "report/charts.h"

#include "report/plot.h"
#include "report/report_common.h"
#include "report/vocab.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>

/* Panels of the small-multiple grids, px. */
#define PANEL_W 680.0
#define PANEL_H 250.0
#define HEAD_H 62.0 /* the document's own heading, its key on a line below */
#define KEY_Y 50.0

static const br_style S_RAIL = {BR_BLUE, NULL, 2.0};
static const br_style S_DRV = {BR_GREEN, "7 4", 2.0};
static const br_style S_RISE = {BR_VERMILION, "8 4", 1.6};
static const br_style S_FALL = {BR_ORANGE, "2 3", 2.0};
static const br_style S_START = {BR_GREEN, NULL, 1.6};
static const br_style S_DRIVE = {BR_VERMILION, "2 3", 2.0};
static const br_style S_GATE = {BR_PURPLE, "8 4", 2.0};
static const br_style S_FAILS = {BR_VERMILION, NULL, 2.0};
static const br_style S_HEAD = {BR_SKY, "10 3 2 3", 2.0};
static const br_style S_DISP = {BR_ORANGE, NULL, 1.4};

/* ---- a rail's limits ---------------------------------------------------- */

/* Each limit of the rail's driver, where the rail must be for it (vocab.h:
 * the same values and names as the tables), in its own style: the
 * regulator output + dropout, the minimum drive, UVLO rising and falling,
 * the gate maximum. */
static const int RAIL_LIMS[] = {BR_LIM_HEADROOM, BR_LIM_DRIVE, BR_LIM_UVLO_RISE, BR_LIM_UVLO_FALL,
                                BR_LIM_GATE};
#define NRAIL_LIMS (int)(sizeof RAIL_LIMS / sizeof RAIL_LIMS[0])

static const br_style *lim_style(int lim)
{
    switch (lim) {
    case BR_LIM_HEADROOM:
        return &S_HEAD;
    case BR_LIM_DRIVE:
        return &S_DRIVE;
    case BR_LIM_UVLO_RISE:
        return &S_RISE;
    case BR_LIM_UVLO_FALL:
        return &S_FALL;
    default:
        return &S_GATE;
    }
}

static const char *lim_key(int lim)
{
    static const char *const key[BR_LIM_COUNT] = {"uvlo-rising", "uvlo-falling", "minimum-drive",
                                                  "gate-maximum", "regulator-headroom"};
    return key[lim];
}

/* Grow [lo, hi] to take in every limit of rail k that a rail voltage can
 * meet. */
void br_chart_take_limits(const br_chain *c, int k, double *lo, double *hi)
{
    for (int i = 0; i < NRAIL_LIMS; i++) {
        double v = br_rail_limit(c, k, RAIL_LIMS[i]);
        if (isfinite(v)) {
            *lo = fmin(*lo, v);
            *hi = fmax(*hi, v);
        }
    }
}

/* Every limit of rail k as a labelled line: its name on the first line of
 * the label, its value on the second, "floor" before the value of the
 * one that is the rail's floor. */
void br_chart_rail_limits(br_plot *p, const br_chain *c, int k)
{
    int which, n = 0;
    br_rail_floor(c, k, &which);
    double y[NRAIL_LIMS];
    const br_style *st[NRAIL_LIMS];
    const char *key[NRAIL_LIMS], *lab[NRAIL_LIMS];
    char text[NRAIL_LIMS][112];
    for (int i = 0; i < NRAIL_LIMS; i++) {
        int lim = RAIL_LIMS[i];
        double v = br_rail_limit(c, k, lim);
        if (!isfinite(v))
            continue;
        char name[64], val[32];
        br_rail_limit_label(c, k, lim, name, sizeof name);
        snprintf(text[n], sizeof text[n], "%s\n%s%s", name, lim == which ? "floor " : "",
                 br_plot_si(val, sizeof val, v, 3, "V"));
        y[n] = v;
        st[n] = lim_style(lim);
        key[n] = lim_key(lim);
        lab[n] = text[n];
        n++;
    }
    br_plot_limits(p, n, y, st, key, lab);
}

/* The key of the limits' styles. */
double br_chart_limits_key(br_plot *p, double x, double y)
{
    x = br_plot_key(p, x, y, &S_HEAD, br_limit_name(BR_LIM_HEADROOM));
    x = br_plot_key(p, x, y, &S_DRIVE, br_limit_name(BR_LIM_DRIVE));
    x = br_plot_key(p, x, y, &S_RISE, br_limit_name(BR_LIM_UVLO_RISE));
    x = br_plot_key(p, x, y, &S_FALL, br_limit_name(BR_LIM_UVLO_FALL));
    return br_plot_key(p, x, y, &S_GATE, br_limit_name(BR_LIM_GATE));
}

static void doc_begin(br_svg *s, br_text *out, double w, double h, int standalone,
                      const char *title)
{
    if (standalone)
        br_svg_begin(s, out, w, h);
    else
        br_svg_begin_inline(s, out, w, h, title);
}

/* Rows of two panels for n panels, and the document height. */
static double grid_height(int n, int cols)
{
    return HEAD_H + PANEL_H * ((n + cols - 1) / cols);
}

static void panel_at(int i, int cols, double *x, double *y)
{
    *x = (i % cols) * PANEL_W;
    *y = HEAD_H + (i / cols) * PANEL_H;
}

static void heading(br_svg *s, const char *text)
{
    br_svg_text_in(s, 12, 26, 18.0, "start", BR_INK, 1, text);
}

/* ---- start-up ------------------------------------------------------------ */

static double column_max(const br_trace *tr, const double *a, int k)
{
    double m = -HUGE_VAL;
    for (long r = 0; r < tr->len; r++)
        m = fmax(m, a[r * tr->n + k]);
    return m;
}

static double column_min(const br_trace *tr, const double *a, int k, long from, long count)
{
    double m = HUGE_VAL;
    for (long r = from; r < from + count; r++)
        m = fmin(m, a[r * tr->n + k]);
    return m;
}

static double column_max_in(const br_trace *tr, const double *a, int k, long from, long count)
{
    double m = -HUGE_VAL;
    for (long r = from; r < from + count; r++)
        m = fmax(m, a[r * tr->n + k]);
    return m;
}

static void startup_panel(br_svg *s, const br_chain *c, const br_startup *su, const br_trace *tr,
                          int k, double x, double y)
{
    br_plot p;
    char title[96], key[64], lab[64];
    br_plot_frame(&p, s, x, y, PANEL_W, PANEL_H);
    double tend = tr->len ? tr->t[tr->len - 1] : su->t_simulated;
    /* a rail can dip a little below zero (leakage, recovery) */
    double vmin = fmin(0.0, column_min(tr, tr->v, k, 0, tr->len));
    double vmax = column_max(tr, tr->v, k);
    br_chart_take_limits(c, k, &vmin, &vmax);
    br_plot_range(&p, 0.0, tend, vmin - 0.02 * vmax, 1.08 * vmax, 0);
    snprintf(title, sizeof title, k == 0 ? "rail %s (supply)" : "rail %s", c->st[k].name);
    snprintf(key, sizeof key, "startup-%s", c->st[k].name);
    br_plot_axes(&p, key, title, "time", "s", "voltage", "V");
    br_chart_rail_limits(&p, c, k);
    snprintf(key, sizeof key, "rail_%s_V", c->st[k].name);
    br_plot_line(&p, tr->t, tr->v + k, tr->len, tr->n, &S_RAIL, key);
    double ts = su->st[k].final_enable;
    if (ts >= 0) {
        char tb[32];
        snprintf(lab, sizeof lab, "starts %s", br_plot_time(tb, sizeof tb, ts));
        br_plot_vline(&p, ts, &S_START, lab);
    } else {
        /* in the strip above the area, where no trace runs */
        br_svg_text_in(s, p.x0 + 8, p.y0 - 7, BR_FONT_TICK, "start", BR_VERMILION, 1,
                       "driver never starts for good");
    }
    br_plot_done(&p);
}

static void startup_key(br_svg *s)
{
    br_plot p;
    br_plot_frame(&p, s, 0, 0, 10, 10);
    double x = 12;
    x = br_plot_key(&p, x, KEY_Y, &S_RAIL, "rail");
    x = br_plot_key(&p, x, KEY_Y, &S_START, "driver starts");
    br_chart_limits_key(&p, x, KEY_Y);
}

int br_chart_startup(const br_chain *c, const br_startup *su, const br_trace *tr, int standalone,
                     br_text *out)
{
    br_svg s;
    int cols = c->n > 1 ? 2 : 1;
    double x, y;
    doc_begin(&s, out, cols * PANEL_W, grid_height(c->n + 1, cols), standalone,
              "Start-up from cold: every rail with its UVLO thresholds, and the supply's current");
    heading(&s, "Start-up from cold");
    startup_key(&s);
    for (int k = 0; k < c->n; k++) {
        panel_at(k, cols, &x, &y);
        startup_panel(&s, c, su, tr, k, x, y);
    }
    panel_at(c->n, cols, &x, &y);
    br_chart_supply_panel(&s, c, su, tr, x, y);
    return br_svg_end(&s);
}

/* ---- steady-state ripple ------------------------------------------------- */

/* The driver supply behind a regulator: drawn when it fits the rail's
 * range, otherwise pointed at from the edge with its mean. */
static void driver_supply(br_plot *p, const br_trace *tr, int k, const char *name)
{
    char key[64], lab[64], v[32];
    double lo = column_min(tr, tr->vd, k, 0, tr->len);
    double hi = column_max_in(tr, tr->vd, k, 0, tr->len);
    if (lo >= p->ymin && hi <= p->ymax) {
        snprintf(key, sizeof key, "drv_%s_V", name);
        br_plot_line(p, tr->t, tr->vd + k, tr->len, tr->n, &S_DRV, key);
        return;
    }
    snprintf(lab, sizeof lab, "driver %s", br_plot_si(v, sizeof v, 0.5 * (lo + hi), 3, "V"));
    br_plot_hline(p, 0.5 * (lo + hi), &S_DRV, lab);
}

static void ripple_panel(br_svg *s, const br_chain *c, const br_steady_figs *f, const br_trace *tr,
                         int k, double x, double y)
{
    br_plot p;
    char title[96], key[64], v[32];
    const br_stage *st = &c->st[k];
    long cnt = tr->len;
    double lo = column_min(tr, tr->v, k, 0, cnt), hi = column_max_in(tr, tr->v, k, 0, cnt);
    /* every limit is drawn as a line in the plot, never pointed at */
    br_chart_take_limits(c, k, &lo, &hi);
    br_plot_frame(&p, s, x, y, PANEL_W, PANEL_H);
    br_plot_range(&p, tr->t[0], tr->t[tr->len - 1], lo, hi, 1);
    snprintf(title, sizeof title, "rail %s: ripple %s", st->name,
             br_plot_si(v, sizeof v, f->rail[k].ripple, 3, "V"));
    snprintf(key, sizeof key, "ripple-%s-%s", br_dir_short(f->dir), st->name);
    br_plot_axes(&p, key, title, "time", "s", "voltage", "V");
    br_chart_rail_limits(&p, c, k);
    if (st->aux.kind == BR_AUX_LDO)
        driver_supply(&p, tr, k, st->name);
    snprintf(key, sizeof key, "rail_%s_V", st->name);
    br_plot_line(&p, tr->t, tr->v + k, tr->len, tr->n, &S_RAIL, key);
    br_plot_done(&p);
}

int br_chart_ripple(const br_chain *c, const br_steady_figs *f, const br_trace *tr, int standalone,
                    br_text *out)
{
    br_svg s;
    br_plot p;
    char head[128];
    int cols = c->n > 1 ? 2 : 1;
    snprintf(head, sizeof head, "Steady state over two periods, %s", br_dir_label(f->dir));
    doc_begin(&s, out, cols * PANEL_W, grid_height(c->n, cols), standalone, head);
    heading(&s, head);
    br_plot_frame(&p, &s, 0, 0, 10, 10);
    double x = 12;
    x = br_plot_key(&p, x, KEY_Y, &S_RAIL, "rail");
    x = br_plot_key(&p, x, KEY_Y, &S_DRV, "driver supply");
    br_chart_limits_key(&p, x, KEY_Y);
    for (int k = 0; k < c->n && tr->len > 1; k++) {
        double px, py;
        panel_at(k, cols, &px, &py);
        ripple_panel(&s, c, f, tr, k, px, py);
    }
    return br_svg_end(&s);
}

/* ---- diode stress -------------------------------------------------------- */

int br_chart_worst_link(const br_chain *c, const br_steady_figs *f, int ndir, int *dir)
{
    int best = c->n > 1 ? 1 : 0;
    double worst = -HUGE_VAL;
    *dir = 0;
    for (int d = 0; d < ndir; d++)
        for (int k = 1; k < c->n; k++) {
            const br_link_fig *l = &f[d].link[k];
            double derated = l->vrrm * c->derating;
            /* share of the derated rating; unrated links rank by volts,
             * below every rated one */
            double score = derated > 0 ? l->vrev_stress / derated : -1e6 + l->vrev_stress;
            if (score > worst) {
                worst = score;
                best = k;
                *dir = d;
            }
        }
    return best;
}

static void diode_panel(br_svg *s, const br_chain *c, const br_steady_figs *f, int k,
                        const br_trace *tr, int which, double y)
{
    br_plot p;
    char title[160], key[64], lab[64], v[32], dp[32];
    const char *name = c->st[k].name;
    long cnt, a = br_trace_find(tr, tr->t[0], tr->t[0] + c->T, &cnt);
    const double *col = which ? tr->vr : tr->i;
    double lo = column_min(tr, col, k, a, cnt), hi = column_max_in(tr, col, k, a, cnt);
    if (!which) { /* the displacement current is drawn beside the forward current */
        lo = fmin(lo, column_min(tr, tr->j, k, a, cnt));
        hi = fmax(hi, column_max_in(tr, tr->j, k, a, cnt));
    }
    double vrrm = f->link[k].vrrm, derated = vrrm * c->derating;
    if (which && vrrm > 0) /* the rating and its derated value as lines in the plot */
        hi = fmax(hi, vrrm);
    lo = fmin(lo, 0.0);
    br_plot_frame(&p, s, 0, y, 2 * PANEL_W, PANEL_H);
    br_plot_range(&p, tr->t[a], tr->t[a + cnt - 1], lo, hi, 1);
    if (which)
        snprintf(title, sizeof title, "link %s: reverse voltage (peak with overshoot %s)", name,
                 br_plot_si(v, sizeof v, f->link[k].vrev_stress, 4, "V"));
    else
        snprintf(title, sizeof title,
                 "link %s: forward current (peak %s, RMS %s), displacement current (peak %s)", name,
                 br_plot_si(v, sizeof v, f->link[k].ipeak, 3, "A"),
                 br_plot_si(lab, sizeof lab, f->link[k].irms, 3, "A"),
                 br_plot_si(dp, sizeof dp, f->link[k].idisp, 3, "A"));
    snprintf(key, sizeof key, "diode-%s-%s-%s", br_dir_short(f->dir), name, which ? "vr" : "i");
    br_plot_axes(&p, key, title, "time", "s", which ? "reverse voltage" : "current",
                 which ? "V" : "A");
    if (which && vrrm > 0) {
        char rated[64];
        snprintf(rated, sizeof rated, "rating\n%s", br_plot_si(v, sizeof v, vrrm, 3, "V"));
        snprintf(lab, sizeof lab, "derated rating\n%s", br_plot_si(v, sizeof v, derated, 3, "V"));
        const double at[] = {vrrm, derated};
        const br_style *st[] = {&S_GATE, &S_DRIVE};
        const char *keys[] = {"rating", "derated-rating"}, *labs[] = {rated, lab};
        br_plot_limits(&p, 2, at, st, keys, labs);
    }
    if (!which) {
        snprintf(key, sizeof key, "disp_%s_A", name);
        br_plot_line(&p, tr->t + a, tr->j + a * tr->n + k, cnt, tr->n, &S_DISP, key);
    }
    snprintf(key, sizeof key, which ? "vrev_%s_V" : "link_%s_A", name);
    br_plot_line(&p, tr->t + a, col + a * tr->n + k, cnt, tr->n, &S_RAIL, key);
    br_plot_done(&p);
}

int br_chart_diode(const br_chain *c, const br_steady_figs *f, int k, const br_trace *tr,
                   int standalone, br_text *out)
{
    br_svg s;
    char head[128];
    snprintf(head, sizeof head, "Link %s over one period, %s (the most stressed diode)",
             c->st[k].name, br_dir_label(f->dir));
    doc_begin(&s, out, 2 * PANEL_W, HEAD_H + 2 * PANEL_H, standalone, head);
    heading(&s, head);
    br_plot p;
    br_plot_frame(&p, &s, 0, 0, 10, 10);
    double x = br_plot_key(&p, 12, KEY_Y, &S_RAIL, "forward current, reverse voltage");
    br_plot_key(&p, x, KEY_Y, &S_DISP, "displacement current (Cj dv/dt)");
    if (tr->len > 1 && k > 0) {
        diode_panel(&s, c, f, k, tr, 0, HEAD_H);
        diode_panel(&s, c, f, k, tr, 1, HEAD_H + PANEL_H);
    }
    return br_svg_end(&s);
}

/* ---- yield histogram ----------------------------------------------------- */

#define NBINS 30

/* Bars left of the limit fail, or only warn for a criterion that cannot
 * fail here (start-up dropouts of a design that states no limit). */
static void bars(br_plot *p, const long *cnt, double lo, double w, int warn_only)
{
    for (int b = 0; b < NBINS; b++) {
        if (!cnt[b])
            continue;
        double x0 = br_plot_px(p, lo + b * w), x1 = br_plot_px(p, lo + (b + 1) * w);
        double ytop = br_plot_py(p, (double)cnt[b]);
        int fails = lo + (b + 1) * w <= 0.0;
        br_svg_rect(p->svg, x0 + 0.5, ytop, fmax(x1 - x0 - 1.0, 0.5), p->y0 + p->h - ytop,
                    !fails      ? BR_BLUE
                    : warn_only ? BR_ORANGE
                                : BR_VERMILION,
                    "none", 0);
    }
}

static void histogram_panel(br_svg *s, const br_yield *y, int crit, double x, double yy)
{
    long cnt[NBINS] = {0}, peak = 1;
    double lo = HUGE_VAL, hi = -HUGE_VAL;
    for (long i = 0; i < y->n; i++) {
        const br_pt_row *r = &y->pts[i].row[crit];
        if (y->pts[i].status == BR_OK && r->applies && !r->undetermined && isfinite(r->margin)) {
            lo = fmin(lo, r->margin);
            hi = fmax(hi, r->margin);
        }
    }
    if (!(hi >= lo))
        return;
    /* the limit comes into view when it is near; far away it would
     * squash the distribution, and the title says none fail anyway */
    if (lo > 0 && lo < 1.5 * (hi - lo))
        lo = 0.0;
    if (hi - lo <= 0) {
        lo -= 0.5e-3 + 0.01 * fabs(lo);
        hi += 0.5e-3 + 0.01 * fabs(hi);
    }
    double w = (hi - lo) / NBINS;
    for (long i = 0; i < y->n; i++) {
        const br_pt_row *r = &y->pts[i].row[crit];
        if (y->pts[i].status == BR_OK && r->applies && !r->undetermined && isfinite(r->margin)) {
            int b = (int)fmin(NBINS - 1, floor((r->margin - lo) / w));
            cnt[b]++;
            peak = cnt[b] > peak ? cnt[b] : peak;
        }
    }
    br_plot p;
    char title[128], key[64];
    br_plot_frame(&p, s, x, yy, PANEL_W, PANEL_H);
    br_plot_range(&p, lo, hi, 0, 1.1 * (double)peak, 0);
    const br_yield_crit *yc = &y->c[crit];
    int warn_only = yc->fails == 0 && yc->warns > 0;
    char undet[48] = "";
    if (yc->undetermined > 0)
        snprintf(undet, sizeof undet, ", %ld undetermined", yc->undetermined);
    if (warn_only)
        snprintf(title, sizeof title, "%s: %ld of %ld warn%s", br_crit_title(crit), yc->warns,
                 yc->judged, undet);
    else
        snprintf(title, sizeof title, "%s: %ld of %ld fail%s", br_crit_title(crit), yc->fails,
                 yc->judged, undet);
    snprintf(key, sizeof key, "yield-%s", br_crit_name(crit));
    br_plot_axes(&p, key, title, "margin", br_crit_unit(crit), "samples", "");
    bars(&p, cnt, lo, w, warn_only);
    if (lo <= 0.0)
        br_plot_vline(&p, 0.0, &S_FAILS, "limit");
    else
        br_svg_text_in(s, p.x0 + 6, p.y0 + 16, BR_FONT_TICK, "start", BR_VERMILION, 1,
                       "\xe2\x86\x90 limit (0) far to the left");
    br_plot_done(&p);
}

int br_chart_yield(const br_yield *y, int standalone, br_text *out)
{
    int crits[BR_CRIT_COUNT], n = 0;
    for (int i = 0; i < BR_CRIT_COUNT; i++) /* a status has no margin to histogram */
        if (y->c[i].applies && y->c[i].judged > 0 && y->c[i].has_margin)
            crits[n++] = i;
    br_svg s;
    char head[160];
    snprintf(head, sizeof head,
             "Monte Carlo margins, %ld samples (seed %lu): blue passes, vermillion fails", y->n,
             y->seed);
    doc_begin(&s, out, 2 * PANEL_W, grid_height(n > 0 ? n : 1, 2), standalone, head);
    heading(&s, head);
    for (int i = 0; i < n; i++) {
        double x, yy;
        panel_at(i, 2, &x, &yy);
        histogram_panel(&s, y, crits[i], x, yy);
    }
    return br_svg_end(&s);
}

/* ---- hold window --------------------------------------------------------- */

/* The value of scan point i on the sweep's axis, as plotted (duty in %). */
static double scan_x(const br_sweep *sw, int i)
{
    const br_hold_point *pt = &sw->scan[i];
    switch (sw->axis) {
    case BR_AXIS_FSW:
        return pt->fsw;
    case BR_AXIS_IPK:
        return pt->ipk;
    case BR_AXIS_FLINE:
        return pt->fline;
    default:
        return 100.0 * pt->duty;
    }
}

/* The limits the search found (not the ends of the range scanned): a
 * marker at each end of every interval where the chain holds, labelled
 * with its value. */
static void limit_marks(br_plot *p, const br_sweep *sw, double k, const char *unit)
{
    static const br_style S_LIMIT = {BR_VERMILION, "6 3", 1.6};
    for (int i = 0; i < sw->nspans; i++) {
        const br_limit *ends[2] = {&sw->span[i].lo, &sw->span[i].hi};
        for (int e = 0; e < 2; e++) {
            if (ends[e]->kind != BR_LIMIT_FOUND)
                continue;
            char v[32], lab[64];
            double x = k * ends[e]->value;
            if (unit[0] == '%')
                snprintf(v, sizeof v, "%.3g %%", x);
            else
                br_plot_si(v, sizeof v, x, 4, unit);
            snprintf(lab, sizeof lab, "%s %s", e ? "holds to" : "holds from", v);
            br_plot_mark(p, x, &S_LIMIT, "found-limit", lab);
        }
    }
}

static void sweep_panel(br_svg *s, const br_sweep *sw, double y)
{
    static const char *const key[] = {"window-duty", "window-fsw", "window-ipk", "window-fline"};
    static const char *const title[] = {"worst margin against duty",
                                        "worst margin against switching frequency",
                                        "worst margin against the line cycle's peak current",
                                        "worst margin against the line frequency"};
    static const char *const label[] = {"duty", "switching frequency", "peak current",
                                        "line frequency"};
    static const char *const unit[] = {"%", "Hz", "A", "Hz"};
    static const char *const series[] = {"margin_vs_duty_V", "margin_vs_fsw_V", "margin_vs_ipk_V",
                                         "margin_vs_fline_V"};
    double x[BR_MAX_SCAN], m[BR_MAX_SCAN], lo = 0.0, hi = 0.0;
    int a = sw->axis >= 0 && sw->axis <= BR_AXIS_FLINE ? sw->axis : 0;
    for (int i = 0; i < sw->nscan; i++) {
        x[i] = scan_x(sw, i);
        m[i] = sw->scan[i].margin;
        if (isfinite(m[i])) {
            lo = fmin(lo, m[i]);
            hi = fmax(hi, m[i]);
        }
    }
    br_plot p;
    br_plot_frame(&p, s, 0, y, 2 * PANEL_W, PANEL_H);
    p.xlog = (a == BR_AXIS_FSW || a == BR_AXIS_FLINE) && sw->lo > 0;
    double k = a == BR_AXIS_DUTY ? 100.0 : 1.0;
    br_plot_range(&p, k * sw->lo, k * sw->hi, lo, hi, 1);
    br_plot_axes(&p, key[a], title[a], label[a], unit[a], "margin", "V");
    br_plot_hline(&p, 0.0, &S_FAILS, "fails below");
    br_plot_line(&p, x, m, sw->nscan, 1, &S_RAIL, series[a]);
    for (int i = 0; i < sw->nscan; i++)
        if (isfinite(m[i]))
            br_svg_circle(s, br_plot_px(&p, x[i]), br_plot_py(&p, m[i]), 3.0,
                          sw->scan[i].holds ? BR_BLUE : BR_VERMILION, "none", 0);
    br_plot_mark(&p, k * sw->design, &S_START, "design", "design");
    limit_marks(&p, sw, k, unit[a]);
    br_plot_done(&p);
}

int br_chart_window(const br_window *w, int standalone, br_text *out)
{
    br_svg s;
    const br_sweep *sw[2] = {w->line ? &w->ipk : &w->duty, w->line ? &w->fline : &w->fsw};
    int n = 0;
    for (int i = 0; i < 2; i++)
        n += sw[i]->applies && sw[i]->nscan > 1;
    doc_begin(&s, out, 2 * PANEL_W, HEAD_H + PANEL_H * (n ? n : 1), standalone,
              "Hold window: worst margin along each axis");
    heading(&s, "Hold window: worst margin of the coarse scans");
    double y = HEAD_H;
    for (int i = 0; i < 2; i++)
        if (sw[i]->applies && sw[i]->nscan > 1) {
            sweep_panel(&s, sw[i], y);
            y += PANEL_H;
        }
    if (n == 0)
        br_svg_text_in(&s, 20, HEAD_H + 40, BR_FONT_LABEL, "start", BR_INK, 0,
                       "no scan to show: the design's switches have no duty to move");
    return br_svg_end(&s);
}

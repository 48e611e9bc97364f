/* map_report.c - the hold map as a summary, CSV and an SVG heat map. */
#include "report/map_report.h"

#include "core/error.h"
#include "report/caution.h"
#include "report/fmt.h"
#include "report/report_common.h"
#include "report/svg.h"
#include "report/table.h"
#include "report/window_report.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

static int oom(br_error *err, const char *what)
{
    return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory writing the %s", what);
}

static const char *pct(double duty, char *buf, size_t cap)
{
    snprintf(buf, cap, "%.2f %%", 100.0 * duty);
    return buf;
}

static int is_judged(const br_hold_point *pt)
{
    return pt->crit != BR_MAP_NO_ONTIME && !isnan(pt->margin);
}

/* ---- text ------------------------------------------------------------------ */

static int grid_line(const br_map *m, br_text *out)
{
    char a[32], b[32], f0[32], f1[32];
    return br_text_printf(out, "grid: duty %s to %s (%d), frequency %s to %s (%d, equal ratios)\n",
                          pct(m->duty[0], a, sizeof a), pct(m->duty[m->nduty - 1], b, sizeof b),
                          m->nduty, br_fmt_si(f0, sizeof f0, m->fsw[0], 4, "Hz"),
                          br_fmt_si(f1, sizeof f1, m->fsw[m->nfsw - 1], 4, "Hz"), m->nfsw);
}

static int counts_line(const br_map *m, br_text *out)
{
    int n = m->nduty * m->nfsw, hold = 0, fail = 0, lost = 0, none = 0;
    for (int k = 0; k < n; k++) {
        const br_hold_point *pt = &m->pt[k];
        if (pt->crit == BR_MAP_NO_ONTIME)
            none++;
        else if (isnan(pt->margin))
            lost++;
        else if (pt->holds)
            hold++;
        else
            fail++;
    }
    return br_text_printf(out,
                          "  %d points: %d hold, %d fail, %d with no periodic steady state found, "
                          "%d with no on-time\n",
                          n, hold, fail, lost, none);
}

/* "design point: holds, margin 575 mV at duty 50.00 %, 100 kHz (what)" */
static int point_line(const br_chain *c, const char *lead, const br_hold_point *pt, br_text *out)
{
    char d[32], f[32], m[32], w[128];
    return br_text_printf(out, "%s %s at duty %s, %s (%s)\n", lead,
                          br_fmt_si(m, sizeof m, pt->margin, 4, "V"), pct(pt->duty, d, sizeof d),
                          br_fmt_si(f, sizeof f, pt->fsw, 4, "Hz"),
                          br_hold_words(c, pt, w, sizeof w));
}

static int extremes(const br_chain *c, const br_map *m, br_text *out)
{
    const br_hold_point *lo = NULL, *hi = NULL;
    for (int k = 0; k < m->nduty * m->nfsw; k++) {
        const br_hold_point *pt = &m->pt[k];
        if (!is_judged(pt))
            continue;
        if (!lo || pt->margin < lo->margin)
            lo = pt;
        if (!hi || pt->margin > hi->margin)
            hi = pt;
    }
    if (!lo)
        return br_text_put(out, "no grid point has a periodic steady state\n");
    return point_line(c, "smallest margin", lo, out) | point_line(c, "largest margin ", hi, out);
}

/* Failing points by what fails there, most frequent first. */
typedef struct tally {
    int crit, stage, count;
} tally;

static int tally_add(tally *t, int n, const br_hold_point *pt)
{
    for (int i = 0; i < n; i++)
        if (t[i].crit == pt->crit && t[i].stage == pt->stage) {
            t[i].count++;
            return n;
        }
    t[n] = (tally){pt->crit, pt->stage, 1};
    return n + 1;
}

static int failures(const br_chain *c, const br_map *m, br_text *out)
{
    tally t[3 * BR_MAX_SWITCHES + 4];
    int nt = 0;
    for (int k = 0; k < m->nduty * m->nfsw; k++)
        if (is_judged(&m->pt[k]) && !m->pt[k].holds)
            nt = tally_add(t, nt, &m->pt[k]);
    if (nt == 0)
        return BR_OK;
    for (int i = 1; i < nt; i++) /* insertion sort: a handful of entries */
        for (int j = i; j > 0 && t[j].count > t[j - 1].count; j--) {
            tally x = t[j];
            t[j] = t[j - 1];
            t[j - 1] = x;
        }
    br_table *tb = br_table_create(2, nt);
    if (!tb)
        return BR_ENOMEM;
    br_table_head(tb, 0, "what fails (smallest margin)", BR_LEFT);
    br_table_head(tb, 1, "points", BR_RIGHT);
    for (int i = 0; i < nt; i++) {
        br_hold_point pt = {.crit = t[i].crit, .stage = t[i].stage, .dir = BR_DIRI_NONE};
        char w[BR_TABLE_CELL];
        br_hold_words(c, &pt, w, sizeof w);
        char *cut = strstr(w, ", idealised"); /* the count spans directions */
        if (cut)
            *cut = '\0';
        br_table_row(tb);
        br_table_set(tb, 0, "%s", w);
        br_table_set(tb, 1, "%d", t[i].count);
    }
    int rc = br_text_put(out, "where a criterion fails:\n") | br_table_render(tb, 2, out);
    br_table_free(tb);
    return rc;
}

/* The holding run through the design's nearest point along a row or a
 * column: "holds from A to B". */
static int line_text(const br_map *m, int along_duty, br_text *out)
{
    int n = along_duty ? m->nduty : m->nfsw, at = along_duty ? m->col0 : m->row0;
#define PT(k) (along_duty ? br_map_at(m, (k), m->row0) : br_map_at(m, m->col0, (k)))
    char a[32], b[32], f[32];
    if (along_duty)
        br_text_printf(
            out, "row nearest the design, %s: ", br_fmt_si(f, sizeof f, m->fsw[m->row0], 4, "Hz"));
    else
        br_text_printf(out,
                       "column nearest the design, duty %s: ", pct(m->duty[m->col0], f, sizeof f));
    if (!PT(at)->holds)
        return br_text_put(out, "fails at the grid point nearest the design\n");
    int lo = at, hi = at;
    while (lo > 0 && PT(lo - 1)->holds)
        lo--;
    while (hi < n - 1 && PT(hi + 1)->holds)
        hi++;
    double vlo = along_duty ? m->duty[lo] : m->fsw[lo], vhi = along_duty ? m->duty[hi] : m->fsw[hi];
#undef PT
    return br_text_printf(out, "holds from %s%s to %s%s\n",
                          along_duty ? pct(vlo, a, sizeof a) : br_fmt_si(a, sizeof a, vlo, 4, "Hz"),
                          lo == 0 ? " (grid end)" : "",
                          along_duty ? pct(vhi, b, sizeof b) : br_fmt_si(b, sizeof b, vhi, 4, "Hz"),
                          hi == n - 1 ? " (grid end)" : "");
}

int br_map_text(const br_chain *c, const br_map *m, const char *csv, const char *svg, br_text *out,
                br_error *err)
{
    int rc = br_report_heading(c, "hold map", out);
    rc |= grid_line(m, out);
    rc |= counts_line(m, out);
    if (isnan(m->design.margin)) /* not settled: neither holds nor fails */
        rc |= br_text_put(out, "design point: UNDETERMINED, the solver found no periodic steady "
                               "state there\n");
    else
        rc |= point_line(
            c, m->design.holds ? "design point: holds, margin" : "design point: FAILS, margin",
            &m->design, out);
    rc |= extremes(c, m, out);
    rc |= line_text(m, 1, out);
    rc |= line_text(m, 0, out);
    rc |= failures(c, m, out);
    if (csv || svg)
        rc |= br_text_printf(out, "written:%s%s%s%s\n", csv ? " CSV " : "", csv ? csv : "",
                             svg ? " SVG " : "", svg ? svg : "");
    rc |= br_text_printf(out, "computed on %d thread%s, %ld periods simulated\n", m->threads,
                         m->threads == 1 ? "" : "s", m->periods);
    rc |= br_report_caution(out);
    return rc ? oom(err, "map report") : BR_OK;
}

/* ---- CSV ------------------------------------------------------------------- */

static int csv_row(const br_chain *c, const br_hold_point *pt, br_text *out)
{
    int rc = br_text_printf(out, "%.9g,%.9g,", pt->duty, pt->fsw);
    if (is_judged(pt) && isfinite(pt->margin)) /* empty, never "nan" */
        rc |= br_text_printf(out, "%.9g", pt->margin);
    rc |= br_text_printf(out, ",%d,", pt->holds);
    if (pt->stage >= 0 && pt->stage < c->n)
        rc |= br_text_printf(out, "%d,%s", pt->stage, c->st[pt->stage].name);
    else
        rc |= br_text_put(out, ",");
    rc |= br_text_printf(out, ",%s,", br_hold_crit_name(pt));
    if (pt->stage >= 0 && pt->stage < c->n)
        rc |= br_text_put(out, br_dir_label(pt->dir));
    return rc | br_text_put(out, "\n");
}

int br_map_csv(const br_chain *c, const br_map *m, br_text *out, br_error *err)
{
    int rc = br_text_put(out, "duty,fsw_Hz,margin_V,holds,stage,switch,criterion,direction\n");
    for (int j = 0; j < m->nfsw; j++)
        for (int i = 0; i < m->nduty; i++)
            rc |= csv_row(c, br_map_at(m, i, j), out);
    return rc ? oom(err, "map CSV") : BR_OK;
}

/* ---- SVG ------------------------------------------------------------------- */

/* Plot geometry: the cells' outer edges in data units, and the frame. */
typedef struct frame {
    double x0, y0, w, h;   /* plot area, px */
    double dlo, dhi;       /* duty at the left and right edges */
    double llo, lhi;       /* ln fsw at the bottom and top edges */
    double half_d, half_l; /* half a cell */
    double mlo, mhi;       /* colour scale: most negative and most positive margin */
} frame;

static double px(const frame *f, double duty)
{
    return f->x0 + f->w * (duty - f->dlo) / (f->dhi - f->dlo);
}
static double py(const frame *f, double fsw)
{
    return f->y0 + f->h * (1.0 - (log(fsw) - f->llo) / (f->lhi - f->llo));
}

static void frame_of(const br_map *m, frame *f)
{
    f->x0 = 95;
    f->y0 = 62;
    f->w = 520;
    f->h = 420;
    f->half_d = m->nduty > 1 ? 0.5 * (m->duty[1] - m->duty[0]) : 0.01;
    f->half_l = m->nfsw > 1 ? 0.5 * log(m->fsw[1] / m->fsw[0]) : log(1.05);
    f->dlo = m->duty[0] - f->half_d;
    f->dhi = m->duty[m->nduty - 1] + f->half_d;
    f->llo = log(m->fsw[0]) - f->half_l;
    f->lhi = log(m->fsw[m->nfsw - 1]) + f->half_l;
    f->mlo = f->mhi = 0.0;
    for (int k = 0; k < m->nduty * m->nfsw; k++)
        if (is_judged(&m->pt[k])) {
            f->mlo = fmin(f->mlo, m->pt[k].margin);
            f->mhi = fmax(f->mhi, m->pt[k].margin);
        }
}

/* Colour scale position: each sign has its own range, so that a small
 * failing margin next to large holding ones still shows. */
static double scale_t(const frame *f, double margin)
{
    if (margin >= 0)
        return f->mhi > 0 ? fmax(margin / f->mhi, 1e-6) : 1e-6;
    return f->mlo < 0 ? -margin / f->mlo : -1.0;
}

#define GREY_LOST "#6e6e6e"
#define GREY_NONE "#d4d4d4"

static void cells(br_svg *s, const br_map *m, const frame *f)
{
    char col[16];
    for (int j = 0; j < m->nfsw; j++)
        for (int i = 0; i < m->nduty; i++) {
            const br_hold_point *pt = br_map_at(m, i, j);
            const char *fill = pt->crit == BR_MAP_NO_ONTIME ? GREY_NONE
                               : isnan(pt->margin)
                                   ? GREY_LOST
                                   : br_svg_diverging(scale_t(f, pt->margin), col, sizeof col);
            double x = px(f, m->duty[i] - f->half_d), x1 = px(f, m->duty[i] + f->half_d);
            double y = py(f, m->fsw[j] * exp(f->half_l)), y1 = py(f, m->fsw[j] / exp(f->half_l));
            /* a hair of overlap hides the seams some renderers leave */
            br_svg_rect(s, x, y, x1 - x + 0.3, y1 - y + 0.3, fill, "none", 0);
        }
}

/* Black edges between a holding cell and its non-holding neighbour. */
static void boundary(br_svg *s, const br_map *m, const frame *f)
{
    for (int j = 0; j < m->nfsw; j++)
        for (int i = 0; i < m->nduty; i++) {
            int h = br_map_at(m, i, j)->holds;
            double xr = px(f, m->duty[i] + f->half_d);
            double yt = py(f, m->fsw[j] * exp(f->half_l)), yb = py(f, m->fsw[j] / exp(f->half_l));
            if (i + 1 < m->nduty && br_map_at(m, i + 1, j)->holds != h)
                br_svg_line(s, xr, yt, xr, yb, "black", 2);
            if (j + 1 < m->nfsw && br_map_at(m, i, j + 1)->holds != h)
                br_svg_line(s, px(f, m->duty[i] - f->half_d), yt, xr, yt, "black", 2);
        }
}

/* Duty ticks every 1, 2, 5, 10, 20 or 25 % so that there are at most 10. */
static void duty_ticks(br_svg *s, const frame *f)
{
    static const double steps[] = {0.01, 0.02, 0.05, 0.1, 0.2, 0.25};
    double step = 0.25;
    for (int i = 0; i < 6; i++)
        if ((f->dhi - f->dlo) / steps[i] <= 10) {
            step = steps[i];
            break;
        }
    for (double d = ceil(f->dlo / step - 1e-9) * step; d <= f->dhi + 1e-12; d += step) {
        char b[32];
        double x = px(f, d);
        br_svg_line(s, x, f->y0 + f->h, x, f->y0 + f->h + 5, "black", 1);
        snprintf(b, sizeof b, "%.0f %%", 100.0 * d);
        br_svg_text(s, x, f->y0 + f->h + 19, 12, "middle", 0, b);
    }
}

/* Frequency ticks at 1, 2 and 5 times the decades (only the decades when
 * those would crowd). */
static void fsw_ticks(br_svg *s, const frame *f)
{
    double lo = exp(f->llo), hi = exp(f->lhi);
    int decades = (int)ceil(log10(hi)) - (int)floor(log10(lo));
    int per = decades > 4 ? 1 : 3;
    static const double mult[] = {1, 2, 5};
    for (int e = (int)floor(log10(lo)); e <= (int)ceil(log10(hi)); e++)
        for (int k = 0; k < per; k++) {
            double v = mult[k] * pow(10.0, e);
            if (v < lo || v > hi)
                continue;
            char b[32];
            double y = py(f, v);
            br_svg_line(s, f->x0 - 5, y, f->x0, y, "black", 1);
            br_svg_text(s, f->x0 - 8, y + 4, 12, "end", 0, br_fmt_si(b, sizeof b, v, 3, "Hz"));
        }
}

/* A label of the colour bar: where (0 bottom, 1 top) and what margin. */
typedef struct bar_label {
    double u, v;
} bar_label;

static void colour_bar(br_svg *s, const frame *f)
{
    const double x = 650, w = 18, top = f->y0, h = f->h;
    int has_neg = f->mlo<0, has_pos = f->mhi> 0 || !has_neg;
    double split = has_neg && has_pos ? 0.5 : has_neg ? 1.0 : 0.0; /* share of the bar below 0 */
    const int steps = 60;
    char col[16], b[32];
    for (int i = 0; i < steps; i++) {
        double u = (i + 0.5) / steps; /* 0 at the bottom */
        double t = u < split ? -(split - u) / split : (u - split) / (1.0 - split);
        br_svg_rect(s, x, top + h * (1.0 - (double)(i + 1) / steps), w, h / steps + 0.3,
                    br_svg_diverging(t, col, sizeof col), "none", 0);
    }
    br_svg_rect(s, x, top, w, h, "none", "black", 1);
    bar_label lab[5];
    int nl = 0;
    if (has_neg) {
        lab[nl++] = (bar_label){0.0, f->mlo};
        lab[nl++] = (bar_label){0.5 * split, 0.5 * f->mlo};
    }
    lab[nl++] = (bar_label){split, 0.0};
    if (has_pos && f->mhi > 0) {
        lab[nl++] = (bar_label){split + 0.5 * (1.0 - split), 0.5 * f->mhi};
        lab[nl++] = (bar_label){1.0, f->mhi};
    }
    for (int i = 0; i < nl; i++) {
        double y = top + h * (1.0 - lab[i].u);
        br_svg_line(s, x + w, y, x + w + 4, y, "black", 1);
        br_svg_text(s, x + w + 7, y + 4, 12, "start", 0, br_fmt_si(b, sizeof b, lab[i].v, 3, "V"));
    }
    br_svg_text(s, x + w / 2, top - 10, 12, "middle", 0, "margin");
}

static void legend(br_svg *s, const frame *f)
{
    double y = f->y0 + f->h + 50;
    br_svg_rect(s, f->x0, y, 14, 14, GREY_LOST, "black", 0.5);
    br_svg_text(s, f->x0 + 20, y + 11, 12, "start", 0, "no periodic steady state found");
    br_svg_rect(s, f->x0 + 230, y, 14, 14, GREY_NONE, "black", 0.5);
    br_svg_text(s, f->x0 + 250, y + 11, 12, "start", 0, "no on-time (dead time)");
    br_svg_line(s, f->x0 + 420, y + 7, f->x0 + 440, y + 7, "black", 2);
    br_svg_text(s, f->x0 + 446, y + 11, 12, "start", 0, "edge of holding");
}

static void design_mark(br_svg *s, const br_map *m, const frame *f)
{
    double d = m->design.duty, lf = log(m->design.fsw);
    if (d < f->dlo || d > f->dhi || lf < f->llo || lf > f->lhi)
        return;
    double x = px(f, d), y = py(f, m->design.fsw);
    br_svg_circle(s, x, y, 6, "white", "black", 2);
    br_svg_line(s, x - 3, y, x + 3, y, "black", 1.5);
    br_svg_line(s, x, y - 3, x, y + 3, "black", 1.5);
    /* a white tag keeps the label readable on the darkest colours */
    br_svg_rect(s, x + 7, y - 21, 46, 17, "white", "black", 0.75);
    br_svg_text(s, x + 10, y - 8, 12, "start", 0, "design");
}

static void titles(br_svg *s, const br_chain *c, const frame *f)
{
    char t[200];
    snprintf(t, sizeof t, "worst steady-state margin of design %s",
             c->design && c->design->name[0] ? c->design->name : "(unnamed)");
    br_svg_text(s, f->x0, 24, 16, "start", 0, t);
    br_svg_text(s, f->x0, 44, 12, "start", 0,
                "below 0 V a criterion fails (UVLO falling, minimum drive, gate maximum)");
    br_svg_text(s, f->x0 + f->w / 2, f->y0 + f->h + 38, 13, "middle", 0, "duty");
    br_svg_text(s, 22, f->y0 + f->h / 2, 13, "middle", -90, "switching frequency");
}

int br_map_svg(const br_chain *c, const br_map *m, br_text *out, br_error *err)
{
    frame f;
    frame_of(m, &f);
    br_svg s;
    br_svg_begin(&s, out, 760, 590);
    titles(&s, c, &f);
    cells(&s, m, &f);
    boundary(&s, m, &f);
    br_svg_rect(&s, f.x0, f.y0, f.w, f.h, "none", "black", 1);
    duty_ticks(&s, &f);
    fsw_ticks(&s, &f);
    colour_bar(&s, &f);
    legend(&s, &f);
    design_mark(&s, m, &f);
    /* a figure travels without its report: it carries the caution too */
    br_svg_text(&s, f.x0, 568, 10, "start", 0,
                "Caution: a design aid computed from a model and the values in the design file; "
                "no substitute for measurement,");
    br_svg_text(&s, f.x0, 581, 10, "start", 0,
                "the parts' own data, safety standards, local codes or licensed engineering "
                "practice. These circuits carry lethal voltages.");
    return br_svg_end(&s) != BR_OK ? oom(err, "map SVG") : BR_OK;
}

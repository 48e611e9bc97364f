/* plot.c - axes, ticks and decimated data lines. */
#include "report/plot.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

/* Space around the plot area inside a panel, px: the title and under it
 * a strip for the labels of vertical markers above, tick labels and the x
 * title below, tick labels and the y title on the left, room for the
 * labels of limit lines on the right.  No label is drawn inside the plot
 * area, where it could hide a trace. */
#define PAD_TOP 50.0
#define PAD_BOTTOM 46.0
#define PAD_LEFT 74.0
#define PAD_RIGHT 215.0
#define STRIP_BASE 7.0 /* marker labels' baseline above the plot area, px */
#define LINE_H 14.0    /* one line of label text, px */
#define CHAR_W 8.2     /* a character of 13 px bold text, px, generously */

br_style br_plot_style(int i)
{
    static const char *const colour[] = {BR_BLUE,   BR_VERMILION, BR_GREEN, BR_PURPLE,
                                         BR_ORANGE, BR_SKY,       "#000000"};
    static const char *const dash[] = {NULL, "8 4", "2 3", "10 3 2 3"};
    /* (colour, dash) pairs differ for the first 28 styles */
    br_style st = {colour[i % 7], dash[(i % 7 + i / 7) % 4], 2.0};
    return st;
}

void br_plot_frame(br_plot *p, br_svg *s, double x, double y, double w, double h)
{
    memset(p, 0, sizeof *p);
    p->svg = s;
    p->fx = x;
    p->fy = y;
    p->fw = w;
    p->fh = h;
    p->x0 = x + PAD_LEFT;
    p->y0 = y + PAD_TOP;
    p->w = w - PAD_LEFT - PAD_RIGHT;
    p->h = h - PAD_TOP - PAD_BOTTOM;
    p->xmin = 0.0;
    p->xmax = p->ymax = 1.0;
}

void br_plot_range(br_plot *p, double xmin, double xmax, double ymin, double ymax, int pad)
{
    if (!(xmax > xmin))
        xmax = xmin + (xmin != 0.0 ? fabs(xmin) * 1e-3 : 1.0);
    if (pad) {
        /* a flat line still gets a range: 1 % of its level, or 1 mV */
        double span = ymax - ymin, floor_span = fmax(0.01 * fmax(fabs(ymin), fabs(ymax)), 1e-3);
        if (span < floor_span) {
            double mid = 0.5 * (ymin + ymax);
            ymin = mid - 0.5 * floor_span;
            ymax = mid + 0.5 * floor_span;
            span = floor_span;
        }
        ymin -= 0.06 * span;
        ymax += 0.06 * span;
    }
    if (!(ymax > ymin))
        ymax = ymin + 1.0;
    p->xmin = xmin;
    p->xmax = xmax;
    p->ymin = ymin;
    p->ymax = ymax;
}

double br_plot_px(const br_plot *p, double x)
{
    if (p->xlog)
        return p->x0 + log(x / p->xmin) / log(p->xmax / p->xmin) * p->w;
    return p->x0 + (x - p->xmin) / (p->xmax - p->xmin) * p->w;
}

double br_plot_py(const br_plot *p, double y)
{
    return p->y0 + (p->ymax - y) / (p->ymax - p->ymin) * p->h;
}

double br_plot_x_of(const br_plot *p, double px)
{
    if (p->xlog)
        return p->xmin * exp((px - p->x0) / p->w * log(p->xmax / p->xmin));
    return p->xmin + (px - p->x0) / p->w * (p->xmax - p->xmin);
}

double br_plot_y_of(const br_plot *p, double py)
{
    return p->ymax - (py - p->y0) / p->h * (p->ymax - p->ymin);
}

const char *br_plot_unit(const br_scale *sc, char *buf, size_t cap)
{
    /* the formatter writes "u" for micro (ASCII for terminals) */
    if (sc->unit[0] == 'u' && sc->unit[1])
        snprintf(buf, cap, "\xc2\xb5%s", sc->unit + 1);
    else
        snprintf(buf, cap, "%s", sc->unit);
    return buf;
}

/* "12.3 us" -> "12.3 µs": a "u" starting the unit after the number. */
static const char *micro(char *buf, size_t cap)
{
    char *sp = strrchr(buf, ' ');
    if (!sp || sp == buf || sp[1] != 'u' || !sp[2] || strlen(buf) + 2 >= cap)
        return buf;
    memmove(sp + 3, sp + 2, strlen(sp + 2) + 1);
    sp[1] = '\xc2';
    sp[2] = '\xb5';
    return buf;
}

const char *br_plot_si(char *buf, size_t cap, double v, int digits, const char *unit)
{
    return micro((char *)br_fmt_si(buf, cap, v, digits, unit), cap);
}

const char *br_plot_time(char *buf, size_t cap, double t)
{
    return micro((char *)br_fmt_time(buf, cap, t), cap);
}

double br_plot_step(double span, int want)
{
    double raw = span / (want > 0 ? want : 1);
    double mag = pow(10.0, floor(log10(raw)));
    double f = raw / mag;
    return (f < 1.5 ? 1.0 : f < 3.5 ? 2.0 : f < 7.5 ? 5.0 : 10.0) * mag;
}

/* Decimals that tell ticks `step` apart once scaled by factor. */
static int tick_decimals(double step, double factor)
{
    double s = step * factor;
    int d = 0;
    while (d < 6 && fabs(s * pow(10.0, d) - round(s * pow(10.0, d))) > 1e-6 * pow(10.0, d))
        d++;
    return d;
}

/* The scale for an axis: from its largest magnitude, and never so coarse
 * that the tick labels need more than three decimals. */
static br_scale axis_scale(double lo, double hi, double step, const char *unit)
{
    /* counts, shares and angles take no prefix */
    if (!unit[0] || strcmp(unit, "%") == 0 || strcmp(unit, "deg") == 0) {
        br_scale plain = {1.0, ""};
        snprintf(plain.unit, sizeof plain.unit, "%s", unit);
        return plain;
    }
    br_scale sc = br_scale_for(fmax(fabs(lo), fabs(hi)), unit);
    if (tick_decimals(step, sc.factor) > 3)
        sc = br_scale_for(step, unit);
    return sc;
}

static void axis_title(char *buf, size_t cap, const char *label, const br_scale *sc)
{
    char u[24];
    br_plot_unit(sc, u, sizeof u);
    if (u[0])
        snprintf(buf, cap, "%s (%s)", label, u);
    else
        snprintf(buf, cap, "%s", label);
}

/* The ticks of one axis: positions along it (px) and their labels. */
typedef struct ticks {
    int n;
    double at[40];
    char label[40][64];
} ticks;

static void tick_add(ticks *t, double at, const char *label)
{
    if (t->n >= 40)
        return;
    t->at[t->n] = at;
    snprintf(t->label[t->n], sizeof t->label[t->n], "%s", label);
    t->n++;
}

/* One path for the grid lines, one for the tick marks, one group for the
 * labels: a panel stays a few kilobytes. */
static void draw_ticks(br_plot *p, const ticks *t, int xaxis)
{
    br_text *o = p->svg->out;
    int rc =
        br_text_printf(o, "<path fill=\"none\" stroke=\"%s\" stroke-width=\"1\" d=\"", BR_GRID);
    for (int i = 0; i < t->n; i++)
        rc |= xaxis ? br_text_printf(o, "M%.1f %.1fV%.1f", t->at[i], p->y0, p->y0 + p->h)
                    : br_text_printf(o, "M%.1f %.1fH%.1f", p->x0, t->at[i], p->x0 + p->w);
    rc |= br_text_printf(o, "\"/>\n<path fill=\"none\" stroke=\"%s\" stroke-width=\"1\" d=\"",
                         BR_INK);
    for (int i = 0; i < t->n; i++)
        rc |= xaxis ? br_text_printf(o, "M%.1f %.1fv5", t->at[i], p->y0 + p->h)
                    : br_text_printf(o, "M%.1f %.1fh5", p->x0 - 5, t->at[i]);
    rc |= br_text_printf(o, "\"/>\n<g font-size=\"%.0f\" fill=\"%s\" text-anchor=\"%s\">\n",
                         BR_FONT_TICK, BR_INK, xaxis ? "middle" : "end");
    for (int i = 0; i < t->n; i++) {
        rc |= xaxis ? br_text_printf(o, "<text x=\"%.1f\" y=\"%.1f\">", t->at[i], p->y0 + p->h + 19)
                    : br_text_printf(o, "<text x=\"%.1f\" y=\"%.1f\">", p->x0 - 8, t->at[i] + 4.5);
        rc |= br_xml_escape_put(o, t->label[i]);
        rc |= br_text_put(o, "</text>\n");
    }
    rc |= br_text_put(o, "</g>\n");
    if (rc)
        p->svg->failed = 1;
}

/* 1, 2 and 5 of every decade, each labelled with its own prefix. */
static void x_ticks_log(br_plot *p, const char *xlabel, const char *xunit)
{
    char b[64], u[24];
    ticks t = {0};
    for (double dec = pow(10.0, floor(log10(p->xmin))); dec <= p->xmax; dec *= 10.0)
        for (int m = 1; m <= 5; m += m == 1 ? 1 : 3) {
            double v = m * dec;
            if (v < p->xmin * (1 - 1e-9) || v > p->xmax * (1 + 1e-9))
                continue;
            br_scale sc = br_scale_for(v, xunit);
            snprintf(b, sizeof b, "%g %s", v * sc.factor, br_plot_unit(&sc, u, sizeof u));
            tick_add(&t, br_plot_px(p, v), b);
        }
    draw_ticks(p, &t, 1);
    br_svg_text_in(p->svg, p->x0 + p->w / 2, p->y0 + p->h + 38, BR_FONT_LABEL, "middle", BR_INK, 0,
                   xlabel);
}

static void x_ticks(br_plot *p, const char *xlabel, const char *xunit)
{
    if (p->xlog) {
        x_ticks_log(p, xlabel, xunit);
        return;
    }
    double step = br_plot_step(p->xmax - p->xmin, p->w > 400 ? 8 : 5);
    br_scale sc = axis_scale(p->xmin, p->xmax, step, xunit);
    int dec = tick_decimals(step, sc.factor);
    char b[64];
    ticks t = {0};
    for (double v = ceil(p->xmin / step - 1e-9) * step; v <= p->xmax + 1e-9 * step; v += step)
        tick_add(&t, br_plot_px(p, v), br_fmt_in(b, sizeof b, v, &sc, dec));
    draw_ticks(p, &t, 1);
    axis_title(b, sizeof b, xlabel, &sc);
    br_svg_text_in(p->svg, p->x0 + p->w / 2, p->y0 + p->h + 38, BR_FONT_LABEL, "middle", BR_INK, 0,
                   b);
}

static void y_ticks(br_plot *p, const char *ylabel, const char *yunit)
{
    double step = br_plot_step(p->ymax - p->ymin, p->h > 200 ? 6 : 4);
    br_scale sc = axis_scale(p->ymin, p->ymax, step, yunit);
    int dec = tick_decimals(step, sc.factor);
    char b[64];
    ticks t = {0};
    for (double v = ceil(p->ymin / step - 1e-9) * step; v <= p->ymax + 1e-9 * step; v += step)
        tick_add(&t, br_plot_py(p, v), br_fmt_in(b, sizeof b, v, &sc, dec));
    draw_ticks(p, &t, 0);
    axis_title(b, sizeof b, ylabel, &sc);
    br_svg_text(p->svg, p->fx + 16, p->y0 + p->h / 2, BR_FONT_LABEL, "middle", -90.0, b);
}

void br_plot_axes(br_plot *p, const char *key, const char *title, const char *xlabel,
                  const char *xunit, const char *ylabel, const char *yunit)
{
    char b[256];
    p->xunit = xunit;
    p->yunit = yunit;
    br_svg_raw(p->svg, "<g data-panel=\"");
    if (br_xml_escape_put(p->svg->out, key ? key : "") != BR_OK)
        p->svg->failed = 1;
    snprintf(b, sizeof b,
             "\" data-xmin=\"%.10g\" data-xmax=\"%.10g\" data-ymin=\"%.10g\" "
             "data-ymax=\"%.10g\" data-px0=\"%.2f\" data-py0=\"%.2f\" data-pw=\"%.2f\" "
             "data-ph=\"%.2f\" data-xlog=\"%d\">\n",
             p->xmin, p->xmax, p->ymin, p->ymax, p->x0, p->y0, p->w, p->h, p->xlog);
    br_svg_raw(p->svg, b);
    br_svg_rect(p->svg, p->x0, p->y0, p->w, p->h, "#fbfcfd", "none", 0);
    if (!p->xcat)
        x_ticks(p, xlabel, xunit);
    y_ticks(p, ylabel, yunit);
    br_svg_rect(p->svg, p->x0, p->y0, p->w, p->h, "none", "#7a8794", 1.0);
    if (title)
        br_svg_text_in(p->svg, p->x0, p->fy + 20, BR_FONT_TITLE, "start", BR_INK, 1, title);
}

void br_plot_done(br_plot *p)
{
    br_svg_raw(p->svg, "</g>\n");
}

/* Points kept so far, flushed in sample order. */
typedef struct column {
    long imin, imax; /* samples with the smallest and largest y, -1: none */
    int pix;         /* pixel column */
} column;

typedef struct poly {
    double *px, *py;
    long n, cap;
    int failed;
} poly;

static void poly_add(poly *pl, double x, double y)
{
    if (pl->n > 0 && fabs(pl->px[pl->n - 1] - x) < 0.05 && fabs(pl->py[pl->n - 1] - y) < 0.05)
        return; /* the same point once rounded */
    if (pl->n == pl->cap) {
        long cap = pl->cap ? 2 * pl->cap : 256;
        double *a = realloc(pl->px, sizeof(double) * (size_t)cap);
        if (a)
            pl->px = a;
        double *b = a ? realloc(pl->py, sizeof(double) * (size_t)cap) : NULL;
        if (!a || !b) {
            pl->failed = 1;
            return;
        }
        pl->py = b;
        pl->cap = cap;
    }
    pl->px[pl->n] = x;
    pl->py[pl->n] = y;
    pl->n++;
}

static double clamp_y(const br_plot *p, double y)
{
    return fmax(p->y0, fmin(p->y0 + p->h, br_plot_py(p, y)));
}

static void flush(const br_plot *p, const column *c, const double *x, const double *y, long ystride,
                  poly *pl)
{
    if (c->imin < 0)
        return;
    long a = c->imin < c->imax ? c->imin : c->imax, b = c->imin < c->imax ? c->imax : c->imin;
    poly_add(pl, br_plot_px(p, x[a]), clamp_y(p, y[a * ystride]));
    poly_add(pl, br_plot_px(p, x[b]), clamp_y(p, y[b * ystride]));
}

void br_plot_line(br_plot *p, const double *x, const double *y, long n, long ystride,
                  const br_style *st, const char *key)
{
    poly pl = {0};
    column c = {-1, -1, -1};
    for (long i = 0; i < n; i++) {
        double v = y[i * ystride];
        if (x[i] < p->xmin || x[i] > p->xmax || !isfinite(v))
            continue;
        int pix = (int)floor(br_plot_px(p, x[i]));
        if (pix != c.pix) {
            flush(p, &c, x, y, ystride, &pl);
            c.imin = c.imax = i;
            c.pix = pix;
        } else if (v < y[c.imin * ystride]) {
            c.imin = i;
        } else if (v > y[c.imax * ystride]) {
            c.imax = i;
        }
    }
    flush(p, &c, x, y, ystride, &pl);
    if (pl.failed)
        p->svg->failed = 1;
    else
        br_svg_polyline(p->svg, pl.px, pl.py, (int)pl.n, st->colour, st->width, st->dash, key);
    free(pl.px);
    free(pl.py);
}

double br_plot_text_width(const char *text)
{
    int chars = 0;
    for (const unsigned char *c = (const unsigned char *)text; *c; c++)
        chars += (*c & 0xC0) != 0x80; /* a UTF-8 sequence is one character */
    return CHAR_W * chars;
}

/* A baseline near want for a label of nlines lines in the right margin,
 * clear of the labels already placed: the nearest free slot above or
 * below, within the panel. */
static double label_slot(br_plot *p, double want, int nlines)
{
    double h = LINE_H * nlines, best = want, dist = HUGE_VAL;
    for (int step = 0; step < 2 * 24 + 2; step++) {
        double y = want + (step % 2 ? -1.0 : 1.0) * LINE_H * 0.5 * ((step + 1) / 2);
        double top = y - 11.0, bot = y - 11.0 + h;
        if (top < p->fy + 2.0 || bot > p->fy + p->fh - 2.0)
            continue;
        int clash = 0;
        for (int i = 0; i < p->nlab && !clash; i++)
            clash = top < p->labbot[i] && bot > p->labtop[i];
        if (!clash && fabs(y - want) < dist) {
            best = y;
            dist = fabs(y - want);
            break;
        }
    }
    if (p->nlab < (int)(sizeof p->labtop / sizeof p->labtop[0])) {
        p->labtop[p->nlab] = best - 11.0;
        p->labbot[p->nlab++] = best - 11.0 + h;
    }
    return best;
}

/* Text of up to two lines (split at '\n') from baseline y down. */
static void label_lines(br_plot *p, double x, double y, const char *colour, const char *label)
{
    char first[160];
    const char *nl = strchr(label, '\n');
    snprintf(first, sizeof first, "%.*s", nl ? (int)(nl - label) : (int)strlen(label), label);
    br_svg_text_in(p->svg, x, y, BR_FONT_TICK, "start", colour, 1, first);
    if (nl)
        br_svg_text_in(p->svg, x, y + LINE_H, BR_FONT_TICK, "start", colour, 0, nl + 1);
}

static int count_lines(const char *label)
{
    return strchr(label, '\n') ? 2 : 1;
}

void br_plot_hline(br_plot *p, double y, const br_style *st, const char *label)
{
    if (br_plot_limit(p, y, st, NULL, label))
        return;
    /* off the range: say where it is instead of squashing the data */
    int above = y > p->ymax;
    double py = label_slot(p, above ? p->y0 + 12 : p->y0 + 0.55 * p->h, count_lines(label));
    char b[160];
    snprintf(b, sizeof b, "%s %s", above ? "\xe2\x86\x91" : "\xe2\x86\x93", label);
    label_lines(p, p->x0 + p->w + 6, py, st->colour, b);
}

/* The line of a limit across the area, named key, without its label. */
static void limit_line(br_plot *p, double y, const br_style *st, const char *key)
{
    double py = br_plot_py(p, y);
    int rc = br_text_printf(p->svg->out, "<line data-limit=\"");
    rc |= br_xml_escape_put(p->svg->out, key ? key : "");
    rc |= br_text_printf(p->svg->out,
                         "\" data-value=\"%.10g\" x1=\"%.2f\" y1=\"%.2f\" x2=\"%.2f\" y2=\"%.2f\" "
                         "stroke=\"%s\" stroke-width=\"%.2f\"",
                         y, p->x0, py, p->x0 + p->w, py, st->colour, st->width);
    if (st->dash)
        rc |= br_text_printf(p->svg->out, " stroke-dasharray=\"%s\"", st->dash);
    rc |= br_text_put(p->svg->out, "/>\n");
    if (rc)
        p->svg->failed = 1;
}

int br_plot_limit(br_plot *p, double y, const br_style *st, const char *key, const char *label)
{
    if (!(y >= p->ymin && y <= p->ymax))
        return 0;
    double py = br_plot_py(p, y);
    limit_line(p, y, st, key);
    label_lines(p, p->x0 + p->w + 6, label_slot(p, py + 4.5, count_lines(label)), st->colour,
                label);
    return 1;
}

/* Label tops for n labels wanted at tops want[] (sorted, top first) of
 * heights h[]: each at its place or just below the one above, then, where
 * that runs past the panel's foot, pushed back up; in the order of their
 * lines. */
static void stack_labels(const br_plot *p, int n, const double *want, const double *h, double *top)
{
    for (int i = 0; i < n; i++)
        top[i] = i ? fmax(want[i], top[i - 1] + h[i - 1]) : fmax(want[i], p->fy + 2.0);
    double foot = p->fy + p->fh - 2.0;
    for (int i = n - 1; i >= 0; i--) {
        double limit = i == n - 1 ? foot : top[i + 1];
        top[i] = fmin(top[i], limit - h[i]);
    }
}

void br_plot_limits(br_plot *p, int n, const double *y, const br_style *const *st,
                    const char *const *key, const char *const *label)
{
    int order[BR_PLOT_LIMITS], m = 0;
    double want[BR_PLOT_LIMITS], h[BR_PLOT_LIMITS], top[BR_PLOT_LIMITS];
    for (int i = 0; i < n && m < BR_PLOT_LIMITS; i++)
        if (y[i] >= p->ymin && y[i] <= p->ymax)
            order[m++] = i;
    for (int i = 1; i < m; i++) /* top first: the highest value */
        for (int j = i; j > 0 && y[order[j - 1]] < y[order[j]]; j--) {
            int t = order[j];
            order[j] = order[j - 1];
            order[j - 1] = t;
        }
    for (int i = 0; i < m; i++) {
        int lines = count_lines(label[order[i]]);
        h[i] = LINE_H * lines + 2.0;
        /* the first line's middle on the limit */
        want[i] = br_plot_py(p, y[order[i]]) - 0.5 * LINE_H;
    }
    stack_labels(p, m, want, h, top);
    double xl = p->x0 + p->w;
    for (int i = 0; i < m; i++) {
        const br_style *s = st[order[i]];
        double py = br_plot_py(p, y[order[i]]);
        limit_line(p, y[order[i]], s, key[order[i]]);
        /* a leader from the line's end to its label when it had to move */
        br_svg_line(p->svg, xl, py, xl + 6, top[i] + 0.5 * LINE_H, s->colour, 1.0);
        label_lines(p, xl + 8, top[i] + LINE_H - 3.0, s->colour, label[order[i]]);
    }
}

/* The left edge of a marker label of width w near centre x in the strip,
 * clear of the labels there and within the panel. */
static double strip_slot(br_plot *p, double x, double w)
{
    double lo = p->fx + 2.0, hi = p->fx + p->fw - 2.0 - w;
    double cand[2 * 24 + 1];
    int nc = 0;
    cand[nc++] = x - w / 2;
    for (int i = 0; i < p->nmark; i++) {
        cand[nc++] = p->markx1[i] + 6.0;
        cand[nc++] = p->markx0[i] - 6.0 - w;
    }
    double best = fmin(fmax(x - w / 2, lo), hi), dist = HUGE_VAL;
    for (int j = 0; j < nc; j++) {
        double a = fmin(fmax(cand[j], lo), hi);
        int clash = 0;
        for (int i = 0; i < p->nmark && !clash; i++)
            clash = a < p->markx1[i] + 4.0 && a + w > p->markx0[i] - 4.0;
        if (!clash && fabs(a + w / 2 - x) < dist) {
            best = a;
            dist = fabs(a + w / 2 - x);
        }
    }
    if (p->nmark < (int)(sizeof p->markx0 / sizeof p->markx0[0])) {
        p->markx0[p->nmark] = best;
        p->markx1[p->nmark++] = best + w;
    }
    return best;
}

void br_plot_mark(br_plot *p, double x, const br_style *st, const char *key, const char *label)
{
    if (!(x >= p->xmin && x <= p->xmax))
        return;
    double px = br_plot_px(p, x);
    int rc = br_text_printf(p->svg->out, "<line data-mark=\"");
    rc |= br_xml_escape_put(p->svg->out, key ? key : "");
    rc |= br_text_printf(p->svg->out,
                         "\" data-value=\"%.10g\" x1=\"%.2f\" y1=\"%.2f\" x2=\"%.2f\" y2=\"%.2f\" "
                         "stroke=\"%s\" stroke-width=\"%.2f\"",
                         x, px, p->y0, px, p->y0 + p->h, st->colour, st->width);
    if (st->dash)
        rc |= br_text_printf(p->svg->out, " stroke-dasharray=\"%s\"", st->dash);
    rc |= br_text_put(p->svg->out, "/>\n");
    if (rc)
        p->svg->failed = 1;
    if (label && label[0]) {
        double w = br_plot_text_width(label);
        br_svg_text_in(p->svg, strip_slot(p, px, w), p->y0 - STRIP_BASE, BR_FONT_TICK, "start",
                       st->colour, 1, label);
    }
}

void br_plot_vline(br_plot *p, double x, const br_style *st, const char *label)
{
    br_plot_mark(p, x, st, NULL, label);
}

double br_plot_key(br_plot *p, double x, double y, const br_style *st, const char *label)
{
    br_svg_dashed(p->svg, x, y - 4.5, x + 28, y - 4.5, st->colour, st->width + 0.5, st->dash);
    br_svg_text_in(p->svg, x + 34, y, BR_FONT_TICK, "start", BR_INK, 0, label);
    return x + 34 + 7.5 * (double)strlen(label) + 18;
}

/* plot.h - axes, ticks and data lines on an SVG, for the plots of the
 * HTML report and of --plot.
 *
 * A plot is a panel of a document: a frame with a title, a plot area with
 * a grid and ticks labelled with engineering prefixes ("µs", "mA"), and
 * lines drawn from SI data.  A line keeps at most the smallest and the
 * largest sample of each pixel column, in the order they came: every
 * point drawn is a sample as given, and a long series stays small.
 *
 * The plot area carries its data range as attributes (data-xmin ...), and
 * every line names the series it draws (data-series), so that a reader
 * (a test) can map each point back to the value it came from. */
#ifndef BR_REPORT_PLOT_H
#define BR_REPORT_PLOT_H

#include "report/fmt.h"
#include "report/svg.h"

/* How a line looks: colour, dash pattern (NULL: solid) and width. */
typedef struct br_style {
    const char *colour; /* "#rrggbb" */
    const char *dash;   /* stroke-dasharray, or NULL */
    double width;       /* px */
} br_style;

/* Styles of data lines, told apart by dash as well as colour.  The
 * colours are the Okabe-Ito palette (M. Okabe and K. Ito, "Color
 * Universal Design", 2002), chosen to stay distinct for the common
 * colour-vision deficiencies. */
br_style br_plot_style(int i);

/* Colours of the palette used for marks and text. */
#define BR_INK "#1d2733"       /* text and axes */
#define BR_GRID "#dde3ea"      /* grid lines */
#define BR_BLUE "#0072B2"      /* data */
#define BR_VERMILION "#D55E00" /* lower limits, failures */
#define BR_GREEN "#009E73"     /* events that went well */
#define BR_PURPLE "#CC79A7"    /* upper limits */
#define BR_ORANGE "#E69F00"
#define BR_SKY "#56B4E9"

/* Font sizes, px: readable on a projector and in print. */
#define BR_FONT_TICK 13.0
#define BR_FONT_LABEL 14.0
#define BR_FONT_TITLE 16.0

typedef struct br_plot {
    br_svg *svg;
    double fx, fy, fw, fh;         /* the panel in the document, px */
    double x0, y0, w, h;           /* the plot area, px (y0 its top) */
    double xmin, xmax, ymin, ymax; /* data range, SI */
    const char *xunit, *yunit;     /* base units of the axes: "s", "V" */
    int xlog;                      /* logarithmic x axis (xmin > 0) */
    int xcat;                      /* categories along x: no ticks, the caller labels them */
    int nlab;                      /* right-hand labels placed so far */
    double labtop[24], labbot[24]; /* their extents, px (kept apart) */
    int nmark;                     /* marker labels placed in the strip above the area */
    double markx0[24], markx1[24]; /* their extents, px (kept apart) */
} br_plot;

/* Estimated width of text in the plots' label font (13 px bold), px: a
 * label is placed where it fits whole. */
double br_plot_text_width(const char *text);

/* A panel of w x h px at (x, y) in the document s. */
void br_plot_frame(br_plot *p, br_svg *s, double x, double y, double w, double h);

/* The data range.  With pad set the y range grows by a small margin and
 * never has zero height. */
void br_plot_range(br_plot *p, double xmin, double xmax, double ymin, double ymax, int pad);

/* Document coordinates of data values, and back. */
double br_plot_px(const br_plot *p, double x);
double br_plot_py(const br_plot *p, double y);
double br_plot_x_of(const br_plot *p, double px);
double br_plot_y_of(const br_plot *p, double py);

/* Open the panel (a <g> named key), draw its title, grid, ticks and axis
 * titles ("time" with xunit "s" reads "time (µs)"). */
void br_plot_axes(br_plot *p, const char *key, const char *title, const char *xlabel,
                  const char *xunit, const char *ylabel, const char *yunit);
/* Close the panel. */
void br_plot_done(br_plot *p);

/* Draw the series (x[i], y[i * ystride]), i < n, with style st; samples
 * outside the x range are left out, y values outside the y range are
 * drawn at its edge.  key names the data (a CSV column). */
void br_plot_line(br_plot *p, const double *x, const double *y, long n, long ystride,
                  const br_style *st, const char *key);

/* A horizontal reference line at y with its label in the right margin,
 * or, when y is outside the range, an arrow and the label at that edge. */
void br_plot_hline(br_plot *p, double y, const br_style *st, const char *label);

/* A limit: a horizontal line at y across the plot area, named key
 * (data-limit, with data-value y, so that a reader can find it), its
 * label (one or two lines, split at '\n') in the right margin beside it,
 * clear of the labels already there and of every trace.  Nothing is
 * drawn, and 0 returned, when y lies outside the y range: a plot that
 * must show a limit sets its range to take it in. */
int br_plot_limit(br_plot *p, double y, const br_style *st, const char *key, const char *label);

/* n limits at once (at most BR_PLOT_LIMITS): each a line as
 * br_plot_limit draws it, their labels (one or two lines) in the right
 * margin in the order of their lines, each beside its line or, where
 * lines lie closer than their labels are tall, stacked and joined to it
 * by a short leader; never over the plot area.  Limits outside the y
 * range are left out. */
#define BR_PLOT_LIMITS 8
void br_plot_limits(br_plot *p, int n, const double *y, const br_style *const *st,
                    const char *const *key, const char *const *label);

/* A vertical marker at x across the plot area, named key (data-mark,
 * with data-value x), its label in the strip above the area, clear of
 * the other markers' labels and of every trace.  Nothing when x lies
 * outside the x range. */
void br_plot_mark(br_plot *p, double x, const br_style *st, const char *key, const char *label);

/* A vertical marker at x with its label: br_plot_mark without a key. */
void br_plot_vline(br_plot *p, double x, const br_style *st, const char *label);

/* A legend entry: a short line sample and its label, at (x, y) in the
 * document; returns the x where the next entry can go. */
double br_plot_key(br_plot *p, double x, double y, const br_style *st, const char *label);

/* "µs" for scale unit "us": the prefix as people write it. */
const char *br_plot_unit(const br_scale *sc, char *buf, size_t cap);

/* br_fmt_si with the micro prefix written "µ": for pages and plots,
 * which are UTF-8 (the terminal reports keep "u"). */
const char *br_plot_si(char *buf, size_t cap, double v, int digits, const char *unit);

/* br_fmt_time the same way ("-" for a negative time). */
const char *br_plot_time(char *buf, size_t cap, double t);

/* A tick spacing of 1, 2 or 5 times a power of ten giving about `want`
 * intervals over span. */
double br_plot_step(double span, int want);

#endif

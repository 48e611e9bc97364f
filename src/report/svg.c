/* svg.c - SVG elements for self-made plots. */
#include "report/svg.h"

#include <math.h>
#include <stdio.h>

static void put(br_svg *s, int rc)
{
    if (rc != BR_OK)
        s->failed = 1;
}

/* Append text with &, <, > and " escaped. */
int br_xml_escape_put(br_text *out, const char *text)
{
    int rc = BR_OK;
    const char *run = text;
    for (const char *p = text;; p++) {
        const char *rep = *p == '&'   ? "&amp;"
                          : *p == '<' ? "&lt;"
                          : *p == '>' ? "&gt;"
                          : *p == '"' ? "&quot;"
                                      : NULL;
        if (!rep && *p)
            continue;
        if (p > run)
            rc |= br_text_printf(out, "%.*s", (int)(p - run), run);
        if (!*p)
            break;
        rc |= br_text_put(out, rep);
        run = p + 1;
    }
    return rc ? BR_ENOMEM : BR_OK;
}

static void svg_open(br_svg *s, br_text *out, double width, double height, const char *title)
{
    s->out = out;
    s->failed = 0;
    put(s, br_text_printf(out,
                          "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"%.0f\" "
                          "height=\"%.0f\" viewBox=\"0 0 %.0f %.0f\" "
                          "font-family=\"sans-serif\"",
                          width, height, width, height));
    if (title) {
        put(s, br_text_put(out, " role=\"img\">\n<title>"));
        put(s, br_xml_escape_put(out, title));
        put(s, br_text_put(out, "</title>\n"));
    } else {
        put(s, br_text_put(out, ">\n"));
    }
}

void br_svg_begin_inline(br_svg *s, br_text *out, double width, double height, const char *title)
{
    svg_open(s, out, width, height, title);
    put(s, br_text_printf(out,
                          "<rect x=\"0\" y=\"0\" width=\"%.0f\" height=\"%.0f\" "
                          "fill=\"white\"/>\n",
                          width, height));
}

void br_svg_begin(br_svg *s, br_text *out, double width, double height)
{
    int rc = br_text_put(out, "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n");
    br_svg_begin_inline(s, out, width, height, NULL);
    put(s, rc);
}

int br_svg_end(br_svg *s)
{
    put(s, br_text_put(s->out, "</svg>\n"));
    return s->failed ? BR_ENOMEM : BR_OK;
}

void br_svg_rect(br_svg *s, double x, double y, double w, double h, const char *fill,
                 const char *stroke, double stroke_width)
{
    put(s, br_text_printf(s->out,
                          "<rect x=\"%.2f\" y=\"%.2f\" width=\"%.2f\" height=\"%.2f\" "
                          "fill=\"%s\" stroke=\"%s\" stroke-width=\"%.2f\"/>\n",
                          x, y, w, h, fill, stroke, stroke_width));
}

void br_svg_line(br_svg *s, double x1, double y1, double x2, double y2, const char *stroke,
                 double width)
{
    put(s, br_text_printf(s->out,
                          "<line x1=\"%.2f\" y1=\"%.2f\" x2=\"%.2f\" y2=\"%.2f\" "
                          "stroke=\"%s\" stroke-width=\"%.2f\" stroke-linecap=\"square\"/>\n",
                          x1, y1, x2, y2, stroke, width));
}

void br_svg_circle(br_svg *s, double cx, double cy, double r, const char *fill, const char *stroke,
                   double stroke_width)
{
    put(s, br_text_printf(s->out,
                          "<circle cx=\"%.2f\" cy=\"%.2f\" r=\"%.2f\" fill=\"%s\" "
                          "stroke=\"%s\" stroke-width=\"%.2f\"/>\n",
                          cx, cy, r, fill, stroke, stroke_width));
}

static void escaped(br_svg *s, const char *text)
{
    put(s, br_xml_escape_put(s->out, text));
}

void br_svg_text(br_svg *s, double x, double y, double size, const char *anchor, double rotate,
                 const char *text)
{
    put(s, br_text_printf(s->out,
                          "<text x=\"%.2f\" y=\"%.2f\" font-size=\"%.1f\" "
                          "text-anchor=\"%s\"",
                          x, y, size, anchor));
    if (rotate != 0.0)
        put(s, br_text_printf(s->out, " transform=\"rotate(%.1f %.2f %.2f)\"", rotate, x, y));
    put(s, br_text_put(s->out, ">"));
    escaped(s, text);
    put(s, br_text_put(s->out, "</text>\n"));
}

void br_svg_polyline(br_svg *s, const double *px, const double *py, int n, const char *stroke,
                     double width, const char *dash, const char *key)
{
    if (n < 1)
        return;
    put(s, br_text_put(s->out, "<polyline"));
    if (key) {
        put(s, br_text_put(s->out, " data-series=\""));
        escaped(s, key);
        put(s, br_text_put(s->out, "\""));
    }
    put(s, br_text_printf(s->out,
                          " fill=\"none\" stroke=\"%s\" stroke-width=\"%.2f\" "
                          "stroke-linejoin=\"round\"",
                          stroke, width));
    if (dash)
        put(s, br_text_printf(s->out, " stroke-dasharray=\"%s\"", dash));
    put(s, br_text_put(s->out, " points=\""));
    for (int i = 0; i < n; i++)
        put(s, br_text_printf(s->out, "%s%.1f,%.1f", i ? " " : "", px[i], py[i]));
    put(s, br_text_put(s->out, "\"/>\n"));
}

void br_svg_dashed(br_svg *s, double x1, double y1, double x2, double y2, const char *stroke,
                   double width, const char *dash)
{
    put(s, br_text_printf(s->out,
                          "<line x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\" "
                          "stroke=\"%s\" stroke-width=\"%.2f\"",
                          x1, y1, x2, y2, stroke, width));
    if (dash)
        put(s, br_text_printf(s->out, " stroke-dasharray=\"%s\"", dash));
    put(s, br_text_put(s->out, "/>\n"));
}

void br_svg_text_in(br_svg *s, double x, double y, double size, const char *anchor,
                    const char *fill, int bold, const char *text)
{
    put(s, br_text_printf(s->out,
                          "<text x=\"%.1f\" y=\"%.1f\" font-size=\"%.1f\" "
                          "text-anchor=\"%s\" fill=\"%s\"%s>",
                          x, y, size, anchor, fill, bold ? " font-weight=\"bold\"" : ""));
    escaped(s, text);
    put(s, br_text_put(s->out, "</text>\n"));
}

void br_svg_raw(br_svg *s, const char *markup)
{
    put(s, br_text_put(s->out, markup));
}

/* Colour stops of the diverging scale: the red-blue scheme of ColorBrewer
 * (C. A. Brewer, colorbrewer2.org, "RdBu", listed there as safe for
 * colour-blind readers; stop values from memory).  The two sides differ in
 * hue right at zero, where a design stops holding; red-green scales are
 * avoided because the commonest colour blindness merges them. */
typedef struct stop {
    double t;
    int r, g, b;
} stop;

static const stop STOPS[] = {
    {-1.0, 103, 0, 31},    {-0.5, 214, 96, 77}, {-1e-9, 253, 219, 199},
    {1e-9, 209, 229, 240}, {0.5, 67, 147, 195}, {1.0, 5, 48, 97},
};

const char *br_svg_diverging(double t, char *buf, size_t cap)
{
    const int n = (int)(sizeof STOPS / sizeof STOPS[0]);
    t = fmax(-1.0, fmin(1.0, t));
    int i = 0;
    while (i < n - 2 && t > STOPS[i + 1].t)
        i++;
    const stop *a = &STOPS[i], *b = &STOPS[i + 1];
    double f = (t - a->t) / (b->t - a->t);
    f = fmax(0.0, fmin(1.0, f));
    snprintf(buf, cap, "#%02x%02x%02x", (int)lround(a->r + f * (b->r - a->r)),
             (int)lround(a->g + f * (b->g - a->g)), (int)lround(a->b + f * (b->b - a->b)));
    return buf;
}

/* svg.h - a few SVG elements for the plots bootrung draws itself.
 *
 * Elements are appended to a br_text as they are drawn; coordinates are
 * user units (pixels) with y downward, as SVG has them.  Errors are
 * sticky, as in the XML writer: draw everything, check once at the end. */
#ifndef BR_REPORT_SVG_H
#define BR_REPORT_SVG_H

#include "bootrung/bootrung.h"

#include <stddef.h>

typedef struct br_svg {
    br_text *out; /* where the document goes */
    int failed;   /* out of memory at some point */
} br_svg;

/* Start a document of width x height into out. */
void br_svg_begin(br_svg *s, br_text *out, double width, double height);
/* Start an <svg> element of width x height for inclusion in an XHTML page
 * (no XML declaration); title (may be NULL) becomes its accessible name. */
void br_svg_begin_inline(br_svg *s, br_text *out, double width, double height, const char *title);
/* Close the document; returns BR_OK or BR_ENOMEM. */
int br_svg_end(br_svg *s);

/* fill/stroke are SVG colours ("#a0b0c0", "none"). */
void br_svg_rect(br_svg *s, double x, double y, double w, double h, const char *fill,
                 const char *stroke, double stroke_width);
void br_svg_line(br_svg *s, double x1, double y1, double x2, double y2, const char *stroke,
                 double width);
void br_svg_circle(br_svg *s, double cx, double cy, double r, const char *fill, const char *stroke,
                   double stroke_width);
/* Text at (x, y), anchor "start", "middle" or "end", turned by `rotate`
 * degrees about that point; XML special characters are escaped. */
void br_svg_text(br_svg *s, double x, double y, double size, const char *anchor, double rotate,
                 const char *text);

/* A polyline through the n points (px[i], py[i]); dash is an SVG
 * stroke-dasharray ("6 3") or NULL for a solid line; key (may be NULL)
 * becomes a data-series attribute naming the data it draws. */
void br_svg_polyline(br_svg *s, const double *px, const double *py, int n, const char *stroke,
                     double width, const char *dash, const char *key);
/* A line with a dash pattern (NULL: solid). */
void br_svg_dashed(br_svg *s, double x1, double y1, double x2, double y2, const char *stroke,
                   double width, const char *dash);
/* Text in colour fill, bold when bold is set; otherwise as br_svg_text. */
void br_svg_text_in(br_svg *s, double x, double y, double size, const char *anchor,
                    const char *fill, int bold, const char *text);
/* Append raw markup (a <g> opening, say); the caller keeps it well formed. */
void br_svg_raw(br_svg *s, const char *markup);

/* Append text with &, <, > and " escaped to out.  Returns BR_OK or
 * BR_ENOMEM. */
int br_xml_escape_put(br_text *out, const char *text);

/* An RGB colour "#rrggbb" for t in [-1, 1] on a colour-blind-safe
 * diverging scale: dark red at -1 through pale red just below 0, pale blue
 * just above 0, to dark blue at 1 (values outside are clamped).  Returns
 * buf. */
const char *br_svg_diverging(double t, char *buf, size_t cap);

#endif

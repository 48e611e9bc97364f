/* html_report.h - the pieces of an HTML report page.
 *
 * A page is one self-contained file: its style inline, its plots inline
 * SVG drawn by bootrung, no script and nothing fetched from a network.
 * It is written as XHTML that is also valid HTML, so that an XML parser
 * reads it as well as a browser does.  The verdict comes first, the
 * caution last. */
#ifndef BR_REPORT_HTML_REPORT_H
#define BR_REPORT_HTML_REPORT_H

#include "analyses/figures.h"

/* The head (title, style) and the page header: what was analysed and at
 * which operating point. */
int br_html_begin(br_text *out, const br_chain *c, const char *what);

/* The overall result and the verdict table of the rows in mask; su (may
 * be NULL) lets a failed start-up say why. */
int br_html_verdict(br_text *out, const br_chain *c, const br_verdict *v, unsigned mask,
                    const br_startup *su);

/* A section with a heading and an optional paragraph; close it with
 * br_html_section_end. */
int br_html_section(br_text *out, const char *heading, const char *intro);
int br_html_section_end(br_text *out);

/* A figure: the SVG in svg (a document or an element; an XML declaration
 * is dropped) and its caption (may be NULL). */
int br_html_figure(br_text *out, const br_text *svg, const char *caption);

/* A paragraph of plain text (escaped). */
int br_html_para(br_text *out, const char *text);

/* The start-up table: per stage first and final start, dropouts and the
 * inrush peak against the surge rating. */
int br_html_startup_table(br_text *out, const br_chain *c, const br_startup *su);

/* Stress tables over ndir directions: one group of rows per direction
 * (every figure of a row from that direction, the group named), each row
 * with its pass/fail: rails (with each rail's floor and the margin above
 * it), diodes (forward and displacement currents apart), capacitors. */
int br_html_rail_table(br_text *out, const br_chain *c, const br_steady_figs *f, int ndir);
int br_html_diode_table(br_text *out, const br_chain *c, const br_steady_figs *f, int ndir);
int br_html_cap_table(br_text *out, const br_chain *c, const br_steady_figs *f, int ndir);

/* The caution and the end of the page. */
int br_html_end(br_text *out);

/* Append text escaped for XML/HTML. */
int br_html_text(br_text *out, const char *text);

#endif

/* line_report.h - the pieces of the reports that a line cycle adds: what
 * the line cycle is, where in it each rail and diode is at its worst, the
 * envelope as CSV rows, and their XML.  Internal to src/report. */
#ifndef BR_REPORT_LINE_REPORT_H
#define BR_REPORT_LINE_REPORT_H

#include "analyses/figures.h"
#include "io/xml_write.h"

/* Degrees of a line phase in radians, in [0, 360). */
double br_line_deg(double theta);

/* "60 Hz line (2000 switching periods), 25 A peak 20 deg behind the
 * modulation, sine depth 0.9" into buf. */
const char *br_line_describe(const br_chain *c, char *buf, size_t cap);

/* The heading's load line for a chain on a line cycle. */
int br_line_heading(const br_chain *c, br_text *out);

/* Where in the line cycle each rail has its lowest and highest driver
 * supply and each diode its peak reverse voltage, with the line phase and
 * the duty and current of the switching period there. */
int br_line_where_text(const br_chain *c, const br_steady_figs *f, br_text *out);

/* The line cycle's attributes of <operating-point>. */
void br_line_xml_operating(br_xmlw *w, const br_chain *c);

/* The line cycle's attributes of <steady>, <rail> k and <link> k. */
void br_line_xml_steady(br_xmlw *w, const br_chain *c);
void br_line_xml_rail(br_xmlw *w, const br_chain *c, const br_steady *ss, int k);
void br_line_xml_link(br_xmlw *w, const br_chain *c, const br_steady *ss, int k);

/* Where a verdict row binds on a line cycle, as <criterion> attributes. */
void br_line_xml_row(br_xmlw *w, const br_chain *c, const br_verdict_row *r);

/* The envelope as CSV rows after the header (br_csv_header): per row of
 * the envelope a "line-min" row (rails and driver supplies at their
 * lowest, links' mean current) and a "line-max" row (at their highest,
 * links' mean current, the diodes' peak reverse voltage). */
int br_line_csv(const br_chain *c, const br_line_env *e, br_text *csv);

#endif

/* report_common.h - pieces every analysis report shares: the heading
 * lines, names of directions and stages, and the XML root element.
 * Internal to src/report. */
#ifndef BR_REPORT_COMMON_H
#define BR_REPORT_COMMON_H

#include "io/xml_write.h"
#include "model/timing.h"
#include "report/vocab.h"

/* The same as br_dir_label (vocab.h): a direction has one name, narrow
 * columns included.  Kept for callers that asked for a short form. */
const char *br_dir_short(int dir);

/* "design NAME (PATH)" and a one-line operating point, then a blank line. */
int br_report_heading(const br_chain *c, const char *what, br_text *out);

/* Reports keep their lines within this many columns. */
#define BR_REPORT_WIDTH 100

/* Append lead then text, wrapped at BR_REPORT_WIDTH on spaces, each
 * continuation line indented by `hang` spaces; ends with a newline. */
int br_report_wrap(br_text *out, const char *lead, const char *text, int hang);

/* The operating point as an XML element. */
void br_xml_operating_point(br_xmlw *w, const br_chain *c);

/* The caution as an XML element. */
void br_xml_caution(br_xmlw *w);

#endif

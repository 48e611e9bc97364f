/* startup_report.h - the cold start as text and as XML.
 *
 * Per stage: when its driver first crossed UVLO rising, when it started
 * for good, its dropouts, the inrush peak of its link against the diode's
 * surge rating, and where its rail ended; then the total start-up time, or
 * which rail never starts, where it settles and why. */
#ifndef BR_REPORT_STARTUP_REPORT_H
#define BR_REPORT_STARTUP_REPORT_H

#include "analyses/startup.h"
#include "io/xml_write.h"

/* The start-up section: the stage table, inrush findings and the
 * summary; with detail, also the first dropout times of each stage. */
int br_startup_text(const br_chain *c, const br_startup *su, int detail, br_text *out);

/* One sentence (no newline) saying why rail su->first_stalled does not
 * start; nothing when the start-up completed. */
int br_startup_stall_text(const br_chain *c, const br_startup *su, br_text *out);

/* The <startup> element. */
void br_startup_xml(br_xmlw *w, const br_chain *c, const br_startup *su);

#endif

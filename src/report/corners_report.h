/* corners_report.h - the worst-case corner report, as text and as XML,
 * and the pieces the yield and part reports share with it: the table of
 * toleranced parameters and a parameter's value for people. */
#ifndef BR_REPORT_CORNERS_REPORT_H
#define BR_REPORT_CORNERS_REPORT_H

#include "analyses/corners.h"
#include "io/xml_write.h"

/* The text report of corners k of chain c (the design at its nominal
 * values), ending with the caution. */
int br_corners_text(const br_chain *c, const br_corners *k, br_text *out);

/* The same as an XML document; version is the program's. */
int br_corners_xml(const br_chain *c, const br_corners *k, const char *version, br_text *out,
                   br_error *err);

/* A value of parameter p for people: "8 uF", "70 C", "0.5". */
const char *br_param_value(const br_tol_param *p, double v, char *buf, size_t cap);

/* The table of toleranced parameters (number, name, limits, nominal,
 * distribution), headed by a line; or a line saying there are none. */
int br_param_table(const br_tol_list *tl, br_text *out);

/* "rail B3" or "link A2" where criterion crit binds at stage, "-" when
 * none. */
const char *br_crit_where(const br_chain *c, int crit, int stage, char *buf, size_t cap);

/* The <parameters> element: every toleranced parameter. */
void br_param_xml(br_xmlw *w, const br_tol_list *tl);

/* Open the <bootrung-results> root of verb (with the operating point). */
void br_results_root(br_xmlw *w, const br_chain *c, const char *verb, const char *version);

#endif

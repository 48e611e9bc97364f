/* explore_report.h - rendering an exploration (analyses/explore.h): the
 * text report, the CSV of every combination, and the SVG plots of margin
 * and cost against level count and frequency. */
#ifndef BR_REPORT_EXPLORE_REPORT_H
#define BR_REPORT_EXPLORE_REPORT_H

#include "analyses/explore.h"

/* The report: the inputs, the feasible set ranked (front first), the
 * combinations that are not feasible and why, the verdict, the caution.
 * design names the template file. */
int br_explore_text(const br_explore *x, const br_catalog *cat, const char *design, br_text *out);

/* One line per combination, in the order judged, SI units. */
int br_explore_csv(const br_explore *x, const br_catalog *cat, br_text *out);

/* Two panels: the smallest margin in volts and the cost of the feasible
 * combinations against the level count, one line per frequency (at each
 * level count the best of the switch classes). */
int br_explore_svg(const br_explore *x, br_text *out);

/* The comment of a split design's file (row r with inject_rail > 0). */
int br_explore_split_comment(const br_explore *x, const br_catalog *cat, const br_explore_row *r,
                             const char *design, br_text *out);

/* The comment of a front member's design file: what was explored and
 * where the row stands. */
int br_explore_comment(const br_explore *x, const br_catalog *cat, const br_explore_row *r,
                       const char *design, br_text *out);

/* Pass: some combination is feasible; fail: none is, and every one was
 * decided; undetermined: none is, and some could not be decided (or the
 * model refused its design).  A br_outcome. */
int br_explore_outcome(const br_explore *x);

#endif

/* map_report.h - rendering the hold map (`bootrung map`): a text
 * summary, the grid as CSV and as an SVG heat map. */
#ifndef BR_REPORT_MAP_REPORT_H
#define BR_REPORT_MAP_REPORT_H

#include "analyses/map.h"

/* The summary for the terminal, ending with the caution; csv/svg are the
 * paths written (NULL when not asked for). */
int br_map_text(const br_chain *c, const br_map *m, const char *csv, const char *svg, br_text *out,
                br_error *err);

/* One header line, then one row per grid point:
 * duty,fsw_Hz,margin_V,holds,stage,switch,criterion,direction */
int br_map_csv(const br_chain *c, const br_map *m, br_text *out, br_error *err);

/* The heat map: duty across, frequency up (logarithmic), the worst margin
 * in colour, the edge of the holding region in black, the design point
 * marked. */
int br_map_svg(const br_chain *c, const br_map *m, br_text *out, br_error *err);

#endif

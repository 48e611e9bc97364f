/* charts.h - the plots of the reports: start-up waveforms, steady-state
 * ripple, diode stress, the yield histogram and the hold-window sweep.
 *
 * Each function draws one complete <svg> into out: with standalone set a
 * document of its own (for --plot), otherwise an element for an XHTML
 * page.  Returns BR_OK or BR_ENOMEM. */
#ifndef BR_REPORT_CHARTS_H
#define BR_REPORT_CHARTS_H

#include "analyses/figures.h"
#include "analyses/window.h"
#include "analyses/yield.h"
#include "report/plot.h"
#include "report/svg.h"
#include "report/trace.h"

/* One panel per rail: its voltage from cold, UVLO rising and falling
 * (as the rail must reach them) and the moment its driver starts for
 * good. */
int br_chart_startup(const br_chain *c, const br_startup *su, const br_trace *tr, int standalone,
                     br_text *out);

/* One panel per rail over the trace (two periods from the steady state):
 * the rail, the driver supply behind a regulator, UVLO falling, the
 * minimum drive and the gate maximum. */
int br_chart_ripple(const br_chain *c, const br_steady_figs *f, const br_trace *tr, int standalone,
                    br_text *out);

/* A line cycle (charts_line.c): the load current and the duty against
 * line phase, then one panel per rail with its lowest and highest voltage
 * (and driver supply behind a regulator) per switching period of the
 * envelope e, UVLO falling, the minimum drive, the gate maximum, and
 * where its driver supply is lowest. */
/* The limits of rail k's driver where the rail must be for them (vocab.h),
 * the same in every plot of a rail: br_chart_take_limits grows [lo, hi]
 * to take them in, br_chart_rail_limits draws them as labelled lines
 * (the floor named), br_chart_limits_key gives their styles' key at (x,
 * y) and returns the x after it. */
void br_chart_take_limits(const br_chain *c, int k, double *lo, double *hi);
void br_chart_rail_limits(br_plot *p, const br_chain *c, int k);
double br_chart_limits_key(br_plot *p, double x, double y);

int br_chart_line(const br_chain *c, const br_steady_figs *f, const br_line_env *e, int standalone,
                  br_text *out);

/* The link that comes closest to its derated reverse rating (or, with no
 * rating anywhere, that blocks the most) over the ndir directions;
 * *dir gets the index in f of the direction where it does. */
int br_chart_worst_link(const br_chain *c, const br_steady_figs *f, int ndir, int *dir);

/* Link k over one period of the trace: forward current and reverse
 * voltage, with its rating and derated rating. */
int br_chart_diode(const br_chain *c, const br_steady_figs *f, int k, const br_trace *tr,
                   int standalone, br_text *out);

/* One histogram per judged criterion: the margins of the samples, the
 * failing side marked. */
int br_chart_yield(const br_yield *y, int standalone, br_text *out);

/* The worst margin of the coarse scans against duty and frequency. */
int br_chart_window(const br_window *w, int standalone, br_text *out);

/* A panel of the start-up chart (charts_heat.c): the supply's current
 * through the start-up (trace column 0), with its limit and rating. */
void br_chart_supply_panel(br_svg *s, const br_chain *c, const br_startup *su, const br_trace *tr,
                           double x, double y);

/* One stacked bar per stage (rail k and link k) of where the power goes
 * over a steady period, beside a bar of what the supply and the power
 * stage deliver; one panel per direction with a period. */
int br_chart_losses(const br_chain *c, const br_steady_figs *f, int ndir, int standalone,
                    br_text *out);

#endif

/* results_html.c - the HTML report and the --plot of `startup`, `steady`
 * and `analyze`. */
#include "report/budget_report.h"
#include "report/charts.h"
#include "report/html_report.h"
#include "report/report_common.h"
#include "report/results.h"
#include "report/supply_report.h"

#include "core/error.h"

#include <string.h>

static int oom(br_error *err)
{
    return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory rendering the HTML report");
}

/* Draw a chart into scratch and put it in the page as a figure. */
typedef int (*chart_fn)(const br_results *r, const br_results_traces *tr, int d, br_text *svg);

static int figure(br_text *out, const br_results *r, const br_results_traces *tr, int d,
                  chart_fn fn, const char *caption)
{
    br_text *svg = br_text_create();
    if (!svg)
        return BR_ENOMEM;
    int rc = fn(r, tr, d, svg);
    if (rc == BR_OK)
        rc = br_html_figure(out, svg, caption);
    br_text_free(svg);
    return rc;
}

static int startup_chart(const br_results *r, const br_results_traces *tr, int d, br_text *svg)
{
    (void)d;
    return br_chart_startup(r->c, &r->su, tr->startup, 0, svg);
}

static int ripple_chart(const br_results *r, const br_results_traces *tr, int d, br_text *svg)
{
    return br_chart_ripple(r->c, &r->figs[d], tr->steady[d], 0, svg);
}

static int line_chart(const br_results *r, const br_results_traces *tr, int d, br_text *svg)
{
    (void)tr;
    return br_chart_line(r->c, &r->figs[d], r->env, 0, svg);
}

static int diode_chart(const br_results *r, const br_results_traces *tr, int d, br_text *svg)
{
    (void)d;
    int dir;
    int k = br_chart_worst_link(r->c, r->figs, r->ndir, &dir);
    return br_chart_diode(r->c, &r->figs[dir], k, tr->steady[dir], 0, svg);
}

static int losses_chart(const br_results *r, const br_results_traces *tr, int d, br_text *svg)
{
    (void)tr;
    (void)d;
    return br_chart_losses(r->c, r->figs, r->ndir, 0, svg);
}

/* Text drawn by fn as paragraphs, one per line. */
static int paragraphs(br_text *out, const br_results *r, int (*fn)(const br_results *r, br_text *t))
{
    br_text *t = br_text_create();
    if (!t)
        return BR_ENOMEM;
    int rc = fn(r, t);
    char *line = (char *)br_text_data(t);
    for (char *end; rc == BR_OK && line && *line; line = end ? end + 1 : NULL) {
        end = strchr(line, '\n');
        if (end)
            *end = '\0';
        rc = br_html_para(out, line);
    }
    br_text_free(t);
    return rc;
}

static int supply_words(const br_results *r, br_text *t)
{
    return br_supply_profile_text(r->c, &r->su, t);
}

static int budget_words(const br_results *r, br_text *t)
{
    return br_budget_summary_text(r->c, r->figs, r->ndir, t);
}

static int losses_section(br_text *out, const br_results *r, const br_results_traces *tr)
{
    int rc = br_html_section(
        out, "Losses and heat",
        "Where the power goes over the steady period: what the supply delivers and what the power "
        "stage gives the chain through the return switches (reverse conduction, on-state drops, "
        "leakage, recovery) equal the losses of the rails and links.");
    rc |= paragraphs(out, r, budget_words);
    rc |= figure(out, r, tr, 0, losses_chart,
                 "Losses per stage (rail k and link k) beside what the supply and the power stage "
                 "deliver; the text report has them part by part.");
    return rc | br_html_section_end(out);
}

static int startup_section(br_text *out, const br_results *r, const br_results_traces *tr)
{
    int rc = br_html_section(
        out, "Start-up from cold",
        "Capacitors empty, drivers off, the design's pre-charge steps, then PWM. Thresholds are "
        "drawn where the rail must be for its driver: with a regulator they include its "
        "dropout. The green line marks the start that lasts.");
    rc |= br_html_startup_table(out, r->c, &r->su);
    if (!r->su.failed)
        rc |= paragraphs(out, r, supply_words);
    if (tr->startup)
        rc |= figure(out, r, tr, 0, startup_chart,
                     "Rail voltages from cold (the rows of the start-up CSV series).");
    return rc | br_html_section_end(out);
}

static int steady_section(br_text *out, const br_results *r, const br_results_traces *tr)
{
    int rc = br_html_section(out, "Steady state: rails",
                             r->env ? "Over the whole line cycle: each figure is the worst of "
                                      "every switching period of the line period, and the "
                                      "verdict names the line phase where it binds."
                                    : "One group of rows per current direction, every figure "
                                      "of a row from that direction. A rail's floor is the "
                                      "highest lower limit at the rail itself. The plots show "
                                      "two periods from the steady state found.");
    rc |= br_html_rail_table(out, r->c, r->figs, r->ndir);
    if (r->env)
        rc |= figure(out, r, tr, 0, line_chart,
                     "Each rail's lowest and highest voltage per switching period over the line "
                     "cycle (the rows of the line-min and line-max CSV series), with the load "
                     "current and the duty of each period.");
    for (int d = 0; d < r->ndir; d++)
        if (tr->steady[d])
            rc |= figure(out, r, tr, d, ripple_chart, NULL);
    rc |= br_html_section_end(out);
    rc |= br_html_section(out, "Diode stress",
                          "Reverse peak includes the design's edge overshoot; the derated limit "
                          "is the rating times the design's derating.");
    rc |= br_html_diode_table(out, r->c, r->figs, r->ndir);
    if (r->c->n > 1 && tr->steady[0])
        rc |= figure(out, r, tr, 0, diode_chart,
                     "Simulated reverse voltage (without the overshoot allowance) and forward "
                     "current of the link closest to its derated rating.");
    rc |= br_html_section_end(out);
    rc |= br_html_section(out, "Capacitor stress", NULL);
    rc |= br_html_cap_table(out, r->c, r->figs, r->ndir);
    rc |= br_html_section_end(out);
    return rc | losses_section(out, r, tr);
}

int br_results_html(const br_results *r, const br_results_traces *tr, br_text *out, br_error *err)
{
    static const char *const what[] = {"", "start-up", "steady state", "analysis"};
    int rc = br_html_begin(out, r->c, what[r->parts & BR_RUN_ALL]);
    rc |= br_html_verdict(out, r->c, &r->verdict, br_results_mask(r),
                          (r->parts & BR_RUN_STARTUP) ? &r->su : NULL);
    if (r->parts & BR_RUN_STARTUP)
        rc |= startup_section(out, r, tr);
    if (r->parts & BR_RUN_STEADY)
        rc |= steady_section(out, r, tr);
    rc |= br_html_end(out);
    return rc ? oom(err) : BR_OK;
}

/* The current direction whose driver supplies come nearest UVLO falling,
 * as the verdict found it (the first when that row does not apply). */
static int binding_dir(const br_results *r)
{
    const br_verdict_row *row = &r->verdict.row[BR_CRIT_UVLO];
    for (int d = 0; row->applies && d < r->ndir; d++)
        if (r->figs[d].dir == row->dir)
            return d;
    return 0;
}

int br_results_plot(const br_results *r, const br_results_traces *tr, br_text *out, br_error *err)
{
    int rc = BR_OK;
    if ((r->parts & BR_RUN_STARTUP) && tr->startup) {
        rc = br_chart_startup(r->c, &r->su, tr->startup, 1, out);
    } else if (r->env) {
        rc = br_chart_line(r->c, &r->figs[0], r->env, 1, out);
    } else if (r->ndir > 0) {
        int d = binding_dir(r);
        if (tr->steady[d])
            rc = br_chart_ripple(r->c, &r->figs[d], tr->steady[d], 1, out);
    }
    return rc ? oom(err) : BR_OK;
}

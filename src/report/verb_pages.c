/* verb_pages.c - HTML pages of the verbs that scan or sample. */
#include "report/verb_pages.h"

#include "core/error.h"
#include "report/charts.h"
#include "report/html_report.h"
#include "report/map_report.h"
#include "report/plot.h"
#include "report/window_report.h"
#include "report/yield_report.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

static int oom(br_error *err)
{
    return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory rendering the HTML report");
}

/* The overall judgement as a badge: the words carry it, colour helps. */
static int badge3(br_text *out, int outcome, const char *text)
{
    static const char *const cls[] = {"<div class=\"badge pass\">", "<div class=\"badge fail\">",
                                      "<div class=\"badge undet\">"};
    static const char *const word[] = {"PASS \xe2\x9c\x93  ", "FAIL \xe2\x9c\x97  ",
                                       "UNDETERMINED ?  "};
    int o = outcome == BR_OUTCOME_FAIL ? 1 : outcome == BR_OUTCOME_UNDETERMINED ? 2 : 0;
    int rc = br_text_put(out, cls[o]);
    rc |= br_html_text(out, word[o]);
    rc |= br_html_text(out, text);
    return rc | br_text_put(out, "</div>\n") ? BR_ENOMEM : BR_OK;
}

static int badge(br_text *out, int pass, const char *text)
{
    return badge3(out, pass ? BR_OUTCOME_PASS : BR_OUTCOME_FAIL, text);
}

/* The terminal report, without its caution, as preformatted text. */
static int full_text(br_text *out, const br_text *text)
{
    const char *s = br_text_data(text);
    const char *cut = strstr(s, "\nCaution:");
    size_t n = cut ? (size_t)(cut - s) : strlen(s);
    char *copy = strndup(s, n);
    if (!copy)
        return BR_ENOMEM;
    int rc = br_html_section(out, "The numbers", "The terminal report of the same run.");
    rc |= br_text_put(out, "<pre>");
    rc |= br_html_text(out, copy);
    rc |= br_text_put(out, "</pre>\n");
    free(copy);
    return rc | br_html_section_end(out);
}

typedef int (*svg_fn)(const void *a, br_text *svg);

static int figure(br_text *out, svg_fn fn, const void *a, const char *caption)
{
    br_text *svg = br_text_create();
    if (!svg)
        return BR_ENOMEM;
    int rc = fn(a, svg);
    if (rc == BR_OK)
        rc = br_html_figure(out, svg, caption);
    br_text_free(svg);
    return rc;
}

/* ---- map ----------------------------------------------------------------- */

typedef struct map_args {
    const br_chain *c;
    const br_map *m;
} map_args;

static int map_svg(const void *a, br_text *svg)
{
    const map_args *ma = a;
    br_error err;
    return br_map_svg(ma->c, ma->m, svg, &err);
}

int br_map_html(const br_chain *c, const br_map *m, const br_text *text, br_text *out,
                br_error *err)
{
    char what[160], line[320], v[32];
    const br_hold_point *d = &m->design;
    int rc = br_html_begin(out, c, "hold map");
    rc |= br_html_section(out, "Verdict", NULL);
    snprintf(line, sizeof line, "the design point %s, worst margin %s",
             d->holds ? "holds" : "does not hold", br_plot_si(v, sizeof v, d->margin, 4, "V"));
    rc |= badge(out, d->holds, line);
    snprintf(line, sizeof line, "At duty %.2f %% and %s the margin binds on: %s.", 100.0 * d->duty,
             br_plot_si(v, sizeof v, d->fsw, 4, "Hz"), br_hold_words(c, d, what, sizeof what));
    rc |= br_html_para(out, line);
    rc |= br_html_section_end(out);
    rc |= br_html_section(out, "Duty x frequency hold map",
                          "Worst margin of the periodic steady state over every rail and "
                          "current direction; below 0 V a criterion fails. The edge of the "
                          "holding region is drawn in black, the design point is marked.");
    map_args a = {c, m};
    rc |= figure(out, map_svg, &a, NULL);
    rc |= br_html_section_end(out);
    rc |= full_text(out, text);
    rc |= br_html_end(out);
    return rc ? oom(err) : BR_OK;
}

/* ---- yield --------------------------------------------------------------- */

static int yield_svg(const void *a, br_text *svg)
{
    return br_chart_yield(a, 0, svg);
}

/* The yield and its interval, in words for the badge. */
static void yield_words(const br_yield *y, char *line, size_t cap)
{
    if (isfinite(y->yield))
        snprintf(line, cap,
                 "yield %.2f %% (%ld pass, %ld fail, %ld undetermined of %ld), 95 %% interval "
                 "%.2f to %.2f %%",
                 100.0 * y->yield, y->pass, y->fail, y->undetermined, y->n, 100.0 * y->lo,
                 100.0 * y->hi);
    else
        snprintf(line, cap,
                 "no sample decided (%ld undetermined of %ld), 95 %% interval %.2f to %.2f %%",
                 y->undetermined, y->n, 100.0 * y->lo, 100.0 * y->hi);
}

int br_yield_html(const br_chain *c, const br_yield *y, double min_yield, const br_text *text,
                  br_text *out, br_error *err)
{
    char line[480];
    int rc = br_html_begin(out, c, "Monte Carlo yield");
    rc |= br_html_section(out, "Verdict", NULL);
    yield_words(y, line, sizeof line);
    rc |= badge3(out, br_yield_outcome(y, min_yield), line);
    if (min_yield >= 0)
        snprintf(line, sizeof line,
                 "Judged on the lower confidence bound against the minimum yield %.2f %%.",
                 100.0 * min_yield);
    else
        snprintf(line, sizeof line, "Passes only when every sample passes (no --min-yield).");
    rc |= br_html_para(out, line);
    if (y->undetermined > 0) {
        snprintf(line, sizeof line,
                 "%ld samples neither pass nor fail: the solver did not settle a steady state at "
                 "%ld of them and could not judge %ld. The yield is over the decided samples; "
                 "the lower bound counts the undetermined ones as failing, the upper bound as "
                 "passing.",
                 y->undetermined, y->unsettled, y->unjudged);
        rc |= br_html_para(out, line);
    }
    snprintf(line, sizeof line, "%ld samples drawn from the design's tolerances, seed %lu%s.", y->n,
             y->seed, y->startup ? ", start-up judged" : ", start-up not judged");
    rc |= br_html_para(out, line);
    rc |= br_html_section_end(out);
    rc |= br_html_section(out, "Margins of the samples",
                          "One histogram per criterion with a margin, over the samples that "
                          "decide it; bars left of the limit fail.");
    rc |= figure(out, yield_svg, y, NULL);
    rc |= br_html_section_end(out);
    rc |= full_text(out, text);
    rc |= br_html_end(out);
    return rc ? oom(err) : BR_OK;
}

/* ---- window -------------------------------------------------------------- */

static int window_svg(const void *a, br_text *svg)
{
    return br_chart_window(a, 0, svg);
}

int br_window_html(const br_chain *c, const br_window *w, const br_text *text, br_text *out,
                   br_error *err)
{
    char what[160], line[320], v[32];
    const br_hold_point *d = &w->design;
    int rc = br_html_begin(out, c, "hold window");
    rc |= br_html_section(out, "Verdict", NULL);
    snprintf(line, sizeof line, "the design point %s, worst margin %s",
             d->holds ? "holds" : "does not hold", br_plot_si(v, sizeof v, d->margin, 4, "V"));
    rc |= badge(out, d->holds, line);
    snprintf(line, sizeof line, "What binds at the design point: %s.",
             br_hold_words(c, d, what, sizeof what));
    rc |= br_html_para(out, line);
    rc |= br_html_section_end(out);
    rc |= br_html_section(out, "Margin along each axis",
                          "The coarse scans, the other coordinate held at the design's value; "
                          "dots that fail are vermillion.");
    rc |= figure(out, window_svg, w, NULL);
    rc |= br_html_section_end(out);
    rc |= full_text(out, text);
    rc |= br_html_end(out);
    return rc ? oom(err) : BR_OK;
}

/* ---- a verb's text as a page -------------------------------------------- */

/* The verdict line of text: the first line starting with one of
 * prefixes, joined with the lines indented by two spaces after it. */
static void verdict_line(const char *text, const char *const *prefixes, int join, char *buf,
                         size_t cap)
{
    const char *at = NULL;
    buf[0] = '\0';
    for (int i = 0; prefixes[i] && !at; i++)
        for (const char *l = text; l && *l && !at; l = strchr(l, '\n') ? strchr(l, '\n') + 1 : NULL)
            if (strncmp(l, prefixes[i], strlen(prefixes[i])) == 0)
                at = l;
    size_t n = 0;
    for (const char *l = at; l && *l && n + 1 < cap; l++) {
        if (*l == '\n') {
            if (!join || strncmp(l + 1, "  ", 2) != 0)
                break;
            while (l[1] == ' ')
                l++;
            buf[n++] = ' ';
            continue;
        }
        buf[n++] = *l;
    }
    buf[n] = '\0';
}

int br_text_html(const br_chain *c, const char *what, int outcome, const char *const *prefixes,
                 int join, const br_text *text, br_text *out, br_error *err)
{
    char line[640];
    verdict_line(br_text_data(text), prefixes, join, line, sizeof line);
    int rc = br_html_begin(out, c, what);
    rc |= br_html_section(out, "Verdict", NULL);
    rc |= badge3(out, outcome, line[0] ? line : "see the report below");
    rc |= br_html_section_end(out);
    rc |= full_text(out, text);
    rc |= br_html_end(out);
    return rc ? oom(err) : BR_OK;
}

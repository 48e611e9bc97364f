/* verdict_report.c - rendering the verdict table. */
#include "report/verdict_report.h"

#include "report/fmt.h"
#include "report/line_report.h"
#include "report/report_common.h"
#include "report/startup_report.h"
#include "report/table.h"
#include "report/vocab.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

enum { C_TITLE, C_RESULT, C_FIGURE, C_LIMIT, C_MARGIN, C_AT, C_DIR, NCOL };

/* A row names its current direction: every steady row, and the start-up
 * rows of a design that starts under load. */
static int names_dir(const br_verdict_row *r, int crit)
{
    return r->applies && isfinite(r->figure) && (!br_crit_is_startup(crit) || r->dir >= 0);
}

const char *br_verdict_word(const br_verdict_row *r)
{
    return !r->applies       ? "n/a"
           : r->undetermined ? "UNDETERMINED"
           : !r->pass        ? "FAIL"
           : r->warn         ? "WARN"
                             : "pass";
}

const char *br_crit_fmt(char *buf, size_t cap, int crit, double v)
{
    if (br_crit_never(crit, v))
        snprintf(buf, cap, crit == BR_CRIT_TJ ? "runaway" : "never starts");
    else if (crit == BR_CRIT_DROPOUTS && isfinite(v))
        snprintf(buf, cap, "%.0f", v);
    else
        br_fmt_si(buf, cap, v, 4, br_crit_unit(crit));
    return buf;
}

const char *br_crit_fmt_value(char *buf, size_t cap, int crit, double v)
{
    if (crit == BR_CRIT_TJ && isfinite(v))
        return br_fmt_temp(buf, cap, v, 1);
    return br_crit_fmt(buf, cap, crit, v);
}

/* A rail that never starts, or a junction that runs away, has no margin
 * to show; junction temperatures read in degrees Celsius. */
static void value_cell(br_table *t, int col, const br_verdict_row *r, double v)
{
    char b[BR_TABLE_CELL];
    if (!r->applies || (col == C_MARGIN && br_crit_never(r->crit, v)))
        br_table_set(t, col, "-");
    else if (col != C_MARGIN)
        br_table_set(t, col, "%s", br_crit_fmt_value(b, sizeof b, r->crit, v));
    else
        br_table_set(t, col, "%s", br_crit_fmt(b, sizeof b, r->crit, v));
}

static void row(br_table *t, const br_chain *c, const br_verdict_row *r)
{
    char b[BR_TABLE_CELL];
    br_table_row(t);
    br_table_set(t, C_TITLE, "%s", br_crit_title(r->crit));
    br_table_set(t, C_RESULT, "%s", br_verdict_word(r));
    value_cell(t, C_FIGURE, r, r->figure);
    value_cell(t, C_LIMIT, r, r->limit);
    if (br_crit_has_margin(r->crit))
        value_cell(t, C_MARGIN, r, r->margin);
    else /* a status: its figure is information, it has no margin */
        br_table_set(t, C_MARGIN, "-");
    br_table_set(t, C_AT, "%s",
                 r->applies ? br_crit_place(c, r->crit, r->stage, r->aux, b, sizeof b) : "-");
    if (names_dir(r, r->crit) && r->dir == BR_DIRI_LINE && r->line_period >= 0)
        br_table_set(t, C_DIR, "%.0f deg", br_line_deg(r->line_theta));
    else
        br_table_set(t, C_DIR, "%s", names_dir(r, r->crit) ? br_dir_label(r->dir) : "-");
}

static int render_table(const br_chain *c, const br_verdict *v, unsigned mask, br_text *out)
{
    br_table *t = br_table_create(NCOL, BR_CRIT_COUNT);
    if (!t)
        return BR_ENOMEM;
    static const char *const heads[NCOL] = {"criterion", "result", "figure",   "limit",
                                            "margin",    "at",     "direction"};
    for (int col = 0; col < NCOL; col++) {
        int left = col == C_TITLE || col == C_RESULT || col >= C_AT;
        br_table_head(t, col, heads[col], left ? BR_LEFT : BR_RIGHT);
    }
    for (int i = 0; i < BR_CRIT_COUNT; i++)
        if (mask & BR_CRIT_BIT(i))
            row(t, c, &v->row[i]);
    int rc = br_table_render(t, 2, out);
    br_table_free(t);
    return rc;
}

/* Why a row failed, warns or does not apply, wrapped under its title. */
static int render_notes(const br_chain *c, const br_verdict *v, unsigned mask, const br_startup *su,
                        br_text *out)
{
    int rc = BR_OK;
    br_text *why = br_text_create();
    if (!why)
        return BR_ENOMEM;
    for (int i = 0; i < BR_CRIT_COUNT; i++) {
        const br_verdict_row *r = &v->row[i];
        /* a passing row says something only with a warning or a note (the
         * ratings the inrush was judged against) */
        if (!(mask & BR_CRIT_BIT(i)) || (r->applies && r->pass && !r->warn && !r->note[0]))
            continue;
        br_text_reset(why);
        rc |= br_verdict_why(c, v, i, su, why);
        if (br_text_len(why) == 0)
            continue;
        char lead[128];
        snprintf(lead, sizeof lead, "  %s %s: ", br_verdict_word(r), br_crit_title(i));
        rc |= br_report_wrap(out, lead, br_text_data(why), 4);
    }
    br_text_free(why);
    return rc;
}

/* The dropouts row at length: the note's figures and what they mean. */
static int dropouts_why(const br_chain *c, const br_verdict_row *r, br_text *why)
{
    int k = r->stage;
    if (!r->applies || r->undetermined || k < 0 || k >= c->n)
        return br_text_put(why, r->note);
    int rc = br_text_printf(why,
                            "rail %d (%s) dropped out %.0f times during the start-up, the most "
                            "of any stage",
                            k, c->st[k].name, r->figure);
    if (c->max_dropouts >= 0)
        return rc | br_text_printf(why, "; the design allows %d (max-dropouts)", c->max_dropouts);
    if (!r->warn)
        return rc | br_text_printf(why, "; a warning above %d, no limit stated", BR_DROPOUTS_WARN);
    return rc | br_text_printf(why,
                               ", more than %d: a chain filling rung by rung hiccups a few times "
                               "per rung, more means the start leans on the UVLO hysteresis to "
                               "limit its current, and each dropout leaves a switch undriven "
                               "while the PWM runs; only a warning, as the design states no "
                               "limit (<analysis max-dropouts=\"N\">)",
                               BR_DROPOUTS_WARN);
}

int br_verdict_why(const br_chain *c, const br_verdict *v, int i, const br_startup *su,
                   br_text *why)
{
    const br_verdict_row *r = &v->row[i];
    if (i == BR_CRIT_STARTUP && su && r->applies && !r->undetermined && !su->complete)
        return br_startup_stall_text(c, su, why);
    if (i == BR_CRIT_DROPOUTS)
        return dropouts_why(c, r, why);
    return br_text_put(why, r->note);
}

void br_verdict_count_rows(const br_verdict *v, unsigned mask, br_verdict_count *n)
{
    memset(n, 0, sizeof *n);
    for (int i = 0; i < BR_CRIT_COUNT; i++) {
        if (!(mask & BR_CRIT_BIT(i)))
            continue;
        const br_verdict_row *r = &v->row[i];
        n->judged += r->applies && !r->undetermined;
        n->undetermined += r->undetermined;
        n->failed += r->applies && !r->pass && !r->undetermined;
        n->warned += r->applies && r->pass && r->warn && !r->undetermined;
        n->na += !r->applies;
    }
}

static int render_overall(const br_verdict *v, unsigned mask, br_text *out)
{
    br_verdict_count n;
    br_verdict_count_rows(v, mask, &n);
    if (n.failed > 0)
        return br_text_printf(out, "verdict: FAIL, %d of %d criteria judged fail%s\n", n.failed,
                              n.judged, n.undetermined ? " (others undetermined)" : "");
    if (n.undetermined > 0) /* never a pass: what was not decided may fail */
        return br_text_printf(out,
                              "verdict: UNDETERMINED, %d criteria could not be decided (see "
                              "above), %d judged pass\n",
                              n.undetermined, n.judged);
    if (n.warned > 0)
        return br_text_printf(out,
                              "verdict: PASS, all %d criteria judged pass, %d with a warning "
                              "(%d not applicable)\n",
                              n.judged, n.warned, n.na);
    return br_text_printf(out, "verdict: PASS, all %d criteria judged pass (%d not applicable)\n",
                          n.judged, n.na);
}

int br_verdict_text(const br_chain *c, const br_verdict *v, unsigned mask, const br_startup *su,
                    br_text *out)
{
    int rc = br_text_put(out, "verdict (margin = limit - figure for a maximum, figure - limit for "
                              "a minimum; at = where it binds)\n");
    rc |= render_table(c, v, mask, out);
    rc |= render_notes(c, v, mask, su, out);
    rc |= render_overall(v, mask, out);
    return rc ? BR_ENOMEM : BR_OK;
}

/* The figures of a row: a rail that never starts has neither a start-up
 * time nor a margin, and says so. */
static void row_numbers_xml(br_xmlw *w, const br_verdict_row *r)
{
    int never = br_crit_never(r->crit, r->figure);
    br_xmlw_bool(w, "pass", r->pass);
    if (never)
        br_xmlw_bool(w, r->crit == BR_CRIT_TJ ? "runaway" : "never-starts", 1);
    else
        br_xmlw_num(w, "figure", r->figure);
    br_xmlw_num(w, "limit", r->limit);
    if (!never)
        br_xmlw_num(w, "margin", r->margin);
    br_xmlw_attr(w, "unit", r->unit ? r->unit : "");
    if (r->warn)
        br_xmlw_bool(w, "warn", 1);
}

/* The note of a row: the same words as the text's. */
static void row_note_xml(br_xmlw *w, const br_chain *c, const br_verdict *v, int i,
                         const br_startup *su)
{
    br_text *why = br_text_create();
    if (!why || br_verdict_why(c, v, i, su, why) != BR_OK) {
        br_xmlw_fail(w);
    } else if (br_text_len(why) > 0) {
        br_xmlw_attr(w, "note", br_text_data(why));
    }
    br_text_free(why);
}

void br_verdict_xml(br_xmlw *w, const br_chain *c, const br_verdict *v, unsigned mask,
                    const br_startup *su)
{
    int all = 1, failed = 0;
    for (int i = 0; i < BR_CRIT_COUNT; i++) {
        const br_verdict_row *r = &v->row[i];
        if ((mask & BR_CRIT_BIT(i)) && r->applies && !r->pass) {
            all = 0;
            failed += !r->undetermined;
        }
    }
    br_xmlw_start(w, "verdict");
    br_xmlw_bool(w, "pass", all);
    br_xmlw_attr(w, "result", all ? "pass" : failed ? "fail" : "undetermined");
    for (int i = 0; i < BR_CRIT_COUNT; i++) {
        const br_verdict_row *r = &v->row[i];
        if (!(mask & BR_CRIT_BIT(i)))
            continue;
        br_xmlw_start(w, "criterion");
        br_xmlw_attr(w, "name", br_crit_name(i));
        br_xmlw_attr(w, "title", br_crit_title(i));
        br_xmlw_bool(w, "applies", r->applies);
        br_xmlw_attr(w, "result",
                     !r->applies       ? "n/a"
                     : r->undetermined ? "undetermined"
                     : r->pass         ? "pass"
                                       : "fail");
        if (r->applies)
            row_numbers_xml(w, r);
        if (r->applies && r->stage >= 0 && r->stage < c->n) {
            br_xmlw_int(w, "stage", r->stage);
            br_xmlw_attr(w, "switch", c->st[r->stage].name);
        }
        if (names_dir(r, i))
            br_xmlw_attr(w, "direction", br_dir_label(r->dir));
        if (r->applies && !r->undetermined)
            br_line_xml_row(w, c, r);
        row_note_xml(w, c, v, i, su);
        br_xmlw_end(w);
    }
    br_xmlw_end(w);
}

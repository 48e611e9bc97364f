/* html_report.c - the page skeleton, the verdict and the stress tables of
 * the HTML reports. */
#include "report/html_report.h"

#include "report/line_report.h"

#include "report/caution.h"
#include "report/plot.h"
#include "report/report_common.h"
#include "report/startup_report.h"
#include "report/supply_report.h"
#include "report/svg.h"
#include "report/verdict_report.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

/* Our own look: a deep slate header on a warm stone page, white cards,
 * tables that read in print, preformatted text on parchment with a
 * brass rule.  Results are told apart by words and symbols as well as by
 * colour.  The palette:
 *   ink #20262d, page #efede6, card #ffffff, rules #d8d3c7,
 *   header #2a3846 on #f4f1ea, table heads #ebe7dc, zebra rows #f8f6f1,
 *   preformatted #f4efe2 with a #b89f5f rule, accents from the plots'
 *   Okabe-Ito colours. */
static const char STYLE[] =
    "body{margin:0;background:#efede6;color:#20262d;"
    "font:16px/1.45 'DejaVu Sans',Verdana,system-ui,sans-serif}\n"
    "header{background:#2a3846;color:#f4f1ea;padding:20px 32px}\n"
    "header h1{margin:0 0 4px;font-size:26px;letter-spacing:.5px}\n"
    "header p{margin:2px 0;color:#dcd6c8}\n"
    "main{max-width:1240px;margin:0 auto;padding:16px 20px 40px}\n"
    "section{background:#fff;border:1px solid #d8d3c7;border-radius:6px;margin:18px 0;"
    "padding:14px 22px}\n"
    "h2{font-size:21px;margin:4px 0 10px;border-bottom:3px solid #0072B2;"
    "display:inline-block;padding-bottom:2px}\n"
    "h3{font-size:17px;margin:14px 0 4px}\n"
    "table{border-collapse:collapse;margin:8px 0;font-size:15px}\n"
    "th,td{border-bottom:1px solid #d8d3c7;padding:5px 12px;text-align:right;"
    "white-space:nowrap}\n"
    "th{background:#ebe7dc;text-align:center}\n"
    "td.l,th.l{text-align:left}\n"
    "tbody tr:nth-child(even){background:#f8f6f1}\n"
    "tr.group th{background:#2a3846;color:#f4f1ea;text-align:left}\n"
    ".pass{color:#00603f;font-weight:bold}\n"
    ".fail{color:#a33a00;font-weight:bold;background:#fbe9dd}\n"
    ".na{color:#5d6268}\n"
    ".badge{display:inline-block;font-size:22px;font-weight:bold;padding:6px 18px;"
    "border-radius:4px;margin:4px 0 8px}\n"
    ".badge.pass{background:#dff3eb;border:2px solid #009E73}\n"
    ".badge.fail{border:2px solid #D55E00}\n"
    ".undet{color:#6b4e00;font-weight:bold;background:#fdf3d0}\n"
    ".badge.undet{border:2px solid #E69F00}\n"
    ".warn{color:#6b4e00;font-weight:bold}\n"
    ".note{margin:4px 0;color:#3b4148}\n"
    "figure{margin:10px 0;overflow-x:auto}\n"
    "pre{font-size:14px;background:#f4efe2;border-left:4px solid #b89f5f;padding:10px;"
    "overflow-x:auto}\n"
    "figure svg{max-width:100%;height:auto;display:block}\n"
    "figcaption{font-size:15px;color:#3b4148;margin-top:4px}\n"
    ".caution{background:#fff6df;border:2px solid #E69F00}\n"
    ".caution h2{border-bottom-color:#E69F00}\n"
    "footer{text-align:center;color:#5d6268;font-size:14px}\n"
    "@media print{body{background:#fff}section{border:none;break-inside:avoid}"
    "header{background:#fff;color:#000;border-bottom:3px solid #000}"
    "header p{color:#000}tr.group th{background:#fff;color:#000}}\n";

int br_html_text(br_text *out, const char *text)
{
    return br_xml_escape_put(out, text);
}

static int tag_text(br_text *out, const char *open, const char *text, const char *close)
{
    int rc = br_text_put(out, open);
    rc |= br_html_text(out, text);
    return rc | br_text_put(out, close) ? BR_ENOMEM : BR_OK;
}

int br_html_para(br_text *out, const char *text)
{
    return tag_text(out, "<p class=\"note\">", text, "</p>\n");
}

static int operating_point(br_text *out, const br_chain *c)
{
    char a[32], b[32], d[32], i[32], duty[32], what[160];
    char line[400];
    if (c->line.on)
        snprintf(duty, sizeof duty, "duty from the modulation");
    else
        snprintf(duty, sizeof duty, "duty %.1f %%", 100.0 * c->duty);
    char ta[32], tj[32];
    br_fmt_temp(ta, sizeof ta, c->tamb, 0);
    br_fmt_temp(tj, sizeof tj, c->tj, 0);
    int n = snprintf(
        line, sizeof line, "%d switches, bus %s, switching at %s, %s, dead time %s, ambient %s",
        c->n, br_plot_si(a, sizeof a, c->vin, 4, "V"), br_plot_si(b, sizeof b, c->fsw, 4, "Hz"),
        duty, br_plot_si(d, sizeof d, c->deadtime, 3, "s"), ta);
    if (c->line.on && n > 0 && (size_t)n < sizeof line)
        snprintf(line + n, sizeof line - (size_t)n, ", %s (switches at %s; start-up %s)",
                 br_line_describe(c, what, sizeof what), tj,
                 c->load_from < HUGE_VAL ? "under load" : "at no load");
    else if (c->direction != BR_DIR_NONE && n > 0 && (size_t)n < sizeof line)
        snprintf(line + n, sizeof line - (size_t)n,
                 ", load current %s (switches at %s; start-up %s)",
                 br_plot_si(i, sizeof i, c->iload, 4, "A"), tj,
                 c->load_from < HUGE_VAL ? "under load" : "at no load");
    int rc = tag_text(out, "<p>", line, "</p>\n");
    for (int k = 1; k < c->n; k++) { /* each isolated supply feeding a rail */
        const br_stage *st = &c->st[k];
        if (!st->inject)
            continue;
        char lim[200];
        br_inject_limit_words(st, lim, sizeof lim);
        snprintf(line, sizeof line,
                 "Injection into rail %d (%s): an isolated supply of %s through %s and diode %s, "
                 "on from %s%s; no link from rail %d",
                 k, st->name, br_plot_si(a, sizeof a, st->vinj, 4, "V"),
                 br_plot_si(b, sizeof b, st->r_link, 3, "ohm"), st->diode.id,
                 br_plot_si(d, sizeof d, st->tinj, 3, "s"), lim, k - 1);
        rc |= tag_text(out, "<p>", line, "</p>\n");
    }
    return rc;
}

int br_html_begin(br_text *out, const br_chain *c, const char *what)
{
    const br_design *d = c->design;
    const char *name = d && d->name[0] ? d->name : "design";
    int rc = br_text_put(out, "<!DOCTYPE html>\n"
                              "<html xmlns=\"http://www.w3.org/1999/xhtml\" lang=\"en\">\n"
                              "<head>\n<meta charset=\"utf-8\"/>\n"
                              "<meta name=\"viewport\" content=\"width=device-width\"/>\n"
                              "<title>bootrung ");
    rc |= br_html_text(out, what);
    rc |= br_text_put(out, ": ");
    rc |= br_html_text(out, name);
    rc |= br_text_printf(out, "</title>\n<style>\n%s</style>\n</head>\n<body>\n<header>\n", STYLE);
    rc |= br_text_put(out, "<h1>");
    rc |= br_html_text(out, name);
    rc |= br_text_put(out, "</h1>\n");
    char line[700];
    snprintf(line, sizeof line, "bootrung %s of %s", what, d ? d->path : "");
    rc |= tag_text(out, "<p>", line, "</p>\n");
    rc |= operating_point(out, c);
    rc |= br_text_put(out, "</header>\n<main>\n");
    return rc ? BR_ENOMEM : BR_OK;
}

int br_html_section(br_text *out, const char *heading, const char *intro)
{
    int rc = tag_text(out, "<section>\n<h2>", heading, "</h2>\n");
    if (intro)
        rc |= br_html_para(out, intro);
    return rc ? BR_ENOMEM : BR_OK;
}

int br_html_section_end(br_text *out)
{
    return br_text_put(out, "</section>\n");
}

int br_html_figure(br_text *out, const br_text *svg, const char *caption)
{
    const char *s = br_text_data(svg);
    if (strncmp(s, "<?xml", 5) == 0) {
        const char *nl = strchr(s, '\n');
        s = nl ? nl + 1 : s;
    }
    int rc = br_text_put(out, "<figure>\n");
    rc |= br_text_put(out, s);
    if (caption)
        rc |= tag_text(out, "<figcaption>", caption, "</figcaption>\n");
    return rc | br_text_put(out, "</figure>\n") ? BR_ENOMEM : BR_OK;
}

/* ---- cells ----------------------------------------------------------------- */

static int cell(br_text *out, const char *cls, const char *text)
{
    int rc =
        br_text_printf(out, "<td%s%s%s>", cls ? " class=\"" : "", cls ? cls : "", cls ? "\"" : "");
    rc |= br_html_text(out, text);
    return rc | br_text_put(out, "</td>") ? BR_ENOMEM : BR_OK;
}

static int cell_si(br_text *out, double v, int digits, const char *unit)
{
    char b[48];
    return cell(out, NULL, br_plot_si(b, sizeof b, v, digits, unit));
}

/* "pass ✓" / "FAIL ✗" / "n/a": the word carries the meaning, the colour
 * only helps. */
static int cell_result(br_text *out, int applies, int pass)
{
    if (!applies)
        return cell(out, "l na", "n/a");
    return cell(out, pass ? "l pass" : "l fail", pass ? "pass \xe2\x9c\x93" : "FAIL \xe2\x9c\x97");
}

/* A verdict row's result: as cell_result, and a criterion the solver
 * could not decide is neither pass nor fail. */
static int cell_verdict(br_text *out, const br_verdict_row *r)
{
    if (r->undetermined)
        return cell(out, "l undet", "UNDETERMINED ?");
    if (r->applies && r->pass && r->warn)
        return cell(out, "l warn", "WARN !");
    return cell_result(out, r->applies, r->pass);
}

static int head_row(br_text *out, const char *const *heads, int n)
{
    int rc = br_text_put(out, "<table>\n<thead><tr>");
    for (int i = 0; i < n; i++)
        rc |= tag_text(out, i == 0 ? "<th class=\"l\">" : "<th>", heads[i], "</th>");
    return rc | br_text_put(out, "</tr></thead>\n<tbody>\n") ? BR_ENOMEM : BR_OK;
}

static int table_end(br_text *out)
{
    return br_text_put(out, "</tbody>\n</table>\n");
}

/* ---- verdict --------------------------------------------------------------- */

/* As br_crit_fmt (a figure or limit: br_crit_fmt_value), with the plots'
 * number style for the rest. */
static int crit_cell(br_text *out, int crit, double v, int margin)
{
    char b[48];
    if (br_crit_never(crit, v) || crit == BR_CRIT_DROPOUTS)
        return cell(out, NULL, br_crit_fmt(b, sizeof b, crit, v));
    if (crit == BR_CRIT_TJ && !margin)
        return cell(out, NULL, br_crit_fmt_value(b, sizeof b, crit, v));
    return cell_si(out, v, 4, br_crit_unit(crit));
}

static int verdict_row(br_text *out, const br_chain *c, const br_verdict_row *r)
{
    char at[64];
    int startup = br_crit_is_startup(r->crit);
    int rc = br_text_put(out, "<tr>");
    rc |= cell(out, "l", br_crit_title(r->crit));
    rc |= cell_verdict(out, r);
    if (r->applies && !r->undetermined) {
        /* a rail that never starts has no start-up time and no margin */
        int never = br_crit_never(r->crit, r->figure);
        rc |= crit_cell(out, r->crit, r->figure, 0);
        rc |= crit_cell(out, r->crit, r->limit, 0);
        rc |= never || !br_crit_has_margin(r->crit) ? cell(out, NULL, "-")
                                                    : crit_cell(out, r->crit, r->margin, 1);
    } else {
        rc |= cell(out, NULL, "-") | cell(out, NULL, "-") | cell(out, NULL, "-");
    }
    if (r->applies)
        br_crit_place(c, r->crit, r->stage, r->aux, at, sizeof at);
    else
        snprintf(at, sizeof at, "-");
    rc |= cell(out, "l", at);
    if (r->applies && !startup && r->dir == BR_DIRI_LINE && r->line_period >= 0)
        snprintf(at, sizeof at, "line cycle at %.0f deg", br_line_deg(r->line_theta));
    else
        snprintf(at, sizeof at, "%s", r->applies && !startup ? br_dir_label(r->dir) : "-");
    rc |= cell(out, "l", at);
    return rc | br_text_put(out, "</tr>\n") ? BR_ENOMEM : BR_OK;
}

static int verdict_notes(br_text *out, const br_chain *c, const br_verdict *v, unsigned mask,
                         const br_startup *su)
{
    int rc = BR_OK;
    br_text *why = br_text_create();
    if (!why)
        return BR_ENOMEM;
    for (int i = 0; i < BR_CRIT_COUNT; i++) {
        const br_verdict_row *r = &v->row[i];
        if (!(mask & (1u << i)) || (r->applies && r->pass && !r->warn && !r->note[0]))
            continue;
        br_text_reset(why);
        rc |= br_text_printf(why, "%s %s: ", br_verdict_word(r), br_crit_title(i));
        size_t head = br_text_len(why);
        rc |= br_verdict_why(c, v, i, su, why);
        if (br_text_len(why) > head)
            rc |= br_html_para(out, br_text_data(why));
    }
    br_text_free(why);
    return rc;
}

int br_html_verdict(br_text *out, const br_chain *c, const br_verdict *v, unsigned mask,
                    const br_startup *su)
{
    static const char *const heads[] = {"criterion", "result",   "figure",   "limit",
                                        "margin",    "binds at", "direction"};
    br_verdict_count n;
    br_verdict_count_rows(v, mask, &n);
    int rc = br_html_section(out, "Verdict", NULL);
    char line[160];
    const char *cls = "<div class=\"badge pass\">";
    if (n.failed) {
        snprintf(line, sizeof line, "FAIL \xe2\x9c\x97  %d of %d criteria judged fail", n.failed,
                 n.judged);
        cls = "<div class=\"badge fail\">";
    } else if (n.undetermined) { /* never a pass: what was not decided may fail */
        snprintf(line, sizeof line, "UNDETERMINED ?  %d criteria could not be decided",
                 n.undetermined);
        cls = "<div class=\"badge undet\">";
    } else if (n.warned) {
        snprintf(line, sizeof line,
                 "PASS \xe2\x9c\x93  all %d criteria judged pass, %d with a warning", n.judged,
                 n.warned);
    } else {
        snprintf(line, sizeof line, "PASS \xe2\x9c\x93  all %d criteria judged pass", n.judged);
    }
    rc |= tag_text(out, cls, line, "</div>\n");
    rc |= head_row(out, heads, 7);
    for (int i = 0; i < BR_CRIT_COUNT; i++)
        if (mask & (1u << i))
            rc |= verdict_row(out, c, &v->row[i]);
    rc |= table_end(out);
    rc |= br_html_para(out, "Margin = limit - figure for a maximum, figure - limit for a minimum; "
                            "a negative margin fails.");
    rc |= verdict_notes(out, c, v, mask, su);
    return rc | br_html_section_end(out) ? BR_ENOMEM : BR_OK;
}

/* ---- tables ---------------------------------------------------------------- */

int br_html_startup_table(br_text *out, const br_chain *c, const br_startup *su)
{
    static const char *const heads[] = {"stage",    "first start", "final start",
                                        "dropouts", "inrush peak", "inrush limit",
                                        "result",   "rail at end"};
    char b[48];
    int rc = head_row(out, heads, 8);
    for (int k = 0; k < c->n; k++) {
        const br_startup_stage *s = &su->st[k];
        br_inrush_check ck[BR_RATING_COUNT];
        int bind = -1, n = k > 0 ? br_inrush_link(c, su, k, ck, &bind) : 0;
        rc |= br_text_put(out, "<tr>");
        rc |= cell(out, "l", c->st[k].name);
        rc |= cell(out, NULL, br_plot_time(b, sizeof b, s->first_enable));
        rc |= cell(out, s->final_enable < 0 ? "fail" : NULL,
                   s->final_enable < 0 ? "never" : br_plot_time(b, sizeof b, s->final_enable));
        snprintf(b, sizeof b, "%d", s->ndropouts);
        rc |= cell(out, NULL, b);
        rc |= k > 0 ? cell_si(out, s->ipeak, 3, "A") : cell(out, NULL, "-");
        if (n > 0) { /* the binding one of IFRM, IFSM and I2t, named */
            char v[32];
            snprintf(b, sizeof b, "%s %s", br_plot_si(v, sizeof v, ck[bind].limit, 3, "A"),
                     br_rating_name(ck[bind].rating));
            rc |= cell(out, NULL, b);
        } else {
            rc |= cell(out, NULL, "-");
        }
        rc |= cell_result(out, 1, s->final_enable >= 0 && !(n > 0 && ck[bind].margin < 0));
        rc |= cell_si(out, s->vend, 4, "V");
        rc |= br_text_put(out, "</tr>\n");
    }
    return rc | table_end(out) ? BR_ENOMEM : BR_OK;
}

/* One group of rows per current direction: a heading row naming it,
 * then its rows, each row's figures all from that direction.  A
 * direction without a period says why instead. */
static int group_row(br_text *out, const br_steady_figs *f, int ncol)
{
    char what[400];
    int rc = br_text_printf(out, "<tr class=\"group\" data-direction=\"%s\"><th colspan=\"%d\">",
                            br_dir_label(f->dir), ncol);
    snprintf(what, sizeof what, "%s", br_dir_label(f->dir));
    if (!br_steady_has_period(f->ss))
        snprintf(what, sizeof what, "%s: no period to take figures from (%s)", br_dir_label(f->dir),
                 f->ss->why);
    rc |= br_html_text(out, what);
    return rc | br_text_put(out, "</th></tr>\n");
}

static int row_open(br_text *out, const br_steady_figs *f)
{
    return br_text_printf(out, "<tr data-direction=\"%s\">", br_dir_label(f->dir));
}

/* Rail k's row: every figure and margin from direction f. */
static int rail_row(br_text *out, const br_chain *c, const br_steady_figs *f, int k)
{
    const br_rail_fig *r = &f->rail[k];
    char b[96], lab[48];
    int what, drive = c->min_drive > 0, gate = c->st[k].sw.vgs_max > 0;
    double floor = br_rail_floor(c, k, &what), above = r->vmin - floor;
    int pass = r->m_uvlo >= 0 && r->m_restart >= 0 && (!drive || r->m_drive >= 0) &&
               (!gate || r->m_gate >= 0) && !(above < 0);
    int rc = row_open(out, f) | cell(out, "l", c->st[k].name);
    rc |= cell_si(out, r->vmin, 4, "V") | cell_si(out, r->vmax, 4, "V");
    rc |= cell_si(out, r->ripple, 3, "V");
    if (isfinite(floor)) {
        char v[32];
        snprintf(b, sizeof b, "%s (%s)", br_plot_si(v, sizeof v, floor, 3, "V"),
                 br_rail_limit_label(c, k, what, lab, sizeof lab));
        rc |= cell(out, "l", b) | cell_si(out, above, 3, "V");
    } else {
        rc |=
            cell(out, "l", isinf(floor) && floor > 0 ? "out of reach" : "-") | cell(out, NULL, "-");
    }
    rc |= cell_si(out, r->vdrv_min, 4, "V") | cell_si(out, r->vdrv_max, 4, "V");
    rc |= cell_si(out, r->m_uvlo, 3, "V") | cell_si(out, r->m_restart, 3, "V");
    rc |= drive ? cell_si(out, r->m_drive, 3, "V") : cell(out, NULL, "-");
    rc |= gate ? cell_si(out, r->m_gate, 3, "V") : cell(out, NULL, "-");
    rc |= cell_result(out, 1, pass);
    return rc | br_text_put(out, "</tr>\n") ? BR_ENOMEM : BR_OK;
}

int br_html_rail_table(br_text *out, const br_chain *c, const br_steady_figs *f, int ndir)
{
    static const char *const heads[] = {"rail",
                                        "min",
                                        "max",
                                        "ripple",
                                        "floor",
                                        "above floor",
                                        "driver min",
                                        "driver max",
                                        "to UVLO falling",
                                        "to UVLO rising",
                                        "to minimum drive",
                                        "to gate maximum",
                                        "result"};
    int rc = head_row(out, heads, 13);
    for (int d = 0; d < ndir; d++) {
        rc |= group_row(out, &f[d], 13);
        for (int k = 0; k < c->n && br_steady_has_period(f[d].ss); k++)
            rc |= rail_row(out, c, &f[d], k);
    }
    return rc | table_end(out) ? BR_ENOMEM : BR_OK;
}

static int diode_row(br_text *out, const br_chain *c, const br_steady_figs *f, int k)
{
    const br_link_fig *w = &f->link[k];
    char b[48];
    double lim = c->derating * w->vrrm;
    int rc = row_open(out, f) | cell(out, "l", c->st[k].name);
    rc |= cell_si(out, w->vrev_sim, 4, "V") | cell_si(out, w->vrev_stress, 4, "V");
    rc |= w->vrrm > 0 ? cell_si(out, lim, 4, "V") : cell(out, NULL, "unrated");
    snprintf(b, sizeof b, "%.0f %%", 100.0 * w->share);
    rc |= cell(out, NULL, w->vrrm > 0 ? b : "-");
    rc |= cell_si(out, w->ipeak, 3, "A") | cell_si(out, w->irms, 3, "A");
    rc |= cell_si(out, w->iavg, 3, "A") | cell_si(out, w->idisp, 3, "A");
    rc |= cell_si(out, w->qrr, 3, "C") | cell_si(out, w->irrm, 3, "A");
    rc |= cell_si(out, w->p_diode, 3, "W");
    rc |= cell_result(out, w->vrrm > 0, w->vrev_stress <= lim);
    return rc | br_text_put(out, "</tr>\n") ? BR_ENOMEM : BR_OK;
}

int br_html_diode_table(br_text *out, const br_chain *c, const br_steady_figs *f, int ndir)
{
    static const char *const heads[] = {
        "link",         "peak reverse", "reverse stress",  "derated rating",    "share of rating",
        "forward peak", "forward RMS",  "forward average", "displacement peak", "Qrr",
        "Irrm",         "diode loss",   "result"};
    int rc = head_row(out, heads, 13);
    for (int d = 0; d < ndir; d++) {
        rc |= group_row(out, &f[d], 13);
        for (int k = 1; k < c->n && br_steady_has_period(f[d].ss); k++)
            rc |= diode_row(out, c, &f[d], k);
    }
    return rc | table_end(out) ? BR_ENOMEM : BR_OK;
}

static int cap_row(br_text *out, const br_chain *c, const br_steady_figs *f, int k)
{
    const br_rail_fig *r = &f->rail[k];
    int rc = row_open(out, f) | cell(out, "l", c->st[k].name);
    rc |= cell(out, "l", c->st[k].cap.id ? c->st[k].cap.id : "-");
    rc |= cell_si(out, r->c_eff, 3, "F") | cell_si(out, r->vcap_peak, 4, "V");
    rc |= r->vcap_rating > 0 ? cell_si(out, r->vcap_rating, 3, "V") : cell(out, NULL, "-");
    rc |= cell_si(out, r->icap_rms, 3, "A");
    rc |= cell_result(out, r->vcap_rating > 0, r->vcap_peak <= r->vcap_rating);
    return rc | br_text_put(out, "</tr>\n") ? BR_ENOMEM : BR_OK;
}

int br_html_cap_table(br_text *out, const br_chain *c, const br_steady_figs *f, int ndir)
{
    static const char *const heads[] = {"rail",   "part",        "C at bias", "peak",
                                        "rating", "RMS current", "result"};
    int rc = head_row(out, heads, 7);
    for (int d = 0; d < ndir; d++) {
        rc |= group_row(out, &f[d], 7);
        for (int k = 1; k < c->n && br_steady_has_period(f[d].ss); k++)
            rc |= cap_row(out, c, &f[d], k);
    }
    return rc | table_end(out) ? BR_ENOMEM : BR_OK;
}

/* ---- end ------------------------------------------------------------------- */

int br_html_end(br_text *out)
{
    br_text *t = br_text_create();
    if (!t)
        return BR_ENOMEM;
    int rc = br_report_caution(t);
    /* one paragraph: the text report's line breaks mean nothing here */
    char buf[1024];
    snprintf(buf, sizeof buf, "%s", br_text_data(t));
    char *s = buf;
    for (char *p = s; *p; p++)
        if (*p == '\n')
            *p = ' ';
    while (*s == ' ')
        s++;
    rc |= br_text_put(out, "<section class=\"caution\">\n<h2>High voltage: read this</h2>\n");
    rc |= tag_text(out, "<p>", s, "</p>\n");
    rc |= br_text_put(out, "</section>\n</main>\n<footer><p>Made by bootrung. Self-contained "
                           "page: no scripts, nothing loaded from a network.</p></footer>\n"
                           "</body>\n</html>\n");
    br_text_free(t);
    return rc ? BR_ENOMEM : BR_OK;
}

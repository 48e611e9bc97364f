/* corners_report.c - rendering the worst-case corners. */
#include "report/corners_report.h"

#include "report/caution.h"
#include "report/fmt.h"
#include "report/report_common.h"
#include "report/table.h"
#include "report/verdict_report.h"
#include "report/vocab.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#define KELVIN 273.15
/* distinct corners drawn: each criterion's worst, and its first undecided */
#define MAX_CORNERS (2 * BR_CRIT_COUNT)

/* ---- shared pieces ---------------------------------------------------------- */

const char *br_param_value(const br_tol_param *p, double v, char *buf, size_t cap)
{
    if (p->kind == BR_KIND_TEMPERATURE) {
        snprintf(buf, cap, "%.4g " BR_DEGC, v - KELVIN);
        return buf;
    }
    if (p->kind == BR_KIND_ANGLE) {
        snprintf(buf, cap, "%.4g deg", v * 180.0 / 3.14159265358979323846);
        return buf;
    }
    return br_fmt_si(buf, cap, v, 4, br_kind_unit((br_kind)p->kind));
}

static const char *dist_text(const br_tol_param *p, char *buf, size_t cap)
{
    if (p->dist == BR_DIST_NORMAL)
        snprintf(buf, cap, "normal, limits at %.3g sigma", p->nsig);
    else
        snprintf(buf, cap, "uniform");
    return buf;
}

int br_param_table(const br_tol_list *tl, br_text *out)
{
    if (tl->n == 0)
        return br_text_put(out, "toleranced parameters: none (the design file gives no tolerance; "
                                "only the nominal point exists)\n");
    int rc = br_text_printf(
        out, "toleranced parameters (%d, with the limits the design file gives)\n", tl->n);
    br_table *t = br_table_create(6, tl->n);
    if (!t)
        return BR_ENOMEM;
    static const char *const heads[] = {"#",       "parameter", "minimum",
                                        "nominal", "maximum",   "distribution"};
    for (int col = 0; col < 6; col++)
        br_table_head(t, col, heads[col], col == 1 || col == 5 ? BR_LEFT : BR_RIGHT);
    for (int j = 0; j < tl->n; j++) {
        const br_tol_param *p = &tl->p[j];
        char a[BR_TABLE_CELL], b[BR_TABLE_CELL], c[BR_TABLE_CELL], d[BR_TABLE_CELL];
        br_table_row(t);
        br_table_set(t, 0, "%d", j + 1);
        br_table_set(t, 1, "%s", p->name);
        br_table_set(t, 2, "%s", br_param_value(p, p->min, a, sizeof a));
        br_table_set(t, 3, "%s", br_param_value(p, p->nom, b, sizeof b));
        br_table_set(t, 4, "%s", br_param_value(p, p->max, c, sizeof c));
        br_table_set(t, 5, "%s", dist_text(p, d, sizeof d));
    }
    rc |= br_table_render(t, 2, out);
    br_table_free(t);
    return rc ? BR_ENOMEM : BR_OK;
}

const char *br_crit_where(const br_chain *c, int crit, int stage, char *buf, size_t cap)
{
    return br_crit_place(c, crit, stage, 0, buf, cap);
}

/* ---- the corners ------------------------------------------------------------ */

/* A corner drawn in the corner table: which criterion's, and whether its
 * worst point or its first undecided one. */
typedef struct drawn {
    int n;
    int crit[MAX_CORNERS];
    int undecided[MAX_CORNERS];
} drawn;

static const signed char *drawn_level(const br_corners *k, const drawn *d, int a)
{
    const br_corner_worst *w = &k->w[d->crit[a]];
    return d->undecided[a] ? w->ulevel : w->level;
}

/* The letter of a corner, adding it when it is new. */
static int letter_of(const br_corners *k, drawn *d, int crit, int undecided)
{
    const br_corner_worst *w = &k->w[crit];
    const signed char *level = undecided ? w->ulevel : w->level;
    for (int a = 0; a < d->n; a++)
        if (memcmp(drawn_level(k, d, a), level, (size_t)k->s->tl.n) == 0)
            return a;
    d->crit[d->n] = crit;
    d->undecided[d->n] = undecided;
    return d->n++;
}

/* The distinct corners, lettered in criterion order: the worst point of
 * every criterion decided somewhere (of a status criterion only where it
 * fails: a state that holds has no worst), then the first undecided
 * point of every undetermined criterion.  letter[crit] is the index of
 * crit's worst corner, uletter[crit] of its undecided one, -1 for none. */
static void distinct_corners(const br_corners *k, int letter[BR_CRIT_COUNT],
                             int uletter[BR_CRIT_COUNT], drawn *d)
{
    d->n = 0;
    for (int crit = 0; crit < BR_CRIT_COUNT; crit++) {
        const br_corner_worst *w = &k->w[crit];
        int shown = w->applies && (br_crit_has_margin(crit) || w->outcome == BR_OUTCOME_FAIL);
        letter[crit] = shown ? letter_of(k, d, crit, 0) : -1;
    }
    for (int crit = 0; crit < BR_CRIT_COUNT; crit++)
        uletter[crit] =
            k->w[crit].outcome == BR_OUTCOME_UNDETERMINED ? letter_of(k, d, crit, 1) : -1;
}

static const char *method_name(int m)
{
    return m == BR_CORNERS_EXHAUSTIVE ? "exhaustive"
           : m == BR_CORNERS_GUIDED   ? "guided"
                                      : "skipped";
}

/* One paragraph per pass saying how its corners were chosen. */
static int method_text(const br_corners *k, br_text *out)
{
    char buf[768], acc[32];
    int n = k->s->tl.n, rc;
    if (n == 0)
        return br_report_wrap(out, "method: ",
                              "no parameter has a tolerance, so the nominal point is the only "
                              "corner.",
                              2);
    if (k->method == BR_CORNERS_EXHAUSTIVE)
        snprintf(buf, sizeof buf,
                 "every corner of the %d parameters (%ld corners), each with its periodic steady "
                 "state for every current direction; no cold start, which these criteria do not "
                 "need.",
                 n, k->steady_points);
    else
        snprintf(buf, sizeof buf,
                 "sensitivity-guided, as %d parameters make too many corners to try them all: the "
                 "nominal point and each parameter alone at each limit (%d points) give each "
                 "criterion's sensitivity to each parameter; then every corner of the parameters "
                 "that move its margin most (up to %d per criterion), the others at the limit "
                 "that lowers it: %ld corners, no cold start.",
                 n, 2 * n, k->max_sensitive, k->steady_points);
    rc = br_report_wrap(out, "method, steady-state criteria: ", buf, 2);
    if (k->su_method == BR_CORNERS_SKIPPED)
        snprintf(buf, sizeof buf, "not searched (no cold start asked for); they are not judged.");
    else if (k->su_method == BR_CORNERS_EXHAUSTIVE)
        snprintf(buf, sizeof buf, "every corner (%ld), each with a cold start.", k->startup_points);
    else
        snprintf(buf, sizeof buf,
                 "sensitivity-guided in the same way from one-at-a-time cold starts, up to %d "
                 "parameters per criterion: %ld corners, each with a cold start (which also "
                 "judges the steady-state criteria there).",
                 k->startup_max_sensitive, k->startup_points);
    if (k->su_method != BR_CORNERS_SKIPPED) {
        size_t len = strlen(buf);
        if (k->su_stepped > 0 || k->s->d->startup_method != BR_SU_PERIODS)
            snprintf(buf + len, sizeof buf - len,
                     " Their periods: %ld integrated, %ld stepped over along the rails' envelope.",
                     k->su_integrated, k->su_stepped);
        else
            snprintf(buf + len, sizeof buf - len, " Their periods: %ld, every one integrated.",
                     k->su_integrated);
    }
    rc |= br_report_wrap(out, "method, start-up criteria: ", buf, 2);
    snprintf(buf, sizeof buf,
             "at every point each steady state is found to within %s of periodic (a quasi-Newton "
             "solve from the nominal state, the shooting solver behind it); every point counts, "
             "the nominal and one-at-a-time points included.",
             br_fmt_si(acc, sizeof acc, k->s->accept, 3, "V"));
    rc |= br_report_wrap(out, "steady states: ", buf, 2);
    return rc;
}

/* The worst corner of each criterion in two tables of the same rows (the
 * criterion's name and its numbers, then where it binds), which keeps
 * each within the report's width. */
enum { C_NAME, C_RESULT, C_FIGURE, C_LIMIT, C_MARGIN, C_NOMINAL, C_CORNER, NCOL };
enum { W_NAME, W_AT, W_DIR, W_CORNER, NWCOL };

static void value_cell(br_table *t, int col, double v, int crit)
{
    char b[BR_TABLE_CELL];
    /* a rail that never starts has no margin; junction temperatures read
     * in degC, their margins in kelvin */
    if (col != C_FIGURE && br_crit_never(crit, v))
        br_table_set(t, col, "-");
    else if (col == C_FIGURE || col == C_LIMIT)
        br_table_set(t, col, "%s", br_crit_fmt_value(b, sizeof b, crit, v));
    else
        br_table_set(t, col, "%s", br_crit_fmt(b, sizeof b, crit, v));
}

static const char *result_word(int outcome)
{
    return outcome == BR_OUTCOME_PASS   ? "pass"
           : outcome == BR_OUTCOME_FAIL ? "FAIL"
                                        : "UNDETERMINED";
}

/* The numbers of a criterion's worst decided point; a status criterion
 * (the steady state) has none: only its result and, where it fails,
 * where and at which corner. */
static void worst_numbers(br_table *t, const br_corners *k, int crit)
{
    const br_corner_worst *w = &k->w[crit];
    if (!w->applies || !br_crit_has_margin(crit)) {
        for (int col = C_FIGURE; col <= C_NOMINAL; col++)
            br_table_set(t, col, "-");
        return;
    }
    value_cell(t, C_FIGURE, w->worst.figure, crit);
    value_cell(t, C_LIMIT, w->worst.limit, crit);
    value_cell(t, C_MARGIN, w->worst.margin, crit);
    if (w->nominal.applies && !w->nominal.undetermined)
        value_cell(t, C_NOMINAL, w->nominal.margin, crit);
    else
        br_table_set(t, C_NOMINAL, "-");
}

static int is_na(const br_corner_worst *w)
{
    return !w->applies && w->outcome != BR_OUTCOME_UNDETERMINED;
}

static void worst_row(br_table *t, const br_corners *k, int crit, int letter)
{
    const br_corner_worst *w = &k->w[crit];
    br_table_row(t);
    br_table_set(t, C_NAME, "%s", br_crit_title(crit));
    if (is_na(w)) {
        br_table_set(t, C_RESULT, "n/a");
        for (int col = C_FIGURE; col < NCOL; col++)
            br_table_set(t, col, "-");
        return;
    }
    br_table_set(t, C_RESULT, "%s",
                 w->outcome == BR_OUTCOME_PASS && w->worst.warn ? "WARN" : result_word(w->outcome));
    worst_numbers(t, k, crit);
    if (w->applies && letter >= 0)
        br_table_set(t, C_CORNER, "%c", 'A' + letter);
    else
        br_table_set(t, C_CORNER, "-");
}

static void where_row(br_table *t, const br_chain *c, const br_corners *k, int crit, int letter)
{
    const br_corner_worst *w = &k->w[crit];
    char b[BR_TABLE_CELL];
    br_table_row(t);
    br_table_set(t, W_NAME, "%s", br_crit_title(crit));
    int shown = w->applies && letter >= 0;
    br_table_set(t, W_AT, "%s",
                 shown ? br_crit_place(c, crit, w->worst.stage, w->worst.aux, b, sizeof b) : "-");
    br_table_set(t, W_DIR, "%s",
                 shown && !br_crit_is_startup(crit) ? br_dir_label(w->worst.dir) : "-");
    if (shown)
        br_table_set(t, W_CORNER, "%c", 'A' + letter);
    else
        br_table_set(t, W_CORNER, "-");
}

static int worst_table(const br_chain *c, const br_corners *k, const int *letter, br_text *out)
{
    static const char *const heads[NCOL] = {"criterion", "result",  "figure", "limit",
                                            "margin",    "nominal", "corner"};
    static const char *const wheads[NWCOL] = {"criterion", "at", "direction", "corner"};
    br_table *t = br_table_create(NCOL, BR_CRIT_COUNT);
    br_table *wt = br_table_create(NWCOL, BR_CRIT_COUNT);
    int rc = t && wt ? BR_OK : BR_ENOMEM;
    for (int col = 0; t && col < NCOL; col++) {
        int left = col == C_NAME || col == C_RESULT || col == C_CORNER;
        br_table_head(t, col, heads[col], left ? BR_LEFT : BR_RIGHT);
    }
    for (int col = 0; wt && col < NWCOL; col++)
        br_table_head(wt, col, wheads[col], BR_LEFT);
    for (int crit = 0; rc == BR_OK && crit < BR_CRIT_COUNT; crit++) {
        worst_row(t, k, crit, letter[crit]);
        if (!is_na(&k->w[crit]) && letter[crit] >= 0)
            where_row(wt, c, k, crit, letter[crit]);
    }
    if (rc == BR_OK)
        rc = br_table_render(t, 2, out);
    if (rc == BR_OK)
        rc = br_text_put(out, "where each worst corner binds (at: the rail or link; direction: "
                              "the current direction there)\n");
    if (rc == BR_OK)
        rc = br_table_render(wt, 2, out);
    br_table_free(t);
    br_table_free(wt);
    return rc;
}

static int overall(const br_corners *k, br_text *out)
{
    int judged = 0, failed = 0, undet = 0, na = 0;
    for (int crit = 0; crit < BR_CRIT_COUNT; crit++) {
        const br_corner_worst *w = &k->w[crit];
        int is_na = !w->applies && w->outcome != BR_OUTCOME_UNDETERMINED;
        na += is_na;
        judged += !is_na;
        failed += !is_na && w->outcome == BR_OUTCOME_FAIL;
        undet += !is_na && w->outcome == BR_OUTCOME_UNDETERMINED;
    }
    if (k->outcome == BR_OUTCOME_FAIL)
        return br_text_printf(out, "verdict at the worst corners: FAIL, %d of %d criteria fail%s\n",
                              failed, judged, undet ? " (others undetermined)" : "");
    if (k->outcome == BR_OUTCOME_UNDETERMINED) /* never a pass: what was not decided may fail */
        return br_text_printf(out,
                              "verdict at the worst corners: UNDETERMINED, none fails, %d of %d "
                              "criteria undecided at some points\n",
                              undet, judged);
    return br_text_printf(out,
                          "verdict at the worst corners: PASS, all %d criteria judged pass "
                          "(%d not applicable)\n",
                          judged, na);
}

/* What was not decided, and where to look. */
static int undecided_text(const br_corners *k, const int *uletter, br_text *out)
{
    int any = k->unjudged > 0;
    for (int crit = 0; crit < BR_CRIT_COUNT; crit++)
        any |= uletter[crit] >= 0;
    if (!any)
        return BR_OK;
    char buf[900], names[400] = "", first = '-';
    size_t len = 0;
    for (int crit = 0; crit < BR_CRIT_COUNT; crit++) {
        if (uletter[crit] < 0)
            continue;
        if (first == '-')
            first = (char)('A' + uletter[crit]);
        len += (size_t)snprintf(names + len, sizeof names - len, "%s%s (%ld point%s)",
                                len ? ", " : "", br_crit_title(crit), k->w[crit].undetermined,
                                k->w[crit].undetermined == 1 ? "" : "s");
        if (len >= sizeof names)
            break;
    }
    snprintf(buf, sizeof buf,
             "at %ld of %ld points some criterion could not be decided: at %ld the solver did "
             "not settle a steady state whose drivers keep running, %ld could not be judged at "
             "all (a solver or the chain model failed). A criterion is never judged at such a "
             "point: it counts neither as passing nor as failing there. %s%s%s%c%s",
             k->undetermined, k->s->points, k->unsettled, k->unjudged,
             names[0] ? "Undetermined: " : "", names,
             names[0] ? "; the first such point is corner " : "", names[0] ? first : ' ',
             names[0] ? "." : "");
    return br_report_wrap(out, "not decided: ", buf, 2);
}

static const char *level_word(int level)
{
    return level < 0 ? "min" : level > 0 ? "max" : "nom";
}

/* One column per distinct corner, one row per parameter. */
static int corner_table(const br_corners *k, const drawn *d, br_text *out)
{
    const br_tol_list *tl = &k->s->tl;
    if (d->n == 0 || tl->n == 0)
        return BR_OK;
    int rc =
        br_text_put(out, "\ncorners (the limit each parameter takes; nom: its nominal value)\n");
    br_table *t = br_table_create(d->n + 1, tl->n);
    if (!t)
        return BR_ENOMEM;
    br_table_head(t, 0, "parameter", BR_LEFT);
    for (int a = 0; a < d->n; a++) {
        char h[4] = {(char)('A' + a), '\0'};
        br_table_head(t, a + 1, h, BR_LEFT);
    }
    for (int j = 0; j < tl->n; j++) {
        br_table_row(t);
        br_table_set(t, 0, "%s", tl->p[j].name);
        for (int a = 0; a < d->n; a++)
            br_table_set(t, a + 1, "%s", level_word(drawn_level(k, d, a)[j]));
    }
    rc |= br_table_render(t, 2, out);
    br_table_free(t);
    return rc;
}

int br_corners_text(const br_chain *c, const br_corners *k, br_text *out)
{
    int letter[BR_CRIT_COUNT], uletter[BR_CRIT_COUNT];
    drawn d;
    distinct_corners(k, letter, uletter, &d);
    int rc = br_report_heading(c, "worst-case corners", out);
    rc |= br_param_table(&k->s->tl, out);
    rc |= br_text_put(out, "\n");
    rc |= method_text(k, out);
    rc |= br_text_put(out, "\n");
    rc |= br_report_wrap(out, "worst corner of each criterion ",
                         "(margin = limit - figure for a maximum, figure - limit for a minimum; "
                         "nominal: the margin at the nominal point; corner: the limits the "
                         "parameters take there, below; the periodic steady state is a status, "
                         "no margin: it holds, a driver drops out, or it is not settled)",
                         0);
    rc |= worst_table(c, k, letter, out);
    rc |= overall(k, out);
    rc |= undecided_text(k, uletter, out);
    rc |= corner_table(k, &d, out);
    rc |= br_report_caution(out);
    return rc ? BR_ENOMEM : BR_OK;
}

/* ---- XML ------------------------------------------------------------------- */

static void xml_row(br_xmlw *w, const br_chain *c, const br_corners *k, int crit, int letter,
                    int uletter)
{
    const br_corner_worst *cw = &k->w[crit];
    int decided = cw->applies, undet = cw->outcome == BR_OUTCOME_UNDETERMINED;
    br_xmlw_start(w, "criterion");
    br_xmlw_attr(w, "name", br_crit_name(crit));
    br_xmlw_attr(w, "title", br_crit_title(crit));
    br_xmlw_bool(w, "applies", decided || undet);
    if (decided || undet) {
        br_xmlw_attr(w, "result", br_outcome_name(cw->outcome));
        br_xmlw_bool(w, "pass", cw->outcome == BR_OUTCOME_PASS);
        br_xmlw_int(w, "undetermined-points", cw->undetermined);
    }
    if (decided && cw->worst.warn)
        br_xmlw_bool(w, "warn", 1);
    if (decided && br_crit_never(crit, cw->worst.figure))
        br_xmlw_bool(w, "never-starts", 1);
    else if (decided && br_crit_has_margin(crit)) {
        br_xmlw_num(w, "figure", cw->worst.figure);
        br_xmlw_num(w, "limit", cw->worst.limit);
        br_xmlw_num(w, "margin", cw->worst.margin);
        if (cw->nominal.applies && !cw->nominal.undetermined)
            br_xmlw_num(w, "nominal-margin", cw->nominal.margin);
        br_xmlw_attr(w, "unit", br_crit_unit(crit));
    }
    if (decided && letter >= 0) {
        char corner[2] = {(char)('A' + letter), '\0'};
        if (cw->worst.stage >= 0 && cw->worst.stage < c->n) {
            br_xmlw_int(w, "stage", cw->worst.stage);
            br_xmlw_attr(w, "switch", c->st[cw->worst.stage].name);
        }
        if (!br_crit_is_startup(crit))
            br_xmlw_attr(w, "direction", br_dir_label(cw->worst.dir));
        br_xmlw_attr(w, "corner", corner);
    }
    if (uletter >= 0) {
        char corner[2] = {(char)('A' + uletter), '\0'};
        br_xmlw_attr(w, "undetermined-corner", corner);
    }
    br_xmlw_end(w);
}

void br_param_xml(br_xmlw *w, const br_tol_list *tl)
{
    br_xmlw_start(w, "parameters");
    for (int j = 0; j < tl->n; j++) {
        const br_tol_param *p = &tl->p[j];
        br_xmlw_start(w, "parameter");
        br_xmlw_int(w, "index", j + 1);
        br_xmlw_attr(w, "name", p->name);
        br_xmlw_attr(w, "unit", br_kind_unit((br_kind)p->kind));
        br_xmlw_num(w, "min", p->min);
        br_xmlw_num(w, "nominal", p->nom);
        br_xmlw_num(w, "max", p->max);
        br_xmlw_attr(w, "distribution", p->dist == BR_DIST_NORMAL ? "normal" : "uniform");
        if (p->dist == BR_DIST_NORMAL)
            br_xmlw_num(w, "sigmas", p->nsig);
        br_xmlw_end(w);
    }
    br_xmlw_end(w);
}

static void xml_corners(br_xmlw *w, const br_corners *k, const drawn *d)
{
    for (int a = 0; a < d->n; a++) {
        char id[2] = {(char)('A' + a), '\0'};
        br_xmlw_start(w, "corner");
        br_xmlw_attr(w, "id", id);
        br_xmlw_attr(w, "kind", d->undecided[a] ? "undetermined" : "worst");
        for (int j = 0; j < k->s->tl.n; j++) {
            int level = drawn_level(k, d, a)[j];
            br_xmlw_start(w, "at");
            br_xmlw_int(w, "parameter", j + 1);
            br_xmlw_attr(w, "limit", level_word(level));
            br_xmlw_num(w, "value", br_tol_level(&k->s->tl.p[j], level));
            br_xmlw_end(w);
        }
        br_xmlw_end(w);
    }
}

void br_results_root(br_xmlw *w, const br_chain *c, const char *verb, const char *version)
{
    const br_design *d = c->design;
    br_xmlw_start(w, "bootrung-results");
    br_xmlw_attr(w, "verb", verb);
    br_xmlw_attr(w, "design", d && d->name[0] ? d->name : "");
    br_xmlw_attr(w, "file", d ? d->path : "");
    br_xmlw_attr(w, "version", version ? version : "");
    br_xml_operating_point(w, c);
}

int br_corners_xml(const br_chain *c, const br_corners *k, const char *version, br_text *out,
                   br_error *err)
{
    int letter[BR_CRIT_COUNT], uletter[BR_CRIT_COUNT];
    drawn d;
    distinct_corners(k, letter, uletter, &d);
    br_xmlw *w;
    int rc = br_xmlw_create(&w, err);
    if (rc != BR_OK)
        return rc;
    br_results_root(w, c, "corners", version);
    br_param_xml(w, &k->s->tl);
    br_xmlw_start(w, "method");
    br_xmlw_attr(w, "steady", method_name(k->method));
    br_xmlw_attr(w, "startup", method_name(k->su_method));
    br_xmlw_int(w, "steady-corners", k->steady_points);
    br_xmlw_int(w, "startup-corners", k->startup_points);
    br_xmlw_int(w, "points", k->s->points);
    br_xmlw_int(w, "undetermined", k->undetermined);
    br_xmlw_int(w, "unsettled", k->unsettled);
    br_xmlw_int(w, "unjudged", k->unjudged);
    br_xmlw_num(w, "accept-V", k->s->accept);
    if (k->s->solver_limit > 0)
        br_xmlw_int(w, "solver-limit", k->s->solver_limit);
    br_xmlw_end(w);
    br_xmlw_start(w, "worst");
    br_xmlw_bool(w, "pass", k->all_pass);
    br_xmlw_attr(w, "result", br_outcome_name(k->outcome));
    for (int crit = 0; crit < BR_CRIT_COUNT; crit++)
        xml_row(w, c, k, crit, letter[crit], uletter[crit]);
    br_xmlw_end(w);
    xml_corners(w, k, &d);
    br_xml_caution(w);
    rc = br_xmlw_finish(w, out, err);
    br_xmlw_free(w);
    return rc;
}

/* explore_report.c - the report, CSV and plots of `bootrung explore`. */
#include "report/explore_report.h"

#include "report/caution.h"
#include "report/fmt.h"
#include "report/plot.h"
#include "report/report_common.h"
#include "report/table.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

int br_explore_outcome(const br_explore *x)
{
    int undet = 0;
    for (int i = 0; i < x->n; i++)
        undet |= x->rows[i].state == BR_EX_UNDETERMINED || x->rows[i].state == BR_EX_REFUSED;
    return x->nfeasible > 0 ? BR_OUTCOME_PASS : undet ? BR_OUTCOME_UNDETERMINED : BR_OUTCOME_FAIL;
}

/* The split design's verdict: its state, and its margin or what fails. */
static void split_verdict(const br_explore_row *r, char *buf, size_t cap)
{
    char a[32], t[32];
    const char *crit = r->split_crit >= 0 ? br_crit_title(r->split_crit) : "a criterion";
    if (r->split_state == BR_EX_FEASIBLE || r->split_state == BR_EX_MARGIN ||
        r->split_state == BR_EX_STARTUP || r->split_state == BR_EX_COST)
        snprintf(buf, cap, "it HOLDS at the nominal point, smallest margin %s (%s), starts in %s%s",
                 br_fmt_si(a, sizeof a, r->split_margin, 3, "V"), crit,
                 br_fmt_time(t, sizeof t, r->split_tstart),
                 r->split_state == BR_EX_MARGIN ? ", below the margin target" : "");
    else if (r->split_state == BR_EX_UNDETERMINED || r->split_state == BR_EX_REFUSED)
        snprintf(buf, cap, "it is undetermined (%s)", crit);
    else
        snprintf(buf, cap, "it still FAILS (%s, margin %s)", crit,
                 br_fmt_si(a, sizeof a, r->split_margin, 3, "V"));
}

/* A combination that needs a second supply: the one-supply chain's
 * failure, and the split design's verdict and cost. */
static void split_words(const br_explore_row *r, const char *crit, char *buf, size_t cap)
{
    char v[160];
    if (r->inject_rail <= 0) {
        snprintf(buf, cap,
                 "fails (%s): rails from rail %d up fall short; needs a second isolated supply "
                 "at rail %d (the split design was not judged)",
                 crit, r->split_at, r->split_at);
        return;
    }
    split_verdict(r, v, sizeof v);
    snprintf(buf, cap,
             "fails with one supply (%s): rails from rail %d up fall short. Split, with a second "
             "isolated supply injected at rail %d (searched over %d rail%s), %s; parts cost %.4g, "
             "the second supply not costed (the catalog lists no supplies)",
             crit, r->split_at, r->inject_rail, r->split_tries, r->split_tries == 1 ? "" : "s", v,
             r->cost);
}

/* Why a combination is not feasible, in words. */
static const char *why(const br_explore *x, const br_explore_row *r, char *buf, size_t cap)
{
    char a[32], b[32];
    const char *crit = r->crit >= 0 ? br_crit_title(r->crit) : "a criterion";
    switch (r->state) {
    case BR_EX_RATING:
        if (r->sw_ok)
            snprintf(buf, cap,
                     "no catalog diode rated %s and as strong in current as the "
                     "template's it replaces (Vin/(N-1) at %.0f %% derating)",
                     br_fmt_si(a, sizeof a, r->need, 3, "V"), 100.0 * x->derating);
        else
            snprintf(buf, cap,
                     "switch class below the %s the rule asks (Vin/(N-1) at %.0f %% "
                     "derating)",
                     br_fmt_si(a, sizeof a, r->need, 3, "V"), 100.0 * x->derating);
        break;
    case BR_EX_SPLIT:
        split_words(r, crit, buf, cap);
        break;
    case BR_EX_FAILS:
        snprintf(buf, cap, "fails: %s", crit);
        break;
    case BR_EX_MARGIN:
        snprintf(buf, cap, "margin %s below the target %s (%s)",
                 br_fmt_si(a, sizeof a, r->margin, 3, "V"),
                 br_fmt_si(b, sizeof b, x->target, 3, "V"), crit);
        break;
    case BR_EX_STARTUP:
        snprintf(buf, cap, "starts in %s, beyond the limit", br_fmt_time(a, sizeof a, r->tstart));
        break;
    case BR_EX_COST:
        snprintf(buf, cap, "costs %.4g, beyond the limit", r->cost);
        break;
    case BR_EX_CORNERS:
        snprintf(buf, cap, "passes at the nominal point, not at its worst corners (%s)", crit);
        break;
    case BR_EX_UNDETERMINED:
        snprintf(buf, cap, "undetermined: %s%s%s", r->crit >= 0 ? crit : "",
                 r->crit >= 0 && r->note[0] ? "; " : "", r->note);
        break;
    case BR_EX_REFUSED:
        snprintf(buf, cap, "the model refuses it: %s", r->note);
        break;
    default:
        snprintf(buf, cap, "feasible");
    }
    return buf;
}

static int head(const br_explore *x, const char *design, br_text *out)
{
    char a[32], b[32], t[32];
    int rc = br_text_printf(out, "bootrung explore: %s\n\n", design);
    rc |= br_text_printf(out,
                         "bus %s (highest %s); switches and link diodes rated at least "
                         "Vin/(N-1) / %.0f %%\n",
                         br_fmt_si(a, sizeof a, x->vbus, 4, "V"),
                         br_fmt_si(b, sizeof b, x->vbus_max, 4, "V"), 100.0 * x->derating);
    rc |= br_text_printf(out, "margin target %s; %d combinations, %d feasible, %d on the front\n\n",
                         br_fmt_si(t, sizeof t, x->target, 3, "V"), x->n, x->nfeasible, x->nfront);
    return rc;
}

static void feasible_row(br_table *t, const br_explore_row *r, const br_catalog *cat)
{
    br_table_row(t);
    br_table_set(t, 0, "%d", r->rank);
    br_table_set(t, 1, "%s", r->front ? "*" : "");
    br_table_set(t, 2, "%d", r->levels);
    br_table_set(t, 3, "%s", cat->switches[r->sw].id);
    br_table_set(t, 4, "%.0f", cat->switch_rating[r->sw]);
    br_table_set(t, 5, "%s", r->diode >= 0 ? cat->diodes[r->diode].id : "(template)");
    br_table_set(t, 6, "%.1f", r->fsw / 1e3);
    br_table_set(t, 7, "%.2f", r->cost);
    br_table_set(t, 8, "%.1f", r->loss * 1e3);
    br_table_set(t, 9, "%.3f", r->margin);
    br_table_set(t, 10, "%.3f", r->tstart * 1e3);
}

static int feasible(const br_explore *x, const br_catalog *cat, br_text *out)
{
    if (x->nfeasible == 0)
        return br_text_put(out, "feasible: none\n\n");
    static const char *const heads[] = {"rank",    "front",    "levels",  "switch",
                                        "class V", "diode",    "fsw kHz", "cost",
                                        "loss mW", "margin V", "start ms"};
    br_table *t = br_table_create(11, x->nfeasible);
    if (!t)
        return BR_ENOMEM;
    for (int c = 0; c < 11; c++)
        br_table_head(t, c, heads[c], c == 3 || c == 5 ? BR_LEFT : BR_RIGHT);
    for (int k = 1; k <= x->nfeasible; k++)
        for (int i = 0; i < x->n; i++)
            if (x->rows[i].rank == k)
                feasible_row(t, &x->rows[i], cat);
    int rc = br_report_wrap(out, "feasible, ",
                            x->corners ? "ranked (front first, then margin, cost, loss; * on the "
                                         "Pareto front of cost, loss and margin; margins at the "
                                         "worst corners):"
                                       : "ranked (front first, then margin, cost, loss; * on the "
                                         "Pareto front of cost, loss and margin; margins at the "
                                         "nominal point):",
                            2);
    rc |= br_table_render(t, 2, out);
    rc |= br_text_put(out, "\n");
    br_table_free(t);
    return rc;
}

/* One line per combination that is not feasible, wrapped. */
static int rejected(const br_explore *x, const br_catalog *cat, br_text *out)
{
    if (x->n == x->nfeasible)
        return BR_OK;
    int rc = br_text_put(out, "not feasible:\n");
    char lead[128], buf[512];
    for (int i = 0; i < x->n; i++) {
        const br_explore_row *r = &x->rows[i];
        if (r->state == BR_EX_FEASIBLE)
            continue;
        snprintf(lead, sizeof lead, "  %2d levels, %s, %.1f kHz: ", r->levels,
                 cat->switches[r->sw].id, r->fsw / 1e3);
        rc |= br_report_wrap(out, lead, why(x, r, buf, sizeof buf), 6);
    }
    rc |= br_text_put(out, "\n");
    return rc;
}

int br_explore_text(const br_explore *x, const br_catalog *cat, const char *design, br_text *out)
{
    int rc = head(x, design, out);
    rc |= feasible(x, cat, out);
    rc |= rejected(x, cat, out);
    int o = br_explore_outcome(x);
    rc |= br_text_printf(out, "verdict: %s (%d of %d combinations feasible, %s)\n\n",
                         o == BR_OUTCOME_PASS   ? "PASS"
                         : o == BR_OUTCOME_FAIL ? "FAIL"
                                                : "UNDETERMINED",
                         x->nfeasible, x->n,
                         x->corners ? "at their worst corners" : "at the nominal point");
    rc |= br_report_wrap(out, "",
                         "A chain that needs a second supply is also judged split, at the nominal "
                         "point: an isolated supply of the main supply's voltage injected at a "
                         "rail through that rail's link resistor and diode (the rail searched "
                         "from the lowest one that falls short, downwards while the smallest "
                         "margin grows); the split design stays out of the ranking.",
                         0);
    rc |= br_text_put(out, "\n");
    rc |= br_report_caution(out);
    return rc ? BR_ENOMEM : BR_OK;
}

/* A CSV number: empty when the combination has none (not simulated). */
static const char *num(char *buf, size_t cap, double v)
{
    if (isfinite(v))
        snprintf(buf, cap, "%.10g", v);
    else
        buf[0] = '\0';
    return buf;
}

int br_explore_csv(const br_explore *x, const br_catalog *cat, br_text *out)
{
    int rc = br_text_put(out, "levels,switch,class_V,need_V,diode,fsw_Hz,state,cost,loss_W,"
                              "margin_V,startup_s,binds,split_at,corners,front,rank,inject_rail,"
                              "split_state,split_margin_V,split_startup_s,split_binds\n");
    char a[32], b[32], c[32];
    for (int i = 0; i < x->n; i++) {
        const br_explore_row *r = &x->rows[i];
        rc |= br_text_printf(out, "%d,%s,%.10g,%.10g,%s,%.10g,%s,%.10g,", r->levels,
                             cat->switches[r->sw].id, cat->switch_rating[r->sw], r->need,
                             r->diode >= 0 ? cat->diodes[r->diode].id : "", r->fsw,
                             br_explore_state_name(r->state), r->cost);
        rc |= br_text_printf(out, "%s,%s,%s,%s,%d,%d,%d,%d,", num(a, sizeof a, r->loss),
                             num(b, sizeof b, r->margin), num(c, sizeof c, r->tstart),
                             r->crit >= 0 ? br_crit_name(r->crit) : "", r->split_at, r->corners,
                             r->front, r->rank);
        int sp = r->inject_rail > 0;
        rc |= br_text_printf(out, "%d,%s,%s,%s,%s\n", r->inject_rail,
                             sp ? br_explore_state_name(r->split_state) : "",
                             num(a, sizeof a, sp ? r->split_margin : NAN),
                             num(b, sizeof b, sp ? r->split_tstart : NAN),
                             sp && r->split_crit >= 0 ? br_crit_name(r->split_crit) : "");
    }
    return rc ? BR_ENOMEM : BR_OK;
}

/* ---- plots -------------------------------------------------------------------- */

#define PANEL_W 560.0
#define PANEL_H 340.0
#define HEAD_H 64.0
#define MAX_LEVELS 33

/* The best value of what (0 margin, highest; 1 cost, lowest) among the
 * feasible rows at (levels, fsw); NaN when none is feasible. */
static double best_at(const br_explore *x, int levels, double fsw, int what)
{
    double b = NAN;
    for (int i = 0; i < x->n; i++) {
        const br_explore_row *r = &x->rows[i];
        if (r->state != BR_EX_FEASIBLE || r->levels != levels || r->fsw != fsw)
            continue;
        double v = what == 0 ? r->margin : r->cost;
        if (isnan(b) || (what == 0 ? v > b : v < b))
            b = v;
    }
    return b;
}

/* The frequencies of the rows, each once, in their order. */
static int freqs(const br_explore *x, double *f)
{
    int n = 0;
    for (int i = 0; i < x->n; i++) {
        int seen = 0;
        for (int j = 0; j < n; j++)
            seen |= f[j] == x->rows[i].fsw;
        if (!seen && n < BR_EXPLORE_MAX_FSW)
            f[n++] = x->rows[i].fsw;
    }
    return n;
}

static void level_range(const br_explore *x, int *lo, int *hi)
{
    *lo = MAX_LEVELS;
    *hi = 2;
    for (int i = 0; i < x->n; i++) {
        *lo = x->rows[i].levels < *lo ? x->rows[i].levels : *lo;
        *hi = x->rows[i].levels > *hi ? x->rows[i].levels : *hi;
    }
}

/* One frequency's line, broken where a level count has nothing feasible
 * (a line across the gap would claim values there), with a mark at each
 * point. */
static void series(br_plot *p, const br_explore *x, int what, double fsw, int j, int lo, int hi)
{
    double lx[MAX_LEVELS], ly[MAX_LEVELS];
    char key[64];
    snprintf(key, sizeof key, "%s_%.0fHz", what == 0 ? "margin_V" : "cost", fsw);
    br_style st = br_plot_style(j);
    int n = 0;
    for (int l = lo; l <= hi + 1; l++) {
        double v = l <= hi ? best_at(x, l, fsw, what) : NAN;
        if (!isnan(v)) {
            lx[n] = l;
            ly[n++] = v;
            br_svg_circle(p->svg, br_plot_px(p, l), br_plot_py(p, v), 3.5, st.colour, st.colour,
                          1.0);
            continue;
        }
        if (n > 1)
            br_plot_line(p, lx, ly, n, 1, &st, key);
        n = 0;
    }
}

static void panel(br_svg *s, const br_explore *x, int what, double px, double py)
{
    double f[BR_EXPLORE_MAX_FSW];
    int nf = freqs(x, f), lo, hi;
    level_range(x, &lo, &hi);
    double ymin = HUGE_VAL, ymax = -HUGE_VAL;
    for (int l = lo; l <= hi; l++)
        for (int j = 0; j < nf; j++) {
            double v = best_at(x, l, f[j], what);
            if (!isnan(v)) {
                ymin = fmin(ymin, v);
                ymax = fmax(ymax, v);
            }
        }
    if (!(ymin <= ymax))
        ymin = 0, ymax = 1;
    br_plot p;
    br_plot_frame(&p, s, px, py, PANEL_W, PANEL_H);
    br_plot_range(&p, lo - 0.5, hi + 0.5, fmin(0.0, ymin), ymax, 1);
    br_plot_axes(&p, what == 0 ? "explore-margin" : "explore-cost",
                 what == 0 ? "smallest margin, best switch class" : "cost, cheapest switch class",
                 "levels", "", what == 0 ? "margin" : "cost", what == 0 ? "V" : "");
    for (int j = 0; j < nf; j++)
        series(&p, x, what, f[j], j, lo, hi);
    br_plot_done(&p);
}

int br_explore_svg(const br_explore *x, br_text *out)
{
    br_svg s;
    double f[BR_EXPLORE_MAX_FSW];
    int nf = freqs(x, f);
    br_svg_begin(&s, out, 2 * PANEL_W, HEAD_H + PANEL_H);
    br_svg_text_in(&s, 12, 26, 18.0, "start", BR_INK, 1,
                   "Exploration: the feasible combinations against the level count");
    br_plot p;
    br_plot_frame(&p, &s, 0, 0, 10, 10);
    double kx = 12;
    for (int j = 0; j < nf; j++) {
        char lab[32], b[32];
        br_style st = br_plot_style(j);
        snprintf(lab, sizeof lab, "%s", br_plot_si(b, sizeof b, f[j], 3, "Hz"));
        kx = br_plot_key(&p, kx, 48, &st, lab);
    }
    panel(&s, x, 0, 0, HEAD_H);
    panel(&s, x, 1, PANEL_W, HEAD_H);
    return br_svg_end(&s);
}

int br_explore_comment(const br_explore *x, const br_catalog *cat, const br_explore_row *r,
                       const char *design, br_text *out)
{
    char a[32], b[32], c[32];
    int rc = br_text_printf(out,
                            "Built by bootrung explore from %s: %d levels, switch %s (%.0f V "
                            "class),\nat %s on a %s bus (the rule asks %s at %.0f %% derating).\n",
                            design, r->levels, cat->switches[r->sw].id, cat->switch_rating[r->sw],
                            br_fmt_si(a, sizeof a, r->fsw, 4, "Hz"),
                            br_fmt_si(b, sizeof b, x->vbus, 4, "V"),
                            br_fmt_si(c, sizeof c, r->need, 3, "V"), 100.0 * x->derating);
    rc |= br_text_printf(out,
                         "Rank %d, on the Pareto front: cost %.4g, supply power %s, smallest "
                         "margin %s (%s).\n",
                         r->rank, r->cost, br_fmt_si(a, sizeof a, r->loss, 3, "W"),
                         br_fmt_si(b, sizeof b, r->margin, 3, "V"),
                         r->corners ? "at the worst corners" : "at the nominal point");
    return rc ? BR_ENOMEM : BR_OK;
}

int br_explore_split_comment(const br_explore *x, const br_catalog *cat, const br_explore_row *r,
                             const char *design, br_text *out)
{
    char a[32], b[32], v[160];
    split_verdict(r, v, sizeof v);
    int rc = br_text_printf(out,
                            "Built by bootrung explore from %s: %d levels, switch %s (%.0f V "
                            "class),\nat %s on a %s bus, split: one supply fails (rails from "
                            "rail %d up fall short),\nso a second isolated supply is injected "
                            "at rail %d.\n",
                            design, r->levels, cat->switches[r->sw].id, cat->switch_rating[r->sw],
                            br_fmt_si(a, sizeof a, r->fsw, 4, "Hz"),
                            br_fmt_si(b, sizeof b, x->vbus, 4, "V"), r->split_at, r->inject_rail);
    rc |= br_text_printf(out,
                         "At the nominal point %s.\nParts cost %.4g; the second supply is not "
                         "costed.\n",
                         v, r->cost);
    return rc ? BR_ENOMEM : BR_OK;
}

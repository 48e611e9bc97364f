/* explore_report.c - the report, CSV and plots of `bootrung explore`. */
#include "report/explore_report.h"

#include "report/caution.h"
#include "report/fmt.h"
#include "report/plot.h"
#include "report/report_common.h"
#include "report/table.h"

#include <ctype.h>
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

/* What holds a split design back that passes every criterion: the
 * margin target, the start-up or the cost limit (empty: nothing). */
static const char *split_limit(const br_explore *x, const br_explore_row *r)
{
    if (r->split_state == BR_EX_MARGIN || r->split_margin < x->target)
        return ", below the margin target";
    if (r->split_state == BR_EX_STARTUP)
        return ", beyond the start-up limit";
    if (r->split_state == BR_EX_COST)
        return "; its parts cost beyond the limit";
    return "";
}

/* The split design's verdict: its state, and its margin or what fails,
 * at the nominal point or (judged there) at its worst corners. */
static void split_verdict(const br_explore *x, const br_explore_row *r, char *buf, size_t cap)
{
    char a[32], t[32];
    const char *crit = r->split_crit >= 0 ? br_crit_title(r->split_crit) : "a criterion";
    const char *where = r->split_corners ? "at its worst corners" : "at the nominal point";
    br_fmt_si(a, sizeof a, r->split_margin, 3, "V");
    if (r->split_state == BR_EX_FEASIBLE || r->split_state == BR_EX_MARGIN ||
        r->split_state == BR_EX_STARTUP || r->split_state == BR_EX_COST)
        snprintf(buf, cap, "it HOLDS %s, smallest margin %s (%s), starts in %s%s%s", where, a, crit,
                 br_fmt_time(t, sizeof t, r->split_tstart),
                 r->split_corners ? " at the nominal point" : "", split_limit(x, r));
    else if (r->split_state == BR_EX_CORNERS)
        snprintf(buf, cap,
                 "it HOLDS at the nominal point, not at its worst corners (%s, smallest margin "
                 "%s there)",
                 crit, a);
    else if (r->split_state == BR_EX_UNDETERMINED || r->split_state == BR_EX_REFUSED)
        snprintf(buf, cap, "it is undetermined %s (%s)", where, crit);
    else
        snprintf(buf, cap, "it still FAILS (%s, margin %s)", crit, a);
}

/* The split's second supply and its cost, in words: the module chosen
 * and the sum, or why the split cost leaves it out. */
static void module_words(const br_explore *x, const br_explore_row *r, char *buf, size_t cap)
{
    char a[32];
    if (r->module >= 0 && x->modules && r->module_passed > 0)
        snprintf(buf, cap,
                 "cost %.4g: parts %.4g + isolated supply %s %.4g (the cheapest of the catalog "
                 "holding the supply's voltage and rated for %s with which the split design is "
                 "feasible; %d cheaper that suit, it is not)",
                 r->split_cost, r->cost, x->modules->module_id[r->module], r->module_cost,
                 br_fmt_si(a, sizeof a, r->inject_need, 3, "A"), r->module_passed);
    else if (r->module >= 0 && x->modules)
        snprintf(buf, cap,
                 "cost %.4g: parts %.4g + isolated supply %s %.4g (the cheapest of the catalog "
                 "holding the supply's voltage and rated for %s)",
                 r->split_cost, r->cost, x->modules->module_id[r->module], r->module_cost,
                 br_fmt_si(a, sizeof a, r->inject_need, 3, "A"));
    else if (r->modules > 0)
        snprintf(buf, cap,
                 "parts cost %.4g; the split cost excludes the second supply: no isolated supply "
                 "of the catalog holds the supply's voltage within its tolerance and is rated "
                 "(and limited) for %s",
                 r->cost, br_fmt_si(a, sizeof a, r->inject_need, 3, "A"));
    else
        snprintf(buf, cap,
                 "parts cost %.4g; the split cost excludes the second supply (the catalog lists "
                 "no isolated supplies)",
                 r->cost);
}

/* A combination that needs a second supply: the one-supply chain's
 * failure, and the split design's verdict and cost. */
static void split_words(const br_explore *x, const br_explore_row *r, const char *crit, char *buf,
                        size_t cap)
{
    char v[256], m[400];
    if (r->inject_rail <= 0) {
        snprintf(buf, cap,
                 "fails (%s): rails from rail %d up fall short; needs a second isolated supply "
                 "at rail %d (the split design was not judged)",
                 crit, r->split_at, r->split_at);
        return;
    }
    split_verdict(x, r, v, sizeof v);
    module_words(x, r, m, sizeof m);
    snprintf(buf, cap,
             "fails with one supply (%s): rails from rail %d up fall short. Split, with a second "
             "isolated supply injected at rail %d (searched over %d rail%s), %s; %s",
             crit, r->split_at, r->inject_rail, r->split_tries, r->split_tries == 1 ? "" : "s", v,
             m);
}

/* Why a combination is not feasible, in words. */
static const char *why(const br_explore *x, const br_explore_row *r, char *buf, size_t cap)
{
    char a[32], b[32];
    const char *crit = r->crit >= 0 ? br_crit_title(r->crit) : "a criterion";
    switch (r->state) {
    case BR_EX_RATING:
        if (r->sw_ok && x->parts)
            snprintf(buf, cap,
                     "a link with no diode of the parts catalog rated %s and as strong in "
                     "current as the template's (Vin/(N-1) at %.0f %% derating)",
                     br_fmt_si(a, sizeof a, r->need, 3, "V"), 100.0 * x->derating);
        else if (r->sw_ok)
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
        split_words(x, r, crit, buf, cap);
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
    case BR_EX_UNSIZED:
        snprintf(buf, cap,
                 "passes with the template's capacitors, but no catalog capacitor keeps rail %d "
                 "at the target (%s)",
                 r->stage, crit);
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
    rc |= br_text_printf(out, "margin target %s; %d combinations, %d feasible, %d on the front\n",
                         br_fmt_si(t, sizeof t, x->target, 3, "V"), x->n, x->nfeasible, x->nfront);
    if (x->parts) {
        char what[1024];
        snprintf(what, sizeof what,
                 "each survivor's rail capacitors sized from %s to the margin target %s, rail by "
                 "rail from the top: the smallest capacitor rated for the supply that keeps every "
                 "margin in volts at the target, judged %s; every link's diode from it by the "
                 "rule (cheapest rated and as strong as the template's)",
                 x->parts->path, t, x->corners ? "at the worst corners" : "at the nominal point");
        rc |= br_report_wrap(out, "sizing: ", what, 2);
    }
    return rc | br_text_put(out, "\n");
}

/* The diode column: the switch catalog's, or the template's; "(sized)"
 * when the links take the parts catalog's (listed below for the front,
 * in the CSV for every row: their names would widen the table past the
 * page). */
static const char *diode_name(const br_explore *x, const br_explore_row *r, const br_catalog *cat)
{
    if (x->parts)
        return "(sized)";
    return r->diode >= 0 ? cat->diodes[r->diode].id : "(template)";
}

static void feasible_row(br_table *t, const br_explore *x, const br_explore_row *r,
                         const br_catalog *cat)
{
    br_table_row(t);
    br_table_set(t, 0, "%d", r->rank);
    br_table_set(t, 1, "%s", r->front ? "*" : "");
    br_table_set(t, 2, "%d", r->levels);
    br_table_set(t, 3, "%s", cat->switches[r->sw].id);
    br_table_set(t, 4, "%.0f", cat->switch_rating[r->sw]);
    br_table_set(t, 5, "%s", diode_name(x, r, cat));
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
                feasible_row(t, x, &x->rows[i], cat);
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

/* The runs of equal parts along stages 1..n-1 of idx (indexes of the
 * parts catalog's capacitors, or diodes): "1-2 a; 3-11 b". */
static void runs(const br_catalog *p, int caps, const signed char *idx, int n, char *buf,
                 size_t cap)
{
    size_t at = 0;
    buf[0] = '\0';
    for (int k = 1; k < n && at < cap;) {
        int e = k;
        while (e + 1 < n && idx[e + 1] == idx[k])
            e++;
        const char *id = idx[k] < 0 ? "(template)"
                         : caps     ? p->caps[idx[k]].id
                                    : p->diodes[idx[k]].id;
        int w = e > k ? snprintf(buf + at, cap - at, "%s%d-%d %s", at ? "; " : "", k, e, id)
                      : snprintf(buf + at, cap - at, "%s%d %s", at ? "; " : "", k, id);
        at += w > 0 ? (size_t)w : 0;
        k = e + 1;
    }
}

/* The sized parts of each front member, in rank order. */
static int sized_parts(const br_explore *x, br_text *out)
{
    if (!x->parts || x->nfront == 0)
        return BR_OK;
    int rc = br_text_put(out, "sized parts of the front (rails and links counted from the "
                              "supply, rail 0):\n");
    char lead[32], caps[1200], diodes[1200], line[2600];
    for (int k = 1; k <= x->nfront; k++)
        for (int i = 0; i < x->n; i++) {
            const br_explore_row *r = &x->rows[i];
            if (r->rank != k || !r->front)
                continue;
            int n = 2 * (r->levels - 1);
            runs(x->parts, 1, r->cap, n, caps, sizeof caps);
            runs(x->parts, 0, r->ldiode, n, diodes, sizeof diodes);
            snprintf(lead, sizeof lead, "  rank %d: ", k);
            snprintf(line, sizeof line, "rail capacitors %s; link diodes %s (%d values judged)",
                     caps, diodes, r->size_trials);
            rc |= br_report_wrap(out, lead, line, 4);
        }
    return rc | br_text_put(out, "\n");
}

static void yield_row(br_table *t, const br_explore_row *r, const br_catalog *cat)
{
    br_table_row(t);
    br_table_set(t, 0, "%d", r->rank);
    br_table_set(t, 1, "%d", r->levels);
    br_table_set(t, 2, "%s", cat->switches[r->sw].id);
    br_table_set(t, 3, "%.1f", r->fsw / 1e3);
    br_table_set(t, 4, "%ld", r->ypass);
    br_table_set(t, 5, "%ld", r->yfail);
    br_table_set(t, 6, "%ld", r->yundet);
    if (isnan(r->yield))
        br_table_set(t, 7, "-");
    else
        br_table_set(t, 7, "%.1f", 100.0 * r->yield);
    br_table_set(t, 8, "%.1f to %.1f", 100.0 * r->ylo, 100.0 * r->yhi);
}

/* The yield of every feasible combination, in rank order. */
static int yields(const br_explore *x, const br_catalog *cat, br_text *out)
{
    if (x->yield_samples <= 0 || x->nfeasible == 0)
        return BR_OK;
    char what[400];
    snprintf(what, sizeof what,
             "%ld samples of each feasible combination's design over its tolerances (seed %lu), "
             "every criterion judged in each, the cold start included; the yield is the share of "
             "the decided samples that pass, its exact 95 %% interval (Clopper-Pearson) counts "
             "the undetermined samples as failures for the lower bound and as passes for the "
             "upper:",
             x->yield_samples, x->seed);
    int rc = br_report_wrap(out, "yield: ", what, 2);
    static const char *const heads[] = {"rank", "levels", "switch",  "fsw kHz",        "pass",
                                        "fail", "undet.", "yield %", "95 % interval %"};
    br_table *t = br_table_create(9, x->nfeasible);
    if (!t)
        return BR_ENOMEM;
    for (int c = 0; c < 9; c++)
        br_table_head(t, c, heads[c], c == 2 ? BR_LEFT : BR_RIGHT);
    for (int k = 1; k <= x->nfeasible; k++)
        for (int i = 0; i < x->n; i++)
            if (x->rows[i].rank == k)
                yield_row(t, &x->rows[i], cat);
    rc |= br_table_render(t, 2, out);
    br_table_free(t);
    return rc | br_text_put(out, "\n");
}

/* One line per combination that is not feasible, wrapped. */
static int rejected(const br_explore *x, const br_catalog *cat, br_text *out)
{
    if (x->n == x->nfeasible)
        return BR_OK;
    int rc = br_text_put(out, "not feasible:\n");
    char lead[128], buf[1024];
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
    rc |= sized_parts(x, out);
    rc |= yields(x, cat, out);
    rc |= rejected(x, cat, out);
    int o = br_explore_outcome(x);
    rc |= br_text_printf(out, "verdict: %s (%d of %d combinations feasible, %s)\n\n",
                         o == BR_OUTCOME_PASS   ? "PASS"
                         : o == BR_OUTCOME_FAIL ? "FAIL"
                                                : "UNDETERMINED",
                         x->nfeasible, x->n,
                         x->corners ? "at their worst corners" : "at the nominal point");
    rc |= br_report_wrap(out, "",
                         x->corners
                             ? "A chain that needs a second supply is also judged split, at the "
                               "nominal point and, where every criterion passes there, at its "
                               "worst corners: an isolated supply of the main supply's voltage "
                               "injected at a rail through that rail's link resistor and diode "
                               "(the rail searched at the nominal point from the lowest one that "
                               "falls short, downwards while the smallest margin grows); the "
                               "split design stays out of the ranking."
                             : "A chain that needs a second supply is also judged split, at the "
                               "nominal point: an isolated supply of the main supply's voltage "
                               "injected at a rail through that rail's link resistor and diode "
                               "(the rail searched from the lowest one that falls short, "
                               "downwards while the smallest margin grows); the split design "
                               "stays out of the ranking.",
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

/* The sized parts of a row as two CSV fields (empty where not sized). */
static int sized_csv(const br_explore *x, const br_explore_row *r, br_text *out)
{
    char caps[1200] = "", diodes[1200] = "";
    int n = 2 * (r->levels - 1);
    if (r->sized)
        runs(x->parts, 1, r->cap, n, caps, sizeof caps);
    if (r->state != BR_EX_RATING)
        runs(x->parts, 0, r->ldiode, n, diodes, sizeof diodes);
    return br_text_printf(out, ",%s,%s", caps, diodes);
}

/* The yield of a row as CSV fields (empty where it has none). */
static int yield_csv(const br_explore_row *r, br_text *out)
{
    char a[32], b[32], c[32];
    if (r->ysamples == 0)
        return br_text_put(out, ",,,,,,,");
    return br_text_printf(out, ",%ld,%ld,%ld,%ld,%s,%s,%s", r->ysamples, r->ypass, r->yfail,
                          r->yundet, num(a, sizeof a, r->yield), num(b, sizeof b, r->ylo),
                          num(c, sizeof c, r->yhi));
}

/* The split's second supply: the module, its cost and the split's cost
 * (the parts' alone, the module column "excluded", where none is costed). */
static int split_supply_csv(const br_explore *x, const br_explore_row *r, br_text *out)
{
    char a[32], b[32];
    int sp = r->inject_rail > 0, m = sp && r->module >= 0 && x->modules;
    return br_text_printf(out, ",%s,%s,%s",
                          m    ? x->modules->module_id[r->module]
                          : sp ? "excluded"
                               : "",
                          num(a, sizeof a, m ? r->module_cost : NAN),
                          num(b, sizeof b, sp ? (m ? r->split_cost : r->cost) : NAN));
}

int br_explore_csv(const br_explore *x, const br_catalog *cat, br_text *out)
{
    int rc = br_text_printf(out,
                            "levels,switch,class_V,need_V,diode,fsw_Hz,state,cost,loss_W,"
                            "margin_V,startup_s,binds,split_at,corners,front,rank,inject_rail,"
                            "split_state,split_margin_V,split_startup_s,split_binds,"
                            "split_corners,split_supply,split_supply_cost,split_cost%s%s\n",
                            x->parts ? ",rail_capacitors,link_diodes" : "",
                            x->yield_samples > 0 ? ",samples,pass,fail,undetermined,yield,"
                                                   "yield_lo,yield_hi"
                                                 : "");
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
        rc |= br_text_printf(out, "%d,%s,%s,%s,%s,%d", r->inject_rail,
                             sp ? br_explore_state_name(r->split_state) : "",
                             num(a, sizeof a, sp ? r->split_margin : NAN),
                             num(b, sizeof b, sp ? r->split_tstart : NAN),
                             sp && r->split_crit >= 0 ? br_crit_name(r->split_crit) : "",
                             sp && r->split_corners);
        rc |= split_supply_csv(x, r, out);
        rc |= x->parts ? sized_csv(x, r, out) : BR_OK;
        rc |= x->yield_samples > 0 ? yield_csv(r, out) : BR_OK;
        rc |= br_text_put(out, "\n");
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
    if (x->parts && r->sized)
        rc |= br_text_printf(out,
                             "Rail capacitors sized from %s to the margin target %s (judged %s);\n"
                             "link diodes from it by the rule.\n",
                             x->parts->path, br_fmt_si(a, sizeof a, x->target, 3, "V"),
                             x->corners ? "at the worst corners" : "at the nominal point");
    if (r->ysamples > 0 && isnan(r->yield))
        rc |= br_text_printf(out, "Yield: none of %ld samples decided (seed %lu).\n", r->ysamples,
                             x->seed);
    else if (r->ysamples > 0)
        rc |=
            br_text_printf(out,
                           "Yield %.1f %% of %ld samples over its tolerances (seed %lu; 95 %% "
                           "interval %.1f %% to %.1f %%).\n",
                           100.0 * r->yield, r->ysamples, x->seed, 100.0 * r->ylo, 100.0 * r->yhi);
    return rc ? BR_ENOMEM : BR_OK;
}

int br_explore_split_comment(const br_explore *x, const br_catalog *cat, const br_explore_row *r,
                             const char *design, br_text *out)
{
    char a[32], b[32], v[256];
    split_verdict(x, r, v, sizeof v);
    int rc = br_text_printf(out,
                            "Built by bootrung explore from %s: %d levels, switch %s (%.0f V "
                            "class),\nat %s on a %s bus, split: one supply fails (rails from "
                            "rail %d up fall short),\nso a second isolated supply is injected "
                            "at rail %d.\n",
                            design, r->levels, cat->switches[r->sw].id, cat->switch_rating[r->sw],
                            br_fmt_si(a, sizeof a, r->fsw, 4, "Hz"),
                            br_fmt_si(b, sizeof b, x->vbus, 4, "V"), r->split_at, r->inject_rail);
    char m[400];
    module_words(x, r, m, sizeof m);
    m[0] = (char)toupper((unsigned char)m[0]); /* a sentence of its own here */
    rc |= br_text_printf(out, "Its verdict: %s.\n", v);
    rc |= br_report_wrap(out, "", m, 0);
    return rc ? BR_ENOMEM : BR_OK;
}

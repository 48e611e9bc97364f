/* yield_report.c - rendering a Monte Carlo yield. */
#include "report/yield_report.h"

#include "report/caution.h"
#include "report/corners_report.h"
#include "report/fmt.h"
#include "report/report_common.h"
#include "report/table.h"
#include "report/verdict_report.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#define TOP_DRIVERS 3 /* parameters shown per criterion */
#define RHO_SHOWN 0.1 /* weaker rank correlations are not worth a line */

/* ---- text ------------------------------------------------------------------ */

/* The samples' cold starts: periods integrated and stepped over in all. */
static void startup_sums(const br_yield *y, long *in, long *st)
{
    *in = *st = 0;
    for (long i = 0; i < y->n; i++) {
        *in += y->pts[i].su_integrated;
        *st += y->pts[i].su_stepped;
    }
}

/* How the samples' cold starts were simulated, summed over them. */
static void startup_periods(const br_yield *y, char *buf, size_t cap)
{
    long in, st;
    startup_sums(y, &in, &st);
    if (st > 0 || y->s->d->startup_method != BR_SU_PERIODS)
        snprintf(buf, cap,
                 " Their periods: %ld integrated, %ld stepped over along the rails' "
                 "envelope.",
                 in, st);
    else
        snprintf(buf, cap, " Their periods: %ld, every one integrated.", in);
}

static int method_text(const br_yield *y, br_text *out)
{
    char buf[1100], acc[32], su[160] = "";
    if (y->startup)
        startup_periods(y, su, sizeof su);
    snprintf(buf, sizeof buf,
             "%ld samples from seed %lu. Each toleranced parameter is drawn from its "
             "distribution (uniform between its limits, or normal about the nominal with the "
             "limits at the stated sigma, truncated at them) by the GSL Mersenne Twister, one "
             "value per parameter, shared by every stage that uses it (parts of one reel). "
             "Each sample's steady states are found to within %s of periodic (a quasi-Newton "
             "solve from the nominal state, the shooting solver behind it). %s%s",
             y->n, y->seed, br_fmt_si(acc, sizeof acc, y->accept, 3, "V"),
             y->startup ? "Every sample has a cold start, so the start-up criteria count."
                        : "No cold start: the start-up criteria are not judged (--startup "
                          "judges them, at about a hundred simulated periods a sample).",
             su);
    return br_report_wrap(out, "method: ", buf, 2);
}

/* A line cycle: what each sample costs, so that the reader can size the
 * run (every sample is whole line periods of simulation). */
static int line_cost_text(const br_chain *c, const br_yield *y, br_text *out)
{
    if (!c->line.on || y->n <= 0)
        return BR_OK;
    double periods = 0.0;
    for (long i = 0; i < y->n; i++)
        periods += (double)y->pts[i].periods;
    periods /= (double)y->n;
    char buf[700];
    snprintf(buf, sizeof buf,
             "each sample's steady state is solved over the whole line cycle (%ld switching "
             "periods a line period); this run simulated %.0f switching periods a sample "
             "(%.1f line periods), about a thousand times what a sample at a DC operating "
             "point takes. Size --samples to the time at hand: the README gives measured "
             "times, and a few hundred samples give the yield to a few percent.",
             c->line.K, periods, periods / (double)c->line.K);
    return br_report_wrap(out, "line cycle: ", buf, 2);
}

static const char *pct(char *buf, size_t cap, double f)
{
    snprintf(buf, cap, "%.4g %%", 100.0 * f);
    return buf;
}

/* The share of the decided samples that pass, or why there is none. */
static const char *estimate(char *buf, size_t cap, const br_yield *y)
{
    if (!isfinite(y->yield))
        snprintf(buf, cap, "no estimate, as no sample was decided");
    else
        snprintf(buf, cap, "%.4g %% of the decided samples", 100.0 * y->yield);
    return buf;
}

static int undetermined_note(const br_yield *y, br_text *out)
{
    char buf[600], why[200];
    if (y->undetermined == 0)
        return BR_OK;
    long other = y->undetermined - y->unsettled - y->unjudged;
    snprintf(why, sizeof why,
             "%s%ld where the solver did not settle a steady state whose drivers "
             "keep running, %ld that could not be judged at all",
             other > 0 ? "of them " : "", y->unsettled, y->unjudged);
    snprintf(buf, sizeof buf,
             "%ld sample%s neither pass%s nor fail%s (%s%s). They are unknowns: the estimate is "
             "over the decided samples, the lower bound counts every undetermined sample as "
             "failing and the upper bound every one as passing.",
             y->undetermined, y->undetermined == 1 ? "" : "s", y->undetermined == 1 ? "es" : "",
             y->undetermined == 1 ? "s" : "", why,
             other > 0 ? ", the others with a criterion not decided for another reason" : "");
    return br_report_wrap(out, "  note: ", buf, 8);
}

static int verdict_line(const br_yield *y, double min_yield, br_text *out)
{
    char b[32], d[32], buf[400];
    int outcome = br_yield_outcome(y, min_yield);
    if (min_yield >= 0) {
        snprintf(buf, sizeof buf, "%s: the lower confidence bound %s is %s the minimum %s%s",
                 outcome == BR_OUTCOME_PASS   ? "PASS"
                 : outcome == BR_OUTCOME_FAIL ? "FAIL"
                                              : "UNDETERMINED",
                 pct(b, sizeof b, y->lo), y->lo >= min_yield ? "at or above" : "below",
                 pct(d, sizeof d, min_yield),
                 outcome == BR_OUTCOME_UNDETERMINED
                     ? ", and would reach it were enough undetermined samples to pass"
                 : outcome == BR_OUTCOME_FAIL && y->undetermined > 0
                     ? ", even were every undetermined sample to pass"
                     : "");
        return br_report_wrap(out, "verdict: ", buf, 2);
    }
    return br_text_printf(out, "verdict: %s\n",
                          outcome == BR_OUTCOME_PASS ? "PASS, every sample passes"
                          : outcome == BR_OUTCOME_FAIL
                              ? "FAIL, some samples fail (--min-yield sets the yield to sign off "
                                "on)"
                              : "UNDETERMINED, no sample fails but some could not be decided");
}

static int yield_line(const br_yield *y, double min_yield, br_text *out)
{
    char a[64], b[32], c[32], buf[500];
    snprintf(buf, sizeof buf,
             "%ld of %ld samples pass, %ld fail, %ld undetermined: %s (95 %% confidence "
             "interval %s to %s, exact, Clopper-Pearson%s)",
             y->pass, y->n, y->fail, y->undetermined, estimate(a, sizeof a, y),
             pct(b, sizeof b, y->lo), pct(c, sizeof c, y->hi),
             y->undetermined > 0 ? ", the undetermined samples as unknowns" : "");
    int rc = br_report_wrap(out, "yield: ", buf, 2);
    rc |= undetermined_note(y, out);
    rc |= verdict_line(y, min_yield, out);
    return rc;
}

static int quantile_table(const br_yield *y, br_text *out)
{
    static const char *const heads[] = {"criterion", "fails", "undetermined", "minimum",
                                        "0.1 %",     "1 %",   "10 %",         "median"};
    enum { NC = 8 };
    int rc = br_text_put(out, "\n");
    rc |= br_report_wrap(out, "margins over the samples ",
                         "(quantiles of each criterion's margin where it is decided; fails: "
                         "samples where it fails; undetermined: samples where it is not decided; "
                         "warn: where it passes with a warning; the periodic steady state is a "
                         "status)",
                         0);
    br_table *t = br_table_create(NC, BR_CRIT_COUNT);
    if (!t)
        return BR_ENOMEM;
    for (int col = 0; col < NC; col++)
        br_table_head(t, col, heads[col], col == 0 ? BR_LEFT : BR_RIGHT);
    for (int crit = 0; crit < BR_CRIT_COUNT; crit++) {
        const br_yield_crit *yc = &y->c[crit];
        char b[BR_TABLE_CELL];
        br_table_row(t);
        br_table_set(t, 0, "%s", br_crit_title(crit));
        if (!yc->applies && yc->undetermined == 0) {
            br_table_set(t, 1, "n/a");
            for (int col = 2; col < NC; col++)
                br_table_set(t, col, "-");
            continue;
        }
        if (yc->warns > 0)
            br_table_set(t, 1, "%ld, %ld warn", yc->fails, yc->warns);
        else
            br_table_set(t, 1, "%ld", yc->fails);
        br_table_set(t, 2, "%ld", yc->undetermined);
        for (int q = 0; q < BR_YIELD_NQ; q++) {
            if (yc->applies && yc->has_margin)
                br_table_set(t, 3 + q, "%s", br_crit_fmt(b, sizeof b, crit, yc->q[q]));
            else
                br_table_set(t, 3 + q, "-");
        }
    }
    rc |= br_table_render(t, 2, out);
    br_table_free(t);
    return rc;
}

/* Parameters of criterion crit by falling |rho|, those above RHO_SHOWN. */
static int strongest(const br_yield *y, int crit, int *order)
{
    int n = 0;
    const double *rho = y->c[crit].rho;
    for (int j = 0; j < y->s->tl.n; j++)
        if (isfinite(rho[j]) && fabs(rho[j]) >= RHO_SHOWN)
            order[n++] = j;
    for (int a = 1; a < n; a++)
        for (int b = a; b > 0 && fabs(rho[order[b]]) > fabs(rho[order[b - 1]]); b--) {
            int tmp = order[b];
            order[b] = order[b - 1];
            order[b - 1] = tmp;
        }
    return n < TOP_DRIVERS ? n : TOP_DRIVERS;
}

static void driver_rows(br_table *t, const br_yield *y, int crit)
{
    int order[BR_TOL_MAX], n = strongest(y, crit, order);
    for (int a = 0; a < n; a++) {
        br_table_row(t);
        br_table_set(t, 0, "%s", a == 0 ? br_crit_title(crit) : "");
        br_table_set(t, 1, "%s", a == 0 && y->c[crit].fails > 0 ? "yes" : "");
        br_table_set(t, 2, "%s", y->s->tl.p[order[a]].name);
        br_table_set(t, 3, "%+.2f", y->c[crit].rho[order[a]]);
    }
}

static int drivers_table(const br_yield *y, br_text *out)
{
    if (y->s->tl.n == 0 || y->n < 3)
        return BR_OK;
    int rc = br_text_put(out, "\nwhat moves the margins (Spearman's rank correlation of each "
                              "parameter with a criterion's\nmargin: + raises it, - lowers it; the "
                              "three strongest, |rho| >= 0.1)\n");
    br_table *t = br_table_create(4, BR_CRIT_COUNT * TOP_DRIVERS);
    if (!t)
        return BR_ENOMEM;
    static const char *const heads[] = {"criterion", "fails", "parameter", "rho"};
    for (int col = 0; col < 4; col++)
        br_table_head(t, col, heads[col], col == 3 ? BR_RIGHT : BR_LEFT);
    /* a status (the steady state) has no margin to correlate */
    for (int crit = 0; crit < BR_CRIT_COUNT; crit++)
        if (y->c[crit].has_margin && y->c[crit].applies)
            driver_rows(t, y, crit);
    rc |= br_table_render(t, 2, out);
    br_table_free(t);
    return rc;
}

int br_yield_text(const br_chain *c, const br_yield *y, double min_yield, br_text *out)
{
    int rc = br_report_heading(c, "Monte Carlo yield", out);
    rc |= br_param_table(&y->s->tl, out);
    rc |= br_text_put(out, "\n");
    rc |= method_text(y, out);
    rc |= line_cost_text(c, y, out);
    rc |= br_text_put(out, "\n");
    rc |= yield_line(y, min_yield, out);
    rc |= quantile_table(y, out);
    rc |= drivers_table(y, out);
    rc |= br_report_caution(out);
    return rc ? BR_ENOMEM : BR_OK;
}

/* ---- XML and CSV -------------------------------------------------------------- */

static void xml_crit(br_xmlw *w, const br_yield *y, int crit)
{
    static const char *const qname[BR_YIELD_NQ] = {"min", "q0.001", "q0.01", "q0.1", "median"};
    const br_yield_crit *yc = &y->c[crit];
    br_xmlw_start(w, "criterion");
    br_xmlw_attr(w, "name", br_crit_name(crit));
    br_xmlw_bool(w, "applies", yc->applies || yc->undetermined > 0);
    if (yc->applies || yc->undetermined > 0) {
        br_xmlw_int(w, "judged", yc->judged);
        br_xmlw_int(w, "fails", yc->fails);
        br_xmlw_int(w, "undetermined", yc->undetermined);
        if (yc->warns > 0)
            br_xmlw_int(w, "warns", yc->warns);
        br_xmlw_attr(w, "kind", yc->has_margin ? "margin" : "status");
    }
    if (yc->applies && yc->has_margin) {
        br_xmlw_attr(w, "unit", br_crit_unit(crit));
        for (int q = 0; q < BR_YIELD_NQ; q++)
            br_xmlw_num(w, qname[q], yc->q[q]);
        for (int j = 0; j < y->s->tl.n; j++) {
            if (!isfinite(yc->rho[j]))
                continue;
            br_xmlw_start(w, "rank-correlation");
            br_xmlw_int(w, "parameter", j + 1);
            br_xmlw_num(w, "rho", yc->rho[j]);
            br_xmlw_end(w);
        }
    }
    br_xmlw_end(w);
}

int br_yield_xml(const br_chain *c, const br_yield *y, double min_yield, const char *version,
                 br_text *out, br_error *err)
{
    br_xmlw *w;
    int rc = br_xmlw_create(&w, err);
    if (rc != BR_OK)
        return rc;
    int outcome = br_yield_outcome(y, min_yield);
    br_results_root(w, c, "yield", version);
    br_param_xml(w, &y->s->tl);
    br_xmlw_start(w, "yield");
    br_xmlw_int(w, "samples", y->n);
    br_xmlw_int(w, "seed", (long)y->seed);
    br_xmlw_bool(w, "startup", y->startup);
    if (y->startup) {
        long in, st;
        startup_sums(y, &in, &st);
        br_xmlw_int(w, "startup-periods-integrated", in);
        br_xmlw_int(w, "startup-periods-stepped", st);
    }
    br_xmlw_num(w, "accept-V", y->accept);
    if (y->s->solver_limit > 0)
        br_xmlw_int(w, "solver-limit", y->s->solver_limit);
    br_xmlw_int(w, "pass", y->pass);
    br_xmlw_int(w, "fail", y->fail);
    br_xmlw_int(w, "undetermined", y->undetermined);
    br_xmlw_int(w, "unsettled", y->unsettled);
    br_xmlw_int(w, "unjudged", y->unjudged);
    br_xmlw_num(w, "yield", y->yield); /* of the decided samples; absent when none is */
    br_xmlw_num(w, "lower", y->lo);
    br_xmlw_num(w, "upper", y->hi);
    br_xmlw_attr(w, "interval",
                 "undetermined samples count as failing for the lower bound and as passing "
                 "for the upper");
    br_xmlw_num(w, "confidence", 0.95);
    if (min_yield >= 0)
        br_xmlw_num(w, "min-yield", min_yield);
    br_xmlw_attr(w, "result", br_outcome_name(outcome));
    br_xmlw_bool(w, "ok", outcome == BR_OUTCOME_PASS);
    for (int crit = 0; crit < BR_CRIT_COUNT; crit++)
        xml_crit(w, y, crit);
    br_xmlw_end(w);
    br_xml_caution(w);
    rc = br_xmlw_finish(w, out, err);
    br_xmlw_free(w);
    return rc;
}

/* A parameter name as a CSV field: quoted, inner quotes doubled. */
static int csv_name(br_text *out, const char *name)
{
    int rc = br_text_put(out, ",\"");
    for (const char *p = name; *p; p++)
        rc |= *p == '"' ? br_text_put(out, "\"\"") : br_text_printf(out, "%c", *p);
    return rc | br_text_put(out, "\"");
}

/* One criterion's cell of a sample: its margin, or for a status its
 * result; empty where it does not apply, and a margin where it is not
 * decided. */
static int csv_cell(br_text *out, const br_pt *p, int crit)
{
    const br_pt_row *r = &p->row[crit];
    int judged = p->status == BR_OK && r->applies;
    if (!br_crit_has_margin(crit))
        return br_text_printf(out, ",%s",
                              !judged           ? (p->status == BR_OK ? "" : "undetermined")
                              : r->undetermined ? "undetermined"
                              : r->pass         ? "pass"
                                                : "fail");
    if (judged && !r->undetermined && isfinite(r->margin))
        return br_text_printf(out, ",%.9g", r->margin);
    return br_text_put(out, ",");
}

int br_yield_csv(const br_yield *y, br_text *out)
{
    int k = y->s->tl.n;
    int rc = br_text_put(out, "sample,result");
    for (int j = 0; j < k; j++)
        rc |= csv_name(out, y->s->tl.p[j].name);
    for (int crit = 0; crit < BR_CRIT_COUNT; crit++)
        rc |= br_crit_has_margin(crit)
                  ? br_text_printf(out, ",margin_%s%s%s", br_crit_name(crit),
                                   br_crit_unit(crit)[0] ? "_" : "", br_crit_unit(crit))
                  : br_text_printf(out, ",%s", br_crit_name(crit));
    rc |= br_text_put(out, "\n");
    for (long i = 0; rc == BR_OK && i < y->n; i++) {
        const br_pt *p = &y->pts[i];
        rc |= br_text_printf(out, "%ld,%s", i + 1, br_outcome_name(p->outcome));
        for (int j = 0; j < k; j++)
            rc |= br_text_printf(out, ",%.9g", y->values[i * k + j]);
        for (int crit = 0; crit < BR_CRIT_COUNT; crit++)
            rc |= csv_cell(out, p, crit);
        rc |= br_text_put(out, "\n");
    }
    return rc ? BR_ENOMEM : BR_OK;
}

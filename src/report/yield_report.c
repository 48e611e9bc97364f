/* yield_report.c - rendering a Monte Carlo yield. */
#include "report/yield_report.h"

#include "report/caution.h"
#include "report/corners_report.h"
#include "report/fmt.h"
#include "report/report_common.h"
#include "report/table.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#define TOP_DRIVERS 3 /* parameters shown per criterion */
#define RHO_SHOWN 0.1 /* weaker rank correlations are not worth a line */

static const char *const UNITS[BR_CRIT_COUNT] = {"s", "A", "V", "V", "V", "V", "V", "V", "V"};

int br_yield_failed(const br_yield *y, double min_yield)
{
    return min_yield >= 0 ? y->lo < min_yield : y->pass < y->n;
}

/* ---- text ------------------------------------------------------------------ */

static int method_text(const br_yield *y, br_text *out)
{
    char buf[900], acc[32];
    snprintf(buf, sizeof buf,
             "%ld samples from seed %lu. Each toleranced parameter is drawn from its "
             "distribution (uniform between its limits, or normal about the nominal with the "
             "limits at the stated sigma, truncated at them) by the GSL Mersenne Twister, one "
             "value per parameter, shared by every stage that uses it (parts of one reel). "
             "Each sample's steady states are found to within %s of periodic (a quasi-Newton "
             "solve from the nominal state, the shooting solver behind it). %s",
             y->n, y->seed, br_fmt_si(acc, sizeof acc, y->accept, 3, "V"),
             y->startup ? "Every sample has a cold start, so the start-up criteria count."
                        : "No cold start: the start-up criteria are not judged (--startup "
                          "judges them, at about a hundred simulated periods a sample).");
    return br_report_wrap(out, "method: ", buf, 2);
}

static const char *pct(char *buf, size_t cap, double f)
{
    snprintf(buf, cap, "%.4g %%", 100.0 * f);
    return buf;
}

static int yield_line(const br_yield *y, double min_yield, br_text *out)
{
    char a[32], b[32], c[32], d[32], buf[400];
    snprintf(buf, sizeof buf,
             "%ld of %ld samples pass: %s (95 %% confidence interval %s to %s, exact, "
             "Clopper-Pearson)",
             y->pass, y->n, pct(a, sizeof a, y->yield), pct(b, sizeof b, y->lo),
             pct(c, sizeof c, y->hi));
    int rc = br_report_wrap(out, "yield: ", buf, 2);
    if (y->unjudged > 0) {
        snprintf(buf, sizeof buf, "%ld sample%s could not be judged and count as failing.",
                 y->unjudged, y->unjudged == 1 ? "" : "s");
        rc |= br_report_wrap(out, "  note: ", buf, 8);
    }
    if (y->steady_only > 0) {
        snprintf(buf, sizeof buf,
                 "%ld failing sample%s fail only because the solver found no periodic steady "
                 "state there; analyze at those values to see why.",
                 y->steady_only, y->steady_only == 1 ? "" : "s");
        rc |= br_report_wrap(out, "  note: ", buf, 8);
    }
    if (min_yield >= 0) {
        snprintf(buf, sizeof buf, "%s: the lower confidence bound %s is %s the minimum %s",
                 y->lo >= min_yield ? "PASS" : "FAIL", pct(b, sizeof b, y->lo),
                 y->lo >= min_yield ? "at or above" : "below", pct(d, sizeof d, min_yield));
        rc |= br_report_wrap(out, "verdict: ", buf, 2);
    } else {
        rc |= br_text_printf(out, "verdict: %s\n",
                             y->pass == y->n ? "PASS, every sample passes"
                                             : "FAIL, some samples fail (--min-yield sets the "
                                               "yield to sign off on)");
    }
    return rc;
}

static int quantile_table(const br_yield *y, br_text *out)
{
    static const char *const heads[] = {"criterion", "fails", "minimum", "0.1 %",
                                        "1 %",       "10 %",  "median"};
    int rc = br_text_put(out, "\nmargins over the samples (quantiles of each criterion's margin; "
                              "fails: samples where it fails)\n");
    br_table *t = br_table_create(7, BR_CRIT_COUNT);
    if (!t)
        return BR_ENOMEM;
    for (int col = 0; col < 7; col++)
        br_table_head(t, col, heads[col], col == 0 ? BR_LEFT : BR_RIGHT);
    for (int crit = 0; crit < BR_CRIT_COUNT; crit++) {
        const br_yield_crit *yc = &y->c[crit];
        char b[BR_TABLE_CELL];
        br_table_row(t);
        br_table_set(t, 0, "%s", br_crit_name(crit));
        if (!yc->applies) {
            br_table_set(t, 1, "n/a");
            for (int col = 2; col < 7; col++)
                br_table_set(t, col, "-");
            continue;
        }
        br_table_set(t, 1, "%ld", yc->fails);
        for (int q = 0; q < BR_YIELD_NQ; q++)
            br_table_set(t, 2 + q, "%s", br_fmt_si(b, sizeof b, yc->q[q], 4, UNITS[crit]));
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
        br_table_set(t, 0, "%s", a == 0 ? br_crit_name(crit) : "");
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
    /* the steady-state row's margin is the solver's drift, not a circuit figure */
    for (int crit = 0; crit < BR_CRIT_COUNT; crit++)
        if (crit != BR_CRIT_STEADY && y->c[crit].applies)
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
    br_xmlw_bool(w, "applies", yc->applies);
    if (yc->applies) {
        br_xmlw_int(w, "judged", yc->judged);
        br_xmlw_int(w, "fails", yc->fails);
        br_xmlw_attr(w, "unit", UNITS[crit]);
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
    br_results_root(w, c, "yield", version);
    br_param_xml(w, &y->s->tl);
    br_xmlw_start(w, "yield");
    br_xmlw_int(w, "samples", y->n);
    br_xmlw_int(w, "seed", (long)y->seed);
    br_xmlw_bool(w, "startup", y->startup);
    br_xmlw_num(w, "accept-V", y->accept);
    br_xmlw_int(w, "pass", y->pass);
    br_xmlw_int(w, "unjudged", y->unjudged);
    br_xmlw_num(w, "yield", y->yield);
    br_xmlw_num(w, "lower", y->lo);
    br_xmlw_num(w, "upper", y->hi);
    br_xmlw_num(w, "confidence", 0.95);
    if (min_yield >= 0)
        br_xmlw_num(w, "min-yield", min_yield);
    br_xmlw_bool(w, "ok", !br_yield_failed(y, min_yield));
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

int br_yield_csv(const br_yield *y, br_text *out)
{
    int k = y->s->tl.n;
    int rc = br_text_put(out, "sample,pass");
    for (int j = 0; j < k; j++)
        rc |= csv_name(out, y->s->tl.p[j].name);
    for (int crit = 0; crit < BR_CRIT_COUNT; crit++)
        rc |= br_text_printf(out, ",margin_%s_%s", br_crit_name(crit), UNITS[crit]);
    rc |= br_text_put(out, "\n");
    for (long i = 0; rc == BR_OK && i < y->n; i++) {
        const br_pt *p = &y->pts[i];
        rc |= br_text_printf(out, "%ld,%d", i + 1, p->pass);
        for (int j = 0; j < k; j++)
            rc |= br_text_printf(out, ",%.9g", y->values[i * k + j]);
        for (int crit = 0; crit < BR_CRIT_COUNT; crit++) {
            if (p->status == BR_OK && p->row[crit].applies)
                rc |= br_text_printf(out, ",%.9g", p->row[crit].margin);
            else
                rc |= br_text_put(out, ",");
        }
        rc |= br_text_put(out, "\n");
    }
    return rc ? BR_ENOMEM : BR_OK;
}

/* line_report.c - what a line cycle adds to the reports. */
#include "report/line_report.h"

#include "report/fmt.h"
#include "report/report_common.h"
#include "report/table.h"

#include <math.h>
#include <stdio.h>

#define KELVIN 273.15

double br_line_deg(double theta)
{
    double d = theta * 180.0 / BR_PI;
    d = fmod(d, 360.0);
    return d < 0 ? d + 360.0 : d;
}

const char *br_line_describe(const br_chain *c, char *buf, size_t cap)
{
    const br_line *l = &c->line;
    char f[24], i[24], mod[48];
    if (l->ntab > 0)
        snprintf(mod, sizeof mod, "duty table of %d points", l->ntab);
    else
        snprintf(mod, sizeof mod, "sine depth %.3g", l->depth);
    snprintf(buf, cap,
             "%s line (%ld switching periods), %s peak %.3g deg behind the modulation, %s",
             br_fmt_si(f, sizeof f, l->freq, 4, "Hz"), l->K, br_fmt_si(i, sizeof i, l->ipk, 4, "A"),
             l->phase * 180.0 / BR_PI, mod);
    return buf;
}

int br_line_heading(const br_chain *c, br_text *out)
{
    char what[160], t[24], line[320];
    int n = snprintf(line, sizeof line, "%s, switches at %.0f degC; ",
                     br_line_describe(c, what, sizeof what), c->tj - KELVIN);
    size_t at = n > 0 && (size_t)n < sizeof line ? (size_t)n : 0;
    if (c->load_from < HUGE_VAL)
        snprintf(line + at, sizeof line - at, "start-up under load from %s",
                 br_fmt_si(t, sizeof t, c->load_from, 4, "s"));
    else
        snprintf(line + at, sizeof line - at, "start-up at no load");
    return br_report_wrap(out, "  ", line, 4);
}

/* ---- where in the line cycle -------------------------------------------------- */

/* Window w's line phase (deg), and the duty and current of the switching
 * period there, into three cells from col. */
static void where_cells(br_table *t, int col, const br_chain *c, const br_steady *ss, long w)
{
    double th;
    long m;
    br_line_window(&c->line, c->T, ss->phase, w, &th, &m);
    br_table_set(t, col, "%.1f", br_line_deg(th));
    br_table_set(t, col + 1, "%.3f", br_line_duty(&c->line, m));
    br_table_set(t, col + 2, "%+.2f", br_line_current(&c->line, m));
}

static br_table *where_table(int ncol, int nrow, const char *first)
{
    br_table *t = br_table_create(ncol, nrow);
    if (!t)
        return NULL;
    br_table_head(t, 0, first, BR_RIGHT);
    br_table_head(t, 1, "switch", BR_LEFT);
    for (int col = 2; col < ncol; col++)
        br_table_head(t, col, "", BR_RIGHT);
    return t;
}

static int render(br_table *t, br_text *out)
{
    if (!t)
        return BR_ENOMEM;
    int rc = br_table_render(t, 2, out);
    br_table_free(t);
    return rc;
}

static int rails_where(const br_chain *c, const br_steady_figs *f, br_text *out)
{
    static const char *const h[] = {"lowest drv V",  "at deg", "duty", "current A",
                                    "highest drv V", "at deg", "duty", "current A"};
    br_table *t = where_table(10, c->n, "stage");
    if (!t)
        return BR_ENOMEM;
    for (int i = 0; i < 8; i++)
        br_table_head(t, 2 + i, h[i], BR_RIGHT);
    for (int k = 0; k < c->n; k++) {
        br_table_row(t);
        br_table_set(t, 0, "%d", k);
        br_table_set(t, 1, "%s", c->st[k].name);
        br_table_set(t, 2, "%.3f", f->rail[k].vdrv_min);
        where_cells(t, 3, c, f->ss, f->ss->at_dmin[k]);
        br_table_set(t, 6, "%.3f", f->rail[k].vdrv_max);
        where_cells(t, 7, c, f->ss, f->ss->at_dmax[k]);
    }
    return render(t, out);
}

static int links_where(const br_chain *c, const br_steady_figs *f, br_text *out)
{
    static const char *const h[] = {"peak reverse V", "at deg", "duty", "current A"};
    br_table *t = where_table(6, c->n, "link");
    if (!t)
        return BR_ENOMEM;
    for (int i = 0; i < 4; i++)
        br_table_head(t, 2 + i, h[i], BR_RIGHT);
    for (int k = 1; k < c->n; k++) {
        br_table_row(t);
        br_table_set(t, 0, "%d", k);
        br_table_set(t, 1, "%s", c->st[k].name);
        br_table_set(t, 2, "%.1f", f->link[k].vrev_sim);
        where_cells(t, 3, c, f->ss, f->ss->at_vrev[k]);
    }
    return render(t, out);
}

int br_line_where_text(const br_chain *c, const br_steady_figs *f, br_text *out)
{
    int rc = br_text_put(out, "where in the line cycle (line phase of the switching period where "
                              "it occurs, that period's\n  duty and current, + out of the "
                              "switch node): driver supplies at their lowest and highest\n");
    rc |= rails_where(c, f, out);
    rc |= br_text_put(out, "diodes at their peak reverse voltage over the line cycle\n");
    return rc | links_where(c, f, out);
}

/* ---- XML --------------------------------------------------------------------------- */

void br_line_xml_operating(br_xmlw *w, const br_chain *c)
{
    const br_line *l = &c->line;
    if (!l->on)
        return;
    br_xmlw_start(w, "line-cycle");
    br_xmlw_num(w, "frequency-Hz", l->freq);
    br_xmlw_num(w, "given-frequency-Hz", l->freq_given);
    br_xmlw_int(w, "periods", l->K);
    br_xmlw_num(w, "peak-current-A", l->ipk);
    br_xmlw_num(w, "phase-deg", l->phase * 180.0 / BR_PI);
    if (l->ntab > 0)
        br_xmlw_int(w, "duty-points", l->ntab);
    else
        br_xmlw_num(w, "depth", l->depth);
    br_xmlw_end(w);
}

void br_line_xml_steady(br_xmlw *w, const br_chain *c)
{
    br_xmlw_num(w, "line-frequency-Hz", c->line.freq);
    br_xmlw_int(w, "line-periods", c->line.K);
}

/* prefix-at-deg, prefix-period of window w. */
static void xml_at(br_xmlw *w, const br_chain *c, const br_steady *ss, const char *prefix, long win)
{
    char a[48];
    double th;
    long m;
    br_line_window(&c->line, c->T, ss->phase, win, &th, &m);
    snprintf(a, sizeof a, "%s-at-deg", prefix);
    br_xmlw_num(w, a, br_line_deg(th));
    snprintf(a, sizeof a, "%s-period", prefix);
    br_xmlw_int(w, a, m);
}

void br_line_xml_rail(br_xmlw *w, const br_chain *c, const br_steady *ss, int k)
{
    xml_at(w, c, ss, "driver-min", ss->at_dmin[k]);
    xml_at(w, c, ss, "driver-max", ss->at_dmax[k]);
    if (k > 0)
        xml_at(w, c, ss, "cap-peak", ss->at_vcap[k]);
}

void br_line_xml_link(br_xmlw *w, const br_chain *c, const br_steady *ss, int k)
{
    xml_at(w, c, ss, "reverse", ss->at_vrev[k]);
}

void br_line_xml_row(br_xmlw *w, const br_chain *c, const br_verdict_row *r)
{
    if (r->line_period < 0 || !c->line.on)
        return;
    br_xmlw_num(w, "line-phase-deg", br_line_deg(r->line_theta));
    br_xmlw_int(w, "line-period", r->line_period);
    br_xmlw_num(w, "duty", br_line_duty(&c->line, r->line_period));
    br_xmlw_num(w, "current-A", br_line_current(&c->line, r->line_period));
}

/* ---- CSV ---------------------------------------------------------------------------- */

static int csv_block(br_text *csv, const double *a, int r, int n, int from)
{
    int rc = 0;
    for (int k = from; k < n; k++) {
        double v = a[(size_t)r * (size_t)n + (size_t)k];
        rc |=
            isfinite(v) ? br_text_printf(csv, ",%.7g", v == 0.0 ? 0.0 : v) : br_text_put(csv, ",");
    }
    return rc;
}

static int csv_links(br_text *csv, const br_line_env *e, int r, double dt)
{
    int rc = 0;
    for (int k = 1; k < e->n; k++)
        rc |= br_text_printf(csv, ",%.7g", e->q[(size_t)r * (size_t)e->n + (size_t)k] / dt);
    return rc;
}

int br_line_csv(const br_chain *c, const br_line_env *e, br_text *csv)
{
    int rc = 0;
    for (int r = 0; r < e->rows; r++) {
        long m0 = br_line_env_first(e, r),
             m1 = r + 1 < e->rows ? br_line_env_first(e, r + 1) : e->K;
        double t = e->phase + (double)m0 * c->T, dt = (double)(m1 - m0) * c->T;
        for (int hi = 0; hi < 2; hi++) {
            rc |= br_text_printf(csv, "%s,%.10g", hi ? "line-max" : "line-min", t);
            rc |= csv_block(csv, hi ? e->vmax : e->vmin, r, e->n, 0);
            rc |= br_text_put(csv, ","); /* supply_A: the envelope keeps none */
            rc |= csv_links(csv, e, r, dt);
            for (int k = 1; k < e->n; k++) /* disp_: the envelope keeps none */
                rc |= br_text_put(csv, ",");
            rc |= csv_block(csv, hi ? e->dmax : e->dmin, r, e->n, 0);
            if (hi) {
                rc |= csv_block(csv, e->vrev, r, e->n, 1);
            } else {
                for (int k = 1; k < e->n; k++)
                    rc |= br_text_put(csv, ",");
            }
            rc |= br_text_put(csv, "\n");
        }
    }
    return rc ? BR_ENOMEM : BR_OK;
}

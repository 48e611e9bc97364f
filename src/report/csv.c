/* csv.c - simulator samples as CSV rows, thinned to a min/max envelope. */
#include "report/csv.h"

#include <math.h>
#include <string.h>

#define M BR_MAX_SWITCHES

int br_csv_header(const br_chain *c, br_text *out)
{
    int rc = br_text_put(out, "series,t_s");
    for (int k = 0; k < c->n; k++)
        rc |= br_text_printf(out, ",rail_%s_V", c->st[k].name);
    rc |= br_text_put(out, ",supply_A");
    for (int k = 1; k < c->n; k++)
        rc |= br_text_printf(out, ",link_%s_A", c->st[k].name);
    for (int k = 1; k < c->n; k++)
        rc |= br_text_printf(out, ",disp_%s_A", c->st[k].name);
    for (int k = 0; k < c->n; k++)
        rc |= br_text_printf(out, ",drv_%s_V", c->st[k].name);
    for (int k = 1; k < c->n; k++)
        rc |= br_text_printf(out, ",vrev_%s_V", c->st[k].name);
    return rc | br_text_put(out, "\n") ? BR_ENOMEM : BR_OK;
}

void br_csv_series_init(br_csv_series *s, br_text *out, const char *label, int n, double min_dt,
                        double t_offset)
{
    memset(s, 0, sizeof *s);
    s->out = out;
    s->label = label;
    s->n = n;
    s->min_dt = min_dt;
    s->t_offset = t_offset;
    s->force = 1; /* the first sample always */
}

/* One column block: values from `from` to n-1, a value that is not
 * finite as an empty field. */
static int put_values(br_text *out, const double *x, int from, int n)
{
    int rc = 0;
    for (int k = from; k < n; k++)
        rc |= isfinite(x[k]) ? br_text_printf(out, ",%.7g", x[k] == 0.0 ? 0.0 : x[k])
                             : br_text_put(out, ",");
    return rc;
}

/* 7 significant digits: 10 uV on a 15 V rail, finer than any figure the
 * reports quote; time gets more so that the rows of one period differ. */
static void put_row(br_csv_series *s, const br_csv_row *r)
{
    const double *v = r->x + BR_CSV_V * M, *i = r->x + BR_CSV_I * M, *j = r->x + BR_CSV_J * M;
    const double *d = r->x + BR_CSV_D * M, *q = r->x + BR_CSV_R * M;
    if (s->row)
        s->row(s->row_ctx, r->t, v, i, d, q, j);
    s->rows++;
    if (!s->out)
        return;
    int rc = br_text_printf(s->out, "%s,%.10g", s->label, r->t + s->t_offset);
    rc |= put_values(s->out, v, 0, s->n);
    rc |= put_values(s->out, i, 0, s->n); /* [0]: the supply (link 0 does not exist) */
    rc |= put_values(s->out, j, 1, s->n);
    rc |= put_values(s->out, d, 0, s->n);
    rc |= put_values(s->out, q, 1, s->n);
    rc |= br_text_put(s->out, "\n");
    s->failed |= rc != 0;
}

/* The columns a row uses, as indexes into x. */
static int in_use(const br_csv_series *s, int col)
{
    return col % M < s->n;
}

/* Take sample r into the envelope. */
static void envelope_add(br_csv_series *s, const br_csv_row *r)
{
    if (s->nenv++ == 0) {
        s->lo = s->hi = *r;
        memset(s->lo_first, 1, sizeof s->lo_first);
        return;
    }
    s->hi.t = r->t;
    for (int col = 0; col < BR_CSV_BLOCKS * M; col++) {
        double x = r->x[col];
        if (!in_use(s, col) || !isfinite(x))
            continue;
        /* the first value of a column is both its low and its high; the
         * one that moves later came second */
        if (x < s->lo.x[col] || !isfinite(s->lo.x[col])) {
            s->lo.x[col] = x;
            s->lo_first[col] = 0;
        } else if (x > s->hi.x[col] || !isfinite(s->hi.x[col])) {
            s->hi.x[col] = x;
            s->lo_first[col] = 1;
        }
    }
}

/* The envelope as rows: one for a single sample, else two, each column's
 * extremes in the order they came, at the first and the last time. */
static void envelope_flush(br_csv_series *s)
{
    if (s->nenv == 1) {
        put_row(s, &s->lo);
    } else if (s->nenv > 1) {
        br_csv_row a, b;
        a.t = s->lo.t;
        b.t = s->hi.t;
        for (int col = 0; col < BR_CSV_BLOCKS * M; col++) {
            int lo_first = s->lo_first[col];
            a.x[col] = lo_first ? s->lo.x[col] : s->hi.x[col];
            b.x[col] = lo_first ? s->hi.x[col] : s->lo.x[col];
        }
        put_row(s, &a);
        put_row(s, &b);
    }
    s->nenv = 0;
}

static void take(br_csv_series *s, const br_csv_row *r)
{
    if (s->force) { /* kept as it is, and a new bucket starts after it */
        envelope_flush(s);
        put_row(s, r);
        s->force = 0;
        s->held = 0;
        return;
    }
    double start = s->nenv > 0 ? s->lo.t : s->last.t; /* the bucket's first sample */
    if (s->held && r->t - start >= s->min_dt) {
        envelope_add(s, &s->last); /* the bucket is full: out with it */
        envelope_flush(s);
        s->held = 0;
    }
    if (s->held)
        envelope_add(s, &s->last);
    s->last = *r;
    s->held = 1;
}

static void on_sample(void *ctx, const br_sim *sim, double t, const double *vrail,
                      const double *ilink, int n)
{
    br_csv_series *s = ctx;
    br_csv_row r;
    double *i = r.x + BR_CSV_I * M;
    (void)n; /* the chain's n, fixed at init */
    r.t = t;
    for (int col = 0; col < BR_CSV_BLOCKS * M; col++)
        r.x[col] = NAN;
    memcpy(r.x + BR_CSV_V * M, vrail, sizeof(double) * (size_t)s->n);
    br_sim_sample_stress(sim, t, vrail, s->n, r.x + BR_CSV_D * M, r.x + BR_CSV_R * M);
    br_sim_sample_links(sim, ilink, s->n, i, r.x + BR_CSV_J * M);
    i[0] = sim ? ilink[0] : NAN; /* no simulator, no supply current */
    if (s->min_dt <= 0.0) {
        put_row(s, &r);
        return;
    }
    take(s, &r);
}

/* A transition: the bucket so far, the sample just before it as it is,
 * and the first one after it as it is. */
static void on_uvlo(void *ctx, const br_uvlo_event *e)
{
    br_csv_series *s = ctx;
    (void)e;
    envelope_flush(s);
    if (s->held)
        put_row(s, &s->last);
    s->held = 0;
    s->force = 1;
}

br_sim_observer br_csv_observer(br_csv_series *s)
{
    br_sim_observer o = {s, on_uvlo, on_sample};
    return o;
}

int br_csv_series_end(br_csv_series *s)
{
    if (s->held)
        envelope_add(s, &s->last);
    envelope_flush(s);
    s->held = 0;
    return s->failed ? BR_ENOMEM : BR_OK;
}

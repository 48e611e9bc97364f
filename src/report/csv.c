/* csv.c - decimated simulator samples as CSV rows. */
#include "report/csv.h"

#include <math.h>

#include <string.h>

int br_csv_header(const br_chain *c, br_text *out)
{
    int rc = br_text_put(out, "series,t_s");
    for (int k = 0; k < c->n; k++)
        rc |= br_text_printf(out, ",rail_%s_V", c->st[k].name);
    for (int k = 1; k < c->n; k++)
        rc |= br_text_printf(out, ",link_%s_A", c->st[k].name);
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

/* 7 significant digits: 10 uV on a 15 V rail, finer than any figure the
 * reports quote; time gets more so that the rows of one period differ. */
static void put_row(br_csv_series *s, double t, const double *v, const double *i)
{
    if (s->row)
        s->row(s->row_ctx, t, v, i);
    s->last_t = t;
    s->rows++;
    s->held = 0;
    if (!s->out)
        return;
    int rc = br_text_printf(s->out, "%s,%.10g", s->label, t + s->t_offset);
    for (int k = 0; k < s->n; k++) /* a value that is not finite: an empty field */
        rc |= isfinite(v[k]) ? br_text_printf(s->out, ",%.7g", v[k]) : br_text_put(s->out, ",");
    for (int k = 1; k < s->n; k++)
        rc |= isfinite(i[k]) ? br_text_printf(s->out, ",%.7g", i[k] == 0.0 ? 0.0 : i[k])
                             : br_text_put(s->out, ",");
    rc |= br_text_put(s->out, "\n");
    s->failed |= rc != 0;
}

static void hold(br_csv_series *s, double t, const double *v, const double *i)
{
    s->held = 1;
    s->ht = t;
    memcpy(s->hv, v, sizeof(double) * (size_t)s->n);
    memcpy(s->hi, i, sizeof(double) * (size_t)s->n);
}

static void on_sample(void *ctx, double t, const double *vrail, const double *ilink, int n)
{
    br_csv_series *s = ctx;
    (void)n; /* the chain's n, fixed at init */
    if (s->force || t - s->last_t >= s->min_dt) {
        put_row(s, t, vrail, ilink);
        s->force = 0;
    } else {
        hold(s, t, vrail, ilink);
    }
}

/* A transition: keep the state just before it and the first one after. */
static void on_uvlo(void *ctx, const br_uvlo_event *e)
{
    br_csv_series *s = ctx;
    (void)e;
    if (s->held)
        put_row(s, s->ht, s->hv, s->hi);
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
        put_row(s, s->ht, s->hv, s->hi);
    return s->failed ? BR_ENOMEM : BR_OK;
}

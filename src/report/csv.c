/* csv.c - decimated simulator samples as CSV rows. */
#include "report/csv.h"

#include <math.h>

#include <string.h>

int br_csv_header(const br_chain *c, br_text *out)
{
    int rc = br_text_put(out, "series,t_s");
    for (int k = 0; k < c->n; k++)
        rc |= br_text_printf(out, ",rail_%s_V", c->st[k].name);
    rc |= br_text_put(out, ",supply_A");
    for (int k = 1; k < c->n; k++)
        rc |= br_text_printf(out, ",link_%s_A", c->st[k].name);
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

/* One column block: n values from `from`, a value that is not finite as
 * an empty field. */
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
static void put_row(br_csv_series *s, double t, const double *v, const double *i, const double *vd,
                    const double *vr)
{
    if (s->row)
        s->row(s->row_ctx, t, v, i, vd, vr);
    s->last_t = t;
    s->rows++;
    s->held = 0;
    if (!s->out)
        return;
    int rc = br_text_printf(s->out, "%s,%.10g", s->label, t + s->t_offset);
    rc |= put_values(s->out, v, 0, s->n);
    rc |= put_values(s->out, i, 0, s->n); /* [0]: the supply (link 0 does not exist) */
    rc |= put_values(s->out, vd, 0, s->n);
    rc |= put_values(s->out, vr, 1, s->n);
    rc |= br_text_put(s->out, "\n");
    s->failed |= rc != 0;
}

static void hold(br_csv_series *s, double t, const double *v, const double *i, const double *vd,
                 const double *vr)
{
    size_t bytes = sizeof(double) * (size_t)s->n;
    s->held = 1;
    s->ht = t;
    memcpy(s->hv, v, bytes);
    memcpy(s->hi, i, bytes);
    memcpy(s->hd, vd, bytes);
    memcpy(s->hr, vr, bytes);
}

static void on_sample(void *ctx, const br_sim *sim, double t, const double *vrail,
                      const double *ilink, int n)
{
    br_csv_series *s = ctx;
    double vd[BR_MAX_SWITCHES], vr[BR_MAX_SWITCHES], il[BR_MAX_SWITCHES];
    (void)n; /* the chain's n, fixed at init */
    br_sim_sample_stress(sim, t, vrail, s->n, vd, vr);
    memcpy(il, ilink, sizeof(double) * (size_t)s->n);
    if (!sim)
        il[0] = NAN; /* no simulator, no supply current */
    if (s->force || t - s->last_t >= s->min_dt) {
        put_row(s, t, vrail, il, vd, vr);
        s->force = 0;
    } else {
        hold(s, t, vrail, il, vd, vr);
    }
}

/* A transition: keep the state just before it and the first one after. */
static void on_uvlo(void *ctx, const br_uvlo_event *e)
{
    br_csv_series *s = ctx;
    (void)e;
    if (s->held)
        put_row(s, s->ht, s->hv, s->hi, s->hd, s->hr);
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
        put_row(s, s->ht, s->hv, s->hi, s->hd, s->hr);
    return s->failed ? BR_ENOMEM : BR_OK;
}

/* startup_report.c - rendering a cold start. */
#include "report/startup_report.h"

#include "analyses/figures.h"
#include "report/fmt.h"
#include "report/report_common.h"
#include "report/supply_report.h"
#include "report/table.h"

#include <math.h>
#include <stdio.h>

#define SHOWN_DROPOUTS 4 /* dropout times listed per stage in the text */

enum { C_STAGE, C_SWITCH, C_FIRST, C_FINAL, C_DROPS, C_INRUSH, C_LIMIT, C_BY, C_VEND, NCOL };

static double latest_start(const br_startup *su)
{
    double t = 0.0;
    for (int k = 0; k < su->n; k++)
        t = fmax(t, fmax(su->st[k].first_enable, su->st[k].final_enable));
    return t;
}

/* The binding inrush check of link k, or NULL when its diode gives no
 * rating to judge it by. */
static const br_inrush_check *binding(const br_chain *c, const br_startup *su, int k,
                                      br_inrush_check ck[BR_RATING_COUNT])
{
    int b;
    return k > 0 && br_inrush_link(c, su, k, ck, &b) > 0 ? &ck[b] : NULL;
}

static double largest_current(const br_chain *c, const br_startup *su)
{
    double i = 0.0;
    for (int k = 1; k < su->n; k++) {
        br_inrush_check ck[BR_RATING_COUNT];
        const br_inrush_check *b = binding(c, su, k, ck);
        i = fmax(i, fmax(su->st[k].ipeak, b && isfinite(b->limit) ? b->limit : 0.0));
    }
    return i;
}

static void heads(br_table *t, const br_scale *ts, const br_scale *is)
{
    char h[BR_TABLE_CELL];
    br_table_head(t, C_STAGE, "stage", BR_RIGHT);
    br_table_head(t, C_SWITCH, "switch", BR_LEFT);
    snprintf(h, sizeof h, "first start %s", ts->unit);
    br_table_head(t, C_FIRST, h, BR_RIGHT);
    snprintf(h, sizeof h, "final start %s", ts->unit);
    br_table_head(t, C_FINAL, h, BR_RIGHT);
    br_table_head(t, C_DROPS, "dropouts", BR_RIGHT);
    snprintf(h, sizeof h, "inrush %s", is->unit);
    br_table_head(t, C_INRUSH, h, BR_RIGHT);
    snprintf(h, sizeof h, "limit %s", is->unit);
    br_table_head(t, C_LIMIT, h, BR_RIGHT);
    br_table_head(t, C_BY, "by", BR_LEFT);
    br_table_head(t, C_VEND, "rail at end V", BR_RIGHT);
}

static void time_cell(br_table *t, int col, double v, const br_scale *sc)
{
    char b[BR_TABLE_CELL];
    br_table_set(t, col, "%s", v < 0 ? "never" : br_fmt_in(b, sizeof b, v, sc, 3));
}

static void stage_row(br_table *t, const br_chain *c, const br_startup *su, int k,
                      const br_scale *ts, const br_scale *is)
{
    const br_startup_stage *s = &su->st[k];
    char b[BR_TABLE_CELL];
    br_table_row(t);
    br_table_set(t, C_STAGE, "%d", k);
    br_table_set(t, C_SWITCH, "%s", c->st[k].name);
    time_cell(t, C_FIRST, s->first_enable, ts);
    time_cell(t, C_FINAL, s->final_enable, ts);
    br_table_set(t, C_DROPS, "%d", s->ndropouts);
    br_table_set(t, C_INRUSH, "%s", k > 0 ? br_fmt_in(b, sizeof b, s->ipeak, is, 3) : "-");
    br_inrush_check ck[BR_RATING_COUNT];
    const br_inrush_check *bind = binding(c, su, k, ck);
    br_table_set(t, C_LIMIT, "%s", bind ? br_fmt_in(b, sizeof b, bind->limit, is, 3) : "-");
    br_table_set(t, C_BY, "%s", bind ? br_rating_name(bind->rating) : "-");
    if (isfinite(s->vend))
        br_table_set(t, C_VEND, "%.3f", s->vend);
    else
        br_table_set(t, C_VEND, "n/a");
}

static int render_table(const br_chain *c, const br_startup *su, br_text *out)
{
    br_table *t = br_table_create(NCOL, su->n);
    if (!t)
        return BR_ENOMEM;
    br_scale ts = br_scale_column(latest_start(su), 1e-6, "s");
    br_scale is = br_scale_column(largest_current(c, su), 1e-3, "A");
    heads(t, &ts, &is);
    for (int k = 0; k < su->n; k++)
        stage_row(t, c, su, k, &ts, &is);
    int rc = br_table_render(t, 2, out);
    br_table_free(t);
    return rc;
}

static int render_dropouts(const br_chain *c, const br_startup *su, br_text *out)
{
    int rc = BR_OK;
    char b[32];
    for (int k = 0; k < su->n; k++) {
        const br_startup_stage *s = &su->st[k];
        if (s->ndropouts == 0)
            continue;
        rc |= br_text_printf(out, "  dropouts of %s (stage %d):", c->st[k].name, k);
        int shown = s->ndropouts < SHOWN_DROPOUTS ? s->ndropouts : SHOWN_DROPOUTS;
        for (int i = 0; i < shown; i++)
            rc |= br_text_printf(out, "%s %s", i ? "," : "",
                                 br_fmt_time(b, sizeof b, s->dropout_t[i]));
        if (s->ndropouts > shown)
            rc |= br_text_printf(out, " and %d more", s->ndropouts - shown);
        rc |= br_text_put(out, "\n");
    }
    return rc;
}

/* One line per rating a link's inrush breaks. */
static int render_inrush(const br_chain *c, const br_startup *su, br_text *out)
{
    int rc = BR_OK;
    char a[32], b[32];
    for (int k = 1; k < su->n; k++) {
        br_inrush_check ck[BR_RATING_COUNT];
        int n = br_inrush_link(c, su, k, ck, NULL);
        const br_diode *d = &c->st[k].diode;
        for (int i = 0; i < n; i++) {
            if (!(ck[i].margin < 0))
                continue;
            rc |= br_text_printf(out, "  inrush: link %d (into %s) ", k, c->st[k].name);
            if (ck[i].rating == BR_RATING_I2T)
                rc |= br_text_printf(out,
                                     "passes an i^2 integral of %.4g A2s over the start-up, above "
                                     "diode %s's I2t rating %.4g A2s\n",
                                     su->st[k].i2t, d->id, d->i2t);
            else
                rc |= br_text_printf(out, "peaks at %s, above diode %s's %s %s\n",
                                     br_fmt_si(a, sizeof a, ck[i].figure, 4, "A"), d->id,
                                     br_rating_name(ck[i].rating),
                                     br_fmt_si(b, sizeof b, ck[i].limit, 4, "A"));
        }
    }
    return rc;
}

/* ---- why a rail does not start --------------------------------------- */

static int stall_regulator(const br_chain *c, int k, br_text *out)
{
    const br_stage *st = &c->st[k];
    return br_text_printf(out,
                          "rail %d (%s) never starts: its regulator %s puts out %.4g V, below "
                          "driver %s's UVLO rising %.4g V",
                          k, st->name, st->aux.id, st->aux.vout, st->drv.id, st->drv.uvlo_rise);
}

/* A rail above its start voltage whose driver still is not running: it
 * starts, its start loads the rail below UVLO falling, it stops. */
static int stall_hiccup(const br_chain *c, const br_startup *su, int k, br_text *out)
{
    const br_stage *st = &c->st[k];
    return br_text_printf(out,
                          "rail %d (%s) never starts for good: it averages %.3f V, above the "
                          "%.3f V its driver needs to start, but the driver dropped out %d "
                          "times: each start loads the rail below UVLO falling %.4g V (its gate "
                          "charge and the rails above it charging)",
                          k, st->name, su->st[k].vend, br_rail_start_voltage(c, k),
                          su->st[k].ndropouts, st->drv.uvlo_fall);
}

static int stall_short(const br_chain *c, const br_startup *su, int k, br_text *out)
{
    const br_stage *st = &c->st[k];
    double vend = su->st[k].vend, vneed = br_rail_start_voltage(c, k);
    int rc = br_text_printf(out, "rail %d (%s) never starts: it settles at %.3f V, %.3f V below ",
                            k, st->name, vend, vneed - vend);
    if (st->aux.kind == BR_AUX_LDO)
        rc |= br_text_printf(out,
                             "the %.3f V it needs (UVLO rising %.4g V plus regulator %s's "
                             "%.4g V dropout)",
                             vneed, st->drv.uvlo_rise, st->aux.id, st->aux.dropout);
    else
        rc |= br_text_printf(out, "UVLO rising %.4g V", vneed);
    if (k == 0)
        return rc | br_text_put(out, "; it is the supply rail, fed through the source resistance");
    char i[32];
    return rc | br_text_printf(out, "; link %d passes %s with a drop of %.3f V from rail %d (%s)",
                               k, br_fmt_si(i, sizeof i, su->st[k].iend, 4, "A"),
                               su->st[k - 1].vend - vend, k - 1, c->st[k - 1].name);
}

int br_startup_stall_text(const br_chain *c, const br_startup *su, br_text *out)
{
    int k = su->first_stalled;
    if (su->complete || su->failed || k < 0 || k >= su->n)
        return BR_OK;
    double vneed = br_rail_start_voltage(c, k);
    if (!isfinite(vneed))
        return stall_regulator(c, k, out);
    if (su->st[k].vend >= vneed)
        return stall_hiccup(c, su, k, out);
    return stall_short(c, su, k, out);
}

static int render_summary(const br_chain *c, const br_startup *su, br_text *out)
{
    char a[32];
    if (su->failed)
        return br_report_wrap(out, "start-up UNDETERMINED: ", su->why, 2);
    if (su->complete) {
        int last = 0;
        for (int k = 0; k < su->n; k++)
            if (su->st[k].final_enable >= su->st[last].final_enable)
                last = k;
        return br_text_printf(out, "start-up complete after %s (the last to start for good: %s)\n",
                              br_fmt_time(a, sizeof a, su->t_total), c->st[last].name);
    }
    br_text *why = br_text_create();
    if (!why)
        return BR_ENOMEM;
    char lead[96];
    snprintf(lead, sizeof lead,
             "start-up INCOMPLETE after %s simulated: ", br_fmt_time(a, sizeof a, su->t_simulated));
    int rc = br_startup_stall_text(c, su, why);
    rc |= br_report_wrap(out, lead, br_text_data(why), 2);
    br_text_free(why);
    rc |= br_text_put(out, "  drivers not running at the end:");
    for (int k = 0; k < su->n; k++)
        if (!su->st[k].running)
            rc |= br_text_printf(out, " %s", c->st[k].name);
    return rc | br_text_put(out, "\n");
}

/* How the start-up was simulated: the periods integrated and those
 * stepped over along the rails' envelope. */
static int render_method(const br_startup *su, br_text *out)
{
    if (su->method == BR_SU_PERIODS)
        return br_text_printf(out,
                              "  %ld periods, every one integrated (--startup-method periods)\n",
                              su->periods_integrated);
    return br_text_printf(out,
                          "  %ld periods: %ld integrated, %ld stepped over along the rails' "
                          "envelope\n",
                          su->periods_integrated + su->periods_stepped, su->periods_integrated,
                          su->periods_stepped);
}

int br_startup_text(const br_chain *c, const br_startup *su, int detail, br_text *out)
{
    char a[32], b[32];
    int rc = br_text_put(out, "start-up from cold (");
    if (su->pwm_start > 0)
        rc |= br_text_printf(out, "pre-charge steps until %s, then PWM; ",
                             br_fmt_time(a, sizeof a, su->pwm_start));
    rc |= br_text_printf(out, "%s simulated)\n", br_fmt_time(b, sizeof b, su->t_simulated));
    rc |= render_method(su, out);
    rc |= render_table(c, su, out);
    if (detail)
        rc |= render_dropouts(c, su, out);
    rc |= render_inrush(c, su, out);
    rc |= render_summary(c, su, out);
    if (!su->failed)
        rc |= br_supply_profile_text(c, su, out);
    return rc ? BR_ENOMEM : BR_OK;
}

/* ---- XML -------------------------------------------------------------- */

static void stage_xml(br_xmlw *w, const br_chain *c, const br_startup *su, int k)
{
    const br_startup_stage *s = &su->st[k];
    br_xmlw_start(w, "stage");
    br_xmlw_int(w, "index", k);
    br_xmlw_attr(w, "switch", c->st[k].name);
    br_xmlw_bool(w, "running", s->running);
    if (s->first_enable >= 0)
        br_xmlw_num(w, "first-start-s", s->first_enable);
    if (s->final_enable >= 0)
        br_xmlw_num(w, "final-start-s", s->final_enable);
    br_xmlw_int(w, "dropouts", s->ndropouts);
    br_xmlw_num(w, "end-V", s->vend);
    br_xmlw_num(w, "start-V", br_rail_start_voltage(c, k));
    if (k > 0) {
        br_xmlw_num(w, "link-end-A", s->iend);
        const br_diode *d = &c->st[k].diode;
        br_xmlw_num(w, "inrush-peak-A", s->ipeak);
        br_xmlw_num(w, "inrush-i2t-A2s", s->i2t);
        if (d->ifrm > 0)
            br_xmlw_num(w, "ifrm-A", d->ifrm);
        if (d->ifsm > 0)
            br_xmlw_num(w, "surge-rating-A", d->ifsm);
        if (d->i2t > 0)
            br_xmlw_num(w, "i2t-rating-A2s", d->i2t);
    }
    int shown = s->ndropouts < BR_MAX_DROPOUT_TIMES ? s->ndropouts : BR_MAX_DROPOUT_TIMES;
    for (int i = 0; i < shown; i++) {
        br_xmlw_start(w, "dropout");
        br_xmlw_num(w, "t-s", s->dropout_t[i]);
        br_xmlw_end(w);
    }
    br_xmlw_end(w);
}

static void stall_xml(br_xmlw *w, const br_chain *c, const br_startup *su)
{
    int k = su->first_stalled;
    if (su->complete || su->failed || k < 0 || k >= su->n)
        return;
    br_text *t = br_text_create();
    if (!t || br_startup_stall_text(c, su, t) != BR_OK) {
        br_xmlw_fail(w);
        br_text_free(t);
        return;
    }
    br_xmlw_start(w, "stall");
    br_xmlw_int(w, "stage", k);
    br_xmlw_attr(w, "switch", c->st[k].name);
    br_xmlw_num(w, "rail-V", su->st[k].vend);
    br_xmlw_num(w, "start-V", br_rail_start_voltage(c, k));
    if (k > 0) {
        br_xmlw_num(w, "link-A", su->st[k].iend);
        br_xmlw_num(w, "link-drop-V", su->st[k - 1].vend - su->st[k].vend);
    }
    br_xmlw_text(w, br_text_data(t));
    br_xmlw_end(w);
    br_text_free(t);
}

void br_startup_xml(br_xmlw *w, const br_chain *c, const br_startup *su)
{
    br_xmlw_start(w, "startup");
    br_xmlw_bool(w, "complete", su->complete);
    if (su->failed) {
        br_xmlw_bool(w, "undetermined", 1);
        br_xmlw_attr(w, "why", su->why);
    }
    if (su->complete)
        br_xmlw_num(w, "total-s", su->t_total);
    br_xmlw_num(w, "simulated-s", su->t_simulated);
    br_xmlw_num(w, "pwm-start-s", su->pwm_start);
    br_xmlw_attr(w, "method", su->method == BR_SU_PERIODS ? "periods" : "envelope");
    br_xmlw_int(w, "periods-integrated", su->periods_integrated);
    br_xmlw_int(w, "periods-stepped", su->periods_stepped);
    if (su->first_stalled >= 0)
        br_xmlw_int(w, "first-stalled", su->first_stalled);
    for (int k = 0; k < su->n; k++)
        stage_xml(w, c, su, k);
    stall_xml(w, c, su);
    if (!su->failed)
        br_supply_profile_xml(w, c, su);
    br_xmlw_end(w);
}

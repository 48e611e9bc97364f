/* window_report.c - the hold window as text and XML. */
#include "report/window_report.h"

#include "analyses/map.h"
#include "core/error.h"
#include "report/caution.h"
#include "report/fmt.h"
#include "report/line_report.h"
#include "report/report_common.h"
#include "report/table.h"
#include "report/vocab.h"

#include <math.h>
#include <stdio.h>

/* ---- words --------------------------------------------------------------- */

const char *br_hold_crit_name(const br_hold_point *pt)
{
    switch (pt->crit) {
    case BR_MAP_NO_ONTIME:
        return "no-on-time";
    case BR_CRIT_STEADY:
        return "steady-state";
    default:
        return br_crit_name(pt->crit);
    }
}

/* The limit a scan's criterion holds the driver supplies to. */
static const char *crit_words(int crit)
{
    switch (crit) {
    case BR_CRIT_UVLO:
        return br_limit_name(BR_LIM_UVLO_FALL);
    case BR_CRIT_DRIVE:
        return br_limit_name(BR_LIM_DRIVE);
    case BR_CRIT_GATE:
        return br_limit_name(BR_LIM_GATE);
    default:
        return "?";
    }
}

const char *br_hold_words(const br_chain *c, const br_hold_point *pt, char *buf, size_t cap)
{
    if (pt->crit == BR_MAP_NO_ONTIME)
        snprintf(buf, cap, "the dead time leaves no on-time");
    else if (pt->crit == BR_CRIT_STEADY || pt->stage < 0 || pt->stage >= c->n)
        snprintf(buf, cap, "no periodic steady state found");
    else if (pt->dir == BR_DIRI_LINE && isfinite(pt->theta))
        snprintf(buf, cap, "%s, rail %s at line phase %.0f deg", crit_words(pt->crit),
                 c->st[pt->stage].name, br_line_deg(pt->theta));
    else
        snprintf(buf, cap, "%s, rail %s, %s", crit_words(pt->crit), c->st[pt->stage].name,
                 br_dir_label(pt->dir));
    return buf;
}

/* A value of the axis: "12.34 %" for duty, "2.011 MHz" for frequency,
 * "31.25 A" for a peak current. */
static const char *axis_value(int axis, double v, char *buf, size_t cap)
{
    if (axis == BR_AXIS_DUTY)
        snprintf(buf, cap, "%.2f %%", 100.0 * v);
    else
        br_fmt_si(buf, cap, v, 4, axis == BR_AXIS_IPK ? "A" : "Hz");
    return buf;
}

static const char *axis_name(int axis)
{
    static const char *const names[] = {"duty", "frequency", "peak current", "line frequency"};
    return axis >= 0 && axis <= BR_AXIS_FLINE ? names[axis] : "?";
}

/* The axis as an XML word. */
static const char *axis_word(int axis)
{
    static const char *const words[] = {"duty", "frequency", "peak-current", "line-frequency"};
    return axis >= 0 && axis <= BR_AXIS_FLINE ? words[axis] : "?";
}

/* ---- text: one axis ------------------------------------------------------- */

static int span_words(const br_sweep *s, const br_span *sp, br_text *out)
{
    char a[32], b[32];
    if (sp->lo.kind == BR_LIMIT_RANGE_END && sp->hi.kind == BR_LIMIT_RANGE_END)
        return br_text_put(out, "holds across the whole range searched");
    return br_text_printf(out, "holds from %s%s to %s%s",
                          axis_value(s->axis, sp->lo.value, a, sizeof a),
                          sp->lo.kind == BR_LIMIT_RANGE_END ? " (end of the range)" : "",
                          axis_value(s->axis, sp->hi.value, b, sizeof b),
                          sp->hi.kind == BR_LIMIT_RANGE_END ? " (end of the range)" : "");
}

/* "duty at 120 kHz: holds from 1.54 % to 95.56 %",
 * "frequency at duty 50.00 %: ..." */
static int sweep_heading(const br_sweep *s, br_text *out)
{
    char v[32];
    int rc;
    if (s->axis == BR_AXIS_DUTY)
        rc = br_text_printf(out, "duty at %s: ", br_fmt_si(v, sizeof v, s->fixed, 4, "Hz"));
    else if (s->axis == BR_AXIS_FSW)
        rc = br_text_printf(
            out, "frequency at duty %s: ", axis_value(BR_AXIS_DUTY, s->fixed, v, sizeof v));
    else if (s->axis == BR_AXIS_IPK)
        rc = br_text_printf(
            out, "peak current at %s line frequency: ", br_fmt_si(v, sizeof v, s->fixed, 4, "Hz"));
    else
        rc = br_text_printf(
            out, "line frequency at %s peak current: ", br_fmt_si(v, sizeof v, s->fixed, 4, "A"));
    if (s->nspans == 0)
        rc |= br_text_put(out, "NEVER holds in the range searched");
    else if (s->home < 0)
        rc |= br_text_put(out, "FAILS at the design point");
    else
        rc |= span_words(s, &s->span[s->home], out);
    return rc | br_text_put(out, "\n");
}

static int sweep_range(const br_sweep *s, br_text *out)
{
    char a[32], b[32], r[48];
    if (s->axis == BR_AXIS_DUTY)
        snprintf(r, sizeof r, "0.1 %% of duty");
    else if (s->axis == BR_AXIS_IPK)
        br_fmt_si(r, sizeof r, s->resolution, 3, "A");
    else
        snprintf(r, sizeof r, "%.3g %% of frequency", 100.0 * s->resolution);
    return br_text_printf(out, "  searched %s to %s, resolution %s\n",
                          axis_value(s->axis, s->lo, a, sizeof a),
                          axis_value(s->axis, s->hi, b, sizeof b), r);
}

enum { L_NAME, L_IN, L_OUT, L_MARGIN, L_WHAT, LCOLS };

static void limit_row(br_table *t, const br_chain *c, const br_sweep *s, const char *name,
                      const br_limit *l)
{
    char b[BR_TABLE_CELL];
    br_table_row(t);
    br_table_set(t, L_NAME, "%s", name);
    br_table_set(t, L_IN, "%s", axis_value(s->axis, l->value, b, sizeof b));
    if (l->kind == BR_LIMIT_RANGE_END) {
        br_table_set(t, L_OUT, "-");
        br_table_set(t, L_MARGIN, "-");
        br_table_set(t, L_WHAT, "still holds at the end of the range");
        return;
    }
    br_table_set(t, L_OUT, "%s", axis_value(s->axis, l->outside, b, sizeof b));
    if (isnan(l->out.margin))
        br_table_set(t, L_MARGIN, "-");
    else
        br_table_set(t, L_MARGIN, "%s", br_fmt_si(b, sizeof b, l->out.margin, 3, "V"));
    char w[BR_TABLE_CELL];
    br_table_set(t, L_WHAT, "%s", br_hold_words(c, &l->out, w, sizeof w));
}

static int limits_table(const br_chain *c, const br_sweep *s, const br_span *sp, br_text *out)
{
    br_table *t = br_table_create(LCOLS, 2);
    if (!t)
        return BR_ENOMEM;
    br_table_head(t, L_NAME, "limit", BR_LEFT);
    br_table_head(t, L_IN, "holds at", BR_RIGHT);
    br_table_head(t, L_OUT, "fails at", BR_RIGHT);
    br_table_head(t, L_MARGIN, "margin there", BR_RIGHT);
    br_table_head(t, L_WHAT, "what fails there", BR_LEFT);
    limit_row(t, c, s, "minimum", &sp->lo);
    limit_row(t, c, s, "maximum", &sp->hi);
    int rc = br_table_render(t, 2, out);
    br_table_free(t);
    return rc;
}

/* The holding intervals other than the design point's. */
static int other_spans(const br_sweep *s, br_text *out)
{
    int rc = BR_OK;
    for (int i = 0; i < s->nspans; i++) {
        if (i == s->home)
            continue;
        rc |= br_text_put(out, s->home >= 0 ? "  apart from that it " : "  it ");
        rc |= span_words(s, &s->span[i], out);
        rc |= br_text_put(out, "\n");
    }
    if (s->truncated)
        rc |= br_text_printf(out, "  (more intervals than the %d listed)\n", BR_MAX_SPANS);
    return rc;
}

static int sweep_text(const br_chain *c, const br_sweep *s, br_text *out)
{
    if (!s->applies)
        return br_text_printf(out, "%s: not applicable (%s)\n", axis_name(s->axis),
                              s->axis == BR_AXIS_DUTY
                                  ? "an explicit switch string has fixed on-intervals"
                                  : "no range to search");
    int rc = sweep_heading(s, out);
    rc |= sweep_range(s, out);
    if (s->home >= 0)
        rc |= limits_table(c, s, &s->span[s->home], out);
    rc |= other_spans(s, out);
    return rc;
}

/* ---- text: design point, hold-up, start-up -------------------------------- */

static int criteria_text(const br_chain *c, br_text *out)
{
    char md[32], buf[256];
    int dirs[2], nd = br_design_directions(c, dirs);
    if (c->min_drive > 0)
        snprintf(buf, sizeof buf,
                 "above UVLO falling, above the minimum drive %s and below the "
                 "gate maximum",
                 br_fmt_si(md, sizeof md, c->min_drive, 3, "V"));
    else
        snprintf(buf, sizeof buf, "above UVLO falling and below the gate maximum");
    char text[512];
    if (c->line.on)
        snprintf(text, sizeof text,
                 "every driver supply %s over the periodic steady state of the line cycle", buf);
    else
        snprintf(text, sizeof text, "every driver supply %s over the periodic steady state, %s%s%s",
                 buf, br_dir_label(dirs[0]), nd > 1 ? " and " : "",
                 nd > 1 ? br_dir_label(dirs[1]) : "");
    return br_report_wrap(out, "criteria: ", text, 2);
}

static int design_text(const br_chain *c, const br_hold_point *pt, br_text *out)
{
    char m[32], w[128];
    if (isnan(pt->margin))
        return br_text_put(out, "design point: UNDETERMINED, the solver found no periodic steady "
                                "state there\n");
    return br_text_printf(out, "design point: %s, worst margin %s (%s)\n",
                          pt->holds ? "holds" : "FAILS", br_fmt_si(m, sizeof m, pt->margin, 4, "V"),
                          br_hold_words(c, pt, w, sizeof w));
}

enum { H_DIR, H_TIME, H_RAIL, H_V, HCOLS };

/* The switches of mask held on, as "A1 B2", or "none". */
static void held_names(const br_chain *c, br_mask mask, char *buf, size_t size)
{
    size_t len = 0;
    buf[0] = '\0';
    for (int s = 0; s < c->n && len < size; s++)
        if (mask >> s & 1)
            len += (size_t)snprintf(buf + len, size - len, "%s%s", len ? " " : "", c->st[s].name);
    if (!buf[0])
        snprintf(buf, size, "none");
}

static int holdup_text(const br_chain *c, const br_window *w, br_text *out)
{
    char held[512], what[640];
    br_mask mask = w->nholdup > 0 ? w->holdup[0].hold_on : 0;
    held_names(c, mask, held, sizeof held);
    snprintf(what, sizeof what,
             mask ? "switching stops at the quiet instant of the steady state, %s held on "
                    "(the design's hold-on) and every other switch off; time until the first "
                    "driver supply falls below UVLO"
                  : "switching stops at the quiet instant of the steady state, every switch off%s; "
                    "time until the first driver supply falls below UVLO",
             mask ? held : "");
    int rc = br_report_wrap(out, "hold-up: ", what, 2);
    br_table *t = br_table_create(HCOLS, w->nholdup);
    if (!t)
        return BR_ENOMEM;
    br_table_head(t, H_DIR, "direction", BR_LEFT);
    br_table_head(t, H_TIME, "hold-up", BR_RIGHT);
    br_table_head(t, H_RAIL, "first to drop", BR_LEFT);
    br_table_head(t, H_V, "its supply then", BR_RIGHT);
    for (int i = 0; i < w->nholdup; i++) {
        const br_holdup *h = &w->holdup[i];
        char b[BR_TABLE_CELL];
        br_table_row(t);
        br_table_set(t, H_DIR, "%s", br_dir_label(h->dir));
        if (h->dropped) {
            br_table_set(t, H_TIME, "%s", br_fmt_time(b, sizeof b, h->t));
            br_table_set(t, H_RAIL, "rail %s", c->st[h->stage].name);
            br_table_set(t, H_V, "%s", br_fmt_si(b, sizeof b, h->v_at, 4, "V"));
        } else {
            br_table_set(t, H_TIME, "> %s", br_fmt_time(b, sizeof b, h->t_max));
            br_table_set(t, H_RAIL, "none");
            br_table_set(t, H_V, "-");
        }
    }
    rc |= br_table_render(t, 2, out);
    br_table_free(t);
    return rc;
}

static int su_points(const br_su_window *s, br_text *out)
{
    br_table *t = br_table_create(2, s->npts);
    if (!t)
        return BR_ENOMEM;
    br_table_head(t, 0, axis_name(s->axis), BR_RIGHT);
    br_table_head(t, 1, "start-up", BR_RIGHT);
    for (int i = s->npts - 1; i >= 0; i--) {
        char b[BR_TABLE_CELL];
        br_table_row(t);
        br_table_set(t, 0, "%s", axis_value(s->axis, s->pt[i].value, b, sizeof b));
        if (s->pt[i].complete)
            br_table_set(t, 1, "%s", br_fmt_time(b, sizeof b, s->pt[i].t_total));
        else
            br_table_set(t, 1, "does not complete");
    }
    int rc = br_table_render(t, 4, out);
    br_table_free(t);
    return rc;
}

/* One end: how far the cold start still completes, and what fails
 * beyond. */
static int su_end_text(const br_chain *c, int axis, const br_su_end *e, const char *what,
                       br_text *out)
{
    char a[32], b[32];
    if (e->kind == BR_LIMIT_RANGE_END)
        return br_text_printf(out, "  %s: %s, the end of the range searched\n", what,
                              axis_value(axis, e->value, a, sizeof a));
    if (e->stalled >= 0 && e->stalled < c->n)
        return br_text_printf(out, "  %s: %s (at %s rail %s never starts for good)\n", what,
                              axis_value(axis, e->value, a, sizeof a),
                              axis_value(axis, e->failing, b, sizeof b), c->st[e->stalled].name);
    return br_text_printf(out, "  %s: %s (at %s it takes too long)\n", what,
                          axis_value(axis, e->value, a, sizeof a),
                          axis_value(axis, e->failing, b, sizeof b));
}

static int su_axis_text(const br_chain *c, const br_su_window *s, br_text *out)
{
    int duty = s->axis == BR_AXIS_DUTY;
    const char *what = duty ? "duty" : "switching frequency";
    if (!s->applies)
        return br_text_printf(out, "  %s: not applicable\n", what);
    if (!s->design_starts)
        return br_text_printf(out, "  %s: the cold start does NOT complete at the design point\n",
                              what);
    int rc =
        su_end_text(c, s->axis, &s->low, duty ? "lowest duty" : "lowest switching frequency", out);
    rc |= su_end_text(c, s->axis, &s->high, duty ? "highest duty" : "highest switching frequency",
                      out);
    return rc | su_points(s, out);
}

static int startup_text(const br_chain *c, const br_window *w, br_text *out)
{
    char t[32];
    if (!w->startup)
        return br_text_put(out, "start-up window: not computed (--startup adds it; every point "
                                "is a cold start)\n");
    int rc = br_text_printf(out,
                            "start-up window: the cold start completes within %s, searched "
                            "both ways from the design point\n",
                            br_fmt_time(t, sizeof t, c->startup_max));
    rc |= su_axis_text(c, &w->su_duty, out);
    return rc | su_axis_text(c, &w->su_fsw, out);
}

int br_window_text(const br_chain *c, const br_window *w, br_text *out, br_error *err)
{
    int rc = br_report_heading(c, "hold window", out);
    rc |= criteria_text(c, out);
    rc |= design_text(c, &w->design, out);
    rc |= br_text_put(out, "\n");
    rc |= sweep_text(c, w->line ? &w->ipk : &w->duty, out);
    rc |= br_text_put(out, "\n");
    rc |= sweep_text(c, w->line ? &w->fline : &w->fsw, out);
    rc |= br_text_put(out, "\n");
    rc |= holdup_text(c, w, out);
    rc |= br_text_put(out, "\n");
    rc |= startup_text(c, w, out);
    rc |= br_report_caution(out);
    return rc ? br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory rendering the report")
              : BR_OK;
}

/* ---- XML -------------------------------------------------------------------- */

static void point_attrs(br_xmlw *x, const br_chain *c, const br_hold_point *pt)
{
    br_xmlw_bool(x, "holds", pt->holds);
    br_xmlw_num(x, "margin-V", pt->margin);
    br_xmlw_attr(x, "criterion", br_hold_crit_name(pt));
    if (pt->stage >= 0 && pt->stage < c->n) {
        br_xmlw_int(x, "stage", pt->stage);
        br_xmlw_attr(x, "switch", c->st[pt->stage].name);
        br_xmlw_attr(x, "direction", br_dir_label(pt->dir));
        if (pt->dir == BR_DIRI_LINE && isfinite(pt->theta))
            br_xmlw_num(x, "line-phase-deg", br_line_deg(pt->theta));
    }
}

/* duty values are fractions, frequencies Hz, currents A: the attribute
 * says which */
static void axis_num(br_xmlw *x, int axis, const char *name, double v)
{
    static const char *const unit[] = {"", "-Hz", "-A", "-Hz"};
    char key[48];
    snprintf(key, sizeof key, "%s%s", name, axis >= 0 && axis <= BR_AXIS_FLINE ? unit[axis] : "");
    br_xmlw_num(x, key, v);
}

static void limit_xml(br_xmlw *x, const br_chain *c, const br_sweep *s, const char *end,
                      const br_limit *l)
{
    br_xmlw_start(x, "limit");
    br_xmlw_attr(x, "end", end);
    br_xmlw_attr(x, "kind", l->kind == BR_LIMIT_FOUND ? "found" : "range-end");
    axis_num(x, s->axis, "holds-at", l->value);
    if (l->kind == BR_LIMIT_FOUND) {
        axis_num(x, s->axis, "fails-at", l->outside);
        br_xmlw_start(x, "fails");
        point_attrs(x, c, &l->out);
        br_xmlw_end(x);
    }
    br_xmlw_end(x);
}

static void sweep_xml(br_xmlw *x, const br_chain *c, const br_sweep *s)
{
    static const char *const fixed[] = {"at-fsw-Hz", "at-duty", "at-line-frequency-Hz",
                                        "at-peak-current-A"};
    static const char *const res[] = {"resolution", "resolution-relative", "resolution-A",
                                      "resolution-relative"};
    br_xmlw_start(x, "sweep");
    br_xmlw_attr(x, "axis", axis_word(s->axis));
    br_xmlw_bool(x, "applies", s->applies);
    if (s->applies) {
        axis_num(x, s->axis, "from", s->lo);
        axis_num(x, s->axis, "to", s->hi);
        axis_num(x, s->axis, "design", s->design);
        br_xmlw_num(x, fixed[s->axis], s->fixed);
        br_xmlw_num(x, res[s->axis], s->resolution);
        br_xmlw_bool(x, "design-holds", s->home >= 0);
        br_xmlw_int(x, "points", s->evals);
    }
    for (int i = 0; i < s->nspans; i++) {
        br_xmlw_start(x, "holds");
        br_xmlw_bool(x, "design-point", i == s->home);
        limit_xml(x, c, s, "min", &s->span[i].lo);
        limit_xml(x, c, s, "max", &s->span[i].hi);
        br_xmlw_end(x);
    }
    br_xmlw_end(x);
}

static void holdup_xml(br_xmlw *x, const br_chain *c, const br_holdup *h)
{
    br_xmlw_start(x, "hold-up");
    char held[512];
    held_names(c, h->hold_on, held, sizeof held);
    br_xmlw_attr(x, "direction", br_dir_label(h->dir));
    br_xmlw_attr(x, "held-on", held);
    br_xmlw_bool(x, "drops", h->dropped);
    if (h->dropped) {
        br_xmlw_num(x, "time-s", h->t);
        br_xmlw_int(x, "stage", h->stage);
        br_xmlw_attr(x, "switch", c->st[h->stage].name);
        br_xmlw_num(x, "supply-V", h->v_at);
    } else {
        br_xmlw_num(x, "simulated-s", h->t_max);
    }
    br_xmlw_end(x);
}

static void su_end_xml(br_xmlw *x, const br_chain *c, int axis, const char *end, const br_su_end *e)
{
    br_xmlw_start(x, "limit");
    br_xmlw_attr(x, "end", end);
    br_xmlw_attr(x, "kind", e->kind == BR_LIMIT_FOUND ? "found" : "range-end");
    axis_num(x, axis, "starts-at", e->value);
    if (e->kind == BR_LIMIT_FOUND)
        axis_num(x, axis, "fails-at", e->failing);
    if (e->stalled >= 0 && e->stalled < c->n)
        br_xmlw_attr(x, "stalled-switch", c->st[e->stalled].name);
    br_xmlw_end(x);
}

static void su_xml(br_xmlw *x, const br_chain *c, const br_su_window *s)
{
    br_xmlw_start(x, "startup-window");
    br_xmlw_attr(x, "axis", axis_word(s->axis));
    br_xmlw_bool(x, "applies", s->applies);
    if (s->applies) {
        axis_num(x, s->axis, "from", s->lo);
        axis_num(x, s->axis, "to", s->hi);
        br_xmlw_bool(x, "design-starts", s->design_starts);
        if (s->design_starts) {
            su_end_xml(x, c, s->axis, "min", &s->low);
            su_end_xml(x, c, s->axis, "max", &s->high);
        }
    }
    for (int i = 0; i < s->npts; i++) {
        br_xmlw_start(x, "run");
        axis_num(x, s->axis, "at", s->pt[i].value);
        br_xmlw_bool(x, "complete", s->pt[i].complete);
        if (s->pt[i].complete)
            br_xmlw_num(x, "time-s", s->pt[i].t_total);
        br_xmlw_end(x);
    }
    br_xmlw_end(x);
}

int br_window_xml(const br_chain *c, const br_window *w, const char *version, br_text *out,
                  br_error *err)
{
    br_xmlw *x;
    int rc = br_xmlw_create(&x, err);
    if (rc != BR_OK)
        return rc;
    const br_design *d = c->design;
    br_xmlw_start(x, "bootrung-window");
    br_xmlw_attr(x, "design", d && d->name[0] ? d->name : "");
    br_xmlw_attr(x, "file", d ? d->path : "");
    br_xmlw_attr(x, "version", version ? version : "");
    br_xml_operating_point(x, c);
    br_xmlw_start(x, "design-point");
    point_attrs(x, c, &w->design);
    br_xmlw_end(x);
    sweep_xml(x, c, w->line ? &w->ipk : &w->duty);
    sweep_xml(x, c, w->line ? &w->fline : &w->fsw);
    for (int i = 0; i < w->nholdup; i++)
        holdup_xml(x, c, &w->holdup[i]);
    if (w->startup) {
        su_xml(x, c, &w->su_duty);
        su_xml(x, c, &w->su_fsw);
    }
    br_xml_caution(x);
    rc = br_xmlw_finish(x, out, err);
    br_xmlw_free(x);
    return rc;
}

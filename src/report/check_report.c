/* check_report.c - rendering `bootrung check`: operating point, the stage
 * table and the design-rule findings. */
#include "report/check_report.h"

#include "analyses/figures.h"
#include "core/error.h"
#include "model/timing.h"
#include "report/caution.h"
#include "report/report_common.h"
#include "report/supply_report.h"
#include "report/table.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#define KELVIN 273.15
#define CELL 64 /* widest cell: a 47-character part id plus margin */
#define NCOL 11

/* A value with an SI prefix chosen so the mantissa lies in [1, 1000). */
static const char *si(char *buf, size_t cap, double v, const char *unit)
{
    static const char *const pre[] = {"f", "p", "n", "u", "m", "", "k", "M", "G"};
    int e = 0;
    if (v != 0 && isfinite(v))
        e = (int)floor(log10(fabs(v)) / 3.0);
    e = e < -5 ? -5 : e > 3 ? 3 : e;
    snprintf(buf, cap, "%.4g %s%s", v / pow(10.0, 3.0 * e), pre[e + 5], unit);
    return buf;
}

/* The supply's highest value over its tolerance, V. */
static double supply_top(const br_chain *c)
{
    return c->design && c->design->vsupply.max > c->vsupply ? c->design->vsupply.max : c->vsupply;
}

static const char *direction_name(int dir)
{
    switch (dir) {
    case BR_DIR_STEP_DOWN:
        return "step-down";
    case BR_DIR_STEP_UP:
        return "step-up";
    case BR_DIR_BOTH:
        return "both directions";
    default:
        return "none (idealised commutation)";
    }
}

static int render_topology(const br_chain *c, br_text *out)
{
    const br_design *d = c->design;
    if (d && d->topology == BR_TOPO_FCML)
        return br_text_printf(
            out, "  topology          flying-capacitor leg, %d levels: %d switches, %d links\n",
            d->levels, c->n, c->n - 1);
    return br_text_printf(out, "  topology          switch string: %d switches, %d links\n", c->n,
                          c->n - 1);
}

/* The supply's current limit, soft-start and rating, when it has them. */
static int supply_limit_line(const br_chain *c, br_text *out)
{
    char a[32], lim[160];
    if (c->limit_mode == BR_SUPPLY_UNLIMITED && !(c->tsoft > 0) && !(c->irating > 0))
        return BR_OK;
    int rc =
        br_text_printf(out, "  supply limit      %s", br_supply_limit_words(c, lim, sizeof lim));
    if (c->tsoft > 0)
        rc |= br_text_printf(out, ", soft-start %s", si(a, sizeof a, c->tsoft, "s"));
    if (c->irating > 0)
        rc |= br_text_printf(out, ", rated %s", si(a, sizeof a, c->irating, "A"));
    return rc | br_text_put(out, "\n");
}

/* "  injection         rail 4 (A4): 15 V (14.25 V to 15.75 V) through
 * 4.7 ohm and diode d1, on from 0 s" */
static int injection_line(const br_chain *c, int k, br_text *out)
{
    char a[32], b[32], r[32], t[32], range[80] = "", text[480], lim[200];
    const br_stage *st = &c->st[k];
    const br_inject_spec *j = c->design ? br_design_injection(c->design, k) : NULL;
    if (j && (j->v.min < st->vinj || j->v.max > st->vinj))
        snprintf(range, sizeof range, " (%s to %s)", si(a, sizeof a, j->v.min, "V"),
                 si(b, sizeof b, j->v.max, "V"));
    br_inject_limit_words(st, lim, sizeof lim);
    snprintf(text, sizeof text, "rail %d (%s): %s%s through %s and diode %s, on from %s%s", k,
             st->name, si(a, sizeof a, st->vinj, "V"), range, si(r, sizeof r, st->r_link, "ohm"),
             st->diode.id, si(t, sizeof t, st->tinj, "s"), lim);
    return br_report_wrap(out, "  injection         ", text, 20);
}

static int render_supply(const br_chain *c, br_text *out)
{
    char a[32], b[32], r[32];
    const br_design *d = c->design;
    int rc = br_text_printf(out, "  supply            %s", si(a, sizeof a, c->vsupply, "V"));
    if (d && (d->vsupply.min < c->vsupply || d->vsupply.max > c->vsupply))
        rc |= br_text_printf(out, " (%s to %s)", si(a, sizeof a, d->vsupply.min, "V"),
                             si(b, sizeof b, d->vsupply.max, "V"));
    rc |= br_text_printf(out, ", source resistance %s", si(r, sizeof r, c->rsupply, "ohm"));
    if (c->tramp > 0)
        rc |= br_text_printf(out, ", ramp %s", si(a, sizeof a, c->tramp, "s"));
    if (c->csupply > 0)
        rc |= br_text_printf(out, ", bypass %s", si(a, sizeof a, c->csupply, "F"));
    rc |= br_text_put(out, "\n");
    rc |= supply_limit_line(c, out);
    for (int k = 1; k < c->n; k++) /* each isolated supply feeding a rail */
        if (c->st[k].inject)
            rc |= injection_line(c, k, out);
    return rc;
}

/* The load current, with its tolerance, and when it starts. */
static int render_load(const br_chain *c, br_text *out)
{
    char a[32], b[32];
    const br_design *d = c->design;
    int rc = br_text_printf(out, "  load current      %s", si(a, sizeof a, c->iload, "A"));
    if (d && (d->iload.min < c->iload || d->iload.max > c->iload))
        rc |= br_text_printf(out, " (%s to %s)", si(a, sizeof a, d->iload.min, "A"),
                             si(b, sizeof b, d->iload.max, "A"));
    if (c->load_from < HUGE_VAL)
        rc |= br_text_printf(out, ", flowing from %s on (start-up under load)\n",
                             si(a, sizeof a, c->load_from, "s"));
    else
        rc |= br_text_put(out, " in steady state; start-up at no load\n");
    rc |= br_text_printf(out, "  switch junction   %.1f degC%s\n", c->tj - KELVIN,
                         d && d->tj_given ? "" : " (the ambient)");
    return rc;
}

/* A line cycle: its frequency and periods, its current and the duty span
 * of its modulation. */
static int render_line(const br_chain *c, br_text *out)
{
    char a[32], b[32], g[32];
    const br_line *l = &c->line;
    const br_design *d = c->design;
    double lo = HUGE_VAL, hi = -HUGE_VAL;
    for (long m = 0; m < l->K; m++) {
        lo = fmin(lo, br_line_duty(l, m));
        hi = fmax(hi, br_line_duty(l, m));
    }
    int rc = br_text_printf(out, "  duty              %.4g to %.4g over the line cycle (", lo, hi);
    rc |= l->ntab > 0 ? br_text_printf(out, "a table of %d points)\n", l->ntab)
                      : br_text_printf(out, "sine modulation, depth %.4g)\n", l->depth);
    rc |= br_text_printf(out, "  dead time         %s\n", si(a, sizeof a, c->deadtime, "s"));
    rc |= br_text_printf(out, "  ambient           %.1f degC\n", c->tamb - KELVIN);
    rc |=
        br_text_printf(out, "  line cycle        %s (%ld switching periods; %s given)\n",
                       si(a, sizeof a, l->freq, "Hz"), l->K, si(g, sizeof g, l->freq_given, "Hz"));
    rc |= br_text_printf(out, "  load current      %s peak", si(a, sizeof a, l->ipk, "A"));
    if (d && (d->ac.ipk.min < l->ipk || d->ac.ipk.max > l->ipk))
        rc |= br_text_printf(out, " (%s to %s)", si(a, sizeof a, d->ac.ipk.min, "A"),
                             si(b, sizeof b, d->ac.ipk.max, "A"));
    rc |= br_text_printf(out, ", %.4g deg behind the modulation; direction alternating\n",
                         l->phase * 180.0 / BR_PI);
    if (c->load_from < HUGE_VAL)
        rc |= br_text_printf(out, "  start-up          under load from %s\n",
                             si(a, sizeof a, c->load_from, "s"));
    else
        rc |= br_text_put(out, "  start-up          at no load\n");
    rc |= br_text_printf(out, "  switch junction   %.1f degC%s\n", c->tj - KELVIN,
                         d && d->tj_given ? "" : " (the ambient)");
    return rc;
}

/* The same over a line cycle: each period's ripple at its own current. */
static int render_line_fly(const br_chain *c, br_text *out)
{
    char a[32], b[32], v[32];
    long m;
    int at;
    double pp, low = br_line_cell_min(c, &m, &at, &pp);
    int rc = br_text_printf(out, "  flying caps       %s each, ripple up to %s peak to peak",
                            si(a, sizeof a, c->cfly, "F"), si(b, sizeof b, pp, "V"));
    if (at >= 0)
        rc |= br_text_printf(out, ", lowest blocking voltage %s (%s at %.1f deg)",
                             si(v, sizeof v, low, "V"), c->st[at].name,
                             br_line_theta(&c->line, m) * 180.0 / BR_PI);
    return rc | br_text_put(out, "\n");
}

/* The flying capacitors, their ripple at the load current and the lowest
 * voltage a switch then blocks, over the directions analysed. */
static int render_fly(const br_chain *c, br_text *out)
{
    char a[32], b[32], v[32];
    if (!(c->cfly > 0))
        return c->design && c->design->topology == BR_TOPO_FCML
                   ? br_text_put(out, "  flying caps       ideal (no ripple)\n")
                   : BR_OK;
    if (c->line.on)
        return render_line_fly(c, out);
    br_timing tm;
    double pp[BR_MAX_FLY + 1], worst = 0.0, low = HUGE_VAL;
    int dirs[2], nd = br_design_directions(c, dirs), at = -1;
    for (int i = 0; i < nd && dirs[i] >= 0; i++) {
        int k;
        br_timing_build(c, dirs[i], &tm);
        br_timing_fly_swing(&tm, pp);
        for (int j = 1; j < tm.npairs; j++)
            worst = fmax(worst, pp[j] * c->iload);
        double lv = br_timing_cell_min(&tm, c, (dirs[i] == BR_DIRI_UP ? 1.0 : -1.0) * c->iload, &k);
        if (lv < low) {
            low = lv;
            at = k;
        }
    }
    int rc = br_text_printf(out, "  flying caps       %s each, ripple up to %s peak to peak",
                            si(a, sizeof a, c->cfly, "F"), si(b, sizeof b, worst, "V"));
    if (at >= 0)
        rc |= br_text_printf(out, ", lowest blocking voltage %s (%s)", si(v, sizeof v, low, "V"),
                             c->st[at].name);
    return rc | br_text_put(out, "\n");
}

static int render_header(const br_chain *c, br_text *out)
{
    char a[32], b[32];
    const br_design *d = c->design;
    int rc = br_text_printf(out, "design %s (%s)\n\noperating point\n",
                            d && d->name[0] ? d->name : "(unnamed)", d ? d->path : "");
    rc |= br_text_printf(out, "  input voltage     %s\n", si(a, sizeof a, c->vin, "V"));
    rc |= br_text_printf(out, "  switching freq    %s (period %s)\n", si(a, sizeof a, c->fsw, "Hz"),
                         si(b, sizeof b, c->T, "s"));
    if (c->line.on) {
        rc |= render_line(c, out);
    } else {
        rc |= br_text_printf(out, "  duty              %.4g (%.1f %%)\n", c->duty, 100.0 * c->duty);
        rc |= br_text_printf(out, "  dead time         %s\n", si(a, sizeof a, c->deadtime, "s"));
        rc |= br_text_printf(out, "  ambient           %.1f degC\n", c->tamb - KELVIN);
        rc |= br_text_printf(out, "  current direction %s\n", direction_name(c->direction));
        if (c->direction != BR_DIR_NONE)
            rc |= render_load(c, out);
    }
    rc |= render_supply(c, out);
    rc |= render_topology(c, out);
    rc |= render_fly(c, out);
    rc |= br_text_printf(
        out, "  rules             edge overshoot %.0f %%, diode derating limit %.0f %%\n",
        100.0 * c->overshoot, 100.0 * c->derating);
    return rc;
}

/* ---- the stage table ------------------------------------------------- */

static const char *const col_head[NCOL] = {"stage",    "switch",    "diode",        "capacitor",
                                           "driver",   "sw part",   "extra",        "return",
                                           "Vblock V", "window ns", "window % of T"};

/* Lines stage k takes: one per charging window of its link, at least one. */
static int stage_lines(const br_chain *c, int k)
{
    return k > 0 && !c->st[k].inject && c->st[k - 1].nwin > 1 ? c->st[k - 1].nwin : 1;
}

static const char *id_or_dash(const char *id)
{
    return id && id[0] ? id : "-";
}

/* Cells of the window columns for link k, window w. */
static void window_cell(const br_chain *c, int k, int w, int col, char *buf, size_t cap)
{
    if (k == 0 || c->st[k].inject) {
        snprintf(buf, cap, "%s",
                 col != 9 ? ""
                 : k == 0 ? "(fed by the supply)"
                          : "(fed by its injection)");
        return;
    }
    const br_stage *ret = &c->st[k - 1];
    if (ret->nwin == 0) {
        snprintf(buf, cap, "%s", col == 9 ? "none" : "");
        return;
    }
    double a = ret->win[w][0], b = ret->win[w][1];
    if (b == 0 && a > 0)
        b = c->T; /* ends exactly at the period end: no wrap to show */
    if (col == 9)
        snprintf(buf, cap, "%.1f-%.1f", a * 1e9, b * 1e9);
    else
        snprintf(buf, cap, "%.1f-%.1f%s", 100.0 * a / c->T, 100.0 * b / c->T,
                 b < a ? " (wraps)" : "");
}

/* The text of one cell: stage k, its w-th line, column col. */
static void cell(const br_chain *c, int k, int w, int col, char *buf, size_t cap)
{
    const br_stage *st = &c->st[k];
    buf[0] = '\0';
    if (col >= 9) {
        window_cell(c, k, w, col, buf, cap);
        return;
    }
    if (w > 0)
        return; /* extra window lines carry only the window columns */
    switch (col) {
    case 0:
        snprintf(buf, cap, "%d", k);
        break;
    case 1:
        snprintf(buf, cap, "%s", st->name);
        break;
    case 2:
        snprintf(buf, cap, "%s", k > 0 ? id_or_dash(st->diode.id) : "-");
        break;
    case 3:
        snprintf(buf, cap, "%s", k > 0 ? id_or_dash(st->cap.id) : "-");
        break;
    case 4:
        snprintf(buf, cap, "%s", id_or_dash(st->drv.id));
        break;
    case 5:
        snprintf(buf, cap, "%s", id_or_dash(st->sw.id));
        break;
    case 6:
        snprintf(buf, cap, "%s", id_or_dash(st->aux.id));
        break;
    case 7: /* an injected rail has no return switch */
        snprintf(buf, cap, "%s", k > 0 && !st->inject ? c->st[k - 1].name : "-");
        break;
    default:
        if (k > 0)
            snprintf(buf, cap, "%.1f", br_link_vblock(c, k));
        else
            snprintf(buf, cap, "-");
    }
}

static void column_widths(const br_chain *c, int width[NCOL])
{
    char buf[CELL];
    for (int col = 0; col < NCOL; col++)
        width[col] = (int)strlen(col_head[col]);
    for (int k = 0; k < c->n; k++)
        for (int w = 0; w < stage_lines(c, k); w++)
            for (int col = 0; col < NCOL; col++) {
                cell(c, k, w, col, buf, sizeof buf);
                if ((int)strlen(buf) > width[col])
                    width[col] = (int)strlen(buf);
            }
}

/* Append one table line from its cells, without trailing blanks.  The
 * stage column and the voltage column are right-aligned. */
static int put_line(br_text *out, char cells[NCOL][CELL], const int width[NCOL])
{
    char line[NCOL * (CELL + 2) + 2];
    size_t n = 0;
    for (int col = 0; col < NCOL; col++) {
        int right = col == 0 || col == 8;
        int w = col == NCOL - 1 ? 0 : width[col];
        n += (size_t)snprintf(line + n, sizeof line - n, right ? "%*s  " : "%-*s  ", w, cells[col]);
    }
    while (n > 0 && line[n - 1] == ' ')
        line[--n] = '\0';
    return br_text_printf(out, "  %s\n", line);
}

static int render_table(const br_chain *c, br_text *out)
{
    int width[NCOL];
    char cells[NCOL][CELL];
    column_widths(c, width);
    int rc = br_text_printf(
        out, "\nstages (bottom to top; link k charges rail k while its return switch is on%s)\n",
        c->line.on ? ";\n  windows at duty 0.5, the modulation's centre: each switching period "
                     "moves them with its duty"
                   : "");
    for (int col = 0; col < NCOL; col++)
        snprintf(cells[col], CELL, "%s", col_head[col]);
    rc |= put_line(out, cells, width);
    for (int k = 0; k < c->n; k++)
        for (int w = 0; w < stage_lines(c, k); w++) {
            for (int col = 0; col < NCOL; col++)
                cell(c, k, w, col, cells[col], CELL);
            rc |= put_line(out, cells, width);
        }
    return rc;
}

/* ---- the switches under load ---------------------------------------- */

enum { S_STAGE, S_NAME, S_PART, S_RDS, S_DOWN, S_UP, S_REV, S_NCOL };

/* Each switch's Rds(on) at its junction temperature, its voltage while on
 * carrying the load current in each direction analysed, and its drop
 * conducting it in reverse in a dead time. */
static int render_switches(const br_chain *c, br_text *out)
{
    static const char *const heads[S_NCOL] = {"stage",         "switch",          "sw part",
                                              "Rds(on) mohm",  "on, step-down V", "on, step-up V",
                                              "reverse drop V"};
    int show[2] = {c->direction == BR_DIR_STEP_DOWN || c->direction == BR_DIR_BOTH,
                   c->direction == BR_DIR_STEP_UP || c->direction == BR_DIR_BOTH};
    char a[32];
    double i = c->line.on ? c->line.ipk : c->iload; /* a line cycle: at its peak */
    br_table *t = br_table_create(S_NCOL, c->n);
    if (!t)
        return BR_ENOMEM;
    for (int col = 0; col < S_NCOL; col++)
        br_table_head(t, col, heads[col], col == S_NAME || col == S_PART ? BR_LEFT : BR_RIGHT);
    for (int k = 0; k < c->n; k++) {
        const br_stage *st = &c->st[k];
        br_table_row(t);
        br_table_set(t, S_STAGE, "%d", k);
        br_table_set(t, S_NAME, "%s", st->name);
        br_table_set(t, S_PART, "%s", id_or_dash(st->sw.id));
        br_table_set(t, S_RDS, "%.2f", st->sw.rds_on * 1e3);
        for (int dir = 0; dir < 2; dir++)
            br_table_set(t, dir ? S_UP : S_DOWN, "%s",
                         show[dir]
                             ? (snprintf(a, sizeof a, "%+.3f", br_sw_on_drop(st, dir, i) + 0.0), a)
                             : "-");
        br_table_set(t, S_REV, "%.3f", br_sw_rev_drop(&st->sw, i));
    }
    int rc = br_text_printf(out, "\nswitches at the %s current (%s, junction %.1f degC)\n",
                            c->line.on ? "line cycle's peak" : "load", si(a, sizeof a, i, "A"),
                            c->tj - KELVIN);
    rc |= br_table_render(t, 2, out);
    br_table_free(t);
    return rc;
}

/* ---- findings ------------------------------------------------------- */

static int describe_diode(const br_chain *c, const br_rule_hit *h, br_text *out)
{
    int k = h->stage;
    double vb = br_link_vblock(c, k), vrrm = c->st[k].diode.vrrm;
    if (c->st[k].inject) /* no switching edge: its own supply off under a charged rail */
        return br_text_printf(out,
                              "injection into rail %d (%s) diode %s: must block %.1f V (the "
                              "injection's highest voltage, with its supply off under the charged "
                              "rail), %s %.4g V rating",
                              k, c->st[k].name, h->part, h->figure,
                              h->kind == BR_RULE_DIODE_UNRATED ? "no" : "against its", h->limit);
    int rc = br_text_printf(out, "link %d (rail %s, returns via %s) diode %s: ", k, c->st[k].name,
                            c->st[k - 1].name, h->part);
    if (h->kind == BR_RULE_DIODE_UNRATED)
        return rc | br_text_printf(out,
                                   "no reverse-voltage rating given, so nothing can be checked; "
                                   "it must block %.1f V (%.1f V plus %.0f %% overshoot)",
                                   h->figure, vb, 100.0 * c->overshoot);
    if (h->kind == BR_RULE_DIODE_RATING)
        return rc | br_text_printf(out,
                                   "must block %.1f V (%.1f V plus %.0f %% overshoot), above its "
                                   "%.4g V rating",
                                   h->figure, vb, 100.0 * c->overshoot, h->limit);
    return rc | br_text_printf(out,
                               "must block %.1f V, %.0f %% of its %.4g V rating; the derating "
                               "limit is %.0f %% (%.1f V)",
                               h->figure, 100.0 * h->figure / vrrm, vrrm, 100.0 * c->derating,
                               h->limit);
}

/* "; THE CHAIN CANNOT WORK: rails 3 to 5 never start" (up to the next
 * injection, in h->index). */
static int stalled(const br_rule_hit *h, br_text *out)
{
    int k = h->stage, top = h->index;
    if (top <= k)
        return br_text_printf(out, "; THE CHAIN CANNOT WORK: rail %d never starts", k);
    return br_text_printf(out, "; THE CHAIN CANNOT WORK: rails %d to %d never start", k, top);
}

static int describe_supply(const br_chain *c, const br_rule_hit *h, br_text *out)
{
    int k = h->stage;
    int rc = br_text_printf(out,
                            "rail %d (%s) driver %s: the %.4g V supply minus the nominal drops "
                            "below it leaves %.2f V, below its UVLO rising %.4g V",
                            k, c->st[k].name, h->part, c->vsupply, h->figure, h->limit);
    if (k > 0)
        rc |=
            br_text_printf(out, " (drops taken at the steady charge currents, %.3g mA in link %d)",
                           h->current * 1e3, k);
    return rc | stalled(h, out);
}

static int describe_injection(const br_chain *c, const br_rule_hit *h, br_text *out)
{
    int k = h->stage;
    const br_stage *st = &c->st[k];
    if (h->kind == BR_RULE_INJECT_LATE)
        return br_text_printf(out,
                              "injection into rail %d (%s): it starts at %.4g s, not before the "
                              "longest start-up simulated (%.4g s, max-startup), so no start-up "
                              "sees it",
                              k, st->name, h->figure, h->limit);
    int rc = br_text_printf(out,
                            "injection into rail %d (%s): its %.4g V less the drop of diode %s "
                            "and %.4g ohm at %.3g mA leaves the driver %.2f V, below its UVLO "
                            "rising %.4g V; it cannot start its rail (expected a higher voltage)",
                            k, st->name, h->lo, h->part, st->r_link, 1e3 * h->current, h->figure,
                            h->limit);
    return rc | stalled(h, out);
}

static int describe_stage(const br_chain *c, const br_rule_hit *h, br_text *out)
{
    const br_stage *st = &c->st[h->stage];
    const char *what = st->aux.kind == BR_AUX_LDO ? "regulator" : "clamp";
    int rc = br_text_printf(out, "stage %d (%s) ", h->stage, st->name);
    switch (h->kind) {
    case BR_RULE_UVLO_HYSTERESIS:
        return rc | br_text_printf(out,
                                   "driver %s: UVLO falling %.4g V is not below UVLO rising "
                                   "%.4g V; expected a hysteresis (falling < rising)",
                                   h->part, h->figure, h->limit);
    case BR_RULE_AUX_BELOW_UVLO:
        return rc | br_text_printf(out,
                                   "%s %s: its %.4g V output is below driver %s's UVLO rising "
                                   "%.4g V, so that driver can never start",
                                   what, h->part, h->figure, st->drv.id, h->limit);
    case BR_RULE_AUX_ABOVE_GATE:
        return rc | br_text_printf(out,
                                   "%s %s: its %.4g V output is above switch %s's gate absolute "
                                   "maximum %.4g V",
                                   what, h->part, h->figure, st->sw.id, h->limit);
    default:
        return rc | br_text_printf(out,
                                   "switch %s: gate absolute maximum %.4g V is below the supply "
                                   "(up to %.4g V) and the rail has no regulator or clamp",
                                   h->part, h->limit, h->figure);
    }
}

/* "diode d1 (link 2): cj0 12 F is outside ..." */
static int describe_implausible(const br_chain *c, const br_rule_hit *h, br_text *out)
{
    char v[32], lo[32], hi[32];
    int rc = 0;
    if (h->part[0])
        rc |= br_text_printf(out, "part %s (stage %d, %s): ", h->part, h->stage,
                             c->st[h->stage].name);
    else if (h->stage >= 0)
        rc |= br_text_printf(out, "link %d (rail %s): ", h->stage, c->st[h->stage].name);
    rc |=
        br_text_printf(out, "%s %s is IMPLAUSIBLE: ", h->what, si(v, sizeof v, h->figure, h->unit));
    if (h->lo > 0)
        rc |=
            br_text_printf(out, "parts of its kind have %s to %s",
                           si(lo, sizeof lo, h->lo, h->unit), si(hi, sizeof hi, h->limit, h->unit));
    else
        rc |= br_text_printf(out, "parts of its kind have at most %s",
                             si(hi, sizeof hi, h->limit, h->unit));
    return rc | br_text_put(out, "; check the number and its unit");
}

/* The names of the switches in mask, space separated. */
static int put_switches(const br_chain *c, unsigned long long mask, br_text *out)
{
    int rc = 0, first = 1;
    for (int s = 0; s < c->n; s++)
        if (mask >> s & 1) {
            rc |= br_text_printf(out, "%s%s", first ? "" : " ", c->st[s].name);
            first = 0;
        }
    return rc;
}

/* Why the driver of switch k cannot start earlier than h->figure. */
static int precharge_why(const br_chain *c, const br_rule_hit *h, br_text *out)
{
    char a[32], b[32], t[32];
    int k = h->stage;
    if (h->by_ramp && isfinite(h->figure))
        return br_text_printf(out,
                              " (the supply ramps to at most %s over %s, and the driver needs %s "
                              "on its rail)",
                              si(a, sizeof a, supply_top(c), "V"), si(t, sizeof t, c->tramp, "s"),
                              si(b, sizeof b, h->current, "V"));
    if (h->by_ramp)
        return br_text_printf(out, " (its rail needs %s, above the supply's %s)",
                              si(b, sizeof b, h->current, "V"),
                              si(a, sizeof a, supply_top(c), "V"));
    return br_text_printf(out, " (rail %d charges only while %s is on%s)", k, c->st[k - 1].name,
                          isfinite(h->figure) ? "" : ", and no step turns it on before");
}

static int describe_precharge(const br_chain *c, const br_rule_hit *h, br_text *out)
{
    char a[32], b[32], e[32];
    unsigned long long held = c->precharge[h->index].mask;
    int rc = br_text_printf(out, "startup precharge %d (holds ", h->index + 1);
    rc |= put_switches(c, held, out);
    rc |= br_text_printf(out, " from %s to %s): ", si(a, sizeof a, h->lo, "s"),
                         si(b, sizeof b, h->limit, "s"));
    rc |= h->mask == held ? br_text_put(out, "none of its switches can turn on in it") : 0;
    if (h->mask != held) {
        rc |= put_switches(c, h->mask, out);
        rc |= br_text_put(out, " cannot turn on in it");
    }
    if (isfinite(h->figure))
        rc |= br_text_printf(out, ": the driver of %s leaves UVLO at %s at the earliest",
                             c->st[h->stage].name, si(e, sizeof e, h->figure, "s"));
    else
        rc |= br_text_printf(out, ": the driver of %s cannot leave UVLO before PWM starts",
                             c->st[h->stage].name);
    rc |= precharge_why(c, h, out);
    if (h->mask == held)
        rc |= br_text_put(out, "; the step does nothing");
    return rc;
}

int br_rule_describe(const br_chain *c, const br_rule_hit *h, br_text *out)
{
    switch (h->kind) {
    case BR_RULE_DIODE_RATING:
    case BR_RULE_DIODE_DERATING:
    case BR_RULE_DIODE_UNRATED:
        return describe_diode(c, h, out);
    case BR_RULE_SUPPLY_SHORT:
        return describe_supply(c, h, out);
    case BR_RULE_INJECT_SHORT:
    case BR_RULE_INJECT_LATE:
        return describe_injection(c, h, out);
    case BR_RULE_FLY_COLLAPSE:
        return br_text_printf(out,
                              "switch %s: the flying capacitors' ripple at %.4g A takes the "
                              "voltage it blocks down to %.3g V of its %.4g V; THE LEG CANNOT "
                              "WORK: its cells collapse (expected a larger cfly)",
                              h->part, h->current, h->figure, h->limit);
    case BR_RULE_IMPLAUSIBLE:
        return describe_implausible(c, h, out);
    case BR_RULE_PRECHARGE_IDLE:
        return describe_precharge(c, h, out);
    case BR_RULE_CAP_DERATING:
        return br_text_printf(out,
                              "rail %d (%s) capacitor %s: a class II ceramic that may sit at up to "
                              "%.4g V, above %.0f %% of its %.4g V rating (%.4g V); common "
                              "practice keeps class II ceramics near half their rating, where "
                              "they keep more of their capacitance and age less",
                              h->stage, c->st[h->stage].name, h->part, h->figure,
                              100.0 * c->cap_derating, c->st[h->stage].cap.vrated, h->limit);
    case BR_RULE_NO_WINDOW:
        return br_text_printf(out,
                              "link %d (rail %s): its return switch %s is never on, so the link "
                              "can never charge; THE CHAIN CANNOT WORK above rail %d",
                              h->stage, c->st[h->stage].name, c->st[h->stage - 1].name,
                              h->stage - 1);
    default:
        return describe_stage(c, h, out);
    }
}

static int count_fatal(const br_rule_list *rules)
{
    int n = 0;
    for (int i = 0; i < rules->n; i++)
        n += rules->hit[i].fatal != 0;
    return n;
}

/* A finding that means the chain cannot work is a failure, not a warning:
 * its line says FAIL and so does the summary (which `check` exits 1 on). */
static int render_findings(const br_chain *c, const br_rule_list *rules, br_text *out)
{
    if (rules->n == 0)
        return br_text_put(out, "\ndesign rules: no warnings\n");
    int nfatal = count_fatal(rules), rc;
    if (nfatal > 0)
        rc = br_text_printf(out,
                            "\ndesign rules: FAIL, %d finding%s, %d of them mean%s the chain "
                            "cannot work\n",
                            rules->n, rules->n == 1 ? "" : "s", nfatal, nfatal == 1 ? "s" : "");
    else
        rc = br_text_printf(out, "\ndesign rules: %d warning%s\n", rules->n,
                            rules->n == 1 ? "" : "s");
    for (int i = 0; i < rules->n; i++) {
        rc |= br_text_put(out, rules->hit[i].fatal ? "  FAIL: " : "  warning: ");
        rc |= br_rule_describe(c, &rules->hit[i], out);
        rc |= br_text_put(out, "\n");
    }
    return rc;
}

int br_check_render(const br_chain *c, const br_rule_list *rules, br_text *out)
{
    int rc = render_header(c, out);
    rc |= render_table(c, out);
    if (c->direction != BR_DIR_NONE)
        rc |= render_switches(c, out);
    rc |= render_findings(c, rules, out);
    rc |= br_report_caution(out);
    return rc ? BR_ENOMEM : BR_OK;
}

int br_check_report(const br_chain *c, br_text *out, int *nwarn, int *nfatal, br_error *err)
{
    br_rule_list rules;
    int rc = br_rules_check(c, &rules, err);
    if (rc != BR_OK)
        return rc;
    if (nwarn)
        *nwarn = rules.n;
    if (nfatal)
        *nfatal = count_fatal(&rules);
    if (br_check_render(c, &rules, out) != BR_OK)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory rendering the report");
    return BR_OK;
}

/* report_common.c - heading, names and XML pieces shared by the analysis
 * reports. */
#include "report/report_common.h"

#include "report/caution.h"
#include "report/fmt.h"
#include "report/line_report.h"
#include "report/supply_report.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#define KELVIN 273.15

const char *br_dir_short(int dir)
{
    return br_dir_label(dir);
}

static const char *design_name(const br_chain *c)
{
    return c->design && c->design->name[0] ? c->design->name : "(unnamed)";
}

/* "1.1 kV bus, 120 kHz (T 8.333 us), duty 0.5, dead time 25 ns, 50 C,
 * supply 15 V, 12 switches / 11 links" */
static int operating_point(const br_chain *c, br_text *out)
{
    char vin[24], f[24], t[24], dt[24], vs[24], duty[32];
    if (c->line.on)
        snprintf(duty, sizeof duty, "duty from the modulation");
    else
        snprintf(duty, sizeof duty, "duty %.3g", c->duty);
    return br_text_printf(
        out,
        "  %s bus, %s (T %s), %s, dead time %s, %.0f degC\n"
        "  supply %s, %d switches, %d link%s\n",
        br_fmt_si(vin, sizeof vin, c->vin, 4, "V"), br_fmt_si(f, sizeof f, c->fsw, 4, "Hz"),
        br_fmt_si(t, sizeof t, c->T, 4, "s"), duty, br_fmt_si(dt, sizeof dt, c->deadtime, 3, "s"),
        c->tamb - KELVIN, br_fmt_si(vs, sizeof vs, c->vsupply, 4, "V"), c->n, c->n - 1,
        c->n == 2 ? "" : "s");
}

/* One line per isolated supply that feeds a rail directly. */
static int injection_lines(const br_chain *c, br_text *out)
{
    int rc = 0;
    for (int k = 1; k < c->n; k++) {
        const br_stage *st = &c->st[k];
        char v[24], r[24], t[24], lead[64], text[400], lim[200];
        if (!st->inject)
            continue;
        snprintf(lead, sizeof lead, "  injection into rail %d (%s): ", k, st->name);
        br_inject_limit_words(st, lim, sizeof lim);
        snprintf(text, sizeof text,
                 "isolated supply %s through %s and diode %s, on from %s%s; no link from rail %d",
                 br_fmt_si(v, sizeof v, st->vinj, 4, "V"),
                 br_fmt_si(r, sizeof r, st->r_link, 3, "ohm"), st->diode.id,
                 br_fmt_si(t, sizeof t, st->tinj, 3, "s"), lim, k - 1);
        rc |= br_report_wrap(out, lead, text, 4);
    }
    return rc;
}

/* "load current 25 A (22.5 A to 27.5 A), switches at 100 C; start-up at no
 * load": what the leg carries, when a direction is analysed. */
static int load_line(const br_chain *c, br_text *out)
{
    char i[24], lo[24], hi[24], t[24];
    const br_design *d = c->design;
    if (c->line.on)
        return br_line_heading(c, out);
    if (c->direction == BR_DIR_NONE)
        return br_text_put(out, "  no load current (idealised commutation)\n");
    int rc = br_text_printf(out, "  load current %s", br_fmt_si(i, sizeof i, c->iload, 4, "A"));
    if (d && (d->iload.min < c->iload || d->iload.max > c->iload))
        rc |= br_text_printf(out, " (%s to %s)", br_fmt_si(lo, sizeof lo, d->iload.min, 4, "A"),
                             br_fmt_si(hi, sizeof hi, d->iload.max, 4, "A"));
    rc |= br_text_printf(out, ", switches at %.0f degC; ", c->tj - KELVIN);
    if (c->load_from < HUGE_VAL)
        return rc | br_text_printf(out, "start-up under load from %s\n",
                                   br_fmt_si(t, sizeof t, c->load_from, 4, "s"));
    return rc | br_text_put(out, "start-up at no load\n");
}

int br_report_heading(const br_chain *c, const char *what, br_text *out)
{
    int rc = br_text_printf(out, "%s of design %s (%s)\n", what, design_name(c),
                            c->design ? c->design->path : "");
    rc |= operating_point(c, out);
    rc |= injection_lines(c, out);
    rc |= load_line(c, out);
    return rc | br_text_put(out, "\n") ? BR_ENOMEM : BR_OK;
}

int br_report_wrap(br_text *out, const char *lead, const char *text, int hang)
{
    int rc = br_text_put(out, lead);
    int col = (int)strlen(lead), first = 1;
    for (const char *p = text; *p;) {
        while (*p == ' ')
            p++;
        int len = (int)strcspn(p, " ");
        if (len == 0)
            break;
        if (!first && col + 1 + len > BR_REPORT_WIDTH) {
            rc |= br_text_printf(out, "\n%*s", hang, "");
            col = hang;
        } else if (!first) {
            rc |= br_text_put(out, " ");
            col++;
        }
        rc |= br_text_printf(out, "%.*s", len, p);
        col += len;
        first = 0;
        p += len;
    }
    return rc | br_text_put(out, "\n") ? BR_ENOMEM : BR_OK;
}

static const char *direction_attr(int direction)
{
    switch (direction) {
    case BR_DIR_STEP_DOWN:
        return "step-down";
    case BR_DIR_STEP_UP:
        return "step-up";
    case BR_DIR_BOTH:
        return "both";
    default:
        return "none";
    }
}

void br_xml_operating_point(br_xmlw *w, const br_chain *c)
{
    br_xmlw_start(w, "operating-point");
    br_xmlw_num(w, "vin-V", c->vin);
    br_xmlw_num(w, "fsw-Hz", c->fsw);
    br_xmlw_num(w, "period-s", c->T);
    br_xmlw_num(w, "duty", c->duty);
    br_xmlw_num(w, "dead-time-s", c->deadtime);
    br_xmlw_num(w, "ambient-K", c->tamb);
    br_xmlw_attr(w, "current", direction_attr(c->direction));
    br_xmlw_num(w, "load-current-A", c->iload);
    br_xmlw_num(w, "switch-tj-K", c->tj);
    if (c->load_from < HUGE_VAL)
        br_xmlw_num(w, "load-from-s", c->load_from);
    if (c->cfly > 0)
        br_xmlw_num(w, "cfly-F", c->cfly);
    br_xmlw_num(w, "supply-V", c->vsupply);
    br_xmlw_int(w, "switches", c->n);
    br_xmlw_int(w, "links", c->n - 1);
    br_line_xml_operating(w, c);
    for (int k = 1; k < c->n; k++) {
        const br_stage *st = &c->st[k];
        if (!st->inject)
            continue;
        br_xmlw_start(w, "injection");
        br_xmlw_int(w, "rail", k);
        br_xmlw_attr(w, "switch", st->name);
        br_xmlw_num(w, "voltage-V", st->vinj);
        br_xmlw_num(w, "resistance-ohm", st->r_link);
        br_xmlw_attr(w, "diode", st->diode.id);
        br_xmlw_num(w, "start-s", st->tinj);
        br_xmlw_end(w);
    }
    br_xmlw_end(w);
}

void br_xml_caution(br_xmlw *w)
{
    br_text *t = br_text_create();
    if (t && br_report_caution(t) == BR_OK) {
        br_xmlw_start(w, "caution");
        /* the paragraph without its leading blank line and line breaks */
        char buf[1024];
        size_t j = 0;
        for (const char *p = br_text_data(t); *p && j + 1 < sizeof buf; p++)
            if (!(j == 0 && *p == '\n'))
                buf[j++] = *p == '\n' ? ' ' : *p;
        while (j > 0 && buf[j - 1] == ' ')
            j--;
        buf[j] = '\0';
        br_xmlw_text(w, buf);
        br_xmlw_end(w);
    } else {
        br_xmlw_fail(w);
    }
    br_text_free(t);
}

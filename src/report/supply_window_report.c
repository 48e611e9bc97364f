/* supply_window_report.c - rendering the supply's answers. */
#include "report/supply_window_report.h"

#include "core/error.h"
#include "report/caution.h"
#include "report/fmt.h"
#include "report/report_common.h"
#include "report/supply_report.h"

#include <math.h>
#include <stdio.h>

static const char *const TITLE[BR_SW_COUNT] = {"smallest current limit", "lowest supply voltage",
                                               "highest supply voltage"};
static const char *const NAME[BR_SW_COUNT] = {"current-limit", "min-voltage", "max-voltage"};
static const char *const KIND[] = {"found", "range-end", "none", "undetermined"};

int br_supply_window_outcome(const br_supply_window *w)
{
    const br_sw_result *r = &w->r[BR_SW_VMIN];
    return r->npts > 0 ? r->pt[0].outcome : BR_OUTCOME_UNDETERMINED;
}

static const char *unit_of(int ans)
{
    return ans == BR_SW_LIMIT ? "A" : "V";
}

/* Digits that tell apart the two ends of a boundary: 1 % of a limit,
 * 10 mV of a supply voltage. */
#define DIGITS 5

/* "the corner of every driver starts from cold" or "the nominal point". */
static void corner_words(const br_supply_window *w, int i, char *buf, size_t cap)
{
    int o = i >= 0 && i < w->ncorner ? w->origin[i] : -1;
    if (o < 0)
        snprintf(buf, cap, "the nominal point");
    else if (o >= BR_CRIT_COUNT)
        snprintf(buf, cap, "the corner of least rail headroom");
    else
        snprintf(buf, cap, "the worst corner of \"%s\"", br_crit_title(o));
}

/* What fails (or is undetermined) at point p. */
static int failure_text(const br_chain *c, const br_supply_window *w, int ans, const br_sw_point *p,
                        br_text *out)
{
    char v[32], where[96];
    corner_words(w, p->corner, where, sizeof where);
    int rc =
        br_text_printf(out, "at %s %s: %s", br_fmt_si(v, sizeof v, p->value, DIGITS, unit_of(ans)),
                       p->outcome == BR_OUTCOME_FAIL ? "fails" : "undetermined",
                       p->crit >= 0 ? br_crit_title(p->crit) : "not judged");
    if (p->stage >= 0 && p->stage < c->n)
        rc |= br_text_printf(out, " (stage %s)", c->st[p->stage].name);
    return rc | br_text_printf(out, ", at %s", where);
}

/* The answer's value, or where a stretch that passes begins. */
static int stretch_text(const br_chain *c, const br_supply_window *w, int ans, br_text *t)
{
    const br_sw_result *r = &w->r[ans];
    char v[32], e[32];
    int rc = BR_OK;
    br_fmt_si(v, sizeof v, r->value, DIGITS, unit_of(ans));
    if (isfinite(r->enter)) {
        rc |= br_text_put(t, ans == BR_SW_LIMIT ? "the highest value searched fails ("
                                                : "the design's value fails (");
        rc |= failure_text(c, w, ans, &r->pt[0], t);
        rc |= br_text_printf(t, "); values pass from %s",
                             br_fmt_si(e, sizeof e, r->enter, DIGITS, unit_of(ans)));
        rc |= r->kind == BR_SW_RANGE_END ? br_text_printf(t, " to the end of the range")
                                         : br_text_printf(t, " to %s", v);
    } else if (r->kind == BR_SW_RANGE_END) {
        rc |= br_text_printf(t, "every value from the design's to %s passes", v);
    } else {
        rc |= br_text_printf(t, "%s", v);
    }
    return rc;
}

int br_supply_window_answer_text(const br_chain *c, const br_supply_window *w, int ans,
                                 br_text *out)
{
    const br_sw_result *r = &w->r[ans];
    char a[32], b[32], lead[160];
    if (!r->applies) {
        snprintf(lead, sizeof lead, "%s: not searched: ", TITLE[ans]);
        return br_report_wrap(out, lead, r->why, 2);
    }
    snprintf(lead, sizeof lead, "%s (from %s %s %s, to %s): ", TITLE[ans],
             br_fmt_si(a, sizeof a, r->from, 4, unit_of(ans)),
             ans == BR_SW_VMAX ? "up to" : "down to",
             br_fmt_si(b, sizeof b, ans == BR_SW_VMAX ? r->hi : r->lo, 4, unit_of(ans)),
             ans == BR_SW_LIMIT ? "1 %" : "10 mV");
    br_text *t = br_text_create();
    if (!t)
        return BR_ENOMEM;
    int rc = BR_OK;
    if (r->kind == BR_SW_NONE) {
        rc |= br_text_put(t, "none: ");
        rc |= failure_text(c, w, ans, &r->fail, t);
        rc |= br_text_put(t, "; no value searched passes");
    } else {
        rc |= stretch_text(c, w, ans, t);
        if (r->kind == BR_SW_FOUND || r->kind == BR_SW_UNDETERMINED) {
            rc |= br_text_put(t, r->kind == BR_SW_FOUND ? "; then " : "; then UNDETERMINED ");
            rc |= failure_text(c, w, ans, &r->fail, t);
        }
    }
    rc |= br_text_printf(t, " (%d values judged)", r->npts);
    if (rc == BR_OK)
        rc = br_report_wrap(out, lead, br_text_data(t), 2);
    br_text_free(t);
    return rc;
}

static int corners_text(const br_supply_window *w, br_text *out)
{
    char text[1200];
    int n = snprintf(text, sizeof text,
                     "every value is judged by the whole verdict, cold start included, at %d "
                     "corners: the nominal point and each criterion's worst corner as the "
                     "one-at-a-time sensitivities give it (every toleranced parameter at the "
                     "limit that lowers that criterion's margin), %ld corner judgements in all",
                     w->ncorner, w->points);
    (void)n;
    return br_report_wrap(out, "  ", text, 2);
}

static int verdict_line(const br_chain *c, const br_supply_window *w, br_text *out)
{
    char v[32], lim[40];
    int o = br_supply_window_outcome(w);
    br_fmt_si(v, sizeof v, c->vsupply, 4, "V");
    if (c->limit_mode == BR_SUPPLY_UNLIMITED)
        snprintf(lim, sizeof lim, "none");
    else
        br_fmt_si(lim, sizeof lim, c->ilimit, 4, "A");
    return br_text_printf(out, "verdict: %s at the design's own supply (%s, current limit %s)\n",
                          o == BR_OUTCOME_PASS   ? "PASS"
                          : o == BR_OUTCOME_FAIL ? "FAIL"
                                                 : "UNDETERMINED",
                          v, lim);
}

int br_supply_window_text(const br_chain *c, const br_supply_window *w, br_text *out)
{
    int rc = br_report_heading(c, "supply window", out);
    rc |= corners_text(w, out);
    rc |= br_text_put(out, "\n");
    for (int a = 0; a < BR_SW_COUNT; a++)
        rc |= br_supply_window_answer_text(c, w, a, out);
    rc |= br_text_put(out, "\n");
    rc |= verdict_line(c, w, out);
    rc |= br_report_caution(out);
    return rc ? BR_ENOMEM : BR_OK;
}

/* ---- XML -------------------------------------------------------------- */

static void point_xml(br_xmlw *w, const br_chain *c, const br_sw_point *p, const char *tag,
                      const char *unit)
{
    char name[32];
    br_xmlw_start(w, tag);
    snprintf(name, sizeof name, "value-%s", unit);
    br_xmlw_num(w, name, p->value);
    br_xmlw_attr(w, "outcome", br_outcome_name(p->outcome));
    if (p->crit >= 0)
        br_xmlw_attr(w, "criterion", br_crit_name(p->crit));
    if (p->corner >= 0)
        br_xmlw_int(w, "corner", p->corner);
    if (p->stage >= 0 && p->stage < c->n)
        br_xmlw_attr(w, "switch", c->st[p->stage].name);
    br_xmlw_end(w);
}

static void answer_xml(br_xmlw *w, const br_chain *c, const br_supply_window *sw, int ans)
{
    const br_sw_result *r = &sw->r[ans];
    const char *u = unit_of(ans);
    char name[32];
    br_xmlw_start(w, "answer");
    br_xmlw_attr(w, "name", NAME[ans]);
    br_xmlw_bool(w, "applies", r->applies);
    if (!r->applies) {
        br_xmlw_attr(w, "why", r->why);
        br_xmlw_end(w);
        return;
    }
    br_xmlw_attr(w, "kind", KIND[r->kind]);
    snprintf(name, sizeof name, "from-%s", u);
    br_xmlw_num(w, name, r->from);
    snprintf(name, sizeof name, "lo-%s", u);
    br_xmlw_num(w, name, r->lo);
    snprintf(name, sizeof name, "hi-%s", u);
    br_xmlw_num(w, name, r->hi);
    if (isfinite(r->value)) {
        snprintf(name, sizeof name, "value-%s", u);
        br_xmlw_num(w, name, r->value);
    }
    if (isfinite(r->enter)) {
        snprintf(name, sizeof name, "passes-from-%s", u);
        br_xmlw_num(w, name, r->enter);
        point_xml(w, c, &r->enter_fail, "before", u);
    }
    if (r->kind != BR_SW_RANGE_END)
        point_xml(w, c, &r->fail, "beyond", u);
    for (int i = 0; i < r->npts; i++)
        point_xml(w, c, &r->pt[i], "judged", u);
    br_xmlw_end(w);
}

static void corner_xml(br_xmlw *w, const br_supply_window *sw, int i)
{
    br_xmlw_start(w, "corner");
    br_xmlw_int(w, "index", i);
    int o = sw->origin[i];
    br_xmlw_attr(w, "of", o < 0 ? "nominal" : o >= BR_CRIT_COUNT ? "headroom" : br_crit_name(o));
    for (int j = 0; j < sw->tl.n; j++) {
        if (sw->level[i][j] == 0)
            continue;
        br_xmlw_start(w, "at");
        br_xmlw_attr(w, "parameter", sw->tl.p[j].name);
        br_xmlw_attr(w, "limit", sw->level[i][j] < 0 ? "min" : "max");
        br_xmlw_end(w);
    }
    br_xmlw_end(w);
}

int br_supply_window_xml(const br_chain *c, const br_supply_window *sw, const char *version,
                         br_text *out, br_error *err)
{
    br_xmlw *w;
    int rc = br_xmlw_create(&w, err);
    if (rc != BR_OK)
        return rc;
    const br_design *d = c->design;
    br_xmlw_start(w, "bootrung-supply");
    br_xmlw_attr(w, "design", d && d->name[0] ? d->name : "");
    br_xmlw_attr(w, "file", d ? d->path : "");
    br_xmlw_attr(w, "version", version ? version : "");
    br_xmlw_attr(w, "outcome", br_outcome_name(br_supply_window_outcome(sw)));
    br_xml_operating_point(w, c);
    for (int i = 0; i < sw->ncorner; i++)
        corner_xml(w, sw, i);
    for (int a = 0; a < BR_SW_COUNT; a++)
        answer_xml(w, c, sw, a);
    br_xml_caution(w);
    rc = br_xmlw_finish(w, out, err);
    br_xmlw_free(w);
    return rc;
}

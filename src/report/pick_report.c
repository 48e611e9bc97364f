/* pick_report.c - rendering the part pick. */
#include "report/pick_report.h"

#include "analyses/corners.h"
#include "report/caution.h"
#include "report/corners_report.h"
#include "report/fmt.h"
#include "report/report_common.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

static const char *part_id(const br_pick *p, int is_diode, int part)
{
    return is_diode ? p->cat->diodes[part].id : p->cat->caps[part].id;
}

/* "x5r-10u-25v on every rail", or runs: "x5r-10u-25v on B2-B3, x5r-4u7-25v
 * on A6-A1".  The design's own part where the catalog offers none. */
static void describe(const br_chain *c, const br_pick *p, const br_choice *ch, int is_diode,
                     char *buf, size_t cap)
{
    const short *part = is_diode ? ch->diode : ch->cap;
    const char *what = is_diode ? "link" : "rail";
    size_t len = 0;
    buf[0] = '\0';
    if (part[1] < 0 || ch->uniform) {
        snprintf(buf, cap, "%s on every %s",
                 part[1] < 0 ? "the design's own part" : part_id(p, is_diode, part[1]), what);
        return;
    }
    for (int k = 1; k < c->n && len < cap;) {
        int e = k;
        while (e + 1 < c->n && part[e + 1] == part[k])
            e++;
        len += (size_t)snprintf(buf + len, cap - len, "%s%s on %s%s%s", k > 1 ? ", " : "",
                                part_id(p, is_diode, part[k]), c->st[k].name, e > k ? "-" : "",
                                e > k ? c->st[e].name : "");
        k = e + 1;
    }
}

static int reject_list(const br_pick *p, int alone, br_text *out)
{
    int rc = BR_OK;
    for (int i = 0; i < p->nrej; i++) {
        const br_reject *r = &p->rej[i];
        if (r->alone != alone)
            continue;
        char lead[96];
        snprintf(lead, sizeof lead, "  %s (%s): ", part_id(p, r->is_diode, r->part),
                 r->is_diode ? "diode" : "capacitor");
        rc |= br_report_wrap(out, lead, r->why, 4);
    }
    return rc;
}

/* Parts rejected on their ratings (never placed), then parts that fail
 * as the only part of their kind (a per-rail mix may still place them). */
static int rejects(const br_pick *p, br_text *out)
{
    int nr = 0, na = 0;
    for (int i = 0; i < p->nrej; i++)
        *(p->rej[i].alone ? &na : &nr) += 1;
    int rc = nr == 0 ? br_text_put(out, "rejected parts: none\n")
                     : br_text_put(out, "rejected parts (their ratings cannot carry the chain: "
                                        "never placed)\n");
    rc |= reject_list(p, 0, out);
    if (na > 0) {
        rc |= br_text_put(out, "\n");
        rc |= br_report_wrap(out, "",
                             "parts that fail on their own (every one-part choice with them "
                             "fails; a per-rail mix may still place them where they pass):",
                             0);
        rc |= reject_list(p, 1, out);
    }
    return rc;
}

static int method_text(const br_pick *p, br_text *out)
{
    char buf[1200];
    snprintf(buf, sizeof buf,
             "parts are screened on their ratings (a capacitor against the supply's maximum, a "
             "diode's derated rating against what the links block); then every one-part choice "
             "(%d: one capacitor on every rail%s) is judged at its worst corners: the nominal "
             "point, the new parts' own tolerances one at a time, and for each steady-state "
             "criterion and for the rails' headroom over what their drivers need the corner "
             "its one-at-a-time sensitivities point to; a choice is rejected at its first "
             "failing point. Per-rail choices "
             "come from a greedy descent from the best passing one-part choice: rail by rail "
             "from the top, then link by link, each takes the cheapest part that keeps the "
             "chain passing with the minimum margin (%d choices tried). Passing choices with at "
             "least the minimum margin are ranked by cost, then area, then margin (the smallest "
             "voltage margin at the worst corners)%s. A choice where a steady state could not be "
             "settled, and nothing fails, is undetermined: never ranked, never rejected.",
             p->nuniform, p->pick_diodes ? ", one diode on every link, every combination" : "",
             p->greedy_tries,
             p->base->startup ? "; the best are then checked for the start-up criteria with a "
                                "cold start at the nominal point and at those criteria's "
                                "predicted worst corners, until --top of them pass"
                              : "; the start-up criteria are not judged (--no-startup)");
    return br_report_wrap(out, "method: ", buf, 2);
}

/* "880 mV, set by "above minimum drive" at rail B1, step-down", never a
 * number that is none. */
static const char *margin_words(const br_chain *c, const br_choice *ch, char *buf, size_t cap)
{
    char m[32], where[32];
    if (!isfinite(ch->margin) || ch->crit < 0) {
        snprintf(buf, cap, "none (no voltage criterion applies)");
        return buf;
    }
    snprintf(buf, cap, "%s, set by \"%s\" at %s, %s",
             br_fmt_si(m, sizeof m, ch->margin, 4, br_crit_unit(ch->crit)), br_crit_title(ch->crit),
             br_crit_where(c, ch->crit, ch->stage, where, sizeof where), br_dir_label(ch->dir));
    return buf;
}

static int parts_lines(const br_chain *c, const br_pick *p, const br_choice *ch, br_text *out)
{
    char rails[600], links[600];
    describe(c, p, ch, 0, rails, sizeof rails);
    describe(c, p, ch, 1, links, sizeof links);
    int rc = br_report_wrap(out, "      rails: ", rails, 13);
    rc |= br_report_wrap(out, "      links: ", links, 13);
    return rc;
}

static int choice_block(const br_chain *c, const br_pick *p, int rank, const br_choice *ch,
                        br_text *out)
{
    char mw[160];
    int rc = br_text_printf(out, "  %2d  cost %.4g  area %.4g mm2  margin %s%s\n", rank, ch->cost,
                            ch->area, margin_words(c, ch, mw, sizeof mw),
                            ch->uniform ? "" : "  [per rail]");
    return rc | parts_lines(c, p, ch, out);
}

static int ranked(const br_chain *c, const br_pick *p, br_text *out)
{
    if (p->nranked == 0)
        return br_text_put(out, "\nno choice passes every criterion at its worst corners with "
                                "the minimum margin\n");
    char line[200];
    snprintf(line, sizeof line,
             "cost, then area, then margin; the %d best that pass every criterion%s with the "
             "minimum margin",
             p->top, p->base->startup ? ", start-up included," : "");
    int rc = br_text_put(out, "\n");
    rc |= br_report_wrap(out, "ranked choices: ", line, 2);
    for (int i = 0; i < p->nranked; i++)
        rc |= choice_block(c, p, i + 1, &p->choice[p->ranked[i]], out);
    return rc;
}

/* The minimum margin and where it comes from. */
static int min_margin_text(const br_pick *p, br_text *out)
{
    char m[32], h[32], buf[300];
    if (p->min_default)
        snprintf(buf, sizeof buf,
                 "%s, a quarter of the smallest UVLO hysteresis of the design's drivers (%s): a "
                 "choice that passes with less is not ranked (--min-margin sets it)",
                 br_fmt_si(m, sizeof m, p->min_margin, 4, "V"),
                 br_fmt_si(h, sizeof h, p->hysteresis, 4, "V"));
    else
        snprintf(buf, sizeof buf, "%s (--min-margin): a choice that passes with less is not ranked",
                 br_fmt_si(m, sizeof m, p->min_margin, 4, "V"));
    return br_report_wrap(out, "minimum margin: ", buf, 2);
}

/* Passing choices below the minimum margin: how many, and the best. */
static int thin_text(const br_chain *c, const br_pick *p, br_text *out)
{
    if (p->nthin == 0)
        return BR_OK;
    char buf[400], mw[160];
    const br_choice *ch = &p->choice[p->thin];
    snprintf(buf, sizeof buf,
             "%d choice%s pass%s every criterion judged but with less than the minimum margin, "
             "and %s not ranked; the largest margin among them is %s, at cost %.4g.",
             p->nthin, p->nthin == 1 ? "" : "s", p->nthin == 1 ? "es" : "",
             p->nthin == 1 ? "is" : "are", margin_words(c, ch, mw, sizeof mw), ch->cost);
    int rc = br_text_put(out, "\n");
    return rc | br_report_wrap(out, "thin margins: ", buf, 2);
}

/* Why a choice is undetermined, in words. */
static void undet_words(const br_choice *ch, char *buf, size_t cap)
{
    if (ch->status != BR_OK)
        snprintf(buf, cap, "it could not be judged (%s)", br_status_name(ch->status));
    else if (ch->unsettled > 0)
        snprintf(buf, cap,
                 "the solver did not settle a steady state at %d of its corners, so \"%s\" "
                 "and what needs it are not decided there",
                 ch->unsettled,
                 br_crit_title(ch->undet_crit >= 0 ? ch->undet_crit : BR_CRIT_STEADY));
    else if (ch->unjudged > 0)
        snprintf(buf, cap, "%d of its corners could not be judged at all", ch->unjudged);
    else
        snprintf(buf, cap, "\"%s\" could not be decided at one of its corners",
                 br_crit_title(ch->undet_crit));
}

/* Choices that neither pass nor fail, the cheapest first. */
static int undetermined(const br_chain *c, const br_pick *p, br_text *out)
{
    if (p->nundet == 0)
        return BR_OK;
    char buf[300], why[240];
    snprintf(buf, sizeof buf,
             "%d choice%s neither pass%s nor fail%s: something could not be decided at %s "
             "corners, and nothing failed. %s not ranked and not counted as failing.%s",
             p->nundet, p->nundet == 1 ? "" : "s", p->nundet == 1 ? "es" : "",
             p->nundet == 1 ? "s" : "", p->nundet == 1 ? "its" : "their",
             p->nundet == 1 ? "It is" : "They are", p->nundet > 8 ? " The cheapest 8:" : "");
    int rc = br_text_put(out, "\n");
    rc |= br_report_wrap(out, "undetermined choices: ", buf, 2);
    for (int i = 0; i < p->nundet && i < 8; i++) {
        const br_choice *ch = &p->choice[p->undet[i]];
        undet_words(ch, why, sizeof why);
        rc |= br_text_printf(out, "   -  cost %.4g  area %.4g mm2%s\n", ch->cost, ch->area,
                             ch->uniform ? "" : "  [per rail]");
        rc |= br_report_wrap(out, "      why: ", why, 11);
        rc |= parts_lines(c, p, ch, out);
    }
    return rc;
}

static int summary(const br_pick *p, br_text *out)
{
    int pass = 0, undet = 0;
    for (int i = 0; i < p->nuniform; i++) {
        pass += p->choice[i].outcome == BR_OUTCOME_PASS;
        undet += p->choice[i].outcome == BR_OUTCOME_UNDETERMINED;
    }
    char line[400];
    snprintf(line, sizeof line,
             "%d one-part choices judged, %d pass at their worst corners, %d fail, %d "
             "undetermined; the per-rail search tried %d choices%s; %ld points judged in all.",
             p->nuniform, pass, p->nuniform - pass - undet, undet, p->greedy_tries,
             p->greedy >= 0 ? " and found a cheaper mix" : "", p->points);
    int rc = br_text_put(out, "\n");
    rc |= br_report_wrap(out, "", line, 0);
    if (p->outcome == BR_OUTCOME_PASS)
        rc |= br_text_put(out, "verdict: PASS, at least one choice passes with the minimum "
                               "margin\n");
    else if (p->outcome == BR_OUTCOME_UNDETERMINED)
        rc |= br_text_put(out, "verdict: UNDETERMINED, no choice passes with the minimum margin, "
                               "but some could not be decided\n");
    else if (p->nthin > 0)
        rc |= br_text_printf(out,
                             "verdict: FAIL, no choice passes with the minimum margin (%d pass "
                             "with less)\n",
                             p->nthin);
    else
        rc |= br_text_put(out, "verdict: FAIL, no choice passes\n");
    return rc;
}

int br_pick_text(const br_chain *c, const br_pick *p, br_text *out)
{
    int rc = br_report_heading(c, "part pick", out);
    char line[800];
    snprintf(line, sizeof line,
             "%s (%s): %d capacitors%s, %d diodes%s; %d toleranced parameters in the design",
             p->cat->name[0] ? p->cat->name : "(unnamed)", p->cat->path, p->cat->ncaps,
             p->pick_caps ? " for the rails" : "", p->cat->ndiodes,
             p->pick_diodes ? " for the links" : "", p->base->tl.n);
    rc |= br_report_wrap(out, "catalog ", line, 2);
    rc |= br_text_put(out, "\n");
    rc |= method_text(p, out);
    rc |= min_margin_text(p, out);
    rc |= br_text_put(out, "\n");
    rc |= rejects(p, out);
    rc |= ranked(c, p, out);
    rc |= thin_text(c, p, out);
    rc |= undetermined(c, p, out);
    rc |= summary(p, out);
    rc |= br_report_caution(out);
    return rc ? BR_ENOMEM : BR_OK;
}

/* ---- XML ------------------------------------------------------------------ */

static void xml_parts(br_xmlw *w, const br_chain *c, const br_pick *p, const br_choice *ch)
{
    for (int k = 1; k < c->n; k++) {
        br_xmlw_start(w, "stage");
        br_xmlw_int(w, "index", k);
        br_xmlw_attr(w, "switch", c->st[k].name);
        if (ch->cap[k] >= 0)
            br_xmlw_attr(w, "capacitor", part_id(p, 0, ch->cap[k]));
        if (ch->diode[k] >= 0)
            br_xmlw_attr(w, "diode", part_id(p, 1, ch->diode[k]));
        br_xmlw_end(w);
    }
}

/* A ranked choice (rank >= 1) or an undetermined one (rank 0). */
static void xml_choice(br_xmlw *w, const br_chain *c, const br_pick *p, const br_choice *ch,
                       int rank)
{
    br_xmlw_start(w, "choice");
    if (rank > 0)
        br_xmlw_int(w, "rank", rank);
    br_xmlw_attr(w, "result", br_outcome_name(ch->outcome));
    br_xmlw_bool(w, "per-rail", !ch->uniform);
    br_xmlw_num(w, "cost", ch->cost);
    br_xmlw_num(w, "area-mm2", ch->area);
    if (rank > 0 && ch->crit >= 0) { /* br_xmlw_num leaves out what is not a number */
        br_xmlw_num(w, "margin-V", ch->margin);
        br_xmlw_attr(w, "binds", br_crit_name(ch->crit));
        if (ch->stage >= 0 && ch->stage < c->n)
            br_xmlw_attr(w, "at", c->st[ch->stage].name);
    }
    if (ch->outcome == BR_OUTCOME_UNDETERMINED) {
        char why[240];
        undet_words(ch, why, sizeof why);
        br_xmlw_attr(w, "why", why);
    }
    br_xmlw_bool(w, "startup-checked", ch->startup_checked);
    xml_parts(w, c, p, ch);
    br_xmlw_end(w);
}

int br_pick_xml(const br_chain *c, const br_pick *p, const char *version, br_text *out,
                br_error *err)
{
    br_xmlw *w;
    int rc = br_xmlw_create(&w, err);
    if (rc != BR_OK)
        return rc;
    br_results_root(w, c, "pick", version);
    br_xmlw_start(w, "catalog");
    br_xmlw_attr(w, "name", p->cat->name);
    br_xmlw_attr(w, "file", p->cat->path);
    br_xmlw_end(w);
    br_xmlw_start(w, "search");
    br_xmlw_attr(w, "result", br_outcome_name(p->outcome));
    br_xmlw_num(w, "min-margin-V", p->min_margin);
    br_xmlw_attr(w, "min-margin-from",
                 p->min_default ? "a quarter of the UVLO hysteresis" : "--min-margin");
    br_xmlw_num(w, "uvlo-hysteresis-V", p->hysteresis);
    br_xmlw_int(w, "ranked", p->nranked);
    br_xmlw_int(w, "thin", p->nthin);
    br_xmlw_int(w, "undetermined", p->nundet);
    if (p->base->solver_limit > 0)
        br_xmlw_int(w, "solver-limit", p->base->solver_limit);
    br_xmlw_end(w);
    for (int i = 0; i < p->nrej; i++) {
        br_xmlw_start(w, "rejected");
        br_xmlw_attr(w, "part", part_id(p, p->rej[i].is_diode, p->rej[i].part));
        br_xmlw_attr(w, "kind", p->rej[i].is_diode ? "diode" : "capacitor");
        br_xmlw_attr(w, "scope", p->rej[i].alone ? "alone" : "everywhere");
        br_xmlw_attr(w, "why", p->rej[i].why);
        br_xmlw_end(w);
    }
    for (int i = 0; i < p->nranked; i++)
        xml_choice(w, c, p, &p->choice[p->ranked[i]], i + 1);
    for (int i = 0; i < p->nundet && i < 8; i++)
        xml_choice(w, c, p, &p->choice[p->undet[i]], 0);
    br_xml_caution(w);
    rc = br_xmlw_finish(w, out, err);
    br_xmlw_free(w);
    return rc;
}

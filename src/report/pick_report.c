/* pick_report.c - rendering the part pick. */
#include "report/pick_report.h"

#include "analyses/corners.h"
#include "report/caution.h"
#include "report/corners_report.h"
#include "report/fmt.h"
#include "report/report_common.h"

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

static int rejects(const br_pick *p, br_text *out)
{
    if (p->nrej == 0)
        return br_text_put(out, "rejected parts: none\n");
    int rc = br_text_put(out, "rejected parts\n");
    for (int i = 0; i < p->nrej; i++) {
        const br_reject *r = &p->rej[i];
        char lead[96];
        snprintf(lead, sizeof lead, "  %s (%s): ", part_id(p, r->is_diode, r->part),
                 r->is_diode ? "diode" : "capacitor");
        rc |= br_report_wrap(out, lead, r->why, 4);
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
             "chain passing (%d choices tried). Passing choices are ranked by cost, then area, "
             "then margin (the smallest voltage margin at the worst corners)%s.",
             p->nuniform, p->pick_diodes ? ", one diode on every link, every combination" : "",
             p->greedy_tries,
             p->base->startup ? "; the best are then checked for the start-up criteria with a "
                                "cold start at the nominal point and at those criteria's "
                                "predicted worst corners, until --top of them pass"
                              : "; the start-up criteria are not judged (--no-startup)");
    return br_report_wrap(out, "method: ", buf, 2);
}

static int choice_block(const br_chain *c, const br_pick *p, int rank, const br_choice *ch,
                        br_text *out)
{
    char rails[600], links[600], m[32], where[32];
    describe(c, p, ch, 0, rails, sizeof rails);
    describe(c, p, ch, 1, links, sizeof links);
    int rc = br_text_printf(out, "  %2d  cost %.4g  area %.4g mm2  margin %s (%s at %s, %s)%s\n",
                            rank, ch->cost, ch->area,
                            br_fmt_si(m, sizeof m, ch->margin, 4,
                                      br_crit_unit(ch->crit >= 0 ? ch->crit : BR_CRIT_UVLO)),
                            ch->crit >= 0 ? br_crit_name(ch->crit) : "-",
                            br_crit_where(c, ch->crit, ch->stage, where, sizeof where),
                            br_dir_short(ch->dir), ch->uniform ? "" : "  [per rail]");
    rc |= br_report_wrap(out, "      rails: ", rails, 13);
    rc |= br_report_wrap(out, "      links: ", links, 13);
    return rc;
}

static int ranked(const br_chain *c, const br_pick *p, br_text *out)
{
    if (p->nranked == 0)
        return br_text_put(out, "\nno choice passes every criterion at its worst corners\n");
    char line[200];
    snprintf(line, sizeof line,
             "cost, then area, then margin; the %d best that pass every criterion%s", p->top,
             p->base->startup ? ", start-up included" : "");
    int rc = br_text_put(out, "\n");
    rc |= br_report_wrap(out, "ranked choices: ", line, 2);
    for (int i = 0; i < p->nranked; i++)
        rc |= choice_block(c, p, i + 1, &p->choice[p->ranked[i]], out);
    return rc;
}

static int summary(const br_pick *p, br_text *out)
{
    int pass = 0;
    for (int i = 0; i < p->nuniform; i++)
        pass += p->choice[i].status == BR_OK && p->choice[i].pass;
    char line[400];
    snprintf(line, sizeof line,
             "%d one-part choices judged, %d pass at their worst corners; the per-rail search "
             "tried %d choices%s; %ld points judged in all.",
             p->nuniform, pass, p->greedy_tries, p->greedy >= 0 ? " and found a cheaper mix" : "",
             p->points);
    int rc = br_text_put(out, "\n");
    rc |= br_report_wrap(out, "", line, 0);
    rc |= br_text_printf(out, "verdict: %s\n",
                         p->nranked > 0 ? "PASS, at least one choice passes"
                                        : "FAIL, no choice passes");
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
    rc |= br_text_put(out, "\n");
    rc |= rejects(p, out);
    rc |= ranked(c, p, out);
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
    for (int i = 0; i < p->nrej; i++) {
        br_xmlw_start(w, "rejected");
        br_xmlw_attr(w, "part", part_id(p, p->rej[i].is_diode, p->rej[i].part));
        br_xmlw_attr(w, "kind", p->rej[i].is_diode ? "diode" : "capacitor");
        br_xmlw_attr(w, "why", p->rej[i].why);
        br_xmlw_end(w);
    }
    for (int i = 0; i < p->nranked; i++) {
        const br_choice *ch = &p->choice[p->ranked[i]];
        br_xmlw_start(w, "choice");
        br_xmlw_int(w, "rank", i + 1);
        br_xmlw_bool(w, "per-rail", !ch->uniform);
        br_xmlw_num(w, "cost", ch->cost);
        br_xmlw_num(w, "area-mm2", ch->area);
        br_xmlw_num(w, "margin-V", ch->margin);
        if (ch->crit >= 0)
            br_xmlw_attr(w, "binds", br_crit_name(ch->crit));
        br_xmlw_bool(w, "startup-checked", ch->startup_checked);
        xml_parts(w, c, p, ch);
        br_xmlw_end(w);
    }
    br_xml_caution(w);
    rc = br_xmlw_finish(w, out, err);
    br_xmlw_free(w);
    return rc;
}

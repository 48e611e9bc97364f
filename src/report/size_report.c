/* size_report.c - rendering the answers of `bootrung size`. */
#include "report/size_report.h"

#include "report/caution.h"
#include "report/fmt.h"
#include "report/report_common.h"
#include "report/supply_window_report.h"
#include "report/table.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

static const char *stage_name(const br_chain *c, int k)
{
    return k >= 0 && k < c->n ? c->st[k].name : "-";
}

const char *br_size_why(const br_chain *c, const br_size_verdict *v, double target, char *buf,
                        size_t cap)
{
    char m[32], t[32];
    const br_pt_row *r = &v->fail_row;
    if (v->status != BR_OK) {
        snprintf(buf, cap, "could not be judged");
    } else if (v->outcome == BR_OUTCOME_UNDETERMINED) {
        snprintf(buf, cap, "undetermined: %s",
                 v->fail_crit >= 0 ? br_crit_title(v->fail_crit) : "a point was not judged");
    } else if (v->outcome == BR_OUTCOME_FAIL && br_crit_never(v->fail_crit, r->figure)) {
        snprintf(buf, cap, "fails: %s (rail %s never starts)", br_crit_title(v->fail_crit),
                 stage_name(c, r->stage));
    } else if (v->outcome == BR_OUTCOME_FAIL && isfinite(r->margin)) {
        snprintf(buf, cap, "fails: %s, margin %s at %s%s%s%s", br_crit_title(v->fail_crit),
                 br_fmt_si(m, sizeof m, r->margin, 4, br_crit_unit(v->fail_crit)),
                 stage_name(c, r->stage), br_crit_is_startup(v->fail_crit) ? "" : " (",
                 br_crit_is_startup(v->fail_crit) ? "" : br_dir_label(r->dir),
                 br_crit_is_startup(v->fail_crit) ? "" : ")");
    } else if (v->outcome == BR_OUTCOME_FAIL) {
        snprintf(buf, cap, "fails: %s at %s", br_crit_title(v->fail_crit), stage_name(c, r->stage));
    } else if (!v->qualifies) {
        snprintf(buf, cap, "passes, but %s keeps only %s at %s (%s), below the target %s",
                 br_crit_title(v->crit), br_fmt_si(m, sizeof m, v->margin, 4, "V"),
                 stage_name(c, v->stage), br_dir_label(v->dir),
                 br_fmt_si(t, sizeof t, target, 4, "V"));
    } else {
        snprintf(buf, cap, "qualifies");
    }
    return buf;
}

/* ---- the capacitors ---------------------------------------------------------------- */

static int found(const br_size_answer *a)
{
    return a->kind == BR_SIZE_FOUND || a->kind == BR_SIZE_END;
}

static double largest_c(const br_size *z)
{
    double m = 0.0;
    for (int k = 1; k < z->n; k++)
        m = fmax(m, fmax(z->cap[k].from, found(&z->cap[k]) ? z->cap[k].at.v : 0.0));
    return m;
}

static void cap_row(br_table *t, const br_chain *c, const br_size *z, int k, const br_scale *cs,
                    const br_scale *ms)
{
    const br_size_answer *a = &z->cap[k];
    char v[32];
    br_table_row(t);
    br_table_set(t, 0, "%d", k);
    br_table_set(t, 1, "%s", c->st[k].name);
    br_table_set(t, 2, "%s", a->from_id);
    br_table_set(t, 3, "%s", br_fmt_in(v, sizeof v, a->from, cs, 2));
    if (found(a)) {
        br_table_set(t, 4, "%s", a->at.id);
        br_table_set(t, 5, "%s", br_fmt_in(v, sizeof v, a->at.v, cs, 2));
        br_table_set(t, 6, "%s", br_fmt_in(v, sizeof v, a->at.ver.margin, ms, 3));
        br_table_set(t, 7, "%s %s %s", a->at.ver.crit >= 0 ? br_crit_name(a->at.ver.crit) : "-",
                     stage_name(c, a->at.ver.stage), br_dir_short(a->at.ver.dir));
    } else {
        br_table_set(t, 4, "%s", a->kind == BR_SIZE_UNDETERMINED ? "UNDETERMINED" : "NONE");
        for (int col = 5; col < 8; col++)
            br_table_set(t, col, "-");
    }
    br_table_set(t, 8, "%s", a->have_beyond && a->kind != BR_SIZE_NONE ? a->beyond.id : "-");
    if (a->have_beyond && a->kind != BR_SIZE_NONE)
        br_table_set(t, 9, "%s", br_fmt_in(v, sizeof v, a->beyond.v, cs, 2));
    else
        br_table_set(t, 9, "-");
}

static int cap_table(const br_chain *c, const br_size *z, br_text *out)
{
    br_table *t = br_table_create(10, z->n);
    if (!t)
        return BR_ENOMEM;
    br_scale cs = br_scale_column(largest_c(z), 1e-6, "F"), ms = br_scale_column(1.0, 1e-3, "V");
    char h[4][32];
    snprintf(h[0], sizeof h[0], "design %s", cs.unit);
    snprintf(h[1], sizeof h[1], "sized %s", cs.unit);
    snprintf(h[2], sizeof h[2], "margin %s", ms.unit);
    snprintf(h[3], sizeof h[3], "%s", cs.unit);
    static const char *const head[] = {"rail", "switch", "design part",  NULL, "sized part", NULL,
                                       NULL,   "binds",  "next smaller", NULL};
    const int hx[] = {-1, -1, -1, 0, -1, 1, 2, -1, -1, 3};
    for (int i = 0; i < 10; i++)
        br_table_head(t, i, head[i] ? head[i] : h[hx[i]],
                      i == 1 || i == 2 || i == 4 || i == 7 || i == 8 ? BR_LEFT : BR_RIGHT);
    for (int k = z->n - 1; k >= 1; k--)
        cap_row(t, c, z, k, &cs, &ms);
    int rc = br_table_render(t, 2, out);
    br_table_free(t);
    return rc;
}

/* A line per rail under the table: what fails at the next smaller value,
 * or why there is no answer. */
static int cap_notes(const br_chain *c, const br_size *z, br_text *out)
{
    int rc = BR_OK;
    for (int k = z->n - 1; k >= 1; k--) {
        const br_size_answer *a = &z->cap[k];
        char lead[96], why[400], text[600], v[32];
        snprintf(lead, sizeof lead, "  rail %d (%s): ", k, c->st[k].name);
        const br_size_value *b = &a->beyond;
        br_size_why(c, &b->ver, z->target, why, sizeof why);
        if (a->kind == BR_SIZE_END)
            snprintf(text, sizeof text, "%s, the smallest value searched, qualifies (%d judged)",
                     a->at.id, a->trials);
        else if (a->kind == BR_SIZE_NONE)
            snprintf(text, sizeof text,
                     "nothing searched qualifies; the largest, %s (%s), %s (%d judged)", b->id,
                     br_fmt_si(v, sizeof v, b->v, 3, "F"), why, a->trials);
        else
            snprintf(text, sizeof text, "%s %s (%s) %s (%d judged)",
                     a->kind == BR_SIZE_UNDETERMINED ? "stopped at" : "next smaller", b->id,
                     br_fmt_si(v, sizeof v, b->v, 3, "F"), why, a->trials);
        rc |= br_report_wrap(out, lead, text, 4);
    }
    return rc;
}

/* ---- the link resistance and the headroom --------------------------------------------- */

/* A resistance search's answer in words; own: how the design's value is
 * named, floor: what the search stops at going down. */
static void res_words(const br_chain *c, const br_size *z, const br_size_answer *a, const char *own,
                      char *text, size_t cap)
{
    char why[400], v[32], f[32], w[32];
    br_fmt_si(f, sizeof f, a->from, 4, "ohm");
    br_size_why(c, &a->beyond.ver, z->target, why, sizeof why);
    if (a->kind == BR_SIZE_FOUND)
        snprintf(text, cap, "%s (%s %s); at %s %s (%d judged)",
                 br_fmt_si(v, sizeof v, a->at.v, 4, "ohm"), own, f,
                 br_fmt_si(w, sizeof w, a->beyond.v, 4, "ohm"), why, a->trials);
    else if (a->kind == BR_SIZE_END)
        snprintf(text, cap,
                 "%s, the largest searched (%g times %s %s), still qualifies (%d "
                 "judged)",
                 br_fmt_si(v, sizeof v, a->at.v, 4, "ohm"), BR_SIZE_SPAN, own, f, a->trials);
    else if (a->kind == BR_SIZE_NONE)
        snprintf(text, cap, "none qualifies, not even %s: %s (%d judged)",
                 br_fmt_si(v, sizeof v, a->beyond.v, 4, "ohm"), why, a->trials);
    else
        snprintf(text, cap, "UNDETERMINED at %s: %s (%d judged)",
                 br_fmt_si(v, sizeof v, a->beyond.v, 4, "ohm"), why, a->trials);
}

static int link_text(const br_chain *c, const br_size *z, br_text *out)
{
    char text[900];
    if (!z->links)
        return BR_OK;
    res_words(c, z, &z->link, "the design's largest", text, sizeof text);
    return br_report_wrap(out,
                          "largest link resistance (one value on every link, cold start "
                          "included, to 2 %): ",
                          text, 2);
}

/* Each injection's resistance, searched down to its floor V / IFRM. */
static int inject_text(const br_chain *c, const br_size *z, br_text *out)
{
    int rc = BR_OK;
    for (int i = 0; z->links && i < z->ninject; i++) {
        char words[900], text[1000], lead[96], f[32];
        int k = z->d->inject[i].rail;
        snprintf(lead, sizeof lead, "largest injection resistance into rail %d (%s): ", k,
                 stage_name(c, k));
        res_words(c, z, &z->inject[i], "the design's", words, sizeof words);
        if (z->inject_floor[i] > 0)
            snprintf(text, sizeof text, "not below V/IFRM %s (cold start included, to 2 %%): %s",
                     br_fmt_si(f, sizeof f, z->inject_floor[i], 4, "ohm"), words);
        else
            snprintf(text, sizeof text,
                     "its diode states no IFRM (cold start included, to 2 %%): %s", words);
        rc |= br_report_wrap(out, lead, text, 2);
    }
    return rc;
}

static int headroom_text(const br_chain *c, const br_size *z, br_text *out)
{
    const br_size_verdict *f = &z->final;
    char text[700], a[32], b[32], d[32], e[32];
    if (!(z->reg_vout > 0)) {
        return br_report_wrap(out, "regulator headroom: ", "no rail has a regulator", 2);
    }
    if (!f->seen[BR_CRIT_HEADROOM])
        return br_report_wrap(out, "regulator headroom: ", "not decided at the worst corners", 2);
    const br_pt_row *r = &f->worst[BR_CRIT_HEADROOM];
    /* the figure is the lowest rail behind a regulator, the limit its output
     * plus dropout: what the rails leave over the output is figure - limit
     * + dropout */
    double over = r->figure - r->limit + z->reg_dropout;
    snprintf(text, sizeof text,
             "at the worst corner the regulated rails stay at least %s above the regulator's "
             "output (%s, %s), where the regulators need %s of dropout: a regulator with a "
             "dropout up to %s keeps the target %s",
             br_fmt_si(a, sizeof a, over, 4, "V"), stage_name(c, r->stage), br_dir_label(r->dir),
             br_fmt_si(b, sizeof b, z->reg_dropout, 4, "V"),
             br_fmt_si(d, sizeof d, over - z->target, 4, "V"),
             br_fmt_si(e, sizeof e, z->target, 4, "V"));
    return br_report_wrap(out, "regulator headroom: ", text, 2);
}

/* ---- the whole report ---------------------------------------------------------------- */

static int target_text(const br_size *z, const char *catalog, br_text *out)
{
    char text[900], t[32];
    snprintf(text, sizeof text,
             "every margin in volts at least %s%s at the design's worst corners (the nominal "
             "point and each criterion's worst corner from the one-at-a-time sensitivities), "
             "every other criterion passing; capacitors %s%s",
             br_fmt_si(t, sizeof t, z->target, 4, "V"),
             z->target_default ? " (the default: a quarter of the smallest UVLO hysteresis)" : "",
             catalog ? "from the catalog "
                     : "as continuous values (each rail's own part, its "
                       "capacitance scaled, to 1 %)",
             catalog ? catalog : "");
    return br_report_wrap(out, "  target: ", text, 4);
}

static int verdict_text(const br_chain *c, const br_size *z, br_text *out)
{
    char why[400], m[32], s[32], text[700];
    const br_size_verdict *f = &z->final;
    br_size_why(c, f, z->target, why, sizeof why);
    if (z->outcome == BR_OUTCOME_PASS)
        snprintf(text, sizeof text,
                 "PASS, the sized design keeps every margin at %s or more at its worst corners, "
                 "cold start included (smallest %s, %s at %s; %ld corner judgements)",
                 br_fmt_si(m, sizeof m, z->target, 4, "V"),
                 br_fmt_si(s, sizeof s, f->margin, 4, "V"),
                 f->crit >= 0 ? br_crit_name(f->crit) : "-", stage_name(c, f->stage), z->points);
    else
        snprintf(text, sizeof text, "%s, the sized design %s (%ld corner judgements)",
                 z->outcome == BR_OUTCOME_FAIL ? "FAIL" : "UNDETERMINED", why, z->points);
    return br_report_wrap(out, "verdict: ", text, 2);
}

int br_size_text(const br_chain *c, const br_size *z, const char *catalog, br_text *out)
{
    char why[400];
    int rc = br_report_heading(c, "sizing", out);
    rc |= target_text(z, catalog, out);
    br_size_why(c, &z->start, z->target, why, sizeof why);
    rc |= br_report_wrap(out, "  the design as given, at its worst corners: ", why, 4);
    rc |= br_text_put(out, "\n");
    rc |= br_report_wrap(out, "",
                         "rail capacitors, from the top: the smallest value that qualifies "
                         "(cold start included); the next smaller was judged and does not",
                         2);
    rc |= cap_table(c, z, out);
    rc |= cap_notes(c, z, out);
    rc |= br_text_put(out, "\n");
    rc |= link_text(c, z, out);
    rc |= inject_text(c, z, out);
    rc |= headroom_text(c, z, out);
    if (z->sw) {
        rc |= br_supply_window_answer_text(c, z->sw, BR_SW_VMIN, out);
        rc |= br_supply_window_answer_text(c, z->sw, BR_SW_VMAX, out);
    }
    rc |= br_text_put(out, "\n");
    rc |= verdict_text(c, z, out);
    rc |= br_report_caution(out);
    return rc ? BR_ENOMEM : BR_OK;
}

int br_size_comment(const br_chain *c, const br_size *z, const char *catalog, br_text *out)
{
    char t[32], v[32];
    int rc = br_text_printf(out,
                            "Sized by bootrung size from %s: every margin in volts at least %s "
                            "at the worst corners.\n",
                            c->design->path, br_fmt_si(t, sizeof t, z->target, 4, "V"));
    rc |= br_text_printf(out, "Rail capacitors %s, rail by rail from the top:\n",
                         catalog ? "from a part catalog" : "as continuous values");
    for (int k = z->n - 1; k >= 1; k--) {
        const br_size_answer *a = &z->cap[k];
        if (found(a))
            rc |= br_text_printf(out, "  rail %d (%s): %s, %s\n", k, c->st[k].name, a->at.id,
                                 br_fmt_si(v, sizeof v, a->at.v, 4, "F"));
        else
            rc |=
                br_text_printf(out, "  rail %d (%s): kept (nothing qualifies)\n", k, c->st[k].name);
    }
    if (z->links && found(&z->link))
        rc |=
            br_text_printf(out, "Link resistance: %s on every link, the largest that qualifies.\n",
                           br_fmt_si(v, sizeof v, z->link.at.v, 4, "ohm"));
    for (int i = 0; z->links && i < z->ninject; i++) {
        char f[32];
        int k = z->d->inject[i].rail;
        if (found(&z->inject[i]))
            rc |= br_text_printf(out,
                                 "Injection into rail %d (%s): resistance %s, the largest that "
                                 "qualifies (not below V/IFRM %s).\n",
                                 k, stage_name(c, k),
                                 br_fmt_si(v, sizeof v, z->inject[i].at.v, 4, "ohm"),
                                 br_fmt_si(f, sizeof f, z->inject_floor[i], 4, "ohm"));
        else
            rc |= br_text_printf(
                out, "Injection into rail %d (%s): resistance kept (%s).\n", k, stage_name(c, k),
                z->inject[i].kind == BR_SIZE_UNDETERMINED ? "its search was undetermined"
                                                          : "no value searched qualifies");
    }
    rc |= br_text_printf(out, "Outcome at the worst corners, cold start included: %s.\n",
                         z->outcome == BR_OUTCOME_PASS   ? "qualifies"
                         : z->outcome == BR_OUTCOME_FAIL ? "does NOT qualify"
                                                         : "UNDETERMINED");
    rc |= br_text_put(out, "Design aids from a model: they do not replace measurement on the "
                           "real board.\nThese circuits carry lethal voltages.\n");
    return rc ? BR_ENOMEM : BR_OK;
}

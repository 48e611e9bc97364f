/* pack_report.c - the index page, checksums and script of a sign-off
 * pack. */
#include "report/pack_report.h"

#include "report/html_report.h"

#include <stdio.h>
#include <string.h>

/* What the model idealises, in the words of docs/engine.md ("Known
 * limits") and docs/physics.md: a reviewer weighs every number against
 * these. */
static const char *const ASSUMPTIONS[] = {
    "Commutation: with current=\"none\" the switches commutate ideally (no load current, no "
    "reverse conduction in the dead times); otherwise the load current the design gives (DC or "
    "over a line cycle) decides which switches conduct in reverse and the I Rds(on) drops.",
    "Edge overshoot: a fixed fraction of the blocking voltage (the operating point's "
    "overshoot) is added to each link diode's simulated peak reverse voltage; the ringing "
    "itself is not simulated.",
    "Heat: the start-up runs with every junction at the ambient; the steady state is at thermal "
    "equilibrium, the link diodes at the junction temperature their losses give behind their "
    "thermal resistance, every other junction at the ambient (the switches at switch-tj); "
    "regulator and clamp temperatures are reported, not fed back into their parts.",
    "Flying capacitors: balanced, with an ideal zero-mean triangle of ripple; their slow "
    "balancing, a start from empty flying capacitors and a collapse of the cells are not "
    "modelled.",
    "A switch whose driver is in UVLO blocks its full voltage.",
    "Diodes follow Shockley's law with series resistance, depletion capacitance (placed across "
    "the whole link), leakage and charge-control stored charge; rail capacitors their DC-bias "
    "table with ESR; every value as the design file gives it, with its tolerance.",
    "A line cycle holds each switching period's duty and current constant (sampled at the "
    "period's centre).",
};

static int para(br_text *out, const char *text)
{
    return br_html_para(out, text);
}

/* Cells wrap: the verdicts and file lists are long. */
#define TD "<td class=\"l\" style=\"white-space:normal\">"

static int cell(br_text *out, const char *text)
{
    int rc = br_text_put(out, TD);
    rc |= br_html_text(out, text);
    return rc | br_text_put(out, "</td>");
}

static int code_cell(br_text *out, const char *text)
{
    int rc = br_text_put(out, "<td class=\"l\"><code>");
    rc |= br_html_text(out, text);
    return rc | br_text_put(out, "</code></td>");
}

static int head(br_text *out, const char *const *h, int n)
{
    int rc = br_text_put(out, "<table>\n<thead><tr>");
    for (int i = 0; i < n; i++) {
        rc |= br_text_put(out, "<th class=\"l\">");
        rc |= br_html_text(out, h[i]);
        rc |= br_text_put(out, "</th>");
    }
    return rc | br_text_put(out, "</tr></thead>\n<tbody>\n");
}

static int link(br_text *out, const char *file)
{
    int rc = br_text_put(out, "<a href=\"");
    rc |= br_html_text(out, file);
    rc |= br_text_put(out, "\">");
    rc |= br_html_text(out, file);
    return rc | br_text_put(out, "</a>");
}

static const char *status_word(int status)
{
    return status == 0 ? "pass" : status == 1 ? "FAIL" : status == 3 ? "UNDETERMINED" : "not done";
}

static int step_row(br_text *out, const br_pack_step *s)
{
    int rc = br_text_put(out, "<tr>") | cell(out, s->verb);
    if (s->status < 0)
        return rc | cell(out, "not run") | cell(out, s->why) | cell(out, "-") |
               br_text_put(out, "</tr>\n");
    char b[32];
    snprintf(b, sizeof b, "%s (exit %d)", status_word(s->status), s->status);
    rc |= br_text_printf(out, "<td class=\"l %s\">",
                         s->status == 0   ? "pass"
                         : s->status == 1 ? "fail"
                                          : "undet");
    rc |= br_html_text(out, b) | br_text_put(out, "</td>");
    rc |= cell(out, s->verdict);
    rc |= br_text_put(out, TD);
    for (int i = 0; i < s->nfile; i++)
        rc |= (i ? br_text_put(out, " ") : 0) | link(out, s->file[i]);
    return rc | br_text_put(out, "</td></tr>\n");
}

static int steps_section(br_text *out, const br_pack *p)
{
    static const char *const h[] = {"verb", "result", "verdict", "pages and files"};
    int rc = br_html_section(out, "What was run",
                             "Each verb's own page (.html), its report as printed (.txt) and its "
                             "result files (.xml, .csv). The exit status follows the README: 0 "
                             "pass, 1 a criterion fails, 3 undetermined.");
    rc |= head(out, h, 4);
    for (int i = 0; i < p->nstep; i++)
        rc |= step_row(out, &p->step[i]);
    rc |= br_text_put(out, "</tbody></table>\n");
    return rc | br_html_section_end(out);
}

static int reproduce_section(br_text *out, const br_pack *p)
{
    static const char *const h[] = {"file", "SHA-256"};
    char line[700];
    int rc = br_html_section(out, "Reproduce",
                             "Every command ran in this folder on design.xml, the design file "
                             "copied here byte for byte; commands.sh runs them again and "
                             "SHA256SUMS lists every file's checksum (sha256sum -c SHA256SUMS).");
    snprintf(line, sizeof line, "Tool: bootrung %s. Design file as given: %s.", p->version,
             p->design_path);
    rc |= para(out, line);
    rc |= head(out, h, 2);
    rc |= br_text_put(out, "<tr>") | cell(out, "design.xml") | code_cell(out, p->design_sha);
    rc |= br_text_put(out, "</tr>\n");
    if (p->catalog_path) {
        rc |= br_text_put(out, "<tr>") | cell(out, "catalog.xml") | code_cell(out, p->catalog_sha);
        rc |= br_text_put(out, "</tr>\n");
    }
    rc |= br_text_put(out, "</tbody></table>\n<pre>");
    for (int i = 0; i < p->nstep; i++)
        if (p->step[i].status >= 0) {
            rc |= br_html_text(out, p->step[i].command);
            rc |= br_text_put(out, "\n");
        }
    rc |= br_text_put(out, "</pre>\n");
    return rc | br_html_section_end(out);
}

static int assumptions_section(br_text *out)
{
    int rc = br_html_section(out, "The model's assumptions",
                             "What the simulation idealises (docs/engine.md, \"Known limits\", "
                             "has the details):");
    rc |= br_text_put(out, "<ul>\n");
    for (size_t i = 0; i < sizeof ASSUMPTIONS / sizeof ASSUMPTIONS[0]; i++) {
        rc |= br_text_put(out, "<li>");
        rc |= br_html_text(out, ASSUMPTIONS[i]);
        rc |= br_text_put(out, "</li>\n");
    }
    rc |= br_text_put(out, "</ul>\n");
    return rc | br_html_section_end(out);
}

static int part_row(br_text *out, const char *kind, const char *id, const char *source)
{
    int rc = br_text_put(out, "<tr>") | cell(out, kind) | cell(out, id);
    rc |= cell(out, source[0] ? source : "not stated (see the design file's comments)");
    return rc | br_text_put(out, "</tr>\n");
}

static int sources_section(br_text *out, const br_design *d, const char *notes)
{
    static const char *const h[] = {"part", "id", "source of its values"};
    int rc = br_html_section(out, "Where the parameters come from",
                             "Each part's source attribute as the design file states it, then "
                             "the design file's own notes.");
    rc |= head(out, h, 3);
    for (int k = 0; d && k < d->ndiodes; k++)
        rc |= part_row(out, "diode", d->diodes[k].id, d->diodes[k].source);
    for (int k = 0; d && k < d->ncaps; k++)
        rc |= part_row(out, "capacitor", d->caps[k].id, d->caps[k].source);
    for (int k = 0; d && k < d->ndrivers; k++)
        rc |= part_row(out, "driver", d->drivers[k].id, d->drivers[k].source);
    for (int k = 0; d && k < d->nswitches; k++)
        rc |= part_row(out, "switch", d->switches[k].id, d->switches[k].source);
    for (int k = 0; d && k < d->naux; k++)
        rc |= part_row(out, d->aux[k].kind == BR_AUX_LDO ? "regulator" : "clamp", d->aux[k].id,
                       d->aux[k].source);
    rc |= br_text_put(out, "</tbody></table>\n");
    rc |= br_html_para(out, notes && notes[0] ? "The design file's own notes (its comments):"
                                              : "The design file has no notes (no comments).");
    if (notes && notes[0]) {
        rc |= br_text_put(out, "<pre style=\"white-space:pre-wrap\">");
        rc |= br_html_text(out, notes);
        rc |= br_text_put(out, "</pre>\n");
    }
    return rc | br_html_section_end(out);
}

int br_pack_index(const br_chain *c, const br_pack *p, br_text *out)
{
    int rc = br_html_begin(out, c, "sign-off pack");
    rc |= steps_section(out, p);
    rc |= reproduce_section(out, p);
    rc |= assumptions_section(out);
    rc |= sources_section(out, c->design, p->notes);
    rc |= br_html_end(out);
    return rc ? BR_ENOMEM : BR_OK;
}

int br_pack_sums(const br_pack *p, br_text *out)
{
    int rc = br_text_printf(out, "%s  design.xml\n", p->design_sha);
    if (p->catalog_path)
        rc |= br_text_printf(out, "%s  catalog.xml\n", p->catalog_sha);
    for (int i = 0; i < p->nstep; i++)
        for (int f = 0; f < p->step[i].nfile; f++)
            rc |= br_text_printf(out, "%s  %s\n", p->step[i].sha[f], p->step[i].file[f]);
    return rc ? BR_ENOMEM : BR_OK;
}

int br_pack_script(const br_pack *p, br_text *out)
{
    int rc = br_text_printf(out,
                            "#!/bin/sh\n# The commands of this sign-off pack (bootrung %s), "
                            "to run again in its folder.\n# Each report is printed to "
                            "VERB.txt; compare the files with SHA256SUMS.\nset -u\n",
                            p->version);
    for (int i = 0; i < p->nstep; i++)
        if (p->step[i].status >= 0)
            rc |= br_text_printf(out, "%s > %s.txt\n", p->step[i].command, p->step[i].verb);
    return rc ? BR_ENOMEM : BR_OK;
}

int br_pack_status(const br_pack *p)
{
    int fail = 0, undet = 0;
    for (int i = 0; i < p->nstep; i++) {
        fail |= p->step[i].status == 1;
        undet |= p->step[i].status == 3;
    }
    return fail ? 1 : undet ? 3 : 0;
}

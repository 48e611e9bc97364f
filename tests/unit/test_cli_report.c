/* test_cli_report.c - --report and --plot as a user meets them: every
 * page and plot parses as XML with libxml2 (the pages are XHTML that is
 * also HTML), the page is self-contained and in the promised order, and
 * the points plotted map back to the rows of the CSV file of the same
 * run. */
#include "runbin.h"
#include "testkit.h"

#include <libxml/parser.h>
#include <libxml/tree.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

static void count_error(void *ctx, const xmlError *e)
{
    (void)e;
    (*(int *)ctx)++;
}

/* Parse a file as XML, failing the test on any error or warning. */
static xmlDocPtr parse_file(const char *path, char **text)
{
    size_t len = 0;
    char *s = br_test_slurp(path, &len);
    CU_ASSERT_PTR_NOT_NULL_FATAL(s);
    int errors = 0;
    xmlSetStructuredErrorFunc(&errors, (xmlStructuredErrorFunc)count_error);
    xmlDocPtr doc = xmlReadMemory(s, (int)len, path, NULL, XML_PARSE_NONET);
    xmlSetStructuredErrorFunc(NULL, NULL);
    CU_ASSERT_EQUAL(errors, 0);
    CU_ASSERT_PTR_NOT_NULL_FATAL(doc);
    if (text)
        *text = s;
    else
        free(s);
    return doc;
}

static void temp_dir(char *path, size_t cap)
{
    snprintf(path, cap, "/tmp/br-report-XXXXXX");
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(path));
}

static void remove_all(const char *dir, const char *const *names)
{
    char p[512];
    for (; *names; names++) {
        snprintf(p, sizeof p, "%s/%s", dir, *names);
        unlink(p);
    }
    rmdir(dir);
}

/* ---- the CSV of the run ------------------------------------------------- */

#define MAXROWS 200000
#define MAXCOLS 40

typedef struct csv {
    int ncol;
    char name[MAXCOLS][32]; /* columns after series and t_s */
    long nrow;
    char (*series)[24];
    double *t;
    double (*v)[MAXCOLS];
} csv;

static void csv_load(csv *c, const char *path)
{
    size_t len;
    char *s = br_test_slurp(path, &len);
    CU_ASSERT_PTR_NOT_NULL_FATAL(s);
    memset(c, 0, sizeof *c);
    c->series = malloc(sizeof *c->series * MAXROWS);
    c->t = malloc(sizeof(double) * MAXROWS);
    c->v = malloc(sizeof *c->v * MAXROWS);
    char *save = NULL;
    char *line = strtok_r(s, "\n", &save);
    /* header: series,t_s,rail_B1_V,... */
    char *f = strchr(strchr(line, ',') + 1, ',');
    while (f && c->ncol < MAXCOLS) {
        f++;
        size_t n = strcspn(f, ",");
        snprintf(c->name[c->ncol++], sizeof c->name[0], "%.*s", (int)n, f);
        f = strchr(f, ',');
    }
    while ((line = strtok_r(NULL, "\n", &save)) && c->nrow < MAXROWS) {
        size_t n = strcspn(line, ",");
        snprintf(c->series[c->nrow], sizeof c->series[0], "%.*s", (int)n, line);
        char *p = line + n + 1;
        c->t[c->nrow] = strtod(p, &p);
        for (int k = 0; k < c->ncol; k++)
            c->v[c->nrow][k] = strtod(p + 1, &p);
        c->nrow++;
    }
    free(s);
}

static void csv_free(csv *c)
{
    free(c->series);
    free(c->t);
    free(c->v);
}

static int csv_col(const csv *c, const char *name)
{
    for (int k = 0; k < c->ncol; k++)
        if (strcmp(c->name[k], name) == 0)
            return k;
    return -1;
}

/* The CSV series a panel draws from, by its key. */
static const char *series_of(const char *panel)
{
    if (strncmp(panel, "startup-", 8) == 0)
        return "startup";
    if (strstr(panel, "-down-"))
        return "steady-step-down";
    if (strstr(panel, "-up-"))
        return "steady-step-up";
    return "steady";
}

static double prop(xmlNodePtr n, const char *name)
{
    xmlChar *v = xmlGetProp(n, BAD_CAST name);
    double d = v ? strtod((const char *)v, NULL) : NAN;
    xmlFree(v);
    return d;
}

typedef struct frame {
    double xmin, xmax, ymin, ymax, px0, py0, pw, ph;
} frame;

/* Check each point of one polyline against the rows of its series: some
 * row lies within the coordinates' rounding (0.05 px, plus the 7 digits
 * of the CSV).  Points past the series' last row (the second steady
 * period, which the CSV does not hold) are not checked.  Returns the
 * number of points checked; *bad counts those without a row. */
static long check_line(const csv *c, const char *series, int col, const frame *f, const char *pts,
                       long *bad)
{
    double dt = 0.06 * (f->xmax - f->xmin) / f->pw, dy = 0.06 * (f->ymax - f->ymin) / f->ph;
    double tlo = HUGE_VAL, thi = -HUGE_VAL;
    for (long r = 0; r < c->nrow; r++)
        if (strcmp(c->series[r], series) == 0) {
            tlo = fmin(tlo, c->t[r]);
            thi = fmax(thi, c->t[r]);
        }
    long checked = 0;
    double px, py;
    for (const char *s = pts; s && sscanf(s, "%lf,%lf", &px, &py) == 2;
         s = strchr(s, ' '), s = s ? s + 1 : NULL) {
        double t = f->xmin + (px - f->px0) / f->pw * (f->xmax - f->xmin);
        double v = f->ymax - (py - f->py0) / f->ph * (f->ymax - f->ymin);
        if (t < tlo - dt || t > thi + dt)
            continue;
        int found = 0;
        for (long r = 0; r < c->nrow && !found; r++)
            found = fabs(c->t[r] - t) <= dt && strcmp(c->series[r], series) == 0 &&
                    fabs(c->v[r][col] - v) <= dy + 1e-6 * fabs(v);
        *bad += !found;
        if (!found && getenv("BR_DEBUG"))
            fprintf(stderr, "%s col %d: t %.9g v %.9g\n", series, col, t, v);
        checked++;
    }
    return checked;
}

static long check_panels(xmlNodePtr n, const csv *c, long *bad)
{
    long checked = 0;
    for (; n; n = n->next) {
        if (n->type != XML_ELEMENT_NODE)
            continue;
        xmlChar *panel = xmlGetProp(n, BAD_CAST "data-panel");
        if (panel) {
            frame f = {prop(n, "data-xmin"), prop(n, "data-xmax"), prop(n, "data-ymin"),
                       prop(n, "data-ymax"), prop(n, "data-px0"),  prop(n, "data-py0"),
                       prop(n, "data-pw"),   prop(n, "data-ph")};
            for (xmlNodePtr l = n->children; l; l = l->next) {
                xmlChar *key = xmlGetProp(l, BAD_CAST "data-series");
                int col = key ? csv_col(c, (const char *)key) : -1;
                xmlChar *pts = col >= 0 ? xmlGetProp(l, BAD_CAST "points") : NULL;
                if (pts)
                    checked += check_line(c, series_of((const char *)panel), col, &f,
                                          (const char *)pts, bad);
                xmlFree(pts);
                xmlFree(key);
            }
            xmlFree(panel);
        } else {
            checked += check_panels(n->children, c, bad);
        }
    }
    return checked;
}

/* ---- cases --------------------------------------------------------------- */

static int count(const char *s, const char *needle)
{
    int n = 0;
    for (const char *p = s; (p = strstr(p, needle)); p++)
        n++;
    return n;
}

static void test_analyze_report(void)
{
    char dir[64], html[96], csvp[96];
    temp_dir(dir, sizeof dir);
    snprintf(html, sizeof html, "%s/r.html", dir);
    snprintf(csvp, sizeof csvp, "%s/r.csv", dir);
    const char *args[] = {"analyze", "examples/leg-7level.xml", "--report", html, "--csv", csvp,
                          NULL};
    run_result r = run(args);
    CU_ASSERT_EQUAL(r.status, 0);
    done(&r);
    char *text = NULL;
    xmlDocPtr doc = parse_file(html, &text);
    /* self-contained: no script, nothing fetched (the only URIs are the
     * XML namespaces) */
    CU_ASSERT_PTR_NULL(strstr(text, "<script"));
    CU_ASSERT_EQUAL(count(text, "http"), count(text, "http://www.w3.org/"));
    CU_ASSERT_PTR_NULL(strstr(text, "src="));
    /* verdict first, caution last */
    const char *verdict = strstr(text, ">Verdict<"), *caution = strstr(text, "lethal voltages");
    CU_ASSERT_TRUE(verdict && caution && verdict < caution);
    CU_ASSERT_TRUE(caution && !strstr(caution, "<section"));
    CU_ASSERT_EQUAL(count(text, "data-panel=\"startup-"), 12);       /* every rail */
    CU_ASSERT_TRUE(count(text, "data-limit=\"uvlo-rising\"") >= 24); /* start-up and steady */
    CU_ASSERT_TRUE(has(text, "data-series=\"vrev_"));
    CU_ASSERT_TRUE(has(text, "\xc2\xb5s")); /* prefixes as people write them */
    CU_ASSERT_TRUE(strlen(text) < 600000);  /* decimated: a page, not a data dump */
    csv c;
    csv_load(&c, csvp);
    long bad = 0, checked = check_panels(xmlDocGetRootElement(doc), &c, &bad);
    CU_ASSERT_TRUE(checked > 2000);
    CU_ASSERT_EQUAL(bad, 0);
    if (bad)
        fprintf(stderr, "%ld of %ld plotted points match no CSV row\n", bad, checked);
    csv_free(&c);
    xmlFreeDoc(doc);
    free(text);
    const char *names[] = {"r.html", "r.csv", NULL};
    remove_all(dir, names);
}

/* The largest value series draws in panel (the points mapped back to
 * data), and one pixel's worth of value there; NaN when not found. */
static double plotted_max(xmlNodePtr n, const char *panel, const char *series, double *pixel)
{
    for (; n; n = n->next) {
        if (n->type != XML_ELEMENT_NODE)
            continue;
        xmlChar *name = xmlGetProp(n, BAD_CAST "data-panel");
        int match = name && strcmp((const char *)name, panel) == 0;
        xmlFree(name);
        if (!match) {
            double m = plotted_max(n->children, panel, series, pixel);
            if (!isnan(m))
                return m;
            continue;
        }
        frame f = {prop(n, "data-xmin"), prop(n, "data-xmax"), prop(n, "data-ymin"),
                   prop(n, "data-ymax"), prop(n, "data-px0"),  prop(n, "data-py0"),
                   prop(n, "data-pw"),   prop(n, "data-ph")};
        *pixel = (f.ymax - f.ymin) / f.ph;
        double most = NAN, px, py;
        for (xmlNodePtr l = n->children; l; l = l->next) {
            xmlChar *key = xmlGetProp(l, BAD_CAST "data-series");
            xmlChar *pts = key && strcmp((const char *)key, series) == 0
                               ? xmlGetProp(l, BAD_CAST "points")
                               : NULL;
            for (const char *p = (const char *)pts; p && sscanf(p, "%lf,%lf", &px, &py) == 2;
                 p = strchr(p, ' '), p = p ? p + 1 : NULL) {
                double v = f.ymax - (py - f.py0) / f.ph * (f.ymax - f.ymin);
                most = isnan(most) ? v : fmax(most, v);
            }
            xmlFree(pts);
            xmlFree(key);
        }
        return most;
    }
    return NAN;
}

/* The data-value of the first <line data-limit="key"> after from, or NaN. */
static double limit_at(const char *from, const char *key)
{
    char needle[64];
    snprintf(needle, sizeof needle, "data-limit=\"%s\" data-value=\"", key);
    const char *p = from ? strstr(from, needle) : NULL;
    return p ? strtod(p + strlen(needle), NULL) : NAN;
}

/* The 12-switch demo's page agrees with itself and with its files: one
 * group of rows per current direction, one floor per rail drawn and
 * tabulated (its regulator's output + dropout, 6 V + 0.3 V), the same
 * limit lines in the start-up and the steady plots, the displacement
 * current as a series of its own, and the start-up CSV reaching the
 * inrush peaks the results report. */
/* The split example: the text, XML and HTML name the injection and its
 * supply figures (the power it gives, in the budget), and the balance
 * over both supplies closes in the XML to 0.1 % of what they give. */
static void test_injection_named(void)
{
    char dir[64], html[96], xml[96];
    temp_dir(dir, sizeof dir);
    snprintf(html, sizeof html, "%s/r.html", dir);
    snprintf(xml, sizeof xml, "%s/r.xml", dir);
    const char *args[] = {"analyze", "examples/split-5level.xml", "--report", html, "--xml", xml,
                          NULL};
    run_result r = run(args);
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(has(r.out, "injection into rail 4 (A4): isolated supply 15 V through 4.7 ohm"));
    CU_ASSERT_TRUE(has(r.out, "+ injection into A4 "));
    done(&r);
    char *x = br_test_slurp(xml, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(x);
    CU_ASSERT_TRUE(has(x, "<injection rail=\"4\" switch=\"A4\" voltage-V=\"15\""));
    const char *l = strstr(x, "<losses ");
    CU_ASSERT_PTR_NOT_NULL_FATAL(l);
    double sup = strtod(strstr(l, "supply-W=\"") + 10, NULL);
    double inj = strtod(strstr(l, "injection-W=\"") + 13, NULL);
    double bal = strtod(strstr(l, "balance-W=\"") + 11, NULL);
    CU_ASSERT_TRUE(inj > 0.1 && sup > 0.1);
    CU_ASSERT_TRUE(fabs(bal) < 1e-3 * (sup + inj));
    free(x);
    char *h = br_test_slurp(html, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(h);
    CU_ASSERT_TRUE(has(h, "Injection into rail 4 (A4): an isolated supply of 15 V"));
    CU_ASSERT_TRUE(has(h, "+ injection into A4 "));
    free(h);
    remove_all(dir, (const char *const[]){"r.html", "r.xml", NULL});
}

static void test_report_agrees(void)
{
    char dir[64], html[96], csvp[96], xmlp[96];
    temp_dir(dir, sizeof dir);
    snprintf(html, sizeof html, "%s/r.html", dir);
    snprintf(csvp, sizeof csvp, "%s/r.csv", dir);
    snprintf(xmlp, sizeof xmlp, "%s/r.xml", dir);
    run_result r = run((const char *[]){"analyze", "examples/leg-7level.xml", "--report", html,
                                        "--csv", csvp, "--xml", xmlp, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    done(&r);
    char *text = br_test_slurp(html, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(text);
    /* rails, diodes, capacitors: a group per direction, every row in one */
    CU_ASSERT_EQUAL(count(text, "<tr class=\"group\" data-direction=\"step-down\">"), 3);
    CU_ASSERT_EQUAL(count(text, "<tr class=\"group\" data-direction=\"step-up\">"), 3);
    CU_ASSERT_EQUAL(count(text, "<tr data-direction=\"step-down\">"), 12 + 11 + 11);
    CU_ASSERT_EQUAL(count(text, "<tr data-direction=\"step-up\">"), 12 + 11 + 11);
    /* the floor: 6 V + 0.3 V, in the table and as the plots' line */
    CU_ASSERT_EQUAL(count(text, ">6.3 V (regulator output + dropout)<"), 24);
    CU_ASSERT_EQUAL(count(text, "data-limit=\"regulator-headroom\" data-value=\"6.3\""), 36);
    /* one set of limits: rail A1's UVLO falling where the start-up plot
     * and both steady plots draw it, 4.2 V + 0.3 V (the regulator's
     * dropout): the steady plots drew 4.2 V, the start-up 4.5 V */
    const char *su = strstr(text, "data-panel=\"startup-A1\"");
    const char *dn = strstr(text, "data-panel=\"ripple-step-down-A1\"");
    const char *up = strstr(text, "data-panel=\"ripple-step-up-A1\"");
    BR_ASSERT_NEAR(limit_at(su, "uvlo-falling"), 4.5, 1e-9);
    BR_ASSERT_NEAR(limit_at(dn, "uvlo-falling"), 4.5, 1e-9);
    BR_ASSERT_NEAR(limit_at(up, "uvlo-falling"), 4.5, 1e-9);
    BR_ASSERT_NEAR(limit_at(dn, "minimum-drive"), 5.3, 1e-9);
    /* the junction capacitance's current: a series and a figure of its own */
    CU_ASSERT_TRUE(has(text, "data-series=\"disp_"));
    CU_ASSERT_TRUE(has(text, ">displacement peak<"));
    CU_ASSERT_TRUE(has(text, "displacement current (peak "));
    /* the diode plot's forward current reaches the forward peak of the
     * results (link A1 stepping up, the most stressed diode): the plot
     * is thinned to each pixel column's lowest and highest sample */
    char *xr = br_test_slurp(xmlp, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(xr);
    const char *upx = strstr(xr, "<steady direction=\"step-up\"");
    const char *a1 = upx ? strstr(upx, "<link index=\"11\" switch=\"A1\"") : NULL;
    const char *pk = a1 ? strstr(a1, " peak-A=\"") : NULL;
    CU_ASSERT_PTR_NOT_NULL_FATAL(pk);
    double ipeak = strtod(pk + 9, NULL), pixel = 0.0;
    free(xr);
    xmlDocPtr doc = parse_file(html, NULL);
    double drawn =
        plotted_max(xmlDocGetRootElement(doc), "diode-step-up-A1-i", "link_A1_A", &pixel);
    xmlFreeDoc(doc);
    CU_ASSERT_TRUE(ipeak > 0.1); /* 783 mA: a peak worth drawing */
    BR_ASSERT_NEAR(drawn, ipeak, 0.06 * pixel + 1e-6 * ipeak);
    /* charges in nC, never a bare C */
    CU_ASSERT_TRUE(has(text, ">0 nC<"));
    /* our own palette: not the code-hosting site's grey for code blocks */
    CU_ASSERT_PTR_NULL(strstr(text, "#f6f8fa"));
    free(text);
    /* the start-up CSV reaches every link's reported inrush peak */
    csv c;
    csv_load(&c, csvp);
    char *x = br_test_slurp(xmlp, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(x);
    int links = 0;
    for (const char *p = strstr(x, "inrush-peak-A=\""); p; p = strstr(p + 1, "inrush-peak-A=\"")) {
        const char *sw = p;
        while (sw > x && strncmp(sw, " switch=\"", 9) != 0)
            sw--;
        char name[32], col[48];
        CU_ASSERT_EQUAL_FATAL(sscanf(sw + 9, "%31[^\"]", name), 1);
        snprintf(col, sizeof col, "link_%s_A", name);
        int k = csv_col(&c, col);
        CU_ASSERT_TRUE_FATAL(k >= 0);
        double peak = strtod(p + 15, NULL), most = -HUGE_VAL;
        for (long i = 0; i < c.nrow; i++)
            if (strcmp(c.series[i], "startup") == 0)
                most = fmax(most, c.v[i][k]);
        BR_ASSERT_REL(most, peak, 1e-6);
        links++;
    }
    CU_ASSERT_EQUAL(links, 11);
    free(x);
    csv_free(&c);
    const char *names[] = {"r.html", "r.csv", "r.xml", NULL};
    remove_all(dir, names);
}

/* The demo fails its 10 V minimum drive: the steady plots draw that limit
 * as a labelled line in the plot (it was pointed at from the edge), and
 * the window plot marks the limits its search found (holds from 1.47 %
 * to 94.7 % of duty on the 12-switch demo). */
static void test_limits_drawn(void)
{
    char dir[64], html[96];
    temp_dir(dir, sizeof dir);
    snprintf(html, sizeof html, "%s/r.html", dir);
    run_result r =
        run((const char *[]){"steady", "examples/demo-3level.xml", "--report", html, NULL});
    CU_ASSERT_EQUAL(r.status, 1);
    done(&r);
    char *text = br_test_slurp(html, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(text);
    /* 4 rails, 2 directions */
    CU_ASSERT_EQUAL(count(text, "data-limit=\"minimum-drive\" data-value=\"10\""), 8);
    CU_ASSERT_TRUE(has(text, ">minimum drive</text>"));
    CU_ASSERT_PTR_NULL(strstr(text, "\xe2\x86\x93 ")); /* no arrow pointing off the plot */
    free(text);
    /* the 12-switch demo holds: its duty and frequency limits are found */
    r = run((const char *[]){"window", "examples/leg-7level.xml", "--report", html, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    done(&r);
    text = br_test_slurp(html, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(text);
    CU_ASSERT_TRUE(count(text, "data-mark=\"found-limit\"") >= 2);
    CU_ASSERT_TRUE(has(text, ">holds to "));
    free(text);
    const char *names[] = {"r.html", NULL};
    remove_all(dir, names);
}

/* One verb's --plot (and --report when it has one) parse as XML. */
static void plot_of(const char *const *args, const char *plot, const char *report)
{
    run_result r = run(args);
    CU_ASSERT_TRUE(r.status == 0 || r.status == 1);
    if (r.status > 1)
        fprintf(stderr, "%s: %s\n", args[0], r.err);
    done(&r);
    xmlDocPtr doc = parse_file(plot, NULL);
    CU_ASSERT_STRING_EQUAL(xmlDocGetRootElement(doc)->name, "svg");
    xmlFreeDoc(doc);
    if (report) {
        char *text = NULL;
        doc = parse_file(report, &text);
        CU_ASSERT_STRING_EQUAL(xmlDocGetRootElement(doc)->name, "html");
        CU_ASSERT_TRUE(has(text, "lethal voltages"));
        CU_ASSERT_PTR_NULL(strstr(text, "<script"));
        xmlFreeDoc(doc);
        free(text);
    }
}

/* One verb's --report: an XHTML page with the verdict first as a badge
 * (its class the outcome the status gives), the terminal report's text in
 * it (want), the caution last. */
static void report_of(const char *const *args, const char *html, int status, const char *badge,
                      const char *want)
{
    run_result r = run(args);
    CU_ASSERT_EQUAL(r.status, status);
    if (r.status != status)
        fprintf(stderr, "%s: status %d: %s\n", args[0], r.status, r.err);
    done(&r);
    char *text = NULL;
    xmlDocPtr doc = parse_file(html, &text);
    CU_ASSERT_STRING_EQUAL(xmlDocGetRootElement(doc)->name, "html");
    const char *b = strstr(text, badge), *w = strstr(text, want);
    const char *caution = strstr(text, "lethal voltages");
    CU_ASSERT_TRUE(b && w && caution && b < w && w < caution);
    if (!b || !w)
        fprintf(stderr, "%s: missing [%s] or [%s]\n", args[0], badge, want);
    CU_ASSERT_PTR_NULL(strstr(text, "<script"));
    xmlFreeDoc(doc);
    free(text);
    unlink(html);
}

/* check, corners, pick and supply take --report like the other verbs: a
 * design review holds the chain, the worst-case table and the chosen
 * parts as pages. */
static void test_text_verb_reports(void)
{
    char dir[64], html[96];
    temp_dir(dir, sizeof dir);
    snprintf(html, sizeof html, "%s/v.html", dir);
    const char *f = "examples/demo-3level.xml", *cat = "examples/parts/catalog.xml";
    const char *ck[] = {"check", f, "--report", html, NULL};
    report_of(ck, html, 0, "badge pass\">PASS", "stages (bottom to top;");
    const char *cn[] = {"corners", f, "--report", html, NULL};
    report_of(cn, html, 1, "badge fail\">FAIL", "worst corner of each criterion");
    const char *pk[] = {"pick", f, "--catalog", cat, "--report", html, NULL};
    report_of(pk, html, 1, "badge fail\">FAIL", "verdict: FAIL, no choice passes");
    const char *sp[] = {"supply", f, "--report", html, NULL};
    report_of(sp, html, 1, "badge fail\">FAIL", "at the design's own supply");
    /* the page is one of the verb's outputs: never the design itself */
    const char *same[] = {"corners", f, "--report", f, NULL};
    run_result r = run(same);
    CU_ASSERT_EQUAL(r.status, 2);
    done(&r);
    const char *names[] = {"v.html", NULL};
    remove_all(dir, names);
}

static void test_every_plot_parses(void)
{
    char dir[64], svg[96], html[96];
    temp_dir(dir, sizeof dir);
    snprintf(svg, sizeof svg, "%s/p.svg", dir);
    snprintf(html, sizeof html, "%s/p.html", dir);
    const char *f = "examples/demo-3level.xml";
    const char *su[] = {"startup", f, "--plot", svg, "--report", html, NULL};
    plot_of(su, svg, html);
    const char *ss[] = {"steady", f, "--plot", svg, "--report", html, NULL};
    plot_of(ss, svg, html);
    const char *mp[] = {"map",    f,   "--duty",   "20%:80%:4", "--freq", "50k:200k:3",
                        "--plot", svg, "--report", html,        NULL};
    plot_of(mp, svg, html);
    const char *yd[] = {"yield", f, "--samples", "20", "--plot", svg, "--report", html, NULL};
    plot_of(yd, svg, html);
    const char *wd[] = {"window", f, "--plot", svg, "--report", html, NULL};
    plot_of(wd, svg, html);
    const char *names[] = {"p.svg", "p.html", NULL};
    remove_all(dir, names);
}

/* Smallest margin-uvlo-V of the rails of one <steady direction="dir">. */
static double min_uvlo_margin(xmlDocPtr doc, const char *dir)
{
    double worst = HUGE_VAL;
    for (xmlNodePtr n = xmlDocGetRootElement(doc)->children; n; n = n->next) {
        if (n->type != XML_ELEMENT_NODE || xmlStrcmp(n->name, BAD_CAST "steady"))
            continue;
        xmlChar *d = xmlGetProp(n, BAD_CAST "direction");
        int match = d && !xmlStrcmp(d, BAD_CAST dir);
        xmlFree(d);
        for (xmlNodePtr r = match ? n->children : NULL; r; r = r->next)
            if (r->type == XML_ELEMENT_NODE && !xmlStrcmp(r->name, BAD_CAST "rail"))
                worst = fmin(worst, prop(r, "margin-uvlo-V"));
    }
    return worst;
}

/* steady --plot draws the current direction whose driver supplies come
 * nearest UVLO falling: at 2 MHz that is step-up, the second direction
 * (its margin read back from the same run's --xml). */
static void test_steady_plot_binding_direction(void)
{
    char dir[64], svg[96], xml[96];
    temp_dir(dir, sizeof dir);
    snprintf(svg, sizeof svg, "%s/p.svg", dir);
    snprintf(xml, sizeof xml, "%s/p.xml", dir);
    const char *args[] = {"steady", "tests/extreme/fsw-2mhz.xml", "--plot", svg, "--xml", xml,
                          NULL};
    run_result r = run(args);
    CU_ASSERT_TRUE(r.status == 0 || r.status == 1);
    done(&r);
    xmlDocPtr doc = parse_file(xml, NULL);
    double down = min_uvlo_margin(doc, "step-down"), up = min_uvlo_margin(doc, "step-up");
    xmlFreeDoc(doc);
    CU_ASSERT_TRUE(up < down);
    char *text = NULL;
    doc = parse_file(svg, &text);
    CU_ASSERT_TRUE(has(text, "Steady state over two periods, step-up"));
    xmlFreeDoc(doc);
    free(text);
    const char *names[] = {"p.svg", "p.xml", NULL};
    remove_all(dir, names);
}

/* A steady state the solver is not allowed to settle: the report says
 * UNDETERMINED in its badge and its rows, as the terminal does, never
 * PASS; the page still parses. */
static void test_undetermined_report(void)
{
    char dir[64], html[96];
    temp_dir(dir, sizeof dir);
    snprintf(html, sizeof html, "%s/u.html", dir);
    const char *args[] = {
        "analyze", "examples/leg-7level.xml", "--solver-limit", "1", "--report", html, NULL};
    run_result r = run(args);
    CU_ASSERT_EQUAL(r.status, 3);
    CU_ASSERT_TRUE(has(r.out, "verdict: UNDETERMINED"));
    done(&r);
    char *text = NULL;
    xmlDocPtr doc = parse_file(html, &text);
    CU_ASSERT_PTR_NOT_NULL(doc);
    CU_ASSERT_TRUE(has(text, "badge undet"));
    CU_ASSERT_TRUE(has(text, "UNDETERMINED"));
    CU_ASSERT_PTR_NULL(strstr(text, "badge pass"));
    xmlFreeDoc(doc);
    free(text);
    const char *names[] = {"u.html", NULL};
    remove_all(dir, names);
}

/* A report that cannot be written: status 2, said why, nothing on stdout. */
static void test_unwritable_report(void)
{
    const char *args[] = {"steady", "examples/demo-3level.xml", "--report",
                          "/nonexistent-dir/r.html", NULL};
    run_result r = run(args);
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_TRUE(has(r.err, "/nonexistent-dir/r.html"));
    CU_ASSERT_STRING_EQUAL(r.out, "");
    done(&r);
    const char *two[] = {"steady", "examples/demo-3level.xml", "--report", "-", "--plot", "-",
                         NULL};
    r = run(two);
    CU_ASSERT_EQUAL(r.status, 2);
    done(&r);
    /* analyze has many plots: they are in the report, not behind --plot */
    const char *ap[] = {"analyze", "examples/demo-3level.xml", "--plot", "x.svg", NULL};
    r = run(ap);
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_TRUE(has(r.err, "unknown option"));
    done(&r);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"analyze --report: parses, self-contained, points are CSV rows", test_analyze_report},
        {"every verb's --plot and --report parse", test_every_plot_parses},
        {"the page agrees with itself and its files", test_report_agrees},
        {"limits drawn as lines, limits found marked", test_limits_drawn},
        {"check, corners, pick, supply: --report", test_text_verb_reports},
        {"steady --plot draws the direction nearest UVLO", test_steady_plot_binding_direction},
        {"undetermined verdict in the report", test_undetermined_report},
        {"an injection named in text, XML and HTML", test_injection_named},
        {"unwritable or clashing outputs: status 2", test_unwritable_report},
        {NULL, NULL},
    };
    if (chdir(BR_SOURCE_DIR) != 0)
        return 2;
    return br_test_main("cli_report", cases);
}

/* test_cli_line.c - the verbs on a design with an AC line cycle: the
 * steady state's text, XML, CSV and plot agree with each other; the
 * verdict rows name the line phase; window answers the peak current and
 * the line frequency; corners and yield take the line cycle; map refuses
 * it. */
#include "runbin.h"
#include "testkit.h"

#include <libxml/parser.h>
#include <libxml/tree.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#define LINE3 "tests/data/line-3level.xml"

static xmlNode *find(xmlNode *n, const char *name, const char *attr, const char *value)
{
    for (; n; n = n->next) {
        if (n->type == XML_ELEMENT_NODE && strcmp((const char *)n->name, name) == 0) {
            xmlChar *v = attr ? xmlGetProp(n, (const xmlChar *)attr) : NULL;
            int match = !attr || (v && strcmp((const char *)v, value) == 0);
            xmlFree(v);
            if (match)
                return n;
        }
        xmlNode *in = find(n->children, name, attr, value);
        if (in)
            return in;
    }
    return NULL;
}

static double num(xmlNode *n, const char *attr)
{
    xmlChar *v = n ? xmlGetProp(n, (const xmlChar *)attr) : NULL;
    double x = v ? strtod((const char *)v, NULL) : NAN;
    xmlFree(v);
    return x;
}

/* The lowest value of CSV column col over the rows of series `series`,
 * and the t_s of that row. */
static double csv_min(const char *csv, const char *series, const char *col, double *t_at)
{
    const char *head_end = strchr(csv, '\n');
    int idx = -1, i = 0;
    for (const char *p = csv; p && p < head_end; i++) {
        size_t len = strcspn(p, ",\n");
        if (strlen(col) == len && strncmp(p, col, len) == 0)
            idx = i;
        p = p[len] == ',' ? p + len + 1 : NULL;
    }
    CU_ASSERT_TRUE_FATAL(idx >= 0);
    double best = HUGE_VAL;
    for (const char *line = head_end + 1; *line; line = strchr(line, '\n') + 1) {
        if (strncmp(line, series, strlen(series)) == 0 && line[strlen(series)] == ',') {
            const char *f = line;
            for (int k = 0; k < idx; k++)
                f = strchr(f, ',') + 1;
            double v = strtod(f, NULL), t = strtod(strchr(line, ',') + 1, NULL);
            if (v < best) {
                best = v;
                *t_at = t;
            }
        }
        if (!strchr(line, '\n'))
            break;
    }
    return best;
}

static int count_lines(const char *s, const char *prefix)
{
    int n = 0;
    for (const char *p = s; p && *p; p = strchr(p, '\n') ? strchr(p, '\n') + 1 : NULL)
        n += strncmp(p, prefix, strlen(prefix)) == 0;
    return n;
}

/* The steady state of a line cycle, written four ways: the XML names the
 * line cycle and where each rail is at its lowest; the CSV holds one
 * line-min and one line-max row per switching period of the line (50),
 * whose lowest driver supply of the binding rail is the XML's (to the
 * CSV's 7 digits) in the row at the XML's line phase; the text shows the
 * same figure; the plot draws the current, the duty and every rail. */
static void test_steady_files_agree(void)
{
    char dir[] = "/tmp/br-line-XXXXXX", xml[128], csv[128], svg[128];
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(dir));
    snprintf(xml, sizeof xml, "%s/s.xml", dir);
    snprintf(csv, sizeof csv, "%s/s.csv", dir);
    snprintf(svg, sizeof svg, "%s/s.svg", dir);
    run_result r =
        run((const char *[]){"steady", LINE3, "--xml", xml, "--csv", csv, "--plot", svg, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(has(r.out, "steady state over the line cycle: 2 kHz line (50 switching"));
    CU_ASSERT_TRUE(has(r.out, "where in the line cycle"));
    CU_ASSERT_TRUE(has(r.out, "pass above minimum drive: binds at line phase"));
    xmlDoc *doc = xmlReadFile(xml, NULL, XML_PARSE_NONET);
    CU_ASSERT_PTR_NOT_NULL_FATAL(doc);
    xmlNode *root = xmlDocGetRootElement(doc);
    xmlNode *st = find(root, "steady", "direction", "line-cycle");
    CU_ASSERT_PTR_NOT_NULL_FATAL(st);
    BR_ASSERT_NEAR(num(st, "line-periods"), 50.0, 0.0);
    CU_ASSERT_PTR_NOT_NULL(find(root, "line-cycle", NULL, NULL));
    xmlNode *crit = find(root, "criterion", "name", "drive");
    CU_ASSERT_PTR_NOT_NULL_FATAL(crit);
    CU_ASSERT_TRUE(isfinite(num(crit, "line-phase-deg")) && isfinite(num(crit, "current-A")));
    xmlChar *sw = xmlGetProp(crit, (const xmlChar *)"switch");
    CU_ASSERT_PTR_NOT_NULL_FATAL(sw);
    xmlNode *rail = find(st, "rail", "switch", (const char *)sw);
    CU_ASSERT_PTR_NOT_NULL_FATAL(rail);
    double dmin = num(rail, "driver-min-V"), at = num(rail, "driver-min-at-deg");
    BR_ASSERT_REL(num(crit, "figure"), dmin, 1e-9);
    BR_ASSERT_NEAR(num(crit, "line-phase-deg"), at, 1e-9);
    char *c = br_test_slurp(csv, NULL), col[64];
    CU_ASSERT_PTR_NOT_NULL_FATAL(c);
    CU_ASSERT_EQUAL(count_lines(c, "line-min,"), 50);
    CU_ASSERT_EQUAL(count_lines(c, "line-max,"), 50);
    snprintf(col, sizeof col, "drv_%s_V", (const char *)sw);
    double t_at = NAN, cmin = csv_min(c, "line-min", col, &t_at);
    BR_ASSERT_REL(cmin, dmin, 1e-6);
    /* the row starts `phase` into its switching period; its centre is the
     * line phase reported (50 periods of 10 us: 7.2 deg each) */
    double centre = fmod((t_at + 5e-6) / 500e-6 * 360.0, 360.0);
    BR_ASSERT_NEAR(centre, at, 1e-6);
    char *s = br_test_slurp(svg, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(s);
    CU_ASSERT_TRUE(has(s, "data-panel=\"line-current\""));
    CU_ASSERT_TRUE(has(s, "data-panel=\"line-duty\""));
    CU_ASSERT_TRUE(has(s, "data-panel=\"line-A1\""));
    CU_ASSERT_TRUE(has(s, "data-series=\"rail_B2_V\""));
    free(c);
    free(s);
    xmlFree(sw);
    xmlFreeDoc(doc);
    done(&r);
    unlink(xml);
    unlink(csv);
    unlink(svg);
    rmdir(dir);
}

/* analyze: the verdict rows of the steady state name the line phase in
 * the current column; --quiet keeps the verdict line and the status. */
static void test_analyze(void)
{
    run_result r = run((const char *[]){"analyze", LINE3, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(has(r.out, "periodic steady state     pass"));
    CU_ASSERT_TRUE(has(r.out, " deg\n"));
    CU_ASSERT_TRUE(has(r.out, "start-up complete"));
    done(&r);
    r = run((const char *[]){"analyze", LINE3, "--quiet", NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(strncmp(r.out, "verdict: PASS", 13) == 0);
    done(&r);
}

/* window on a line cycle: the peak current and the line frequency, each
 * with its limits and what binds there (a rail and a line phase). */
static void test_window(void)
{
    char dir[] = "/tmp/br-linew-XXXXXX", xml[128];
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(dir));
    snprintf(xml, sizeof xml, "%s/w.xml", dir);
    run_result r = run((const char *[]){"window", LINE3, "--xml", xml, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(has(r.out, "peak current at 2 kHz line frequency: holds"));
    CU_ASSERT_TRUE(has(r.out, "line frequency at 10 A peak current: holds"));
    CU_ASSERT_TRUE(has(r.out, "at line phase"));
    xmlDoc *doc = xmlReadFile(xml, NULL, XML_PARSE_NONET);
    CU_ASSERT_PTR_NOT_NULL_FATAL(doc);
    xmlNode *root = xmlDocGetRootElement(doc);
    xmlNode *ipk = find(root, "sweep", "axis", "peak-current");
    CU_ASSERT_PTR_NOT_NULL_FATAL(ipk);
    CU_ASSERT_PTR_NOT_NULL(find(root, "sweep", "axis", "line-frequency"));
    BR_ASSERT_NEAR(num(ipk, "design-A"), 10.0, 1e-9);
    /* the lowest line frequency found holds and the next one down fails,
     * within the resolution, where a rail's drive runs out at a line phase
     * (the lower the line, the longer the rails dwell at the duty's
     * extremes) */
    xmlNode *fl = find(root, "sweep", "axis", "line-frequency");
    xmlNode *lim = find(fl, "limit", "end", "min");
    CU_ASSERT_PTR_NOT_NULL_FATAL(lim);
    xmlChar *kind = xmlGetProp(lim, (const xmlChar *)"kind");
    CU_ASSERT_TRUE(kind && strcmp((const char *)kind, "found") == 0);
    double in = num(lim, "holds-at-Hz"), out = num(lim, "fails-at-Hz");
    CU_ASSERT_TRUE(in < 2000.0 && out < in && in / out - 1.0 <= 0.01 * 1.001);
    CU_ASSERT_TRUE(isfinite(num(find(lim, "fails", NULL, NULL), "line-phase-deg")));
    xmlFree(kind);
    xmlFreeDoc(doc);
    done(&r);
    unlink(xml);
    rmdir(dir);
}

/* corners and yield take the line cycle's parameters and judge each point
 * over the line cycle; map refuses a line cycle with the reason. */
static void test_tolerances(void)
{
    run_result r = run((const char *[]){"corners", LINE3, "--no-startup", NULL});
    CU_ASSERT_TRUE(r.status == 1 || r.status == 0);
    CU_ASSERT_TRUE(has(r.out, "line-cycle: peak-current"));
    CU_ASSERT_TRUE(has(r.out, "9 A"));
    done(&r);
    r = run((const char *[]){"yield", LINE3, "--samples", "6", "--threads", "1", NULL});
    CU_ASSERT_TRUE(r.status == 1 || r.status == 0);
    CU_ASSERT_TRUE(has(r.out, "6 samples"));
    CU_ASSERT_TRUE(has(r.out, "line cycle: each sample's steady state is solved over the whole"));
    done(&r);
    r = run((const char *[]){"map", LINE3, "--duty", "0.2:0.8:3", "--freq", "50k:200k:3", NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_TRUE(has(r.err, "line-3level.xml:13: operating-point: line-cycle: map moves"));
    done(&r);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"steady: text, XML, CSV and plot agree", test_steady_files_agree},
        {"analyze names the line phase", test_analyze},
        {"window: peak current and line frequency", test_window},
        {"corners, yield; map refuses", test_tolerances},
        {NULL, NULL},
    };
    if (chdir(BR_SOURCE_DIR) != 0)
        return 2;
    return br_test_main("cli_line", cases);
}

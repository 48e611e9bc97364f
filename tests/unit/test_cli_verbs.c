/* test_cli_verbs.c - the analysis verbs (startup, steady, analyze) as a
 * user meets them: exit statuses, the report's rows, the --xml file parsed
 * back, the --csv file's shape, bad input and output that cannot be
 * written.  Numbers change as the engine is tuned, so these checks are
 * structural; only the help texts are golden (tests/golden/). */
#include "analyses/figures.h"
#include "runbin.h"
#include "testkit.h"

#include <dirent.h>
#include <fcntl.h>
#include <libxml/parser.h>
#include <spawn.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

static int count_char(const char *s, char ch)
{
    int n = 0;
    for (; *s; s++)
        n += *s == ch;
    return n;
}

/* A fresh temporary directory for output files. */
static void temp_dir(char *path, size_t cap)
{
    snprintf(path, cap, "/tmp/br-verbs-XXXXXX");
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(path));
}

/* Number of entries in dir besides . and .. */
static int entries(const char *dir)
{
    DIR *d = opendir(dir);
    int n = 0;
    for (struct dirent *e; d && (e = readdir(d));)
        n += strcmp(e->d_name, ".") != 0 && strcmp(e->d_name, "..") != 0;
    if (d)
        closedir(d);
    return n;
}

/* The chain of a design file, through the library. */
static br_chain *load_chain(const char *path, br_design **d)
{
    br_chain *c = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(path, d, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_chain_build(*d, &c, &err), BR_OK);
    return c;
}

/* Copy file src to dst (a small text file). */
static void copy_file(const char *src, const char *dst)
{
    size_t len = 0;
    char *text = br_test_slurp(src, &len);
    CU_ASSERT_PTR_NOT_NULL_FATAL(text);
    FILE *f = fopen(dst, "wb");
    CU_ASSERT_PTR_NOT_NULL_FATAL(f);
    CU_ASSERT_EQUAL(fwrite(text, 1, len, f), len);
    fclose(f);
    free(text);
}

/* A path in dir that two options name at once. */
static const char *xml_twice_path(const char *dir)
{
    static char path[128];
    snprintf(path, sizeof path, "%s/twice.out", dir);
    return path;
}

/* Parse the XML a verb wrote to stdout; the root's attribute attr must
 * read want (what the path becomes in XML). */
static void expect_xml_attr(const run_result *r, const char *attr, const char *want)
{
    xmlDoc *doc = xmlReadMemory(r->out, (int)strlen(r->out), "stdout.xml", NULL,
                                XML_PARSE_NONET | XML_PARSE_NOERROR | XML_PARSE_NOWARNING);
    CU_ASSERT_PTR_NOT_NULL_FATAL(doc);
    xmlNode *root = xmlDocGetRootElement(doc);
    xmlChar *v = root ? xmlGetProp(root, (const xmlChar *)attr) : NULL;
    CU_ASSERT_PTR_NOT_NULL(v);
    if (v)
        CU_ASSERT_STRING_EQUAL((const char *)v, want);
    xmlFree(v);
    xmlFreeDoc(doc);
}

/* ---- the XML result file ------------------------------------------------ */

static int count_elements(xmlNode *n, const char *name)
{
    int k = 0;
    for (; n; n = n->next) {
        if (n->type == XML_ELEMENT_NODE && strcmp((const char *)n->name, name) == 0)
            k++;
        k += count_elements(n->children, name);
    }
    return k;
}

static xmlNode *find_element(xmlNode *n, const char *name)
{
    for (; n; n = n->next) {
        if (n->type == XML_ELEMENT_NODE && strcmp((const char *)n->name, name) == 0)
            return n;
        xmlNode *in = find_element(n->children, name);
        if (in)
            return in;
    }
    return NULL;
}

static double attr_num(xmlNode *n, const char *name)
{
    xmlChar *v = n ? xmlGetProp(n, (const xmlChar *)name) : NULL;
    double x = v ? strtod((const char *)v, NULL) : NAN;
    xmlFree(v);
    return x;
}

static int attr_is(xmlNode *n, const char *name, const char *want)
{
    xmlChar *v = n ? xmlGetProp(n, (const xmlChar *)name) : NULL;
    int ok = v && strcmp((const char *)v, want) == 0;
    xmlFree(v);
    return ok;
}

/* What a result file must hold for a verb on a chain of n stages with
 * ndir directions; returns the document (caller frees) or NULL. */
static xmlDoc *check_xml(const char *path, const char *verb, int n, int ndir, int status)
{
    xmlDoc *doc = xmlReadFile(path, NULL, XML_PARSE_NONET);
    CU_ASSERT_PTR_NOT_NULL(doc);
    if (!doc)
        return NULL;
    xmlNode *root = xmlDocGetRootElement(doc);
    CU_ASSERT_STRING_EQUAL(root->name, "bootrung-results");
    CU_ASSERT_TRUE(attr_is(root, "verb", verb));
    int startup = strcmp(verb, "steady") != 0, steady = strcmp(verb, "startup") != 0;
    CU_ASSERT_EQUAL(count_elements(root, "startup"), startup);
    CU_ASSERT_EQUAL(count_elements(root, "stage"), startup ? n : 0);
    CU_ASSERT_EQUAL(count_elements(root, "steady"), steady ? ndir : 0);
    CU_ASSERT_EQUAL(count_elements(root, "rail"), steady ? ndir * n : 0);
    CU_ASSERT_EQUAL(count_elements(root, "link"), steady ? ndir * (n - 1) : 0);
    /* start-up judges its criteria, steady the others */
    int nsu = 0;
    for (int i = 0; i < BR_CRIT_COUNT; i++)
        nsu += br_crit_is_startup(i);
    CU_ASSERT_EQUAL(nsu, 4);
    int ncrit = startup && steady ? BR_CRIT_COUNT : startup ? nsu : BR_CRIT_COUNT - nsu;
    CU_ASSERT_EQUAL(count_elements(root, "criterion"), ncrit);
    CU_ASSERT_TRUE(attr_is(find_element(root, "verdict"), "pass", status == 0 ? "true" : "false"));
    xmlNode *caution = find_element(root, "caution");
    xmlChar *text = caution ? xmlNodeGetContent(caution) : NULL;
    CU_ASSERT_TRUE(text && strstr((const char *)text, "lethal voltages"));
    xmlFree(text);
    return doc;
}

/* ---- the CSV time series ------------------------------------------------- */

typedef struct csv_series {
    char label[32];
    int rows;
    double t_first, t_last;
    int monotonic; /* time never goes back within the series */
} csv_series;

/* Check the header and every row's field count; summarise each series. */
static int check_csv(const char *path, int n, csv_series *s, int cap)
{
    char *csv = br_test_slurp(path, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(csv);
    CU_ASSERT_TRUE(strncmp(csv, "series,t_s,rail_", 16) == 0);
    /* series, time; rails, the supply's current, the links' forward and
     * displacement currents; driver supplies and reverse voltages */
    int fields = 2 + 2 * (n + (n - 1)) + 1 + (n - 1), ns = 0, bad = 0;
    char *save = NULL;
    char *line = strtok_r(csv, "\n", &save);
    CU_ASSERT_EQUAL(count_char(line, ',') + 1, fields);
    while ((line = strtok_r(NULL, "\n", &save))) {
        bad += count_char(line, ',') + 1 != fields;
        char label[32];
        double t;
        if (sscanf(line, "%31[^,],%lf", label, &t) != 2) {
            bad++;
            continue;
        }
        if (ns == 0 || strcmp(s[ns - 1].label, label) != 0) {
            if (ns == cap)
                break;
            snprintf(s[ns].label, sizeof s[ns].label, "%s", label);
            s[ns].t_first = t;
            s[ns].monotonic = 1;
            s[ns++].rows = 0;
        }
        csv_series *cur = &s[ns - 1];
        if (cur->rows > 0 && t < cur->t_last)
            cur->monotonic = 0;
        cur->t_last = t;
        cur->rows++;
    }
    CU_ASSERT_EQUAL(bad, 0);
    free(csv);
    return ns;
}

/* One steady series covers exactly one period from the quiet phase: its
 * first row is at phase-s, its last at phase-s + T (README, "CSV"). */
static void check_steady_series(const csv_series *s, xmlNode *steady, double T)
{
    double phase = attr_num(steady, "phase-s");
    CU_ASSERT_TRUE(s->monotonic);
    CU_ASSERT_TRUE(s->rows >= 10);
    BR_ASSERT_NEAR(s->t_last - phase, T, 1e-6 * T);
    BR_ASSERT_NEAR(s->t_first, phase, 1e-9 * T);
}

/* ---- cases ----------------------------------------------------------------- */

static void expect_names(const br_chain *c, const char *out)
{
    for (int k = 0; k < c->n; k++) {
        char cell[BR_ID_MAX + 8];
        snprintf(cell, sizeof cell, "  %s  ", c->st[k].name);
        CU_ASSERT_TRUE(has(out, cell));
    }
}

/* analyze with every output on a design; returns the exit status. */
static int analyze_fully(const char *design)
{
    char dir[64], xml[96], csv[96];
    temp_dir(dir, sizeof dir);
    snprintf(xml, sizeof xml, "%s/r.xml", dir);
    snprintf(csv, sizeof csv, "%s/r.csv", dir);
    br_design *d = NULL;
    br_chain *c = load_chain(design, &d);
    int dirs[2], ndir = br_design_directions(c, dirs);
    run_result r = run((const char *[]){"analyze", "--xml", xml, "--csv", csv, design, NULL});
    if (r.status != 0 && r.status != 1)
        fprintf(stderr, "%s: %s", design, r.err);
    CU_ASSERT_TRUE(r.status == 0 || r.status == 1);
    CU_ASSERT_STRING_EQUAL(r.err, "");
    expect_names(c, r.out);
    for (int i = 0; i < BR_CRIT_COUNT; i++)
        CU_ASSERT_TRUE(has(r.out, br_crit_title(i)));
    CU_ASSERT_TRUE(has(r.out, r.status == 0 ? "verdict: PASS" : "verdict: FAIL"));
    CU_ASSERT_TRUE(has(r.out, "These circuits carry lethal voltages."));
    xmlDoc *doc = check_xml(xml, "analyze", c->n, ndir, r.status);
    csv_series s[8];
    int ns = check_csv(csv, c->n, s, 8);
    CU_ASSERT_EQUAL(ns, 1 + ndir);
    CU_ASSERT_STRING_EQUAL(s[0].label, "startup");
    CU_ASSERT_TRUE(s[0].monotonic && s[0].rows >= 10);
    xmlNode *st = doc ? find_element(xmlDocGetRootElement(doc), "steady") : NULL;
    for (int i = 1; i < ns && st; i++, st = xmlNextElementSibling(st))
        check_steady_series(&s[i], st, c->T);
    xmlFreeDoc(doc);
    unlink(xml);
    unlink(csv);
    rmdir(dir);
    br_chain_free(c);
    br_design_free(d);
    done(&r);
    return r.status;
}

/* The demo passes: examples/run.sh shows a design that works. */
static void test_analyze_demo(void)
{
    CU_ASSERT_EQUAL(analyze_fully("examples/leg-7level.xml"), 0);
}

static void test_analyze_examples(void)
{
    analyze_fully("examples/demo-3level.xml");
    analyze_fully("tests/data/ref-c1.xml");
}

/* ref-c2 starts (the reference simulator has every rail running by
 * 0.27 ms, tests/data/reference/c2.json). */
static void test_startup(void)
{
    char dir[64], xml[96];
    temp_dir(dir, sizeof dir);
    snprintf(xml, sizeof xml, "%s/s.xml", dir);
    br_design *d = NULL;
    br_chain *c = load_chain("tests/data/ref-c2.xml", &d);
    run_result r = run((const char *[]){"startup", "tests/data/ref-c2.xml", "--xml", xml, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_STRING_EQUAL(r.err, "");
    expect_names(c, r.out);
    CU_ASSERT_TRUE(has(r.out, "start-up complete after "));
    /* the verdict of the start-up criteria alone */
    CU_ASSERT_TRUE(has(r.out, "verdict: PASS"));
    for (int i = 0; i < BR_CRIT_COUNT; i++)
        CU_ASSERT_EQUAL(strstr(r.out, br_crit_title(i)) != NULL, br_crit_is_startup(i));
    xmlDoc *doc = check_xml(xml, "startup", c->n, 0, r.status);
    xmlNode *su = doc ? find_element(xmlDocGetRootElement(doc), "startup") : NULL;
    CU_ASSERT_TRUE(attr_is(su, "complete", "true"));
    CU_ASSERT_TRUE(attr_num(su, "total-s") > 0);
    /* by envelope following (the default): how many periods of each kind */
    CU_ASSERT_TRUE(attr_is(su, "method", "envelope"));
    double integrated = attr_num(su, "periods-integrated"),
           stepped = attr_num(su, "periods-stepped");
    CU_ASSERT_TRUE(integrated > 0 && stepped > 0);
    char line[160];
    snprintf(line, sizeof line, "  %.0f periods: %.0f integrated, %.0f stepped over",
             integrated + stepped, integrated, stepped);
    CU_ASSERT_TRUE(has(r.out, line));
    xmlFreeDoc(doc);
    done(&r);
    /* every period integrated: the same periods, the report says so */
    r = run((const char *[]){"startup", "--startup-method", "periods", "tests/data/ref-c2.xml",
                             "--xml", xml, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    snprintf(line, sizeof line, "  %.0f periods, every one integrated", integrated + stepped);
    CU_ASSERT_TRUE(has(r.out, line));
    doc = check_xml(xml, "startup", c->n, 0, r.status);
    su = doc ? find_element(xmlDocGetRootElement(doc), "startup") : NULL;
    CU_ASSERT_TRUE(attr_is(su, "method", "periods"));
    CU_ASSERT_TRUE(attr_num(su, "periods-stepped") == 0);
    xmlFreeDoc(doc);
    unlink(xml);
    rmdir(dir);
    br_chain_free(c);
    br_design_free(d);
    done(&r);
}

static void test_steady(void)
{
    char dir[64], xml[96], csv[96];
    temp_dir(dir, sizeof dir);
    snprintf(xml, sizeof xml, "%s/s.xml", dir);
    snprintf(csv, sizeof csv, "%s/s.csv", dir);
    br_design *d = NULL;
    br_chain *c = load_chain("tests/data/ref-c1.xml", &d);
    run_result r =
        run((const char *[]){"steady", "--csv", csv, "tests/data/ref-c1.xml", "--xml", xml, NULL});
    CU_ASSERT_TRUE(r.status == 0 || r.status == 1);
    expect_names(c, r.out);
    CU_ASSERT_TRUE(has(r.out, "found by "));
    CU_ASSERT_TRUE(has(r.out, "margins of the driver supply"));
    CU_ASSERT_PTR_NULL(strstr(r.out, br_crit_title(BR_CRIT_STARTUP)));
    xmlDoc *doc = check_xml(xml, "steady", c->n, 1, r.status);
    csv_series s[4];
    CU_ASSERT_EQUAL(check_csv(csv, c->n, s, 4), 1);
    CU_ASSERT_STRING_EQUAL(s[0].label, "steady");
    if (doc)
        check_steady_series(&s[0], find_element(xmlDocGetRootElement(doc), "steady"), c->T);
    xmlFreeDoc(doc);
    unlink(xml);
    unlink(csv);
    rmdir(dir);
    br_chain_free(c);
    br_design_free(d);
    done(&r);
}

/* A copy of design src at path with the first `from` replaced by `to`. */
static void design_variant(const char *src_path, const char *from, const char *to, const char *path)
{
    char *src = br_test_slurp(src_path, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(src);
    char *at = strstr(src, from);
    CU_ASSERT_PTR_NOT_NULL_FATAL(at);
    FILE *f = fopen(path, "w");
    CU_ASSERT_PTR_NOT_NULL_FATAL(f);
    fprintf(f, "%.*s%s%s", (int)(at - src), src, to, at + strlen(from));
    fclose(f);
    free(src);
}

/* The line of text that starts with prefix, copied into line. */
static int line_of(const char *text, const char *prefix, char *line, size_t cap)
{
    for (const char *p = text; p && *p;) {
        const char *nl = strchr(p, '\n');
        size_t n = nl ? (size_t)(nl - p) : strlen(p);
        if (strncmp(p, prefix, strlen(prefix)) == 0) {
            snprintf(line, cap, "%.*s", (int)n, p);
            return 1;
        }
        p = nl ? nl + 1 : NULL;
    }
    line[0] = '\0';
    return 0;
}

/* The <criterion> of the verdict named name. */
static xmlNode *criterion(xmlDoc *doc, const char *name)
{
    xmlNode *v = doc ? find_element(xmlDocGetRootElement(doc), "verdict") : NULL;
    for (xmlNode *n = v ? v->children : NULL; n; n = n->next)
        if (n->type == XML_ELEMENT_NODE && attr_is(n, "name", name))
            return n;
    return NULL;
}

static int has_attr(xmlNode *n, const char *name)
{
    return n && xmlHasProp(n, (const xmlChar *)name) != NULL;
}

/* The verdict row of a rail that never starts: FAIL, "never starts" in
 * place of a start-up time, no margin, and the note says where it
 * settles (before: the time simulated against the limit, a margin of
 * minus one period, a near miss). */
static void check_never_row(const char *out)
{
    char row[256];
    CU_ASSERT_TRUE_FATAL(line_of(out, "  start-up time", row, sizeof row));
    CU_ASSERT_PTR_NOT_NULL(strstr(row, " FAIL "));
    CU_ASSERT_PTR_NOT_NULL(strstr(row, "never starts"));
    CU_ASSERT_PTR_NOT_NULL(strstr(row, " 20 ms  "));
    CU_ASSERT_PTR_NOT_NULL(strstr(row, " -  rail "));
    CU_ASSERT_PTR_NULL(strstr(row, " us"));
    CU_ASSERT_TRUE(has(out, "FAIL start-up time: rail "));
    CU_ASSERT_TRUE(has(out, "never starts: it settles at "));
}

/* ref-c2 with UVLO thresholds the upper rails cannot reach (each link
 * costs about half a volt): the start-up fails, status 1, and the report
 * says which rail never starts, where it settles and what its link
 * carries, in the text, the XML and the HTML of startup and analyze. */
static void test_startup_stall(void)
{
    char dir[64], path[96], xml[96], html[96];
    temp_dir(dir, sizeof dir);
    snprintf(path, sizeof path, "%s/stall.xml", dir);
    snprintf(xml, sizeof xml, "%s/stall-r.xml", dir);
    snprintf(html, sizeof html, "%s/stall-r.html", dir);
    design_variant("tests/data/ref-c2.xml", "uvlo-rise=\"7.5 V\" uvlo-fall=\"7.0 V\"",
                   "uvlo-rise=\"10.6 V\" uvlo-fall=\"10.0 V\"", path);
    run_result r = run((const char *[]){"startup", path, NULL});
    CU_ASSERT_EQUAL(r.status, 1);
    CU_ASSERT_TRUE(has(r.out, "start-up INCOMPLETE"));
    CU_ASSERT_TRUE(has(r.out, "below UVLO"));
    CU_ASSERT_TRUE(has(r.out, "passes"));
    CU_ASSERT_TRUE(has(r.out, "drivers not running at the end:"));
    check_never_row(r.out);
    done(&r);
    r = run((const char *[]){"analyze", path, "--xml", xml, "--report", html, NULL});
    CU_ASSERT_EQUAL(r.status, 1);
    check_never_row(r.out);
    done(&r);
    xmlDoc *doc = xmlReadFile(xml, NULL, XML_PARSE_NONET);
    xmlNode *row = criterion(doc, "startup");
    CU_ASSERT_PTR_NOT_NULL_FATAL(row);
    CU_ASSERT_TRUE(attr_is(row, "result", "fail"));
    CU_ASSERT_TRUE(attr_is(row, "never-starts", "true"));
    CU_ASSERT_FALSE(has_attr(row, "figure"));
    CU_ASSERT_FALSE(has_attr(row, "margin"));
    BR_ASSERT_NEAR(attr_num(row, "limit"), 20e-3, 1e-12);
    xmlChar *note = xmlGetProp(row, (const xmlChar *)"note");
    CU_ASSERT_TRUE(note && strstr((const char *)note, "never starts: it settles at "));
    xmlFree(note);
    xmlFreeDoc(doc);
    char *page = br_test_slurp(html, NULL);
    CU_ASSERT_TRUE(page && has(page, "<td>never starts</td>"));
    CU_ASSERT_TRUE(page && has(page, "never starts: it settles at "));
    free(page);
    unlink(path);
    unlink(xml);
    unlink(html);
    rmdir(dir);
}

/* The stage of a <startup> element with the most dropouts, and how many. */
static int most_dropouts(xmlDoc *doc, int *stage)
{
    xmlNode *su = doc ? find_element(xmlDocGetRootElement(doc), "startup") : NULL;
    int most = -1;
    for (xmlNode *n = su ? su->children : NULL; n; n = n->next) {
        if (n->type != XML_ELEMENT_NODE || strcmp((const char *)n->name, "stage") != 0)
            continue;
        int k = (int)attr_num(n, "dropouts");
        if (k > most) {
            most = k;
            *stage = (int)attr_num(n, "index");
        }
    }
    return most;
}

/* Start-up dropouts are a criterion: ref-c2 hiccups up to 9 times on one
 * stage (the reference simulator's count too, tests/data/reference/c2.json),
 * more than the warning level of a design without a limit: startup passes
 * with a warning (status 0) naming that stage; a stated limit below the
 * count fails (status 1, startup and analyze alike), one above it passes
 * without a word. */
static void test_dropouts(void)
{
    char dir[64], tight[96], loose[96];
    temp_dir(dir, sizeof dir);
    snprintf(tight, sizeof tight, "%s/tight.xml", dir);
    snprintf(loose, sizeof loose, "%s/loose.xml", dir);
    const char *title = br_crit_title(BR_CRIT_DROPOUTS);
    char row[256];
    run_result r = run((const char *[]){"startup", "tests/data/ref-c2.xml", "--xml", "-", NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    xmlDoc *doc = xmlReadMemory(r.out, (int)strlen(r.out), "s.xml", NULL, XML_PARSE_NONET);
    int stage = -1, most = most_dropouts(doc, &stage);
    CU_ASSERT_TRUE(most > BR_DROPOUTS_WARN);
    xmlNode *n = criterion(doc, "dropouts");
    CU_ASSERT_TRUE(attr_is(n, "result", "pass") && attr_is(n, "warn", "true"));
    BR_ASSERT_NEAR(attr_num(n, "figure"), most, 0.0);
    BR_ASSERT_NEAR(attr_num(n, "limit"), BR_DROPOUTS_WARN, 0.0);
    BR_ASSERT_NEAR(attr_num(n, "stage"), stage, 0.0);
    xmlFreeDoc(doc);
    done(&r);
    r = run((const char *[]){"startup", "tests/data/ref-c2.xml", NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(line_of(r.out, "  start-up dropouts", row, sizeof row));
    CU_ASSERT_PTR_NOT_NULL(strstr(row, " WARN "));
    CU_ASSERT_TRUE(has(r.out, "1 with a warning"));
    CU_ASSERT_TRUE(has(r.out, "dropped out"));
    done(&r);
    const char *end = "</bootrung-design>";
    design_variant("tests/data/ref-c2.xml", end,
                   "  <analysis max-dropouts=\"4\"/>\n</bootrung-design>", tight);
    design_variant("tests/data/ref-c2.xml", end,
                   "  <analysis max-dropouts=\"20\"/>\n</bootrung-design>", loose);
    static const char *const verbs[] = {"startup", "analyze"};
    for (int i = 0; i < 2; i++) {
        r = run((const char *[]){verbs[i], tight, NULL});
        CU_ASSERT_EQUAL(r.status, 1);
        CU_ASSERT_TRUE(line_of(r.out, "  start-up dropouts", row, sizeof row));
        CU_ASSERT_PTR_NOT_NULL(strstr(row, " FAIL "));
        CU_ASSERT_TRUE(has(r.out, "the design allows 4"));
        done(&r);
    }
    r = run((const char *[]){"startup", loose, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(line_of(r.out, "  start-up dropouts", row, sizeof row));
    CU_ASSERT_PTR_NOT_NULL(strstr(row, " pass "));
    CU_ASSERT_PTR_NULL(strstr(r.out, "WARN"));
    CU_ASSERT_TRUE(has(r.out, title));
    done(&r);
    unlink(tight);
    unlink(loose);
    rmdir(dir);
}

static void test_bad_input(void)
{
    static const char *const verbs[] = {"startup", "steady", "analyze"};
    for (int i = 0; i < 3; i++) {
        run_result r = run((const char *[]){verbs[i], "tests/bad/uvlo-inverted.xml", NULL});
        CU_ASSERT_EQUAL(r.status, 2);
        CU_ASSERT_STRING_EQUAL(r.out, "");
        CU_ASSERT_EQUAL(count_char(r.err, '\n'), 1);
        CU_ASSERT_TRUE(strncmp(r.err, "bootrung: tests/bad/uvlo-inverted.xml:", 38) == 0);
        done(&r);
        r = run((const char *[]){verbs[i], "no/such/design.xml", NULL});
        CU_ASSERT_EQUAL(r.status, 2);
        CU_ASSERT_STRING_EQUAL(r.out, "");
        done(&r);
    }
}

static void test_bad_usage(void)
{
    const char *const *cases[] = {
        (const char *[]){"analyze", NULL},
        (const char *[]){"steady", "--xml", NULL},
        (const char *[]){"startup", "--csv=", "tests/data/ref-c1.xml", NULL},
        (const char *[]){"analyze", "--xml", "-", "--csv", "-", "tests/data/ref-c1.xml", NULL},
        (const char *[]){"analyze", "--strict", "tests/data/ref-c1.xml", NULL},
        (const char *[]){"startup", "--startup-method", "every", "tests/data/ref-c1.xml", NULL},
        (const char *[]){"yield", "--startup-method=", "tests/data/ref-c1.xml", NULL},
        (const char *[]){"steady", "--startup-method", "periods", "tests/data/ref-c1.xml", NULL},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        run_result r = run(cases[i]);
        CU_ASSERT_EQUAL(r.status, 2);
        CU_ASSERT_STRING_EQUAL(r.out, "");
        CU_ASSERT_EQUAL(count_char(r.err, '\n'), 1);
        done(&r);
    }
}

/* An output that cannot be written: status 2, one line naming it, no
 * report on stdout, and nothing left behind (no file, no temporary). */
static void test_write_failure(void)
{
    char dir[64], missing[128], isdir[96];
    temp_dir(dir, sizeof dir);
    snprintf(missing, sizeof missing, "%s/no/such/dir/r.xml", dir);
    run_result r =
        run((const char *[]){"startup", "--xml", missing, "tests/data/ref-c1.xml", NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_STRING_EQUAL(r.out, "");
    CU_ASSERT_EQUAL(count_char(r.err, '\n'), 1);
    CU_ASSERT_TRUE(has(r.err, missing));
    done(&r);
    CU_ASSERT_EQUAL(entries(dir), 0);
    /* a directory in the way: the temporary file is written, the rename
     * fails, and the temporary must go */
    snprintf(isdir, sizeof isdir, "%s/r.csv", dir);
    CU_ASSERT_EQUAL_FATAL(mkdir(isdir, 0755), 0);
    r = run((const char *[]){"startup", "--csv", isdir, "tests/data/ref-c1.xml", NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_STRING_EQUAL(r.out, "");
    CU_ASSERT_EQUAL(entries(dir), 1);
    struct stat sb;
    CU_ASSERT_TRUE(stat(isdir, &sb) == 0 && S_ISDIR(sb.st_mode));
    done(&r);
    rmdir(isdir);
    rmdir(dir);
}

/* All the outputs or none: a later file that cannot be written, or a
 * stdout that cannot take the report, leaves no earlier file behind. */
static void test_all_or_nothing(void)
{
    char dir[64], xml[96], csv[128], svg[96];
    temp_dir(dir, sizeof dir);
    snprintf(xml, sizeof xml, "%s/r.xml", dir);
    snprintf(svg, sizeof svg, "%s/r.svg", dir);
    snprintf(csv, sizeof csv, "%s/no/such/dir/r.csv", dir);
    run_result r = run((const char *[]){"startup", "--xml", xml, "--plot", svg, "--csv", csv,
                                        "tests/data/ref-c1.xml", NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_STRING_EQUAL(r.out, "");
    CU_ASSERT_TRUE(has(r.err, csv));
    done(&r);
    CU_ASSERT_EQUAL(entries(dir), 0);
    if (access("/dev/full", W_OK) == 0) { /* the report cannot be written */
        r = run_to("/dev/full",
                   (const char *[]){"startup", "--xml", xml, "tests/data/ref-c1.xml", NULL});
        CU_ASSERT_EQUAL(r.status, 2);
        CU_ASSERT_TRUE(has(r.err, "cannot write to standard output"));
        done(&r);
        CU_ASSERT_EQUAL(entries(dir), 0);
    }
    rmdir(dir);
}

/* An output path that is an input (the design itself, through a symbolic
 * or a hard link too) is refused before anything runs; the file is left
 * as it was. */
static void test_output_is_input(void)
{
    char dir[64], design[96], sym[96], hard[96];
    temp_dir(dir, sizeof dir);
    snprintf(design, sizeof design, "%s/d.xml", dir);
    snprintf(sym, sizeof sym, "%s/sym.xml", dir);
    snprintf(hard, sizeof hard, "%s/hard.xml", dir);
    copy_file("tests/data/ref-c1.xml", design);
    CU_ASSERT_EQUAL_FATAL(symlink("d.xml", sym), 0);
    CU_ASSERT_EQUAL_FATAL(link(design, hard), 0);
    size_t before = 0;
    char *was = br_test_slurp(design, &before);
    const char *const *cases[] = {
        (const char *[]){"startup", "--xml", design, design, NULL},
        (const char *[]){"analyze", "--csv", sym, design, NULL},
        (const char *[]){"steady", "--report", hard, design, NULL},
        (const char *[]){"window", "--plot", design, sym, NULL},
        (const char *[]){"corners", "--xml", hard, sym, NULL},
        (const char *[]){"yield", "--csv", design, design, NULL},
        (const char *[]){"map", "--duty", "0.4:0.6:2", "--freq", "100k:200k:2", "--svg", sym,
                         design, NULL},
        (const char *[]){"pick", "--catalog", design, "--xml", sym, "tests/data/ref-c1.xml", NULL},
        (const char *[]){"startup", "--xml", xml_twice_path(dir), "--csv", xml_twice_path(dir),
                         design, NULL},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        run_result r = run(cases[i]);
        CU_ASSERT_EQUAL(r.status, 2);
        CU_ASSERT_STRING_EQUAL(r.out, "");
        CU_ASSERT_EQUAL(count_char(r.err, '\n'), 1);
        CU_ASSERT_TRUE(has(r.err, i + 1 < sizeof cases / sizeof cases[0] ? "is the input file"
                                                                         : "both write"));
        done(&r);
    }
    size_t after = 0;
    char *now = br_test_slurp(design, &after);
    CU_ASSERT_TRUE(was && now && before == after && memcmp(was, now, before) == 0);
    free(was);
    free(now);
    CU_ASSERT_EQUAL(entries(dir), 3); /* nothing written beside them */
    unlink(sym);
    unlink(hard);
    unlink(design);
    rmdir(dir);
}

/* --quiet prints the start-up's verdict line also when it is undetermined.  A
 * 100 fF rail behind a 12 V supply and a 1 ohm link charges in about
 * 100 fs, far below what the integrator can step: it stops at once. */
static void test_quiet_undetermined(void)
{
    char dir[64], design[96];
    temp_dir(dir, sizeof dir);
    snprintf(design, sizeof design, "%s/tiny.xml", dir);
    size_t len = 0;
    char *text = br_test_slurp("tests/data/ref-c1.xml", &len);
    CU_ASSERT_PTR_NOT_NULL_FATAL(text);
    char *at = strstr(text, "c=\"1 uF\"");
    CU_ASSERT_PTR_NOT_NULL_FATAL(at);
    FILE *f = fopen(design, "w");
    CU_ASSERT_PTR_NOT_NULL_FATAL(f);
    fprintf(f, "%.*sc=\"100 fF\"%s", (int)(at - text), text, at + strlen("c=\"1 uF\""));
    fclose(f);
    free(text);
    run_result r = run_limited(20.0, (const char *[]){"startup", "--quiet", design, NULL});
    CU_ASSERT_EQUAL(r.status, 3);
    CU_ASSERT_TRUE(strncmp(r.out, "verdict: UNDETERMINED, ", 23) == 0);
    CU_ASSERT_EQUAL(count_char(r.out, '\n'), 1);
    done(&r);
    unlink(design);
    rmdir(dir);
}

/* "--xml -" sends the XML to stdout in place of the text report. */
static void test_xml_to_stdout(void)
{
    run_result r = run((const char *[]){"startup", "--xml", "-", "tests/data/ref-c1.xml", NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(strncmp(r.out, "<?xml ", 6) == 0);
    xmlDoc *doc = xmlReadMemory(r.out, (int)strlen(r.out), "stdout.xml", NULL, XML_PARSE_NONET);
    CU_ASSERT_PTR_NOT_NULL(doc);
    xmlFreeDoc(doc);
    done(&r);
}

/* A design or catalog path is bytes in no particular encoding (a Latin-1
 * name, a control character): the result XML stays well-formed, the name
 * read as Latin-1 where it is not UTF-8 and a control character replaced
 * by U+FFFD.  By hand: 0xE9 is U+00E9, UTF-8 C3 A9; U+FFFD is EF BF BD. */
static void test_xml_path_not_utf8(void)
{
    char dir[64], design[128], odd[128], catalog[128];
    temp_dir(dir, sizeof dir);
    snprintf(design, sizeof design, "%s/caf\xE9.xml", dir);
    snprintf(odd, sizeof odd, "%s/ctl\x01.xml", dir);
    snprintf(catalog, sizeof catalog, "%s/parts\x1F\xE9.xml", dir);
    copy_file("tests/data/ref-c1.xml", design);
    copy_file("tests/data/ref-c1.xml", odd);
    FILE *f = fopen(catalog, "w");
    CU_ASSERT_PTR_NOT_NULL_FATAL(f);
    fputs("<?xml version=\"1.0\"?>\n<bootrung-catalog version=\"1\">\n"
          "<capacitor id=\"c\" c=\"1 uF\" rating=\"25 V\" cost=\"1\" area-mm2=\"2\"/>\n"
          "</bootrung-catalog>\n",
          f);
    fclose(f);
    char want[160], want_odd[160], want_cat[160];
    snprintf(want, sizeof want, "%s/caf\xC3\xA9.xml", dir);
    snprintf(want_odd, sizeof want_odd, "%s/ctl\xEF\xBF\xBD.xml", dir);
    snprintf(want_cat, sizeof want_cat, "%s/parts\xEF\xBF\xBD\xC3\xA9.xml", dir);
    const char *const *runs[] = {
        (const char *[]){"startup", "--xml", "-", design, NULL},
        (const char *[]){"steady", "--xml", "-", odd, NULL},
        (const char *[]){"window", "--xml", "-", design, NULL},
        (const char *[]){"corners", "--no-startup", "--xml", "-", odd, NULL},
        (const char *[]){"yield", "--samples", "8", "--xml", "-", design, NULL},
    };
    const char *wants[] = {want, want_odd, want, want_odd, want};
    for (size_t i = 0; i < sizeof runs / sizeof runs[0]; i++) {
        run_result r = run(runs[i]);
        CU_ASSERT_TRUE(r.status == 0 || r.status == 1);
        expect_xml_attr(&r, "file", wants[i]);
        done(&r);
    }
    run_result r = run((const char *[]){"pick", "--catalog", catalog, "--xml", "-", design, NULL});
    CU_ASSERT_TRUE(r.status == 0 || r.status == 1);
    xmlDoc *doc = xmlReadMemory(r.out, (int)strlen(r.out), "pick.xml", NULL,
                                XML_PARSE_NONET | XML_PARSE_NOERROR | XML_PARSE_NOWARNING);
    CU_ASSERT_PTR_NOT_NULL(doc);
    CU_ASSERT_PTR_NOT_NULL(strstr(r.out, want_cat));
    xmlFreeDoc(doc);
    done(&r);
    remove(design);
    remove(odd);
    remove(catalog);
    rmdir(dir);
}

static void test_help_golden(void)
{
    CU_ASSERT_TRUE(help_is_golden("startup"));
    CU_ASSERT_TRUE(help_is_golden("steady"));
    CU_ASSERT_TRUE(help_is_golden("analyze"));
}

int main(void)
{
    static const br_test_case cases[] = {
        {"analyze on the demo: passes, full outputs", test_analyze_demo},
        {"analyze on the other designs", test_analyze_examples},
        {"startup completes on ref-c2", test_startup},
        {"steady on ref-c1 with XML and CSV", test_steady},
        {"a rail that never starts: status 1, why", test_startup_stall},
        {"start-up dropouts: warning, limit", test_dropouts},
        {"bad design file: status 2", test_bad_input},
        {"bad usage: status 2", test_bad_usage},
        {"unwritable output: status 2, nothing left", test_write_failure},
        {"--xml - goes to stdout", test_xml_to_stdout},
        {"all outputs or none", test_all_or_nothing},
        {"an output path that is an input: refused", test_output_is_input},
        {"--quiet when the start-up is undetermined", test_quiet_undetermined},
        {"result XML well-formed for paths that are not UTF-8", test_xml_path_not_utf8},
        {"help texts (golden)", test_help_golden},
        {NULL, NULL},
    };
    if (chdir(BR_SOURCE_DIR) != 0)
        return 2;
    return br_test_main("cli_verbs", cases);
}

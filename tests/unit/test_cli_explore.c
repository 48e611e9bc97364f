/* test_cli_explore.c - exploring around a template: a small exploration
 * end to end (report, CSV, plots, the front's design files), the
 * combinations the rule of the trade must reject, the front's design
 * files loading and passing `analyze`, sizing from a parts catalog (the
 * sized capacitor is the smallest that passes), and bad input. */
#include "analyses/evaluate.h"
#include "analyses/explore.h"
#include "runbin.h"
#include "testkit.h"

#include <ctype.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#define LEG BR_SOURCE_DIR "/examples/leg-7level.xml"
#define SWITCHES BR_SOURCE_DIR "/examples/parts/switches.xml"
#define PICKCAT BR_SOURCE_DIR "/examples/parts/catalog.xml"
/* A two-switch string: a template whose level count cannot be varied. */
static const char STRING_XML[] =
    "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
    "<bootrung-design version=\"1\" name=\"pair\">\n"
    "  <operating-point vin=\"100 V\" fsw=\"100 kHz\"/>\n"
    "  <supply voltage=\"12 V\"/>\n"
    "  <topology><string>\n"
    "    <switch name=\"S1\" vblock=\"50 V\"><on from=\"0.0\" to=\"0.45\"/></switch>\n"
    "    <switch name=\"S2\" vblock=\"50 V\"><on from=\"0.5\" to=\"0.95\"/></switch>\n"
    "  </string></topology>\n"
    "  <parts><diode id=\"d1\"/><capacitor id=\"c1\" c=\"1 uF\"/><driver id=\"drv1\"/>"
    "<switch id=\"q1\"/></parts>\n"
    "  <stages diode=\"d1\" capacitor=\"c1\" driver=\"drv1\" switch=\"q1\"/>\n"
    "</bootrung-design>\n";

typedef struct files {
    char dir[40], csv[64], svg[64];
} files;

static void files_make(files *f)
{
    snprintf(f->dir, sizeof f->dir, "/tmp/br-explore-XXXXXX");
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(f->dir));
    snprintf(f->csv, sizeof f->csv, "%s/x.csv", f->dir);
    snprintf(f->svg, sizeof f->svg, "%s/x.svg", f->dir);
}

static void files_drop(files *f)
{
    char cmd[128];
    snprintf(cmd, sizeof cmd, "rm -rf '%s'", f->dir);
    CU_ASSERT_EQUAL(system(cmd), 0);
}

/* The CSV line of (levels, switch, fsw) or NULL. */
static const char *csv_line(const char *csv, const char *key)
{
    const char *p = csv;
    size_t n = strlen(key);
    while (p && *p) {
        if (strncmp(p, key, n) == 0)
            return p;
        p = strchr(p, '\n');
        p = p ? p + 1 : NULL;
    }
    return NULL;
}

/* The field-th comma-separated field of a CSV line, as a number. */
static int has_words(const char *text, const char *want);

static double field(const char *line, int k)
{
    for (int i = 0; i < k && line; i++) {
        line = strchr(line, ',');
        line = line ? line + 1 : NULL;
    }
    return line ? strtod(line, NULL) : -1.0;
}

static int count_lines(const char *s)
{
    int n = 0;
    for (; *s; s++)
        n += *s == '\n';
    return n;
}

/* Levels 3 to 8 at 60 kHz around the 7-level example on its 1.1 kV bus:
 * 18 combinations.  Hand calculation of the rule (derating 80 %, the
 * template's): 3 levels need 1100 / 2 / 0.8 = 687.5 V, above every
 * switch of the catalog (650 V at most), so all three are rejected
 * without a simulation; 8 levels need 1100 / 7 / 0.8 = 196.4 V, which
 * the 200 V class meets. */
static void test_small(void)
{
    files f;
    files_make(&f);
    run_result r = run((const char *[]){"explore", LEG, "--catalog", SWITCHES, "--vin", "1.1k",
                                        "--levels", "3:8", "--fsw", "60k", "--csv", f.csv, "--svg",
                                        f.svg, "--designs", f.dir, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(has(r.out, "18 combinations"));
    CU_ASSERT_TRUE(has(r.out, "verdict: PASS"));
    CU_ASSERT_TRUE(has(r.out, "lethal voltages"));
    for (const char *l = r.out; *l;) { /* reports keep to 100 columns */
        const char *e = strchr(l, '\n');
        size_t len = e ? (size_t)(e - l) : strlen(l);
        CU_ASSERT_TRUE(len <= 100);
        l += len + (e != NULL);
    }
    char *csv = br_test_slurp(f.csv, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(csv);
    CU_ASSERT_EQUAL(count_lines(csv), 19);
    static const char *const sw[] = {"gan-200v-g", "gan-400v-g", "gan-650v-g"};
    for (int i = 0; i < 3; i++) {
        char key[64];
        snprintf(key, sizeof key, "3,%s,", sw[i]);
        const char *line = csv_line(csv, key);
        CU_ASSERT_PTR_NOT_NULL_FATAL(line);
        BR_ASSERT_NEAR(field(line, 3), 687.5, 1e-6);
        CU_ASSERT_TRUE(strstr(line, ",rating,") != NULL &&
                       strstr(line, ",rating,") < strchr(line, '\n'));
    }
    const char *l8 = csv_line(csv, "8,gan-200v-g,");
    CU_ASSERT_PTR_NOT_NULL_FATAL(l8);
    BR_ASSERT_NEAR(field(l8, 3), 1100.0 / 7.0 / 0.8, 1e-6);
    CU_ASSERT_FALSE(strncmp(strstr(l8, "60000,") + 6, "rating", 6) == 0);
    free(csv);
    char *svg = br_test_slurp(f.svg, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(svg);
    CU_ASSERT_TRUE(has(svg, "<svg"));
    CU_ASSERT_TRUE(has(svg, "data-series=\"margin_V_60000Hz\""));
    CU_ASSERT_TRUE(has(svg, "data-series=\"cost_60000Hz\""));
    free(svg);
    done(&r);
    files_drop(&f);
}

/* Every front member's design file (rail capacitors scaled: parts of its
 * own) loads and passes `analyze`, and the number of files is the
 * front's size in the CSV. */
static void test_front_designs(void)
{
    files f;
    files_make(&f);
    run_result r = run((const char *[]){"explore", LEG, "--catalog", SWITCHES, "--vin", "1.1k",
                                        "--levels", "4:5", "--fsw", "60k,120k", "--scale-caps",
                                        "--csv", f.csv, "--designs", f.dir, "--quiet", NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    done(&r);
    char *csv = br_test_slurp(f.csv, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(csv);
    int front = 0;
    for (const char *p = strchr(csv, '\n'); p && p[1]; p = strchr(p + 1, '\n'))
        front += (int)field(p + 1, 14) == 1;
    free(csv);
    CU_ASSERT_TRUE(front >= 1);
    for (int k = 1; k <= front + 1; k++) {
        char path[96];
        snprintf(path, sizeof path, "%s/explore-%d.xml", f.dir, k);
        if (k == front + 1) { /* only the front is written; ranks run 1.. along it */
            CU_ASSERT_NOT_EQUAL(access(path, F_OK), 0);
            break;
        }
        run_result a = run((const char *[]){"analyze", "--quiet", path, NULL});
        CU_ASSERT_EQUAL(a.status, 0);
        CU_ASSERT_TRUE(has(a.out, "verdict: PASS"));
        done(&a);
    }
    files_drop(&f);
}

/* With --corners a survivor is judged again at its worst corners: its
 * margin there is at most the nominal one (the nominal point is one of
 * the points judged), and the CSV says it was.  4 levels: the 650 V class
 * alone passes the rating rule, and it survives the screen. */
static void test_corners(void)
{
    files f;
    files_make(&f);
    char nominal[96];
    snprintf(nominal, sizeof nominal, "%s/n.csv", f.dir);
    run_result r =
        run((const char *[]){"explore", LEG, "--catalog", SWITCHES, "--vin", "1.1k", "--levels",
                             "4:4", "--fsw", "60k", "--csv", nominal, "--quiet", NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(has(r.out, "at the nominal point)"));
    done(&r);
    r = run((const char *[]){"explore", LEG, "--catalog", SWITCHES, "--vin", "1.1k", "--levels",
                             "4:4", "--fsw", "60k", "--corners", "--threads", "2", "--csv", f.csv,
                             "--quiet", NULL});
    CU_ASSERT_TRUE(r.status == 0 || r.status == 1);
    CU_ASSERT_TRUE(has(r.out, "at their worst corners)"));
    done(&r);
    char *a = br_test_slurp(nominal, NULL), *b = br_test_slurp(f.csv, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(a);
    CU_ASSERT_PTR_NOT_NULL_FATAL(b);
    const char *la = csv_line(a, "4,gan-650v-g,"), *lb = csv_line(b, "4,gan-650v-g,");
    CU_ASSERT_PTR_NOT_NULL_FATAL(la);
    CU_ASSERT_PTR_NOT_NULL_FATAL(lb);
    CU_ASSERT_TRUE(strstr(la, ",feasible,") != NULL); /* survives the screen */
    CU_ASSERT_EQUAL((int)field(lb, 13), 1);           /* judged at the corners */
    CU_ASSERT_TRUE(field(lb, 9) <= field(la, 9) + 1e-12);
    free(a);
    free(b);
    files_drop(&f);
}

/* A bus no catalog switch can take at any level count asked: nothing is
 * feasible, exit 1.  Hand calculation: 3 levels on 1.1 kV need 687.5 V. */
static void test_none_feasible(void)
{
    run_result r = run((const char *[]){"explore", LEG, "--catalog", SWITCHES, "--vin", "1.1k",
                                        "--levels", "3:3", "--fsw", "60k", NULL});
    CU_ASSERT_EQUAL(r.status, 1);
    CU_ASSERT_TRUE(has(r.out, "verdict: FAIL (0 of 3"));
    CU_ASSERT_TRUE(has(r.out, "switch class below the 688 V the rule asks"));
    done(&r);
}

static void test_bad_input(void)
{
    run_result r = run((const char *[]){"explore", LEG, "--catalog", PICKCAT, "--vin", "1.1k",
                                        "--levels", "5:7", "--fsw", "60k", NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_TRUE(has(r.err, "the catalog offers no switch"));
    done(&r);
    files f;
    files_make(&f);
    char path[96];
    snprintf(path, sizeof path, "%s/pair.xml", f.dir);
    FILE *fp = fopen(path, "w");
    CU_ASSERT_PTR_NOT_NULL_FATAL(fp);
    fputs(STRING_XML, fp);
    fclose(fp);
    r = run((const char *[]){"analyze", "--quiet", path, NULL}); /* a design that reads */
    CU_ASSERT_NOT_EQUAL(r.status, 2);
    done(&r);
    r = run((const char *[]){"explore", path, "--catalog", SWITCHES, "--vin", "1.1k", "--levels",
                             "5:7", "--fsw", "60k", NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_TRUE(has(r.err, "expected an <fcml> leg"));
    done(&r);
    files_drop(&f);
    r = run((const char *[]){"explore", LEG, "--catalog", SWITCHES, "--vin", "1.1k", "--levels",
                             "9:5", "--fsw", "60k", NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_TRUE(has(r.err, "--levels"));
    done(&r);
    r = run(
        (const char *[]){"explore", LEG, "--vin", "1.1k", "--levels", "5:7", "--fsw", "60k", NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    done(&r);
}

/* The capacitor of rail k of design d, F. */
static double cap_of(const br_design *d, int k)
{
    return d->caps[br_design_stage(d, k)->cap].c.nom;
}

/* The scaling rule on the 7-level example (12 stages; rails 1 and 2 have
 * 22 uF, the others 10 uF; 1.2 mA + 1.5 mA of driver current and 10 nC of
 * gate charge at 120 kHz) made 9 levels (16 stages) with the 200 V switch
 * (10 nC, a driver drawing the same).  Hand calculation, rail k carries
 * 16 - k rails, the template's rail carrying as many is 12 - (16 - k):
 *  - at 120 kHz the charge per rail is unchanged; rail 15 is the
 *    template's rail 11 (10 uF), rail 6 its rail 2 (22 uF), rail 5 its
 *    rail 1 (22 uF), rail 1 carries 15 rails where the template's rail 1
 *    carries 11: 22 uF * 15 / 11 = 30 uF, 33 uF in E6; rail 4: 22 * 12 /
 *    11 = 24 uF, 33 uF;
 *  - at 60 kHz each rail gives 10 nC + 2.7 mA / 60 kHz = 55 nC a period
 *    against 10 nC + 2.7 mA / 120 kHz = 32.5 nC: rail 15 needs 10 uF *
 *    55 / 32.5 = 16.9 uF, 22 uF in E6.
 * Without the rule the template's capacitors stay, counted from the
 * bottom (rail 1 22 uF, rail 7 10 uF). */
static void test_scale_caps(void)
{
    br_design *t = NULL;
    br_catalog *cat = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(LEG, &t, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_catalog_load(SWITCHES, &cat, &err), BR_OK);
    br_explore_opts o;
    br_explore_opts_default(&o);
    o.cat = cat;
    o.vbus = o.vbus_max = 1100.0;
    o.scale_caps = 1;
    br_explore_row r = {.levels = 9, .fsw = 120e3, .sw = 0, .diode = -1, .need = 196.4};
    br_design *d = NULL;
    CU_ASSERT_EQUAL_FATAL(br_explore_design(t, &o, &r, &d, &err), BR_OK);
    BR_ASSERT_REL(cap_of(d, 15), 10e-6, 1e-9);
    BR_ASSERT_REL(cap_of(d, 6), 22e-6, 1e-9);
    BR_ASSERT_REL(cap_of(d, 5), 22e-6, 1e-9);
    BR_ASSERT_REL(cap_of(d, 4), 33e-6, 1e-9);
    BR_ASSERT_REL(cap_of(d, 1), 33e-6, 1e-9);
    BR_ASSERT_REL(br_design_stage(d, 1)->r_link.nom, 0.5, 1e-12);
    br_design_free(d);
    r.fsw = 60e3;
    CU_ASSERT_EQUAL_FATAL(br_explore_design(t, &o, &r, &d, &err), BR_OK);
    BR_ASSERT_REL(cap_of(d, 15), 22e-6, 1e-9);
    br_design_free(d);
    o.scale_caps = 0;
    CU_ASSERT_EQUAL_FATAL(br_explore_design(t, &o, &r, &d, &err), BR_OK);
    BR_ASSERT_REL(cap_of(d, 1), 22e-6, 1e-9);
    BR_ASSERT_REL(cap_of(d, 7), 10e-6, 1e-9);
    CU_ASSERT_EQUAL(d->levels, 9);
    BR_ASSERT_REL(d->fsw.nom, 60e3, 1e-12);
    CU_ASSERT_STRING_EQUAL(d->switches[br_design_stage(d, 3)->sw].id, "gan-200v-g");
    CU_ASSERT_STRING_EQUAL(d->drivers[br_design_stage(d, 3)->driver].id, "iso-drv-basic");
    br_design_free(d);
    br_catalog_free(cat);
    br_design_free(t);
}

/* A template named like a front member's file, in the --designs folder, is
 * an input: refused, and left as it was. */
static void test_designs_not_over_input(void)
{
    files f;
    files_make(&f);
    char path[96];
    snprintf(path, sizeof path, "%s/explore-1.xml", f.dir);
    size_t n;
    char *text = br_test_slurp(LEG, &n);
    CU_ASSERT_PTR_NOT_NULL_FATAL(text);
    FILE *fp = fopen(path, "w");
    CU_ASSERT_PTR_NOT_NULL_FATAL(fp);
    CU_ASSERT_EQUAL(fwrite(text, 1, n, fp), n);
    fclose(fp);
    run_result r =
        run((const char *[]){"explore", path, "--catalog", SWITCHES, "--vin", "1.1k", "--levels",
                             "4:4", "--fsw", "60k", "--designs", f.dir, NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_TRUE(has(r.err, "does not overwrite an input"));
    done(&r);
    size_t m;
    char *after = br_test_slurp(path, &m);
    CU_ASSERT_TRUE(after && m == n && memcmp(after, text, n) == 0);
    free(after);
    free(text);
    files_drop(&f);
}

/* 9 levels at 60 kHz on the 1.1 kV bus: the 400 V class fails with one
 * supply, its rails from rail 8 up falling short (the drops of eight
 * links and regulators), so the split design is built and judged: the
 * report names the rail of its injection and its verdict, the CSV carries
 * them, and --designs writes the split design, which holds an injection
 * at that rail and loads. */
static void test_split(void)
{
    files f;
    files_make(&f);
    run_result r =
        run((const char *[]){"explore", LEG, "--catalog", SWITCHES, "--vin", "1.1k", "--levels",
                             "9:9", "--fsw", "60k", "--csv", f.csv, "--designs", f.dir, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(has(r.out, "9 levels, gan-400v-g, 60.0 kHz: fails with one supply"));
    CU_ASSERT_TRUE(has(r.out, "Split, with a second isolated supply injected at rail "));
    CU_ASSERT_TRUE(has_words(r.out, "the split cost excludes the second supply (the catalog "
                                    "lists no isolated supplies)"));
    done(&r);
    char *csv = br_test_slurp(f.csv, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(csv);
    CU_ASSERT_TRUE(has(csv, ",inject_rail,split_state,split_margin_V,"));
    const char *l = csv_line(csv, "9,gan-400v-g,");
    CU_ASSERT_PTR_NOT_NULL_FATAL(l);
    CU_ASSERT_TRUE(strstr(l, ",split,") != NULL && strstr(l, ",split,") < strchr(l, '\n'));
    int split_at = (int)field(l, 12), rail = (int)field(l, 16);
    CU_ASSERT_EQUAL(split_at, 8);
    /* no modules listed: the split cost is the parts' alone, said so */
    CU_ASSERT_TRUE(strstr(l, ",excluded,,") != NULL && strstr(l, ",excluded,,") < strchr(l, '\n'));
    BR_ASSERT_NEAR(field(l, 24), field(l, 7), 1e-9);
    CU_ASSERT_TRUE(rail >= 1 && rail <= split_at);
    free(csv);
    /* rows are numbered in the order judged: 9 levels x (200, 400, 650 V) */
    char path[96], want[48];
    snprintf(path, sizeof path, "%s/explore-split-2.xml", f.dir);
    char *xml = br_test_slurp(path, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(xml);
    snprintf(want, sizeof want, "<injection rail=\"%d\"", rail);
    CU_ASSERT_TRUE(has(xml, want));
    CU_ASSERT_TRUE(has(xml, "the split cost excludes the second"));
    free(xml);
    run_result c = run((const char *[]){"check", "--quiet", path, NULL});
    CU_ASSERT_TRUE(c.status == 0 || c.status == 1); /* it loads: not bad input */
    done(&c);
    files_drop(&f);
}

#define MODULES BR_SOURCE_DIR "/tests/data/switches-modules.xml"

/* text has the words of want, whatever the wrapping between them. */
static int has_words(const char *text, const char *want)
{
    size_t n = strlen(text);
    char *flat = malloc(n + 1), *q = flat;
    if (!flat)
        return 0;
    for (const char *p = text; *p; p++)
        if (!isspace((unsigned char)*p) || (q > flat && q[-1] != ' '))
            *q++ = isspace((unsigned char)*p) ? ' ' : *p;
    *q = '\0';
    int ok = has(flat, want);
    free(flat);
    return ok;
}

/* The cheapest module that suits: the catalog's modules (tests/data/
 * switches-modules.xml) are a 15 V +-5 % one rated 20 mA (1.5), a 12 V
 * +-5 % one rated 200 mA (0.8), a 15 V +-5 % one rated 100 mA behind a
 * hiccup limit of 150 mA +-10 % (3.2) and a 15 V +-5 % one rated 250 mA
 * (4.5).  For 41 mA on a 15 V chain: not the 20 mA one (too weak, though
 * cheaper), not the 12 V one (its tolerance does not hold 15 V), the
 * 100 mA one; after it, the 250 mA one; for 140 mA the 250 mA one (the
 * 100 mA one's rating falls short); for 300 mA none. */
static void test_module_choice(void)
{
    br_catalog *cat = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_catalog_load(MODULES, &cat, &err), BR_OK);
    CU_ASSERT_EQUAL(br_explore_module_choose(cat, 15.0, 41e-3, -1), 2);
    CU_ASSERT_EQUAL(br_explore_module_choose(cat, 15.0, 41e-3, 2), 3);
    CU_ASSERT_EQUAL(br_explore_module_choose(cat, 15.0, 41e-3, 3), -1);
    CU_ASSERT_EQUAL(br_explore_module_choose(cat, 15.0, 10e-3, -1), 0);
    CU_ASSERT_EQUAL(br_explore_module_choose(cat, 15.0, 140e-3, -1), 3);
    CU_ASSERT_EQUAL(br_explore_module_choose(cat, 15.0, 300e-3, -1), -1);
    CU_ASSERT_EQUAL(br_explore_module_choose(cat, 12.0, 100e-3, -1), 1);
    br_explore_opts o;
    br_explore_opts_default(&o);
    o.cat = cat;
    CU_ASSERT_PTR_EQUAL(br_explore_module_catalog(&o), cat);
    br_catalog_free(cat);
}

/* The split of test_split with the modules' catalog: the cheapest module
 * rated for what the rails above the injection draw (their drivers'
 * running and isolator currents, gate charge and regulators: about 3.3 mA
 * a rail, a quarter more) is taken, the 100 mA one, and costed: the split
 * cost is the parts' plus the module's, in the report and the CSV; the
 * split design carries its voltage, tolerance and limit, its resistance
 * in series with the link resistor (1 ohm + 0.5 ohm). */
static void test_split_module(void)
{
    files f;
    files_make(&f);
    run_result r =
        run((const char *[]){"explore", LEG, "--catalog", MODULES, "--vin", "1.1k", "--levels",
                             "9:9", "--fsw", "60k", "--csv", f.csv, "--designs", f.dir, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(has_words(r.out, "+ isolated supply iso-15v-100ma 3.2 (the cheapest"));
    done(&r);
    char *csv = br_test_slurp(f.csv, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(csv);
    CU_ASSERT_TRUE(
        has(csv, ",split_binds,split_corners,split_supply,split_supply_cost,split_cost"));
    const char *l = csv_line(csv, "9,gan-400v-g,");
    CU_ASSERT_PTR_NOT_NULL_FATAL(l);
    CU_ASSERT_TRUE(strstr(l, ",iso-15v-100ma,") && strstr(l, ",iso-15v-100ma,") < strchr(l, '\n'));
    double parts = field(l, 7), module = field(l, 23), split = field(l, 24);
    BR_ASSERT_NEAR(module, 3.2, 1e-9); /* the catalog's cost of iso-15v-100ma */
    CU_ASSERT_TRUE(parts > 0.0);
    BR_ASSERT_NEAR(split, parts + module, 1e-9);
    free(csv);
    char path[96];
    snprintf(path, sizeof path, "%s/explore-split-2.xml", f.dir);
    char *xml = br_test_slurp(path, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(xml);
    CU_ASSERT_TRUE(has(xml, "voltage=\"14.25/15/15.75 V\" resistance=\"1.5 ohm\""));
    CU_ASSERT_TRUE(has(xml, "current-limit=\"0.135/0.15/"));
    CU_ASSERT_TRUE(has(xml, "limit-mode=\"hiccup\""));
    CU_ASSERT_TRUE(has_words(xml, "parts 80 + isolated supply iso-15v-100ma 3.2"));
    free(xml);
    files_drop(&f);
}

static void test_help_golden(void)
{
    run_result a = run((const char *[]){"explore", "--help", NULL});
    CU_ASSERT_EQUAL(a.status, 0);
    char *want = br_test_slurp("tests/golden/explore-help.txt", NULL);
    CU_ASSERT_PTR_NOT_NULL(want);
    if (want)
        CU_ASSERT_STRING_EQUAL(want, a.out);
    free(want);
    done(&a);
}

/* Whether design d qualifies at its nominal point as the sizing judges a
 * value, judged here on its own (the cold start, every direction's
 * steady state, the verdict): every criterion that applies passes and is
 * decided, and every margin in volts reaches target. */
static int qualifies(const br_design *d, double target)
{
    br_chain *c = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_evaluation *e = malloc(sizeof *e);
    CU_ASSERT_PTR_NOT_NULL_FATAL(e);
    int ok = br_evaluate(c, 1, NULL, e, &err) == BR_OK;
    for (int k = 0; ok && k < BR_CRIT_COUNT; k++) {
        const br_verdict_row *v = &e->v.row[k];
        if (!v->applies)
            continue;
        ok = !v->undetermined && v->pass;
        if (ok && br_crit_has_margin(k) && strcmp(br_crit_unit(k), "V") == 0)
            ok = v->margin >= target;
    }
    free(e);
    br_chain_free(c);
    return ok;
}

/* The parts catalog's capacitor just below part p in the order the
 * sizing walks (capacitance, then cost; rated for vmax), or -1. */
static int next_smaller(const br_catalog *cat, int p, double vmax)
{
    int best = -1;
    for (int i = 0; i < cat->ncaps; i++) {
        if (i == p || !(cat->caps[i].vrated.nom >= vmax))
            continue;
        double ci = cat->caps[i].c.nom, cp = cat->caps[p].c.nom;
        int below = ci < cp || (ci == cp && cat->cap_offer[i].cost < cat->cap_offer[p].cost);
        if (below &&
            (best < 0 || ci > cat->caps[best].c.nom ||
             (ci == cat->caps[best].c.nom && cat->cap_offer[i].cost > cat->cap_offer[best].cost)))
            best = i;
    }
    return best;
}

/* Sizing through explore (4 levels on a 300 V bus, 60 kHz, the example
 * catalogs): every survivor's rails carry catalog capacitors, and on
 * each rail whose capacitor is not the smallest the catalog offers, the
 * design with the next smaller one fails the target while the sized one
 * passes (the "the sized capacitor is the smallest that
 * passes"), both judged here independently of the sizing. */
static void test_sized_smallest(void)
{
    br_design *t = NULL;
    br_catalog *cat = NULL, *parts = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(LEG, &t, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_catalog_load(SWITCHES, &cat, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_catalog_load(PICKCAT, &parts, &err), BR_OK);
    br_explore_opts o;
    br_explore_opts_default(&o);
    o.cat = cat;
    o.parts = parts;
    o.vbus = o.vbus_max = 300.0;
    o.lmin = o.lmax = 4;
    o.nfsw = 1;
    o.fsw[0] = 60e3;
    br_explore *x = NULL;
    CU_ASSERT_EQUAL_FATAL(br_explore_run(t, &o, &x, &err), BR_OK);
    CU_ASSERT_TRUE_FATAL(x->nfeasible >= 1);
    int checked = 0;
    for (int i = 0; i < x->n; i++) {
        br_explore_row r = x->rows[i];
        if (r.state != BR_EX_FEASIBLE)
            continue;
        CU_ASSERT_TRUE(r.sized);
        br_design *d = NULL;
        CU_ASSERT_EQUAL_FATAL(br_explore_design(t, &o, &r, &d, &err), BR_OK);
        CU_ASSERT_TRUE(qualifies(d, x->target));
        for (int k = 1; k < 2 * (r.levels - 1); k++) {
            CU_ASSERT_TRUE_FATAL(r.cap[k] >= 0);
            CU_ASSERT_EQUAL(d->caps[br_design_stage(d, k)->cap].c.nom, parts->caps[r.cap[k]].c.nom);
            int below = next_smaller(parts, r.cap[k], d->vsupply.max);
            if (below < 0)
                continue;
            br_explore_row s = r;
            s.cap[k] = (signed char)below;
            br_design *ds = NULL;
            CU_ASSERT_EQUAL_FATAL(br_explore_design(t, &o, &s, &ds, &err), BR_OK);
            CU_ASSERT_FALSE(qualifies(ds, x->target));
            br_design_free(ds);
            checked++;
        }
        br_design_free(d);
    }
    CU_ASSERT_TRUE(checked >= 1); /* some rail's answer was not the catalog's smallest */
    br_explore_free(x);
    br_catalog_free(parts);
    br_catalog_free(cat);
    br_design_free(t);
}

/* --yield: the yield of the rank-1 design is the `yield` verb's on its
 * design file (--startup, the same samples and seed): the same counts of
 * samples that pass, fail and are undetermined.  When every sample
 * passes, the lower bound is Clopper-Pearson's for n of n, by hand
 * 0.025^(1/n) (C. J. Clopper and E. S. Pearson, Biometrika 26(4), 1934:
 * the lower bound for x = n solves p^n = alpha/2).  --max-cost 15 leaves
 * one feasible combination (the others cost more once sized), so one
 * design is sampled. */
static void test_yield(void)
{
    files f;
    files_make(&f);
    run_result r = run((const char *[]){
        "explore",    LEG,   "--catalog", SWITCHES, "--parts",   PICKCAT, "--vin",  "300V",
        "--levels",   "3:3", "--fsw",     "60k",    "--yield",   "6",     "--seed", "3",
        "--max-cost", "15",  "--csv",     f.csv,    "--designs", f.dir,   NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(has(r.out, "yield: 6 samples of each feasible combination"));
    done(&r);
    char *csv = br_test_slurp(f.csv, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(csv);
    CU_ASSERT_TRUE(has(csv, ",samples,pass,fail,undetermined,yield,yield_lo,yield_hi\n"));
    const char *line = NULL; /* the rank-1 row: field 15 */
    for (const char *p = strchr(csv, '\n'); p && p[1] && !line; p = strchr(p + 1, '\n'))
        if ((int)field(p + 1, 15) == 1)
            line = p + 1;
    CU_ASSERT_PTR_NOT_NULL_FATAL(line);
    long pass = (long)field(line, 28), fail = (long)field(line, 29), und = (long)field(line, 30);
    CU_ASSERT_EQUAL((long)field(line, 27), 6);
    CU_ASSERT_EQUAL(pass + fail + und, 6);
    if (pass == 6)
        BR_ASSERT_NEAR(field(line, 32), pow(0.025, 1.0 / 6.0), 1e-9);
    char design[96], want[128];
    snprintf(design, sizeof design, "%s/explore-1.xml", f.dir);
    r = run((const char *[]){"yield", "--startup", "--samples", "6", "--seed", "3", design, NULL});
    CU_ASSERT_TRUE(r.status == 0 || r.status == 1 || r.status == 3);
    snprintf(want, sizeof want, "yield: %ld of 6 samples pass, %ld fail, %ld undetermined", pass,
             fail, und);
    CU_ASSERT_TRUE(has(r.out, want));
    done(&r);
    free(csv);
    files_drop(&f);
}

/* The combinations are judged on worker threads, each on its own: one
 * thread and three give the same CSV byte for byte.  6 and 7 levels at
 * 60 kHz: rows refused by the rating rule, failing, feasible and split. */
static void test_threads(void)
{
    files f;
    files_make(&f);
    char one[96];
    snprintf(one, sizeof one, "%s/one.csv", f.dir);
    const char *threads[] = {"1", "3"};
    const char *out[] = {one, f.csv};
    for (int i = 0; i < 2; i++) {
        run_result r = run((const char *[]){"explore", LEG, "--catalog", SWITCHES, "--vin", "1.1k",
                                            "--levels", "6:7", "--fsw", "60k", "--threads",
                                            threads[i], "--csv", out[i], "--quiet", NULL});
        CU_ASSERT_EQUAL(r.status, 0);
        done(&r);
    }
    size_t na, nb;
    char *a = br_test_slurp(one, &na), *b = br_test_slurp(f.csv, &nb);
    CU_ASSERT_PTR_NOT_NULL_FATAL(a);
    CU_ASSERT_PTR_NOT_NULL_FATAL(b);
    CU_ASSERT_EQUAL(na, nb);
    CU_ASSERT_STRING_EQUAL(a, b);
    CU_ASSERT_TRUE(count_lines(a) == 7); /* 2 levels, 3 switches and the head */
    free(a);
    free(b);
    files_drop(&f);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"a small exploration end to end", test_small},
        {"the front's design files pass analyze", test_front_designs},
        {"the rule rejects what it must", test_none_feasible},
        {"survivors at their worst corners", test_corners},
        {"bad input", test_bad_input},
        {"the front's files never overwrite the template", test_designs_not_over_input},
        {"the capacitor scaling rule by hand", test_scale_caps},
        {"a chain too long for one supply, judged split", test_split},
        {"the split's module: the cheapest that suits", test_module_choice},
        {"the split's module chosen and costed", test_split_module},
        {"sizing: the sized capacitor is the smallest that passes", test_sized_smallest},
        {"--yield: the yield verb's counts on the rank-1 design", test_yield},
        {"one thread or three: the same rows", test_threads},
        {"help (golden)", test_help_golden},
        {NULL, NULL},
    };
    return br_test_main("cli_explore", cases);
}

/* test_cli_explore_split.c - a split design judged at its worst corners:
 * `explore --corners` judges the split design it chose as it judges a
 * survivor, and a split design that holds at its nominal point but fails
 * at a corner is not reported as holding.  Checked against `corners` run
 * on the split design file that `--designs` writes. */
#include "runbin.h"
#include "testkit.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#define LEG BR_SOURCE_DIR "/examples/leg-7level.xml"

/* One switch class of the example switch catalog (examples/parts/
 * switches.xml), with its driver: the exploration below judges one
 * combination. */
static const char CATALOG_XML[] =
    "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
    "<bootrung-catalog version=\"1\" name=\"one-class\">\n"
    "  <driver id=\"iso-drv-basic\" uvlo-rise=\"4.5 V +-0.1 V\" uvlo-fall=\"4.2 V +-0.1 V\"\n"
    "          iq-run=\"1.2 mA +-25%\" iq-uvlo=\"150 uA\" iq-isolator=\"1.5 mA +-20%\"\n"
    "          cost=\"0.9\" area-mm2=\"30\"/>\n"
    "  <switch id=\"gan-400v-g\" rating=\"400 V\" driver=\"iso-drv-basic\"\n"
    "          rds-on=\"20 mohm +-10%\" rds-on-hot=\"31 mohm\" rds-on-hot-temp=\"100 C\"\n"
    "          qg=\"9 nC +-20%\" qg-at=\"6 V\" gate-pulse=\"20 ns\" reverse=\"channel\"\n"
    "          vth=\"1.6 V\" vgs-rec=\"6 V\" vgs-max=\"7 V\" cost=\"4.1\" area-mm2=\"20\"/>\n"
    "</bootrung-catalog>\n";

typedef struct files {
    char dir[40], leg[64], cat[64], csv[64], csv2[64], xml[80], corners[80];
} files;

static void write_file(const char *path, const char *text)
{
    FILE *f = fopen(path, "w");
    CU_ASSERT_PTR_NOT_NULL_FATAL(f);
    CU_ASSERT_EQUAL(fputs(text, f) >= 0, 1);
    CU_ASSERT_EQUAL(fclose(f), 0);
}

/* The 7-level example with 3 ohm link resistors instead of 1 ohm (link 1
 * keeps its 0.5 ohm): the split design of the 400 V class
 * on 8 levels then starts without breaking a diode's IFRM, and holds at
 * its nominal point (with 1 ohm every split design of this neighbourhood
 * fails its link inrush there). */
static void files_make(files *f)
{
    snprintf(f->dir, sizeof f->dir, "/tmp/br-xsplit-XXXXXX");
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(f->dir));
    snprintf(f->leg, sizeof f->leg, "%s/leg.xml", f->dir);
    snprintf(f->cat, sizeof f->cat, "%s/cat.xml", f->dir);
    snprintf(f->csv, sizeof f->csv, "%s/nominal.csv", f->dir);
    snprintf(f->csv2, sizeof f->csv2, "%s/corners.csv", f->dir);
    snprintf(f->xml, sizeof f->xml, "%s/explore-split-1.xml", f->dir);
    snprintf(f->corners, sizeof f->corners, "%s/corners.xml", f->dir);
    char *leg = br_test_slurp(LEG, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(leg);
    char *at = strstr(leg, "link-resistor=\"1 ohm\"");
    CU_ASSERT_PTR_NOT_NULL_FATAL(at);
    at[strlen("link-resistor=\"")] = '3';
    write_file(f->leg, leg);
    free(leg);
    write_file(f->cat, CATALOG_XML);
}

static void files_drop(files *f)
{
    char cmd[128];
    snprintf(cmd, sizeof cmd, "rm -rf '%s'", f->dir);
    CU_ASSERT_EQUAL(system(cmd), 0);
}

/* The CSV field named `name` of the first combination (a copy of at most
 * cap - 1 characters). */
static void csv_get(const char *csv, const char *name, char *out, size_t cap)
{
    const char *head = csv, *row = strchr(csv, '\n');
    out[0] = '\0';
    CU_ASSERT_PTR_NOT_NULL_FATAL(row);
    row++;
    size_t n = strlen(name);
    for (;;) {
        int last = head[n] == '\n';
        if (strncmp(head, name, n) == 0 && (head[n] == ',' || last)) {
            size_t len = strcspn(row, ",\n");
            snprintf(out, cap, "%.*s", (int)(len < cap ? len : cap - 1), row);
            return;
        }
        head = strpbrk(head, ",\n");
        row = strpbrk(row, ",\n");
        if (!head || *head != ',' || !row || *row != ',') {
            fprintf(stderr, "no CSV column %s\n", name);
            CU_FAIL("a CSV column is missing");
            return;
        }
        head++;
        row++;
    }
}

static double csv_num(const char *csv, const char *name)
{
    char v[64];
    csv_get(csv, name, v, sizeof v);
    return v[0] ? strtod(v, NULL) : NAN;
}

/* The smallest value of attribute `attr` over the criteria of a
 * `corners --xml` result whose unit is volts and that apply. */
static double smallest_volts(const char *xml, const char *attr)
{
    double m = HUGE_VAL;
    char key[40];
    snprintf(key, sizeof key, " %s=\"", attr);
    for (const char *p = strstr(xml, "<criterion "); p; p = strstr(p + 1, "<criterion ")) {
        const char *e = strchr(p, '>');
        CU_ASSERT_PTR_NOT_NULL_FATAL(e);
        const char *u = strstr(p, " unit=\"V\""), *a = strstr(p, key);
        const char *ap = strstr(p, " applies=\"true\"");
        if (u && u < e && a && a < e && ap && ap < e)
            m = fmin(m, strtod(a + strlen(key), NULL));
    }
    return m;
}

/* 8 levels of the 400 V class at 60 kHz on the 1.1 kV bus: one supply
 * falls short, and the split design the search keeps holds at its
 * nominal point (every criterion passes, smallest margin 1 V).  At its
 * worst corner it does not: with the supply and the injection low
 * (15 V - 3 %), the drivers and gates drawing most and the regulators'
 * output high, the drops of the links above the injection leave the top
 * rail's regulator short of headroom and its driver below the minimum
 * drive.
 * With --corners the split design is judged there and reported so; the
 * corners verb on its design file agrees.  Before the split design was
 * judged at its corners, --corners still reported it holding with the
 * nominal margin. */
static void test_split_corners(void)
{
    files f;
    files_make(&f);
    run_result a = run((const char *[]){"explore", f.leg, "--catalog", f.cat, "--vin", "1.1k",
                                        "--levels", "8:8", "--fsw", "60k", "--csv", f.csv, NULL});
    CU_ASSERT_EQUAL(a.status, 1); /* nothing feasible: the one combination needs a split */
    CU_ASSERT_TRUE(has(a.out, "it HOLDS at the nominal point, smallest margin"));
    done(&a);
    char *csv = br_test_slurp(f.csv, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(csv);
    char state[32];
    csv_get(csv, "state", state, sizeof state);
    CU_ASSERT_STRING_EQUAL(state, "split");
    csv_get(csv, "split_state", state, sizeof state);
    CU_ASSERT_STRING_EQUAL(state, "feasible");
    CU_ASSERT_EQUAL(csv_num(csv, "split_corners"), 0);
    double nominal = csv_num(csv, "split_margin_V");
    CU_ASSERT_TRUE(nominal > 0);
    free(csv);

    run_result b = run((const char *[]){"explore", f.leg, "--catalog", f.cat, "--vin", "1.1k",
                                        "--levels", "8:8", "--fsw", "60k", "--corners", "--csv",
                                        f.csv2, "--designs", f.dir, NULL});
    CU_ASSERT_EQUAL(b.status, 1);
    CU_ASSERT_TRUE(has(b.out, "it HOLDS at the nominal point, not at its worst corners"));
    CU_ASSERT_FALSE(strstr(b.out, "it HOLDS at its worst corners") != NULL);
    done(&b);
    csv = br_test_slurp(f.csv2, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(csv);
    csv_get(csv, "split_state", state, sizeof state);
    CU_ASSERT_STRING_EQUAL(state, "corners");
    CU_ASSERT_EQUAL(csv_num(csv, "split_corners"), 1);
    double worst = csv_num(csv, "split_margin_V");
    CU_ASSERT_TRUE(worst < 0 && worst < nominal);
    free(csv);
    char *design = br_test_slurp(f.xml, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(design);
    CU_ASSERT_TRUE(has(design, "not at its worst corners"));
    free(design);

    /* the corners verb on the written split design: a criterion fails at
     * its worst corner; its smallest margin in volts there is the one
     * explore reports (the same corner: the supply and injection low),
     * and its nominal one explore's without --corners */
    run_result c = run(
        (const char *[]){"corners", "--no-startup", "--xml", f.corners, "--quiet", f.xml, NULL});
    CU_ASSERT_EQUAL(c.status, 1);
    done(&c);
    char *xml = br_test_slurp(f.corners, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(xml);
    BR_ASSERT_NEAR(smallest_volts(xml, "margin"), worst, 0.01);
    BR_ASSERT_NEAR(smallest_volts(xml, "nominal-margin"), nominal, 1e-3);
    free(xml);
    files_drop(&f);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"a split design judged at its worst corners", test_split_corners},
        {NULL, NULL},
    };
    return br_test_main("cli_explore_split", cases);
}

/* test_io_spice.c - a link diode's parameters from a Berkeley SPICE
 * .model line: SPICE numbers, the statement (continuations, comments,
 * aliases), its errors with file, line and field, and the mapping onto
 * the diode part in a design and in a catalog. */
#include "bootrung/bootrung.h"
#include "io/spice_model.h"
#include "model/catalog.h"
#include "model/chain.h"
#include "model/design.h"
#include "testkit.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#define KELVIN 273.15

/* ---- numbers ------------------------------------------------------------------ */

static double num(const char *s)
{
    double v = NAN;
    CU_ASSERT_EQUAL(br_spice_number(s, &v), 0);
    return v;
}

/* The scale factors of SPICE (common practice: every SPICE since the
 * Berkeley one reads them so; "M" is milli, "MEG" mega, and letters after
 * a number are ignored, so "1F" is a femto, not a farad). */
static void test_numbers(void)
{
    BR_ASSERT_REL(num("2.5n"), 2.5e-9, 1e-15);
    BR_ASSERT_REL(num("10pF"), 10e-12, 1e-15);
    BR_ASSERT_REL(num("1meg"), 1e6, 1e-15);
    BR_ASSERT_REL(num("1MEGohm"), 1e6, 1e-15);
    BR_ASSERT_REL(num("1M"), 1e-3, 1e-15);
    BR_ASSERT_REL(num("1mA"), 1e-3, 1e-15);
    BR_ASSERT_REL(num("3.3k"), 3300.0, 1e-15);
    BR_ASSERT_REL(num("2G"), 2e9, 1e-15);
    BR_ASSERT_REL(num("1t"), 1e12, 1e-15);
    BR_ASSERT_REL(num("1F"), 1e-15, 1e-15);
    BR_ASSERT_REL(num("1mil"), 25.4e-6, 1e-12);
    BR_ASSERT_REL(num("1.5V"), 1.5, 1e-15);
    BR_ASSERT_REL(num("1e-14"), 1e-14, 1e-15);
    BR_ASSERT_REL(num("2.2E+3"), 2200.0, 1e-15);
    BR_ASSERT_REL(num("-1.5"), -1.5, 1e-15);
    BR_ASSERT_REL(num(".5"), 0.5, 1e-15);
    BR_ASSERT_REL(num("1.2eV"), 1.2, 1e-15); /* an 'e' without digits is a letter */
    double v;
    CU_ASSERT_EQUAL(br_spice_number("", &v), -1);
    CU_ASSERT_EQUAL(br_spice_number("abc", &v), -1);
    CU_ASSERT_EQUAL(br_spice_number("1.2.3", &v), -1);
    CU_ASSERT_EQUAL(br_spice_number("12x3", &v), -1);
    CU_ASSERT_EQUAL(br_spice_number("4u7", &v),
                    -1); /* a digit after the letters: refused, not 4u */
    CU_ASSERT_EQUAL(br_spice_number("1e999", &v), -1);
}

/* ---- the statement --------------------------------------------------------------- */

static int parse(const char *text, br_spice_model *m, br_error *err)
{
    br_error_clear(err);
    return br_spice_model_parse(text, "f.xml", 10, "diode d: spice-model", m, err);
}

static void test_statement(void)
{
    br_spice_model m;
    br_error err;
    const char *text = "\n  .MODEL dfast d (IS=2.5n N=1.8, RS = 0.12\n"
                       "* a comment line\n"
                       "  + CJ0=15p VJ=0.75 m=0.4 TT=30n\n"
                       "+ BV=650 IBV=10u TNOM=25)\n  ";
    CU_ASSERT_EQUAL_FATAL(parse(text, &m, &err), BR_OK);
    CU_ASSERT_STRING_EQUAL(m.name, "dfast");
    BR_ASSERT_REL(m.v[BR_SP_IS], 2.5e-9, 1e-15);
    BR_ASSERT_REL(m.v[BR_SP_N], 1.8, 1e-15);
    BR_ASSERT_REL(m.v[BR_SP_RS], 0.12, 1e-15);
    BR_ASSERT_REL(m.v[BR_SP_CJO], 15e-12, 1e-15); /* CJ0: an alias of CJO */
    BR_ASSERT_REL(m.v[BR_SP_VJ], 0.75, 1e-15);
    BR_ASSERT_REL(m.v[BR_SP_M], 0.4, 1e-15);
    BR_ASSERT_REL(m.v[BR_SP_TT], 30e-9, 1e-15);
    BR_ASSERT_REL(m.v[BR_SP_BV], 650.0, 1e-15);
    BR_ASSERT_REL(m.v[BR_SP_IBV], 10e-6, 1e-15);
    BR_ASSERT_REL(m.v[BR_SP_TNOM], 25.0, 1e-15);
    CU_ASSERT_FALSE(m.given[BR_SP_EG]);
    /* the text starts on file line 10 with a newline: the statement is on 11 */
    CU_ASSERT_EQUAL(m.line[BR_SP_IS], 11);
    CU_ASSERT_EQUAL(m.line[BR_SP_CJO], 13);
    CU_ASSERT_EQUAL(m.line[BR_SP_TNOM], 14);
    /* without parentheses, as SPICE3 allows */
    CU_ASSERT_EQUAL_FATAL(parse(".model x D IS=1e-12 N=2", &m, &err), BR_OK);
    BR_ASSERT_REL(m.v[BR_SP_N], 2.0, 1e-15);
    CU_ASSERT_EQUAL(m.line[BR_SP_N], 10);
}

/* err is BR_EINPUT at line, its field ends in field, its message holds msg. */
static void expect_error(const char *text, int line, const char *field, const char *msg)
{
    br_spice_model m;
    br_error err;
    char buf[1600];
    CU_ASSERT_EQUAL(parse(text, &m, &err), BR_EINPUT);
    CU_ASSERT_STRING_EQUAL(err.file, "f.xml");
    CU_ASSERT_EQUAL(err.line, line);
    CU_ASSERT_STRING_EQUAL(err.field, field);
    if (!strstr(err.msg, msg) || err.line != line || strcmp(err.field, field) != 0)
        fprintf(stderr, "\n%s\n", br_error_format(&err, buf, sizeof buf));
    CU_ASSERT_PTR_NOT_NULL(strstr(err.msg, msg));
}

static void test_statement_errors(void)
{
    expect_error(".model d D(IS=1n\n+ XYZ=3)", 11, "diode d: spice-model: XYZ",
                 "unknown diode parameter 'XYZ'");
    expect_error(".model d D(IS=1n\n+\n+ IS=2n)", 12, "diode d: spice-model: IS",
                 "given twice (first on line 10)");
    expect_error(".model d D(IS=1n N=x1)", 10, "diode d: spice-model: N",
                 "'x1' is not a SPICE number");
    expect_error(".model d D(IS=1n N=)", 10, "diode d: spice-model: N", "no value");
    expect_error(".model q NPN(BF=100)", 10, "diode d: spice-model", "model type 'NPN'");
    expect_error(".model d D(IS=1n", 10, "diode d: spice-model", "no ')'");
    expect_error(".model d D(IS=1n) N=2", 10, "diode d: spice-model", "after the ')'");
    expect_error("model d D(IS=1n)", 10, "diode d: spice-model", "expected '.model");
    expect_error(".model d D(IS=1n)\n.model e D(IS=2n)", 11, "diode d: spice-model",
                 "second statement");
    expect_error("+ IS=1n", 10, "diode d: spice-model", "continuation before");
    expect_error("  \n * only a comment\n", 10, "diode d: spice-model", "empty");
}

/* ---- a design with a <spice-model> ---------------------------------------------- */

#define HEAD                                                                                       \
    "<?xml version=\"1.0\"?>\n"                                                                    \
    "<bootrung-design version=\"1\">\n"                                                            \
    "  <operating-point vin=\"400 V\" fsw=\"100 kHz\" ambient=\"27 C\"/>\n"                        \
    "  <supply voltage=\"12 V\"/>\n"                                                               \
    "  <topology><fcml levels=\"2\"/></topology>\n"                                                \
    "  <parts>\n"
#define TAIL                                                                                       \
    "    <capacitor id=\"c1\" c=\"1 uF\"/>\n"                                                      \
    "    <driver id=\"drv\"/>\n"                                                                   \
    "    <switch id=\"q\"/>\n"                                                                     \
    "  </parts>\n"                                                                                 \
    "  <stages diode=\"d\" capacitor=\"c1\" driver=\"drv\" switch=\"q\"/>\n"                       \
    "</bootrung-design>\n"

static int load(const char *diode, br_design **d, br_error *err)
{
    char text[4096];
    snprintf(text, sizeof text, HEAD "%s" TAIL, diode);
    br_error_clear(err);
    *d = NULL;
    return br_design_load_memory(text, strlen(text), "mem.xml", d, err);
}

static void test_design_mapping(void)
{
    br_design *d;
    br_error err;
    char buf[1600];
    int rc = load("    <diode id=\"d\" vrrm=\"600 V\">\n"
                  "      <spice-model>.model dfast D(IS=2.5n N=1.8 RS=0.12 CJO=15p\n"
                  "      + M=0.4 TT=30n EG=1.2 XTI=2.5 BV=650 IBV=10u FC=0.5)</spice-model>\n"
                  "    </diode>\n",
                  &d, &err);
    if (rc != BR_OK)
        fprintf(stderr, "\n%s\n", br_error_format(&err, buf, sizeof buf));
    CU_ASSERT_EQUAL_FATAL(rc, BR_OK);
    const br_diode_part *p = &d->diodes[0];
    BR_ASSERT_REL(p->is.nom, 2.5e-9, 1e-15);
    CU_ASSERT_EQUAL(p->is.min, p->is.nom); /* a .model value carries no tolerance */
    CU_ASSERT_EQUAL(p->is.line, 8);
    BR_ASSERT_REL(p->n.nom, 1.8, 1e-15);
    BR_ASSERT_REL(p->rs.nom, 0.12, 1e-15);
    BR_ASSERT_REL(p->cj0.nom, 15e-12, 1e-15);
    BR_ASSERT_REL(p->vj.nom, 1.0, 1e-15); /* left out: SPICE's default VJ = 1 V, not ours */
    BR_ASSERT_REL(p->m.nom, 0.4, 1e-15);
    CU_ASSERT_EQUAL(p->m.line, 9);
    BR_ASSERT_REL(p->tau.nom, 30e-9, 1e-15); /* TT: the stored charge TT i at forward current i */
    BR_ASSERT_REL(p->eg.nom, 1.2, 1e-15);
    BR_ASSERT_REL(p->xti.nom, 2.5, 1e-15);
    BR_ASSERT_REL(p->tnom, 27.0 + KELVIN, 1e-12); /* TNOM left out: SPICE's 27 C */
    BR_ASSERT_REL(p->bv, 650.0, 1e-15);
    BR_ASSERT_REL(p->ibv, 10e-6, 1e-15);
    BR_ASSERT_REL(p->vrrm.nom, 600.0, 1e-15); /* the rating stays the attribute's, not BV */
    /* The forward voltage of the resolved diode at 1 A and 27 C, by hand:
     * Vt = k T / q = 1.380649e-23 * 300.15 / 1.602176634e-19 = 25.8649 mV;
     * V = n Vt ln(I / IS + 1) + I RS
     *   = 1.8 * 0.0258649 * ln(1 / 2.5e-9 + 1) + 0.12 = 0.0465569 * 19.80698 + 0.12
     *   = 0.92215 + 0.12 = 1.04215 V. */
    br_diode dd;
    CU_ASSERT_EQUAL_FATAL(br_diode_at(p, 27.0 + KELVIN, &dd, &err), BR_OK);
    double v = dd.n * dd.vt * log(1.0 / dd.is + 1.0) + 1.0 * dd.rs;
    BR_ASSERT_REL(v, 1.04215, 1e-5);
    br_design_free(d);
}

/* TNOM sets the reference temperature; the line in a catalog. */
static void test_tnom_and_catalog(void)
{
    br_design *d;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(
        load("    <diode id=\"d\"><spice-model>.model x D(IS=1p TNOM=50 VJ=0.6)</spice-model>"
             "</diode>\n",
             &d, &err),
        BR_OK);
    BR_ASSERT_REL(d->diodes[0].tnom, 50.0 + KELVIN, 1e-12);
    BR_ASSERT_REL(d->diodes[0].vj.nom, 0.6, 1e-15);
    CU_ASSERT_EQUAL(d->diodes[0].bv, 0.0);
    br_design_free(d);

    static const char cat[] =
        "<?xml version=\"1.0\"?>\n<bootrung-catalog version=\"1\">\n"
        "  <diode id=\"sp\" vrrm=\"100 V\" cost=\"0.1\" area-mm2=\"2\">\n"
        "    <spice-model>.model sp D(IS=3n N=1.1 RS=0.05 CJO=80p)</spice-model>\n"
        "  </diode>\n"
        "  <capacitor id=\"c\" c=\"1 uF\" rating=\"25 V\" cost=\"0.01\" area-mm2=\"1\"/>\n"
        "</bootrung-catalog>\n";
    br_catalog *c = NULL;
    char buf[1600];
    br_error_clear(&err);
    int rc = br_catalog_load_memory(cat, strlen(cat), "cat.xml", &c, &err);
    if (rc != BR_OK)
        fprintf(stderr, "\n%s\n", br_error_format(&err, buf, sizeof buf));
    CU_ASSERT_EQUAL_FATAL(rc, BR_OK);
    CU_ASSERT_EQUAL(c->ndiodes, 1);
    BR_ASSERT_REL(c->diodes[0].is.nom, 3e-9, 1e-15);
    BR_ASSERT_REL(c->diodes[0].rs.nom, 0.05, 1e-15);
    BR_ASSERT_REL(c->diodes[0].cj0.nom, 80e-12, 1e-15);
    br_catalog_free(c);
}

static void expect_design_error(const char *diode, int line, const char *field, const char *msg)
{
    br_design *d;
    br_error err;
    char buf[1600];
    CU_ASSERT_EQUAL(load(diode, &d, &err), BR_EINPUT);
    CU_ASSERT_PTR_NULL(d);
    CU_ASSERT_STRING_EQUAL(err.file, "mem.xml");
    CU_ASSERT_EQUAL(err.line, line);
    CU_ASSERT_STRING_EQUAL(err.field, field);
    CU_ASSERT_PTR_NOT_NULL(strstr(err.msg, msg));
    if (err.line != line || strcmp(err.field, field) || !strstr(err.msg, msg))
        fprintf(stderr, "\n%s\n", br_error_format(&err, buf, sizeof buf));
}

static void test_design_errors(void)
{
    /* a value our model refuses, on the line's second line (file line 8) */
    expect_design_error("    <diode id=\"d\"><spice-model>.model x D(IS=1n\n"
                        "+ N=20)</spice-model></diode>\n",
                        8, "diode d: spice-model: N", "got 20, expected an emission coefficient");
    expect_design_error("    <diode id=\"d\"><spice-model>.model x D(M=1)</spice-model></diode>\n",
                        7, "diode d: spice-model: M", "strictly between 0 and 1");
    expect_design_error("    <diode id=\"d\"><spice-model>.model x D(BV=-5)</spice-model>"
                        "</diode>\n",
                        7, "diode d: spice-model: BV", "got -5");
    expect_design_error("    <diode id=\"d\">\n<spice-model>.model x D(IS=1n Q=2)</spice-model>"
                        "</diode>\n",
                        8, "diode d: spice-model: Q", "unknown diode parameter");
    /* one source for the law: the attribute or the line */
    expect_design_error("    <diode id=\"d\" n=\"1.5\"><spice-model>.model x D(IS=1n)</spice-model>"
                        "</diode>\n",
                        7, "diode d: n", "a <spice-model> line is given too");
    expect_design_error("    <diode id=\"d\" ref-temp=\"25 C\"><spice-model>.model x D(TNOM=30)"
                        "</spice-model></diode>\n",
                        7, "diode d: ref-temp", "gives TNOM too");
    expect_design_error("    <diode id=\"d\"><forward i=\"1 A\" v=\"1 V\"/>"
                        "<spice-model>.model x D(IS=1n)</spice-model></diode>\n",
                        7, "diode d: forward", "forward points or the line");
}

int main(void)
{
    static const br_test_case cases[] = {
        {"SPICE numbers and scale factors", test_numbers},
        {"a .model statement with continuations", test_statement},
        {"errors of a statement: line and field", test_statement_errors},
        {"a .model line mapped onto the diode part", test_design_mapping},
        {"TNOM, and the line in a catalog", test_tnom_and_catalog},
        {"errors in a design: file, line, field", test_design_errors},
        {NULL, NULL},
    };
    return br_test_main("io_spice", cases);
}

/* test_report_check.c - the text of `bootrung check` rendered from
 * hand-built designs: operating point, stage table, windows, findings and
 * the closing caution. */
#include "report/check_report.h"
#include "testdesign.h"
#include "testkit.h"

#include <stdio.h>
#include <string.h>

/* Render the check report of a 3-level leg at 100 kHz (T = 10 us) with
 * 50 ns dead time; returns the text (caller frees) and the warning count. */
static br_text *render_fatal(br_design *d, int *nwarn, int *nfatal)
{
    br_chain *c = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_text *t = br_text_create();
    CU_ASSERT_PTR_NOT_NULL_FATAL(t);
    CU_ASSERT_EQUAL(br_check_report(c, t, nwarn, nfatal, &err), BR_OK);
    br_chain_free(c);
    return t;
}

static br_text *render(br_design *d, int *nwarn)
{
    return render_fatal(d, nwarn, NULL);
}

static int has(const br_text *t, const char *s)
{
    int ok = strstr(br_text_data(t), s) != NULL;
    if (!ok)
        fprintf(stderr, "missing \"%s\" in:\n%s\n", s, br_text_data(t));
    return ok;
}

/* Phase-shifted PWM (common practice, see src/model/fcml.c): at D = 0.5
 * the string B1 B2 A2 A1 has B1 on 5050-9950 ns, B2 50-4950 ns and A2
 * 5000-10000 ns; links 1, 2, 3 return through B1, B2, A2. */
static void test_table(void)
{
    int nwarn = -1;
    br_design *d = br_test_fcml(3, 800.0, 100e3, 0.5, 50e-9);
    snprintf(d->name, sizeof d->name, "three-level test");
    br_text *t = render(d, &nwarn);
    CU_ASSERT_EQUAL(nwarn, 0);
    CU_ASSERT_TRUE(has(t, "design three-level test ((test))"));
    CU_ASSERT_TRUE(has(t, "input voltage     800 V"));
    CU_ASSERT_TRUE(has(t, "switching freq    100 kHz (period 10 us)"));
    CU_ASSERT_TRUE(has(t, "dead time         50 ns"));
    CU_ASSERT_TRUE(has(t, "ambient           27.0 degC"));
    CU_ASSERT_TRUE(has(t, "flying-capacitor leg, 3 levels: 4 switches, 3 links"));
    CU_ASSERT_TRUE(has(t, "5050.0-9950.0"));
    CU_ASSERT_TRUE(has(t, "50.5-99.5"));
    CU_ASSERT_TRUE(has(t, " 50.0-4950.0"));
    CU_ASSERT_TRUE(has(t, "5000.0-10000.0"));
    CU_ASSERT_TRUE(has(t, "50.0-100.0"));
    CU_ASSERT_PTR_NULL(strstr(br_text_data(t), "(wraps)"));
    CU_ASSERT_TRUE(has(t, "400.0")); /* 800 V / (3-1) on every link diode */
    CU_ASSERT_TRUE(has(t, "design rules: no warnings"));
    br_text_free(t);
    br_design_free(d);
}

/* At D = 0.3, B2 is on from 8050 ns to 4950 ns of the next period. */
static void test_wrapping_window(void)
{
    br_design *d = br_test_fcml(3, 800.0, 100e3, 0.3, 50e-9);
    br_text *t = render(d, NULL);
    CU_ASSERT_TRUE(has(t, "8050.0-4950.0"));
    CU_ASSERT_TRUE(has(t, "80.5-49.5 (wraps)"));
    br_text_free(t);
    br_design_free(d);
}

/* Every row names its switch, its parts and its return switch. */
static void test_rows(void)
{
    br_design *d = br_test_fcml(4, 900.0, 100e3, 0.5, 50e-9);
    br_text *t = render(d, NULL);
    static const char *const names[] = {"B1", "B2", "B3", "A3", "A2", "A1"};
    for (int i = 0; i < 6; i++)
        CU_ASSERT_TRUE(has(t, names[i]));
    CU_ASSERT_TRUE(has(t, "test-diode"));
    CU_ASSERT_TRUE(has(t, "test-cap"));
    CU_ASSERT_TRUE(has(t, "test-driver"));
    CU_ASSERT_TRUE(has(t, "test-switch"));
    CU_ASSERT_TRUE(has(t, "(fed by the supply)"));
    br_text_free(t);
    br_design_free(d);
}

/* Findings name the part, the figure and the limit. */
static void test_findings(void)
{
    int nwarn = 0;
    br_design *d = br_test_fcml(3, 800.0, 100e3, 0.5, 50e-9);
    d->overshoot = br_qty_fixed(0.25);          /* 400 V -> 500 V: derating (480 V) */
    d->switches[0].vgs_max = br_qty_fixed(7.0); /* 12 V supply, no regulator */
    br_text *t = render(d, &nwarn);
    CU_ASSERT_EQUAL(nwarn, 3 + 4);
    CU_ASSERT_TRUE(has(t, "design rules: 7 warnings"));
    CU_ASSERT_TRUE(has(t, "link 1 (rail B2, returns via B1) diode test-diode: must block 500.0 V, "
                          "83 % of its 600 V rating; the derating limit is 80 % (480.0 V)"));
    CU_ASSERT_TRUE(has(t, "stage 3 (A1) switch test-switch: gate absolute maximum 7 V is below "
                          "the supply (up to 12 V)"));
    br_text_free(t);
    br_design_free(d);
}

static void test_fatal_finding(void)
{
    br_design *d = br_test_fcml(3, 800.0, 100e3, 0.5, 50e-9);
    d->vsupply = br_qty_fixed(8.0);
    d->def.r_link = br_qty_fixed(200.0);
    int nwarn = -1, nfatal = -1;
    br_text *t = render_fatal(d, &nwarn, &nfatal);
    CU_ASSERT_EQUAL(nfatal, 1);
    CU_ASSERT_TRUE(nwarn >= nfatal);
    CU_ASSERT_TRUE(has(t, "THE CHAIN CANNOT WORK"));
    CU_ASSERT_TRUE(has(t, "design rules: FAIL, "));
    CU_ASSERT_TRUE(has(t, "  FAIL: rail "));
    CU_ASSERT_TRUE(has(t, "below its UVLO rising 7.5 V"));
    br_text_free(t);
    br_design_free(d);
}

/* A pre-charge step that ends before the supply ramp lets the first
 * driver start: by hand, 200 us * 7.5 V / 12 V = 125 us. */
static void test_precharge_finding(void)
{
    br_design *d = br_test_fcml(3, 800.0, 100e3, 0.5, 50e-9);
    d->tramp = br_qty_fixed(200e-6);
    d->nprecharge = 1;
    d->precharge[0].mask = 0x3;
    d->precharge[0].duration = 50e-6;
    br_text *t = render(d, NULL);
    CU_ASSERT_TRUE(has(t, "warning: startup precharge 1 (holds B1 B2 from 0 s to 50 us): none of "
                          "its switches can turn on in it: the driver of B1 leaves UVLO at 125 us "
                          "at the earliest (the supply ramps to at most 12 V over 200 us, and the "
                          "driver needs 7.5 V on its rail); the step does nothing"));
    br_text_free(t);
    br_design_free(d);
}

/* Every report ends with the caution. */
static void test_caution_last(void)
{
    br_design *d = br_test_fcml(3, 800.0, 100e3, 0.5, 50e-9);
    br_text *t = render(d, NULL);
    const char *s = br_text_data(t);
    const char *end = "These circuits carry lethal voltages.\n";
    size_t n = strlen(s), m = strlen(end);
    CU_ASSERT_TRUE_FATAL(n > m);
    CU_ASSERT_STRING_EQUAL(s + n - m, end);
    CU_ASSERT_TRUE(has(t, "do not replace measurement on the real"));
    br_text_free(t);
    br_design_free(d);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"operating point and stage table", test_table},
        {"a window that wraps past the period end", test_wrapping_window},
        {"every switch and part appears", test_rows},
        {"findings name part, figure and limit", test_findings},
        {"a chain that cannot work says so", test_fatal_finding},
        {"the caution closes the report", test_caution_last},
        {"a pre-charge step that does nothing", test_precharge_finding},
        {NULL, NULL},
    };
    return br_test_main("report_check", cases);
}

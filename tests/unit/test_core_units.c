/* test_core_units.c - quantities with SI units and tolerances. */
#include "core/units.h"
#include "model/design.h"
#include "testkit.h"

#include <locale.h>
#include <string.h>

/* Parse text as kind and return the SI value; a failure fails the test. */
static double val(const char *text, br_kind kind)
{
    br_error err;
    double v = -12345.0;
    br_error_clear(&err);
    int rc = br_unit_parse(text, kind, &v, &err);
    if (rc != BR_OK)
        fprintf(stderr, "'%s': %s\n", text, err.msg);
    CU_ASSERT_EQUAL(rc, BR_OK);
    return v;
}

/* Expect text to be rejected with a message containing want. */
static void bad(const char *text, br_kind kind, const char *want)
{
    br_error err;
    double v = 42.0;
    br_error_clear(&err);
    int rc = br_unit_parse(text, kind, &v, &err);
    CU_ASSERT_EQUAL(rc, BR_EINPUT);
    CU_ASSERT_EQUAL(err.code, BR_EINPUT);
    CU_ASSERT_EQUAL(v, 42.0); /* untouched on failure */
    if (!strstr(err.msg, want))
        fprintf(stderr, "'%s': message '%s' lacks '%s'\n", text ? text : "(null)", err.msg, want);
    CU_ASSERT_PTR_NOT_NULL(strstr(err.msg, want));
}

static br_qty qty(const char *text, br_kind kind)
{
    br_error err;
    br_qty q;
    memset(&q, 0, sizeof q);
    br_error_clear(&err);
    int rc = br_qty_parse(text, kind, &q, &err);
    if (rc != BR_OK)
        fprintf(stderr, "'%s': %s\n", text, err.msg);
    CU_ASSERT_EQUAL(rc, BR_OK);
    return q;
}

static void bad_qty(const char *text, br_kind kind, const char *want)
{
    br_error err;
    br_qty q = br_qty_fixed(7.0);
    br_error_clear(&err);
    CU_ASSERT_EQUAL(br_qty_parse(text, kind, &q, &err), BR_EINPUT);
    CU_ASSERT_EQUAL(q.nom, 7.0);
    if (!strstr(err.msg, want))
        fprintf(stderr, "'%s': message '%s' lacks '%s'\n", text, err.msg, want);
    CU_ASSERT_PTR_NOT_NULL(strstr(err.msg, want));
}

static void test_prefixes(void)
{
    BR_ASSERT_REL(val("4.7u", BR_KIND_CAPACITANCE), 4.7e-6, 1e-15);
    BR_ASSERT_REL(val("4.7 uF", BR_KIND_CAPACITANCE), 4.7e-6, 1e-15);
    BR_ASSERT_REL(val("4.7uF", BR_KIND_CAPACITANCE), 4.7e-6, 1e-15);
    BR_ASSERT_REL(val("4.7 \xC2\xB5"
                      "F",
                      BR_KIND_CAPACITANCE),
                  4.7e-6, 1e-15);
    BR_ASSERT_REL(val("4.7 \xCE\xBC"
                      "F",
                      BR_KIND_CAPACITANCE),
                  4.7e-6, 1e-15);
    BR_ASSERT_REL(val("100 pF", BR_KIND_CAPACITANCE), 100e-12, 1e-15);
    BR_ASSERT_REL(val("3 fF", BR_KIND_CAPACITANCE), 3e-15, 1e-15);
    BR_ASSERT_REL(val("2 mF", BR_KIND_CAPACITANCE), 2e-3, 1e-15);
    BR_ASSERT_REL(val("650V", BR_KIND_VOLTAGE), 650.0, 1e-15);
    BR_ASSERT_REL(val("1.2 kV", BR_KIND_VOLTAGE), 1200.0, 1e-15);
    BR_ASSERT_REL(val("200 kHz", BR_KIND_FREQUENCY), 200e3, 1e-15);
    BR_ASSERT_REL(val("1.5 MHz", BR_KIND_FREQUENCY), 1.5e6, 1e-15);
    BR_ASSERT_REL(val("200k", BR_KIND_FREQUENCY), 200e3, 1e-15);
    BR_ASSERT_REL(val("50 ns", BR_KIND_TIME), 50e-9, 1e-15);
    BR_ASSERT_REL(val("20 us", BR_KIND_TIME), 20e-6, 1e-15);
    BR_ASSERT_REL(val("10 ms", BR_KIND_TIME), 10e-3, 1e-15);
    BR_ASSERT_REL(val("2 mA", BR_KIND_CURRENT), 2e-3, 1e-15);
    BR_ASSERT_REL(val("10 nC", BR_KIND_CHARGE), 10e-9, 1e-15);
    BR_ASSERT_REL(val("3 GHz", BR_KIND_FREQUENCY), 3e9, 1e-15);
}

/* "m" alone is milli whatever the kind; M is mega. */
static void test_milli_vs_unit(void)
{
    BR_ASSERT_REL(val("10 m", BR_KIND_RESISTANCE), 10e-3, 1e-15);
    BR_ASSERT_REL(val("10 mohm", BR_KIND_RESISTANCE), 10e-3, 1e-15);
    BR_ASSERT_REL(val("10 m\xCE\xA9", BR_KIND_RESISTANCE), 10e-3, 1e-15);
    BR_ASSERT_REL(val("1 Ohm", BR_KIND_RESISTANCE), 1.0, 1e-15);
    BR_ASSERT_REL(val("1 ohm", BR_KIND_RESISTANCE), 1.0, 1e-15);
    BR_ASSERT_REL(val("2.2 kohm", BR_KIND_RESISTANCE), 2200.0, 1e-15);
    BR_ASSERT_REL(val("1 M", BR_KIND_RESISTANCE), 1e6, 1e-15);
    BR_ASSERT_REL(val("1 Mohm", BR_KIND_RESISTANCE), 1e6, 1e-15);
    BR_ASSERT_REL(val("5 m", BR_KIND_TIME), 5e-3, 1e-15);
    /* C is coulomb for a charge: "mC" is millicoulomb, not a prefix pair */
    BR_ASSERT_REL(val("1 mC", BR_KIND_CHARGE), 1e-3, 1e-15);
    BR_ASSERT_REL(val("1 C", BR_KIND_CHARGE), 1.0, 1e-15);
    /* F is farad, f is femto */
    BR_ASSERT_REL(val("1 F", BR_KIND_CAPACITANCE), 1.0, 1e-15);
    BR_ASSERT_REL(val("1 f", BR_KIND_CAPACITANCE), 1e-15, 1e-15);
}

static void test_bare_numbers(void)
{
    BR_ASSERT_REL(val("0.8", BR_KIND_FRACTION), 0.8, 1e-15);
    BR_ASSERT_REL(val("80 %", BR_KIND_FRACTION), 0.8, 1e-15);
    BR_ASSERT_REL(val("80%", BR_KIND_FRACTION), 0.8, 1e-15);
    BR_ASSERT_REL(val("1e-7 A", BR_KIND_CURRENT), 1e-7, 1e-15);
    BR_ASSERT_REL(val("1E+3 V", BR_KIND_VOLTAGE), 1e3, 1e-15);
    BR_ASSERT_REL(val("  12 V  ", BR_KIND_VOLTAGE), 12.0, 1e-15);
    BR_ASSERT_REL(val(".5", BR_KIND_NUMBER), 0.5, 1e-15);
    BR_ASSERT_REL(val("5.", BR_KIND_NUMBER), 5.0, 1e-15);
    BR_ASSERT_REL(val("0.000123", BR_KIND_NUMBER), 1.23e-4, 1e-15);
    BR_ASSERT_REL(val("-3.5", BR_KIND_NUMBER), -3.5, 1e-15);
    BR_ASSERT_REL(val("+2", BR_KIND_NUMBER), 2.0, 1e-15);
    BR_ASSERT_REL(val("1.5", BR_KIND_NUMBER), 1.5, 1e-15);
    BR_ASSERT_REL(val("3.26 eV", BR_KIND_ENERGY_EV), 3.26, 1e-15);
    BR_ASSERT_REL(val("3.26eV", BR_KIND_ENERGY_EV), 3.26, 1e-15);
    CU_ASSERT_EQUAL(val("0", BR_KIND_VOLTAGE), 0.0);
    CU_ASSERT_EQUAL(val("0.0e0", BR_KIND_VOLTAGE), 0.0);
    CU_ASSERT_EQUAL(val("0", BR_KIND_CAPACITANCE), 0.0);
}

/* A dimensioned value needs its unit, or at least a prefix that states
 * the scale; only plain numbers, fractions and 0 may be bare.  "62" for a
 * gate charge would be 62 C, and "12" for a junction capacitance 12 F. */
static void test_unit_required(void)
{
    bad("62", BR_KIND_CHARGE, "got '62' without a unit, expected a charge like '10 nC'");
    bad("12", BR_KIND_CAPACITANCE, "got '12' without a unit, expected a capacitance");
    bad("1e-7", BR_KIND_CURRENT, "got '1e-7' without a unit");
    bad("  12  ", BR_KIND_VOLTAGE, "got '12' without a unit, expected a voltage");
    bad("200e3", BR_KIND_FREQUENCY, "without a unit");
    bad("50e-9", BR_KIND_TIME, "without a unit");
    bad("10", BR_KIND_RESISTANCE, "without a unit");
    bad("1.11", BR_KIND_ENERGY_EV, "without a unit");
    bad("10", BR_KIND_TEMP_DELTA, "without a unit");
    bad("-3", BR_KIND_VOLTAGE, "got '-3' without a unit");
    /* a prefix alone states the scale: accepted */
    BR_ASSERT_REL(val("62n", BR_KIND_CHARGE), 62e-9, 1e-15);
    BR_ASSERT_REL(val("12p", BR_KIND_CAPACITANCE), 12e-12, 1e-15);
    BR_ASSERT_REL(val("200k", BR_KIND_FREQUENCY), 200e3, 1e-15);
    /* every value of a toleranced quantity: the absolute tolerance too */
    bad_qty("12 V +-0.5", BR_KIND_VOLTAGE, "got '0.5' without a unit");
    bad_qty("-3/-2/-1", BR_KIND_VOLTAGE, "without a unit");
    BR_ASSERT_REL(qty("12 V +-0.5 V", BR_KIND_VOLTAGE).max, 12.5, 1e-15);
    BR_ASSERT_REL(qty("0 V +-1 mV", BR_KIND_VOLTAGE).max, 1e-3, 1e-15);
}

/* I2t ratings in A^2 s, spelt A2s, A^2s or A²s; no prefix, since "mA2s"
 * could mean 1e-3 A^2 s or (1 mA)^2 s = 1e-6 A^2 s. */
static void test_i2t(void)
{
    BR_ASSERT_REL(val("4.5 A2s", BR_KIND_I2T), 4.5, 1e-15);
    BR_ASSERT_REL(val("4.5A^2s", BR_KIND_I2T), 4.5, 1e-15);
    BR_ASSERT_REL(val("4.5 A\xC2\xB2s", BR_KIND_I2T), 4.5, 1e-15);
    BR_ASSERT_REL(val("2e-3 A2s", BR_KIND_I2T), 2e-3, 1e-15);
    BR_ASSERT_REL(qty("4 A2s +-10%", BR_KIND_I2T).min, 3.6, 1e-12);
    bad("4.5 mA2s", BR_KIND_I2T, "no prefix");
    bad("4.5", BR_KIND_I2T, "without a unit, expected an I2t like '4.5 A2s'");
    bad("4.5 A", BR_KIND_I2T, "got 'A'");
    /* a power in a unit does not open other units to digits */
    bad("12 V2", BR_KIND_VOLTAGE, "got 'V2'");
}

/* Powers in W with prefixes; thermal resistances in K/W (C/W the same,
 * a difference of one kelvin is one of a degree Celsius), without
 * prefixes, and whose '/' must not be taken for a min / typ / max. */
static void test_power_thermal(void)
{
    BR_ASSERT_REL(val("250 mW", BR_KIND_POWER), 0.25, 1e-15);
    BR_ASSERT_REL(val("1.5 W", BR_KIND_POWER), 1.5, 1e-15);
    bad("2", BR_KIND_POWER, "without a unit, expected a power like '250 mW'");
    bad("2 MW", BR_KIND_POWER, "prefix 'M' does not fit");
    BR_ASSERT_REL(val("60 K/W", BR_KIND_THERMAL_R), 60.0, 1e-15);
    BR_ASSERT_REL(val("60 C/W", BR_KIND_THERMAL_R), 60.0, 1e-15);
    BR_ASSERT_REL(val("60K/W", BR_KIND_THERMAL_R), 60.0, 1e-15);
    br_qty q = qty("60 K/W +-10%", BR_KIND_THERMAL_R);
    BR_ASSERT_REL(q.min, 54.0, 1e-12);
    BR_ASSERT_REL(q.max, 66.0, 1e-12);
    q = qty("50/60/70 K/W", BR_KIND_THERMAL_R);
    BR_ASSERT_REL(q.min, 50.0, 1e-12);
    BR_ASSERT_REL(q.nom, 60.0, 1e-12);
    BR_ASSERT_REL(q.max, 70.0, 1e-12);
    bad("60 mK/W", BR_KIND_THERMAL_R, "no prefix");
    bad("60", BR_KIND_THERMAL_R, "without a unit");
    bad("60 K", BR_KIND_THERMAL_R, "got 'K'");
    bad("2e5 K/W", BR_KIND_THERMAL_R, "at most 10000 K/W");
}

/* Magnitudes no design can mean are refused with the bound they break. */
static void test_sane_limits(void)
{
    bad("1e300 V", BR_KIND_VOLTAGE,
        "got '1e300 V', beyond any value that can be meant here; "
        "expected a voltage like '12 V' of at most 1 MV");
    bad("1.1 MV", BR_KIND_VOLTAGE, "at most 1 MV");
    bad("-2 MV", BR_KIND_VOLTAGE, "at most 1 MV");
    bad("2 F", BR_KIND_CAPACITANCE, "at most 1 F");
    bad("2 THz", BR_KIND_FREQUENCY, "got 'THz'"); /* T is no prefix: a unit error */
    bad("2e12 Hz", BR_KIND_FREQUENCY, "at most 1000 GHz");
    bad("20000 s", BR_KIND_TIME, "at most 10000 s");
    bad("2 C", BR_KIND_CHARGE, "at most 1 C");
    bad_qty("1 MV +-50%", BR_KIND_VOLTAGE, "at most 1 MV");
    BR_ASSERT_REL(val("1 MV", BR_KIND_VOLTAGE), 1e6, 1e-15);
    BR_ASSERT_REL(val("1e12", BR_KIND_NUMBER), 1e12, 1e-15); /* plain numbers have ranges of
                                                                their own, per attribute */
}

static void test_temperature(void)
{
    BR_ASSERT_NEAR(val("85 C", BR_KIND_TEMPERATURE), 358.15, 1e-12);
    BR_ASSERT_NEAR(val("358 K", BR_KIND_TEMPERATURE), 358.0, 1e-12);
    BR_ASSERT_NEAR(val("-40 C", BR_KIND_TEMPERATURE), 233.15, 1e-12);
    BR_ASSERT_NEAR(val("27degC", BR_KIND_TEMPERATURE), 300.15, 1e-12);
    BR_ASSERT_NEAR(val("27 \xC2\xB0"
                       "C",
                       BR_KIND_TEMPERATURE),
                   300.15, 1e-12);
    BR_ASSERT_NEAR(val("10 K", BR_KIND_TEMP_DELTA), 10.0, 1e-12);
    BR_ASSERT_NEAR(val("10 C", BR_KIND_TEMP_DELTA), 10.0, 1e-12);
    bad("85", BR_KIND_TEMPERATURE, "ambiguous");
    bad("85 kC", BR_KIND_TEMPERATURE, "expected a temperature");
    bad("85 V", BR_KIND_TEMPERATURE, "got 'V', expected a temperature like '85 C'");
}

/* A phase angle: degrees as written, radians inside (1 deg = pi/180 rad,
 * the definition of the degree). */
static void test_angle(void)
{
    const double deg = 3.14159265358979323846 / 180.0;
    BR_ASSERT_NEAR(val("30 deg", BR_KIND_ANGLE), 30.0 * deg, 1e-15);
    BR_ASSERT_NEAR(val("-90deg", BR_KIND_ANGLE), -90.0 * deg, 1e-15);
    BR_ASSERT_NEAR(val("45 \xC2\xB0", BR_KIND_ANGLE), 45.0 * deg, 1e-15);
    BR_ASSERT_NEAR(val("0", BR_KIND_ANGLE), 0.0, 0.0);
    br_qty q = qty("20 deg +-5 deg", BR_KIND_ANGLE);
    BR_ASSERT_NEAR(q.min, 15.0 * deg, 1e-15);
    BR_ASSERT_NEAR(q.max, 25.0 * deg, 1e-15);
    bad("30", BR_KIND_ANGLE, "an angle like '30 deg'");
    bad("30 kdeg", BR_KIND_ANGLE, "no prefix");
    bad("30 V", BR_KIND_ANGLE, "expected an angle");
}

static void test_wrong_units(void)
{
    bad("4.7 uF", BR_KIND_VOLTAGE, "got 'uF', expected a voltage like '12 V'");
    bad("12 V", BR_KIND_CURRENT, "got 'V', expected a current");
    bad("10 nC", BR_KIND_CAPACITANCE, "got 'nC', expected a capacitance");
    bad("10 Hz", BR_KIND_TIME, "expected a time");
    bad("10 s", BR_KIND_FREQUENCY, "expected a frequency");
    bad("80 %", BR_KIND_NUMBER, "expected a plain number");
    bad("1.5 V", BR_KIND_NUMBER, "got 'V'");
    bad("5 uV", BR_KIND_ENERGY_EV, "expected an energy");
    bad("10 mm", BR_KIND_RESISTANCE, "got 'mm'");
    bad("10 xF", BR_KIND_CAPACITANCE, "got 'xF'");
    bad("10 %", BR_KIND_VOLTAGE, "got '%'");
    /* a megafarad is a typo for milli: refused with the prefixes that fit */
    bad("10 MF", BR_KIND_CAPACITANCE, "prefix 'M' does not fit");
    bad("1 ks", BR_KIND_TIME, "prefix 'k'");
}

static void test_garbage(void)
{
    bad("", BR_KIND_VOLTAGE, "empty value");
    bad("   ", BR_KIND_VOLTAGE, "empty value");
    bad(NULL, BR_KIND_VOLTAGE, "empty value");
    bad("V", BR_KIND_VOLTAGE, "not a number");
    bad("nan", BR_KIND_VOLTAGE, "not a number");
    bad("NaN V", BR_KIND_VOLTAGE, "not a number");
    bad("inf", BR_KIND_VOLTAGE, "not a number");
    bad("-inf", BR_KIND_VOLTAGE, "not a number");
    bad("0x10", BR_KIND_VOLTAGE, "got 'x10'");
    bad("12 V extra", BR_KIND_VOLTAGE, "unexpected 'extra'");
    bad("12 V 5", BR_KIND_VOLTAGE, "unexpected '5'");
    bad("12,5 V", BR_KIND_VOLTAGE, "unexpected ',5 V'");
    bad("1.2.3", BR_KIND_VOLTAGE, "unexpected '.3'");
    bad("1e999", BR_KIND_VOLTAGE, "out of range");
    bad("1e-999", BR_KIND_VOLTAGE, "out of range");
    bad("1e308 G", BR_KIND_VOLTAGE, "out of range");
    bad("-", BR_KIND_VOLTAGE, "not a number");
    bad("12 V +-5%", BR_KIND_VOLTAGE, "no tolerance allowed");
    bad("1234567890123456789012345678901234567890123", BR_KIND_NUMBER, "too many digits");
}

/* A caller may have switched to a locale with a decimal comma; the file
 * format does not change with it.  (Only meaningful where a de_DE locale
 * is installed; elsewhere it checks the C locale.) */
static void test_locale_independent(void)
{
    const char *set = setlocale(LC_NUMERIC, "de_DE.UTF-8");
    BR_ASSERT_REL(val("4.7 uF", BR_KIND_CAPACITANCE), 4.7e-6, 1e-15);
    if (set)
        setlocale(LC_NUMERIC, "C");
}

static void test_symmetric(void)
{
    br_qty q = qty("2.2 uF +-10%", BR_KIND_CAPACITANCE);
    BR_ASSERT_REL(q.nom, 2.2e-6, 1e-14);
    BR_ASSERT_REL(q.min, 1.98e-6, 1e-12);
    BR_ASSERT_REL(q.max, 2.42e-6, 1e-12);
    CU_ASSERT_EQUAL(q.dist, BR_DIST_UNIFORM);
    CU_ASSERT_EQUAL(q.line, 0);
    q = qty("12 V \xC2\xB1 5 %", BR_KIND_VOLTAGE);
    BR_ASSERT_REL(q.min, 11.4, 1e-12);
    BR_ASSERT_REL(q.max, 12.6, 1e-12);
    q = qty("12 V +- 0.5 V", BR_KIND_VOLTAGE);
    BR_ASSERT_REL(q.min, 11.5, 1e-12);
    BR_ASSERT_REL(q.max, 12.5, 1e-12);
    q = qty("12 V +-500 mV", BR_KIND_VOLTAGE);
    BR_ASSERT_REL(q.max, 12.5, 1e-12);
    /* percent of the magnitude: a negative nominal keeps min < max */
    q = qty("-2 V +-10%", BR_KIND_VOLTAGE);
    BR_ASSERT_REL(q.min, -2.2, 1e-12);
    BR_ASSERT_REL(q.max, -1.8, 1e-12);
    /* temperature tolerances are differences, not offsets */
    q = qty("25 C +-5 C", BR_KIND_TEMPERATURE);
    BR_ASSERT_NEAR(q.nom, 298.15, 1e-12);
    BR_ASSERT_NEAR(q.min, 293.15, 1e-12);
    BR_ASSERT_NEAR(q.max, 303.15, 1e-12);
}

static void test_plain_qty(void)
{
    br_qty q = qty("650 V", BR_KIND_VOLTAGE);
    CU_ASSERT_EQUAL(q.nom, 650.0);
    CU_ASSERT_EQUAL(q.min, 650.0);
    CU_ASSERT_EQUAL(q.max, 650.0);
    BR_ASSERT_REL(q.nsig, 3.0, 1e-15);
    q = qty("0.5 normal", BR_KIND_FRACTION);
    CU_ASSERT_EQUAL(q.nom, 0.5);
    CU_ASSERT_EQUAL(q.dist, BR_DIST_NORMAL);
}

static void test_asymmetric(void)
{
    br_qty q = qty("2.2 uF +10%/-20%", BR_KIND_CAPACITANCE);
    BR_ASSERT_REL(q.nom, 2.2e-6, 1e-14);
    BR_ASSERT_REL(q.min, 1.76e-6, 1e-12);
    BR_ASSERT_REL(q.max, 2.42e-6, 1e-12);
    q = qty("2.2 uF -20% / +10%", BR_KIND_CAPACITANCE);
    BR_ASSERT_REL(q.min, 1.76e-6, 1e-12);
    BR_ASSERT_REL(q.max, 2.42e-6, 1e-12);
    q = qty("10 nC +2 nC/-1 nC normal", BR_KIND_CHARGE);
    BR_ASSERT_REL(q.min, 9e-9, 1e-12);
    BR_ASSERT_REL(q.max, 12e-9, 1e-12);
    CU_ASSERT_EQUAL(q.dist, BR_DIST_NORMAL);
    BR_ASSERT_REL(q.nsig, 3.0, 1e-15);
}

static void test_min_typ_max(void)
{
    br_qty q = qty("0.6 V / 0.7 V / 0.8 V", BR_KIND_VOLTAGE);
    BR_ASSERT_REL(q.min, 0.6, 1e-15);
    BR_ASSERT_REL(q.nom, 0.7, 1e-15);
    BR_ASSERT_REL(q.max, 0.8, 1e-15);
    q = qty("0.6/0.7/0.8 V", BR_KIND_VOLTAGE);
    BR_ASSERT_REL(q.min, 0.6, 1e-15);
    BR_ASSERT_REL(q.nom, 0.7, 1e-15);
    BR_ASSERT_REL(q.max, 0.8, 1e-15);
    q = qty("600 mV/0.7/0.8 V", BR_KIND_VOLTAGE);
    BR_ASSERT_REL(q.min, 0.6, 1e-15);
    q = qty("4/4.5/5 mA normal", BR_KIND_CURRENT);
    BR_ASSERT_REL(q.nom, 4.5e-3, 1e-15);
    CU_ASSERT_EQUAL(q.dist, BR_DIST_NORMAL);
    q = qty("20/25/30 C", BR_KIND_TEMPERATURE);
    BR_ASSERT_NEAR(q.min, 293.15, 1e-12);
    BR_ASSERT_NEAR(q.max, 303.15, 1e-12);
    q = qty("-3/-2/-1 V", BR_KIND_VOLTAGE);
    BR_ASSERT_REL(q.min, -3.0, 1e-15);
    BR_ASSERT_REL(q.max, -1.0, 1e-15);
}

static void test_bad_tolerances(void)
{
    bad_qty("0.8/0.7/0.6 V", BR_KIND_VOLTAGE, "out of order");
    bad_qty("0.6/0.7 V", BR_KIND_VOLTAGE, "'/'");
    bad_qty("2.2 uF +-", BR_KIND_CAPACITANCE, "missing number");
    bad_qty("2.2 uF +-10% gaussian", BR_KIND_CAPACITANCE, "'gaussian', expected a distribution");
    bad_qty("2.2 uF +10%", BR_KIND_CAPACITANCE, "'/' between");
    bad_qty("2.2 uF +10%/+20%", BR_KIND_CAPACITANCE, "'-' side");
    bad_qty("2.2 uF +-10 V", BR_KIND_CAPACITANCE, "got 'V'");
    bad_qty("2.2 uF +--10%", BR_KIND_CAPACITANCE, "negative tolerance");
    bad_qty("25 C +-10%", BR_KIND_TEMPERATURE, "must be absolute");
    bad_qty("2.2 uF +-10% normal x", BR_KIND_CAPACITANCE, "unexpected 'x'");
    bad_qty("2.2 uF normal uniform", BR_KIND_CAPACITANCE, "unexpected 'uniform'");
    bad_qty("", BR_KIND_CAPACITANCE, "empty value");
    bad_qty("4.7 uF", BR_KIND_VOLTAGE, "got 'uF', expected a voltage like '12 V'");
}

static void test_expected_words(void)
{
    CU_ASSERT_STRING_EQUAL(br_kind_expected(BR_KIND_VOLTAGE), "a voltage like '12 V'");
    CU_ASSERT_STRING_EQUAL(br_kind_unit(BR_KIND_RESISTANCE), "ohm");
    CU_ASSERT_STRING_EQUAL(br_kind_unit(BR_KIND_TEMPERATURE), "K");
    br_error err;
    double v;
    CU_ASSERT_EQUAL(br_unit_parse("1", BR_KIND_COUNT, &v, &err), BR_EUSAGE);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"SI prefixes", test_prefixes},
        {"milli versus a unit letter", test_milli_vs_unit},
        {"bare numbers, fractions, eV", test_bare_numbers},
        {"a dimensioned value needs its unit or a prefix", test_unit_required},
        {"magnitudes beyond any design are refused", test_sane_limits},
        {"I2t in A2s", test_i2t},
        {"powers and thermal resistances", test_power_thermal},
        {"temperatures in C and K", test_temperature},
        {"angles in degrees, radians inside", test_angle},
        {"wrong units say what was expected", test_wrong_units},
        {"garbage, NaN, inf, overflow", test_garbage},
        {"decimal point independent of locale", test_locale_independent},
        {"plain toleranced quantity", test_plain_qty},
        {"symmetric tolerance", test_symmetric},
        {"asymmetric tolerance", test_asymmetric},
        {"min / typ / max", test_min_typ_max},
        {"bad tolerances", test_bad_tolerances},
        {"kind words", test_expected_words},
        {NULL, NULL},
    };
    return br_test_main("core_units", cases);
}

/* test_report_format.c - the display helpers every report shares:
 * engineering prefixes, column tables, wrapped paragraphs, and the
 * decimated CSV series fed by a simulator observer. */
#include "report/csv.h"
#include "report/fmt.h"
#include "report/report_common.h"
#include "report/table.h"
#include "testkit.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

static void expect_si(double v, int digits, const char *unit, const char *want)
{
    char buf[32];
    br_fmt_si(buf, sizeof buf, v, digits, unit);
    if (strcmp(buf, want) != 0)
        fprintf(stderr, "br_fmt_si(%g) = [%s], expected [%s]\n", v, buf, want);
    CU_ASSERT_STRING_EQUAL(buf, want);
}

/* SI prefixes (BIPM, The International System of Units, 9th ed., 2019,
 * table 7): m = 1e-3, u (micro) = 1e-6, n = 1e-9, k = 1e3. */
static void test_si(void)
{
    expect_si(0.0123, 4, "A", "12.3 mA");
    expect_si(4.7e-6, 3, "F", "4.7 uF");
    expect_si(-0.425, 4, "V", "-425 mV");
    expect_si(1100.0, 4, "V", "1.1 kV");
    expect_si(25e-9, 3, "s", "25 ns");
    expect_si(0.0, 3, "W", "0 W");
    expect_si(1e-3, 3, "V", "1 mV"); /* an exact power of 1000 stays in its prefix */
    /* rounding to 4 digits carries 999.96 mV into the next prefix */
    expect_si(0.99996, 4, "V", "1 V");
    expect_si(5.0, 3, "", "5");
    expect_si(NAN, 3, "V", "n/a");
}

static void test_scale(void)
{
    br_scale s = br_scale_for(0.0395, "V");
    CU_ASSERT_STRING_EQUAL(s.unit, "mV");
    BR_ASSERT_REL(s.factor, 1e3, 1e-12);
    /* a column of small values does not go finer than asked */
    s = br_scale_column(3e-9, 1e-3, "A");
    CU_ASSERT_STRING_EQUAL(s.unit, "mA");
    s = br_scale_column(0.0, 1e-6, "s");
    CU_ASSERT_STRING_EQUAL(s.unit, "us");
    s = br_scale_column(7.48, 1e-3, "A");
    CU_ASSERT_STRING_EQUAL(s.unit, "A");
    char buf[32];
    CU_ASSERT_STRING_EQUAL(br_fmt_in(buf, sizeof buf, -0.00001, &s, 3), "0.000"); /* no -0 */
    CU_ASSERT_STRING_EQUAL(br_fmt_in(buf, sizeof buf, 1.23456, &s, 2), "1.23");
    /* a value far beyond the column's prefix never prints dozens of digits */
    s = br_scale_column(1e9, 1e-3, "V"); /* GV, the largest prefix */
    CU_ASSERT_STRING_EQUAL(s.unit, "GV");
    CU_ASSERT_STRING_EQUAL(br_fmt_in(buf, sizeof buf, -1.339e147, &s, 3), "-1.339e+138");
    CU_ASSERT_STRING_EQUAL(br_fmt_in(buf, sizeof buf, 2.5e15, &s, 3), "2.5e+06");
    CU_ASSERT_STRING_EQUAL(br_fmt_in(buf, sizeof buf, 999.9e12, &s, 1), "999900.0");
    CU_ASSERT_STRING_EQUAL(br_fmt_time(buf, sizeof buf, -1.0), "-");
    CU_ASSERT_STRING_EQUAL(br_fmt_time(buf, sizeof buf, 1.5126e-3), "1.513 ms");
}

static void test_table(void)
{
    br_table *t = br_table_create(3, 2);
    br_text *out = br_text_create();
    CU_ASSERT_PTR_NOT_NULL_FATAL(t);
    CU_ASSERT_PTR_NOT_NULL_FATAL(out);
    br_table_head(t, 0, "stage", BR_RIGHT);
    br_table_head(t, 1, "switch", BR_LEFT);
    br_table_head(t, 2, "note", BR_LEFT);
    CU_ASSERT_EQUAL(br_table_row(t), 0);
    br_table_set(t, 0, "%d", 7);
    br_table_set(t, 1, "A1");
    br_table_set(t, 2, "long note");
    CU_ASSERT_EQUAL(br_table_row(t), 1);
    br_table_set(t, 0, "%d", 11);
    CU_ASSERT_EQUAL(br_table_row(t), -1); /* full */
    CU_ASSERT_EQUAL(br_table_render(t, 2, out), BR_OK);
    /* right-aligned numbers, left-aligned names, no trailing blanks */
    CU_ASSERT_STRING_EQUAL(br_text_data(out), "  stage  switch  note\n"
                                              "      7  A1      long note\n"
                                              "     11\n");
    br_table_free(t);
    br_table_free(NULL);
    br_text_free(out);
}

static void test_wrap(void)
{
    br_text *out = br_text_create();
    CU_ASSERT_PTR_NOT_NULL_FATAL(out);
    char text[400] = "";
    for (int i = 0; i < 40; i++)
        strcat(text, "word ");
    CU_ASSERT_EQUAL(br_report_wrap(out, "  lead: ", text, 4), BR_OK);
    const char *s = br_text_data(out);
    int lines = 0, longest = 0, len = 0;
    for (; *s; s++) {
        if (*s == '\n') {
            longest = len > longest ? len : longest;
            len = 0;
            lines++;
        } else {
            len++;
        }
    }
    CU_ASSERT_EQUAL(lines, 3); /* 8 + 40 * 5 characters in 100 columns */
    CU_ASSERT_TRUE(longest <= BR_REPORT_WIDTH);
    CU_ASSERT_TRUE(strstr(br_text_data(out), "\n    word") != NULL);
    br_text_free(out);
}

/* Rows of a series' text, and the value of one column (0 = series) of
 * row r (0-based) as a number. */
static int count_rows(const char *t)
{
    int rows = 0;
    for (; *t; t++)
        rows += *t == '\n';
    return rows;
}

static double field(const char *t, int row, int col)
{
    for (int r = 0; r < row; r++)
        t = strchr(t, '\n') + 1;
    for (int c = 0; c < col; c++)
        t = strchr(t, ',') + 1;
    return *t == ',' || *t == '\n' ? NAN : strtod(t, NULL);
}

/* Feed a series by hand: a sample every 1 us with min_dt 9.5 us makes
 * buckets of ten samples, each kept as two rows (the min/max envelope).
 * Link 1 carries a spike of 7 A at 23 us, between two kept rows' times,
 * and rail 2 a dip to 4 V at 37 us: the rows of their buckets hold them,
 * each at its own place in the bucket's order.  A UVLO transition before
 * the sample at 55 us keeps the sample before it (54 us) and the one
 * after it (55 us) as they are; the end keeps the last samples. */
static void test_csv_series(void)
{
    br_text *out = br_text_create();
    CU_ASSERT_PTR_NOT_NULL_FATAL(out);
    br_csv_series s;
    br_csv_series_init(&s, out, "startup", 3, 9.5e-6, 0.0);
    br_sim_observer o = br_csv_observer(&s);
    for (int k = 0; k <= 100; k++) {
        double v[3] = {12.0, 11.0, k == 37 ? 4.0 : 10.0}, i[3] = {0.0, k == 23 ? 7.0 : 0.1, 0.05};
        if (k == 55) {
            br_uvlo_event e = {k * 1e-6, 2, 1, 10.0};
            o.uvlo(o.ctx, &e);
        }
        o.sample(o.ctx, NULL, k * 1e-6, v, i, 3);
    }
    CU_ASSERT_EQUAL(br_csv_series_end(&s), BR_OK);
    const char *t = br_text_data(out);
    CU_ASSERT_EQUAL(count_rows(t), s.rows);
    /* buckets: 0 alone (the first sample), 1-10, 11-20, 21-30, 31-40,
     * 41-50, 51-53 (cut by the transition), then 54 and 55 alone, 56-65,
     * 66-75, 76-85, 86-95, 96-100: 2 + 9 x 2 + 2 rows... counted below */
    double peak = 0.0, dip = HUGE_VAL;
    for (int r = 0; r < s.rows; r++) {
        peak = fmax(peak, field(t, r, 6)); /* series,t,rail x3,supply,link1 */
        dip = fmin(dip, field(t, r, 4));
    }
    CU_ASSERT_DOUBLE_EQUAL(peak, 7.0, 0.0);
    CU_ASSERT_DOUBLE_EQUAL(dip, 4.0, 0.0);
    /* every row is 2 + 3 rails + supply + 2 links + 2 displacement + 3
     * drivers + 2 reverse voltages = 15 fields; fed without a simulator,
     * the supply, the displacement and the reverse voltages are empty */
    CU_ASSERT_PTR_NOT_NULL(strstr(t, "startup,5.4e-05,12,11,10,,0.1,0.05,,,12,11,10,,\n"));
    CU_ASSERT_PTR_NOT_NULL(strstr(t, "\nstartup,5.5e-05,12,11,10,"));
    CU_ASSERT_PTR_NOT_NULL(strstr(t, "\nstartup,0.0001,"));
    /* a bucket's two rows sit at its first and last sample */
    CU_ASSERT_PTR_NOT_NULL(strstr(t, "\nstartup,2.1e-05,"));
    CU_ASSERT_PTR_NOT_NULL(strstr(t, "\nstartup,3e-05,"));
    CU_ASSERT_PTR_NULL(strstr(t, "\nstartup,2.3e-05,"));
    /* about two rows per bucket, against one per sample */
    CU_ASSERT_TRUE(s.rows >= 20 && s.rows <= 26);
    br_text_free(out);
}

/* min_dt 0 keeps every sample as it is. */
static void test_csv_every_sample(void)
{
    br_text *out = br_text_create();
    CU_ASSERT_PTR_NOT_NULL_FATAL(out);
    br_csv_series s;
    br_csv_series_init(&s, out, "steady", 2, 0.0, 1e-6);
    br_sim_observer o = br_csv_observer(&s);
    for (int k = 0; k < 7; k++) {
        double v[2] = {12.0, 11.0 + k}, i[2] = {0.0, 0.1 * k};
        o.sample(o.ctx, NULL, k * 1e-6, v, i, 2);
    }
    CU_ASSERT_EQUAL(br_csv_series_end(&s), BR_OK);
    CU_ASSERT_EQUAL(s.rows, 7);
    CU_ASSERT_EQUAL(count_rows(br_text_data(out)), 7);
    /* t_offset is added: the first row is at 1 us */
    CU_ASSERT_TRUE(strncmp(br_text_data(out), "steady,1e-06,12,11,", 19) == 0);
    br_text_free(out);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"engineering prefixes", test_si},
        {"column scales and fixed decimals", test_scale},
        {"table layout", test_table},
        {"wrapped paragraphs", test_wrap},
        {"CSV series: min/max envelope and events", test_csv_series},
        {"CSV series: every sample", test_csv_every_sample},
        {NULL, NULL},
    };
    return br_test_main("report_format", cases);
}

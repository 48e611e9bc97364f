/* test_report_plot.c - the plot primitives: data to pixels and back, the
 * decimated line keeps samples as given (every point drawn maps back to a
 * sample within the rounding of its coordinates) and keeps the extremes,
 * tick steps, prefixes, escaping, and every chart parses as SVG. */
#include "report/charts.h"
#include "report/plot.h"
#include "testkit.h"

#include <libxml/parser.h>
#include <libxml/tree.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#define NS 20000
#define PI 3.14159265358979323846

/* libxml2 errors are counted, not printed. */
static void count_error(void *ctx, const xmlError *e)
{
    (void)e;
    (*(int *)ctx)++;
}

/* Parse text as XML; NULL (and a failed assertion) on any error. */
static xmlDocPtr parse_strict(const char *text, size_t len)
{
    int errors = 0;
    xmlSetStructuredErrorFunc(&errors, (xmlStructuredErrorFunc)count_error);
    xmlDocPtr doc = xmlReadMemory(text, (int)len, "plot.svg", NULL, XML_PARSE_NONET);
    xmlSetStructuredErrorFunc(NULL, NULL);
    CU_ASSERT_EQUAL(errors, 0);
    CU_ASSERT_PTR_NOT_NULL(doc);
    return doc;
}

static xmlNodePtr find(xmlNodePtr n, const char *name)
{
    for (; n; n = n->next) {
        if (n->type == XML_ELEMENT_NODE && strcmp((const char *)n->name, name) == 0)
            return n;
        xmlNodePtr c = find(n->children, name);
        if (c)
            return c;
    }
    return NULL;
}

/* A test signal with sharp features: a slow sine, a fast ripple and one
 * narrow spike that a naive every-k-th-sample decimation would lose. */
static void signal(double *t, double *y)
{
    for (int i = 0; i < NS; i++) {
        t[i] = 1e-6 * i; /* 0 .. 20 ms in 1 us steps */
        y[i] = 5.0 + 2.0 * sin(2 * PI * t[i] / 0.02) + 0.05 * sin(2 * PI * t[i] / 2e-5);
    }
    y[12345] = 9.5; /* the spike */
}

/* Render the signal in one panel; returns the document. */
static br_text *render(br_plot *p, const double *t, const double *y)
{
    br_text *out = br_text_create();
    br_svg s;
    br_svg_begin(&s, out, 800, 300);
    br_plot_frame(p, &s, 0, 0, 800, 300);
    br_plot_range(p, 0.0, t[NS - 1], 2.5, 10.0, 0);
    br_plot_axes(p, "test", "a title & more", "time", "s", "voltage", "V");
    br_style st = br_plot_style(0);
    br_plot_line(p, t, y, NS, 1, &st, "sig_V");
    br_plot_done(p);
    CU_ASSERT_EQUAL(br_svg_end(&s), BR_OK);
    return out;
}

static void test_mapping(void)
{
    br_svg s = {0};
    br_plot p;
    br_plot_frame(&p, &s, 10, 20, 600, 250);
    br_plot_range(&p, 1e-3, 3e-3, -2.0, 8.0, 0);
    BR_ASSERT_NEAR(br_plot_px(&p, 1e-3), p.x0, 1e-9);
    BR_ASSERT_NEAR(br_plot_px(&p, 3e-3), p.x0 + p.w, 1e-9);
    BR_ASSERT_NEAR(br_plot_py(&p, 8.0), p.y0, 1e-9); /* y grows downward */
    BR_ASSERT_NEAR(br_plot_py(&p, -2.0), p.y0 + p.h, 1e-9);
    BR_ASSERT_REL(br_plot_x_of(&p, br_plot_px(&p, 2.2e-3)), 2.2e-3, 1e-12);
    BR_ASSERT_REL(br_plot_y_of(&p, br_plot_py(&p, 3.3)), 3.3, 1e-12);
    p.xlog = 1;
    br_plot_range(&p, 1e3, 1e6, 0, 1, 0);
    BR_ASSERT_NEAR(br_plot_px(&p, 1e4), p.x0 + p.w / 3, 1e-9); /* a decade is a third */
    BR_ASSERT_REL(br_plot_x_of(&p, br_plot_px(&p, 47e3)), 47e3, 1e-12);
}

/* Every point of the polyline is a sample: its x maps back within half a
 * pixel column of some sample whose y maps back to the point's y within
 * the 0.05 px rounding of the coordinates. */
static void test_points_are_samples(void)
{
    double *t = malloc(sizeof(double) * NS), *y = malloc(sizeof(double) * NS);
    signal(t, y);
    br_plot p;
    br_text *out = render(&p, t, y);
    xmlDocPtr doc = parse_strict(br_text_data(out), br_text_len(out));
    xmlNodePtr line = find(xmlDocGetRootElement(doc), "polyline");
    CU_ASSERT_PTR_NOT_NULL_FATAL(line);
    xmlChar *key = xmlGetProp(line, BAD_CAST "data-series");
    CU_ASSERT_STRING_EQUAL(key, "sig_V");
    xmlChar *pts = xmlGetProp(line, BAD_CAST "points");
    const char *s = (const char *)pts;
    int n = 0, bad = 0, spike = 0;
    double ymax = -1e9;
    for (double px, py; sscanf(s, "%lf,%lf", &px, &py) == 2; n++) {
        double tv = br_plot_x_of(&p, px), yv = br_plot_y_of(&p, py);
        double dt = 0.06 * (p.xmax - p.xmin) / p.w, dy = 0.06 * (p.ymax - p.ymin) / p.h;
        int found = 0;
        long i0 = (long)floor((tv - dt) / 1e-6), i1 = (long)ceil((tv + dt) / 1e-6);
        for (long i = i0 < 0 ? 0 : i0; i <= i1 && i < NS; i++)
            found |= fabs(t[i] - tv) <= dt && fabs(y[i] - yv) <= dy;
        bad += !found;
        ymax = fmax(ymax, yv);
        spike |= fabs(yv - 9.5) < dy && fabs(tv - t[12345]) < dt;
        s = strchr(s, ' ');
        if (!s)
            break;
        s++;
    }
    CU_ASSERT_EQUAL(bad, 0);
    CU_ASSERT_TRUE(spike);                            /* the one-sample spike survives */
    CU_ASSERT_TRUE(n > 200 && n <= 2 * (int)p.w + 2); /* decimated: two per column at most */
    BR_ASSERT_NEAR(ymax, 9.5, 0.05);
    xmlFree(key);
    xmlFree(pts);
    xmlFreeDoc(doc);
    br_text_free(out);
    free(t);
    free(y);
}

/* The panel says its range, so a reader can map points back. */
static void test_panel_attributes(void)
{
    double *t = malloc(sizeof(double) * NS), *y = malloc(sizeof(double) * NS);
    signal(t, y);
    br_plot p;
    br_text *out = render(&p, t, y);
    xmlDocPtr doc = parse_strict(br_text_data(out), br_text_len(out));
    xmlNodePtr g = find(xmlDocGetRootElement(doc), "g");
    CU_ASSERT_PTR_NOT_NULL_FATAL(g);
    xmlChar *xmax = xmlGetProp(g, BAD_CAST "data-xmax"), *pw = xmlGetProp(g, BAD_CAST "data-pw");
    BR_ASSERT_REL(strtod((const char *)xmax, NULL), t[NS - 1], 1e-9);
    BR_ASSERT_NEAR(strtod((const char *)pw, NULL), p.w, 0.01);
    /* the title was escaped, the axis says its prefixed unit */
    CU_ASSERT_PTR_NOT_NULL(strstr(br_text_data(out), "a title &amp; more"));
    CU_ASSERT_PTR_NOT_NULL(strstr(br_text_data(out), "time (ms)"));
    xmlFree(xmax);
    xmlFree(pw);
    xmlFreeDoc(doc);
    br_text_free(out);
    free(t);
    free(y);
}

static void test_steps_and_units(void)
{
    BR_ASSERT_REL(br_plot_step(10.0, 5), 2.0, 1e-12);
    BR_ASSERT_REL(br_plot_step(0.0213, 5), 5e-3, 1e-12);
    BR_ASSERT_REL(br_plot_step(7.0, 8), 1.0, 1e-12);
    char b[32];
    CU_ASSERT_STRING_EQUAL(br_plot_si(b, sizeof b, 12.3e-6, 3, "s"), "12.3 \xc2\xb5s");
    CU_ASSERT_STRING_EQUAL(br_plot_si(b, sizeof b, 4.7e-3, 2, "A"), "4.7 mA");
    CU_ASSERT_STRING_EQUAL(br_plot_time(b, sizeof b, -1.0), "-");
    br_scale sc = br_scale_for(2e-6, "s");
    CU_ASSERT_STRING_EQUAL(br_plot_unit(&sc, b, sizeof b), "\xc2\xb5s");
    /* every style differs from the first seven in dash or colour */
    br_style a = br_plot_style(0), z = br_plot_style(7);
    CU_ASSERT_TRUE(strcmp(a.colour, z.colour) != 0 || (a.dash == NULL) != (z.dash == NULL));
}

static void test_escape(void)
{
    br_text *t = br_text_create();
    CU_ASSERT_EQUAL(br_xml_escape_put(t, "a<b & \"c\" > d"), BR_OK);
    CU_ASSERT_STRING_EQUAL(br_text_data(t), "a&lt;b &amp; &quot;c&quot; &gt; d");
    br_text_free(t);
}

/* Off-range limits are pointed at, not drawn over the data. */
static void test_offrange_limit(void)
{
    br_text *out = br_text_create();
    br_svg s;
    br_plot p;
    br_svg_begin(&s, out, 600, 250);
    br_plot_frame(&p, &s, 0, 0, 600, 250);
    br_plot_range(&p, 0, 1, 10.0, 11.0, 1);
    br_plot_axes(&p, "k", NULL, "time", "s", "voltage", "V");
    br_style st = br_plot_style(1);
    br_plot_hline(&p, 5.0, &st, "min drive 5 V");
    br_plot_hline(&p, 10.5, &st, "inside");
    br_plot_done(&p);
    CU_ASSERT_EQUAL(br_svg_end(&s), BR_OK);
    CU_ASSERT_PTR_NOT_NULL(strstr(br_text_data(out), "\xe2\x86\x93 min drive 5 V"));
    CU_ASSERT_PTR_NULL(strstr(br_text_data(out), "\xe2\x86\x93 inside"));
    xmlFreeDoc(parse_strict(br_text_data(out), br_text_len(out)));
    br_text_free(out);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"data to pixels and back", test_mapping},
        {"every point drawn is a sample; extremes kept", test_points_are_samples},
        {"panel carries its range", test_panel_attributes},
        {"tick steps and prefixes", test_steps_and_units},
        {"XML escaping", test_escape},
        {"off-range limits are pointed at", test_offrange_limit},
        {NULL, NULL},
    };
    return br_test_main("report_plot", cases);
}

/* test_io_limits.c - input limits beyond the bad-file corpus: a catalog
 * with more parts than allowed or over its size limit, and large
 * documents that stay under the byte limit but exceed a table limit many
 * times over, which must be refused quickly rather than slowly. */
#include "bootrung/bootrung.h"
#include "model/catalog.h"
#include "model/design.h"
#include "testkit.h"

#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

/* A growable buffer for generated documents. */
typedef struct doc {
    char *p;
    size_t len, cap;
} doc;

static void put(doc *d, const char *s)
{
    size_t n = strlen(s);
    if (d->len + n + 1 > d->cap) {
        size_t cap = d->cap ? d->cap : 4096;
        while (d->len + n + 1 > cap)
            cap *= 2;
        char *np = realloc(d->p, cap);
        CU_ASSERT_PTR_NOT_NULL_FATAL(np);
        d->p = np;
        d->cap = cap;
    }
    memcpy(d->p + d->len, s, n + 1);
    d->len += n;
}

/* Processor time, not wall time: what the loader does is the work the
 * bound is about, and a loaded machine stretches wall time many fold. */
static double now_s(void)
{
    struct timespec t;
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &t);
    return (double)t.tv_sec + 1e-9 * (double)t.tv_nsec;
}

/* A catalog of `ndiodes` diodes (and one capacitor). */
static void catalog_doc(doc *d, int ndiodes)
{
    char line[160];
    put(d, "<?xml version=\"1.0\"?>\n<bootrung-catalog version=\"1\" name=\"big\">\n");
    put(d, "  <capacitor id=\"c1\" c=\"1 uF\" cost=\"0.01\" area-mm2=\"1\"/>\n");
    for (int i = 0; i < ndiodes; i++) {
        snprintf(line, sizeof line, "  <diode id=\"d%d\" cost=\"0.1\" area-mm2=\"2\"/>\n", i + 1);
        put(d, line);
    }
    put(d, "</bootrung-catalog>\n");
}

static void test_catalog_part_count(void)
{
    doc d = {0};
    br_catalog *c = NULL;
    br_error err;
    catalog_doc(&d, BR_MAX_PARTS);
    br_error_clear(&err);
    CU_ASSERT_EQUAL(br_catalog_load_memory(d.p, d.len, "ok.xml", &c, &err), BR_OK);
    br_catalog_free(c);
    d.len = 0;
    catalog_doc(&d, BR_MAX_PARTS + 1);
    c = NULL;
    br_error_clear(&err);
    CU_ASSERT_EQUAL(br_catalog_load_memory(d.p, d.len, "many.xml", &c, &err), BR_EINPUT);
    CU_ASSERT_PTR_NULL(c);
    CU_ASSERT_TRUE(err.line > 0);
    CU_ASSERT_PTR_NOT_NULL(strstr(err.msg, "expected at most 64"));
    free(d.p);
}

static void test_catalog_size(void)
{
    size_t len = ((size_t)4 << 20) + 1;
    char *buf = calloc(len, 1);
    CU_ASSERT_PTR_NOT_NULL_FATAL(buf);
    br_catalog *c = NULL;
    br_error err;
    br_error_clear(&err);
    CU_ASSERT_EQUAL(br_catalog_load_memory(buf, len, "big.xml", &c, &err), BR_EINPUT);
    CU_ASSERT_PTR_NULL(c);
    CU_ASSERT_PTR_NOT_NULL(strstr(err.msg, "MiB limit"));
    free(buf);
}

/* Half the 16 MiB limit: a capacitor with about 230000 DC-bias points
 * is refused by its table limit within seconds, not after minutes. */
static void test_huge_table_fast(void)
{
    doc d = {0};
    put(&d, "<?xml version=\"1.0\"?>\n<bootrung-design version=\"1\" name=\"big\">\n"
            "  <operating-point vin=\"400 V\" fsw=\"100 kHz\" duty=\"0.5\" dead-time=\"100 ns\"/>\n"
            "  <supply voltage=\"12 V\"/>\n  <topology><fcml levels=\"3\"/></topology>\n"
            "  <parts>\n    <diode id=\"d1\"/>\n    <capacitor id=\"c1\" c=\"1 uF\">\n");
    while (d.len < ((size_t)8 << 20))
        put(&d, "      <bias v=\"1 V\" factor=\"0.5\"/>\n");
    put(&d, "    </capacitor>\n    <driver id=\"drv1\"/>\n    <switch id=\"q1\"/>\n  </parts>\n"
            "  <stages diode=\"d1\" capacitor=\"c1\" driver=\"drv1\" switch=\"q1\"/>\n"
            "</bootrung-design>\n");
    br_design *des = NULL;
    br_error err;
    br_error_clear(&err);
    double t0 = now_s();
    CU_ASSERT_EQUAL(br_design_load_memory(d.p, d.len, "huge.xml", &des, &err), BR_EINPUT);
    double took = now_s() - t0;
    fprintf(stderr, " (%.2f s CPU for %zu MiB) ", took, d.len >> 20);
    CU_ASSERT_PTR_NULL(des);
    CU_ASSERT_PTR_NOT_NULL(strstr(err.msg, "expected at most 32"));
    CU_ASSERT_TRUE(took < 20.0); /* processor s; generous: sanitizer builds are slower */
    free(d.p);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"catalog part count limit", test_catalog_part_count},
        {"catalog size limit", test_catalog_size},
        {"a huge table is refused quickly", test_huge_table_fast},
        {NULL, NULL},
    };
    return br_test_main("io_limits", cases);
}

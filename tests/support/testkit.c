/* testkit.c - shared CUnit helpers. */
#include "testkit.h"

#include <CUnit/Basic.h>
#include <stdio.h>
#include <stdlib.h>

int br_near(double a, double b, double tol)
{
    return !isnan(a) && !isnan(b) && fabs(a - b) <= tol;
}

int br_rel(double a, double b, double rel)
{
    return !isnan(a) && !isnan(b) && fabs(a - b) <= rel * fabs(b);
}

void br_report_mismatch(const char *file, int line, double a, double b)
{
    fprintf(stderr, "%s:%d: got %.12g, expected %.12g\n", file, line, a, b);
}

int br_test_main(const char *suite, const br_test_case *cases)
{
    if (CU_initialize_registry() != CUE_SUCCESS)
        return 2;
    CU_pSuite s = CU_add_suite(suite, NULL, NULL);
    if (!s)
        return 2;
    for (const br_test_case *c = cases; c->name; c++)
        if (!CU_add_test(s, c->name, c->fn))
            return 2;
    CU_basic_set_mode(CU_BRM_VERBOSE);
    CU_basic_run_tests();
    unsigned fails = CU_get_number_of_failures();
    unsigned run = CU_get_number_of_tests_run();
    CU_cleanup_registry();
    return (fails == 0 && run > 0) ? 0 : 1;
}

char *br_test_slurp(const char *path, size_t *len)
{
    FILE *f = fopen(path, "rb");
    if (!f)
        return NULL;
    size_t cap = 4096, n = 0;
    char *buf = malloc(cap);
    size_t got;
    while (buf && (got = fread(buf + n, 1, cap - n - 1, f)) > 0) {
        n += got;
        if (cap - n - 1 == 0) {
            char *nb = realloc(buf, cap * 2);
            if (!nb) {
                free(buf);
                buf = NULL;
                break;
            }
            buf = nb;
            cap *= 2;
        }
    }
    fclose(f);
    if (buf) {
        buf[n] = '\0';
        if (len)
            *len = n;
    }
    return buf;
}

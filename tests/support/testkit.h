/* testkit.h - small helpers shared by the CUnit suites. */
#ifndef BR_TESTKIT_H
#define BR_TESTKIT_H

#include <CUnit/CUnit.h>
#include <math.h>

typedef struct br_test_case {
    const char *name;
    void (*fn)(void);
} br_test_case;

/* Register one suite of cases (NULL-terminated), run it verbosely so the
 * CUnit summary is visible, and return the process exit status. */
int br_test_main(const char *suite, const br_test_case *cases);

/* |a - b| <= tol, and neither is NaN. */
int br_near(double a, double b, double tol);
/* |a - b| <= rel * |b|, and neither is NaN. */
int br_rel(double a, double b, double rel);

#define BR_ASSERT_NEAR(a, b, tol) CU_ASSERT_TRUE_FATAL_OR(br_near((a), (b), (tol)), (a), (b))
#define BR_ASSERT_REL(a, b, rel) CU_ASSERT_TRUE_FATAL_OR(br_rel((a), (b), (rel)), (a), (b))

/* Non-fatal assertion that prints both values when it fails. */
void br_report_mismatch(const char *file, int line, double a, double b);
#define CU_ASSERT_TRUE_FATAL_OR(cond, a, b)                                                        \
    do {                                                                                           \
        int ok_ = (cond);                                                                          \
        if (!ok_)                                                                                  \
            br_report_mismatch(__FILE__, __LINE__, (a), (b));                                      \
        CU_assertImplementation(ok_, __LINE__, #cond, __FILE__, "", CU_FALSE);                     \
    } while (0)

/* Read a whole file (for tests); returns malloc'd, NUL-terminated, or NULL. */
char *br_test_slurp(const char *path, size_t *len);

#endif

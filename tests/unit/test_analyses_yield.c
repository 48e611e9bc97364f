/* test_analyses_yield.c - exact confidence bounds, rank correlation,
 * sampling, a design on its limit, and reproducibility across threads. */
#include "analyses/evaluate.h"
#include "analyses/yield.h"
#include "testdesign.h"
#include "testkit.h"

#include <gsl/gsl_errno.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

static br_qty tol(double nom, double rel)
{
    br_qty q = br_qty_fixed(nom);
    q.min = nom * (1.0 - rel);
    q.max = nom * (1.0 + rel);
    return q;
}

/* Exact two-sided 95 % bounds of a binomial proportion: C. J. Clopper and
 * E. S. Pearson, Biometrika 26(4), 1934.  0 of 10 has the closed form
 * upper = 1 - 0.025^(1/10) = 0.3085, 10 of 10 lower = 0.025^(1/10) =
 * 0.6915; 5 of 10 gives 0.1871 to 0.8129 and 1 of 10 0.0025 to 0.4450
 * (the usual tables, from memory). */
static void test_clopper_pearson(void)
{
    double lo, hi;
    br_clopper_pearson(0, 10, 0.95, &lo, &hi);
    BR_ASSERT_NEAR(lo, 0.0, 0.0);
    BR_ASSERT_NEAR(hi, 0.3085, 5e-5);
    BR_ASSERT_NEAR(hi, 1.0 - pow(0.025, 0.1), 1e-9);
    br_clopper_pearson(10, 10, 0.95, &lo, &hi);
    BR_ASSERT_NEAR(lo, 0.6915, 5e-5);
    BR_ASSERT_NEAR(hi, 1.0, 0.0);
    br_clopper_pearson(5, 10, 0.95, &lo, &hi);
    BR_ASSERT_NEAR(lo, 0.1871, 5e-5);
    BR_ASSERT_NEAR(hi, 0.8129, 5e-5);
    br_clopper_pearson(1, 10, 0.95, &lo, &hi);
    BR_ASSERT_NEAR(lo, 0.0025, 5e-5);
    BR_ASSERT_NEAR(hi, 0.4450, 5e-5);
}

/* Spearman's rho (C. Spearman, American Journal of Psychology 15(1),
 * 1904) of the usual textbook example, IQ against hours of television of
 * ten people (from memory).  By hand: the rank differences d are 4, -3,
 * 0, -5, -5, -3, -4, 6, 7, 3, their squares sum to 194, and without ties
 * rho = 1 - 6*194/(10*99) = -29/165.  Monotonic data give +-1 whatever
 * the scale; ties share their average rank. */
static void test_spearman(void)
{
    static const double iq[] = {106, 100, 86, 101, 99, 103, 97, 113, 112, 110};
    static const double tv[] = {7, 27, 2, 50, 28, 29, 20, 12, 6, 17};
    BR_ASSERT_NEAR(br_spearman(iq, tv, 10), -29.0 / 165.0, 1e-12);
    static const double a[] = {1, 2, 3, 4, 5}, b[] = {1, 10, 100, 1000, 1e4}, c[] = {9, 7, 5, 3, 1};
    BR_ASSERT_NEAR(br_spearman(a, b, 5), 1.0, 1e-12);
    BR_ASSERT_NEAR(br_spearman(a, c, 5), -1.0, 1e-12);
    static const double t[] = {1, 2, 2, 3};
    double r[4];
    CU_ASSERT_EQUAL_FATAL(br_rank(t, 4, r), BR_OK);
    BR_ASSERT_NEAR(r[1], 2.5, 0.0);
    BR_ASSERT_NEAR(r[2], 2.5, 0.0);
    BR_ASSERT_NEAR(r[3], 4.0, 0.0);
    static const double flat[] = {2, 2, 2, 2, 2};
    CU_ASSERT_TRUE(isnan(br_spearman(a, flat, 5)));
}

/* Draws stay within the limits; the uniform mean sits mid-range and the
 * normal one on the nominal; one seed always gives the same draws. */
static void test_sampling(void)
{
    br_tol_list tl = {.n = 2};
    tl.p[0] =
        (br_tol_param){.nom = 10.0, .min = 8.0, .max = 11.0, .dist = BR_DIST_UNIFORM, .nsig = 3.0};
    tl.p[1] =
        (br_tol_param){.nom = 5.0, .min = 4.0, .max = 6.0, .dist = BR_DIST_NORMAL, .nsig = 3.0};
    enum { N = 20000 };
    double *v = malloc(sizeof(double) * 2 * N), *w = malloc(sizeof(double) * 2 * N);
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_yield_sample(&tl, 42, N, v, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_yield_sample(&tl, 42, N, w, &err), BR_OK);
    CU_ASSERT_EQUAL(memcmp(v, w, sizeof(double) * 2 * N), 0);
    double s0 = 0, s1 = 0, ss1 = 0;
    int inside = 1;
    for (int i = 0; i < N; i++) {
        inside &= v[2 * i] >= 8.0 && v[2 * i] <= 11.0 && v[2 * i + 1] >= 4.0 && v[2 * i + 1] <= 6.0;
        s0 += v[2 * i];
        s1 += v[2 * i + 1];
        ss1 += (v[2 * i + 1] - 5.0) * (v[2 * i + 1] - 5.0);
    }
    CU_ASSERT_TRUE(inside);
    BR_ASSERT_NEAR(s0 / N, 9.5, 0.02); /* sd of the mean 0.87/sqrt(N) = 0.006 */
    BR_ASSERT_NEAR(s1 / N, 5.0, 0.01);
    /* sigma = 1/3: truncation at 3 sigma shrinks it by 1.3 %, from memory */
    BR_ASSERT_NEAR(sqrt(ss1 / N), 1.0 / 3.0, 0.01);
    CU_ASSERT_EQUAL_FATAL(br_yield_sample(&tl, 43, N, w, &err), BR_OK);
    CU_ASSERT_NOT_EQUAL(memcmp(v, w, sizeof(double) * 2 * N), 0);
    free(v);
    free(w);
}

/* A one-link chain whose only tolerance is the supply, uniform +-5 %. */
static br_design *supply_only(void)
{
    br_design *d = br_test_fcml(2, 400.0, 100e3, 0.5, 50e-9);
    d->vsupply = tol(12.0, 0.05);
    return d;
}

/* The minimum drive set exactly to the nominal rail minimum: the drive
 * margin moves with the supply one for one, so a sample passes when its
 * supply is above the nominal, half of a symmetric distribution.  The
 * yield must be about 50 % and its exact interval must hold 0.5. */
static void test_on_the_limit(void)
{
    br_design *d = supply_only();
    br_chain c;
    br_error err;
    br_evaluation *e = malloc(sizeof *e);
    CU_ASSERT_EQUAL_FATAL(br_chain_build_nominal(d, &c, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_evaluate(&c, 0, NULL, e, &err), BR_OK);
    /* the UVLO row's figure is the lowest driver supply */
    d->min_drive = br_qty_fixed(e->v.row[BR_CRIT_UVLO].figure);
    free(e);
    br_yield_opts o;
    br_yield_opts_default(&o);
    o.samples = 200;
    o.seed = 7;
    br_yield *y;
    CU_ASSERT_EQUAL_FATAL(br_yield_run(d, &o, &y, &err), BR_OK);
    CU_ASSERT_TRUE(y->lo <= 0.5 && y->hi >= 0.5);
    CU_ASSERT_TRUE(y->yield > 0.38 && y->yield < 0.62);
    CU_ASSERT_EQUAL(y->c[BR_CRIT_DRIVE].fails, y->n - y->pass);
    /* the supply drives the drive margin: rank correlation near +1 */
    CU_ASSERT_TRUE(y->c[BR_CRIT_DRIVE].rho[0] > 0.99);
    /* the median margin sits on the limit, within the spread of 200 draws */
    CU_ASSERT_TRUE(fabs(y->c[BR_CRIT_DRIVE].q[4]) < 0.1);
    CU_ASSERT_EQUAL(y->unjudged, 0);
    br_yield_free(y);
    br_design_free(d);
}

/* Same seed, one thread or two: the same samples and bit-identical
 * results. */
static void test_threads_identical(void)
{
    br_design *d = supply_only();
    d->caps[0].c = tol(1e-6, 0.2);
    d->drivers[0].iq_on = tol(2e-3, 0.25);
    br_yield_opts o;
    br_yield_opts_default(&o);
    o.samples = 60;
    o.seed = 11;
    br_yield *y1, *y2;
    br_error err;
    o.threads = 1;
    CU_ASSERT_EQUAL_FATAL(br_yield_run(d, &o, &y1, &err), BR_OK);
    o.threads = 2;
    CU_ASSERT_EQUAL_FATAL(br_yield_run(d, &o, &y2, &err), BR_OK);
    CU_ASSERT_EQUAL(y2->s->threads, 2);
    CU_ASSERT_EQUAL(memcmp(y1->values, y2->values, sizeof(double) * 60 * 3), 0);
    int same = 1;
    for (int i = 0; i < 60; i++)
        for (int r = 0; r < BR_CRIT_COUNT; r++)
            same &= memcmp(&y1->pts[i].row[r], &y2->pts[i].row[r], sizeof(br_pt_row)) == 0;
    CU_ASSERT_TRUE(same);
    CU_ASSERT_EQUAL(y1->pass, y2->pass);
    CU_ASSERT_EQUAL(memcmp(y1->c, y2->c, sizeof y1->c), 0);
    br_yield_free(y1);
    br_yield_free(y2);
    br_design_free(d);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"Clopper-Pearson bounds against published values", test_clopper_pearson},
        {"Spearman's rank correlation", test_spearman},
        {"sampling: limits, means, seeds", test_sampling},
        {"a design on its limit yields about 50 %", test_on_the_limit},
        {"same seed, 1 and 2 threads: identical", test_threads_identical},
        {NULL, NULL},
    };
    gsl_set_error_handler_off(); /* the library checks every GSL status itself */
    return br_test_main("analyses_yield", cases);
}

/* test_regress_unsettled.c - points whose steady state is hard to settle,
 * in the searches over tolerances (corners, yield): a point that has a
 * periodic state is settled, and one the solver cannot settle within its
 * bounds is undetermined, never a failure and never a pass. */
#include "analyses/corners.h"
#include "analyses/yield.h"
#include "bootrung/bootrung.h"
#include "testkit.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define DESIGN BR_SOURCE_DIR "/tests/data/fcml5-clamped.xml"

static br_design *load(void)
{
    br_design *d = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(DESIGN, &d, &err), BR_OK);
    return d;
}

/* The index of the supply voltage among the toleranced parameters. */
static int supply_param(const br_tol_list *tl)
{
    for (int j = 0; j < tl->n; j++)
        if (strstr(tl->p[j].name, "supply"))
            return j;
    return -1;
}

/* At the supply's maximum (20.6 V) the step-up steady state of this leg
 * settles only by a slow mode; the shooting solver alone gives up after
 * its plain periods, 14 uV a period short of settled.  The state exists
 * (plain simulation settles it to 1e-13 V a period after 600 periods),
 * so the one-at-a-time point must come out settled and passing, as must
 * every corner. */
static void test_slow_mode_settles(void)
{
    br_design *d = load();
    br_spread_opts so;
    br_spread_opts_default(&so);
    so.threads = 2;
    br_spread *s = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_spread_create(d, &so, &s, &err), BR_OK);
    int j = supply_param(&s->tl);
    CU_ASSERT_TRUE_FATAL(j >= 0);
    BR_ASSERT_NEAR(s->tl.p[j].max, 20.6, 1e-9); /* 20 V +3 % */
    const br_pt *hi = &s->oat[2 * j + 1];
    CU_ASSERT_EQUAL(hi->status, BR_OK);
    CU_ASSERT_TRUE(hi->row[BR_CRIT_STEADY].pass);
    CU_ASSERT_TRUE(hi->pass);
    CU_ASSERT_TRUE(s->nominal.pass);
    br_spread_free(s);
    br_corners_opts co;
    br_corners_opts_default(&co);
    co.startup = 0;
    co.threads = 2;
    br_corners *k = NULL;
    CU_ASSERT_EQUAL_FATAL(br_corners_run(d, &co, &k, &err), BR_OK);
    CU_ASSERT_TRUE(k->all_pass);
    br_corners_free(k);
    br_design_free(d);
}

/* With the solver held to one Newton iteration and one plain period, no
 * steady state settles: every steady criterion is undetermined at every
 * point, none fails, none passes, and the nominal point that did not
 * settle does not end the search.  (The cold-start criteria are left
 * out: the limit does not bound the cold start.) */
static void test_corners_undetermined(void)
{
    br_design *d = load();
    br_corners_opts co;
    br_corners_opts_default(&co);
    co.startup = 0;
    co.threads = 2;
    co.solver_limit = 1;
    br_corners *k = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_corners_run(d, &co, &k, &err), BR_OK);
    CU_ASSERT_EQUAL(k->outcome, BR_OUTCOME_UNDETERMINED);
    CU_ASSERT_FALSE(k->all_pass);
    CU_ASSERT_EQUAL(k->s->nominal.outcome, BR_OUTCOME_UNDETERMINED);
    CU_ASSERT_FALSE(k->s->predict);
    long points = k->s->points;
    CU_ASSERT_TRUE(points >= 1 + 2 * k->s->tl.n);
    CU_ASSERT_EQUAL(k->undetermined, points);
    CU_ASSERT_EQUAL(k->unsettled, points);
    CU_ASSERT_EQUAL(k->unjudged, 0);
    for (int c = 0; c < BR_CRIT_COUNT; c++) {
        const br_corner_worst *w = &k->w[c];
        CU_ASSERT_NOT_EQUAL(w->outcome, BR_OUTCOME_FAIL);
        /* no regulator and no thermal resistance: those rows cannot apply */
        if (br_crit_is_startup(c) || c == BR_CRIT_HEADROOM || c == BR_CRIT_TJ)
            continue;
        /* every rating is given, so every other steady criterion could apply */
        CU_ASSERT_EQUAL(w->outcome, BR_OUTCOME_UNDETERMINED);
        CU_ASSERT_EQUAL(w->undetermined, points);
        CU_ASSERT_FALSE(w->applies); /* decided nowhere */
    }
    br_corners_free(k);
    br_design_free(d);
}

/* The same for the yield: every sample is undetermined, none fails; the
 * estimate is over the decided samples (none: no number), and the
 * interval takes the unknowns as failing for its lower bound and as
 * passing for its upper: 0 of 10 and 10 of 10 at 95 %, so 0 and 1.
 * With a minimum yield the verdict stays open while the best case, all
 * ten passing, would reach it: the Clopper-Pearson lower bound of 10 of
 * 10 is 0.025^(1/10) = 0.6915 (by hand: the bound for x = n solves
 * p^n = alpha/2), so 50 % is open and 70 % fails. */
static void test_yield_undetermined(void)
{
    br_design *d = load();
    br_yield_opts yo;
    br_yield_opts_default(&yo);
    yo.samples = 10;
    yo.threads = 2;
    yo.solver_limit = 1;
    br_yield *y = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_yield_run(d, &yo, &y, &err), BR_OK);
    CU_ASSERT_EQUAL(y->pass, 0);
    CU_ASSERT_EQUAL(y->fail, 0);
    CU_ASSERT_EQUAL(y->undetermined, 10);
    CU_ASSERT_EQUAL(y->unsettled, 10);
    CU_ASSERT_TRUE(isnan(y->yield));
    BR_ASSERT_NEAR(y->lo, 0.0, 0.0);
    BR_ASSERT_NEAR(y->hi, 1.0, 0.0);
    CU_ASSERT_EQUAL(br_yield_outcome(y, -1.0 /* no minimum */), BR_OUTCOME_UNDETERMINED);
    CU_ASSERT_EQUAL(br_yield_outcome(y, 0.5), BR_OUTCOME_UNDETERMINED);
    CU_ASSERT_EQUAL(br_yield_outcome(y, 0.7), BR_OUTCOME_FAIL);
    for (long i = 0; i < y->n; i++) {
        CU_ASSERT_EQUAL(y->pts[i].outcome, BR_OUTCOME_UNDETERMINED);
        CU_ASSERT_FALSE(y->pts[i].pass);
    }
    /* the steady state is a status: no quantiles, no rank correlation */
    const br_yield_crit *st = &y->c[BR_CRIT_STEADY];
    CU_ASSERT_FALSE(st->has_margin);
    CU_ASSERT_EQUAL(st->undetermined, 10);
    CU_ASSERT_EQUAL(st->fails, 0);
    CU_ASSERT_TRUE(isnan(st->q[0]));
    br_yield_free(y);
    br_design_free(d);
}

/* Settled samples of the same design pass, and their steady-state status
 * still has no margin: its quantiles stay empty while the UVLO margin's
 * do not. */
static void test_yield_settled(void)
{
    br_design *d = load();
    br_yield_opts yo;
    br_yield_opts_default(&yo);
    yo.samples = 12;
    yo.threads = 2;
    br_yield *y = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_yield_run(d, &yo, &y, &err), BR_OK);
    CU_ASSERT_EQUAL(y->pass, 12);
    CU_ASSERT_EQUAL(y->undetermined, 0);
    BR_ASSERT_NEAR(y->yield, 1.0, 0.0);
    CU_ASSERT_EQUAL(br_yield_outcome(y, 0.0), BR_OUTCOME_PASS);
    CU_ASSERT_TRUE(isnan(y->c[BR_CRIT_STEADY].q[0]));
    CU_ASSERT_TRUE(y->c[BR_CRIT_UVLO].has_margin);
    CU_ASSERT_TRUE(y->c[BR_CRIT_UVLO].q[0] > 0);
    br_yield_free(y);
    br_design_free(d);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"a slow step-up steady state settles in the search", test_slow_mode_settles},
        {"corners: unsettled points are undetermined", test_corners_undetermined},
        {"yield: unsettled samples are unknowns", test_yield_undetermined},
        {"yield: settled samples, the steady state a status", test_yield_settled},
        {NULL, NULL},
    };
    return br_test_main("regress/unsettled", cases);
}

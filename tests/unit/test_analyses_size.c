/* test_analyses_size.c - what a sizing judgement costs, held to what it
 * decides: the catalog search gallops to an answer far from where it
 * starts and still returns the smallest value that qualifies with the
 * next smaller one judged and failing; a point whose steady state rules
 * it out is judged without its cold start, and one that it does not is
 * judged exactly as without the shortcut; a steady state whose
 * temperature loop starts from the junction temperatures found settles
 * in one pass at the same state.  Designs and parts are invented. */
#include "analyses/size.h"
#include "analyses/steady.h"
#include "testdesign.h"
#include "testkit.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define KELVIN 273.15

/* A 3-level leg at 100 kHz whose rail capacitors (own part: 47 uF) start
 * the search at the top of the catalog. */
static br_design *leg(void)
{
    br_design *d = br_test_fcml(3, 600.0, 100e3, 0.5, 50e-9);
    CU_ASSERT_PTR_NOT_NULL_FATAL(d);
    d->caps[0].c = br_qty_fixed(47e-6);
    return d;
}

/* An invented drawer of ceramics, 22 nF to 47 uF, in no particular
 * order, one of them rated below the 12 V supply (never a candidate). */
static br_catalog *drawer(void)
{
    static const double c[] = {4.7e-6, 22e-9,  1e-6,  47e-6,  100e-9, 10e-6,
                               2.2e-6, 470e-9, 22e-6, 220e-9, 47e-9,  1e-6};
    br_catalog *cat = calloc(1, sizeof *cat);
    CU_ASSERT_PTR_NOT_NULL_FATAL(cat);
    snprintf(cat->path, sizeof cat->path, "(drawer)");
    for (int i = 0; i < (int)(sizeof c / sizeof c[0]); i++) {
        br_cap_part *p = &cat->caps[cat->ncaps];
        br_cap_part_defaults(p);
        snprintf(p->id, sizeof p->id, "cap-%d", i);
        p->c = br_qty_fixed(c[i]);
        p->esr = br_qty_fixed(0.01);
        p->vrated = br_qty_fixed(i == 11 ? 10.0 : 25.0);
        cat->cap_offer[cat->ncaps++].cost = 0.01 * (i + 1);
    }
    return cat;
}

/* Rail k of d with catalog part p, as a new design. */
static br_design *with_part(const br_design *d, const br_catalog *cat, int k, int p)
{
    br_design *t = br_design_copy(d);
    CU_ASSERT_PTR_NOT_NULL_FATAL(t);
    CU_ASSERT_TRUE_FATAL(t->ncaps < BR_MAX_PARTS);
    t->caps[t->ncaps] = cat->caps[p];
    t->stage[k] = *br_design_stage(t, k);
    t->stage[k].cap = t->ncaps++;
    t->has_override[k] = 1;
    return t;
}

/* The catalog part just below p in the search's order (capacitance,
 * then cost), rated for vmax; -1 when p is the first. */
static int below(const br_catalog *cat, int p, double vmax)
{
    int best = -1;
    for (int i = 0; i < cat->ncaps; i++) {
        double ci = cat->caps[i].c.nom, cp = cat->caps[p].c.nom;
        if (i == p || !(cat->caps[i].vrated.nom >= vmax) || ci > cp ||
            (ci == cp && cat->cap_offer[i].cost >= cat->cap_offer[p].cost))
            continue;
        if (best < 0 || ci > cat->caps[best].c.nom)
            best = i;
    }
    return best;
}

/* The search starts at the top rail's own 47 uF, the largest candidate
 * of eleven, and the answers lie far below it: galloping (1, 2, 4 and 8
 * positions down, then bisection) judges at most 7 values on that rail
 * where a walk one position at a time judges one more than the distance.
 * Every answer qualifies, judged on its own in the sized design, and the
 * next smaller part does not. */
static void test_catalog_gallop(void)
{
    br_design *d = leg();
    br_catalog *cat = drawer();
    br_size_opts o;
    br_size_opts_default(&o);
    o.threads = 1;
    o.links = 0;
    o.nominal = 1;
    o.cat = cat;
    br_size *z = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_size_run(d, &o, &z, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(z->n, 4);
    o.target = z->target;
    int top = z->n - 1;
    for (int k = top; k >= 1; k--) {
        const br_size_answer *a = &z->cap[k];
        CU_ASSERT_TRUE_FATAL(a->kind == BR_SIZE_FOUND || a->kind == BR_SIZE_END);
        int at = a->at.part, next = below(cat, at, d->vsupply.max);
        br_design *same = with_part(z->d, cat, k, at);
        br_size_verdict v;
        CU_ASSERT_EQUAL_FATAL(br_size_judge(z->d, same, &o, &v, &err), BR_OK);
        CU_ASSERT_TRUE(v.qualifies);
        br_design_free(same);
        CU_ASSERT_EQUAL(a->kind == BR_SIZE_END, next < 0);
        if (next < 0)
            continue;
        CU_ASSERT_EQUAL(a->beyond.part, next);
        CU_ASSERT_FALSE(a->beyond.ver.qualifies);
        br_design *smaller = with_part(z->d, cat, k, next);
        CU_ASSERT_EQUAL_FATAL(br_size_judge(z->d, smaller, &o, &v, &err), BR_OK);
        CU_ASSERT_FALSE(v.qualifies);
        br_design_free(smaller);
    }
    /* 47 uF is position 10 of 0..10; the top rail's answer lies at least
     * 6 positions below it, which a walk takes 7 or more values for */
    int pos = 0;
    for (int i = 0; i < cat->ncaps; i++)
        pos += cat->caps[i].vrated.nom >= d->vsupply.max &&
               cat->caps[i].c.nom < cat->caps[z->cap[top].at.part].c.nom;
    int far = 10 - pos;
    printf("\n    top rail: answer %d positions below the start, %d values judged\n", far,
           z->cap[top].trials);
    CU_ASSERT_TRUE(far >= 6);
    CU_ASSERT_TRUE(z->cap[top].trials <= 7);
    br_size_free(z);
    free(cat);
    br_design_free(d);
}

/* Two spreads of design d at its nominal point with the cold start, the
 * second lazy at target. */
static void lazy_pair(const br_design *d, double target, br_spread **plain, br_spread **lazy)
{
    br_spread_opts so;
    br_spread_opts_default(&so);
    so.threads = 1;
    so.startup = 1;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_spread_create(d, &so, plain, &err), BR_OK);
    so.lazy_startup = 1;
    so.lazy_target = target;
    CU_ASSERT_EQUAL_FATAL(br_spread_create(d, &so, lazy, &err), BR_OK);
}

/* A target that no margin reaches: the steady state rules the point out,
 * no cold start is simulated and the steady-state rows are those of the
 * point judged with it.  A target every margin reaches: the point is the
 * same as without the shortcut, cold start included, bit for bit. */
static void test_lazy_startup(void)
{
    br_design *d = leg();
    br_spread *plain, *lazy;
    lazy_pair(d, 1e3, &plain, &lazy);
    CU_ASSERT_TRUE(plain->nominal.with_startup);
    CU_ASSERT_TRUE(plain->nominal.su_integrated > 0);
    CU_ASSERT_FALSE(lazy->nominal.with_startup);
    CU_ASSERT_EQUAL(lazy->nominal.su_integrated, 0);
    int steady_rows = 0;
    for (int c = 0; c < BR_CRIT_COUNT; c++) {
        const br_pt_row *a = &plain->nominal.row[c], *b = &lazy->nominal.row[c];
        if (br_crit_is_startup(c)) {
            CU_ASSERT_FALSE(b->applies);
            continue;
        }
        steady_rows += a->applies;
        CU_ASSERT_EQUAL(memcmp(a, b, sizeof *a), 0);
    }
    CU_ASSERT_TRUE(steady_rows > 3);
    br_spread_free(plain);
    br_spread_free(lazy);
    lazy_pair(d, -1e3, &plain, &lazy);
    CU_ASSERT_TRUE(lazy->nominal.with_startup);
    CU_ASSERT_EQUAL(memcmp(&plain->nominal, &lazy->nominal, sizeof plain->nominal), 0);
    br_spread_free(plain);
    br_spread_free(lazy);
    br_design_free(d);
}

/* The leaky 3-level leg of test_analyses_thermal (10 uA at 25 C doubling
 * every 10 K behind 200 K/W, 50 C ambient) solved from the ambient takes
 * at least two passes of its temperature loop; started from the state
 * and temperatures found, one pass settles, at the same temperatures
 * within the loop's 0.05 K and the same rails within 0.1 mV. */
static void test_steady_from_temperatures(void)
{
    br_design *d = br_test_fcml(3, 600.0, 100e3, 0.5, 50e-9);
    CU_ASSERT_PTR_NOT_NULL_FATAL(d);
    d->tamb = br_qty_fixed(50.0 + KELVIN);
    d->diodes[0].ir = br_qty_fixed(10e-6);
    d->diodes[0].ir_double = br_qty_fixed(10.0);
    d->diodes[0].rth = br_qty_fixed(200.0);
    br_chain *c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_steady a, b;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, BR_DIRI_NONE, NULL, &a, &err), BR_OK);
    CU_ASSERT_TRUE_FATAL(a.converged && a.thermal_settled);
    CU_ASSERT_TRUE(a.thermal >= 2);
    br_steady_opts o;
    br_steady_opts_default(&o);
    o.guess = a.x;
    o.tj = a.tj;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, BR_DIRI_NONE, &o, &b, &err), BR_OK);
    CU_ASSERT_TRUE(b.converged && b.thermal_settled);
    CU_ASSERT_EQUAL(b.thermal, 1);
    CU_ASSERT_TRUE(b.periods < a.periods);
    for (int k = 1; k < c->n; k++) {
        BR_ASSERT_NEAR(b.tj[k], a.tj[k], 0.05);
        BR_ASSERT_NEAR(b.x[k], a.x[k], 1e-4);
    }
    br_chain_free(c);
    br_design_free(d);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"the catalog search gallops to the smallest value that qualifies", test_catalog_gallop},
        {"the cold start only where the steady state leaves a chance", test_lazy_startup},
        {"the temperature loop from the temperatures found", test_steady_from_temperatures},
        {NULL, NULL},
    };
    return br_test_main("analyses_size", cases);
}

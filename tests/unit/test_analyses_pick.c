/* test_analyses_pick.c - rating screens, one-part choices, the ranking
 * and the per-rail descent on a small chain with a hand-made catalog. */
#include "analyses/pick.h"
#include "testdesign.h"
#include "testkit.h"

#include <gsl/gsl_errno.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

/* A 3-level leg on 600 V: three links, each diode blocks 300 V; rails at
 * about 11 V from a 12 V +-5 % supply; drivers stop below 7 V. */
static br_design *design(void)
{
    br_design *d = br_test_fcml(3, 600.0, 100e3, 0.5, 50e-9);
    d->vsupply.min = 11.4;
    d->vsupply.max = 12.6;
    return d;
}

static void add_cap(br_catalog *cat, const char *id, double c, double rating, double cost)
{
    br_cap_part *p = &cat->caps[cat->ncaps];
    br_cap_part_defaults(p);
    snprintf(p->id, sizeof p->id, "%s", id);
    p->c = br_qty_fixed(c);
    p->c.min = 0.9 * c;
    p->c.max = 1.1 * c;
    p->esr = br_qty_fixed(0.01);
    p->vrated = br_qty_fixed(rating);
    cat->cap_offer[cat->ncaps].cost = cost;
    cat->cap_offer[cat->ncaps++].area = 2.0;
}

static void add_diode(br_catalog *cat, const char *id, double vrrm, double cost)
{
    br_diode_part *p = &cat->diodes[cat->ndiodes];
    br_diode_part_defaults(p);
    snprintf(p->id, sizeof p->id, "%s", id);
    p->is = br_qty_fixed(1e-7);
    p->n = br_qty_fixed(1.5);
    p->rs = br_qty_fixed(0.5);
    p->vrrm = br_qty_fixed(vrrm);
    cat->diode_offer[cat->ndiodes].cost = cost;
    cat->diode_offer[cat->ndiodes++].area = 3.0;
}

/* Capacitors: 0 tiny-10n (far too small for the bottom rails), 1
 * small-1u, 2 big-4u7, 3 low-volt-1u (rated below the supply).  Diodes:
 * 0 d-200v (160 V derated, below the 300 V blocked), 1 d-600v, 2 d-800v. */
static br_catalog *catalog(void)
{
    br_catalog *cat = calloc(1, sizeof *cat);
    snprintf(cat->path, sizeof cat->path, "(test)");
    add_cap(cat, "tiny-10n", 10e-9, 25.0, 0.01);
    add_cap(cat, "small-1u", 1e-6, 25.0, 0.02);
    add_cap(cat, "big-4u7", 4.7e-6, 25.0, 0.05);
    add_cap(cat, "low-volt-1u", 1e-6, 10.0, 0.005);
    add_diode(cat, "d-200v", 200.0, 0.05);
    add_diode(cat, "d-600v", 600.0, 0.1);
    add_diode(cat, "d-800v", 800.0, 0.2);
    return cat;
}

static const br_reject *rejected(const br_pick *p, int is_diode, int part)
{
    for (int i = 0; i < p->nrej; i++)
        if (p->rej[i].is_diode == is_diode && p->rej[i].part == part)
            return &p->rej[i];
    return NULL;
}

/* Placing a choice appends each catalog part once and points every stage
 * above the supply at it; stage 0 keeps its parts. */
static void test_apply(void)
{
    br_design *d = design();
    br_catalog *cat = catalog();
    br_choice ch;
    memset(&ch, 0, sizeof ch);
    for (int k = 0; k < BR_MAX_SWITCHES; k++)
        ch.cap[k] = ch.diode[k] = -1;
    ch.cap[1] = ch.cap[2] = 2;
    ch.cap[3] = 1;
    ch.diode[1] = ch.diode[2] = ch.diode[3] = 1;
    br_design *x;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_pick_apply(d, cat, &ch, &x, &err), BR_OK);
    CU_ASSERT_EQUAL(x->ncaps, 3);
    CU_ASSERT_EQUAL(x->ndiodes, 2);
    CU_ASSERT_STRING_EQUAL(x->caps[br_design_stage(x, 1)->cap].id, "big-4u7");
    CU_ASSERT_EQUAL(br_design_stage(x, 1)->cap, br_design_stage(x, 2)->cap);
    CU_ASSERT_STRING_EQUAL(x->caps[br_design_stage(x, 3)->cap].id, "small-1u");
    CU_ASSERT_STRING_EQUAL(x->diodes[br_design_stage(x, 3)->diode].id, "d-600v");
    CU_ASSERT_EQUAL(br_design_stage(x, 0)->cap, 0);
    br_design_free(x);
    free(cat);
    br_design_free(d);
}

/* The screens reject on ratings with the reason; the too-small capacitor
 * fails on every rail; the passing choices come cheapest first, and the
 * cheapest one-part choice is the small capacitor with the 600 V diode. */
static void test_screen_and_rank(void)
{
    br_design *d = design();
    br_catalog *cat = catalog();
    br_pick_opts o;
    br_pick_opts_default(&o);
    o.per_rail = 0;
    br_pick *p;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_pick_run(d, cat, &o, &p, &err), BR_OK);
    const br_reject *r = rejected(p, 0, 3);
    CU_ASSERT_PTR_NOT_NULL_FATAL(r);
    CU_ASSERT_PTR_NOT_NULL(strstr(r->why, "below the supply's maximum 12.6 V"));
    r = rejected(p, 1, 0);
    CU_ASSERT_PTR_NOT_NULL_FATAL(r);
    /* 80 % of 200 V (common practice derating) against 300 V blocked */
    CU_ASSERT_PTR_NOT_NULL(strstr(r->why, "derated rating 160 V"));
    r = rejected(p, 0, 0);
    CU_ASSERT_PTR_NOT_NULL_FATAL(r);
    CU_ASSERT_PTR_NOT_NULL(strstr(r->why, "on every rail: fails"));
    CU_ASSERT_PTR_NULL(rejected(p, 0, 1));
    CU_ASSERT_EQUAL(p->nuniform, 6); /* 3 admissible capacitors x 2 diodes */
    CU_ASSERT_EQUAL_FATAL(p->nranked, 4);
    const br_choice *best = &p->choice[p->ranked[0]];
    CU_ASSERT_EQUAL(best->cap[1], 1);
    CU_ASSERT_EQUAL(best->diode[1], 1);
    BR_ASSERT_NEAR(best->cost, 3 * (0.02 + 0.1), 1e-12);
    CU_ASSERT_TRUE(best->startup_checked);
    for (int i = 1; i < p->nranked; i++)
        CU_ASSERT_TRUE(p->choice[p->ranked[i]].cost >= p->choice[p->ranked[i - 1]].cost);
    br_pick_free(p);
    free(cat);
    br_design_free(d);
}

/* pick's start-up checks judge the start-up dropouts too: these chains
 * hiccup once or more on some stage from cold, so a design that allows
 * none has no choice left, each turned down on the dropouts row (with
 * the stage and the count). */
static void test_startup_dropouts(void)
{
    br_design *d = design();
    d->max_dropouts = 0;
    br_catalog *cat = catalog();
    br_pick_opts o;
    br_pick_opts_default(&o);
    o.per_rail = 0;
    br_pick *p;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_pick_run(d, cat, &o, &p, &err), BR_OK);
    CU_ASSERT_EQUAL(p->nranked, 0);
    int checked = 0;
    for (int i = 0; i < p->nchoice; i++) {
        const br_choice *ch = &p->choice[i];
        if (!ch->startup_checked)
            continue;
        checked++;
        CU_ASSERT_FALSE(ch->pass);
        CU_ASSERT_EQUAL(ch->fail_crit, BR_CRIT_DROPOUTS);
        CU_ASSERT_TRUE(ch->fail_row.figure >= 1.0 && ch->fail_row.limit == 0.0);
        CU_ASSERT_TRUE(ch->fail_row.stage > 0);
    }
    CU_ASSERT_TRUE(checked >= 4); /* every choice that passed its steady criteria */
    br_pick_free(p);
    free(cat);
    br_design_free(d);
}

/* The top rail carries only its own driver's charge, the bottom one the
 * charge of all three.  Per period a driver takes Iq T + Qg = 2 mA x
 * 10 us + 10 nC = 30 nC (charge budget, IR DT98-2): on 10 nF the top rail
 * droops about 3 V, within the 4 V between its 11 V and UVLO falling at
 * 7 V, while the rail below would droop 6 V.  So the descent puts the
 * tiny capacitor on the top rail only, a mix cheaper than any one-part
 * choice. */
static void test_per_rail(void)
{
    br_design *d = design();
    br_catalog *cat = catalog();
    br_pick_opts o;
    br_pick_opts_default(&o);
    o.startup = 0;
    br_pick *p;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_pick_run(d, cat, &o, &p, &err), BR_OK);
    CU_ASSERT_TRUE(p->greedy_tries > 0);
    CU_ASSERT_TRUE_FATAL(p->greedy >= 0);
    const br_choice *g = &p->choice[p->greedy];
    CU_ASSERT_TRUE(g->pass);
    CU_ASSERT_FALSE(g->uniform);
    BR_ASSERT_NEAR(g->cost, 2 * 0.02 + 0.01 + 3 * 0.1, 1e-12);
    CU_ASSERT_EQUAL(p->ranked[0], p->greedy);
    CU_ASSERT_EQUAL(g->cap[3], 0);
    CU_ASSERT_EQUAL(g->cap[2], 1);
    CU_ASSERT_EQUAL(g->cap[1], 1);
    CU_ASSERT_TRUE(g->margin > 0 && g->margin < 1.0);
    /* the list never contradicts the choices: a part the mix places was
     * not rejected everywhere, only as the only capacitor of every rail */
    const br_reject *tiny = rejected(p, 0, 0), *low = rejected(p, 0, 3);
    CU_ASSERT_TRUE_FATAL(tiny && low);
    CU_ASSERT_PTR_NOT_NULL(strstr(tiny->why, "as the only capacitor"));
    CU_ASSERT_TRUE(tiny->alone);
    CU_ASSERT_FALSE(low->alone); /* below the supply: never placed */
    for (int i = 0; i < p->nranked; i++) {
        const br_choice *ch = &p->choice[p->ranked[i]];
        for (int k = 1; k < 4; k++) {
            const br_reject *rc = rejected(p, 0, ch->cap[k]), *rd = rejected(p, 1, ch->diode[k]);
            CU_ASSERT_TRUE(!rc || rc->alone);
            CU_ASSERT_TRUE(!rd || rd->alone);
        }
    }
    br_pick_free(p);
    free(cat);
    br_design_free(d);
}

/* The ranking honours a minimum margin: by default a quarter of the UVLO
 * hysteresis (the test driver's 8 V rising, 7 V falling: 1 V, so 250 mV),
 * which every ranked choice meets; a minimum no choice reaches leaves
 * none ranked and the verdict a failure, the thin ones counted apart. */
static void test_min_margin(void)
{
    br_design *d = design();
    br_catalog *cat = catalog();
    br_pick_opts o;
    br_pick_opts_default(&o);
    o.startup = 0;
    o.per_rail = 0;
    br_pick *p;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_pick_run(d, cat, &o, &p, &err), BR_OK);
    BR_ASSERT_NEAR(p->hysteresis, d->drivers[0].uvlo_rise.nom - d->drivers[0].uvlo_fall.nom, 1e-12);
    BR_ASSERT_NEAR(p->min_margin, 0.25 * p->hysteresis, 1e-12);
    CU_ASSERT_TRUE(p->min_default);
    CU_ASSERT_TRUE_FATAL(p->nranked > 0);
    for (int i = 0; i < p->nranked; i++) {
        const br_choice *ch = &p->choice[p->ranked[i]];
        CU_ASSERT_TRUE(ch->margin >= p->min_margin);
        CU_ASSERT_TRUE(ch->crit >= BR_CRIT_RESTART && ch->crit < BR_CRIT_COUNT);
    }
    CU_ASSERT_EQUAL(p->outcome, BR_OUTCOME_PASS);
    int pass = p->nranked;
    br_pick_free(p);
    o.min_margin = 50.0;
    CU_ASSERT_EQUAL_FATAL(br_pick_run(d, cat, &o, &p, &err), BR_OK);
    CU_ASSERT_EQUAL(p->nranked, 0);
    CU_ASSERT_TRUE(p->nthin >= pass);
    CU_ASSERT_TRUE(p->thin >= 0);
    CU_ASSERT_EQUAL(p->outcome, BR_OUTCOME_FAIL);
    br_pick_free(p);
    free(cat);
    br_design_free(d);
}

/* With the solver held to one Newton iteration and one plain period the
 * choices that pass without it (the 1 uF and 4.7 uF capacitors) settle
 * nowhere: none is ranked, none counted as failing or held against its
 * parts, and the search ends undetermined.  The tiny capacitor still
 * fails: its drivers drop out, which no solver limit makes unsure. */
static void test_pick_undetermined(void)
{
    br_design *d = design();
    br_catalog *cat = catalog();
    br_pick_opts o;
    br_pick_opts_default(&o);
    o.startup = 0;
    o.per_rail = 0;
    o.solver_limit = 1;
    br_pick *p;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_pick_run(d, cat, &o, &p, &err), BR_OK);
    CU_ASSERT_EQUAL(p->nranked, 0);
    CU_ASSERT_EQUAL(p->outcome, BR_OUTCOME_UNDETERMINED);
    CU_ASSERT_EQUAL(p->nundet, 4); /* 2 capacitors x 2 diodes */
    for (int i = 0; i < p->nuniform; i++) {
        const br_choice *ch = &p->choice[i];
        CU_ASSERT_FALSE(ch->pass);
        if (ch->cap[1] == 0) {
            CU_ASSERT_EQUAL(ch->outcome, BR_OUTCOME_FAIL);
            continue;
        }
        CU_ASSERT_EQUAL(ch->outcome, BR_OUTCOME_UNDETERMINED);
        CU_ASSERT_TRUE(ch->unsettled > 0);
        CU_ASSERT_EQUAL(ch->fail_crit, -1);
    }
    CU_ASSERT_PTR_NULL(rejected(p, 0, 1));
    CU_ASSERT_PTR_NULL(rejected(p, 0, 2));
    CU_ASSERT_PTR_NULL(rejected(p, 1, 1));
    CU_ASSERT_PTR_NULL(rejected(p, 1, 2));
    br_pick_free(p);
    free(cat);
    br_design_free(d);
}

/* The progress hook: counts, and asks to stop at call stop_at (0: never). */
typedef struct seen {
    int calls, stop_at;
    double done, total;
    int backwards;
} seen;

static int hook(void *ctx, double done, double total)
{
    seen *s = ctx;
    s->calls++;
    s->backwards |= done < s->done;
    s->done = done;
    s->total = total;
    return s->stop_at > 0 && s->calls >= s->stop_at;
}

/* The work only grows and ends where the estimate does; a stop in the
 * base design's points or among the choices gives BR_ECANCEL and no
 * result (nothing leaked under ASan). */
static void test_progress_and_cancel(void)
{
    br_design *d = design();
    br_catalog *cat = catalog();
    br_pick_opts o;
    br_pick_opts_default(&o);
    o.threads = 2;
    o.per_rail = 0; /* the one-part choices are work enough */
    o.startup = 0;
    seen s = {0};
    br_progress hk = {hook, &s, NULL};
    o.progress = &hk;
    br_pick *p = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_pick_run(d, cat, &o, &p, &err), BR_OK);
    CU_ASSERT_TRUE(s.calls > 3);
    CU_ASSERT_FALSE(s.backwards);
    BR_ASSERT_NEAR(s.done, s.total, 1e-9);
    br_pick_free(p);
    int all = s.calls;
    for (int stop = 1; stop < all; stop += all / 3 + 1) {
        s = (seen){.stop_at = stop};
        p = (br_pick *)&s;
        CU_ASSERT_EQUAL(br_pick_run(d, cat, &o, &p, &err), BR_ECANCEL);
        CU_ASSERT_PTR_NULL(p);
        CU_ASSERT_EQUAL(s.calls, stop);
    }
    br_design_free(d);
    free(cat);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"a choice placed in the design", test_apply},
        {"rating screens, failures and the ranking", test_screen_and_rank},
        {"per-rail descent", test_per_rail},
        {"start-up dropouts over the design's limit", test_startup_dropouts},
        {"a minimum margin", test_min_margin},
        {"unsettled choices are undetermined", test_pick_undetermined},
        {"progress and a stop", test_progress_and_cancel},
        {NULL, NULL},
    };
    gsl_set_error_handler_off(); /* the library checks every GSL status itself */
    return br_test_main("analyses_pick", cases);
}

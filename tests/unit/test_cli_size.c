/* test_cli_size.c - sizing one design: the sized capacitor is the
 * smallest that qualifies (the next smaller catalog value, judged on its
 * own, does not), the continuous answer is within 1 % of failing, and the
 * verb writes a design file that reads back, never over its input. */
#include "analyses/size.h"
#include "runbin.h"
#include "testkit.h"

#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#define DESIGN BR_SOURCE_DIR "/tests/data/ref-c2.xml"
#define CATALOG BR_SOURCE_DIR "/examples/parts/catalog.xml"
#define SPLIT BR_SOURCE_DIR "/tests/data/split-3level.xml"
#define ONECAP BR_SOURCE_DIR "/tests/data/one-capacitor.xml"

static br_design *load(const char *path)
{
    br_design *d = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(path, &d, &err), BR_OK);
    return d;
}

/* The catalog's capacitors rated for the supply, in the order the search
 * walks them (capacitance, then cost), written out independently. */
static int order(const br_catalog *cat, double vmax, int *out)
{
    int n = 0;
    for (int i = 0; i < cat->ncaps; i++)
        if (cat->caps[i].vrated.nom >= vmax)
            out[n++] = i;
    for (int a = 1; a < n; a++)
        for (int b = a; b > 0; b--) {
            const br_cap_part *x = &cat->caps[out[b]], *y = &cat->caps[out[b - 1]];
            int before = x->c.nom < y->c.nom ||
                         (x->c.nom == y->c.nom &&
                          cat->cap_offer[out[b]].cost < cat->cap_offer[out[b - 1]].cost);
            if (!before)
                break;
            int t = out[b];
            out[b] = out[b - 1];
            out[b - 1] = t;
        }
    return n;
}

/* d with rail k's capacitor replaced by catalog part `part`. */
static br_design *with_part(const br_design *d, const br_catalog *cat, int k, int part)
{
    br_design *t = br_design_copy(d);
    CU_ASSERT_PTR_NOT_NULL_FATAL(t);
    t->caps[t->ncaps] = cat->caps[part];
    snprintf(t->caps[t->ncaps].id, BR_ID_MAX, "test-part");
    br_stage_spec s = *br_design_stage(t, k);
    s.cap = t->ncaps++;
    t->stage[k] = s;
    t->has_override[k] = 1;
    return t;
}

static int qualifies(const br_design *d, const br_design *t, const br_size_opts *o)
{
    br_size_verdict v;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_size_judge(d, t, o, &v, &err), BR_OK);
    return v.qualifies;
}

/* Every rail's answer qualifies and the catalog part just below it in the
 * walk's order does not, each judged afresh in the sized design. */
static void test_catalog_smallest(void)
{
    br_design *d = load(DESIGN);
    br_catalog *cat;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_catalog_load(CATALOG, &cat, &err), BR_OK);
    br_size_opts o;
    br_size_opts_default(&o);
    o.threads = 2;
    o.links = 0;
    o.cat = cat;
    o.target = 2.1; /* V: above what the catalog's smallest part keeps on the lower rails */
    br_size *z;
    CU_ASSERT_EQUAL_FATAL(br_size_run(d, &o, &z, &err), BR_OK);
    o.target = z->target;
    CU_ASSERT_EQUAL(z->outcome, BR_OUTCOME_PASS);
    int ord[BR_MAX_PARTS], n = order(cat, d->vsupply.max, ord), checked = 0;
    for (int k = 1; k < z->n; k++) {
        const br_size_answer *a = &z->cap[k];
        CU_ASSERT_TRUE(a->kind == BR_SIZE_FOUND || a->kind == BR_SIZE_END);
        int at = -1;
        for (int i = 0; i < n; i++)
            at = ord[i] == a->at.part ? i : at;
        CU_ASSERT_TRUE_FATAL(at >= 0);
        br_design *same = with_part(z->d, cat, k, ord[at]);
        CU_ASSERT_TRUE(qualifies(d, same, &o));
        br_design_free(same);
        if (a->kind == BR_SIZE_END) { /* the smallest rated part of the catalog */
            CU_ASSERT_EQUAL(at, 0);
            continue;
        }
        CU_ASSERT_EQUAL(a->beyond.part, ord[at - 1]);
        br_design *smaller = with_part(z->d, cat, k, ord[at - 1]);
        CU_ASSERT_FALSE(qualifies(d, smaller, &o));
        br_design_free(smaller);
        checked++;
    }
    CU_ASSERT_TRUE(checked > 0); /* some rail's answer is not the catalog's smallest */
    br_size_free(z);
    br_catalog_free(cat);
    br_design_free(d);
}

/* Continuous values: the answer qualifies, a value 1 % below it was judged
 * and does not. */
static void test_continuous(void)
{
    br_design *d = load(DESIGN);
    br_size_opts o;
    br_size_opts_default(&o);
    o.threads = 2;
    o.links = 0;
    br_size *z;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_size_run(d, &o, &z, &err), BR_OK);
    for (int k = 1; k < z->n; k++) {
        const br_size_answer *a = &z->cap[k];
        CU_ASSERT_EQUAL_FATAL(a->kind, BR_SIZE_FOUND);
        CU_ASSERT_TRUE(a->at.ver.qualifies);
        CU_ASSERT_FALSE(a->beyond.ver.qualifies);
        CU_ASSERT_TRUE(a->beyond.v < a->at.v && a->beyond.v >= a->at.v / (1 + BR_SIZE_RES_C));
        CU_ASSERT_TRUE(a->at.v < a->from); /* ref-c2's rails are larger than they need */
    }
    br_size_free(z);
    br_design_free(d);
}

/* The verb: a report, a design file that reads back with the sized parts,
 * and no writing over the input. */
static void test_cli(void)
{
    char dir[] = "/tmp/br-size-XXXXXX", out[96];
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(dir));
    snprintf(out, sizeof out, "%s/sized.xml", dir);
    run_result r = run((const char *[]){"size", "--catalog", CATALOG, "--threads", "2",
                                        "--write-design", out, DESIGN, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(has(r.out, "rail capacitors, from the top"));
    CU_ASSERT_TRUE(has(r.out, "largest link resistance"));
    CU_ASSERT_TRUE(has(r.out, "verdict: PASS"));
    CU_ASSERT_TRUE(has(r.out, "lethal voltages"));
    done(&r);
    char *text = br_test_slurp(out, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(text);
    CU_ASSERT_TRUE(has(text, "Sized by bootrung size from"));
    free(text);
    r = run((const char *[]){"analyze", "--quiet", out, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    done(&r);
    /* the design file is never an output */
    char *before = br_test_slurp(DESIGN, NULL);
    r = run((const char *[]){"size", "--write-design", DESIGN, DESIGN, NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    char *after = br_test_slurp(DESIGN, NULL);
    CU_ASSERT_STRING_EQUAL(before, after);
    free(before);
    free(after);
    done(&r);
    r = run((const char *[]){"size", "--target", "lots", DESIGN, NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    done(&r);
    /* a voltage that reads but is negative: the message says what is
     * expected (it printed an uninitialised error record's text before) */
    r = run((const char *[]){"size", "--target", "-1 V", DESIGN, NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_PTR_NOT_NULL(strstr(r.err, "--target '-1 V': expected a voltage of 0 or more"));
    done(&r);
    unlink(out);
    rmdir(dir);
}

/* d with injection i's resistance r. */
static br_design *with_inject_r(const br_design *d, int i, double r)
{
    br_design *t = br_design_copy(d);
    CU_ASSERT_PTR_NOT_NULL_FATAL(t);
    t->inject[i].r = br_qty_fixed(r);
    return t;
}

static br_size *size_split(const br_design *d, double target, br_size_opts *o)
{
    br_catalog *cat;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_catalog_load(ONECAP, &cat, &err), BR_OK);
    br_size_opts_default(o);
    o->threads = 2;
    o->cat = cat;
    o->target = target;
    br_size *z = NULL;
    CU_ASSERT_EQUAL_FATAL(br_size_run(d, o, &z, &err), BR_OK);
    br_catalog_free(cat);
    o->cat = NULL;
    return z;
}

/* The injection's resistance is sized as the link resistance is: the
 * answer qualifies, the value one bisection step (at most 2 %) above it
 * was judged and does not, each judged afresh at the worst corners; and
 * it is not below the floor V/IFRM.  Hand calculation of the floor
 * (tests/data/split-3level.xml): the injection's highest voltage 15 V +
 * 5 % = 15.75 V over its diode's IFRM 5 A = 3.15 ohm. */
static void test_inject(void)
{
    br_design *d = load(SPLIT);
    br_size_opts o;
    br_size *z = size_split(d, 1.0, &o);
    CU_ASSERT_EQUAL_FATAL(z->ninject, 1);
    BR_ASSERT_NEAR(z->inject_floor[0], 15.75 / 5.0, 1e-12);
    const br_size_answer *a = &z->inject[0];
    BR_ASSERT_NEAR(a->from, 4.7, 1e-12);
    CU_ASSERT_EQUAL_FATAL(a->kind, BR_SIZE_FOUND);
    CU_ASSERT_TRUE(a->at.v >= z->inject_floor[0]);
    CU_ASSERT_TRUE(a->beyond.v > a->at.v && a->beyond.v <= a->at.v * (1 + BR_SIZE_RES_R));
    CU_ASSERT_TRUE(a->at.ver.qualifies);
    CU_ASSERT_FALSE(a->beyond.ver.qualifies);
    BR_ASSERT_NEAR(z->d->inject[0].r.nom, a->at.v, 1e-12); /* the sized design has it */
    CU_ASSERT_EQUAL(z->outcome, BR_OUTCOME_PASS);
    br_design *same = with_inject_r(z->d, 0, a->at.v);
    br_design *above = with_inject_r(z->d, 0, a->beyond.v);
    CU_ASSERT_TRUE(qualifies(d, same, &o));
    CU_ASSERT_FALSE(qualifies(d, above, &o));
    br_design_free(same);
    br_design_free(above);
    br_size_free(z);
    br_design_free(d);
}

/* The floor holds: with a target no value reaches, the search halves from
 * the design's 4.7 ohm and stops at V/IFRM 3.15 ohm (by hand, above),
 * judging nothing below it. */
static void test_inject_floor(void)
{
    br_design *d = load(SPLIT);
    br_size_opts o;
    br_size *z = size_split(d, 8.0, &o); /* V: more than a 15 V rail keeps over 9 V */
    const br_size_answer *a = &z->inject[0];
    CU_ASSERT_EQUAL(a->kind, BR_SIZE_NONE);
    CU_ASSERT_TRUE(a->have_beyond);
    BR_ASSERT_NEAR(a->beyond.v, 3.15, 1e-12);          /* the last and smallest value judged */
    CU_ASSERT_EQUAL(a->trials, 2);                     /* 4.7 ohm, then the floor */
    BR_ASSERT_NEAR(z->d->inject[0].r.nom, 4.7, 1e-12); /* kept */
    br_size_free(z);
    br_design_free(d);
}

/* The verb reports the injection's resistance and writes it into the
 * design file, which reads back with it; the comment says what was sized. */
static void test_inject_cli(void)
{
    char dir[] = "/tmp/br-size-XXXXXX", out[96];
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(dir));
    snprintf(out, sizeof out, "%s/sized.xml", dir);
    run_result r = run((const char *[]){"size", "--catalog", ONECAP, "--target", "1 V", "--threads",
                                        "2", "--write-design", out, SPLIT, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(has(r.out, "largest injection resistance into rail 2 (A2): not below V/IFRM "
                              "3.15 ohm"));
    done(&r);
    char *text = br_test_slurp(out, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(text);
    CU_ASSERT_TRUE(has(text, "Injection into rail 2 (A2): resistance "));
    CU_ASSERT_TRUE(has(text, "the largest that qualifies (not below V/IFRM 3.15 ohm)"));
    free(text);
    br_design *back = load(out), *d = load(SPLIT);
    br_size_opts o;
    br_size *z = size_split(d, 1.0, &o);
    CU_ASSERT_EQUAL_FATAL(back->ninject, 1);
    BR_ASSERT_REL(back->inject[0].r.nom, z->inject[0].at.v, 1e-12);
    CU_ASSERT_TRUE(z->inject[0].at.v != 4.7); /* sized: not the design's own */
    br_size_free(z);
    br_design_free(back);
    br_design_free(d);
    r = run((const char *[]){"analyze", "--quiet", out, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    done(&r);
    unlink(out);
    rmdir(dir);
}

static void test_help_golden(void)
{
    CU_ASSERT_TRUE(help_is_golden("size"));
}

int main(void)
{
    static const br_test_case cases[] = {
        {"catalog: the next smaller value fails", test_catalog_smallest},
        {"continuous: within 1 % of failing", test_continuous},
        {"the verb", test_cli},
        {"an injection's resistance: the next larger value fails", test_inject},
        {"an injection's resistance never below V/IFRM", test_inject_floor},
        {"the verb sizes an injection's resistance", test_inject_cli},
        {"help (golden)", test_help_golden},
        {NULL, NULL},
    };
    return br_test_main("cli_size", cases);
}

/* test_io_design_write.c - a design written back to a design file reads
 * back as the same design: the chain it builds, its tolerances, and the
 * text it writes again. */
#include "io/design_write.h"
#include "model/chain.h"
#include "model/tolerance.h"
#include "testkit.h"

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

static br_design *load(const char *path)
{
    br_design *d = NULL;
    br_error err;
    br_error_clear(&err);
    int rc = br_design_load(path, &d, &err);
    if (rc != BR_OK)
        fprintf(stderr, "%s: %s\n", path, err.msg);
    return d;
}

static br_text *written(const br_design *d, const char *comment)
{
    br_text *t = br_text_create();
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_write(d, comment, t, &err), BR_OK);
    return t;
}

static br_design *reread(const br_text *t)
{
    br_design *d = NULL;
    br_error err;
    br_error_clear(&err);
    int rc = br_design_load_memory(br_text_data(t), br_text_len(t), "written.xml", &d, &err);
    if (rc != BR_OK)
        fprintf(stderr, "written.xml:%d: %s: %s\n%s", err.line, err.field, err.msg,
                br_text_data(t));
    CU_ASSERT_EQUAL_FATAL(rc, BR_OK);
    return d;
}

/* The chain without the pointers into its design. */
static void strip(br_chain *c)
{
    c->design = NULL;
    c->line.tab_at = c->line.tab_duty = NULL;
    for (int i = 0; i < c->nprecharge; i++)
        c->precharge[i].line = 0; /* where it stood in the file */
    for (int k = 0; k < c->n; k++) {
        br_stage *s = &c->st[k];
        s->diode.id = s->cap.id = s->drv.id = s->sw.id = s->aux.id = NULL;
        s->cap.bias_v = s->cap.bias_f = NULL;
    }
}

/* Numbers equal to the last few units (angles pass through degrees). */
static int same(double a, double b)
{
    return a == b || fabs(a - b) <= 1e-14 * fmax(fabs(a), fabs(b));
}

static void same_chain(const br_design *a, const br_design *b)
{
    br_chain *ca = calloc(1, sizeof *ca), *cb = calloc(1, sizeof *cb);
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build_nominal(a, ca, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_chain_build_nominal(b, cb, &err), BR_OK);
    for (int k = 0; k < ca->n; k++) /* the DC-bias tables themselves */
        for (int i = 0; i < ca->st[k].cap.nbias; i++)
            CU_ASSERT_TRUE(same(ca->st[k].cap.bias_f[i], cb->st[k].cap.bias_f[i]));
    strip(ca);
    strip(cb);
    if (memcmp(ca, cb, sizeof *ca) != 0) {
        /* the line cycle's phases go through degrees: compare as numbers */
        const double *x = (const double *)(const void *)ca, *y = (const double *)(const void *)cb;
        size_t n = sizeof *ca / sizeof(double), bad = 0;
        for (size_t i = 0; i < n; i++)
            bad += !(same(x[i], y[i]) || (isnan(x[i]) && isnan(y[i])));
        CU_ASSERT_EQUAL(bad, 0);
    }
    free(ca);
    free(cb);
}

static void same_tolerances(const br_design *a, const br_design *b)
{
    br_tol_list *la = malloc(sizeof *la), *lb = malloc(sizeof *lb);
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_tol_list_build(a, la, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_tol_list_build(b, lb, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(la->n, lb->n);
    for (int j = 0; j < la->n; j++) {
        CU_ASSERT_STRING_EQUAL(la->p[j].name, lb->p[j].name);
        CU_ASSERT_TRUE(same(la->p[j].min, lb->p[j].min));
        CU_ASSERT_TRUE(same(la->p[j].nom, lb->p[j].nom));
        CU_ASSERT_TRUE(same(la->p[j].max, lb->p[j].max));
        CU_ASSERT_EQUAL(la->p[j].dist, lb->p[j].dist);
    }
    free(la);
    free(lb);
}

static void round_trip(const char *path)
{
    br_design *a = load(path);
    CU_ASSERT_PTR_NOT_NULL_FATAL(a);
    br_text *t1 = written(a, "written back by a test");
    br_design *b = reread(t1);
    same_chain(a, b);
    same_tolerances(a, b);
    CU_ASSERT_STRING_EQUAL(a->name, b->name);
    CU_ASSERT_EQUAL(a->nprecharge, b->nprecharge);
    for (int i = 0; i < a->nprecharge; i++)
        CU_ASSERT_EQUAL(a->precharge[i].mask, b->precharge[i].mask);
    CU_ASSERT_EQUAL(a->hold_on, b->hold_on);
    CU_ASSERT_EQUAL(a->max_dropouts, b->max_dropouts);
    CU_ASSERT_EQUAL(a->ninject, b->ninject);
    for (int i = 0; i < a->ninject && i < b->ninject; i++) {
        CU_ASSERT_EQUAL(a->inject[i].rail, b->inject[i].rail);
        CU_ASSERT_EQUAL(a->inject[i].diode, b->inject[i].diode);
        CU_ASSERT_TRUE(same(a->inject[i].start, b->inject[i].start));
    }
    br_text *t2 = written(b, "written back by a test");
    /* a fixed point: what is written reads back to what writes the same */
    CU_ASSERT_STRING_EQUAL(br_text_data(t1), br_text_data(t2));
    br_text_free(t1);
    br_text_free(t2);
    br_design_free(a);
    br_design_free(b);
}

/* An injection's current limit reads as the supply's (its attributes
 * and modes); its current limit is a toleranced parameter and the chain
 * takes it at its nominal value, with the module's voltage as the set
 * point; a round trip keeps it (test_data). */
static void test_injection_limit_read(void)
{
    br_design *a = load(BR_SOURCE_DIR "/tests/data/split-limited.xml");
    CU_ASSERT_PTR_NOT_NULL_FATAL(a);
    const br_inject_spec *j = &a->inject[0];
    CU_ASSERT_EQUAL(j->limit_mode, BR_SUPPLY_HICCUP);
    BR_ASSERT_NEAR(j->ilimit.nom, 0.1, 1e-12);
    BR_ASSERT_NEAR(j->ilimit.min, 0.09, 1e-12);
    BR_ASSERT_NEAR(j->hiccup_delay.nom, 1e-3, 1e-15);
    BR_ASSERT_NEAR(j->hiccup_off.nom, 10e-3, 1e-15);
    CU_ASSERT_EQUAL(j->hiccup_retries, 5);
    BR_ASSERT_NEAR(j->irating.nom, 0.08, 1e-12);
    CU_ASSERT_EQUAL(a->limit_mode, BR_SUPPLY_CONSTANT); /* the supply's own, apart */
    br_tol_list *l = malloc(sizeof *l);
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_tol_list_build(a, l, &err), BR_OK);
    int found = 0;
    for (int i = 0; i < l->n; i++)
        found += strcmp(l->p[i].name, "injection rail 4: current-limit") == 0;
    CU_ASSERT_EQUAL(found, 1);
    free(l);
    br_chain *c = calloc(1, sizeof *c);
    CU_ASSERT_EQUAL_FATAL(br_chain_build_nominal(a, c, &err), BR_OK);
    CU_ASSERT_EQUAL(c->st[4].inj_lim.mode, BR_SUPPLY_HICCUP);
    BR_ASSERT_NEAR(c->st[4].inj_lim.ilimit, 0.1, 1e-12);
    BR_ASSERT_NEAR(c->st[4].inj_lim.vset, 15.0, 1e-12);
    CU_ASSERT_EQUAL(c->st[4].inj_lim.hiccup_retries, 5);
    BR_ASSERT_NEAR(c->st[4].inj_rating, 0.08, 1e-12);
    CU_ASSERT_EQUAL(c->st[3].inj_lim.mode, BR_SUPPLY_UNLIMITED);
    free(c);
    br_design_free(a);
}

static void test_examples(void)
{
    round_trip(BR_SOURCE_DIR "/examples/demo-3level.xml");
    round_trip(BR_SOURCE_DIR "/examples/leg-7level.xml");
    round_trip(BR_SOURCE_DIR "/examples/inverter-7level.xml");
    round_trip(BR_SOURCE_DIR "/examples/split-5level.xml");
}

/* The example's injection as its file gives it: rail 4, 15 V +-5 %
 * (14.25 V to 15.75 V), 4.7 ohm, the Schottky link diode, on from 0 s;
 * its voltage a toleranced parameter like the supply's; the chain takes
 * the injection's diode and resistance on link 4. */
static void test_injection_read(void)
{
    br_design *a = load(BR_SOURCE_DIR "/examples/split-5level.xml");
    CU_ASSERT_PTR_NOT_NULL_FATAL(a);
    CU_ASSERT_EQUAL_FATAL(a->ninject, 1);
    const br_inject_spec *j = &a->inject[0];
    CU_ASSERT_EQUAL(j->rail, 4);
    BR_ASSERT_NEAR(j->v.nom, 15.0, 1e-12);
    BR_ASSERT_NEAR(j->v.min, 14.25, 1e-12);
    BR_ASSERT_NEAR(j->v.max, 15.75, 1e-12);
    BR_ASSERT_NEAR(j->r.nom, 4.7, 1e-12);
    BR_ASSERT_NEAR(j->start, 0.0, 0.0);
    CU_ASSERT_STRING_EQUAL(a->diodes[j->diode].id, "sic-schottky-600v");
    br_tol_list *l = malloc(sizeof *l);
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_tol_list_build(a, l, &err), BR_OK);
    int found = 0;
    for (int i = 0; i < l->n; i++)
        found += strcmp(l->p[i].name, "injection rail 4: voltage") == 0;
    CU_ASSERT_EQUAL(found, 1);
    free(l);
    br_chain *c = calloc(1, sizeof *c);
    CU_ASSERT_EQUAL_FATAL(br_chain_build_nominal(a, c, &err), BR_OK);
    CU_ASSERT_TRUE(c->st[4].inject && !c->st[3].inject && !c->st[5].inject);
    BR_ASSERT_NEAR(c->st[4].r_link, 4.7, 1e-12);
    BR_ASSERT_NEAR(c->st[4].vinj, 15.0, 1e-12);
    free(c);
    br_design_free(a);
}

static void test_data(void)
{
    static const char *const files[] = {"tests/data/fcml5-clamped.xml",
                                        "tests/data/hiccup-startup.xml",
                                        "tests/data/split-limited.xml",
                                        "tests/data/line-3level.xml",
                                        "tests/data/ref-c1.xml",
                                        "tests/data/ref-c8.xml",
                                        "tests/data/slow-startup.xml",
                                        "tests/extreme/string-wrap.xml",
                                        "tests/extreme/halfbridge-d02.xml",
                                        "tests/extreme/clamp-ideal.xml",
                                        "tests/extreme/levels-33.xml",
                                        NULL};
    for (int i = 0; files[i]; i++) {
        char path[512];
        snprintf(path, sizeof path, "%s/%s", BR_SOURCE_DIR, files[i]);
        round_trip(path);
    }
}

/* The comment is kept, without the "--" XML forbids in it, and the
 * markup of a name is escaped. */
static void test_comment_and_escapes(void)
{
    br_design *a = load(BR_SOURCE_DIR "/examples/demo-3level.xml");
    CU_ASSERT_PTR_NOT_NULL_FATAL(a);
    snprintf(a->name, sizeof a->name, "a<b&\"c\"");
    br_text *t = written(a, "sized -- to 50 mV\nsecond line-");
    CU_ASSERT_PTR_NOT_NULL(strstr(br_text_data(t), "sized - - to 50 mV"));
    CU_ASSERT_PTR_NOT_NULL(strstr(br_text_data(t), "  second line-\n-->"));
    br_design *b = reread(t);
    CU_ASSERT_STRING_EQUAL(b->name, "a<b&\"c\"");
    br_text_free(t);
    br_design_free(a);
    br_design_free(b);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"an injection read from its file", test_injection_read},
        {"an injection's current limit read from its file", test_injection_limit_read},
        {"examples", test_examples},
        {"data and extreme designs", test_data},
        {"comment and escapes", test_comment_and_escapes},
        {NULL, NULL},
    };
    return br_test_main("io_design_write", cases);
}

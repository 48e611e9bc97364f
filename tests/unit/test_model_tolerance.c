/* test_model_tolerance.c - listing, naming, reading and writing the
 * toleranced values of a design. */
#include "model/chain.h"
#include "model/tolerance.h"
#include "testdesign.h"
#include "testkit.h"

#include <stddef.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

static br_qty tol(double nom, double rel)
{
    br_qty q = br_qty_fixed(nom);
    q.min = nom * (1.0 - rel);
    q.max = nom * (1.0 + rel);
    return q;
}

static int find(const br_tol_list *l, const char *name)
{
    for (int j = 0; j < l->n; j++)
        if (strcmp(l->p[j].name, name) == 0)
            return j;
    return -1;
}

/* Only values with a tolerance are listed, each named after its element
 * and attribute as the design file writes them, in file order. */
static void test_list_names(void)
{
    br_design *d = br_test_fcml(2, 400.0, 100e3, 0.5, 50e-9);
    br_error err;
    br_tol_list l;
    d->vsupply = tol(12.0, 0.05);
    d->tamb = br_qty_fixed(313.15);
    d->tamb.min = 263.15;
    d->tamb.max = 358.15;
    d->caps[0].c = tol(1e-6, 0.2);
    d->drivers[0].iq_on = tol(2e-3, 0.25);
    CU_ASSERT_EQUAL_FATAL(br_tol_list_build(d, &l, &err), BR_OK);
    CU_ASSERT_EQUAL(l.n, 4);
    CU_ASSERT_EQUAL(find(&l, "operating-point: ambient"), 0);
    CU_ASSERT_EQUAL(find(&l, "supply: voltage"), 1);
    CU_ASSERT_EQUAL(find(&l, "capacitor test-cap: c"), 2);
    CU_ASSERT_EQUAL(find(&l, "driver test-driver: iq-run"), 3);
    CU_ASSERT_EQUAL(l.p[0].kind, BR_KIND_TEMPERATURE);
    BR_ASSERT_NEAR(l.p[1].min, 11.4, 1e-12);
    BR_ASSERT_NEAR(l.p[1].max, 12.6, 1e-12);
    BR_ASSERT_NEAR(l.p[2].nom, 1e-6, 1e-18);
    br_design_free(d);
}

/* Parts no stage uses, and a rail capacitor on stage 0 (the supply), are
 * not parameters of the chain. */
static void test_unused_parts_left_out(void)
{
    br_design *d = br_test_fcml(3, 400.0, 100e3, 0.5, 50e-9);
    br_error err;
    br_tol_list l;
    br_cap_part *spare = &d->caps[d->ncaps++];
    br_cap_part_defaults(spare);
    snprintf(spare->id, sizeof spare->id, "spare-cap");
    spare->c = tol(10e-6, 0.2);
    d->caps[0].c = tol(1e-6, 0.1);
    CU_ASSERT_EQUAL_FATAL(br_tol_list_build(d, &l, &err), BR_OK);
    CU_ASSERT_EQUAL(l.n, 1);
    CU_ASSERT_TRUE(find(&l, "capacitor test-cap: c") >= 0);
    CU_ASSERT_EQUAL(find(&l, "capacitor spare-cap: c"), -1);
    /* once a stage uses it, it counts */
    d->stage[2] = d->def;
    d->stage[2].cap = 1;
    d->has_override[2] = 1;
    CU_ASSERT_EQUAL_FATAL(br_tol_list_build(d, &l, &err), BR_OK);
    CU_ASSERT_EQUAL(l.n, 2);
    CU_ASSERT_TRUE(find(&l, "capacitor spare-cap: c") >= 0);
    br_design_free(d);
}

/* The link resistor of an overridden stage is its own value, named by
 * the stage and its switch (B1, B2, A2, A1 for a 3-level leg). */
static void test_stage_resistors(void)
{
    br_design *d = br_test_fcml(3, 400.0, 100e3, 0.5, 50e-9);
    br_error err;
    br_tol_list l;
    d->def.r_link = tol(1.0, 0.05);
    d->stage[2] = d->def;
    d->stage[2].r_link = tol(2.2, 0.1);
    d->has_override[2] = 1;
    CU_ASSERT_EQUAL_FATAL(br_tol_list_build(d, &l, &err), BR_OK);
    CU_ASSERT_EQUAL(l.n, 2);
    int a = find(&l, "stages: link-resistor"), b = find(&l, "stage 2 (A2): link-resistor");
    CU_ASSERT_TRUE_FATAL(a >= 0 && b >= 0);
    BR_ASSERT_NEAR(l.p[b].nom, 2.2, 1e-12);
    br_design_free(d);
}

/* Values are written into a copy at their nominal field; the limits and
 * the original stay as they were. */
static void test_set_in_copy(void)
{
    br_design *d = br_test_fcml(2, 400.0, 100e3, 0.5, 50e-9);
    br_error err;
    br_tol_list l;
    d->vsupply = tol(12.0, 0.05);
    d->switches[0].qg = tol(10e-9, 0.2);
    CU_ASSERT_EQUAL_FATAL(br_tol_list_build(d, &l, &err), BR_OK);
    br_design *c = br_design_copy(d);
    CU_ASSERT_PTR_NOT_NULL_FATAL(c);
    double v[2] = {br_tol_level(&l.p[0], -1), br_tol_level(&l.p[1], 1)};
    br_tol_apply(c, &l, v);
    BR_ASSERT_NEAR(c->vsupply.nom, 11.4, 1e-12);
    BR_ASSERT_NEAR(c->switches[0].qg.nom, 12e-9, 1e-21);
    BR_ASSERT_NEAR(c->vsupply.min, 11.4, 1e-12);
    BR_ASSERT_NEAR(c->vsupply.max, 12.6, 1e-12);
    BR_ASSERT_NEAR(d->vsupply.nom, 12.0, 1e-12);
    BR_ASSERT_NEAR(br_tol_get(c, &l.p[0]), 11.4, 1e-12);
    BR_ASSERT_NEAR(br_tol_level(&l.p[0], 0), 12.0, 1e-12);
    CU_ASSERT_EQUAL(br_tol_find(&l, offsetof(br_design, vsupply)), 0);
    CU_ASSERT_EQUAL(br_tol_find(&l, offsetof(br_design, vin)), -1);
    br_design_free(c);
    br_design_free(d);
}

/* A design with more toleranced values than the list holds is refused
 * with a message that says so. */
/* One ambient for every part: a design whose capacitor follows a
 * temperature table and whose diodes leak by the usual law has a single
 * temperature parameter, and at its hot limit the capacitor is at its
 * hot capacitance and the diode leaks its hot leakage in the same chain
 * (hot diodes come with hot capacitors, not independently).  By hand: at
 * 85 C the table gives 0.85 (1 uF -> 0.85 uF), the leakage 1 uA x
 * 2^((85 - 25)/10) = 64 uA; at -15 C, 1 + (40/80) (0.9 - 1) = 0.95 and
 * 1 uA x 2^-4 = 62.5 nA. */
static void test_one_ambient(void)
{
    br_design *d = br_test_fcml(2, 400.0, 100e3, 0.5, 50e-9);
    br_error err;
    br_tol_list l;
    d->tamb = br_qty_fixed(298.15);
    d->tamb.min = 258.15;
    d->tamb.max = 358.15;
    br_cap_part *cp = &d->caps[0];
    cp->ntemp = 3;
    cp->temp_t[0] = 218.15; /* -55 C */
    cp->temp_f[0] = 0.9;
    cp->temp_t[1] = 298.15;
    cp->temp_f[1] = 1.0;
    cp->temp_t[2] = 378.15; /* 105 C */
    cp->temp_f[2] = 0.8;
    d->diodes[0].ir = br_qty_fixed(1e-6);
    d->diodes[0].ir_temp = br_qty_fixed(298.15);
    d->diodes[0].ir_double = br_qty_fixed(10.0);
    CU_ASSERT_EQUAL_FATAL(br_tol_list_build(d, &l, &err), BR_OK);
    CU_ASSERT_EQUAL(l.n, 1);
    CU_ASSERT_STRING_EQUAL(l.p[0].name, "operating-point: ambient");
    br_design *hot = br_design_copy(d);
    CU_ASSERT_PTR_NOT_NULL_FATAL(hot);
    double levels[2] = {br_tol_level(&l.p[0], 1), br_tol_level(&l.p[0], -1)};
    double want_c[2] = {0.85e-6, 0.95e-6}, want_ir[2] = {64e-6, 62.5e-9};
    for (int i = 0; i < 2; i++) {
        br_tol_apply(hot, &l, &levels[i]);
        br_chain *c;
        CU_ASSERT_EQUAL_FATAL(br_chain_build(hot, &c, &err), BR_OK);
        BR_ASSERT_REL(c->st[1].cap.c, want_c[i], 1e-12);
        BR_ASSERT_REL(c->st[1].diode.ir, want_ir[i], 1e-12);
        br_chain_free(c);
    }
    br_design_free(hot);
    br_design_free(d);
}

static void test_too_many(void)
{
    br_design *d = br_test_fcml(33, 6400.0, 100e3, 0.5, 50e-9);
    br_error err;
    br_error_clear(&err);
    br_tol_list *l = malloc(sizeof *l);
    int n = br_design_nswitch(d);
    for (int k = 1; k < n; k++) {
        br_diode_part *p = &d->diodes[k - 1];
        if (k > 1)
            *p = d->diodes[0];
        snprintf(p->id, sizeof p->id, "d%d", k);
        p->is = tol(1e-7, 0.5);
        p->rs = tol(0.5, 0.2);
        p->n = tol(1.5, 0.1);
        d->stage[k] = d->def;
        d->stage[k].diode = k - 1;
        d->has_override[k] = 1;
    }
    d->ndiodes = n - 1;
    CU_ASSERT_EQUAL(br_tol_list_build(d, l, &err), BR_EINPUT);
    CU_ASSERT_PTR_NOT_NULL(strstr(err.msg, "toleranced values"));
    free(l);
    br_design_free(d);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"toleranced values named as in the file", test_list_names},
        {"unused parts are not parameters", test_unused_parts_left_out},
        {"link resistors of overridden stages", test_stage_resistors},
        {"values written into a copy", test_set_in_copy},
        {"one ambient for capacitors and diodes", test_one_ambient},
        {"too many toleranced values refused", test_too_many},
        {NULL, NULL},
    };
    return br_test_main("model_tolerance", cases);
}

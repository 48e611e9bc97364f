/* test_analyses_rules.c - the design rules of `bootrung check`, on designs
 * built by hand so that each rule fires alone (or not at all). */
#include "analyses/rules.h"
#include "testdesign.h"
#include "testkit.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

/* The test design (tests/support/testdesign.c): 12 V supply with 0.2 ohm,
 * 1 ohm link resistors, diode Is 1e-7 A, n 1.5, Rs 0.5 ohm, 600 V; driver
 * UVLO 7.5/7.0 V, 2 mA running; switch Qg 10 nC, gate maximum 20 V; no
 * overshoot, 80 % derating, 27 C (the diode's reference temperature). */
static br_design *leg(int levels, double vin)
{
    br_design *d = br_test_fcml(levels, vin, 100e3, 0.5, 50e-9);
    CU_ASSERT_PTR_NOT_NULL_FATAL(d);
    return d;
}

/* Build the chain of d and run the rules; frees nothing. */
static br_chain *check(const br_design *d, br_rule_list *rules)
{
    br_chain *c = NULL;
    br_error err;
    br_error_clear(&err);
    int rc = br_chain_build(d, &c, &err);
    if (rc != BR_OK)
        fprintf(stderr, "chain: %s\n", err.msg);
    CU_ASSERT_EQUAL_FATAL(rc, BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_rules_check(c, rules, &err), BR_OK);
    return c;
}

static int count(const br_rule_list *r, int kind)
{
    int n = 0;
    for (int i = 0; i < r->n; i++)
        n += r->hit[i].kind == kind;
    return n;
}

static const br_rule_hit *first(const br_rule_list *r, int kind)
{
    for (int i = 0; i < r->n; i++)
        if (r->hit[i].kind == kind)
            return &r->hit[i];
    return NULL;
}

static void done(br_design *d, br_chain *c)
{
    br_chain_free(c);
    br_design_free(d);
}

/* A sound design: 4 levels at 1000 V, 333 V per diode against 600 V. */
static void test_clean_design(void)
{
    br_rule_list r;
    br_design *d = leg(4, 1000.0);
    br_chain *c = check(d, &r);
    for (int i = 0; i < r.n; i++)
        fprintf(stderr, "unexpected finding %s at stage %d\n", br_rule_name(r.hit[i].kind),
                r.hit[i].stage);
    CU_ASSERT_EQUAL(r.n, 0);
    done(d, c);
}

/* 4 levels at 2000 V: each switch blocks 2000/3 V (common practice:
 * Vin/(N-1)), above the 600 V rating, on every one of the 5 links. */
static void test_diode_rating(void)
{
    br_rule_list r;
    br_design *d = leg(4, 2000.0);
    br_chain *c = check(d, &r);
    CU_ASSERT_EQUAL(count(&r, BR_RULE_DIODE_RATING), 5);
    CU_ASSERT_EQUAL(count(&r, BR_RULE_DIODE_DERATING), 0);
    const br_rule_hit *h = first(&r, BR_RULE_DIODE_RATING);
    CU_ASSERT_PTR_NOT_NULL_FATAL(h);
    CU_ASSERT_EQUAL(h->stage, 1);
    CU_ASSERT_STRING_EQUAL(h->part, "test-diode");
    BR_ASSERT_NEAR(h->figure, 2000.0 / 3.0, 1e-9);
    BR_ASSERT_NEAR(h->limit, 600.0, 1e-12);
    done(d, c);
}

/* 333.3 V with 50 % overshoot is 500 V: under the 600 V rating, over the
 * 80 % derating limit of 480 V. */
static void test_diode_derating(void)
{
    br_rule_list r;
    br_design *d = leg(4, 1000.0);
    d->overshoot = br_qty_fixed(0.5);
    br_chain *c = check(d, &r);
    CU_ASSERT_EQUAL(count(&r, BR_RULE_DIODE_RATING), 0);
    CU_ASSERT_EQUAL(count(&r, BR_RULE_DIODE_DERATING), 5);
    const br_rule_hit *h = first(&r, BR_RULE_DIODE_DERATING);
    CU_ASSERT_PTR_NOT_NULL_FATAL(h);
    BR_ASSERT_NEAR(h->figure, 500.0, 1e-9);
    BR_ASSERT_NEAR(h->limit, 480.0, 1e-9);
    done(d, c);
}

static void test_diode_unrated(void)
{
    br_rule_list r;
    br_design *d = leg(3, 800.0);
    d->diodes[0].vrrm = br_qty_fixed(0.0);
    br_chain *c = check(d, &r);
    CU_ASSERT_EQUAL(count(&r, BR_RULE_DIODE_UNRATED), 3);
    CU_ASSERT_EQUAL(r.n, 3);
    done(d, c);
}

static void test_uvlo_hysteresis(void)
{
    br_rule_list r;
    br_design *d = leg(3, 800.0);
    d->drivers[0].uvlo_fall = br_qty_fixed(7.5); /* equal to rising */
    br_chain *c = check(d, &r);
    CU_ASSERT_EQUAL(count(&r, BR_RULE_UVLO_HYSTERESIS), 4); /* every stage */
    CU_ASSERT_EQUAL(r.n, 4);
    const br_rule_hit *h = first(&r, BR_RULE_UVLO_HYSTERESIS);
    CU_ASSERT_PTR_NOT_NULL_FATAL(h);
    CU_ASSERT_EQUAL(h->stage, 0);
    CU_ASSERT_STRING_EQUAL(h->part, "test-driver");
    done(d, c);
}

/* Average link currents: each stage draws 2 mA + 10 nC * 100 kHz = 3 mA,
 * so link k of a 6-stage leg carries (6-k) * 3 mA and the supply 18 mA. */
static void test_link_current(void)
{
    br_rule_list r;
    br_design *d = leg(4, 1000.0);
    br_chain *c = check(d, &r);
    BR_ASSERT_NEAR(br_link_current(c, 0), 18e-3, 1e-12);
    BR_ASSERT_NEAR(br_link_current(c, 1), 15e-3, 1e-12);
    BR_ASSERT_NEAR(br_link_current(c, 5), 3e-3, 1e-12);
    done(d, c);
}

/* Shockley (S. M. Sze, Physics of Semiconductor Devices): at 15 mA,
 * Is 1e-7 A, n 1.5 and 300.15 K (Vt = kT/q = 25.8648 mV, CODATA 2018) the
 * junction drops 1.5 * Vt * ln(1 + 15e-3/1e-7) = 0.46240 V; with the 1 ohm
 * link resistor and 0.5 ohm Rs, Ohm's law adds 22.5 mV. */
static void test_link_drop(void)
{
    br_rule_list r;
    br_design *d = leg(4, 1000.0);
    br_chain *c = check(d, &r);
    BR_ASSERT_NEAR(br_link_drop(c, 1), 0.46240 + 0.0225, 2e-5);
    done(d, c);
}

/* A near-ideal diode (Is = 1 A: junction drop ~ n Vt I, < 1 mV) and 120 ohm
 * links make the drops pure Ohm's law: 18 mA * 0.2 ohm at the supply, then
 * 1.8, 1.44, 1.08, 0.72 V on links 1-4.  Rail 4 sits at 12 - 0.0036 - 5.04
 * = 6.9564 V, below UVLO rising 7.5 V; rail 3 (7.6764 V) still starts. */
static void test_supply_short(void)
{
    br_rule_list r;
    br_design *d = leg(4, 1000.0);
    d->diodes[0].is = br_qty_fixed(1.0);
    d->diodes[0].rs = br_qty_fixed(0.0);
    d->def.r_link = br_qty_fixed(120.0);
    br_chain *c = check(d, &r);
    CU_ASSERT_EQUAL(count(&r, BR_RULE_SUPPLY_SHORT), 1);
    CU_ASSERT_EQUAL(r.n, 1);
    const br_rule_hit *h = first(&r, BR_RULE_SUPPLY_SHORT);
    CU_ASSERT_PTR_NOT_NULL_FATAL(h);
    CU_ASSERT_EQUAL(h->stage, 4);
    CU_ASSERT_TRUE(h->fatal);
    BR_ASSERT_NEAR(h->figure, 6.9564, 3e-3);
    BR_ASSERT_NEAR(h->limit, 7.5, 1e-12);
    BR_ASSERT_NEAR(h->current, 6e-3, 1e-12);
    done(d, c);
}

/* The supply_short design with a second isolated supply into rail 4
 * through 10 ohm: rails 4 and 5 draw 2 x 3 mA = 6 mA from it, so the
 * driver of rail 4 sees V - n Vt ln(6 mA / 1 A + 1) - 6 mA x 10 ohm =
 * V - 1.5 x 25.865 mV x 0.0059822 - 60 mV = V - 60.232 mV.  At 8 V that
 * is 7.9398 V, above UVLO rising 7.5 V: no finding (and rails 1 to 3 no
 * longer carry the charge of 4 and 5).  At 7.5 V it is 7.4398 V: the
 * injection cannot start its rail, a fatal finding that stalls rails 4
 * and 5. */
static br_design *injected(double v)
{
    br_design *d = leg(4, 1000.0);
    d->diodes[0].is = br_qty_fixed(1.0);
    d->diodes[0].rs = br_qty_fixed(0.0);
    d->def.r_link = br_qty_fixed(120.0);
    br_inject_spec *j = &d->inject[d->ninject++];
    j->rail = 4;
    j->v = br_qty_fixed(v);
    j->r = br_qty_fixed(10.0);
    j->diode = 0;
    j->start = 0.0;
    return d;
}

static void test_injection_short(void)
{
    br_rule_list r;
    br_design *d = injected(8.0);
    br_chain *c = check(d, &r);
    CU_ASSERT_EQUAL(r.n, 0);
    done(d, c);
    d = injected(7.5);
    c = check(d, &r);
    CU_ASSERT_EQUAL(r.n, 1);
    CU_ASSERT_EQUAL(count(&r, BR_RULE_SUPPLY_SHORT), 0);
    const br_rule_hit *h = first(&r, BR_RULE_INJECT_SHORT);
    CU_ASSERT_PTR_NOT_NULL_FATAL(h);
    CU_ASSERT_EQUAL(h->stage, 4);
    CU_ASSERT_TRUE(h->fatal);
    const double vt = 1.380649e-23 * 300.15 / 1.602176634e-19;
    BR_ASSERT_NEAR(h->figure, 7.5 - 1.5 * vt * log(6e-3 + 1.0) - 0.06, 1e-9);
    BR_ASSERT_NEAR(h->figure, 7.4398, 1e-4);
    BR_ASSERT_NEAR(h->current, 6e-3, 1e-12);
    CU_ASSERT_EQUAL(h->index, 5); /* the last rail it stalls */
    CU_ASSERT_STRING_EQUAL(br_rule_name(BR_RULE_INJECT_SHORT), "injection-short");
    done(d, c);
}

/* An injection that starts after the longest start-up simulated (20 ms)
 * is a warning: no start-up sees it. */
static void test_injection_late(void)
{
    br_rule_list r;
    br_design *d = injected(8.0);
    d->inject[0].start = 25e-3;
    br_chain *c = check(d, &r);
    const br_rule_hit *h = first(&r, BR_RULE_INJECT_LATE);
    CU_ASSERT_PTR_NOT_NULL_FATAL(h);
    CU_ASSERT_FALSE(h->fatal);
    BR_ASSERT_NEAR(h->figure, 25e-3, 1e-15);
    BR_ASSERT_NEAR(h->limit, 20e-3, 1e-15);
    done(d, c);
}

/* A 7.4 V supply is below UVLO rising even before any link. */
static void test_supply_short_low(void)
{
    br_rule_list r;
    br_design *d = leg(4, 1000.0);
    d->vsupply = br_qty_fixed(7.4);
    br_chain *c = check(d, &r);
    const br_rule_hit *h = first(&r, BR_RULE_SUPPLY_SHORT);
    CU_ASSERT_PTR_NOT_NULL_FATAL(h);
    CU_ASSERT_EQUAL(h->stage, 0);
    BR_ASSERT_NEAR(h->figure, 7.4 - 0.2 * 18e-3, 1e-12);
    done(d, c);
}

/* e-mode GaN style gate (7 V absolute maximum, from memory) on a 12 V
 * supply with +-5 %: every rail can reach 12.6 V. */
static void test_gate_unprotected(void)
{
    br_rule_list r;
    br_design *d = leg(3, 800.0);
    d->switches[0].vgs_max = br_qty_fixed(7.0);
    d->vsupply.max = 12.6;
    d->vsupply.min = 11.4;
    br_chain *c = check(d, &r);
    CU_ASSERT_EQUAL(count(&r, BR_RULE_GATE_UNPROTECTED), 4);
    const br_rule_hit *h = first(&r, BR_RULE_GATE_UNPROTECTED);
    CU_ASSERT_PTR_NOT_NULL_FATAL(h);
    BR_ASSERT_NEAR(h->figure, 12.6, 1e-12);
    BR_ASSERT_NEAR(h->limit, 7.0, 1e-12);
    CU_ASSERT_STRING_EQUAL(h->part, "test-switch");
    done(d, c);
}

static void add_ldo(br_design *d, double vout, double dropout)
{
    br_aux_part *a = &d->aux[d->naux++];
    br_aux_part_defaults(a);
    snprintf(a->id, sizeof a->id, "test-ldo");
    a->kind = BR_AUX_LDO;
    a->vout = br_qty_fixed(vout);
    a->dropout = br_qty_fixed(dropout);
    a->iq = br_qty_fixed(50e-6);
    d->def.aux = 0;
}

/* A 6 V regulator per rail with 5 V UVLO-class drivers and 7 V gates: the
 * gate rule is satisfied by the regulator, nothing else fires. */
static void test_regulated_clean(void)
{
    br_rule_list r;
    br_design *d = leg(3, 800.0);
    d->switches[0].vgs_max = br_qty_fixed(7.0);
    d->drivers[0].uvlo_rise = br_qty_fixed(5.0);
    d->drivers[0].uvlo_fall = br_qty_fixed(4.6);
    add_ldo(d, 6.0, 0.3);
    br_chain *c = check(d, &r);
    CU_ASSERT_EQUAL(r.n, 0);
    done(d, c);
}

static void test_aux_limits(void)
{
    br_rule_list r;
    br_design *d = leg(3, 800.0);
    d->switches[0].vgs_max = br_qty_fixed(5.0);
    add_ldo(d, 6.0, 0.3); /* below UVLO 7.5 V and above the 5 V gate */
    br_chain *c = check(d, &r);
    CU_ASSERT_EQUAL(count(&r, BR_RULE_AUX_BELOW_UVLO), 4);
    CU_ASSERT_EQUAL(count(&r, BR_RULE_AUX_ABOVE_GATE), 4);
    CU_ASSERT_EQUAL(count(&r, BR_RULE_GATE_UNPROTECTED), 0);
    const br_rule_hit *h = first(&r, BR_RULE_AUX_ABOVE_GATE);
    CU_ASSERT_PTR_NOT_NULL_FATAL(h);
    CU_ASSERT_STRING_EQUAL(h->part, "test-ldo");
    BR_ASSERT_NEAR(h->figure, 6.0, 1e-12);
    BR_ASSERT_NEAR(h->limit, 5.0, 1e-12);
    /* the supply rule sees the regulator's output too: stage 0 stalls */
    h = first(&r, BR_RULE_SUPPLY_SHORT);
    CU_ASSERT_PTR_NOT_NULL_FATAL(h);
    CU_ASSERT_EQUAL(h->stage, 0);
    BR_ASSERT_NEAR(h->figure, 6.0, 1e-12);
    done(d, c);
}

/* An explicit three-switch string whose middle switch is never on: link 2
 * (returning through it) can never charge. */
static void test_no_window(void)
{
    br_rule_list r;
    br_design *d = leg(2, 400.0);
    d->topology = BR_TOPO_STRING;
    d->nswitch = 3;
    for (int s = 0; s < 3; s++) {
        snprintf(d->sw[s].name, sizeof d->sw[s].name, "S%d", s + 1);
        d->sw[s].vblock = br_qty_fixed(200.0);
        d->sw[s].nwin = s == 1 ? 0 : 1;
        d->sw[s].on[0][0] = 0.1;
        d->sw[s].on[0][1] = 0.6;
    }
    br_chain *c = check(d, &r);
    const br_rule_hit *h = first(&r, BR_RULE_NO_WINDOW);
    CU_ASSERT_PTR_NOT_NULL_FATAL(h);
    CU_ASSERT_EQUAL(h->stage, 2);
    CU_ASSERT_STRING_EQUAL(h->part, "S2");
    CU_ASSERT_TRUE(h->fatal);
    CU_ASSERT_EQUAL(count(&r, BR_RULE_NO_WINDOW), 1);
    done(d, c);
}

/* Values no part of their kind has, with their units right but a prefix
 * slipped: a 62 mC gate charge (meant 62 nC) and a 12 mF junction
 * capacitance (meant 12 pF).  Each is flagged once, though the parts sit
 * on every stage; the same values at the edge of the range are not. */
static void test_implausible(void)
{
    br_rule_list r;
    br_design *d = leg(4, 1000.0);
    d->switches[0].qg = br_qty_fixed(62e-3);
    d->diodes[0].cj0 = br_qty_fixed(12e-3);
    br_chain *c = check(d, &r);
    CU_ASSERT_EQUAL(count(&r, BR_RULE_IMPLAUSIBLE), 2);
    int seen_qg = 0, seen_cj0 = 0;
    for (int i = 0; i < r.n; i++) {
        const br_rule_hit *h = &r.hit[i];
        if (h->kind != BR_RULE_IMPLAUSIBLE)
            continue;
        CU_ASSERT_FALSE(h->fatal);
        if (strcmp(h->what, "qg") == 0) {
            seen_qg = 1;
            BR_ASSERT_REL(h->figure, 62e-3, 1e-12);
            BR_ASSERT_REL(h->limit, 10e-6, 1e-12);
            CU_ASSERT_STRING_EQUAL(h->unit, "C");
        } else if (strcmp(h->what, "cj0") == 0) {
            seen_cj0 = 1;
            CU_ASSERT_EQUAL(h->stage, 1); /* the first link that uses it */
        }
    }
    CU_ASSERT_TRUE(seen_qg && seen_cj0);
    done(d, c);
    d = leg(4, 1000.0);
    d->switches[0].qg = br_qty_fixed(10e-6);
    d->diodes[0].cj0 = br_qty_fixed(10e-9);
    c = check(d, &r);
    CU_ASSERT_EQUAL(count(&r, BR_RULE_IMPLAUSIBLE), 0);
    done(d, c);
}

/* Pre-charge steps whose held switches cannot turn on.  The test leg has
 * a 12 V supply and drivers with UVLO rising 7.5 V; with a 200 us ramp the
 * supply reaches 7.5 V at 200 us * 7.5 / 12 = 125 us at the earliest (by
 * hand), so a step of the first 50 us holds switches that stay off. */
static void set_steps(br_design *d, int n, const unsigned long long *mask, const double *dur)
{
    d->nprecharge = n;
    for (int i = 0; i < n; i++) {
        d->precharge[i].mask = mask[i];
        d->precharge[i].duration = dur[i];
    }
}

static void test_precharge_idle(void)
{
    br_rule_list r;
    br_design *d = leg(3, 800.0);
    d->tramp = br_qty_fixed(200e-6);
    set_steps(d, 1, (unsigned long long[]){0x3}, (double[]){50e-6});
    br_chain *c = check(d, &r);
    CU_ASSERT_EQUAL(count(&r, BR_RULE_PRECHARGE_IDLE), 1);
    const br_rule_hit *h = first(&r, BR_RULE_PRECHARGE_IDLE);
    CU_ASSERT_PTR_NOT_NULL_FATAL(h);
    CU_ASSERT_EQUAL(h->index, 0);
    CU_ASSERT_EQUAL(h->stage, 0);
    CU_ASSERT_EQUAL(h->mask, 0x3ULL); /* neither B1 nor B2: the step does nothing */
    CU_ASSERT_TRUE(h->by_ramp);
    BR_ASSERT_REL(h->figure, 125e-6, 1e-12);
    BR_ASSERT_REL(h->limit, 50e-6, 1e-12);
    CU_ASSERT_FALSE(h->fatal);
    done(d, c);
    /* the highest supply of its tolerance is the earliest: 12.6 V gives
     * 200 us * 7.5 / 12.6 = 119.05 us */
    d = leg(3, 800.0);
    d->tramp = br_qty_fixed(200e-6);
    d->vsupply = (br_qty){12.0, 11.4, 12.6, BR_DIST_UNIFORM, 3.0, 0};
    set_steps(d, 1, (unsigned long long[]){0x3}, (double[]){50e-6});
    c = check(d, &r);
    h = first(&r, BR_RULE_PRECHARGE_IDLE);
    CU_ASSERT_PTR_NOT_NULL_FATAL(h);
    BR_ASSERT_REL(h->figure, 200e-6 * 7.5 / 12.6, 1e-12);
    done(d, c);
    /* long enough: the drivers can start inside the step */
    d = leg(3, 800.0);
    d->tramp = br_qty_fixed(200e-6);
    set_steps(d, 1, (unsigned long long[]){0x3}, (double[]){200e-6});
    c = check(d, &r);
    CU_ASSERT_EQUAL(count(&r, BR_RULE_PRECHARGE_IDLE), 0);
    done(d, c);
    /* no ramp: the supply is there at once */
    d = leg(3, 800.0);
    set_steps(d, 1, (unsigned long long[]){0x3}, (double[]){50e-6});
    c = check(d, &r);
    CU_ASSERT_EQUAL(count(&r, BR_RULE_PRECHARGE_IDLE), 0);
    done(d, c);
    /* B2 alone: its rail charges only while B1 is on, which no step before
     * PWM turns on, so its driver cannot start however long the step */
    d = leg(3, 800.0);
    set_steps(d, 1, (unsigned long long[]){0x2}, (double[]){1e-3});
    c = check(d, &r);
    h = first(&r, BR_RULE_PRECHARGE_IDLE);
    CU_ASSERT_PTR_NOT_NULL_FATAL(h);
    CU_ASSERT_EQUAL(h->stage, 1);
    CU_ASSERT_EQUAL(h->mask, 0x2ULL);
    CU_ASSERT_FALSE(h->by_ramp);
    CU_ASSERT_TRUE(isinf(h->figure));
    done(d, c);
    /* B1 first, then B2 alone: rail 2 (B2's driver) charged in step 1 */
    d = leg(3, 800.0);
    d->tramp = br_qty_fixed(200e-6);
    set_steps(d, 2, (unsigned long long[]){0x1, 0x2}, (double[]){200e-6, 100e-6});
    c = check(d, &r);
    CU_ASSERT_EQUAL(count(&r, BR_RULE_PRECHARGE_IDLE), 0);
    done(d, c);
}

/* Class II ceramics: at most cap-derating (50 %, common practice) of
 * their rating.  The test capacitor (25 V) on a 12 V supply sits at 48 %;
 * on 15 V at 60 %, a finding per rail; a class I part, or a clamp at 12 V,
 * keeps it clear.  A DC-bias table marks a part as class II unless the
 * file says otherwise. */
static void test_cap_derating(void)
{
    br_design *d = leg(3, 400.0);
    br_rule_list r;
    d->caps[0].dielectric = BR_DIEL_CLASS2;
    br_chain *c = check(d, &r);
    CU_ASSERT_EQUAL(count(&r, BR_RULE_CAP_DERATING), 0);
    br_chain_free(c);
    d->vsupply = br_qty_fixed(15.0);
    d->drivers[0].uvlo_rise = br_qty_fixed(7.5);
    c = check(d, &r);
    CU_ASSERT_EQUAL(count(&r, BR_RULE_CAP_DERATING), 3);
    const br_rule_hit *h = first(&r, BR_RULE_CAP_DERATING);
    CU_ASSERT_TRUE_FATAL(h != NULL);
    BR_ASSERT_REL(h->figure, 15.0, 1e-12);
    BR_ASSERT_REL(h->limit, 12.5, 1e-12);
    br_chain_free(c);
    d->caps[0].dielectric = BR_DIEL_UNSTATED;
    d->caps[0].nbias = 2;
    d->caps[0].bias_v[0] = 0.0;
    d->caps[0].bias_f[0] = 1.0;
    d->caps[0].bias_v[1] = 25.0;
    d->caps[0].bias_f[1] = 0.5;
    c = check(d, &r);
    CU_ASSERT_EQUAL(count(&r, BR_RULE_CAP_DERATING), 3);
    br_chain_free(c);
    d->caps[0].dielectric = BR_DIEL_CLASS1;
    c = check(d, &r);
    CU_ASSERT_EQUAL(count(&r, BR_RULE_CAP_DERATING), 0);
    br_chain_free(c);
    br_design_free(d);
}

static void test_names(void)
{
    CU_ASSERT_STRING_EQUAL(br_rule_name(BR_RULE_SUPPLY_SHORT), "supply-short");
    for (int k = 0; k < BR_RULE_KINDS; k++)
        CU_ASSERT_STRING_NOT_EQUAL(br_rule_name(k), "unknown");
    CU_ASSERT_STRING_EQUAL(br_rule_name(BR_RULE_KINDS), "unknown");
}

int main(void)
{
    static const br_test_case cases[] = {
        {"a sound design has no findings", test_clean_design},
        {"diode rated below its blocking voltage", test_diode_rating},
        {"diode above the derating limit with overshoot", test_diode_derating},
        {"diode without a rating", test_diode_unrated},
        {"UVLO falling not below rising", test_uvlo_hysteresis},
        {"average link currents", test_link_current},
        {"nominal link drop (Shockley + Ohm)", test_link_drop},
        {"supply cannot reach an upper rail's UVLO", test_supply_short},
        {"supply cannot start even the bottom driver", test_supply_short_low},
        {"an injection that cannot start its rail", test_injection_short},
        {"an injection that starts after the longest start-up", test_injection_late},
        {"gate maximum below the supply, no regulator", test_gate_unprotected},
        {"a regulated design has no findings", test_regulated_clean},
        {"regulator output against UVLO and gate maximum", test_aux_limits},
        {"a return switch that is never on", test_no_window},
        {"implausible values, once per part", test_implausible},
        {"pre-charge steps whose switches cannot turn on", test_precharge_idle},
        {"class II capacitor voltage derating", test_cap_derating},
        {"rule names", test_names},
        {NULL, NULL},
    };
    return br_test_main("analyses_rules", cases);
}

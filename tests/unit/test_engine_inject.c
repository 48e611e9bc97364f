/* test_engine_inject.c - a second isolated supply feeding a rail directly
 * (an injection): the injected rail's steady voltage by hand, the rails
 * above cascading from it, the split chain holding where one supply does
 * not, and the power balance over two supplies. */
#include "analyses/figures.h"
#include "analyses/startup.h"
#include "analyses/steady.h"
#include "testdesign.h"
#include "testkit.h"

#include <math.h>
#include <stdlib.h>

/* An FCML leg of `levels` levels on the test parts (testdesign.c: diode
 * Is 100 nA, n 1.5, Rs 0.5 ohm; driver 2 mA running, UVLO 7.5 / 7 V;
 * switch 10 nC at any drive), 100 kHz, duty 0.5, no load current, rails of
 * 100 uF so that their ripple is small, with an injection of vinj through
 * rinj into rail `rail` (none when rail is 0). */
static br_design *leg(int levels, int rail, double vinj, double rinj)
{
    br_design *d = br_test_fcml(levels, 400.0, 100e3, 0.5, 0.0);
    d->caps[0].c = br_qty_fixed(100e-6);
    if (rail > 0) {
        br_inject_spec *j = &d->inject[d->ninject++];
        j->rail = rail;
        j->v = br_qty_fixed(vinj);
        j->r = br_qty_fixed(rinj);
        j->diode = 0;
        j->start = 0.0;
    }
    return d;
}

typedef struct solved {
    br_design *d;
    br_chain *c;
    br_steady ss;
    br_steady_figs f;
} solved;

static int solve(solved *s, br_design *d)
{
    br_error err;
    s->d = d;
    if (br_chain_build(d, &s->c, &err) != BR_OK)
        return -1;
    br_steady_opts o;
    br_steady_opts_default(&o);
    if (br_steady_solve(s->c, BR_DIRI_NONE, &o, &s->ss, &err) != BR_OK)
        return -1;
    br_steady_figures(s->c, &s->ss, &s->f);
    return br_steady_has_period(&s->ss) ? 0 : -1;
}

static void done(solved *s)
{
    br_chain_free(s->c);
    br_design_free(s->d);
}

/* Hand calculation.  Each rail's loads draw 2 mA running plus the gate
 * charge, 10 nC x 100 kHz = 1 mA: 3 mA.  Rails 3, 4 and 5 of the 4-level
 * leg (6 switches) hang on the injection into rail 3, so over a steady
 * period it delivers I = 3 x 3 mA = 9 mA (charge balance), all period
 * long (its supply does not wait for a switch).  With 100 uF the rail
 * moves by well under a millivolt, so the current is nearly constant and
 * the rail's mean is the supply less the diode's drop at I less I R:
 *
 *   Vt = k T / q at 300.15 K = 1.380649e-23 x 300.15 / 1.602176634e-19
 *      = 25.865 mV
 *   diode (Shockley with series resistance): n Vt ln(I / Is + 1) + I Rs
 *      = 1.5 x 25.865 mV x ln(9 mA / 100 nA + 1) + 9 mA x 0.5 ohm
 *      = 1.5 x 25.865 mV x 11.4076 + 4.5 mV = 442.59 mV + 4.5 mV
 *   rail 3 = 15 V - 447.09 mV - 9 mA x 10 ohm = 14.4629 V. */
static void test_injected_rail_by_hand(void)
{
    solved s;
    CU_ASSERT_EQUAL_FATAL(solve(&s, leg(4, 3, 15.0, 10.0)), 0);
    const double vt = 1.380649e-23 * 300.15 / 1.602176634e-19, I = 9e-3;
    double v3 = 15.0 - 1.5 * vt * log(I / 1e-7 + 1.0) - I * 0.5 - I * 10.0;
    BR_ASSERT_NEAR(v3, 14.4629, 1e-4); /* the number written out above */
    BR_ASSERT_NEAR(s.f.rail[3].vavg, v3, 2e-4);
    /* charge balance: each link carries the loads of the rails it feeds,
     * up to the injection; the injection those of rails 3 to 5 */
    BR_ASSERT_REL(s.f.link[3].iavg, 9e-3, 2e-3);
    BR_ASSERT_REL(s.f.link[4].iavg, 6e-3, 2e-3);
    BR_ASSERT_REL(s.f.link[5].iavg, 3e-3, 2e-3);
    BR_ASSERT_REL(s.f.link[1].iavg, 6e-3, 2e-3); /* rails 1 and 2 only: the chain is split */
    BR_ASSERT_REL(s.f.link[2].iavg, 3e-3, 2e-3);
    /* the rails above cascade from it, a link's drop at a time */
    CU_ASSERT(s.f.rail[4].vavg < s.f.rail[3].vavg - 0.3);
    CU_ASSERT(s.f.rail[4].vavg > s.f.rail[3].vavg - 1.5);
    CU_ASSERT(s.f.rail[5].vavg < s.f.rail[4].vavg - 0.3);
    CU_ASSERT(s.f.rail[3].vavg > s.f.rail[2].vavg + 2.0); /* not fed from rail 2 */
    done(&s);
}

/* Conservation of energy over a steady period: what the supply and the
 * injection give (and the power stage) equals the losses, to 0.1 %; the
 * injection gives its open-circuit voltage times its mean current. */
static void test_power_balance_two_supplies(void)
{
    solved s;
    CU_ASSERT_EQUAL_FATAL(solve(&s, leg(4, 3, 15.0, 10.0)), 0);
    const br_budget *b = &s.f.budget;
    BR_ASSERT_REL(b->inject, 15.0 * s.f.link[3].iavg, 1e-6);
    BR_ASSERT_REL(b->inject, 15.0 * 9e-3, 2e-3);
    CU_ASSERT(fabs(b->balance) < 1e-3 * (b->supply + b->inject));
    /* the main supply gives the lower part alone: rails 0 to 2 */
    BR_ASSERT_REL(s.f.supply_iavg, 9e-3, 5e-3);
    CU_ASSERT(fabs(b->stage) < 1e-3 * b->supply); /* no load current: nothing from the stage */
    done(&s);
}

/* A 7-level leg (12 switches) on the test parts: one 12 V supply cannot
 * reach the top rails through eleven links; with a second 12 V supply
 * injected at rail 6 every rail starts and holds above UVLO falling. */
static void test_split_chain_holds(void)
{
    br_error err;
    br_startup su;
    br_startup_opts so = {0};
    solved split;
    br_design *d1 = leg(7, 0, 0.0, 0.0);
    d1->caps[0].c = br_qty_fixed(10e-6);
    d1->vsupply = br_qty_fixed(12.0);
    br_chain *c1 = NULL;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d1, &c1, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_startup_run(c1, &so, &su, &err), BR_OK);
    CU_ASSERT(!su.complete); /* the top rails never start */
    CU_ASSERT(su.first_stalled > 0);
    br_chain_free(c1);
    br_design_free(d1);

    br_design *d2 = leg(7, 6, 12.0, 1.0);
    d2->caps[0].c = br_qty_fixed(10e-6);
    d2->vsupply = br_qty_fixed(12.0);
    br_chain *c2 = NULL;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d2, &c2, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_startup_run(c2, &so, &su, &err), BR_OK);
    CU_ASSERT(su.complete);
    CU_ASSERT_EQUAL(su.first_stalled, -1);
    br_chain_free(c2);
    CU_ASSERT_EQUAL_FATAL(solve(&split, d2), 0);
    CU_ASSERT(split.ss.holds);
    for (int k = 1; k < split.c->n; k++)
        CU_ASSERT(split.f.rail[k].m_uvlo > 0.0);
    done(&split);
}

/* An injection that starts late: its rail stays empty until then, and
 * charges after. */
static void test_injection_starts_late(void)
{
    br_design *d = leg(3, 2, 12.0, 1.0);
    d->caps[0].c = br_qty_fixed(1e-6);
    d->inject[0].start = 200e-6;
    br_chain *c = NULL;
    br_sim *s = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_sim_create(c, BR_DIRI_NONE, BR_INTEG_FAST, &s, &err), BR_OK);
    br_sim_reset_cold(s);
    double vc[BR_MAX_SWITCHES];
    CU_ASSERT_EQUAL(br_sim_run_until(s, 199e-6, &err), BR_OK);
    br_sim_vc(s, vc);
    CU_ASSERT(vc[2] < 0.01 && vc[3] < 0.01); /* not fed from rail 1, its supply still off */
    CU_ASSERT_EQUAL(br_sim_run_until(s, 400e-6, &err), BR_OK);
    br_sim_vc(s, vc);
    CU_ASSERT(vc[2] > 10.0);
    br_sim_free(s);
    br_chain_free(c);
    br_design_free(d);
}

/* An injection's rating is judged as the supply's: its mean current in
 * steady state, 9 mA by the charge balance of test_injected_rail_by_hand
 * (rails 3 to 5 at 3 mA each), against it, in the supply row, bound at
 * the rail it feeds.  Rated 5 mA it fails by about 4 mA; rated 20 mA it
 * passes by about 11 mA; without a rating (and a supply without one) the
 * row does not apply. */
static void test_injection_rating(void)
{
    static const double rating[3] = {5e-3, 20e-3, 0.0};
    for (int i = 0; i < 3; i++) {
        solved s;
        br_design *d = leg(4, 3, 15.0, 10.0);
        d->inject[0].irating = br_qty_fixed(rating[i]);
        CU_ASSERT_EQUAL_FATAL(solve(&s, d), 0);
        br_verdict v;
        br_verdict_make(s.c, NULL, &s.f, 1, &v);
        const br_verdict_row *r = &v.row[BR_CRIT_SUPPLY];
        CU_ASSERT_EQUAL(r->applies, rating[i] > 0);
        if (rating[i] > 0) {
            CU_ASSERT_EQUAL(r->stage, 3);
            BR_ASSERT_REL(r->figure, 9e-3, 2e-3);
            BR_ASSERT_NEAR(r->margin, rating[i] - r->figure, 1e-12);
            CU_ASSERT_EQUAL(r->pass, rating[i] > 9e-3);
        }
        done(&s);
    }
}

/* A 3-level leg (4 switches) on 1 uF rails with a 12 V injection through
 * 1 ohm into its top rail, 3, behind a current limit of `mode` at 10 mA
 * (fold-back: 2 mA at 0 V). */
static br_design *limited(int mode)
{
    br_design *d = leg(3, 3, 12.0, 1.0);
    d->caps[0].c = br_qty_fixed(1e-6);
    br_inject_spec *j = &d->inject[0];
    j->limit_mode = mode;
    j->ilimit = br_qty_fixed(10e-3);
    j->ifold = br_qty_fixed(mode == BR_SUPPLY_FOLDBACK ? 2e-3 : 0.0);
    j->hiccup_delay = br_qty_fixed(100e-6);
    j->hiccup_off = br_qty_fixed(1e-3);
    j->hiccup_retries = 0;
    return d;
}

/* Rail 3's capacitor voltage at t1 and t2 of a cold start. */
static int top_rail(br_design *d, double t1, double t2, double v[2])
{
    br_chain *c = NULL;
    br_sim *s = NULL;
    br_error err;
    double vc[BR_MAX_SWITCHES];
    int rc = br_chain_build(d, &c, &err) == BR_OK &&
                     br_sim_create(c, BR_DIRI_NONE, BR_INTEG_FAST, &s, &err) == BR_OK
                 ? 0
                 : -1;
    if (rc == 0) {
        br_sim_reset_cold(s);
        rc |= br_sim_run_until(s, t1, &err) != BR_OK;
        br_sim_vc(s, vc);
        v[0] = vc[3];
        rc |= br_sim_run_until(s, t2, &err) != BR_OK;
        br_sim_vc(s, vc);
        v[1] = vc[3];
    }
    br_sim_free(s);
    br_chain_free(c);
    br_design_free(d);
    return rc;
}

/* Hand calculation.  Without a limit rail 3 charges through 1 ohm into
 * 1 uF (a time constant of 1 us) to about 11.4 V within tens of
 * microseconds.  At a constant 10 mA it charges at the limit: its driver,
 * held in UVLO below 7.5 V, takes its standby 0.2 mA, so the capacitor
 * takes 9.8 mA and
 *   v(t) = I t / C = 9.8 mA x t / 1 uF:  2.94 V at 300 us, 4.90 V at 500 us
 * (t = C dV / I: 500 us for the 4.9 V).  Nothing rides above rail 3 (the
 * top), and the test capacitor has no DC-bias table. */
static void test_constant_limit_charges_at_limit(void)
{
    double v[2];
    CU_ASSERT_EQUAL_FATAL(top_rail(limited(BR_SUPPLY_UNLIMITED), 300e-6, 500e-6, v), 0);
    CU_ASSERT(v[0] > 11.0); /* unlimited: charged long since */
    CU_ASSERT_EQUAL_FATAL(top_rail(limited(BR_SUPPLY_CONSTANT), 300e-6, 500e-6, v), 0);
    BR_ASSERT_REL(v[0], 9.8e-3 * 300e-6 / 1e-6, 5e-3);
    BR_ASSERT_REL(v[1], 9.8e-3 * 500e-6 / 1e-6, 5e-3);
}

/* Hand calculation.  Fold-back from 10 mA at the set 12 V to 2 mA at
 * 0 V, read at the rail: I(v) = 2 mA + (8 mA / 12 V) v.  Less the
 * standby 0.2 mA, C dv/dt = a + b v with a = 1.8 mA, b = 0.6667 mA/V:
 *   v(t) = (a / b) (exp(b t / C) - 1)
 *   at 1 ms: 2.7 V x (exp(0.6667) - 1) = 2.7 V x 0.94773 = 2.5589 V. */
static void test_foldback_limit(void)
{
    double v[2];
    CU_ASSERT_EQUAL_FATAL(top_rail(limited(BR_SUPPLY_FOLDBACK), 500e-6, 1e-3, v), 0);
    double a = 1.8e-3, b = 8e-3 / 12.0;
    BR_ASSERT_NEAR(a / b * (exp(b * 1e-3 / 1e-6) - 1.0), 2.5589, 1e-4); /* as written out */
    BR_ASSERT_REL(v[1], a / b * (exp(b * 1e-3 / 1e-6) - 1.0), 5e-3);
    BR_ASSERT_REL(v[0], a / b * (exp(b * 500e-6 / 1e-6) - 1.0), 5e-3);
}

/* Hiccup: 100 us in the limit and the module turns off; with no retry
 * it stays off.  Rail 3 takes 9.8 mA x 100 us / 1 uF = 0.98 V and then
 * only loses its driver's standby current: it never starts. */
static void test_hiccup_limit_stays_off(void)
{
    double v[2];
    CU_ASSERT_EQUAL_FATAL(top_rail(limited(BR_SUPPLY_HICCUP), 99e-6, 2e-3, v), 0);
    BR_ASSERT_REL(v[0], 9.8e-3 * 99e-6 / 1e-6, 1e-2);
    CU_ASSERT(v[1] < 0.99); /* off: nothing more */
}

/* The start-up of a limited injection: its rail starts at the limit
 * current (the link's peak forward current is the limit, not the inrush
 * of 12 V through 1 ohm) and later than without the limit; its time to
 * reach UVLO rising, 7.5 V, is at least C dV / I = 1 uF x 7.5 V / 9.8 mA
 * = 765 us. */
static void test_limited_startup(void)
{
    br_error err;
    br_startup su;
    br_startup_opts so = {0};
    br_design *d = limited(BR_SUPPLY_CONSTANT);
    br_chain *c = NULL;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_startup_run(c, &so, &su, &err), BR_OK);
    CU_ASSERT(su.complete);
    CU_ASSERT(su.st[3].ipeak <= 10e-3 * (1.0 + 1e-6));
    CU_ASSERT(su.st[3].ipeak > 9.9e-3);
    CU_ASSERT(su.st[3].first_enable > 765e-6);
    CU_ASSERT(su.st[3].first_enable < 800e-6);
    br_chain_free(c);
    br_design_free(d);
}

/* Envelope following behind a limited injection: a 4-level leg on
 * 100 uF rails whose injection into rail 3 (feeding rails 3 to 5), limited
 * to 50 mA, starts at 10 ms: the lower part starts and settles first, and
 * the envelope steps over its quiet periods until the injection starts
 * (off, the injection cannot be near its limit), then over none while it
 * charges its rails at the limit; its start-up time is that of
 * integrating every period (to 1 %). */
static void test_limited_envelope(void)
{
    double t[2];
    long stepped[2];
    for (int m = 0; m < 2; m++) {
        br_design *d = leg(4, 3, 15.0, 10.0);
        br_inject_spec *j = &d->inject[0];
        j->limit_mode = BR_SUPPLY_CONSTANT;
        j->ilimit = br_qty_fixed(50e-3);
        j->start = 10e-3;
        br_chain *c = NULL;
        br_error err;
        br_startup su;
        br_startup_opts so = {0};
        CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
        c->startup_method = m ? BR_SU_PERIODS : BR_SU_ENVELOPE;
        c->startup_max = 0.5;
        CU_ASSERT_EQUAL_FATAL(br_startup_run(c, &so, &su, &err), BR_OK);
        CU_ASSERT_TRUE(su.complete);
        t[m] = su.t_total;
        stepped[m] = su.periods_stepped;
        br_chain_free(c);
        br_design_free(d);
    }
    CU_ASSERT_TRUE(stepped[0] > 0);
    CU_ASSERT_EQUAL(stepped[1], 0);
    BR_ASSERT_REL(t[0], t[1], 1e-2);
}

/* A design built by hand (or a template on a shorter leg) with an
 * injection beyond its floating rails is refused, not silently ignored. */
static void test_injection_beyond_leg(void)
{
    br_design *d = leg(3, 4, 12.0, 1.0); /* 4 switches: rails 1 to 3 */
    br_chain *c = NULL;
    br_error err;
    br_error_clear(&err);
    CU_ASSERT_EQUAL(br_chain_build(d, &c, &err), BR_EINPUT);
    CU_ASSERT_PTR_NULL(c);
    CU_ASSERT_STRING_EQUAL(err.field, "injection: rail");
    br_design_free(d);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"injected rail by hand", test_injected_rail_by_hand},
        {"power balance with two supplies", test_power_balance_two_supplies},
        {"split chain holds", test_split_chain_holds},
        {"injection starts late", test_injection_starts_late},
        {"an injection beyond the leg is refused", test_injection_beyond_leg},
        {"constant limit: the rail charges at the limit", test_constant_limit_charges_at_limit},
        {"fold-back limit", test_foldback_limit},
        {"hiccup limit without retries stays off", test_hiccup_limit_stays_off},
        {"start-up behind a limited injection", test_limited_startup},
        {"an injection's rating judged as the supply's", test_injection_rating},
        {"envelope following behind a limited injection", test_limited_envelope},
        {NULL, NULL}};
    return br_test_main("engine_inject", cases);
}

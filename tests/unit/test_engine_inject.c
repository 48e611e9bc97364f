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
        {NULL, NULL}};
    return br_test_main("engine_inject", cases);
}

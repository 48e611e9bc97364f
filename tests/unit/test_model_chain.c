/* test_model_chain.c - the FCML generator, the chain model and the timing
 * of one period. */
#include "model/chain.h"
#include "model/fcml.h"
#include "model/timing.h"
#include "testdesign.h"
#include "testkit.h"

#include <stdlib.h>
#include <string.h>

static br_chain *build(int levels, double vin, double fsw, double duty, double td)
{
    br_design *d = br_test_fcml(levels, vin, fsw, duty, td);
    br_chain *c = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    /* the chain points into the design; tests keep both alive together */
    return c;
}

static void release(br_chain *c)
{
    br_design_free((br_design *)c->design);
    br_chain_free(c);
}

/* Common practice: an N-level FCML leg has 2(N-1) switches, N-2 flying
 * capacitors and 2N-3 bootstrap links. */
static void test_counts(void)
{
    for (int N = 2; N <= 9; N++) {
        br_chain *c = build(N, 800.0, 100e3, 0.5, 50e-9);
        CU_ASSERT_EQUAL(c->n, 2 * (N - 1));
        CU_ASSERT_EQUAL(c->design->levels - 2, N - 2);
        CU_ASSERT_EQUAL(c->n - 1, 2 * N - 3); /* links: stages 1..n-1 */
        release(c);
    }
}

/* Common practice: each switch blocks Vin/(N-1); 4 levels at 1000 V ->
 * 333.3 V, at 1500 V -> 500 V. */
static void test_blocking(void)
{
    br_chain *c = build(4, 1000.0, 100e3, 0.5, 0);
    for (int k = 0; k < c->n; k++)
        BR_ASSERT_NEAR(c->st[k].vblock, 333.333333, 1e-4);
    release(c);
    c = build(4, 1500.0, 100e3, 0.5, 0);
    for (int k = 0; k < c->n; k++)
        BR_ASSERT_NEAR(c->st[k].vblock, 500.0, 1e-9);
    release(c);
}

static void test_names(void)
{
    static const char *want[] = {"B1", "B2", "B3", "A3", "A2", "A1"};
    br_chain *c = build(4, 400.0, 200e3, 0.5, 50e-9);
    for (int k = 0; k < 6; k++)
        CU_ASSERT_STRING_EQUAL(c->st[k].name, want[k]);
    release(c);
}

/* Pair j's carrier is delayed by (j-1)T/P; Aj on for D*T; Bj its
 * complement less a dead time at each edge (common practice). */
static void test_windows(void)
{
    double T = 1.0 / 200e3, D = 0.3, td = 50e-9;
    br_chain *c = build(4, 400.0, 200e3, D, td);
    for (int k = 0; k < c->n; k++) {
        const br_stage *st = &c->st[k];
        double phase = (st->pair - 1) * T / 3.0;
        double len = st->win[0][1] - st->win[0][0];
        if (len < 0)
            len += T;
        if (st->is_top) {
            BR_ASSERT_NEAR(st->win[0][0], phase, 1e-15);
            BR_ASSERT_NEAR(len, D * T, 1e-15);
        } else {
            BR_ASSERT_NEAR(st->win[0][0], br_wrap(phase + D * T + td, T), 1e-15);
            BR_ASSERT_NEAR(len, (1 - D) * T - 2 * td, 1e-15);
        }
    }
    release(c);
}

/* A3's window at D = 0.5 with P = 3 is [2T/3, 7T/6): it wraps past the
 * period end and the switch is on at t = 0; B3 starts at 7T/6 + td, i.e.
 * wrapped to T/6 + td. */
static void test_wraparound(void)
{
    double T = 1.0 / 200e3, td = 50e-9;
    br_chain *c = build(4, 400.0, 200e3, 0.5, td);
    const br_stage *a3 = &c->st[3], *b3 = &c->st[2];
    CU_ASSERT_STRING_EQUAL(a3->name, "A3");
    CU_ASSERT_TRUE(a3->win[0][1] < a3->win[0][0]);
    BR_ASSERT_NEAR(a3->win[0][1], T / 6, 1e-15);
    BR_ASSERT_NEAR(b3->win[0][0], T / 6 + td, 1e-15);
    br_timing tm;
    br_timing_build(c, BR_DIRI_NONE, &tm);
    br_mask on, rev;
    br_timing_state_at(&tm, 0.0, &on, &rev);
    CU_ASSERT_TRUE(on & (1ULL << 3));
    CU_ASSERT_FALSE(on & (1ULL << 2));
    CU_ASSERT_EQUAL(rev, 0);
    release(c);
}

/* Through a whole period exactly one switch of each pair is on outside the
 * dead times, and none during them; the dead times carry reverse
 * conduction of the bottom switch when stepping down. */
static void test_timing_pairs(void)
{
    double T = 1.0 / 100e3, td = 100e-9;
    br_chain *c = build(5, 800.0, 100e3, 0.37, td);
    br_timing down;
    br_timing_build(c, BR_DIRI_DOWN, &down);
    int P = 4, n_dead = 0;
    for (int i = 0; i < 4000; i++) {
        double t = (i + 0.5) * T / 4000;
        br_mask on, rev;
        br_timing_state_at(&down, t, &on, &rev);
        for (int j = 1; j <= P; j++) {
            int b = j - 1, a = 2 * P - j;
            int nb = !!(on & (1ULL << b)), na = !!(on & (1ULL << a));
            CU_ASSERT_TRUE(nb + na <= 1);
            if (nb + na == 0) {
                n_dead++;
                CU_ASSERT_TRUE(rev & (1ULL << b));
                CU_ASSERT_FALSE(rev & (1ULL << a));
            } else {
                CU_ASSERT_FALSE(rev & (1ULL << b));
            }
        }
    }
    /* 2 dead times per pair per period: 2*td/T of the samples, per pair */
    BR_ASSERT_NEAR((double)n_dead / (4000.0 * P), 2 * td / T, 1.0 / 4000);
    release(c);
}

static void test_events_sorted(void)
{
    br_chain *c = build(7, 1100.0, 100e3, 0.5, 20e-9);
    br_timing tm;
    br_timing_build(c, BR_DIRI_UP, &tm);
    CU_ASSERT_EQUAL(tm.nev, 12 * 2 + 6 * 2 * 2);
    for (int i = 1; i < tm.nev; i++)
        CU_ASSERT_TRUE(tm.ev[i].t >= tm.ev[i - 1].t);
    release(c);
}

static void test_dead_time_too_long(void)
{
    br_design *d = br_test_fcml(3, 400.0, 1e6, 0.9, 60e-9);
    br_chain *c = NULL;
    br_error err;
    CU_ASSERT_EQUAL(br_chain_build(d, &c, &err), BR_EINPUT);
    CU_ASSERT_PTR_NULL(c);
    CU_ASSERT_PTR_NOT_NULL(strstr(err.field, "dead-time"));
    br_design_free(d);
}

/* Thermal voltage kT/q at 27 C: 25.865 mV (CODATA constants). */
static void test_thermal_voltage(void)
{
    BR_ASSERT_REL(br_thermal_voltage(300.15), 25.865e-3, 2e-5);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"switch, capacitor and link counts", test_counts},
        {"blocking voltage Vin/(N-1)", test_blocking},
        {"string order B1..BP AP..A1", test_names},
        {"phase-shifted windows with dead time", test_windows},
        {"window wrapping past the period end", test_wraparound},
        {"pairs never overlap; dead times reverse-conduct", test_timing_pairs},
        {"events sorted", test_events_sorted},
        {"dead time longer than the off time", test_dead_time_too_long},
        {"thermal voltage", test_thermal_voltage},
        {NULL, NULL}};
    return br_test_main("model/chain", cases);
}

/* test_examples_budget.c - the energy budget of a steady period on the
 * shipped examples: the power balance, and the losses of the 3-level demo
 * against a hand calculation (written out in docs/physics.md, "Losses and
 * heat"). */
#include "analyses/figures.h"
#include "analyses/steady.h"
#include "bootrung/bootrung.h"
#include "testkit.h"

#include <math.h>
#include <stdio.h>

static br_design *load(const char *file)
{
    char path[1024];
    snprintf(path, sizeof path, "%s/%s", BR_SOURCE_DIR, file);
    br_design *d = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(path, &d, &err), BR_OK);
    return d;
}

static void solve(const br_chain *c, int dir, br_steady *ss, br_steady_figs *f)
{
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, dir, NULL, ss, &err), BR_OK);
    CU_ASSERT_TRUE_FATAL(ss->converged);
    br_steady_figures(c, ss, f);
}

/* Energy is conserved: over a steady period what the supply delivers and
 * what the power stage gives the chain through the return switches equal
 * the sum of every loss plus the change of the rails' stored energy, to
 * 0.1 % of the supply's power (common practice for a power balance; the
 * quadratures ride on the integrator's steps, seen: 4e-6 at worst).  On
 * both examples, in every direction they carry. */
static void test_power_balance(void)
{
    static const char *files[] = {"examples/demo-3level.xml", "examples/leg-7level.xml"};
    for (int i = 0; i < 2; i++) {
        br_design *d = load(files[i]);
        br_chain *c;
        br_error err;
        CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
        int dirs[2], nd = br_design_directions(c, dirs);
        for (int j = 0; j < nd; j++) {
            br_steady ss;
            br_steady_figs f;
            solve(c, dirs[j], &ss, &f);
            const br_budget *b = &f.budget;
            CU_ASSERT_TRUE(b->supply > 0.0);
            BR_ASSERT_NEAR(b->supply + b->stage, b->losses + b->stored, 1e-3 * b->supply);
            /* a periodic state stores nothing over its period */
            BR_ASSERT_NEAR(b->stored, 0.0, 1e-4 * b->supply);
        }
        br_chain_free(c);
        br_design_free(d);
    }
}

/* The demo's losses by hand, stepping down (docs/physics.md, "Losses and
 * heat"): each rail's driver draws 1.6 mA and its isolator 1.2 mA at the
 * rail's voltage (no regulator); each turn-on takes the gate charge 28 nC
 * scaled from 10 V to the rail's voltage V, at 100 kHz: 2.8e-4 W/V^2 x V^2;
 * each link leaks 2 uA x 2^((Tj - 25 C)/15 K) at its reverse voltage,
 * 400 V/2 x 1.02 = 204 V, while its return switch is off, half the
 * period (0.408 mW at 40 C; its junction sits a few kelvin above the
 * ambient behind 150 K/W); its 2.2 ohm resistor takes 2.2 ohm x Irms^2. */
/* The same balance over a whole line cycle (tests/data/line-3level.xml,
 * a short one): every energy of the budget is summed over the line
 * period, the drivers' and the isolators' too (they were left at one
 * switching period's worth, so the losses came to a fraction of what the
 * supply delivered). */
static void test_line_balance(void)
{
    br_design *d = load("tests/data/line-3level.xml");
    br_chain *c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_steady ss;
    br_steady_figs f;
    solve(c, BR_DIRI_LINE, &ss, &f);
    const br_budget *b = &f.budget;
    CU_ASSERT_TRUE(b->supply > 0.0);
    BR_ASSERT_NEAR(b->supply + b->stage, b->losses + b->stored, 1e-3 * b->supply);
    /* every driver runs all the time, drawing iq-run at its driver
     * supply: at least iq-run times the supply's lowest value each (a
     * hand bound; 1 % off for the isolator's share of the split) */
    double drivers = 0.0;
    for (int k = 0; k < c->n; k++)
        drivers += b->rail[k].run;
    double least = 0.0;
    for (int k = 0; k < c->n; k++)
        least += 0.99 * c->st[k].drv.iq_on * f.rail[k].vdrv_min;
    CU_ASSERT_TRUE(drivers >= least);
    br_chain_free(c);
    br_design_free(d);
}

static void test_demo_by_hand(void)
{
    br_design *d = load("examples/demo-3level.xml");
    br_chain *c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_steady ss;
    br_steady_figs f;
    solve(c, BR_DIRI_DOWN, &ss, &f);
    const br_budget *b = &f.budget;
    double hand_total = 0.0;
    for (int k = 0; k < c->n; k++) {
        double v = f.rail[k].vavg;
        BR_ASSERT_REL(b->rail[k].run, 1.6e-3 * v, 1e-3);
        BR_ASSERT_REL(b->rail[k].iso, 1.2e-3 * v, 1e-3);
        BR_ASSERT_REL(b->rail[k].gate, 2.8e-4 * v * v, 0.01); /* V at the turn-on, not the mean */
        BR_ASSERT_NEAR(b->rail[k].regulator, 0.0, 1e-9);
        hand_total += 2.8e-3 * v + 2.8e-4 * v * v;
        if (k == 0)
            continue;
        /* at the junction's own temperature: the diode sits behind 150 K/W */
        double ir = 2e-6 * pow(2.0, (f.link[k].tj - 298.15) / 15.0);
        CU_ASSERT_TRUE(f.link[k].tj > 313.15 + 0.5);
        BR_ASSERT_REL(b->link[k].leakage, ir * 204.0 * 0.5, 0.02);
        BR_ASSERT_REL(b->link[k].resistor, 2.2 * f.link[k].irms * f.link[k].irms, 0.02);
    }
    /* the drivers, isolators and gates are most of it: 276 mW by hand of
     * the 310 mW lost in all (the links' conduction takes most of the rest) */
    BR_ASSERT_REL(hand_total, 0.2758, 0.01);
    CU_ASSERT_TRUE(b->losses > hand_total && b->losses < 1.2 * hand_total);
    br_chain_free(c);
    br_design_free(d);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"power balance of a steady period", test_power_balance},
        {"power balance over a line cycle", test_line_balance},
        {"the 3-level demo's losses by hand", test_demo_by_hand},
        {NULL, NULL},
    };
    return br_test_main("examples_budget", cases);
}

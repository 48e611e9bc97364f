/* test_examples_links.c - a link's current split into conduction and the
 * displacement current of its junction capacitance: the edge spikes are
 * displacement (reported apart, with their own peak), not forward
 * current. */
#include "analyses/figures.h"
#include "analyses/steady.h"
#include "bootrung/bootrung.h"
#include "testkit.h"

#include <math.h>
#include <stdio.h>

/* The single bootstrap of tests/data/ref-c1.xml: 400 V edges of 10 ns,
 * a diode with cj0 40 pF, vj 0.7 V, m 0.5.  Hand calculation: the edge
 * sweeps the diode's reverse voltage at dv/dt = 400 V / 10 ns = 4e10 V/s
 * (linear edges), so its displacement current Cj(v) dv/dt lies between
 * Cj(400 V) dv/dt = 40 pF / sqrt(1 + 400/0.7) x 4e10 = 66.9 mA and
 * Cj(0) dv/dt = 1.6 A (depletion capacitance, Sze, "Physics of
 * Semiconductor Devices", the abrupt junction).  The conduction peak is
 * the rail's refill once a period, an order of magnitude below (12 mA
 * here): the spike is not conduction, and the forward figures must not
 * carry it. */
static void test_displacement_apart(void)
{
    char path[1024];
    snprintf(path, sizeof path, "%s/tests/data/ref-c1.xml", BR_SOURCE_DIR);
    br_design *d = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(path, &d, &err), BR_OK);
    br_chain *c;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    br_steady ss;
    br_steady_figs f;
    int dirs[2];
    CU_ASSERT_EQUAL_FATAL(br_design_directions(c, dirs), 1);
    CU_ASSERT_EQUAL_FATAL(br_steady_solve(c, dirs[0], NULL, &ss, &err), BR_OK);
    CU_ASSERT_TRUE_FATAL(ss.converged);
    br_steady_figures(c, &ss, &f);
    const br_link_fig *l = &f.link[1];
    double dvdt = 400.0 / 10e-9;
    double lo = 40e-12 / sqrt(1.0 + 400.0 / 0.7) * dvdt, hi = 40e-12 * dvdt;
    CU_ASSERT_TRUE(l->idisp >= lo && l->idisp <= hi);
    CU_ASSERT_TRUE(l->ipeak < 0.1 * l->idisp); /* conduction: far below */
    CU_ASSERT_TRUE(l->ipeak > 0.0);
    br_chain_free(c);
    br_design_free(d);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"displacement current apart from conduction", test_displacement_apart},
        {NULL, NULL},
    };
    return br_test_main("examples_links", cases);
}

/* test_model_line.c - the line cycle's switching periods: the duty each
 * takes from the modulation, the pulses each carrier makes, the direction
 * of each period's current, and the events of a period against the fixed
 * duty leg's.  Each check names its source beside it. */
#include "model/chain.h"
#include "model/timing.h"
#include "testdesign.h"
#include "testkit.h"

#include <stdlib.h>
#include <string.h>

#define PI 3.14159265358979323846

/* An FCML leg of `levels` levels at 100 kHz (T = 10 us) with 100 ns dead
 * times on a line cycle of K = 100 kHz / fline periods. */
static br_design *ac_leg(int levels, double fline, double ipk, double phase, double depth)
{
    br_design *d = br_test_fcml(levels, 400.0, 100e3, 0.5, 100e-9);
    CU_ASSERT_PTR_NOT_NULL_FATAL(d);
    d->direction = BR_DIR_BOTH;
    d->ac.on = 1;
    d->ac.freq = br_qty_fixed(fline);
    d->ac.ipk = br_qty_fixed(ipk);
    d->ac.phase = br_qty_fixed(phase);
    d->ac.depth = br_qty_fixed(depth);
    return d;
}

static br_chain *build(const br_design *d)
{
    br_chain *c = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    return c;
}

/* ---- the modulation -------------------------------------------------------- */

/* Sine-carrier PWM of a half-bridge leg, regularly sampled: the reference
 * M sin(theta) is held over each carrier period, and the top switch's duty
 * there is (1 + M sin theta) / 2 (D. G. Holmes and T. A. Lipo, Pulse Width
 * Modulation for Power Converters, IEEE Press / Wiley 2003, carrier-based
 * PWM of a half-bridge: the leg's mean output over a carrier period,
 * relative to the lower rail, is the duty times the bus).  Each switching
 * period takes the reference at its centre, theta_m = 2 pi (m + 1/2) / K. */
static void test_duty_relation(void)
{
    br_design *d = ac_leg(3, 2500.0, 10.0, 0.0, 0.8); /* K = 40 */
    br_chain *c = build(d);
    CU_ASSERT_EQUAL(c->line.K, 40);
    for (long m = 0; m < 40; m++) {
        double th = 2.0 * PI * (m + 0.5) / 40.0;
        BR_ASSERT_NEAR(br_line_theta(&c->line, m), th, 1e-14);
        BR_ASSERT_NEAR(br_line_duty(&c->line, m), 0.5 * (1.0 + 0.8 * sin(th)), 1e-14);
    }
    /* the line cycle repeats: period K is period 0, period -1 is K - 1 */
    BR_ASSERT_NEAR(br_line_duty(&c->line, 40), br_line_duty(&c->line, 0), 0.0);
    BR_ASSERT_NEAR(br_line_duty(&c->line, -1), br_line_duty(&c->line, 39), 0.0);
    br_chain_free(c);
    br_design_free(d);
}

/* A duty table is read linearly between its points and closes the circle
 * from its last point to its first a line period later (a hand
 * calculation): points (0 deg, 0.5), (90 deg, 0.9), (270 deg, 0.1); at
 * 45 deg halfway from 0.5 to 0.9, 0.7; at 180 deg halfway from 0.9 to
 * 0.1, 0.5; at 315 deg halfway from 0.1 to 0.5, 0.3. */
static void test_duty_table(void)
{
    br_design *d = ac_leg(3, 50.0, 10.0, 0.0, 0.0);
    d->ac.ntab = 3;
    double at[] = {0.0, 90.0, 270.0}, duty[] = {0.5, 0.9, 0.1};
    for (int i = 0; i < 3; i++) {
        d->ac.tab_at[i] = at[i] * PI / 180.0;
        d->ac.tab_duty[i] = duty[i];
    }
    br_chain *c = build(d);
    BR_ASSERT_NEAR(br_line_duty_at(&c->line, 45.0 * PI / 180.0), 0.7, 1e-12);
    BR_ASSERT_NEAR(br_line_duty_at(&c->line, PI), 0.5, 1e-12);
    BR_ASSERT_NEAR(br_line_duty_at(&c->line, 315.0 * PI / 180.0), 0.3, 1e-12);
    BR_ASSERT_NEAR(br_line_duty_at(&c->line, 0.0), 0.5, 1e-12);
    br_chain_free(c);
    br_design_free(d);
}

/* The line period is a whole number of switching periods, the nearest to
 * fsw / fline (a hand calculation): 100 kHz / 61 Hz = 1639.3, so 1639
 * periods and a simulated line frequency of 100 kHz / 1639 = 61.013 Hz. */
static void test_whole_periods(void)
{
    br_design *d = ac_leg(3, 61.0, 10.0, 0.0, 0.5);
    br_chain *c = build(d);
    CU_ASSERT_EQUAL(c->line.K, 1639);
    BR_ASSERT_REL(c->line.freq, 100e3 / 1639.0, 1e-15);
    BR_ASSERT_NEAR(c->line.freq_given, 61.0, 0.0);
    br_chain_free(c);
    br_design_free(d);
}

/* The load current i = ipk sin(theta - phase), positive out of the
 * switch node (step-down): its sign changes exactly where theta crosses
 * phase and phase + 180 deg (a hand calculation with phase 30 deg and
 * K = 36: period centres at 5, 15, ... 355 deg, so the current is
 * negative up to period 2 (25 deg), positive from period 3 (35 deg) to
 * period 20 (205 deg), negative from period 21 (215 deg) on). */
static void test_current_direction(void)
{
    br_design *d = ac_leg(3, 100e3 / 36.0, 20.0, 30.0 * PI / 180.0, 0.5);
    br_chain *c = build(d);
    CU_ASSERT_EQUAL_FATAL(c->line.K, 36);
    int flips = 0;
    for (long m = 0; m < 36; m++) {
        double want = 20.0 * sin((10.0 * m + 5.0 - 30.0) * PI / 180.0);
        BR_ASSERT_NEAR(br_line_current(&c->line, m), want, 1e-12);
        int dir = br_line_dir(&c->line, m);
        CU_ASSERT_EQUAL(dir, m >= 3 && m <= 20 ? BR_DIRI_DOWN : BR_DIRI_UP);
        flips += dir != br_line_dir(&c->line, m + 1);
    }
    CU_ASSERT_EQUAL(flips, 2);
    br_chain_free(c);
    br_design_free(d);
}

/* ---- the events of a period ----------------------------------------------- */

/* The event of b that e is, within the rounding of a time computed two
 * ways (1e-18 s), or -1.  Events at one instant may come in either order. */
static int find_event(const br_timing *b, const br_event *e)
{
    for (int i = 0; i < b->nev; i++)
        if (b->ev[i].sw == e->sw && b->ev[i].kind == e->kind && fabs(b->ev[i].t - e->t) <= 1e-18)
            return i;
    return -1;
}

/* With a constant duty the line cycle's periods are the fixed-duty leg's
 * period, event for event (the same leg at one duty), in the direction of
 * each period's current. */
static void test_constant_duty_is_dc(void)
{
    br_design *d = ac_leg(4, 2500.0, 10.0, 0.0, 0.0); /* depth 0: duty 0.5 throughout */
    br_design *dc = ac_leg(4, 2500.0, 10.0, 0.0, 0.0);
    dc->ac.on = 0;
    br_chain *c = build(d), *cd = build(dc);
    for (long m = 0; m < c->line.K; m++) {
        br_timing a, b;
        int dir = br_line_dir(&c->line, m);
        br_timing_line(c, m, dir, 0, &a);
        br_timing_build(cd, dir, &b);
        CU_ASSERT_EQUAL_FATAL(a.nev, b.nev);
        CU_ASSERT_EQUAL(a.on0, b.on0);
        CU_ASSERT_EQUAL(a.rev0, b.rev0);
        for (int i = 0; i < a.nev; i++)
            CU_ASSERT(find_event(&b, &a.ev[i]) >= 0);
    }
    br_chain_free(c);
    br_chain_free(cd);
    br_design_free(d);
    br_design_free(dc);
}

/* Every pulse over a line cycle, walked period after period from the
 * masks at the start and the events: its switch, start and end (absolute,
 * s). */
typedef struct pulse {
    int sw;
    double t0, t1;
} pulse;

typedef struct walk {
    pulse *p;
    int n, cap;
    double start[BR_MAX_SWITCHES]; /* the pulse in progress began here (NAN: off) */
    int overlaps;                  /* both switches of a pair on at once */
    int breaks;                    /* a period's masks at its start unlike the last's end */
} walk;

static void edge(walk *w, br_mask before, br_mask after, double t)
{
    for (int s = 0; s < BR_MAX_SWITCHES; s++) {
        int a = (int)(before >> s & 1), b = (int)(after >> s & 1);
        if (!a && b)
            w->start[s] = t;
        if (a && !b && !isnan(w->start[s]) && w->n < w->cap)
            w->p[w->n++] = (pulse){s, w->start[s], t};
        if (a && !b)
            w->start[s] = NAN;
    }
}

/* Walk `cycles` line cycles of c from period 0. */
static void walk_cycles(const br_chain *c, int cycles, walk *w)
{
    int P = c->n / 2;
    br_mask on = 0, rev = 0;
    for (int s = 0; s < BR_MAX_SWITCHES; s++)
        w->start[s] = NAN;
    for (long m = 0; m < cycles * c->line.K; m++) {
        br_timing tm;
        br_timing_line(c, m, br_line_dir(&c->line, m), 0, &tm);
        double t0 = (double)m * c->T;
        /* the masks at the period's start, its events at t = 0 applied */
        br_mask at0 = on, r0 = rev;
        for (int i = 0; i < tm.nev && tm.ev[i].t == 0.0; i++)
            br_event_apply(&tm.ev[i], &at0, &r0);
        w->breaks += m > 0 && at0 != tm.on0;
        edge(w, on, tm.on0, t0);
        on = tm.on0;
        rev = tm.rev0;
        for (int i = 0; i < tm.nev; i++) {
            br_mask was = on;
            br_event_apply(&tm.ev[i], &on, &rev);
            edge(w, was, on, t0 + tm.ev[i].t);
            for (int j = 1; j <= P; j++)
                w->overlaps += (int)(on >> (2 * P - j) & 1) && (int)(on >> (j - 1) & 1);
        }
    }
}

/* The carrier period of pair j that began at or just before absolute
 * time t: its index counts from line period 0. */
static long carrier_period(const br_chain *c, int j, double t)
{
    double a = (j - 1) * c->T / (c->n / 2);
    return (long)floor((t - a) / c->T + 1e-6);
}

/* Each carrier takes the duty of the switching period in which its own
 * period begins and keeps it for the whole pulse: every top pulse lasts
 * D T and every bottom pulse (1 - D) T less two dead times (common
 * practice for a complementary pair; the same relation as the
 * fixed-duty leg), D the duty of that carrier period.  Across a line
 * cycle of a 7-level leg whose duty moves fast (K = 40), no pair ever has
 * both switches on and every period starts as the last one ended: a
 * carrier's pulse that runs across the common period boundary is neither
 * cut nor repeated there. */
static void pulses_whole(double deadtime)
{
    br_design *d = ac_leg(7, 2500.0, 10.0, 0.3, 0.9);
    d->deadtime = br_qty_fixed(deadtime);
    br_chain *c = build(d);
    walk w = {calloc(20000, sizeof(pulse)), 0, 20000, {0}, 0, 0};
    CU_ASSERT_PTR_NOT_NULL_FATAL(w.p);
    walk_cycles(c, 2, &w);
    CU_ASSERT_EQUAL(w.overlaps, 0);
    CU_ASSERT_EQUAL(w.breaks, 0);
    int P = c->n / 2, checked = 0;
    double T = c->T, td = c->deadtime;
    for (int i = 0; i < w.n; i++) {
        const pulse *p = &w.p[i];
        int top = p->sw >= P, j = top ? 2 * P - p->sw : p->sw + 1;
        /* a top pulse begins its carrier period, a bottom pulse a dead
         * time after the top one ends, within the same */
        long k = carrier_period(c, j, p->t0);
        double D = br_line_duty(&c->line, k);
        double want = top ? D * T : (1.0 - D) * T - 2.0 * td;
        if (p->t0 == 0.0)
            continue; /* begun before the walk: only its end is seen */
        BR_ASSERT_NEAR(p->t1 - p->t0, want, 1e-15);
        checked++;
    }
    CU_ASSERT(checked >= 2 * 40 * 2 * P - 4 * P); /* one a switch a period, bar the ends */
    free(w.p);
    br_chain_free(c);
    br_design_free(d);
}

static void test_pulses_whole(void)
{
    pulses_whole(100e-9);
    /* without dead times a bottom pulse ends on its carrier period's
     * boundary, in one common period or the next by a rounding */
    pulses_whole(0.0);
}

/* In the dead times the direction of the period's current picks the
 * switch that conducts in reverse: the bottom one of each pair stepping
 * down (current out of the switch node), the top one stepping up, none
 * at zero current (common practice for a complementary pair with its
 * freewheeling path). */
static void test_reverse_follows_current(void)
{
    br_design *d = ac_leg(3, 100e3 / 36.0, 20.0, 30.0 * PI / 180.0, 0.5);
    br_chain *c = build(d);
    int P = c->n / 2;
    for (long m = 0; m < c->line.K; m++) {
        br_timing tm;
        int dir = br_line_dir(&c->line, m);
        br_timing_line(c, m, dir, 0, &tm);
        br_mask rev_seen = tm.rev0;
        for (int i = 0; i < tm.nev; i++)
            if (tm.ev[i].kind == BR_EV_REV_ON)
                rev_seen |= 1ULL << tm.ev[i].sw;
        br_mask bottoms = (1ULL << P) - 1, tops = ((1ULL << (2 * P)) - 1) & ~bottoms;
        CU_ASSERT_EQUAL(rev_seen, dir == BR_DIRI_DOWN ? bottoms : tops);
    }
    br_timing none;
    br_timing_line(c, 0, BR_DIRI_NONE, 0, &none);
    CU_ASSERT_EQUAL(none.rev0, 0);
    for (int i = 0; i < none.nev; i++)
        CU_ASSERT(none.ev[i].kind == BR_EV_ON || none.ev[i].kind == BR_EV_OFF);
    br_chain_free(c);
    br_design_free(d);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"each period's duty from the sine modulation", test_duty_relation},
        {"a duty table, linear and periodic", test_duty_table},
        {"a whole number of switching periods", test_whole_periods},
        {"the current's sign and its zero crossings", test_current_direction},
        {"a constant duty gives the fixed-duty leg's events", test_constant_duty_is_dc},
        {"every pulse whole, no overlap, no break between periods", test_pulses_whole},
        {"reverse conduction follows the period's current", test_reverse_follows_current},
        {NULL, NULL},
    };
    return br_test_main("model_line", cases);
}

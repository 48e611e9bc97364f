/* test_analyses_progress.c - the progress hook of the long analyses: it
 * sees the work advance, and a hook asking to stop makes each analysis
 * return BR_ECANCEL soon after, with nothing returned and (under ASan)
 * nothing leaked. */
#include "analyses/corners.h"
#include "analyses/map.h"
#include "analyses/meter.h"
#include "analyses/startup.h"
#include "analyses/window.h"
#include "analyses/yield.h"
#include "testdesign.h"
#include "testkit.h"

#include <gsl/gsl_errno.h>
#include <stdlib.h>

/* What the hook saw; it asks to stop once it has been called stop_at
 * times (0: never). */
typedef struct seen {
    int calls;
    int stop_at;
    int calls_after_stop;
    double done, total; /* the last call's */
    int backwards;      /* done ever went down */
} seen;

static int hook(void *ctx, double done, double total)
{
    seen *s = ctx;
    s->calls++;
    if (s->stop_at > 0 && s->calls > s->stop_at)
        s->calls_after_stop++;
    if (done < s->done)
        s->backwards = 1;
    s->done = done;
    s->total = total;
    return s->stop_at > 0 && s->calls >= s->stop_at;
}

static br_qty tol(double nom, double rel)
{
    br_qty q = br_qty_fixed(nom);
    q.min = nom * (1.0 - rel);
    q.max = nom * (1.0 + rel);
    return q;
}

/* A 3-level leg with two toleranced parameters. */
static br_design *toleranced(void)
{
    br_design *d = br_test_fcml(3, 400.0, 100e3, 0.5, 50e-9);
    d->vsupply = tol(12.0, 0.05);
    d->caps[0].c = tol(1e-6, 0.2);
    return d;
}

static br_map_opts map_opts(const br_progress *p)
{
    br_map_opts o = {0.2, 0.8, 6, 50e3, 200e3, 6, 2, p, 0, 0, NULL};
    return o;
}

/* Without a stop the map reports every grid point and the design point,
 * in order, ending at the total. */
static void test_map_counts(void)
{
    br_design *d = br_test_fcml(3, 400.0, 100e3, 0.5, 50e-9);
    seen s = {0};
    br_progress p = {hook, &s, NULL};
    br_map_opts o = map_opts(&p);
    br_map *m = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_map_run(d, &o, &m, &err), BR_OK);
    CU_ASSERT_EQUAL(s.calls, 6 * 6 + 1);
    BR_ASSERT_NEAR(s.done, 37.0, 1e-12);
    BR_ASSERT_NEAR(s.total, 37.0, 1e-12);
    CU_ASSERT_FALSE(s.backwards);
    br_map_free(m);
    br_design_free(d);
}

/* A stop at the fifth point: BR_ECANCEL, no map, and the two workers
 * stop after the point each is judging (a call or two more at most). */
static void test_map_cancel(void)
{
    br_design *d = br_test_fcml(3, 400.0, 100e3, 0.5, 50e-9);
    seen s = {.stop_at = 5};
    br_progress p = {hook, &s, NULL};
    br_map_opts o = map_opts(&p);
    br_map *m = (br_map *)&s; /* must be reset to NULL */
    br_error err;
    br_error_clear(&err);
    CU_ASSERT_EQUAL(br_map_run(d, &o, &m, &err), BR_ECANCEL);
    CU_ASSERT_PTR_NULL(m);
    CU_ASSERT_EQUAL(err.code, BR_ECANCEL);
    CU_ASSERT_TRUE(s.calls_after_stop == 0); /* the meter calls no more once stopped */
    br_design_free(d);
}

/* Stopping on the very first call (the design point) works too. */
static void test_map_cancel_first(void)
{
    br_design *d = br_test_fcml(3, 400.0, 100e3, 0.5, 50e-9);
    seen s = {.stop_at = 1};
    br_progress p = {hook, &s, NULL};
    br_map_opts o = map_opts(&p);
    br_map *m = NULL;
    br_error err;
    CU_ASSERT_EQUAL(br_map_run(d, &o, &m, &err), BR_ECANCEL);
    CU_ASSERT_PTR_NULL(m);
    CU_ASSERT_EQUAL(s.calls, 1);
    br_design_free(d);
}

static void test_yield_counts(void)
{
    br_design *d = toleranced();
    seen s = {0};
    br_progress p = {hook, &s, NULL};
    br_yield_opts o;
    br_yield_opts_default(&o);
    o.samples = 20;
    o.threads = 2;
    o.progress = &p;
    br_yield *y = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_yield_run(d, &o, &y, &err), BR_OK);
    /* the nominal point, two per parameter, then the samples */
    CU_ASSERT_EQUAL(s.calls, 1 + 2 * 2 + 20);
    BR_ASSERT_NEAR(s.done, 25.0, 1e-12);
    BR_ASSERT_NEAR(s.total, 25.0, 1e-12);
    CU_ASSERT_FALSE(s.backwards);
    br_yield_free(y);
    br_design_free(d);
}

static void test_yield_cancel(void)
{
    for (int stop = 1; stop <= 12; stop += 5) { /* in the preparation, and in the samples */
        br_design *d = toleranced();
        seen s = {.stop_at = stop};
        br_progress p = {hook, &s, NULL};
        br_yield_opts o;
        br_yield_opts_default(&o);
        o.samples = 200;
        o.threads = 2;
        o.progress = &p;
        br_yield *y = NULL;
        br_error err;
        CU_ASSERT_EQUAL(br_yield_run(d, &o, &y, &err), BR_ECANCEL);
        CU_ASSERT_PTR_NULL(y);
        CU_ASSERT_EQUAL(s.calls, stop);
        br_design_free(d);
    }
}

static void test_corners_cancel(void)
{
    br_design *d = toleranced();
    seen s = {.stop_at = 6};
    br_progress p = {hook, &s, NULL};
    br_corners_opts o;
    br_corners_opts_default(&o);
    o.threads = 2;
    o.progress = &p;
    br_corners *k = NULL;
    br_error err;
    CU_ASSERT_EQUAL(br_corners_run(d, &o, &k, &err), BR_ECANCEL);
    CU_ASSERT_PTR_NULL(k);
    CU_ASSERT_EQUAL(s.calls, 6);
    br_design_free(d);
}

static void test_window_cancel(void)
{
    br_design *d = br_test_fcml(3, 400.0, 100e3, 0.5, 50e-9);
    seen s = {.stop_at = 4};
    br_progress p = {hook, &s, NULL};
    br_window_opts o;
    br_window_opts_default(&o);
    o.progress = &p;
    br_window *w = malloc(sizeof *w);
    br_error err;
    CU_ASSERT_EQUAL(br_window_run(d, &o, w, &err), BR_ECANCEL);
    CU_ASSERT_EQUAL(s.calls, 4);
    free(w);
    br_design_free(d);
}

/* The cold start calls every BR_STARTUP_PROGRESS_EVERY periods with the
 * simulated time, and stops when asked (at 1 MHz the start takes a few
 * hundred periods), by either method: every period integrated, the call
 * exactly at the period; by envelope following, at the end of the step
 * that passed it. */
static void test_startup_cancel(void)
{
    br_design *d = br_test_fcml(3, 400.0, 1e6, 0.5, 50e-9);
    br_chain c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build_nominal(d, &c, &err), BR_OK);
    for (int m = BR_SU_ENVELOPE; m <= BR_SU_PERIODS; m++) {
        c.startup_method = m;
        seen s = {0};
        br_progress p = {hook, &s, NULL};
        br_startup_opts o = {0, 0, NULL, &p};
        br_startup su;
        CU_ASSERT_EQUAL_FATAL(br_startup_run(&c, &o, &su, &err), BR_OK);
        CU_ASSERT_TRUE(s.calls >= 1);
        CU_ASSERT_TRUE(s.calls * BR_STARTUP_PROGRESS_EVERY * c.T <= su.t_simulated);
        BR_ASSERT_REL(s.total, c.startup_max, 1e-12);
        s = (seen){.stop_at = 1};
        CU_ASSERT_EQUAL(br_startup_run(&c, &o, &su, &err), BR_ECANCEL);
        CU_ASSERT_EQUAL(s.calls, 1);
        if (m == BR_SU_PERIODS)
            BR_ASSERT_REL(s.done, BR_STARTUP_PROGRESS_EVERY * c.T, 1e-9);
        else
            CU_ASSERT_TRUE(s.done >= BR_STARTUP_PROGRESS_EVERY * c.T * (1 - 1e-9) &&
                           s.done < 2 * BR_STARTUP_PROGRESS_EVERY * c.T);
    }
    br_design_free(d);
}

/* A stop poll that asks to stop at its n-th call. */
typedef struct countdown {
    int calls, stop_at;
} countdown;

static int stop_at_call(void *ctx)
{
    countdown *c = ctx;
    return ++c->calls >= c->stop_at;
}

/* A stop takes effect wherever the envelope path is: in a period
 * integrated, in a step's trial (undone, the stop held), in the model's
 * arithmetic.  Stopped at each of the polls of a run of 0.2 s (waiting
 * for a settling it is never granted, the tail stepped over by thousands
 * of periods a step), every run ends with BR_ECANCEL within a few polls
 * of the stop. */
static void test_startup_envelope_stop(void)
{
    br_design *d = br_test_fcml(4, 400.0, 200e3, 0.5, 50e-9);
    br_chain c;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_chain_build_nominal(d, &c, &err), BR_OK);
    countdown all = {0, 1 << 30};
    br_progress p = {NULL, &all, stop_at_call};
    br_startup_opts o = {0.2, 1 << 20, NULL, &p}; /* to 0.2 s: no settling before */
    br_startup su;
    CU_ASSERT_EQUAL_FATAL(br_startup_run(&c, &o, &su, &err), BR_OK);
    CU_ASSERT_TRUE(su.periods_stepped > 30000);
    int polls = all.calls;
    CU_ASSERT_TRUE(polls >= 3);
    for (int n = 1; n <= polls; n++) {
        countdown cd = {0, n};
        p.ctx = &cd;
        CU_ASSERT_EQUAL(br_startup_run(&c, &o, &su, &err), BR_ECANCEL);
        CU_ASSERT_TRUE(cd.calls <= n + 2);
    }
    br_design_free(d);
}

/* The meter keeps the total at least the work done and stays stopped. */
static void test_meter(void)
{
    seen s = {.stop_at = 3};
    br_progress p = {hook, &s, NULL};
    br_meter m;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_meter_init(&m, &p, 1.0, &err), BR_OK);
    CU_ASSERT_EQUAL(br_meter_add(&m, 1.0), 0);
    CU_ASSERT_EQUAL(br_meter_add(&m, 1.0), 0);
    BR_ASSERT_NEAR(s.total, 2.0, 1e-12);
    br_meter_grow(&m, 5.0);
    CU_ASSERT_EQUAL(br_meter_add(&m, 1.0), 1);
    BR_ASSERT_NEAR(s.total, 7.0, 1e-12);
    CU_ASSERT_EQUAL(br_meter_add(&m, 1.0), 1);
    CU_ASSERT_EQUAL(s.calls, 3);
    CU_ASSERT_EQUAL(br_meter_status(&m, BR_OK, &err), BR_ECANCEL);
    br_meter_destroy(&m);
    CU_ASSERT_EQUAL(br_meter_add(NULL, 1.0), 0);
    CU_ASSERT_EQUAL(br_meter_status(NULL, BR_EIO, &err), BR_EIO);
    CU_ASSERT_STRING_EQUAL(br_status_name(BR_ECANCEL), "cancelled");
}

int main(void)
{
    gsl_set_error_handler_off();
    static const br_test_case cases[] = {
        {"meter: counts, grows, stops", test_meter},
        {"map: every point counted", test_map_counts},
        {"map: a stop ends the workers", test_map_cancel},
        {"map: a stop on the first call", test_map_cancel_first},
        {"yield: every point counted", test_yield_counts},
        {"yield: a stop in preparation or sampling", test_yield_cancel},
        {"corners: a stop", test_corners_cancel},
        {"window: a stop", test_window_cancel},
        {"startup: periodic calls and a stop", test_startup_cancel},
        {"startup: a stop anywhere on the envelope path", test_startup_envelope_stop},
        {NULL, NULL},
    };
    return br_test_main("progress", cases);
}

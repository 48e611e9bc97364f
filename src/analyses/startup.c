/* startup.c - simulating the cold start period by period. */
#include "analyses/startup.h"

#include "analyses/figures.h"
#include "core/error.h"
#include "engine/envelope.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

/* The supply's running totals at an instant. */
typedef struct supply_snap {
    double t, q, e, tlim; /* s, C, J, s */
} supply_snap;

typedef struct watch {
    br_startup *r;
    double last_event; /* s */
    const br_sim_observer *user;
    br_sim *sim;                     /* to read the supply's totals at an event */
    supply_snap at[BR_MAX_SWITCHES]; /* at each stage's latest start */
    supply_snap end;                 /* before the last period */
    double peak;                     /* the supply's peak current by then, A */
} watch;

static supply_snap snap(br_sim *s)
{
    const br_stats *st = br_sim_stats(s);
    supply_snap o = {br_sim_time(s), st->qsupply, st->esupply, st->t_limit};
    return o;
}

static void on_uvlo(void *ctx, const br_uvlo_event *e)
{
    watch *w = ctx;
    br_startup_stage *s = &w->r->st[e->stage];
    w->last_event = e->t;
    if (e->enabled) {
        if (s->first_enable < 0)
            s->first_enable = e->t;
        s->final_enable = e->t;
        if (w->sim)
            w->at[e->stage] = snap(w->sim);
    } else {
        if (s->ndropouts < BR_MAX_DROPOUT_TIMES)
            s->dropout_t[s->ndropouts] = e->t;
        s->ndropouts++;
        s->final_enable = -1;
    }
    if (w->user && w->user->uvlo)
        w->user->uvlo(w->user->ctx, e);
}

static void on_sample(void *ctx, const br_sim *s, double t, const double *vr, const double *il,
                      int n)
{
    watch *w = ctx;
    if (w->user && w->user->sample)
        w->user->sample(w->user->ctx, s, t, vr, il, n);
}

static int all_running(const br_sim *s, int n)
{
    for (int k = 0; k < n; k++)
        if (!br_sim_enabled(s, k))
            return 0;
    return 1;
}

static void init_result(br_startup *r, int n)
{
    memset(r, 0, sizeof *r);
    r->n = n;
    r->first_stalled = -1;
    for (int k = 0; k < n; k++)
        r->st[k].first_enable = r->st[k].final_enable = -1;
}

/* The supply's figures: up to the last start when the chain started,
 * over the simulation otherwise (w->end, taken before the last period). */
static void supply_profile(const br_chain *c, const watch *w, br_startup *r)
{
    br_supply_profile *p = &r->supply;
    int last = 0;
    for (int k = 0; k < r->n; k++)
        if (r->st[k].final_enable >= r->st[last].final_enable)
            last = k;
    const supply_snap *at = r->complete ? &w->at[last] : &w->end;
    p->span = at->t;
    p->ipeak = w->peak;
    p->charge = at->q;
    p->energy = at->e;
    p->iavg = at->t > 0 ? at->q / at->t : 0.0;
    p->t_limit = at->tlim;
    p->latched = p->trips > 0 && c->hiccup_retries >= 0 && p->trips > c->hiccup_retries;
}

/* Figures of the last period: where each rail sits and what its link
 * carries (what a stalled rung is losing). */
static int last_period(br_sim *s, const br_chain *c, br_startup *r, br_error *err)
{
    double peaks[BR_MAX_SWITCHES], i2[BR_MAX_SWITCHES];
    const br_stats *st = br_sim_stats(s);
    for (int k = 0; k < c->n; k++) {
        peaks[k] = st->link[k].ipeak;
        i2[k] = st->link[k].i2;
    }
    br_sim_stats_select(s, BR_STATS_ALL); /* the rail's mean, the link's charge */
    br_sim_stats_start(s);
    int rc = br_sim_run_until(s, br_sim_time(s) + c->T, err);
    st = br_sim_stats(s);
    double dt = st->t1 - st->t0;
    for (int k = 0; k < c->n; k++) {
        r->st[k].ipeak = fmax(peaks[k], st->link[k].ipeak);
        r->st[k].i2t = i2[k] + st->link[k].i2;
        r->st[k].vend = st->rail[k].vint / dt;
        r->st[k].iend = st->link[k].q / dt;
        r->st[k].running = br_sim_enabled(s, k);
    }
    return rc;
}

/* Keep what stopped the simulation for the verdict's note. */
static void record_failure(br_startup *r, br_error *err)
{
    r->failed = 1;
    snprintf(r->why, sizeof r->why, "the start-up simulation stopped at t = %.6g s: %.200s",
             r->t_simulated, err && err->msg[0] ? err->msg : "numerical failure");
    br_error_clear(err);
}

/* How a start-up runs: to t_max, or until every driver has run for
 * `settle` periods without a UVLO event; the progress hook sees part
 * `part` of `parts` of the work. */
typedef struct run {
    const br_chain *c;
    br_sim *s;
    watch *w;
    double t_max;
    int settle;
    const br_progress *hook;
    int part, parts;
} run;

static int settled(const run *u, double t)
{
    return all_running(u->s, u->c->n) && t - u->w->last_event >= u->settle * u->c->T;
}

/* Every period integrated. */
static int run_periods(const run *u, br_startup *r, br_error *err)
{
    const br_chain *c = u->c;
    double t = 0.0;
    int rc = BR_OK;
    for (long period = 1; rc == BR_OK && t < u->t_max; period++) {
        t = fmin(t + c->T, u->t_max);
        rc = br_sim_run_until(u->s, t, err);
        r->periods_integrated++;
        if (settled(u, t))
            break;
        if (rc == BR_OK && u->hook && period % BR_STARTUP_PROGRESS_EVERY == 0)
            rc = br_progress_call(u->hook, u->part * u->t_max + t, u->parts * u->t_max, err);
    }
    return rc;
}

/* The first loop boundary at which the run may end: `settle` periods
 * after the last UVLO event once every driver runs, else t_max; never
 * less than a period ahead of t. */
static double goal(const run *u, double t)
{
    const br_chain *c = u->c;
    double g = u->t_max;
    if (all_running(u->s, c->n)) {
        double m = ceil((u->w->last_event + u->settle * c->T) / c->T - 1e-9);
        g = fmin(g, m * c->T);
    }
    return g > t + 0.5 * c->T ? g : fmin(t + c->T, u->t_max);
}

/* Envelope following (engine/envelope.h): the same loop boundaries, some
 * periods stepped over; the samples of an observer come from integrated
 * periods only. */
static int run_envelope(const run *u, const br_startup_opts *o, br_startup *r, br_error *err)
{
    br_envelope *env;
    int replay = o && o->obs && o->obs->sample;
    int rc = br_envelope_create(u->s, replay, &env, err);
    double t = 0.0, per = BR_STARTUP_PROGRESS_EVERY * u->c->T;
    long shown = 0;
    while (rc == BR_OK && t < u->t_max) {
        rc = br_envelope_advance(env, goal(u, t), err);
        t = br_sim_time(u->s);
        if (settled(u, t))
            break;
        if (rc == BR_OK && u->hook && (long)(t / per) > shown) {
            shown = (long)(t / per);
            rc = br_progress_call(u->hook, u->part * u->t_max + t, u->parts * u->t_max, err);
        }
    }
    if (env) {
        r->periods_integrated = br_envelope_count(env)->integrated;
        r->periods_stepped = br_envelope_count(env)->stepped;
        memcpy(r->integrated_why, br_envelope_count(env)->why, sizeof r->integrated_why);
    }
    br_envelope_free(env);
    return rc;
}

/* One cold start in current direction dir; the progress hook sees part
 * `part` of `parts` of the work. */
static int startup_one(const br_chain *c, int dir, const br_startup_opts *o, int part, int parts,
                       br_startup *r, br_error *err)
{
    br_sim *s;
    int rc = br_sim_create(c, dir, BR_INTEG_FAST, &s, err);
    if (rc != BR_OK)
        return rc;
    init_result(r, c->n);
    r->dir = dir;
    r->method = c->startup_method;
    watch w;
    memset(&w, 0, sizeof w);
    w.r = r;
    w.user = o ? o->obs : NULL;
    w.sim = s;
    br_sim_observer obs = {&w, on_uvlo, on_sample};
    br_sim_set_observer(s, &obs);
    br_sim_set_stop(s, o ? o->progress : NULL);
    br_sim_set_locator(s, 1); /* crossings in a fifth of the trial steps (engine/sim.h) */
    run u = {c,
             s,
             &w,
             o && o->t_max > 0 ? o->t_max : c->startup_max,
             o && o->settle_periods > 0 ? o->settle_periods : 50,
             o ? o->progress : NULL,
             part,
             parts};
    r->pwm_start = br_sim_pwm_start(s);
    /* over its course a start-up reads the links' i^2 and peaks and the
     * supply's totals: the other statistics would cost most of each step */
    br_sim_stats_select(s, BR_STATS_STARTUP);
    br_sim_stats_start(s);
    rc = c->startup_method == BR_SU_PERIODS ? run_periods(&u, r, err) : run_envelope(&u, o, r, err);
    w.end = snap(s);
    w.peak = br_sim_stats(s)->isup_peak;
    if (rc == BR_OK) {
        rc = last_period(s, c, r, err);
        r->periods_integrated++;
    }
    r->t_simulated = br_sim_time(s);
    r->supply.trips = br_sim_supply_trips(s, &r->supply.first_trip);
    if (rc == BR_ENUMERIC) {
        record_failure(r, err);
        rc = BR_OK;
    }
    r->complete = !r->failed;
    for (int k = 0; k < c->n; k++) {
        if (!r->st[k].running || r->st[k].final_enable < 0) {
            r->complete = 0;
            if (r->first_stalled < 0)
                r->first_stalled = k;
        }
        r->t_total = fmax(r->t_total, r->st[k].final_enable);
    }
    supply_profile(c, &w, r);
    br_sim_free(s);
    return rc;
}

/* The later of two start-ups: one the simulation could not finish, then
 * one that never completes, then the one that takes longer. */
static int worse(const br_startup *a, const br_startup *b)
{
    if (a->failed != b->failed)
        return a->failed;
    if (a->complete != b->complete)
        return !a->complete;
    return a->t_total > b->t_total;
}

int br_startup_run(const br_chain *c, const br_startup_opts *o, br_startup *r, br_error *err)
{
    /* a design that starts under load starts in each direction it
     * carries; otherwise the start-up runs at no load */
    int dirs[2] = {BR_DIRI_NONE, BR_DIRI_NONE};
    int nd = c->load_from < HUGE_VAL ? br_design_directions(c, dirs) : 1;
    if (nd == 1)
        return startup_one(c, dirs[0], o, 0, 1, r, err);
    /* two runs: neither feeds the caller's observer, the worse one is run
     * again for it */
    br_startup_opts quiet = o ? *o : (br_startup_opts){0};
    quiet.obs = NULL;
    br_startup other;
    int rc = startup_one(c, dirs[0], &quiet, 0, 2, r, err);
    if (rc == BR_OK)
        rc = startup_one(c, dirs[1], &quiet, 1, 2, &other, err);
    if (rc == BR_OK && worse(&other, r))
        *r = other;
    if (rc == BR_OK && o && o->obs) {
        quiet.obs = o->obs;
        quiet.progress = NULL;
        rc = startup_one(c, r->dir, &quiet, 0, 1, r, err);
    }
    return rc;
}

/* supply_window.c - the smallest current limit and the supply voltage
 * window of a design at its worst corners (supply_window.h). */
#include "analyses/supply_window.h"

#include "analyses/corners.h"
#include "analyses/rules.h"
#include "core/error.h"

#include <math.h>
#include <stddef.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

typedef struct search {
    br_supply_window *w;
    br_spread *s;
    br_design *dd;     /* the spread's design: the swept value is written here */
    int ans;           /* br_sw_answer */
    int jparam, jfold; /* columns of the swept quantity and of a fold-back current, -1 */
    double fold;       /* fold-back current over the limit */
    double *values;    /* ncorner x tl.n */
    br_pt *pts;        /* ncorner */
    br_meter *meter;
} search;

static int same_levels(const signed char *a, const signed char *b, int n)
{
    return memcmp(a, b, (size_t)n) == 0;
}

/* The nominal point, then each objective's worst corner as its
 * one-at-a-time sensitivities give it, the distinct ones. */
static void worst_corners(br_supply_window *w, const br_spread *s)
{
    int n = s->tl.n;
    memset(w->level[0], 0, sizeof w->level[0]);
    w->origin[0] = -1;
    w->ncorner = 1;
    for (int crit = 0; crit <= BR_OBJ_HEADROOM && w->ncorner < BR_SW_MAXCORNERS; crit++) {
        signed char lv[BR_TOL_MAX];
        br_corner_sensitivity(s, crit, lv, NULL);
        int seen = 0;
        for (int i = 0; i < w->ncorner && !seen; i++)
            seen = same_levels(w->level[i], lv, n);
        if (seen)
            continue;
        memcpy(w->level[w->ncorner], lv, sizeof lv);
        w->origin[w->ncorner++] = crit;
    }
}

/* Write value v of the swept quantity into the design and every corner. */
static void set_value(search *q, double v)
{
    br_design *d = q->dd;
    if (q->ans == BR_SW_LIMIT) {
        d->limit_mode = q->w->mode;
        d->ilimit = br_qty_fixed(v);
        d->ifold = br_qty_fixed(q->fold * v);
    } else {
        d->vsupply = br_qty_fixed(v);
    }
    int n = q->s->tl.n;
    for (int i = 0; i < q->w->ncorner; i++) {
        double *row = q->values + (size_t)i * (size_t)n;
        br_spread_levels(q->s, q->w->level[i], row);
        if (q->jparam >= 0)
            row[q->jparam] = v;
        if (q->jfold >= 0)
            row[q->jfold] = q->fold * v;
    }
}

/* The first row of a point that fails, else the first undetermined. */
static void first_row(const br_pt *p, int want_undetermined, int *crit, int *stage)
{
    for (int r = 0; r < BR_CRIT_COUNT; r++) {
        const br_pt_row *row = &p->row[r];
        int hit = want_undetermined ? row->undetermined
                                    : row->applies && !row->pass && !row->undetermined;
        if (hit) {
            *crit = r;
            *stage = row->stage;
            return;
        }
    }
}

/* Judge value v at every corner: pass when each passes. */
static int judge(search *q, double v, br_sw_point *p, br_error *err)
{
    br_sw_result *r = &q->w->r[q->ans];
    set_value(q, v);
    br_meter_grow(q->meter, q->w->ncorner);
    int rc = br_spread_eval(q->s, q->w->ncorner, q->values, 1, q->pts, err);
    if (rc != BR_OK)
        return rc;
    q->w->points += q->w->ncorner;
    *p = (br_sw_point){v, BR_OUTCOME_PASS, -1, -1, -1};
    for (int i = 0; i < q->w->ncorner && p->outcome != BR_OUTCOME_FAIL; i++) {
        const br_pt *pt = &q->pts[i];
        if (pt->outcome == BR_OUTCOME_PASS ||
            (p->outcome != BR_OUTCOME_PASS && pt->outcome == BR_OUTCOME_UNDETERMINED))
            continue;
        p->outcome = pt->outcome;
        p->corner = i;
        first_row(pt, pt->outcome == BR_OUTCOME_UNDETERMINED, &p->crit, &p->stage);
    }
    if (r->npts < BR_SW_MAXPTS)
        r->pt[r->npts++] = *p;
    return BR_OK;
}

static double between(double a, double b, int geometric)
{
    return geometric ? sqrt(a * b) : 0.5 * (a + b);
}

static int close_enough(double a, double b, int geometric)
{
    return geometric ? fabs(b / a - 1.0) <= BR_SW_RES_LIMIT : fabs(b - a) <= BR_SW_RES_V;
}

/* Narrow the boundary between value a, which passes, and point fb, which
 * fails, to the resolution: *a the last value found passing, *fb the
 * nearest found failing.  Returns 1 when an undetermined value stopped it
 * (then *fb is that point). */
static int narrow(search *q, double *a, br_sw_point *fb, int geometric, int *rc, br_error *err)
{
    br_sw_result *r = &q->w->r[q->ans];
    while (!close_enough(*a, fb->value, geometric) && r->npts < BR_SW_MAXPTS) {
        br_sw_point p;
        if ((*rc = judge(q, between(*a, fb->value, geometric), &p, err)) != BR_OK)
            return 0;
        if (p.outcome == BR_OUTCOME_PASS)
            *a = p.value;
        else
            *fb = p;
        if (p.outcome == BR_OUTCOME_UNDETERMINED)
            return 1;
    }
    return 0;
}

/* The end of the passing stretch: between the last value that passes and
 * the first that fails. */
static int leave(search *q, double a, br_sw_point fb, int geometric, br_error *err)
{
    br_sw_result *r = &q->w->r[q->ans];
    int rc = BR_OK, undet = narrow(q, &a, &fb, geometric, &rc, err);
    r->kind = undet ? BR_SW_UNDETERMINED : BR_SW_FOUND;
    r->value = a;
    r->fail = fb;
    return rc;
}

/* The design's value fails and a value further on passes: where the
 * passing stretch begins. */
static int enter(search *q, const br_sw_point *fail, double pass, int geometric, br_error *err)
{
    br_sw_result *r = &q->w->r[q->ans];
    double b = pass;
    br_sw_point fa = *fail;
    int rc = BR_OK;
    /* narrow() keeps a passing and a failing end whichever way they lie */
    narrow(q, &b, &fa, geometric, &rc, err);
    r->enter = b;
    r->enter_fail = fa;
    return rc;
}

/* From r->from toward `to`: a coarse scan for the first stretch that
 * passes (the design's value first), then its ends narrowed down. */
static int sweep(search *q, double to, int geometric, br_error *err)
{
    br_sw_result *r = &q->w->r[q->ans];
    br_sw_point prev = {0};
    double last = NAN;
    int passing = 0, rc;
    for (int i = 0; i < BR_SW_SCAN; i++) {
        double f = (double)i / (BR_SW_SCAN - 1);
        double v = geometric ? r->from * pow(to / r->from, f) : r->from + (to - r->from) * f;
        br_sw_point p;
        if ((rc = judge(q, v, &p, err)) != BR_OK)
            return rc;
        if (p.outcome == BR_OUTCOME_UNDETERMINED) {
            r->kind = BR_SW_UNDETERMINED;
            r->value = last;
            r->fail = p;
            return BR_OK;
        }
        if (passing && p.outcome == BR_OUTCOME_FAIL)
            return leave(q, last, p, geometric, err);
        if (!passing && p.outcome == BR_OUTCOME_PASS && i > 0 &&
            (rc = enter(q, &prev, v, geometric, err)) != BR_OK)
            return rc;
        passing |= p.outcome == BR_OUTCOME_PASS;
        last = passing ? v : last;
        prev = p;
    }
    r->kind = passing ? BR_SW_RANGE_END : BR_SW_NONE;
    r->value = passing ? to : NAN;
    r->fail = r->pt[0];
    return BR_OK;
}

/* The supply's peak current and the charge it gives in an unlimited
 * cold start of the nominal design, A and C (0 when it cannot be had). */
static void unlimited_start(const br_design *d, double *peak, double *charge)
{
    br_design *u = br_design_copy(d);
    br_chain *c = NULL;
    br_startup su;
    br_error err;
    *peak = *charge = 0.0;
    if (u) {
        u->limit_mode = BR_SUPPLY_UNLIMITED;
        if (br_chain_build(u, &c, &err) == BR_OK && br_startup_run(c, NULL, &su, &err) == BR_OK &&
            !su.failed) {
            *peak = su.supply.ipeak;
            *charge = su.supply.charge;
        }
    }
    br_chain_free(c);
    br_design_free(u);
}

/* The limit: from well above the unlimited start's peak (where the limit
 * never acts) down to half of what the chain needs at least: what it
 * draws running, or the charge of an unlimited start-up within the
 * start-up limit (charge balance), whichever is more. */
static int limit_answer(search *q, const br_design *d, br_error *err)
{
    br_sw_result *r = &q->w->r[BR_SW_LIMIT];
    if (!(d->csupply.min > 0 && d->rsupply.min > 0)) {
        snprintf(r->why, sizeof r->why,
                 "a current limit needs the supply's bypass capacitance and resistance (bypass "
                 "and resistance > 0), which the design does not give");
        return BR_OK;
    }
    br_chain *c = NULL;
    int rc = br_chain_build(d, &c, err);
    if (rc != BR_OK)
        return rc;
    double draw = br_link_current(c, 0), peak, charge;
    br_chain_free(c);
    unlimited_start(d, &peak, &charge);
    draw = fmax(draw, charge / d->startup_max.nom);
    double top = fmax(1.5 * peak, d->limit_mode ? d->ilimit.nom : 0.0);
    q->ans = BR_SW_LIMIT;
    q->jparam = br_tol_find(&q->s->tl, offsetof(br_design, ilimit));
    q->jfold = br_tol_find(&q->s->tl, offsetof(br_design, ifold));
    q->fold = d->limit_mode == BR_SUPPLY_FOLDBACK ? d->ifold.nom / d->ilimit.nom : 0.0;
    r->applies = 1;
    r->from = r->hi = fmax(top, 2.0 * draw);
    r->lo = 0.5 * draw > 0 ? 0.5 * draw : 1e-3 * r->from;
    rc = sweep(q, r->lo, 1, err);
    q->dd->limit_mode = d->limit_mode; /* the design's own again */
    q->dd->ilimit = d->ilimit;
    q->dd->ifold = d->ifold;
    return rc;
}

/* The supply voltage, from the design's down to half of it or up to
 * twice it. */
static int voltage_answer(search *q, const br_design *d, int ans, br_error *err)
{
    br_sw_result *r = &q->w->r[ans];
    q->ans = ans;
    q->jparam = br_tol_find(&q->s->tl, offsetof(br_design, vsupply));
    q->jfold = -1;
    r->applies = 1;
    r->from = d->vsupply.nom;
    r->lo = 0.5 * r->from;
    r->hi = 2.0 * r->from;
    int rc = sweep(q, ans == BR_SW_VMIN ? r->lo : r->hi, 0, err);
    q->dd->vsupply = d->vsupply;
    return rc;
}

static int answers(search *q, const br_design *d, int voltage_only, br_error *err)
{
    int rc = BR_OK;
    if (voltage_only)
        snprintf(q->w->r[BR_SW_LIMIT].why, sizeof q->w->r[BR_SW_LIMIT].why,
                 "not searched: the supply voltage window only was asked for");
    else
        rc = limit_answer(q, d, err);
    if (rc == BR_OK)
        rc = voltage_answer(q, d, BR_SW_VMIN, err);
    if (rc == BR_OK)
        rc = voltage_answer(q, d, BR_SW_VMAX, err);
    return rc;
}

static int run(br_supply_window *w, const br_design *d, const br_supply_window_opts *o,
               br_meter *meter, br_error *err)
{
    search q = {.w = w, .meter = meter};
    if (!(q.dd = br_design_copy(d)))
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    br_spread_opts so;
    br_spread_opts_default(&so);
    so.threads = o ? o->threads : 0;
    so.startup = 1;
    so.meter = meter;
    int rc = br_spread_create(q.dd, &so, &q.s, err);
    if (rc == BR_OK) {
        w->tl = q.s->tl;
        worst_corners(w, q.s);
        q.values = malloc(sizeof(double) * (size_t)BR_SW_MAXCORNERS * (size_t)(w->tl.n + 1));
        q.pts = malloc(sizeof(br_pt) * BR_SW_MAXCORNERS);
        rc = q.values && q.pts ? answers(&q, d, o && o->voltage_only, err)
                               : br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    }
    free(q.values);
    free(q.pts);
    br_spread_free(q.s);
    br_design_free(q.dd);
    return rc;
}

int br_supply_window_run(const br_design *d, const br_supply_window_opts *o, br_supply_window **out,
                         br_error *err)
{
    *out = NULL;
    br_supply_window *w = calloc(1, sizeof *w);
    if (!w)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    w->mode = d->limit_mode != BR_SUPPLY_UNLIMITED ? d->limit_mode : BR_SUPPLY_CONSTANT;
    for (int i = 0; i < BR_SW_COUNT; i++)
        w->r[i].value = w->r[i].enter = NAN;
    br_meter meter;
    int rc = br_meter_init(&meter, o ? o->progress : NULL, 0.0, err);
    if (rc == BR_OK) {
        rc = run(w, d, o, &meter, err);
        rc = br_meter_status(&meter, rc, err);
        br_meter_destroy(&meter);
    }
    if (rc != BR_OK) {
        free(w);
        return rc;
    }
    *out = w;
    return BR_OK;
}

void br_supply_window_free(br_supply_window *w)
{
    free(w);
}

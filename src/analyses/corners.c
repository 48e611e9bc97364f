/* corners.c - the worst corner of every criterion: exhaustive while the
 * corners are few, guided by one-at-a-time sensitivities beyond. */
#include "analyses/corners.h"

#include "core/error.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

void br_corners_opts_default(br_corners_opts *o)
{
    memset(o, 0, sizeof *o); /* fields added later start at zero */
    o->threads = 0;
    o->max_exhaustive = 10;
    o->max_sensitive = 8;
    o->startup = 1;
    o->startup_max_exhaustive = 4;
    o->startup_max_sensitive = 3;
    o->progress = NULL;
    o->solver_limit = 0;
}

/* A criterion without a margin (the steady state, a status) has no
 * sensitivity worth following. */
static int is_searched(int crit)
{
    return br_crit_has_margin(crit);
}

/* ---- a list of corners --------------------------------------------------- */

/* Rows have a fixed stride of BR_TOL_MAX levels (unused ones 0), so that
 * any two compare with one memcmp. */
typedef struct corner_list {
    int k;              /* parameters */
    int n, cap;         /* corners, room */
    signed char *level; /* n rows of BR_TOL_MAX */
} corner_list;

#define ROW(l, i) ((l)->level + (size_t)(i)*BR_TOL_MAX)

static int list_add(corner_list *l, const signed char *level)
{
    if (l->n == l->cap) {
        int cap = l->cap ? 2 * l->cap : 64;
        signed char *nl = realloc(l->level, (size_t)cap * BR_TOL_MAX);
        if (!nl)
            return BR_ENOMEM;
        l->level = nl;
        l->cap = cap;
    }
    memset(ROW(l, l->n), 0, BR_TOL_MAX);
    memcpy(ROW(l, l->n), level, (size_t)l->k);
    l->n++;
    return BR_OK;
}

static int cmp_rows(const void *a, const void *b)
{
    return memcmp(a, b, BR_TOL_MAX);
}

/* Sort and drop repeated corners (two criteria may ask for the same). */
static void list_unique(corner_list *l)
{
    if (l->n < 2)
        return;
    qsort(l->level, (size_t)l->n, BR_TOL_MAX, cmp_rows);
    int m = 1;
    for (int i = 1; i < l->n; i++)
        if (memcmp(ROW(l, i), ROW(l, m - 1), BR_TOL_MAX) != 0)
            memmove(ROW(l, m++), ROW(l, i), BR_TOL_MAX);
    l->n = m;
}

/* Every corner of the parameters in set[0..m-1]; the others at base. */
static int add_corners(corner_list *l, const signed char *base, const int *set, int m)
{
    signed char row[BR_TOL_MAX];
    for (unsigned long bits = 0; bits < (1ul << m); bits++) {
        memcpy(row, base, (size_t)l->k);
        for (int b = 0; b < m; b++)
            row[set[b]] = (bits >> b) & 1ul ? 1 : -1;
        if (list_add(l, row) != BR_OK)
            return BR_ENOMEM;
    }
    return BR_OK;
}

/* ---- sensitivities ------------------------------------------------------------ */

/* A decided row's margin for comparisons: a failing row whose margin
 * does not say so (a steady state that does not hold) ranks below every
 * other, a passing one without a margin (a status) above. */
static double rank(const br_pt_row *r)
{
    if (!r->pass)
        return r->margin < 0 ? r->margin : -HUGE_VAL;
    return isnan(r->margin) ? HUGE_VAL : r->margin;
}

/* The row of crit at p decides it. */
static int decided(const br_pt *p, int crit)
{
    return p->status == BR_OK && p->row[crit].applies && !p->row[crit].undetermined;
}

static double row_margin(const br_pt *p, int crit, double fallback)
{
    if (crit == BR_OBJ_HEADROOM)
        return p->status == BR_OK && isfinite(p->headroom) ? p->headroom : fallback;
    if (!decided(p, crit))
        return fallback;
    return rank(&p->row[crit]);
}

void br_corner_sensitivity(const br_spread *s, int crit, signed char *level, double *effect)
{
    double mnom = row_margin(&s->nominal, crit, 0.0);
    double mbase = row_margin(&s->base_nominal, crit, mnom);
    for (int j = 0; j < s->tl.n; j++) {
        /* a point borrowed from a base design compares with its nominal */
        double ref = s->borrowed[2 * j] ? mbase : mnom;
        double lo = row_margin(&s->oat[2 * j], crit, ref);
        double hi = row_margin(&s->oat[2 * j + 1], crit, ref);
        double e = ref - fmin(lo, hi);
        level[j] = e > 0 ? (lo < hi ? -1 : 1) : 0;
        if (effect)
            effect[j] = e > 0 ? e : 0.0;
    }
}

#define SENS_FLOOR 0.02

/* The guided corners of one criterion: its most sensitive parameters
 * (the strongest first, at most cap) at every combination of their
 * limits, the others at the limit that lowers the margin. */
static int guided_corners(const br_spread *s, int crit, int cap, corner_list *l, int *nsens)
{
    signed char base[BR_TOL_MAX];
    double effect[BR_TOL_MAX];
    int set[BR_TOL_MAX], m = 0;
    br_corner_sensitivity(s, crit, base, effect);
    /* an infinite effect (a limit at which a rail never starts) is kept
     * whatever the others, and does not set the floor */
    double top = 0.0;
    for (int j = 0; j < s->tl.n; j++)
        if (isfinite(effect[j]))
            top = fmax(top, effect[j]);
    /* a parameter that moves the margin by less than SENS_FLOOR of the
     * strongest one stays at the limit that lowers it */
    for (int j = 0; j < s->tl.n; j++)
        if (effect[j] > SENS_FLOOR * top)
            set[m++] = j;
    /* strongest first: insertion sort, k is small */
    for (int a = 1; a < m; a++)
        for (int b = a; b > 0 && effect[set[b]] > effect[set[b - 1]]; b--) {
            int t = set[b];
            set[b] = set[b - 1];
            set[b - 1] = t;
        }
    *nsens = m < cap ? m : cap;
    return add_corners(l, base, set, *nsens);
}

/* ---- judging a list ---------------------------------------------------------------- */

/* crit is not decided at p: a row marked so, or a point not judged at
 * all where the nominal point says the criterion can apply. */
static int undecided(const br_corners *c, int crit, const br_pt *p)
{
    const br_pt *nom = &c->s->nominal;
    if (p->status != BR_OK)
        return nom->status != BR_OK || nom->row[crit].applies;
    return p->row[crit].applies && p->row[crit].undetermined;
}

/* Keep p as crit's worst point when its margin is lower; count it apart
 * when it does not decide crit. */
static void consider(br_corners *c, int crit, const br_pt *p, const signed char *level)
{
    br_corner_worst *w = &c->w[crit];
    if (br_crit_is_startup(crit) && !p->with_startup)
        return;
    if (undecided(c, crit, p)) {
        if (!w->undetermined++)
            memcpy(w->ulevel, level, (size_t)c->s->tl.n);
        return;
    }
    if (!decided(p, crit))
        return;
    if (w->applies && rank(&p->row[crit]) >= rank(&w->worst))
        return;
    w->applies = 1;
    w->worst = p->row[crit];
    memcpy(w->level, level, (size_t)c->s->tl.n);
}

static void consider_all(br_corners *c, const br_pt *p, const signed char *level)
{
    for (int crit = 0; crit < BR_CRIT_COUNT; crit++)
        consider(c, crit, p, level);
    int undecided = p->status != BR_OK;
    for (int crit = 0; crit < BR_CRIT_COUNT; crit++)
        undecided |= p->status == BR_OK && p->row[crit].undetermined;
    c->unjudged += p->status != BR_OK;
    c->unsettled += p->status == BR_OK && p->unsettled != 0;
    c->undetermined += undecided;
}

/* Judge every corner of l, with or without the cold start. */
static int judge_list(br_corners *c, const corner_list *l, int with_startup, br_error *err)
{
    int k = c->s->tl.n;
    if (l->n == 0)
        return BR_OK;
    double *v = malloc(sizeof(double) * (size_t)l->n * (size_t)(k ? k : 1));
    br_pt *pts = malloc(sizeof(br_pt) * (size_t)l->n);
    int rc = v && pts ? BR_OK : br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    for (int i = 0; rc == BR_OK && i < l->n; i++)
        br_spread_levels(c->s, ROW(l, i), v + (size_t)i * (size_t)k);
    br_meter_grow(c->s->meter, l->n);
    if (rc == BR_OK)
        rc = br_spread_eval(c->s, l->n, v, with_startup, pts, err);
    for (int i = 0; rc == BR_OK && i < l->n; i++) {
        consider_all(c, &pts[i], ROW(l, i));
        c->su_integrated += pts[i].su_integrated;
        c->su_stepped += pts[i].su_stepped;
    }
    if (rc == BR_OK)
        *(with_startup ? &c->startup_points : &c->steady_points) += l->n;
    free(v);
    free(pts);
    return rc;
}

/* The nominal and one-at-a-time points the spread judged already. */
static void consider_known(br_corners *c)
{
    signed char level[BR_TOL_MAX] = {0};
    const br_spread *s = c->s;
    consider_all(c, &s->nominal, level);
    for (int crit = 0; crit < BR_CRIT_COUNT; crit++)
        c->w[crit].nominal = s->nominal.row[crit];
    for (int r = 0; r < 2 * s->tl.n; r++) {
        level[r / 2] = r % 2 ? 1 : -1;
        consider_all(c, &s->oat[r], level);
        level[r / 2] = 0;
    }
}

/* The corners one pass (steady or start-up criteria) tries. */
static int pass_corners(br_corners *c, int startup, int max_exh, int max_sens, corner_list *l,
                        int *method)
{
    int k = c->s->tl.n;
    signed char zero[BR_TOL_MAX] = {0};
    if (k == 0)
        return BR_OK; /* the nominal point is the only point */
    if (k <= max_exh) {
        int all[BR_TOL_MAX];
        for (int j = 0; j < k; j++)
            all[j] = j;
        *method = BR_CORNERS_EXHAUSTIVE;
        return add_corners(l, zero, all, k);
    }
    *method = BR_CORNERS_GUIDED;
    for (int crit = 0; crit < BR_CRIT_COUNT; crit++) {
        if (!is_searched(crit) || br_crit_is_startup(crit) != startup ||
            !c->s->nominal.row[crit].applies)
            continue;
        if (guided_corners(c->s, crit, max_sens, l, &c->w[crit].nsens) != BR_OK)
            return BR_ENOMEM;
    }
    int nsens;
    if (!startup && guided_corners(c->s, BR_OBJ_HEADROOM, max_sens, l, &nsens) != BR_OK)
        return BR_ENOMEM;
    list_unique(l);
    return BR_OK;
}

static int run_pass(br_corners *c, int startup, int max_exh, int max_sens, int *method,
                    br_error *err)
{
    corner_list l = {.k = c->s->tl.n};
    int rc = pass_corners(c, startup, max_exh, max_sens, &l, method);
    if (rc != BR_OK)
        rc = br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory listing corners");
    else
        rc = judge_list(c, &l, startup, err);
    free(l.level);
    return rc;
}

static void verdict(br_corners *c)
{
    int failed = 0, undetermined = c->unjudged > 0;
    for (int crit = 0; crit < BR_CRIT_COUNT; crit++) {
        br_corner_worst *w = &c->w[crit];
        w->outcome = w->applies && !w->worst.pass ? BR_OUTCOME_FAIL
                     : w->undetermined > 0        ? BR_OUTCOME_UNDETERMINED
                                                  : BR_OUTCOME_PASS;
        failed |= w->outcome == BR_OUTCOME_FAIL;
        undetermined |= w->outcome == BR_OUTCOME_UNDETERMINED;
    }
    c->outcome = failed         ? BR_OUTCOME_FAIL
                 : undetermined ? BR_OUTCOME_UNDETERMINED
                                : BR_OUTCOME_PASS;
    c->all_pass = c->outcome == BR_OUTCOME_PASS;
}

/* The spread and both passes into c. */
static int search(br_corners *c, const br_design *d, const br_corners_opts *o, br_meter *meter,
                  br_error *err)
{
    br_spread_opts so;
    br_spread_opts_default(&so);
    so.threads = o->threads;
    so.startup = o->startup;
    so.meter = meter;
    so.solver_limit = o->solver_limit;
    int rc = br_spread_create(d, &so, &c->s, err);
    if (rc == BR_OK) {
        consider_known(c);
        rc = run_pass(c, 0, o->max_exhaustive, o->max_sensitive, &c->method, err);
    }
    if (rc == BR_OK && o->startup)
        rc =
            run_pass(c, 1, o->startup_max_exhaustive, o->startup_max_sensitive, &c->su_method, err);
    return rc;
}

int br_corners_run(const br_design *d, const br_corners_opts *o, br_corners **out, br_error *err)
{
    br_corners_opts def;
    if (!o) {
        br_corners_opts_default(&def);
        o = &def;
    }
    *out = NULL;
    br_corners *c = calloc(1, sizeof *c);
    if (!c)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    c->max_exhaustive = o->max_exhaustive;
    c->max_sensitive = o->max_sensitive;
    c->startup_max_exhaustive = o->startup_max_exhaustive;
    c->startup_max_sensitive = o->startup_max_sensitive;
    br_meter meter;
    int rc = br_meter_init(&meter, o->progress, 0.0, err);
    if (rc == BR_OK) {
        rc = search(c, d, o, &meter, err);
        br_meter_destroy(&meter);
        if (c->s)
            c->s->meter = NULL; /* the meter is gone; the result outlives it */
    }
    if (rc != BR_OK) {
        br_corners_free(c);
        return rc;
    }
    verdict(c);
    *out = c;
    return BR_OK;
}

void br_corners_free(br_corners *c)
{
    if (!c)
        return;
    br_spread_free(c->s);
    free(c);
}

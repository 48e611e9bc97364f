/* size.c - the smallest capacitor per rail, the largest link and injection resistances
 * and the headroom of one design at a margin target (size.h). */
#include "analyses/size.h"

#include "analyses/corners.h"
#include "core/error.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

typedef struct sizer {
    const br_design *d0; /* the design as given */
    const br_size_opts *o;
    br_size *z;
    br_spread *base; /* its spread, cold starts included */
    br_meter *meter;
    int ncand;                          /* admissible catalog capacitors */
    int cand[BR_MAX_PARTS];             /* in order of capacitance, then cost */
    br_cap_part own[BR_MAX_SWITCHES];   /* each rail's part in the design as given */
    br_design *judged;                  /* the design that qualified whole last (a copy, owned) */
    br_size_verdict judged_v;           /* its verdict */
    int warm;                           /* a value judged at the nominal point settled: */
    double warm_x[2][BR_SPREAD_NX];     /* its steady state, where the next one starts */
    double warm_tj[2][BR_MAX_SWITCHES]; /* and its junction temperatures */
} sizer;

void br_size_opts_default(br_size_opts *o)
{
    memset(o, 0, sizeof *o);
    o->target = -1.0;
    o->links = 1;
}

/* ---- judging a design at its worst corners ------------------------------------------ */

/* Smaller is worse; a failing row without a negative margin is the
 * worst, a passing one without a margin (a status) the best. */
static double rank_of(const br_pt_row *r)
{
    if (!r->pass)
        return r->margin < 0 ? r->margin : -HUGE_VAL;
    return isnan(r->margin) ? HUGE_VAL : r->margin;
}

/* The criteria the target applies to: those with a margin in volts. */
static int in_volts(int c)
{
    return br_crit_has_margin(c) && strcmp(br_crit_unit(c), "V") == 0;
}

static void take(br_size_verdict *v, const br_pt *p, int all, int *undet)
{
    v->points++;
    if (p->status != BR_OK) {
        *undet = *undet < 0 ? BR_CRIT_STEADY : *undet;
        return;
    }
    v->headroom = fmin(v->headroom, p->headroom);
    for (int c = 0; c < BR_CRIT_COUNT; c++) {
        const br_pt_row *r = &p->row[c];
        if (!r->applies || (!all && br_crit_is_startup(c)))
            continue;
        if (r->undetermined) {
            *undet = *undet < 0 ? c : *undet;
            continue;
        }
        if (!v->seen[c] || rank_of(r) < rank_of(&v->worst[c])) {
            v->worst[c] = *r;
            v->seen[c] = 1;
        }
    }
}

/* Fail when a criterion fails; else undetermined when one is; else pass.
 * The failing criterion named is a circuit one where there is one (the
 * steady-state row fails too wherever a driver drops out). */
static void conclude(br_size_verdict *v, int undet, double target)
{
    v->fail_crit = v->crit = -1;
    v->margin = HUGE_VAL;
    for (int c = 0; c < BR_CRIT_COUNT; c++) {
        if (!v->seen[c])
            continue;
        if (!v->worst[c].pass && (v->fail_crit < 0 || v->fail_crit == BR_CRIT_STEADY)) {
            v->fail_crit = c;
            v->fail_row = v->worst[c];
        }
        if (in_volts(c) && v->worst[c].margin < v->margin) {
            v->margin = v->worst[c].margin;
            v->crit = c;
            v->stage = v->worst[c].stage;
            v->dir = v->worst[c].dir;
        }
    }
    v->outcome = v->fail_crit >= 0 ? BR_OUTCOME_FAIL
                 : undet >= 0      ? BR_OUTCOME_UNDETERMINED
                                   : BR_OUTCOME_PASS;
    if (v->outcome == BR_OUTCOME_UNDETERMINED)
        v->fail_crit = undet;
    v->qualifies = v->outcome == BR_OUTCOME_PASS && v->margin >= target;
    if (v->outcome == BR_OUTCOME_PASS && !v->qualifies) {
        v->fail_crit = v->crit;
        v->fail_row = v->worst[v->crit];
    }
}

/* The predicted worst corner of every objective (the steady-state ones,
 * or all), each once, into level (rows of BR_TOL_MAX); their count. */
static int corners_of(const br_spread *s, int all, signed char *level)
{
    int n = 0;
    for (int a = 0; a <= BR_CRIT_COUNT; a++) {
        int c = a == 0 ? BR_OBJ_HEADROOM : a - 1;
        if (c != BR_OBJ_HEADROOM &&
            (c == BR_CRIT_STEADY || (!all && br_crit_is_startup(c)) || !s->nominal.row[c].applies))
            continue;
        signed char *row = level + (size_t)n * BR_TOL_MAX;
        memset(row, 0, BR_TOL_MAX);
        br_corner_sensitivity(s, c, row, NULL);
        int dup = 0, moved = 0;
        for (int j = 0; j < s->tl.n; j++)
            moved |= row[j] != 0;
        for (int b = 0; b < n && !dup; b++)
            dup = memcmp(level + (size_t)b * BR_TOL_MAX, row, BR_TOL_MAX) == 0;
        n += moved && !dup;
    }
    return n;
}

/* The nominal point and the one-at-a-time points the spread judged for t
 * itself, then each predicted worst corner (unless the nominal point
 * fails already). */
static int judge_spread(br_spread *s, int all, br_size_verdict *v, int *undet, br_error *err)
{
    take(v, &s->nominal, all, undet);
    for (int r = 0; r < 2 * s->tl.n; r++)
        if (!s->borrowed[r])
            take(v, &s->oat[r], all, undet);
    if (s->stopped || s->nominal.outcome == BR_OUTCOME_FAIL)
        return BR_OK;
    signed char *level = malloc((size_t)(BR_CRIT_COUNT + 1) * BR_TOL_MAX);
    double *values = malloc(sizeof(double) * (BR_CRIT_COUNT + 1) * (size_t)(s->tl.n + 1));
    br_pt *pts = malloc(sizeof(br_pt) * (BR_CRIT_COUNT + 1));
    int rc = level && values && pts ? BR_OK
                                    : br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    int n = rc == BR_OK ? corners_of(s, all, level) : 0;
    for (int i = 0; i < n; i++)
        br_spread_levels(s, level + (size_t)i * BR_TOL_MAX, values + (size_t)i * (size_t)s->tl.n);
    br_meter_grow(s->meter, n);
    if (rc == BR_OK && n > 0)
        rc = br_spread_eval(s, n, values, all, pts, err);
    for (int i = 0; rc == BR_OK && i < n; i++)
        take(v, &pts[i], all, undet);
    free(level);
    free(values);
    free(pts);
    return rc;
}

/* How far a value is judged: the steady-state criteria only; every
 * criterion, the cold start included; or (the nominal point only) every
 * criterion with the cold start simulated only when the steady state
 * leaves the value able to qualify (br_spread_opts.lazy_startup: a value
 * it rules out is judged on its steady state alone, which already says
 * that it does not qualify). */
enum { BY_STEADY = 0, BY_ALL = 1, BY_ALL_LAZY = 2 };

/* Keep t and its verdict v as the last design that qualified whole: the
 * searches keep that design as their result, whose final judgement is
 * then the same computation again (judging depends on nothing else). */
static void remember(sizer *q, const br_design *t, const br_size_verdict *v)
{
    if (!q->judged)
        q->judged = br_design_copy(t);
    else
        memcpy(q->judged, t, sizeof *t);
    if (q->judged)
        q->judged_v = *v;
}

/* At the nominal point the values judged one after another differ in
 * one rail's capacitor: each starts its steady state (and its junction
 * temperatures) from the last one that settled, which lies closer than
 * the design as given once rails have changed. */
static void keep_warm(sizer *q, const br_spread *s)
{
    if (!q->o->nominal || !s->predict)
        return;
    memcpy(q->warm_x, s->xnom, sizeof q->warm_x);
    memcpy(q->warm_tj, s->tjnom, sizeof q->warm_tj);
    q->warm = 1;
}

/* Judge t at its worst corners: the steady-state criteria, or all of
 * them (the cold start included).  Only running out of memory or a stop
 * is an error; a design that cannot be judged is undetermined. */
static int judge(sizer *q, const br_design *t, int by, br_size_verdict *v, br_error *err)
{
    int all = by != BY_STEADY;
    memset(v, 0, sizeof *v);
    v->headroom = HUGE_VAL;
    br_spread_opts so;
    br_spread_opts_default(&so);
    so.threads = q->base->threads;
    so.startup = all;
    so.accept = q->base->accept;
    so.similar = 1;
    so.stop_failed = 1; /* a design that fails at its nominal point needs no corners */
    so.meter = q->meter;
    so.solver_limit = q->o->solver_limit;
    so.warm = q->o->nominal;
    so.lazy_startup = by == BY_ALL_LAZY && q->o->nominal;
    so.lazy_target = q->z->target;
    so.warm_x = q->warm ? q->warm_x : NULL;
    so.warm_tj = q->warm ? q->warm_tj : NULL;
    br_spread *s = NULL;
    int undet = -1;
    br_meter_grow(q->meter, 1);
    int rc = br_spread_derive(q->base, t, &so, &s, err);
    if (rc == BR_OK)
        rc = judge_spread(s, all, v, &undet, err);
    if (rc == BR_OK)
        keep_warm(q, s);
    q->z->points += v->points;
    br_spread_free(s);
    if (rc == BR_ENOMEM || rc == BR_ECANCEL)
        return rc;
    if (rc != BR_OK) { /* a design the model refuses decides nothing */
        v->status = rc;
        undet = BR_CRIT_STEADY;
    }
    conclude(v, undet, q->z->target);
    if (all && v->qualifies)
        remember(q, t, v);
    return BR_OK;
}

/* Judge t whole: the steady-state criteria first (no cold start), and
 * only when they qualify every criterion with the cold start, which
 * costs most; at the nominal point both in one judgement. */
static int judge_whole(sizer *q, const br_design *t, br_size_verdict *v, br_error *err)
{
    if (q->o->nominal) /* one point: its steady state once, then the cold start */
        return judge(q, t, BY_ALL_LAZY, v, err);
    int rc = judge(q, t, BY_STEADY, v, err);
    if (rc == BR_OK && v->qualifies)
        rc = judge(q, t, BY_ALL, v, err);
    return rc;
}

/* ---- capacitors ---------------------------------------------------------------------- */

static void rail_name(const br_design *d, int k, char *buf, size_t cap)
{
    br_chain *c = malloc(sizeof *c);
    br_error err;
    buf[0] = '\0';
    if (c && br_chain_build_nominal(d, c, &err) == BR_OK)
        snprintf(buf, cap, "%s", c->st[k].name);
    free(c);
}

/* Whether t uses capacitor i anywhere but on rail k (the default stage
 * counts as elsewhere). */
static int cap_used_elsewhere(const br_design *t, int k, int i)
{
    if (t->def.cap == i)
        return 1;
    for (int j = 0; j < BR_MAX_SWITCHES; j++)
        if (j != k && t->has_override[j] && t->stage[j].cap == i)
            return 1;
    return 0;
}

static int cap_find(const br_design *t, const char *id)
{
    for (int i = 0; i < t->ncaps; i++)
        if (strcmp(t->caps[i].id, id) == 0)
            return i;
    return -1;
}

/* The index of part p in t's capacitors for rail k: the part of its id
 * when that is p, else the slot of its id that only rail k uses
 * (overwritten: an earlier value of this search), else appended; an id
 * that a different part holds elsewhere gets a number ("-2", "-3"...). */
static int cap_slot(br_design *t, int k, br_cap_part *p, br_error *err)
{
    char base[BR_ID_MAX - 4]; /* room for "-99" */
    size_t len = strnlen(p->id, sizeof base - 1);
    memcpy(base, p->id, len);
    base[len] = '\0';
    for (int n = 1; n < 100; n++) {
        if (n > 1)
            snprintf(p->id, BR_ID_MAX, "%s-%d", base, n);
        int i = cap_find(t, p->id);
        if (i < 0)
            break;
        br_cap_part a = t->caps[i];
        a.line = p->line;
        if (memcmp(&a, p, sizeof a) == 0)
            return i;
        if (!cap_used_elsewhere(t, k, i)) {
            t->caps[i] = *p;
            return i;
        }
    }
    if (t->ncaps >= BR_MAX_PARTS || cap_find(t, p->id) >= 0)
        return -br_error_set(err, BR_EINPUT, t->path, 0, "parts",
                             "no room for another capacitor: a design holds at most %d",
                             BR_MAX_PARTS);
    t->caps[t->ncaps] = *p;
    return t->ncaps++;
}

/* Rail k of cur with catalog part `part`, or (part < 0) its own part of
 * the design as given scaled to capacitance c, as a new design. */
static int with_cap(const sizer *q, const br_design *cur, int k, int part, double c,
                    br_size_value *val, br_design **out, br_error *err)
{
    br_design *t = br_design_copy(cur);
    if (!t)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    br_cap_part p = part >= 0 ? q->o->cat->caps[part] : q->own[k];
    if (part < 0) {
        double f = c / p.c.nom;
        p.c.nom = c;
        p.c.min *= f;
        p.c.max *= f;
        char sw[BR_ID_MAX];
        rail_name(cur, k, sw, sizeof sw);
        snprintf(p.id, sizeof p.id, "cap-%.40s", sw);
    }
    int slot = cap_slot(t, k, &p, err);
    if (slot < 0) {
        br_design_free(t);
        return -slot;
    }
    br_stage_spec spec = *br_design_stage(t, k);
    spec.cap = slot;
    t->stage[k] = spec;
    t->has_override[k] = 1;
    int rc = q->o->nominal ? br_tol_fix(t, err) : BR_OK;
    if (rc != BR_OK) {
        br_design_free(t);
        return rc;
    }
    val->v = p.c.nom;
    val->part = part;
    snprintf(val->id, sizeof val->id, "%s", p.id);
    *out = t;
    return BR_OK;
}

/* Judge rail k of *cur at a value; *cur takes it when it qualifies. */
static int try_cap(sizer *q, br_design **cur, int k, int part, double c, br_size_value *val,
                   br_error *err)
{
    br_design *t = NULL;
    int rc = with_cap(q, *cur, k, part, c, val, &t, err);
    if (rc == BR_OK)
        rc = judge_whole(q, t, &val->ver, err);
    q->z->cap[k].trials++;
    if (rc == BR_OK && val->ver.qualifies) {
        br_design_free(*cur);
        *cur = t;
        return BR_OK;
    }
    br_design_free(t);
    return rc;
}

static int undetermined(const br_size_value *v)
{
    return v->ver.outcome == BR_OUTCOME_UNDETERMINED;
}

/* Two positions among the catalog's candidates: lo does not qualify (-1:
 * below the first, not judged), hi qualifies (ncand: beyond the last,
 * not judged); or the value judged last was undetermined (vund). */
typedef struct bracket {
    int lo, hi;
    br_size_value vlo, vhi;
    int undet;
    br_size_value vund;
} bracket;

/* Judge position j into b. */
static int probe(sizer *q, br_design **cur, int k, int j, bracket *b, br_error *err)
{
    br_size_value v;
    int rc = try_cap(q, cur, k, q->cand[j], 0, &v, err);
    if (rc != BR_OK)
        return rc;
    if (undetermined(&v)) {
        b->undet = 1;
        b->vund = v;
    } else if (v.ver.qualifies) {
        b->hi = j;
        b->vhi = v;
    } else {
        b->lo = j;
        b->vlo = v;
    }
    return BR_OK;
}

/* Narrow b until its ends are neighbours: galloping from the end judged
 * (1, 2, 4... positions on) while the other is not, then bisecting.
 * Values that qualify are met in decreasing order, so *cur ends with the
 * answer.  Over at most 64 candidates: 7 values galloping, 5 bisecting. */
static int narrow(sizer *q, br_design **cur, int k, bracket *b, br_error *err)
{
    int step = 1, rc = BR_OK;
    while (rc == BR_OK && !b->undet && b->hi - b->lo > 1) {
        int j;
        if (b->lo >= 0 && b->hi < q->ncand)
            j = b->lo + (b->hi - b->lo) / 2;
        else if (b->lo >= 0)
            j = b->lo + step < q->ncand - 1 ? b->lo + step : q->ncand - 1;
        else
            j = b->hi - step > 0 ? b->hi - step : 0;
        step *= 2;
        rc = probe(q, cur, k, j, b, err);
    }
    return rc;
}

/* Catalog: from position i (the rail above's answer) down while values
 * qualify, up while they do not, galloping and then bisecting, to the
 * smallest candidate that qualifies with the next smaller one judged and
 * not qualifying (at most 13 values, BR_SIZE_MAXTRY 40).  At the nominal
 * point a value is simulated from power-up only when its steady state
 * leaves it able to qualify (judge_whole). */
static int walk_catalog(sizer *q, br_design **cur, int k, int i, br_error *err)
{
    _Static_assert(BR_MAX_PARTS <= 64 && 7 + 6 <= BR_SIZE_MAXTRY,
                   "a rail's catalog search stays within BR_SIZE_MAXTRY values");
    br_size_answer *a = &q->z->cap[k];
    bracket b = {.lo = -1, .hi = q->ncand};
    int rc = probe(q, cur, k, i, &b, err);
    if (rc == BR_OK)
        rc = narrow(q, cur, k, &b, err);
    if (rc != BR_OK)
        return rc;
    a->at = b.hi < q->ncand ? b.vhi : a->at;
    if (b.undet) {
        a->kind = BR_SIZE_UNDETERMINED;
        a->beyond = b.vund;
        a->have_beyond = 1;
    } else if (b.hi >= q->ncand) {
        a->kind = BR_SIZE_NONE;
        a->beyond = b.vlo;
        a->have_beyond = 0;
    } else {
        a->kind = b.lo < 0 ? BR_SIZE_END : BR_SIZE_FOUND;
        a->beyond = b.lo < 0 ? b.vhi : b.vlo;
        a->have_beyond = b.lo >= 0;
    }
    return BR_OK;
}

/* A bisection's answer from its last value tried v and its closest
 * passing and failing values (NULL: none found). */
static void settle(br_size_answer *a, const br_size_value *v, const br_size_value *pass,
                   const br_size_value *fail)
{
    static const br_size_value none = {0};
    int und = undetermined(v);
    a->at = pass ? *pass : none;
    a->beyond = und ? *v : fail ? *fail : none;
    a->have_beyond = und || fail;
    a->kind = und     ? BR_SIZE_UNDETERMINED
              : !pass ? BR_SIZE_NONE
              : !fail ? BR_SIZE_END
                      : BR_SIZE_FOUND;
}

/* Continuous: halve (or double) from c until the answer changes, then
 * bisect on a logarithmic scale to BR_SIZE_RES_C. */
static int walk_continuous(sizer *q, br_design **cur, int k, double c, br_error *err)
{
    br_size_answer *a = &q->z->cap[k];
    double lo_bound = a->from / BR_SIZE_SPAN, hi_bound = a->from * BR_SIZE_SPAN;
    br_size_value v, pass = {0}, fail = {0};
    int rc = try_cap(q, cur, k, -1, c, &v, err), have_pass = 0, have_fail = 0;
    while (rc == BR_OK && !undetermined(&v) && a->trials < BR_SIZE_MAXTRY) {
        if (v.ver.qualifies)
            pass = v, have_pass = 1;
        else
            fail = v, have_fail = 1;
        double next;
        if (have_pass && have_fail) {
            if (pass.v / fail.v - 1.0 <= BR_SIZE_RES_C)
                break;
            next = sqrt(pass.v * fail.v);
        } else {
            next = have_pass ? v.v / 2 : v.v * 2;
            if (next < lo_bound || next > hi_bound)
                break;
        }
        rc = try_cap(q, cur, k, -1, next, &v, err);
    }
    if (rc != BR_OK)
        return rc;
    settle(a, &v, have_pass ? &pass : NULL, have_fail ? &fail : NULL);
    return BR_OK;
}

/* Where rail k's search starts: the answer of the rail above (rails
 * lower down carry more), or the design's own value for the top rail. */
static int start_of(const sizer *q, int k, double *c)
{
    const br_size_answer *above = k + 1 < q->z->n ? &q->z->cap[k + 1] : NULL;
    int from_above =
        above && (above->kind == BR_SIZE_FOUND || above->kind == BR_SIZE_END) && above->at.v > 0;
    *c = from_above ? above->at.v : q->z->cap[k].from;
    if (!q->z->catalog)
        return -1;
    int i = 0;
    while (i + 1 < q->ncand && q->o->cat->caps[q->cand[i]].c.nom < *c * (1 - 1e-9))
        i++;
    return i;
}

static int size_caps(sizer *q, br_design **cur, br_error *err)
{
    for (int k = q->z->n - 1; k >= 1; k--) {
        double c;
        int i = start_of(q, k, &c);
        int rc =
            q->z->catalog ? walk_catalog(q, cur, k, i, err) : walk_continuous(q, cur, k, c, err);
        if (rc != BR_OK)
            return rc;
    }
    return BR_OK;
}

/* ---- the link resistance ------------------------------------------------------------ */

static br_qty scaled(const br_qty *q, double v)
{
    br_qty r = *q;
    double f = q->nom > 0 ? v / q->nom : 0.0;
    if (!(q->nom > 0))
        return br_qty_fixed(v);
    r.nom = v;
    r.min *= f;
    r.max *= f;
    return r;
}

/* The answer of resistance search `which`: the links (-1) or injection
 * `which`. */
static br_size_answer *res_answer(sizer *q, int which)
{
    return which < 0 ? &q->z->link : &q->z->inject[which];
}

/* Resistance r into t: on every link (which < 0, one value), or as
 * injection `which`'s, with the tolerance of the design's own value. */
static void set_res(const sizer *q, br_design *t, int which, double r)
{
    if (which >= 0) {
        t->inject[which].r = scaled(&q->d0->inject[which].r, r);
        return;
    }
    br_qty base = q->d0->def.r_link;
    t->def.r_link = scaled(&base, r);
    for (int k = 0; k < BR_MAX_SWITCHES; k++)
        if (t->has_override[k])
            t->stage[k].r_link = t->def.r_link;
}

static int try_res(sizer *q, br_design **cur, int which, double r, br_size_value *val,
                   br_error *err)
{
    br_design *t = br_design_copy(*cur);
    if (!t)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    set_res(q, t, which, r);
    val->v = r;
    val->part = -1;
    val->id[0] = '\0';
    int rc = judge_whole(q, t, &val->ver, err);
    res_answer(q, which)->trials++;
    if (rc == BR_OK && val->ver.qualifies) {
        br_design_free(*cur);
        *cur = t;
        return BR_OK;
    }
    br_design_free(t);
    return rc;
}

/* Doubling from the design's value while it qualifies (or halving while
 * it does not, down to the floor lo: 0 for the links, V / IFRM for an
 * injection), then bisection to BR_SIZE_RES_R. */
static int size_res(sizer *q, br_design **cur, int which, double lo, br_error *err)
{
    br_size_answer *a = res_answer(q, which);
    double r = fmax(a->from > 0 ? a->from : 1.0, lo);
    br_size_value v, pass = {0}, fail = {0};
    int rc = try_res(q, cur, which, r, &v, err), have_pass = 0, have_fail = 0;
    while (rc == BR_OK && !undetermined(&v) && a->trials < BR_SIZE_MAXTRY) {
        if (v.ver.qualifies)
            pass = v, have_pass = 1;
        else
            fail = v, have_fail = 1;
        double next;
        if (have_pass && have_fail) {
            if (fail.v / pass.v - 1.0 <= BR_SIZE_RES_R || pass.v == 0)
                break;
            next = sqrt(pass.v * fail.v);
        } else if (have_pass) {
            if ((next = v.v * 2) > r * BR_SIZE_SPAN)
                break;
        } else {
            if (v.v <= lo)
                break;
            next = v.v / 2 < r / BR_SIZE_SPAN ? lo : fmax(v.v / 2, lo);
        }
        rc = try_res(q, cur, which, next, &v, err);
    }
    if (rc != BR_OK)
        return rc;
    settle(a, &v, have_pass ? &pass : NULL, have_fail ? &fail : NULL);
    return BR_OK;
}

/* The link resistance, then each injection's above its floor. */
static int size_resistances(sizer *q, br_design **cur, br_error *err)
{
    int rc = size_res(q, cur, -1, 0.0, err);
    for (int i = 0; rc == BR_OK && i < q->z->ninject; i++)
        rc = size_res(q, cur, i, q->z->inject_floor[i], err);
    return rc;
}

double br_size_inject_floor(const br_design *d, int i)
{
    const br_inject_spec *j = &d->inject[i];
    const br_diode_part *p = &d->diodes[j->diode];
    double ipk = p->ifrm.nom > 0 ? p->ifrm.nom : p->ifsm.nom;
    return ipk > 0 ? j->v.max / ipk : 0.0;
}

/* ---- the whole run ------------------------------------------------------------------ */

static int by_capacitance(const br_catalog *cat, int a, int b)
{
    double ca = cat->caps[a].c.nom, cb = cat->caps[b].c.nom;
    if (ca != cb)
        return ca < cb;
    return cat->cap_offer[a].cost < cat->cap_offer[b].cost;
}

/* The catalog capacitors rated for the supply's highest voltage, in order. */
static void candidates(sizer *q)
{
    const br_catalog *cat = q->o->cat;
    for (int i = 0; i < cat->ncaps; i++) {
        if (!(cat->caps[i].vrated.nom >= q->d0->vsupply.max))
            continue;
        int at = q->ncand++;
        while (at > 0 && by_capacitance(cat, i, q->cand[at - 1])) {
            q->cand[at] = q->cand[at - 1];
            at--;
        }
        q->cand[at] = i;
    }
}

static void prepare(sizer *q, const br_chain *c)
{
    br_size *z = q->z;
    z->n = c->n;
    double hyst = HUGE_VAL;
    for (int k = 0; k < c->n; k++) {
        hyst = fmin(hyst, c->st[k].drv.uvlo_rise - c->st[k].drv.uvlo_fall);
        const br_stage_spec *s = br_design_stage(q->d0, k);
        q->own[k] = q->d0->caps[s->cap];
        z->cap[k].from = q->own[k].c.nom;
        snprintf(z->cap[k].from_id, BR_ID_MAX, "%s", q->own[k].id);
        z->cap[k].kind = k == 0 ? BR_SIZE_KEPT : BR_SIZE_NONE;
        z->link.from = fmax(z->link.from, k > 0 ? s->r_link.nom : 0.0);
        if (c->st[k].aux.kind == BR_AUX_LDO) {
            z->reg_vout = fmax(z->reg_vout, c->st[k].aux.vout);
            z->reg_dropout = fmax(z->reg_dropout, c->st[k].aux.dropout);
        }
    }
    z->target_default = !(q->o->target >= 0);
    z->target = z->target_default ? 0.25 * (hyst > 0 && isfinite(hyst) ? hyst : 0.0) : q->o->target;
    z->link.kind = z->links ? BR_SIZE_NONE : BR_SIZE_KEPT;
    z->ninject = q->d0->ninject;
    for (int i = 0; i < z->ninject; i++) {
        z->inject[i].from = q->d0->inject[i].r.nom;
        z->inject[i].kind = z->links ? BR_SIZE_NONE : BR_SIZE_KEPT;
    }
}

/* The design as given at the nominal point, on the steady-state
 * criteria: the base spread judged it so already. */
static void start_nominal(sizer *q, br_size_verdict *v)
{
    int undet = -1;
    memset(v, 0, sizeof *v);
    v->headroom = HUGE_VAL;
    take(v, &q->base->nominal, 0, &undet);
    conclude(v, undet, q->z->target);
}

/* The result judged whole, every criterion with the cold start: the
 * verdict of the value that qualified last when the result is that
 * design (the same judgement again would give the same), else afresh. */
static int judge_final(sizer *q, const br_design *cur, br_error *err)
{
    if (q->judged && q->judged_v.qualifies && memcmp(q->judged, cur, sizeof *cur) == 0) {
        q->z->final = q->judged_v;
        return BR_OK;
    }
    return judge(q, cur, BY_ALL, &q->z->final, err);
}

static int search(sizer *q, br_error *err)
{
    br_size *z = q->z;
    br_design *cur = br_design_copy(q->d0);
    if (!cur)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    int rc = BR_OK;
    if (q->o->nominal)
        start_nominal(q, &z->start);
    else
        rc = judge_whole(q, q->d0, &z->start, err);
    if (rc == BR_OK)
        rc = size_caps(q, &cur, err);
    if (rc == BR_OK && z->links)
        rc = size_resistances(q, &cur, err);
    if (rc == BR_OK)
        rc = judge_final(q, cur, err);
    z->d = cur;
    z->outcome = z->final.qualifies                            ? BR_OUTCOME_PASS
                 : z->final.outcome == BR_OUTCOME_UNDETERMINED ? BR_OUTCOME_UNDETERMINED
                                                               : BR_OUTCOME_FAIL;
    return rc;
}

static int supply_window(sizer *q, br_error *err)
{
    br_supply_window_opts so = {0};
    so.threads = q->o->threads;
    so.progress = q->o->progress;
    so.voltage_only = 1;
    return br_supply_window_run(q->z->d, &so, &q->z->sw, err);
}

/* The spread every judgement of a run shares: its threads, cold starts,
 * meter and solver limit.  At the nominal point it lends the values
 * judged its steady state only (they start theirs from it), and no
 * one-at-a-time points, so it needs no cold start. */
static void spread_opts(const sizer *q, br_spread_opts *so)
{
    br_spread_opts_default(so);
    so->threads = q->o->threads;
    so->startup = !q->o->nominal;
    so->meter = q->meter;
    so->solver_limit = q->o->solver_limit;
}

static int run(sizer *q, br_error *err)
{
    br_chain *c = malloc(sizeof *c);
    if (!c)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    int rc = br_chain_build_nominal(q->d0, c, err);
    if (rc == BR_OK)
        prepare(q, c);
    free(c);
    if (rc == BR_OK && q->z->catalog)
        candidates(q);
    if (rc == BR_OK && q->z->catalog && q->ncand == 0)
        rc = br_error_set(err, BR_EINPUT, q->o->cat->path, 0, "capacitor",
                          "no capacitor of the catalog is rated for the supply's highest "
                          "voltage %.4g V, expected at least one to size the rails with",
                          q->d0->vsupply.max);
    br_spread_opts so;
    spread_opts(q, &so);
    if (rc == BR_OK)
        rc = br_spread_create(q->d0, &so, &q->base, err);
    if (rc == BR_OK)
        rc = search(q, err);
    br_spread_free(q->base);
    br_design_free(q->judged);
    return rc;
}

int br_size_run(const br_design *d, const br_size_opts *o, br_size **out, br_error *err)
{
    br_size_opts def;
    if (!o) {
        br_size_opts_default(&def);
        o = &def;
    }
    *out = NULL;
    br_size *z = calloc(1, sizeof *z);
    if (!z)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    z->catalog = o->cat && o->cat->ncaps > 0;
    z->links = o->links;
    for (int i = 0; i < d->ninject; i++) /* the highest voltage the design gives */
        z->inject_floor[i] = br_size_inject_floor(d, i);
    br_design *fixed = o->nominal ? br_design_copy(d) : NULL;
    int rc = !o->nominal ? BR_OK
             : fixed     ? br_tol_fix(fixed, err)
                         : br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    sizer q = {.d0 = fixed ? fixed : d, .o = o, .z = z};
    br_meter meter;
    if (rc == BR_OK)
        rc = br_meter_init(&meter, o->progress, 0.0, err);
    if (rc == BR_OK) {
        q.meter = &meter;
        rc = run(&q, err);
        rc = br_meter_status(&meter, rc, err);
        br_meter_destroy(&meter);
    }
    if (rc == BR_OK && o->supply)
        rc = supply_window(&q, err);
    br_design_free(fixed);
    if (rc != BR_OK) {
        br_size_free(z);
        return rc;
    }
    *out = z;
    return BR_OK;
}

void br_size_free(br_size *s)
{
    if (!s)
        return;
    br_design_free(s->d);
    br_supply_window_free(s->sw);
    free(s);
}

static int judge_alone(sizer *q, const br_design *t, br_size_verdict *v, br_error *err)
{
    br_chain *c = malloc(sizeof *c);
    int rc = c ? BR_OK : br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    if (rc == BR_OK)
        rc = br_chain_build_nominal(q->d0, c, err);
    if (rc == BR_OK)
        prepare(q, c);
    free(c);
    br_spread_opts so;
    spread_opts(q, &so);
    if (rc == BR_OK)
        rc = br_spread_create(q->d0, &so, &q->base, err);
    if (rc == BR_OK)
        rc = judge_whole(q, t, v, err);
    br_spread_free(q->base);
    br_design_free(q->judged);
    return rc;
}

int br_size_judge(const br_design *d, const br_design *t, const br_size_opts *o, br_size_verdict *v,
                  br_error *err)
{
    br_size *z = calloc(1, sizeof *z);
    if (!z)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    sizer q = {.d0 = d, .o = o, .z = z};
    /* the meter carries o's stop poll to every simulation of the spread */
    br_meter meter;
    int rc = br_meter_init(&meter, o->progress, 0.0, err);
    if (rc == BR_OK) {
        q.meter = &meter;
        rc = judge_alone(&q, t, v, err);
        rc = br_meter_status(&meter, rc, err);
        br_meter_destroy(&meter);
    }
    free(z);
    return rc;
}

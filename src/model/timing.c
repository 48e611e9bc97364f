/* timing.c - the sorted events of one period. */
#include "model/timing.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

int br_in_interval(double t, double a, double b)
{
    if (a <= b)
        return t >= a && t < b;
    return t >= a || t < b; /* wraps past the period end */
}

static void add(br_timing *tm, double t, int sw, int kind)
{
    br_event *e = &tm->ev[tm->nev++];
    e->t = t;
    e->sw = sw;
    e->kind = kind;
}

static int cmp_event(const void *pa, const void *pb)
{
    const br_event *a = pa, *b = pb;
    if (a->t != b->t)
        return a->t < b->t ? -1 : 1;
    if (a->kind != b->kind)
        return a->kind - b->kind; /* offs first: no overlap at a tie */
    return a->sw - b->sw;
}

/* Windows of zero length contribute nothing; full-period windows have no
 * edges but keep the switch on throughout. */
static void add_windows(br_timing *tm, int sw, int n, const double (*iv)[2], int on_kind,
                        int off_kind, br_mask *mask0)
{
    for (int i = 0; i < n; i++) {
        double a = iv[i][0], b = iv[i][1];
        if (b - a >= tm->T) { /* on all period: no edges */
            *mask0 |= 1ULL << sw;
            continue;
        }
        if (a == b)
            continue;
        add(tm, a, sw, on_kind);
        add(tm, b, sw, off_kind);
        if (br_in_interval(0.0, a, b))
            *mask0 |= 1ULL << sw;
    }
}

void br_event_apply(const br_event *e, br_mask *on, br_mask *rev)
{
    br_mask bit = 1ULL << e->sw;
    switch (e->kind) {
    case BR_EV_ON:
        *on |= bit;
        break;
    case BR_EV_OFF:
        *on &= ~bit;
        break;
    case BR_EV_REV_ON:
        *rev |= bit;
        break;
    default:
        *rev &= ~bit;
        break;
    }
}

void br_timing_state_at(const br_timing *tm, double t, br_mask *on, br_mask *rev)
{
    br_mask m = tm->on0, r = tm->rev0;
    for (int i = 0; i < tm->nev && tm->ev[i].t <= t; i++)
        br_event_apply(&tm->ev[i], &m, &r);
    *on = m;
    *rev = r;
}

/* ---- flying-capacitor ripple ----------------------------------------------
 * The string from ground is B1 ... BP, AP ... A1; capacitor k sits between
 * the node above Bk and the node below Ak, so cell k (Ak, Bk) lies between
 * capacitors k-1 and k (capacitor 0 is the bus, P the switch node's zero).
 * A current I entering the switch node climbs to cell k on the A side when
 * pair k+1's top switch conducts and on the B side otherwise, and leaves
 * cell k on the side pair k conducts on; when the sides differ it passes
 * through capacitor k: dV(k)/dt = (I / Cfly) (S(k+1) - S(k)) (the cell
 * relations of Meynard & Foch, IEEE PESC 1992). */

void br_timing_fly_slopes(const br_timing *tm, br_mask conducting, double *sl)
{
    int P = tm->npairs;
    sl[0] = 0.0;
    for (int k = 1; k <= P; k++) {
        /* Aj sits at string position 2P - j */
        int s_k = (int)(conducting >> (2 * P - k) & 1);
        int s_k1 = k < P ? (int)(conducting >> (2 * P - k - 1) & 1) : 0;
        sl[k] = k < P ? (s_k1 - s_k) / tm->cfly : 0.0;
    }
}

/* Extremes over a walk, per ampere: of each capacitor's ripple and of
 * each cell's, fly[j-1] - fly[j] (a line between events has them at its
 * ends). */
typedef struct fly_ext {
    double cap[BR_MAX_FLY + 1][2], cell[BR_MAX_FLY + 1][2];
} fly_ext;

static void ext_take(fly_ext *x, const double *fly, int P)
{
    for (int k = 1; k <= P; k++) {
        double c = fly[k - 1] - fly[k];
        x->cap[k][0] = fmin(x->cap[k][0], fly[k]);
        x->cap[k][1] = fmax(x->cap[k][1], fly[k]);
        x->cell[k][0] = fmin(x->cell[k][0], c);
        x->cell[k][1] = fmax(x->cell[k][1], c);
    }
}

/* Walk the period from 0 (ripple fly0) to t: the ripple and slope there,
 * the integral of the ripple over [0, t] and, when ext is not NULL, the
 * extremes on the way. */
static void fly_walk(const br_timing *tm, const double *fly0, double t, double *fly, double *sl,
                     double *area, fly_ext *ext)
{
    int P = tm->npairs;
    br_mask on = tm->on0, rev = tm->rev0;
    double at = 0.0;
    for (int k = 0; k <= P; k++) {
        fly[k] = fly0[k];
        area[k] = 0.0;
    }
    br_timing_fly_slopes(tm, on | rev, sl);
    for (int i = 0; i <= tm->nev; i++) {
        double te = i < tm->nev && tm->ev[i].t <= t ? tm->ev[i].t : t;
        double dt = te - at;
        for (int k = 1; k < P; k++) {
            area[k] += fly[k] * dt + 0.5 * sl[k] * dt * dt;
            fly[k] += sl[k] * dt;
        }
        if (ext)
            ext_take(ext, fly, P);
        at = te;
        if (i == tm->nev || tm->ev[i].t > t)
            break;
        br_event_apply(&tm->ev[i], &on, &rev);
        br_timing_fly_slopes(tm, on | rev, sl);
    }
}

void br_timing_fly_at(const br_timing *tm, double t, double *fly, double *sl)
{
    double area[BR_MAX_FLY + 1];
    fly_walk(tm, tm->fly_start, t, fly, sl, area, NULL);
}

void br_timing_fly_swing(const br_timing *tm, double *pp)
{
    memcpy(pp, tm->fly_pp, sizeof tm->fly_pp);
}

double br_timing_cell_min(const br_timing *tm, const br_chain *c, double i, int *stage)
{
    double low = HUGE_VAL;
    *stage = -1;
    for (int k = 0; k < c->n && tm->npairs > 0; k++) {
        int j = c->st[k].pair;
        double v = c->st[k].vblock + fmin(i * tm->cell_lo[j], i * tm->cell_hi[j]);
        if (v < low) {
            low = v;
            *stage = k;
        }
    }
    return low;
}

/* The ripple's value at the period start that gives it zero mean, and
 * from it its value at the first event. */
static void fly_build(const br_chain *c, br_timing *tm)
{
    double zero[BR_MAX_FLY + 1] = {0}, fly[BR_MAX_FLY + 1], sl[BR_MAX_FLY + 1];
    double area[BR_MAX_FLY + 1];
    tm->npairs = 0;
    memset(tm->fly_start, 0, sizeof tm->fly_start);
    memset(tm->fly_ev0, 0, sizeof tm->fly_ev0);
    memset(tm->fly_pp, 0, sizeof tm->fly_pp);
    memset(tm->cell_lo, 0, sizeof tm->cell_lo);
    memset(tm->cell_hi, 0, sizeof tm->cell_hi);
    if (!(c->cfly > 0) || !c->design || c->design->topology != BR_TOPO_FCML || tm->nev == 0)
        return;
    tm->npairs = c->n / 2;
    tm->cfly = c->cfly;
    fly_walk(tm, zero, tm->T, fly, sl, area, NULL);
    for (int k = 0; k <= tm->npairs; k++)
        tm->fly_start[k] = -area[k] / tm->T;
    fly_walk(tm, tm->fly_start, tm->ev[0].t, fly, sl, area, NULL);
    memcpy(tm->fly_ev0, fly, sizeof fly);
    fly_ext x;
    for (int k = 0; k <= BR_MAX_FLY; k++) {
        x.cap[k][0] = x.cell[k][0] = HUGE_VAL;
        x.cap[k][1] = x.cell[k][1] = -HUGE_VAL;
    }
    ext_take(&x, tm->fly_start, tm->npairs);
    fly_walk(tm, tm->fly_start, tm->T, fly, sl, area, &x);
    for (int k = 1; k <= tm->npairs; k++) {
        tm->fly_pp[k] = k < tm->npairs ? x.cap[k][1] - x.cap[k][0] : 0.0;
        tm->cell_lo[k] = x.cell[k][0];
        tm->cell_hi[k] = x.cell[k][1];
    }
}

void br_timing_sort(const br_chain *c, br_timing *tm)
{
    qsort(tm->ev, (size_t)tm->nev, sizeof tm->ev[0], cmp_event);
    fly_build(c, tm);
}

void br_timing_build(const br_chain *c, int dir, br_timing *tm)
{
    if (c->line.on) {
        br_timing_line(c, 0, dir == BR_DIRI_NONE ? dir : br_line_dir(&c->line, 0), 0, tm);
        return;
    }
    tm->T = c->T;
    tm->n = c->n;
    tm->nev = 0;
    tm->on0 = tm->rev0 = 0;
    for (int s = 0; s < c->n; s++) {
        const br_stage *st = &c->st[s];
        add_windows(tm, s, st->nwin, st->win, BR_EV_ON, BR_EV_OFF, &tm->on0);
        if (dir >= 0)
            add_windows(tm, s, st->nrev[dir], st->rev[dir], BR_EV_REV_ON, BR_EV_REV_OFF, &tm->rev0);
    }
    br_timing_sort(c, tm);
}

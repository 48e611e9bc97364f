/* timing.c - the sorted events of one period. */
#include "model/timing.h"

#include <stdlib.h>

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

void br_timing_build(const br_chain *c, int dir, br_timing *tm)
{
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
    qsort(tm->ev, (size_t)tm->nev, sizeof tm->ev[0], cmp_event);
}

void br_timing_state_at(const br_timing *tm, double t, br_mask *on, br_mask *rev)
{
    br_mask m = tm->on0, r = tm->rev0;
    for (int i = 0; i < tm->nev && tm->ev[i].t <= t; i++) {
        br_mask bit = 1ULL << tm->ev[i].sw;
        switch (tm->ev[i].kind) {
        case BR_EV_ON:
            m |= bit;
            break;
        case BR_EV_OFF:
            m &= ~bit;
            break;
        case BR_EV_REV_ON:
            r |= bit;
            break;
        default:
            r &= ~bit;
            break;
        }
    }
    *on = m;
    *rev = r;
}

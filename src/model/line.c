/* line.c - the line cycle's switching periods: their phase, duty,
 * current, and the events of each one (phase-shifted carriers that each
 * take a new duty at the start of their own period). */
#include "model/line.h"

#include "model/timing.h"

#include <math.h>
#include <string.h>

void br_line_resolve(const br_line_spec *ac, double fsw, br_line *l)
{
    memset(l, 0, sizeof *l);
    if (!ac->on || !(ac->freq.nom > 0) || !(fsw > 0))
        return;
    l->on = 1;
    l->freq_given = ac->freq.nom;
    double k = floor(fsw / ac->freq.nom + 0.5);
    l->K = k < 1.0 ? 1 : (long)k;
    l->freq = fsw / (double)l->K;
    l->ipk = ac->ipk.nom;
    l->phase = ac->phase.nom;
    l->depth = ac->depth.nom;
    l->ntab = ac->ntab;
    l->tab_at = ac->tab_at;
    l->tab_duty = ac->tab_duty;
}

long br_line_index(const br_line *l, long m)
{
    if (l->K <= 0)
        return 0;
    long r = m % l->K;
    return r < 0 ? r + l->K : r;
}

double br_line_theta(const br_line *l, long m)
{
    return 2.0 * BR_PI * ((double)br_line_index(l, m) + 0.5) / (double)l->K;
}

/* The table between its points, closing the circle from the last point
 * to the first one a line period later. */
static double table_at(const br_line *l, double th)
{
    int n = l->ntab, i = 0;
    while (i < n && l->tab_at[i] <= th)
        i++;
    double a0, d0, a1, d1;
    if (i == 0 || i == n) { /* between the last point and the first */
        a0 = l->tab_at[n - 1] - (i == 0 ? 2.0 * BR_PI : 0.0);
        a1 = l->tab_at[0] + (i == n ? 2.0 * BR_PI : 0.0);
        d0 = l->tab_duty[n - 1];
        d1 = l->tab_duty[0];
    } else {
        a0 = l->tab_at[i - 1];
        a1 = l->tab_at[i];
        d0 = l->tab_duty[i - 1];
        d1 = l->tab_duty[i];
    }
    return a1 > a0 ? d0 + (d1 - d0) * (th - a0) / (a1 - a0) : d0;
}

double br_line_duty_at(const br_line *l, double theta)
{
    if (l->ntab > 0)
        return table_at(l, theta);
    return 0.5 * (1.0 + l->depth * sin(theta));
}

double br_line_duty(const br_line *l, long m)
{
    return br_line_duty_at(l, br_line_theta(l, m));
}

double br_line_current(const br_line *l, long m)
{
    return l->ipk * sin(br_line_theta(l, m) - l->phase);
}

void br_line_window(const br_line *l, double T, double offset, long w, double *theta, long *m)
{
    double at = offset / T + (double)br_line_index(l, w) + 0.5; /* in switching periods */
    long k = (long)floor(at);
    *m = br_line_index(l, k);
    double f = at / (double)l->K;
    *theta = 2.0 * BR_PI * (f - floor(f));
}

int br_line_dir(const br_line *l, long m)
{
    double i = br_line_current(l, m);
    return i > 0.0 ? BR_DIRI_DOWN : i < 0.0 ? BR_DIRI_UP : BR_DIRI_NONE;
}

/* ---- the events of one switching period ----------------------------------
 * Pair j's carrier is delayed by a = (j-1) T/P.  Each carrier takes the
 * duty of the switching period in which its own period begins (a shadow
 * register loaded at its own zero): in common period m, the edges of pair
 * j before a still belong to its period that began in m-1 (duty D[m-1]),
 * those from a on to its period m (duty D[m]).  So every pulse is a whole
 * D T and every dead time stays whole.  Within its own period, starting
 * at o, the pair makes the fixed-duty leg's pulses (br_fcml_switch): the
 * top switch on over [0, D T), the bottom one over [D T + td, T - td),
 * dead times [D T, D T + td) and [T - td, T).  Each edge is placed by its
 * offset in the carrier period it belongs to, so that an edge on a
 * period boundary (td = 0) falls in exactly one common period whatever
 * the rounding. */

static void add_event(br_timing *tm, double t, int sw, int kind)
{
    br_event *e = &tm->ev[tm->nev++];
    e->t = t;
    e->sw = sw;
    e->kind = kind;
}

/* A carrier period: where it begins and ends (the next one's start, so
 * that an edge at its end and the next one's first edge are one instant
 * exactly), and its duty. */
typedef struct frame {
    double o, end, D;
} frame;

static double frame_at(const frame *f, double T, double x)
{
    return x >= T ? f->end : f->o + x;
}

/* Interval [x0, x1) of switch s in carrier period f: its edges that fall
 * in this common period [0, T), and whether it holds t = 0 (after the
 * events there). */
static void frame_interval(br_timing *tm, const frame *f, double x0, double x1, int s,
                           const int kinds[2], br_mask *mask0)
{
    double t0 = frame_at(f, tm->T, x0), t1 = frame_at(f, tm->T, x1);
    if (!(x1 > x0))
        return;
    if (t0 >= 0.0 && t0 < tm->T)
        add_event(tm, t0, s, kinds[0]);
    if (t1 >= 0.0 && t1 < tm->T)
        add_event(tm, t1, s, kinds[1]);
    if (t0 <= 0.0 && 0.0 < t1)
        *mask0 |= 1ULL << s;
}

/* Pair j's carrier period f, for direction dir (which switch conducts in
 * reverse in the dead times: the bottom one stepping down, the top one
 * stepping up). */
static void frame_pair(br_timing *tm, const br_chain *c, int j, const frame *f, int dir)
{
    static const int on[2] = {BR_EV_ON, BR_EV_OFF}, rev[2] = {BR_EV_REV_ON, BR_EV_REV_OFF};
    int P = c->n / 2, top = 2 * P - j, bottom = j - 1;
    double T = c->T, td = c->deadtime, dT = f->D * T;
    frame_interval(tm, f, 0.0, dT, top, on, &tm->on0);
    frame_interval(tm, f, dT + td, T - td, bottom, on, &tm->on0);
    if (td > 0 && dir >= 0) {
        int s = dir == BR_DIRI_DOWN ? bottom : top;
        frame_interval(tm, f, dT, dT + td, s, rev, &tm->rev0);
        frame_interval(tm, f, T - td, T, s, rev, &tm->rev0);
    }
}

void br_timing_line(const br_chain *c, long m, int dir, int held, br_timing *tm)
{
    const br_line *l = &c->line;
    int P = c->n / 2;
    double dc = br_line_duty(l, m), dp = held ? dc : br_line_duty(l, m - 1);
    tm->T = c->T;
    tm->n = c->n;
    tm->nev = 0;
    tm->on0 = tm->rev0 = 0;
    for (int j = 1; j <= P; j++) {
        double a = (j - 1) * c->T / P;
        frame last = {a - c->T, a, dp}, now = {a, a + c->T, dc};
        frame_pair(tm, c, j, &last, dir); /* began in the last period */
        frame_pair(tm, c, j, &now, dir);  /* begins in this one */
    }
    br_timing_sort(c, tm);
}

double br_line_cell_min(const br_chain *c, long *m, int *stage, double *pp)
{
    const br_line *l = &c->line;
    double low = HUGE_VAL, fpp[BR_MAX_FLY + 1];
    *m = -1;
    *stage = -1;
    *pp = 0.0;
    for (long p = 0; p < l->K && c->cfly > 0; p++) {
        br_timing tm;
        int k, dir = br_line_dir(l, p);
        double i = br_line_current(l, p);
        br_timing_line(c, p, dir, 0, &tm);
        br_timing_fly_swing(&tm, fpp);
        for (int j = 1; j < tm.npairs; j++)
            *pp = fmax(*pp, fpp[j] * fabs(i));
        double v = br_timing_cell_min(&tm, c, -i, &k); /* step-up positive */
        if (v < low) {
            low = v;
            *m = p;
            *stage = k;
        }
    }
    return low;
}

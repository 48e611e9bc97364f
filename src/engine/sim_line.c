/* sim_line.c - the simulator on an AC line cycle: every switching period
 * takes its own timing (the duty its carriers took) and its own load
 * current, whose sign sets the direction of the period: which switch of
 * each pair conducts in reverse in the dead times, and the sign of every
 * on-state drop.
 *
 * The simulator's period counter counts switching periods from its reset
 * (the PWM start of a cold start, or the reset instant of a running
 * chain); period p is period p mod K of the line cycle, so a reset starts
 * at line phase 0.  The timing of the next period is built as soon as the
 * counter moves on (after the last event of a period), so that its first
 * event is known; its current and masks take over at that first event,
 * which is the period's start (A1's carrier turns it on there). */
#include "engine/sim_impl.h"

#include <math.h>

/* The line period that counter value per runs. */
static long line_period(const br_sim *s, long per)
{
    return s->ac_hold >= 0 ? s->ac_hold : br_line_index(&s->c->line, per);
}

void br_sim_line_build(br_sim *s, long per)
{
    const br_line *l = &s->c->line;
    long m = line_period(s, per);
    s->ac_m = m;
    s->ac_next = br_line_current(l, m);
    int dir = s->dir0 == BR_DIRI_NONE ? BR_DIRI_NONE : br_line_dir(l, m);
    br_timing_line(s->c, m, dir, s->ac_hold >= 0, &s->tm);
}

void br_sim_line_enter(br_sim *s)
{
    s->ac_i = s->ac_next;
    if (s->dir0 != BR_DIRI_NONE)
        s->dir = br_line_dir(&s->c->line, s->ac_m);
    s->isgn = s->ac_i > 0.0 ? -1.0 : 1.0; /* step-up positive */
    if (s->loaded) {
        s->iamp = fabs(s->ac_i);
        br_sim_load_drops(s);
        s->cell_low = br_timing_cell_min(&s->tm, s->c, s->isgn * s->iamp, &s->cell_stage);
    }
    /* the masks of the new period: its pulses continue those of the last
     * one, and the reverse conduction follows the new direction */
    if (s->pre_idx >= s->npre && !s->frozen) {
        s->cmd = s->tm.on0;
        s->rev = s->tm.rev0;
    }
}

void br_sim_line_reset(br_sim *s)
{
    br_sim_line_build(s, 0);
    br_sim_line_enter(s);
}

void br_sim_line_hold(br_sim *s, long m)
{
    s->ac_hold = s->ac && m >= 0 ? br_line_index(&s->c->line, m) : -1;
}

long br_sim_line_period(const br_sim *s)
{
    return s->ac ? s->ac_m : -1;
}

/* holdup.c - the rails after switching stops. */
#include "analyses/holdup.h"

#include "core/error.h"

#include <math.h>
#include <string.h>

/* Slices of t_max simulated between checks for a dropout: the run ends
 * soon after the first one instead of draining every rail. */
#define HOLDUP_SLICES 64

double br_holdup_load(const br_chain *c, int k)
{
    const br_stage *st = &c->st[k];
    double i = st->drv.iq_on + st->drv.i_iso;
    if (st->aux.kind == BR_AUX_LDO)
        i += st->aux.iq;
    return i;
}

static void on_uvlo(void *ctx, const br_uvlo_event *e)
{
    br_holdup *h = ctx;
    if (e->enabled || h->dropped)
        return;
    h->dropped = 1;
    h->t = e->t;
    h->stage = e->stage;
    h->v_at = e->v;
}

/* Four times the shortest time any loaded rail takes to drain its whole
 * charge at its zero-bias capacitance (the largest a bias table gives):
 * a rail crosses UVLO before that unless its load shrinks. */
static double default_t_max(const br_chain *c, const double *vc)
{
    double t = HUGE_VAL;
    for (int k = 1; k < c->n; k++) {
        double i = br_holdup_load(c, k);
        if (i > 0 && vc[k] > 0)
            t = fmin(t, c->st[k].cap.c * vc[k] / i);
    }
    return isfinite(t) ? 4.0 * t : 1.0;
}

int br_holdup_run(const br_chain *c, const br_steady *ss, br_mask hold_on, double t_max,
                  br_holdup *out, br_error *err)
{
    memset(out, 0, sizeof *out);
    out->dir = ss->dir;
    out->hold_on = hold_on;
    out->stage = -1;
    br_sim *s;
    int rc = br_sim_create(c, ss->dir, BR_INTEG_FAST, &s, err);
    if (rc != BR_OK)
        return rc;
    br_sim_observer obs = {out, on_uvlo, NULL};
    br_sim_set_observer(s, &obs);
    br_sim_reset_running_at(s, ss->x, ss->phase);
    br_sim_vc(s, out->vc0);
    br_sim_freeze(s, hold_on);
    out->t_max = t_max > 0 ? t_max : default_t_max(c, out->vc0);
    for (int i = 1; i <= HOLDUP_SLICES && rc == BR_OK && !out->dropped; i++)
        rc = br_sim_run_until(s, out->t_max * i / HOLDUP_SLICES, err);
    br_sim_free(s);
    return rc;
}

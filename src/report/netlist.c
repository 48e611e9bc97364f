/* netlist.c - the chain as a Berkeley SPICE3 netlist (see the header;
 * docs/spice.md says what it simplifies and why). */
#include "report/netlist.h"

#include "core/error.h"
#include "model/timing.h"

#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define MIN_RAMP 1e-12   /* s: PWL times must rise, so a zero-length edge takes this */
#define R_UVLO_SENSE 1e6 /* ohm: the load of each UVLO state node */
#define PAIRS_PER_LINE 3
#define SAME_INSTANT 1e-9 /* of the period: events closer than this coincide */
#define ZERO_C 273.15     /* K */

/* A writer that remembers the first failure, so rendering reads straight. */
typedef struct nl {
    br_text *out;
    int rc;
} nl;

static void put(nl *w, const char *fmt, ...) __attribute__((format(printf, 2, 3)));

static void put(nl *w, const char *fmt, ...)
{
    char buf[512];
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(buf, sizeof buf, fmt, ap);
    va_end(ap);
    if (w->rc == BR_OK)
        w->rc = br_text_put(w->out, buf);
}

/* Node names: the source of switch k (0 for k = 0) and rail k's top. */
static const char *src_node(int k, char *buf, size_t cap)
{
    if (k == 0)
        snprintf(buf, cap, "0");
    else
        snprintf(buf, cap, "s%d", k);
    return buf;
}

/* ---- a switch's commanded voltage, piecewise linear ------------------------- */

typedef struct pwl {
    nl *w;
    double t0, v0; /* the last point written */
    double t1, v1; /* the next point, not yet written: a ramp's end may move */
    int npts;      /* points written */
    double eps;    /* s: points closer than this are one instant */
} pwl;

static void pwl_emit(pwl *p, double t, double v)
{
    put(p->w, "%s%.12g %.6g", p->npts % PAIRS_PER_LINE == 0 ? "\n+ " : " ", t, v);
    p->npts++;
    p->t0 = t;
    p->v0 = v;
}

/* Head for level v from time t over dur: a ramp still running at t is cut
 * where it stands, as the simulator's switches do. */
static void pwl_ramp(pwl *p, double t, double v, double dur)
{
    double cur = p->v1;
    if (t < p->t1 - p->eps) /* inside the ramp toward (t1, v1) */
        cur = p->v0 + (p->v1 - p->v0) * (t - p->t0) / (p->t1 - p->t0);
    else if (p->t1 > p->t0) /* the last ramp has ended: its end is final */
        pwl_emit(p, p->t1, p->v1);
    if (t > p->t0 + p->eps)
        pwl_emit(p, t, cur);
    p->t1 = fmax(t, p->t0) + fmax(dur, MIN_RAMP);
    p->v1 = v;
}

/* Switch k's voltage with commanded-on mask `on` and reverse mask `rev`
 * (the simulator's targets: on-state drop, reverse drop, blocking). */
static double sw_level(const br_chain *c, int k, int dir, double i, br_mask on, br_mask rev)
{
    if (on >> k & 1)
        return br_sw_on_drop(&c->st[k], dir, i);
    if ((rev >> k & 1) && i > 0.0)
        return -br_sw_rev_drop(&c->st[k].sw, i);
    return c->st[k].vblock;
}

/* An edge takes tedge for a swing of the blocking voltage, less for less
 * (the simulator's ramp rate), all of tedge when nothing is blocked. */
static double ramp_time(const br_chain *c, int k, double dv)
{
    double vb = c->st[k].vblock;
    return vb > 0.0 ? c->tedge * fabs(dv) / vb : c->tedge;
}

static void write_command(nl *w, const br_chain *c, const br_timing *tm, int k,
                          const br_netlist_opts *o)
{
    double i = o->dir == BR_DIRI_NONE ? 0.0 : c->iload;
    br_mask on = tm->on0, rev = tm->rev0;
    double v = sw_level(c, k, o->dir, i, on, rev);
    pwl p = {w, 0.0, v, 0.0, v, 0, SAME_INSTANT * tm->T};
    put(w, "VC%d c%d 0 PWL(", k, k);
    pwl_emit(&p, 0.0, v);
    p.t1 = 0.0;
    for (long m = 0; m < o->periods; m++)
        for (int e = 0; e < tm->nev;) {
            double te = tm->ev[e].t;
            /* every event at this instant (the timing's sums may differ in
             * the last bits for one instant) */
            for (; e < tm->nev && tm->ev[e].t - te <= SAME_INSTANT * tm->T; e++)
                br_event_apply(&tm->ev[e], &on, &rev);
            double lv = sw_level(c, k, o->dir, i, on, rev);
            if (fabs(lv - p.v1) > 1e-12)
                pwl_ramp(&p, (double)m * tm->T + te, lv, ramp_time(c, k, lv - p.v1));
        }
    /* the run ends at tend: a ramp still going is cut there */
    double tend = (double)o->periods * tm->T;
    if (p.t1 > tend) {
        p.v1 = p.v0 + (p.v1 - p.v0) * (tend - p.t0) / (p.t1 - p.t0);
        p.t1 = tend;
    }
    if (p.t1 > p.t0)
        pwl_emit(&p, p.t1, p.v1);
    if (tend > p.t0 + p.eps)
        pwl_emit(&p, tend, p.v1);
    put(w, ")\n");
}

/* Driver k's gate charge: a pulse of Qg/tg for tg at every turn-on of
 * switch k (tg 0: over the edge time, or 1 ns), in amperes per volt of
 * node gK, drawn from rail k while the driver runs, scaled linearly with
 * the rail voltage from the stated drive voltage (as the simulator
 * scales it with the drive voltage). */
static void write_gate(nl *w, const br_chain *c, const br_timing *tm, int k,
                       const br_netlist_opts *o)
{
    const br_sw *sw = &c->st[k].sw;
    double dur = sw->tg > 0.0 ? sw->tg : c->tedge > 0.0 ? c->tedge : 1e-9;
    double h = sw->qg / dur, tend = (double)o->periods * tm->T;
    pwl p = {w, 0.0, 0.0, 0.0, 0.0, 0, SAME_INSTANT * tm->T};
    put(w, "VG%d g%d 0 PWL(", k, k);
    pwl_emit(&p, 0.0, 0.0);
    for (long m = 0; m < o->periods; m++)
        for (int e = 0; e < tm->nev; e++) {
            double t = (double)m * tm->T + tm->ev[e].t;
            /* a pulse that would overlap the last, or outlast the run, is
             * not drawn (a gate pulse is far shorter than a period) */
            if (tm->ev[e].sw != k || tm->ev[e].kind != BR_EV_ON ||
                (p.npts > 1 && t <= p.t0 + p.eps) || t + dur + MIN_RAMP > tend)
                continue;
            if (t > p.t0 + p.eps)
                pwl_emit(&p, t, 0.0);
            pwl_emit(&p, t + MIN_RAMP, h);
            pwl_emit(&p, t + dur, h);
            pwl_emit(&p, t + dur + MIN_RAMP, 0.0);
        }
    if (tend > p.t0 + p.eps)
        pwl_emit(&p, tend, 0.0);
    put(w, ")\n");
    char s[16], scale[64] = "";
    if (sw->qg_v > 0.0)
        snprintf(scale, sizeof scale, "*(V(r%d)-V(%s))/%.6g", k, src_node(k, s, sizeof s),
                 sw->qg_v);
    put(w, "BQG%d r%d %s I=V(u%d)*V(g%d)%s\n", k, k, src_node(k, s, sizeof s), k, k, scale);
}

/* ---- elements --------------------------------------------------------------- */

static void write_supply(nl *w, const br_chain *c)
{
    double tr = fmax(fmax(c->tramp, c->tsoft), MIN_RAMP);
    put(w, "* rail 0: the supply (its current limit is not modelled)\n");
    put(w, "VSUP vs 0 PWL(0 0 %.10g %.6g)\n", tr, c->vsupply);
    put(w, "RSUP vs r0 %.6g\n", fmax(c->rsupply, 1e-6));
    if (c->csupply > 0.0)
        put(w, "CSUP r0 0 %.6g IC=0\n", c->csupply);
}

/* Switch k (k < n-1: its drain is the source of switch k+1): the command
 * while its driver runs, its blocking voltage while the driver is held in
 * UVLO (a switch whose driver is off stays off). */
static void write_switch(nl *w, const br_chain *c, const br_timing *tm, int k,
                         const br_netlist_opts *o)
{
    char s0[16];
    put(w, "* switch %s (%d): blocks %.6g V\n", c->st[k].name, k, c->st[k].vblock);
    write_command(w, c, tm, k, o);
    put(w, "BSW%d s%d %s V=V(u%d)*V(c%d)+(1-V(u%d))*%.6g\n", k, k + 1, src_node(k, s0, sizeof s0),
        k, k, k, c->st[k].vblock);
}

/* Driver k: a hysteretic switch on rail k sets u_k (1 V running, 0 V in
 * UVLO); running it draws iq_on, the isolator's current and its gate
 * charge at each turn-on; its UVLO current is a resistor that draws it
 * at UVLO rising. */
static void write_driver(nl *w, const br_chain *c, const br_timing *tm, int k, int model,
                         const br_netlist_opts *o)
{
    const br_stage *st = &c->st[k];
    char s[16];
    src_node(k, s, sizeof s);
    double run = st->drv.iq_on + st->drv.i_iso;
    put(w, "* driver %d (%s): UVLO %.6g V rising, %.6g V falling\n", k, st->drv.id,
        st->drv.uvlo_rise, st->drv.uvlo_fall);
    put(w, "SUV%d one u%d r%d %s uv%d\n", k, k, k, s, model);
    put(w, "RU%d u%d 0 %.6g\n", k, k, R_UVLO_SENSE);
    put(w, "GRUN%d r%d %s u%d 0 %.6g\n", k, k, s, k, run);
    if (st->drv.iq_off > 0.0 && st->drv.uvlo_rise > 0.0)
        put(w, "RSTB%d r%d %s %.6g\n", k, k, s, st->drv.uvlo_rise / st->drv.iq_off);
    if (st->sw.qg > 0.0)
        write_gate(w, c, tm, k, o);
}

/* Rail k fed by an isolated supply: a DC source on the switch's own
 * source (stepping on at its start), then its diode and resistance.
 * Returns the node the diode starts from. */
static const char *write_injection(nl *w, const br_chain *c, int k, char *from, size_t cap)
{
    const br_stage *st = &c->st[k];
    char s[16];
    src_node(k, s, sizeof s);
    snprintf(from, cap, "i%d", k);
    put(w,
        "* rail %d fed by an isolated supply (injection) of %.6g V from %.6g s; no link from "
        "rail %d\n",
        k, st->vinj, st->tinj, k - 1);
    if (st->tinj > 0.0)
        put(w, "VINJ%d i%d %s PWL(0 0 %.10g 0 %.10g %.6g)\n", k, k, s, st->tinj,
            st->tinj + MIN_RAMP, st->vinj);
    else
        put(w, "VINJ%d i%d %s PWL(0 0 %.10g %.6g)\n", k, k, s, MIN_RAMP, st->vinj);
    return from;
}

/* Link k and rail k (k >= 1): the diode from rail k-1 (or from an
 * injection's source), its resistor plus the return switch's
 * on-resistance, the capacitor behind its ESR. */
static void write_stage(nl *w, const br_chain *c, int k, int model)
{
    const br_stage *st = &c->st[k];
    char s[16], low[16];
    src_node(k, s, sizeof s);
    snprintf(low, sizeof low, "r%d", k - 1);
    if (st->inject)
        write_injection(w, c, k, low, sizeof low);
    double r = st->r_link + (st->inject ? 0.0 : c->st[k - 1].sw.rds_on);
    put(w, "* link %d (%s) and rail %d (%s)\n", k, st->diode.id, k, st->cap.id);
    if (r > 0.0) {
        put(w, "D%d %s a%d dm%d\n", k, low, k, model);
        put(w, "RL%d a%d r%d %.6g\n", k, k, k, r);
    } else {
        put(w, "D%d %s r%d dm%d\n", k, low, k, model);
    }
    double cap = br_cap_at(&st->cap, c->vsupply);
    if (st->cap.esr > 0.0) {
        put(w, "C%d r%d e%d %.6g IC=0\n", k, k, k, cap);
        put(w, "RESR%d e%d %s %.6g\n", k, k, s, st->cap.esr);
    } else {
        put(w, "C%d r%d %s %.6g IC=0\n", k, k, s, cap);
    }
    if (st->aux.id)
        put(w, "* rail %d's %s %s is not in the netlist\n", k,
            st->aux.kind == BR_AUX_LDO ? "regulator" : "clamp", st->aux.id);
}

/* ---- models ---------------------------------------------------------------- */

/* Index of the first stage (from 1) whose diode is part id, i.e. the
 * model it shares. */
static int diode_model(const br_chain *c, int k)
{
    for (int j = 1; j < k; j++)
        if (strcmp(c->st[j].diode.id, c->st[k].diode.id) == 0)
            return j;
    return k;
}

static int driver_model(const br_chain *c, int k)
{
    for (int j = 0; j < k; j++)
        if (strcmp(c->st[j].drv.id, c->st[k].drv.id) == 0)
            return j;
    return k;
}

static const br_diode_part *diode_part(const br_chain *c, const char *id)
{
    for (int j = 0; j < c->design->ndiodes; j++)
        if (strcmp(c->design->diodes[j].id, id) == 0)
            return &c->design->diodes[j];
    return NULL;
}

static void write_models(nl *w, const br_chain *c)
{
    for (int k = 1; k < c->n; k++) {
        if (diode_model(c, k) != k)
            continue;
        const br_diode *d = &c->st[k].diode;
        const br_diode_part *p = diode_part(c, d->id);
        put(w, "* diode %s at %.2f C\n", d->id, c->tamb - ZERO_C);
        put(w, ".model dm%d D(IS=%.6g N=%.6g RS=%.6g CJO=%.6g VJ=%.6g M=%.6g\n", k, d->is, d->n,
            d->rs, d->cj0, d->vj, d->m);
        put(w, "+ TT=%.6g", d->tau);
        if (p)
            put(w, " EG=%.6g XTI=%.6g", p->eg.nom, p->xti.nom);
        if (p && p->bv > 0.0)
            put(w, " BV=%.6g", p->bv);
        if (p && p->ibv > 0.0)
            put(w, " IBV=%.6g", p->ibv);
        put(w, ")\n");
    }
    for (int k = 0; k < c->n; k++) {
        if (driver_model(c, k) != k)
            continue;
        const br_driver *d = &c->st[k].drv;
        put(w, "* UVLO of driver %s: on above %.6g V, off below %.6g V\n", d->id, d->uvlo_rise,
            d->uvlo_fall);
        put(w, ".model uv%d SW(VT=%.6g VH=%.6g RON=1 ROFF=1e12)\n", k,
            0.5 * (d->uvlo_rise + d->uvlo_fall), 0.5 * (d->uvlo_rise - d->uvlo_fall));
    }
}

/* ---- the whole netlist ------------------------------------------------------ */

/* A name for a comment or the title: a control character (a newline in
 * a path) would end the line and start an element. */
static const char *printable(const char *s, char *buf, size_t cap)
{
    size_t n = 0;
    for (; *s && n + 1 < cap; s++)
        buf[n++] = (unsigned char)*s < 0x20 || *s == 0x7f ? '?' : *s;
    buf[n] = '\0';
    return buf;
}

static void write_head(nl *w, const br_chain *c, const br_netlist_opts *o)
{
    static const char *const dirs[] = {"step-down", "step-up"};
    const char *dir = o->dir == BR_DIRI_NONE ? "none" : dirs[o->dir];
    const br_design *d = c->design;
    char name[160], path[160];
    put(w, "bootrung %s netlist of design %s\n", o->version,
        printable(d->name[0] ? d->name : d->path, name, sizeof name));
    put(w, "* From %s. Berkeley SPICE3 syntax; what it leaves out or simplifies:\n",
        printable(d->path, path, sizeof path));
    put(w, "* docs/spice.md of bootrung. Cross-check aid only: these circuits carry\n"
           "* lethal voltages; the netlist does not replace measurement on the board.\n");
    put(w,
        "* %.6g Hz, duty %.6g, dead time %.6g s, edges %.6g s, load current %.6g A "
        "(%s),\n",
        c->fsw, c->duty, c->deadtime, c->tedge, o->dir == BR_DIRI_NONE ? 0.0 : c->iload, dir);
    put(w, "* %ld periods from a cold start, ambient %.2f C.\n", o->periods, c->tamb - ZERO_C);
    put(w, "* Nodes: 0 source of switch 0; sK source of switch K; rK top of rail K\n"
           "* (rail K = V(rK)-V(sK)); cK switch K's command; uK driver K running (1 V);\n"
           "* gK driver K's gate-charge pulses (1 V = 1 A at the stated drive voltage).\n");
    put(w, "VONE one 0 DC 1\n");
}

static void write_tail(nl *w, const br_chain *c, const br_netlist_opts *o)
{
    double tc = c->tamb - ZERO_C;
    put(w, ".options TNOM=%.6g\n.temp %.6g\n", tc, tc);
    put(w, ".tran %.6g %.10g 0 %.6g UIC\n.end\n", c->T / 100.0, (double)o->periods * c->T,
        c->T / 50.0);
}

static int check_opts(const br_chain *c, const br_netlist_opts *o, br_error *err)
{
    static const int carries[] = {BR_DIR_STEP_DOWN, BR_DIR_STEP_UP};
    if (c->line.on)
        return br_error_set(err, BR_EINPUT, c->design->path, c->design->ac.line, "line-cycle",
                            "a netlist holds one switching period repeated, expected a design "
                            "at a DC operating point");
    if (o->periods < 1 || o->periods > BR_NETLIST_MAX_PERIODS)
        return br_error_set(err, BR_EINPUT, NULL, 0, "periods", "%ld, expected 1 to %ld",
                            o->periods, BR_NETLIST_MAX_PERIODS);
    if (o->dir != BR_DIRI_NONE && (o->dir < 0 || o->dir > 1 || !(c->direction & carries[o->dir])))
        return br_error_set(err, BR_EINPUT, NULL, 0, "current",
                            "the design carries no load current that way, expected a direction "
                            "its operating point gives, or none");
    return BR_OK;
}

int br_netlist_render(const br_chain *c, const br_netlist_opts *o, br_text *out, br_error *err)
{
    int rc = check_opts(c, o, err);
    if (rc != BR_OK)
        return rc;
    br_timing *tm = malloc(sizeof *tm);
    if (!tm)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    br_timing_build(c, o->dir, tm);
    nl w = {out, BR_OK};
    write_head(&w, c, o);
    write_supply(&w, c);
    for (int k = 0; k < c->n; k++) {
        if (k + 1 < c->n)
            write_switch(&w, c, tm, k, o);
        write_driver(&w, c, tm, k, driver_model(c, k), o);
        if (k >= 1)
            write_stage(&w, c, k, diode_model(c, k));
    }
    write_models(&w, c);
    write_tail(&w, c, o);
    free(tm);
    if (w.rc != BR_OK)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory writing the netlist");
    return BR_OK;
}

int br_netlist_default_dir(const br_chain *c)
{
    if (c->direction == BR_DIR_NONE || c->iload <= 0.0)
        return BR_DIRI_NONE;
    return c->direction == BR_DIR_STEP_UP ? BR_DIRI_UP : BR_DIRI_DOWN;
}

long br_netlist_default_periods(const br_chain *c)
{
    double p = ceil(c->startup_max / c->T - 1e-9);
    return p < 1.0 ? 1 : p > (double)BR_NETLIST_MAX_PERIODS ? BR_NETLIST_MAX_PERIODS : (long)p;
}

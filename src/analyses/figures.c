/* figures.c - margins and stresses from simulated periods, and the
 * verdict table. */
#include "analyses/figures.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

int br_design_directions(const br_chain *c, int dirs[2])
{
    if (c->line.on) { /* one line cycle, both directions in it */
        dirs[0] = BR_DIRI_LINE;
        return 1;
    }
    switch (c->direction) {
    case BR_DIR_STEP_DOWN:
        dirs[0] = BR_DIRI_DOWN;
        return 1;
    case BR_DIR_STEP_UP:
        dirs[0] = BR_DIRI_UP;
        return 1;
    case BR_DIR_BOTH:
        dirs[0] = BR_DIRI_DOWN;
        dirs[1] = BR_DIRI_UP;
        return 2;
    default:
        dirs[0] = BR_DIRI_NONE;
        return 1;
    }
}

static void rail_figure(const br_chain *c, const br_rail_stats *r, int k, double dt, br_rail_fig *f)
{
    const br_stage *st = &c->st[k];
    f->vmin = r->vmin;
    f->vmax = r->vmax;
    f->vavg = r->vint / dt;
    f->ripple = r->vmax - r->vmin;
    f->vdrv_min = r->vdrv_min;
    f->vdrv_max = r->vdrv_max;
    f->m_uvlo = r->vdrv_min - st->drv.uvlo_fall;
    f->m_restart = r->vdrv_min - st->drv.uvlo_rise;
    f->m_drive = c->min_drive > 0 ? r->vdrv_min - c->min_drive : NAN;
    f->m_gate = st->sw.vgs_max > 0 ? st->sw.vgs_max - r->vdrv_max : NAN;
    f->p_load = r->qload / dt * f->vavg;
    if (k == 0) {
        f->c_eff = f->vcap_peak = f->vcap_rating = f->icap_rms = NAN;
        return;
    }
    f->c_eff = br_cap_at(&st->cap, f->vavg);
    f->vcap_peak = r->vc_max;
    f->vcap_rating = st->cap.vrated;
    f->icap_rms = sqrt(r->icap2 / dt);
}

static void link_figure(const br_chain *c, const br_link_stats *l, int k, double dt, br_link_fig *f)
{
    const br_diode *d = &c->st[k].diode;
    f->vrev_sim = l->vrev_peak;
    /* an injection's diode sees no switching edge: its supply is on the
     * switch's own source */
    f->vrev_stress = l->vrev_peak + (c->st[k].inject ? 0.0 : c->st[k - 1].vblock * c->overshoot);
    f->vrrm = d->vrrm;
    f->share = d->vrrm > 0 ? f->vrev_stress / d->vrrm : 0.0;
    f->iavg = l->q / dt;
    f->irms = sqrt(l->i2 / dt);
    f->ipeak = l->ipeak;
    f->idisp = l->dpeak;
    f->qrr = l->qrr * (c->T / dt);
    f->irrm = l->irrm;
    f->p_cond = l->e_cond / dt;
    f->p_rr = l->e_rr / dt;
}

double br_rail_loss_sum(const br_rail_loss *r)
{
    return r->run + r->iso + r->standby + r->gate + r->regulator + r->clamp + r->esr;
}

double br_link_loss_sum(const br_link_loss *l)
{
    return l->cond + l->recovery + l->leakage + l->junction + l->resistor + l->sw;
}

/* The driver's running and isolator currents flow together while it
 * runs: their energy splits in the ratio of the currents. */
static void rail_loss(const br_stage *st, const br_rail_stats *r, double dt, br_rail_loss *out)
{
    double ion = st->drv.iq_on, iiso = st->drv.i_iso, both = ion + iiso;
    out->run = both > 0 ? r->e_run * ion / both / dt : 0.0;
    out->iso = both > 0 ? r->e_run * iiso / both / dt : 0.0;
    out->standby = r->e_standby / dt;
    out->gate = r->e_gate / dt;
    /* without a regulator the loads see the rail itself: nothing between */
    out->regulator =
        st->aux.kind == BR_AUX_LDO ? (r->e_load - r->e_run - r->e_standby - r->e_gate) / dt : 0.0;
    out->clamp = r->e_clamp / dt;
    out->esr = st->cap.esr * r->icap2 / dt;
}

static void link_loss(const br_link_stats *l, double dt, br_link_loss *out)
{
    out->cond = l->e_cond / dt;
    out->recovery = l->e_rr / dt;
    out->leakage = l->e_leak / dt;
    out->junction = (l->e_other - l->e_leak) / dt;
    out->resistor = l->e_res / dt;
    out->sw = l->e_sw / dt;
    out->stage = l->e_stage / dt;
}

void br_budget_make(const br_chain *c, const br_stats *st, br_budget *b)
{
    double dt = st->t1 - st->t0;
    memset(b, 0, sizeof *b);
    b->supply = st->esupply / dt;
    b->rsupply = st->e_rsupply / dt;
    b->stored = st->e_stored / dt;
    b->losses = b->rsupply;
    for (int k = 0; k < c->n; k++) {
        rail_loss(&c->st[k], &st->rail[k], dt, &b->rail[k]);
        if (k == 0)
            b->rail[0].esr = 0.0; /* the supply rail: its resistance is the supply's */
        b->losses += br_rail_loss_sum(&b->rail[k]);
        if (k == 0)
            continue;
        link_loss(&st->link[k], dt, &b->link[k]);
        b->losses += br_link_loss_sum(&b->link[k]);
        if (c->st[k].inject)
            b->inject -= b->link[k].stage;
        else
            b->stage -= b->link[k].stage;
    }
    b->balance = b->supply + b->stage + b->inject - b->losses - b->stored;
}

int br_avg_within(double avg, double vmin, double vmax)
{
    /* the extremes are taken at the integrator's points and the average
     * is its quadrature: they agree to far better than a hundredth of the
     * ripple plus a part in a million */
    double tol = 1e-6 * fmax(fabs(vmin), fabs(vmax)) + 0.01 * (vmax - vmin) + 1e-9;
    return avg >= vmin - tol && avg <= vmax + tol;
}

/* Every figure NaN: a failed simulation has none. */
static void no_figures(const br_chain *c, br_steady_figs *out)
{
    for (int k = 0; k < c->n; k++) {
        double *r = (double *)&out->rail[k], *l = (double *)&out->link[k];
        for (size_t i = 0; i < sizeof out->rail[k] / sizeof(double); i++)
            r[i] = NAN;
        for (size_t i = 0; k > 0 && i < sizeof out->link[k] / sizeof(double); i++)
            l[i] = NAN;
        out->link[k].runaway = 0;
    }
    out->supply_iavg = out->supply_p = out->supply_ipeak = NAN;
    out->supply_limited = out->supply_stretch = NAN;
}

/* Dissipation and temperature of every regulator, clamp and link diode. */
static void heat_figures(const br_chain *c, const br_steady *ss, br_steady_figs *out)
{
    const br_budget *b = &out->budget;
    for (int k = 0; k < c->n; k++) {
        const br_aux *a = &c->st[k].aux;
        br_rail_fig *r = &out->rail[k];
        /* rail 0 is the supply: a clamp there is not modelled, a regulator is */
        int modelled = a->kind == BR_AUX_LDO || (a->kind == BR_AUX_ZENER && k > 0);
        r->p_aux = b->rail[k].regulator + b->rail[k].clamp;
        r->tj_aux = modelled && a->rth > 0 ? c->tamb + a->rth * fmax(r->p_aux, 0.0) : NAN;
        if (k == 0)
            continue;
        const br_link_loss *l = &b->link[k];
        br_link_fig *f = &out->link[k];
        f->p_diode = l->cond + l->recovery + l->leakage + l->junction;
        f->tj = ss->thermal ? ss->tj[k] : c->st[k].diode.tj;
        f->runaway = ss->thermal ? ss->runaway[k] : 0;
        f->onset_amb = ss->thermal ? ss->onset_amb[k] : HUGE_VAL;
    }
}

void br_steady_figures(const br_chain *c, const br_steady *ss, br_steady_figs *out)
{
    memset(out, 0, sizeof *out);
    out->dir = ss->dir;
    out->ss = ss;
    out->n = c->n;
    out->bad_rail = -1;
    if (!br_steady_has_period(ss)) {
        no_figures(c, out);
        return;
    }
    double dt = ss->stats.t1 - ss->stats.t0;
    for (int k = 0; k < c->n; k++) {
        const br_rail_fig *r = &out->rail[k];
        rail_figure(c, &ss->stats.rail[k], k, dt, &out->rail[k]);
        if (out->bad_rail < 0 && !br_avg_within(r->vavg, r->vmin, r->vmax))
            out->bad_rail = k;
        if (k > 0)
            link_figure(c, &ss->stats.link[k], k, dt, &out->link[k]);
    }
    out->supply_iavg = ss->stats.qsupply / dt;
    out->supply_p = ss->stats.esupply / dt;
    out->supply_ipeak = ss->stats.isup_peak;
    out->supply_limited = ss->stats.t_limit / dt;
    out->supply_stretch = ss->stats.lim_stretch;
    br_budget_make(c, &ss->stats, &out->budget);
    heat_figures(c, ss, out);
}

/* ---- verdict ------------------------------------------------------------- */

static const char *const NAMES[BR_CRIT_COUNT] = {[BR_CRIT_STARTUP] = "startup",
                                                 [BR_CRIT_INRUSH] = "inrush",
                                                 [BR_CRIT_DROPOUTS] = "dropouts",
                                                 [BR_CRIT_SUPPLY_START] = "supply-startup",
                                                 [BR_CRIT_STEADY] = "steady-state",
                                                 [BR_CRIT_RESTART] = "restart",
                                                 [BR_CRIT_UVLO] = "uvlo",
                                                 [BR_CRIT_DRIVE] = "drive",
                                                 [BR_CRIT_GATE] = "gate",
                                                 [BR_CRIT_DIODE_VR] = "diode-reverse",
                                                 [BR_CRIT_CAP_V] = "capacitor-voltage",
                                                 [BR_CRIT_SUPPLY] = "supply",
                                                 [BR_CRIT_HEADROOM] = "headroom",
                                                 [BR_CRIT_AUX_POWER] = "regulator-power",
                                                 [BR_CRIT_DIODE_IAVG] = "diode-current",
                                                 [BR_CRIT_CAP_RIPPLE] = "capacitor-ripple",
                                                 [BR_CRIT_TJ] = "junction-temperature"};
/* Each criterion's one name in every report (docs/glossary.md); NAMES
 * are the keys of the result files. */
static const char *const TITLES[BR_CRIT_COUNT] = {[BR_CRIT_STARTUP] = "start-up time",
                                                  [BR_CRIT_INRUSH] = "link inrush",
                                                  [BR_CRIT_DROPOUTS] = "start-up dropouts",
                                                  [BR_CRIT_SUPPLY_START] =
                                                      "supply start-up average",
                                                  [BR_CRIT_STEADY] = "periodic steady state",
                                                  [BR_CRIT_RESTART] = "above UVLO rising",
                                                  [BR_CRIT_UVLO] = "above UVLO falling",
                                                  [BR_CRIT_DRIVE] = "above minimum drive",
                                                  [BR_CRIT_GATE] = "below gate maximum",
                                                  [BR_CRIT_DIODE_VR] = "diode reverse stress",
                                                  [BR_CRIT_CAP_V] = "capacitor voltage",
                                                  [BR_CRIT_SUPPLY] = "supply average current",
                                                  [BR_CRIT_HEADROOM] = "regulator headroom",
                                                  [BR_CRIT_AUX_POWER] = "regulator/clamp power",
                                                  [BR_CRIT_DIODE_IAVG] = "diode average current",
                                                  [BR_CRIT_CAP_RIPPLE] = "capacitor ripple current",
                                                  [BR_CRIT_TJ] = "junction temperature"};
static const char *const UNITS[BR_CRIT_COUNT] = {[BR_CRIT_STARTUP] = "s",
                                                 [BR_CRIT_INRUSH] = "A",
                                                 [BR_CRIT_DROPOUTS] = "",
                                                 [BR_CRIT_STEADY] = "V",
                                                 [BR_CRIT_RESTART] = "V",
                                                 [BR_CRIT_UVLO] = "V",
                                                 [BR_CRIT_DRIVE] = "V",
                                                 [BR_CRIT_GATE] = "V",
                                                 [BR_CRIT_DIODE_VR] = "V",
                                                 [BR_CRIT_CAP_V] = "V",
                                                 [BR_CRIT_SUPPLY_START] = "A",
                                                 [BR_CRIT_SUPPLY] = "A",
                                                 [BR_CRIT_HEADROOM] = "V",
                                                 [BR_CRIT_AUX_POWER] = "W",
                                                 [BR_CRIT_DIODE_IAVG] = "A",
                                                 [BR_CRIT_CAP_RIPPLE] = "A",
                                                 [BR_CRIT_TJ] = "K"};

const char *br_crit_name(int crit)
{
    return crit >= 0 && crit < BR_CRIT_COUNT ? NAMES[crit] : "?";
}
const char *br_crit_title(int crit)
{
    return crit >= 0 && crit < BR_CRIT_COUNT ? TITLES[crit] : "?";
}
const char *br_crit_unit(int crit)
{
    return crit >= 0 && crit < BR_CRIT_COUNT ? UNITS[crit] : "";
}

int br_crit_is_startup(int crit)
{
    return crit == BR_CRIT_STARTUP || crit == BR_CRIT_INRUSH || crit == BR_CRIT_DROPOUTS ||
           crit == BR_CRIT_SUPPLY_START;
}

int br_crit_never(int crit, double value)
{
    return (crit == BR_CRIT_STARTUP || crit == BR_CRIT_TJ) && isinf(value);
}

/* Keep the row with the smallest margin; returns 1 when it took this one. */
static int consider(br_verdict_row *r, double figure, double limit, double margin, int stage,
                    int dir)
{
    /* a figure that is not a number decides nothing; a NaN margin with a
     * finite figure is a limit that is not set */
    if (!isfinite(figure) || isinf(margin)) {
        if (!r->undetermined)
            snprintf(r->note, sizeof r->note, "a figure is not finite (stage %d): not decided",
                     stage);
        r->undetermined = 1;
        return 0;
    }
    if (isnan(margin))
        return 0;
    if (r->applies && margin >= r->margin)
        return 0;
    r->applies = 1;
    r->figure = figure;
    r->limit = limit;
    r->margin = margin;
    r->stage = stage;
    r->dir = dir;
    r->line_theta = NAN;
    r->line_period = -1;
    return 1;
}

/* A row a line cycle's steady state just set binds in window w of it. */
static void line_at(const br_chain *c, const br_steady *ss, long w, br_verdict_row *r)
{
    if (ss->dir != BR_DIRI_LINE || !c->line.on || w < 0)
        return;
    br_line_window(&c->line, c->T, ss->phase, w, &r->line_theta, &r->line_period);
}

/* ---- inrush ---------------------------------------------------------------- */

const char *br_rating_name(int rating)
{
    static const char *const names[BR_RATING_COUNT] = {"IFRM", "IFSM", "I2t"};
    return rating >= 0 && rating < BR_RATING_COUNT ? names[rating] : "?";
}

static void add_check(br_inrush_check *ck, int *n, int rating, double figure, double limit)
{
    ck[*n].rating = rating;
    ck[*n].figure = figure;
    ck[*n].limit = limit;
    ck[*n].margin = limit - figure;
    (*n)++;
}

int br_inrush_link(const br_chain *c, const br_startup *su, int k, br_inrush_check *ck, int *bind)
{
    const br_diode *d = &c->st[k].diode;
    double ip = su->st[k].ipeak, i2 = su->st[k].i2t;
    int n = 0;
    /* start-up pulses repeat at the switching frequency: every one of them,
     * the largest included, is a repetitive peak */
    if (d->ifrm > 0)
        add_check(ck, &n, BR_RATING_IFRM, ip, d->ifrm);
    /* the single-surge rating still bounds the largest pulse alone */
    if (d->ifsm > 0)
        add_check(ck, &n, BR_RATING_IFSM, ip, d->ifsm);
    /* pulses microseconds apart heat the die as one surge: the whole
     * start-up's i^2 against the rating (a current scaled by a scales i^2
     * by a^2, hence the square root) */
    if (d->i2t > 0 && i2 > 0) /* no current at all cannot break it */
        add_check(ck, &n, BR_RATING_I2T, ip, ip * sqrt(d->i2t / i2));
    int b = 0;
    for (int i = 1; i < n; i++)
        if (ck[i].margin < ck[b].margin)
            b = i;
    if (bind)
        *bind = n > 0 ? b : -1;
    return n;
}

/* Append to the row's note (snprintf keeps it terminated when full). */
static void note_add(br_verdict_row *r, const char *a, const char *b)
{
    size_t n = strlen(r->note);
    if (n + 1 < sizeof r->note)
        snprintf(r->note + n, sizeof r->note - n, "%s%s", a, b);
}

/* Which ratings the inrush row used, and the one that binds it. */
static void inrush_note(const br_chain *c, unsigned used, const br_inrush_check *b, int link,
                        br_verdict_row *r)
{
    static const char *const role[BR_RATING_COUNT] = {" (every pulse)", " (the largest pulse)",
                                                      " (i^2 over the whole start-up)"};
    int count = 0, total = 0;
    for (int i = 0; i < BR_RATING_COUNT; i++)
        total += used >> i & 1;
    snprintf(r->note, sizeof r->note, "judged against");
    for (int i = 0; i < BR_RATING_COUNT; i++)
        if (used >> i & 1) {
            note_add(r, count == 0 ? " " : count == total - 1 ? " and " : ", ", br_rating_name(i));
            note_add(r, role[i], "");
            count++;
        }
    if (!(used & (1u << BR_RATING_IFRM)))
        note_add(r, ", no IFRM given", "");
    note_add(r, "; binds: ", br_rating_name(b->rating));
    note_add(r, " of diode ", c->st[link].diode.id);
}

static void inrush_row(const br_chain *c, const br_startup *su, br_verdict *v)
{
    br_verdict_row *r = &v->row[BR_CRIT_INRUSH];
    br_inrush_check best = {0, 0, 0, INFINITY};
    unsigned used = 0;
    int link = -1;
    for (int k = 1; k < c->n; k++) {
        br_inrush_check ck[BR_RATING_COUNT];
        const br_diode *d = &c->st[k].diode;
        int b, n = br_inrush_link(c, su, k, ck, &b);
        used |= (d->ifrm > 0 ? 1u << BR_RATING_IFRM : 0) |
                (d->ifsm > 0 ? 1u << BR_RATING_IFSM : 0) | (d->i2t > 0 ? 1u << BR_RATING_I2T : 0);
        if (n > 0) {
            consider(r, ck[b].figure, ck[b].limit, ck[b].margin, k, su->dir);
            if (ck[b].margin < best.margin || link < 0) {
                best = ck[b];
                link = k;
            }
        }
    }
    if (!r->applies && !r->undetermined) {
        snprintf(r->note, sizeof r->note, "no diode gives IFRM, IFSM or I2t");
        return;
    }
    if (link > 0 && !r->undetermined)
        inrush_note(c, used, &best, link, r);
}

/* A start-up the integrator could not finish decides none of its rows
 * (a row whose rating the design does not give stays not applicable). */
static void startup_failed(const br_chain *c, const br_startup *su, br_verdict *v)
{
    for (int i = 0; i < BR_CRIT_COUNT; i++) {
        if (!br_crit_is_startup(i) || (i == BR_CRIT_SUPPLY_START && !(c->irating > 0)))
            continue;
        v->row[i].undetermined = 1;
        snprintf(v->row[i].note, sizeof v->row[i].note, "%.255s", su->why);
    }
}

/* The stage whose driver started for good last (what sets the time). */
static int last_started(const br_startup *su)
{
    int last = 0;
    for (int k = 0; k < su->n; k++)
        if (su->st[k].final_enable >= su->st[last].final_enable)
            last = k;
    return last;
}

/* A rail that never starts has no start-up time: the figure is infinite,
 * not the time simulated, so no margin is shown and every search ranks it
 * below any start that is merely late.  The note says where the rail
 * settles against what its driver needs. */
static void never_starts(const br_chain *c, const br_startup *su, br_verdict_row *r)
{
    int k = su->first_stalled >= 0 && su->first_stalled < c->n ? su->first_stalled : 0;
    double vneed = br_rail_start_voltage(c, k), vend = su->st[k].vend;
    r->applies = 1;
    r->pass = 0;
    r->figure = HUGE_VAL;
    r->limit = c->startup_max;
    r->margin = -HUGE_VAL;
    r->stage = k;
    r->dir = su->dir;
    if (!isfinite(vneed))
        snprintf(r->note, sizeof r->note,
                 "rail %d (%s) never starts: its regulator's output is below UVLO rising", k,
                 c->st[k].name);
    else if (vend >= vneed)
        snprintf(r->note, sizeof r->note,
                 "rail %d (%s) never starts: at %.3f V, above the %.3f V it needs, its driver "
                 "dropped out %d times",
                 k, c->st[k].name, vend, vneed, su->st[k].ndropouts);
    else
        snprintf(r->note, sizeof r->note,
                 "rail %d (%s) never starts: it settles at %.3f V, %.3f V below the %.3f V its "
                 "driver needs",
                 k, c->st[k].name, vend, vneed - vend, vneed);
}

/* The stage with the most start-up dropouts against the design's limit,
 * or against the warning level when it states none (then it only warns). */
static void dropout_row(const br_chain *c, const br_startup *su, br_verdict_row *r)
{
    int most = 0;
    for (int k = 1; k < su->n; k++)
        if (su->st[k].ndropouts > su->st[most].ndropouts)
            most = k;
    int n = su->st[most].ndropouts, stated = c->max_dropouts >= 0;
    int limit = stated ? c->max_dropouts : BR_DROPOUTS_WARN;
    r->applies = 1;
    r->figure = n;
    r->limit = limit;
    r->margin = (double)limit - n;
    r->stage = n > 0 ? most : -1;
    r->dir = su->dir;
    r->pass = !stated || n <= limit;
    r->warn = !stated && n > limit;
    if (n == 0)
        snprintf(r->note, sizeof r->note, "no driver dropped out during the start-up");
    else
        snprintf(r->note, sizeof r->note,
                 "rail %d (%s) dropped out %d times during the start-up, the most of any stage; "
                 "%s %d",
                 most, c->st[most].name, n,
                 stated ? "the design allows" : "no limit stated, a warning above", limit);
}

static const char *dir_word(int dir);

/* What the start-up asks of the supply on average, against its rating:
 * a supply gives its rated current for good, so a start-up that needs
 * more on average works it above its rating (the peak is the current
 * limit's business, or the supply's own when the design gives none). */
static void supply_start_row(const br_chain *c, const br_startup *su, br_verdict_row *r)
{
    const br_supply_profile *p = &su->supply;
    if (!(c->irating > 0))
        return;
    consider(r, p->iavg, c->irating, c->irating - p->iavg, -1, su->dir);
    if (r->undetermined)
        return;
    int n = snprintf(r->note, sizeof r->note,
                     "average %.4g A over the %.4g ms start-up (%.4g mC), peak %.4g A", p->iavg,
                     p->span * 1e3, p->charge * 1e3, p->ipeak);
    if (c->limit_mode == BR_SUPPLY_UNLIMITED)
        snprintf(r->note + n, sizeof r->note - (size_t)n,
                 "; the supply is taken to give any current (no current-limit given): give its "
                 "current-limit to simulate what it does at its limit");
    else if (p->t_limit > 0)
        snprintf(r->note + n, sizeof r->note - (size_t)n, "; %.4g ms in its current limit%s",
                 p->t_limit * 1e3, p->trips ? ", with hiccups" : "");
}

static void startup_rows(const br_chain *c, const br_startup *su, br_verdict *v)
{
    br_verdict_row *r = &v->row[BR_CRIT_STARTUP];
    if (su->failed) {
        startup_failed(c, su, v);
        return;
    }
    if (su->complete) {
        consider(r, su->t_total, c->startup_max, c->startup_max - su->t_total, last_started(su),
                 su->dir);
        r->pass = su->t_total <= c->startup_max;
    } else {
        never_starts(c, su, r);
    }
    dropout_row(c, su, &v->row[BR_CRIT_DROPOUTS]);
    inrush_row(c, su, v);
    supply_start_row(c, su, &v->row[BR_CRIT_SUPPLY_START]);
}

/* The steady state is trusted when the cross-check periods move the rails
 * by no more than 0.1 mV each. */
#define DRIFT_LIMIT 1e-4

int br_crit_has_margin(int crit)
{
    return crit >= 0 && crit < BR_CRIT_COUNT && crit != BR_CRIT_STEADY;
}

/* A direction whose steady state the solver settled and trusts. */
static int settled(const br_steady *ss)
{
    return ss->converged && ss->drift <= DRIFT_LIMIT;
}

/* Stage k's regulator headroom and dissipation, its link's average
 * current and its capacitor's ripple current, each against its rating. */
static void rating_rows(const br_chain *c, const br_steady_figs *f, int k, br_verdict *v)
{
    const br_stage *st = &c->st[k];
    const br_rail_fig *rf = &f->rail[k];
    if (st->aux.kind == BR_AUX_LDO) {
        double need = st->aux.vout + st->aux.dropout;
        consider(&v->row[BR_CRIT_HEADROOM], rf->vmin, need, rf->vmin - need, k, f->dir);
    }
    if ((st->aux.kind == BR_AUX_LDO || (st->aux.kind == BR_AUX_ZENER && k > 0)) && st->aux.pmax > 0)
        consider(&v->row[BR_CRIT_AUX_POWER], rf->p_aux, st->aux.pmax, st->aux.pmax - rf->p_aux, k,
                 f->dir);
    if (k == 0)
        return;
    const br_link_fig *lf = &f->link[k];
    if (st->diode.if_avg > 0)
        consider(&v->row[BR_CRIT_DIODE_IAVG], lf->iavg, st->diode.if_avg,
                 st->diode.if_avg - lf->iavg, k, f->dir);
    if (st->cap.iripple > 0)
        consider(&v->row[BR_CRIT_CAP_RIPPLE], rf->icap_rms, st->cap.iripple,
                 st->cap.iripple - rf->icap_rms, k, f->dir);
}

/* A supply that hiccups once held in its limit for hiccup-delay cannot
 * stay there in steady state: it turns off. */
static int supply_hiccups(const br_chain *c, const br_steady_figs *f)
{
    double period = f->ss->stats.t1 - f->ss->stats.t0;
    if (c->limit_mode != BR_SUPPLY_HICCUP || !(f->supply_limited > 0))
        return 0;
    return f->supply_stretch >= period * (1.0 - 1e-9) || f->supply_stretch >= c->hiccup_delay;
}

/* Each injection with a rating: its mean current in steady state (its
 * link's) against it, as the supply's; the row binds at the rail it
 * feeds where an injection has the least margin. */
static void injections_row(const br_chain *c, const br_steady_figs *f, br_verdict_row *r)
{
    if (r->applies && r->margin == -HUGE_VAL)
        return; /* the supply turns off: nothing else matters */
    for (int k = 1; k < c->n; k++) {
        const br_stage *st = &c->st[k];
        if (!st->inject || !(st->inj_rating > 0))
            continue;
        double i = f->link[k].iavg;
        if (consider(r, i, st->inj_rating, st->inj_rating - i, k, f->dir))
            snprintf(r->note, sizeof r->note,
                     "the injection into rail %d (%s) gives %.4g A on average in steady state "
                     "against its rating %.4g A",
                     k, st->name, i, st->inj_rating);
    }
}

static void supply_row(const br_chain *c, const br_steady_figs *f, br_verdict_row *r)
{
    if (supply_hiccups(c, f)) {
        r->applies = 1;
        r->pass = 0;
        r->figure = f->supply_iavg;
        r->limit = c->irating > 0 ? c->irating : NAN;
        r->margin = -HUGE_VAL; /* below every passing point, whatever its rating */
        r->stage = -1;
        r->dir = f->dir;
        snprintf(r->note, sizeof r->note,
                 "the supply sits in its current limit (%.4g A) %.0f %% of the steady period, "
                 "longer than its hiccup-delay: it turns off and the chain with it",
                 c->ilimit, 100.0 * f->supply_limited);
        return;
    }
    if (c->irating > 0 && !(r->applies && r->margin == -HUGE_VAL))
        consider(r, f->supply_iavg, c->irating, c->irating - f->supply_iavg, -1, f->dir);
    injections_row(c, f, r);
}

/* A link that runs away has no temperature: it fails whatever else. */
static void runaway_row(const br_chain *c, const br_steady_figs *f, int k, br_verdict_row *r)
{
    const br_link_fig *l = &f->link[k];
    r->applies = 1;
    r->pass = 0;
    r->figure = HUGE_VAL;
    r->limit = c->st[k].diode.tj_max > 0 ? c->st[k].diode.tj_max : NAN;
    r->margin = -HUGE_VAL;
    r->stage = k;
    r->aux = 0;
    r->dir = f->dir;
    snprintf(r->note, sizeof r->note,
             "link %d (%s) runs away: no junction temperature balances its losses behind "
             "%.4g K/W at a %.1f degC ambient; it runs away from an ambient of %.1f degC up",
             k, c->st[k].name, c->st[k].diode.rth, c->tamb - 273.15, l->onset_amb - 273.15);
}

static int is_runaway(const br_verdict_row *r)
{
    return r->applies && r->margin == -HUGE_VAL;
}

/* Junction temperatures: link diodes with a thermal resistance (from the
 * steady state at their temperatures), regulators and clamps with one. */
static void tj_rows(const br_chain *c, const br_steady_figs *f, br_verdict_row *r)
{
    if (f->ss->thermal && !f->ss->thermal_settled && !r->undetermined) {
        r->undetermined = 1;
        snprintf(r->note, sizeof r->note,
                 "the junction temperatures did not settle within %d passes (current %s)",
                 BR_THERMAL_PASSES, dir_word(f->dir));
    }
    for (int k = 0; k < c->n; k++) {
        const br_aux *a = &c->st[k].aux;
        double ta = f->rail[k].tj_aux;
        if (isfinite(ta) && a->tj_max > 0 && !is_runaway(r)) {
            consider(r, ta, a->tj_max, a->tj_max - ta, k, f->dir);
            if (r->stage == k && r->figure == ta && r->limit == a->tj_max)
                r->aux = 1; /* it binds now */
        }
        if (k == 0 || !(c->st[k].diode.rth > 0))
            continue;
        const br_link_fig *l = &f->link[k];
        double tmax = c->st[k].diode.tj_max;
        if (l->runaway && !is_runaway(r))
            runaway_row(c, f, k, r);
        else if (!l->runaway && tmax > 0 && !is_runaway(r)) {
            consider(r, l->tj, tmax, tmax - l->tj, k, f->dir);
            if (r->stage == k && r->figure == l->tj && r->limit == tmax)
                r->aux = 0;
        }
    }
}

static void steady_rows(const br_chain *c, const br_steady_figs *f, br_verdict *v)
{
    supply_row(c, f, &v->row[BR_CRIT_SUPPLY]);
    tj_rows(c, f, &v->row[BR_CRIT_TJ]);
    const br_steady *ss = f->ss;
    for (int k = 0; k < c->n; k++) {
        const br_rail_fig *rf = &f->rail[k];
        const br_stage *st = &c->st[k];
        br_verdict_row *row = v->row;
        if (consider(&row[BR_CRIT_RESTART], rf->vdrv_min, st->drv.uvlo_rise, rf->m_restart, k,
                     f->dir))
            line_at(c, ss, ss->at_dmin[k], &row[BR_CRIT_RESTART]);
        if (consider(&row[BR_CRIT_UVLO], rf->vdrv_min, st->drv.uvlo_fall, rf->m_uvlo, k, f->dir))
            line_at(c, ss, ss->at_dmin[k], &row[BR_CRIT_UVLO]);
        if (consider(&row[BR_CRIT_DRIVE], rf->vdrv_min, c->min_drive, rf->m_drive, k, f->dir))
            line_at(c, ss, ss->at_dmin[k], &row[BR_CRIT_DRIVE]);
        if (consider(&row[BR_CRIT_GATE], rf->vdrv_max, st->sw.vgs_max, rf->m_gate, k, f->dir))
            line_at(c, ss, ss->at_dmax[k], &row[BR_CRIT_GATE]);
        if (k == 0)
            continue;
        const br_link_fig *lf = &f->link[k];
        double lim_v = c->derating * lf->vrrm;
        if (lf->vrrm > 0 && consider(&row[BR_CRIT_DIODE_VR], lf->vrev_stress, lim_v,
                                     lim_v - lf->vrev_stress, k, f->dir))
            line_at(c, ss, ss->at_vrev[k], &row[BR_CRIT_DIODE_VR]);
        if (rf->vcap_rating > 0 && consider(&row[BR_CRIT_CAP_V], rf->vcap_peak, rf->vcap_rating,
                                            rf->vcap_rating - rf->vcap_peak, k, f->dir))
            line_at(c, ss, ss->at_vcap[k], &row[BR_CRIT_CAP_V]);
        rating_rows(c, f, k, v);
    }
}

/* A decided row of a line cycle says where in it it binds: the line
 * phase, and the duty and current of the switching period there. */
static void line_note(const br_chain *c, br_verdict_row *r)
{
    if (r->line_period < 0 || r->undetermined || r->note[0] || !r->applies)
        return;
    double i = br_line_current(&c->line, r->line_period);
    snprintf(r->note, sizeof r->note,
             "binds at line phase %.1f deg: switching period %ld of %ld, duty %.3f, current "
             "%.3g A (%s)",
             r->line_theta * 180.0 / BR_PI, r->line_period, c->line.K,
             br_line_duty(&c->line, r->line_period), i,
             i > 0   ? "step-down"
             : i < 0 ? "step-up"
                     : "none");
}

/* An undetermined row stays undetermined unless trustworthy data make it
 * fail anyway; without any data its numbers are NaN (printed "n/a"). */
static void settle_row(br_verdict_row *r)
{
    if (!r->undetermined)
        return;
    if (r->applies && !r->pass) {
        r->undetermined = 0; /* a real failure elsewhere decides it */
        return;
    }
    if (!r->applies) {
        r->figure = r->limit = r->margin = NAN;
        r->stage = -1;
        r->dir = BR_DIRI_NONE;
    }
    r->applies = 1;
    r->pass = 0;
}

static void finish_rows(br_verdict *v)
{
    static const char *why[BR_CRIT_COUNT] = {
        [BR_CRIT_DRIVE] = "no minimum drive voltage set",
        [BR_CRIT_GATE] = "no gate maximum given",
        [BR_CRIT_DIODE_VR] = "no diode voltage rating given",
        [BR_CRIT_CAP_V] = "no capacitor rating given",
        [BR_CRIT_SUPPLY_START] = "no supply rating given",
        [BR_CRIT_SUPPLY] = "no supply rating given",
        [BR_CRIT_HEADROOM] = "no rail has a regulator",
        [BR_CRIT_AUX_POWER] = "no regulator or clamp gives a power-rating",
        [BR_CRIT_DIODE_IAVG] = "no diode gives an if-avg rating",
        [BR_CRIT_CAP_RIPPLE] = "no capacitor gives a ripple rating",
        [BR_CRIT_TJ] = "no part gives both a thermal resistance and a tj-max, and none runs "
                       "away"};
    for (int i = 0; i < BR_CRIT_COUNT; i++) {
        br_verdict_row *r = &v->row[i];
        r->crit = i;
        r->unit = UNITS[i];
        /* the start-up time, the steady state and the dropouts set their own */
        if (i != BR_CRIT_STARTUP && i != BR_CRIT_STEADY && i != BR_CRIT_DROPOUTS && r->applies)
            r->pass = r->margin >= 0;
        settle_row(r);
        if (!r->applies && !r->note[0] && why[i])
            snprintf(r->note, sizeof r->note, "%s", why[i]);
        r->warn = r->warn && r->applies && r->pass && !r->undetermined;
        v->nundetermined += r->undetermined;
        v->nfail += r->applies && !r->pass && !r->undetermined;
        v->nwarn += r->warn;
    }
    v->all_pass = v->nfail == 0 && v->nundetermined == 0;
}

static const char *dir_word(int dir)
{
    return dir == BR_DIRI_DOWN   ? "step-down"
           : dir == BR_DIRI_UP   ? "step-up"
           : dir == BR_DIRI_LINE ? "line-cycle"
                                 : "idealised";
}

/* Whether a steady row can apply at all: a limit the design does not
 * give leaves its row "not applicable" whatever the solver does. */
static int can_apply(const br_chain *c, int crit)
{
    int any = 0;
    for (int k = 0; k < c->n && !any; k++) {
        const br_stage *st = &c->st[k];
        any = crit == BR_CRIT_DRIVE      ? c->min_drive > 0
              : crit == BR_CRIT_GATE     ? st->sw.vgs_max > 0
              : crit == BR_CRIT_DIODE_VR ? k > 0 && st->diode.vrrm > 0
              : crit == BR_CRIT_CAP_V    ? k > 0 && st->cap.vrated > 0
              : crit == BR_CRIT_SUPPLY
                  ? c->irating > 0 || c->limit_mode == BR_SUPPLY_HICCUP || st->inj_rating > 0
              : crit == BR_CRIT_HEADROOM   ? st->aux.kind == BR_AUX_LDO
              : crit == BR_CRIT_AUX_POWER  ? st->aux.id && st->aux.pmax > 0
              : crit == BR_CRIT_DIODE_IAVG ? k > 0 && st->diode.if_avg > 0
              : crit == BR_CRIT_CAP_RIPPLE ? k > 0 && st->cap.iripple > 0
              : crit == BR_CRIT_TJ         ? (k > 0 && st->diode.rth > 0) || st->aux.rth > 0
                                           : 1;
    }
    return any;
}

/* The steady row's note for a direction without a trustworthy steady
 * state: why the simulation failed, which rail's figures contradict each
 * other, or where the solver got stuck (which rail, after how many
 * periods, how far from settled). */
/* "current step-down", or "over the line cycle". */
static const char *case_words(int dir, char *buf, size_t cap)
{
    if (dir == BR_DIRI_LINE)
        snprintf(buf, cap, "over the line cycle");
    else
        snprintf(buf, cap, "current %s", dir_word(dir));
    return buf;
}

static void unsettled_note(const br_chain *c, const br_steady_figs *f, char *note, size_t cap)
{
    const br_steady *ss = f->ss;
    int k = ss->resid_rail >= 0 && ss->resid_rail < c->n ? ss->resid_rail : 0;
    int line = ss->dir == BR_DIRI_LINE;
    char what[24];
    case_words(ss->dir, what, sizeof what);
    if (ss->failed || ss->collapsed) {
        snprintf(note, cap, "%s: %s", what, ss->why);
    } else if (f->bad_rail >= 0) {
        const br_rail_fig *r = &f->rail[f->bad_rail];
        snprintf(note, cap,
                 "the simulated period contradicts itself (%s): rail %d (%s) averages %.6g V "
                 "outside its minimum %.6g V and maximum %.6g V",
                 what, f->bad_rail, c->st[f->bad_rail].name, r->vavg, r->vmin, r->vmax);
    } else if (ss->converged) {
        snprintf(note, cap,
                 "the state the solver found (%s) is not periodic: the cross-check moves the "
                 "rails by %.3g V per %speriod, more than %.3g V",
                 what, ss->drift, line ? "line " : "", DRIFT_LIMIT);
    } else {
        snprintf(note, cap,
                 "the solver did not converge (%s): after %ld %speriods rail %d (%s) still "
                 "moves %.3g V per %speriod",
                 what, ss->periods, line ? "switching " : "", k, c->st[k].name, ss->residual,
                 line ? "line " : "");
    }
}

/* No trustworthy periodic steady state for one direction: every row that
 * needs one is undetermined, and the steady row says why. */
static void unsettled(const br_chain *c, const br_steady_figs *f, br_verdict *v)
{
    int again = v->row[BR_CRIT_STEADY].undetermined; /* the other direction too */
    char what[24];
    v->row[BR_CRIT_STEADY].undetermined = 1;
    for (int i = BR_CRIT_STEADY + 1; i < BR_CRIT_COUNT; i++)
        if ((v->row[i].undetermined = can_apply(c, i)))
            snprintf(v->row[i].note, sizeof v->row[i].note, "no converged steady state %s%s",
                     again                    ? "in either current direction"
                     : f->dir == BR_DIRI_LINE ? ""
                                              : "for ",
                     again ? "" : case_words(f->dir, what, sizeof what));
    if (!again) /* the steady row keeps the first direction's details */
        unsettled_note(c, f, v->row[BR_CRIT_STEADY].note, sizeof v->row[BR_CRIT_STEADY].note);
}

/* The figures of a direction can be used: its simulation ran and its
 * period agrees with itself. */
static int trusted(const br_steady_figs *f)
{
    return !f->ss->failed && !f->ss->collapsed && f->bad_rail < 0;
}

/* The figures of a direction decide its rows: trusted, and either settled
 * or failing (a driver that drops out fails whatever the solver did). */
static int usable(const br_steady_figs *f)
{
    return trusted(f) && (settled(f->ss) || !f->ss->holds);
}

/* The steady-state row is a status, not a margin: the state holds (found
 * and trusted in every direction, no driver drops out), does not hold (a
 * driver drops out: a failure whatever the solver did), or is
 * undetermined (the solver did not settle).  Its figure is the largest
 * cross-check drift, shown for information; it has no margin. */
static void steady_status(const br_steady_figs *figs, int ndir, br_verdict *out)
{
    br_verdict_row *r = &out->row[BR_CRIT_STEADY];
    int holds = 1, decided = 1, collapsed = 0;
    r->figure = -1.0; /* no direction with a period yet */
    for (int d = 0; d < ndir; d++) {
        const br_steady *ss = figs[d].ss;
        int ok = trusted(&figs[d]);
        collapsed |= ss->collapsed;
        holds = holds && !(ok && !ss->holds) && !ss->collapsed;
        decided = decided && usable(&figs[d]);
        if (ok && isfinite(ss->drift) && ss->drift >= r->figure) {
            r->figure = ss->drift;
            r->dir = figs[d].dir;
        }
    }
    if (r->figure < 0) { /* no period to read a drift from */
        r->figure = NAN;
        r->dir = BR_DIRI_NONE;
    }
    r->limit = DRIFT_LIMIT;
    r->margin = NAN;
    r->applies = !holds || decided; /* an undetermined row is marked by unsettled() */
    r->pass = holds && decided;
    if (!holds && !collapsed) /* a collapse keeps the note unsettled() wrote */
        snprintf(r->note, sizeof r->note, "%s", "a driver drops out in the periodic steady state");
}

/* Steady rows of each direction; one whose solver did not settle (and
 * whose drivers did not drop out, which is a failure whatever the state)
 * adds no figures, only undetermined marks. */
static void steady_all(const br_chain *c, const br_steady_figs *figs, int ndir, br_verdict *out)
{
    for (int d = 0; d < ndir; d++)
        if (usable(&figs[d]))
            steady_rows(c, &figs[d], out);
    for (int d = 0; d < ndir; d++)
        if (!usable(&figs[d]))
            unsettled(c, &figs[d], out);
    steady_status(figs, ndir, out);
}

void br_verdict_make(const br_chain *c, const br_startup *su, const br_steady_figs *figs, int ndir,
                     br_verdict *out)
{
    memset(out, 0, sizeof *out);
    for (int i = 0; i < BR_CRIT_COUNT; i++) {
        out->row[i].stage = -1;
        out->row[i].line_theta = NAN;
        out->row[i].line_period = -1;
    }
    if (su)
        startup_rows(c, su, out);
    steady_all(c, figs, ndir, out);
    for (int i = 0; i < BR_CRIT_COUNT; i++)
        line_note(c, &out->row[i]);
    finish_rows(out);
}

br_rail_fig br_rail_fig_worst(const br_steady_figs *f, int ndir, int k)
{
    br_rail_fig w = f[0].rail[k];
    for (int d = 1; d < ndir; d++) { /* fmin and fmax pass over a NaN */
        const br_rail_fig *r = &f[d].rail[k];
        w.vmin = fmin(w.vmin, r->vmin);
        w.vmax = fmax(w.vmax, r->vmax);
        w.ripple = fmax(w.ripple, r->ripple);
        w.vdrv_min = fmin(w.vdrv_min, r->vdrv_min);
        w.vdrv_max = fmax(w.vdrv_max, r->vdrv_max);
        w.m_uvlo = fmin(w.m_uvlo, r->m_uvlo);
        w.m_drive = fmin(w.m_drive, r->m_drive);
        w.m_gate = fmin(w.m_gate, r->m_gate);
        w.vcap_peak = fmax(w.vcap_peak, r->vcap_peak);
        w.icap_rms = fmax(w.icap_rms, r->icap_rms);
    }
    return w;
}

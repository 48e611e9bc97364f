/* pick.c - rating screens, one-part choices, the per-rail greedy descent
 * and the ranking of capacitor and diode choices from a catalog. */
#include "analyses/pick.h"
#include "analyses/workpool.h"

#include "analyses/corners.h"
#include "core/error.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

void br_pick_opts_default(br_pick_opts *o)
{
    memset(o, 0, sizeof *o); /* fields added later start at zero */
    o->threads = 0;
    o->top = 10;
    o->startup = 1;
    o->per_rail = 1;
    o->progress = NULL;
    o->min_margin = -1.0;
    o->solver_limit = 0;
}

/* ---- placing a choice in a design ------------------------------------------ */

/* Index of catalog part `part` appended to the design's parts (each
 * catalog part once). */
static int place(br_design *d, const br_catalog *cat, int is_diode, int part, int *placed,
                 br_error *err)
{
    if (placed[part] >= 0)
        return BR_OK;
    int *count = is_diode ? &d->ndiodes : &d->ncaps;
    if (*count >= BR_MAX_PARTS)
        return br_error_set(err, BR_EINPUT, d->path, 0, "parts",
                            "no room for catalog part %s: the design and the choice need more "
                            "than %d %s parts",
                            is_diode ? cat->diodes[part].id : cat->caps[part].id, BR_MAX_PARTS,
                            is_diode ? "diode" : "capacitor");
    if (is_diode)
        d->diodes[*count] = cat->diodes[part];
    else
        d->caps[*count] = cat->caps[part];
    placed[part] = (*count)++;
    return BR_OK;
}

int br_pick_apply(const br_design *d, const br_catalog *cat, const br_choice *ch, br_design **out,
                  br_error *err)
{
    int pcap[BR_MAX_PARTS], pdio[BR_MAX_PARTS], rc = BR_OK;
    br_design *x = br_design_copy(d);
    *out = NULL;
    if (!x)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    for (int i = 0; i < BR_MAX_PARTS; i++)
        pcap[i] = pdio[i] = -1;
    int n = br_design_nswitch(d);
    for (int k = 1; rc == BR_OK && k < n; k++) {
        br_stage_spec spec = *br_design_stage(d, k);
        if (ch->cap[k] >= 0 && (rc = place(x, cat, 0, ch->cap[k], pcap, err)) == BR_OK)
            spec.cap = pcap[ch->cap[k]];
        if (rc == BR_OK && ch->diode[k] >= 0 &&
            (rc = place(x, cat, 1, ch->diode[k], pdio, err)) == BR_OK)
            spec.diode = pdio[ch->diode[k]];
        for (int i = 0; rc == BR_OK && ch->diode[k] >= 0 && i < x->ninject; i++)
            if (x->inject[i].rail == k) /* link k's diode is the injection's */
                x->inject[i].diode = spec.diode;
        x->stage[k] = spec;
        x->has_override[k] = 1;
    }
    if (rc != BR_OK) {
        br_design_free(x);
        return rc;
    }
    *out = x;
    return BR_OK;
}

/* ---- judging one choice ----------------------------------------------------- */

/* Smaller is worse; a failing row without a negative margin is the
 * worst, a passing one without a margin (a status) the best. */
static double rank_of(const br_pt_row *r)
{
    if (!r->pass)
        return r->margin < 0 ? r->margin : -HUGE_VAL;
    return isnan(r->margin) ? HUGE_VAL : r->margin;
}

/* What a choice's points add up to, for criteria of one kind: the worst
 * decided row of each criterion, and what was not decided. */
typedef struct tally {
    br_pt_row worst[BR_CRIT_COUNT];
    int seen[BR_CRIT_COUNT];  /* decided somewhere */
    int undet[BR_CRIT_COUNT]; /* not decided somewhere */
    int unsettled;            /* points with a steady state not settled */
    int unjudged;             /* points not judged at all */
} tally;

/* Keep p's decided rows where they are worse than the tally's so far. */
static void keep_worst(tally *t, const br_pt *p, int startup_rows)
{
    if (p->status != BR_OK) {
        t->unjudged++;
        return;
    }
    t->unsettled += !startup_rows && p->unsettled != 0;
    for (int c = 0; c < BR_CRIT_COUNT; c++) {
        const br_pt_row *r = &p->row[c];
        if (!r->applies || br_crit_is_startup(c) != startup_rows)
            continue;
        if (r->undetermined) {
            t->undet[c] = 1;
            continue;
        }
        if (!t->seen[c] || rank_of(r) < rank_of(&t->worst[c])) {
            t->worst[c] = *r;
            t->seen[c] = 1;
        }
    }
}

/* Objectives in the order their corners are tried: the rails' headroom
 * first (where a weak part shows), then the criteria. */
static int objective(int a)
{
    return a == 0 ? BR_OBJ_HEADROOM : a - 1;
}

/* The predicted worst corner of every objective of the kind asked for
 * (steady-state or start-up), each once, into level (rows of
 * BR_TOL_MAX); returns their count. */
static int predicted_corners(const br_spread *s, int startup_rows, signed char *level)
{
    int n = 0;
    for (int a = 0; a <= BR_CRIT_COUNT; a++) {
        int c = objective(a);
        if (c == BR_OBJ_HEADROOM ? startup_rows
                                 : c == BR_CRIT_STEADY || br_crit_is_startup(c) != startup_rows ||
                                       !s->nominal.row[c].applies)
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

/* Any row of the kind asked for fails at p (on figures it can trust). */
static int fails(const br_pt *p, int startup_rows)
{
    if (p->status != BR_OK)
        return 0;
    for (int c = 0; c < BR_CRIT_COUNT; c++) {
        const br_pt_row *r = &p->row[c];
        if (r->applies && !r->pass && !r->undetermined && br_crit_is_startup(c) == startup_rows)
            return 1;
    }
    return 0;
}

/* The worst rows of criteria of one kind over the points s judged for d
 * itself and its predicted corners, one at a time: a choice is rejected
 * at its first failing point, the rest of its corners untried. */
static int worst_rows(br_spread *s, int startup_rows, tally *t, br_error *err)
{
    signed char level[(BR_CRIT_COUNT + 1) * BR_TOL_MAX];
    double v[BR_TOL_MAX];
    br_pt pt;
    int k = s->tl.n;
    keep_worst(t, &s->nominal, startup_rows);
    int failed = fails(&s->nominal, startup_rows);
    for (int r = 0; r < 2 * k && !failed; r++)
        if (!s->borrowed[r]) {
            keep_worst(t, &s->oat[r], startup_rows);
            failed = fails(&s->oat[r], startup_rows);
        }
    int n = failed ? 0 : predicted_corners(s, startup_rows, level);
    for (int a = 0; a < n && !failed; a++) {
        br_spread_levels(s, level + (size_t)a * BR_TOL_MAX, v);
        int rc = br_spread_eval(s, 1, v, startup_rows, &pt, err);
        if (rc != BR_OK)
            return rc;
        keep_worst(t, &pt, startup_rows);
        failed = fails(&pt, startup_rows);
    }
    return BR_OK;
}

/* The criteria whose margin ranks choices: those with a voltage margin. */
static int ranks_choices(int c)
{
    return br_crit_has_margin(c) && strcmp(br_crit_unit(c), "V") == 0;
}

/* A choice fails when a criterion fails on figures it can trust; else it
 * is undetermined when something was not decided (or it could not be
 * judged at all); else it passes. */
static void settle(br_choice *ch)
{
    ch->outcome = ch->fail_crit >= 0                        ? BR_OUTCOME_FAIL
                  : ch->status != BR_OK                     ? BR_OUTCOME_UNDETERMINED
                  : ch->undet_crit >= 0 || ch->unjudged > 0 ? BR_OUTCOME_UNDETERMINED
                                                            : BR_OUTCOME_PASS;
    ch->pass = ch->outcome == BR_OUTCOME_PASS;
}

/* Fill the verdict of ch from the tally of one kind of criteria.  The
 * failing criterion named is a circuit one when any fails: the
 * steady-state row fails too wherever a driver drops out, and says less. */
static void conclude(br_choice *ch, const tally *t, int startup_rows)
{
    if (!startup_rows) {
        ch->margin = HUGE_VAL;
        ch->fail_crit = ch->undet_crit = -1;
        ch->unsettled = ch->unjudged = 0;
    }
    ch->unsettled += t->unsettled;
    ch->unjudged += t->unjudged;
    for (int c = 0; c < BR_CRIT_COUNT; c++) {
        if (br_crit_is_startup(c) != startup_rows)
            continue;
        if (t->undet[c] && ch->undet_crit < 0)
            ch->undet_crit = c;
        if (!t->seen[c])
            continue;
        if (!t->worst[c].pass && (ch->fail_crit < 0 || ch->fail_crit == BR_CRIT_STEADY)) {
            ch->fail_crit = c;
            ch->fail_row = t->worst[c];
        }
        if (ranks_choices(c) && t->worst[c].margin < ch->margin) {
            ch->margin = t->worst[c].margin;
            ch->crit = c;
            ch->stage = t->worst[c].stage;
            ch->dir = t->worst[c].dir;
        }
    }
}

/* Judge ch: steady-state criteria (startup_rows = 0) or the start-up
 * criteria (1).  A choice that cannot be judged gets that status (and is
 * undetermined); only running out of memory is an error. */
static int judge(const br_pick *pk, br_choice *ch, int startup_rows, br_error *err)
{
    br_design *d = NULL;
    br_spread *s = NULL;
    tally t;
    memset(&t, 0, sizeof t);
    br_spread_opts so;
    br_spread_opts_default(&so);
    so.threads = 1;
    so.startup = startup_rows;
    so.accept = pk->base->accept;
    so.similar = 1;
    so.stop_failed = 1;         /* a choice that fails at its nominal point needs no corners */
    so.meter = pk->base->meter; /* to stop within a choice; the pool counts the choice */
    so.meter_weight = 0.0;
    so.solver_limit = pk->base->solver_limit;
    int rc = br_pick_apply(pk->base->d, pk->cat, ch, &d, err);
    if (rc == BR_OK)
        rc = br_spread_derive(pk->base, d, &so, &s, err);
    if (rc == BR_OK)
        rc = worst_rows(s, startup_rows, &t, err);
    ch->points += s ? s->points : 0;
    if (rc == BR_OK) {
        conclude(ch, &t, startup_rows);
        ch->startup_checked |= startup_rows;
    }
    ch->status = rc == BR_ENOMEM ? ch->status : rc;
    settle(ch);
    br_spread_free(s);
    br_design_free(d);
    return rc == BR_ENOMEM ? rc : BR_OK;
}

/* ---- judging many choices in parallel ------------------------------------------ */

/* One pool item: a choice to judge. */
typedef struct pool {
    const br_pick *pk;
    br_choice **todo;
    int startup_rows;
} pool;

/* What judging one choice counts for on the meter: about the points it
 * takes (its nominal point and a few per parameter). */
static double choice_weight(const br_pick *pk)
{
    return 1.0 + pk->base->tl.n;
}

static int judge_item(void *ctx, int i, br_error *err)
{
    const pool *p = ctx;
    return judge(p->pk, p->todo[i], p->startup_rows, err);
}

static int judge_all(const br_pick *pk, br_choice **todo, int n, int startup_rows, br_error *err)
{
    pool p = {.pk = pk, .todo = todo, .startup_rows = startup_rows};
    if (n == 0)
        return BR_OK;
    br_meter_grow(pk->base->meter, n * choice_weight(pk));
    int rc =
        br_work_run(n, pk->base->threads, judge_item, &p, pk->base->meter, choice_weight(pk), err);
    if (br_meter_stopped(pk->base->meter))
        return br_progress_cancelled(err);
    return rc;
}

/* ---- screening ------------------------------------------------------------------ */

static char *reject(br_pick *pk, int is_diode, int part)
{
    br_reject *r = &pk->rej[pk->nrej++];
    r->is_diode = is_diode;
    r->part = part;
    r->alone = 0;
    return r->why;
}

/* The highest reverse voltage a link diode must block: the largest
 * blocking voltage of a return switch with the edge overshoot, at the
 * highest bus voltage and flying-capacitor imbalance. */
static double link_stress(const br_design *d, const br_chain *c)
{
    double vb = 0.0;
    for (int k = 0; k + 1 < c->n; k++)
        vb = fmax(vb, c->st[k].vblock);
    double scale = (d->vin.max / d->vin.nom) * (1.0 + d->imbalance.max) / (1.0 + d->imbalance.nom);
    return vb * scale * (1.0 + d->overshoot.max);
}

/* Ratings first: admissible[] marks what may be placed at all. */
static void screen(br_pick *pk, const br_design *d, const br_chain *c, int *cap_ok, int *dio_ok)
{
    const br_catalog *cat = pk->cat;
    double vmax = d->vsupply.max, stress = link_stress(d, c), der = d->derating.nom;
    for (int i = 0; i < cat->ncaps; i++) {
        double r = cat->caps[i].vrated.nom;
        cap_ok[i] = r > 0 && r >= vmax;
        if (!(r > 0))
            snprintf(reject(pk, 0, i), BR_PICK_WHY,
                     "no voltage rating given, so its voltage cannot be checked");
        else if (!cap_ok[i])
            snprintf(reject(pk, 0, i), BR_PICK_WHY,
                     "rated %.4g V, below the supply's maximum %.4g V", r, vmax);
    }
    for (int i = 0; i < cat->ndiodes; i++) {
        double r = cat->diodes[i].vrrm.nom;
        dio_ok[i] = r > 0 && der * r >= stress;
        if (!(r > 0))
            snprintf(reject(pk, 1, i), BR_PICK_WHY,
                     "no reverse voltage rating given, so its stress cannot be checked");
        else if (!dio_ok[i])
            snprintf(reject(pk, 1, i), BR_PICK_WHY,
                     "derated rating %.4g V (%.0f %% of %.4g V) below the %.4g V the links "
                     "block with the edge overshoot",
                     der * r, 100.0 * der, r, stress);
    }
}

/* ---- one-part choices ------------------------------------------------------------ */

static void set_uniform(br_choice *ch, int n, int cap, int diode, const br_catalog *cat)
{
    memset(ch, 0, sizeof *ch);
    ch->uniform = 1;
    ch->fail_crit = ch->undet_crit = -1;
    ch->crit = ch->stage = -1;
    for (int k = 0; k < BR_MAX_SWITCHES; k++)
        ch->cap[k] = ch->diode[k] = -1;
    for (int k = 1; k < n; k++) {
        ch->cap[k] = (short)cap;
        ch->diode[k] = (short)diode;
        ch->cost += (cap >= 0 ? cat->cap_offer[cap].cost : 0) +
                    (diode >= 0 ? cat->diode_offer[diode].cost : 0);
        ch->area += (cap >= 0 ? cat->cap_offer[cap].area : 0) +
                    (diode >= 0 ? cat->diode_offer[diode].area : 0);
    }
}

/* Every combination of an admissible capacitor and diode (or the design's
 * own where the catalog offers none). */
static int list_uniform(br_pick *pk, int n, const int *cap_ok, const int *dio_ok)
{
    const br_catalog *cat = pk->cat;
    int nc = pk->pick_caps ? cat->ncaps : 1, nd = pk->pick_diodes ? cat->ndiodes : 1;
    pk->choice =
        calloc((size_t)(nc * nd) + 2 * BR_MAX_SWITCHES * BR_MAX_PARTS + 1, sizeof *pk->choice);
    if (!pk->choice)
        return BR_ENOMEM;
    for (int a = 0; a < nc; a++)
        for (int b = 0; b < nd; b++) {
            int cap = pk->pick_caps ? a : -1, dio = pk->pick_diodes ? b : -1;
            if ((cap >= 0 && !cap_ok[cap]) || (dio >= 0 && !dio_ok[dio]))
                continue;
            set_uniform(&pk->choice[pk->nchoice++], n, cap, dio, cat);
        }
    pk->nuniform = pk->nchoice;
    return BR_OK;
}

/* A part every one of whose one-part choices fails (none passes, none is
 * undetermined) fails on its own: it is listed with the reason of its
 * best combination (the one with the highest margin).  It is not
 * rejected everywhere: a per-rail mix may still place it where it passes,
 * and the list says so. */
static void reject_alone(br_pick *pk, int is_diode, int part)
{
    const br_choice *best = NULL;
    for (int i = 0; i < pk->nuniform; i++) {
        const br_choice *ch = &pk->choice[i];
        if ((is_diode ? ch->diode[1] : ch->cap[1]) != part)
            continue;
        if (ch->outcome != BR_OUTCOME_FAIL)
            return;
        if (!best || rank_of(&ch->fail_row) > rank_of(&best->fail_row))
            best = ch;
    }
    if (!best)
        return;
    char *why = reject(pk, is_diode, part);
    pk->rej[pk->nrej - 1].alone = 1;
    const char *as = is_diode ? "as the only diode, on every link"
                              : "as the only capacitor, on "
                                "every rail";
    const br_pt_row *r = &best->fail_row;
    if (best->fail_crit == BR_CRIT_STEADY)
        snprintf(why, BR_PICK_WHY,
                 "%s: a driver drops out in the periodic steady state at one of its corners", as);
    else if (br_crit_never(best->fail_crit, r->figure))
        snprintf(why, BR_PICK_WHY, "%s: rail %d never starts at its worst corner", as, r->stage);
    else if (isfinite(r->margin))
        snprintf(why, BR_PICK_WHY, "%s: fails %s at its worst corner (margin %.4g%s%s)", as,
                 br_crit_name(best->fail_crit), r->margin,
                 br_crit_unit(best->fail_crit)[0] ? " " : "", br_crit_unit(best->fail_crit));
    else
        snprintf(why, BR_PICK_WHY, "%s: fails %s at its worst corner", as,
                 br_crit_name(best->fail_crit));
}

/* ---- ranking -------------------------------------------------------------------------- */

static int better(const br_choice *a, const br_choice *b)
{
    if (a->cost != b->cost)
        return a->cost < b->cost;
    if (a->area != b->area)
        return a->area < b->area;
    return a->margin > b->margin;
}

/* A choice that may be ranked: it passes with at least the minimum margin. */
static int qualifies(const br_pick *pk, const br_choice *ch)
{
    return ch->status == BR_OK && ch->pass && ch->margin >= pk->min_margin;
}

/* Qualifying choices by rank, into order (returns their count). */
static int sorted_passing(const br_pick *pk, int *order)
{
    int n = 0;
    for (int i = 0; i < pk->nchoice; i++) {
        const br_choice *ch = &pk->choice[i];
        if (!qualifies(pk, ch))
            continue;
        int at = n++;
        while (at > 0 && better(ch, &pk->choice[order[at - 1]])) {
            order[at] = order[at - 1];
            at--;
        }
        order[at] = i;
    }
    return n;
}

/* The start-up criteria of the best choices, in rank order and in batches
 * of one per thread, until `top` of them pass. */
static int verify(br_pick *pk, int startup, br_error *err)
{
    int *order = malloc(sizeof(int) * (size_t)(pk->nchoice + 1));
    if (!order)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    int n = sorted_passing(pk, order), rc = BR_OK, at = 0;
    pk->nranked = 0;
    while (rc == BR_OK && at < n && pk->nranked < pk->top) {
        br_choice *batch[BR_SPREAD_MAX_THREADS];
        int nb = 0, want = pk->top - pk->nranked;
        while (at < n && nb < want && nb < pk->base->threads)
            batch[nb++] = &pk->choice[order[at++]];
        if (startup)
            rc = judge_all(pk, batch, nb, 1, err);
        for (int b = 0; rc == BR_OK && b < nb; b++)
            if (batch[b]->status == BR_OK && batch[b]->pass && pk->nranked < pk->top)
                pk->ranked[pk->nranked++] = (int)(batch[b] - pk->choice);
    }
    free(order);
    return rc;
}

/* ---- per-rail choices: the greedy descent ------------------------------------------ */

static double part_cost(const br_catalog *cat, int is_diode, int part)
{
    return is_diode ? cat->diode_offer[part].cost : cat->cap_offer[part].cost;
}

static double part_area(const br_catalog *cat, int is_diode, int part)
{
    return is_diode ? cat->diode_offer[part].area : cat->cap_offer[part].area;
}

/* Admissible parts cheaper than `than` (cost, then area), cheapest first. */
static int cheaper(const br_catalog *cat, int is_diode, const int *ok, int than, int *out)
{
    int n = 0, count = is_diode ? cat->ndiodes : cat->ncaps;
    double c0 = part_cost(cat, is_diode, than), a0 = part_area(cat, is_diode, than);
    for (int i = 0; i < count; i++) {
        double c = part_cost(cat, is_diode, i), a = part_area(cat, is_diode, i);
        if (!ok[i] || i == than || c > c0 || (c == c0 && a >= a0))
            continue;
        int at = n++;
        while (at > 0 && (part_cost(cat, is_diode, out[at - 1]) > c ||
                          (part_cost(cat, is_diode, out[at - 1]) == c &&
                           part_area(cat, is_diode, out[at - 1]) > a))) {
            out[at] = out[at - 1];
            at--;
        }
        out[at] = i;
    }
    return n;
}

static void recost(br_choice *ch, const br_catalog *cat, int n)
{
    ch->cost = ch->area = 0.0;
    for (int k = 1; k < n; k++) {
        if (ch->cap[k] >= 0) {
            ch->cost += cat->cap_offer[ch->cap[k]].cost;
            ch->area += cat->cap_offer[ch->cap[k]].area;
        }
        if (ch->diode[k] >= 0) {
            ch->cost += cat->diode_offer[ch->diode[k]].cost;
            ch->area += cat->diode_offer[ch->diode[k]].area;
        }
    }
}

/* Try cheaper parts at stage k of cur, a batch per thread at a time, the
 * cheapest first; cur takes the first that keeps it passing. */
static int descend_stage(br_pick *pk, br_choice *cur, int is_diode, int k, const int *ok, int n,
                         br_error *err)
{
    int cand[BR_MAX_PARTS],
        nc = cheaper(pk->cat, is_diode, ok, is_diode ? cur->diode[k] : cur->cap[k], cand);
    for (int at = 0; at < nc;) {
        br_choice *slot = &pk->choice[pk->nchoice];
        br_choice *batch[BR_SPREAD_MAX_THREADS];
        int nb = 0;
        while (at < nc && nb < pk->base->threads) {
            slot[nb] = *cur;
            (is_diode ? slot[nb].diode : slot[nb].cap)[k] = (short)cand[at++];
            slot[nb].uniform = 0;
            slot[nb].points = 0;
            recost(&slot[nb], pk->cat, n);
            batch[nb] = &slot[nb];
            nb++;
        }
        int rc = judge_all(pk, batch, nb, 0, err);
        pk->greedy_tries += nb;
        for (int b = 0; b < nb; b++)
            pk->points += batch[b]->points;
        if (rc != BR_OK)
            return rc;
        for (int b = 0; b < nb; b++)
            if (qualifies(pk, batch[b])) {
                *cur = *batch[b];
                return BR_OK;
            }
    }
    return BR_OK;
}

/* From the best passing one-part choice, rails then links, top down. */
static int greedy(br_pick *pk, const int *cap_ok, const int *dio_ok, int n, br_error *err)
{
    int *order = malloc(sizeof(int) * (size_t)(pk->nuniform + 1));
    if (!order)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    int saved = pk->nchoice;
    pk->nchoice = pk->nuniform; /* rank the one-part choices only */
    int np = sorted_passing(pk, order);
    pk->nchoice = saved;
    br_choice cur = np > 0 ? pk->choice[order[0]] : pk->choice[0];
    free(order);
    if (np == 0)
        return BR_OK;
    int rc = BR_OK;
    for (int k = n - 1; rc == BR_OK && pk->pick_caps && k >= 1; k--)
        rc = descend_stage(pk, &cur, 0, k, cap_ok, n, err);
    for (int k = n - 1; rc == BR_OK && pk->pick_diodes && k >= 1; k--)
        rc = descend_stage(pk, &cur, 1, k, dio_ok, n, err);
    if (rc == BR_OK && !cur.uniform) {
        pk->choice[pk->nchoice] = cur;
        pk->greedy = pk->nchoice++;
    }
    return rc;
}

/* ---- the whole search -------------------------------------------------------------- */

static int judge_uniform(br_pick *pk, br_error *err)
{
    br_choice **todo = malloc(sizeof *todo * (size_t)(pk->nuniform + 1));
    if (!todo)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    for (int i = 0; i < pk->nuniform; i++)
        todo[i] = &pk->choice[i];
    int rc = judge_all(pk, todo, pk->nuniform, 0, err);
    free(todo);
    for (int i = 0; i < pk->nuniform; i++)
        pk->points += pk->choice[i].points;
    return rc;
}

/* The passing choices below the minimum margin and the undetermined
 * ones, for the report; and the outcome of the whole search. */
static void leftovers(br_pick *pk)
{
    pk->thin = -1;
    for (int i = 0; i < pk->nchoice; i++) {
        const br_choice *ch = &pk->choice[i];
        if (ch->status == BR_OK && ch->pass && !qualifies(pk, ch)) {
            pk->nthin++;
            if (pk->thin < 0 || ch->margin > pk->choice[pk->thin].margin)
                pk->thin = i;
        }
        if (ch->outcome != BR_OUTCOME_UNDETERMINED)
            continue;
        int at = pk->nundet < 8 ? pk->nundet : 8; /* the cheapest 8, insertion */
        pk->nundet++;
        while (at > 0 && better(ch, &pk->choice[pk->undet[at - 1]])) {
            if (at < 8)
                pk->undet[at] = pk->undet[at - 1];
            at--;
        }
        if (at < 8)
            pk->undet[at] = i;
    }
    pk->outcome = pk->nranked > 0  ? BR_OUTCOME_PASS
                  : pk->nundet > 0 ? BR_OUTCOME_UNDETERMINED
                                   : BR_OUTCOME_FAIL;
}

/* The smallest UVLO hysteresis of the chain's drivers, V (0 or more). */
static double hysteresis(const br_chain *c)
{
    double h = HUGE_VAL;
    for (int k = 0; k < c->n; k++)
        h = fmin(h, c->st[k].drv.uvlo_rise - c->st[k].drv.uvlo_fall);
    return c->n > 0 && h > 0 ? h : 0.0;
}

static int search(br_pick *pk, const br_design *d, const br_chain *c, const br_pick_opts *o,
                  br_error *err)
{
    int cap_ok[BR_MAX_PARTS] = {0}, dio_ok[BR_MAX_PARTS] = {0};
    screen(pk, d, c, cap_ok, dio_ok);
    if (list_uniform(pk, c->n, cap_ok, dio_ok) != BR_OK)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    int rc = judge_uniform(pk, err);
    for (int i = 0; rc == BR_OK && pk->pick_caps && i < pk->cat->ncaps; i++)
        if (cap_ok[i])
            reject_alone(pk, 0, i);
    for (int i = 0; rc == BR_OK && pk->pick_diodes && i < pk->cat->ndiodes; i++)
        if (dio_ok[i])
            reject_alone(pk, 1, i);
    if (rc == BR_OK && o->per_rail)
        rc = greedy(pk, cap_ok, dio_ok, c->n, err);
    if (rc == BR_OK)
        rc = verify(pk, o->startup, err);
    if (rc == BR_OK)
        leftovers(pk);
    return rc;
}

int br_pick_run(const br_design *d, const br_catalog *cat, const br_pick_opts *o, br_pick **out,
                br_error *err)
{
    br_pick_opts def;
    if (!o) {
        br_pick_opts_default(&def);
        o = &def;
    }
    *out = NULL;
    if (cat->ncaps == 0 && cat->ndiodes == 0)
        return br_error_set(err, BR_EINPUT, cat->path, 0, "", "the catalog offers no part");
    br_pick *pk = calloc(1, sizeof *pk);
    br_chain *c = malloc(sizeof *c);
    int rc = pk && c ? BR_OK : br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    if (rc == BR_OK) {
        pk->cat = cat;
        pk->pick_caps = cat->ncaps > 0;
        pk->pick_diodes = cat->ndiodes > 0;
        pk->top = o->top < 1 ? 1 : o->top > 64 ? 64 : o->top;
        pk->greedy = -1;
        rc = br_chain_build_nominal(d, c, err);
    }
    if (rc == BR_OK) {
        /* a quarter of the hysteresis by default: a rail that ends its
         * worst period that close to UVLO rising has lost most of the
         * band that lets its driver restart after a dip */
        pk->hysteresis = hysteresis(c);
        pk->min_default = !(o->min_margin >= 0);
        pk->min_margin = pk->min_default ? 0.25 * pk->hysteresis : o->min_margin;
    }
    br_meter meter;
    int metered = rc == BR_OK && (rc = br_meter_init(&meter, o->progress, 0.0, err)) == BR_OK;
    br_spread_opts so;
    br_spread_opts_default(&so);
    so.threads = o->threads;
    so.startup = o->startup;
    so.meter = metered ? &meter : NULL;
    so.solver_limit = o->solver_limit;
    if (rc == BR_OK)
        rc = br_spread_create(d, &so, &pk->base, err);
    if (rc == BR_OK)
        rc = search(pk, d, c, o, err);
    if (rc == BR_OK)
        pk->points += pk->base->points;
    if (metered)
        br_meter_destroy(&meter);
    if (pk && pk->base)
        pk->base->meter = NULL; /* the meter is gone; the result outlives it */
    free(c);
    if (rc != BR_OK) {
        br_pick_free(pk);
        return rc;
    }
    *out = pk;
    return BR_OK;
}

void br_pick_free(br_pick *p)
{
    if (!p)
        return;
    br_spread_free(p->base);
    free(p->choice);
    free(p);
}

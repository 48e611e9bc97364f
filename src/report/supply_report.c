/* supply_report.c - rendering the supply's share of a start-up. */
#include "report/supply_report.h"

#include "report/fmt.h"
#include "report/report_common.h"

#include <stdio.h>

const char *br_supply_limit_words(const br_chain *c, char *buf, size_t cap)
{
    br_climit l = br_chain_supply_limit(c);
    return br_limit_words(&l, buf, cap);
}

const char *br_limit_words(const br_climit *c, char *buf, size_t cap)
{
    char a[32], b[32], t[32];
    br_fmt_si(a, sizeof a, c->ilimit, 4, "A");
    switch (c->mode) {
    case BR_SUPPLY_CONSTANT:
        snprintf(buf, cap, "%s, constant current", a);
        break;
    case BR_SUPPLY_FOLDBACK:
        snprintf(buf, cap, "%s, folding back to %s at 0 V", a,
                 br_fmt_si(b, sizeof b, c->ifold, 4, "A"));
        break;
    case BR_SUPPLY_HICCUP:
        br_fmt_time(b, sizeof b, c->hiccup_off);
        br_fmt_time(t, sizeof t, c->hiccup_delay);
        if (c->hiccup_retries >= 0)
            snprintf(buf, cap, "%s, hiccup (off %s after %s in it, %d retries)", a, b, t,
                     c->hiccup_retries);
        else
            snprintf(buf, cap, "%s, hiccup (off %s after %s in it, retrying without end)", a, b, t);
        break;
    default:
        snprintf(buf, cap, "none");
    }
    return buf;
}

const char *br_inject_limit_words(const br_stage *st, char *buf, size_t cap)
{
    char w[128], a[32];
    int n = 0;
    buf[0] = '\0';
    if (st->inj_lim.mode != BR_SUPPLY_UNLIMITED)
        n = snprintf(buf, cap, ", current limit %s", br_limit_words(&st->inj_lim, w, sizeof w));
    if (st->inj_rating > 0 && n >= 0 && (size_t)n < cap)
        snprintf(buf + n, cap - (size_t)n, ", rated %s",
                 br_fmt_si(a, sizeof a, st->inj_rating, 4, "A"));
    return buf;
}

/* The hiccups, when there were any. */
static int trips_text(const br_startup *su, br_text *out)
{
    const br_supply_profile *p = &su->supply;
    char a[32];
    if (p->trips == 0)
        return BR_OK;
    return br_text_printf(out, "; %d hiccup%s, the first at %s%s", p->trips,
                          p->trips == 1 ? "" : "s", br_fmt_time(a, sizeof a, p->first_trip),
                          p->latched ? ", then off for good (no retries left)" : "");
}

int br_supply_profile_text(const br_chain *c, const br_startup *su, br_text *out)
{
    const br_supply_profile *p = &su->supply;
    char pk[32], av[32], q[32], e[32], sp[32], tl[32], lim[160], rat[32];
    br_text *t = br_text_create();
    if (!t)
        return BR_ENOMEM;
    br_fmt_si(rat, sizeof rat, c->irating, 4, "A");
    int rc = br_text_printf(
        t, "peak %s, average %s, %s and %s drawn %s %s; current limit %s%s%s",
        br_fmt_si(pk, sizeof pk, p->ipeak, 4, "A"), br_fmt_si(av, sizeof av, p->iavg, 4, "A"),
        br_fmt_si(q, sizeof q, p->charge, 4, "C"), br_fmt_si(e, sizeof e, p->energy, 4, "J"),
        su->complete ? "up to the start-up time" : "over the", br_fmt_time(sp, sizeof sp, p->span),
        br_supply_limit_words(c, lim, sizeof lim), c->irating > 0 ? ", rated " : "",
        c->irating > 0 ? rat : "");
    if (c->limit_mode != BR_SUPPLY_UNLIMITED)
        rc |=
            br_text_printf(t, "; %s in the limit (%.0f %%)", br_fmt_time(tl, sizeof tl, p->t_limit),
                           p->span > 0 ? 100.0 * p->t_limit / p->span : 0.0);
    rc |= trips_text(su, t);
    if (rc == BR_OK)
        rc = br_report_wrap(out, "supply (through its resistance): ", br_text_data(t), 2);
    br_text_free(t);
    return rc;
}

void br_supply_profile_xml(br_xmlw *w, const br_chain *c, const br_startup *su)
{
    const br_supply_profile *p = &su->supply;
    static const char *const modes[] = {"none", "constant", "foldback", "hiccup"};
    br_xmlw_start(w, "supply");
    br_xmlw_num(w, "span-s", p->span);
    br_xmlw_num(w, "peak-A", p->ipeak);
    br_xmlw_num(w, "avg-A", p->iavg);
    br_xmlw_num(w, "charge-C", p->charge);
    br_xmlw_num(w, "energy-J", p->energy);
    br_xmlw_attr(w, "limit", modes[c->limit_mode]);
    if (c->limit_mode != BR_SUPPLY_UNLIMITED) {
        br_xmlw_num(w, "limit-A", c->ilimit);
        br_xmlw_num(w, "in-limit-s", p->t_limit);
    }
    if (c->irating > 0)
        br_xmlw_num(w, "rating-A", c->irating);
    br_xmlw_int(w, "hiccups", p->trips);
    if (p->trips > 0)
        br_xmlw_num(w, "first-hiccup-s", p->first_trip);
    br_xmlw_end(w);
}

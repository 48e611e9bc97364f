/* test_cli_netlist.c - the chain as a Berkeley SPICE3 netlist: its
 * structure read back (every element present, the nodes joined as the
 * chain joins them, no node left hanging), its numbers read back (the
 * .model lines through the SPICE reader, the switch waveforms against the
 * chain's on-windows and levels), a diode's .model line from the design
 * round-tripping, and the verb as a user meets it.  No simulator is run:
 * the netlist's behaviour in one is not this suite's claim. */
#include "bootrung/bootrung.h"
#include "io/spice_model.h"
#include "model/chain.h"
#include "model/timing.h"
#include "report/netlist.h"
#include "runbin.h"
#include "testkit.h"

#include <ctype.h>
#include <dirent.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#define MAXE 2000
#define MAXTOK 8
#define MAXPTS 20000

/* ---- reading a netlist back -------------------------------------------------- */

typedef struct elem {
    char tok[MAXTOK][48]; /* name, nodes, value or model... */
    int ntok;
    const char *line; /* the logical line (continuations joined) */
} elem;

typedef struct net {
    char *text;      /* logical lines, NUL-separated */
    char title[128]; /* the first line */
    elem e[MAXE];
    int n;
    const char *model[64]; /* .model lines */
    int nmodel;
    const char *tran; /* the .tran line */
    int ended;        /* .end is the last line */
} net;

/* Join '+' continuations; drop comments; keep the first line as title. */
static void read_net(net *nt, const char *src)
{
    memset(nt, 0, sizeof *nt);
    nt->text = calloc(strlen(src) * 2 + 16, 1);
    char *w = nt->text;
    const char *p = src;
    size_t tl = strcspn(p, "\n");
    snprintf(nt->title, sizeof nt->title, "%.*s", (int)(tl < 127 ? tl : 127), p);
    p += tl + (p[tl] == '\n');
    char *cur = NULL;
    while (*p) {
        size_t l = strcspn(p, "\n");
        if (p[0] == '+' && cur) {
            w--; /* over the NUL: append to the logical line */
            *w++ = ' ';
            memcpy(w, p + 1, l - 1);
            w += l - 1;
            *w++ = '\0';
        } else if (p[0] != '*' && l > 0) {
            cur = w;
            memcpy(w, p, l);
            w += l;
            *w++ = '\0';
        }
        p += l + (p[l] == '\n');
    }
    for (char *q = nt->text; q < w; q += strlen(q) + 1) {
        nt->ended = strcmp(q, ".end") == 0;
        if (strncmp(q, ".model", 6) == 0 && nt->nmodel < 64)
            nt->model[nt->nmodel++] = q;
        else if (strncmp(q, ".tran", 5) == 0)
            nt->tran = q;
        else if (q[0] != '.' && nt->n < MAXE) {
            elem *e = &nt->e[nt->n++];
            char copy[1024], *save = NULL;
            int k = 0;
            e->line = q;
            snprintf(copy, sizeof copy, "%s", q);
            for (char *tk = strtok_r(copy, " \t", &save); tk && k < MAXTOK;
                 tk = strtok_r(NULL, " \t", &save))
                snprintf(e->tok[k++], sizeof e->tok[0], "%s", tk);
            e->ntok = k;
        }
    }
}

static const elem *find(const net *nt, const char *name)
{
    for (int i = 0; i < nt->n; i++)
        if (strcmp(nt->e[i].tok[0], name) == 0)
            return &nt->e[i];
    return NULL;
}

/* Terminal nodes of an element by its kind (the first letter). */
static int nterm(const elem *e)
{
    switch (toupper((unsigned char)e->tok[0][0])) {
    case 'S':
    case 'G':
        return 4;
    default:
        return 2;
    }
}

static double value(const elem *e, int i)
{
    double v = NAN;
    CU_ASSERT_EQUAL(br_spice_number(e->tok[i], &v), 0);
    return v;
}

/* ---- the structure ------------------------------------------------------------ */

static const char *nd(char *buf, const char *prefix, int k)
{
    if (k == 0 && strcmp(prefix, "s") == 0)
        return "0";
    snprintf(buf, 16, "%s%d", prefix, k);
    return buf;
}

/* Element name with nodes a and b (in this order). */
static const elem *need(const net *nt, const char *name, const char *a, const char *b)
{
    const elem *e = find(nt, name);
    if (!e) {
        fprintf(stderr, "\nno element %s\n", name);
        CU_FAIL("an element is missing");
        return NULL;
    }
    if (strcmp(e->tok[1], a) != 0 || strcmp(e->tok[2], b) != 0) {
        fprintf(stderr, "\n%s joins %s and %s, expected %s and %s\n", name, e->tok[1], e->tok[2], a,
                b);
        CU_FAIL("an element joins the wrong nodes");
    }
    return e;
}

/* Link k from rail k-1 to rail k: a diode, then the resistance. */
static void check_link(const net *nt, const br_chain *c, int k)
{
    char n0[16], n1[16], n2[16], name[16];
    snprintf(name, sizeof name, "D%d", k);
    const elem *d = find(nt, name);
    CU_ASSERT_PTR_NOT_NULL_FATAL(d);
    const br_stage *st = &c->st[k];
    /* an injection: its source on the switch's own source, no rail k-1 */
    if (st->inject) {
        snprintf(name, sizeof name, "VINJ%d", k);
        const elem *v = need(nt, name, nd(n0, "i", k), nd(n2, "s", k));
        CU_ASSERT_PTR_NOT_NULL(v);
        CU_ASSERT_PTR_NOT_NULL(v ? strstr(v->line, "PWL(") : NULL);
    }
    CU_ASSERT_STRING_EQUAL(d->tok[1], st->inject ? nd(n0, "i", k) : nd(n0, "r", k - 1));
    snprintf(name, sizeof name, "RL%d", k);
    const elem *r = need(nt, name, nd(n1, "a", k), nd(n2, "r", k));
    CU_ASSERT_STRING_EQUAL(d->tok[2], n1);
    /* the link resistor plus the return switch's on-resistance (an
     * injection: its own resistance alone) */
    if (r)
        BR_ASSERT_REL(value(r, 3), st->r_link + (st->inject ? 0.0 : c->st[k - 1].sw.rds_on), 1e-5);
}

/* Rail k's capacitor from rK through its ESR to the source of switch k. */
static void check_rail(const net *nt, const br_chain *c, int k)
{
    char n0[16], n1[16], n2[16], name[16];
    snprintf(name, sizeof name, "C%d", k);
    const elem *cap = need(nt, name, nd(n0, "r", k), nd(n1, "e", k));
    snprintf(name, sizeof name, "RESR%d", k);
    const elem *esr = need(nt, name, nd(n1, "e", k), nd(n2, "s", k));
    if (cap)
        BR_ASSERT_REL(value(cap, 3), br_cap_at(&c->st[k].cap, c->vsupply), 1e-5);
    if (esr)
        BR_ASSERT_REL(value(esr, 3), c->st[k].cap.esr, 1e-5);
}

/* Driver k: its UVLO switch watches rail k; its running load sits on it. */
static void check_driver(const net *nt, const br_chain *c, int k)
{
    char r[16], s[16], u[16], name[16];
    snprintf(name, sizeof name, "SUV%d", k);
    const elem *sw = need(nt, name, "one", nd(u, "u", k));
    if (sw) {
        CU_ASSERT_STRING_EQUAL(sw->tok[3], nd(r, "r", k));
        CU_ASSERT_STRING_EQUAL(sw->tok[4], nd(s, "s", k));
    }
    snprintf(name, sizeof name, "GRUN%d", k);
    const elem *g = need(nt, name, nd(r, "r", k), nd(s, "s", k));
    const br_stage *st = &c->st[k];
    if (g) {
        CU_ASSERT_STRING_EQUAL(g->tok[3], u);
        BR_ASSERT_REL(value(g, 5), st->drv.iq_on + st->drv.i_iso, 1e-5);
    }
    if (!(st->sw.qg > 0.0))
        return;
    /* the gate charge: pulses on gK drawn from rail k while it runs */
    snprintf(name, sizeof name, "BQG%d", k);
    const elem *b = need(nt, name, nd(r, "r", k), nd(s, "s", k));
    char want[64];
    snprintf(want, sizeof want, "I=V(u%d)*V(g%d)", k, k);
    if (b)
        CU_ASSERT_PTR_NOT_NULL(strstr(b->line, want));
    snprintf(name, sizeof name, "VG%d", k);
    need(nt, name, nd(u, "g", k), "0");
}

/* Switch k between the sources of switches k and k+1, following its
 * command cK while driver k runs. */
static void check_switch(const net *nt, int k)
{
    char a[16], b[16], name[16], want[64];
    snprintf(name, sizeof name, "BSW%d", k);
    const elem *e = need(nt, name, nd(a, "s", k + 1), nd(b, "s", k));
    snprintf(want, sizeof want, "V(u%d)*V(c%d)", k, k);
    if (e)
        CU_ASSERT_PTR_NOT_NULL(strstr(e->line, want));
    snprintf(name, sizeof name, "VC%d", k);
    need(nt, name, nd(a, "c", k), "0");
}

/* A voltage source holds node against 0 (a command, a pulse train). */
static int driven(const net *nt, const char *node)
{
    for (int i = 0; i < nt->n; i++)
        if (nt->e[i].tok[0][0] == 'V' && strcmp(nt->e[i].tok[1], node) == 0 &&
            strcmp(nt->e[i].tok[2], "0") == 0)
            return 1;
    return 0;
}

/* Every node reaches node 0 through elements, and every node but one a
 * source holds against 0 joins at least two terminals. */
static void check_nodes(const net *nt)
{
    static char node[2 * MAXE][48];
    static int uses[2 * MAXE], comp[2 * MAXE];
    int nn = 0;
    for (int i = 0; i < nt->n; i++)
        for (int t = 1; t <= nterm(&nt->e[i]); t++) {
            int j = 0;
            while (j < nn && strcmp(node[j], nt->e[i].tok[t]) != 0)
                j++;
            if (j == nn) {
                snprintf(node[nn], sizeof node[0], "%s", nt->e[i].tok[t]);
                uses[nn] = 0;
                comp[nn] = nn;
                nn++;
            }
            uses[j]++;
        }
    for (int j = 0; j < nn; j++)
        if (uses[j] < 2 && !driven(nt, node[j])) {
            fprintf(stderr, "\nnode %s joins %d terminal\n", node[j], uses[j]);
            CU_FAIL("a node hangs");
        }
    /* connectivity: merge the nodes of every element until nothing moves */
    for (int changed = 1; changed;) {
        changed = 0;
        for (int i = 0; i < nt->n; i++) {
            int m = 2 * MAXE, idx[4], nt_ = nterm(&nt->e[i]);
            for (int t = 0; t < nt_; t++) {
                for (idx[t] = 0; strcmp(node[idx[t]], nt->e[i].tok[t + 1]) != 0; idx[t]++)
                    ;
                m = comp[idx[t]] < m ? comp[idx[t]] : m;
            }
            for (int t = 0; t < nt_; t++)
                if (comp[idx[t]] != m)
                    comp[idx[t]] = m, changed = 1;
        }
    }
    int ground = -1;
    for (int j = 0; j < nn; j++)
        if (strcmp(node[j], "0") == 0)
            ground = comp[j];
    CU_ASSERT_NOT_EQUAL_FATAL(ground, -1);
    for (int j = 0; j < nn; j++)
        if (comp[j] != ground) {
            fprintf(stderr, "\nnode %s is cut off from node 0\n", node[j]);
            CU_FAIL("a node is cut off");
        }
}

/* ---- the numbers --------------------------------------------------------------- */

/* The .model dmK line of link k's diode through the SPICE reader. */
static void check_diode_model(const net *nt, const br_chain *c, int k, br_spice_model *m)
{
    char name[16], text[512];
    const elem *d = find(nt, (snprintf(name, sizeof name, "D%d", k), name));
    CU_ASSERT_PTR_NOT_NULL_FATAL(d);
    int found = 0;
    for (int i = 0; i < nt->nmodel && !found; i++) {
        char mname[48];
        if (sscanf(nt->model[i], ".model %47s", mname) == 1 && strcmp(mname, d->tok[3]) == 0) {
            snprintf(text, sizeof text, "%s", nt->model[i]);
            found = 1;
        }
    }
    CU_ASSERT_TRUE_FATAL(found);
    br_error err;
    br_error_clear(&err);
    CU_ASSERT_EQUAL_FATAL(br_spice_model_parse(text, "net", 1, "netlist", m, &err), BR_OK);
    const br_diode *dd = &c->st[k].diode;
    BR_ASSERT_REL(m->v[BR_SP_IS], dd->is, 1e-5);
    BR_ASSERT_REL(m->v[BR_SP_N], dd->n, 1e-5);
    BR_ASSERT_REL(m->v[BR_SP_RS], dd->rs, 1e-5);
    BR_ASSERT_REL(m->v[BR_SP_CJO], dd->cj0, 1e-5);
    BR_ASSERT_REL(m->v[BR_SP_VJ], dd->vj, 1e-5);
    BR_ASSERT_REL(m->v[BR_SP_M], dd->m, 1e-5);
    BR_ASSERT_NEAR(m->v[BR_SP_TT], dd->tau, 1e-5 * dd->tau + 1e-30);
}

/* The UVLO switch model: VT -+ VH are UVLO falling and rising. */
static void check_uvlo_model(const net *nt, const br_chain *c, int k)
{
    char name[16], mname[48];
    const elem *s = find(nt, (snprintf(name, sizeof name, "SUV%d", k), name));
    CU_ASSERT_PTR_NOT_NULL_FATAL(s);
    for (int i = 0; i < nt->nmodel; i++) {
        double vt, vh;
        char a[48], b[48];
        if (sscanf(nt->model[i], ".model %47s SW(VT=%47s VH=%47s", mname, a, b) == 3 &&
            strcmp(mname, s->tok[5]) == 0) {
            CU_ASSERT_EQUAL(br_spice_number(a, &vt), 0);
            CU_ASSERT_EQUAL(br_spice_number(b, &vh), 0);
            BR_ASSERT_REL(vt + vh, c->st[k].drv.uvlo_rise, 1e-5);
            BR_ASSERT_REL(vt - vh, c->st[k].drv.uvlo_fall, 1e-5);
            return;
        }
    }
    CU_FAIL("no UVLO switch model");
}

/* The PWL points of VCk. */
static int pwl_points(const net *nt, int k, double *t, double *v)
{
    char name[16];
    const elem *e = find(nt, (snprintf(name, sizeof name, "VC%d", k), name));
    CU_ASSERT_PTR_NOT_NULL_FATAL(e);
    const char *p = strstr(e->line, "PWL(");
    CU_ASSERT_PTR_NOT_NULL_FATAL(p);
    p += 4;
    int n = 0, used;
    while (n < MAXPTS && sscanf(p, " %lf %lf%n", &t[n], &v[n], &used) == 2) {
        n++;
        p += used;
    }
    return n;
}

/* Time within [a, b] that the PWL spends below level, integrating each
 * linear piece exactly. */
static double time_below(const double *t, const double *v, int n, double a, double b, double level)
{
    double sum = 0.0;
    for (int i = 0; i + 1 < n; i++) {
        double t0 = t[i], t1 = t[i + 1], v0 = v[i], v1 = v[i + 1];
        double lo = t0 > a ? t0 : a, hi = t1 < b ? t1 : b;
        if (!(hi > lo))
            continue;
        double va = v0 + (v1 - v0) * (lo - t0) / (t1 - t0);
        double vb = v0 + (v1 - v0) * (hi - t0) / (t1 - t0);
        if (va < level && vb < level)
            sum += hi - lo;
        else if ((va < level) != (vb < level)) {
            double tx = lo + (hi - lo) * (level - va) / (vb - va);
            sum += va < level ? tx - lo : hi - tx;
        }
    }
    return sum;
}

static double span(double a, double b, double T)
{
    double d = b - a;
    return d > 0 ? d : d + T;
}

/* Switch k's command: rising times from 0 to the end of the run, levels
 * from the chain (blocking, on, reverse), and the time it conducts in a
 * period (second one, away from the start) equal to its on-windows and
 * reverse windows (hand: each edge crosses half the blocking voltage
 * half-way, at turn-on and at turn-off alike, so the edges cancel). */
static void check_command(const net *nt, const br_chain *c, int k, int dir, long periods)
{
    static double t[MAXPTS], v[MAXPTS];
    int n = pwl_points(nt, k, t, v);
    CU_ASSERT_TRUE_FATAL(n >= 2);
    CU_ASSERT_EQUAL(t[0], 0.0);
    BR_ASSERT_REL(t[n - 1], periods * c->T, 1e-9);
    for (int i = 1; i < n; i++)
        if (!(t[i] > t[i - 1])) {
            fprintf(stderr, "\nVC%d: time %.10g after %.10g\n", k, t[i], t[i - 1]);
            CU_FAIL("PWL times do not rise");
            break;
        }
    const br_stage *st = &c->st[k];
    double iload = dir == BR_DIRI_NONE ? 0.0 : c->iload;
    double on = br_sw_on_drop(st, dir, iload), rev = -br_sw_rev_drop(&st->sw, iload);
    for (int i = 0; i < n; i++)
        if (!br_near(v[i], st->vblock, 1e-5 * st->vblock) && !br_near(v[i], on, 1e-5) &&
            !br_near(v[i], rev, 1e-5)) { /* written with 6 digits */
            fprintf(stderr, "\nVC%d: level %g is none of %g, %g, %g\n", k, v[i], st->vblock, on,
                    rev);
            CU_FAIL("a PWL level the chain does not have");
            break;
        }
    double want = 0.0;
    for (int w = 0; w < st->nwin; w++)
        want += span(st->win[w][0], st->win[w][1], c->T);
    for (int w = 0; dir != BR_DIRI_NONE && w < st->nrev[dir]; w++)
        want += span(st->rev[dir][w][0], st->rev[dir][w][1], c->T);
    double got = time_below(t, v, n, c->T, 2.0 * c->T, 0.5 * st->vblock);
    BR_ASSERT_NEAR(got, want, 1e-4 * c->T);
}

/* Area of the PWL over [a, b], trapezoid by trapezoid. */
static double area(const double *t, const double *v, int n, double a, double b)
{
    double sum = 0.0;
    for (int i = 0; i + 1 < n; i++) {
        double lo = t[i] > a ? t[i] : a, hi = t[i + 1] < b ? t[i + 1] : b;
        if (!(hi > lo))
            continue;
        double sl = (v[i + 1] - v[i]) / (t[i + 1] - t[i]);
        sum += (hi - lo) * (v[i] + sl * (lo - t[i]) + v[i] + sl * (hi - t[i])) / 2.0;
    }
    return sum;
}

/* Driver k's gate pulses carry Qg (at its stated drive voltage) for each
 * turn-on of switch k in a period: hand, the area of a pulse of Qg/tg for
 * tg with 1 ps edges is (Qg/tg) tg = Qg. */
static void check_gate(const net *nt, const br_chain *c, int k, int dir)
{
    static double t[MAXPTS], v[MAXPTS];
    char name[16];
    const elem *e = find(nt, (snprintf(name, sizeof name, "VG%d", k), name));
    CU_ASSERT_PTR_NOT_NULL_FATAL(e);
    const char *p = strstr(e->line, "PWL(") + 4;
    int n = 0, used;
    while (n < MAXPTS && sscanf(p, " %lf %lf%n", &t[n], &v[n], &used) == 2) {
        n++;
        p += used;
    }
    br_timing tm;
    br_timing_build(c, dir, &tm);
    int ons = 0;
    for (int i = 0; i < tm.nev; i++)
        ons += tm.ev[i].sw == k && tm.ev[i].kind == BR_EV_ON;
    CU_ASSERT_TRUE(ons >= 1);
    BR_ASSERT_REL(area(t, v, n, c->T, 2.0 * c->T), ons * c->st[k].sw.qg, 1e-4);
}

static br_chain *chain_of(const char *path, br_design **d)
{
    br_error err;
    br_chain *c = NULL;
    char buf[1600];
    br_error_clear(&err);
    if (br_design_load(path, d, &err) != BR_OK || br_chain_build(*d, &c, &err) != BR_OK)
        fprintf(stderr, "\n%s\n", br_error_format(&err, buf, sizeof buf));
    return c;
}

static void check_example(const char *path, long periods)
{
    br_design *d = NULL;
    br_chain *c = chain_of(path, &d);
    CU_ASSERT_PTR_NOT_NULL_FATAL(c);
    br_netlist_opts o = {br_netlist_default_dir(c), periods, "test"};
    CU_ASSERT_EQUAL(o.dir, BR_DIRI_DOWN); /* the examples carry current both ways */
    br_text *t = br_text_create();
    br_error err;
    br_error_clear(&err);
    CU_ASSERT_EQUAL_FATAL(br_netlist_render(c, &o, t, &err), BR_OK);
    static net nt;
    read_net(&nt, br_text_data(t));
    CU_ASSERT_PTR_NOT_NULL(strstr(nt.title, "netlist of design"));
    CU_ASSERT_TRUE(nt.ended);
    need(&nt, "VSUP", "vs", "0");
    need(&nt, "RSUP", "vs", "r0");
    for (int k = 0; k < c->n; k++) {
        check_driver(&nt, c, k);
        check_uvlo_model(&nt, c, k);
        check_gate(&nt, c, k, o.dir);
        if (k + 1 < c->n) {
            check_switch(&nt, k);
            check_command(&nt, c, k, o.dir, periods);
        }
        if (k >= 1) {
            br_spice_model m;
            check_link(&nt, c, k);
            check_rail(&nt, c, k);
            check_diode_model(&nt, c, k, &m);
        }
    }
    /* switches 0..n-2, drivers, links and rails, the supply, nothing else */
    int want = (c->n - 1) * 2 + c->n * 3 + (c->n - 1) * 4 + 3 + (c->csupply > 0);
    for (int k = 1; k < c->n; k++)
        want += c->st[k].inject; /* its source */
    for (int k = 0; k < c->n; k++)
        want += (c->st[k].drv.iq_off > 0) + 2 * (c->st[k].sw.qg > 0);
    CU_ASSERT_EQUAL(nt.n, want);
    check_nodes(&nt);
    CU_ASSERT_PTR_NOT_NULL_FATAL(nt.tran);
    double tstep, tstop;
    CU_ASSERT_EQUAL(sscanf(nt.tran, ".tran %lf %lf", &tstep, &tstop), 2);
    BR_ASSERT_REL(tstop, periods * c->T, 1e-9);
    free(nt.text);
    br_text_free(t);
    br_chain_free(c);
    br_design_free(d);
}

static void test_demo(void)
{
    check_example("examples/demo-3level.xml", 3);
}

static void test_leg(void)
{
    check_example("examples/leg-7level.xml", 2);
}

/* A split chain: rail 4 fed by its injection's source, no link from
 * rail 3. */
static void test_split(void)
{
    check_example("examples/split-5level.xml", 2);
}

/* Every design of the test data and the extremes that loads at a DC
 * operating point: switch waveforms whose times rise to the end of the
 * run (a ramp that ended at the last instant once gave a time twice),
 * with the chain's levels and on-times.  A design the reader refuses, or
 * a line cycle, is skipped: not this test's business. */
static void check_dir(const char *dirname, int *checked)
{
    char path[512];
    DIR *dir = opendir(dirname);
    CU_ASSERT_PTR_NOT_NULL_FATAL(dir);
    for (struct dirent *e; (e = readdir(dir)) != NULL;) {
        size_t l = strlen(e->d_name);
        if (l < 5 || strcmp(e->d_name + l - 4, ".xml") != 0)
            continue;
        snprintf(path, sizeof path, "%s/%s", dirname, e->d_name);
        br_design *d = NULL;
        br_chain *c = NULL;
        br_error err;
        br_error_clear(&err);
        if (br_design_load(path, &d, &err) == BR_OK && br_chain_build(d, &c, &err) == BR_OK &&
            !c->line.on) {
            br_netlist_opts o = {br_netlist_default_dir(c), 3, "test"};
            br_text *t = br_text_create();
            CU_ASSERT_EQUAL_FATAL(br_netlist_render(c, &o, t, &err), BR_OK);
            static net nt;
            read_net(&nt, br_text_data(t));
            for (int k = 0; k + 1 < c->n; k++)
                check_command(&nt, c, k, o.dir, 3);
            check_nodes(&nt);
            free(nt.text);
            br_text_free(t);
            (*checked)++;
        }
        br_chain_free(c);
        br_design_free(d);
    }
    closedir(dir);
}

static void test_every_design(void)
{
    int checked = 0;
    check_dir("tests/data", &checked);
    check_dir("tests/extreme", &checked);
    CU_ASSERT_TRUE(checked >= 15);
}

/* A diode given by a SPICE .model line comes back out with the same
 * numbers (TNOM and the ambient both 27 C, so IS is not rescaled), BV and
 * IBV included. */
static const char SPICE_DESIGN[] =
    "<?xml version=\"1.0\"?>\n"
    "<bootrung-design version=\"1\" name=\"spice-trip\">\n"
    "  <operating-point vin=\"48 V\" fsw=\"200 kHz\" duty=\"0.4\" dead-time=\"50 ns\"\n"
    "                   current=\"step-up\" load-current=\"3 A\" ambient=\"27 C\"/>\n"
    "  <supply voltage=\"10 V\" resistance=\"0.2 ohm\"/>\n"
    "  <topology><fcml levels=\"3\"/></topology>\n"
    "  <parts>\n"
    "    <diode id=\"fast\" vrrm=\"100 V\">\n"
    "      <spice-model>.model dx D(IS=2.5n N=1.8 RS=0.12 CJO=15p VJ=0.75 M=0.4\n"
    "      + TT=30n EG=1.2 XTI=2.5 BV=120 IBV=10u)</spice-model>\n"
    "    </diode>\n"
    "    <capacitor id=\"c1\" c=\"4.7 uF\" esr=\"5 mohm\" rating=\"25 V\"/>\n"
    "    <driver id=\"g\" uvlo-rise=\"7 V\" uvlo-fall=\"6.5 V\" iq-run=\"1 mA\"/>\n"
    "    <switch id=\"q\" qg=\"10 nC\" rds-on=\"20 mohm\"/>\n"
    "  </parts>\n"
    "  <stages diode=\"fast\" capacitor=\"c1\" driver=\"g\" switch=\"q\" "
    "link-resistor=\"1 ohm\"/>\n"
    "</bootrung-design>\n";

static void test_spice_round_trip(void)
{
    br_design *d = NULL;
    br_chain *c = NULL;
    br_error err;
    char buf[1600];
    br_error_clear(&err);
    int rc = br_design_load_memory(SPICE_DESIGN, strlen(SPICE_DESIGN), "trip.xml", &d, &err);
    if (rc == BR_OK) {
        /* a newline in a path must not end a comment and start an element */
        snprintf(d->path, sizeof d->path, "trip\n.model evil D(IS=1)");
        rc = br_chain_build(d, &c, &err);
    }
    if (rc != BR_OK)
        fprintf(stderr, "\n%s\n", br_error_format(&err, buf, sizeof buf));
    CU_ASSERT_EQUAL_FATAL(rc, BR_OK);
    br_netlist_opts o = {br_netlist_default_dir(c), 2, "test"};
    CU_ASSERT_EQUAL(o.dir, BR_DIRI_UP);
    br_text *t = br_text_create();
    CU_ASSERT_EQUAL_FATAL(br_netlist_render(c, &o, t, &err), BR_OK);
    static net nt;
    read_net(&nt, br_text_data(t));
    CU_ASSERT_PTR_NOT_NULL(strstr(br_text_data(t), "* From trip?.model evil"));
    br_spice_model m;
    check_diode_model(&nt, c, 1, &m);
    /* as written in the design: the chain resolves at 27 C = TNOM */
    BR_ASSERT_REL(m.v[BR_SP_IS], 2.5e-9, 1e-5);
    BR_ASSERT_REL(m.v[BR_SP_N], 1.8, 1e-5);
    BR_ASSERT_REL(m.v[BR_SP_RS], 0.12, 1e-5);
    BR_ASSERT_REL(m.v[BR_SP_CJO], 15e-12, 1e-5);
    BR_ASSERT_REL(m.v[BR_SP_VJ], 0.75, 1e-5);
    BR_ASSERT_REL(m.v[BR_SP_M], 0.4, 1e-5);
    BR_ASSERT_REL(m.v[BR_SP_TT], 30e-9, 1e-5);
    BR_ASSERT_REL(m.v[BR_SP_EG], 1.2, 1e-5);
    BR_ASSERT_REL(m.v[BR_SP_XTI], 2.5, 1e-5);
    BR_ASSERT_REL(m.v[BR_SP_BV], 120.0, 1e-5);
    BR_ASSERT_REL(m.v[BR_SP_IBV], 10e-6, 1e-5);
    /* every link shares the one part's model */
    CU_ASSERT_EQUAL(nt.nmodel, 2);
    for (int k = 0; k + 1 < c->n; k++)
        check_command(&nt, c, k, o.dir, 2);
    /* a direction the design does not carry, and a period count out of range */
    o.dir = BR_DIRI_DOWN;
    CU_ASSERT_EQUAL(br_netlist_render(c, &o, t, &err), BR_EINPUT);
    CU_ASSERT_STRING_EQUAL(err.field, "current");
    o.dir = BR_DIRI_UP;
    o.periods = BR_NETLIST_MAX_PERIODS + 1;
    CU_ASSERT_EQUAL(br_netlist_render(c, &o, t, &err), BR_EINPUT);
    free(nt.text);
    br_text_free(t);
    br_chain_free(c);
    br_design_free(d);
}

/* ---- the verb ------------------------------------------------------------------- */

static void test_help_golden(void)
{
    CU_ASSERT_TRUE(help_is_golden("netlist"));
}

static void test_verb(void)
{
    const char *path = "test_cli_netlist.out.cir";
    remove(path);
    run_result r = run((const char *[]){"netlist", "--quiet", "--periods", "4", "--out", path,
                                        "examples/demo-3level.xml", NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(has(r.out, "netlist: design demo-3level, 4 switches, 3 links, 4 periods"));
    CU_ASSERT_PTR_NULL(strchr(r.out, '\n') ? strchr(strchr(r.out, '\n') + 1, '\n') : NULL);
    done(&r);
    char *file = br_test_slurp(path, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(file);
    /* the same netlist as on stdout */
    r = run((const char *[]){"netlist", "--periods", "4", "examples/demo-3level.xml", NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_STRING_EQUAL(r.out, file);
    CU_ASSERT_TRUE(has(r.out, "lethal voltages"));
    done(&r);
    free(file);
    remove(path);
    /* no load current: no reverse conduction, only blocking and 0 V on */
    r = run((const char *[]){"netlist", "--current", "none", "--periods", "1",
                             "examples/demo-3level.xml", NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(has(r.out, "load current 0 A (none)"));
    CU_ASSERT_PTR_NULL(strstr(r.out, " -1.1"));
    done(&r);
}

static void test_refusals(void)
{
    static const char *const cases[][6] = {
        {"netlist", "--current", "sideways", "examples/demo-3level.xml", NULL, "--current"},
        {"netlist", "--periods", "0", "examples/demo-3level.xml", NULL, "--periods"},
        {"netlist", "examples/inverter-7level.xml", NULL, NULL, NULL, "line-cycle"},
        {"netlist", "tests/bad/spice-model-range.xml", NULL, NULL, NULL, "spice-model: M"},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        run_result r = run(cases[i]);
        CU_ASSERT_EQUAL(r.status, 2);
        CU_ASSERT_STRING_EQUAL(r.out, "");
        CU_ASSERT_TRUE(has(r.err, cases[i][5]));
        CU_ASSERT_PTR_NOT_NULL(strchr(r.err, '\n'));
        CU_ASSERT_EQUAL(strchr(r.err, '\n') - r.err + 1, (long)strlen(r.err)); /* one line */
        done(&r);
    }
}

int main(void)
{
    static const br_test_case cases[] = {
        {"demo: every element, its nodes and numbers", test_demo},
        {"7-level leg: every element, its nodes and numbers", test_leg},
        {"a .model line from the design comes back", test_spice_round_trip},
        {"the split example: an injection's source and diode", test_split},
        {"every test design: waveforms and nodes", test_every_design},
        {"help (golden)", test_help_golden},
        {"the verb: --out, --quiet, stdout, --current none", test_verb},
        {"bad input and usage: exit 2, one line", test_refusals},
        {NULL, NULL},
    };
    if (chdir(BR_SOURCE_DIR) != 0)
        return 2;
    return br_test_main("cli_netlist", cases);
}

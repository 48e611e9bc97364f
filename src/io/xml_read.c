/* xml_read.c - tree helpers, located errors, quantities and the structural
 * diagnosis of a design document. */
#include "io/xml_read.h"

#include "core/error.h"

#include <ctype.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <string.h>

#define ATTR_MAX 1024 /* longest attribute value read (a precharge list) */
#define WHERE_MAX 96

const br_range br_range_pos = {0.0, INFINITY, 1, 1, "a value > 0"};
const br_range br_range_nonneg = {0.0, INFINITY, 0, 1, "a value >= 0"};

/* ---- tree --------------------------------------------------------------- */

static int is_named(xmlNode *n, const char *name)
{
    return n->type == XML_ELEMENT_NODE && (!name || xmlStrcmp(n->name, BAD_CAST name) == 0);
}

xmlNode *br_xml_child(xmlNode *n, const char *name)
{
    for (xmlNode *c = n ? n->children : NULL; c; c = c->next)
        if (is_named(c, name))
            return c;
    return NULL;
}

xmlNode *br_xml_next(xmlNode *c, const char *name)
{
    for (c = c ? c->next : NULL; c; c = c->next)
        if (is_named(c, name))
            return c;
    return NULL;
}

int br_xml_count(xmlNode *n, const char *name)
{
    int k = 0;
    for (xmlNode *c = br_xml_child(n, name); c; c = br_xml_next(c, name))
        k++;
    return k;
}

int br_xml_line(xmlNode *n)
{
    long l = n ? xmlGetLineNo(n) : 0;
    return (l > 0 && l < 0x7fffffffL) ? (int)l : 0;
}

int br_xml_attr(xmlNode *n, const char *attr, char *buf, size_t cap)
{
    xmlChar *v = xmlGetNoNsProp(n, BAD_CAST attr);
    if (!v)
        return 0;
    int fits = (size_t)snprintf(buf, cap, "%s", (const char *)v) < cap;
    xmlFree(v);
    return fits ? 1 : -1;
}

/* ---- where things are ----------------------------------------------------- */

static int ordinal(xmlNode *n)
{
    int k = 1;
    for (xmlNode *c = n->prev; c; c = c->prev)
        if (is_named(c, (const char *)n->name))
            k++;
    return k;
}

/* Elements that repeat without a name of their own are counted. */
static int is_counted(const char *name)
{
    static const char *const counted[] = {"forward", "bias",      "temp", "on",
                                          "reverse", "precharge", "duty", NULL};
    for (int i = 0; counted[i]; i++)
        if (strcmp(name, counted[i]) == 0)
            return 1;
    return 0;
}

void br_xml_where(xmlNode *n, char *buf, size_t cap)
{
    static const char *const keys[] = {"id", "name", "index", NULL};
    char v[WHERE_MAX];
    const char *name = (const char *)n->name;
    if (is_counted(name) && n->parent && n->parent->type == XML_ELEMENT_NODE) {
        char up[WHERE_MAX];
        br_xml_where(n->parent, up, sizeof up);
        snprintf(buf, cap, "%s %s %d", up, name, ordinal(n));
        return;
    }
    for (int i = 0; keys[i]; i++)
        if (strcmp(name, "bootrung-design") != 0 && br_xml_attr(n, keys[i], v, sizeof v) == 1) {
            snprintf(buf, cap, "%s %s", name, v);
            return;
        }
    snprintf(buf, cap, "%s", name);
}

/* Offset of the first byte of 1-based line `line` (len if past the end). */
static size_t line_offset(const br_rd *r, int line)
{
    size_t p = 0;
    for (int l = 1; l < line && p < r->len; p++)
        if (r->buf[p] == '\n')
            l++;
    return p;
}

static int line_of(const br_rd *r, size_t off)
{
    int line = 1;
    for (size_t p = 0; p < off && p < r->len; p++)
        line += (r->buf[p] == '\n');
    return line;
}

static int is_name_end(char c)
{
    return isspace((unsigned char)c) || c == '/' || c == '>';
}

/* Start of the last "<name" tag that begins before `end`. */
static int find_tag(const br_rd *r, const char *name, size_t end, size_t *at)
{
    size_t nl = strlen(name);
    for (size_t p = end; p-- > 0;)
        if (r->buf[p] == '<' && p + 1 + nl < r->len && memcmp(r->buf + p + 1, name, nl) == 0 &&
            is_name_end(r->buf[p + 1 + nl])) {
            *at = p;
            return 1;
        }
    return 0;
}

/* Offset of attribute attr inside the start tag at `tag` (quotes skipped). */
static int find_attr(const br_rd *r, size_t tag, const char *attr, size_t *at)
{
    size_t al = strlen(attr);
    char quote = 0;
    for (size_t p = tag + 1; p < r->len; p++) {
        char c = r->buf[p];
        if (quote) {
            quote = (c == quote) ? 0 : quote;
            continue;
        }
        if (c == '"' || c == '\'') {
            quote = c;
            continue;
        }
        if (c == '>')
            return 0;
        if (isspace((unsigned char)r->buf[p - 1]) && p + al < r->len &&
            memcmp(r->buf + p, attr, al) == 0) {
            size_t q = p + al;
            while (q < r->len && isspace((unsigned char)r->buf[q]))
                q++;
            if (q < r->len && r->buf[q] == '=') {
                *at = p;
                return 1;
            }
        }
    }
    return 0;
}

/* Line of the start of element n's tag.  libxml2 records the line where
 * the start tag ends; the text tells where it begins. */
int br_rd_line(const br_rd *r, xmlNode *n)
{
    int line = br_xml_line(n);
    size_t tag;
    if (!r->buf || line <= 0 || !find_tag(r, (const char *)n->name, line_offset(r, line + 1), &tag))
        return line;
    return line_of(r, tag);
}

/* A start tag spread over several lines is searched in the text so that
 * a message points at the attribute itself. */
int br_xml_attr_line(const br_rd *r, xmlNode *n, const char *attr)
{
    int line = br_xml_line(n);
    size_t tag, at;
    if (!r->buf || line <= 0 || !find_tag(r, (const char *)n->name, line_offset(r, line + 1), &tag))
        return line;
    return line_of(r, (attr && find_attr(r, tag, attr, &at)) ? at : tag);
}

/* ---- errors ---------------------------------------------------------------- */

int br_rd_fail(br_rd *r, xmlNode *n, const char *attr, const char *fmt, ...)
{
    char where[WHERE_MAX], field[2 * WHERE_MAX], msg[sizeof r->err->msg];
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(msg, sizeof msg, fmt, ap);
    va_end(ap);
    br_xml_where(n, where, sizeof where);
    if (attr)
        snprintf(field, sizeof field, "%s: %s", where, attr);
    else
        snprintf(field, sizeof field, "%s", where);
    int line = attr ? br_xml_attr_line(r, n, attr) : br_rd_line(r, n);
    return br_error_set(r->err, BR_EINPUT, r->file, line, field, "%s", msg);
}

/* ---- values ---------------------------------------------------------------- */

static int in_range(double v, const br_range *g)
{
    if (isnan(v))
        return 0;
    if (g->lo_open ? !(v > g->lo) : !(v >= g->lo))
        return 0;
    return g->hi_open ? v < g->hi : v <= g->hi;
}

static int range_fail(br_rd *r, xmlNode *n, const char *attr, const char *text, const br_qty *q,
                      br_kind kind, const br_range *g)
{
    if (!in_range(q->nom, g))
        return br_rd_fail(r, n, attr, "got '%s', expected %s", text, g->expect);
    int low = !in_range(q->min, g);
    const char *unit = br_kind_unit(kind);
    return br_rd_fail(r, n, attr, "'%s' reaches %g%s%s at its %s limit, expected %s", text,
                      low ? q->min : q->max, unit[0] ? " " : "", unit, low ? "lower" : "upper",
                      g->expect);
}

/* Re-home an error of the units parser at attribute attr of n. */
static int unit_fail(br_rd *r, xmlNode *n, const char *attr, const br_error *e)
{
    return br_rd_fail(r, n, attr, "%s", e->msg);
}

/* Attribute attr of n as text (ATTR_MAX bytes): *got is 1 when present
 * (and *present likewise, when asked).  Returns the located error for a
 * value too long to hold, BR_OK otherwise. */
static int attr_text(br_rd *r, xmlNode *n, const char *attr, char *text, int *got, int *present)
{
    int has = br_xml_attr(n, attr, text, ATTR_MAX);
    if (present)
        *present = has != 0;
    *got = has > 0;
    if (has < 0)
        return br_rd_fail(r, n, attr, "value longer than %d characters, expected at most %d",
                          ATTR_MAX - 1, ATTR_MAX - 1);
    return BR_OK;
}

int br_rd_qty(br_rd *r, xmlNode *n, const char *attr, br_kind kind, const br_range *range,
              br_qty *q, int *present)
{
    char text[ATTR_MAX];
    br_error e;
    br_qty v;
    int got, rc = attr_text(r, n, attr, text, &got, present);
    if (rc != BR_OK || !got)
        return rc;
    br_error_clear(&e);
    if (br_qty_parse(text, kind, &v, &e) != BR_OK)
        return unit_fail(r, n, attr, &e);
    if (range && !(in_range(v.min, range) && in_range(v.max, range)))
        return range_fail(r, n, attr, text, &v, kind, range);
    v.line = br_xml_attr_line(r, n, attr);
    *q = v;
    return BR_OK;
}

int br_rd_value(br_rd *r, xmlNode *n, const char *attr, br_kind kind, const br_range *range,
                double *v, int *present)
{
    char text[ATTR_MAX];
    br_error e;
    double x;
    int got, rc = attr_text(r, n, attr, text, &got, present);
    if (rc != BR_OK || !got)
        return rc;
    br_error_clear(&e);
    if (br_unit_parse(text, kind, &x, &e) != BR_OK)
        return unit_fail(r, n, attr, &e);
    if (range && !in_range(x, range))
        return br_rd_fail(r, n, attr, "got '%s', expected %s", text, range->expect);
    *v = x;
    return BR_OK;
}

int br_rd_int(br_rd *r, xmlNode *n, const char *attr, int lo, int hi, int *v)
{
    char text[32];
    int has = br_xml_attr(n, attr, text, sizeof text);
    const char *p = text;
    long x = 0;
    if (has == 0)
        return br_rd_fail(r, n, attr, "missing, expected a whole number from %d to %d", lo, hi);
    while (has > 0 && isspace((unsigned char)*p))
        p++;
    int ndig = 0;
    for (; has > 0 && isdigit((unsigned char)*p); p++, ndig++)
        x = x < 100000 ? x * 10 + (*p - '0') : x;
    while (has > 0 && isspace((unsigned char)*p))
        p++;
    if (has < 0 || ndig == 0 || *p)
        return br_rd_fail(r, n, attr, "got '%.24s', expected a whole number from %d to %d",
                          has < 0 ? "(too long)" : text, lo, hi);
    if (x < lo || x > hi)
        return br_rd_fail(r, n, attr, "got %ld, expected a whole number from %d to %d", x, lo, hi);
    *v = (int)x;
    return BR_OK;
}

/* ---- structural diagnosis --------------------------------------------------
 *
 * The schema says whether a document is valid; libxml2's messages for a
 * missing or misspelt attribute do not say which one.  This table restates
 * the element and attribute names of design.rng so that the first such
 * fault can be named.  It must never be stricter than the schema (it only
 * runs after validation failed, and order and counts stay the schema's
 * job). */

typedef struct rule {
    const char *parent;   /* parent element, "" for the root */
    const char *name;     /* element */
    const char *attrs;    /* space separated; "!a" required; "a=x|y" enumerated */
    const char *children; /* space separated; "!a" at least one; "a|b" either */
    int ordered;          /* children at most once each, in the order listed */
} rule;

#define STAGE_ATTRS "rail-extra link-resistor diode-rth"
#define AUX_HEAT "power-rating rth tj-max"
static const rule rules[] = {
    {"", "bootrung-design", "!version=1 name",
     "!operating-point !supply injections !topology !parts !stages startup analysis", 1},
    {"bootrung-design", "operating-point",
     "!vin !fsw duty dead-time ambient current=step-down|step-up|both|none imbalance edge-time "
     "overshoot load-current load-from switch-tj",
     "line-cycle", 1},
    {"operating-point", "line-cycle", "!frequency !peak-current phase depth", "duty", 0},
    {"line-cycle", "duty", "!at !value", "", 0},
    {"bootrung-design", "supply",
     "!voltage resistance ramp bypass current-limit limit-mode=constant|foldback|hiccup "
     "foldback-current hiccup-delay hiccup-off hiccup-retries soft-start rating",
     "", 0},
    {"bootrung-design", "injections", "", "!injection", 0},
    {"injections", "injection",
     "!rail !voltage resistance diode start current-limit limit-mode=constant|foldback|hiccup "
     "foldback-current hiccup-delay hiccup-off hiccup-retries rating",
     "", 0},
    {"bootrung-design", "topology", "", "!fcml|string", 1},
    {"topology", "fcml", "!levels cfly", "", 0},
    {"topology", "string", "", "!switch", 0},
    {"string", "switch", "!name !vblock conducts=forward|reverse|none", "!on reverse", 0},
    {"switch", "on", "!from !to", "", 0},
    {"switch", "reverse", "!from !to", "", 0},
    {"bootrung-design", "parts", "", "diode capacitor driver switch regulator clamp", 0},
    {"parts", "diode",
     "!id source is n rs ref-temp cj0 vj m tau qrr if eg xti ir ir-temp ir-doubling vrrm ifsm ifrm "
     "i2t if-avg rth tj-max",
     "forward spice-model", 0},
    {"diode", "forward", "!i !v", "", 0},
    {"diode", "spice-model", "", "", 0},
    {"parts", "capacitor",
     "!id source !c esr rating temp-factor aging ripple dielectric=class-1|class-2|other",
     "bias temp", 0},
    {"capacitor", "bias", "!v !factor", "", 0},
    {"capacitor", "temp", "!t !factor", "", 0},
    {"parts", "driver", "!id source uvlo-rise uvlo-fall iq-run iq-uvlo iq-isolator gate-off", "",
     0},
    {"parts", "switch",
     "!id source rds-on rds-on-temp rds-on-exp rds-on-hot rds-on-hot-temp qg qg-at gate-pulse "
     "reverse=diode|channel vsd vth reverse-r vgs-rec vgs-max",
     "", 0},
    {"parts", "regulator", "!id source !vout dropout iq " AUX_HEAT, "", 0},
    {"parts", "clamp", "!id source !vz rz " AUX_HEAT, "", 0},
    {"bootrung-design", "stages", "!diode !capacitor !driver !switch " STAGE_ATTRS, "stage", 0},
    {"stages", "stage", "!index diode capacitor driver switch " STAGE_ATTRS, "", 0},
    {"bootrung-design", "startup", "", "precharge", 0},
    {"startup", "precharge", "!switches !duration", "", 0},
    {"bootrung-design", "analysis",
     "min-drive derating max-startup max-dropouts cap-derating hold-on", "", 0},
};

int br_xml_rule_count(void)
{
    return (int)(sizeof rules / sizeof rules[0]);
}

void br_xml_rule(int i, const char **parent, const char **name, const char **attrs,
                 const char **children)
{
    *parent = rules[i].parent;
    *name = rules[i].name;
    *attrs = rules[i].attrs;
    *children = rules[i].children;
}

static const rule *find_rule(const char *parent, const char *name)
{
    for (size_t i = 0; i < sizeof rules / sizeof rules[0]; i++)
        if (strcmp(rules[i].parent, parent) == 0 && strcmp(rules[i].name, name) == 0)
            return &rules[i];
    return NULL;
}

/* Copy the next space-separated token of a spec into tok; NULL at the end. */
static const char *next_token(const char *s, char *tok, size_t cap)
{
    while (*s == ' ')
        s++;
    if (!*s)
        return NULL;
    size_t n = 0;
    for (; *s && *s != ' '; s++)
        if (n + 1 < cap)
            tok[n++] = *s;
    tok[n] = '\0';
    return s;
}

/* The bare names of a spec, for "expected one of ..." lists. */
static void spec_names(const char *spec, char *buf, size_t cap)
{
    char tok[128];
    size_t n = 0;
    buf[0] = '\0';
    for (const char *s = spec; (s = next_token(s, tok, sizeof tok)) != NULL;) {
        char *t = tok + (tok[0] == '!');
        t[strcspn(t, "=")] = '\0';
        for (char *bar; (bar = strchr(t, '|')) != NULL;)
            *bar = ' ';
        if (n < cap)
            n += (size_t)snprintf(buf + n, cap - n, "%s%s", n ? " " : "", t);
    }
}

/* Find attribute name in an attrs spec; sets *values to its enumeration
 * ("x|y") or NULL, *required. */
static int spec_attr(const char *spec, const char *name, char *values, size_t cap, int *required)
{
    char tok[128];
    for (const char *s = spec; (s = next_token(s, tok, sizeof tok)) != NULL;) {
        char *t = tok + (tok[0] == '!');
        char *eq = strchr(t, '=');
        if (eq)
            *eq = '\0';
        if (strcmp(t, name) == 0) {
            snprintf(values, cap, "%s", eq ? eq + 1 : "");
            *required = tok[0] == '!';
            return 1;
        }
    }
    return 0;
}

static int in_list(const char *value, const char *list)
{
    size_t vl = strlen(value);
    for (const char *p = list; *p;) {
        size_t l = strcspn(p, "|");
        if (l == vl && strncmp(p, value, l) == 0)
            return 1;
        p += l + (p[l] == '|');
    }
    return 0;
}

static int diag_attrs(br_rd *r, xmlNode *n, const rule *ru)
{
    char values[128], list[512], text[ATTR_MAX];
    int req;
    for (xmlAttr *a = n->properties; a; a = a->next) {
        const char *an = (const char *)a->name;
        if (a->ns || !spec_attr(ru->attrs, an, values, sizeof values, &req)) {
            spec_names(ru->attrs, list, sizeof list);
            return br_rd_fail(r, n, an, "unknown attribute of <%s>, expected one of: %s",
                              (const char *)n->name, list[0] ? list : "(none)");
        }
        if (values[0] && br_xml_attr(n, an, text, sizeof text) == 1 && !in_list(text, values)) {
            char shown[160];
            spec_names(values, shown, sizeof shown);
            return br_rd_fail(r, n, an, "got '%s', expected %s%s", text,
                              strchr(values, '|') ? "one of: " : "", shown);
        }
    }
    char tok[128];
    for (const char *s = ru->attrs; (s = next_token(s, tok, sizeof tok)) != NULL;) {
        if (tok[0] != '!')
            continue;
        tok[strcspn(tok, "=")] = '\0';
        if (!xmlHasProp(n, BAD_CAST(tok + 1)))
            return br_rd_fail(r, n, tok + 1, "required attribute missing from <%s>",
                              (const char *)n->name);
    }
    return BR_OK;
}

static int has_child_of(xmlNode *n, const char *alts)
{
    char one[64];
    for (const char *p = alts; *p;) {
        size_t l = strcspn(p, "|");
        snprintf(one, sizeof one, "%.*s", (int)l, p);
        if (br_xml_child(n, one))
            return 1;
        p += l + (p[l] == '|');
    }
    return 0;
}

static int diag_required_children(br_rd *r, xmlNode *n, const rule *ru)
{
    char tok[128];
    for (const char *s = ru->children; (s = next_token(s, tok, sizeof tok)) != NULL;) {
        if (tok[0] != '!' || has_child_of(n, tok + 1))
            continue;
        char *alts = tok + 1;
        for (char *bar; (bar = strchr(alts, '|')) != NULL;)
            *bar = '/';
        return br_rd_fail(r, n, NULL, "missing <%s>, expected at least one inside <%s>", alts,
                          (const char *)n->name);
    }
    return BR_OK;
}

static int diag_elem(br_rd *r, xmlNode *n, const char *parent);

/* Position of element name among the children of a spec, -1 if absent. */
static int child_pos(const char *spec, const char *name)
{
    char tok[128];
    int k = 0;
    for (const char *s = spec; (s = next_token(s, tok, sizeof tok)) != NULL; k++)
        if (in_list(name, tok + (tok[0] == '!')))
            return k;
    return -1;
}

/* For an ordered rule: each child once, in the listed order. */
static int diag_order(br_rd *r, xmlNode *n, xmlNode *c, const rule *ru, int *last)
{
    char list[512], where[WHERE_MAX];
    int pos = child_pos(ru->children, (const char *)c->name);
    if (!ru->ordered || pos > *last) {
        *last = pos;
        return BR_OK;
    }
    spec_names(ru->children, list, sizeof list);
    br_xml_where(n, where, sizeof where);
    if (pos == *last)
        return br_error_set(r->err, BR_EINPUT, r->file, br_rd_line(r, c), where,
                            "a second <%s> (or an element of the same role) inside <%s>, "
                            "expected only one",
                            (const char *)c->name, (const char *)n->name);
    return br_error_set(r->err, BR_EINPUT, r->file, br_rd_line(r, c), where,
                        "<%s> is out of order, expected the elements of <%s> in the order: %s",
                        (const char *)c->name, (const char *)n->name, list);
}

static int diag_children(br_rd *r, xmlNode *n, const rule *ru)
{
    char list[512];
    int last = -1;
    for (xmlNode *c = n->children; c; c = c->next) {
        if (c->type == XML_TEXT_NODE || c->type == XML_CDATA_SECTION_NODE) {
            if (!xmlIsBlankNode(c))
                return br_rd_fail(r, n, NULL, "unexpected text inside <%s>", (const char *)n->name);
            continue;
        }
        if (c->type != XML_ELEMENT_NODE)
            continue;
        if (child_pos(ru->children, (const char *)c->name) < 0) {
            char where[WHERE_MAX];
            spec_names(ru->children, list, sizeof list);
            br_xml_where(n, where, sizeof where);
            return br_error_set(r->err, BR_EINPUT, r->file, br_rd_line(r, c), where,
                                "unknown element <%s> inside <%s>, expected %s%s",
                                (const char *)c->name, (const char *)n->name,
                                list[0] ? "one of: " : "no elements", list);
        }
        BR_TRY(diag_order(r, n, c, ru, &last));
        BR_TRY(diag_elem(r, c, (const char *)n->name));
    }
    return diag_required_children(r, n, ru);
}

static int diag_elem(br_rd *r, xmlNode *n, const char *parent)
{
    const rule *ru = find_rule(parent, (const char *)n->name);
    if (!ru)
        return BR_OK; /* reported by the caller */
    if (n->ns)
        return br_rd_fail(r, n, NULL, "design files use no XML namespace, got '%s'",
                          (const char *)n->ns->href);
    int rc = diag_attrs(r, n, ru);
    return rc ? rc : diag_children(r, n, ru);
}

int br_xml_diagnose(br_rd *r, xmlNode *root)
{
    if (!is_named(root, "bootrung-design"))
        return br_error_set(r->err, BR_EINPUT, r->file, br_rd_line(r, root), "",
                            "the root element is <%s>, expected <bootrung-design>",
                            (const char *)root->name);
    return diag_elem(r, root, "");
}

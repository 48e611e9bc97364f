/* test_io_schema.c - the reader's table of elements and attributes
 * (xml_read.c), from which every "expected one of" list of a bad design
 * file's diagnosis is built, against the schema the files are validated
 * with (design.rng): the same elements under the same parents, the same
 * attributes, the same required ones, the same enumerated values and the
 * same child elements.  A list can then not drift from what the schema
 * accepts (an attribute added to the schema and not to the table would
 * be missing from the lists). */
#include "bootrung/bootrung.h"
#include "io/xml_read.h"
#include "testkit.h"

#include <libxml/parser.h>
#include <libxml/tree.h>
#include <stdio.h>
#include <string.h>

#define RNG_NS "http://relaxng.org/ns/structure/1.0"
#define LIST 1024

typedef struct shape {
    char attrs[LIST];    /* " name" per attribute, "!" before a required one */
    char values[LIST];   /* " name=a|b" per enumerated attribute */
    char children[LIST]; /* " name" per child element */
} shape;

static xmlDocPtr schema;

static int is(const xmlNode *n, const char *name)
{
    return n->type == XML_ELEMENT_NODE && strcmp((const char *)n->name, name) == 0;
}

static void attr_of(const xmlNode *n, const char *name, char *buf, size_t cap)
{
    xmlChar *v = xmlGetProp(n, BAD_CAST name);
    snprintf(buf, cap, "%s", v ? (const char *)v : "");
    xmlFree(v);
}

static xmlNode *define_named(const char *name)
{
    char b[128];
    for (xmlNode *c = xmlDocGetRootElement(schema)->children; c; c = c->next)
        if (is(c, "define")) {
            attr_of(c, "name", b, sizeof b);
            if (strcmp(b, name) == 0)
                return c;
        }
    return NULL;
}

/* " ab" onto a list (b may be "": a word; "=" between a name and its
 * values is part of a). */
static void append(char *list, const char *a, const char *b)
{
    size_t n = strlen(list);
    snprintf(list + n, LIST - n, " %s%s", a, b);
}

static void append_values(char *list, const char *name, const char *values)
{
    size_t n = strlen(list);
    snprintf(list + n, LIST - n, " %s=%s", name, values);
}

/* The enumerated values of an attribute's pattern, "a|b", or "". */
static void values_of(const xmlNode *n, char *buf, size_t cap)
{
    for (const xmlNode *c = n->children; c; c = c->next) {
        if (is(c, "value")) {
            xmlChar *v = xmlNodeGetContent(c);
            size_t len = strlen(buf);
            snprintf(buf + len, cap - len, "%s%s", len ? "|" : "", (const char *)v);
            xmlFree(v);
        } else if (is(c, "choice")) {
            values_of(c, buf, cap);
        }
    }
}

/* The attributes and child elements of a pattern, through its refs, not
 * into the child elements; optional: under <optional> or a repetition
 * that may be empty, or a choice. */
static void walk(const xmlNode *n, int optional, shape *s)
{
    char name[128], vals[256];
    for (const xmlNode *c = n->children; c; c = c->next) {
        if (c->type != XML_ELEMENT_NODE)
            continue;
        if (is(c, "attribute")) {
            attr_of(c, "name", name, sizeof name);
            append(s->attrs, optional ? "" : "!", name);
            vals[0] = '\0';
            values_of(c, vals, sizeof vals);
            if (vals[0])
                append_values(s->values, name, vals);
        } else if (is(c, "element")) {
            attr_of(c, "name", name, sizeof name);
            append(s->children, name, "");
        } else if (is(c, "ref")) {
            attr_of(c, "name", name, sizeof name);
            const xmlNode *d = define_named(name);
            CU_ASSERT_PTR_NOT_NULL_FATAL(d);
            walk(d, optional, s);
        } else if (!is(c, "value") && !is(c, "text") && !is(c, "data")) {
            walk(c, optional || is(c, "optional") || is(c, "zeroOrMore") || is(c, "choice"), s);
        }
    }
}

/* The same shape from a rule of the table. */
static void rule_shape(const char *attrs, const char *children, shape *s)
{
    char tok[256];
    memset(s, 0, sizeof *s);
    int used = 0;
    for (const char *p = attrs; sscanf(p, " %255s%n", tok, &used) == 1; p += used) {
        char *eq = strchr(tok, '=');
        if (eq) {
            *eq = '\0';
            append_values(s->values, tok + (tok[0] == '!'), eq + 1);
        }
        append(s->attrs, tok, "");
    }
    for (const char *p = children; sscanf(p, " %255s%n", tok, &used) == 1; p += used) {
        char *t = tok + (tok[0] == '!');
        for (char *bar; (bar = strchr(t, '|')) != NULL; t = bar + 1) {
            *bar = '\0';
            append(s->children, t, "");
        }
        append(s->children, t, "");
    }
}

/* The words of a list, sorted, so that the order does not matter. */
static void sorted(const char *list, char *out, size_t cap)
{
    char w[64][160];
    int n = 0;
    char tok[160];
    int used = 0;
    for (const char *p = list; n < 64 && sscanf(p, " %159s%n", tok, &used) == 1; p += used)
        snprintf(w[n++], sizeof w[0], "%s", tok);
    for (int i = 1; i < n; i++)
        for (int j = i; j > 0 && strcmp(w[j - 1], w[j]) > 0; j--) {
            char t[160];
            memcpy(t, w[j], sizeof t);
            memcpy(w[j], w[j - 1], sizeof t);
            memcpy(w[j - 1], t, sizeof t);
        }
    out[0] = '\0';
    for (int i = 0; i < n; i++) {
        size_t len = strlen(out);
        snprintf(out + len, cap - len, " %s", w[i]);
    }
}

static int same(const char *what, const char *elem, const char *a, const char *b)
{
    char sa[LIST], sb[LIST];
    sorted(a, sa, sizeof sa);
    sorted(b, sb, sizeof sb);
    if (strcmp(sa, sb) != 0) {
        fprintf(stderr, "<%s> %s: table [%s], schema [%s]\n", elem, what, sa, sb);
        return 0;
    }
    return 1;
}

static int rules_seen[256];

/* Element e of the schema, child of parent: its rule must exist and say
 * the same; then its own children. */
static int check_element(const char *parent, const xmlNode *e, int depth)
{
    char name[128];
    attr_of(e, "name", name, sizeof name);
    int found = -1, bad = 0;
    for (int i = 0; i < br_xml_rule_count(); i++) {
        const char *rp, *rn, *ra, *rc;
        br_xml_rule(i, &rp, &rn, &ra, &rc);
        if (strcmp(rp, parent) == 0 && strcmp(rn, name) == 0)
            found = i;
    }
    if (found < 0) {
        fprintf(stderr, "<%s> inside <%s>: in the schema, not in the table\n", name, parent);
        return 1;
    }
    if (rules_seen[found]++ || depth > 8)
        return 0;
    const char *rp, *rn, *ra, *rc;
    br_xml_rule(found, &rp, &rn, &ra, &rc);
    shape fromschema, fromtable;
    memset(&fromschema, 0, sizeof fromschema);
    walk(e, 0, &fromschema);
    rule_shape(ra, rc, &fromtable);
    /* a required attribute of the schema's is "!name" in the table */
    bad += !same("attributes", name, fromtable.attrs, fromschema.attrs);
    bad += !same("values", name, fromtable.values, fromschema.values);
    bad += !same("children", name, fromtable.children, fromschema.children);
    return bad;
}

/* Every element of the schema, found from the start pattern down. */
static int check_below(const char *parent, const xmlNode *n, int depth)
{
    int bad = 0;
    char name[128];
    for (const xmlNode *c = n->children; c; c = c->next) {
        if (is(c, "element")) {
            bad += check_element(parent, c, depth);
            attr_of(c, "name", name, sizeof name);
            bad += check_below(name, c, depth + 1);
        } else if (is(c, "ref")) {
            attr_of(c, "name", name, sizeof name);
            bad += check_below(parent, define_named(name), depth);
        } else if (c->type == XML_ELEMENT_NODE && depth < 16) {
            bad += check_below(parent, c, depth);
        }
    }
    return bad;
}

static void test_table_is_schema(void)
{
    const char *rng = br_design_schema();
    schema = xmlReadMemory(rng, (int)strlen(rng), "design.rng", NULL, XML_PARSE_NONET);
    CU_ASSERT_PTR_NOT_NULL_FATAL(schema);
    xmlNode *start = NULL;
    for (xmlNode *c = xmlDocGetRootElement(schema)->children; c; c = c->next)
        if (is(c, "start"))
            start = c;
    CU_ASSERT_PTR_NOT_NULL_FATAL(start);
    memset(rules_seen, 0, sizeof rules_seen);
    CU_ASSERT_EQUAL(check_below("", start, 0), 0);
    /* and nothing in the table that the schema does not have */
    for (int i = 0; i < br_xml_rule_count(); i++) {
        const char *rp, *rn, *ra, *rc;
        br_xml_rule(i, &rp, &rn, &ra, &rc);
        if (!rules_seen[i])
            fprintf(stderr, "<%s> inside <%s>: in the table, not in the schema\n", rn, rp);
        CU_ASSERT_TRUE(rules_seen[i] > 0);
    }
    xmlFreeDoc(schema);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"the diagnosis's table is the schema", test_table_is_schema},
        {NULL, NULL},
    };
    return br_test_main("io_schema", cases);
}

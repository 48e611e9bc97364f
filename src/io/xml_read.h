/* xml_read.h - reading a validated design document into a br_design.
 *
 * Internal to the io layer.  design_xml.c parses and validates; the
 * functions here walk the tree, read quantities with their units, check
 * ranges and cross references, and report the first fault with file, line
 * and field ("capacitor c1: esr"). */
#ifndef BR_IO_XML_READ_H
#define BR_IO_XML_READ_H

#include "core/error.h"
#include "core/units.h"
#include "model/design.h"

#include <libxml/tree.h>

/* State of one load. */
typedef struct br_rd {
    const char *file; /* name used in messages */
    const char *buf;  /* the document text, to find attribute lines */
    size_t len;       /* bytes in buf */
    br_design *d;     /* being filled */
    br_error *err;    /* first fault */
} br_rd;

/* An allowed range for a value; the message quotes `expect`. */
typedef struct br_range {
    double lo, hi;      /* bounds, SI */
    int lo_open;        /* 1: lo itself is excluded */
    int hi_open;        /* 1: hi itself is excluded */
    const char *expect; /* e.g. "a capacitance > 0" */
} br_range;

/* 0 C in kelvin.  Temperature bounds are written as "-100.0 +
 * BR_ZERO_CELSIUS" so that they round exactly as the reader's "-100 C"
 * does (-100 + 273.15 is not the double nearest 173.15). */
#define BR_ZERO_CELSIUS 273.15

extern const br_range br_range_pos;    /* (0, inf) */
extern const br_range br_range_nonneg; /* [0, inf) */

/* ---- the tree (xml_read.c) --------------------------------------------- */

/* First element child of n named name (NULL: any name), or NULL. */
xmlNode *br_xml_child(xmlNode *n, const char *name);
/* Next element sibling after c with the same name (NULL: any name). */
xmlNode *br_xml_next(xmlNode *c, const char *name);
/* Number of element children of n named name. */
int br_xml_count(xmlNode *n, const char *name);
/* Line of element n (0 if unknown). */
int br_xml_line(xmlNode *n);
/* Line where element n's start tag begins (found in the source text). */
int br_rd_line(const br_rd *r, xmlNode *n);
/* Line of attribute attr of n, found in the source text; the start tag's
 * line when the attribute is absent (or attr is NULL). */
int br_xml_attr_line(const br_rd *r, xmlNode *n, const char *attr);
/* "capacitor c1", "stage 3", "capacitor c1 bias 2", "operating-point". */
void br_xml_where(xmlNode *n, char *buf, size_t cap);
/* Copy of attribute attr into buf; returns 1 if present, 0 if absent,
 * -1 if longer than cap. */
int br_xml_attr(xmlNode *n, const char *attr, char *buf, size_t cap);

/* Structural diagnosis, used when schema validation fails: explains the
 * first unknown/missing element or attribute in document order.  Returns
 * BR_OK if it finds nothing it can explain. */
int br_xml_diagnose(br_rd *r, xmlNode *root);

/* The diagnosis's table, one rule per element of design.rng, for the test
 * that holds it to the schema (test_io_schema.c): rule i's parent element
 * ("" for the root), element, attributes ("!a" required, "a=x|y" with
 * its values) and children ("!a" at least one, "a|b" either), space
 * separated.  Every "expected one of" list of the diagnosis is built from
 * it. */
int br_xml_rule_count(void);
void br_xml_rule(int i, const char **parent, const char **name, const char **attrs,
                 const char **children);

/* ---- errors and values (xml_read.c) ------------------------------------ */

/* Fail at element n (attr may be NULL): sets file, line, field. */
int br_rd_fail(br_rd *r, xmlNode *n, const char *attr, const char *fmt, ...)
    __attribute__((format(printf, 4, 5)));

/* Read attribute attr of n as a toleranced quantity of kind into q, then
 * check every value it may take against range (NULL: no check).  An absent
 * attribute leaves q as it was and returns BR_OK; *present (may be NULL)
 * says which. */
int br_rd_qty(br_rd *r, xmlNode *n, const char *attr, br_kind kind, const br_range *range,
              br_qty *q, int *present);
/* Same for a value without tolerance. */
int br_rd_value(br_rd *r, xmlNode *n, const char *attr, br_kind kind, const br_range *range,
                double *v, int *present);
/* A non-negative decimal integer in [lo, hi]. */
int br_rd_int(br_rd *r, xmlNode *n, const char *attr, int lo, int hi, int *v);

/* ---- the design (design_read.c) ----------------------------------------- */

/* Fill r->d from the validated root element. */
int br_rd_design(br_rd *r, xmlNode *root);

/* The operating point's <line-cycle> (line_read.c): read it, refusing
 * the DC attributes it replaces; then, once the topology is known, check
 * it against the leg, the switching frequency and the dead time. */
int br_rd_line_cycle(br_rd *r, xmlNode *op);
int br_rd_line_check(br_rd *r, xmlNode *op);

/* An isolated supply's output on element n (design_read.c): voltage
 * (required), resistance and current limit as an <injection>'s, into j's
 * v, r and limit fields (the others left as they are). */
int br_rd_supply_output(br_rd *r, xmlNode *n, br_inject_spec *j);

/* Parts (parts_read.c). */
int br_rd_parts(br_rd *r, xmlNode *parts);
/* One part element n of any kind <parts> takes. */
int br_rd_part(br_rd *r, xmlNode *n);
/* The kind of part of d whose id is id ("diode", ...), or NULL. */
const char *br_rd_part_owner(const br_design *d, const char *id);

#endif

/* xml_safe.h - the safe way in for every XML file bootrung reads (design
 * files, part catalogs): a size limit, no network, no DTD, no entity
 * substitution, any DOCTYPE refused, and libxml2's messages captured for
 * the duration of a load instead of printed. */
#ifndef BR_IO_XML_SAFE_H
#define BR_IO_XML_SAFE_H

#include "bootrung/bootrung.h"

#include <libxml/tree.h>
#include <libxml/xmlerror.h>

/* What a kind of document is called in messages. */
typedef struct br_xkind {
    const char *root;   /* root element, e.g. "bootrung-design" */
    const char *a_file; /* "a design file" */
    const char *files;  /* "design files" */
    size_t max_bytes;   /* size limit */
} br_xkind;

/* The first error libxml2 reports during one step. */
typedef struct br_xcapture {
    int have;             /* an error was recorded */
    int line;             /* its line, 0 if unknown */
    xmlNode *node;        /* the element it is about, if known */
    int doctype;          /* it is our refusal of a DOCTYPE */
    const br_xkind *kind; /* set by br_xparse, for its messages */
    char msg[400];
} br_xcapture;

/* libxml2's (per-thread) error handlers, saved while a load runs. */
typedef struct br_xhandlers {
    xmlStructuredErrorFunc serror;
    void *sctx;
    xmlGenericErrorFunc gerror;
    void *gctx;
} br_xhandlers;

/* Point libxml2's handlers at c (silencing the rest); restore them after. */
void br_xcapture_begin(br_xhandlers *saved, br_xcapture *c);
void br_xcapture_end(const br_xhandlers *saved);

/* Refuse an empty or oversized buffer. */
int br_xcheck_size(const br_xkind *k, const char *file, size_t len, br_error *err);

/* Read a whole file (not a directory) of at most k->max_bytes. */
int br_xread_file(const br_xkind *k, const char *path, char **buf, size_t *len, br_error *err);

/* A file whose lines end in a carriage return alone (XML allows it, and
 * normalises it to a line feed before parsing) gets a copy in *copy with
 * each such CR made a LF: libxml2 counts lines only by LF, and the same
 * length keeps every offset.  *copy is NULL when nothing needs it (no lone
 * CR, or a document in an encoding where a CR byte need not be one).
 * BR_ENOMEM when the copy cannot be made. */
int br_xline_ends(const char *buf, size_t len, const char *file, char **copy, br_error *err);

/* Parse buf into *out; c receives the parser's first error. */
int br_xparse(const br_xkind *k, const char *buf, size_t len, const char *file, br_xcapture *c,
              xmlDoc **out, br_error *err);

/* Validate doc against the RELAX NG grammar rng.  BR_OK when it is valid;
 * BR_EINPUT when not (c holds the first fault, err untouched for the
 * caller to explain); another status when the grammar itself fails. */
int br_xvalidate(const char *rng, xmlDoc *doc, br_xcapture *c, br_error *err);

#endif

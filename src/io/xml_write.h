/* xml_write.h - a small streaming XML writer for result files.
 *
 * The reports describe their results as nested elements with attributes;
 * this writer turns that into well-formed, indented XML (escaping done
 * here) and hands the document back as a br_text.  It is the only place
 * outside the design reader that touches libxml2, and no libxml2 type
 * appears here.
 *
 * Errors are sticky: after the first failure every call does nothing and
 * br_xmlw_finish reports it, so a renderer can write a whole document and
 * check once. */
#ifndef BR_IO_XML_WRITE_H
#define BR_IO_XML_WRITE_H

#include "bootrung/bootrung.h"

typedef struct br_xmlw br_xmlw;

/* A writer with the XML declaration already written.  Returns BR_OK or
 * BR_ENOMEM (then *out is NULL). */
int br_xmlw_create(br_xmlw **out, br_error *err);
void br_xmlw_free(br_xmlw *w);

/* Open element name (closed by br_xmlw_end). */
void br_xmlw_start(br_xmlw *w, const char *name);
/* Close the innermost open element. */
void br_xmlw_end(br_xmlw *w);

/* Attributes of the element just opened (before any child or text). */
void br_xmlw_attr(br_xmlw *w, const char *name, const char *value);
/* A number with 9 significant digits ("1.2e-06"); a non-finite value is
 * left out, since XML readers expect a number in a numeric attribute. */
void br_xmlw_num(br_xmlw *w, const char *name, double v);
void br_xmlw_int(br_xmlw *w, const char *name, long v);
/* "true" or "false". */
void br_xmlw_bool(br_xmlw *w, const char *name, int v);

/* Character data inside the current element. */
void br_xmlw_text(br_xmlw *w, const char *text);

/* Mark the document as failed (the caller could not build a value). */
void br_xmlw_fail(br_xmlw *w);

/* Close every open element, end the document and append it to out.
 * Returns BR_OK, or the first failure with err filled. */
int br_xmlw_finish(br_xmlw *w, br_text *out, br_error *err);

#endif

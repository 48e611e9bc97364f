/* xml_write.c - result files through libxml2's xmlTextWriter into an
 * in-memory buffer. */
#include "io/xml_write.h"

#include "core/error.h"

#include <libxml/xmlwriter.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>

struct br_xmlw {
    xmlBufferPtr buf;    /* the document so far */
    xmlTextWriterPtr tw; /* writes into buf */
    int failed;          /* a libxml2 call returned an error */
};

static const xmlChar *X(const char *s)
{
    return (const xmlChar *)s;
}

/* libxml2 calls return a negative number on failure. */
static void check(br_xmlw *w, int rc)
{
    if (rc < 0)
        w->failed = 1;
}

int br_xmlw_create(br_xmlw **out, br_error *err)
{
    *out = NULL;
    br_xmlw *w = calloc(1, sizeof *w);
    if (w)
        w->buf = xmlBufferCreate();
    if (w && w->buf)
        w->tw = xmlNewTextWriterMemory(w->buf, 0);
    if (!w || !w->tw) {
        br_xmlw_free(w);
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory starting an XML file");
    }
    /* two-space indentation keeps result files readable and diffable */
    check(w, xmlTextWriterSetIndent(w->tw, 1));
    check(w, xmlTextWriterSetIndentString(w->tw, X("  ")));
    check(w, xmlTextWriterStartDocument(w->tw, "1.0", "UTF-8", NULL));
    *out = w;
    return BR_OK;
}

void br_xmlw_free(br_xmlw *w)
{
    if (!w)
        return;
    if (w->tw)
        xmlFreeTextWriter(w->tw);
    if (w->buf)
        xmlBufferFree(w->buf);
    free(w);
}

void br_xmlw_start(br_xmlw *w, const char *name)
{
    if (!w->failed)
        check(w, xmlTextWriterStartElement(w->tw, X(name)));
}

void br_xmlw_end(br_xmlw *w)
{
    if (!w->failed)
        check(w, xmlTextWriterEndElement(w->tw));
}

void br_xmlw_attr(br_xmlw *w, const char *name, const char *value)
{
    if (!w->failed)
        check(w, xmlTextWriterWriteAttribute(w->tw, X(name), X(value ? value : "")));
}

void br_xmlw_num(br_xmlw *w, const char *name, double v)
{
    char buf[40];
    if (!isfinite(v))
        return;
    snprintf(buf, sizeof buf, "%.9g", v == 0.0 ? 0.0 : v); /* no "-0" */
    br_xmlw_attr(w, name, buf);
}

void br_xmlw_int(br_xmlw *w, const char *name, long v)
{
    char buf[32];
    snprintf(buf, sizeof buf, "%ld", v);
    br_xmlw_attr(w, name, buf);
}

void br_xmlw_bool(br_xmlw *w, const char *name, int v)
{
    br_xmlw_attr(w, name, v ? "true" : "false");
}

void br_xmlw_text(br_xmlw *w, const char *text)
{
    if (!w->failed)
        check(w, xmlTextWriterWriteString(w->tw, X(text)));
}

void br_xmlw_fail(br_xmlw *w)
{
    w->failed = 1;
}

int br_xmlw_finish(br_xmlw *w, br_text *out, br_error *err)
{
    if (!w->failed)
        check(w, xmlTextWriterEndDocument(w->tw)); /* closes open elements */
    if (!w->failed)
        check(w, xmlTextWriterFlush(w->tw));
    if (w->failed)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL,
                            "could not produce the XML results (out of memory or a bad name)");
    if (br_text_put(out, (const char *)xmlBufferContent(w->buf)) != BR_OK)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory copying the XML results");
    return BR_OK;
}

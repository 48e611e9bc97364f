/* xml_write.c - result files through libxml2's xmlTextWriter into an
 * in-memory buffer. */
#include "io/xml_write.h"

#include "core/error.h"

#include <libxml/xmlwriter.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

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

/* ---- text that XML can carry ------------------------------------------------

 * Values come from the program except for names the user chose, above all
 * the design file's path, which is a string of bytes in no particular
 * encoding.  XML carries only Unicode characters, and not all of them, so
 * before a value is written: a well-formed UTF-8 sequence of an XML
 * character passes; any other byte is taken as Latin-1, the commonest
 * 8-bit encoding of such names (so "caf\xE9" becomes "café"); a control
 * character XML 1.0 forbids (below U+0020 other than tab, LF and CR) and a
 * non-character become U+FFFD, the replacement character. */

#define REPLACEMENT 0xFFFDu

/* Length of the well-formed UTF-8 sequence at s and its code point, or 0
 * when s does not start one (an overlong form, a surrogate, a stray or
 * missing continuation byte, or beyond U+10FFFF). */
static int utf8_seq(const unsigned char *s, unsigned *cp)
{
    unsigned c = s[0];
    int n = c >= 0xF0 && c <= 0xF4 ? 4 : c >= 0xE0 ? 3 : c >= 0xC2 && c < 0xE0 ? 2 : 0;
    if (n == 0 || c >= 0xF5)
        return 0;
    unsigned v = c & (0x7Fu >> n);
    for (int i = 1; i < n; i++) {
        if ((s[i] & 0xC0) != 0x80)
            return 0; /* also stops at the terminating NUL */
        v = (v << 6) | (s[i] & 0x3Fu);
    }
    static const unsigned least[] = {0, 0, 0x80, 0x800, 0x10000};
    if (v < least[n] || v > 0x10FFFF || (v >= 0xD800 && v <= 0xDFFF))
        return 0;
    *cp = v;
    return n;
}

/* XML 1.0 Char: tab, LF, CR, U+0020..U+D7FF, U+E000..U+FFFD, U+10000 up. */
static int xml_char(unsigned cp)
{
    return cp == 0x9 || cp == 0xA || cp == 0xD || (cp >= 0x20 && cp <= 0xD7FF) ||
           (cp >= 0xE000 && cp <= 0xFFFD) || cp >= 0x10000;
}

static size_t put_utf8(unsigned cp, char *out)
{
    if (cp < 0x80) {
        out[0] = (char)cp;
        return 1;
    }
    if (cp < 0x800) {
        out[0] = (char)(0xC0 | (cp >> 6));
        out[1] = (char)(0x80 | (cp & 0x3F));
        return 2;
    }
    out[0] = (char)(0xE0 | (cp >> 12)); /* U+FFFD and Latin-1 need no more */
    out[1] = (char)(0x80 | ((cp >> 6) & 0x3F));
    out[2] = (char)(0x80 | (cp & 0x3F));
    return 3;
}

/* The code point of the character at s and the bytes it takes. */
static unsigned next_char(const unsigned char *s, int *len)
{
    unsigned cp;
    *len = s[0] < 0x80 ? 1 : utf8_seq(s, &cp);
    if (*len == 1)
        cp = s[0];
    else if (*len == 0) {
        *len = 1;
        cp = s[0]; /* not UTF-8: the byte as Latin-1 */
    }
    return xml_char(cp) ? cp : REPLACEMENT;
}

/* s when XML can carry it as it is; otherwise a cleaned copy in *copy
 * (freed by the caller), or NULL when out of memory. */
static const char *xml_text(const char *s, char **copy)
{
    const unsigned char *p = (const unsigned char *)s;
    size_t n = 0, bad = 0;
    *copy = NULL;
    for (int len; p[n]; n += (size_t)len) {
        unsigned cp = next_char(p + n, &len);
        bad += cp == REPLACEMENT || (len == 1 && p[n] >= 0x80);
    }
    if (bad == 0)
        return s;
    char *out = malloc(3 * n + 1); /* one byte never becomes more than three */
    if (!out)
        return NULL;
    size_t o = 0;
    for (int len; *p; p += len) {
        unsigned cp = next_char(p, &len);
        if (cp == REPLACEMENT || len == 1)
            o += put_utf8(cp, out + o);
        else {
            memcpy(out + o, p, (size_t)len);
            o += (size_t)len;
        }
    }
    out[o] = '\0';
    *copy = out;
    return out;
}

/* ---- elements ---------------------------------------------------------------- */

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
    char *copy;
    const char *v = w->failed ? NULL : xml_text(value ? value : "", &copy);
    if (w->failed)
        return;
    if (!v)
        w->failed = 1;
    else
        check(w, xmlTextWriterWriteAttribute(w->tw, X(name), X(v)));
    free(copy);
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
    char *copy;
    const char *v = w->failed ? NULL : xml_text(text ? text : "", &copy);
    if (w->failed)
        return;
    if (!v)
        w->failed = 1;
    else
        check(w, xmlTextWriterWriteString(w->tw, X(v)));
    free(copy);
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

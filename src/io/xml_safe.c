/* xml_safe.c - reading, parsing and validating XML safely (see the header). */
#include "io/xml_safe.h"

#include "core/error.h"

#include <errno.h>
#include <fcntl.h>
#include <limits.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include <libxml/globals.h>
#include <libxml/parser.h>
#include <libxml/parserInternals.h>
#include <libxml/relaxng.h>

#define READ_CHUNK ((size_t)64 << 10)

/* libxml2 2.12 made the error record const in the handler signature. */
#if LIBXML_VERSION >= 21200
typedef const xmlError *br_xml_error;
#else
typedef xmlError *br_xml_error;
#endif

static void capture_error(void *ctx, br_xml_error e)
{
    br_xcapture *c = ctx;
    if (!c || !e || c->have || e->level == XML_ERR_WARNING)
        return;
    xmlNode *node = e->node;
    c->have = 1;
    c->line = e->line;
    c->node = (node && node->type == XML_ELEMENT_NODE) ? node : NULL;
    snprintf(c->msg, sizeof c->msg, "%s", e->message ? e->message : "unknown XML error");
    size_t n = strlen(c->msg);
    while (n > 0 && (c->msg[n - 1] == '\n' || c->msg[n - 1] == ' '))
        c->msg[--n] = '\0';
}

/* Swallows libxml2's unstructured messages. */
static void silent(void *ctx, const char *msg, ...)
{
    (void)ctx;
    (void)msg;
}

void br_xcapture_begin(br_xhandlers *saved, br_xcapture *c)
{
    xmlInitParser();
    saved->serror = xmlStructuredError;
    saved->sctx = xmlStructuredErrorContext;
    saved->gerror = xmlGenericError;
    saved->gctx = xmlGenericErrorContext;
    xmlSetGenericErrorFunc(NULL, silent);
    xmlSetStructuredErrorFunc(c, capture_error);
}

void br_xcapture_end(const br_xhandlers *saved)
{
    xmlSetStructuredErrorFunc(saved->sctx, saved->serror);
    xmlSetGenericErrorFunc(saved->gctx, saved->gerror);
}

int br_xcheck_size(const br_xkind *k, const char *file, size_t len, br_error *err)
{
    if (len == 0)
        return br_error_set(err, BR_EINPUT, file, 0, "",
                            "the file is empty, expected a <%s> document", k->root);
    if (len > k->max_bytes || len > INT_MAX)
        return br_error_set(err, BR_EINPUT, file, 0, "",
                            "%zu bytes, larger than the %zu MiB limit for %s", len,
                            k->max_bytes >> 20, k->files);
    return BR_OK;
}

static int io_fail(const char *path, int e, const char *what, br_error *err)
{
    char why[128] = "";
    if (strerror_r(e, why, sizeof why) != 0)
        snprintf(why, sizeof why, "error %d", e);
    return br_error_set(err, BR_EIO, path, 0, "", "%s: %s", what, why);
}

/* Read all of fd, at most max_bytes + 1 bytes (one more than allowed, so
 * that the size check can refuse the file). */
static int read_all(const br_xkind *k, int fd, const char *path, char **out, size_t *len,
                    br_error *err)
{
    size_t cap = READ_CHUNK, n = 0;
    char *buf = malloc(cap);
    while (buf && n <= k->max_bytes) {
        if (n == cap) {
            char *nb = realloc(buf, cap * 2);
            if (!nb)
                break;
            buf = nb;
            cap *= 2;
        }
        ssize_t got = read(fd, buf + n, cap - n);
        if (got < 0 && errno == EINTR)
            continue;
        if (got < 0) {
            free(buf);
            return io_fail(path, errno, "cannot read", err);
        }
        if (got == 0) {
            *out = buf;
            *len = n;
            return BR_OK;
        }
        n += (size_t)got;
    }
    if (buf && n > k->max_bytes) {
        free(buf);
        return br_xcheck_size(k, path, n, err);
    }
    free(buf);
    return br_error_set(err, BR_ENOMEM, path, 0, "", "out of memory reading the file");
}

int br_xread_file(const br_xkind *k, const char *path, char **buf, size_t *len, br_error *err)
{
    struct stat st;
    char what[96];
    int fd = open(path, O_RDONLY | O_CLOEXEC);
    if (fd < 0) {
        snprintf(what, sizeof what, "cannot open the %s", k->a_file + 2); /* past "a " */
        return io_fail(path, errno, what, err);
    }
    int rc = BR_OK;
    if (fstat(fd, &st) != 0) {
        snprintf(what, sizeof what, "cannot inspect the %s", k->a_file + 2);
        rc = io_fail(path, errno, what, err);
    } else if (S_ISDIR(st.st_mode)) {
        rc = br_error_set(err, BR_EIO, path, 0, "", "is a directory, expected %s", k->a_file);
    } else if (S_ISREG(st.st_mode) && (unsigned long long)st.st_size > k->max_bytes) {
        rc = br_xcheck_size(k, path, (size_t)st.st_size, err);
    } else {
        rc = read_all(k, fd, path, buf, len, err);
    }
    close(fd);
    return rc;
}

/* SAX hook for "<!DOCTYPE": refuse before any declaration is read. */
static void refuse_doctype(void *ctx, const xmlChar *name, const xmlChar *ext_id,
                           const xmlChar *sys_id)
{
    xmlParserCtxtPtr p = ctx;
    br_xcapture *c = p->_private;
    const br_xkind *k = c ? c->kind : NULL;
    (void)ext_id;
    (void)sys_id;
    if (c && !c->have) {
        c->have = c->doctype = 1;
        c->line = p->input ? p->input->line : 0;
        snprintf(c->msg, sizeof c->msg,
                 "a DOCTYPE (<!DOCTYPE %s ...>) is not allowed in %s: no DTD, no "
                 "entity declarations; expected the <%s> element directly",
                 name ? (const char *)name : "", k ? k->a_file : "this file",
                 k ? k->root : "document");
    }
    xmlStopParser(p);
}

/* UTF-16 and UTF-32 documents start with a byte-order mark or have a zero
 * byte among their first four: there a 0x0D byte is half a character. */
static int ascii_compatible(const unsigned char *b, size_t len)
{
    if (len >= 2 && ((b[0] == 0xFE && b[1] == 0xFF) || (b[0] == 0xFF && b[1] == 0xFE)))
        return 0;
    for (size_t i = 0; i < len && i < 4; i++)
        if (b[i] == 0)
            return 0;
    return 1;
}

static int lone_cr(const char *buf, size_t len, size_t i)
{
    return buf[i] == '\r' && !(i + 1 < len && buf[i + 1] == '\n');
}

int br_xline_ends(const char *buf, size_t len, const char *file, char **copy, br_error *err)
{
    *copy = NULL;
    size_t i = 0;
    while (i < len && !lone_cr(buf, len, i))
        i++;
    if (i == len || !ascii_compatible((const unsigned char *)buf, len))
        return BR_OK;
    char *c = malloc(len);
    if (!c)
        return br_error_set(err, BR_ENOMEM, file, 0, "", "out of memory reading the file");
    memcpy(c, buf, len);
    for (; i < len; i++)
        if (lone_cr(buf, len, i))
            c[i] = '\n';
    *copy = c;
    return BR_OK;
}

int br_xparse(const br_xkind *k, const char *buf, size_t len, const char *file, br_xcapture *c,
              xmlDoc **out, br_error *err)
{
    const int opts = XML_PARSE_NONET | XML_PARSE_NOERROR | XML_PARSE_NOWARNING |
                     XML_PARSE_BIG_LINES; /* and never NOENT, DTDLOAD, DTDATTR, XINCLUDE */
    xmlParserCtxtPtr p = xmlCreateMemoryParserCtxt(buf, (int)len);
    if (!p)
        return br_error_set(err, BR_ENOMEM, file, 0, "", "out of memory starting the parser");
    xmlCtxtUseOptions(p, opts);
    p->linenumbers = 1;
    p->_private = c;
    c->kind = k;
    p->sax->internalSubset = refuse_doctype;
    p->sax->externalSubset = NULL;
    xmlParseDocument(p);
    xmlDoc *doc = p->myDoc;
    int ok = p->wellFormed && !c->have && doc;
    p->myDoc = NULL;
    xmlFreeParserCtxt(p);
    if (ok) {
        *out = doc;
        return BR_OK;
    }
    xmlFreeDoc(doc);
    if (c->doctype)
        return br_error_set(err, BR_EINPUT, file, c->line, "", "%s", c->msg);
    if (c->have && strstr(c->msg, "Excessive depth")) /* XML_PARSE_HUGE stays off */
        return br_error_set(err, BR_EINPUT, file, c->line, "",
                            "not well-formed XML: elements nested deeper than libxml2's "
                            "limit of %d, expected the few levels of %s",
                            (int)xmlParserMaxDepth, k->a_file);
    return br_error_set(err, BR_EINPUT, file, c->line, "", "not well-formed XML: %s",
                        c->have ? c->msg : "the parser gave up");
}

int br_xvalidate(const char *rng, xmlDoc *doc, br_xcapture *c, br_error *err)
{
    br_xcapture sc;
    memset(&sc, 0, sizeof sc);
    xmlRelaxNGParserCtxtPtr pc = xmlRelaxNGNewMemParserCtxt(rng, (int)strlen(rng));
    if (!pc)
        return br_error_set(err, BR_ENOMEM, NULL, 0, "", "out of memory loading the schema");
    xmlRelaxNGSetParserStructuredErrors(pc, capture_error, &sc);
    xmlRelaxNGPtr schema = xmlRelaxNGParse(pc);
    xmlRelaxNGFreeParserCtxt(pc);
    if (!schema) /* a broken build, not a broken input */
        return br_error_set(err, BR_EUSAGE, NULL, sc.line, "schema",
                            "the built-in schema does not compile: %s", sc.msg);
    xmlRelaxNGValidCtxtPtr vc = xmlRelaxNGNewValidCtxt(schema);
    int bad = -1;
    if (vc) {
        xmlRelaxNGSetValidStructuredErrors(vc, capture_error, c);
        bad = xmlRelaxNGValidateDoc(vc, doc);
        xmlRelaxNGFreeValidCtxt(vc);
    }
    xmlRelaxNGFree(schema);
    if (!vc)
        return br_error_set(err, BR_ENOMEM, NULL, 0, "", "out of memory validating");
    return bad == 0 ? BR_OK : BR_EINPUT;
}

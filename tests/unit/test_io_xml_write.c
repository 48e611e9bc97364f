/* test_io_xml_write.c - the result-file writer: well-formed output that
 * libxml2 reads back with the same names and values, escaping, numbers,
 * and the sticky failure. */
#include "io/xml_write.h"
#include "testkit.h"

#include <libxml/parser.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

static xmlDoc *parse(const br_text *t)
{
    return xmlReadMemory(br_text_data(t), (int)br_text_len(t), "mem.xml", NULL, XML_PARSE_NONET);
}

static int prop_is(xmlNode *n, const char *name, const char *want)
{
    xmlChar *v = xmlGetProp(n, (const xmlChar *)name);
    int ok = v && strcmp((const char *)v, want) == 0;
    if (!ok)
        fprintf(stderr, "%s=[%s], expected [%s]\n", name, v ? (const char *)v : "(none)", want);
    xmlFree(v);
    return ok;
}

static void test_round_trip(void)
{
    br_xmlw *w;
    br_error err;
    br_text *out = br_text_create();
    CU_ASSERT_EQUAL_FATAL(br_xmlw_create(&w, &err), BR_OK);
    br_xmlw_start(w, "bootrung-results");
    br_xmlw_attr(w, "design", "a<b & \"c\"");
    br_xmlw_start(w, "rail");
    br_xmlw_num(w, "min-V", 14.5631234567);
    br_xmlw_num(w, "tiny-A", 1.5e-9);
    br_xmlw_num(w, "nothing", NAN); /* left out */
    br_xmlw_num(w, "zero", -0.0);
    br_xmlw_int(w, "index", 11);
    br_xmlw_bool(w, "holds", 1);
    br_xmlw_end(w);
    br_xmlw_start(w, "caution");
    br_xmlw_text(w, "lethal <voltages> & more");
    /* left open: finish closes it and the root */
    CU_ASSERT_EQUAL_FATAL(br_xmlw_finish(w, out, &err), BR_OK);
    br_xmlw_free(w);
    xmlDoc *doc = parse(out);
    CU_ASSERT_PTR_NOT_NULL_FATAL(doc);
    xmlNode *root = xmlDocGetRootElement(doc);
    CU_ASSERT_STRING_EQUAL(root->name, "bootrung-results");
    CU_ASSERT_TRUE(prop_is(root, "design", "a<b & \"c\""));
    xmlNode *rail = xmlFirstElementChild(root);
    CU_ASSERT_STRING_EQUAL(rail->name, "rail");
    CU_ASSERT_TRUE(prop_is(rail, "min-V", "14.5631235")); /* 9 significant digits */
    CU_ASSERT_TRUE(prop_is(rail, "tiny-A", "1.5e-09"));
    CU_ASSERT_PTR_NULL(xmlHasProp(rail, (const xmlChar *)"nothing"));
    CU_ASSERT_TRUE(prop_is(rail, "zero", "0"));
    CU_ASSERT_TRUE(prop_is(rail, "index", "11"));
    CU_ASSERT_TRUE(prop_is(rail, "holds", "true"));
    xmlNode *caution = xmlNextElementSibling(rail);
    xmlChar *text = xmlNodeGetContent(caution);
    CU_ASSERT_STRING_EQUAL(text, "lethal <voltages> & more");
    xmlFree(text);
    xmlFreeDoc(doc);
    /* the declaration says what the bytes are */
    CU_ASSERT_TRUE(strncmp(br_text_data(out), "<?xml version=\"1.0\" encoding=\"UTF-8\"?>", 38) ==
                   0);
    br_text_free(out);
}

/* After a failure every call is a no-op and finish reports it, leaving
 * the output untouched. */
/* Names the user chose (a design file's path) are bytes in no particular
 * encoding: a Latin-1 name, a control byte, a cut UTF-8 sequence, an
 * overlong form and a surrogate must still give a well-formed document.
 * Expected values by hand: 0xE9 in Latin-1 is U+00E9, UTF-8 C3 A9; a
 * forbidden character becomes U+FFFD, UTF-8 EF BF BD. */
static void test_bytes_not_utf8(void)
{
    static const struct {
        const char *in, *want;
    } cases[] = {
        {"caf\xE9.xml", "caf\xC3\xA9.xml"},
        {"a\x01"
         "b\x1F.xml",
         "a\xEF\xBF\xBD"
         "b\xEF\xBF\xBD.xml"},
        {"tab\tok \xC3\xA9t\xC3\xA9 \xE2\x82\xAC", "tab\tok \xC3\xA9t\xC3\xA9 \xE2\x82\xAC"},
        {"cut \xC3", "cut \xC3\x83"},
        {"overlong \xC0\xAF", "overlong \xC3\x80\xC2\xAF"},
        {"surrogate \xED\xA0\x80", "surrogate \xC3\xAD\xC2\xA0\xC2\x80"},
        {"nonchar \xEF\xBF\xBE", "nonchar \xEF\xBF\xBD"},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        br_xmlw *w;
        br_error err;
        br_text *out = br_text_create();
        CU_ASSERT_EQUAL_FATAL(br_xmlw_create(&w, &err), BR_OK);
        br_xmlw_start(w, "r");
        br_xmlw_attr(w, "file", cases[i].in);
        br_xmlw_text(w, cases[i].in);
        CU_ASSERT_EQUAL_FATAL(br_xmlw_finish(w, out, &err), BR_OK);
        br_xmlw_free(w);
        xmlDoc *doc = parse(out);
        CU_ASSERT_PTR_NOT_NULL_FATAL(doc);
        xmlNode *root = xmlDocGetRootElement(doc);
        CU_ASSERT_TRUE(prop_is(root, "file", cases[i].want));
        xmlChar *text = xmlNodeGetContent(root);
        CU_ASSERT_STRING_EQUAL((const char *)text, cases[i].want);
        xmlFree(text);
        xmlFreeDoc(doc);
        br_text_free(out);
    }
}

static void test_sticky_failure(void)
{
    br_xmlw *w;
    br_error err;
    br_text *out = br_text_create();
    CU_ASSERT_EQUAL_FATAL(br_xmlw_create(&w, &err), BR_OK);
    br_xmlw_start(w, "root");
    br_xmlw_fail(w);
    br_xmlw_start(w, "child");
    br_xmlw_attr(w, "a", "b");
    CU_ASSERT_NOT_EQUAL(br_xmlw_finish(w, out, &err), BR_OK);
    CU_ASSERT_EQUAL(err.code, BR_ENOMEM);
    CU_ASSERT_EQUAL(br_text_len(out), 0);
    br_xmlw_free(w);
    br_xmlw_free(NULL);
    br_text_free(out);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"written, read back", test_round_trip},
        {"sticky failure", test_sticky_failure},
        {"bytes that are not UTF-8 or not XML characters", test_bytes_not_utf8},
        {NULL, NULL},
    };
    return br_test_main("io_xml_write", cases);
}

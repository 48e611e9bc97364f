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
        {NULL, NULL},
    };
    return br_test_main("io_xml_write", cases);
}

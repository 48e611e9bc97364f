/* test_io_bad.c - every file of the bad-input corpus (tests/bad) must be
 * refused with one located message; plus missing files, directories,
 * oversized input and the promise that libxml2 never prints. */
#include "bootrung/bootrung.h"
#include "model/design.h"
#include "testkit.h"

#include <dirent.h>
#include <fcntl.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include <libxml/globals.h>
#include <libxml/xmlerror.h>
#include <libxml/xmlversion.h>

#define BAD_DIR BR_SOURCE_DIR "/tests/bad"

/* What each bad file must produce: the line of the fault (0: the fault
 * has no line, like an empty file), the exact field and a piece of the
 * message. */
typedef struct bad_case {
    const char *file;
    int line;
    const char *field;
    const char *msg;
} bad_case;

static const bad_case corpus[] = {
    {"unit-wrong.xml", 4, "operating-point: dead-time", "got 'uF', expected a time"},
    {"unit-garbage.xml", 4, "operating-point: vin", "not a number"},
    {"unit-nan.xml", 4, "operating-point: vin", "not a number"},
    {"unit-trailing.xml", 4, "operating-point: fsw", "unexpected '!'"},
    {"temperature-bare.xml", 4, "operating-point: ambient", "ambiguous"},
    {"unit-missing-charge.xml", 16, "switch q1: qg",
     "got '62' without a unit, expected a charge like '10 nC'"},
    {"unit-missing-capacitance.xml", 10, "diode d1: cj0",
     "got '12' without a unit, expected a capacitance"},
    {"unit-missing-tolerance.xml", 5, "supply: voltage", "got '0.5' without a unit"},
    {"value-absurd.xml", 4, "operating-point: vin", "of at most 1 MV"},
    {"vin-1e305.xml", 4, "operating-point: vin", "of at most 1 MV"},
    {"cj0-twelve-farad.xml", 11, "diode d-fast: cj0", "of at most 1 F"},
    {"duty-range.xml", 4, "operating-point: duty", "strictly between 0 and 1"},
    {"duty-tolerance-range.xml", 4, "operating-point: duty", "lower limit"},
    {"dead-time-too-long.xml", 4, "operating-point: dead-time", "expected dead-time <"},
    {"current-unknown.xml", 5, "operating-point: current", "expected one of"},
    {"supply-zero.xml", 5, "supply: voltage", "> 0"},
    {"levels-too-many.xml", 7, "fcml: levels", "from 2 to 33"},
    {"levels-too-few.xml", 7, "fcml: levels", "from 2 to 33"},
    {"levels-not-integer.xml", 7, "fcml: levels", "whole number"},
    {"cap-zero.xml", 11, "capacitor c1: c", "a capacitance > 0"},
    {"cap-tolerance-negative.xml", 11, "capacitor c1: c", "lower limit"},
    {"esr-negative.xml", 11, "capacitor c1: esr", ">= 0"},
    {"line-ends-cr.xml", 13, "capacitor c1: esr", ">= 0"}, /* CR alone ends each line */
    {"link-resistor-negative.xml", 18, "stages: link-resistor", ">= 0"},
    {"bias-not-ascending.xml", 14, "capacitor c1 bias 3: v", "ascending"},
    {"bias-factor-range.xml", 13, "capacitor c1 bias 2: factor", "(0, 1]"},
    {"uvlo-inverted.xml", 15, "driver drv1: uvlo-fall", "falling < rising"},
    {"gate-off-positive.xml", 15, "driver drv1: gate-off", "from -50 V to 0 V"},
    {"rds-hot-without-temp.xml", 16, "switch q1: rds-on-hot-temp", "go together"},
    {"rds-hot-and-exponent.xml", 16, "switch q1: rds-on-hot", "either rds-on-exp or rds-on-hot"},
    {"reverse-channel-with-vsd.xml", 16, "switch q1: vsd", "expected vth instead of vsd"},
    {"reverse-channel-without-vth.xml", 16, "switch q1: vth", "gate threshold voltage"},
    {"load-current-negative.xml", 4, "operating-point: load-current", ">= 0"},
    {"load-with-current-none.xml", 4, "operating-point: load-current", "current=\"none\""},
    {"line-with-load-current.xml", 4, "operating-point: load-current", "DC load current"},
    {"line-with-duty.xml", 5, "operating-point: duty", "a fixed duty together with"},
    {"line-current-none.xml", 4, "operating-point: current", "\"none\" would carry"},
    {"line-frequency-too-high.xml", 5, "line-cycle: frequency", "far below the switching"},
    {"line-frequency-too-low.xml", 5, "line-cycle: frequency", "at least fsw/100000"},
    {"line-depth-one.xml", 5, "line-cycle: depth", "from 0 to below 1"},
    {"line-no-modulation.xml", 5, "line-cycle", "no modulation"},
    {"line-depth-and-table.xml", 5, "line-cycle: depth", "not both"},
    {"line-table-order.xml", 8, "line-cycle duty 3: at", "ascending"},
    {"line-table-duty-range.xml", 7, "line-cycle duty 2: value", "strictly between 0 and 1"},
    {"line-phase-bare.xml", 5, "line-cycle: phase", "an angle like '30 deg'"},
    {"line-string.xml", 5, "line-cycle", "expected an <fcml> leg"},
    {"line-dead-time.xml", 4, "operating-point: dead-time", "shortest on-time of the line cycle"},
    {"switch-tj-bare.xml", 4, "operating-point: switch-tj", "ambiguous"},
    {"string-conducts-missing.xml", 12, "switch S2: conducts", "missing"},
    {"conducts-unknown.xml", 8, "switch S1: conducts", "expected one of"},
    {"vgs-rec-above-max.xml", 16, "switch q1: vgs-rec", "vgs-max"},
    {"diode-n-range.xml", 10, "diode d1: n", "0.5 to 10"},
    {"spice-model-range.xml", 13, "diode d1: spice-model: M", "got 1.5, expected a grading"},
    {"spice-model-type.xml", 10, "diode d1: spice-model", "model type 'NPN', expected D"},
    {"forward-too-few.xml", 10, "diode d1: forward", "expected 3 to"},
    {"forward-and-law.xml", 10, "diode d1: is", "either"},
    {"forward-descending.xml", 13, "diode d1 forward 3: i", "ascend"},
    {"qrr-without-if.xml", 10, "diode d1: if", "go together"},
    {"tau-and-qrr.xml", 10, "diode d1: qrr", "either tau or qrr"},
    {"duplicate-id.xml", 16, "switch c1: id", "already the id of a capacitor"},
    {"unknown-part-id.xml", 18, "stages: capacitor", "unknown part id 'c9'"},
    {"wrong-kind-id.xml", 18, "stages: diode", "'c1' is a capacitor"},
    {"rail-extra-unknown.xml", 19, "stages: rail-extra", "unknown part id 'ldo-x'"},
    {"stage-index-range.xml", 19, "stage 4: index", "from 0 to 3"},
    {"stage-duplicate.xml", 20, "stage 2: index", "overridden twice"},
    {"precharge-unknown-switch.xml", 20, "startup precharge 1: switches", "unknown switch 'B7'"},
    {"hold-on-unknown-switch.xml", 16, "analysis: hold-on", "unknown switch 'B7'"},
    {"hold-on-pair.xml", 16, "analysis: hold-on", "shorts the flying capacitor"},
    {"hold-on-empty.xml", 16, "analysis: hold-on", "empty, expected switch names"},
    {"precharge-zero-duration.xml", 20, "startup precharge 1: duration", "> 0"},
    {"derating-range.xml", 22, "analysis: derating", "(0, 1]"},
    {"max-dropouts-negative.xml", 22, "analysis: max-dropouts", "expected a whole number from 0"},
    {"max-dropouts-fraction.xml", 22, "analysis: max-dropouts", "got '2.5', expected a whole"},
    {"max-dropouts-too-many.xml", 22, "analysis: max-dropouts", "got 20000, expected"},
    {"supply-limit-no-bypass.xml", 5, "supply: current-limit", "needs bypass > 0"},
    {"supply-limit-mode-alone.xml", 5, "supply: limit-mode", "without current-limit"},
    {"supply-foldback-missing.xml", 5, "supply: foldback-current", "missing"},
    {"supply-foldback-above.xml", 5, "supply: foldback-current", "below current-limit"},
    {"supply-hiccup-off-missing.xml", 5, "supply: hiccup-off", "missing"},
    {"supply-hiccup-off-constant.xml", 5, "supply: hiccup-off", "only with limit-mode=\"hiccup\""},
    {"supply-limit-mode-unknown.xml", 5, "supply: limit-mode", "constant foldback hiccup"},
    {"supply-hiccup-retries-fraction.xml", 5, "supply: hiccup-retries", "whole number"},
    {"supply-rating-zero.xml", 5, "supply: rating", "> 0"},
    {"diode-rth-unit.xml", 10, "diode d1: rth", "a thermal resistance like '60 K/W'"},
    {"diode-tj-max-bare.xml", 10, "diode d1: tj-max", "ambiguous"},
    {"cap-temp-and-factor.xml", 11, "capacitor c1: temp-factor", "either temp-factor"},
    {"cap-temp-not-ascending.xml", 13, "capacitor c1 temp 2: t", "ascending"},
    {"cap-dielectric-unknown.xml", 11, "capacitor c1: dielectric", "class-1 class-2 other"},
    {"stage-diode-rth-negative.xml", 18, "stages: diode-rth", ">= 0"},
    {"cap-derating-range.xml", 22, "analysis: cap-derating", "(0, 1]"},
    {"string-empty-interval.xml", 12, "switch S2 on 1: to", "empty interval"},
    {"string-duplicate-name.xml", 11, "switch S1: name", "unique"},
    {"string-interval-range.xml", 12, "switch S2 on 1: to", "from 0 to 1"},
    {"unknown-element.xml", 16, "parts", "unknown element <swich>"},
    {"unknown-attribute.xml", 7, "fcml: colour", "unknown attribute"},
    {"missing-attribute.xml", 11, "capacitor c1: c", "required attribute missing"},
    {"missing-element.xml", 3, "bootrung-design", "missing <stages>"},
    {"out-of-order.xml", 8, "bootrung-design", "out of order"},
    {"two-supplies.xml", 6, "bootrung-design", "a second <supply>"},
    {"text-content.xml", 5, "supply", "unexpected text"},
    {"bad-version.xml", 3, "bootrung-design: version", "expected 1"},
    {"wrong-root.xml", 3, "", "expected <bootrung-design>"},
    {"not-xml.xml", 1, "", "not well-formed"},
    {"truncated.xml", 15, "", "not well-formed"},
    {"mismatched-tag.xml", 17, "", "not well-formed"},
    {"empty.xml", 0, "", "empty"},
    {"doctype-billion-laughs.xml", 3, "", "DOCTYPE"},
    {"doctype-external-entity.xml", 3, "", "DOCTYPE"},
    {"doctype-external-dtd.xml", 3, "", "DOCTYPE"},
    /* limits: table lengths, string lengths, nesting, entities */
    {"bias-too-many.xml", 11, "capacitor c1: bias", "expected at most 32"},
    {"forward-too-many.xml", 10, "diode d1: forward", "expected 3 to 32"},
    {"parts-too-many.xml", 75, "capacitor c65", "expected at most 64"},
    {"precharge-too-many.xml", 33, "startup precharge 17", "expected at most 16"},
    {"string-too-many-switches.xml", 7, "string", "expected 2 to 64"},
    {"string-too-many-windows.xml", 13, "switch S1 on 5", "expected at most 4"},
    {"id-too-long.xml", 10,
     "diode dxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxx: id",
     "1 to 47 characters"},
    {"name-too-long.xml", 3, "bootrung-design: name", "expected at most 127"},
    {"string-name-too-long.xml", 8,
     "switch SSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSSS: name",
     "1 to 47 characters"},
    {"value-too-long.xml", 4, "operating-point: vin", "expected at most 1023"},
    {"nesting-too-deep.xml", 7, "", "nested deeper than libxml2's limit of 256"},
    {"entity-undeclared.xml", 3, "", "Entity 'lol' not defined"},
    {"injection-rail-zero.xml", 7, "injection: rail", "rail 0 is the supply itself"},
    {"injection-rail-beyond.xml", 7, "injection: rail",
     "got 4, expected a floating rail from 1 to 3"},
    {"injection-rail-twice.xml", 8, "injection: rail", "already has an injection (line 7)"},
    {"injection-diode-unknown.xml", 7, "injection: diode", "unknown part id 'd9'"},
    {"injection-resistance-negative.xml", 7, "injection: resistance", ">= 0"},
    {"injection-voltage-bare.xml", 7, "injection: voltage", "without a unit"},
    {"injection-voltage-missing.xml", 7, "injection: voltage", "required attribute missing"},
    {"injection-start-tolerance.xml", 7, "injection: start", "no tolerance allowed"},
    {"injection-foldback-missing.xml", 7, "injection: foldback-current",
     "missing, expected the limit at 0 V output"},
    {"injection-limit-mode-alone.xml", 7, "injection: limit-mode", "given without current-limit"},
};

#define NCORPUS ((int)(sizeof corpus / sizeof corpus[0]))

static int load_bad(const char *name, br_error *err)
{
    char path[512];
    br_design *d = (br_design *)0x1; /* must come back NULL */
    snprintf(path, sizeof path, "%s/%s", BAD_DIR, name);
    br_error_clear(err);
    int rc = br_design_load(path, &d, err);
    CU_ASSERT_PTR_NULL(d);
    return rc;
}

static void check_case(const bad_case *c)
{
    br_error err;
    char buf[2048];
    int rc = load_bad(c->file, &err);
    int ok = rc == BR_EINPUT && err.code == BR_EINPUT && err.line == c->line &&
             strcmp(err.field, c->field) == 0 && strstr(err.msg, c->msg) != NULL &&
             strstr(err.file, c->file) != NULL;
    if (!ok)
        fprintf(stderr, "\n%s: expected line %d field '%s' msg '...%s...'\n  got [%d] %s\n",
                c->file, c->line, c->field, c->msg, rc, br_error_format(&err, buf, sizeof buf));
    CU_ASSERT_TRUE(ok);
}

static void test_corpus(void)
{
    CU_ASSERT_TRUE(NCORPUS >= 25);
    for (int i = 0; i < NCORPUS; i++)
        check_case(&corpus[i]);
}

static int in_table(const char *name)
{
    for (int i = 0; i < NCORPUS; i++)
        if (strcmp(corpus[i].file, name) == 0)
            return 1;
    return 0;
}

/* A file added to tests/bad without a table entry would test nothing. */
static void test_corpus_complete(void)
{
    DIR *dir = opendir(BAD_DIR);
    int files = 0;
    CU_ASSERT_PTR_NOT_NULL_FATAL(dir);
    for (struct dirent *e; (e = readdir(dir)) != NULL;) {
        size_t n = strlen(e->d_name);
        if (n < 4 || strcmp(e->d_name + n - 4, ".xml") != 0)
            continue;
        files++;
        if (!in_table(e->d_name))
            fprintf(stderr, "\n%s has no entry in the corpus table\n", e->d_name);
        CU_ASSERT_TRUE(in_table(e->d_name));
    }
    closedir(dir);
    CU_ASSERT_EQUAL(files, NCORPUS);
}

/* The record renders as FILE:LINE: field: message. */
static void test_message_format(void)
{
    br_error err;
    char buf[2048];
    load_bad("esr-negative.xml", &err);
    br_error_format(&err, buf, sizeof buf);
    CU_ASSERT_PTR_NOT_NULL(strstr(buf, "esr-negative.xml:11: capacitor c1: esr: got '-10 mohm'"));
}

static void test_missing_file(void)
{
    br_error err;
    br_design *d = NULL;
    br_error_clear(&err);
    CU_ASSERT_EQUAL(br_design_load(BAD_DIR "/no-such-file.xml", &d, &err), BR_EIO);
    CU_ASSERT_PTR_NULL(d);
    CU_ASSERT_PTR_NOT_NULL(strstr(err.msg, "cannot open"));
    CU_ASSERT_PTR_NOT_NULL(strstr(err.file, "no-such-file.xml"));
}

static void test_directory(void)
{
    br_error err;
    br_design *d = NULL;
    br_error_clear(&err);
    CU_ASSERT_EQUAL(br_design_load(BAD_DIR, &d, &err), BR_EIO);
    CU_ASSERT_PTR_NULL(d);
    CU_ASSERT_PTR_NOT_NULL(strstr(err.msg, "directory"));
}

/* A sparse 17 MiB file: refused by size before it is read. */
static void test_huge_file(void)
{
    char path[] = "/tmp/bootrung-huge-XXXXXX";
    int fd = mkstemp(path);
    CU_ASSERT_TRUE_FATAL(fd >= 0);
    CU_ASSERT_EQUAL(ftruncate(fd, (off_t)17 << 20), 0);
    close(fd);
    br_error err;
    br_design *d = NULL;
    br_error_clear(&err);
    CU_ASSERT_EQUAL(br_design_load(path, &d, &err), BR_EINPUT);
    CU_ASSERT_PTR_NULL(d);
    CU_ASSERT_PTR_NOT_NULL(strstr(err.msg, "MiB limit"));
    unlink(path);
}

static void test_huge_memory(void)
{
    size_t len = ((size_t)16 << 20) + 1;
    char *buf = calloc(len, 1);
    CU_ASSERT_PTR_NOT_NULL_FATAL(buf);
    br_error err;
    br_design *d = NULL;
    br_error_clear(&err);
    CU_ASSERT_EQUAL(br_design_load_memory(buf, len, "big", &d, &err), BR_EINPUT);
    CU_ASSERT_PTR_NULL(d);
    CU_ASSERT_PTR_NOT_NULL(strstr(err.msg, "MiB limit"));
    free(buf);
}

static void test_bad_arguments(void)
{
    br_error err;
    br_design *d = NULL;
    CU_ASSERT_EQUAL(br_design_load(NULL, &d, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_design_load(BAD_DIR "/empty.xml", NULL, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_design_load_memory(NULL, 3, "x", &d, &err), BR_EUSAGE);
    /* a NULL error record is allowed: the status still says what happened */
    CU_ASSERT_EQUAL(br_design_load(BAD_DIR "/esr-negative.xml", &d, NULL), BR_EINPUT);
    CU_ASSERT_PTR_NULL(d);
}

/* The external entity must never be read: the refusal comes first and
 * nothing of the file it names reaches the message. */
static void test_no_entities(void)
{
    br_error err;
    load_bad("doctype-external-entity.xml", &err);
    CU_ASSERT_PTR_NULL(strstr(err.msg, "root:"));
    CU_ASSERT_PTR_NOT_NULL(strstr(err.msg, "DOCTYPE"));
}

/* libxml2 2.12 made the error record const in the handler signature. */
#if LIBXML_VERSION >= 21200
typedef const xmlError *xml_error_arg;
#else
typedef xmlError *xml_error_arg;
#endif

static void foreign_structured(void *ctx, xml_error_arg e)
{
    (void)e;
    (*(int *)ctx)++;
}

/* A caller's own libxml2 handlers are neither called nor replaced. */
static void test_handlers_restored(void)
{
    br_error err;
    int calls = 0;
    xmlSetStructuredErrorFunc(&calls, foreign_structured);
    load_bad("mismatched-tag.xml", &err);
    load_bad("unknown-element.xml", &err);
    CU_ASSERT_EQUAL(calls, 0);
    CU_ASSERT_PTR_EQUAL(xmlStructuredErrorContext, &calls);
    CU_ASSERT_TRUE(xmlStructuredError == foreign_structured);
    xmlSetStructuredErrorFunc(NULL, NULL);
}

/* libxml2 must never write to stderr: run the whole corpus with stderr
 * pointed at a file and expect the file to stay empty. */
static void test_silent(void)
{
    char path[] = "/tmp/bootrung-stderr-XXXXXX";
    int fd = mkstemp(path);
    CU_ASSERT_TRUE_FATAL(fd >= 0);
    fflush(stderr);
    int saved = dup(2);
    dup2(fd, 2);
    br_error err;
    for (int i = 0; i < NCORPUS; i++)
        load_bad(corpus[i].file, &err);
    fflush(stderr);
    dup2(saved, 2);
    close(saved);
    struct stat st;
    CU_ASSERT_EQUAL(fstat(fd, &st), 0);
    CU_ASSERT_EQUAL(st.st_size, 0);
    close(fd);
    unlink(path);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"every bad file fails with line, field and message", test_corpus},
        {"every bad file is in the table", test_corpus_complete},
        {"message format", test_message_format},
        {"missing file", test_missing_file},
        {"directory", test_directory},
        {"file over the size limit", test_huge_file},
        {"buffer over the size limit", test_huge_memory},
        {"bad arguments", test_bad_arguments},
        {"entities are never expanded", test_no_entities},
        {"caller's libxml2 handlers restored", test_handlers_restored},
        {"nothing printed to stderr", test_silent},
        {NULL, NULL},
    };
    return br_test_main("io_bad", cases);
}

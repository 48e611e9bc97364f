/* test_cli_extreme.c - extreme but legal designs (tests/extreme): each
 * `analyze` run either works (exit 0, 1 or 3 with a verdict and only
 * finite numbers) or is refused with a reason naming the field (exit 2),
 * within a time bound per case. */
#include "runbin.h"
#include "testkit.h"

#include <ctype.h>
#include <libxml/parser.h>
#include <stdio.h>
#include <string.h>
#include <strings.h>
#include <sys/stat.h>
#include <time.h>

#define EXTREME_DIR BR_SOURCE_DIR "/tests/extreme/"
/* Wall time per case before it counts as a hang; sanitizer builds run
 * several times slower. */
#if defined(__SANITIZE_ADDRESS__)
#define LIMIT_S 180.0
#else
#define LIMIT_S 60.0
#endif

/* One case: the exit statuses it may give (bits), and for a refusal the
 * field the message must name. */
typedef struct extreme_case {
    const char *file;
    unsigned allowed;  /* bit s: exit status s is acceptable */
    const char *field; /* exit 2: "FILE:LINE: field:" must name it */
} extreme_case;

#define ST(s) (1u << (s))
#define WORKS (ST(0) | ST(1) | ST(3))

static const extreme_case cases[] = {
    /* 64 switches: the largest string the model holds */
    {"levels-33.xml", WORKS, NULL},
    /* 64 levels would need 126 switches: refused at load time */
    {"levels-64.xml", ST(2), "fcml: levels"},
    /* 1 nF cannot deliver 20 nC of gate charge: must never pass */
    {"cap-tiny.xml", ST(1) | ST(3), NULL},
    {"cap-huge.xml", WORKS, NULL},
    {"fsw-2mhz.xml", WORKS, NULL},
    {"duty-001.xml", WORKS, NULL},
    {"duty-099.xml", WORKS, NULL},
    /* an on-window across the period end, and a quiet phase after every
     * event of the period: both read past the period's events once */
    {"string-wrap.xml", ST(0), NULL},
    {"halfbridge-d02.xml", ST(0), NULL},
    /* a clamp with rz = 0 is a hard limit, not an infinite current */
    {"clamp-ideal.xml", ST(0) | ST(1), NULL},
    /* runaways: bounded work, undetermined (a numerical failure is never
     * exit 2); absurd values may also fail on what could be decided */
    {"fsw-1hz.xml", ST(3), NULL},
    {"cap-100ff.xml", ST(1) | ST(3), NULL},
    {"cap-1ff.xml", ST(1) | ST(3), NULL},
    /* edges of 10 ns in a 1 ps period: refused */
    {"fsw-1thz.xml", ST(2), "operating-point: edge-time"},
};

#define NCASES ((int)(sizeof cases / sizeof cases[0]))

/* Where "nan" or "inf" stands as a word of its own ("n/a" is the honest
 * form), or NULL. */
static const char *nonfinite_word(const char *s)
{
    static const char *const words[] = {"nan", "inf"};
    for (const char *p = s; *p; p++) {
        if (p > s && (isalnum((unsigned char)p[-1]) || p[-1] == '_'))
            continue;
        for (int w = 0; w < 2; w++) {
            size_t n = strlen(words[w]);
            if (strncasecmp(p, words[w], n) == 0 &&
                (!isalnum((unsigned char)p[n]) || strncasecmp(p, "infinity", 8) == 0))
                return p;
        }
    }
    return NULL;
}

static int finite_only(const char *s)
{
    const char *p = nonfinite_word(s);
    if (p)
        fprintf(stderr, "\nnon-finite number printed: [%.40s]\n", p);
    return p == NULL;
}

static double seconds_since(const struct timespec *t0)
{
    struct timespec now;
    clock_gettime(CLOCK_MONOTONIC, &now);
    return (double)(now.tv_sec - t0->tv_sec) + 1e-9 * (double)(now.tv_nsec - t0->tv_nsec);
}

static void check_refusal(const extreme_case *c, const run_result *r)
{
    char want[160];
    snprintf(want, sizeof want, "%s:", c->field);
    CU_ASSERT_TRUE(has(r->err, c->file));
    CU_ASSERT_TRUE(has(r->err, want));
    CU_ASSERT_TRUE(has(r->err, "expected"));
}

static void check_works(const run_result *r)
{
    CU_ASSERT_TRUE(has(r->out, "verdict: "));
    CU_ASSERT_TRUE(finite_only(r->out));
    CU_ASSERT_TRUE(finite_only(r->err));
}

static void run_case(const extreme_case *c)
{
    char path[512];
    snprintf(path, sizeof path, "%s%s", EXTREME_DIR, c->file);
    const char *args[] = {"analyze", path, NULL};
    struct timespec t0;
    clock_gettime(CLOCK_MONOTONIC, &t0);
    run_result r = run_limited(LIMIT_S, args);
    double took = seconds_since(&t0);
    fprintf(stderr, "\n  %-16s exit %d in %.2f s", c->file, r.status, took);
    CU_ASSERT_FALSE(r.timed_out);
    int ok = r.status >= 0 && r.status < 32 && (c->allowed & ST(r.status));
    if (!ok)
        fprintf(stderr, "\n%s: unexpected exit %d\n%s\n", c->file, r.status, r.err);
    CU_ASSERT_TRUE(ok);
    if (ok && r.status == 2)
        check_refusal(c, &r);
    else if (ok)
        check_works(&r);
    done(&r);
}

static void test_extreme_set(void)
{
    for (int i = 0; i < NCASES; i++)
        run_case(&cases[i]);
}

/* The scanner itself: it must see what it is there to catch. */
static void test_nonfinite_scanner(void)
{
    CU_ASSERT_PTR_NOT_NULL(nonfinite_word("margin nan V"));
    CU_ASSERT_PTR_NOT_NULL(nonfinite_word("figure -inf"));
    CU_ASSERT_PTR_NOT_NULL(nonfinite_word("x=INF"));
    CU_ASSERT_PTR_NOT_NULL(nonfinite_word("Infinity"));
    CU_ASSERT_PTR_NULL(nonfinite_word("information, n/a, financial, nanosecond"));
}

/* A solver held to one iteration and one plain period cannot settle the
 * demo: the steady criteria are undetermined (never pass), the note says
 * which rail, after how many periods and by how much it still moves, and
 * the exit status is 3 because nothing that was decided fails. */
static void test_undetermined(void)
{
    const char *demo = BR_SOURCE_DIR "/examples/demo-3level.xml";
    const char *args[] = {"analyze", "--solver-limit", "1", demo, NULL};
    run_result r = run_limited(LIMIT_S, args);
    CU_ASSERT_EQUAL(r.status, 3);
    CU_ASSERT_TRUE(has(r.out, "verdict: UNDETERMINED"));
    CU_ASSERT_TRUE(has(r.out, "periodic steady state     UNDETERMINED"));
    CU_ASSERT_TRUE(has(r.out, "the solver did not converge"));
    CU_ASSERT_TRUE(has(r.out, "periods rail "));
    CU_ASSERT_TRUE(has(r.out, "per period"));
    CU_ASSERT_TRUE(has(r.out, "start-up time             pass"));
    CU_ASSERT_PTR_NULL(strstr(r.out, "verdict: PASS"));
    CU_ASSERT_TRUE(finite_only(r.out));
    done(&r);
    const char *xml[] = {"steady", "--solver-limit", "1", "--xml", "-", demo, NULL};
    r = run_limited(LIMIT_S, xml);
    CU_ASSERT_EQUAL(r.status, 3);
    CU_ASSERT_TRUE(has(r.out, "<verdict pass=\"false\" result=\"undetermined\">"));
    CU_ASSERT_TRUE(has(r.out, "result=\"undetermined\" pass=\"false\""));
    CU_ASSERT_TRUE(has(r.out, "converged=\"false\""));
    CU_ASSERT_TRUE(has(r.out, "residual-rail=\""));
    xmlDoc *doc = xmlReadMemory(r.out, (int)strlen(r.out), "steady.xml", NULL, XML_PARSE_NONET);
    CU_ASSERT_PTR_NOT_NULL(doc); /* well-formed */
    xmlFreeDoc(doc);
    done(&r);
    /* the same design with the default solver settles and decides */
    const char *plain[] = {"steady", demo, NULL};
    r = run_limited(LIMIT_S, plain);
    CU_ASSERT_EQUAL(r.status, 1);
    CU_ASSERT_PTR_NULL(strstr(r.out, "UNDETERMINED"));
    done(&r);
}

static void test_solver_limit_usage(void)
{
    const char *args[] = {"analyze", "--solver-limit", "0", "x.xml", NULL};
    run_result r = run_limited(LIMIT_S, args);
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_TRUE(has(r.err, "--solver-limit"));
    done(&r);
}

/* Results written to a device (here one that is always full) go into it
 * in place: the write error is reported (exit 2), and the device node is
 * never replaced by a regular file, even when the tests run as root. */
static void test_device_output(void)
{
    struct stat st;
    if (stat("/dev/full", &st) != 0 || !S_ISCHR(st.st_mode))
        return; /* no /dev/full here: nothing to check */
    const char *args[] = {"analyze", "--xml", "/dev/full",
                          BR_SOURCE_DIR "/examples/demo-3level.xml", NULL};
    run_result r = run_limited(LIMIT_S, args);
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_TRUE(has(r.err, "/dev/full"));
    done(&r);
    CU_ASSERT_EQUAL(stat("/dev/full", &st), 0);
    CU_ASSERT_TRUE(S_ISCHR(st.st_mode));
}

int main(void)
{
    static const br_test_case tests[] = {
        {"non-finite scanner", test_nonfinite_scanner},
        {"forced non-convergence is undetermined, exit 3", test_undetermined},
        {"--solver-limit usage", test_solver_limit_usage},
        {"output to a device file", test_device_output},
        {"extreme designs work or are refused, in bounded time", test_extreme_set},
        {NULL, NULL},
    };
    return br_test_main("cli_extreme", tests);
}

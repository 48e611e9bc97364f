/* test_cli_check.c - the bootrung binary as a user meets it: help, usage
 * errors, `check` on every example and on every bad design file, write
 * errors on stdout, exit statuses and golden outputs (tests/golden/). */
#include "model/chain.h"
#include "runbin.h"
#include "testkit.h"

#include <dirent.h>
#include <fcntl.h>
#include <signal.h>
#include <spawn.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#define MAX_FILES 128

static int count_lines(const char *s)
{
    int n = 0;
    for (; *s; s++)
        n += *s == '\n';
    return n;
}

static int starts_with(const char *s, const char *prefix)
{
    return strncmp(s, prefix, strlen(prefix)) == 0;
}

/* One diagnostic line on stderr that starts with prefix. */
static void expect_one_line(const run_result *r, const char *prefix)
{
    if (count_lines(r->err) != 1 || !starts_with(r->err, prefix))
        fprintf(stderr, "stderr was: [%s], expected one line starting [%s]\n", r->err, prefix);
    CU_ASSERT_EQUAL(count_lines(r->err), 1);
    CU_ASSERT_TRUE(starts_with(r->err, prefix));
}

static int by_name(const void *a, const void *b)
{
    return strcmp(a, b);
}

/* Files in BR_SOURCE_DIR-relative folder dir ending in ".xml", sorted. */
static int list_xml(const char *dir, char names[][256])
{
    DIR *d = opendir(dir);
    int n = 0;
    for (struct dirent *e; d && n < MAX_FILES && (e = readdir(d));) {
        size_t len = strlen(e->d_name);
        if (len > 4 && strcmp(e->d_name + len - 4, ".xml") == 0) {
            int w = snprintf(names[n], 256, "%s/%s", dir, e->d_name);
            n += w > 0 && w < 256; /* a name too long to hold is skipped */
        }
    }
    if (d)
        closedir(d);
    qsort(names, (size_t)n, 256, by_name);
    return n;
}

/* ---- help and usage -------------------------------------------------- */

static void test_help(void)
{
    run_result r = run((const char *[]){"--help", NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(starts_with(r.out, "usage: bootrung "));
    CU_ASSERT_PTR_NOT_NULL(strstr(r.out, "\n  check "));
    CU_ASSERT_STRING_EQUAL(r.err, "");
    done(&r);
}

static void test_verb_help(void)
{
    run_result a = run((const char *[]){"help", "check", NULL});
    run_result b = run((const char *[]){"check", "--help", NULL});
    CU_ASSERT_EQUAL(a.status, 0);
    CU_ASSERT_EQUAL(b.status, 0);
    CU_ASSERT_TRUE(starts_with(a.out, "usage: bootrung check [options] FILE"));
    CU_ASSERT_PTR_NOT_NULL(strstr(a.out, "--strict"));
    CU_ASSERT_STRING_EQUAL(a.out, b.out);
    done(&a);
    done(&b);
}

static void test_version(void)
{
    run_result r = run((const char *[]){"--version", NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(starts_with(r.out, "bootrung "));
    CU_ASSERT_PTR_NULL(strstr(r.out, "unknown"));
    CU_ASSERT_PTR_NOT_NULL(strstr(r.out, "GPL-3.0-or-later"));
    done(&r);
}

static void test_no_args(void)
{
    run_result r = run((const char *[]){NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_TRUE(starts_with(r.err, "usage: bootrung "));
    CU_ASSERT_STRING_EQUAL(r.out, "");
    done(&r);
}

static void test_unknown_verb(void)
{
    run_result r = run((const char *[]){"frobnicate", "x.xml", NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    expect_one_line(&r, "bootrung: unknown verb 'frobnicate'");
    done(&r);
    r = run((const char *[]){"help", "frobnicate", NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    expect_one_line(&r, "bootrung: no verb 'frobnicate'");
    done(&r);
}

static void test_bad_usage(void)
{
    const char *const *cases[] = {
        (const char *[]){"check", NULL},
        (const char *[]){"check", "a.xml", "b.xml", NULL},
        (const char *[]){"check", "--nope", "a.xml", NULL},
        (const char *[]){"check", "-x", "a.xml", NULL},
        (const char *[]){"check", "--strict=yes", "a.xml", NULL},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        run_result r = run(cases[i]);
        CU_ASSERT_EQUAL(r.status, 2);
        expect_one_line(&r, "bootrung: check: ");
        CU_ASSERT_STRING_EQUAL(r.out, "");
        done(&r);
    }
}

/* ---- bad input ------------------------------------------------------- */

static void test_missing_file(void)
{
    run_result r = run((const char *[]){"check", "no/such/design.xml", NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    expect_one_line(&r, "bootrung: no/such/design.xml");
    CU_ASSERT_STRING_EQUAL(r.out, "");
    done(&r);
}

static void test_directory(void)
{
    run_result r = run((const char *[]){"check", "examples", NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    expect_one_line(&r, "bootrung: examples");
    CU_ASSERT_STRING_EQUAL(r.out, "");
    done(&r);
}

/* Every file of the bad-input corpus: exit 2, nothing on stdout, one line
 * "bootrung: FILE:LINE: ..." on stderr (an empty file has no line). */
static void test_bad_corpus(void)
{
    static char names[MAX_FILES][256];
    int n = list_xml("tests/bad", names);
    CU_ASSERT_TRUE(n >= 5);
    for (int i = 0; i < n; i++) {
        run_result r = run((const char *[]){"check", names[i], NULL});
        char prefix[300];
        snprintf(prefix, sizeof prefix, "bootrung: %.255s:", names[i]);
        CU_ASSERT_EQUAL(r.status, 2);
        CU_ASSERT_STRING_EQUAL(r.out, "");
        expect_one_line(&r, prefix);
        const char *p = r.err + strlen(prefix);
        struct stat sb;
        int empty = stat(names[i], &sb) == 0 && sb.st_size == 0; /* no line to name */
        int has_line = empty || (*p >= '1' && *p <= '9');
        if (!has_line)
            fprintf(stderr, "%s: no line number in [%s]\n", names[i], r.err);
        CU_ASSERT_TRUE(has_line);
        done(&r);
    }
}

/* ---- the examples ---------------------------------------------------- */

/* Every switch name of the example's chain, from the library itself. */
static void expect_switch_names(const char *path, const char *out)
{
    br_design *d = NULL;
    br_chain *c = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load(path, &d, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_chain_build(d, &c, &err), BR_OK);
    for (int k = 0; k < c->n; k++) {
        char cellname[BR_ID_MAX + 4];
        snprintf(cellname, sizeof cellname, "  %s  ", c->st[k].name);
        if (!strstr(out, cellname))
            fprintf(stderr, "%s: switch %s missing from the table\n", path, c->st[k].name);
        CU_ASSERT_PTR_NOT_NULL(strstr(out, cellname));
    }
    br_chain_free(c);
    br_design_free(d);
}

static void test_examples(void)
{
    static char names[MAX_FILES][256];
    int n = list_xml("examples", names);
    CU_ASSERT_TRUE(n >= 2);
    for (int i = 0; i < n; i++) {
        run_result r = run((const char *[]){"check", names[i], NULL});
        if (r.status != 0)
            fprintf(stderr, "%s: %s", names[i], r.err);
        CU_ASSERT_EQUAL(r.status, 0);
        CU_ASSERT_STRING_EQUAL(r.err, "");
        CU_ASSERT_PTR_NOT_NULL(strstr(r.out, "operating point"));
        CU_ASSERT_PTR_NOT_NULL(strstr(r.out, "design rules: "));
        CU_ASSERT_PTR_NOT_NULL(strstr(r.out, "These circuits carry lethal voltages."));
        expect_switch_names(names[i], r.out);
        done(&r);
    }
}

/* --strict turns warnings into exit status 1 and nothing else. */
static void test_strict(void)
{
    static char names[MAX_FILES][256];
    int n = list_xml("examples", names);
    for (int i = 0; i < n; i++) {
        run_result r = run((const char *[]){"check", "--strict", names[i], NULL});
        int clean = strstr(r.out, "design rules: no warnings") != NULL;
        CU_ASSERT_EQUAL(r.status, clean ? 0 : 1);
        done(&r);
    }
}

/* A design in a scratch file (caller removes it and the directory). */
static void scratch_design(char *dir, size_t dcap, char *path, size_t pcap, const char *text)
{
    snprintf(dir, dcap, "/tmp/br-check-XXXXXX");
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(dir));
    snprintf(path, pcap, "%s/design.xml", dir);
    FILE *f = fopen(path, "w");
    CU_ASSERT_PTR_NOT_NULL_FATAL(f);
    fputs(text, f);
    fclose(f);
}

/* A chain that cannot work fails: status 1 without --strict.  Hand
 * calculation: 8 V supply, link 1 through 200 ohm at its steady current
 * of about 4 mA (2 mA running, 2 mA gate charge 10 nC x 200 kHz) drops
 * 0.8 V plus the junction, leaving about 6.8 V for a 7.5 V UVLO rising. */
static void test_cannot_work(void)
{
    static const char design[] =
        "<bootrung-design version=\"1\" name=\"short\">\n"
        "  <operating-point vin=\"400 V\" fsw=\"200 kHz\" dead-time=\"50 ns\"/>\n"
        "  <supply voltage=\"8 V\" resistance=\"0.2 ohm\"/>\n"
        "  <topology><fcml levels=\"2\"/></topology>\n"
        "  <parts>\n"
        "    <diode id=\"d\" is=\"100 nA\" n=\"1.5\" rs=\"0.5 ohm\" vrrm=\"600 V\"/>\n"
        "    <capacitor id=\"c\" c=\"1 uF\"/>\n"
        "    <driver id=\"g\" uvlo-rise=\"7.5 V\" uvlo-fall=\"7 V\" iq-run=\"2 mA\"/>\n"
        "    <switch id=\"s\" qg=\"10 nC\"/>\n"
        "  </parts>\n"
        "  <stages diode=\"d\" capacitor=\"c\" driver=\"g\" switch=\"s\" "
        "link-resistor=\"200 ohm\"/>\n"
        "</bootrung-design>\n";
    char dir[64], path[128];
    scratch_design(dir, sizeof dir, path, sizeof path, design);
    const char *const *cases[] = {
        (const char *[]){"check", path, NULL},
        (const char *[]){"check", "--strict", path, NULL},
        (const char *[]){"check", "--quiet", path, NULL},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        run_result r = run(cases[i]);
        CU_ASSERT_EQUAL(r.status, 1);
        CU_ASSERT_STRING_EQUAL(r.err, "");
        CU_ASSERT_TRUE(has(r.out, "design rules: FAIL, "));
        done(&r);
    }
    run_result r = run((const char *[]){"check", path, NULL});
    CU_ASSERT_TRUE(has(r.out, "THE CHAIN CANNOT WORK: rail 1 never starts"));
    done(&r);
    remove(path);
    rmdir(dir);
}

/* Run bootrung with stdout on a pipe nobody reads (`| head -1` once head
 * has gone) and SIGPIPE at its default action, as a shell leaves it.
 * Returns the wait status. */
static int run_closed_pipe(char *const *argv)
{
    int fds[2];
    CU_ASSERT_EQUAL_FATAL(pipe(fds), 0);
    close(fds[0]);
    posix_spawn_file_actions_t fa;
    posix_spawnattr_t at;
    sigset_t def;
    posix_spawn_file_actions_init(&fa);
    posix_spawn_file_actions_adddup2(&fa, fds[1], 1);
    posix_spawn_file_actions_addopen(&fa, 2, "/dev/null", O_WRONLY, 0);
    posix_spawnattr_init(&at);
    sigemptyset(&def);
    sigaddset(&def, SIGPIPE);
    posix_spawnattr_setsigdefault(&at, &def);
    posix_spawnattr_setflags(&at, POSIX_SPAWN_SETSIGDEF);
    pid_t pid;
    int ok = posix_spawn(&pid, BR_BINARY, &fa, &at, argv, NULL) == 0, status = -1;
    close(fds[1]);
    if (ok)
        waitpid(pid, &status, 0);
    posix_spawn_file_actions_destroy(&fa);
    posix_spawnattr_destroy(&at);
    CU_ASSERT_TRUE(ok);
    return status;
}

/* A reader that has gone is a write error: status 2, not death by
 * SIGPIPE (status 141 in a shell). */
static void test_closed_pipe(void)
{
    char *const check[] = {"bootrung", "check", "examples/demo-3level.xml", NULL};
    char *const csv[] = {"bootrung", "startup", "--csv", "-", "tests/data/ref-c1.xml", NULL};
    char *const *cases[] = {check, csv};
    for (int i = 0; i < 2; i++) {
        int st = run_closed_pipe(cases[i]);
        CU_ASSERT_TRUE(WIFEXITED(st));
        if (WIFSIGNALED(st))
            fprintf(stderr, "%s: killed by signal %d\n", cases[i][1], WTERMSIG(st));
        CU_ASSERT_EQUAL(WIFEXITED(st) ? WEXITSTATUS(st) : -1, 2);
    }
}

/* A full disk on stdout is an error, not a silent truncation. */
static void test_stdout_error(void)
{
    static char names[MAX_FILES][256];
    if (access("/dev/full", W_OK) != 0 || list_xml("examples", names) < 1)
        return;
    run_result r = run_to("/dev/full", (const char *[]){"check", names[0], NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    expect_one_line(&r, "bootrung: cannot write to standard output: ");
    done(&r);
    r = run_to("/dev/full", (const char *[]){"--help", NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    done(&r);
}

/* ---- golden outputs -------------------------------------------------- */

static void test_golden(void)
{
    static char names[MAX_FILES][256];
    run_result r = run((const char *[]){"--help", NULL});
    CU_ASSERT_TRUE(same_as_golden("tests/golden/help.txt", r.out));
    done(&r);
    r = run((const char *[]){"check", "--help", NULL});
    CU_ASSERT_TRUE(same_as_golden("tests/golden/check-help.txt", r.out));
    done(&r);
    int n = list_xml("examples", names);
    for (int i = 0; i < n; i++) {
        char base[256], golden[300];
        snprintf(base, sizeof base, "%s", strrchr(names[i], '/') + 1);
        base[strlen(base) - 4] = '\0'; /* drop ".xml" */
        snprintf(golden, sizeof golden, "tests/golden/check-%.200s.txt", base);
        r = run((const char *[]){"check", names[i], NULL});
        CU_ASSERT_TRUE(same_as_golden(golden, r.out));
        done(&r);
    }
}

int main(void)
{
    static const br_test_case cases[] = {
        {"--help lists the verbs", test_help},
        {"help VERB and VERB --help agree", test_verb_help},
        {"--version", test_version},
        {"no arguments: usage, exit 2", test_no_args},
        {"unknown verb: exit 2", test_unknown_verb},
        {"bad usage of check: exit 2, one line", test_bad_usage},
        {"missing file: exit 2, names the file", test_missing_file},
        {"a directory: exit 2", test_directory},
        {"bad-input corpus: exit 2, FILE:LINE:", test_bad_corpus},
        {"check on every example", test_examples},
        {"--strict exit status", test_strict},
        {"a chain that cannot work: exit 1", test_cannot_work},
        {"write error on stdout: exit 2", test_stdout_error},
        {"a closed pipe on stdout: exit 2, not SIGPIPE", test_closed_pipe},
        {"golden outputs", test_golden},
        {NULL, NULL},
    };
    /* paths in messages and golden files are relative to the source tree */
    if (chdir(BR_SOURCE_DIR) != 0)
        return 2;
    return br_test_main("cli_check", cases);
}

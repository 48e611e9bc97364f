/* test_cli_pack.c - `analyze --pack DIR`: the sign-off pack a reviewer
 * opens and reproduces from.  One folder, every verb's page linked from
 * the index, the design copied in with its SHA-256, the tool's version,
 * the command lines (run again here, they give the same bytes), the
 * model's assumptions and each part's source; nothing left behind when
 * it cannot be made. */
#include "core/sha256.h"
#include "runbin.h"
#include "testkit.h"

#include <fcntl.h>
#include <libxml/parser.h>
#include <libxml/tree.h>
#include <signal.h>
#include <spawn.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <time.h>
#include <unistd.h>

extern char **environ;

#define DEMO "examples/demo-3level.xml"
#define CATALOG "examples/parts/catalog.xml"

static char dir[64], pack[96], design[96];

static int exists(const char *path)
{
    struct stat sb;
    return stat(path, &sb) == 0;
}

static char *slurp_in(const char *name, size_t *len)
{
    char path[256];
    snprintf(path, sizeof path, "%s/%s", pack, name);
    return br_test_slurp(path, len);
}

static void sha_of_file(const char *path, char hex[65])
{
    size_t len = 0;
    char *s = br_test_slurp(path, &len);
    CU_ASSERT_PTR_NOT_NULL_FATAL(s);
    br_sha256_hex(s, len, hex);
    free(s);
}

/* The demo with a source stated on its diode. */
static void write_design(void)
{
    char *src = br_test_slurp(DEMO, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(src);
    const char *from = "<diode id=\"sic-schottky-600v\"";
    char *at = strstr(src, from);
    CU_ASSERT_PTR_NOT_NULL_FATAL(at);
    FILE *f = fopen(design, "w");
    CU_ASSERT_PTR_NOT_NULL_FATAL(f);
    fprintf(f, "%.*s%s source=\"invented for the demo, rev 2\"%s", (int)(at - src), src, from,
            at + strlen(from));
    fclose(f);
    free(src);
}

/* Every line "HEX  NAME" of SHA256SUMS matches the file; returns the
 * number of files listed. */
static int sums_hold(void)
{
    char *sums = slurp_in("SHA256SUMS", NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(sums);
    int n = 0;
    char hex[65], name[128], path[256], got[65];
    for (const char *l = sums; sscanf(l, "%64s  %127s", hex, name) == 2; n++) {
        snprintf(path, sizeof path, "%s/%s", pack, name);
        sha_of_file(path, got);
        CU_ASSERT_STRING_EQUAL(got, hex);
        l = strchr(l, '\n');
        if (!l)
            break;
        l++;
    }
    free(sums);
    return n;
}

static void test_pack(void)
{
    snprintf(dir, sizeof dir, "/tmp/br-pack-XXXXXX");
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(dir));
    snprintf(pack, sizeof pack, "%s/review", dir);
    snprintf(design, sizeof design, "%s/d.xml", dir);
    write_design();
    run_result r =
        run((const char *[]){"analyze", "--pack", pack, "--catalog", CATALOG, design, NULL});
    /* the demo fails its minimum drive: the pack says so in its status */
    CU_ASSERT_EQUAL(r.status, 1);
    CU_ASSERT_TRUE(has(r.out, "pack: "));
    CU_ASSERT_TRUE(has(r.out, "  corners  verdict at the worst corners: FAIL"));
    done(&r);
    /* the index: XHTML, every verb's page linked and there */
    size_t len = 0;
    char *index = slurp_in("index.html", &len);
    CU_ASSERT_PTR_NOT_NULL_FATAL(index);
    xmlDocPtr doc = xmlReadMemory(index, (int)len, "index.html", NULL, XML_PARSE_NONET);
    CU_ASSERT_PTR_NOT_NULL(doc);
    xmlFreeDoc(doc);
    static const char *const verbs[] = {"check",  "analyze", "corners", "yield",
                                        "window", "map",     "supply",  "pick"};
    for (int i = 0; i < 8; i++) {
        char link[64], path[256];
        snprintf(link, sizeof link, "<a href=\"%s.html\">", verbs[i]);
        CU_ASSERT_TRUE(has(index, link));
        snprintf(path, sizeof path, "%s/%s.html", pack, verbs[i]);
        CU_ASSERT_TRUE(exists(path));
        snprintf(link, sizeof link, "bootrung %s design.xml", verbs[i]);
        CU_ASSERT_TRUE(has(index, link));
    }
    CU_ASSERT_TRUE(has(index, "<a href=\"analyze.xml\">"));
    CU_ASSERT_TRUE(has(index, "<a href=\"analyze.csv\">"));
    /* the design byte for byte, its checksum, the version */
    char want[65], got[65], copy[256];
    sha_of_file(design, want);
    snprintf(copy, sizeof copy, "%s/design.xml", pack);
    sha_of_file(copy, got);
    CU_ASSERT_STRING_EQUAL(got, want);
    CU_ASSERT_TRUE(has(index, want));
    CU_ASSERT_TRUE(has(index, "Tool: bootrung " BR_TEST_VERSION "."));
    /* what the model assumes, where the values come from */
    CU_ASSERT_TRUE(has(index, "assumptions</h2>"));
    CU_ASSERT_TRUE(has(index, "Edge overshoot: a fixed fraction"));
    CU_ASSERT_TRUE(has(index, "invented for the demo, rev 2"));
    /* and the design file's own notes, its comments */
    CU_ASSERT_TRUE(has(index, "- demo-3level.xml - a small invented design to try bootrung on."));
    CU_ASSERT_TRUE(has(index, "lethal voltages"));
    free(index);
    CU_ASSERT_TRUE(sums_hold() >= 20);
    /* a reviewer runs the commands again in the folder: the same bytes */
    char *sums = slurp_in("SHA256SUMS", NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(sums);
    CU_ASSERT_EQUAL_FATAL(chdir(pack), 0);
    FILE *f = fopen("again.txt", "w"); /* the report goes there, as commands.sh sends it */
    CU_ASSERT_PTR_NOT_NULL_FATAL(f);
    fclose(f);
    run_result a =
        run_to("again.txt", (const char *[]){"analyze", "design.xml", "--report", "again.html",
                                             "--xml", "again.xml", "--csv", "again.csv", NULL});
    CU_ASSERT_EQUAL(a.status, 1);
    done(&a);
    static const char *const pairs[][2] = {{"again.html", "analyze.html"},
                                           {"again.xml", "analyze.xml"},
                                           {"again.csv", "analyze.csv"},
                                           {"again.txt", "analyze.txt"}};
    for (int i = 0; i < 4; i++) {
        char line[128];
        sha_of_file(pairs[i][0], got);
        snprintf(line, sizeof line, "%s  %s\n", got, pairs[i][1]);
        CU_ASSERT_TRUE(has(sums, line));
        unlink(pairs[i][0]);
    }
    free(sums);
    CU_ASSERT_EQUAL_FATAL(chdir(BR_SOURCE_DIR), 0);
    /* DIR exists now: refused, nothing changed */
    r = run((const char *[]){"analyze", "--pack", pack, design, NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_TRUE(has(r.err, "expected a new folder"));
    done(&r);
    char cmd[256];
    snprintf(cmd, sizeof cmd, "rm -rf '%s'", dir);
    CU_ASSERT_EQUAL(system(cmd), 0);
}

/* Bad input, or --pack with files of its own: status 2, no folder and
 * no temporary one left beside it. */
static void test_pack_refused(void)
{
    char d[] = "/tmp/br-pack-XXXXXX", p[96];
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(d));
    snprintf(p, sizeof p, "%s/review", d);
    run_result r =
        run((const char *[]){"analyze", "--pack", p, "tests/bad/uvlo-inverted.xml", NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_TRUE(has(r.err, "uvlo-inverted.xml:"));
    done(&r);
    r = run((const char *[]){"analyze", "--pack", p, "--xml", "x.xml", DEMO, NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    done(&r);
    r = run((const char *[]){"analyze", "--catalog", CATALOG, DEMO, NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    done(&r);
    CU_ASSERT_EQUAL(rmdir(d), 0); /* empty: nothing was left in it */
}

/* Ctrl-C while the verbs run (the 12-switch demo's take minutes): the
 * running verb is stopped, status 130, "bootrung: interrupted", and
 * neither the folder nor its temporary is left. */
static void test_pack_interrupted(void)
{
    char d[] = "/tmp/br-pack-XXXXXX", p[96];
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(d));
    snprintf(p, sizeof p, "%s/review", d);
    char *argv[] = {"bootrung", "analyze", "--pack", p, "examples/leg-7level.xml", NULL};
    posix_spawn_file_actions_t fa;
    posix_spawn_file_actions_init(&fa);
    posix_spawn_file_actions_addopen(&fa, 1, "/dev/null", O_WRONLY, 0);
    posix_spawn_file_actions_addopen(&fa, 2, "/dev/null", O_WRONLY, 0);
    pid_t pid;
    CU_ASSERT_EQUAL_FATAL(posix_spawn(&pid, BR_BINARY, &fa, NULL, argv, environ), 0);
    posix_spawn_file_actions_destroy(&fa);
    CU_ASSERT_TRUE(await_catching(pid, 30.0)); /* its run has begun */
    const struct timespec wait = {1, 500 * 1000 * 1000};
    nanosleep(&wait, NULL);
    kill(pid, SIGINT);
    int st = 0;
    CU_ASSERT_EQUAL(waitpid(pid, &st, 0), pid);
    CU_ASSERT_TRUE(WIFEXITED(st) && WEXITSTATUS(st) == 130);
    CU_ASSERT_EQUAL(rmdir(d), 0); /* empty: no pack, no temporary folder */
}

int main(void)
{
    static const br_test_case cases[] = {
        {"analyze --pack: a folder to review and reproduce from", test_pack},
        {"--pack refused: nothing left behind", test_pack_refused},
        {"--pack interrupted: nothing left behind", test_pack_interrupted},
        {NULL, NULL},
    };
    return br_test_main("cli_pack", cases);
}

/* test_cli_shard.c - sweeps split into shards (--shard K/N) and put back
 * together by `merge`: the report and every file byte for byte what the
 * run without shards writes; shards that do not fit together refused. */
#include "runbin.h"
#include "testkit.h"

#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#define DESIGN BR_SOURCE_DIR "/examples/demo-3level.xml"
#define LEG BR_SOURCE_DIR "/examples/leg-7level.xml"
#define SWITCHES BR_SOURCE_DIR "/examples/parts/switches.xml"
#define PARTS BR_SOURCE_DIR "/examples/parts/catalog.xml"

static char dir[] = "/tmp/br-shard-XXXXXX";

static const char *in_dir(char *buf, size_t cap, const char *name)
{
    snprintf(buf, cap, "%s/%s", dir, name);
    return buf;
}

/* The file at path, renamed to path.ref (the unsharded run's). */
static void keep_as_ref(const char *path)
{
    char ref[256];
    snprintf(ref, sizeof ref, "%s.ref", path);
    CU_ASSERT_EQUAL_FATAL(rename(path, ref), 0);
}

static void same_file(const char *path)
{
    char ref[256];
    snprintf(ref, sizeof ref, "%s.ref", path);
    size_t na, nb;
    char *a = br_test_slurp(ref, &na), *b = br_test_slurp(path, &nb);
    CU_ASSERT_PTR_NOT_NULL_FATAL(a);
    CU_ASSERT_PTR_NOT_NULL_FATAL(b);
    CU_ASSERT_EQUAL(na, nb);
    CU_ASSERT_TRUE(na == nb && memcmp(a, b, na) == 0);
    free(a);
    free(b);
}

/* args (up to 20, NULL-terminated) with "--shard K/N --shard-file FILE" added. */
static run_result run_shard(const char *const *args, int k, int n, const char *file)
{
    const char *argv[32];
    char spec[32];
    int i = 0;
    for (; args[i]; i++)
        argv[i] = args[i];
    snprintf(spec, sizeof spec, "%d/%d", k, n);
    argv[i++] = "--shard";
    argv[i++] = spec;
    argv[i++] = "--shard-file";
    argv[i++] = file;
    argv[i] = NULL;
    return run(argv);
}

/* Run args whole, then as n shards merged in reverse order: the same
 * status, stdout and files. */
static void check_identical(const char *const *args, int n, const char *const *files)
{
    run_result whole = run(args);
    CU_ASSERT_TRUE(whole.status == 0 || whole.status == 1);
    for (int f = 0; files[f]; f++)
        keep_as_ref(files[f]);
    char shard[8][128];
    const char *margs[10] = {"merge"};
    for (int k = 1; k <= n; k++) {
        char name[32];
        snprintf(name, sizeof name, "part-%d.shard", k);
        in_dir(shard[k - 1], sizeof shard[k - 1], name);
        run_result r = run_shard(args, k, n, shard[k - 1]);
        CU_ASSERT_EQUAL(r.status, 0);
        CU_ASSERT_STRING_EQUAL(r.out, ""); /* no report from a shard */
        for (int f = 0; files[f]; f++)
            CU_ASSERT_NOT_EQUAL(access(files[f], F_OK), 0); /* nor its files */
        done(&r);
        margs[1 + n - k] = shard[k - 1];
    }
    margs[n + 1] = NULL;
    run_result merged = run(margs);
    CU_ASSERT_EQUAL(merged.status, whole.status);
    CU_ASSERT_STRING_EQUAL(merged.out, whole.out);
    for (int f = 0; files[f]; f++)
        same_file(files[f]);
    done(&whole);
    done(&merged);
}

static void test_map(void)
{
    char csv[128], svg[128];
    in_dir(csv, sizeof csv, "map.csv");
    in_dir(svg, sizeof svg, "map.svg");
    const char *args[] = {"map", "--duty", "20%:80%:6", "--freq", "50k:500k:5", "--csv",
                          csv,   "--svg",  svg,         DESIGN,   NULL};
    const char *files[] = {csv, svg, NULL};
    check_identical(args, 3, files);
    /* more shards than rows: the last ones judge only the design column */
    const char *small[] = {"map",   "--duty", "30%:70%:3", "--freq", "100k:200k:2",
                           "--csv", csv,      DESIGN,      NULL};
    const char *one[] = {csv, NULL};
    check_identical(small, 4, one);
}

static void test_yield(void)
{
    char csv[128], xml[128];
    in_dir(csv, sizeof csv, "yield.csv");
    in_dir(xml, sizeof xml, "yield.xml");
    const char *args[] = {"yield", "--samples", "40",    "--seed", "7",    "--threads", "2",
                          "--csv", csv,         "--xml", xml,      DESIGN, NULL};
    const char *files[] = {csv, xml, NULL};
    check_identical(args, 3, files);
}

static void expect_refused(const char *const *margs, const char *what)
{
    run_result r = run(margs);
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_TRUE(has(r.err, what));
    CU_ASSERT_STRING_EQUAL(r.out, "");
    done(&r);
}

static void write_text(const char *path, const char *text, size_t n)
{
    FILE *f = fopen(path, "w");
    CU_ASSERT_PTR_NOT_NULL_FATAL(f);
    CU_ASSERT_EQUAL(fwrite(text, 1, n, f), n);
    fclose(f);
}

static void test_explore(void)
{
    char csv[128], svg[128], cat[128];
    in_dir(csv, sizeof csv, "explore.csv");
    in_dir(svg, sizeof svg, "explore.svg");
    const char *args[] = {"explore", LEG,        "--catalog", SWITCHES, "--vin",
                          "1.1k",    "--levels", "6:7",       "--fsw",  "60k,120k",
                          "--csv",   csv,        "--svg",     svg,      NULL};
    const char *files[] = {csv, svg, NULL};
    check_identical(args, 3, files);
    /* sized from the parts catalog, with a yield per feasible combination:
     * each shard sizes and samples its own combinations (--max-cost 21: the
     * 200 V and 400 V classes feasible, combinations 1 and 2, one a shard) */
    const char *sized[] = {"explore", LEG,    "--catalog", SWITCHES, "--parts",    PARTS,
                           "--vin",   "300V", "--levels",  "3:3",    "--fsw",      "60k",
                           "--yield", "3",    "--seed",    "5",      "--max-cost", "21",
                           "--csv",   csv,    "--threads", "2",      NULL};
    const char *one[] = {csv, NULL};
    check_identical(sized, 2, one);
    /* the catalog is an input too: changed after the shards ran, refused */
    in_dir(cat, sizeof cat, "switches.xml");
    size_t n;
    char *text = br_test_slurp(SWITCHES, &n);
    CU_ASSERT_PTR_NOT_NULL_FATAL(text);
    write_text(cat, text, n);
    const char *cargs[] = {"explore",  LEG,   "--catalog", cat,   "--vin", "1.1k",
                           "--levels", "6:6", "--fsw",     "60k", NULL};
    char s1[128], s2[128];
    in_dir(s1, sizeof s1, "e1.shard");
    in_dir(s2, sizeof s2, "e2.shard");
    run_result r = run_shard(cargs, 1, 2, s1);
    CU_ASSERT_EQUAL(r.status, 0);
    done(&r);
    r = run_shard(cargs, 2, 2, s2);
    CU_ASSERT_EQUAL(r.status, 0);
    done(&r);
    write_text(cat, text, n);
    FILE *f = fopen(cat, "a");
    CU_ASSERT_PTR_NOT_NULL_FATAL(f);
    fputs("<!-- changed -->\n", f);
    fclose(f);
    expect_refused((const char *[]){"merge", s1, s2, NULL}, "changed since the shards ran");
    free(text);
    /* and so is the parts catalog */
    char parts[128];
    in_dir(parts, sizeof parts, "parts.xml");
    text = br_test_slurp(PARTS, &n);
    CU_ASSERT_PTR_NOT_NULL_FATAL(text);
    write_text(parts, text, n);
    const char *pargs[] = {"explore", LEG,        "--catalog", SWITCHES, "--parts", parts, "--vin",
                           "300V",    "--levels", "3:3",       "--fsw",  "60k",     NULL};
    r = run_shard(pargs, 1, 2, s1);
    CU_ASSERT_EQUAL(r.status, 0);
    done(&r);
    r = run_shard(pargs, 2, 2, s2);
    CU_ASSERT_EQUAL(r.status, 0);
    done(&r);
    f = fopen(parts, "a");
    CU_ASSERT_PTR_NOT_NULL_FATAL(f);
    fputs("<!-- changed -->\n", f);
    fclose(f);
    expect_refused((const char *[]){"merge", s1, s2, NULL}, "changed since the shards ran");
    free(text);
}

/* Shards that do not make one whole run are refused, and nothing is written. */
static void test_refused(void)
{
    char design[128], csv[128], s1[128], s2[128], other[128], cut[128];
    in_dir(design, sizeof design, "copy.xml");
    in_dir(csv, sizeof csv, "refused.csv");
    in_dir(s1, sizeof s1, "r1.shard");
    in_dir(s2, sizeof s2, "r2.shard");
    in_dir(other, sizeof other, "other.shard");
    in_dir(cut, sizeof cut, "cut.shard");
    size_t n;
    char *text = br_test_slurp(DESIGN, &n);
    CU_ASSERT_PTR_NOT_NULL_FATAL(text);
    write_text(design, text, n);
    const char *args[] = {"yield", "--samples", "6", "--csv", csv, design, NULL};
    const char *args2[] = {"yield", "--samples", "6", "--seed", "2", "--csv", csv, design, NULL};
    run_result r = run_shard(args, 1, 2, s1);
    done(&r);
    r = run_shard(args, 2, 2, s2);
    done(&r);
    r = run_shard(args2, 2, 2, other);
    done(&r);
    expect_refused((const char *[]){"merge", s1, NULL}, "shard 2/2 is missing");
    expect_refused((const char *[]){"merge", s1, s1, NULL}, "given twice");
    expect_refused((const char *[]){"merge", s1, other, NULL}, "another run");
    char *part = br_test_slurp(s2, &n);
    CU_ASSERT_PTR_NOT_NULL_FATAL(part);
    write_text(cut, part, n - 6); /* without its "end" line */
    expect_refused((const char *[]){"merge", s1, cut, NULL}, "did not finish");
    write_text(design, text, n > 0 ? strlen(text) - 1 : 0); /* the design changed */
    expect_refused((const char *[]){"merge", s1, s2, NULL}, "changed since the shards ran");
    CU_ASSERT_NOT_EQUAL(access(csv, F_OK), 0);
    r = run((const char *[]){"yield", "--shard", "3/2", DESIGN, NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    done(&r);
    r = run((const char *[]){"map", "--duty", "0.5:0.5:1", "--freq", "1k:1k:1", "--shard", "0/2",
                             DESIGN, NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    done(&r);
    free(part);
    free(text);
}

static void test_help_golden(void)
{
    CU_ASSERT_TRUE(help_is_golden("merge"));
}

static void cleanup(void)
{
    char cmd[160];
    snprintf(cmd, sizeof cmd, "rm -rf '%s'", dir);
    if (system(cmd) != 0)
        fprintf(stderr, "could not remove %s\n", dir);
}

int main(void)
{
    if (!mkdtemp(dir))
        return 1;
    static const br_test_case cases[] = {
        {"map: merged shards are the whole run", test_map},
        {"yield: merged shards are the whole run", test_yield},
        {"explore: merged shards are the whole run; a changed catalog refused", test_explore},
        {"shards that do not fit are refused", test_refused},
        {"help (golden)", test_help_golden},
        {NULL, NULL},
    };
    int status = br_test_main("cli_shard", cases);
    cleanup();
    return status;
}

/* test_cli_words.c - one word for one thing (docs/glossary.md), and a
 * repository that stands on its own.  The glossary's tables are read
 * here: every criterion's title and key, every current direction and
 * limit the reports name are its terms, and none of the words it retires
 * appears in a help text, a report (text, HTML) or a result file. */
#include "analyses/figures.h"
#include "report/vocab.h"
#include "runbin.h"
#include "testkit.h"

#include <ctype.h>
#include <dirent.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

static char *glossary;

/* A row "| first | ..." of the glossary. */
static int has_row(const char *first, const char *second)
{
    char row[256];
    if (second)
        snprintf(row, sizeof row, "\n| %s | `%s` |", first, second);
    else
        snprintf(row, sizeof row, "\n| %s |", first);
    return has(glossary, row);
}

static void test_terms(void)
{
    for (int c = 0; c < BR_CRIT_COUNT; c++)
        CU_ASSERT_TRUE(has_row(br_crit_title(c), br_crit_name(c)));
    static const int dirs[] = {BR_DIRI_DOWN, BR_DIRI_UP, BR_DIRI_LINE};
    for (int i = 0; i < 3; i++)
        CU_ASSERT_TRUE(has_row(br_dir_label(dirs[i]), br_dir_label(dirs[i])));
    for (int lim = 0; lim < BR_LIM_COUNT; lim++)
        CU_ASSERT_TRUE(has_row(br_limit_name(lim), NULL));
    CU_ASSERT_TRUE(has_row("floor", NULL));
    CU_ASSERT_TRUE(has_row("displacement current", NULL));
}

/* phrase in text as a whole: neither end inside a word. */
static const char *find_whole(const char *text, const char *phrase)
{
    size_t n = strlen(phrase);
    for (const char *p = strstr(text, phrase); p; p = strstr(p + 1, phrase)) {
        int before = p > text && (isalnum((unsigned char)p[-1]) || p[-1] == '-');
        int after = isalnum((unsigned char)p[n]);
        if (!before && !after)
            return p;
    }
    return NULL;
}

/* A temperature or a charge written with a bare "C": a digit, a space, C
 * and no letter after. */
static const char *bare_celsius(const char *text)
{
    for (const char *p = strstr(text, " C"); p; p = strstr(p + 1, " C"))
        if (p > text && isdigit((unsigned char)p[-1]) && !isalnum((unsigned char)p[2]))
            return p;
    return NULL;
}

static int nretired;
static char retired[64][64];

/* The first column of the "Words not used" table. */
static void read_retired(void)
{
    const char *at = strstr(glossary, "## Words not used");
    CU_ASSERT_PTR_NOT_NULL_FATAL(at);
    nretired = 0;
    for (const char *l = strstr(at, "\n| `"); l && nretired < 64; l = strstr(l + 1, "\n| `")) {
        const char *end = strchr(l + 4, '`');
        CU_ASSERT_PTR_NOT_NULL_FATAL(end);
        snprintf(retired[nretired++], sizeof retired[0], "%.*s", (int)(end - l - 4), l + 4);
    }
    CU_ASSERT_TRUE(nretired >= 10);
}

static void check_words(const char *what, const char *text)
{
    CU_ASSERT_PTR_NOT_NULL_FATAL(text);
    for (int i = 0; i < nretired; i++) {
        const char *p = find_whole(text, retired[i]);
        if (p)
            fprintf(stderr, "%s: retired word '%s' in \"%.60s\"\n", what, retired[i],
                    p > text + 20 ? p - 20 : text);
        CU_ASSERT_PTR_NULL(p);
    }
    const char *c = bare_celsius(text);
    if (c)
        fprintf(stderr, "%s: a bare C in \"%.40s\"\n", what, c > text + 20 ? c - 20 : text);
    CU_ASSERT_PTR_NULL(c);
}

static void check_run(const char *const *args)
{
    run_result r = run(args);
    CU_ASSERT_TRUE(r.status <= 1);
    char what[96];
    snprintf(what, sizeof what, "%s %s", args[0], args[1] ? args[1] : "");
    check_words(what, r.out);
    done(&r);
}

static void check_file(const char *path)
{
    char *t = br_test_slurp(path, NULL);
    check_words(path, t);
    free(t);
    remove(path);
}

/* The help texts, the reports and the result files of the verbs. */
static void test_words(void)
{
    read_retired();
    check_run((const char *[]){"--help", NULL});
    static const char *const verbs[] = {"check", "startup", "steady", "analyze", "window",
                                        "map",   "corners", "yield",  "pick",    "supply"};
    for (int i = 0; i < 10; i++)
        check_run((const char *[]){verbs[i], "--help", NULL});
    char dir[] = "/tmp/br-words-XXXXXX", html[64], xml[64];
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(dir));
    snprintf(html, sizeof html, "%s/r.html", dir);
    snprintf(xml, sizeof xml, "%s/r.xml", dir);
    /* both directions, regulated rails */
    check_run((const char *[]){"analyze", "examples/leg-7level.xml", "--report", html, "--xml", xml,
                               NULL});
    check_file(html);
    check_file(xml);
    check_run((const char *[]){"corners", "examples/demo-3level.xml", "--xml", xml, NULL});
    check_file(xml);
    check_run((const char *[]){"check", "examples/inverter-7level.xml", NULL});
    check_run((const char *[]){"yield", "examples/demo-3level.xml", "--samples", "8", NULL});
    remove(dir);
}

/* "analyse" is the verb analyze. */
static void test_analyse(void)
{
    run_result a = run((const char *[]){"analyze", "--help", NULL});
    run_result b = run((const char *[]){"analyse", "--help", NULL});
    run_result c = run((const char *[]){"help", "analyse", NULL});
    CU_ASSERT_EQUAL(b.status, 0);
    CU_ASSERT_STRING_EQUAL(a.out, b.out);
    CU_ASSERT_STRING_EQUAL(a.out, c.out);
    done(&a);
    done(&b);
    done(&c);
}

/* The README opens with the job (who, for what), the two commands right
 * after it. */
static void test_readme(void)
{
    char *t = br_test_slurp("README.md", NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(t);
    CU_ASSERT_TRUE(strncmp(t, "# bootrung\n\n", 12) == 0);
    const char *first = t + 12, *end = strstr(first, "\n\n");
    CU_ASSERT_PTR_NOT_NULL_FATAL(end);
    char para[1024];
    snprintf(para, sizeof para, "%.*s", (int)(end - first), first);
    CU_ASSERT_TRUE(has(para, "power-electronics engineers"));
    CU_ASSERT_TRUE(has(para, "gate drivers"));
    CU_ASSERT_TRUE(has(para, "design file"));
    CU_ASSERT_TRUE(strncmp(end, "\n\n## Two commands\n\n```sh\nexamples/run.sh", 39) == 0);
    CU_ASSERT_TRUE(has(end, "\ntests/run.sh "));
    free(t);
}

/* A clone is complete: no committed text points outside the repository
 * (a workplace folder beside it, a machine's own paths). */
static int outside(const char *path, const char *self)
{
    if (strstr(path, self))
        return 0;
    char *t = br_test_slurp(path, NULL);
    if (!t)
        return 0;
    char up[16], machine[16];
    snprintf(up, sizeof up, "../%s/", "shared");
    snprintf(machine, sizeof machine, "/%s/", "work");
    int bad = strstr(t, up) != NULL || strstr(t, machine) != NULL;
    if (bad)
        fprintf(stderr, "%s points outside the repository\n", path);
    free(t);
    return bad;
}

static int scan(const char *dir, const char *self)
{
    DIR *d = opendir(dir);
    int bad = 0;
    char path[512];
    struct stat sb;
    for (struct dirent *e; d && (e = readdir(d)) != NULL;) {
        if (e->d_name[0] == '.' || strncmp(e->d_name, "build", 5) == 0)
            continue;
        snprintf(path, sizeof path, "%s/%s", dir, e->d_name);
        if (stat(path, &sb) != 0)
            continue;
        bad += S_ISDIR(sb.st_mode) ? scan(path, self) : outside(path, self);
    }
    if (d)
        closedir(d);
    return bad;
}

static void test_self_contained(void)
{
    static const char *const top[] = {"src", "tests", "docs", "examples", "cmake", "include"};
    int bad = outside("README.md", "-") + outside("DEVELOPERS.md", "-");
    for (int i = 0; i < 6; i++)
        bad += scan(top[i], "test_cli_words.c");
    CU_ASSERT_EQUAL(bad, 0);
}

int main(void)
{
    glossary = br_test_slurp("docs/glossary.md", NULL);
    if (!glossary)
        glossary = strdup("");
    static const br_test_case cases[] = {
        {"the reports' terms are the glossary's", test_terms},
        {"no retired word in help, reports, results", test_words},
        {"analyse is analyze", test_analyse},
        {"README: the job, then the two commands", test_readme},
        {"nothing points outside the repository", test_self_contained},
        {NULL, NULL},
    };
    int rc = br_test_main("cli_words", cases);
    free(glossary);
    return rc;
}

/* test_cli_output.c - the all-or-nothing file writer behind --xml/--csv:
 * the target holds either its old contents or the whole new text, and no
 * temporary file survives a failure. */
#include "report/save.h"
#include "testkit.h"

#include <dirent.h>
#include <errno.h>
#include <signal.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/resource.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

/* A fresh scratch directory per case. */
static char dir[256];

static void make_dir(void)
{
    snprintf(dir, sizeof dir, "/tmp/br-save-XXXXXX");
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(dir));
}

static void path_in(char *buf, size_t cap, const char *name)
{
    snprintf(buf, cap, "%s/%s", dir, name);
}

static int entries(void)
{
    DIR *dd = opendir(dir);
    int n = 0;
    if (!dd)
        return -1;
    for (struct dirent *e; (e = readdir(dd));)
        n += strcmp(e->d_name, ".") != 0 && strcmp(e->d_name, "..") != 0;
    closedir(dd);
    return n;
}

static void write_plain(const char *path, const char *s)
{
    FILE *f = fopen(path, "w");
    CU_ASSERT_PTR_NOT_NULL_FATAL(f);
    fputs(s, f);
    fclose(f);
}

static void remove_dir(void)
{
    DIR *dd = opendir(dir);
    char p[512];
    for (struct dirent *e; dd && (e = readdir(dd));) {
        if (strcmp(e->d_name, ".") == 0 || strcmp(e->d_name, "..") == 0)
            continue;
        path_in(p, sizeof p, e->d_name);
        if (remove(p) != 0)
            rmdir(p);
    }
    if (dd)
        closedir(dd);
    rmdir(dir);
}

static br_text *text_of(const char *s, int repeat)
{
    br_text *t = br_text_create();
    CU_ASSERT_PTR_NOT_NULL_FATAL(t);
    for (int i = 0; i < repeat; i++)
        br_text_put(t, s);
    return t;
}

static void test_new_file(void)
{
    char p[512];
    br_error err;
    make_dir();
    path_in(p, sizeof p, "out.csv");
    br_text *t = text_of("t,v\n0,1\n", 1);
    CU_ASSERT_EQUAL(br_text_save(t, p, &err), BR_OK);
    char *got = br_test_slurp(p, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(got);
    CU_ASSERT_STRING_EQUAL(got, "t,v\n0,1\n");
    CU_ASSERT_EQUAL(entries(), 1); /* no temporary left beside it */
    free(got);
    br_text_free(t);
    remove_dir();
}

/* A shorter text replaces a longer file completely (no stale tail). */
static void test_replace(void)
{
    char p[512];
    br_error err;
    make_dir();
    path_in(p, sizeof p, "out.xml");
    write_plain(p, "a much longer previous content that must disappear\n");
    br_text *t = text_of("new\n", 1);
    CU_ASSERT_EQUAL(br_text_save(t, p, &err), BR_OK);
    char *got = br_test_slurp(p, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(got);
    CU_ASSERT_STRING_EQUAL(got, "new\n");
    CU_ASSERT_EQUAL(entries(), 1);
    free(got);
    br_text_free(t);
    remove_dir();
}

static void test_missing_dir(void)
{
    char p[512];
    br_error err;
    br_error_clear(&err);
    make_dir();
    path_in(p, sizeof p, "no/such/dir/out.csv");
    br_text *t = text_of("x\n", 1);
    CU_ASSERT_EQUAL(br_text_save(t, p, &err), BR_EIO);
    CU_ASSERT_STRING_EQUAL(err.file, p);
    CU_ASSERT_PTR_NOT_NULL(strstr(err.msg, "No such file"));
    CU_ASSERT_EQUAL(entries(), 0);
    br_text_free(t);
    remove_dir();
}

/* The target is a directory: rename() refuses, the temporary goes. */
static void test_target_is_dir(void)
{
    char p[512];
    br_error err;
    make_dir();
    path_in(p, sizeof p, "sub");
    CU_ASSERT_EQUAL_FATAL(mkdir(p, 0755), 0);
    br_text *t = text_of("x\n", 1);
    CU_ASSERT_EQUAL(br_text_save(t, p, &err), BR_EIO);
    struct stat sb;
    CU_ASSERT_EQUAL(stat(p, &sb), 0);
    CU_ASSERT_TRUE(S_ISDIR(sb.st_mode));
    CU_ASSERT_EQUAL(entries(), 1);
    br_text_free(t);
    remove_dir();
}

/* A write that fails half-way (file-size limit of 1 kB against 64 kB of
 * text, run in a child so the limit does not touch this process): the old
 * file stays whole and no temporary remains. */
static void test_failed_write(void)
{
    char p[512];
    make_dir();
    path_in(p, sizeof p, "out.csv");
    write_plain(p, "old\n");
    br_text *t = text_of("0123456789abcdef0123456789abcdef0123456789abcdef0123456789abcde\n", 1024);
    pid_t pid = fork();
    CU_ASSERT_TRUE_FATAL(pid >= 0);
    if (pid == 0) {
        struct rlimit rl = {1024, 1024};
        br_error err;
        signal(SIGXFSZ, SIG_IGN); /* get EFBIG instead of being killed */
        setrlimit(RLIMIT_FSIZE, &rl);
        _exit(br_text_save(t, p, &err) == BR_EIO && strstr(err.msg, "large") ? 0 : 1);
    }
    int status = 0;
    CU_ASSERT_EQUAL(waitpid(pid, &status, 0), pid);
    CU_ASSERT_TRUE(WIFEXITED(status) && WEXITSTATUS(status) == 0);
    char *got = br_test_slurp(p, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(got);
    CU_ASSERT_STRING_EQUAL(got, "old\n");
    CU_ASSERT_EQUAL(entries(), 1);
    free(got);
    br_text_free(t);
    remove_dir();
}

int main(void)
{
    static const br_test_case cases[] = {
        {"writes a new file whole", test_new_file},
        {"replaces an existing file whole", test_replace},
        {"missing directory: error, nothing created", test_missing_dir},
        {"target is a directory: error, no temporary left", test_target_is_dir},
        {"write fails half-way: old file intact", test_failed_write},
        {NULL, NULL},
    };
    return br_test_main("cli_output", cases);
}

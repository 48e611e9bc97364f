/* output.c - where results and diagnostics go.
 *
 * Results to stdout, diagnostics to stderr, each diagnostic on one line so
 * that scripts and editors can jump to FILE:LINE.  A failed write to
 * stdout (full disk, closed pipe) is an error, not a silent truncation. */
#include "cli.h"

#include "bootrung/report.h"

#include <errno.h>
#include <pthread.h>
#include <signal.h>
#include <stdarg.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

/* Messages from libraries can carry newlines; keep the diagnostic on one
 * line. */
static void one_line(char *s)
{
    for (char *p = s; *p; p++)
        if (*p == '\n' || *p == '\r' || *p == '\t')
            *p = ' ';
    size_t n = strlen(s);
    while (n > 0 && s[n - 1] == ' ')
        s[--n] = '\0';
}

int br_cli_fail(const br_error *err, const char *path)
{
    br_error e = *err;
    char buf[2048];
    if (!e.file[0] && path)
        snprintf(e.file, sizeof e.file, "%s", path);
    if (!e.msg[0])
        snprintf(e.msg, sizeof e.msg, "%s", br_status_name(e.code));
    /* a solver that could not finish decides nothing: undetermined, never
     * the status of bad input */
    int numeric = e.code == BR_ENUMERIC;
    if (numeric && !e.field[0])
        snprintf(e.field, sizeof e.field, "undetermined");
    br_error_format(&e, buf, sizeof buf);
    one_line(buf);
    fprintf(stderr, "bootrung: %s\n", buf);
    return numeric ? BR_EXIT_UNDETERMINED : BR_EXIT_INPUT;
}

int br_cli_usage_error(const char *verb, const char *fmt, ...)
{
    char buf[1024];
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(buf, sizeof buf, fmt, ap);
    va_end(ap);
    one_line(buf);
    if (verb)
        fprintf(stderr, "bootrung: %s: %s (see 'bootrung %s --help')\n", verb, buf, verb);
    else
        fprintf(stderr, "bootrung: %s (see 'bootrung --help')\n", buf);
    return BR_EXIT_INPUT;
}

static int stdout_failed(int e)
{
    fprintf(stderr, "bootrung: cannot write to standard output: %s\n",
            e ? strerror(e) : "write error");
    return BR_EXIT_INPUT;
}

int br_cli_emit(const br_text *t)
{
    errno = 0;
    size_t n = br_text_len(t);
    if (fwrite(br_text_data(t), 1, n, stdout) != n || fflush(stdout) != 0)
        return stdout_failed(errno);
    return BR_EXIT_OK;
}

/* A signal that would end the program waits while files are written, so
 * that no temporary file is left behind and no file is half replaced. */
static int hold_signals(sigset_t *old)
{
    sigset_t hold;
    sigemptyset(&hold);
    sigaddset(&hold, SIGINT);
    sigaddset(&hold, SIGTERM);
    sigaddset(&hold, SIGHUP);
    return pthread_sigmask(SIG_BLOCK, &hold, old) == 0;
}

int br_cli_save(const br_text *t, const char *path)
{
    if (strcmp(path, "-") == 0)
        return br_cli_emit(t);
    br_error err;
    br_error_clear(&err);
    sigset_t old;
    int held = hold_signals(&old);
    int rc = br_text_save(t, path, &err);
    if (held)
        pthread_sigmask(SIG_SETMASK, &old, NULL);
    if (rc != BR_OK)
        return br_cli_fail(&err, path);
    return BR_EXIT_OK;
}

int br_cli_finish(int status)
{
    errno = 0;
    int bad = fflush(stdout) != 0 || ferror(stdout);
    if (bad && status != BR_EXIT_INPUT) /* not yet reported */
        return stdout_failed(errno);
    return bad ? BR_EXIT_INPUT : status;
}

/* Stdout's part: a file sent there, or the report (its verdict line
 * with quiet). */
static int write_stdout(const br_cli_file *files, int nfiles, const br_text *report, int quiet,
                        const char *const *prefixes, int join)
{
    for (int i = 0; i < nfiles; i++)
        if (files[i].path && strcmp(files[i].path, "-") == 0)
            return br_cli_emit(files[i].text);
    return quiet ? br_cli_emit_verdict(report, prefixes, join) : br_cli_emit(report);
}

/* Every file is written to its temporary first; stdout gets its part once
 * all of them are ready; then they are renamed into place.  A failure on
 * the way leaves none of them: temporaries are dropped, and a file
 * already renamed when a later rename fails is removed again. */
static int write_files(const br_cli_file *files, int nfiles, br_staged *st, const br_text *report,
                       int quiet, const char *const *prefixes, int join)
{
    br_error err;
    br_error_clear(&err);
    int ns = 0, status = BR_EXIT_OK, i;
    for (i = 0; i < nfiles && status == BR_EXIT_OK; i++)
        if (files[i].path && strcmp(files[i].path, "-") != 0) {
            if (br_text_stage(files[i].text, files[i].path, &st[ns], &err) != BR_OK)
                status = br_cli_fail(&err, files[i].path);
            else
                ns++;
        }
    if (status == BR_EXIT_OK)
        status = write_stdout(files, nfiles, report, quiet, prefixes, join);
    for (i = 0; i < ns && status == BR_EXIT_OK; i++)
        if (br_staged_commit(&st[i], &err) != BR_OK) {
            status = br_cli_fail(&err, st[i].path);
            for (int j = 0; j < i; j++)
                if (!st[j].special)
                    unlink(st[j].path);
        }
    for (; i < ns; i++)
        br_staged_discard(&st[i]);
    return status;
}

int br_cli_write(const br_cli_file *files, int nfiles, const br_text *report, int quiet,
                 const char *const *prefixes, int join)
{
    br_staged *st = calloc(nfiles > 0 ? (size_t)nfiles : 1, sizeof *st);
    if (!st) {
        fprintf(stderr, "bootrung: out of memory\n");
        return BR_EXIT_INPUT;
    }
    sigset_t old;
    int held = hold_signals(&old);
    int status = write_files(files, nfiles, st, report, quiet, prefixes, join);
    if (held)
        pthread_sigmask(SIG_SETMASK, &old, NULL);
    free(st);
    return status;
}

/* 1 when a and b name the same existing file (through links as well). */
static int same_file(const char *a, const char *b)
{
    struct stat sa, sb;
    if (strcmp(a, b) == 0)
        return 1;
    return stat(a, &sa) == 0 && stat(b, &sb) == 0 && sa.st_dev == sb.st_dev &&
           sa.st_ino == sb.st_ino && S_ISREG(sa.st_mode);
}

int br_cli_outputs(const char *verb, const char *const *names, const char *const *paths, int n,
                   const char *const *inputs, int ninputs)
{
    int k = 0;
    for (int i = 0; i < n; i++) {
        if (!paths[i] || strcmp(paths[i], "-") == 0) {
            k += paths[i] != NULL;
            continue;
        }
        for (int j = 0; j < ninputs; j++)
            if (inputs[j] && same_file(paths[i], inputs[j]))
                return br_cli_usage_error(verb,
                                          "--%s '%s' is the input file '%s'; expected a path "
                                          "for the results that does not overwrite an input",
                                          names[i], paths[i], inputs[j]);
        for (int j = 0; j < i; j++)
            if (paths[j] && strcmp(paths[j], "-") != 0 && same_file(paths[i], paths[j]))
                return br_cli_usage_error(verb,
                                          "--%s and --%s both write '%s'; expected a file of "
                                          "its own for each",
                                          names[j], names[i], paths[i]);
    }
    if (k > 1)
        return br_cli_usage_error(verb, "only one output file can go to standard output");
    return BR_EXIT_OK;
}

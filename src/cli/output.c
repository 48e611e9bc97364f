/* output.c - where results and diagnostics go.
 *
 * Results to stdout, diagnostics to stderr, each diagnostic on one line so
 * that scripts and editors can jump to FILE:LINE.  A failed write to
 * stdout (full disk, closed pipe) is an error, not a silent truncation. */
#include "cli.h"

#include "report/save.h"

#include <errno.h>
#include <pthread.h>
#include <signal.h>
#include <stdarg.h>
#include <string.h>

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

int br_cli_save(const br_text *t, const char *path)
{
    if (strcmp(path, "-") == 0)
        return br_cli_emit(t);
    br_error err;
    br_error_clear(&err);
    /* a signal that would end the program waits until the temporary file
     * is renamed or removed, so none is ever left behind */
    sigset_t hold, old;
    sigemptyset(&hold);
    sigaddset(&hold, SIGINT);
    sigaddset(&hold, SIGTERM);
    sigaddset(&hold, SIGHUP);
    int held = pthread_sigmask(SIG_BLOCK, &hold, &old) == 0;
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

int br_cli_write(const br_cli_file *files, int nfiles, const br_text *report, int quiet,
                 const char *const *prefixes, int join)
{
    int to_stdout = 0;
    for (int i = 0; i < nfiles; i++) {
        if (!files[i].path)
            continue;
        int status = br_cli_save(files[i].text, files[i].path);
        if (status != BR_EXIT_OK)
            return status;
        to_stdout |= strcmp(files[i].path, "-") == 0;
    }
    if (to_stdout)
        return BR_EXIT_OK;
    return quiet ? br_cli_emit_verdict(report, prefixes, join) : br_cli_emit(report);
}

int br_cli_one_stdout(const char *verb, const char *const *paths, int n)
{
    int k = 0;
    for (int i = 0; i < n; i++)
        k += paths[i] && strcmp(paths[i], "-") == 0;
    if (k > 1)
        return br_cli_usage_error(verb, "only one output file can go to standard output");
    return BR_EXIT_OK;
}

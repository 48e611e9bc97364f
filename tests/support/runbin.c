/* runbin.c - running the built bootrung binary from a test. */
#define _DEFAULT_SOURCE /* wait4 */
#include "runbin.h"

#include "testkit.h"

#include <errno.h>
#include <fcntl.h>
#include <signal.h>
#include <spawn.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/resource.h>
#include <sys/wait.h>
#include <time.h>
#include <unistd.h>

extern char **environ;

static char *slurp_and_remove(const char *path)
{
    char *s = br_test_slurp(path, NULL);
    unlink(path);
    return s ? s : calloc(1, 1);
}

/* Wait for pid; with a limit (s > 0) kill it once that much wall time
 * has passed.  Returns the wait status, sets *killed. */
static int wait_limited(pid_t pid, double limit, int *killed)
{
    int ws = 0;
    *killed = 0;
    if (limit <= 0)
        return waitpid(pid, &ws, 0) == pid ? ws : -1;
    struct timespec t0, now, nap = {0, 10 * 1000 * 1000};
    clock_gettime(CLOCK_MONOTONIC, &t0);
    for (;;) {
        pid_t got = waitpid(pid, &ws, WNOHANG);
        if (got == pid)
            return ws;
        if (got < 0)
            return -1;
        clock_gettime(CLOCK_MONOTONIC, &now);
        if (!*killed &&
            (double)(now.tv_sec - t0.tv_sec) + 1e-9 * (double)(now.tv_nsec - t0.tv_nsec) > limit) {
            kill(pid, SIGKILL);
            *killed = 1;
        }
        nanosleep(&nap, NULL);
    }
}

static run_result run_spawn(const char *stdout_path, double limit, const char *const *args)
{
    char *argv[32] = {BR_BINARY};
    int n = 1;
    for (; args[n - 1] && n < 31; n++)
        argv[n] = (char *)args[n - 1];
    argv[n] = NULL;
    char po[] = "/tmp/br-run-out-XXXXXX", pe[] = "/tmp/br-run-err-XXXXXX";
    int fo = mkstemp(po), fe = mkstemp(pe);
    CU_ASSERT_TRUE_FATAL(fo >= 0 && fe >= 0);
    posix_spawn_file_actions_t fa;
    posix_spawn_file_actions_init(&fa);
    posix_spawn_file_actions_addopen(&fa, 0, "/dev/null", O_RDONLY, 0);
    if (stdout_path)
        posix_spawn_file_actions_addopen(&fa, 1, stdout_path, O_WRONLY, 0);
    else
        posix_spawn_file_actions_adddup2(&fa, fo, 1);
    posix_spawn_file_actions_adddup2(&fa, fe, 2);
    pid_t pid;
    run_result r = {-1, NULL, NULL, 0};
    int rc = posix_spawn(&pid, BR_BINARY, &fa, NULL, argv, environ);
    posix_spawn_file_actions_destroy(&fa);
    CU_ASSERT_EQUAL_FATAL(rc, 0);
    int ws = wait_limited(pid, limit, &r.timed_out);
    if (ws != -1 && WIFEXITED(ws))
        r.status = WEXITSTATUS(ws);
    close(fo);
    close(fe);
    r.out = slurp_and_remove(po);
    r.err = slurp_and_remove(pe);
    return r;
}

run_result run_to(const char *stdout_path, const char *const *args)
{
    return run_spawn(stdout_path, 0.0, args);
}

run_result run(const char *const *args)
{
    return run_to(NULL, args);
}

run_result run_limited(double seconds, const char *const *args)
{
    return run_spawn(NULL, seconds, args);
}

void done(run_result *r)
{
    free(r->out);
    free(r->err);
}

int has(const char *haystack, const char *needle)
{
    int ok = strstr(haystack, needle) != NULL;
    if (!ok)
        fprintf(stderr, "missing from the output: [%s]\n", needle);
    return ok;
}

int same_as_golden(const char *golden, const char *got)
{
    char *want = br_test_slurp(golden, NULL);
    if (!want) {
        fprintf(stderr, "%s is missing: run tests/golden/update.sh\n", golden);
        return 0;
    }
    int ok = strcmp(want, got) == 0, line = 1;
    for (const char *a = want, *b = got; !ok && *a && *a == *b; a++, b++)
        line += *a == '\n';
    if (!ok)
        fprintf(stderr, "%s:%d: output differs (see tests/golden/update.sh)\n", golden, line);
    free(want);
    return ok;
}

int help_is_golden(const char *verb)
{
    char golden[96];
    snprintf(golden, sizeof golden, "tests/golden/%s-help.txt", verb);
    run_result a = run((const char *[]){verb, "--help", NULL});
    run_result b = run((const char *[]){"help", verb, NULL});
    int ok = a.status == 0 && b.status == 0 && same_as_golden(golden, a.out);
    if (ok && strcmp(a.out, b.out) != 0) {
        fprintf(stderr, "'help %s' differs from '%s --help'\n", verb, verb);
        ok = 0;
    }
    done(&a);
    done(&b);
    return ok;
}

int catching(pid_t pid)
{
    char path[64], line[256];
    snprintf(path, sizeof path, "/proc/%d/status", (int)pid);
    FILE *f = fopen(path, "r");
    unsigned long long mask = 0;
    while (f && fgets(line, sizeof line, f))
        if (sscanf(line, "SigCgt: %llx", &mask) == 1)
            break;
    if (f)
        fclose(f);
    unsigned long long want = (1ULL << (SIGINT - 1)) | (1ULL << (SIGTERM - 1));
    return (mask & want) == want;
}

int await_catching(pid_t pid, double seconds)
{
    const struct timespec tick = {0, 2 * 1000 * 1000};
    for (double waited = 0.0; waited < seconds; waited += 2e-3) {
        if (catching(pid))
            return 1;
        siginfo_t si = {0};
        if (waitid(P_PID, (id_t)pid, &si, WEXITED | WNOHANG | WNOWAIT) == 0 && si.si_pid == pid)
            return 0; /* it ended */
        nanosleep(&tick, NULL);
    }
    return 0;
}

double proc_cpu(pid_t pid)
{
    char path[64], buf[1024];
    snprintf(path, sizeof path, "/proc/%d/stat", (int)pid);
    FILE *f = fopen(path, "r");
    size_t n = f ? fread(buf, 1, sizeof buf - 1, f) : 0;
    if (f)
        fclose(f);
    buf[n] = '\0';
    const char *p = strrchr(buf, ')'); /* the name may hold spaces */
    unsigned long long ut = 0, st = 0;
    /* after the name: state, then fields 4 to 13, then utime and stime */
    if (!p ||
        sscanf(p + 1, " %*c %*d %*d %*d %*d %*d %*u %*u %*u %*u %*u %llu %llu", &ut, &st) != 2)
        return -1.0;
    return (double)(ut + st) / (double)sysconf(_SC_CLK_TCK);
}

pid_t reap_cpu(pid_t pid, int options, int *status, double *cpu)
{
    int ws = 0;
    struct rusage ru = {0};
    pid_t got;
    while ((got = wait4(pid, &ws, options, &ru)) < 0 && errno == EINTR)
        ;
    if (got == pid) {
        *status = WIFEXITED(ws) ? WEXITSTATUS(ws) : -1;
        *cpu = (double)ru.ru_utime.tv_sec + 1e-6 * (double)ru.ru_utime.tv_usec +
               (double)ru.ru_stime.tv_sec + 1e-6 * (double)ru.ru_stime.tv_usec;
    }
    return got;
}

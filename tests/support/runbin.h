/* runbin.h - running the built bootrung binary from a test (the macro
 * BR_BINARY names it) and reading what it printed. */
#ifndef BR_RUNBIN_H
#define BR_RUNBIN_H

#include <sys/types.h>

/* What one run of the binary produced. */
typedef struct run_result {
    int status;    /* exit status, or -1 when it did not exit normally */
    char *out;     /* stdout, NUL-terminated */
    char *err;     /* stderr, NUL-terminated */
    int timed_out; /* run_limited killed it */
} run_result;

/* Run bootrung with args (NULL-terminated, without argv[0]); stdin is
 * /dev/null; stdout goes to stdout_path when given (e.g. /dev/full), else
 * it is captured.  At most 30 arguments. */
run_result run_to(const char *stdout_path, const char *const *args);
run_result run(const char *const *args);
/* Like run, but killed after `seconds` of wall time (status -1, timed_out). */
run_result run_limited(double seconds, const char *const *args);
void done(run_result *r);

/* 1 when needle is in haystack; says on stderr what is missing when not. */
int has(const char *haystack, const char *needle);

/* 1 when got equals the golden file (a path from the source tree); says
 * on stderr at which line they part when not. */
int same_as_golden(const char *golden, const char *got);
/* 1 when `VERB --help` exits 0, prints tests/golden/VERB-help.txt and
 * `help VERB` prints the same; says on stderr what differs when not. */
int help_is_golden(const char *verb);

/* 1 when process pid catches both SIGINT and SIGTERM (Linux: the SigCgt
 * mask of /proc/PID/status), i.e. a verb's run has begun. */
int catching(pid_t pid);
/* Wait until pid catches them, for at most `seconds` (a loaded machine
 * may take seconds to start a program): 1 when it does, 0 when it ended
 * first (it is not reaped) or the time ran out.  A test that signals a
 * run waits for this instead of a fixed delay. */
int await_catching(pid_t pid, double seconds);

/* Processor time process pid has used so far, all its threads, s (Linux:
 * /proc/PID/stat); -1 when it cannot be read. */
double proc_cpu(pid_t pid);
/* Reap pid (options as waitpid's, e.g. WNOHANG): what waitpid returns,
 * with its exit status in *status (-1: it did not exit normally) and the
 * processor time it used in all in *cpu, s.  Stopping "within a second"
 * is a promise about work, so tests judge it by processor time: on a
 * loaded machine a second of work can take many seconds of wall time. */
pid_t reap_cpu(pid_t pid, int options, int *status, double *cpu);

#endif

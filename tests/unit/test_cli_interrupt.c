/* test_cli_interrupt.c - long runs on the command line: a signal stops
 * them with status 130 (SIGINT) or 143 (SIGTERM) and no file written, no
 * temporary file left; --quiet prints the verdict line alone; the
 * progress bar goes to a terminal only. */
#define _DEFAULT_SOURCE /* openpty */
#include "runbin.h"
#include "testkit.h"

#include <dirent.h>
#include <errno.h>
#include <fcntl.h>
#include <libxml/parser.h>
#include <poll.h>
#include <pty.h>
#include <signal.h>
#include <spawn.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/ioctl.h>
#include <sys/wait.h>
#include <termios.h>
#include <time.h>
#include <unistd.h>

extern char **environ;

#define LEG BR_SOURCE_DIR "/examples/leg-7level.xml"
#define DEMO BR_SOURCE_DIR "/examples/demo-3level.xml"
/* a cold start of seconds: a driver that never starts, 1 s simulated */
/* A start-up that takes seconds by either method: a top rail that
 * hiccups every period until the limit; and one that takes seconds when
 * every period is integrated (its stalled rail is stepped over otherwise). */
#define HICCUP_STARTUP BR_SOURCE_DIR "/tests/data/hiccup-startup.xml"
#define SLOW_STARTUP BR_SOURCE_DIR "/tests/data/slow-startup.xml"
/* 64 switches: every simulation is long, and with --solver-limit 100000
 * the steady state runs its plain periods until the work limit */
#define L33 BR_SOURCE_DIR "/tests/extreme/levels-33.xml"
#define CATALOG BR_SOURCE_DIR "/examples/parts/catalog.xml"
#define SWITCHES BR_SOURCE_DIR "/examples/parts/switches.xml"
/* How much processor time a run may use after its signal, s (the stop
 * is polled every few milliseconds of work; sanitizer builds are slower).
 * Processor time, not wall time: the machines running the suite are
 * shared, and under a load of ten a second of work takes ten. */
#if defined(__SANITIZE_ADDRESS__)
#define STOP_S 3.0
#else
#define STOP_S 1.0
#endif
#define INVERTER BR_SOURCE_DIR "/examples/inverter-7level.xml"

static double now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

/* Spawn the binary with args, stdout to out_path, stderr to fd err_fd;
 * SIGINT and SIGTERM at their default whatever this process inherited (a
 * background shell ignores SIGINT, and so would the child). */
static pid_t spawn(const char *const *args, const char *out_path, int err_fd)
{
    char *argv[32] = {BR_BINARY};
    int n = 1;
    for (; args[n - 1] && n < 31; n++)
        argv[n] = (char *)args[n - 1];
    argv[n] = NULL;
    posix_spawn_file_actions_t fa;
    posix_spawn_file_actions_init(&fa);
    posix_spawn_file_actions_addopen(&fa, 0, "/dev/null", O_RDONLY, 0);
    posix_spawn_file_actions_addopen(&fa, 1, out_path, O_WRONLY | O_CREAT | O_TRUNC, 0600);
    posix_spawn_file_actions_adddup2(&fa, err_fd, 2);
    posix_spawnattr_t at;
    posix_spawnattr_init(&at);
    sigset_t def, none;
    sigemptyset(&def);
    sigaddset(&def, SIGINT);
    sigaddset(&def, SIGTERM);
    sigemptyset(&none);
    posix_spawnattr_setsigdefault(&at, &def);
    posix_spawnattr_setsigmask(&at, &none);
    posix_spawnattr_setflags(&at, POSIX_SPAWN_SETSIGDEF | POSIX_SPAWN_SETSIGMASK);
    pid_t pid = -1;
    int rc = posix_spawn(&pid, BR_BINARY, &fa, &at, argv, environ);
    posix_spawn_file_actions_destroy(&fa);
    posix_spawnattr_destroy(&at);
    CU_ASSERT_EQUAL_FATAL(rc, 0);
    return pid;
}

/* Exit status, or -1 when killed. */
static int wait_status(pid_t pid)
{
    int ws = 0;
    while (waitpid(pid, &ws, 0) < 0 && errno == EINTR)
        ;
    return WIFEXITED(ws) ? WEXITSTATUS(ws) : -1;
}

/* Entries of dir besides . and .. */
static int entries(const char *dir)
{
    DIR *d = opendir(dir);
    int n = 0;
    CU_ASSERT_PTR_NOT_NULL_FATAL(d);
    for (struct dirent *e; (e = readdir(d));)
        if (strcmp(e->d_name, ".") != 0 && strcmp(e->d_name, "..") != 0) {
            fprintf(stderr, "left behind: %s\n", e->d_name);
            n++;
        }
    closedir(d);
    return n;
}

/* Start a long run writing files into a fresh directory, send sig 0.3 s
 * after its run has begun (its handlers are in place), and check the status, the one line on
 * stderr, and that nothing was written. */
static void interrupt_run_on(const char *design, double within, const char *verb, const char *o1,
                             const char *f1, const char *o2, const char *f2, int sig, int expect)
{
    char dir[] = "/tmp/br-int-XXXXXX", p1[128], p2[128], po[] = "/tmp/br-int-out-XXXXXX",
         pe[] = "/tmp/br-int-err-XXXXXX";
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(dir));
    snprintf(p1, sizeof p1, "%s/%s", dir, f1);
    snprintf(p2, sizeof p2, "%s/%s", dir, f2);
    int fo = mkstemp(po), fe = mkstemp(pe);
    CU_ASSERT_TRUE_FATAL(fo >= 0 && fe >= 0);
    const char *map[] = {verb, design, "--duty", "5%:95%:40", "--freq", "10k:1M:40",
                         o1,   p1,     o2,       p2,          NULL};
    const char *yield[] = {verb, design, "--samples", "100000", o1, p1, o2, p2, NULL};
    const char *steady[] = {verb, design, o1, p1, o2, p2, NULL};
    int one = strcmp(verb, "steady") == 0 || strcmp(verb, "analyze") == 0;
    pid_t pid = spawn(strcmp(verb, "map") == 0 ? map : one ? steady : yield, po, fe);
    CU_ASSERT_TRUE(await_catching(pid, 30.0)); /* its run has begun */
    usleep(300000);
    double before = proc_cpu(pid), cpu = 0.0;
    kill(pid, sig);
    int status = -1;
    reap_cpu(pid, 0, &status, &cpu);
    double took = cpu - before; /* processor time after the signal */
    if (status != expect)
        fprintf(stderr, "%s on %s: status %d, expected %d\n", verb, design, status, expect);
    CU_ASSERT_EQUAL(status, expect);
    if (!(took < within))
        fprintf(stderr, "%s took %.2f s of processor time to stop, expected under %.1f s\n", verb,
                took, within);
    CU_ASSERT_TRUE(took < within);
    char *err = br_test_slurp(pe, NULL), *out = br_test_slurp(po, NULL);
    if (err && strcmp(err, "bootrung: interrupted\n") != 0)
        fprintf(stderr, "stderr: %s\n", err);
    CU_ASSERT_TRUE(err && strcmp(err, "bootrung: interrupted\n") == 0);
    CU_ASSERT_TRUE(out && out[0] == '\0');
    CU_ASSERT_EQUAL(entries(dir), 0);
    free(err);
    free(out);
    close(fo);
    close(fe);
    unlink(po);
    unlink(pe);
    rmdir(dir);
}

static void interrupt_run(const char *verb, const char *o1, const char *f1, const char *o2,
                          const char *f2, int sig, int expect)
{
    /* the workers stop after their current point */
    interrupt_run_on(LEG, 5.0, verb, o1, f1, o2, f2, sig, expect);
}

static void test_sigint_map(void)
{
    interrupt_run("map", "--csv", "m.csv", "--svg", "m.svg", SIGINT, 130);
}

static void test_sigterm_yield(void)
{
    interrupt_run("yield", "--xml", "y.xml", "--csv", "y.csv", SIGTERM, 143);
}

/* One phase of one verb, stopped by a signal `after` seconds after the
 * run caught its signals (before that, a signal would end the process
 * through its default action, which says nothing about the run). */
typedef struct phase_case {
    const char *what;
    const char *args[16]; /* NULL-terminated; "@" stands for the output file */
    double after;         /* s */
    int sig;
} phase_case;

static const phase_case phases[] = {
    {"startup: the cold start", {"startup", HICCUP_STARTUP, "--xml", "@", NULL}, 0.5, SIGINT},
    {"analyze: the cold start",
     {"analyze", SLOW_STARTUP, "--startup-method", "periods", "--xml", "@", NULL},
     0.5,
     SIGTERM},
    {"steady: the steady state",
     {"steady", "--solver-limit", "100000", L33, "--xml", "@", NULL},
     0.5,
     SIGINT},
    {"analyze: the steady state",
     {"analyze", "--solver-limit", "100000", L33, "--xml", "@", NULL},
     2.0,
     SIGTERM},
    {"window: the design point", {"window", L33, "--xml", "@", NULL}, 0.03, SIGINT},
    {"window: the sweeps", {"window", L33, "--xml", "@", NULL}, 2.5, SIGTERM},
    {"map: the design column",
     {"map", L33, "--duty", "30%:70%:5", "--freq", "20k:100k:5", "--csv", "@", NULL},
     0.5,
     SIGINT},
    {"corners: the one-at-a-time points", {"corners", L33, "--xml", "@", NULL}, 0.3, SIGTERM},
    {"supply: the one-at-a-time points", {"supply", L33, "--xml", "@", NULL}, 0.3, SIGINT},
    {"yield: the samples", {"yield", L33, "--samples", "40", "--xml", "@", NULL}, 1.5, SIGINT},
    {"pick: the one-part choices",
     {"pick", L33, "--catalog", CATALOG, "--xml", "@", NULL},
     0.5,
     SIGTERM},
    {"pick: the per-rail descent",
     {"pick", L33, "--catalog", CATALOG, "--xml", "@", NULL},
     3.0,
     SIGINT},
    {"size: the search", {"size", L33, "--write-design", "@", NULL}, 1.0, SIGTERM},
    /* chains of 48 to 64 switches: every screen is long */
    {"explore: the screen",
     {"explore", LEG, "--catalog", SWITCHES, "--vin", "1.1k", "--levels", "25:33", "--fsw", "60k",
      "--csv", "@", NULL},
     0.5,
     SIGINT},
    {"explore: the corners",
     {"explore", LEG, "--catalog", SWITCHES, "--vin", "1.1k", "--levels", "8:8", "--fsw", "60k",
      "--corners", "--csv", "@", NULL},
     1.0,
     SIGTERM},
    {"explore: the sizing",
     {"explore", LEG, "--catalog", SWITCHES, "--parts", CATALOG, "--vin", "1.1k", "--levels", "8:8",
      "--fsw", "60k", "--csv", "@", NULL},
     2.0,
     SIGINT},
    {"explore: the yield",
     {"explore", LEG, "--catalog", SWITCHES, "--vin", "1.1k", "--levels", "8:8", "--fsw", "60k",
      "--yield", "20", "--csv", "@", NULL},
     1.5,
     SIGTERM},
    {"yield: a shard's samples",
     {"yield", L33, "--samples", "40", "--shard", "1/2", "--shard-file", "@", NULL},
     1.5,
     SIGTERM},
};
#define NPHASES ((int)(sizeof phases / sizeof phases[0]))

/* A run of phases[i] in flight. */
typedef struct flight {
    pid_t pid;
    char dir[32], out[40], err[40];
    int fo, fe, sent, status;
    double armed, signalled, ended; /* s, monotonic (armed 0: not yet) */
    double cpu_sent, cpu;           /* processor time at the signal and in all, s */
} flight;

static void launch(const phase_case *pc, flight *f)
{
    snprintf(f->dir, sizeof f->dir, "/tmp/br-phase-XXXXXX");
    snprintf(f->out, sizeof f->out, "/tmp/br-phase-out-XXXXXX");
    snprintf(f->err, sizeof f->err, "/tmp/br-phase-err-XXXXXX");
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(f->dir));
    f->fo = mkstemp(f->out);
    f->fe = mkstemp(f->err);
    CU_ASSERT_TRUE_FATAL(f->fo >= 0 && f->fe >= 0);
    char file[64];
    snprintf(file, sizeof file, "%s/result", f->dir);
    enum { NARGS = sizeof pc->args / sizeof pc->args[0] };
    const char *args[NARGS];
    for (int i = 0; i < NARGS; i++)
        args[i] = pc->args[i] && strcmp(pc->args[i], "@") == 0 ? file : pc->args[i];
    f->pid = spawn(args, f->out, f->fe);
    f->sent = 0;
    f->status = -2;
    f->armed = 0.0;
}

/* Status 130/143, the one line on stderr, nothing on stdout, no file. */
static void judge(const phase_case *pc, flight *f)
{
    double took = f->cpu - f->cpu_sent;
    fprintf(stderr, "\n  %-36s exit %d, %.3f s after the signal (%.3f s of processor time)",
            pc->what, f->status, f->ended - f->signalled, took);
    CU_ASSERT_EQUAL(f->status, pc->sig == SIGINT ? 130 : 143);
    CU_ASSERT_TRUE(took < STOP_S);
    char *err = br_test_slurp(f->err, NULL), *out = br_test_slurp(f->out, NULL);
    CU_ASSERT_TRUE(err && strcmp(err, "bootrung: interrupted\n") == 0);
    CU_ASSERT_TRUE(out && out[0] == '\0');
    CU_ASSERT_EQUAL(entries(f->dir), 0);
    free(err);
    free(out);
    close(f->fo);
    close(f->fe);
    unlink(f->out);
    unlink(f->err);
    rmdir(f->dir);
}

/* Every phase of every long verb stops on its signal within STOP_S of
 * processor time: the runs go in parallel, each signalled at its own
 * time.  A run that has not ended STOP_S plus a margin of wall time after
 * its signal is killed and fails. */
static void test_every_phase(void)
{
    flight f[NPHASES];
    double t0 = now();
    for (int i = 0; i < NPHASES; i++)
        launch(&phases[i], &f[i]);
    for (int left = NPHASES; left > 0;) {
        for (int i = 0; i < NPHASES; i++) {
            if (f[i].status != -2)
                continue;
            if (f[i].armed == 0.0 && catching(f[i].pid))
                f[i].armed = now();
            if (!f[i].sent && f[i].armed > 0.0 && now() - f[i].armed >= phases[i].after) {
                f[i].cpu_sent = proc_cpu(f[i].pid);
                f[i].sent = kill(f[i].pid, phases[i].sig) == 0;
                f[i].signalled = now();
            }
            int st;
            if (reap_cpu(f[i].pid, WNOHANG, &st, &f[i].cpu) == f[i].pid) {
                f[i].ended = now();
                f[i].status = st;
                if (!f[i].sent) { /* ended before its signal: say so */
                    f[i].signalled = f[i].ended;
                    f[i].cpu_sent = f[i].cpu;
                }
                left--;
            } else if ((f[i].sent && now() - f[i].signalled > STOP_S + 10.0) ||
                       (!f[i].sent && now() - t0 > 60.0)) { /* hung, or never caught */
                kill(f[i].pid, SIGKILL);
            }
        }
        usleep(2000);
    }
    for (int i = 0; i < NPHASES; i++)
        judge(&phases[i], &f[i]);
}

/* A line cycle's steady state (thousands of switching periods, one
 * solve of a second or more) stops inside the solve, and so does a yield
 * whose every point is one (the workers' solves poll the meter), well
 * before the solve would end. */
static void test_sigint_line_steady(void)
{
    interrupt_run_on(INVERTER, 0.5, "steady", "--xml", "s.xml", "--csv", "s.csv", SIGINT, 130);
    /* analyze: the cold start first, then the line cycle */
    interrupt_run_on(INVERTER, 0.5, "analyze", "--xml", "a.xml", "--csv", "a.csv", SIGINT, 130);
    interrupt_run_on(INVERTER, 0.5, "yield", "--xml", "y.xml", "--csv", "y.csv", SIGTERM, 143);
}

/* --quiet: one line on stdout, the verdict; nothing on stderr. */
static void quiet_line(const char *const *args, const char *prefix, int expect)
{
    run_result r = run(args);
    CU_ASSERT_EQUAL(r.status, expect);
    CU_ASSERT_TRUE(strncmp(r.out, prefix, strlen(prefix)) == 0);
    char *nl = strchr(r.out, '\n');
    CU_ASSERT_TRUE(nl && nl[1] == '\0'); /* exactly one line */
    CU_ASSERT_STRING_EQUAL(r.err, "");
    if (!(nl && nl[1] == '\0'))
        fprintf(stderr, "stdout was: [%s]\n", r.out);
    done(&r);
}

static void test_quiet(void)
{
    const char *analyze[] = {"analyze", DEMO, "--quiet", NULL};
    quiet_line(analyze, "verdict: FAIL, ", 1);
    const char *startup[] = {"startup", DEMO, "--quiet", NULL};
    quiet_line(startup, "verdict: PASS, ", 0);
    const char *check[] = {"check", DEMO, "--quiet", NULL};
    quiet_line(check, "design rules: ", 0);
    const char *map[] = {"map",    DEMO,         "--duty",  "40%:60%:2",
                         "--freq", "80k:120k:2", "--quiet", NULL};
    quiet_line(map, "design point: FAILS", 1);
    const char *yield[] = {"yield", DEMO, "--samples", "20", "--quiet", NULL};
    quiet_line(yield, "verdict: ", 1);
}

/* --quiet still writes the files asked for. */
static void test_quiet_writes_files(void)
{
    char dir[] = "/tmp/br-quiet-XXXXXX", path[128];
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(dir));
    snprintf(path, sizeof path, "%s/r.xml", dir);
    const char *args[] = {"analyze", DEMO, "--quiet", "--xml", path, NULL};
    run_result r = run(args);
    CU_ASSERT_EQUAL(r.status, 1);
    CU_ASSERT_EQUAL(access(path, R_OK), 0);
    CU_ASSERT_TRUE(has(r.out, "verdict: FAIL"));
    done(&r);
    xmlDoc *doc = xmlReadFile(path, NULL, XML_PARSE_NONET);
    CU_ASSERT_PTR_NOT_NULL(doc); /* well-formed */
    xmlFreeDoc(doc);
    unlink(path);
    rmdir(dir);
}

/* A run of many seconds (its first points alone take a while), stopped
 * by SIGINT. */
static const char *const long_map[] = {"map",    LEG,         "--duty", "5%:95%:40",
                                       "--freq", "10k:1M:40", NULL,     NULL};

/* Run args with stderr on fd err_fd (or, when err_fd < 0, on a
 * pseudo-terminal 80 columns wide), send SIGINT after `after` seconds or,
 * when `until` is given, as soon as the terminal shows it (within 30 s),
 * and return what reached stderr (malloc'd). */
static char *stopped_run(const char *const *args, int err_fd, double after, const char *until,
                         int *status)
{
    int master = -1, slave = err_fd;
    struct winsize ws = {.ws_row = 24, .ws_col = 80};
    if (err_fd < 0)
        CU_ASSERT_EQUAL_FATAL(openpty(&master, &slave, NULL, NULL, &ws), 0);
    char po[] = "/tmp/br-pty-out-XXXXXX";
    int fo = mkstemp(po);
    CU_ASSERT_TRUE_FATAL(fo >= 0);
    pid_t pid = spawn(args, po, slave);
    if (master >= 0)
        close(slave);
    await_catching(pid, 30.0); /* count from the start of its run */
    size_t cap = 1 << 16, len = 0;
    char *buf = calloc(cap, 1);
    double t0 = now();
    int sent = 0;
    /* drain the terminal so the child never blocks on it, until its side
     * closes (read fails with EIO) */
    for (;;) {
        int due = until ? strstr(buf, until) != NULL || now() - t0 >= 30.0 : now() - t0 >= after;
        if (!sent && due)
            sent = kill(pid, SIGINT) == 0;
        struct pollfd pf = {master, POLLIN, 0};
        if (master < 0) {
            if (sent)
                break;
            usleep(10000);
            continue;
        }
        if (poll(&pf, 1, 20) <= 0)
            continue;
        ssize_t n = read(master, buf + len, cap - 1 - len);
        if (n <= 0 && !(n < 0 && errno == EINTR))
            break;
        len += n > 0 ? (size_t)n : 0;
    }
    *status = wait_status(pid);
    if (master >= 0)
        close(master);
    close(fo);
    unlink(po);
    return buf;
}

/* stderr to a file: not a byte of progress in 1.5 s of running. */
static void test_no_bar_off_terminal(void)
{
    char pe[] = "/tmp/br-int-err-XXXXXX";
    int fe = mkstemp(pe), status;
    CU_ASSERT_TRUE_FATAL(fe >= 0);
    free(stopped_run(long_map, fe, 1.5, NULL, &status));
    CU_ASSERT_EQUAL(status, 130);
    char *err = br_test_slurp(pe, NULL);
    if (err && strcmp(err, "bootrung: interrupted\n") != 0)
        fprintf(stderr, "stderr: %s\n", err);
    CU_ASSERT_TRUE(err && strcmp(err, "bootrung: interrupted\n") == 0);
    free(err);
    close(fe);
    unlink(pe);
}

static void test_bar_on_terminal(void)
{
    int status;
    char *tty = stopped_run(long_map, -1, 0.0, " % ", &status);
    CU_ASSERT_EQUAL(status, 130);
    CU_ASSERT_TRUE(has(tty, "\rmap ["));
    CU_ASSERT_TRUE(has(tty, " % "));
    /* the bar is erased before the last line (the terminal turns \n
     * into \r\n) */
    CU_ASSERT_TRUE(has(tty, " \rbootrung: interrupted\r\n"));
    /* one line redrawn: no newline before the last line */
    CU_ASSERT_TRUE(strchr(tty, '\n') == tty + strlen(tty) - 1);
    size_t width = 0, run_len = 0;
    for (const char *p = tty; *p; p++) {
        run_len = *p == '\r' ? 0 : run_len + 1;
        width = run_len > width ? run_len : width;
    }
    CU_ASSERT_TRUE(width < 80); /* no line longer than the terminal */
    free(tty);
}

/* The cold start of startup shows its bar too (the verb's results once
 * wiped the hook that draws it before the run began). */
static void test_startup_bar_on_terminal(void)
{
    const char *args[] = {"startup", HICCUP_STARTUP, NULL};
    int status;
    char *tty = stopped_run(args, -1, 0.0, " % ", &status);
    CU_ASSERT_EQUAL(status, 130);
    CU_ASSERT_TRUE(has(tty, "\rstartup ["));
    CU_ASSERT_TRUE(has(tty, " \rbootrung: interrupted\r\n"));
    free(tty);
}

static void test_quiet_no_bar_on_terminal(void)
{
    const char *args[] = {"map",    LEG,         "--duty",  "5%:95%:40",
                          "--freq", "10k:1M:40", "--quiet", NULL};
    int status;
    char *tty = stopped_run(args, -1, 1.5, NULL, &status);
    CU_ASSERT_EQUAL(status, 130);
    CU_ASSERT_STRING_EQUAL(tty, "bootrung: interrupted\r\n");
    free(tty);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"SIGINT stops map: 130, no files", test_sigint_map},
        {"signals stop a line cycle's steady state and yield", test_sigint_line_steady},
        {"SIGTERM stops yield: 143, no files", test_sigterm_yield},
        {"every phase of every verb stops on a signal", test_every_phase},
        {"--quiet prints the verdict line only", test_quiet},
        {"--quiet still writes the files", test_quiet_writes_files},
        {"no progress off a terminal", test_no_bar_off_terminal},
        {"a progress bar on a terminal", test_bar_on_terminal},
        {"startup: a progress bar on a terminal", test_startup_bar_on_terminal},
        {"--quiet: no bar on a terminal", test_quiet_no_bar_on_terminal},
        {NULL, NULL},
    };
    return br_test_main("cli interrupt", cases);
}

/* progress.c - long runs on the command line: a progress bar on stderr
 * and a clean stop on SIGINT (Ctrl-C) or SIGTERM.
 *
 * The bar is one line redrawn with a carriage return, only when stderr is
 * a terminal, --quiet is off and the run has lasted half a second (a
 * quick run shows nothing), at most ten times a second; it is erased
 * before anything else is printed.  When stderr is not a terminal nothing
 * of it is written at all.
 *
 * The signal handler only records which signal came: `caught` is the one
 * mutable global of the program, because a handler can reach nothing
 * else.  The analysis polls it through the progress hook and, inside
 * every simulation, through the hook's stop poll, and stops; the verb then
 * writes no output file. */
#include "cli.h"

#include <pthread.h>
#include <stdlib.h>
#include <string.h>
#include <sys/ioctl.h>
#include <time.h>
#include <unistd.h>

#define BAR_DELAY 0.5 /* s a run lasts before its bar appears */
#define BAR_EVERY 0.1 /* s between redraws */
#define BAR_MIN 10    /* columns of the bar itself, at least */
#define BAR_MAX 40    /* and at most */

static volatile sig_atomic_t caught; /* the signal that asked to stop, or 0 */

static void on_signal(int sig)
{
    caught = sig;
}

static const int signals[2] = {SIGINT, SIGTERM};

static double now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

static int columns(void)
{
    struct winsize ws;
    if (ioctl(STDERR_FILENO, TIOCGWINSZ, &ws) == 0 && ws.ws_col >= 20)
        return ws.ws_col;
    return 80;
}

/* "12 s", or "3:05" from a minute on. */
static void elapsed_text(char *buf, size_t cap, double s)
{
    long t = (long)s;
    if (t < 60)
        snprintf(buf, cap, "%ld s", t);
    else
        snprintf(buf, cap, "%ld:%02ld", t / 60, t % 60);
}

const char *br_cli_bar_render(char *buf, size_t cap, const char *label, double done, double total,
                              double elapsed, int width)
{
    double f = total > 0 && done > 0 ? done / total : 0.0;
    f = f > 1.0 ? 1.0 : f;
    char tail[48];
    elapsed_text(tail, sizeof tail, elapsed);
    /* "label [####......] 42 % 12 s": the bar takes what is left */
    int fixed = (int)strlen(label) + 2 + 2 + 5 + 1 + (int)strlen(tail);
    int n = width - 1 - fixed;
    n = n < BAR_MIN ? BAR_MIN : n > BAR_MAX ? BAR_MAX : n;
    char bar[BAR_MAX + 1];
    int full = (int)(f * n);
    for (int i = 0; i < n; i++)
        bar[i] = i < full ? '#' : '.';
    bar[n] = '\0';
    snprintf(buf, cap, "%s [%s] %3d %% %s", label, bar, (int)(100.0 * f), tail);
    return buf;
}

static void erase(br_cli_run *r)
{
    if (!r->drawn)
        return;
    fprintf(stderr, "\r%*s\r", r->width, "");
    fflush(stderr);
    r->drawn = 0;
}

static void draw(br_cli_run *r, double done, double total)
{
    double t = now();
    if (t - r->t0 < BAR_DELAY || (r->drawn && t - r->last < BAR_EVERY))
        return;
    char buf[512];
    int w = columns();
    w = w > (int)sizeof buf - 1 ? (int)sizeof buf - 1 : w;
    br_cli_bar_render(buf, sizeof buf, r->label, done, total, t - r->t0, w);
    int len = (int)strlen(buf);
    /* pad over a longer line drawn before */
    fprintf(stderr, "\r%s%*s", buf, r->width > len ? r->width - len : 0, "");
    fflush(stderr);
    r->width = len > r->width ? len : r->width;
    r->drawn = 1;
    r->last = t;
}

/* The hook the analysis calls: stop once a signal came, else draw. */
int br_cli_run_progress(void *ctx, double done, double total)
{
    br_cli_run *r = ctx;
    if (caught)
        return 1;
    if (r->draw)
        draw(r, done, total);
    return 0;
}

/* The stop poll the simulators call every few milliseconds of work, from
 * any thread: reading the flag is all it does. */
int br_cli_run_stop(void *ctx)
{
    (void)ctx;
    return caught != 0;
}

static int want_bar(int quiet)
{
    const char *term = getenv("TERM");
    return !quiet && isatty(STDERR_FILENO) && !(term && strcmp(term, "dumb") == 0);
}

/* A signal ignored when we started (a background job's SIGINT) stays
 * ignored. */
static void catch_signals(br_cli_run *r)
{
    struct sigaction sa;
    memset(&sa, 0, sizeof sa);
    sa.sa_handler = on_signal;
    sa.sa_flags = SA_RESTART;
    sigemptyset(&sa.sa_mask);
    for (int i = 0; i < 2; i++) {
        r->mine[i] = 0;
        if (sigaction(signals[i], NULL, &r->old[i]) != 0 || r->old[i].sa_handler == SIG_IGN)
            continue;
        r->mine[i] = sigaction(signals[i], &sa, NULL) == 0;
    }
}

void br_cli_run_begin(br_cli_run *r, const char *label, int quiet)
{
    memset(r, 0, sizeof *r);
    r->label = label;
    r->draw = want_bar(quiet);
    r->t0 = now();
    caught = 0;
    catch_signals(r);
}

static void both(sigset_t *set)
{
    sigemptyset(set);
    sigaddset(set, SIGINT);
    sigaddset(set, SIGTERM);
}

int br_cli_run_commit(br_cli_run *r)
{
    erase(r);
    r->draw = 0;
    sigset_t set;
    both(&set);
    r->blocked = pthread_sigmask(SIG_BLOCK, &set, &r->oldmask) == 0;
    int sig = caught;
    if (!sig)
        return 0;
    fprintf(stderr, "bootrung: interrupted\n");
    return sig == SIGTERM ? BR_EXIT_TERMINATED : BR_EXIT_INTERRUPTED;
}

void br_cli_run_end(br_cli_run *r)
{
    erase(r);
    /* a signal held while the results were written reaches our handler
     * here, and is ignored: the run had finished */
    if (r->blocked)
        pthread_sigmask(SIG_SETMASK, &r->oldmask, NULL);
    r->blocked = 0;
    for (int i = 0; i < 2; i++)
        if (r->mine[i])
            sigaction(signals[i], &r->old[i], NULL);
    memset(r->mine, 0, sizeof r->mine);
}

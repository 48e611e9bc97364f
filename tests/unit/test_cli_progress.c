/* test_cli_progress.c - the progress bar's text and the signal handling
 * of a long run, in this process (src/cli/progress.c is linked in). */
#include "cli.h"
#include "testkit.h"

#include <signal.h>
#include <string.h>

/* At 40 columns the line takes 39: the bar gets what the rest leaves. */
static void test_render(void)
{
    char buf[256];
    CU_ASSERT_STRING_EQUAL(br_cli_bar_render(buf, sizeof buf, "map", 5.0, 10.0, 12.4, 40),
                           "map [###########...........]  50 % 12 s");
    /* nothing known yet; beyond the estimate it stays at 100 % */
    CU_ASSERT_STRING_EQUAL(br_cli_bar_render(buf, sizeof buf, "map", 3.0, 0.0, 0.0, 40),
                           "map [.......................]   0 % 0 s");
    CU_ASSERT_STRING_EQUAL(br_cli_bar_render(buf, sizeof buf, "map", 12.0, 10.0, 75.0, 40),
                           "map [######################] 100 % 1:15");
    /* the bar takes at most 40 columns, and at least 10 */
    br_cli_bar_render(buf, sizeof buf, "yield", 1.0, 4.0, 1.0, 200);
    CU_ASSERT_EQUAL(strlen(buf), strlen("yield [] 100 % 1 s") + 40);
    br_cli_bar_render(buf, sizeof buf, "yield", 1.0, 4.0, 1.0, 20);
    CU_ASSERT_EQUAL(strlen(buf), strlen("yield [] 100 % 1 s") + 10);
    /* a line fits the terminal */
    br_cli_bar_render(buf, sizeof buf, "corners", 1.0, 3.0, 3599.0, 60);
    CU_ASSERT_TRUE(strlen(buf) < 60);
    /* a small buffer is cut, never overrun */
    char small[8];
    br_cli_bar_render(small, sizeof small, "map", 1.0, 2.0, 0.0, 80);
    CU_ASSERT_EQUAL(strlen(small), 7);
}

/* The hook runs on until a signal comes; then it asks to stop, commit
 * reports the interruption, and end puts the old handler back. */
static void test_signal(void)
{
    struct sigaction before, after;
    sigaction(SIGINT, NULL, &before);
    int ignored = before.sa_handler == SIG_IGN;
    signal(SIGINT, SIG_DFL); /* as from a terminal, even under a background shell */
    br_cli_run r;
    br_cli_run_begin(&r, "test", 1);
    CU_ASSERT_EQUAL(br_cli_run_progress(&r, 1.0, 2.0), 0);
    CU_ASSERT_EQUAL(br_cli_run_stop(&r), 0);
    raise(SIGINT); /* caught: the process goes on */
    CU_ASSERT_NOT_EQUAL(br_cli_run_progress(&r, 1.0, 2.0), 0);
    CU_ASSERT_NOT_EQUAL(br_cli_run_stop(&r), 0);
    CU_ASSERT_EQUAL(br_cli_run_commit(&r), BR_EXIT_INTERRUPTED);
    br_cli_run_end(&r);
    sigaction(SIGINT, NULL, &after);
    CU_ASSERT_TRUE(after.sa_handler == SIG_DFL);
    /* a clean run: commit lets the verb write */
    br_cli_run_begin(&r, "test", 1);
    CU_ASSERT_EQUAL(br_cli_run_progress(&r, 2.0, 2.0), 0);
    CU_ASSERT_EQUAL(br_cli_run_commit(&r), 0);
    br_cli_run_end(&r);
    /* SIGTERM gives its own status */
    br_cli_run_begin(&r, "test", 1);
    raise(SIGTERM);
    CU_ASSERT_EQUAL(br_cli_run_commit(&r), BR_EXIT_TERMINATED);
    br_cli_run_end(&r);
    if (ignored)
        signal(SIGINT, SIG_IGN);
}

/* A signal ignored at the start stays ignored: the run is not stopped. */
static void test_ignored_stays_ignored(void)
{
    struct sigaction before;
    sigaction(SIGINT, NULL, &before);
    signal(SIGINT, SIG_IGN);
    br_cli_run r;
    br_cli_run_begin(&r, "test", 1);
    raise(SIGINT);
    CU_ASSERT_EQUAL(br_cli_run_progress(&r, 1.0, 2.0), 0);
    CU_ASSERT_EQUAL(br_cli_run_commit(&r), 0);
    br_cli_run_end(&r);
    sigaction(SIGINT, &before, NULL);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"the bar's text", test_render},
        {"signals: stop, status, handler restored", test_signal},
        {"an ignored SIGINT stays ignored", test_ignored_stays_ignored},
        {NULL, NULL},
    };
    return br_test_main("cli progress", cases);
}

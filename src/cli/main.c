/* main.c - bootrung's entry point: one table of verbs and the dispatch.
 *
 * Adding a verb: write cmd_<verb>.c exporting cmd_<verb>(argc, argv),
 * declare it in cli.h and add one row to `verbs` below. */
#include "cli.h"

#include <gsl/gsl_errno.h>
#include <signal.h>
#include <string.h>

#ifndef BR_VERSION
#define BR_VERSION "unknown"
#endif

typedef struct br_verb {
    const char *name;                 /* what the user types */
    int (*fn)(int argc, char **argv); /* argv[0] is the verb; returns the exit status */
    const char *summary;              /* one line for the verb list */
} br_verb;

static const br_verb verbs[] = {
    {"check", cmd_check, "print a design's chain and the design-rule warnings"},
    {"startup", cmd_startup, "simulate the start-up from cold, rail by rail"},
    {"steady", cmd_steady, "the periodic steady state: rail margins, diode and capacitor stress"},
    {"analyze", cmd_analyze, "start-up, steady state and the pass/fail verdict (the main job)"},
    {"window", cmd_window, "duty and frequency limits, hold-up time, start-up window"},
    {"map", cmd_map, "worst margin over a duty x frequency grid, as CSV and an SVG heat map"},
    {"corners", cmd_corners, "worst-case corners of the tolerances, criterion by criterion"},
    {"yield", cmd_yield, "Monte Carlo yield over the tolerances, with its confidence interval"},
    {"pick", cmd_pick, "rail capacitors and link diodes from a catalog, ranked by cost"},
    {"supply", cmd_supply, "smallest current limit and supply voltage window at the worst corners"},
    {"netlist", cmd_netlist, "the chain as a Berkeley SPICE3 netlist for another simulator"},
    {"size", cmd_size, "size rail capacitors and link resistance to a margin target"},
    {"explore", cmd_explore,
     "explore level counts, switch classes and frequencies around a design"},
    {"merge", cmd_merge, "put the shard files of a sweep (--shard K/N) back together"},
    {NULL, NULL, NULL},
};

/* Other spellings of a verb: British "analyse" is the verb analyze. */
static const char *const ALIASES[][2] = {{"analyse", "analyze"}};

/* The verb's own name for name (an alias's verb; name otherwise). */
static const char *verb_name(const char *name)
{
    for (size_t i = 0; i < sizeof ALIASES / sizeof ALIASES[0]; i++)
        if (strcmp(name, ALIASES[i][0]) == 0)
            return ALIASES[i][1];
    return name;
}

static const br_verb *find_verb(const char *name)
{
    name = verb_name(name);
    for (const br_verb *v = verbs; v->name; v++)
        if (strcmp(v->name, name) == 0)
            return v;
    return NULL;
}

static int main_help(FILE *f)
{
    fprintf(f, "usage: bootrung [--version] [--help] VERB [options] [ARGS]\n\n"
               "bootrung models a cascaded bootstrap gate-drive chain (a string of stacked\n"
               "switches whose floating driver supplies are charged rung by rung through\n"
               "diodes from one ground-referenced supply) from an XML design file.\n\n"
               "verbs:\n");
    for (const br_verb *v = verbs; v->name; v++)
        fprintf(f, "  %-10s %s\n", v->name, v->summary);
    fprintf(f, "\n'bootrung help VERB' or 'bootrung VERB --help' describes a verb ('analyse'\n"
               "is accepted for analyze).\n"
               "exit status: 0 done and every criterion passes, 1 a design criterion fails,\n"
               "2 bad input, bad usage or an output error, 3 undetermined (a solver did not\n"
               "converge; nothing fails), 130 interrupted (Ctrl-C), 143 stopped by SIGTERM.\n"
               "Every verb takes --quiet: the verdict line alone.\n");
    return BR_EXIT_OK;
}

static int version(void)
{
    printf("bootrung %s\n"
           "License GPL-3.0-or-later: GNU GPL version 3 or later.\n"
           "This is free software; there is NO WARRANTY, to the extent permitted by law.\n",
           BR_VERSION);
    return BR_EXIT_OK;
}

/* "bootrung help [VERB]": run the verb with --help so each verb owns its
 * text in one place. */
static int help(int argc, char **argv)
{
    if (argc < 2)
        return main_help(stdout);
    const br_verb *v = find_verb(argv[1]);
    if (!v)
        return br_cli_usage_error(NULL, "no verb '%s'", argv[1]);
    char *args[] = {(char *)v->name, "--help", NULL};
    return v->fn(2, args);
}

static int dispatch(int argc, char **argv)
{
    if (argc < 2) {
        main_help(stderr);
        return BR_EXIT_INPUT;
    }
    const char *a = argv[1];
    if (strcmp(a, "--help") == 0 || strcmp(a, "-h") == 0)
        return main_help(stdout);
    if (strcmp(a, "--version") == 0)
        return version();
    if (strcmp(a, "help") == 0)
        return help(argc - 1, argv + 1);
    const br_verb *v = find_verb(a);
    if (!v)
        return br_cli_usage_error(NULL, "unknown verb '%s'", a);
    argv[1] = (char *)v->name; /* messages and help name the verb as it is spelt here */
    return v->fn(argc - 1, argv + 1);
}

int main(int argc, char **argv)
{
    /* The library checks every GSL status itself; GSL's default handler
     * would abort the process instead of letting us report. */
    gsl_set_error_handler_off();
    /* A reader that goes away (`| head -1`) is a write error on stdout,
     * reported with status 2 like any other, not a silent death by
     * SIGPIPE: writes then fail with EPIPE instead. */
    signal(SIGPIPE, SIG_IGN);
    return br_cli_finish(dispatch(argc, argv));
}

/* cmd_netlist.c - `bootrung netlist FILE`: the design's chain as a plain
 * Berkeley SPICE3 netlist, to cross-check a rail in another simulator.
 * A client of the public API only (tests/lib/cli_includes.sh holds it to
 * that). */
#include "cli.h"

#include "bootrung/bootrung.h"
#include "bootrung/export.h"

#include <stdio.h>
#include <string.h>

#define ABOUT                                                                                      \
    "Write the chain of design FILE as a Berkeley SPICE3 netlist (to stdout, or to\n"              \
    "--out PATH with a one-line summary on stdout): the supply, each link diode\n"                 \
    "with its .model, each rail capacitor with its ESR, each switch as a\n"                        \
    "piecewise-linear source at the design's duty, dead time and edges (blocking\n"                \
    "while its driver is held in UVLO), each driver as current loads switched by\n"                \
    "a voltage-controlled switch with the UVLO hysteresis, and a transient from a\n"               \
    "cold start over --periods switching periods (default: the design's start-up\n"                \
    "limit). What the netlist simplifies is listed in docs/spice.md. Exit status\n"                \
    "0 when written, 2 for bad input.\n"

/* --current: which way the load current flows in the switch waveforms. */
static int parse_current(const char *text, int *dir)
{
    *dir = BR_CURRENT_DEFAULT;
    if (!text)
        return BR_EXIT_OK;
    if (strcmp(text, "step-down") == 0)
        *dir = BR_CURRENT_STEP_DOWN;
    else if (strcmp(text, "step-up") == 0)
        *dir = BR_CURRENT_STEP_UP;
    else if (strcmp(text, "none") == 0)
        *dir = BR_CURRENT_NONE;
    else
        return br_cli_usage_error("netlist",
                                  "--current: got '%s', expected step-down, step-up "
                                  "or none",
                                  text);
    return BR_EXIT_OK;
}

static int summary(const br_chain *c, long periods, const char *path, br_text *t)
{
    int n = br_chain_stages(c);
    int rc =
        br_text_printf(t,
                       "netlist: design %s, %d switches, %d links, %ld periods (%.6g s) "
                       "written to %s\n",
                       br_chain_name(c), n, n - 1, periods, periods * br_chain_period(c), path);
    if (rc == BR_OK)
        rc = br_text_put(t, "What the netlist simplifies: docs/spice.md.\n");
    return rc == BR_OK ? br_text_caution(t) : rc;
}

static void out_of_memory(br_error *err)
{
    br_error_clear(err);
    err->code = BR_ENOMEM;
    snprintf(err->msg, sizeof err->msg, "out of memory");
}

/* Render into net and sum; the options come from the command line. */
static int render(const br_chain *c, const char *path, const char *current, const char *periods,
                  const char *out, br_text *net, br_text *sum)
{
    int dir;
    long n = 0;
    br_error err;
    br_error_clear(&err);
    if (parse_current(current, &dir) ||
        (periods && br_cli_long("netlist", "periods", periods, 1, BR_NETLIST_PERIODS_MAX, &n)))
        return BR_EXIT_INPUT;
    if (br_netlist_write(c, dir, n, net, &n, &err) != BR_OK || summary(c, n, out, sum) != BR_OK) {
        if (err.code == BR_OK)
            out_of_memory(&err);
        return br_cli_fail(&err, path);
    }
    return BR_EXIT_OK;
}

static int run(const char *path, const char *current, const char *periods, const char *out,
               int quiet)
{
    static const char *const verdict[] = {"netlist:", NULL};
    br_design *d = NULL;
    br_chain *c = NULL;
    br_text *net = br_text_create(), *sum = br_text_create();
    br_error err;
    br_error_clear(&err);
    int status;
    if (!net || !sum) {
        out_of_memory(&err);
        status = br_cli_fail(&err, path);
    } else if (br_design_load(path, &d, &err) != BR_OK || br_chain_build(d, &c, &err) != BR_OK)
        status = br_cli_fail(&err, path);
    else
        status = render(c, path, current, periods, out, net, sum);
    if (status == BR_EXIT_OK) {
        const br_cli_file files[] = {{net, out}};
        status = br_cli_write(files, 1, sum, quiet, verdict, 0);
    }
    br_text_free(net);
    br_text_free(sum);
    br_chain_free(c);
    br_design_free(d);
    return status;
}

int cmd_netlist(int argc, char **argv)
{
    const char *out = NULL, *current = NULL, *periods = NULL;
    int quiet = 0;
    const br_opt opts[] = {
        {BR_OPT_STRING, "out", "PATH", &out, "write the netlist to PATH (default: stdout)"},
        {BR_OPT_STRING, "current", "DIR", &current,
         "load current in the switch waveforms: step-down, step-up or none"},
        {BR_OPT_STRING, "periods", "N", &periods,
         "switching periods simulated (default: the design's start-up limit)"},
        {BR_OPT_FLAG, "quiet", NULL, &quiet, BR_QUIET_HELP},
        {BR_OPT_END, NULL, NULL, NULL, NULL},
    };
    const br_cmd_doc doc = {"netlist", "FILE", ABOUT, opts, 1};
    char *pos[1];
    int parsed = br_cli_parse(&doc, argc, argv, pos);
    if (parsed != 0)
        return br_cli_parse_status(parsed);
    if (!out)
        out = "-";
    const char *const names[] = {"out"};
    if (br_cli_outputs("netlist", names, &out, 1, (const char *const *)pos, 1) != BR_EXIT_OK)
        return BR_EXIT_INPUT;
    return run(pos[0], current, periods, out, quiet);
}

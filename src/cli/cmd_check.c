/* cmd_check.c - `bootrung check FILE`: the chain of a design and the
 * design rules that need no simulation. */
#include "cli.h"

#include "core/error.h"
#include "report/check_report.h"

#include <stdlib.h>

/* Load, build and render; returns a br_status with err filled. */
static int run(const char *path, br_text *out, int *nwarn, int *nfatal, br_error *err)
{
    br_design *d = NULL;
    br_chain *c = NULL;
    int rc = br_design_load(path, &d, err);
    if (rc == BR_OK)
        rc = br_chain_build(d, &c, err);
    if (rc == BR_OK)
        rc = br_check_report(c, out, nwarn, nfatal, err);
    br_chain_free(c);
    br_design_free(d);
    return rc;
}

int cmd_check(int argc, char **argv)
{
    int strict = 0, quiet = 0;
    static const char *const verdict[] = {"design rules:", NULL};
    const br_opt opts[] = {
        {BR_OPT_FLAG, "strict", NULL, &strict, "exit with status 1 when any design rule warns"},
        {BR_OPT_FLAG, "quiet", NULL, &quiet, BR_QUIET_HELP},
        {BR_OPT_END, NULL, NULL, NULL, NULL},
    };
    const br_cmd_doc doc = {
        "check", "FILE",
        "Load the design file FILE, build its chain and print it: the operating point,\n"
        "then one row per stage (switch, parts, the return switch of its link, each\n"
        "charging window in ns and in % of the period, the blocking voltage of the link\n"
        "diode), then the design rules that need no simulation. A finding that means\n"
        "the chain cannot work at all (a rail that can never reach its UVLO, a link\n"
        "that never charges) fails: exit status 1. Other findings are warnings: they\n"
        "do not change the exit status unless --strict is given.\n",
        opts, 1};
    char *pos[1];
    int parsed = br_cli_parse(&doc, argc, argv, pos);
    if (parsed != 0)
        return br_cli_parse_status(parsed);
    br_text *out = br_text_create();
    br_error err;
    br_error_clear(&err);
    int nwarn = 0, nfatal = 0, status;
    if (!out) {
        br_error_set(&err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
        status = br_cli_fail(&err, NULL);
    } else if (run(pos[0], out, &nwarn, &nfatal, &err) != BR_OK) {
        status = br_cli_fail(&err, pos[0]);
    } else {
        status = quiet ? br_cli_emit_verdict(out, verdict, 0) : br_cli_emit(out);
    }
    br_text_free(out);
    if (status == BR_EXIT_OK && (nfatal > 0 || (strict && nwarn > 0)))
        status = BR_EXIT_FAIL;
    return status;
}

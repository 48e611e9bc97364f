/* cmd_check.c - `bootrung check FILE`: the chain of a design and the
 * design rules that need no simulation. */
#include "cli.h"

#include "analyses/spread.h"
#include "core/error.h"
#include "report/check_report.h"
#include "report/verb_pages.h"

#include <stdlib.h>

static const char *const VERDICT[] = {"design rules:", NULL};

typedef struct outputs {
    br_text *text, *html;
    int nwarn, nfatal;
} outputs;

/* Load, build and render; returns a br_status with err filled. */
static int run(const char *path, int strict, outputs *o, br_error *err)
{
    br_design *d = NULL;
    br_chain *c = NULL;
    int rc = br_design_load(path, &d, err);
    if (rc == BR_OK)
        rc = br_chain_build(d, &c, err);
    if (rc == BR_OK)
        rc = br_check_report(c, o->text, &o->nwarn, &o->nfatal, err);
    int fails = o->nfatal > 0 || (strict && o->nwarn > 0);
    if (rc == BR_OK && o->html)
        rc = br_text_html(c, "design check", fails ? BR_OUTCOME_FAIL : BR_OUTCOME_PASS, VERDICT, 0,
                          o->text, o->html, err);
    br_chain_free(c);
    br_design_free(d);
    return rc;
}

int cmd_check(int argc, char **argv)
{
    int strict = 0, quiet = 0;
    const char *report = NULL;
    const br_opt opts[] = {
        {BR_OPT_FLAG, "strict", NULL, &strict, "exit with status 1 when any design rule warns"},
        {BR_OPT_STRING, "report", "PATH", &report,
         "also write a self-contained HTML report to PATH (- stdout)"},
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
    const char *const out[] = {report}, *const names[] = {"report"};
    if (br_cli_outputs("check", names, out, 1, (const char *const *)pos, 1) != BR_EXIT_OK)
        return BR_EXIT_INPUT;
    outputs o = {br_text_create(), report ? br_text_create() : NULL, 0, 0};
    br_error err;
    br_error_clear(&err);
    int status;
    if (!o.text || (report && !o.html)) {
        br_error_set(&err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
        status = br_cli_fail(&err, NULL);
    } else if (run(pos[0], strict, &o, &err) != BR_OK) {
        status = br_cli_fail(&err, pos[0]);
    } else {
        const br_cli_file files[] = {{o.html, report}};
        status = br_cli_write(files, 1, o.text, quiet, VERDICT, 0);
    }
    br_text_free(o.text);
    br_text_free(o.html);
    if (status == BR_EXIT_OK && (o.nfatal > 0 || (strict && o.nwarn > 0)))
        status = BR_EXIT_FAIL;
    return status;
}

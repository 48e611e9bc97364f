/* cmd_check.c - `bootrung check FILE`: the chain of a design and the
 * design rules that need no simulation. */
#include "cli.h"

#include "bootrung/analysis.h"
#include "bootrung/report.h"

static const char *const VERDICT[] = {BR_CHECK_VERDICT, NULL};

typedef struct outputs {
    br_text *text, *html;
    br_design_check *k;
} outputs;

/* Load, check and render; returns a br_status with err filled. */
static int run(const char *path, outputs *o, br_error *err)
{
    br_design *d = NULL;
    int rc = br_design_load(path, &d, err);
    if (rc == BR_OK)
        rc = br_design_check_run(o->k, d, err);
    br_design_free(d);
    if (rc == BR_OK)
        rc = br_design_check_render(o->k, BR_FORMAT_TEXT, o->text, err);
    if (rc == BR_OK && o->html)
        rc = br_design_check_render(o->k, BR_FORMAT_HTML, o->html, err);
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
    outputs o = {br_text_create(), report ? br_text_create() : NULL, br_design_check_create()};
    br_error err;
    br_error_clear(&err);
    int status, res = BR_RESULT_PASS;
    if (!o.text || (report && !o.html) || !o.k) {
        br_error_set(&err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
        status = br_cli_fail(&err, NULL);
    } else if (br_design_check_set_strict(o.k, strict) != BR_OK || run(pos[0], &o, &err) != BR_OK) {
        status = br_cli_fail(&err, pos[0]);
    } else {
        const br_cli_file files[] = {{o.html, report}};
        status = br_cli_write(files, 1, o.text, quiet, VERDICT, 0);
    }
    if (status == BR_EXIT_OK && br_design_check_result(o.k, &res) == BR_OK && res == BR_RESULT_FAIL)
        status = BR_EXIT_FAIL;
    br_text_free(o.text);
    br_text_free(o.html);
    br_design_check_free(o.k);
    return status;
}

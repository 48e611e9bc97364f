/* cmd_corners.c - `bootrung corners FILE`: every criterion's worst corner
 * over the tolerances of the design file. */
#include "cli.h"

#include "bootrung/analysis.h"
#include "bootrung/report.h"

#include <string.h>

static const char ABOUT[] =
    "Worst-case (extreme-value) analysis of design FILE over the tolerances its\n"
    "values carry (\"10 uF +-20%\", \"0.6/0.7/0.8 V\"; the temperature range is the\n"
    "tolerance of the ambient, the supply tolerance that of the supply voltage).\n"
    "Each parameter goes to its minimum or maximum; for every criterion of the\n"
    "verdict the report gives the corner with the smallest margin, its figure,\n"
    "limit and margin beside the nominal margin, and which limit each parameter\n"
    "takes there. Up to --exhaustive parameters every corner is tried; beyond,\n"
    "the search is guided by one-at-a-time sensitivities (the report says how).\n"
    "The steady-state criteria are judged without a cold start; the start-up\n"
    "criteria get a smaller search of their own with a cold start at each corner\n"
    "(--no-startup skips them). A point where the solver cannot settle a steady\n"
    "state (or finish a cold start) decides nothing: it is counted and shown apart\n"
    "as undetermined, never as a pass or a failure. Exit status 0 when every\n"
    "criterion passes at its worst corner, 1 when one fails, 3 when none fails\n"
    "but one is undetermined somewhere, 2 for bad input.\n";

static const char *const VERDICT[] = {BR_CORNERS_VERDICT, NULL};

typedef struct args {
    const char *xml, *report, *threads, *exhaustive, *limit, *method;
    int no_startup, quiet;
    int su_method; /* br_su_method */
} args;

/* The options, checked, into the search's settings; BR_EXIT_OK or a usage
 * error's status. */
static int options(args *a, br_corner_search *s)
{
    long v;
    if (br_cli_startup_method("corners", a->method, &a->su_method))
        return BR_EXIT_INPUT;
    br_corner_search_set_startup(s, !a->no_startup);
    if (a->threads) {
        if (br_cli_long("corners", "threads", a->threads, 1, BR_THREADS_MAX, &v))
            return BR_EXIT_INPUT;
        br_corner_search_set_threads(s, (int)v);
    }
    if (a->exhaustive) {
        if (br_cli_long("corners", "exhaustive", a->exhaustive, 0, BR_CORNERS_EXHAUSTIVE_MAX, &v))
            return BR_EXIT_INPUT;
        br_corner_search_set_exhaustive(s, (int)v);
    }
    if (a->limit) {
        if (br_cli_long("corners", "solver-limit", a->limit, 1, BR_SOLVER_LIMIT_MAX, &v))
            return BR_EXIT_INPUT;
        br_corner_search_set_solver_limit(s, v);
    }
    return BR_EXIT_OK;
}

typedef struct outputs {
    br_corner_search *s;
    br_text *text, *xml, *html;
} outputs;

static void outputs_free(outputs *o)
{
    br_corner_search_free(o->s);
    br_text_free(o->text);
    br_text_free(o->xml);
    br_text_free(o->html);
}

static int compute(const char *path, const args *a, outputs *o, br_error *err)
{
    o->text = br_text_create();
    o->xml = a->xml ? br_text_create() : NULL;
    o->html = a->report ? br_text_create() : NULL;
    if (!o->text || (a->xml && !o->xml) || (a->report && !o->html))
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    br_design *d = NULL;
    int rc = br_design_load(path, &d, err);
    if (rc == BR_OK) {
        br_design_set_startup_method(d, a->su_method);
        rc = br_corner_search_run(o->s, d, err);
    }
    br_design_free(d);
    if (rc == BR_OK)
        rc = br_corner_search_render(o->s, BR_FORMAT_TEXT, o->text, err);
    if (rc == BR_OK && a->xml)
        rc = br_corner_search_render(o->s, BR_FORMAT_XML, o->xml, err);
    if (rc == BR_OK && a->report)
        rc = br_corner_search_render(o->s, BR_FORMAT_HTML, o->html, err);
    return rc;
}

/* The files first, then the report (unless a file took stdout). */
static int write_all(const args *a, const outputs *o)
{
    const br_cli_file files[] = {{o->xml, a->xml}, {o->html, a->report}};
    return br_cli_write(files, 2, o->text, a->quiet, VERDICT, 0);
}

int cmd_corners(int argc, char **argv)
{
    args a = {0};
    const br_opt opts[] = {
        {BR_OPT_STRING, "xml", "PATH", &a.xml, "also write the results as XML to PATH (- stdout)"},
        {BR_OPT_STRING, "report", "PATH", &a.report,
         "also write a self-contained HTML report to PATH (- stdout)"},
        {BR_OPT_STRING, "exhaustive", "N", &a.exhaustive,
         "try every corner up to N toleranced parameters (default 10, at most 16)"},
        {BR_OPT_FLAG, "no-startup", NULL, &a.no_startup,
         "skip the start-up criteria (no cold starts)"},
        {BR_OPT_STRING, "solver-limit", "N", &a.limit,
         "steady-state solver: at most N Newton iterations and plain periods a point"},
        {BR_OPT_STRING, "startup-method", "M", &a.method, BR_STARTUP_METHOD_HELP},
        {BR_OPT_STRING, "threads", "N", &a.threads, "worker threads (default: one per processor)"},
        {BR_OPT_FLAG, "quiet", NULL, &a.quiet, BR_QUIET_HELP},
        {BR_OPT_END, NULL, NULL, NULL, NULL},
    };
    const br_cmd_doc doc = {"corners", "FILE", ABOUT, opts, 1};
    char *pos[1];
    int parsed = br_cli_parse(&doc, argc, argv, pos);
    if (parsed != 0)
        return br_cli_parse_status(parsed);
    outputs o = {br_corner_search_create(), NULL, NULL, NULL};
    const char *const out[] = {a.xml, a.report}, *const names[] = {"xml", "report"};
    if (!o.s) {
        fprintf(stderr, "bootrung: out of memory\n");
        return BR_EXIT_INPUT;
    }
    if (options(&a, o.s) != BR_EXIT_OK ||
        br_cli_outputs("corners", names, out, 2, (const char *const *)pos, 1) != BR_EXIT_OK) {
        outputs_free(&o);
        return BR_EXIT_INPUT;
    }
    br_error err;
    br_error_clear(&err);
    br_cli_run lr;
    br_cli_run_begin(&lr, "corners", a.quiet);
    br_corner_search_set_progress(o.s, br_cli_run_progress, br_cli_run_stop, &lr);
    int rc = compute(pos[0], &a, &o, &err);
    int status = br_cli_run_commit(&lr);
    if (status == BR_EXIT_OK)
        status = rc != BR_OK ? br_cli_fail(&err, pos[0]) : write_all(&a, &o);
    br_cli_run_end(&lr);
    br_corner_search_set_progress(o.s, NULL, NULL, NULL);
    int res = BR_RESULT_PASS;
    if (status == BR_EXIT_OK && br_corner_result(o.s, &res) == BR_OK && res != BR_RESULT_PASS)
        status = res == BR_RESULT_FAIL ? BR_EXIT_FAIL : BR_EXIT_UNDETERMINED;
    outputs_free(&o);
    return status;
}

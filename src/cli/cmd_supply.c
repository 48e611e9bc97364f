/* cmd_supply.c - `bootrung supply FILE`: the smallest current limit and
 * the supply voltage window at which the chain still starts and holds at
 * its worst corners. */
#include "cli.h"

#include "bootrung/parts.h"

#include <stdio.h>

static const char ABOUT[] =
    "What the chain of design FILE asks of its supply. Three answers, each\n"
    "judged by the whole verdict (cold start included) at the design's worst\n"
    "corners: the nominal point and, for each criterion, every toleranced\n"
    "parameter at the limit that lowers that criterion's margin (from the\n"
    "one-at-a-time sensitivities). The smallest current limit, searched from\n"
    "above the peak an unlimited supply gives down to half what the chain needs\n"
    "at least (its running draw, or an unlimited start-up's charge over the\n"
    "start-up limit), in the design's limit mode (constant current when it gives\n"
    "none; the model needs the supply's bypass and resistance for it), to 1 %;\n"
    "the lowest\n"
    "and the highest supply voltage, from the design's down to half of it and\n"
    "up to twice it, with the design's current limit, to 10 mV. Each answer\n"
    "names what fails just beyond it, and where. Slow: every value judged is a\n"
    "cold start and a steady state at every corner.\n"
    "Exit status 0 when the design's own supply passes at every corner, 1 when\n"
    "not, 3 when a corner is undetermined there, 2 for bad input.\n";

static const char *const VERDICT[] = {"verdict:", NULL};

typedef struct args {
    const char *xml, *report, *threads, *method;
    int quiet;
    int su_method; /* br_su_method */
    int nthreads;  /* --threads (0: one per processor) */
} args;

typedef struct outputs {
    br_design *d;
    br_supply_study *w;
    br_text *text, *xml, *html;
} outputs;

static void outputs_free(outputs *o)
{
    br_supply_study_free(o->w);
    br_design_free(o->d);
    br_text_free(o->text);
    br_text_free(o->xml);
    br_text_free(o->html);
}

static int out_of_memory(br_error *err)
{
    br_error_clear(err);
    err->code = BR_ENOMEM;
    snprintf(err->msg, sizeof err->msg, "out of memory");
    return BR_ENOMEM;
}

static int compute(const char *path, const args *a, br_cli_run *lr, outputs *o, br_error *err)
{
    int want_xml = a->xml != NULL;
    o->text = br_text_create();
    o->xml = want_xml ? br_text_create() : NULL;
    o->html = a->report ? br_text_create() : NULL;
    o->w = br_supply_study_create();
    if (!o->text || (want_xml && !o->xml) || (a->report && !o->html) || !o->w)
        return out_of_memory(err);
    br_supply_study_set_threads(o->w, a->nthreads);
    br_supply_study_set_progress(o->w, br_cli_run_progress, br_cli_run_stop, lr);
    int rc = br_design_load(path, &o->d, err);
    if (rc == BR_OK && a->method) /* every cold start of the search, by this method */
        br_design_set_startup_method(o->d, a->su_method);
    if (rc == BR_OK)
        rc = br_supply_study_run(o->w, o->d, err);
    if (rc == BR_OK)
        rc = br_supply_study_render(o->w, BR_FORMAT_TEXT, o->text, err);
    if (rc == BR_OK && want_xml)
        rc = br_supply_study_render(o->w, BR_FORMAT_XML, o->xml, err);
    if (rc == BR_OK && a->report)
        rc = br_supply_study_render(o->w, BR_FORMAT_HTML, o->html, err);
    return rc;
}

static int write_all(const args *a, const outputs *o)
{
    const br_cli_file files[] = {{o->xml, a->xml}, {o->html, a->report}};
    return br_cli_write(files, 2, o->text, a->quiet, VERDICT, 0);
}

int cmd_supply(int argc, char **argv)
{
    args a = {0};
    const br_opt opts[] = {
        {BR_OPT_STRING, "xml", "PATH", &a.xml, "also write the results as XML to PATH (- stdout)"},
        {BR_OPT_STRING, "report", "PATH", &a.report,
         "also write a self-contained HTML report to PATH (- stdout)"},
        {BR_OPT_STRING, "threads", "N", &a.threads, "worker threads (default: one per processor)"},
        {BR_OPT_STRING, "startup-method", "M", &a.method, BR_STARTUP_METHOD_HELP},
        {BR_OPT_FLAG, "quiet", NULL, &a.quiet, BR_QUIET_HELP},
        {BR_OPT_END, NULL, NULL, NULL, NULL},
    };
    const br_cmd_doc doc = {"supply", "FILE", ABOUT, opts, 1};
    char *pos[1];
    int parsed = br_cli_parse(&doc, argc, argv, pos);
    if (parsed != 0)
        return br_cli_parse_status(parsed);
    long v;
    if (a.threads && br_cli_long("supply", "threads", a.threads, 1, BR_STUDY_THREADS_MAX, &v))
        return BR_EXIT_INPUT;
    a.nthreads = a.threads ? (int)v : 0;
    if (br_cli_startup_method("supply", a.method, &a.su_method))
        return BR_EXIT_INPUT;
    const char *const out[] = {a.xml, a.report}, *const names[] = {"xml", "report"};
    if (br_cli_outputs("supply", names, out, 2, (const char *const *)pos, 1) != BR_EXIT_OK)
        return BR_EXIT_INPUT;
    outputs o = {0};
    br_error err;
    br_error_clear(&err);
    br_cli_run lr;
    br_cli_run_begin(&lr, "supply", a.quiet);
    int rc = compute(pos[0], &a, &lr, &o, &err);
    int status = br_cli_run_commit(&lr);
    if (status == BR_EXIT_OK)
        status = rc != BR_OK ? br_cli_fail(&err, pos[0]) : write_all(&a, &o);
    br_cli_run_end(&lr);
    if (status == BR_EXIT_OK) {
        int result = BR_RESULT_UNDETERMINED;
        br_supply_result(o.w, &result);
        status = result == BR_RESULT_PASS   ? BR_EXIT_OK
                 : result == BR_RESULT_FAIL ? BR_EXIT_FAIL
                                            : BR_EXIT_UNDETERMINED;
    }
    outputs_free(&o);
    return status;
}

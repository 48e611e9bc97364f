/* analysis_verb.c - what `startup`, `steady` and `analyze` share: load
 * the design, run the analyses, print the report, write the --xml and
 * --csv files, and turn the verdict into the exit status. */
#include "cli.h"

#include "core/error.h"
#include "report/results.h"

#include <string.h>

#ifndef BR_VERSION
#define BR_VERSION "unknown"
#endif

/* Outputs of one run, owned together so one function frees them. */
typedef struct outputs {
    br_text *text, *xml, *csv; /* xml/csv NULL when not asked for */
    br_results *res;
} outputs;

static void outputs_free(outputs *o)
{
    br_text_free(o->text);
    br_text_free(o->xml);
    br_text_free(o->csv);
    br_results_free(o->res);
}

static int outputs_alloc(outputs *o, const char *xml, const char *csv, br_error *err)
{
    o->text = br_text_create();
    o->xml = xml ? br_text_create() : NULL;
    o->csv = csv ? br_text_create() : NULL;
    o->res = br_results_create();
    if (!o->text || !o->res || (xml && !o->xml) || (csv && !o->csv))
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    return BR_OK;
}

/* Load, build, run and render everything in memory; nothing is written
 * unless all of it succeeded. */
static int compute(const char *path, const char *verb, int parts, const br_steady_opts *so,
                   outputs *o, br_error *err)
{
    br_design *d = NULL;
    br_chain *c = NULL;
    int rc = br_design_load(path, &d, err);
    if (rc == BR_OK)
        rc = br_chain_build(d, &c, err);
    if (rc == BR_OK)
        rc = br_results_run(o->res, c, verb, parts, so, o->csv, err);
    if (rc == BR_OK)
        rc = br_results_text(o->res, o->text, err);
    if (rc == BR_OK && o->xml)
        rc = br_results_xml(o->res, BR_VERSION, o->xml, err);
    o->res->c = NULL; /* the chain goes now; the verdict stays */
    br_chain_free(c);
    br_design_free(d);
    return rc;
}

static int is_stdout(const char *path)
{
    return path && strcmp(path, "-") == 0;
}

/* Files first: a failure to write them is reported before any result
 * reaches stdout, so a script never mistakes a partial run for a whole.
 * A file sent to stdout ("-") takes the text report's place. */
static int write_all(const outputs *o, const char *xml, const char *csv)
{
    int status = BR_EXIT_OK;
    if (xml)
        status = br_cli_save(o->xml, xml);
    if (status == BR_EXIT_OK && csv)
        status = br_cli_save(o->csv, csv);
    if (status == BR_EXIT_OK && !is_stdout(xml) && !is_stdout(csv))
        status = br_cli_emit(o->text);
    return status;
}

/* --solver-limit N: fewer Newton iterations (never more than the default)
 * and N periods of plain simulation; what the solver cannot settle within
 * them is reported undetermined, never a pass. */
static int solver_limit(const char *verb, const char *text, br_steady_opts *so)
{
    long n;
    if (br_cli_long(verb, "solver-limit", text, 1, 100000, &n) != BR_EXIT_OK)
        return BR_EXIT_INPUT;
    so->max_iter = n < so->max_iter ? (int)n : so->max_iter;
    so->max_plain = n;
    return BR_EXIT_OK;
}

int br_cli_analysis(int argc, char **argv, const char *about, int parts)
{
    const char *xml = NULL, *csv = NULL, *limit = NULL;
    const br_opt opts[] = {
        {BR_OPT_STRING, "solver-limit", "N", &limit,
         "steady-state solver: at most N Newton iterations and N plain periods"},
        /* "-" for either sends it to stdout in place of the text report */
        {BR_OPT_STRING, "xml", "PATH", &xml, "also write the results as XML to PATH (- stdout)"},
        {BR_OPT_STRING, "csv", "PATH", &csv,
         "also write the time series as CSV to PATH (- stdout)"},
        {BR_OPT_END, NULL, NULL, NULL, NULL},
    };
    const br_cmd_doc doc = {argv[0], "FILE", about, opts, 1};
    char *pos[1];
    int parsed = br_cli_parse(&doc, argc, argv, pos);
    if (parsed != 0)
        return br_cli_parse_status(parsed);
    if (is_stdout(xml) && is_stdout(csv))
        return br_cli_usage_error(argv[0], "--xml and --csv cannot both go to standard output");
    br_steady_opts so;
    br_steady_opts_default(&so);
    if (limit && solver_limit(argv[0], limit, &so) != BR_EXIT_OK)
        return BR_EXIT_INPUT;
    outputs o = {0};
    br_error err;
    br_error_clear(&err);
    int status;
    if (outputs_alloc(&o, xml, csv, &err) != BR_OK)
        status = br_cli_fail(&err, NULL);
    else if (compute(pos[0], argv[0], parts, &so, &o, &err) != BR_OK)
        status = br_cli_fail(&err, pos[0]);
    else
        status = write_all(&o, xml, csv);
    if (status == BR_EXIT_OK && br_results_failed(o.res))
        status = BR_EXIT_FAIL;
    else if (status == BR_EXIT_OK && br_results_undetermined(o.res))
        status = BR_EXIT_UNDETERMINED;
    outputs_free(&o);
    return status;
}

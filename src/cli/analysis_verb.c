/* analysis_verb.c - what `startup`, `steady` and `analyze` share: load
 * the design, run the analyses, print the report, write the --xml and
 * --csv files, and turn the verdict into the exit status. */
#include "cli.h"

#include "bootrung/analysis.h"
#include "bootrung/report.h"

#include <string.h>

/* The files a run writes (NULL when not asked for). */
typedef struct paths {
    const char *xml, *csv, *report, *plot;
} paths;

/* Outputs of one run, owned together so one function frees them. */
typedef struct outputs {
    br_text *text, *xml, *csv, *html, *svg; /* NULL when not asked for */
    br_analysis *a;
} outputs;

static void outputs_free(outputs *o)
{
    br_text_free(o->text);
    br_text_free(o->xml);
    br_text_free(o->csv);
    br_text_free(o->html);
    br_text_free(o->svg);
    br_analysis_free(o->a);
}

static int outputs_alloc(outputs *o, const paths *p, br_error *err)
{
    o->text = br_text_create();
    o->xml = p->xml ? br_text_create() : NULL;
    o->csv = p->csv ? br_text_create() : NULL;
    o->html = p->report ? br_text_create() : NULL;
    o->svg = p->plot ? br_text_create() : NULL;
    o->a = br_analysis_create();
    if (!o->text || !o->a || (p->xml && !o->xml) || (p->csv && !o->csv) ||
        (p->report && !o->html) || (p->plot && !o->svg))
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    /* the series only for what plots them; the CSV only when asked */
    br_analysis_set_series(o->a, o->html || o->svg);
    br_analysis_set_csv(o->a, o->csv != NULL);
    return BR_OK;
}

/* The forms asked for, rendered from the analysis. */
static int render(const outputs *o, br_error *err)
{
    int rc = br_analysis_render(o->a, BR_FORMAT_TEXT, o->text, err);
    if (rc == BR_OK && o->xml)
        rc = br_analysis_render(o->a, BR_FORMAT_XML, o->xml, err);
    if (rc == BR_OK && o->csv)
        rc = br_analysis_render(o->a, BR_FORMAT_CSV, o->csv, err);
    if (rc == BR_OK && o->html)
        rc = br_analysis_render(o->a, BR_FORMAT_HTML, o->html, err);
    if (rc == BR_OK && o->svg)
        rc = br_analysis_render(o->a, BR_FORMAT_SVG, o->svg, err);
    return rc;
}

/* Load, build, run and render everything in memory; nothing is written
 * unless all of it succeeded. */
static int compute(const char *path, int parts, int su_method, outputs *o, br_error *err)
{
    br_design *d = NULL;
    br_chain *c = NULL;
    int rc = br_design_load(path, &d, err);
    if (rc == BR_OK) {
        br_design_set_startup_method(d, su_method);
        rc = br_chain_build(d, &c, err);
    }
    if (rc == BR_OK)
        rc = br_analysis_run(o->a, c, parts, err);
    br_chain_free(c); /* the analysis keeps what its reports need */
    br_design_free(d);
    return rc == BR_OK ? render(o, err) : rc;
}

/* The files and the report together, all or none (br_cli_write), so a
 * script never mistakes a partial run for a whole.  A file sent to stdout
 * ("-") takes the text report's place. */
static int write_all(const outputs *o, const paths *p, int quiet)
{
    /* --quiet: the verdict of steady and analyze, or how the start-up ended */
    static const char *const verdict[] = {"verdict:", "start-up complete", "start-up INCOMPLETE",
                                          "start-up UNDETERMINED", NULL};
    const br_cli_file files[] = {
        {o->xml, p->xml}, {o->csv, p->csv}, {o->html, p->report}, {o->svg, p->plot}};
    return br_cli_write(files, 4, o->text, quiet, verdict, 1);
}

/* Compute, then write unless a signal stopped the run.  Every phase takes
 * signals (a steady state alone can run for seconds on an odd design);
 * the bar follows the cold start, the part whose length is known. */
static int run(const char *path, const char *verb, int parts, int su_method, outputs *o,
               const paths *p, int quiet)
{
    br_error err;
    br_error_clear(&err);
    br_cli_run lr;
    br_cli_run_begin(&lr, verb, quiet);
    br_analysis_set_progress(o->a, br_cli_run_progress, br_cli_run_stop, &lr);
    int rc = compute(path, parts, su_method, o, &err);
    int stop = br_cli_run_commit(&lr);
    int status = stop ? stop : rc != BR_OK ? br_cli_fail(&err, path) : write_all(o, p, quiet);
    br_cli_run_end(&lr);
    br_analysis_set_progress(o->a, NULL, NULL, NULL);
    return status;
}

/* --solver-limit N: fewer Newton iterations (never more than the default)
 * and N periods of plain simulation; what the solver cannot settle within
 * them is reported undetermined, never a pass. */
static int solver_limit(const char *verb, const char *text, long *n)
{
    *n = 0; /* the solver's defaults */
    return text ? br_cli_long(verb, "solver-limit", text, 1, BR_SOLVER_LIMIT_MAX, n) : BR_EXIT_OK;
}

/* The verb's options: --plot only where there is one plot (startup,
 * steady), --startup-method where a start-up runs, --pack and --catalog
 * on analyze. */
static int verb_options(br_opt *o, int parts, paths *p, int *quiet, const char **limit,
                        const char **method, const char **pack, const char **catalog)
{
    int n = 0;
    /* "-" for any sends it to stdout in place of the text report */
    o[n++] = (br_opt){BR_OPT_STRING, "xml", "PATH", &p->xml,
                      "also write the results as XML to PATH (- stdout)"};
    o[n++] = (br_opt){BR_OPT_STRING, "csv", "PATH", &p->csv,
                      "also write the time series as CSV to PATH (- stdout)"};
    o[n++] = (br_opt){BR_OPT_STRING, "report", "PATH", &p->report,
                      "also write a self-contained HTML report with plots to PATH"};
    if (parts != BR_PART_ALL) /* analyze has many plots: they are in the report */
        o[n++] = (br_opt){BR_OPT_STRING, "plot", "PATH", &p->plot,
                          parts == BR_PART_STARTUP
                              ? "also plot the rail waveforms from cold as SVG to PATH"
                              : "also plot the steady ripple (a line cycle: the envelope) as SVG "
                                "to PATH"};
    if (parts == BR_PART_ALL) {
        o[n++] =
            (br_opt){BR_OPT_STRING, "pack", "DIR", pack,
                     "write the sign-off pack (every verb's pages and files) to new folder DIR"};
        o[n++] = (br_opt){BR_OPT_STRING, "catalog", "PARTS.xml", catalog,
                          "with --pack: the catalog pick chooses from"};
    }
    o[n++] = (br_opt){BR_OPT_FLAG, "quiet", NULL, quiet, BR_QUIET_HELP};
    o[n++] = (br_opt){BR_OPT_STRING, "solver-limit", "N", limit,
                      "steady-state solver: at most N Newton iterations and N plain periods"};
    if (parts != BR_PART_STEADY) /* no start-up: no method for it */
        o[n++] = (br_opt){BR_OPT_STRING, "startup-method", "M", method, BR_STARTUP_METHOD_HELP};
    o[n] = (br_opt){BR_OPT_END, NULL, NULL, NULL, NULL};
    return n;
}

/* --pack runs every verb with its defaults, into files of its own. */
static int pack_usage(const paths *p, const char *limit, const char *method, const char *pack,
                      const char *catalog)
{
    if (catalog && !pack)
        return br_cli_usage_error("analyze", "--catalog goes with --pack");
    if (pack && (p->xml || p->csv || p->report || limit || method))
        return br_cli_usage_error("analyze", "--pack writes every file itself and runs every "
                                             "verb with its defaults, expected it without --xml, "
                                             "--csv, --report, --solver-limit, --startup-method");
    return BR_EXIT_OK;
}

int br_cli_analysis(int argc, char **argv, const char *about, int parts)
{
    paths p = {0};
    int quiet = 0;
    const char *limit = NULL, *method = NULL, *pack = NULL, *catalog = NULL;
    int su_method = BR_SU_ENVELOPE;
    br_opt opts[12];
    verb_options(opts, parts, &p, &quiet, &limit, &method, &pack, &catalog);
    const br_cmd_doc doc = {argv[0], "FILE", about, opts, 1};
    char *pos[1];
    int parsed = br_cli_parse(&doc, argc, argv, pos);
    if (parsed != 0)
        return br_cli_parse_status(parsed);
    if (pack_usage(&p, limit, method, pack, catalog) != BR_EXIT_OK)
        return BR_EXIT_INPUT;
    if (pack)
        return br_cli_pack(pack, pos[0], catalog, quiet);
    const char *const out[] = {p.xml, p.csv, p.report, p.plot};
    const char *const names[] = {"xml", "csv", "report", "plot"};
    if (br_cli_outputs(argv[0], names, out, 4, (const char *const *)pos, 1) != BR_EXIT_OK)
        return BR_EXIT_INPUT;
    long limit_n;
    if (solver_limit(argv[0], limit, &limit_n) != BR_EXIT_OK ||
        br_cli_startup_method(argv[0], method, &su_method) != BR_EXIT_OK)
        return BR_EXIT_INPUT;
    outputs o = {0};
    br_error err;
    br_error_clear(&err);
    int status, verdict = BR_RESULT_PASS;
    if (outputs_alloc(&o, &p, &err) != BR_OK)
        status = br_cli_fail(&err, NULL);
    else if (br_analysis_set_solver_limit(o.a, limit_n) != BR_OK)
        status = br_cli_usage_error(argv[0], "--solver-limit: out of range");
    else
        status = run(pos[0], argv[0], parts, su_method, &o, &p, quiet);
    if (status == BR_EXIT_OK && br_verdict_result(o.a, &verdict) == BR_OK)
        status = verdict == BR_RESULT_FAIL           ? BR_EXIT_FAIL
                 : verdict == BR_RESULT_UNDETERMINED ? BR_EXIT_UNDETERMINED
                                                     : BR_EXIT_OK;
    outputs_free(&o);
    return status;
}

/* analysis_verb.c - what `startup`, `steady` and `analyze` share: load
 * the design, run the analyses, print the report, write the --xml and
 * --csv files, and turn the verdict into the exit status. */
#include "cli.h"

#include "core/error.h"
#include "model/design.h"
#include "report/results.h"

#include <string.h>

#ifndef BR_VERSION
#define BR_VERSION "unknown"
#endif

/* The files a run writes (NULL when not asked for). */
typedef struct paths {
    const char *xml, *csv, *report, *plot;
} paths;

/* Outputs of one run, owned together so one function frees them. */
typedef struct outputs {
    br_text *text, *xml, *csv, *html, *svg; /* NULL when not asked for */
    br_results *res;
    br_results_traces tr; /* kept for the report and the plot */
} outputs;

static void outputs_free(outputs *o)
{
    br_text_free(o->text);
    br_text_free(o->xml);
    br_text_free(o->csv);
    br_text_free(o->html);
    br_text_free(o->svg);
    br_results_free(o->res);
    br_results_traces_release(&o->tr);
}

static int outputs_alloc(outputs *o, const paths *p, br_error *err)
{
    o->text = br_text_create();
    o->xml = p->xml ? br_text_create() : NULL;
    o->csv = p->csv ? br_text_create() : NULL;
    o->html = p->report ? br_text_create() : NULL;
    o->svg = p->plot ? br_text_create() : NULL;
    o->res = br_results_create();
    if (!o->text || !o->res || (p->xml && !o->xml) || (p->csv && !o->csv) ||
        (p->report && !o->html) || (p->plot && !o->svg))
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    return BR_OK;
}

/* Load, build, run and render everything in memory; nothing is written
 * unless all of it succeeded. */
static int compute(const char *path, const char *verb, int parts, const br_steady_opts *so,
                   int su_method, outputs *o, br_error *err)
{
    br_design *d = NULL;
    br_chain *c = NULL;
    int rc = br_design_load(path, &d, err);
    if (rc == BR_OK) {
        br_design_set_startup_method(d, su_method);
        rc = br_chain_build(d, &c, err);
    }
    br_results_traces *tr = o->html || o->svg ? &o->tr : NULL;
    if (rc == BR_OK)
        rc = br_results_run_traced(o->res, c, verb, parts, so, o->csv, tr, err);
    if (rc == BR_OK)
        rc = br_results_text(o->res, o->text, err);
    if (rc == BR_OK && o->xml)
        rc = br_results_xml(o->res, BR_VERSION, o->xml, err);
    if (rc == BR_OK && o->html)
        rc = br_results_html(o->res, &o->tr, o->html, err);
    if (rc == BR_OK && o->svg)
        rc = br_results_plot(o->res, &o->tr, o->svg, err);
    o->res->c = NULL; /* the chain goes now; the verdict stays */
    br_chain_free(c);
    br_design_free(d);
    return rc;
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
static int run(const char *path, const char *verb, int parts, const br_steady_opts *so,
               int su_method, outputs *o, const paths *p, int quiet)
{
    br_error err;
    br_error_clear(&err);
    br_cli_run lr;
    br_cli_run_begin(&lr, verb, quiet);
    o->res->progress = BR_CLI_HOOK(&lr);
    int rc = compute(path, verb, parts, so, su_method, o, &err);
    int stop = br_cli_run_commit(&lr);
    int status = stop ? stop : rc != BR_OK ? br_cli_fail(&err, path) : write_all(o, p, quiet);
    br_cli_run_end(&lr);
    o->res->progress = NULL;
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
    if (parts != BR_RUN_ALL) /* analyze has many plots: they are in the report */
        o[n++] = (br_opt){BR_OPT_STRING, "plot", "PATH", &p->plot,
                          parts == BR_RUN_STARTUP
                              ? "also plot the rail waveforms from cold as SVG to PATH"
                              : "also plot the steady ripple (a line cycle: the envelope) as SVG "
                                "to PATH"};
    if (parts == BR_RUN_ALL) {
        o[n++] =
            (br_opt){BR_OPT_STRING, "pack", "DIR", pack,
                     "write the sign-off pack (every verb's pages and files) to new folder DIR"};
        o[n++] = (br_opt){BR_OPT_STRING, "catalog", "PARTS.xml", catalog,
                          "with --pack: the catalog pick chooses from"};
    }
    o[n++] = (br_opt){BR_OPT_FLAG, "quiet", NULL, quiet, BR_QUIET_HELP};
    o[n++] = (br_opt){BR_OPT_STRING, "solver-limit", "N", limit,
                      "steady-state solver: at most N Newton iterations and N plain periods"};
    if (parts != BR_RUN_STEADY) /* no start-up: no method for it */
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
    br_steady_opts so;
    br_steady_opts_default(&so);
    if ((limit && solver_limit(argv[0], limit, &so) != BR_EXIT_OK) ||
        br_cli_startup_method(argv[0], method, &su_method) != BR_EXIT_OK)
        return BR_EXIT_INPUT;
    outputs o = {0};
    br_error err;
    br_error_clear(&err);
    int status;
    if (outputs_alloc(&o, &p, &err) != BR_OK)
        status = br_cli_fail(&err, NULL);
    else
        status = run(pos[0], argv[0], parts, &so, su_method, &o, &p, quiet);
    if (status == BR_EXIT_OK && br_results_failed(o.res))
        status = BR_EXIT_FAIL;
    else if (status == BR_EXIT_OK && br_results_undetermined(o.res))
        status = BR_EXIT_UNDETERMINED;
    outputs_free(&o);
    return status;
}

/* cmd_window.c - `bootrung window FILE`: how far duty and frequency can
 * move before a criterion fails, the hold-up time, and (with --startup)
 * the start-up window. */
#include "cli.h"

#include "bootrung/analysis.h"
#include "bootrung/report.h"

#include <stdlib.h>

static const char ABOUT[] =
    "How far the design FILE can move from its operating point. In periodic\n"
    "steady state, every driver supply must stay above UVLO falling, above the\n"
    "design's minimum drive and below its gate maximum, in each current direction\n"
    "the design asks for. Reported: the lowest and highest duty at the design\n"
    "frequency (searched over every duty the dead time allows, to 0.1 % of duty)\n"
    "and the lowest and highest switching frequency at the design duty (searched\n"
    "from a hundredth to a hundred times the design frequency unless --fmin/--fmax\n"
    "say otherwise, to 0.5 %), with the rail and criterion that fail at each\n"
    "limit; the hold-up time once switching stops (every switch off); and with\n"
    "--startup the lowest and highest duty and frequency at which the cold start\n"
    "completes within the design's start-up limit, searched over the same ranges\n"
    "(slow: every point is a cold start).\n"
    "On a design with an AC line cycle the steady-state limits are the largest\n"
    "peak current (searched from 0 to four times the design's, to 1 % of it) and\n"
    "the lowest line frequency (a tenth to four times the design's unless\n"
    "--fmin/--fmax say otherwise, to 1 %) at which every rail holds over the whole\n"
    "line cycle, each at the design's other value, with the rail and the line\n"
    "phase that fail beyond them; every point is a line cycle's steady state.\n"
    "Exit status 0 when the design point holds, 1 when not, 3 when no periodic\n"
    "steady state was found there, 2 for bad input.\n";

/* A frequency option, or 0 when not given. */
static int parse_freq(const char *opt, const char *text, double *out)
{
    br_error err;
    br_error_clear(&err);
    *out = 0.0;
    if (!text)
        return BR_EXIT_OK;
    if (br_unit_parse(text, BR_KIND_FREQUENCY, out, &err) != BR_OK || !(*out > 0))
        return br_cli_usage_error("window", "--%s '%s': %s", opt, text,
                                  err.msg[0] ? err.msg : "expected a frequency above 0");
    return BR_EXIT_OK;
}

/* The files asked for (NULL when not). */
typedef struct paths {
    const char *xml, *report, *plot;
} paths;

typedef struct outputs {
    br_text *text, *xml, *html, *svg;
    br_window_study *w;
} outputs;

static void outputs_free(outputs *o)
{
    br_text_free(o->text);
    br_text_free(o->xml);
    br_text_free(o->html);
    br_text_free(o->svg);
    br_window_study_free(o->w);
}

/* Load, analyse and render everything in memory. */
static int compute(const char *path, int su_method, outputs *o, br_error *err)
{
    br_design *d = NULL;
    int rc = br_design_load(path, &d, err);
    if (rc == BR_OK) {
        br_design_set_startup_method(d, su_method);
        rc = br_window_study_run(o->w, d, err);
    }
    br_design_free(d);
    if (rc == BR_OK)
        rc = br_window_study_render(o->w, BR_FORMAT_TEXT, o->text, err);
    if (rc == BR_OK && o->xml)
        rc = br_window_study_render(o->w, BR_FORMAT_XML, o->xml, err);
    if (rc == BR_OK && o->html)
        rc = br_window_study_render(o->w, BR_FORMAT_HTML, o->html, err);
    if (rc == BR_OK && o->svg)
        rc = br_window_study_render(o->w, BR_FORMAT_SVG, o->svg, err);
    return rc;
}

/* The files and the report, all or none (unless a file took stdout). */
static int write_all(const outputs *o, const paths *p, int quiet)
{
    static const char *const verdict[] = {BR_WINDOW_VERDICT, NULL};
    const br_cli_file files[] = {{o->xml, p->xml}, {o->html, p->report}, {o->svg, p->plot}};
    return br_cli_write(files, 3, o->text, quiet, verdict, 0);
}

/* The window's settings, then the run. */
static int run(const char *path, const paths *p, int startup, double fmin, double fmax,
               int su_method, int quiet)
{
    outputs o = {br_text_create(), p->xml ? br_text_create() : NULL,
                 p->report ? br_text_create() : NULL, p->plot ? br_text_create() : NULL,
                 br_window_study_create()};
    br_error err;
    br_error_clear(&err);
    int status, res = BR_RESULT_PASS;
    if (!o.text || !o.w || (p->xml && !o.xml) || (p->report && !o.html) || (p->plot && !o.svg) ||
        br_window_study_set_startup(o.w, startup) != BR_OK ||
        br_window_study_set_range(o.w, fmin, fmax) != BR_OK) {
        br_error_set(&err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
        status = br_cli_fail(&err, NULL);
    } else {
        br_cli_run lr;
        br_cli_run_begin(&lr, "window", quiet);
        br_window_study_set_progress(o.w, br_cli_run_progress, br_cli_run_stop, &lr);
        int rc = compute(path, su_method, &o, &err);
        status = br_cli_run_commit(&lr);
        if (status == BR_EXIT_OK && rc == BR_EUSAGE) /* an option does not fit the design */
            status = br_cli_usage_error("window", "%s: %s", err.field, err.msg);
        else if (status == BR_EXIT_OK)
            status = rc != BR_OK ? br_cli_fail(&err, path) : write_all(&o, p, quiet);
        if (status == BR_EXIT_OK && br_window_result(o.w, &res) == BR_OK &&
            res != BR_RESULT_PASS) /* no steady state found: not a failure */
            status = res == BR_RESULT_UNDETERMINED ? BR_EXIT_UNDETERMINED : BR_EXIT_FAIL;
        br_cli_run_end(&lr);
        br_window_study_set_progress(o.w, NULL, NULL, NULL);
    }
    outputs_free(&o);
    return status;
}

int cmd_window(int argc, char **argv)
{
    const char *fmin = NULL, *fmax = NULL;
    paths p = {0};
    const char *method = NULL;
    int startup = 0, quiet = 0, su_method = 0;
    const br_opt opts[] = {
        {BR_OPT_STRING, "xml", "PATH", &p.xml, "also write the results as XML to PATH (- stdout)"},
        {BR_OPT_STRING, "report", "PATH", &p.report,
         "also write a self-contained HTML report with the plot to PATH"},
        {BR_OPT_STRING, "plot", "PATH", &p.plot,
         "also plot the worst margin along duty and frequency as SVG to PATH"},
        {BR_OPT_STRING, "fmin", "FREQ", &fmin,
         "lowest frequency searched (default fsw/100; a line cycle's: line/10)"},
        {BR_OPT_STRING, "fmax", "FREQ", &fmax,
         "highest frequency searched (default fsw*100 within the dead time; line*4)"},
        {BR_OPT_FLAG, "startup", NULL, &startup, "also the start-up window (slow)"},
        {BR_OPT_STRING, "startup-method", "M", &method, BR_STARTUP_METHOD_HELP},
        {BR_OPT_FLAG, "quiet", NULL, &quiet, BR_QUIET_HELP},
        {BR_OPT_END, NULL, NULL, NULL, NULL},
    };
    const br_cmd_doc doc = {"window", "FILE", ABOUT, opts, 1};
    char *pos[1];
    int parsed = br_cli_parse(&doc, argc, argv, pos);
    if (parsed != 0)
        return br_cli_parse_status(parsed);
    double lo, hi;
    if (parse_freq("fmin", fmin, &lo) != BR_EXIT_OK ||
        parse_freq("fmax", fmax, &hi) != BR_EXIT_OK ||
        br_cli_startup_method("window", method, &su_method) != BR_EXIT_OK)
        return BR_EXIT_INPUT;
    const char *const out[] = {p.xml, p.report, p.plot};
    const char *const names[] = {"xml", "report", "plot"};
    if (br_cli_outputs("window", names, out, 3, (const char *const *)pos, 1) != BR_EXIT_OK)
        return BR_EXIT_INPUT;
    return run(pos[0], &p, startup, lo, hi, su_method, quiet);
}

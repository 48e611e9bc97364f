/* cmd_pick.c - `bootrung pick FILE --catalog PARTS.xml`: rail capacitors
 * and link diodes from a catalog, judged at their worst corners and
 * ranked by cost. */
#include "cli.h"

#include "bootrung/parts.h"
#include "bootrung/report.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

static const char ABOUT[] =
    "Choose the rail capacitors and link diodes of design FILE from the parts of\n"
    "a catalog (--catalog, our own XML: docs/catalog.md). Parts whose ratings\n"
    "cannot carry the chain are rejected with the reason; every choice of one\n"
    "capacitor for all rails and one diode for all links is judged at its worst\n"
    "corners over the design's tolerances; a greedy descent then looks for\n"
    "cheaper per-rail mixes. The passing choices with at least the minimum\n"
    "voltage margin (--min-margin, by default a quarter of the smallest UVLO\n"
    "hysteresis) are ranked by cost, then board area, then margin, and the best\n"
    "are checked for start-up too (--no-startup skips that). A choice where the\n"
    "solver cannot settle a steady state, and nothing fails, is undetermined:\n"
    "never ranked, never rejected. Exit status 0 when at least one choice passes,\n"
    "1 when none does, 3 when none passes but some are undetermined, 2 for bad\n"
    "input.\n";

static const char *const VERDICT[] = {"verdict:", NULL};

typedef struct args {
    const char *catalog, *xml, *report, *threads, *top, *min_margin, *limit, *method;
    int no_startup, no_per_rail, quiet;
    int su_method; /* br_su_method */
} args;

/* The options' values, checked, for the study. */
typedef struct settings {
    int threads, top, limit; /* 0: the study's default */
    double min_margin;       /* V; NaN: the default */
} settings;

/* --min-margin: a voltage, 0 or more ("50 mV", "0.05"). */
static int min_margin(const char *text, settings *o)
{
    br_error err;
    br_error_clear(&err);
    if (!text)
        return BR_EXIT_OK;
    if (br_unit_parse(text, BR_KIND_VOLTAGE, &o->min_margin, &err) != BR_OK ||
        !(o->min_margin >= 0 && o->min_margin < 1e6))
        return br_cli_usage_error("pick", "--min-margin '%s': %s", text,
                                  err.msg[0] ? err.msg
                                             : "expected a voltage from 0 V to below 1 MV");
    return BR_EXIT_OK;
}

static int options(args *a, settings *o)
{
    long v;
    *o = (settings){0, 0, 0, NAN};
    if (br_cli_startup_method("pick", a->method, &a->su_method))
        return BR_EXIT_INPUT;
    if (!a->catalog)
        return br_cli_usage_error("pick", "missing --catalog PARTS.xml");
    if (a->threads) {
        if (br_cli_long("pick", "threads", a->threads, 1, BR_STUDY_THREADS_MAX, &v))
            return BR_EXIT_INPUT;
        o->threads = (int)v;
    }
    if (a->top) {
        if (br_cli_long("pick", "top", a->top, 1, 64, &v))
            return BR_EXIT_INPUT;
        o->top = (int)v;
    }
    if (a->limit) {
        if (br_cli_long("pick", "solver-limit", a->limit, 1, 100000, &v))
            return BR_EXIT_INPUT;
        o->limit = (int)v;
    }
    return min_margin(a->min_margin, o);
}

/* The study as the options set it, its progress handed to the run. */
static br_pick_study *study(const args *a, const settings *o, br_cli_run *lr)
{
    br_pick_study *p = br_pick_study_create();
    if (p && (br_pick_study_set_threads(p, o->threads) != BR_OK ||
              (o->top && br_pick_study_set_top(p, o->top) != BR_OK) ||
              br_pick_study_set_min_margin(p, o->min_margin) != BR_OK ||
              br_pick_study_set_startup(p, !a->no_startup) != BR_OK ||
              br_pick_study_set_per_rail(p, !a->no_per_rail) != BR_OK ||
              br_pick_study_set_solver_limit(p, o->limit) != BR_OK ||
              br_pick_study_set_progress(p, br_cli_run_progress, br_cli_run_stop, lr) != BR_OK)) {
        br_pick_study_free(p);
        return NULL;
    }
    return p;
}

typedef struct outputs {
    br_design *d;
    br_catalog *cat;
    br_pick_study *p;
    br_text *text, *xml, *html;
} outputs;

static void outputs_free(outputs *o)
{
    br_pick_study_free(o->p);
    br_catalog_free(o->cat);
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

/* The design, then the catalog.  The study builds the design's chain
 * when it runs, so a design the chain model refuses is reported before
 * anything about the catalog; only when the catalog cannot be read is the
 * chain built here, to keep that order. */
static int load(const char *path, const args *a, outputs *o, const char **culprit, br_error *err)
{
    *culprit = path;
    int rc = br_design_load(path, &o->d, err);
    if (rc != BR_OK)
        return rc;
    br_design_set_startup_method(o->d, a->su_method);
    br_error cat_err;
    br_error_clear(&cat_err);
    rc = br_catalog_load(a->catalog, &o->cat, &cat_err);
    if (rc == BR_OK)
        return BR_OK;
    br_chain *c = NULL;
    int built = br_chain_build(o->d, &c, err);
    br_chain_free(c);
    if (built != BR_OK)
        return built;
    *culprit = a->catalog;
    *err = cat_err;
    return rc;
}

/* Returns a br_status; *culprit is the file a failure is about. */
static int compute(const char *path, const args *a, const settings *so, br_cli_run *lr, outputs *o,
                   const char **culprit, br_error *err)
{
    o->text = br_text_create();
    o->xml = a->xml ? br_text_create() : NULL;
    o->html = a->report ? br_text_create() : NULL;
    o->p = study(a, so, lr);
    if (!o->text || (a->xml && !o->xml) || (a->report && !o->html) || !o->p)
        return out_of_memory(err);
    int rc = load(path, a, o, culprit, err);
    if (rc == BR_OK) {
        *culprit = path;
        rc = br_pick_study_run(o->p, o->d, o->cat, err);
    }
    if (rc == BR_OK)
        rc = br_pick_study_render(o->p, BR_FORMAT_TEXT, o->text, err);
    if (rc == BR_OK && a->xml)
        rc = br_pick_study_render(o->p, BR_FORMAT_XML, o->xml, err);
    if (rc == BR_OK && a->report)
        rc = br_pick_study_render(o->p, BR_FORMAT_HTML, o->html, err);
    return rc;
}

/* The files first, then the report (unless a file took stdout). */
static int write_all(const args *a, const outputs *o)
{
    const br_cli_file files[] = {{o->xml, a->xml}, {o->html, a->report}};
    return br_cli_write(files, 2, o->text, a->quiet, VERDICT, 0);
}

int cmd_pick(int argc, char **argv)
{
    args a = {0};
    const br_opt opts[] = {
        {BR_OPT_STRING, "catalog", "PARTS.xml", &a.catalog,
         "the catalog of candidate parts (required)"},
        {BR_OPT_STRING, "top", "N", &a.top, "rank the N best passing choices (default 10)"},
        {BR_OPT_STRING, "min-margin", "V", &a.min_margin,
         "rank only choices with this voltage margin (default: UVLO hysteresis / 4)"},
        {BR_OPT_FLAG, "no-startup", NULL, &a.no_startup,
         "do not check the start-up criteria of the ranked choices"},
        {BR_OPT_FLAG, "no-per-rail", NULL, &a.no_per_rail,
         "judge one-part choices only (no per-rail search)"},
        {BR_OPT_STRING, "xml", "PATH", &a.xml, "also write the results as XML to PATH (- stdout)"},
        {BR_OPT_STRING, "report", "PATH", &a.report,
         "also write a self-contained HTML report to PATH (- stdout)"},
        {BR_OPT_STRING, "solver-limit", "N", &a.limit,
         "steady-state solver: at most N Newton iterations and plain periods a point"},
        {BR_OPT_STRING, "startup-method", "M", &a.method, BR_STARTUP_METHOD_HELP},
        {BR_OPT_STRING, "threads", "N", &a.threads, "worker threads (default: one per processor)"},
        {BR_OPT_FLAG, "quiet", NULL, &a.quiet, BR_QUIET_HELP},
        {BR_OPT_END, NULL, NULL, NULL, NULL},
    };
    const br_cmd_doc doc = {"pick", "FILE", ABOUT, opts, 1};
    char *pos[1];
    int parsed = br_cli_parse(&doc, argc, argv, pos);
    if (parsed != 0)
        return br_cli_parse_status(parsed);
    settings so;
    const char *const out[] = {a.xml, a.report}, *const names[] = {"xml", "report"};
    const char *const in[] = {pos[0], a.catalog};
    if (options(&a, &so) != BR_EXIT_OK ||
        br_cli_outputs("pick", names, out, 2, in, 2) != BR_EXIT_OK)
        return BR_EXIT_INPUT;
    outputs o = {0};
    br_error err;
    br_error_clear(&err);
    const char *culprit = pos[0];
    br_cli_run lr;
    br_cli_run_begin(&lr, "pick", a.quiet);
    int rc = compute(pos[0], &a, &so, &lr, &o, &culprit, &err);
    int status = br_cli_run_commit(&lr);
    if (status == BR_EXIT_OK)
        status = rc != BR_OK ? br_cli_fail(&err, culprit) : write_all(&a, &o);
    br_cli_run_end(&lr);
    int result = BR_RESULT_UNDETERMINED;
    if (status == BR_EXIT_OK && br_pick_result(o.p, &result) == BR_OK && result != BR_RESULT_PASS)
        status = result == BR_RESULT_FAIL ? BR_EXIT_FAIL : BR_EXIT_UNDETERMINED;
    outputs_free(&o);
    return status;
}

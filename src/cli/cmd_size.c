/* cmd_size.c - `bootrung size FILE`: the smallest capacitor per rail,
 * the largest link and injection resistances and the regulator headroom
 * that keep every margin above a target at the worst corners; optionally
 * the supply voltage window of the result, and the sized design as a
 * design file. */
#include "cli.h"

#include "bootrung/parts.h"
#include "bootrung/report.h"

#include <math.h>
#include <stdio.h>

static const char ABOUT[] =
    "Size design FILE to a margin target. Rail by rail from the top, the\n"
    "smallest capacitor (from --catalog, or as a continuous value: the rail's\n"
    "own part with its capacitance scaled, to 1 %) that keeps every margin in\n"
    "volts at least the target at the design's worst corners (the nominal point\n"
    "and each criterion's worst corner from the one-at-a-time sensitivities),\n"
    "every other criterion passing; the next smaller value is judged and does\n"
    "not qualify. Then the largest link resistance (one value on every link,\n"
    "cold start included, to 2 %), the largest resistance of each injection\n"
    "(the same search, never below its V/IFRM), the regulator headroom of the\n"
    "result, and with --supply its supply voltage window (slow: cold starts at\n"
    "every corner). --write-design PATH writes the sized design as a design file\n"
    "with a comment saying what was sized and to what target.\n"
    "Exit status 0 when the sized design qualifies, cold start included, 1 when\n"
    "it does not, 3 when that is undetermined, 2 for bad input.\n";

typedef struct args {
    const char *catalog, *target, *threads, *limit, *method, *write;
    int quiet, supply, no_links;
    int su_method;
} args;

/* The options' values, checked, for the study. */
typedef struct settings {
    int threads, limit; /* 0: the study's default */
    double target;      /* V; NaN: the default */
} settings;

typedef struct outputs {
    br_design *d;
    br_catalog *cat;
    br_size_study *z;
    br_text *text, *design;
} outputs;

static void outputs_free(outputs *o)
{
    br_size_study_free(o->z);
    br_design_free(o->d);
    br_catalog_free(o->cat);
    br_text_free(o->text);
    br_text_free(o->design);
}

static int options(const args *a, settings *o)
{
    long v;
    *o = (settings){0, 0, NAN};
    if (a->threads && br_cli_long("size", "threads", a->threads, 1, BR_STUDY_THREADS_MAX, &v))
        return BR_EXIT_INPUT;
    o->threads = a->threads ? (int)v : 0;
    if (a->limit && br_cli_long("size", "solver-limit", a->limit, 1, 400, &v))
        return BR_EXIT_INPUT;
    o->limit = a->limit ? (int)v : 0;
    if (a->target) {
        br_error err;
        br_error_clear(&err);
        if (br_unit_parse(a->target, BR_KIND_VOLTAGE, &o->target, &err) != BR_OK ||
            !(o->target >= 0 && o->target < 1e6))
            return br_cli_usage_error("size", "--target '%s': %s", a->target,
                                      err.msg[0] ? err.msg : "expected a voltage of 0 or more");
    }
    return BR_EXIT_OK;
}

/* The study as the options set it, its progress handed to the run. */
static br_size_study *study(const args *a, const settings *o, br_cli_run *lr)
{
    br_size_study *z = br_size_study_create();
    if (z && (br_size_study_set_threads(z, o->threads) != BR_OK ||
              br_size_study_set_solver_limit(z, o->limit) != BR_OK ||
              br_size_study_set_target(z, o->target) != BR_OK ||
              br_size_study_set_supply(z, a->supply) != BR_OK ||
              br_size_study_set_links(z, !a->no_links) != BR_OK ||
              br_size_study_set_progress(z, br_cli_run_progress, br_cli_run_stop, lr) != BR_OK)) {
        br_size_study_free(z);
        return NULL;
    }
    return z;
}

static int out_of_memory(br_error *err)
{
    br_error_clear(err);
    err->code = BR_ENOMEM;
    snprintf(err->msg, sizeof err->msg, "out of memory");
    return BR_ENOMEM;
}

static int compute(const char *path, const args *a, const settings *so, br_cli_run *lr, outputs *o,
                   br_error *err)
{
    o->text = br_text_create();
    o->design = a->write ? br_text_create() : NULL;
    o->z = study(a, so, lr);
    if (!o->text || (a->write && !o->design) || !o->z)
        return out_of_memory(err);
    int rc = br_design_load(path, &o->d, err);
    if (rc == BR_OK && a->method)
        br_design_set_startup_method(o->d, a->su_method);
    if (rc == BR_OK && a->catalog)
        rc = br_catalog_load(a->catalog, &o->cat, err);
    if (rc == BR_OK)
        rc = br_size_study_run(o->z, o->d, o->cat, err);
    if (rc == BR_OK)
        rc = br_size_study_render(o->z, BR_FORMAT_TEXT, o->text, err);
    if (rc == BR_OK && a->write)
        rc = br_size_design_file(o->z, o->design, err);
    return rc;
}

int cmd_size(int argc, char **argv)
{
    args a = {0};
    const br_opt opts[] = {
        {BR_OPT_STRING, "catalog", "PARTS.xml", &a.catalog,
         "rail capacitors from this catalog (default: continuous values)"},
        {BR_OPT_STRING, "target", "V", &a.target,
         "smallest margin in volts (default: a quarter of the UVLO hysteresis)"},
        {BR_OPT_FLAG, "no-links", NULL, &a.no_links,
         "keep the design's link and injection resistances"},
        {BR_OPT_FLAG, "supply", NULL, &a.supply,
         "also search the supply voltage window of the result (slow)"},
        {BR_OPT_STRING, "write-design", "PATH", &a.write,
         "write the sized design as a design file to PATH (- stdout)"},
        {BR_OPT_STRING, "threads", "N", &a.threads, "worker threads (default: one per processor)"},
        {BR_OPT_STRING, "solver-limit", "N", &a.limit,
         "at most N Newton iterations and N plain periods per steady state"},
        {BR_OPT_STRING, "startup-method", "M", &a.method, BR_STARTUP_METHOD_HELP},
        {BR_OPT_FLAG, "quiet", NULL, &a.quiet, BR_QUIET_HELP},
        {BR_OPT_END, NULL, NULL, NULL, NULL},
    };
    const br_cmd_doc doc = {"size", "FILE", ABOUT, opts, 1};
    char *pos[2];
    int parsed = br_cli_parse(&doc, argc, argv, pos);
    if (parsed != 0)
        return br_cli_parse_status(parsed);
    settings so;
    if (options(&a, &so) != BR_EXIT_OK ||
        br_cli_startup_method("size", a.method, &a.su_method) != BR_EXIT_OK)
        return BR_EXIT_INPUT;
    const char *const out[] = {a.write}, *const names[] = {"write-design"};
    const char *const in[] = {pos[0], a.catalog};
    if (br_cli_outputs("size", names, out, 1, in, a.catalog ? 2 : 1) != BR_EXIT_OK)
        return BR_EXIT_INPUT;
    outputs o = {0};
    br_error err;
    br_error_clear(&err);
    br_cli_run lr;
    br_cli_run_begin(&lr, "size", a.quiet);
    int rc = compute(pos[0], &a, &so, &lr, &o, &err);
    int status = br_cli_run_commit(&lr);
    if (status == BR_EXIT_OK && rc != BR_OK)
        status = br_cli_fail(&err, rc == BR_EINPUT && err.file[0] ? err.file : pos[0]);
    else if (status == BR_EXIT_OK) {
        static const char *const verdict[] = {"verdict:", NULL};
        const br_cli_file files[] = {{o.design, a.write}};
        status = br_cli_write(files, 1, o.text, a.quiet, verdict, 1);
    }
    br_cli_run_end(&lr);
    int result = BR_RESULT_UNDETERMINED;
    if (status == BR_EXIT_OK && br_size_result(o.z, &result) == BR_OK)
        status = result == BR_RESULT_PASS   ? BR_EXIT_OK
                 : result == BR_RESULT_FAIL ? BR_EXIT_FAIL
                                            : BR_EXIT_UNDETERMINED;
    outputs_free(&o);
    return status;
}

/* cmd_size.c - `bootrung size FILE`: the smallest capacitor per rail,
 * the largest link resistance and the regulator headroom that keep every
 * margin above a target at the worst corners; optionally the supply
 * voltage window of the result, and the sized design as a design file. */
#include "cli.h"

#include "analyses/size.h"
#include "core/error.h"
#include "core/units.h"
#include "io/design_write.h"
#include "model/catalog.h"
#include "report/size_report.h"

static const char ABOUT[] =
    "Size design FILE to a margin target. Rail by rail from the top, the\n"
    "smallest capacitor (from --catalog, or as a continuous value: the rail's\n"
    "own part with its capacitance scaled, to 1 %) that keeps every margin in\n"
    "volts at least the target at the design's worst corners (the nominal point\n"
    "and each criterion's worst corner from the one-at-a-time sensitivities),\n"
    "every other criterion passing; the next smaller value is judged and does\n"
    "not qualify. Then the largest link resistance (one value on every link,\n"
    "cold start included, to 2 %), the regulator headroom of the result, and\n"
    "with --supply its supply voltage window (slow: cold starts at every\n"
    "corner). --write-design PATH writes the sized design as a design file\n"
    "with a comment saying what was sized and to what target.\n"
    "Exit status 0 when the sized design qualifies, cold start included, 1 when\n"
    "it does not, 3 when that is undetermined, 2 for bad input.\n";

typedef struct args {
    const char *catalog, *target, *threads, *limit, *method, *write;
    int quiet, supply, no_links;
    int su_method;
} args;

typedef struct outputs {
    br_design *d;
    br_chain *c;
    br_catalog *cat;
    br_size *z;
    br_text *text, *design;
} outputs;

static void outputs_free(outputs *o)
{
    br_size_free(o->z);
    br_chain_free(o->c);
    br_design_free(o->d);
    br_catalog_free(o->cat);
    br_text_free(o->text);
    br_text_free(o->design);
}

static int options(const args *a, br_size_opts *o)
{
    long v;
    br_size_opts_default(o);
    if (a->threads && br_cli_long("size", "threads", a->threads, 1, BR_SPREAD_MAX_THREADS, &v))
        return BR_EXIT_INPUT;
    o->threads = a->threads ? (int)v : 0;
    if (a->limit && br_cli_long("size", "solver-limit", a->limit, 1, 400, &v))
        return BR_EXIT_INPUT;
    o->solver_limit = a->limit ? (int)v : 0;
    o->supply = a->supply;
    o->links = !a->no_links;
    if (a->target) {
        br_error err;
        if (br_unit_parse(a->target, BR_KIND_VOLTAGE, &o->target, &err) != BR_OK ||
            !(o->target >= 0 && o->target < 1e6))
            return br_cli_usage_error("size", "--target '%s': %s", a->target,
                                      err.msg[0] ? err.msg : "expected a voltage of 0 or more");
    }
    return BR_EXIT_OK;
}

static int compute(const char *path, const args *a, br_size_opts *so, outputs *o, br_error *err)
{
    o->text = br_text_create();
    o->design = a->write ? br_text_create() : NULL;
    if (!o->text || (a->write && !o->design))
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    int rc = br_design_load(path, &o->d, err);
    if (rc == BR_OK && a->method)
        br_design_set_startup_method(o->d, a->su_method);
    if (rc == BR_OK && a->catalog)
        rc = br_catalog_load(a->catalog, &o->cat, err);
    if (rc == BR_OK)
        rc = br_chain_build(o->d, &o->c, err);
    so->cat = o->cat;
    if (rc == BR_OK)
        rc = br_size_run(o->d, so, &o->z, err);
    if (rc == BR_OK)
        rc = br_size_text(o->c, o->z, a->catalog, o->text);
    if (rc == BR_OK && a->write) {
        br_text *comment = br_text_create();
        rc = comment ? br_size_comment(o->c, o->z, a->catalog, comment) : BR_ENOMEM;
        if (rc == BR_OK)
            rc = br_design_write(o->z->d, br_text_data(comment), o->design, err);
        br_text_free(comment);
    }
    if (rc == BR_ENOMEM && !err->msg[0])
        br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory rendering the report");
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
        {BR_OPT_FLAG, "no-links", NULL, &a.no_links, "keep the design's link resistances"},
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
    br_size_opts so;
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
    so.progress = BR_CLI_HOOK(&lr);
    int rc = compute(pos[0], &a, &so, &o, &err);
    int status = br_cli_run_commit(&lr);
    if (status == BR_EXIT_OK && rc != BR_OK)
        status = br_cli_fail(&err, rc == BR_EINPUT && err.file[0] ? err.file : pos[0]);
    else if (status == BR_EXIT_OK) {
        static const char *const verdict[] = {"verdict:", NULL};
        const br_cli_file files[] = {{o.design, a.write}};
        status = br_cli_write(files, 1, o.text, a.quiet, verdict, 1);
    }
    br_cli_run_end(&lr);
    if (status == BR_EXIT_OK)
        status = o.z->outcome == BR_OUTCOME_PASS   ? BR_EXIT_OK
                 : o.z->outcome == BR_OUTCOME_FAIL ? BR_EXIT_FAIL
                                                   : BR_EXIT_UNDETERMINED;
    outputs_free(&o);
    return status;
}

/* cmd_yield.c - `bootrung yield FILE --samples N --seed S`: Monte Carlo
 * yield over the tolerances of the design file. */
#include "cli.h"
#include "shard.h"

#include "bootrung/analysis.h"
#include "bootrung/report.h"

#include <stdlib.h>
#include <string.h>

static const char ABOUT[] =
    "Monte Carlo yield of design FILE: --samples sets of values drawn from the\n"
    "tolerances of the design file (uniform between the limits, or normal with the\n"
    "limits at the stated sigma, truncated there), each judged like analyze does.\n"
    "The report gives the share of samples that pass every criterion with its\n"
    "exact 95 % confidence interval (Clopper-Pearson), quantiles of each\n"
    "criterion's margin, and the parameters that move the margins most (Spearman's\n"
    "rank correlation). The same seed gives the same samples and results whatever\n"
    "the number of threads. Without --startup the start-up criteria are not judged\n"
    "(a cold start costs about a hundred periods a sample). A sample where the\n"
    "solver cannot settle a steady state neither passes nor fails: it is counted\n"
    "apart as undetermined, and the interval treats it as unknown (failing for the\n"
    "lower bound, passing for the upper). Exit status 0 when every sample passes\n"
    "(or, with --min-yield, when the lower confidence bound reaches it), 1 when\n"
    "one fails (or the bound cannot reach the minimum), 3 when the undetermined\n"
    "samples leave it open, 2 for bad input. --shard K/N judges only the samples\n"
    "i with i mod N = K-1 and writes a shard file instead (--shard-file, default\n"
    "stdout); 'bootrung merge' puts the N files together into this verb's output.\n";

typedef struct args {
    const char *xml, *csv, *samples, *seed, *threads, *min_yield, *report, *plot, *limit, *method;
    const char *shard, *shard_file;
    int startup, quiet;
    int su_method; /* br_su_method */
} args;

/* The options, checked, into the study's settings; BR_EXIT_OK or a usage
 * error's status. */
static int options(args *a, br_yield_study *y)
{
    long v, samples = BR_YIELD_DEFAULT_SAMPLES, seed = (long)BR_YIELD_DEFAULT_SEED;
    double min_yield = -1.0;
    if (br_cli_startup_method("yield", a->method, &a->su_method))
        return BR_EXIT_INPUT;
    br_yield_study_set_startup(y, a->startup);
    if (a->samples && br_cli_long("yield", "samples", a->samples, 1, 10000000L, &samples))
        return BR_EXIT_INPUT;
    if (a->seed && br_cli_long("yield", "seed", a->seed, 0, 4294967295L, &seed))
        return BR_EXIT_INPUT;
    br_yield_study_set_samples(y, samples, (unsigned long)seed);
    if (a->threads) {
        if (br_cli_long("yield", "threads", a->threads, 1, BR_THREADS_MAX, &v))
            return BR_EXIT_INPUT;
        br_yield_study_set_threads(y, (int)v);
    }
    if (a->min_yield && br_cli_fraction("yield", "min-yield", a->min_yield, &min_yield))
        return BR_EXIT_INPUT;
    br_yield_study_set_min_yield(y, min_yield);
    if (a->limit) {
        if (br_cli_long("yield", "solver-limit", a->limit, 1, BR_SOLVER_LIMIT_MAX, &v))
            return BR_EXIT_INPUT;
        br_yield_study_set_solver_limit(y, v);
    }
    return BR_EXIT_OK;
}

typedef struct outputs {
    br_yield_study *y;
    br_text *text, *xml, *csv, *html, *svg;
} outputs;

static void outputs_free(outputs *o)
{
    br_yield_study_free(o->y);
    br_text_free(o->text);
    br_text_free(o->xml);
    br_text_free(o->csv);
    br_text_free(o->html);
    br_text_free(o->svg);
}

static int render(const args *a, outputs *o, br_error *err)
{
    int rc = br_yield_study_render(o->y, BR_FORMAT_TEXT, o->text, err);
    if (rc == BR_OK && a->xml)
        rc = br_yield_study_render(o->y, BR_FORMAT_XML, o->xml, err);
    if (rc == BR_OK && a->csv)
        rc = br_yield_study_render(o->y, BR_FORMAT_CSV, o->csv, err);
    if (rc == BR_OK && a->report)
        rc = br_yield_study_render(o->y, BR_FORMAT_HTML, o->html, err);
    if (rc == BR_OK && a->plot)
        rc = br_yield_study_render(o->y, BR_FORMAT_SVG, o->svg, err);
    return rc;
}

static int compute(const char *path, const args *a, int shard, outputs *o, br_error *err)
{
    o->text = br_text_create();
    o->xml = a->xml ? br_text_create() : NULL;
    o->csv = a->csv ? br_text_create() : NULL;
    o->html = a->report ? br_text_create() : NULL;
    o->svg = a->plot ? br_text_create() : NULL;
    if (!o->text || (a->xml && !o->xml) || (a->csv && !o->csv) || (a->report && !o->html) ||
        (a->plot && !o->svg))
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    br_design *d = NULL;
    int rc = br_design_load(path, &d, err);
    if (rc == BR_OK) {
        br_design_set_startup_method(d, a->su_method);
        rc = br_yield_study_run(o->y, d, err);
    }
    br_design_free(d);
    if (rc == BR_OK && !shard)
        rc = render(a, o, err);
    return rc;
}

/* The files and the report, all or none (unless a file took stdout). */
static int write_all(const args *a, const outputs *o)
{
    static const char *const verdict[] = {BR_YIELD_VERDICT, NULL};
    const br_cli_file files[] = {
        {o->xml, a->xml}, {o->csv, a->csv}, {o->html, a->report}, {o->svg, a->plot}};
    return br_cli_write(files, 4, o->text, a->quiet, verdict, 1);
}

static int judged(const void *y, long i)
{
    int has = 0;
    br_yield_study_judges(y, i, &has);
    return has;
}

/* The shard's samples, judged. */
static int write_shard(int argc, char **argv, const char *path, const args *a, int k, int n,
                       const br_yield_study *y)
{
    const void *rec = NULL;
    long total = 0;
    br_yield_records(y, &rec, &total);
    br_shard_head h = {argc, argv, path, k, n, br_yield_record_size(), total, NULL, NULL};
    return br_cli_shard_write(&h, rec, judged, y, a->shard_file ? a->shard_file : "-");
}

/* --shard, or the samples merged from shards checked against --samples. */
static int shard_options(const args *a, br_yield_study *y, int *k, int *n,
                         const br_cli_given *given)
{
    *k = *n = 0;
    if (a->shard_file && !a->shard)
        return br_cli_usage_error("yield", "--shard-file without --shard");
    if (a->shard && br_cli_shard_parse("yield", a->shard, k, n))
        return BR_EXIT_INPUT;
    br_yield_study_set_shard(y, *k, *n);
    if (given && br_yield_study_set_given(y, given->rec, given->size, given->total) != BR_OK)
        return br_cli_usage_error("merge", "the shards' samples do not fit --samples");
    return BR_EXIT_OK;
}

int cmd_yield(int argc, char **argv)
{
    return br_cli_yield_main(argc, argv, NULL);
}

int br_cli_yield_main(int argc, char **argv, const br_cli_given *given)
{
    args a = {0};
    const br_opt opts[] = {
        {BR_OPT_STRING, "samples", "N", &a.samples, "number of samples (default 1000)"},
        {BR_OPT_STRING, "seed", "S", &a.seed, "seed of the random numbers (default 1)"},
        {BR_OPT_FLAG, "startup", NULL, &a.startup,
         "also judge the start-up criteria (a cold start per sample: slow)"},
        {BR_OPT_STRING, "min-yield", "P", &a.min_yield,
         "exit 1 unless the lower 95 % bound reaches P (0.99 or 99%)"},
        {BR_OPT_STRING, "xml", "PATH", &a.xml, "also write the results as XML to PATH (- stdout)"},
        {BR_OPT_STRING, "csv", "PATH", &a.csv,
         "also write every sample (values, margins) as CSV to PATH (- stdout)"},
        {BR_OPT_STRING, "report", "PATH", &a.report,
         "also write a self-contained HTML report with histograms to PATH"},
        {BR_OPT_STRING, "plot", "PATH", &a.plot,
         "also plot the histograms of the margins as SVG to PATH"},
        {BR_OPT_STRING, "solver-limit", "N", &a.limit,
         "steady-state solver: at most N Newton iterations and plain periods a sample"},
        {BR_OPT_STRING, "startup-method", "M", &a.method, BR_STARTUP_METHOD_HELP},
        {BR_OPT_STRING, "threads", "N", &a.threads, "worker threads (default: one per processor)"},
        {BR_OPT_STRING, "shard", "K/N", &a.shard, "judge slice K of N only, write a shard file"},
        {BR_OPT_STRING, "shard-file", "PATH", &a.shard_file,
         "the shard file's path (default - stdout)"},
        {BR_OPT_FLAG, "quiet", NULL, &a.quiet, BR_QUIET_HELP},
        {BR_OPT_END, NULL, NULL, NULL, NULL},
    };
    const br_cmd_doc doc = {"yield", "FILE", ABOUT, opts, 1};
    char *pos[1];
    int parsed = br_cli_parse(&doc, argc, argv, pos);
    if (parsed != 0)
        return br_cli_parse_status(parsed);
    outputs o = {0};
    if (!(o.y = br_yield_study_create())) {
        fprintf(stderr, "bootrung: out of memory\n");
        return BR_EXIT_INPUT;
    }
    int k, n;
    const char *const out[] = {a.xml, a.csv, a.report, a.plot, a.shard_file};
    const char *const names[] = {"xml", "csv", "report", "plot", "shard-file"};
    if (options(&a, o.y) != BR_EXIT_OK || shard_options(&a, o.y, &k, &n, given) ||
        br_cli_outputs("yield", names, out, 5, (const char *const *)pos, 1) != BR_EXIT_OK) {
        outputs_free(&o);
        return BR_EXIT_INPUT;
    }
    br_error err;
    br_error_clear(&err);
    br_cli_run lr;
    br_cli_run_begin(&lr, "yield", a.quiet);
    br_yield_study_set_progress(o.y, br_cli_run_progress, br_cli_run_stop, &lr);
    int rc = compute(pos[0], &a, n > 0, &o, &err);
    int status = br_cli_run_commit(&lr);
    if (status == BR_EXIT_OK)
        status = rc != BR_OK ? br_cli_fail(&err, pos[0])
                 : n > 0     ? write_shard(argc, argv, pos[0], &a, k, n, o.y)
                             : write_all(&a, &o);
    br_cli_run_end(&lr);
    br_yield_study_set_progress(o.y, NULL, NULL, NULL);
    int res = BR_RESULT_PASS;
    if (status == BR_EXIT_OK && n <= 0 && br_yield_result(o.y, &res) == BR_OK)
        status = res == BR_RESULT_PASS   ? BR_EXIT_OK
                 : res == BR_RESULT_FAIL ? BR_EXIT_FAIL
                                         : BR_EXIT_UNDETERMINED;
    outputs_free(&o);
    return status;
}

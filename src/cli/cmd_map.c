/* cmd_map.c - `bootrung map FILE --duty FROM:TO:N --freq FROM:TO:N`: the
 * worst margin and what binds it over a duty x frequency grid, as CSV and
 * an SVG heat map. */
#include "cli.h"
#include "shard.h"

#include "bootrung/analysis.h"
#include "bootrung/report.h"

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

static const char ABOUT[] =
    "The hold map of design FILE: on a grid of duty (--duty FROM:TO:N, equal\n"
    "steps, e.g. 5%:95%:40) by switching frequency (--freq FROM:TO:N, equal\n"
    "ratios, e.g. 10k:1M:40), the worst margin of the periodic steady state over\n"
    "every rail and current direction (driver supply above UVLO falling and the\n"
    "minimum drive, below the gate maximum; below 0 V a criterion fails) and the\n"
    "rail and criterion that bind it. Prints a summary; --csv writes every grid\n"
    "point, --svg (or --plot) a heat map with the edge of the holding region and\n"
    "the design point marked, --report an HTML page with the map. Rows are shared\n"
    "between --threads workers (default 2); the result does not depend on their\n"
    "number. --shard K/N judges only every N-th row (and the design column) and\n"
    "writes a shard file instead (--shard-file, default stdout); 'bootrung merge'\n"
    "puts the N files together into this verb's output.\n"
    "Exit status 0 when the design point holds, 1 when not, 3 when no periodic\n"
    "steady state was found there, 2 for bad input.\n";

/* "FROM:TO:N" with FROM and TO of the given kind. */
static int parse_axis(const char *opt, const char *text, br_kind kind, double *from, double *to,
                      int *n)
{
    char part[3][64];
    const char *p = text;
    int k = 0;
    for (; k < 3 && p; k++) {
        const char *colon = strchr(p, ':');
        size_t len = colon ? (size_t)(colon - p) : strlen(p);
        if (len == 0 || len >= sizeof part[k] || (k == 2 && colon))
            break;
        memcpy(part[k], p, len);
        part[k][len] = '\0';
        p = colon ? colon + 1 : NULL;
    }
    br_error err;
    br_error_clear(&err);
    char *end = NULL;
    if (k != 3 || p)
        return br_cli_usage_error("map", "--%s '%s': expected FROM:TO:N", opt, text);
    if (br_unit_parse(part[0], kind, from, &err) != BR_OK ||
        br_unit_parse(part[1], kind, to, &err) != BR_OK)
        return br_cli_usage_error("map", "--%s '%s': %s", opt, text, err.msg);
    long v = strtol(part[2], &end, 10);
    if (*end || v < 1 || v > BR_MAP_POINTS_MAX)
        return br_cli_usage_error("map", "--%s '%s': N must be a whole number from 1 to %d", opt,
                                  text, BR_MAP_POINTS_MAX);
    *n = (int)v;
    return BR_EXIT_OK;
}

static int parse_threads(const char *text, int *out)
{
    char *end = NULL;
    long v = text ? strtol(text, &end, 10) : 2;
    if (text && (*end || v < 1 || v > BR_MAP_THREADS_MAX))
        return br_cli_usage_error("map", "--threads '%s': expected 1 to %d", text,
                                  BR_MAP_THREADS_MAX);
    *out = (int)v;
    return BR_EXIT_OK;
}

/* The files asked for (NULL when not). */
typedef struct paths {
    const char *csv, *svg, *report, *plot;
    const char *shard, *shard_file; /* --shard K/N and its file */
} paths;

typedef struct outputs {
    br_text *text, *csv, *svg, *html;
    br_map_study *m;
} outputs;

static void outputs_free(outputs *o)
{
    br_text_free(o->text);
    br_text_free(o->csv);
    br_text_free(o->svg);
    br_text_free(o->html);
    br_map_study_free(o->m);
}

static int compute(const char *path, const paths *p, outputs *o, br_error *err)
{
    br_design *d = NULL;
    int rc = br_design_load(path, &d, err);
    if (rc == BR_OK)
        rc = br_map_study_run(o->m, d, err);
    br_design_free(d);
    if (p->shard) /* a slice: no report */
        return rc;
    if (rc == BR_OK)
        rc = br_map_study_set_file_names(o->m, p->csv, p->svg ? p->svg : p->plot) == BR_OK
                 ? br_map_study_render(o->m, BR_FORMAT_TEXT, o->text, err)
                 : br_error_set(err, BR_EINPUT, NULL, 0, NULL, "a file name is too long");
    if (rc == BR_OK && o->csv)
        rc = br_map_study_render(o->m, BR_FORMAT_CSV, o->csv, err);
    if (rc == BR_OK && o->svg)
        rc = br_map_study_render(o->m, BR_FORMAT_SVG, o->svg, err);
    if (rc == BR_OK && o->html)
        rc = br_map_study_render(o->m, BR_FORMAT_HTML, o->html, err);
    return rc;
}

/* The files and the summary, all or none; a file sent to stdout takes the
 * summary's place. */
static int write_all(const outputs *o, const paths *p, int quiet)
{
    static const char *const verdict[] = {BR_MAP_VERDICT, NULL};
    const br_cli_file files[] = {
        {o->csv, p->csv}, {o->svg, p->svg}, {o->svg, p->plot}, {o->html, p->report}};
    int status = br_cli_write(files, 4, o->text, quiet, verdict, 0);
    int res = BR_RESULT_PASS;
    if (status == BR_EXIT_OK && br_map_result(o->m, &res) == BR_OK && res != BR_RESULT_PASS)
        /* no steady state found: not a failure */
        status = res == BR_RESULT_UNDETERMINED ? BR_EXIT_UNDETERMINED : BR_EXIT_FAIL;
    return status;
}

/* The shard's points (its rows and the design column), then the design point. */
static int judged(const void *m, long i)
{
    int has = 0;
    br_map_study_judges(m, i, &has);
    return has;
}

static int write_shard(int argc, char **argv, const char *path, int k, int n, const paths *p,
                       const br_map_study *m)
{
    const void *rec = NULL;
    long total = 0;
    br_map_records(m, &rec, &total);
    br_shard_head h = {argc, argv, path, k, n, br_map_record_size(), total, NULL, NULL};
    return br_cli_shard_write(&h, rec, judged, m, p->shard_file ? p->shard_file : "-");
}

static int run(int argc, char **argv, const char *path, outputs *o, int k, int n, const paths *p,
               int quiet)
{
    int want_svg = p->svg || p->plot;
    o->text = br_text_create();
    o->csv = p->csv ? br_text_create() : NULL;
    o->svg = want_svg ? br_text_create() : NULL;
    o->html = p->report ? br_text_create() : NULL;
    br_error err;
    br_error_clear(&err);
    int status;
    if (!o->text || (p->csv && !o->csv) || (want_svg && !o->svg) || (p->report && !o->html)) {
        br_error_set(&err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
        status = br_cli_fail(&err, NULL);
    } else {
        br_cli_run lr;
        br_cli_run_begin(&lr, "map", quiet);
        br_map_study_set_progress(o->m, br_cli_run_progress, br_cli_run_stop, &lr);
        int rc = compute(path, p, o, &err);
        int stop = br_cli_run_commit(&lr);
        status = stop          ? stop
                 : rc != BR_OK ? br_cli_fail(&err, path)
                 : n > 0       ? write_shard(argc, argv, path, k, n, p, o->m)
                               : write_all(o, p, quiet);
        br_cli_run_end(&lr);
        br_map_study_set_progress(o->m, NULL, NULL, NULL);
    }
    return status;
}

/* The grid, the threads and the shard into the study; BR_EXIT_OK or a
 * usage error's status. */
static int settings(br_map_study *m, const char *duty, const char *freq, const char *threads,
                    const paths *p, int *k, int *n, const br_cli_given *given)
{
    double d0, d1, f0, f1;
    int nd, nf, nt = 2;
    *k = *n = 0;
    if (parse_axis("duty", duty, BR_KIND_FRACTION, &d0, &d1, &nd) ||
        parse_axis("freq", freq, BR_KIND_FREQUENCY, &f0, &f1, &nf) || parse_threads(threads, &nt) ||
        (p->shard && br_cli_shard_parse("map", p->shard, k, n)))
        return BR_EXIT_INPUT;
    br_map_study_set_grid(m, d0, d1, nd, f0, f1, nf);
    br_map_study_set_threads(m, nt);
    br_map_study_set_shard(m, *k, *n);
    if (given && br_map_study_set_given(m, given->rec, given->size, given->total) != BR_OK)
        return br_cli_usage_error("merge", "the shards' points do not fit the map's grid");
    return BR_EXIT_OK;
}

int cmd_map(int argc, char **argv)
{
    return br_cli_map_main(argc, argv, NULL);
}

int br_cli_map_main(int argc, char **argv, const br_cli_given *given)
{
    const char *duty = NULL, *freq = NULL, *threads = NULL;
    paths p = {0};
    int quiet = 0;
    const br_opt opts[] = {
        {BR_OPT_STRING, "duty", "FROM:TO:N", &duty, "duty grid (required), e.g. 5%:95%:40"},
        {BR_OPT_STRING, "freq", "FROM:TO:N", &freq, "frequency grid (required), e.g. 10k:1M:40"},
        {BR_OPT_STRING, "csv", "PATH", &p.csv, "write every grid point as CSV to PATH (- stdout)"},
        {BR_OPT_STRING, "svg", "PATH", &p.svg, "draw the heat map as SVG to PATH (- stdout)"},
        {BR_OPT_STRING, "plot", "PATH", &p.plot, "the same as --svg"},
        {BR_OPT_STRING, "report", "PATH", &p.report,
         "also write a self-contained HTML report with the map to PATH"},
        {BR_OPT_STRING, "threads", "N", &threads, "worker threads, 1 to 16 (default 2)"},
        {BR_OPT_STRING, "shard", "K/N", &p.shard, "judge slice K of N only, write a shard file"},
        {BR_OPT_STRING, "shard-file", "PATH", &p.shard_file,
         "the shard file's path (default - stdout)"},
        {BR_OPT_FLAG, "quiet", NULL, &quiet, BR_QUIET_HELP},
        {BR_OPT_END, NULL, NULL, NULL, NULL},
    };
    const br_cmd_doc doc = {"map", "FILE", ABOUT, opts, 1};
    char *pos[1];
    int parsed = br_cli_parse(&doc, argc, argv, pos);
    if (parsed != 0)
        return br_cli_parse_status(parsed);
    if (!duty || !freq)
        return br_cli_usage_error("map", "--duty and --freq are required");
    const char *const out[] = {p.csv, p.svg, p.plot, p.report, p.shard_file};
    const char *const names[] = {"csv", "svg", "plot", "report", "shard-file"};
    if (br_cli_outputs("map", names, out, 5, (const char *const *)pos, 1) != BR_EXIT_OK)
        return BR_EXIT_INPUT;
    outputs o = {0};
    if (!(o.m = br_map_study_create())) {
        fprintf(stderr, "bootrung: out of memory\n");
        return BR_EXIT_INPUT;
    }
    int k, n, status;
    br_error err;
    br_error_clear(&err);
    if (settings(o.m, duty, freq, threads, &p, &k, &n, given))
        status = BR_EXIT_INPUT;
    else if (p.shard_file && !p.shard)
        status = br_cli_usage_error("map", "--shard-file without --shard");
    else if (br_map_study_check(o.m, &err) != BR_OK)
        status = br_cli_usage_error("map", "--%s: %s", err.field, err.msg);
    else
        status = run(argc, argv, pos[0], &o, k, n, &p, quiet);
    outputs_free(&o);
    return status;
}

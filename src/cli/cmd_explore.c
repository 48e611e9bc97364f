/* cmd_explore.c - `bootrung explore FILE --catalog PARTS.xml`: level
 * counts, switch voltage classes and switching frequencies around a
 * template design, each judged; the feasible set ranked, its Pareto front
 * of cost, gate-supply loss and margin, and the front's design files. */
#include "cli.h"
#include "shard.h"

#include "bootrung/parts.h"
#include "bootrung/report.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

static const char ABOUT[] =
    "Explore level counts, switch voltage classes and switching frequencies\n"
    "around design FILE, an FCML leg that gives the supply, drivers, regulators,\n"
    "timing, start-up pattern, link diodes and rail capacitors. For every level\n"
    "count of --levels, switch of --catalog and frequency of --fsw: the rule of\n"
    "the trade first (each of the N-1 series switches of a side, and each link\n"
    "diode, blocks the highest bus voltage over N-1; a part is used up to the\n"
    "derating), then the chain built by the FCML generator with the catalog\n"
    "switch and its driver, its cold start and steady state at the nominal\n"
    "point, and the verdict; with --corners the survivors again at their worst\n"
    "corners, as 'size' judges a value (slow). With --parts every link takes the\n"
    "cheapest diode of PARTS.xml that the rule allows and that is as strong in\n"
    "current as the template's, and each survivor's rail capacitors are sized\n"
    "from it as 'size' sizes them: rail by rail from the top, the smallest\n"
    "capacitor that keeps every margin in volts at the target (judged at the\n"
    "nominal point, at the worst corners with --corners); the sized design is\n"
    "screened again and its parts counted in its cost. A combination is\n"
    "feasible when every criterion passes, its smallest margin in volts reaches\n"
    "the target and its start-up time and cost are within --max-startup and\n"
    "--max-cost. A chain whose rails fall short from some rail up needs a\n"
    "second isolated supply: the split design, with one injected at a rail the\n"
    "search chooses, is judged too (with --corners at its worst corners as\n"
    "well, where it holds at the nominal point) and reported beside it, out of\n"
    "the ranking. The report ranks the feasible set and marks its Pareto front\n"
    "of cost, supply power and margin; --csv, --svg and --designs DIR (the\n"
    "front's design files) write the rest. --shard K/N judges every N-th\n"
    "combination only and writes a shard file (--shard-file, default stdout);\n"
    "'bootrung merge' puts the N files together into this verb's output.\n"
    "--yield N samples every feasible combination's design N times over its\n"
    "tolerances as 'yield --startup' does (the same seed for each), and the\n"
    "report gives each its yield with the exact 95 % interval; every feasible\n"
    "combination, not only the front, so that a shard yields its own.\n"
    "Exit status 0 when some combination is feasible, 1 when none is, 3 when\n"
    "none is and some could not be decided, 2 for bad input.\n";

typedef struct args {
    const char *catalog, *parts, *vin, *levels, *fsw, *iload, *derating, *margin, *max_startup,
        *max_cost, *threads, *csv, *svg, *designs, *shard, *shard_file, *yield, *seed;
    int quiet, corners, scale_caps;
} args;

/* What the options ask of the study (explore_opts_default: its defaults). */
typedef struct explore_opts {
    double vbus, vbus_max; /* V */
    int lmin, lmax;
    int nfsw;
    double fsw[BR_EXPLORE_FSW_MAX];                        /* Hz */
    double limit[BR_EXPLORE_LIMIT_COUNT];                  /* br_explore_limit; NaN: the default */
    double iload, derating, target, max_startup, max_cost; /* parsed into limit[] */
    int corners, scale_caps, threads, shard_k, shard_n;
    long yield_samples;
    unsigned long seed;
    const void *given; /* merged records, or NULL */
    long ngiven;
} explore_opts;

static void explore_opts_default(explore_opts *o)
{
    *o = (explore_opts){0};
    for (int i = 0; i < BR_EXPLORE_LIMIT_COUNT; i++)
        o->limit[i] = NAN;
}

typedef struct outputs {
    br_design *d;
    br_catalog *cat, *parts;
    br_explore_study *x;
    br_text *text, *csv, *svg;
    int ndesigns;
    br_text **design;
    char (*path)[1024];
} outputs;

static void outputs_free(outputs *o)
{
    br_explore_study_free(o->x);
    br_design_free(o->d);
    br_catalog_free(o->cat);
    br_catalog_free(o->parts);
    br_text_free(o->text);
    br_text_free(o->csv);
    br_text_free(o->svg);
    for (int i = 0; i < o->ndesigns; i++)
        br_text_free(o->design[i]);
    free(o->design);
    free(o->path);
}

/* "LO:HI" or one level count. */
static int parse_levels(const char *text, explore_opts *eo)
{
    char *end = NULL;
    long lo = strtol(text, &end, 10), hi = lo;
    if (*end == ':')
        hi = strtol(end + 1, &end, 10);
    if (*end || lo < 2 || hi < lo || hi > BR_EXPLORE_LEVELS_MAX)
        return br_cli_usage_error("explore", "--levels '%s': expected LO:HI, from 2 to %d", text,
                                  BR_EXPLORE_LEVELS_MAX);
    eo->lmin = (int)lo;
    eo->lmax = (int)hi;
    return BR_EXIT_OK;
}

/* "F1,F2,...": frequencies. */
static int parse_fsw(const char *text, explore_opts *eo)
{
    char buf[512];
    snprintf(buf, sizeof buf, "%s", text);
    eo->nfsw = 0;
    for (char *save = NULL, *tok = strtok_r(buf, ",", &save); tok;
         tok = strtok_r(NULL, ",", &save)) {
        br_error err;
        double f;
        if (eo->nfsw == BR_EXPLORE_FSW_MAX)
            return br_cli_usage_error("explore", "--fsw: at most %d frequencies",
                                      BR_EXPLORE_FSW_MAX);
        if (br_unit_parse(tok, BR_KIND_FREQUENCY, &f, &err) != BR_OK || !(f > 0 && f < 1e9))
            return br_cli_usage_error("explore", "--fsw '%s': expected frequencies like 60k,120k",
                                      text);
        eo->fsw[eo->nfsw++] = f;
    }
    return eo->nfsw > 0 ? BR_EXIT_OK
                        : br_cli_usage_error("explore", "--fsw '%s': no frequency", text);
}

/* "V" or "V/VMAX": the nominal and the highest bus voltage. */
static int parse_vin(const char *text, explore_opts *eo)
{
    char buf[128];
    snprintf(buf, sizeof buf, "%s", text);
    char *slash = strchr(buf, '/');
    if (slash)
        *slash = '\0';
    br_error err;
    if (br_unit_parse(buf, BR_KIND_VOLTAGE, &eo->vbus, &err) != BR_OK ||
        (slash && br_unit_parse(slash + 1, BR_KIND_VOLTAGE, &eo->vbus_max, &err) != BR_OK))
        return br_cli_usage_error("explore", "--vin '%s': expected V or V/VMAX", text);
    if (!slash)
        eo->vbus_max = eo->vbus;
    if (!(eo->vbus > 0 && eo->vbus < 1e6 && eo->vbus_max >= eo->vbus && eo->vbus_max < 1e6))
        return br_cli_usage_error("explore", "--vin '%s': expected 0 < V <= VMAX < 1 MV", text);
    return BR_EXIT_OK;
}

static int parse_value(const char *opt, const char *text, br_kind kind, double lo, double *out)
{
    br_error err;
    if (br_unit_parse(text, kind, out, &err) != BR_OK || !(*out >= lo && *out < 1e12))
        return br_cli_usage_error("explore", "--%s '%s': expected a value of at least %g", opt,
                                  text, lo);
    return BR_EXIT_OK;
}

static int yield_options(const args *a, explore_opts *eo);

static int options(const args *a, explore_opts *eo)
{
    explore_opts_default(eo);
    eo->corners = a->corners;
    eo->scale_caps = a->scale_caps;
    if (!a->catalog || !a->vin || !a->levels || !a->fsw)
        return br_cli_usage_error("explore", "--catalog, --vin, --levels and --fsw are required");
    if (parse_vin(a->vin, eo) || parse_levels(a->levels, eo) || parse_fsw(a->fsw, eo))
        return BR_EXIT_INPUT;
    if ((a->iload && parse_value("load-current", a->iload, BR_KIND_CURRENT, 0, &eo->iload)) ||
        (a->margin && parse_value("min-margin", a->margin, BR_KIND_VOLTAGE, 0, &eo->target)) ||
        (a->max_startup &&
         parse_value("max-startup", a->max_startup, BR_KIND_TIME, 0, &eo->max_startup)) ||
        (a->max_cost && parse_value("max-cost", a->max_cost, BR_KIND_NUMBER, 0, &eo->max_cost)))
        return BR_EXIT_INPUT;
    eo->limit[BR_EXPLORE_LOAD_CURRENT] = a->iload ? eo->iload : NAN;
    eo->limit[BR_EXPLORE_TARGET] = a->margin ? eo->target : NAN;
    eo->limit[BR_EXPLORE_MAX_STARTUP] = a->max_startup ? eo->max_startup : NAN;
    eo->limit[BR_EXPLORE_MAX_COST] = a->max_cost ? eo->max_cost : NAN;
    if (a->derating && br_cli_fraction("explore", "derating", a->derating, &eo->derating))
        return BR_EXIT_INPUT;
    if (a->derating && !(eo->derating > 0))
        return br_cli_usage_error("explore", "--derating '%s': expected a fraction above 0",
                                  a->derating);
    eo->limit[BR_EXPLORE_DERATING] = a->derating ? eo->derating : NAN;
    long v;
    if (a->threads && br_cli_long("explore", "threads", a->threads, 1, 64, &v))
        return BR_EXIT_INPUT;
    eo->threads = a->threads ? (int)v : 0;
    return yield_options(a, eo);
}

/* --yield N and --seed S. */
static int yield_options(const args *a, explore_opts *eo)
{
    long v;
    if (a->yield && br_cli_long("explore", "yield", a->yield, 1, 1000000L, &eo->yield_samples))
        return BR_EXIT_INPUT;
    if (a->seed && !a->yield)
        return br_cli_usage_error("explore", "--seed without --yield");
    if (a->seed && br_cli_long("explore", "seed", a->seed, 0, 4294967295L, &v))
        return BR_EXIT_INPUT;
    eo->seed = a->seed ? (unsigned long)v : 1;
    return BR_EXIT_OK;
}

/* The study as the options set it, its progress handed to the run. */
static br_explore_study *study(const explore_opts *eo, br_cli_run *lr)
{
    br_explore_study *x = br_explore_study_create();
    int rc = x ? BR_OK : BR_ENOMEM;
    if (rc == BR_OK)
        rc = br_explore_study_set_bus(x, eo->vbus, eo->vbus_max) ||
             br_explore_study_set_levels(x, eo->lmin, eo->lmax) ||
             br_explore_study_set_frequencies(x, eo->fsw, eo->nfsw) ||
             br_explore_study_set_corners(x, eo->corners) ||
             br_explore_study_set_scale_caps(x, eo->scale_caps) ||
             br_explore_study_set_threads(x, eo->threads) ||
             br_explore_study_set_yield(x, eo->yield_samples, eo->seed) ||
             br_explore_study_set_shard(x, eo->shard_k, eo->shard_n) ||
             br_explore_study_set_given(x, eo->given, eo->ngiven, br_explore_record_size()) ||
             br_explore_study_set_progress(x, br_cli_run_progress, br_cli_run_stop, lr);
    for (int i = 0; rc == BR_OK && i < BR_EXPLORE_LIMIT_COUNT; i++)
        rc = br_explore_study_set(x, i, eo->limit[i]);
    if (rc != BR_OK) {
        br_explore_study_free(x);
        return NULL;
    }
    return x;
}

/* Combination i's figure (key a br_explore_key). */
static int row_value(const br_explore_study *x, int i, int key)
{
    double v = 0;
    br_explore_value(x, i, key, &v);
    return (int)v;
}

/* The next design file: its text, at DIR/NAME-NUMBER.xml. */
static br_text *design_slot(const args *a, outputs *o, const char *name, int number)
{
    br_text *t = br_text_create();
    o->design[o->ndesigns] = t;
    snprintf(o->path[o->ndesigns++], sizeof o->path[0], "%s/%s-%d.xml", a->designs, name, number);
    return t;
}

/* The design file of each front member, DIR/explore-RANK.xml, and of
 * each split design judged, DIR/explore-split-ROW.xml (ROW counted from 1
 * in the order judged). */
static int front_designs(const args *a, outputs *o, br_error *err)
{
    int n = 0, nfiles = 0;
    br_explore_combinations(o->x, &n);
    for (int i = 0; i < n; i++)
        nfiles += row_value(o->x, i, BR_XV_FRONT) + (row_value(o->x, i, BR_XV_INJECT_RAIL) > 0);
    o->design = calloc((size_t)nfiles + 1, sizeof *o->design);
    o->path = calloc((size_t)nfiles + 1, sizeof *o->path);
    if (!o->design || !o->path)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    int rc = BR_OK;
    for (int i = 0; rc == BR_OK && i < n; i++) {
        if (row_value(o->x, i, BR_XV_INJECT_RAIL) > 0) {
            br_text *t = design_slot(a, o, "explore-split", i + 1);
            rc = t ? br_explore_split_file(o->x, i, t, err) : BR_ENOMEM;
        }
        if (rc != BR_OK || !row_value(o->x, i, BR_XV_FRONT))
            continue;
        br_text *t = design_slot(a, o, "explore", row_value(o->x, i, BR_XV_RANK));
        rc = t ? br_explore_design_file(o->x, i, t, err) : BR_ENOMEM;
    }
    return rc;
}

static int compute(const char *path, const args *a, const explore_opts *eo, br_cli_run *lr,
                   outputs *o, br_error *err)
{
    o->text = br_text_create();
    o->csv = a->csv ? br_text_create() : NULL;
    o->svg = a->svg ? br_text_create() : NULL;
    o->x = study(eo, lr);
    if (!o->text || (a->csv && !o->csv) || (a->svg && !o->svg) || !o->x)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    int rc = br_design_load(path, &o->d, err);
    if (rc == BR_OK)
        rc = br_catalog_load(a->catalog, &o->cat, err);
    if (rc == BR_OK && a->parts)
        rc = br_catalog_load(a->parts, &o->parts, err);
    if (rc == BR_OK && o->parts)
        rc = br_explore_study_set_parts(o->x, o->parts);
    if (rc == BR_ENOMEM && !err->msg[0])
        br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    if (rc == BR_OK)
        rc = br_explore_study_run(o->x, o->d, o->cat, err);
    if (eo->shard_n > 0) /* a slice: no report */
        return rc;
    if (rc == BR_OK)
        rc = br_explore_study_render(o->x, BR_FORMAT_TEXT, o->text, err);
    if (rc == BR_OK && o->csv)
        rc = br_explore_study_render(o->x, BR_FORMAT_CSV, o->csv, err);
    if (rc == BR_OK && o->svg)
        rc = br_explore_study_render(o->x, BR_FORMAT_SVG, o->svg, err);
    if (rc == BR_OK && a->designs)
        rc = front_designs(a, o, err);
    if (rc == BR_ENOMEM && !err->msg[0])
        br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory rendering the report");
    return rc;
}

/* Every output, the front's design files included, checked against the
 * inputs (a template named like a front member's file is not overwritten)
 * and then written, all or none. */
static int write_all(const args *a, const char *design, outputs *o)
{
    int n = 2 + o->ndesigns;
    br_cli_file *files = calloc((size_t)n, sizeof *files);
    const char **paths = calloc((size_t)n, sizeof *paths);
    const char **names = calloc((size_t)n, sizeof *names);
    int status = files && paths && names ? BR_EXIT_OK : BR_EXIT_INPUT;
    if (status != BR_EXIT_OK)
        fprintf(stderr, "bootrung: explore: out of memory\n");
    for (int i = 0; status == BR_EXIT_OK && i < n; i++) {
        files[i] = i == 0   ? (br_cli_file){o->csv, a->csv}
                   : i == 1 ? (br_cli_file){o->svg, a->svg}
                            : (br_cli_file){o->design[i - 2], o->path[i - 2]};
        paths[i] = files[i].path;
        names[i] = i == 0 ? "csv" : i == 1 ? "svg" : "designs";
    }
    const char *const in[] = {design, a->catalog, a->parts};
    if (status == BR_EXIT_OK)
        status = br_cli_outputs("explore", names, paths, n, in, a->parts ? 3 : 2);
    static const char *const verdict[] = {"verdict:", NULL};
    if (status == BR_EXIT_OK)
        status = br_cli_write(files, n, o->text, a->quiet, verdict, 0);
    free(files);
    free(paths);
    free(names);
    return status;
}

static int judged(const void *x, long i)
{
    int has = 0;
    br_explore_judged(x, (int)i, &has);
    return has;
}

/* The shard's combinations. */
static int write_shard(int argc, char **argv, const char *path, const args *a,
                       const explore_opts *eo, const br_explore_study *x)
{
    const void *rec = NULL;
    size_t size = 0;
    long n = 0;
    br_explore_records(x, &rec, &size, &n);
    br_shard_head h = {argc, argv, path, eo->shard_k, eo->shard_n, size, n, a->catalog, a->parts};
    return br_cli_shard_write(&h, rec, judged, x, a->shard_file ? a->shard_file : "-");
}

/* The rows merged from shards. */
static int take_given(explore_opts *eo, const br_cli_given *given)
{
    if (!given)
        return BR_EXIT_OK;
    if (given->size != br_explore_record_size())
        return br_cli_usage_error("merge", "the shards' records are not explore's");
    eo->given = given->rec;
    eo->ngiven = given->total;
    return BR_EXIT_OK;
}

int cmd_explore(int argc, char **argv)
{
    return br_cli_explore_main(argc, argv, NULL);
}

int br_cli_explore_main(int argc, char **argv, const br_cli_given *given)
{
    args a = {0};
    const br_opt opts[] = {
        {BR_OPT_STRING, "catalog", "PARTS.xml", &a.catalog,
         "switches by voltage class (rating), their drivers, link diodes (required)"},
        {BR_OPT_STRING, "parts", "PARTS.xml", &a.parts,
         "link diodes, and each survivor's rail capacitors sized, from here"},
        {BR_OPT_STRING, "vin", "V[/VMAX]", &a.vin,
         "bus voltage, and the highest the parts are rated for (required)"},
        {BR_OPT_STRING, "levels", "LO:HI", &a.levels, "level counts of the leg (required)"},
        {BR_OPT_STRING, "fsw", "F1,F2,...", &a.fsw, "switching frequencies (required)"},
        {BR_OPT_STRING, "load-current", "A", &a.iload, "load current (default: the design's)"},
        {BR_OPT_STRING, "derating", "F", &a.derating,
         "fraction of a voltage rating used (default: the design's diode derating)"},
        {BR_OPT_STRING, "min-margin", "V", &a.margin,
         "smallest margin in volts (default: a quarter of the UVLO hysteresis)"},
        {BR_OPT_STRING, "max-startup", "S", &a.max_startup, "longest start-up accepted"},
        {BR_OPT_STRING, "max-cost", "X", &a.max_cost, "highest cost of the catalog parts placed"},
        {BR_OPT_FLAG, "scale-caps", NULL, &a.scale_caps,
         "rail capacitors scaled by the rails each carries (default: the design's)"},
        {BR_OPT_FLAG, "corners", NULL, &a.corners,
         "judge the survivors and split designs at their worst corners too (slow)"},
        {BR_OPT_STRING, "csv", "PATH", &a.csv, "every combination as CSV to PATH (- stdout)"},
        {BR_OPT_STRING, "svg", "PATH", &a.svg, "plots of margin and cost against levels to PATH"},
        {BR_OPT_STRING, "designs", "DIR", &a.designs,
         "the design file of each front member into DIR (explore-RANK.xml)"},
        {BR_OPT_STRING, "yield", "N", &a.yield,
         "Monte Carlo yield of every feasible combination, N samples each"},
        {BR_OPT_STRING, "seed", "S", &a.seed, "seed of --yield's random numbers (default 1)"},
        {BR_OPT_STRING, "threads", "N", &a.threads,
         "worker threads, across combinations and within each (default: all)"},
        {BR_OPT_STRING, "shard", "K/N", &a.shard,
         "judge every N-th combination from the K-th only, write a shard file"},
        {BR_OPT_STRING, "shard-file", "PATH", &a.shard_file,
         "the shard file's path (default - stdout)"},
        {BR_OPT_FLAG, "quiet", NULL, &a.quiet, BR_QUIET_HELP},
        {BR_OPT_END, NULL, NULL, NULL, NULL},
    };
    const br_cmd_doc doc = {"explore", "FILE", ABOUT, opts, 1};
    char *pos[2];
    int parsed = br_cli_parse(&doc, argc, argv, pos);
    if (parsed != 0)
        return br_cli_parse_status(parsed);
    explore_opts eo;
    if (options(&a, &eo) != BR_EXIT_OK ||
        (a.shard && br_cli_shard_parse("explore", a.shard, &eo.shard_k, &eo.shard_n)) ||
        take_given(&eo, given))
        return BR_EXIT_INPUT;
    if (a.shard_file && !a.shard)
        return br_cli_usage_error("explore", "--shard-file without --shard");
    const char *const out[] = {a.csv, a.svg, a.shard_file};
    const char *const names[] = {"csv", "svg", "shard-file"};
    const char *const in[] = {pos[0], a.catalog, a.parts};
    if (br_cli_outputs("explore", names, out, 3, in, a.parts ? 3 : 2) != BR_EXIT_OK)
        return BR_EXIT_INPUT;
    outputs o = {0};
    br_error err;
    br_error_clear(&err);
    br_cli_run lr;
    br_cli_run_begin(&lr, "explore", a.quiet);
    int rc = compute(pos[0], &a, &eo, &lr, &o, &err);
    int status = br_cli_run_commit(&lr);
    if (status == BR_EXIT_OK && rc != BR_OK)
        status = br_cli_fail(&err, rc == BR_EINPUT && err.file[0] ? err.file : pos[0]);
    else if (status == BR_EXIT_OK && eo.shard_n > 0)
        status = write_shard(argc, argv, pos[0], &a, &eo, o.x);
    else if (status == BR_EXIT_OK)
        status = write_all(&a, pos[0], &o);
    br_cli_run_end(&lr);
    if (status == BR_EXIT_OK && eo.shard_n == 0) {
        int result = BR_RESULT_UNDETERMINED;
        br_explore_result(o.x, &result);
        status = result == BR_RESULT_PASS   ? BR_EXIT_OK
                 : result == BR_RESULT_FAIL ? BR_EXIT_FAIL
                                            : BR_EXIT_UNDETERMINED;
    }
    outputs_free(&o);
    return status;
}

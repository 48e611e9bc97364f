/* cmd_merge.c - `bootrung merge SHARD...`: the shard files of one sweep
 * (map or yield run with --shard K/N) put back together, and the run's
 * report and files written exactly as the run without shards writes them. */
#include "cli.h"
#include "shard.h"

#include <errno.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

static const char ABOUT[] =
    "Merge the shard files of one sweep: map, yield or explore run N times with\n"
    "--shard 1/N ... --shard N/N, each judging its own slice of the points.\n"
    "The files must come from the same version of bootrung on the same kind of\n"
    "machine, with the same arguments, the same design file and (explore) the\n"
    "same catalog, unchanged since, and hold every shard once. merge then writes\n"
    "the report and every file the arguments ask for, exactly as the run without\n"
    "--shard would have (yield judges its nominal and one-at-a-time points\n"
    "again, in seconds; the samples come from the shards). Run it where the\n"
    "arguments' paths lead to the design file and to where the outputs should\n"
    "go.\n"
    "Exit status: that of the verb merged; 2 when the shards do not fit together.\n";

#define MAX_LINE 64

typedef struct merged {
    char *head;          /* the header lines before "shard", the same in every file */
    char *points_line;   /* "points TOTAL" */
    int n;               /* shards */
    unsigned char *seen; /* [n] shard K-1 read */
    size_t size;         /* record bytes */
    long total;          /* records */
    unsigned char *rec;  /* total * size */
    unsigned char *have; /* [total] */
} merged;

static int fail(const char *path, long line, const char *fmt, ...)
    __attribute__((format(printf, 3, 4)));

/* "bootrung: FILE:LINE: field: message", and the status of bad input. */
static int fail(const char *path, long line, const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    fprintf(stderr, "bootrung: %s:%ld: ", path, line);
    vfprintf(stderr, fmt, ap);
    fputc('\n', stderr);
    va_end(ap);
    return BR_EXIT_INPUT;
}

static int hexval(int c)
{
    return c >= '0' && c <= '9' ? c - '0' : c >= 'a' && c <= 'f' ? c - 'a' + 10 : -1;
}

/* n bytes from hex text s (exactly 2n digits, then the end or a newline). */
static int unhex(const char *s, unsigned char *out, size_t n)
{
    for (size_t i = 0; i < n; i++) {
        int a = hexval(s[2 * i]), b = a >= 0 ? hexval(s[2 * i + 1]) : -1;
        if (b < 0)
            return -1;
        out[i] = (unsigned char)(a * 16 + b);
    }
    return s[2 * n] == '\0' || s[2 * n] == '\n' ? 0 : -1;
}

static int append(char **buf, size_t *len, const char *line)
{
    size_t n = strlen(line);
    char *b = realloc(*buf, *len + n + 1);
    if (!b)
        return -1;
    memcpy(b + *len, line, n + 1);
    *buf = b;
    *len += n;
    return 0;
}

/* The record count and size once the first file has said them. */
static int take_points(merged *m, const char *path, long ln, const char *line)
{
    char *end = NULL;
    long total = strtol(line + 7, &end, 10);
    if (!end || *end != '\n' || total < 1 || total > 100000001L)
        return fail(path, ln, "%s: expected 'points TOTAL'", "points");
    if (m->points_line)
        return strcmp(m->points_line, line) == 0
                   ? BR_EXIT_OK
                   : fail(path, ln, "%s: another run than the first shard's", "points");
    m->points_line = strdup(line);
    m->total = total;
    m->rec = calloc((size_t)total, m->size);
    m->have = calloc((size_t)total, 1);
    if (!m->points_line || !m->rec || !m->have)
        return fail(path, ln, "%s", "out of memory for the merged points");
    return BR_EXIT_OK;
}

/* The record size from the program line ("program VERSION SIZE ..."). */
static size_t record_size(const char *head)
{
    const char *p = strstr(head, "\nprogram ");
    p = p ? strchr(p + 9, ' ') : NULL;
    return p ? (size_t)strtoul(p + 1, NULL, 10) : 0;
}

/* The header of one file (up to "shard K N"): the same as the first's. */
static int check_head(merged *m, const char *path, long ln, char *head, const char *shard_line)
{
    br_text *t = br_text_create();
    int ok = t && br_cli_shard_program(t, record_size(head)) == BR_OK &&
             strncmp(head, br_text_data(t), br_text_len(t)) == 0;
    br_text_free(t);
    if (!ok)
        free(head);
    if (!ok)
        return fail(path, 1, "%s: not a shard file of this version of bootrung on this machine",
                    "shard");
    if (!m->head) {
        m->head = head;
        m->size = record_size(head);
    } else if (strcmp(m->head, head) != 0) {
        free(head);
        return fail(path, ln,
                    "%s: another run than the first shard's (program, verb, "
                    "arguments or design differ)",
                    "shard");
    } else
        free(head);
    int k, n, used = 0;
    if (sscanf(shard_line, "shard %d %d%n", &k, &n, &used) != 2 || shard_line[used] != '\n' ||
        n < 1 || k < 1 || k > n || (m->n && n != m->n))
        return fail(path, ln, "%s: expected 'shard K N' with the first shard's N", "shard");
    if (!m->n && !(m->seen = calloc((size_t)n, 1)))
        return fail(path, ln, "%s", "out of memory");
    m->n = n;
    if (m->seen[k - 1])
        return fail(path, ln, "%s: this shard was given twice", "shard");
    m->seen[k - 1] = 1;
    return BR_EXIT_OK;
}

/* One record line "p INDEX HEX". */
static int take_record(merged *m, const char *path, long ln, const char *line)
{
    char *end = NULL;
    long i = strtol(line + 2, &end, 10);
    if (!end || *end != ' ' || i < 0 || i >= m->total ||
        unhex(end + 1, m->rec + (size_t)i * m->size, m->size) != 0)
        return fail(path, ln, "%s: expected 'p INDEX HEX' with one whole record", "p");
    m->have[i] = 1;
    return BR_EXIT_OK;
}

static int read_lines(merged *m, const char *path, FILE *f)
{
    char *line = NULL, *head = NULL;
    size_t cap = 0, hlen = 0;
    long ln = 0, count = 0, end_count = -1;
    int status = BR_EXIT_OK, in_head = 1;
    while (status == BR_EXIT_OK && end_count < 0 && getline(&line, &cap, f) > 0) {
        ln++;
        if (in_head && strncmp(line, "shard ", 6) == 0) {
            in_head = 0;
            status = head ? check_head(m, path, ln, head, line)
                          : fail(path, ln, "%s: no header before it", "shard");
            head = NULL;
        } else if (in_head) {
            if (append(&head, &hlen, line) != 0)
                status = fail(path, ln, "%s", "out of memory");
        } else if (strncmp(line, "points ", 7) == 0)
            status = take_points(m, path, ln, line);
        else if (strncmp(line, "p ", 2) == 0 && m->rec)
            status = take_record(m, path, ln, line), count++;
        else if (sscanf(line, "end %ld", &end_count) != 1)
            status = fail(path, ln, "%s: a line a shard file does not have", "line");
    }
    free(head);
    free(line);
    if (status == BR_EXIT_OK && end_count != count)
        status = fail(path, ln,
                      "%s: the file ends before its 'end' line, or its count is "
                      "wrong (a shard that did not finish?)",
                      "end");
    return status;
}

static int read_shard(merged *m, const char *path)
{
    FILE *f = fopen(path, "r");
    if (!f)
        return fail(path, 0, "%s", strerror(errno));
    int status = read_lines(m, path, f);
    fclose(f);
    return status;
}

/* Every shard read and every point present. */
static int complete(const merged *m, const char *path)
{
    for (int k = 0; k < m->n; k++)
        if (!m->seen[k]) {
            char what[32];
            snprintf(what, sizeof what, "%d/%d", k + 1, m->n);
            return fail(path, 0, "shard %s is missing", what);
        }
    for (long i = 0; i < m->total; i++)
        if (!m->have[i])
            return fail(path, 0, "%s: the shards do not hold every point", "points");
    return BR_EXIT_OK;
}

/* The verb and its arguments from the header's lines, as an argv. */
static int unpack_args(const merged *m, char **argv, int max, char *verb)
{
    int argc = 1;
    argv[0] = verb;
    for (const char *p = strstr(m->head, "\narg "); p && argc < max; p = strstr(p + 1, "\narg ")) {
        const char *s = p + 5, *e = strchr(s, '\n');
        size_t n = (size_t)(e - s) / 2;
        char *a = malloc(n + 1);
        if (!a || unhex(s, (unsigned char *)a, n) != 0) {
            free(a);
            return -1;
        }
        a[n] = '\0';
        argv[argc++] = a;
    }
    return argc;
}

/* The file of header line `key` ("design", "input") as the shards saw it. */
static int same_file(const merged *m, const char *path, const char *key)
{
    char look[16];
    snprintf(look, sizeof look, "\n%s ", key);
    const char *p = strstr(m->head, look);
    unsigned long long hash;
    long size;
    char hex[2 * 4096 + 3], file[4097];
    if (!p && strcmp(key, "design") != 0)
        return BR_EXIT_OK; /* a verb with fewer inputs */
    if (!p || sscanf(p + strlen(look), "%llx %ld %8194s", &hash, &size, hex) != 3 ||
        strlen(hex) > 2 * 4096 || unhex(hex, (unsigned char *)file, strlen(hex) / 2) != 0)
        return fail(path, 0, "%s: no %s line", key, key);
    file[strlen(hex) / 2] = '\0';
    br_error err;
    br_error_clear(&err);
    uint64_t now;
    long now_size;
    if (br_cli_shard_hash(file, &now, &now_size, &err) != BR_OK)
        return br_cli_fail(&err, file);
    if (now != hash || now_size != size)
        return fail(file, 0, "%s: the %s file changed since the shards ran", key,
                    strcmp(key, "design") == 0 ? "design" : "input");
    return BR_EXIT_OK;
}

static int same_design(const merged *m, const char *path)
{
    int status = same_file(m, path, "design");
    status = status == BR_EXIT_OK ? same_file(m, path, "input") : status;
    return status == BR_EXIT_OK ? same_file(m, path, "input2") : status;
}

static int dispatch(const merged *m, const char *path)
{
    char verb[MAX_LINE] = "";
    const char *v = strstr(m->head, "\nverb ");
    if (!v || sscanf(v, "\nverb %63s", verb) != 1)
        return fail(path, 0, "%s: no verb line", "verb");
    const br_cli_given given = {m->rec, m->total, m->size};
    char *argv[256];
    int argc = unpack_args(m, argv, 256, verb), status;
    if (argc < 0)
        status = fail(path, 0, "%s: a bad argument line", "arg");
    else if (strcmp(verb, "map") == 0)
        status = br_cli_map_main(argc, argv, &given);
    else if (strcmp(verb, "yield") == 0)
        status = br_cli_yield_main(argc, argv, &given);
    else if (strcmp(verb, "explore") == 0)
        status = br_cli_explore_main(argc, argv, &given);
    else
        status = fail(path, 0, "verb: '%s' has no shards", verb);
    for (int i = 1; i < argc; i++)
        free(argv[i]);
    return status;
}

static int merge(char **paths, int n)
{
    merged m = {0};
    int status = BR_EXIT_OK;
    for (int i = 0; i < n && status == BR_EXIT_OK; i++)
        status = read_shard(&m, paths[i]);
    if (status == BR_EXIT_OK && !m.rec)
        status = fail(paths[0], 0, "%s: no 'points' line", "points");
    if (status == BR_EXIT_OK)
        status = complete(&m, paths[n - 1]);
    if (status == BR_EXIT_OK)
        status = same_design(&m, paths[0]);
    if (status == BR_EXIT_OK)
        status = dispatch(&m, paths[0]);
    free(m.head);
    free(m.points_line);
    free(m.seen);
    free(m.rec);
    free(m.have);
    return status;
}

int cmd_merge(int argc, char **argv)
{
    const br_opt opts[] = {{BR_OPT_END, NULL, NULL, NULL, NULL}};
    const br_cmd_doc doc = {"merge", "SHARD...", ABOUT, opts, 1};
    int first = 1;
    for (int i = 1; i < argc; i++) {
        if (strcmp(argv[i], "-h") == 0 || strcmp(argv[i], "--help") == 0) {
            br_cli_help(&doc, stdout);
            return BR_EXIT_OK;
        }
        if (strcmp(argv[i], "--") == 0 && i == first) {
            first = i + 1;
            continue;
        }
        if (argv[i][0] == '-' && argv[i][1] && i >= first && first == 1)
            return br_cli_usage_error("merge", "unknown option '%s'", argv[i]);
    }
    if (argc - first < 1)
        return br_cli_usage_error("merge", "expected the shard files");
    return merge(argv + first, argc - first);
}

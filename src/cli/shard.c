/* shard.c - shard files: what one slice of a sweep judged, to be merged.
 *
 * A sweep verb run with --shard K/N judges a deterministic slice of its
 * points and writes them here instead of a report; `merge` reads the N
 * files, checks that they come from one run (the same program, verb,
 * arguments and design file) and cover every point, and runs the verb
 * again with the points given, so it writes exactly what the run without
 * shards would have written.
 *
 * The format is our own line-oriented text:
 *
 *   bootrung-shard 1
 *   program VERSION RECORD-BYTES LAYOUT-CHECK
 *   verb map
 *   design HASH BYTES HEXPATH  FNV-1a 64 of the design file, its size, its path
 *   input HASH BYTES HEXPATH   the same of another input (explore's catalog), when there is one
 *   input2 HASH BYTES HEXPATH  the same of a third (explore's parts catalog), when there is one
 *   arg HEX                    each argument of the verb, hex-coded
 *   shard K N
 *   points TOTAL
 *   p INDEX HEX                one judged point, its bytes as the program holds them
 *   end COUNT
 *
 * The records are the program's own structures byte for byte, so shards
 * merge only with the same version of bootrung on the same kind of
 * machine; the program line says which, and merge refuses the rest. */
#include "shard.h"

#include "bootrung/report.h"

#include <errno.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#ifndef BR_VERSION
#define BR_VERSION "unknown"
#endif

#define SHARD_MAGIC "bootrung-shard 1"

int br_cli_shard_parse(const char *verb, const char *text, int *k, int *n)
{
    char *end = NULL;
    long a = strtol(text, &end, 10), b = 0;
    if (end && *end == '/')
        b = strtol(end + 1, &end, 10);
    if (!end || *end || b < 1 || b > 100000 || a < 1 || a > b)
        return br_cli_usage_error(verb, "--shard '%s': expected K/N, 1 <= K <= N <= 100000", text);
    *k = (int)a;
    *n = (int)b;
    return BR_EXIT_OK;
}

int br_cli_shard_hash(const char *path, uint64_t *hash, long *size, br_error *err)
{
    FILE *f = fopen(path, "rb");
    if (!f)
        return br_error_set(err, BR_EIO, path, 0, NULL, "cannot read the design file: %s",
                            strerror(errno));
    uint64_t h = 1469598103934665603ULL;
    long n = 0;
    for (int c = getc(f); c != EOF; c = getc(f), n++)
        h = (h ^ (uint64_t)(unsigned char)c) * 1099511628211ULL;
    int bad = ferror(f);
    fclose(f);
    if (bad)
        return br_error_set(err, BR_EIO, path, 0, NULL, "cannot read the design file");
    *hash = h;
    *size = n;
    return BR_OK;
}

int br_cli_shard_hex(br_text *t, const void *p, size_t n)
{
    static const char digit[] = "0123456789abcdef";
    const unsigned char *b = p;
    char buf[257];
    int rc = BR_OK;
    size_t at = 0;
    for (size_t i = 0; i < n && rc == BR_OK; i++) {
        buf[at++] = digit[b[i] >> 4];
        buf[at++] = digit[b[i] & 15];
        if (at == 256 || i + 1 == n) {
            buf[at] = '\0';
            rc = br_text_put(t, buf);
            at = 0;
        }
    }
    return rc;
}

int br_cli_shard_program(br_text *t, size_t size)
{
    double probe = 1.0 / 3.0; /* the byte order and format of a double */
    int rc = br_text_printf(t, SHARD_MAGIC "\nprogram %s %zu %zu-", BR_VERSION, size, sizeof(long));
    rc |= br_cli_shard_hex(t, &probe, sizeof probe);
    rc |= br_text_put(t, "\n");
    return rc;
}

/* Whether argument i of argv is --shard or --shard-file (or their value). */
static int shard_arg(char **argv, int i)
{
    static const char *const names[] = {"--shard", "--shard-file"};
    for (int a = 0; a < 2; a++) {
        size_t len = strlen(names[a]);
        if (strcmp(argv[i], names[a]) == 0 ||
            (strncmp(argv[i], names[a], len) == 0 && argv[i][len] == '='))
            return 1;
        if (i > 1 && strcmp(argv[i - 1], names[a]) == 0)
            return 1;
    }
    return 0;
}

/* The header: program, verb, design, the arguments but the shard's own. */
/* The line of another input file: its hash, size and path. */
static int input_line(br_text *t, const char *key, const char *path, br_error *err)
{
    uint64_t hash;
    long size;
    int rc = br_cli_shard_hash(path, &hash, &size, err);
    if (rc != BR_OK)
        return rc;
    rc |= br_text_printf(t, "%s %016llx %ld ", key, (unsigned long long)hash, size);
    rc |= br_cli_shard_hex(t, path, strlen(path));
    rc |= br_text_put(t, "\n");
    return rc == BR_OK ? BR_OK : br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
}

static int put_head(br_text *t, const br_shard_head *h, br_error *err)
{
    uint64_t hash;
    long size;
    int rc = br_cli_shard_hash(h->design, &hash, &size, err);
    if (rc != BR_OK)
        return rc;
    rc |= br_cli_shard_program(t, h->size);
    rc |= br_text_printf(t, "verb %s\ndesign %016llx %ld ", h->argv[0], (unsigned long long)hash,
                         size);
    rc |= br_cli_shard_hex(t, h->design, strlen(h->design));
    rc |= br_text_put(t, "\n");
    int in = rc == BR_OK && h->other ? input_line(t, "input", h->other, err) : BR_OK;
    if (in == BR_OK && h->other2)
        in = input_line(t, "input2", h->other2, err);
    if (in != BR_OK)
        return in;
    for (int i = 1, opts = 1; i < h->argc; i++) {
        if (opts && strcmp(h->argv[i], "--") == 0)
            opts = 0;
        else if (opts && shard_arg(h->argv, i))
            continue;
        rc |= br_text_put(t, "arg ");
        rc |= br_cli_shard_hex(t, h->argv[i], strlen(h->argv[i]));
        rc |= br_text_put(t, "\n");
    }
    rc |= br_text_printf(t, "shard %d %d\npoints %ld\n", h->k, h->n, h->total);
    return rc == BR_OK ? BR_OK : br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
}

int br_cli_shard_write(const br_shard_head *h, const void *rec, br_cli_shard_judged judged,
                       const void *study, const char *path)
{
    br_error err;
    br_error_clear(&err);
    br_text *t = br_text_create();
    int rc = t ? put_head(t, h, &err) : br_error_set(&err, BR_ENOMEM, NULL, 0, NULL, "no memory");
    long count = 0;
    for (long i = 0; rc == BR_OK && i < h->total; i++) {
        if (!judged(study, i))
            continue;
        rc |= br_text_printf(t, "p %ld ", i);
        rc |= br_cli_shard_hex(t, (const char *)rec + (size_t)i * h->size, h->size);
        rc |= br_text_put(t, "\n");
        count++;
    }
    if (rc == BR_OK && br_text_printf(t, "end %ld\n", count) != BR_OK)
        rc = BR_ENOMEM;
    if (rc == BR_ENOMEM && !err.msg[0])
        br_error_set(&err, BR_ENOMEM, NULL, 0, NULL, "out of memory for the shard file");
    int status = rc != BR_OK ? br_cli_fail(&err, h->design) : br_cli_save(t, path);
    br_text_free(t);
    return status;
}

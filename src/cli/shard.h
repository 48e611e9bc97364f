/* shard.h - shard files of the sweep verbs (--shard K/N) and what merge
 * needs to read them back (shard.c describes the format). */
#ifndef BR_CLI_SHARD_H
#define BR_CLI_SHARD_H

#include "cli.h"

#include <stddef.h>
#include <stdint.h>

/* What a shard judged. */
typedef struct br_shard_head {
    int argc; /* the verb's arguments, argv[0] the verb (--shard and --shard-file
                 are left out of the file) */
    char **argv;
    const char *design; /* the design file */
    int k, n;           /* shard K of N */
    size_t size;        /* bytes of one record */
    long total;         /* records of the whole run */
    const char *other;  /* another input file whose identity is checked like the
                           design's (a catalog), or NULL */
    const char *other2; /* a third one (explore's parts catalog), or NULL */
} br_shard_head;

/* --shard K/N; on a bad value a usage error and BR_EXIT_INPUT. */
int br_cli_shard_parse(const char *verb, const char *text, int *k, int *n);

/* Whether the study's run judged record i (1) or left it to another shard
 * (0): each verb wraps its study's own accessor. */
typedef int (*br_cli_shard_judged)(const void *study, long i);

/* Write the shard file: the header, then record i of rec (h->total of
 * h->size bytes) wherever judged(study, i); to path ("-" stdout), all or
 * nothing.  A BR_EXIT_* status. */
int br_cli_shard_write(const br_shard_head *h, const void *rec, br_cli_shard_judged judged,
                       const void *study, const char *path);

/* FNV-1a 64 of a file's bytes and its size: its identity, not a defence. */
int br_cli_shard_hash(const char *path, uint64_t *hash, long *size, br_error *err);

/* The lines every shard file of this program starts with, for records of size bytes. */
int br_cli_shard_program(br_text *t, size_t size);

/* Bytes as lower-case hex. */
int br_cli_shard_hex(br_text *t, const void *p, size_t n);

/* Points merged from the shards, handed to the verb instead of judged. */
typedef struct br_cli_given {
    const void *rec; /* total records of size bytes */
    long total;
    size_t size;
} br_cli_given;

/* The verbs with their points given (merge) or judged (given NULL). */
int br_cli_map_main(int argc, char **argv, const br_cli_given *given);
int br_cli_yield_main(int argc, char **argv, const br_cli_given *given);
int br_cli_explore_main(int argc, char **argv, const br_cli_given *given);

#endif

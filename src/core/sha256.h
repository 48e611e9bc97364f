/* sha256.h - the SHA-256 digest (FIPS 180-4), for the checksums of the
 * files a sign-off pack holds. */
#ifndef BR_CORE_SHA256_H
#define BR_CORE_SHA256_H

#include "bootrung/report.h"

#include <stddef.h>
#include <stdint.h>

/* A digest in progress: init, update with the bytes in any pieces, then
 * final. */
typedef struct br_sha256 {
    uint32_t h[8];         /* the chaining state */
    uint64_t bytes;        /* message length so far */
    unsigned char blk[64]; /* the block being filled */
    size_t fill;           /* bytes in blk */
} br_sha256;

void br_sha256_init(br_sha256 *s);
void br_sha256_update(br_sha256 *s, const void *data, size_t n);

/* The digest as 64 lower-case hex digits and a NUL into hex[65]. */
void br_sha256_final(br_sha256 *s, char hex[65]);

/* br_sha256_hex, the digest of bytes in memory, is public:
 * bootrung/report.h. */

#endif

/* test_core_sha256.c - the digest of the sign-off pack's checksums
 * against the published test vectors. */
#include "core/sha256.h"
#include "testkit.h"

#include <stdlib.h>
#include <string.h>

/* NIST, "Secure Hash Standard" examples for SHA-256 (FIPS 180-2,
 * appendix B.1 and B.2; the same vectors in the NIST CSRC example
 * files): "abc" and the 448-bit two-block message. */
static void test_vectors(void)
{
    char hex[65];
    br_sha256_hex("abc", 3, hex);
    CU_ASSERT_STRING_EQUAL(hex, "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
    const char *two = "abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq";
    br_sha256_hex(two, strlen(two), hex);
    CU_ASSERT_STRING_EQUAL(hex, "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1");
    /* the empty message (common practice: the digest every sha256sum
     * prints for an empty file) */
    br_sha256_hex("", 0, hex);
    CU_ASSERT_STRING_EQUAL(hex, "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
}

/* FIPS 180-2 appendix B.3: one million 'a', fed in uneven pieces so the
 * block boundaries fall everywhere. */
static void test_million(void)
{
    char *a = malloc(1000000);
    CU_ASSERT_PTR_NOT_NULL_FATAL(a);
    memset(a, 'a', 1000000);
    br_sha256 s;
    char hex[65];
    br_sha256_init(&s);
    size_t at = 0, step = 1;
    while (at < 1000000) {
        size_t n = step < 1000000 - at ? step : 1000000 - at;
        br_sha256_update(&s, a + at, n);
        at += n;
        step = step * 7 % 131 + 1;
    }
    br_sha256_final(&s, hex);
    CU_ASSERT_STRING_EQUAL(hex, "cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0");
    free(a);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"published vectors", test_vectors},
        {"a million a in pieces", test_million},
        {NULL, NULL},
    };
    return br_test_main("core_sha256", cases);
}

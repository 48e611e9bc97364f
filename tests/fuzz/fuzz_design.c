/* fuzz_design.c - libFuzzer target for the design-file loader.
 *
 * Each input is a design file in memory.  The loader must either accept it
 * or refuse it with a located message; it must never crash, leak, read out
 * of bounds or hang.  An accepted design is also turned into the chain
 * model, since the model builder trusts whatever the loader let through.
 * Built only with -DBR_FUZZ=ON under clang (tests/fuzz/run.sh). */
#include "bootrung/bootrung.h"

#include <stddef.h>
#include <stdint.h>
#include <string.h>

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    br_design *d = NULL;
    br_chain *c = NULL;
    br_error err;
    br_error_clear(&err);
    int rc = br_design_load_memory((const char *)data, size, "fuzz.xml", &d, &err);
    if (rc != BR_OK) {
        /* a refusal must say something */
        if (err.msg[0] == '\0' || d != NULL)
            __builtin_trap();
        return 0;
    }
    if (br_chain_build(d, &c, &err) == BR_OK)
        br_chain_free(c);
    br_design_free(d);
    return 0;
}

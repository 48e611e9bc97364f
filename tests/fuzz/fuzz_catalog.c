/* fuzz_catalog.c - libFuzzer target for the part-catalog loader.
 *
 * Each input is a catalog file in memory.  The loader must either accept
 * it or refuse it with a located message; it must never crash, leak, read
 * out of bounds or hang.  Every part of an accepted catalog is also
 * resolved as `pick` would resolve it (a diode at room temperature, a
 * capacitor's effective value at a bias), since those trust whatever the
 * loader let through.  Built only with -DBR_FUZZ=ON under clang
 * (tests/fuzz/run.sh). */
#include "engine/diode.h"
#include "model/catalog.h"
#include "model/chain.h"

#include <math.h>
#include <stddef.h>
#include <stdint.h>

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    br_catalog *cat = NULL;
    br_error err;
    br_error_clear(&err);
    int rc = br_catalog_load_memory((const char *)data, size, "fuzz.xml", &cat, &err);
    if (rc != BR_OK) {
        /* a refusal must say something */
        if (err.msg[0] == '\0' || cat != NULL)
            __builtin_trap();
        return 0;
    }
    for (int i = 0; i < cat->ndiodes; i++) {
        br_diode d;
        if (br_diode_resolve(&cat->diodes[i], 300.15, &d, &err) == BR_OK &&
            !isfinite(br_diode_current(&d, 1.0, 0.7)))
            __builtin_trap(); /* an accepted part conducts a finite current */
    }
    for (int i = 0; i < cat->ncaps; i++) {
        br_cap c;
        br_cap_at_nominal(&cat->caps[i], 298.15, &c);
        if (!(br_cap_at(&c, 5.0) > 0.0)) /* nor a capacitor a useless one */
            __builtin_trap();
    }
    br_catalog_free(cat);
    return 0;
}

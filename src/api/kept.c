/* kept.c - a study's copy of its design and chain (kept.h). */
#include "kept.h"

#include "core/error.h"
#include "model/chain.h"
#include "model/design.h"

#include <stdlib.h>

int br_kept_take(br_kept *k, const br_design *d, br_error *err)
{
    br_chain_free(k->c);
    k->c = NULL;
    if (!k->d && !(k->d = malloc(sizeof *k->d)))
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory keeping the design");
    *k->d = *d;
    return br_chain_build(k->d, &k->c, err);
}

void br_kept_release(br_kept *k)
{
    br_chain_free(k->c);
    free(k->d);
    k->c = NULL;
    k->d = NULL;
}

/* kept.h - what a study of the public API keeps from its run for its
 * reports: a copy of the design (a br_design holds no pointers) and the
 * chain built from the copy as the caller builds theirs (br_chain_build,
 * the one public way), so the caller may free both once the run returns. */
#ifndef BR_API_KEPT_H
#define BR_API_KEPT_H

#include "bootrung/bootrung.h"

typedef struct br_kept {
    br_design *d; /* NULL: none kept */
    br_chain *c;
} br_kept;

/* Keep d and its chain (what was kept before goes).  A br_status with err
 * filled as br_chain_build fills it. */
int br_kept_take(br_kept *k, const br_design *d, br_error *err);
void br_kept_release(br_kept *k);

#endif

/* study.h - what the public API's part studies (src/api/pick.c, size.c,
 * supply.c, explore.c) share: a study keeps its own copy of the design
 * and the chain built from it, so that its reports render after the
 * caller's design is gone. */
#ifndef BR_API_STUDY_H
#define BR_API_STUDY_H

#include "bootrung/analysis.h"

#include "analyses/spread.h"
#include "model/chain.h"
#include "model/design.h"

/* A study's design and chain as of its last run. */
typedef struct br_study_base {
    br_design *d; /* a copy of the design run on (owned) */
    br_chain *c;  /* built from it (owned) */
} br_study_base;

/* Copy d and build its chain into b (freeing what b held).  A br_status. */
int br_study_base_set(br_study_base *b, const br_design *d, br_error *err);
void br_study_base_clear(br_study_base *b);

/* A br_outcome as a br_result. */
int br_study_result(int outcome);

/* The page of a study whose report is its text: text is rendered by
 * render(study, text) first; what, outcome and join as br_text_html
 * takes them, the verdict line starting "verdict:". */
int br_study_html(const br_chain *c, const char *what, int outcome, int join,
                  int (*render)(const void *study, br_text *out), const void *study, br_text *out,
                  br_error *err);

/* Whether a thread count is one a study takes (0: one per processor). */
int br_study_threads_ok(int threads);

#endif

/* study.c - what the public API's part studies share (study.h). */
#include "api/study.h"

#include "analyses/spread.h"
#include "core/error.h"
#include "model/tolerance.h"
#include "report/verb_pages.h"

#include "bootrung/parts.h"

_Static_assert(BR_STUDY_THREADS_MAX == BR_SPREAD_MAX_THREADS,
               "the public thread bound is the spread's");

int br_study_base_set(br_study_base *b, const br_design *d, br_error *err)
{
    br_study_base_clear(b);
    b->d = br_design_copy(d);
    if (!b->d)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory copying the design");
    int rc = br_chain_build(b->d, &b->c, err);
    if (rc != BR_OK)
        br_study_base_clear(b);
    return rc;
}

void br_study_base_clear(br_study_base *b)
{
    br_chain_free(b->c);
    br_design_free(b->d);
    b->c = NULL;
    b->d = NULL;
}

int br_study_result(int outcome)
{
    return outcome == BR_OUTCOME_PASS   ? BR_RESULT_PASS
           : outcome == BR_OUTCOME_FAIL ? BR_RESULT_FAIL
                                        : BR_RESULT_UNDETERMINED;
}

int br_study_html(const br_chain *c, const char *what, int outcome, int join,
                  int (*render)(const void *study, br_text *out), const void *study, br_text *out,
                  br_error *err)
{
    static const char *const verdict[] = {"verdict:", NULL};
    br_text *text = br_text_create();
    int rc = text ? render(study, text) : BR_ENOMEM;
    if (rc == BR_OK)
        rc = br_text_html(c, what, outcome, verdict, join, text, out, err);
    br_text_free(text);
    if (rc == BR_ENOMEM && err && !err->msg[0])
        br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory rendering the report");
    return rc;
}

int br_study_threads_ok(int threads)
{
    return threads >= 0 && threads <= BR_STUDY_THREADS_MAX;
}

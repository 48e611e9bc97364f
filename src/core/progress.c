/* progress.c - calling a caller's progress hook. */
#include "core/progress.h"

#include "core/error.h"

int br_progress_cancelled(br_error *err)
{
    return br_error_set(err, BR_ECANCEL, NULL, 0, NULL,
                        "stopped at the caller's request before the analysis finished");
}

int br_progress_call(const br_progress *p, double done, double total, br_error *err)
{
    if (br_progress_stopped(p))
        return br_progress_cancelled(err);
    if (!p || !p->fn)
        return BR_OK;
    return p->fn(p->ctx, done, total) ? br_progress_cancelled(err) : BR_OK;
}

int br_progress_stopped(const br_progress *p)
{
    return p && p->stop && p->stop(p->ctx);
}

br_progress br_progress_stop_only(const br_progress *p)
{
    br_progress only = {NULL, p ? p->ctx : NULL, p ? p->stop : NULL};
    return only;
}

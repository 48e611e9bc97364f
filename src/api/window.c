/* window.c - the window through the public API
 * (include/bootrung/analysis.h): an opaque object over analyses/window,
 * handing out its axes, intervals and start-up window as they are. */
#include "bootrung/analysis.h"
#include "bootrung/report.h"

#include "kept.h"

#include "analyses/window.h"
#include "core/error.h"
#include "core/progress.h"
#include "report/charts.h"
#include "report/verb_pages.h"
#include "report/window_report.h"

#include <math.h>
#include <stdlib.h>

_Static_assert((int)BR_WINDOW_DUTY == (int)BR_AXIS_DUTY &&
                   (int)BR_WINDOW_FREQUENCY == (int)BR_AXIS_FSW &&
                   (int)BR_WINDOW_PEAK == (int)BR_AXIS_IPK &&
                   (int)BR_WINDOW_LINE == (int)BR_AXIS_FLINE,
               "the public axes are the analysis's");

struct br_window_study {
    br_window *r; /* the last run's (NULL: none); large, so on the heap */
    int startup;
    double fmin, fmax; /* the frequency range searched (0: the default) */
    br_progress prog;
    br_kept kept; /* the design and its chain, for the reports */
};

br_window_study *br_window_study_create(void)
{
    return calloc(1, sizeof(br_window_study));
}

void br_window_study_free(br_window_study *w)
{
    if (w) {
        free(w->r);
        br_kept_release(&w->kept);
    }
    free(w);
}

int br_window_study_set_progress(br_window_study *w, br_progress_hook hook, br_stop_poll stop,
                                 void *ctx)
{
    if (!w)
        return BR_EUSAGE;
    w->prog = (br_progress){hook, ctx, stop};
    return BR_OK;
}

int br_window_study_set_startup(br_window_study *w, int on)
{
    if (!w || (on != 0 && on != 1))
        return BR_EUSAGE;
    w->startup = on;
    return BR_OK;
}

int br_window_study_set_range(br_window_study *w, double fmin, double fmax)
{
    if (!w || !(fmin >= 0) || !(fmax >= 0) || isinf(fmin) || isinf(fmax))
        return BR_EUSAGE;
    w->fmin = fmin;
    w->fmax = fmax;
    return BR_OK;
}

int br_window_study_run(br_window_study *w, const br_design *d, br_error *err)
{
    if (!w || !d)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_window_study_run: expected a study and a design");
    free(w->r);
    w->r = NULL;
    br_window *r = calloc(1, sizeof *r);
    if (!r)
        return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory for the window");
    br_window_opts o;
    br_window_opts_default(&o);
    o.startup = w->startup;
    o.progress = &w->prog;
    o.fmin = w->fmin;
    o.fmax = w->fmax;
    int rc = br_kept_take(&w->kept, d, err);
    if (rc == BR_OK)
        rc = br_window_run(d, &o, r, err);
    if (rc != BR_OK) {
        free(r);
        return rc;
    }
    w->r = r;
    return BR_OK;
}

static const br_sweep *sweep_of(const br_window_study *w, int axis)
{
    if (!w || !w->r)
        return NULL;
    const br_sweep *s[] = {&w->r->duty, &w->r->fsw, &w->r->ipk, &w->r->fline};
    return axis >= 0 && axis <= BR_WINDOW_LINE ? s[axis] : NULL;
}

int br_window_axis(const br_window_study *w, int axis, int key, double *out)
{
    const br_sweep *s = sweep_of(w, axis);
    if (!s || !out || key < 0 || key >= BR_WA_KEY_COUNT)
        return BR_EUSAGE;
    const double v[BR_WA_KEY_COUNT] = {
        [BR_WA_APPLIES] = s->applies, [BR_WA_LO] = s->lo,       [BR_WA_HI] = s->hi,
        [BR_WA_DESIGN] = s->design,   [BR_WA_FIXED] = s->fixed, [BR_WA_RESOLUTION] = s->resolution,
        [BR_WA_SPANS] = s->nspans,    [BR_WA_HOME] = s->home,
    };
    *out = v[key];
    return BR_OK;
}

int br_window_span(const br_window_study *w, int axis, int i, int key, double *out)
{
    const br_sweep *s = sweep_of(w, axis);
    if (!s || !out || i < 0 || i >= s->nspans || i >= BR_MAX_SPANS || key < 0 ||
        key >= BR_WS_KEY_COUNT)
        return BR_EUSAGE;
    const br_span *sp = &s->span[i];
    int lo = sp->lo.kind == BR_LIMIT_FOUND, hi = sp->hi.kind == BR_LIMIT_FOUND;
    const double v[BR_WS_KEY_COUNT] = {
        [BR_WS_LOW] = sp->lo.value,
        [BR_WS_LOW_FOUND] = lo,
        [BR_WS_LOW_OUTSIDE] = lo ? sp->lo.outside : NAN,
        [BR_WS_HIGH] = sp->hi.value,
        [BR_WS_HIGH_FOUND] = hi,
        [BR_WS_HIGH_OUTSIDE] = hi ? sp->hi.outside : NAN,
    };
    *out = v[key];
    return BR_OK;
}

int br_window_startup(const br_window_study *w, int axis, int key, double *out)
{
    if (!w || !w->r || !out || (axis != BR_WINDOW_DUTY && axis != BR_WINDOW_FREQUENCY) || key < 0 ||
        key >= BR_WU_KEY_COUNT)
        return BR_EUSAGE;
    const br_su_window *u = axis == BR_WINDOW_DUTY ? &w->r->su_duty : &w->r->su_fsw;
    int on = w->r->startup && u->applies;
    const double v[BR_WU_KEY_COUNT] = {
        [BR_WU_APPLIES] = on,
        [BR_WU_DESIGN_STARTS] = on ? u->design_starts : NAN,
        [BR_WU_LOW] = on ? u->low.value : NAN,
        [BR_WU_LOW_FAILING] = on ? u->low.failing : NAN,
        [BR_WU_LOW_STALLED] = on ? u->low.stalled : NAN,
        [BR_WU_HIGH] = on ? u->high.value : NAN,
        [BR_WU_HIGH_FAILING] = on ? u->high.failing : NAN,
        [BR_WU_HIGH_STALLED] = on ? u->high.stalled : NAN,
    };
    *out = v[key];
    return BR_OK;
}

int br_window_result(const br_window_study *w, int *out)
{
    if (!w || !w->r || !out)
        return BR_EUSAGE;
    /* no steady state found at the design point decides nothing */
    *out = isnan(w->r->design.margin) ? BR_RESULT_UNDETERMINED
           : w->r->design.holds       ? BR_RESULT_PASS
                                      : BR_RESULT_FAIL;
    return BR_OK;
}

/* ---- reports (bootrung/report.h) ---------------------------------------- */

static int html(const br_window_study *w, br_text *out, br_error *err)
{
    br_text *text = br_text_create();
    int rc = text ? br_window_text(w->kept.c, w->r, text, err)
                  : br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory");
    if (rc == BR_OK)
        rc = br_window_html(w->kept.c, w->r, text, out, err);
    br_text_free(text);
    return rc;
}

int br_window_study_render(const br_window_study *w, int format, br_text *out, br_error *err)
{
    if (!w || !w->r || !w->kept.c || !out)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_window_study_render: expected a study that has run, and a text");
    switch (format) {
    case BR_FORMAT_TEXT:
        return br_window_text(w->kept.c, w->r, out, err);
    case BR_FORMAT_XML:
        return br_window_xml(w->kept.c, w->r, br_version(), out, err);
    case BR_FORMAT_HTML:
        return html(w, out, err);
    case BR_FORMAT_SVG:
        if (br_chart_window(w->r, 1, out) != BR_OK)
            return br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory drawing the plot");
        return BR_OK;
    default:
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_window_study_render: the window offers text, XML, HTML and SVG");
    }
}

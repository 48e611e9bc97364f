/* map.c - the duty-frequency map through the public API
 * (include/bootrung/analysis.h): an opaque object over analyses/map,
 * handing out its grid points as judged. */
#include "bootrung/analysis.h"

#include "analyses/map.h"
#include "core/error.h"
#include "core/progress.h"

#include <math.h>
#include <stdlib.h>

struct br_map_study {
    br_map *r; /* the last run's (NULL: none) */
    br_map_opts o;
    br_progress prog;
};

br_map_study *br_map_study_create(void)
{
    br_map_study *m = calloc(1, sizeof *m);
    if (m)
        m->o.threads = 2; /* as the command line: the two axes' rows side by side */
    return m;
}

void br_map_study_free(br_map_study *m)
{
    if (m)
        br_map_free(m->r);
    free(m);
}

int br_map_study_set_progress(br_map_study *m, br_progress_hook hook, br_stop_poll stop, void *ctx)
{
    if (!m)
        return BR_EUSAGE;
    m->prog = (br_progress){hook, ctx, stop};
    return BR_OK;
}

int br_map_study_set_grid(br_map_study *m, double duty_from, double duty_to, int nduty,
                          double fsw_from, double fsw_to, int nfsw)
{
    if (!m)
        return BR_EUSAGE;
    m->o.duty_from = duty_from;
    m->o.duty_to = duty_to;
    m->o.nduty = nduty;
    m->o.fsw_from = fsw_from;
    m->o.fsw_to = fsw_to;
    m->o.nfsw = nfsw;
    return BR_OK;
}

int br_map_study_run(br_map_study *m, const br_design *d, br_error *err)
{
    if (!m || !d)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_map_study_run: expected a study and a design");
    br_map_free(m->r);
    m->r = NULL;
    br_map_opts o = m->o;
    o.progress = &m->prog;
    int rc = br_map_opts_check(&o, err); /* the grid, said as the library's error */
    if (rc == BR_OK)
        rc = br_map_run(d, &o, &m->r, err);
    if (rc != BR_OK) {
        br_map_free(m->r);
        m->r = NULL;
    }
    return rc;
}

int br_map_size(const br_map_study *m, int *nduty, int *nfsw)
{
    if (!m || !m->r || !nduty || !nfsw)
        return BR_EUSAGE;
    *nduty = m->r->nduty;
    *nfsw = m->r->nfsw;
    return BR_OK;
}

int br_map_point(const br_map_study *m, int i, int j, int key, double *out)
{
    if (!m || !m->r || !out || key < 0 || key >= BR_MAP_KEY_COUNT)
        return BR_EUSAGE;
    int design = i == -1 && j == -1;
    if (!design && (i < 0 || i >= m->r->nduty || j < 0 || j >= m->r->nfsw))
        return BR_EUSAGE;
    const br_hold_point *p = design ? &m->r->design : br_map_at(m->r, i, j);
    const double v[BR_MAP_KEY_COUNT] = {
        [BR_MAP_DUTY] = p->duty,   [BR_MAP_FSW] = p->fsw,     [BR_MAP_MARGIN] = p->margin,
        [BR_MAP_HOLDS] = p->holds, [BR_MAP_STAGE] = p->stage, [BR_MAP_CRITERION] = p->crit,
    };
    *out = v[key];
    return BR_OK;
}

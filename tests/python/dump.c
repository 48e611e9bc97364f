/* dump.c - the figures of one analysis through the C API, one per line as
 * "NAME VALUE" (%.17g: a double read back is the same double), for the
 * Python package's test to compare with what it reads through ctypes.
 * Names are spelled here from the C enumerators, so a key the package
 * maps to the wrong enumerator shows as a mismatch.
 *
 * usage: dump DESIGN [corners|window]
 * (runs BR_PART_ALL and the hold-up, the series kept; with "corners" the
 * worst-case corners, a yield of 200 samples and the window too; with
 * "window" the window and a small map) */
#include <bootrung/analysis.h>
#include <bootrung/bootrung.h>

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

typedef struct key {
    int key;
    const char *name;
} key;

static const key su_keys[] = {{BR_SU_COMPLETE, "complete"},
                              {BR_SU_TIME, "time"},
                              {BR_SU_SIMULATED, "simulated"},
                              {BR_SU_FIRST_STALLED, "first_stalled"},
                              {BR_SU_PERIODS_STEPPED, "periods_stepped"},
                              {-1, NULL}};
static const key sur_keys[] = {{BR_SUR_START, "start"},
                               {BR_SUR_FIRST_START, "first_start"},
                               {BR_SUR_DROPOUTS, "dropouts"},
                               {BR_SUR_FINAL, "final_voltage"},
                               {BR_SUR_LINK_IPEAK, "link_ipeak"},
                               {BR_SUR_LINK_I2T, "link_i2t"},
                               {-1, NULL}};
static const key sup_keys[] = {
    {BR_SUP_IPEAK, "ipeak"}, {BR_SUP_CHARGE, "charge"}, {BR_SUP_ENERGY, "energy"}, {-1, NULL}};
static const key ss_keys[] = {{BR_SS_RESIDUAL, "residual"},
                              {BR_SS_DRIFT, "drift"},
                              {BR_SS_PERIODS, "periods"},
                              {BR_SS_SUPPLY_IAVG, "supply_iavg"},
                              {-1, NULL}};
static const key rail_keys[] = {{BR_RAIL_VMIN, "vmin"},       {BR_RAIL_VMAX, "vmax"},
                                {BR_RAIL_VAVG, "vavg"},       {BR_RAIL_DRV_MIN, "drv_min"},
                                {BR_RAIL_M_UVLO, "m_uvlo"},   {BR_RAIL_M_GATE, "m_gate"},
                                {BR_RAIL_CAP_RMS, "cap_rms"}, {-1, NULL}};
static const key link_keys[] = {{BR_LINK_VREV, "vrev"},   {BR_LINK_IAVG, "iavg"},
                                {BR_LINK_IPEAK, "ipeak"}, {BR_LINK_QRR, "qrr"},
                                {BR_LINK_TJ, "tj"},       {-1, NULL}};
static const key hu_keys[] = {{BR_HU_DECIDED, "decided"},
                              {BR_HU_TIME, "time"},
                              {BR_HU_STAGE, "stage"},
                              {BR_HU_V_AT, "v_at"},
                              {-1, NULL}};
static const key corner_keys[] = {{BR_CORNER_WORST_FIGURE, "worst_figure"},
                                  {BR_CORNER_WORST_MARGIN, "worst_margin"},
                                  {BR_CORNER_NOMINAL_MARGIN, "nominal_margin"},
                                  {BR_CORNER_UNDETERMINED, "undetermined"},
                                  {-1, NULL}};
static const key yield_keys[] = {{BR_YIELD_PASS, "passed"},  {BR_YIELD_FAIL, "failed"},
                                 {BR_YIELD_YIELD, "yield_"}, {BR_YIELD_LO, "lo"},
                                 {BR_YIELD_HI, "hi"},        {-1, NULL}};
static const key yc_keys[] = {{BR_YC_FAILS, "fails"},
                              {BR_YC_MIN, "q_min"},
                              {BR_YC_Q01, "q_1"},
                              {BR_YC_MEDIAN, "median"},
                              {-1, NULL}};
static const key verdict_keys[] = {{BR_VERDICT_FIGURE, "figure"},
                                   {BR_VERDICT_LIMIT, "limit"},
                                   {BR_VERDICT_MARGIN, "margin"},
                                   {-1, NULL}};
static const key series_keys[] = {{BR_SERIES_RAIL, "rail"},
                                  {BR_SERIES_LINK_I, "link_current"},
                                  {BR_SERIES_DRIVER, "driver"},
                                  {BR_SERIES_VREV, "reverse"},
                                  {-1, NULL}};

static void put(const char *prefix, const char *name, double v)
{
    printf("%s%s %.17g\n", prefix, name, v);
}

static void startup(const br_analysis *a, int n)
{
    double v;
    char p[64];
    for (const key *k = su_keys; k->name; k++)
        if (br_startup_get(a, k->key, &v) == BR_OK)
            put("startup.", k->name, v);
    for (const key *k = sup_keys; k->name; k++)
        if (br_startup_supply(a, k->key, &v) == BR_OK)
            put("startup.supply.", k->name, v);
    for (int r = 0; r < n; r++) {
        snprintf(p, sizeof p, "startup.rails.%d.", r);
        for (const key *k = sur_keys; k->name; k++)
            if (br_startup_rail(a, r, k->key, &v) == BR_OK)
                put(p, k->name, v);
    }
}

static void steady(const br_analysis *a, int n)
{
    double v;
    char p[64];
    int nd = 0;
    br_steady_cases(a, &nd);
    for (int d = 0; d < nd; d++) {
        snprintf(p, sizeof p, "steady.%d.", d);
        for (const key *k = ss_keys; k->name; k++)
            if (br_steady_get(a, d, k->key, &v) == BR_OK)
                put(p, k->name, v);
        snprintf(p, sizeof p, "steady.%d.holdup.", d);
        for (const key *k = hu_keys; k->name; k++)
            if (br_holdup_get(a, d, k->key, &v) == BR_OK)
                put(p, k->name, v);
        for (int r = 0; r < n; r++) {
            snprintf(p, sizeof p, "steady.%d.rails.%d.", d, r);
            for (const key *k = rail_keys; k->name; k++)
                if (br_steady_rail(a, d, r, k->key, &v) == BR_OK)
                    put(p, k->name, v);
            snprintf(p, sizeof p, "steady.%d.links.%d.", d, r - 1);
            for (const key *k = link_keys; k->name && r > 0; k++)
                if (br_steady_link(a, d, r, k->key, &v) == BR_OK)
                    put(p, k->name, v);
        }
    }
}

static void verdict(const br_analysis *a)
{
    int n = 0;
    double v;
    char p[64];
    br_verdict_rows(a, &n);
    for (int i = 0; i < n; i++) {
        snprintf(p, sizeof p, "verdict.criteria.%d.", i);
        for (const key *k = verdict_keys; k->name; k++)
            if (br_verdict_value(a, i, k->key, &v) == BR_OK)
                put(p, k->name, v);
    }
}

/* A series by its length, its sum and its last sample (every sample
 * enters the sum). */
static void series(const br_analysis *a, int which, const char *label, int n)
{
    char p[96];
    for (const key *k = series_keys; k->name; k++)
        for (int r = 0; r < n; r++) {
            size_t len = 0;
            if (br_series_get(a, which, k->key, r, NULL, 0, &len) != BR_OK || len == 0)
                continue;
            double *buf = malloc(len * sizeof *buf), sum = 0;
            if (!buf)
                exit(2);
            br_series_get(a, which, k->key, r, buf, len, &len);
            for (size_t i = 0; i < len; i++)
                sum += buf[i];
            snprintf(p, sizeof p, "%s.series.%s.%d.", label, k->name, r);
            put(p, "len", (double)len);
            put(p, "sum", sum);
            put(p, "last", buf[len - 1]);
            free(buf);
        }
}

/* The worst-case corners: every row's figures and levels, the counts. */
static int corners(const br_design *d)
{
    br_error err;
    br_corner_search *s = br_corner_search_create();
    if (!s || br_corner_search_run(s, d, &err) != BR_OK)
        return 2;
    int n = 0, np = 0, level;
    long count;
    double v;
    char p[64];
    br_corner_rows(s, &n);
    br_corner_params(s, &np);
    for (int i = 0; i < n; i++) {
        snprintf(p, sizeof p, "corners.rows.%d.", i);
        for (const key *k = corner_keys; k->name; k++)
            if (br_corner_value(s, i, k->key, &v) == BR_OK)
                put(p, k->name, v);
        for (int j = 0; j < np; j++) {
            snprintf(p, sizeof p, "corners.rows.%d.levels.", i);
            char idx[16];
            snprintf(idx, sizeof idx, "%d", j);
            if (br_corner_level(s, i, j, &level) == BR_OK)
                put(p, idx, level);
        }
    }
    if (br_corner_count_of(s, BR_CORNERS_STARTUP_POINTS, &count) == BR_OK)
        put("corners.", "startup_points", (double)count);
    if (br_corner_count_of(s, BR_CORNERS_STEADY_POINTS, &count) == BR_OK)
        put("corners.", "steady_points", (double)count);
    br_corner_search_free(s);
    return 0;
}

/* The window: each duty and frequency interval's ends. */
static int window(const br_design *d)
{
    static const key ws[] = {{BR_WS_LOW, "low"}, {BR_WS_HIGH, "high"}, {-1, NULL}};
    br_error err;
    br_window_study *w = br_window_study_create();
    if (!w || br_window_study_run(w, d, &err) != BR_OK)
        return 2;
    double n, v;
    char p[64];
    for (int a = 0; a < 2; a++) {
        br_window_axis(w, a, BR_WA_SPANS, &n);
        for (int i = 0; i < (int)n; i++) {
            snprintf(p, sizeof p, "window.axes.%d.spans.%d.", a, i);
            for (const key *k = ws; k->name; k++)
                if (br_window_span(w, a, i, k->key, &v) == BR_OK)
                    put(p, k->name, v);
        }
        br_window_axis(w, a, BR_WA_DESIGN, &v);
        snprintf(p, sizeof p, "window.axes.%d.", a);
        put(p, "design", v);
    }
    br_window_study_free(w);
    return 0;
}

/* A 4 x 3 map from where the leg holds to where it does not. */
static int map(const br_design *d)
{
    static const key mk[] = {
        {BR_MAP_MARGIN, "margin"}, {BR_MAP_FSW, "fsw"}, {BR_MAP_STAGE, "stage"}, {-1, NULL}};
    br_error err;
    br_map_study *m = br_map_study_create();
    if (!m || br_map_study_set_grid(m, 0.005, 0.5, 4, 2e3, 120e3, 3) != BR_OK ||
        br_map_study_run(m, d, &err) != BR_OK)
        return 2;
    int nd = 0, nf = 0;
    double v;
    char p[64];
    br_map_size(m, &nd, &nf);
    for (int j = 0; j < nf; j++)
        for (int i = 0; i < nd; i++) {
            snprintf(p, sizeof p, "map.points.%d.%d.", j, i);
            for (const key *k = mk; k->name; k++)
                if (br_map_point(m, i, j, k->key, &v) == BR_OK)
                    put(p, k->name, v);
        }
    if (br_map_point(m, -1, -1, BR_MAP_MARGIN, &v) == BR_OK)
        put("map.design.", "margin", v);
    br_map_study_free(m);
    return 0;
}

/* Monte Carlo yield, 200 samples from seed 3: the counts, the interval,
 * the statistics of every criterion, the first sample's values. */
static int yield(const br_design *d)
{
    br_error err;
    br_yield_study *y = br_yield_study_create();
    if (!y || br_yield_study_set_samples(y, 200, 3) != BR_OK ||
        br_yield_study_run(y, d, &err) != BR_OK)
        return 2;
    double v;
    char p[64];
    for (const key *k = yield_keys; k->name; k++)
        if (br_yield_get(y, k->key, &v) == BR_OK)
            put("yield.", k->name, v);
    int np = 0;
    br_yield_params(y, &np);
    for (int i = 0; i < br_criteria(); i++) {
        snprintf(p, sizeof p, "yield.rows.%d.", i);
        for (const key *k = yc_keys; k->name; k++)
            if (br_yield_criterion(y, i, k->key, &v) == BR_OK)
                put(p, k->name, v);
        snprintf(p, sizeof p, "yield.rows.%d.rho.", i);
        for (int j = 0; j < np; j++)
            if (br_yield_rho(y, i, j, &v) == BR_OK)
                printf("%s%d %.17g\n", p, j, v);
    }
    for (int j = 0; j < np; j++)
        if (br_yield_sample_value(y, 0, j, &v) == BR_OK)
            printf("yield.values.0.%d %.17g\n", j, v);
    br_yield_study_free(y);
    return 0;
}

int main(int argc, char **argv)
{
    br_error err;
    br_design *d = NULL;
    br_chain *c = NULL;
    br_analysis *a = br_analysis_create();
    if (argc < 2 || argc > 3 || !a || br_design_load(argv[1], &d, &err) != BR_OK ||
        br_chain_build(d, &c, &err) != BR_OK || br_analysis_set_series(a, 1) != BR_OK ||
        br_analysis_run(a, c, BR_PART_ALL | BR_PART_HOLDUP, &err) != BR_OK) {
        fprintf(stderr, "dump: cannot analyse %s\n", argc > 1 ? argv[1] : "(none)");
        return 2;
    }
    int n = br_analysis_stages(a);
    startup(a, n);
    steady(a, n);
    verdict(a);
    series(a, BR_SERIES_STARTUP, "startup", n);
    series(a, BR_SERIES_STEADY, "steady.0", n);
    int rc = 0;
    if (argc == 3 && strcmp(argv[2], "window") == 0)
        rc = window(d) | map(d);
    else if (argc == 3)
        rc = corners(d) | yield(d) | window(d);
    br_analysis_free(a);
    br_chain_free(c);
    br_design_free(d);
    return rc;
}

/* consumer.c - a program built against an installed bootrung, as a user
 * would build one: it includes only the public headers and links the
 * installed library (tests/lib/install.sh builds it with pkg-config and
 * with find_package).
 *
 * usage: consumer VERSION DESIGN BAD-DESIGN
 * Loads DESIGN, builds its chain and runs its cold start, then loads BAD-DESIGN and checks that
 * the failure comes back as a record that names the file; reads "50 mV"
 * through the part studies' header.  Prints one line per step; exit 0
 * when every step went as expected. */
#include <bootrung/analysis.h>
#include <bootrung/bootrung.h>
#include <bootrung/parts.h>
#include <bootrung/report.h>

#include <stdio.h>
#include <string.h>

/* The cold start through the analysis API: a start-up time, or +inf. */
static int cold_start(const br_chain *c, br_error *err)
{
    br_analysis *a = br_analysis_create();
    double t = 0;
    int rc = a ? br_analysis_run(a, c, BR_PART_STARTUP, err) : BR_ENOMEM;
    if (rc == BR_OK)
        rc = br_startup_get(a, BR_SU_TIME, &t);
    if (rc == BR_OK)
        printf("start-up time %.6g s over %d rails\n", t, br_analysis_stages(a));
    br_analysis_free(a);
    return rc;
}

static int load_good(const char *path)
{
    br_error err;
    br_design *d = NULL;
    br_chain *c = NULL;
    char buf[1600];
    br_error_clear(&err);
    if (br_design_load(path, &d, &err) != BR_OK) {
        printf("load failed: %s\n", br_error_format(&err, buf, sizeof buf));
        return 1;
    }
    int rc = br_chain_build(d, &c, &err);
    if (rc == BR_OK && (rc = cold_start(c, &err)) != BR_OK)
        printf("start-up failed: %s\n", br_error_format(&err, buf, sizeof buf));
    else if (rc != BR_OK)
        printf("chain failed: %s\n", br_error_format(&err, buf, sizeof buf));
    else
        printf("loaded %s and built its chain\n", path);
    br_chain_free(c);
    br_design_free(d);
    return rc != BR_OK;
}

static int load_bad(const char *path)
{
    br_error err;
    br_design *d = NULL;
    char buf[1600];
    br_error_clear(&err);
    int rc = br_design_load(path, &d, &err);
    if (rc == BR_OK || d != NULL || strstr(err.file, path) == NULL) {
        printf("%s: expected a refusal that names the file, got status %s\n", path,
               br_status_name(rc));
        br_design_free(d);
        return 1;
    }
    printf("refused: %s\n", br_error_format(&err, buf, sizeof buf));
    return 0;
}

int main(int argc, char **argv)
{
    if (argc != 4) {
        fprintf(stderr, "usage: consumer VERSION DESIGN BAD-DESIGN\n");
        return 2;
    }
    if (strcmp(br_version(), argv[1]) != 0) {
        printf("library version %s, expected %s\n", br_version(), argv[1]);
        return 1;
    }
    printf("bootrung library %s\n", br_version());
    br_text *t = br_text_create();
    int bad = !t || br_text_printf(t, "%d rails", 3) != BR_OK || strcmp(br_text_data(t), "3 rails");
    br_text_free(t);
    if (bad) {
        printf("text buffer broken\n");
        return 1;
    }
    double v = 0;
    br_error err;
    if (br_unit_parse("50 mV", BR_KIND_VOLTAGE, &v, &err) != BR_OK ||
        !(v > 0.0499999 && v < 0.0500001)) {
        printf("quantity \"50 mV\" read as %g, expected 0.05\n", v);
        return 1;
    }
    return load_good(argv[2]) | load_bad(argv[3]);
}

/* check.c - the design check through the public API (bootrung/report.h):
 * the chain of a design and the design rules that need no simulation,
 * over report/check_report (its findings are counted as it renders). */
#include "bootrung/report.h"

#include "kept.h"

#include "core/error.h"
#include "model/chain.h"
#include "report/check_report.h"
#include "report/verb_pages.h"

#include <stdlib.h>

struct br_design_check {
    int strict;
    int done;            /* run */
    int findings, fatal; /* of the run */
    br_text *text;       /* the report, rendered by the run that counts */
    br_kept kept;
};

br_design_check *br_design_check_create(void)
{
    br_design_check *k = calloc(1, sizeof *k);
    if (k && !(k->text = br_text_create())) {
        free(k);
        return NULL;
    }
    return k;
}

void br_design_check_free(br_design_check *k)
{
    if (!k)
        return;
    br_text_free(k->text);
    br_kept_release(&k->kept);
    free(k);
}

int br_design_check_set_strict(br_design_check *k, int on)
{
    if (!k || (on != 0 && on != 1))
        return BR_EUSAGE;
    k->strict = on;
    return BR_OK;
}

int br_design_check_run(br_design_check *k, const br_design *d, br_error *err)
{
    if (!k || !d)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_design_check_run: expected a check and a design");
    k->done = 0;
    br_text_reset(k->text);
    int rc = br_kept_take(&k->kept, d, err);
    if (rc == BR_OK)
        rc = br_check_report(k->kept.c, k->text, &k->findings, &k->fatal, err);
    k->done = rc == BR_OK;
    return rc;
}

int br_design_check_counts(const br_design_check *k, int *findings, int *fatal)
{
    if (!k || !k->done || !findings || !fatal)
        return BR_EUSAGE;
    *findings = k->findings;
    *fatal = k->fatal;
    return BR_OK;
}

int br_design_check_result(const br_design_check *k, int *out)
{
    if (!k || !k->done || !out)
        return BR_EUSAGE;
    *out = k->fatal > 0 || (k->strict && k->findings > 0) ? BR_RESULT_FAIL : BR_RESULT_PASS;
    return BR_OK;
}

int br_design_check_render(const br_design_check *k, int format, br_text *out, br_error *err)
{
    static const char *const verdict[] = {BR_CHECK_VERDICT, NULL};
    int res;
    if (!k || !out || br_design_check_result(k, &res) != BR_OK)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_design_check_render: expected a check that has run, and a text");
    if (format == BR_FORMAT_TEXT)
        return br_text_put(out, br_text_data(k->text));
    if (format == BR_FORMAT_HTML)
        return br_text_html(k->kept.c, "design check",
                            res == BR_RESULT_FAIL ? BR_OUTCOME_FAIL : BR_OUTCOME_PASS, verdict, 0,
                            k->text, out, err);
    return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                        "br_design_check_render: the check offers text and HTML");
}

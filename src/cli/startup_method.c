/* startup_method.c - --startup-method, shared by every verb that runs a
 * start-up. */
#include "cli.h"

#include <string.h>

int br_cli_startup_method(const char *verb, const char *text, int *out)
{
    if (!text)
        return BR_EXIT_OK;
    if (strcmp(text, "envelope") == 0)
        *out = BR_SU_ENVELOPE;
    else if (strcmp(text, "periods") == 0)
        *out = BR_SU_PERIODS;
    else
        return br_cli_usage_error(verb, "--startup-method: got '%s', expected envelope or periods",
                                  text);
    return BR_EXIT_OK;
}

/* number_opt.c - numeric option values (counts, seeds, fractions), read
 * strictly: the whole text must be the number, within its range. */
#include "cli.h"

#include <errno.h>
#include <stdlib.h>

int br_cli_long(const char *verb, const char *opt, const char *text, long lo, long hi, long *out)
{
    char *end;
    errno = 0;
    long v = text ? strtol(text, &end, 10) : 0;
    if (!text || end == text || *end != '\0' || errno != 0 || v < lo || v > hi)
        return br_cli_usage_error(verb, "--%s: got '%s', expected a whole number from %ld to %ld",
                                  opt, text ? text : "", lo, hi);
    *out = v;
    return BR_EXIT_OK;
}

int br_cli_fraction(const char *verb, const char *opt, const char *text, double *out)
{
    char *end;
    errno = 0;
    double v = text ? strtod(text, &end) : 0.0;
    int pct = text && end != text && *end == '%' && end[1] == '\0';
    if (pct)
        v /= 100.0;
    if (!text || end == text || (*end != '\0' && !pct) || errno != 0 || !(v >= 0.0 && v <= 1.0))
        return br_cli_usage_error(verb,
                                  "--%s: got '%s', expected a fraction from 0 to 1 (or 0%% "
                                  "to 100%%)",
                                  opt, text ? text : "");
    *out = v;
    return BR_EXIT_OK;
}

/* quiet.c - what --quiet prints: the report's verdict line alone.
 *
 * Every verb's report already states its verdict on a line of its own;
 * --quiet prints that line and nothing else, so the terminal shows one
 * line per run and the exit status says the rest. */
#include "cli.h"

#include <string.h>

static int starts_with(const char *s, const char *prefix)
{
    return strncmp(s, prefix, strlen(prefix)) == 0;
}

/* The first line of text starting with prefix, or NULL. */
static const char *find_prefix(const char *text, const char *prefix)
{
    for (const char *line = text; line && *line;) {
        if (starts_with(line, prefix))
            return line;
        line = strchr(line, '\n');
        line = line ? line + 1 : NULL;
    }
    return NULL;
}

/* The first prefix that some line starts with decides (they come in
 * order of preference). */
static const char *find_line(const char *text, const char *const *prefixes)
{
    const char *line = NULL;
    for (const char *const *p = prefixes; *p && !line; p++)
        line = find_prefix(text, *p);
    return line;
}

/* Append the line at s (without its newline) to t; returns where the
 * next line starts, or NULL at the end. */
static const char *take_line(br_text *t, const char *s, int *rc)
{
    const char *nl = strchr(s, '\n');
    size_t n = nl ? (size_t)(nl - s) : strlen(s);
    *rc |= br_text_printf(t, "%.*s", (int)n, s);
    return nl ? nl + 1 : NULL;
}

int br_cli_emit_verdict(const br_text *report, const char *const *prefixes, int join)
{
    const char *line = find_line(br_text_data(report), prefixes);
    if (!line)
        return BR_EXIT_OK;
    br_text *t = br_text_create();
    if (!t) {
        fprintf(stderr, "bootrung: out of memory\n");
        return BR_EXIT_INPUT;
    }
    int rc = BR_OK;
    line = take_line(t, line, &rc);
    /* a wrapped verdict goes on in lines indented by two spaces */
    while (join && line && starts_with(line, "  ") && line[2] != ' ') {
        rc |= br_text_put(t, " ");
        line = take_line(t, line + 2, &rc);
    }
    rc |= br_text_put(t, "\n");
    int status = rc == BR_OK ? br_cli_emit(t) : BR_EXIT_INPUT;
    if (rc != BR_OK)
        fprintf(stderr, "bootrung: out of memory\n");
    br_text_free(t);
    return status;
}

/* options.c - parsing a verb's arguments against its option table. */
#include "cli.h"

#include <string.h>

static const br_opt *find_opt(const br_opt *opts, const char *name, size_t len)
{
    for (const br_opt *o = opts; o && o->type != BR_OPT_END; o++)
        if (strlen(o->name) == len && strncmp(o->name, name, len) == 0)
            return o;
    return NULL;
}

/* Handle the option at argv[*i] ("--name" or "--name=value").  Returns 0,
 * or BR_PARSE_ERROR after a diagnostic. */
static int take_opt(const br_cmd_doc *doc, int argc, char **argv, int *i)
{
    const char *name = argv[*i] + 2;
    const char *eq = strchr(name, '=');
    size_t len = eq ? (size_t)(eq - name) : strlen(name);
    const br_opt *o = find_opt(doc->opts, name, len);
    if (!o)
        return br_cli_usage_error(doc->verb, "unknown option '%s'", argv[*i]), BR_PARSE_ERROR;
    if (o->type == BR_OPT_FLAG) {
        if (eq)
            return br_cli_usage_error(doc->verb, "option '--%s' takes no value", o->name),
                   BR_PARSE_ERROR;
        *(int *)o->value = 1;
        return 0;
    }
    const char *val = eq ? eq + 1 : (*i + 1 < argc ? argv[++*i] : NULL);
    if (!val || !val[0])
        return br_cli_usage_error(doc->verb, "option '--%s' needs a value (%s)", o->name, o->arg),
               BR_PARSE_ERROR;
    *(const char **)o->value = val;
    return 0;
}

static int is_help(const char *a)
{
    return strcmp(a, "--help") == 0 || strcmp(a, "-h") == 0;
}

/* A lone "-" is a positional (it may mean stdin or stdout to a verb). */
static int is_option(const char *a)
{
    return a[0] == '-' && a[1] != '\0';
}

int br_cli_parse(const br_cmd_doc *doc, int argc, char **argv, char **pos)
{
    int npos = 0, opts_done = 0;
    for (int i = 1; i < argc; i++) {
        const char *a = argv[i];
        if (!opts_done && strcmp(a, "--") == 0) {
            opts_done = 1;
        } else if (!opts_done && is_help(a)) {
            br_cli_help(doc, stdout);
            return BR_PARSE_HELP;
        } else if (!opts_done && is_option(a)) {
            if (a[1] != '-')
                return br_cli_usage_error(doc->verb, "unknown option '%s'", a), BR_PARSE_ERROR;
            if (take_opt(doc, argc, argv, &i) != 0)
                return BR_PARSE_ERROR;
        } else if (npos < doc->npos) {
            pos[npos++] = argv[i];
        } else {
            return br_cli_usage_error(doc->verb, "unexpected argument '%s'", a), BR_PARSE_ERROR;
        }
    }
    if (npos < doc->npos)
        return br_cli_usage_error(doc->verb, "missing %s", doc->args), BR_PARSE_ERROR;
    return 0;
}

int br_cli_parse_status(int parsed)
{
    return parsed == BR_PARSE_HELP ? BR_EXIT_OK : BR_EXIT_INPUT;
}

void br_cli_help(const br_cmd_doc *doc, FILE *f)
{
    fprintf(f, "usage: bootrung %s [options] %s\n\n%s\noptions:\n", doc->verb, doc->args,
            doc->about);
    for (const br_opt *o = doc->opts; o && o->type != BR_OPT_END; o++) {
        char head[64];
        snprintf(head, sizeof head, "--%s%s%s", o->name, o->arg ? " " : "", o->arg ? o->arg : "");
        fprintf(f, "  %-22s %s\n", head, o->help);
    }
    fprintf(f, "  %-22s %s\n", "-h, --help", "show this help");
}

/* cli.h - the command line: verbs, option tables and output helpers.
 *
 * Each verb lives in its own file cmd_<verb>.c and exports
 *   int cmd_<verb>(int argc, char **argv);
 * argv[0] is the verb's name; the return value is the process exit status
 * (BR_EXIT_*).  Verbs are thin: they parse options, call the library and
 * write the rendered text.  Results go to stdout, diagnostics to stderr. */
#ifndef BR_CLI_H
#define BR_CLI_H

#include "bootrung/bootrung.h"

#include <stdio.h>

/* Exit statuses, the same for every verb. */
enum {
    BR_EXIT_OK = 0,   /* done; every criterion evaluated passes */
    BR_EXIT_FAIL = 1, /* done; a design criterion fails */
    BR_EXIT_INPUT = 2, /* not done: bad input, bad usage or an I/O error */
    BR_EXIT_UNDETERMINED = 3 /* done; nothing fails but a criterion could not
                                be decided (a solver did not converge) */
};

/* ---- options --------------------------------------------------------- */

typedef enum br_opt_type {
    BR_OPT_END = 0, /* terminates an option array */
    BR_OPT_FLAG,    /* --name: sets an int to 1 */
    BR_OPT_STRING   /* --name VALUE or --name=VALUE: stores the argument */
} br_opt_type;

typedef struct br_opt {
    int type;         /* br_opt_type */
    const char *name; /* long name without the leading dashes */
    const char *arg;  /* name of the argument in the help ("PATH"), or NULL */
    void *value;      /* int * for a flag, const char ** for a string */
    const char *help; /* one line for --help */
} br_opt;

/* What a verb says about itself in its --help. */
typedef struct br_cmd_doc {
    const char *verb;   /* "check" */
    const char *args;   /* positional arguments for the usage line: "FILE" */
    const char *about;  /* a paragraph, lines ending in \n */
    const br_opt *opts; /* BR_OPT_END-terminated; --help is implicit */
    int npos;           /* exact number of positional arguments required */
} br_cmd_doc;

/* Results of br_cli_parse besides the number of positionals. */
enum { BR_PARSE_HELP = -1, BR_PARSE_ERROR = -2 };

/* Parse argv[1..argc-1] against doc->opts; positionals go to pos[] (room
 * for doc->npos).  Returns 0 when all is well, BR_PARSE_HELP after
 * printing the verb's help on stdout, BR_PARSE_ERROR after printing one
 * diagnostic line on stderr.  "--" ends the options. */
int br_cli_parse(const br_cmd_doc *doc, int argc, char **argv, char **pos);

/* Status to return for a BR_PARSE_* result. */
int br_cli_parse_status(int parsed);

/* Print the verb's help to f. */
void br_cli_help(const br_cmd_doc *doc, FILE *f);

/* ---- output ---------------------------------------------------------- */

/* Write t to stdout and flush; on a write error print one diagnostic line
 * and return BR_EXIT_INPUT, else BR_EXIT_OK. */
int br_cli_emit(const br_text *t);

/* Write t to path, all or nothing ("-" means stdout); on failure print one
 * diagnostic line and return BR_EXIT_INPUT. */
int br_cli_save(const br_text *t, const char *path);

/* Print err as the one line "bootrung: FILE:LINE: field: message" (path
 * stands in when err names no file) and return BR_EXIT_INPUT. */
int br_cli_fail(const br_error *err, const char *path);

/* Print "bootrung: VERB: message (see 'bootrung VERB --help')" and return
 * BR_EXIT_INPUT. */
int br_cli_usage_error(const char *verb, const char *fmt, ...)
    __attribute__((format(printf, 2, 3)));

/* After a verb: flush stdout and turn a pending write error into a
 * diagnostic and BR_EXIT_INPUT; otherwise return status unchanged. */
int br_cli_finish(int status);

/* Read option --opt's text as a whole number in [lo, hi] (a seed, a
 * count); on a bad value print one diagnostic line and return
 * BR_EXIT_INPUT, else BR_EXIT_OK. */
int br_cli_long(const char *verb, const char *opt, const char *text, long lo, long hi, long *out);

/* The same for a fraction from 0 to 1, also written as a percentage ("95%"). */
int br_cli_fraction(const char *verb, const char *opt, const char *text, double *out);

/* ---- verbs ----------------------------------------------------------- */

int cmd_check(int argc, char **argv);
int cmd_startup(int argc, char **argv);
int cmd_steady(int argc, char **argv);
int cmd_analyze(int argc, char **argv);
int cmd_corners(int argc, char **argv);
int cmd_yield(int argc, char **argv);
int cmd_pick(int argc, char **argv);
int cmd_window(int argc, char **argv);
int cmd_map(int argc, char **argv);

/* The shared body of the analysis verbs: options --xml/--csv, the help
 * text `about`, the analyses `parts` (BR_RUN_* of report/results.h). */
int br_cli_analysis(int argc, char **argv, const char *about, int parts);

#endif

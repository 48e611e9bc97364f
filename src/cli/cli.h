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

#include <signal.h>
#include <stdio.h>

/* Exit statuses, the same for every verb (README: "Exit status").  The
 * interrupted ones follow the shells' 128 + signal number. */
enum {
    BR_EXIT_OK = 0,            /* done; every criterion judged passes */
    BR_EXIT_FAIL = 1,          /* done; a design criterion fails */
    BR_EXIT_INPUT = 2,         /* not done: bad input, bad usage or an I/O error */
    BR_EXIT_UNDETERMINED = 3,  /* done; nothing fails but a criterion could not be
                                  decided (a solver did not converge) */
    BR_EXIT_INTERRUPTED = 130, /* not done: SIGINT (Ctrl-C) stopped a long run */
    BR_EXIT_TERMINATED = 143   /* not done: SIGTERM stopped a long run */
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
 * stands in when err names no file) and return BR_EXIT_INPUT; a numerical
 * failure (BR_ENUMERIC) reads "FILE: undetermined: message" and returns
 * BR_EXIT_UNDETERMINED. */
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

/* --startup-method M of every verb that runs a start-up: "envelope" (the
 * default: periods in which something discrete happens integrated, the
 * others stepped over along the rails' envelope) or "periods" (every
 * period integrated, the reference).  On a bad value print one
 * diagnostic line and return BR_EXIT_INPUT, else BR_EXIT_OK with *out a
 * br_su_method (unchanged when text is NULL). */
int br_cli_startup_method(const char *verb, const char *text, int *out);
#define BR_STARTUP_METHOD_HELP                                                                     \
    "start-ups by envelope (default: repeating periods stepped over) or periods"

/* The help line of --quiet, the same for every verb. */
#define BR_QUIET_HELP "print only the verdict line on stdout (no report, no progress bar)"

/* Print the verdict line of report t (what --quiet prints) on stdout:
 * the first line starting with the first of `prefixes` (NULL-terminated,
 * in order of preference) that some line starts with, with
 * the lines indented by two spaces that continue it when join is set,
 * made one line.  When no line matches, nothing is printed.  Returns as
 * br_cli_emit does. */
int br_cli_emit_verdict(const br_text *t, const char *const *prefixes, int join);

/* The n output paths of verb's options names[] (NULL: not asked for),
 * checked before anything runs: at most one may be "-" (stdout), none may
 * be one of the ninputs input files (also through a link: the design must
 * not be overwritten by its results), and no two may be the same file.
 * Otherwise a usage error is printed and BR_EXIT_INPUT returned. */
int br_cli_outputs(const char *verb, const char *const *names, const char *const *paths, int n,
                   const char *const *inputs, int ninputs);

/* One output file of a verb: its text and where it goes (path NULL: not
 * asked for; "-": stdout in place of the report). */
typedef struct br_cli_file {
    const br_text *text;
    const char *path;
} br_cli_file;

/* All the files or none, so a script never mistakes a partial run for a
 * whole: each file is written to a temporary beside it, then stdout gets
 * the report unless a file took stdout (the whole report, or with quiet
 * only its lines that start with one of prefixes, joined as
 * br_cli_emit_verdict does), then the files are renamed into place.  On
 * any failure (a file, stdout, a rename) no file of the run is left.
 * Signals that would end the program are held meanwhile.  Returns
 * BR_EXIT_OK or BR_EXIT_INPUT. */
int br_cli_write(const br_cli_file *files, int nfiles, const br_text *report, int quiet,
                 const char *const *prefixes, int join);

/* ---- long runs: the progress bar and interrupts (progress.c) --------- */

/* One long run of a verb.  br_cli_run_begin catches SIGINT and SIGTERM
 * (the handler only records the signal) and gives a hook to hand to the
 * analysis: it stops the analysis once a signal has come, and draws a
 * bar on stderr when stderr is a terminal, --quiet is off and the run has
 * lasted half a second.  br_cli_run_commit erases the bar and blocks the
 * two signals: it returns 0 when the verb may write its results (a signal
 * arriving while it does is held until the files are complete, and then
 * ignored: the run has finished), or, after printing "bootrung:
 * interrupted", BR_EXIT_INTERRUPTED or BR_EXIT_TERMINATED, and the verb
 * writes nothing.  br_cli_run_end restores the signals as they were.
 * Hand the run to a study with the public setter:
 * br_*_set_progress(obj, br_cli_run_progress, br_cli_run_stop, r). */
typedef struct br_cli_run {
    const char *label;       /* what the bar says: the verb */
    int draw;                /* a bar may be drawn */
    int drawn;               /* a bar is on the terminal now */
    double t0;               /* s, monotonic: when the run began */
    double last;             /* s, monotonic: the last redraw */
    int width;               /* columns of the bar drawn last */
    int mine[2];             /* SIGINT, SIGTERM: our handler is installed */
    struct sigaction old[2]; /* what they were before */
    int blocked;             /* br_cli_run_commit blocked the signals */
    sigset_t oldmask;        /* the mask before that */
} br_cli_run;

void br_cli_run_begin(br_cli_run *r, const char *label, int quiet);
/* The hook and the stop poll of a run (ctx is the br_cli_run). */
int br_cli_run_progress(void *ctx, double done, double total);
int br_cli_run_stop(void *ctx);
int br_cli_run_commit(br_cli_run *r);
void br_cli_run_end(br_cli_run *r);

/* The bar for `done` of `total` after `elapsed` seconds, fitted to
 * `width` columns (without the leading carriage return), into buf.
 * Returns buf. */
const char *br_cli_bar_render(char *buf, size_t cap, const char *label, double done, double total,
                              double elapsed, int width);

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
int cmd_supply(int argc, char **argv);
int cmd_netlist(int argc, char **argv);
int cmd_size(int argc, char **argv);
int cmd_explore(int argc, char **argv);
int cmd_merge(int argc, char **argv);

/* The shared body of the analysis verbs: options --xml/--csv/--quiet, the
 * help text `about`, the analyses `parts` (BR_PART_* of bootrung/analysis.h). */
int br_cli_analysis(int argc, char **argv, const char *about, int parts);

/* `analyze --pack DIR`: every verb run on design (and pick on catalog,
 * may be NULL) into the new folder dir with an index page, the design
 * copied in, checksums and the command lines (pack.c).  Returns the exit
 * status: 2 when it could not be made (nothing is left behind), else the
 * verbs' statuses together (1 a criterion fails, 3 undetermined). */
int br_cli_pack(const char *dir, const char *design, const char *catalog, int quiet);

#endif

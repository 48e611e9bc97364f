/* pack.c - `bootrung analyze --pack DIR FILE`: the sign-off pack, every
 * verb's pages and results for one design in one new folder.
 *
 * Each verb runs as this program in a child process, in the folder, on
 * design.xml (the design copied byte for byte), so the command lines the
 * index shows are exactly those that made the files, and a reviewer runs
 * them again there.  The folder is built under a temporary name beside
 * DIR and renamed at the end: it appears whole or not at all. */
#include "cli.h"

#include "bootrung/export.h"
#include "bootrung/report.h"

#include <dirent.h>
#include <errno.h>
#include <fcntl.h>
#include <limits.h>
#include <signal.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <time.h>
#include <unistd.h>

#ifndef BR_VERSION
#define BR_VERSION "unknown"
#endif

#define PATH_CAP 4096
#define MAX_ARGS 24

/* The prefixes of the verdict lines of the verbs' reports. */
static const char *const VERDICTS[] = {
    "verdict:", "verdict at the worst corners:", "design rules:", "design point:", NULL};

/* A step: verb, its arguments after the design file, the files it writes
 * (its page first).  Steps that do not apply are marked with why. */
static void add_step(br_pack *p, const char *verb, const char *args, const char *files)
{
    br_pack_step *s = &p->step[p->nstep++];
    memset(s, 0, sizeof *s);
    snprintf(s->verb, sizeof s->verb, "%s", verb);
    snprintf(s->command, sizeof s->command, "bootrung %s design.xml %s", verb, args);
    char list[160];
    snprintf(list, sizeof list, "%s", files);
    char *save = NULL;
    for (char *f = strtok_r(list, " ", &save); f && s->nfile < BR_PACK_FILES;
         f = strtok_r(NULL, " ", &save))
        snprintf(s->file[s->nfile++], sizeof s->file[0], "%s", f);
    if (s->nfile < BR_PACK_FILES)
        snprintf(s->file[s->nfile++], sizeof s->file[0], "%s.txt", verb);
}

static void skip_step(br_pack *p, const char *verb, const char *why)
{
    br_pack_step *s = &p->step[p->nstep++];
    memset(s, 0, sizeof *s);
    snprintf(s->verb, sizeof s->verb, "%s", verb);
    snprintf(s->why, sizeof s->why, "%s", why);
    s->status = -1;
}

/* Every verb with every file it can write, on the design's own grid for
 * map (duty 5 % to 95 %, a factor 4 either side of the design's
 * frequency). */
static void plan(br_pack *p, const br_chain *c, int catalog)
{
    char args[320];
    add_step(p, "check", "--report check.html", "check.html");
    add_step(p, "analyze", "--report analyze.html --xml analyze.xml --csv analyze.csv",
             "analyze.html analyze.xml analyze.csv");
    add_step(p, "corners", "--report corners.html --xml corners.xml", "corners.html corners.xml");
    add_step(p, "yield", "--report yield.html --xml yield.xml --csv yield.csv",
             "yield.html yield.xml yield.csv");
    add_step(p, "window", "--report window.html --xml window.xml", "window.html window.xml");
    if (br_chain_line_cycle(c)) {
        skip_step(p, "map", "a line cycle has no single duty and frequency to map");
    } else {
        snprintf(args, sizeof args,
                 "--duty 5%%:95%%:19 --freq %.6gHz:%.6gHz:9 --report map.html --csv map.csv",
                 br_chain_frequency(c) / 4.0, br_chain_frequency(c) * 4.0);
        add_step(p, "map", args, "map.html map.csv");
    }
    add_step(p, "supply", "--report supply.html --xml supply.xml", "supply.html supply.xml");
    if (catalog)
        add_step(p, "pick", "--catalog catalog.xml --report pick.html --xml pick.xml",
                 "pick.html pick.xml");
    else
        skip_step(p, "pick", "no catalog given (--catalog PARTS.xml)");
}

/* ---- files --------------------------------------------------------------- */

/* dir/name + ext into buf; -1 when it does not fit. */
static int in_dir(char *buf, size_t cap, const char *dir, const char *name, const char *ext)
{
    int n = snprintf(buf, cap, "%s/%s%s", dir, name, ext);
    return n > 0 && (size_t)n < cap ? 0 : -1;
}

static int slurp(const char *path, char **data, size_t *len)
{
    FILE *f = fopen(path, "rb");
    if (!f)
        return -1;
    size_t cap = 1 << 16, n = 0;
    char *b = malloc(cap + 1);
    for (size_t got; b && (got = fread(b + n, 1, cap - n, f)) > 0;) {
        n += got;
        char *nb = n == cap ? realloc(b, (cap *= 2) + 1) : b;
        if (!nb)
            free(b);
        b = nb;
    }
    int bad = ferror(f);
    fclose(f);
    if (!b || bad) {
        free(b);
        return -1;
    }
    b[n] = '\0';
    *data = b;
    *len = n;
    return 0;
}

/* Copy src to dir/name and give its SHA-256. */
static int copy_in(const char *src, const char *dir, const char *name, char sha[65])
{
    char *data, to[PATH_CAP];
    size_t len;
    if (slurp(src, &data, &len))
        return -1;
    br_sha256_hex(data, len, sha);
    FILE *f = in_dir(to, sizeof to, dir, name, "") ? NULL : fopen(to, "wb");
    int bad = !f || fwrite(data, 1, len, f) != len;
    bad |= f && fclose(f) != 0;
    free(data);
    return bad ? -1 : 0;
}

static int sha_of(const char *dir, const char *name, char sha[65])
{
    char *data, path[PATH_CAP];
    size_t len;
    if (in_dir(path, sizeof path, dir, name, "") || slurp(path, &data, &len))
        return -1;
    br_sha256_hex(data, len, sha);
    free(data);
    return 0;
}

/* Empty and remove the temporary folder (it holds only what we wrote). */
static void remove_dir(const char *dir)
{
    DIR *d = opendir(dir);
    char path[PATH_CAP];
    for (struct dirent *e; d && (e = readdir(d)) != NULL;) {
        if (strcmp(e->d_name, ".") == 0 || strcmp(e->d_name, "..") == 0)
            continue;
        if (in_dir(path, sizeof path, dir, e->d_name, "") == 0)
            unlink(path);
    }
    if (d)
        closedir(d);
    rmdir(dir);
}

/* The verdict line of a step's report (VERB.txt). */
static void verdict_of(const char *dir, br_pack_step *s)
{
    char *data, path[PATH_CAP];
    size_t len;
    if (in_dir(path, sizeof path, dir, s->verb, ".txt") || slurp(path, &data, &len))
        return;
    for (int i = 0; VERDICTS[i] && !s->verdict[0]; i++)
        for (char *l = data; l && *l && !s->verdict[0];
             l = strchr(l, '\n') ? strchr(l, '\n') + 1 : NULL)
            if (strncmp(l, VERDICTS[i], strlen(VERDICTS[i])) == 0)
                snprintf(s->verdict, sizeof s->verdict, "%.*s", (int)strcspn(l, "\n"), l);
    free(data);
}

/* ---- the verbs as child processes --------------------------------------- */

/* The child: in the folder, its report to VERB.txt, its diagnostics to
 * VERB.err; never returns. */
static void child(const char *self, const char *dir, const br_pack_step *s)
{
    char cmd[sizeof s->command], out[64], err[64], *argv[MAX_ARGS + 1];
    int n = 0;
    snprintf(cmd, sizeof cmd, "%s", s->command);
    char *save = NULL;
    for (char *a = strtok_r(cmd, " ", &save); a && n < MAX_ARGS; a = strtok_r(NULL, " ", &save))
        argv[n++] = a;
    argv[n] = NULL;
    snprintf(out, sizeof out, "%s.txt", s->verb);
    snprintf(err, sizeof err, "%s.err", s->verb);
    if (chdir(dir) != 0)
        _exit(BR_EXIT_INPUT);
    int fo = open(out, O_WRONLY | O_CREAT | O_TRUNC, 0644);
    int fe = open(err, O_WRONLY | O_CREAT | O_TRUNC, 0644);
    if (fo < 0 || fe < 0 || dup2(fo, 1) < 0 || dup2(fe, 2) < 0)
        _exit(BR_EXIT_INPUT);
    execv(self, argv);
    _exit(BR_EXIT_INPUT);
}

/* Run step s and wait for it; a signal to us stops it (SIGTERM) and is
 * then the caller's to report.  Returns the step's exit status (128 +
 * its signal when one ended it). */
static int run_step(const char *self, const char *dir, br_pack_step *s, br_cli_run *lr)
{
    fflush(NULL);
    pid_t pid = fork();
    if (pid < 0)
        return BR_EXIT_INPUT;
    if (pid == 0)
        child(self, dir, s);
    int st = 0, sent = 0;
    const struct timespec tick = {0, 20 * 1000 * 1000};
    for (;;) {
        pid_t w = waitpid(pid, &st, WNOHANG);
        if (w == pid)
            break;
        if (w < 0 && errno != EINTR)
            return BR_EXIT_INPUT;
        if (!sent && br_cli_run_stop(lr)) {
            kill(pid, SIGTERM);
            sent = 1;
        }
        nanosleep(&tick, NULL);
    }
    return WIFEXITED(st) ? WEXITSTATUS(st) : 128 + (WIFSIGNALED(st) ? WTERMSIG(st) : 0);
}

/* One line on stderr for a step that did not finish, with the first line
 * of what it said. */
static void step_failed(const char *dir, const br_pack_step *s)
{
    char *data = NULL, path[PATH_CAP];
    size_t len;
    if (in_dir(path, sizeof path, dir, s->verb, ".err") == 0 && slurp(path, &data, &len) == 0 &&
        data[0])
        fprintf(stderr, "bootrung: pack: %s did not finish (status %d): %.*s\n", s->verb, s->status,
                (int)strcspn(data, "\n"), data);
    else
        fprintf(stderr, "bootrung: pack: %s did not finish (status %d)\n", s->verb, s->status);
    free(data);
}

/* Run every step; BR_EXIT_OK, or the status of the first that did not
 * finish (bad input, an interruption). */
static int run_all(const char *self, const char *dir, br_pack *p, br_cli_run *lr)
{
    for (int i = 0; i < p->nstep; i++) {
        br_pack_step *s = &p->step[i];
        if (s->status < 0)
            continue;
        s->status = run_step(self, dir, s, lr);
        if (br_cli_run_stop(lr))
            return BR_EXIT_INTERRUPTED;
        if (s->status != 0 && s->status != 1 && s->status != 3) {
            step_failed(dir, s);
            return s->status >= 128 ? s->status : BR_EXIT_INPUT;
        }
        char err[PATH_CAP];
        struct stat sb;
        if (in_dir(err, sizeof err, dir, s->verb, ".err") == 0 && stat(err, &sb) == 0 &&
            sb.st_size == 0)
            unlink(err); /* nothing said: no file */
        verdict_of(dir, s);
        for (int f = 0; f < s->nfile; f++)
            if (sha_of(dir, s->file[f], s->sha[f]))
                return BR_EXIT_INPUT;
    }
    return BR_EXIT_OK;
}

/* ---- the pack ------------------------------------------------------------ */

/* What the pack holds, on stdout (with quiet only its verdict line); the
 * status of its verbs together. */
static int summary(const char *dir, const br_pack *p, int quiet)
{
    br_text *t = br_text_create();
    if (!t)
        return BR_EXIT_INPUT;
    int rc = 0, status = br_pack_status(p);
    if (!quiet)
        for (int i = 0; i < p->nstep; i++)
            rc |= p->step[i].status < 0
                      ? br_text_printf(t, "  %-8s not run: %s\n", p->step[i].verb, p->step[i].why)
                      : br_text_printf(t, "  %-8s %s\n", p->step[i].verb, p->step[i].verdict);
    rc |= br_text_printf(t, "pack: %s, %s (open %s/index.html)\n", dir,
                         status == 0   ? "every verb passes"
                         : status == 1 ? "a criterion FAILS"
                                       : "UNDETERMINED somewhere",
                         dir);
    int out = rc ? BR_EXIT_INPUT : br_cli_emit(t);
    br_text_free(t);
    return out != BR_EXIT_OK ? out : status;
}

/* index.html, SHA256SUMS and commands.sh into the folder. */
static int write_lists(const char *dir, const br_chain *c, const br_pack *p, br_error *err)
{
    br_text *t[3] = {br_text_create(), br_text_create(), br_text_create()};
    static const char *const name[3] = {"SHA256SUMS", "commands.sh", "index.html"};
    int rc = t[0] && t[1] && t[2] ? BR_OK : BR_ENOMEM;
    if (rc == BR_OK)
        rc = br_pack_sums(p, t[0]) | br_pack_script(p, t[1]) | br_pack_index(c, p, t[2]);
    if (rc != BR_OK)
        br_error_set(err, BR_ENOMEM, NULL, 0, NULL, "out of memory writing the pack's index");
    for (int i = 0; i < 3 && rc == BR_OK; i++) {
        char path[PATH_CAP];
        rc =
            in_dir(path, sizeof path, dir, name[i], "") ? BR_EINPUT : br_text_save(t[i], path, err);
    }
    for (int i = 0; i < 3; i++)
        br_text_free(t[i]);
    return rc;
}

/* A new folder beside dir, DIR.partial-XXXXXX; 0 or -1. */
static int temp_folder(const char *dir, char *tmp, size_t cap)
{
    int n = snprintf(tmp, cap, "%s.partial-XXXXXX", dir);
    return n > 0 && (size_t)n < cap && mkdtemp(tmp) ? 0 : -1;
}

/* Copy the inputs in and run the verbs; then the lists.  BR_EXIT_OK or
 * the status to return (the caller removes the folder). */
static int fill(const char *tmp, const char *design, const char *catalog, const br_chain *c,
                br_pack *p, br_cli_run *lr)
{
    char self[PATH_CAP];
    ssize_t n = readlink("/proc/self/exe", self, sizeof self - 1);
    if (n <= 0) {
        fprintf(stderr, "bootrung: pack: cannot find this program (/proc/self/exe): %s\n",
                strerror(errno));
        return BR_EXIT_INPUT;
    }
    self[n] = '\0';
    if (copy_in(design, tmp, "design.xml", p->design_sha) ||
        (catalog && copy_in(catalog, tmp, "catalog.xml", p->catalog_sha))) {
        fprintf(stderr, "bootrung: pack: cannot copy the inputs into %s: %s\n", tmp,
                strerror(errno));
        return BR_EXIT_INPUT;
    }
    plan(p, c, catalog != NULL);
    int status = run_all(self, tmp, p, lr);
    int stop = br_cli_run_commit(lr);
    if (stop)
        return stop;
    br_error err;
    br_error_clear(&err);
    if (status == BR_EXIT_OK && write_lists(tmp, c, p, &err) != BR_OK)
        status = br_cli_fail(&err, NULL);
    return status;
}

int br_cli_pack(const char *dir, const char *design, const char *catalog, int quiet)
{
    struct stat sb;
    if (lstat(dir, &sb) == 0)
        return br_cli_usage_error("analyze", "--pack %s: it exists, expected a new folder", dir);
    br_design *d = NULL;
    br_chain *c = NULL;
    br_error err;
    br_error_clear(&err);
    if (br_design_load(design, &d, &err) != BR_OK || br_chain_build(d, &c, &err) != BR_OK) {
        br_design_free(d);
        return br_cli_fail(&err, design);
    }
    br_text *notes = br_text_create();
    if (notes && br_design_notes(design, notes, &err) != BR_OK) {
        br_text_free(notes);
        br_chain_free(c);
        br_design_free(d);
        return br_cli_fail(&err, design);
    }
    char tmp[PATH_CAP];
    br_pack *p = calloc(1, sizeof *p);
    int status = BR_EXIT_INPUT;
    if (!p || temp_folder(dir, tmp, sizeof tmp)) {
        fprintf(stderr, "bootrung: pack: cannot make a folder beside %s: %s\n", dir,
                p ? strerror(errno) : "out of memory");
    } else {
        p->version = BR_VERSION;
        p->notes = notes ? br_text_data(notes) : NULL;
        p->design_path = design;
        p->catalog_path = catalog;
        br_cli_run lr;
        br_cli_run_begin(&lr, "pack", 1);
        status = fill(tmp, design, catalog, c, p, &lr);
        if (status == BR_EXIT_OK && rename(tmp, dir) != 0) {
            fprintf(stderr, "bootrung: pack: cannot rename %s to %s: %s\n", tmp, dir,
                    strerror(errno));
            status = BR_EXIT_INPUT;
        }
        if (status != BR_EXIT_OK)
            remove_dir(tmp);
        br_cli_run_end(&lr);
    }
    if (status == BR_EXIT_OK)
        status = summary(dir, p, quiet);
    free(p);
    br_text_free(notes);
    br_chain_free(c);
    br_design_free(d);
    return status;
}

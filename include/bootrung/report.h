/* report.h - the reports of the analyses, and writing them out: what a
 * front end needs besides running the studies of analysis.h.
 *
 * Every study renders its own reports (br_*_render): the same bytes the
 * command line prints and writes, in a br_format, appended to a br_text.
 * A study keeps what its reports need from its run (the design and its
 * chain), so the design may be freed once the run has returned.  A render
 * returns BR_OK, BR_EUSAGE (err says why) when the study was not run or
 * does not offer the form, or BR_ENOMEM.
 *
 * Copyright (C) 2026 the bootrung developers.  GPL-3.0-or-later. */
#ifndef BOOTRUNG_REPORT_H
#define BOOTRUNG_REPORT_H

#include "bootrung/analysis.h"

#ifdef __cplusplus
extern "C" {
#endif

/* ---- the analyses: start-up, steady state, verdict ---------------------- */

/* a's reports of its last run, as `bootrung startup`, `steady` or
 * `analyze` (by the parts run) print and write them: TEXT; XML (with the
 * library's version); HTML (with the series kept, br_analysis_set_series);
 * CSV (recorded when asked, br_analysis_set_csv); SVG, the plot of a
 * start-up or a steady state run alone (with the series kept). */
BR_API int br_analysis_render(const br_analysis *a, int format, br_text *out, br_error *err);

/* ---- the design check: the chain and the rules needing no simulation ---- */

/* The design's chain as a table (operating point, one row per stage with
 * its parts, return switch, charging windows and link blocking voltage)
 * and the findings of the design rules.  A finding that means the chain
 * cannot work at all (a rail that never reaches its UVLO, a link that
 * never charges) is fatal; the others are warnings. */
typedef struct br_design_check br_design_check;

BR_API br_design_check *br_design_check_create(void);
BR_API void br_design_check_free(br_design_check *k);
/* 1: a warning fails the check too; 0 (the default): only a fatal one. */
BR_API int br_design_check_set_strict(br_design_check *k, int on);
/* Check d (it may be freed once this returns). */
BR_API int br_design_check_run(br_design_check *k, const br_design *d, br_error *err);
/* The findings, and how many of them are fatal. */
BR_API int br_design_check_counts(const br_design_check *k, int *findings, int *fatal);
/* BR_RESULT_FAIL when a finding is fatal (or, strict, any finding), else
 * BR_RESULT_PASS. */
BR_API int br_design_check_result(const br_design_check *k, int *out);
/* The report's verdict line starts with this. */
#define BR_CHECK_VERDICT "design rules:"
/* TEXT, or HTML (the page with the judgement first). */
BR_API int br_design_check_render(const br_design_check *k, int format, br_text *out,
                                  br_error *err);

/* ---- the worst-case corners --------------------------------------------- */

/* The report's verdict line starts with this (its continuation lines are
 * indented). */
#define BR_CORNERS_VERDICT "verdict at the worst corners:"
/* TEXT, XML (with the library's version) or HTML, as `bootrung corners`. */
BR_API int br_corner_search_render(const br_corner_search *s, int format, br_text *out,
                                   br_error *err);

/* ---- the window ----------------------------------------------------------- */

/* The report's verdict line starts with this. */
#define BR_WINDOW_VERDICT "design point:"
/* TEXT, XML, HTML, or SVG (the worst margin along each axis), as
 * `bootrung window`. */
BR_API int br_window_study_render(const br_window_study *w, int format, br_text *out,
                                  br_error *err);

/* ---- the duty-frequency map ------------------------------------------------ */

/* The files the map's text report names as written (NULL: not written). */
BR_API int br_map_study_set_file_names(br_map_study *m, const char *csv, const char *svg);
/* The report's verdict line starts with this. */
#define BR_MAP_VERDICT "design point:"
/* TEXT (the summary), CSV (every grid point), SVG (the heat map) or HTML,
 * as `bootrung map`; not of a shard's run. */
BR_API int br_map_study_render(const br_map_study *m, int format, br_text *out, br_error *err);

/* ---- Monte Carlo yield ------------------------------------------------------ */

/* The report's verdict line starts with this (its continuation lines are
 * indented). */
#define BR_YIELD_VERDICT "verdict:"
/* TEXT, XML, CSV (every sample: values, margins), HTML, or SVG (the
 * margins' histograms), as `bootrung yield`; not of a shard's run. */
BR_API int br_yield_study_render(const br_yield_study *y, int format, br_text *out, br_error *err);

/* ---- the sign-off pack --------------------------------------------------- */

/* A pack is one folder with every verb's pages and result files for one
 * design, the design itself and what a reviewer needs to reproduce every
 * number: the tool's version, the exact command lines, the checksums, the
 * model's assumptions and where each part's values come from.  A front
 * end runs the verbs (the command line: `analyze --pack DIR`); these
 * render what it found. */
#define BR_PACK_STEPS 10
#define BR_PACK_FILES 6

/* One verb run in the pack's folder. */
typedef struct br_pack_step {
    char verb[16];
    char command[640];            /* as run, in the folder */
    int status;                   /* its exit status; -1: not run */
    char why[200];                /* why it was not run */
    char verdict[400];            /* its report's verdict line */
    char file[BR_PACK_FILES][32]; /* the files it wrote, its page first */
    char sha[BR_PACK_FILES][65];  /* their SHA-256 */
    int nfile;
} br_pack_step;

typedef struct br_pack {
    const char *version;      /* the tool's */
    const char *design_path;  /* as given */
    char design_sha[65];      /* of design.xml, the copy in the folder */
    const char *catalog_path; /* as given, NULL: none */
    char catalog_sha[65];     /* of catalog.xml */
    const char *notes;        /* the design file's comments (br_design_notes), NULL: none */
    br_pack_step step[BR_PACK_STEPS];
    int nstep;
} br_pack;

/* The index page (index.html): what the pack is, the verbs with their
 * status, verdict, page and files, the design and its checksum, the
 * version and command lines, the model's assumptions, the parts and the
 * source of their values, the caution. */
BR_API int br_pack_index(const br_chain *c, const br_pack *p, br_text *out);

/* SHA256SUMS: "HEX  NAME" per file, as sha256sum -c reads it. */
BR_API int br_pack_sums(const br_pack *p, br_text *out);

/* commands.sh: the command lines, to run again in the folder. */
BR_API int br_pack_script(const br_pack *p, br_text *out);

/* The combined status of the steps: 1 when one fails, else 3 when one is
 * undetermined, else 0 (a step not run counts for nothing). */
BR_API int br_pack_status(const br_pack *p);

/* The chain's switching frequency (Hz), and 1 when it runs an AC line
 * cycle (0 otherwise; NaN and 0 for NULL). */
BR_API double br_chain_frequency(const br_chain *c);
BR_API int br_chain_line_cycle(const br_chain *c);

/* The SHA-256 of n bytes at data as 64 lower-case hex digits and a NUL
 * into hex[65]. */
BR_API void br_sha256_hex(const void *data, size_t n, char hex[65]);

/* ---- quantities with SI units ------------------------------------------ */

/* The kind of quantity expected: it decides the accepted units and the SI
 * scale. */
typedef enum br_kind {
    BR_KIND_VOLTAGE = 0, /* V */
    BR_KIND_CURRENT,     /* A */
    BR_KIND_CAPACITANCE, /* F */
    BR_KIND_FREQUENCY,   /* Hz */
    BR_KIND_TIME,        /* s */
    BR_KIND_RESISTANCE,  /* ohm; "10 m" is 10 milliohm */
    BR_KIND_CHARGE,      /* C (coulomb) */
    BR_KIND_TEMPERATURE, /* C (Celsius) or K, result in K; no bare numbers */
    BR_KIND_TEMP_DELTA,  /* a temperature difference, K (C accepted) */
    BR_KIND_FRACTION,    /* "80 %" or a plain number 0.8 */
    BR_KIND_NUMBER,      /* dimensionless, a plain number */
    BR_KIND_ENERGY_EV,   /* eV, kept in eV (bandgaps) */
    BR_KIND_I2T,         /* A^2 s ("A2s"), no prefixes: on a squared unit they mislead */
    BR_KIND_POWER,       /* W */
    BR_KIND_THERMAL_R,   /* thermal resistance, K/W ("C/W" accepted); no prefixes */
    BR_KIND_ANGLE,       /* an angle in degrees ("30 deg", or the degree sign), in radians */
    BR_KIND_COUNT
} br_kind;

/* Read one quantity as a design file writes it ("4.7 uF", "200 kHz",
 * "85 C"; a prefix alone, "4.7u", too; only plain numbers, fractions and 0
 * may be bare) into SI.  BR_EINPUT with err->msg saying what was expected
 * (file, line and field left empty), *out untouched. */
BR_API int br_unit_parse(const char *text, br_kind kind, double *out, br_error *err);

/* ---- writing a report to a file, all or nothing ------------------------ */

/* The text goes to a temporary file in the target's directory, flushed
 * to disk, then renamed over the target: a reader sees the old file or
 * the complete new one, and a failure leaves no temporary file behind. */

/* Write t to path.  BR_OK, or BR_EIO with err naming the path and the
 * system's reason; the target is then unchanged. */
BR_API int br_text_save(const br_text *t, const char *path, br_error *err);

/* Several files all or nothing: each is first written whole to its
 * temporary file (br_text_stage); only when every one is ready are they
 * renamed into place (br_staged_commit); a failure on the way drops the
 * temporaries (br_staged_discard). */
typedef struct br_staged {
    const br_text *text; /* kept by pointer until committed */
    char path[4096];     /* the target */
    char tmp[4096 + 64]; /* its temporary file, "" when none */
    int special;         /* the target is a device or FIFO: written in place at commit */
} br_staged;

/* Write t to a temporary file beside path.  BR_OK, or BR_EIO with err
 * naming the path and the reason (nothing is left behind). */
BR_API int br_text_stage(const br_text *t, const char *path, br_staged *s, br_error *err);
/* Rename the temporary file over the target (or write a special file).
 * BR_OK, or BR_EIO with err; the temporary file is gone either way. */
BR_API int br_staged_commit(br_staged *s, br_error *err);
/* Remove the temporary file of a staged file not committed. */
BR_API void br_staged_discard(br_staged *s);

#ifdef __cplusplus
}
#endif
#endif

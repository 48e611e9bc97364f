/* bootrung.h - the public API of the bootrung engine.
 *
 * Data flow: design file -> br_design (parsed, toleranced parameters)
 *   -> br_chain (immutable model: stages, links, charging windows)
 *   -> simulation and analyses -> reports rendered into a br_text
 *   -> the command line writes them out.
 *
 * Conventions: every quantity is an SI double (V, A, s, F, ohm, K inside;
 * temperatures are kelvin).  Functions return a br_status and fill a
 * caller-supplied br_error on failure.  Objects come in create/free pairs;
 * every _free accepts NULL.  The library never prints and never exits.
 * It checks the status of every GSL call it makes, so a program using it
 * should turn GSL's default error handler (which aborts) off with
 * gsl_set_error_handler_off(), as the command-line front end does; the
 * library itself leaves that process-wide setting to its host.
 *
 * Copyright (C) 2026 the bootrung developers.  GPL-3.0-or-later. */
#ifndef BOOTRUNG_H
#define BOOTRUNG_H

#include <stddef.h>

/* BR_API marks what the shared library exports: it is built with hidden
 * visibility, so a function declared without it stays internal. */
#if defined(__GNUC__) || defined(__clang__)
#define BR_API __attribute__((visibility("default")))
#else
#define BR_API
#endif

#ifdef __cplusplus
extern "C" {
#endif

/* The library's version, "MAJOR.MINOR.PATCH" (the project's version). */
BR_API const char *br_version(void);

/* ---- status and errors ------------------------------------------------ */

typedef enum br_status {
    BR_OK = 0,
    BR_EINPUT = 1,   /* the design file or an argument is wrong */
    BR_ENOMEM = 2,   /* allocation failed */
    BR_EIO = 3,      /* a file could not be read or written */
    BR_ENUMERIC = 4, /* a solver failed to converge */
    BR_EUSAGE = 5,   /* the caller broke an API precondition */
    BR_ECANCEL = 6   /* the caller's progress hook asked the run to stop */
} br_status;

/* What failed, where.  file/line/field are empty/0 when not known. */
typedef struct br_error {
    int code;       /* a br_status */
    char file[512]; /* design file path, or "" */
    int line;       /* 1-based line in file, 0 if unknown */
    char field[96]; /* element/attribute path, e.g. "capacitor[c1]/esr" */
    char msg[768];  /* what is wrong and what is expected */
} br_error;

BR_API void br_error_clear(br_error *err);
/* Render err as "FILE:LINE: field: message" into buf; returns buf. */
BR_API const char *br_error_format(const br_error *err, char *buf, size_t cap);
BR_API const char *br_status_name(int code);

/* ---- a growable text buffer that reports render into ------------------ */

typedef struct br_text br_text;
BR_API br_text *br_text_create(void);
BR_API void br_text_free(br_text *t);
BR_API const char *br_text_data(const br_text *t); /* NUL-terminated */
BR_API size_t br_text_len(const br_text *t);
/* Appends; returns BR_OK or BR_ENOMEM (the buffer then stays as it was). */
BR_API int br_text_printf(br_text *t, const char *fmt, ...) __attribute__((format(printf, 2, 3)));
BR_API int br_text_put(br_text *t, const char *s);
BR_API void br_text_reset(br_text *t);

/* ---- design files ------------------------------------------------------ */

typedef struct br_design br_design;

/* Parse, validate against the embedded schema and check every value.
 * On failure *out is NULL and err says FILE:LINE: field: what is wrong. */
BR_API int br_design_load(const char *path, br_design **out, br_error *err);
/* Same, from memory; name is used in messages. */
BR_API int br_design_load_memory(const char *buf, size_t len, const char *name, br_design **out,
                                 br_error *err);
BR_API void br_design_free(br_design *d);
/* The RELAX NG schema the loader enforces (NUL-terminated). */
BR_API const char *br_design_schema(void);
/* The design file's own notes: its XML comments in order, each as "-
 * text" on a line of its own (white space run together), appended to out.
 * Read as safely as a load reads it. */
BR_API int br_design_notes(const char *path, br_text *out, br_error *err);

/* How every start-up of a design is simulated.  Both give the same
 * figures within the envelope's tolerance; the second is the reference the
 * tests hold the first to. */
typedef enum br_su_method {
    BR_SU_ENVELOPE = 0, /* periods integrated where something discrete happens,
                           stepped over along the rails' envelope elsewhere */
    BR_SU_PERIODS = 1   /* every period integrated */
} br_su_method;
/* Set d's start-up method (a br_su_method): every analysis run on d, or
 * on a chain built from it afterwards, uses it.  BR_EUSAGE for a NULL
 * design or an unknown method. */
BR_API int br_design_set_startup_method(br_design *d, int method);

/* ---- reports ------------------------------------------------------------ */

/* The forms a study renders its report in (br_*_render). */
typedef enum br_format {
    BR_FORMAT_TEXT = 0, /* the plain-text report */
    BR_FORMAT_XML = 1,  /* the result file (our own XML vocabulary) */
    BR_FORMAT_HTML = 2, /* a self-contained HTML page */
    BR_FORMAT_CSV = 3,  /* a table (time series, grid points, samples) */
    BR_FORMAT_SVG = 4   /* the study's plot, an SVG document */
} br_format;

/* ---- the chain model --------------------------------------------------- */

typedef struct br_chain br_chain;

/* Build the immutable chain model of d at its nominal values. */
BR_API int br_chain_build(const br_design *d, br_chain **out, br_error *err);
BR_API void br_chain_free(br_chain *c);

#ifdef __cplusplus
}
#endif
#endif

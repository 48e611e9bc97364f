/* results.h - what an analysis verb computes, and its documents.
 *
 * `startup`, `steady` and `analyze` share one flow: build a br_results by
 * running the analyses the verb asks for (optionally recording time
 * series as CSV), then render it as text for the terminal and as XML for
 * other programs.  The verbs stay thin; the verdict decides the exit
 * status. */
#ifndef BR_REPORT_RESULTS_H
#define BR_REPORT_RESULTS_H

#include "analyses/figures.h"
#include "report/trace.h"

/* Which analyses a verb runs (bits). */
enum {
    BR_RUN_STARTUP = 1, /* cold start */
    BR_RUN_STEADY = 2,  /* periodic steady state per direction */
    BR_RUN_ALL = 3      /* both, and the full verdict */
};

typedef struct br_results {
    const br_chain *c;           /* the chain analysed (not owned) */
    const char *verb;            /* "startup", "steady" or "analyze" */
    int parts;                   /* BR_RUN_* bits that were run */
    br_startup su;               /* valid when parts has BR_RUN_STARTUP */
    int ndir;                    /* steady states computed (0 without BR_RUN_STEADY) */
    br_steady ss[2];             /* one per direction of br_design_directions */
    br_steady_figs figs[2];      /* figs[d].ss points at ss[d] */
    br_verdict verdict;          /* over what was run */
    br_line_env *env;            /* a line cycle's rail envelope (NULL otherwise; owned) */
    const br_progress *progress; /* the cold start's and a line cycle's steady state's
                                    progress hook, and the stop poll of every
                                    simulation (NULL: none); set it before
                                    br_results_run, which keeps it */
} br_results;

/* Allocate (the structure is large).  Returns NULL when out of memory. */
br_results *br_results_create(void);
void br_results_free(br_results *r);

/* Run the analyses `parts` on c, the steady state with solver options so
 * (NULL: the defaults); BR_ECANCEL when r->progress stops it.  When csv is
 * not NULL, the time series (start-up decimated, one steady period per
 * direction at the solver's resolution) are appended to it, header first.
 * Returns a br_status. */
int br_results_run(br_results *r, const br_chain *c, const char *verb, int parts,
                   const br_steady_opts *so, br_text *csv, br_error *err);

/* Time series kept for plots: the start-up rows the CSV gets, and two
 * periods of each direction from its steady state (the first the CSV's
 * period), with driver supplies and diode reverse voltages. */
typedef struct br_results_traces {
    br_trace *startup;   /* NULL when the start-up was not run */
    br_trace *steady[2]; /* one per direction computed */
} br_results_traces;

/* As br_results_run, also filling tr (created here; release with
 * br_results_traces_release). */
int br_results_run_traced(br_results *r, const br_chain *c, const char *verb, int parts,
                          const br_steady_opts *so, br_text *csv, br_results_traces *tr,
                          br_error *err);
void br_results_traces_release(br_results_traces *tr);

/* The HTML report of the verb that ran (see html_report.h). */
int br_results_html(const br_results *r, const br_results_traces *tr, br_text *out, br_error *err);

/* The verb's plot as an SVG document: the start-up waveforms for
 * `startup`, the ripple of the first direction for `steady`. */
int br_results_plot(const br_results *r, const br_results_traces *tr, br_text *out, br_error *err);

/* The criteria (BR_CRIT_BIT mask) the verb that ran judges. */
unsigned br_results_mask(const br_results *r);

/* 0 when every criterion the verb judges passes (or does not apply),
 * 1 when one fails; an undetermined criterion is not a failure. */
int br_results_failed(const br_results *r);
/* 1 when a criterion the verb judges is undetermined (a solver did not
 * converge): the verdict is then never a pass. */
int br_results_undetermined(const br_results *r);

/* The text report of the verb that ran, ending with the caution. */
int br_results_text(const br_results *r, br_text *out, br_error *err);

/* The XML document of the same results (see README: "Result files");
 * version is the program's, recorded in the root element. */
int br_results_xml(const br_results *r, const char *version, br_text *out, br_error *err);

#endif

/* table.h - plain-text tables for the reports.
 *
 * A table is filled cell by cell, then rendered with each column as wide
 * as its widest cell, two spaces between columns, numbers right-aligned
 * and names left-aligned, no trailing blanks.  Cells that do not fit are
 * cut (the cell size is generous for every figure a report prints). */
#ifndef BR_REPORT_TABLE_H
#define BR_REPORT_TABLE_H

#include "bootrung/bootrung.h"

#define BR_TABLE_COLS 16
#define BR_TABLE_CELL 48

typedef struct br_table br_table;

typedef enum br_align { BR_RIGHT = 0, BR_LEFT = 1 } br_align;

/* A table of ncol columns (at most BR_TABLE_COLS) with room for nrow body
 * rows.  Returns NULL when out of memory. */
br_table *br_table_create(int ncol, int nrow);
void br_table_free(br_table *t);

/* Column col's heading and alignment. */
void br_table_head(br_table *t, int col, const char *head, int align);

/* Start the next body row (its cells are empty until set); returns its
 * index, or -1 when the table is full. */
int br_table_row(br_table *t);

/* Set cell col of the current row. */
void br_table_set(br_table *t, int col, const char *fmt, ...) __attribute__((format(printf, 3, 4)));

/* Append the table, each line indented by `indent` spaces.  Returns BR_OK
 * or BR_ENOMEM. */
int br_table_render(const br_table *t, int indent, br_text *out);

#endif

/* table.c - column-aligned plain-text tables. */
#include "report/table.h"

#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

typedef char br_cell[BR_TABLE_CELL];

struct br_table {
    int ncol;                       /* columns in use */
    int cap;                        /* body rows allocated */
    int nrow;                       /* body rows filled */
    br_cell head[BR_TABLE_COLS];    /* headings */
    int align[BR_TABLE_COLS];       /* br_align per column */
    br_cell (*body)[BR_TABLE_COLS]; /* cap rows */
};

br_table *br_table_create(int ncol, int nrow)
{
    br_table *t = calloc(1, sizeof *t);
    if (!t)
        return NULL;
    t->ncol = ncol < 1 ? 1 : ncol > BR_TABLE_COLS ? BR_TABLE_COLS : ncol;
    t->cap = nrow > 0 ? nrow : 1;
    t->body = calloc((size_t)t->cap, sizeof *t->body);
    if (!t->body) {
        free(t);
        return NULL;
    }
    return t;
}

void br_table_free(br_table *t)
{
    if (!t)
        return;
    free(t->body);
    free(t);
}

void br_table_head(br_table *t, int col, const char *head, int align)
{
    if (col < 0 || col >= t->ncol)
        return;
    snprintf(t->head[col], BR_TABLE_CELL, "%s", head);
    t->align[col] = align;
}

int br_table_row(br_table *t)
{
    if (t->nrow >= t->cap)
        return -1;
    return t->nrow++;
}

void br_table_set(br_table *t, int col, const char *fmt, ...)
{
    if (t->nrow == 0 || col < 0 || col >= t->ncol)
        return;
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(t->body[t->nrow - 1][col], BR_TABLE_CELL, fmt, ap);
    va_end(ap);
}

static void widths(const br_table *t, int w[BR_TABLE_COLS])
{
    for (int c = 0; c < t->ncol; c++) {
        w[c] = (int)strlen(t->head[c]);
        for (int r = 0; r < t->nrow; r++) {
            int len = (int)strlen(t->body[r][c]);
            w[c] = len > w[c] ? len : w[c];
        }
    }
}

static int line(const br_table *t, const br_cell *cells, const int w[BR_TABLE_COLS], int indent,
                br_text *out)
{
    char buf[BR_TABLE_COLS * (BR_TABLE_CELL + 2) + 128];
    size_t n = (size_t)snprintf(buf, sizeof buf, "%*s", indent, "");
    for (int c = 0; c < t->ncol && n < sizeof buf; c++) {
        int last = c == t->ncol - 1;
        int wc = last && t->align[c] == BR_LEFT ? 0 : w[c];
        n += (size_t)snprintf(buf + n, sizeof buf - n, t->align[c] == BR_LEFT ? "%-*s%s" : "%*s%s",
                              wc, cells[c], last ? "" : "  ");
    }
    if (n >= sizeof buf)
        n = sizeof buf - 1;
    while (n > 0 && buf[n - 1] == ' ')
        buf[--n] = '\0';
    return br_text_printf(out, "%s\n", buf);
}

int br_table_render(const br_table *t, int indent, br_text *out)
{
    int w[BR_TABLE_COLS];
    widths(t, w);
    int rc = line(t, t->head, w, indent, out);
    for (int r = 0; r < t->nrow; r++)
        rc |= line(t, t->body[r], w, indent, out);
    return rc ? BR_ENOMEM : BR_OK;
}

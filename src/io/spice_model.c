/* spice_model.c - the Berkeley SPICE diode .model statement: tokens with
 * their lines, the statement's grammar, SPICE numbers. */
#include "io/spice_model.h"

#include "core/error.h"

#include <ctype.h>
#include <errno.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>

#define TOK_MAX 64  /* longest token kept (a longer one is refused) */
#define TOKS_MAX 96 /* tokens in a statement: 15 parameters of 3 each, and spare */

/* Parameter names as SPICE3 and its descendants spell them; the aliases
 * map onto the canonical parameter. */
static const struct {
    const char *name;
    int param;
} names[] = {
    {"IS", BR_SP_IS},   {"N", BR_SP_N},    {"RS", BR_SP_RS},     {"CJO", BR_SP_CJO},
    {"CJ0", BR_SP_CJO}, {"CJ", BR_SP_CJO}, {"VJ", BR_SP_VJ},     {"PB", BR_SP_VJ},
    {"M", BR_SP_M},     {"MJ", BR_SP_M},   {"TT", BR_SP_TT},     {"EG", BR_SP_EG},
    {"XTI", BR_SP_XTI}, {"BV", BR_SP_BV},  {"IBV", BR_SP_IBV},   {"FC", BR_SP_FC},
    {"KF", BR_SP_KF},   {"AF", BR_SP_AF},  {"TNOM", BR_SP_TNOM},
};
#define NNAMES (sizeof names / sizeof names[0])
#define KNOWN "IS N RS CJO (CJ0, CJ) VJ (PB) M (MJ) TT EG XTI BV IBV FC KF AF TNOM"

const char *br_sp_param_name(int p)
{
    for (size_t i = 0; i < NNAMES; i++)
        if (names[i].param == p)
            return names[i].name;
    return "?";
}

static int param_of(const char *name)
{
    for (size_t i = 0; i < NNAMES; i++)
        if (strcasecmp(names[i].name, name) == 0)
            return names[i].param;
    return -1;
}

/* ---- numbers ---------------------------------------------------------------- */

/* Digits with an optional point into "DIGITS" and a power of ten, so that
 * strtod reads them the same way in every locale. */
static const char *scan_mantissa(const char *p, char *buf, size_t cap, long *exp10, int *ndig)
{
    size_t n = 0;
    int point = 0;
    *ndig = 0;
    *exp10 = 0;
    for (;; p++) {
        if (*p == '.' && !point) {
            point = 1;
            continue;
        }
        if (!isdigit((unsigned char)*p))
            break;
        (*ndig)++;
        *exp10 -= point;
        if (n == 0 && *p == '0')
            continue;
        if (n + 1 >= cap)
            return NULL;
        buf[n++] = *p;
    }
    if (n == 0)
        buf[n++] = '0';
    buf[n] = '\0';
    return p;
}

/* An exponent "e-9" when digits follow the e ("1.2eV" has none). */
static const char *scan_exp(const char *p, long *e)
{
    const char *q = p + 1;
    int sign = 1;
    *e = 0;
    if (*p != 'e' && *p != 'E')
        return p;
    if (*q == '+' || *q == '-')
        sign = *q++ == '-' ? -1 : 1;
    if (!isdigit((unsigned char)*q))
        return p;
    for (; isdigit((unsigned char)*q); q++)
        if (*e < 100000)
            *e = *e * 10 + (*q - '0');
    *e *= sign;
    return q;
}

/* SPICE's scale factors; "meg" and "mil" before "m". */
static double scale_of(const char *p)
{
    static const struct {
        const char *s;
        double f;
    } sf[] = {{"meg", 1e6}, {"mil", 25.4e-6}, {"t", 1e12}, {"g", 1e9},   {"k", 1e3},
              {"m", 1e-3},  {"u", 1e-6},      {"n", 1e-9}, {"p", 1e-12}, {"f", 1e-15}};
    for (size_t i = 0; i < sizeof sf / sizeof sf[0]; i++)
        if (strncasecmp(p, sf[i].s, strlen(sf[i].s)) == 0)
            return sf[i].f;
    return 1.0;
}

int br_spice_number(const char *s, double *v)
{
    char buf[48];
    long exp10, e;
    int ndig, neg = 0;
    const char *p = s;
    if (*p == '+' || *p == '-')
        neg = *p++ == '-';
    p = scan_mantissa(p, buf, 32, &exp10, &ndig);
    if (!p || ndig == 0)
        return -1;
    p = scan_exp(p, &e);
    for (const char *q = p; *q; q++) /* a scale factor, then letters SPICE ignores */
        if (!isalpha((unsigned char)*q))
            return -1;
    size_t n = strlen(buf);
    snprintf(buf + n, sizeof buf - n, "e%ld", e + exp10);
    errno = 0;
    double x = strtod(buf, NULL) * scale_of(p);
    if (errno == ERANGE || !isfinite(x))
        return -1;
    *v = neg ? -x : x;
    return 0;
}

/* ---- tokens ----------------------------------------------------------------- */

typedef struct tok {
    char s[TOK_MAX];
    int line;
} tok;

typedef struct lexer {
    tok t[TOKS_MAX];
    int n;
    const char *file;
    const char *field;
    br_error *err;
} lexer;

static int lex_fail(lexer *x, int line, const char *param, const char *fmt, ...)
    __attribute__((format(printf, 4, 5)));

static int lex_fail(lexer *x, int line, const char *param, const char *fmt, ...)
{
    char field[160], msg[512];
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(msg, sizeof msg, fmt, ap);
    va_end(ap);
    if (param)
        snprintf(field, sizeof field, "%s: %s", x->field, param);
    else
        snprintf(field, sizeof field, "%s", x->field);
    return br_error_set(x->err, BR_EINPUT, x->file, line, field, "%s", msg);
}

static int push(lexer *x, const char *s, size_t len, int line)
{
    if (len >= TOK_MAX)
        return lex_fail(x, line, NULL, "'%.24s...' is too long, expected a name or a number", s);
    if (x->n >= TOKS_MAX)
        return lex_fail(x, line, NULL, "too many words, expected one diode .model statement");
    memcpy(x->t[x->n].s, s, len);
    x->t[x->n].s[len] = '\0';
    x->t[x->n++].line = line;
    return BR_OK;
}

/* The words of one physical line (after a continuation's '+'). */
static int lex_line(lexer *x, const char *p, const char *end, int line)
{
    while (p < end) {
        if (isspace((unsigned char)*p) || *p == ',') {
            p++;
            continue;
        }
        if (*p == '(' || *p == ')' || *p == '=') {
            BR_TRY(push(x, p++, 1, line));
            continue;
        }
        const char *w = p;
        while (p < end && !isspace((unsigned char)*p) && !strchr(",()=", *p))
            p++;
        BR_TRY(push(x, w, (size_t)(p - w), line));
    }
    return BR_OK;
}

/* Split text into tokens: '*' lines are comments, '+' lines continue the
 * statement, any other non-blank line after the first starts a second
 * statement (refused). */
static int lex(lexer *x, const char *text, int line0)
{
    int line = line0, started = 0;
    for (const char *p = text; *p; line++) {
        const char *end = p + strcspn(p, "\n");
        const char *q = p;
        while (q < end && isspace((unsigned char)*q))
            q++;
        if (q < end && *q != '*') {
            if (*q == '+' && !started)
                return lex_fail(x, line, NULL, "%s",
                                "a '+' continuation before the statement, expected "
                                "'.model NAME D(...)' first");
            if (*q != '+' && started)
                return lex_fail(x, line, NULL,
                                "'%.24s' starts a second statement, expected "
                                "one .model statement (continuation lines "
                                "start with '+')",
                                q);
            BR_TRY(lex_line(x, q + (*q == '+'), end, line));
            started = 1;
        }
        p = *end ? end + 1 : end;
    }
    if (!started)
        return lex_fail(x, line0, NULL, "%s", "empty, expected '.model NAME D(IS=... N=...)'");
    return BR_OK;
}

/* ---- the statement ---------------------------------------------------------- */

static int read_param(lexer *x, int *i, br_spice_model *m)
{
    const tok *name = &x->t[*i];
    int p = param_of(name->s);
    if (p < 0)
        return lex_fail(x, name->line, name->s,
                        "unknown diode parameter '%s', expected one of " KNOWN, name->s);
    const char *canon = br_sp_param_name(p);
    if (*i + 2 >= x->n || strcmp(x->t[*i + 1].s, "=") != 0 || strchr("()=", x->t[*i + 2].s[0]))
        return lex_fail(x, name->line, canon, "no value, expected %s=VALUE", canon);
    const tok *val = &x->t[*i + 2];
    double v;
    if (br_spice_number(val->s, &v) != 0)
        return lex_fail(x, val->line, canon,
                        "'%s' is not a SPICE number, expected digits with an optional exponent "
                        "and scale factor (f p n u m k meg g t)",
                        val->s);
    if (m->given[p]) {
        return lex_fail(x, name->line, canon, "given twice (first on line %d), expected once",
                        m->line[p]);
    }
    m->given[p] = 1;
    m->v[p] = v;
    m->line[p] = name->line;
    *i += 3;
    return BR_OK;
}

static int read_head(lexer *x, br_spice_model *m)
{
    if (strcasecmp(x->t[0].s, ".model") != 0)
        return lex_fail(x, x->t[0].line, NULL, "starts with '%s', expected '.model NAME D(...)'",
                        x->t[0].s);
    if (x->n < 3 || strchr("()=", x->t[1].s[0]))
        return lex_fail(x, x->t[0].line, NULL, "%s",
                        "no model name and type, expected "
                        "'.model NAME D(...)'");
    if (strlen(x->t[1].s) >= sizeof m->name)
        return lex_fail(x, x->t[1].line, NULL,
                        "model name '%s' too long, expected at most 47 "
                        "characters",
                        x->t[1].s);
    memcpy(m->name, x->t[1].s, strlen(x->t[1].s) + 1);
    if (strcasecmp(x->t[2].s, "D") != 0)
        return lex_fail(x, x->t[2].line, NULL, "model type '%s', expected D (a diode)", x->t[2].s);
    return BR_OK;
}

int br_spice_model_parse(const char *text, const char *file, int line0, const char *field,
                         br_spice_model *m, br_error *err)
{
    lexer x = {.n = 0, .file = file, .field = field, .err = err};
    memset(m, 0, sizeof *m);
    BR_TRY(lex(&x, text, line0));
    BR_TRY(read_head(&x, m));
    int i = 3, open = i < x.n && strcmp(x.t[i].s, "(") == 0;
    i += open;
    while (i < x.n && strcmp(x.t[i].s, ")") != 0)
        BR_TRY(read_param(&x, &i, m));
    int close = i < x.n;
    const tok *last = &x.t[i < x.n ? i : x.n - 1];
    if (open != close)
        return lex_fail(&x, last->line, NULL, "%s",
                        open ? "no ')' to close the parameters, expected D(... )"
                             : "a ')' without '(', expected D(...)");
    if (close && i + 1 < x.n)
        return lex_fail(&x, x.t[i + 1].line, NULL, "'%s' after the ')', expected the end",
                        x.t[i + 1].s);
    return BR_OK;
}

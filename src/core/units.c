/* units.c - quantities with SI units and tolerances, text to SI doubles.
 *
 * Grammar (whitespace allowed between tokens):
 *   qty    := value [tol] [dist] | value '/' value '/' value [dist]
 *   value  := number [suffix]            suffix: [prefix] [unit]
 *   tol    := ("+-" | "±") amount | '+' amount '/' '-' amount
 *                                        | '-' amount '/' '+' amount
 *   amount := number ('%' | [suffix])    '%' is relative to the nominal
 *   dist   := "uniform" | "normal"
 * Numbers are decimal only (no hex, inf or nan) and are read independently
 * of the C locale. */
#include "core/units.h"

#include "core/error.h"
#include "model/design.h"

#include <ctype.h>
#include <errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define KELVIN 273.15
#define SUFFIX_MAX 24
#define DIGITS_MAX 40

#define MICRO_SIGN "\xC2\xB5"
#define GREEK_MU "\xCE\xBC"
#define PLUS_MINUS "\xC2\xB1"
#define DEGREE "\xC2\xB0"

typedef struct kind_info {
    const char *expected; /* phrase for messages */
    const char *unit;     /* the SI unit */
    const char *units[8]; /* spellings of the unit at scale 1, NULL-terminated */
    const char *prefixes; /* SI prefixes that make sense for this kind */
    int bare;             /* a bare number is accepted: the kind has no unit */
    double limit;         /* largest magnitude that can be meant, SI (0: none) */
    const char *limit_as; /* the same for messages */
} kind_info;

/* A bare number is a plain number or a fraction.  Every dimensioned kind
 * needs its unit or at least a prefix ("62 nC", "62n"): "62" for a gate
 * charge would be 62 C, a scale the writer almost surely did not mean.
 * A bare 0 is the same in every unit and is accepted.  The limits are far
 * beyond any gate-drive chain; a value past them is a typo, and keeps the
 * arithmetic away from overflow. */
static const kind_info kinds[BR_KIND_COUNT] = {
    [BR_KIND_VOLTAGE] =
        {"a voltage like '12 V'", "V", {"V", "v", NULL}, "fpnumkMG", 0, 1e6, "1 MV"},
    [BR_KIND_CURRENT] = {"a current like '2 mA'", "A", {"A", NULL}, "fpnumkMG", 0, 1e6, "1 MA"},
    /* A mega- or kilofarad is never meant: those are typos for milli. */
    [BR_KIND_CAPACITANCE] =
        {"a capacitance like '4.7 uF'", "F", {"F", NULL}, "fpnum", 0, 1.0, "1 F"},
    [BR_KIND_FREQUENCY] =
        {"a frequency like '200 kHz'", "Hz", {"Hz", "hz", "HZ", NULL}, "mkMG", 0, 1e12, "1000 GHz"},
    [BR_KIND_TIME] = {"a time like '50 ns'", "s", {"s", NULL}, "fpnum", 0, 1e4, "10000 s"},
    [BR_KIND_RESISTANCE] = {"a resistance like '10 mohm'",
                            "ohm",
                            {"ohm", "Ohm", "ohms", "Ohms", "OHM", "\xCE\xA9", "\xE2\x84\xA6", NULL},
                            "fpnumkMG",
                            0,
                            1e12,
                            "1000 Gohm"},
    [BR_KIND_CHARGE] = {"a charge like '10 nC'", "C", {"C", NULL}, "fpnum", 0, 1.0, "1 C"},
    [BR_KIND_TEMPERATURE] =
        {"a temperature like '85 C' or '358 K'", "K", {"K", NULL}, "", 0, 0, NULL},
    [BR_KIND_TEMP_DELTA] = {"a temperature difference like '10 K'",
                            "K",
                            {"K", "C", "degC", DEGREE "C", NULL},
                            "",
                            0,
                            1e4,
                            "10000 K"},
    [BR_KIND_FRACTION] = {"a fraction like '80 %' or '0.8'", "", {NULL}, "", 1, 0, NULL},
    [BR_KIND_NUMBER] = {"a plain number like '1.5'", "", {NULL}, "", 1, 0, NULL},
    [BR_KIND_ENERGY_EV] = {"an energy like '1.12 eV'", "eV", {"eV", NULL}, "m", 0, 1e3, "1 keV"},
    /* "mA2s" could be read as 1e-3 A^2 s or (1e-3 A)^2 s: no prefixes */
    [BR_KIND_I2T] = {"an I2t like '4.5 A2s'",
                     "A2s",
                     {"A2s", "A^2s", "A\xC2\xB2s", NULL},
                     "",
                     0,
                     1e9,
                     "1e9 A2s"},
    [BR_KIND_POWER] = {"a power like '250 mW'", "W", {"W", NULL}, "fpnumk", 0, 1e4, "10 kW"},
    /* junction to ambient: "mK/W" would be a typo, never a value */
    [BR_KIND_THERMAL_R] = {"a thermal resistance like '60 K/W'",
                           "K/W",
                           {"K/W", "C/W", "degC/W", DEGREE "C/W", NULL},
                           "",
                           0,
                           1e4,
                           "10000 K/W"},
    /* a phase angle: degrees as the trade writes them, radians inside */
    [BR_KIND_ANGLE] =
        {"an angle like '30 deg'", "rad", {"deg", DEGREE, NULL}, "", 0, 1e3, "1000 rad"},
};

const char *br_kind_expected(br_kind kind)
{
    return (kind >= 0 && kind < BR_KIND_COUNT) ? kinds[kind].expected : "a value";
}

const char *br_kind_unit(br_kind kind)
{
    return (kind >= 0 && kind < BR_KIND_COUNT) ? kinds[kind].unit : "";
}

/* ---- suffixes ---------------------------------------------------------- */

static double prefix_scale(char c)
{
    switch (c) {
    case 'f':
        return 1e-15;
    case 'p':
        return 1e-12;
    case 'n':
        return 1e-9;
    case 'u':
        return 1e-6;
    case 'm':
        return 1e-3;
    case 'k':
        return 1e3;
    case 'M':
        return 1e6;
    case 'G':
        return 1e9;
    default:
        return 0.0;
    }
}

static int is_unit(const kind_info *k, const char *s)
{
    for (int i = 0; k->units[i]; i++)
        if (strcmp(s, k->units[i]) == 0)
            return 1;
    return 0;
}

/* Split a leading prefix off s: returns its letter ('u' for either micro
 * sign) and sets *rest, or returns 0 when s does not start with a prefix. */
static char split_prefix(const char *s, const char **rest)
{
    if (strncmp(s, MICRO_SIGN, 2) == 0 || strncmp(s, GREEK_MU, 2) == 0) {
        *rest = s + 2;
        return 'u';
    }
    if (s[0] && prefix_scale(s[0]) > 0.0) {
        *rest = s + 1;
        return s[0];
    }
    return 0;
}

static int unit_error(br_error *err, const char *suffix, br_kind kind)
{
    return br_error_set(err, BR_EINPUT, NULL, 0, NULL, "got '%s', expected %s", suffix,
                        kinds[kind].expected);
}

/* Temperatures carry an offset, so they are handled apart. */
static int temperature_scale(const char *suffix, double *offset, br_error *err)
{
    if (strcmp(suffix, "K") == 0) {
        *offset = 0.0;
        return BR_OK;
    }
    if (strcmp(suffix, "C") == 0 || strcmp(suffix, "degC") == 0 ||
        strcmp(suffix, DEGREE "C") == 0) {
        *offset = KELVIN;
        return BR_OK;
    }
    if (suffix[0] == '\0')
        return br_error_set(err, BR_EINPUT, NULL, 0, NULL,
                            "a bare number is ambiguous for a temperature, expected %s",
                            kinds[BR_KIND_TEMPERATURE].expected);
    return unit_error(err, suffix, BR_KIND_TEMPERATURE);
}

/* SI value = number * scale + offset for the suffix of a value of kind. */
static int suffix_scale(const char *suffix, br_kind kind, double *scale, double *offset,
                        br_error *err)
{
    const kind_info *k = &kinds[kind];
    *scale = 1.0;
    *offset = 0.0;
    if (kind == BR_KIND_TEMPERATURE)
        return temperature_scale(suffix, offset, err);
    if (kind == BR_KIND_ANGLE && suffix[0] != '\0' && is_unit(k, suffix)) {
        *scale = 3.14159265358979323846 / 180.0; /* every spelling is a degree */
        return BR_OK;
    }
    if (suffix[0] == '\0' || is_unit(k, suffix))
        return BR_OK; /* a missing unit is to_si's to judge: it knows the number */
    if (kind == BR_KIND_FRACTION && strcmp(suffix, "%") == 0) {
        *scale = 0.01;
        return BR_OK;
    }
    const char *rest = NULL;
    char p = split_prefix(suffix, &rest);
    if (!p || !(rest[0] == '\0' || is_unit(k, rest)))
        return unit_error(err, suffix, kind);
    if (!k->prefixes[0])
        return br_error_set(err, BR_EINPUT, NULL, 0, NULL,
                            "got '%s', expected %s (no prefix: on this unit it would mislead)",
                            suffix, k->expected);
    if (!strchr(k->prefixes, p))
        return br_error_set(err, BR_EINPUT, NULL, 0, NULL,
                            "got '%s', expected %s (prefix '%c' does not fit; the prefixes "
                            "that do: '%s')",
                            suffix, k->expected, p, k->prefixes);
    *scale = prefix_scale(p);
    return BR_OK;
}

/* ---- scanning ---------------------------------------------------------- */

typedef struct scan {
    const char *p; /* cursor into the text */
    br_kind kind;
    br_error *err;
} scan;

/* One value as written: the number, its (possibly empty) suffix and the
 * number's own text, for messages. */
typedef struct raw {
    double num;
    char suffix[SUFFIX_MAX];
    char text[DIGITS_MAX + 24];
} raw;

static void skip_ws(scan *s)
{
    while (*s->p && isspace((unsigned char)*s->p))
        s->p++;
}

static int is_plus_minus(const char *p)
{
    return strncmp(p, "+-", 2) == 0 || strncmp(p, PLUS_MINUS, 2) == 0;
}

static int is_suffix_char(const char *p)
{
    unsigned char c = (unsigned char)*p;
    if (c >= 0x80)
        return !is_plus_minus(p);
    return isalpha(c) || c == '%';
}

/* Collect the digits of a decimal number into a string strtod reads the
 * same way in every locale (no decimal point): "4.70" -> "470" with
 * *exp10 = -2.  Leading zeros are dropped but still shift the exponent. */
static int scan_digits(scan *s, char *buf, size_t cap, long *exp10, int *ndig)
{
    size_t n = 0;
    int seen_point = 0;
    *ndig = 0;
    *exp10 = 0;
    for (;; s->p++) {
        char c = *s->p;
        if (c == '.' && !seen_point) {
            seen_point = 1;
            continue;
        }
        if (!isdigit((unsigned char)c))
            break;
        (*ndig)++;
        if (seen_point)
            (*exp10)--;
        if (n == 0 && c == '0')
            continue;
        if (n + 1 >= cap)
            return -1;
        buf[n++] = c;
    }
    if (n == 0)
        buf[n++] = '0';
    buf[n] = '\0';
    return 0;
}

static int scan_exponent(scan *s, long *e)
{
    const char *q = s->p;
    if (*q != 'e' && *q != 'E')
        return 0;
    q++;
    int sign = 1;
    if (*q == '+' || *q == '-')
        sign = (*q++ == '-') ? -1 : 1;
    if (!isdigit((unsigned char)*q))
        return 0; /* "3.26 eV": the e belongs to the unit */
    long v = 0;
    for (; isdigit((unsigned char)*q); q++)
        if (v < 100000)
            v = v * 10 + (*q - '0');
    *e = sign * v;
    s->p = q;
    return 0;
}

static int number_error(scan *s, const char *what)
{
    return br_error_set(s->err, BR_EINPUT, NULL, 0, NULL, "%s at '%.24s', expected %s", what, s->p,
                        kinds[s->kind].expected);
}

static int scan_number(scan *s, double *out)
{
    char buf[DIGITS_MAX + 24];
    const char *start = s->p;
    int neg = 0, ndig;
    long exp10, e = 0;
    if (*s->p == '+' || *s->p == '-')
        neg = (*s->p++ == '-');
    if (scan_digits(s, buf, DIGITS_MAX, &exp10, &ndig) != 0)
        return number_error(s, "too many digits");
    if (ndig == 0) {
        s->p = start;
        return number_error(s, *s->p ? "not a number" : "missing number");
    }
    scan_exponent(s, &e);
    size_t n = strlen(buf);
    snprintf(buf + n, sizeof buf - n, "e%ld", e + exp10);
    errno = 0;
    double v = strtod(buf, NULL);
    if (errno == ERANGE || !isfinite(v))
        return number_error(s, "number out of range");
    *out = neg ? -v : v;
    return BR_OK;
}

/* A unit may hold a power once it has begun ("A2s", "A^2s"), and a
 * thermal resistance its "per watt" ("K/W"); any other '/' separates the
 * values of a min / typ / max. */
static int continues_suffix(const char *p, size_t n)
{
    return n > 0 && (isdigit((unsigned char)*p) || *p == '^' || (p[0] == '/' && p[1] == 'W'));
}

static int scan_suffix(scan *s, char *buf, size_t cap)
{
    size_t n = 0;
    while (*s->p && (is_suffix_char(s->p) || continues_suffix(s->p, n))) {
        if (n + 1 >= cap)
            return br_error_set(s->err, BR_EINPUT, NULL, 0, NULL, "unit too long, expected %s",
                                kinds[s->kind].expected);
        buf[n++] = *s->p++;
    }
    buf[n] = '\0';
    return BR_OK;
}

static int is_dist_word(const char *w)
{
    return strcmp(w, "uniform") == 0 || strcmp(w, "normal") == 0;
}

/* number [ws] [suffix]; a distribution word is left for the caller. */
static int scan_value(scan *s, raw *r)
{
    const char *start = s->p;
    int rc = scan_number(s, &r->num);
    if (rc)
        return rc;
    const char *after_number = s->p;
    snprintf(r->text, sizeof r->text, "%.*s", (int)(after_number - start), start);
    skip_ws(s);
    if ((rc = scan_suffix(s, r->suffix, sizeof r->suffix)) != 0)
        return rc;
    if (is_dist_word(r->suffix)) {
        r->suffix[0] = '\0';
        s->p = after_number;
    }
    return BR_OK;
}

static int expect_end(scan *s);

/* After a value: something that can follow it in a quantity (the end, a
 * tolerance, a '/', a distribution word), or not. */
static int junk_follows(const scan *s)
{
    const char *p = s->p;
    while (*p && isspace((unsigned char)*p))
        p++;
    return *p &&
           !(*p == '+' || *p == '-' || *p == '/' || is_plus_minus(p) || isalpha((unsigned char)*p));
}

/* A magnitude beyond the kind's limit is refused, naming the limit. */
static int check_limit(scan *s, br_kind kind, double v, const char *what)
{
    const kind_info *k = &kinds[kind];
    if (!(k->limit > 0) || fabs(v) <= k->limit)
        return BR_OK;
    return br_error_set(s->err, BR_EINPUT, NULL, 0, NULL,
                        "got '%.40s', beyond any value that can be meant here; expected %s of "
                        "at most %s",
                        what, k->expected, k->limit_as);
}

static int to_si(scan *s, const raw *r, br_kind kind, double *out)
{
    double scale, offset;
    int rc = suffix_scale(r->suffix, kind, &scale, &offset, s->err);
    if (rc)
        return rc;
    if (r->suffix[0] == '\0' && !kinds[kind].bare && r->num != 0.0 && junk_follows(s))
        return expect_end(s); /* "12,5 V": the comma is the fault, not the unit */
    if (r->suffix[0] == '\0' && !kinds[kind].bare && r->num != 0.0)
        return br_error_set(s->err, BR_EINPUT, NULL, 0, NULL,
                            "got '%s' without a unit, expected %s (a bare number is only for "
                            "plain numbers, fractions and 0)",
                            r->text, kinds[kind].expected);
    double v = r->num * scale + offset;
    if (!isfinite(v))
        return br_error_set(s->err, BR_EINPUT, NULL, 0, NULL, "value out of range, expected %s",
                            kinds[kind].expected);
    char what[DIGITS_MAX + 24 + SUFFIX_MAX + 2];
    snprintf(what, sizeof what, "%s%s%s", r->text, r->suffix[0] ? " " : "", r->suffix);
    if ((rc = check_limit(s, kind, v, what)) != 0)
        return rc;
    *out = v;
    return BR_OK;
}

/* ---- tolerances -------------------------------------------------------- */

/* A tolerance amount: relative ("10%", a fraction of |nom|) or absolute. */
static int scan_amount(scan *s, double nom, double *out)
{
    raw r;
    skip_ws(s);
    int rc = scan_value(s, &r);
    if (rc)
        return rc;
    if (r.num < 0.0)
        return br_error_set(s->err, BR_EINPUT, NULL, 0, NULL,
                            "negative tolerance, expected an amount >= 0 like '10%%'");
    if (strcmp(r.suffix, "%") == 0) {
        if (s->kind == BR_KIND_TEMPERATURE)
            return br_error_set(s->err, BR_EINPUT, NULL, 0, NULL,
                                "a temperature tolerance must be absolute, like '+-5 K'");
        *out = r.num * 0.01 * fabs(nom);
        return BR_OK;
    }
    br_kind k = s->kind == BR_KIND_TEMPERATURE ? BR_KIND_TEMP_DELTA : s->kind;
    return to_si(s, &r, k, out);
}

static int expect_char(scan *s, char c, const char *what)
{
    skip_ws(s);
    if (*s->p != c)
        return br_error_set(s->err, BR_EINPUT, NULL, 0, NULL, "expected %s at '%.24s'", what,
                            *s->p ? s->p : "(end)");
    s->p++;
    return BR_OK;
}

/* "+10%/-20%" or "-20%/+10%", the cursor on the first sign. */
static int scan_asymmetric(scan *s, br_qty *q)
{
    int plus_first = (*s->p++ == '+');
    double a, b;
    int rc = scan_amount(s, q->nom, &a);
    if (!rc)
        rc = expect_char(s, '/', "'/' between the two sides of the tolerance");
    if (!rc)
        rc = expect_char(s, plus_first ? '-' : '+',
                         plus_first ? "the '-' side of the tolerance" : "the '+' side");
    if (!rc)
        rc = scan_amount(s, q->nom, &b);
    if (rc)
        return rc;
    q->max = q->nom + (plus_first ? a : b);
    q->min = q->nom - (plus_first ? b : a);
    return BR_OK;
}

/* The first value is read; "/ typ / max" follows.  A value without a
 * suffix takes the suffix of the next one that has one ("0.6/0.7/0.8 V"). */
static int scan_min_typ_max(scan *s, raw v[3], br_qty *q)
{
    int rc = BR_OK;
    for (int i = 1; i < 3 && !rc; i++) {
        rc = expect_char(s, '/', "'/' in min / typ / max");
        if (!rc) {
            skip_ws(s);
            rc = scan_value(s, &v[i]);
        }
    }
    for (int i = 1; i >= 0 && !rc; i--)
        if (v[i].suffix[0] == '\0')
            memcpy(v[i].suffix, v[i + 1].suffix, sizeof v[i].suffix);
    if (!rc)
        rc = to_si(s, &v[0], s->kind, &q->min);
    if (!rc)
        rc = to_si(s, &v[1], s->kind, &q->nom);
    if (!rc)
        rc = to_si(s, &v[2], s->kind, &q->max);
    if (!rc && !(q->min <= q->nom && q->nom <= q->max))
        rc = br_error_set(s->err, BR_EINPUT, NULL, 0, NULL,
                          "min / typ / max out of order, expected min <= typ <= max");
    return rc;
}

static int scan_dist(scan *s, br_qty *q)
{
    char w[SUFFIX_MAX];
    skip_ws(s);
    int rc = scan_suffix(s, w, sizeof w);
    if (rc || w[0] == '\0')
        return rc;
    if (strcmp(w, "normal") == 0)
        q->dist = BR_DIST_NORMAL;
    else if (strcmp(w, "uniform") == 0)
        q->dist = BR_DIST_UNIFORM;
    else
        return br_error_set(s->err, BR_EINPUT, NULL, 0, NULL,
                            "unexpected '%s', expected a distribution 'uniform' or 'normal'", w);
    return BR_OK;
}

static int expect_end(scan *s)
{
    skip_ws(s);
    if (*s->p)
        return br_error_set(s->err, BR_EINPUT, NULL, 0, NULL,
                            "unexpected '%.24s' after the value, expected %s", s->p,
                            kinds[s->kind].expected);
    return BR_OK;
}

static int check_text(const char *text, br_kind kind, br_error *err)
{
    if (kind < 0 || kind >= BR_KIND_COUNT)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL, "unknown quantity kind %d", (int)kind);
    const char *p = text ? text : "";
    while (isspace((unsigned char)*p))
        p++;
    if (*p == '\0')
        return br_error_set(err, BR_EINPUT, NULL, 0, NULL, "empty value, expected %s",
                            kinds[kind].expected);
    return BR_OK;
}

int br_unit_parse(const char *text, br_kind kind, double *out, br_error *err)
{
    if (!out) /* a public function: the caller's mistake, said so */
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL, "br_unit_parse: no place for the value");
    int rc = check_text(text, kind, err);
    if (rc)
        return rc;
    scan s = {text, kind, err};
    raw r;
    double v;
    skip_ws(&s);
    if ((rc = scan_value(&s, &r)) != 0)
        return rc;
    skip_ws(&s);
    if (is_plus_minus(s.p) || *s.p == '/' || *s.p == '+')
        return br_error_set(err, BR_EINPUT, NULL, 0, NULL, "no tolerance allowed here, expected %s",
                            kinds[kind].expected);
    if ((rc = to_si(&s, &r, kind, &v)) != 0 || (rc = expect_end(&s)) != 0)
        return rc;
    *out = v;
    return BR_OK;
}

/* After the first value: a tolerance, min/typ/max, or nothing. */
static int scan_spread(scan *s, raw v[3], br_qty *q)
{
    skip_ws(s);
    if (*s->p == '/')
        return scan_min_typ_max(s, v, q);
    int rc = to_si(s, &v[0], s->kind, &q->nom);
    if (rc)
        return rc;
    q->min = q->max = q->nom;
    if (is_plus_minus(s->p)) {
        s->p += 2;
        double a;
        if ((rc = scan_amount(s, q->nom, &a)) != 0)
            return rc;
        q->min = q->nom - a;
        q->max = q->nom + a;
        return BR_OK;
    }
    if (*s->p == '+' || *s->p == '-')
        return scan_asymmetric(s, q);
    return BR_OK;
}

int br_qty_parse(const char *text, br_kind kind, br_qty *q, br_error *err)
{
    int rc = check_text(text, kind, err);
    if (rc)
        return rc;
    scan s = {text, kind, err};
    raw v[3];
    br_qty r = {0.0, 0.0, 0.0, BR_DIST_UNIFORM, BR_QTY_NSIG, 0};
    memset(v, 0, sizeof v);
    skip_ws(&s);
    if ((rc = scan_value(&s, &v[0])) != 0 || (rc = scan_spread(&s, v, &r)) != 0 ||
        (rc = scan_dist(&s, &r)) != 0 || (rc = expect_end(&s)) != 0)
        return rc;
    /* a tolerance in % can carry a limit past the kind's bound */
    if ((rc = check_limit(&s, kind, r.min, text)) != 0 ||
        (rc = check_limit(&s, kind, r.max, text)) != 0)
        return rc;
    *q = r;
    return BR_OK;
}

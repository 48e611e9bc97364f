/* text.c - growable NUL-terminated text buffer for rendered reports. */
#include "bootrung/bootrung.h"

#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

struct br_text {
    char *buf;  /* NUL-terminated contents */
    size_t len; /* bytes used, without the NUL */
    size_t cap; /* bytes allocated */
};

br_text *br_text_create(void)
{
    br_text *t = calloc(1, sizeof *t);
    if (!t)
        return NULL;
    t->cap = 256;
    t->buf = malloc(t->cap);
    if (!t->buf) {
        free(t);
        return NULL;
    }
    t->buf[0] = '\0';
    return t;
}

void br_text_free(br_text *t)
{
    if (!t)
        return;
    free(t->buf);
    free(t);
}

const char *br_text_data(const br_text *t)
{
    return t->buf;
}
size_t br_text_len(const br_text *t)
{
    return t->len;
}

void br_text_reset(br_text *t)
{
    t->len = 0;
    t->buf[0] = '\0';
}

static int reserve(br_text *t, size_t extra)
{
    if (t->len + extra + 1 <= t->cap)
        return BR_OK;
    size_t cap = t->cap;
    while (cap < t->len + extra + 1)
        cap *= 2;
    char *nb = realloc(t->buf, cap);
    if (!nb)
        return BR_ENOMEM;
    t->buf = nb;
    t->cap = cap;
    return BR_OK;
}

int br_text_printf(br_text *t, const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    int n = vsnprintf(NULL, 0, fmt, ap);
    va_end(ap);
    if (n < 0 || reserve(t, (size_t)n) != BR_OK)
        return BR_ENOMEM;
    va_start(ap, fmt);
    vsnprintf(t->buf + t->len, (size_t)n + 1, fmt, ap);
    va_end(ap);
    t->len += (size_t)n;
    return BR_OK;
}

int br_text_put(br_text *t, const char *s)
{
    size_t n = strlen(s);
    if (reserve(t, n) != BR_OK)
        return BR_ENOMEM;
    memcpy(t->buf + t->len, s, n + 1);
    t->len += n;
    return BR_OK;
}

/* error.c - filling and formatting the error record. */
#include "core/error.h"

#include <stdarg.h>
#include <stdio.h>
#include <string.h>

static void copy_str(char *dst, size_t cap, const char *src)
{
    if (!src)
        src = "";
    snprintf(dst, cap, "%s", src);
}

int br_error_set(br_error *err, int code, const char *file, int line, const char *field,
                 const char *fmt, ...)
{
    if (!err)
        return code;
    err->code = code;
    err->line = line;
    copy_str(err->file, sizeof err->file, file);
    copy_str(err->field, sizeof err->field, field);
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(err->msg, sizeof err->msg, fmt, ap);
    va_end(ap);
    return code;
}

void br_error_clear(br_error *err)
{
    if (err)
        memset(err, 0, sizeof *err);
}

/* "FILE:LINE: field: message", leaving out the parts that are unknown. */
const char *br_error_format(const br_error *err, char *buf, size_t cap)
{
    size_t n = 0;
    if (!buf || cap == 0)
        return "";
    buf[0] = '\0';
    if (err->file[0])
        n += (size_t)snprintf(buf + n, cap - n, "%s:", err->file);
    if (err->line > 0 && n < cap)
        n += (size_t)snprintf(buf + n, cap - n, "%d:", err->line);
    if (n > 0 && n < cap)
        n += (size_t)snprintf(buf + n, cap - n, " ");
    if (err->field[0] && n < cap)
        n += (size_t)snprintf(buf + n, cap - n, "%s: ", err->field);
    if (n < cap)
        snprintf(buf + n, cap - n, "%s", err->msg);
    return buf;
}

const char *br_status_name(int code)
{
    switch (code) {
    case BR_OK:
        return "ok";
    case BR_EINPUT:
        return "bad input";
    case BR_ENOMEM:
        return "out of memory";
    case BR_EIO:
        return "i/o error";
    case BR_ENUMERIC:
        return "numerical failure";
    case BR_EUSAGE:
        return "usage error";
    case BR_ECANCEL:
        return "cancelled";
    default:
        return "unknown error";
    }
}

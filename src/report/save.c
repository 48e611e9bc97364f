/* save.c - all-or-nothing file output through a temporary file and
 * rename(), which POSIX makes atomic within one file system. */
#include "report/save.h"

#include "core/error.h"

#include <errno.h>
#include <fcntl.h>
#include <stdio.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#define TEMP_TRIES 100

/* Create "<path>.<pid>.<i>.tmp" exclusively: same directory as the target
 * so rename() never crosses file systems.  Mode 0666 lets the umask
 * decide, as for any file the user creates. */
static int open_temp(const char *path, char *tmp, size_t cap)
{
    for (int i = 0; i < TEMP_TRIES; i++) {
        int n = snprintf(tmp, cap, "%s.%ld.%d.tmp", path, (long)getpid(), i);
        if (n < 0 || (size_t)n >= cap) {
            errno = ENAMETOOLONG;
            return -1;
        }
        int fd = open(tmp, O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, 0666);
        if (fd >= 0 || errno != EEXIST)
            return fd;
    }
    return -1; /* errno is still EEXIST */
}

/* write() may write less than asked or be interrupted; loop until done.
 * Returns 0 or an errno value. */
static int write_all(int fd, const char *p, size_t n)
{
    while (n > 0) {
        ssize_t w = write(fd, p, n);
        if (w < 0 && errno == EINTR)
            continue;
        if (w <= 0)
            return w < 0 ? errno : EIO;
        p += w;
        n -= (size_t)w;
    }
    return 0;
}

static int fail(br_error *err, const char *path, int e)
{
    return br_error_set(err, BR_EIO, path, 0, NULL,
                        "cannot write this file (%s); expected a writable path to a file",
                        strerror(e));
}

/* An existing path that is not a regular file (a device, a FIFO,
 * /dev/stdout) is written in place: renaming over it would replace the
 * device node itself when run as root. */
static int save_special(const br_text *t, const char *path, br_error *err)
{
    int fd = open(path, O_WRONLY | O_TRUNC | O_CLOEXEC);
    if (fd < 0)
        return fail(err, path, errno);
    int e = write_all(fd, br_text_data(t), br_text_len(t));
    if (close(fd) != 0 && e == 0)
        e = errno;
    return e != 0 ? fail(err, path, e) : BR_OK;
}

int br_text_stage(const br_text *t, const char *path, br_staged *s, br_error *err)
{
    struct stat st;
    s->text = t;
    s->tmp[0] = '\0';
    s->special = 0;
    if ((size_t)snprintf(s->path, sizeof s->path, "%s", path) >= sizeof s->path)
        return fail(err, path, ENAMETOOLONG);
    int exists = stat(path, &st) == 0;
    if (exists && S_ISDIR(st.st_mode))
        return fail(err, path, EISDIR); /* rename() would refuse it at the end */
    if (exists && !S_ISREG(st.st_mode)) {
        s->special = 1;
        return BR_OK;
    }
    int fd = open_temp(path, s->tmp, sizeof s->tmp);
    if (fd < 0) {
        int e = errno;
        s->tmp[0] = '\0';
        return fail(err, path, e);
    }
    int e = write_all(fd, br_text_data(t), br_text_len(t));
    if (e == 0 && fsync(fd) != 0)
        e = errno;
    if (close(fd) != 0 && e == 0)
        e = errno;
    if (e != 0) {
        br_staged_discard(s);
        return fail(err, path, e);
    }
    return BR_OK;
}

int br_staged_commit(br_staged *s, br_error *err)
{
    if (s->special)
        return save_special(s->text, s->path, err);
    int e = rename(s->tmp, s->path) != 0 ? errno : 0;
    if (e != 0) {
        br_staged_discard(s);
        return fail(err, s->path, e);
    }
    s->tmp[0] = '\0';
    return BR_OK;
}

void br_staged_discard(br_staged *s)
{
    if (s->tmp[0])
        unlink(s->tmp);
    s->tmp[0] = '\0';
}

int br_text_save(const br_text *t, const char *path, br_error *err)
{
    br_staged s;
    int rc = br_text_stage(t, path, &s, err);
    return rc == BR_OK ? br_staged_commit(&s, err) : rc;
}

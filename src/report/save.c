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

int br_text_save(const br_text *t, const char *path, br_error *err)
{
    struct stat st;
    if (stat(path, &st) == 0 && !S_ISREG(st.st_mode) && !S_ISDIR(st.st_mode))
        return save_special(t, path, err);
    char tmp[4096 + 64];
    int fd = open_temp(path, tmp, sizeof tmp);
    if (fd < 0)
        return fail(err, path, errno);
    int e = write_all(fd, br_text_data(t), br_text_len(t));
    if (e == 0 && fsync(fd) != 0)
        e = errno;
    if (close(fd) != 0 && e == 0)
        e = errno;
    if (e == 0 && rename(tmp, path) != 0)
        e = errno;
    if (e != 0) {
        unlink(tmp);
        return fail(err, path, e);
    }
    return BR_OK;
}

/* version.c - the library's version, set by the build from the project's. */
#include "bootrung/bootrung.h"

#ifndef BR_LIB_VERSION
#error "the build defines BR_LIB_VERSION (CMakeLists.txt)"
#endif

const char *br_version(void)
{
    return BR_LIB_VERSION;
}

#include "bootrung/bootrung.h"
int main(void) { return 0; }

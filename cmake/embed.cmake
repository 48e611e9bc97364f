# Turns file IN into a C source OUT defining `const char NAME[]` (NUL-terminated).
file(READ ${IN} hex HEX)
string(REGEX REPLACE "(..)" "0x\\1," body "${hex}")
file(WRITE ${OUT} "/* generated from ${IN}; do not edit */\n"
                  "const char ${NAME}[] = {${body}0x00};\n")

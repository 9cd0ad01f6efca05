# Turns a reference data file into a C array so the binary needs no data
# path at run time. Called as: cmake -DIN=file -DOUT=file.c -DNAME=symbol -P embed.cmake
file(READ "${IN}" hex HEX)
string(LENGTH "${hex}" hexlen)
math(EXPR len "${hexlen} / 2")
string(REGEX REPLACE "([0-9a-f][0-9a-f])" "0x\\1," body "${hex}")
string(REGEX REPLACE "(0x..,0x..,0x..,0x..,0x..,0x..,0x..,0x..,0x..,0x..,0x..,0x..,)" "\\1\n" body "${body}")
file(WRITE "${OUT}" "/* Generated from ${IN} by cmake/embed.cmake; do not edit. */\n#include <stddef.h>\nconst unsigned char ${NAME}[] = {\n${body}0x00};\nconst size_t ${NAME}_len = ${len};\n")

#!/bin/sh
# A manual page in mdoc from a command's own --help, so that the two say
# the same (issue 21). usage: man/help2mdoc.sh ACIDLOT [COMMAND] > page.1
set -u
acidlot=$1
cmd=${2:-}
if [ -n "$cmd" ]; then
	"$acidlot" "$cmd" --help
else
	"$acidlot" --help
fi | awk -v cmd="$cmd" '
function esc(s) {
	gsub(/\\/, "\\e", s)
	if (s ~ /^[.'"'"']/) s = "\\&" s
	return s
}
function flush_text() { if (text != "") { print esc(text); text = "" } }
function close_list() { flush_text(); if (inlist) { print ".El"; inlist = 0 } }
function open_list() { if (!inlist) { print ".Bl -tag -width Ds"; inlist = 1 } }
NR == 1 {
	sub(/^Usage: /, "")
	name = cmd == "" ? "acidlot" : "acidlot-" cmd
	print ".Dd December 5, 2026"
	print ".Dt " toupper(name) " 1"
	print ".Os"
	print ".Sh NAME"
	print ".Nm " name
	usage = $0
	while ((getline line) > 0 && line ~ /^  /) {
		sub(/^ +/, "", line)
		usage = usage "\n" line
	}
	para = line
	while ((getline line) > 0 && line != "")
		para = para " " line
	nd = para
	sub(/[.:].*$/, "", nd)
	print ".Nd " esc(tolower(substr(nd, 1, 1)) substr(nd, 2))
	print ".Sh SYNOPSIS"
	print ".Bd -literal"
	n = split(usage, u, "\n")
	for (i = 1; i <= n; i++) print esc(u[i])
	print ".Ed"
	print ".Sh DESCRIPTION"
	print esc(para)
	print ".Sh OPTIONS"
	state = "body"
	next
}
/^$/ { flush_text(); next }
/^Exit status:/ {
	close_list(); print ".Sh EXIT STATUS"; sub(/^Exit status: */, ""); text = $0; state = "exit"; next
}
/^[A-Z][^:]*:$/ || /^[A-Z].*\):$/ {
	close_list(); h = $0; sub(/:$/, "", h); print ".Ss " esc(h); next
}
/^  +-/ {
	flush_text(); open_list()
	line = $0; sub(/^ +/, "", line)
	# the option part ends at two blanks
	n = index(line, "  ")
	opt = n ? substr(line, 1, n - 1) : line
	rest = n ? substr(line, n) : ""
	sub(/^ +/, "", rest)
	print ".It Li " esc(opt)
	text = rest
	next
}
{
	line = $0
	if ((inlist && line ~ /^    +[^ -]/) ||
	    (!inlist && text != "" && line ~ /^    +/) || state == "exit") {
		sub(/^ +/, "", line); text = text == "" ? line : text " " line; next
	}
	flush_text()
	if (inlist) { print ".El"; inlist = 0 }
	sub(/^ +/, "", line)
	print ".Pp"
	text = line
}
END {
	close_list()
	print ".Sh SEE ALSO"
	if (cmd != "") print ".Xr acidlot 1"
	else print ".Xr acidlot-assay 1 , .Xr acidlot-standardize 1"
}'

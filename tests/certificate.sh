#!/bin/sh
# Certificates of analysis (issue 24): made from stored, approved
# results; refused for a lot without an approved run (naming the run to
# sign) unless --draft; a second one names the one it replaces; each
# read by tests/certificate_check.py (html.parser: ISO/IEC 17025
# 7.8.2.1 items, GUM 7.2.6 rounding against the store); printed to PDF
# by headless chromium, whose text (pdftotext) shows the id and "Page i
# of N" on every page, and DRAFT on every page of a draft; verify
# --store covers certificates.
# usage: certificate.sh ACIDLOT SAMPLES_DIR
set -u
acidlot=$1
samples=$2
here=$(cd "$(dirname "$0")" && pwd)
py=/usr/bin/python3
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
cd "$work" || exit 2
fail=0
"$acidlot" standardize "$samples/standardisation.csv" -o reg.csv >/dev/null 2>&1
"$acidlot" assay "$samples/titrations.csv" --spec "$samples/specs.csv" \
	--titrants reg.csv --store lab.db -o week.csv --analyst "I. Okafor" \
	>/dev/null 2>&1
# one lemon lot of 60 samples: a results table of several pages
{
	echo "product,lot,sample,mass_g,titrant_ml,titrant_mol_l,date"
	i=1
	while [ $i -le 60 ]; do
		printf 'LEM-SS,L-BIG,S%02d,10.0%02d,%s,0.1001,2026-11-%02d\n' $i $i \
			"$(awk "BEGIN { printf \"%.2f\", 78 + ($i % 7) * 0.3 }")" $((1 + i % 28))
		printf 'LEM-SS,L-BIG,S%02d,10.0%02d,%s,0.1001,2026-11-%02d\n' $i $((i + 3)) \
			"$(awk "BEGIN { printf \"%.2f\", 78.1 + ($i % 5) * 0.3 }")" $((1 + i % 28))
		i=$((i + 1))
	done
} >big.csv
"$acidlot" assay big.csv --spec "$samples/specs.csv" --store lab.db \
	-o big-report.csv --analyst "I. Okafor" >/dev/null 2>&1
week=$("$acidlot" runs --store lab.db --format csv --lot OJ-4471 2>/dev/null | sed -n 2p | cut -d, -f2)
big=$("$acidlot" runs --store lab.db --format csv --lot L-BIG 2>/dev/null | sed -n 2p | cut -d, -f2)
cert() { "$acidlot" certificate --store lab.db --lab "$samples/lab.conf" "$@"; }
echo "refused without an approved run:"
cert --lot L-BIG -o refused.html 2>err.txt
rc=$?
cat err.txt
if [ $rc -ne 2 ] || [ -e refused.html ] || ! grep -q "sign --run $big" err.txt; then
	echo "FAIL: exit $rc"
	fail=1
fi
"$acidlot" sign --store lab.db --run "$week" --name "M. Sato" \
	--role "QC manager" --meaning approved --reason "week released" >/dev/null
cert --lot OJ-4471 --customer "Blue Heron Juices Ltd" -o first.html 2>/dev/null || fail=1
first=$(grep -o 'COA-[0-9]*-[0-9]*' first.html | head -n 1)
"$py" "$here/certificate_check.py" first.html lab.db OJ-4471 \
	--customer "Blue Heron Juices Ltd" || fail=1
cert --lot OJ-4471 -o second.html 2>/dev/null || fail=1
"$py" "$here/certificate_check.py" second.html lab.db OJ-4471 \
	--replaces "$first" || fail=1
cert --lot L-BIG --draft -o draft.html 2>/dev/null || fail=1
"$py" "$here/certificate_check.py" draft.html lab.db L-BIG --draft || fail=1
"$acidlot" sign --store lab.db --run "$big" --name "M. Sato" \
	--role "QC manager" --meaning approved --reason "lot released" >/dev/null
cert --lot L-BIG -o big.html 2>/dev/null || fail=1
"$py" "$here/certificate_check.py" big.html lab.db L-BIG || fail=1
said=$("$acidlot" verify --store lab.db 2>&1)
echo "verify: $said"
case $said in *"chain intact") ;; *) fail=1 ;; esac
cp lab.db changed.db
sqlite3 changed.db "DROP TRIGGER certificates_no_update; UPDATE certificates SET lot = 'OJ-9999' WHERE certificate_id = '$first'"
said=$("$acidlot" verify --store changed.db 2>/dev/null)
echo "a certificate's lot changed: $said"
case $said in "certificate $first: its data no longer match its hash"*) ;; *) fail=1 ;; esac
# printed: chromium headless to PDF, the PDF's text page by page
if command -v chromium >/dev/null && command -v pdftotext >/dev/null; then
	for f in big draft; do
		HOME=$work timeout 120 chromium --headless --no-sandbox --disable-gpu \
			--no-pdf-header-footer --print-to-pdf="$work/$f.pdf" \
			"file://$work/$f.html" >/dev/null 2>&1
		pdftotext -layout "$f.pdf" "$f.txt" || { fail=1; continue; }
		pages=$(tr -cd '\f' <"$f.txt" | wc -c)
		id=$( [ $f = draft ] && echo DRAFT || grep -o 'COA-[0-9]*-[0-9]*' big.html | head -n 1)
		i=1
		numbered=0
		draft_marked=0
		while [ $i -le "$pages" ]; do
			page=$(awk -v n=$i 'BEGIN { RS = "\f" } NR == n' "$f.txt")
			printf '%s' "$page" | grep -q "Page $i of $pages" &&
				printf '%s' "$page" | grep -q "Certificate $id" &&
				numbered=$((numbered + 1))
			printf '%s' "$page" | grep -q "DRAFT: not approved" &&
				draft_marked=$((draft_marked + 1))
			i=$((i + 1))
		done
		echo "$f.pdf: $pages pages, $numbered with the id and 'Page i of $pages', $draft_marked marked DRAFT"
		[ "$pages" -ge 2 ] && [ $numbered -eq "$pages" ] || fail=1
		if [ $f = draft ]; then
			[ $draft_marked -eq "$pages" ] || fail=1
		else
			[ $draft_marked -eq 0 ] || fail=1
		fi
	done
else
	echo "SKIPPED the printed part: no chromium or pdftotext (Debian's chromium, poppler-utils)"
fi
exit $fail

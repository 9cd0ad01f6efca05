#!/bin/sh
# assay --xlsx (issue 24): the workbook read back by openpyxl against the
# run's CSV outputs and its store (tests/workbook_check.py says what is
# checked); a product named =1+1 and a lot 0012 stay text; the workbook
# is all or nothing with the run's other outputs.
# usage: workbook.sh ACIDLOT SAMPLES_DIR
# Exit 77 (skipped, and says so) without Debian's python3-openpyxl.
set -u
acidlot=$1
samples=$2
here=$(cd "$(dirname "$0")" && pwd)
py=/usr/bin/python3
if ! "$py" -c "import openpyxl" 2>/dev/null; then
	echo "SKIPPED: no python3-openpyxl (Debian): the workbook was not read back"
	exit 77
fi
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
cd "$work" || exit 2
"$acidlot" standardize "$samples/standardisation.csv" -o reg.csv >/dev/null 2>&1
{
	cat "$samples/titrations.csv"
	echo "=1+1,0012,S1,1,10.010,,12.40,NaOH-0.1-2611,0.05,,,8.1,2026-11-28,,"
	echo "=1+1,0012,S1,2,10.004,,12.37,NaOH-0.1-2611,0.05,,,8.1,2026-11-28,,"
	echo "=1+1,0012,S1,3,10.021,,twelve,NaOH-0.1-2611,0.05,,,8.1,2026-11-28,,"
} >t.csv
# the CSV files with every digit (--decimals full): each cell of the
# workbook equals its CSV value to 1e-12 relative
"$acidlot" assay t.csv --spec "$samples/specs.csv" --titrants reg.csv \
	-o r.csv -r reps.csv --rejects rej.csv --budget b.csv --store lab.db \
	--decimals full --xlsx book.xlsx >/dev/null 2>err.txt
rc=$?
[ "$rc" -le 1 ] || { echo "the assay failed (exit $rc):"; cat err.txt; exit 1; }
fail=0
"$py" "$here/workbook_check.py" book.xlsx --full --assay lab.db report=r.csv \
	replicates=reps.csv rejects=rej.csv budget=b.csv || fail=1
# and the usual CSV files (10 significant digits) round the same cells
"$acidlot" assay t.csv --spec "$samples/specs.csv" --titrants reg.csv \
	-o r10.csv -r reps10.csv --rejects rej10.csv --budget b10.csv \
	>/dev/null 2>&1
"$py" "$here/workbook_check.py" book.xlsx --other-run --assay lab.db report=r10.csv \
	replicates=reps10.csv rejects=rej10.csv budget=b10.csv >check10.txt ||
	{ cat check10.txt; fail=1; }
head -n 4 check10.txt
grep -q '"role": "workbook"' r.csv.record.json ||
	{ echo "the record does not list the workbook"; fail=1; }
# a real spreadsheet opens it: LibreOffice Calc, headless, writes every
# sheet back as CSV (in make check when Debian's libreoffice-calc-nogui
# is installed; make deps installs it)
if command -v soffice >/dev/null; then
	mkdir calc
	HOME=$work/calc soffice --headless --convert-to \
		'csv:Text - txt - csv (StarCalc):44,34,76,1,,0,false,true,false,false,false,-1' \
		--outdir calc book.xlsx >calc/log 2>&1
	"$py" "$here/workbook_calc.py" book.xlsx calc || { cat calc/log; fail=1; }
else
	echo "SKIPPED the LibreOffice part: no soffice (Debian's libreoffice-calc-nogui)"
fi
# trend --xlsx: the points and the summary (a second run stores more
# points of the orange juice)
"$acidlot" assay t.csv --spec "$samples/specs.csv" --titrants reg.csv \
	-o r3.csv --rejects rej3.csv --store lab.db --rerun "a second week" \
	>/dev/null 2>&1
"$acidlot" trend --store lab.db --product ORJ-NFC -o points.csv \
	--summary summary.csv --xlsx trend.xlsx 2>/dev/null
"$py" "$here/workbook_check.py" trend.xlsx points=points.csv \
	summary=summary.csv || fail=1
# all or nothing: a workbook that cannot be written leaves no output
"$acidlot" assay t.csv --titrants reg.csv -o r2.csv --rejects rej2.csv \
	--xlsx no/such/folder/book.xlsx >/dev/null 2>&1
rc=$?
if [ $rc -ne 2 ] || [ -e r2.csv ] || [ -e rej2.csv ]; then
	echo "a workbook in a missing folder: exit $rc, outputs: $(ls)"
	fail=1
else
	echo "a workbook in a missing folder: exit 2, no output written"
fi
"$acidlot" assay t.csv --titrants reg.csv --rejects rej4.csv --xlsx - \
	>/dev/null 2>&1
rc=$?
[ $rc -eq 2 ] && echo "--xlsx -: refused (exit 2)" || { echo "--xlsx -: exit $rc"; fail=1; }
exit $fail

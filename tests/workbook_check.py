"""The workbook of assay --xlsx (issue 24), read by openpyxl (Debian's
python3-openpyxl, a general-purpose reader, not ours) against the run's
own CSV outputs and its results store.

usage: workbook_check.py BOOK.xlsx [--full | --other-run] [--assay STORE.db]
       SHEET=CSV...
(--full: the CSV files were written with --decimals full, every number
with 17 significant digits: each cell then equals its CSV value to
1e-12 relative; without it the CSV's 10 significant digits round it;
--other-run: the CSV files come from a second run of the same data,
whose report ids differ)
(--assay: the workbook of assay --xlsx, with its run sheet, the store's
doubles and the status fills; without: trend --xlsx)

- every sheet has the CSV's rows and columns; its header is the CSV's
  column name, with the unit in brackets after it where there is one;
- a CSV's empty cell is an empty cell; a numeric column's cell is a
  number (never text) that the CSV's 10 significant digits round; a
  text cell is a text cell equal to the CSV's (unguarded: the CSV puts
  ' before a cell that would start a formula, the workbook needs not);
- the report's and replicates' numbers equal the store's doubles to
  1e-12 relative (the store keeps each double as it was computed);
- no cell of any sheet is a formula (no <f> element in the sheets'
  XML); the header row is frozen and filtered; the status column's
  fills tell fail, retest and pass apart.
"""
import csv
import math
import re
import sqlite3
import sys
import zipfile

import openpyxl

NUMERIC = set("""n mean sd rsd_pct ci95_low ci95_high spec_min spec_max
median grubbs_g dixon_q range critical_range horrat u U k brix
brix_corrected brix_acid_ratio water_pct line meq value
standard_uncertainty sensitivity contribution share_pct seq centre lcl
ucl mr mr_ucl ewma cusum_hi cusum_lo sigma_within sigma_overall cp cpk
pp ppk points_signalled""".split())
FORMULA_START = "=+-@\t\r"
# the CSV writes these with fixed decimals (the budget's shares: 3)
DECIMALS = {"share_pct": 3}


def unguard(text):
    if len(text) > 1 and text[0] == "'" and text[1] in FORMULA_START:
        return text[1:]
    return text


def header_name(cell):
    return re.sub(r" \(.*\)$", "", cell)


def agrees(v, text, name, full):
    """v, the workbook's number, against the CSV's text."""
    if full:
        c = float(text)
        return abs(v - c) <= 1e-12 * abs(c)
    if name in DECIMALS:
        return round(v, DECIMALS[name]) == float(text)
    return float(f"{v:.10g}") == float(text)


def check_sheet(ws, path, problems, full, other_run=False):
    with open(path, newline="", encoding="utf-8-sig") as f:
        rows = list(csv.reader(f))
    if ws.max_row != len(rows):
        problems.append(f"{ws.title}: {ws.max_row} rows, the CSV {len(rows)}")
        return 0
    names = [header_name(c.value) for c in ws[1]]
    if names != rows[0]:
        problems.append(f"{ws.title}: header {names} is not {rows[0]}")
        return 0
    numbers = 0
    for r, row in enumerate(rows[1:], start=2):
        for k, text in enumerate(row):
            cell = ws.cell(row=r, column=k + 1)
            where = f"{ws.title}!{cell.coordinate}"
            if text == "":
                if cell.value is not None:
                    problems.append(f"{where}: {cell.value!r}, the CSV empty")
            elif names[k] in NUMERIC:
                v = cell.value
                if cell.data_type != "n" or isinstance(v, bool) or \
                        not isinstance(v, (int, float)):
                    problems.append(f"{where}: not a number: {v!r}")
                elif not agrees(v, text, names[k], full):
                    problems.append(f"{where}: {v!r} is not the CSV's {text}")
                else:
                    numbers += 1
            elif other_run and names[k] == "report_id":
                continue
            elif cell.data_type != "s" or cell.value != unguard(text):
                problems.append(f"{where}: {cell.value!r} ({cell.data_type}), "
                                f"the CSV {text!r}")
    return numbers


def check_store(book, store, problems):
    db = sqlite3.connect(store)
    equal = 0
    for sheet, table, rename in (("report", "results", {"U": "expanded_u"}),
                                 ("replicates", "replicates", {})):
        ws = book[sheet]
        names = [header_name(c.value) for c in ws[1]]
        stored = db.execute(f"SELECT * FROM {table} ORDER BY pos").fetchall()
        columns = [d[0] for d in db.execute(f"SELECT * FROM {table}").description]
        for r, srow in enumerate(stored, start=2):
            for k, name in enumerate(names):
                if name not in NUMERIC or ws.cell(row=r, column=k + 1).value is None:
                    continue
                v = ws.cell(row=r, column=k + 1).value
                s = srow[columns.index(rename.get(name, name))]
                if s is None or abs(v - s) > 1e-12 * abs(s):
                    problems.append(f"{sheet} row {r} {name}: {v!r}, "
                                    f"the store {s!r}")
                else:
                    equal += 1
    return equal


def check_form(path, book, problems):
    with zipfile.ZipFile(path) as z:
        for name in z.namelist():
            if name.startswith("xl/worksheets/") and b"<f>" in z.read(name):
                problems.append(f"{name}: holds a formula")
    for ws in book.worksheets:
        if ws.freeze_panes != "A2":
            problems.append(f"{ws.title}: header not frozen")
        if ws.title != "run" and not ws.auto_filter.ref:
            problems.append(f"{ws.title}: no autofilter")
    report = book["report"]
    col = [c.value for c in report[1]].index("status") + 1
    fills = {}
    for r in range(2, report.max_row + 1):
        c = report.cell(row=r, column=col)
        fills.setdefault(c.value, set()).add(c.fill.fgColor.rgb)
    if len({min(fills[s]) for s in ("pass", "fail", "retest") if s in fills}) < 3:
        problems.append(f"status fills do not tell pass, fail, retest apart: {fills}")


def check_assay(path, book, store, problems):
    print(f"the store's doubles: {check_store(book, store, problems)} equal")
    check_form(path, book, problems)
    report = book["report"]
    for r in range(2, report.max_row + 1):
        product, lot = report.cell(row=r, column=1), report.cell(row=r, column=2)
        if product.value == "=1+1":
            print(f"product {product.value!r}: type {product.data_type}, "
                  f"lot {lot.value!r}: type {lot.data_type}")
            if product.data_type != "s" or lot.value != "0012":
                problems.append("=1+1 or 0012 not kept as text")
            break
    else:
        problems.append("no result of product =1+1")
    run = {book["run"].cell(row=r, column=1).value: book["run"].cell(row=r, column=2).value
           for r in range(2, book["run"].max_row + 1)}
    print("run sheet:", ", ".join(f"{k} {run.get(k)!r}" for k in
                                  ("command", "decision_rule.name", "inputs[0].role")))


def main():
    args = sys.argv[1:]
    path, store = args.pop(0), None
    full = args[0] == "--full"
    other_run = args[0] == "--other-run"
    if full or other_run:
        args.pop(0)
    if args[0] == "--assay":
        store = args[1]
        args = args[2:]
    book = openpyxl.load_workbook(path)
    problems = []
    want = [p.split("=", 1)[0] for p in args] + (["run"] if store else [])
    if book.sheetnames != want:
        problems.append(f"sheets {book.sheetnames}, expected {want}")
    for pair in args:
        sheet, csv_path = pair.split("=", 1)
        n = check_sheet(book[sheet], csv_path, problems, full, other_run)
        print(f"{sheet}: {book[sheet].max_row - 1} rows, {n} numbers "
              + ("equal to the CSV's to 1e-12" if full else "as the CSV rounds them"))
    if store:
        check_assay(path, book, store, problems)
    for p in problems[:20]:
        print("PROBLEM:", p)
    sys.exit(1 if problems else 0)


main()

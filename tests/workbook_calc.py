"""A real spreadsheet reads the workbook (issue 24): LibreOffice Calc,
headless, wrote each sheet of BOOK.xlsx to BOOK-SHEET.csv; every cell it
gives back equals the workbook's as openpyxl reads it: text the same,
numbers to 1e-13 relative (Calc writes 15 significant digits).

usage: workbook_calc.py BOOK.xlsx FOLDER
"""
import csv
import os
import sys

import openpyxl


def main():
    path, folder = sys.argv[1], sys.argv[2]
    book = openpyxl.load_workbook(path)
    stem = os.path.splitext(os.path.basename(path))[0]
    problems, cells = [], 0
    for ws in book.worksheets:
        calc = os.path.join(folder, f"{stem}-{ws.title}.csv")
        with open(calc, newline="", encoding="utf-8") as f:
            rows = list(csv.reader(f))
        if len(rows) != ws.max_row:
            problems.append(f"{ws.title}: Calc gives {len(rows)} rows, "
                            f"the workbook {ws.max_row}")
            continue
        for r, row in enumerate(rows, start=1):
            for k in range(ws.max_column):
                v = ws.cell(row=r, column=k + 1).value
                text = row[k] if k < len(row) else ""
                if v is None:
                    ok = text == ""
                elif isinstance(v, (int, float)) and not isinstance(v, bool):
                    ok = text != "" and abs(float(text) - v) <= 1e-13 * abs(v)
                else:
                    ok = text == v
                if not ok:
                    problems.append(f"{ws.title}!R{r}C{k + 1}: Calc {text!r}, "
                                    f"the workbook {v!r}")
                cells += 1
    print(f"LibreOffice Calc: {len(book.worksheets)} sheets, {cells} cells "
          "as the workbook holds them")
    for p in problems[:20]:
        print("PROBLEM:", p)
    sys.exit(1 if problems else 0)


main()

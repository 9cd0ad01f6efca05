"""A certificate of analysis (acidlot certificate, issue 24) read with
python3's html.parser against ISO/IEC 17025:2017 7.8.2.1 (the items a
report carries), 7.8.6 (decision rule, statement of conformity) and
7.8.8 (a replaced report named), and its numbers against the results
store: each result rounded to the decimal place of its expanded
uncertainty given to two significant digits (JCGM 100:2008, GUM 7.2.6),
done here by Python's decimal module, not by acidlot.

usage: certificate_check.py CERT.html STORE.db LOT [--customer TEXT]
       [--replaces ID] [--draft]
"""
import decimal
import sqlite3
import sys
from html.parser import HTMLParser


class Reader(HTMLParser):
    """The text under each class, the tags met, the title, the rows."""

    def __init__(self):
        super().__init__()
        self.text, self.tags, self.rows = {}, set(), []
        self.open = []  # (tag, classes)
        self.row = None

    def handle_starttag(self, tag, attrs):
        a = dict(attrs)
        self.tags.add(tag)
        for k, v in attrs:
            if k in ("src", "href") or (k == "style" and "url(" in (v or "")):
                self.tags.add("external:" + k)
        if tag == "tr":
            self.row = {}
        self.open.append((tag, (a.get("class") or "").split()))

    def handle_endtag(self, tag):
        while self.open:
            t, _ = self.open.pop()
            if t == tag:
                break
        if tag == "tr" and self.row is not None:
            if self.row:
                self.rows.append(self.row)
            self.row = None

    def handle_data(self, data):
        for _, classes in self.open:
            for c in classes:
                self.text[c] = self.text.get(c, "") + data
                if self.row is not None:
                    self.row[c] = self.row.get(c, "") + data
        if self.open and self.open[-1][0] in ("h1", "title", "style", "script"):
            self.text[self.open[-1][0]] = self.text.get(self.open[-1][0], "") + data


def gum_rounded(mean, U):
    """mean to the decimal place of U's second significant digit."""
    u = decimal.Decimal(repr(U))
    place = u.adjusted() - 1  # exponent of the second significant digit
    q = decimal.Decimal(1).scaleb(place)
    return str(decimal.Decimal(repr(mean)).quantize(q, decimal.ROUND_HALF_EVEN)), \
        str(u.quantize(q, decimal.ROUND_HALF_EVEN))


def main():
    args = sys.argv[1:]
    path, store, lot = args[:3]
    opts = {"--customer": None, "--replaces": None}
    draft = "--draft" in args
    for k in opts:
        if k in args:
            opts[k] = args[args.index(k) + 1]
    r = Reader()
    r.feed(open(path, encoding="utf-8").read())
    t = r.text
    problems = []

    def need(what, ok):
        print(f"{'ok ' if ok else 'NO '} {what}")
        if not ok:
            problems.append(what)

    need("a) title", t.get("h1", "").strip() == "Certificate of analysis")
    need("b) the lab's name and address", t.get("name") and t.get("lab", "").count("\n") >= 2)
    need("c) where the work was done", t.get("location", "") and t.get("location") in t.get("lab", ""))
    cid = t.get("certificate-id", "")
    need("d) a unique id" + (" (DRAFT)" if draft else f" ({cid})"),
         cid == "DRAFT" if draft else cid.startswith("COA-"))
    need("d) id and page numbering on every page (@page margin boxes)",
         "counter(page)" in t.get("style", "") and "counter(pages)" in t.get("style", ""))
    if opts["--customer"]:
        need("e) the customer", t.get("customer") == opts["--customer"])
    need("f) the method", len(t.get("method", "")) > 10)
    need("g) product, lot and samples", t.get("lot") == lot and t.get("product") and t.get("samples"))
    need("i) the titration dates", len(t.get("titration-dates", "")) >= 10)
    need("j) the date of issue", len(t.get("issue-date", "")) == 10)
    need("l) the results relate only to the items tested", "only to the items tested" in t.get("items-tested", ""))
    need("k) sampling: not the laboratory's", "did not take the samples" in t.get("items-tested", ""))
    need("7.8.6 the decision rule", "ILAC G8" in t.get("decision-rule", ""))
    need("m) coverage statement (U, k)", "coverage" in t.get("coverage", "") and "k" in t.get("coverage", ""))
    if draft:
        need("o) a draft says it is not approved", "DRAFT" in t.get("draft", ""))
    else:
        need("o) the approver's name, role and date", t.get("approver") and t.get("role")
             and len(t.get("approval-date", "")) == 10)
    if opts["--replaces"]:
        need("7.8.8 the certificate replaced", opts["--replaces"] in t.get("replaces", ""))
    need("self-contained: no script, no external resource",
         "script" not in r.tags and "link" not in r.tags and
         not any(x.startswith("external:") for x in r.tags) and "http" not in t.get("style", ""))
    db = sqlite3.connect(store)
    run = db.execute("SELECT run_id FROM results WHERE lot = ? AND run_id = "
                     "(SELECT run_id FROM runs WHERE run_id = ?)", (lot, t.get("run", "").strip())).fetchone()
    stored = db.execute("SELECT sample, mean, expanded_u, k, unit, status FROM results "
                        "WHERE lot = ? AND run_id = ? ORDER BY pos", (lot, run[0] if run else "")).fetchall()
    rows = [x for x in r.rows if "sample" in x]
    need(f"m) {len(stored)} results, each a row", len(rows) == len(stored) and len(stored) > 0)
    wrong = 0
    for row, (sample, mean, U, k, unit, status) in zip(rows, stored):
        value, unc = gum_rounded(mean, U)
        if row.get("result") != f"{value} {unit}" or f"± {unc} {unit}" not in row.get("uncertainty", "") \
                or f"k = {k:g}" not in row.get("uncertainty", "") or not row.get("conformity") \
                or row.get("sample") != sample or not row.get("limits"):
            wrong += 1
            print("   row", row, "store", (sample, mean, U, k, unit, status), "expected", value, unc)
    need("m) every result rounded to its U by GUM 7.2.6, with U, k, unit, limits, a statement", wrong == 0)
    sys.exit(1 if problems else 0)


main()

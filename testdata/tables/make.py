#!/usr/bin/python3
"""Write the printed-table corpus: Table 1 of a paper as copied from a PDF,
a word processor or a spreadsheet, in many forms, each with what the reader
(checks/load/table) must give, and malformed tables with their exact errors.

The tables are invented for this project (no real study's figures). Each
good variant prints one of the base tables below; cases.json holds the base
table's figures, which the Go test (TestRead_Corpus) holds the reader to, the
significance marks this script printed (counted here), and words the guesses
must contain. Bad variants list the exact problems the reader must report.
The smallest eigenvalue of the one matrix that is not positive definite is
computed here with numpy (numpy.linalg.eigvalsh), an outside reference.

Run from this folder with Debian's Python: /usr/bin/python3 make.py
"""
import json

import numpy as np

MINUS = "\u2212"  # the minus sign
EN = "\u2013"     # en dash
EM = "\u2014"     # em dash


def base(labels, names, means, sds, lower, n):
    k = len(labels)
    full = np.eye(k)
    for i in range(k):
        for j in range(i):
            full[i, j] = full[j, i] = lower[i][j]
    assert np.linalg.eigvalsh(full)[0] > 1e-10, labels
    return dict(labels=labels, names=names, means=means, sds=sds, lower=lower, n=n)


NOISE = base(["Noise exposure (dB)", "Sleep duration (h)", "Recall score"],
             ["noise_exposure_db", "sleep_duration_h", "recall_score"],
             [59.3, 7.4, 52.0], [6.1, 0.9, 11.0],
             [[1], [-0.22, 1], [-0.14, 0.41, 1]], 812)
GARDEN = base(["Garden hours per week", "Neighbourhood trust", "Loneliness", "Wellbeing", "Age (years)"],
              ["garden_hours_per_week", "neighbourhood_trust", "loneliness", "wellbeing", "age_years"],
              [3.2, 3.9, 2.1, 5.4, 47.8], [2.4, 0.7, 0.6, 1.1, 14.2],
              [[1], [0.31, 1], [-0.18, -0.35, 1], [0.24, 0.38, -0.52, 1], [0.27, 0.12, -0.09, 0.06, 1]], 1204)
COMMUTE = base(["Commute stress (centred)", "Job autonomy", "Exhaustion", "Turnover intention"],
               ["commute_stress_centred", "job_autonomy", "exhaustion", "turnover_intention"],
               [-0.12, 3.6, 2.8, 2.2], [1.05, 0.8, 0.9, 1.2],
               [[1], [-0.21, 1], [0.44, -0.30, 1], [0.29, -0.33, 0.47, 1]], 356)
LANG = base(["Lärmbelastung", "Schlafqualität", "Gedächtnis 1", "Gedächtnis 2"],
            ["larmbelastung", "schlafqualitat", "gedachtnis_1", "gedachtnis_2"],
            [61.2, 3.1, 14.5, 13.9], [7.3, 0.8, 3.2, 3.4],
            [[1], [-0.27, 1], [-0.16, 0.33, 1], [-0.12, 0.29, 0.61, 1]], 230)
CLUB = base(["Club member (1 = yes)", "Weekly reading (h)", "Vocabulary score"],
            ["club_member_1_yes", "weekly_reading_h", "vocabulary_score"],
            [0.41, 2.9, 48.2], None,
            [[1], [0.23, 1], [0.19, 0.36, 1]], 205)


def r_text(x, lead_dot=True, minus=MINUS, dec=".", digits=2):
    """A correlation as a paper prints it."""
    s = f"{abs(x):.{digits}f}"
    if lead_dot and s.startswith("0."):
        s = s[1:]
    s = s.replace(".", dec)
    return (minus if x < 0 else "") + s


def stars(x):
    """Invented significance marks by size, as a paper with a large n might."""
    a = abs(x)
    return "***" if a >= 0.30 else "**" if a >= 0.20 else "*" if a >= 0.10 else ""


def num(x, digits=2, dec=".", minus=MINUS):
    s = f"{abs(x):.{digits}f}".replace(".", dec)
    return (minus if x < 0 else "") + s


class Printer:
    """Prints a base table's cells and counts the marks it printed."""

    def __init__(self, b, marks=stars, **fmt):
        self.b, self.marks, self.fmt, self.count = b, marks, fmt, {}

    def r(self, i, j):
        x = self.b["lower"][max(i, j)][min(i, j)]
        m = self.marks(x) if self.marks else ""
        if m:
            self.count[m] = self.count.get(m, 0) + 1
        return r_text(x, **self.fmt) + m

    def lower_row(self, i, diag=EM):
        cells = [self.r(i, j) for j in range(i)]
        return cells + ([diag] if diag is not None else [])

    def upper_row(self, i, diag=EM):
        k = len(self.b["labels"])
        return ([diag] if diag is not None else []) + [self.r(i, j) for j in range(i + 1, k)]

    def full_row(self, i, diag="1.00"):
        k = len(self.b["labels"])
        return [diag if j == i else self.r(i, j) for j in range(k)]


def pad(rows, widths=None, gap=3):
    """Sets cells apart by runs of spaces, as text copied from a PDF."""
    w = widths or [max(len(r[c]) for r in rows if c < len(r)) for c in range(max(map(len, rows)))]
    return "\n".join((" " * gap).join(c.ljust(w[i]) for i, c in enumerate(r)).rstrip() for r in rows)


cases = []


def case(name, text, b, marks=None, guesses=(), means=True, sds=True, n=True, labels=None, names=None,
         raw=None, reliabilities=None):
    path = name + ".txt"
    with open(path, "wb") as f:
        f.write(raw if raw is not None else text.encode())
    c = {"file": path, "names": names or b["names"], "labels": labels or b["labels"],
         "correlations": b["lower"], "means": b["means"] if means else None,
         "sds": b["sds"] if sds else None, "n": b["n"] if n else 0,
         "marks": marks or {}, "guesses": list(guesses), "reliabilities": reliabilities}
    cases.append(c)


def bad(name, text, problems, raw=None):
    path = name + ".txt"
    with open(path, "wb") as f:
        f.write(raw if raw is not None else text.encode())
    cases.append({"file": path, "problems": problems})


def labelled(b, i, style="{n}. {label}"):
    return style.format(n=i + 1, label=b["labels"][i])


# --- Good variants -----------------------------------------------------------

# 1. PDF, runs of spaces: a title over two lines, numbered rows and columns,
# em-dash diagonal, Unicode minus, leading dots, stars, a note with N.
p = Printer(NOISE)
rows = [["Variable", "M", "SD", "1", "2", "3"]]
rows += [[labelled(NOISE, i), num(NOISE["means"][i]), num(NOISE["sds"][i])] + p.lower_row(i) for i in range(3)]
case("noise-pdf-wide", "Table 1\nMeans, Standard Deviations and Correlations of the Study Variables\n" + pad(rows) +
     "\nNote. N = 812. *p < .05. **p < .01. ***p < .001.\n", NOISE, p.count,
     ["runs of two or more spaces", "line 1 skipped as the table's title", "lower triangle", "n = 812, from line 7",
      'M read from the column headed "M"'])

# 2. PDF whose spaces collapsed to one.
p = Printer(NOISE)
lines = ["Variable M SD 1 2 3"]
lines += [" ".join([labelled(NOISE, i), num(NOISE["means"][i]), num(NOISE["sds"][i])] + p.lower_row(i))
          for i in range(3)]
case("noise-pdf-single", "\n".join(lines) + "\nN = 812.\n", NOISE, p.count, ["single spaces", "n = 812, from line 5"])

# 3. Word processor: tabs, empty cells above a diagonal of 1, "1 Noise" without a dot, no N.
p = Printer(NOISE, marks=None, lead_dot=False, minus="-")
lines = ["\tM\tSD\t1\t2\t3"]
for i in range(3):
    cells = [labelled(NOISE, i, "{n} {label}"), num(NOISE["means"][i], 1), num(NOISE["sds"][i], 1)]
    cells += p.lower_row(i, diag="1") + [""] * (2 - i)
    lines.append("\t".join(cells))
case("noise-tabs", "\n".join(lines) + "\n", NOISE, guesses=["tabs", 'SD read from the column headed "SD" (cell 3'],
     n=False)

# 4. Spreadsheet in a German locale: semicolons, decimal commas, Unicode minus, accents.
p = Printer(LANG, marks=lambda x: "**" if abs(x) >= 0.2 else "*", lead_dot=False, dec=",")
lines = ["Tabelle 1;;;;;;", "Variable;M;SD;1;2;3;4"]
for i in range(4):
    cells = [labelled(LANG, i), num(LANG["means"][i], 1, ","), num(LANG["sds"][i], 1, ",")]
    lines.append(";".join(cells + p.lower_row(i) + [""] * (3 - i)))
case("lang-semicolons-decimal-commas", "\n".join(lines) + "\nAnmerkung. N = 230. *p < .05. **p < .01.\n", LANG,
     p.count, ["semicolons", "decimal commas"])

# 5. The bare form init --summary has always read: a header of names, the lower triangle.
case("noise-csv-bare", "noise,sleep,recall\n1,,\n-0.22,1,\n-0.14,0.41,1\n", NOISE, means=False, sds=False, n=False,
     names=["noise", "sleep", "recall"], labels=["noise", "sleep", "recall"], guesses=["commas", "lower triangle"])

# 6. A full matrix in CSV with labelled rows and a header of short names.
p = Printer(GARDEN, marks=None, lead_dot=False, minus="-")
lines = [",garden,trust,lonely,wellbeing,age"]
lines += [",".join([GARDEN["labels"][i]] + p.full_row(i, diag="1")) for i in range(5)]
case("garden-csv-full", "\n".join(lines) + "\n", GARDEN, means=False, sds=False, n=False,
     guesses=["full matrix is read"])

# 7. Upper triangle, PDF spacing, numbered columns, N with a thousands comma in the title.
p = Printer(GARDEN, marks=lambda x: "**" if abs(x) >= 0.08 else "*")
rows = [["", "1", "2", "3", "4", "5"]]
rows += [[labelled(GARDEN, i)] + [""] * i + p.upper_row(i) for i in range(5)]
case("garden-upper-wide", "Table 3. Intercorrelations of the study variables (N = 1,204)\n" + pad(rows) +
     "\nNote. *p < .05. **p < .01.\n", GARDEN, p.count, ["upper triangle", "n = 1204, from line 1"],
     means=False, sds=False)

# 8. "M (SD)" in one cell, tabs, rows without trailing empty cells.
p = Printer(GARDEN)
lines = ["Variable\tM (SD)\t1\t2\t3\t4\t5"]
lines += ["\t".join([labelled(GARDEN, i), f"{GARDEN['means'][i]:.1f} ({GARDEN['sds'][i]:.1f})"] + p.lower_row(i))
          for i in range(5)]
case("garden-msd-tabs", "\n".join(lines) + "\nNote. N = 1204.\n", GARDEN, p.count,
     ['M (SD) read from the column headed "M (SD)"'])

# 9. No diagonal printed, columns numbered 1 to k-1 (the last would be empty).
p = Printer(GARDEN)
rows = [["Variable", "M", "SD", "1", "2", "3", "4"]]
rows += [[labelled(GARDEN, i), num(GARDEN["means"][i]), num(GARDEN["sds"][i])] + p.lower_row(i, diag=None)
         for i in range(5)]
case("garden-no-diagonal-wide", pad(rows) + "\nN = 1204\n", GARDEN, p.count, ["diagonal is not printed"])

# 10. SD before M in the header, CSV, leading zeros.
p = Printer(COMMUTE, marks=None, lead_dot=False, minus="-")
lines = ["Variable,SD,M,1,2,3,4"]
for i in range(4):
    lines.append(",".join([labelled(COMMUTE, i), num(COMMUTE["sds"][i], 2, ".", "-"),
                           num(COMMUTE["means"][i], 2, ".", "-")] + p.lower_row(i, diag="1") + [""] * (3 - i)))
case("commute-sd-first-csv", "\n".join(lines) + "\nn = 356\n", COMMUTE,
     guesses=['SD read from the column headed "SD" (cell 2', 'M read from the column headed "M" (cell 3'])

# 11. Daggers, double daggers and letters as marks, tabs.
marks = {0.31: "†", -0.18: "‡", 0.24: "a", 0.27: "b", -0.35: "***", 0.38: "**", -0.52: "***", 0.12: "*",
         -0.09: "", 0.06: "a"}
p = Printer(GARDEN, marks=lambda x: marks[x])
lines = ["Variable\tM\tSD\t1\t2\t3\t4\t5"]
lines += ["\t".join([labelled(GARDEN, i), num(GARDEN["means"][i], 1), num(GARDEN["sds"][i], 1)] + p.lower_row(i))
          for i in range(5)]
case("garden-daggers-tabs", "\n".join(lines) + "\n† p < .10. ‡ Reverse-scored. a, b Differ from zero. N = 1204.\n",
     GARDEN, p.count, ["read as a note below the table"])

# 12. Footnotes below, one of them starting with a superscript letter; N in the second.
p = Printer(COMMUTE)
rows = [["Measure", "M", "SD", "1", "2", "3", "4"]]
rows += [[labelled(COMMUTE, i), num(COMMUTE["means"][i]), num(COMMUTE["sds"][i])] + p.lower_row(i)
         for i in range(4)]
case("commute-footnotes", "Table 2\nDescriptive statistics and correlations\n" + pad(rows) +
     "\na Centred at the sample mean.\nNote. N = 356 employees; correlations above .11 are significant at p < .05."
     "\n*p < .05. **p < .01. ***p < .001.\n", COMMUTE, p.count,
     ["line 8 read as a note", "line 9 read as a note", "line 10 read as a note", "n = 356, from line 9"])

# 13. En dashes for minus signs and for the diagonal.
p = Printer(COMMUTE, marks=None, minus=EN)
rows = [["", "M", "SD", "1", "2", "3", "4"]]
rows += [[labelled(COMMUTE, i), num(COMMUTE["means"][i], 2, ".", EN), num(COMMUTE["sds"][i])] +
         p.lower_row(i, diag=EN) for i in range(4)]
case("commute-en-dash", pad(rows) + "\nN = 356\n", COMMUTE, guesses=["an en dash before a number is read as a minus"])

# 14. Full matrix with 1.00 on the diagonal, semicolons, decimal points.
p = Printer(GARDEN, marks=None, lead_dot=False)
lines = ["Variable;M;SD;1;2;3;4;5"]
lines += [";".join([labelled(GARDEN, i), num(GARDEN["means"][i]), num(GARDEN["sds"][i])] + p.full_row(i))
          for i in range(5)]
case("garden-full-semicolons", "\n".join(lines) + "\nN = 1204\n", GARDEN, guesses=["semicolons", "full matrix"])

# 15. M and SD after the matrix, PDF spacing, a header naming them.
p = Printer(COMMUTE)
rows = [["", "1", "2", "3", "4", "M", "SD"]]
rows += [[labelled(COMMUTE, i)] + p.lower_row(i) + [""] * (3 - i) + [num(COMMUTE["means"][i]), num(COMMUTE["sds"][i])]
         for i in range(4)]
case("commute-descriptives-after", pad(rows) + "\nNote. N = 356.\n", COMMUTE, p.count)

# 16. No header: two columns before the matrix, SD first (the means hold a negative value).
p = Printer(COMMUTE, marks=None, lead_dot=False, minus="-")
lines = [",".join([COMMUTE["labels"][i], num(COMMUTE["sds"][i], 2, ".", "-"), num(COMMUTE["means"][i], 2, ".", "-")]
                  + p.lower_row(i, diag="1")) for i in range(4)]
case("commute-no-header-sd-first", "\n".join(lines) + "\n", COMMUTE, n=False, guesses=["read as SD, then M"])

# 17. M and SD as rows below the matrix.
p = Printer(NOISE, marks=None)
rows = [["Variable", "1", "2", "3"]]
rows += [[labelled(NOISE, i)] + p.lower_row(i) for i in range(3)]
rows += [["M"] + [num(x, 1) for x in NOISE["means"]], ["SD"] + [num(x, 1) for x in NOISE["sds"]]]
case("noise-descriptive-rows", pad(rows) + "\nN = 812\n", NOISE)

# 18. Row numbers in cells of their own, labels quoted because they hold commas.
b = dict(COMMUTE, labels=["Commute stress, centred", "Job autonomy", "Exhaustion", "Turnover intention"])
p = Printer(b, marks=None, lead_dot=False, minus="-")
lines = [",Variable,M,SD,1,2,3,4"]
for i in range(4):
    lab = b["labels"][i]
    lab = f'"{lab}"' if "," in lab else lab
    lines.append(",".join([str(i + 1), lab, num(b["means"][i], 2, ".", "-"), num(b["sds"][i])] +
                          p.lower_row(i, diag="—") + [""] * (3 - i)))
case("commute-row-number-cells", "\n".join(lines) + "\nN = 356\n", b)

# 19. "M ± SD" in one cell, PDF spacing, leading zeros and hyphens for minus.
p = Printer(GARDEN, marks=None, lead_dot=False, minus="-")
rows = [["Variable", "M ± SD", "1", "2", "3", "4", "5"]]
rows += [[labelled(GARDEN, i), f"{GARDEN['means'][i]:.1f} ± {GARDEN['sds'][i]:.1f}"] + p.lower_row(i, diag="-")
         for i in range(5)]
case("garden-plus-minus-wide", pad(rows) + "\nN = 1204\n", GARDEN)

# 20. Headings between the rows, tabs.
p = Printer(GARDEN)
lines = ["Variable\tM\tSD\t1\t2\t3\t4\t5", "Predictors"]
for i in range(5):
    if i == 2:
        lines.append("Outcomes")
    lines.append("\t".join([labelled(GARDEN, i), num(GARDEN["means"][i], 1), num(GARDEN["sds"][i], 1)] +
                           p.lower_row(i)))
case("garden-headings-tabs", "\n".join(lines) + "\nN = 1204\n", GARDEN, p.count,
     ["line 2 skipped as a heading above the rows", "line 5 skipped as a heading or note between the rows"])

# 21. A byte-order mark and Windows line ends.
p = Printer(NOISE)
lines = ["\tM\tSD\t1\t2\t3"]
lines += ["\t".join([labelled(NOISE, i), num(NOISE["means"][i], 1), num(NOISE["sds"][i], 1)] + p.lower_row(i))
          for i in range(3)]
case("noise-bom-crlf", "", NOISE, p.count,
     raw=("\ufeff" + "\r\n".join(lines) + "\r\nN = 812\r\n").encode())

# 22. A binary variable printed without an SD: the SDs are left out.
p = Printer(CLUB)
rows = [["Variable", "M", "SD", "1", "2", "3"]]
rows += [[labelled(CLUB, i), num(CLUB["means"][i]), "—" if i == 0 else num([0, 1.7, 9.6][i])] + p.lower_row(i)
         for i in range(3)]
case("club-no-sd-for-binary", pad(rows) + "\nNote. N = 205.\n", CLUB, p.count, ["no SD printed for club_member_1_yes"],
     sds=False)

# 23. Single spaces with decimal commas and Unicode minus, numbered without dots.
p = Printer(LANG, marks=None, lead_dot=False, dec=",")
lines = ["M SD 1 2 3 4"]
lines += [" ".join([labelled(LANG, i, "{n} {label}"), num(LANG["means"][i], 1, ","), num(LANG["sds"][i], 1, ",")]
                   + p.lower_row(i)) for i in range(4)]
case("lang-single-decimal-commas", "\n".join(lines) + "\nn = 230\n", LANG, guesses=["single spaces", "decimal commas"])

# 24. An upper triangle in CSV without labels, diagonal of ones.
case("noise-csv-upper", "noise,sleep,recall\n1,-0.22,-0.14\n,1,0.41\n,,1\n", NOISE, means=False, sds=False, n=False,
     names=["noise", "sleep", "recall"], labels=["noise", "sleep", "recall"], guesses=["upper triangle"])

# 25. Rows and columns numbered in parentheses, full matrix, PDF spacing.
p = Printer(COMMUTE)
rows = [["", "M", "SD", "(1)", "(2)", "(3)", "(4)"]]
rows += [[labelled(COMMUTE, i, "({n}) {label}"), num(COMMUTE["means"][i]), num(COMMUTE["sds"][i])] +
         p.full_row(i, diag="—") for i in range(4)]
case("commute-parenthesised-numbers", pad(rows) + "\n(N = 356)\n", COMMUTE, p.count, ["full matrix"])

# 26. Two labels that give the same name, and a row number that is part of a label.
b = dict(NOISE, labels=["Recall, week 1", "Recall (week 1)", "2nd recall"],
         names=["recall_week_1", "recall_week_1_2", "v_2nd_recall"])
p = Printer(b, marks=None)
lines = ["\tM\tSD\t1\t2\t3"]
lines += ["\t".join([b["labels"][i], num(b["means"][i], 1), num(b["sds"][i], 1)] + p.lower_row(i)) for i in range(3)]
case("noise-same-names", "\n".join(lines) + "\nN = 812\n", b,
     guesses=["gives the name recall_week_1, as the label of line 2 does: it is named recall_week_1_2"])

# 27. No header at all: the label, M, SD and the matrix, PDF spacing.
p = Printer(NOISE)
rows = [[labelled(NOISE, i), num(NOISE["means"][i]), num(NOISE["sds"][i])] + p.lower_row(i) for i in range(3)]
case("noise-no-header-wide", pad(rows) + "\nN = 812\n", NOISE, p.count, ["read as M, then SD: no header names them"])

# 28. A bare matrix without names or labels: the variables are named var_1, var_2, ...
case("noise-csv-no-names", "1,,\n-0.22,1,\n-0.14,0.41,1\n", NOISE, means=False, sds=False, n=False,
     names=["var_1", "var_2", "var_3"], labels=["", "", ""],
     guesses=["rows without a label to name their variable: 3"])

# 29. Reliabilities in parentheses on the diagonal (none for age), PDF spacing.
alphas = [0.81, 0.77, 0.79, 0.9, None]
p = Printer(GARDEN)
rows = [["Variable", "M", "SD", "1", "2", "3", "4", "5"]]
rows += [[labelled(GARDEN, i), num(GARDEN["means"][i]), num(GARDEN["sds"][i])] +
         p.lower_row(i, diag="—" if alphas[i] is None else f"({alphas[i]:.2f})".replace("0.", "."))
         for i in range(5)]
case("garden-reliabilities-wide", pad(rows) + "\nNote. N = 1204. Reliabilities (α) on the diagonal.\n", GARDEN,
     p.count, ["read as the variables' reliabilities (first at line 2, cell 4"],
     reliabilities=[a or 0 for a in alphas])

# --- Malformed tables, with their exact problems -----------------------------

HEAD = "Variable  M  SD  1  2  3\n"
bad("bad-letter", HEAD + "1. Noise  59.3  6.1  —\n2. Sleep  7.4  0.9  −.22  —\n3. Recall  52.0  11.0  x  .41  —\n",
    ['line 4, cell 4 ("x"): expected the correlation of recall and noise: a number such as .45 or −0.22'])
bad("bad-short-row", HEAD + "1. Noise  59.3  6.1  —\n2. Sleep  7.4  0.9  —\n3. Recall  52.0  11.0  −.14  .41  —\n",
    ["line 3: has 3 values; expected 4: M, SD, then row 2 of a lower triangle with its diagonal (2 cells)"])
bad("bad-not-symmetric", "a,b,c\n1,0.2,0.1\n0.25,1,0.3\n0.1,0.3,1\n",
    ['line 3, cell 1 ("0.25"): the correlation of b and a is 0.25, but line 2, cell 2 is 0.2: '
     'the matrix is not symmetric'])
bad("bad-range", HEAD + "1. Noise  59.3  6.1  —\n2. Sleep  7.4  0.9  1.3  —\n3. Recall  52.0  11.0  −.14  .41  —\n",
    ['line 3, cell 4 ("1.3"): the correlation of sleep and noise is 1.3; a correlation lies in [-1, 1]'])
bad("bad-diagonal", "\tM\tSD\t1\t2\t3\n1. Noise\t59.3\t6.1\t1.00\n2. Sleep\t7.4\t0.9\t-.22\t0.98\n"
    "3. Recall\t52.0\t11.0\t-.14\t.41\t1.00\n",
    ['line 3, cell 5 ("0.98"): the diagonal entry of sleep is 0.98; a correlation matrix has 1 on its diagonal'])
# Not positive definite: numpy gives the smallest eigenvalue and its
# eigenvector; the problem names the variables whose entries in it are at
# least half the largest in size, largest first.
pd = np.array([[1, 0.8, 0.6, 0.05], [0.8, 1, -0.5, 0.1], [0.6, -0.5, 1, 0.0], [0.05, 0.1, 0.0, 1]])
vals, vecs = np.linalg.eigh(pd)
v = np.abs(vecs[:, 0])
order = [i for i in np.argsort(-v, kind="stable") if v[i] >= v.max() / 2]
pd_names = ["noise", "sleep", "recall", "mood"]
bad("bad-not-positive-definite", "1. Noise  —\n2. Sleep  .80  —\n3. Recall  .60  −.50  —\n4. Mood  .05  .10  .00  —\n",
    [f"table: the correlation matrix is not positive definite: its smallest eigenvalue is {vals[0]:.6g}; "
     "the variables weighing most on its eigenvector: " + ", ".join(pd_names[i] for i in order)])
bad("bad-misnumbered", HEAD + "1. Noise  59.3  6.1  —\n2. Sleep  7.4  0.9  −.22  —\n"
    "4. Recall  52.0  11.0  −.14  .41  —\n",
    ['line 4, cell 1 ("4. Recall"): the row is numbered 4; expected 3 (the rows are numbered in order)'])
bad("bad-sd-zero", "Variable,M,SD,1,2\nNoise,59.3,0,1,\nSleep,7.4,0.9,-0.22,1\n",
    ['line 2, cell 3 ("0"): an SD is greater than 0'])
bad("bad-several", HEAD + "1. Noise  n/a  6.1  —\n2. Sleep  7.4  0.9  −.22  —\n5. Recall  52.0  11.0  .4O  .41  —\n"
    "N = 2\n",
    ['line 2, cell 2 ("n/a"): expected a mean: a number such as 59.3',
     'line 4, cell 1 ("5. Recall"): the row is numbered 5; expected 3 (the rows are numbered in order)',
     'line 4, cell 4 (".4O"): expected the correlation of recall and noise: a number such as .45 or −0.22',
     "line 5: n = 2; a summary screen needs at least 3"])
bad("bad-prose", "We measured noise, sleep and recall in 812 adults.\nSee the appendix for details.\n",
    ["table: no rows of numbers found: expected one row per variable, its label first, then its M, SD and "
     "correlations"])
bad("bad-one-row", "Variable  M  SD  1\n1. Noise  59.3  6.1  —\n",
    ["table: found 1 row of numbers; a correlation table has at least two variables"])
bad("bad-past-header", "Variable,M,SD,1,2\nNoise,59.3,6.1,1,\nSleep,7.4,0.9,-0.22,1,0.5\n",
    ['line 3, cell 6 ("0.5"): lies past the header\'s last column'])
bad("bad-word-in-empty-half", "\t1\t2\t3\nNoise\t—\t−.22\t−.14\nSleep\tsee text\t—\t.41\nRecall\t\t\t—\n",
    ['line 3, cell 2 ("see text"): expected nothing here: the lower half of the matrix is empty'])
bad("bad-named-columns", "a,b,c,d\n1,,\n0.2,1,\n0.1,0.3,1\n",
    ["line 1: names 4 columns, but 3 rows follow; expected a name for each row's variable"])
bad("bad-utf8", "", ["line 3: is not valid UTF-8 text"],
    raw=b"a,b\n1,\n0.2\xff,1\n")
bad("bad-diagonal-word", "\tM\tSD\t1\t2\nNoise\t59.3\t6.1\tn/a\nSleep\t7.4\t0.9\t-.22\t1\n",
    ['line 2, cell 4 ("n/a"): expected the diagonal of noise: —, 1, nothing, or a reliability in parentheses '
     'such as (.84)'])

bad("bad-typo-last-row", "a,b,c\n1\n0.2,1\n0.1,x,y\n",
    ['line 4, cell 2 ("x"): expected the correlation of c and b: a number such as .45 or −0.22',
     'line 4, cell 3 ("y"): expected the diagonal of c: —, 1, nothing, or a reliability in parentheses such as (.84)'])
bad("bad-means-row", "Variable  1  2  3\n1. Noise  —\n2. Sleep  −.22  —\n3. Recall  −.14  .41  —\nM  59.3  7.4\n",
    ["line 5: a row of means has 2 values; expected one for each of the 3 variables"])
bad("bad-only-descriptive-rows", "M  59.3  7.4\nSD  6.1  0.9\n",
    ["table: found no row of numbers; a correlation table has at least two variables"])

bad("bad-reliability", "Variable  1  2\n1. Noise  (1.20)\n2. Sleep  −.22  (.77)\n",
    ['line 2, cell 2 ("(1.20)"): the reliability of noise is 1.2; a reliability lies in (0, 1]'])

with open("cases.json", "w") as f:
    json.dump(cases, f, indent=1, ensure_ascii=False)
    f.write("\n")

#!/usr/bin/env python3
"""Write the bad-input corpus: each case is a valid package with one fault.

cases.json lists, for each file, the place its error must name (a JSON
pointer or a CSV line and column; "also" lists more text that must appear
in the same list of problems, for cases with several faults that must all
be reported at once) and whether the JSON Schema alone rejects it. Run
from this folder: python3 make.py
"""
import copy, json

base = {
    "format_version": 1,
    "title": "Bad-input corpus base (invented)",
    "design": "observational",
    "variables": [
        {"name": "a", "scale": "binary", "exogenous": True},
        {"name": "b", "scale": "continuous", "reliability": 0.8},
        {"name": "c", "scale": "continuous"},
        {"name": "d", "scale": "continuous"},
    ],
    "graph": {"edges": [{"from": "a", "to": "b"}, {"from": "b", "to": "c"}, {"from": "c", "to": "d"}]},
    "claims": [
        {"id": "C1", "text": "b raises c", "kind": "direct_effect", "from": "b", "to": "c",
         "estimate": 0.3, "std_error": 0.05, "ci": [0.2, 0.4], "p_value": 0.001},
        {"id": "C2", "text": "c goes with d", "kind": "association", "from": "c", "to": "d"},
    ],
    "data": {"kind": "summary", "n": 200, "variables": ["a", "b", "c", "d"],
             "correlations": [[1], [0.2, 1], [0.1, 0.4, 1], [0.05, 0.2, 0.5, 1]]},
}
rows = "a,b,c,d\n1,2.5,3.1,0.2\n0,1.5,2.2,\n1,NA,1.0,4.4\n"

cases = []

def case(name, place, schema, mutate=None, raw=None, also=None):
    doc = copy.deepcopy(base)
    if mutate:
        mutate(doc)
    text = raw if raw is not None else json.dumps(doc, indent=1, ensure_ascii=False)
    with open(name + ".json", "wb") as f:
        f.write(text if isinstance(text, bytes) else text.encode())
    c = {"file": name + ".json", "place": place, "schema_rejects": schema}
    if also:
        c["also"] = also
    cases.append(c)

def both(*ms):
    def m(doc):
        for f in ms:
            f(doc)
    return m

def as_rows(doc, csv):
    doc["data"] = {"kind": "rows", "csv": csv}

def setp(path, value):
    def m(doc):
        node = doc
        for k in path[:-1]:
            node = node[k]
        node[path[-1]] = value
    return m

def full_matrix(doc, m):
    doc["data"]["correlations"] = m

case("not-json", "not valid JSON", None, raw='{"format_version": 1,')
case("unknown-field", "/titel", True, setp(["titel"], "x"))
case("unknown-nested-field", "/claims/0/estimat", True, setp(["claims", 0, "estimat"], 0.3))
case("wrong-type", "/variables/1/reliability", True, setp(["variables", 1, "reliability"], "high"))
case("null-title", "/title", True, setp(["title"], None))
case("format-version", "/format_version", True, setp(["format_version"], 2))
case("design", "/design", True, setp(["design"], "cohort"))
case("variable-name", "/variables/0/name", True, setp(["variables", 0, "name"], "2nd"))
case("duplicate-variable", "/variables/3/name", False, setp(["variables", 3, "name"], "c"))
case("edge-unknown-variable", "/graph/edges/2/to", False, setp(["graph", "edges", 2, "to"], "e"))
case("self-loop", "/graph/edges/2", False, setp(["graph", "edges", 2], {"from": "c", "to": "c"}))
case("duplicate-edge", "/graph/edges/3", False, lambda d: d["graph"]["edges"].append({"from": "c", "to": "d"}))
case("cycle", "/graph/edges: has a cycle: b → c → d → b", False, lambda d: d["graph"]["edges"].append({"from": "d", "to": "b"}))
case("two-cycle", "/graph/edges: has a cycle: c → b → c", False, lambda d: d["graph"]["edges"].append({"from": "c", "to": "b"}))
case("exogenous-violated", "/graph/edges/3/to", False, lambda d: d["graph"]["edges"].append({"from": "d", "to": "a"}))
case("fixed-edge-not-in-graph", "/graph/fixed_edges/0", False, setp(["graph", "fixed_edges"], [{"from": "a", "to": "c"}]))
case("alternative-cycle", "/alternatives/0/edges", False, setp(["alternatives"], [
    {"name": "loop", "edges": [{"from": "b", "to": "c"}, {"from": "c", "to": "d"}, {"from": "d", "to": "b"}]}]))
case("claim-unknown-variable", "/claims/0/from", False, setp(["claims", 0, "from"], "e"))
case("claim-same-variables", "/claims/0/to", False, setp(["claims", 0, "to"], "b"))
case("duplicate-claim-id", "/claims/1/id", False, setp(["claims", 1, "id"], "C1"))
case("claim-id-pattern", "/claims/0/id", True, setp(["claims", 0, "id"], "claim one"))
case("adjust-for-self", "/claims/1/adjust_for/0", False, setp(["claims", 1, "adjust_for"], ["c"]))
case("ci-reversed", "/claims/0/ci", False, setp(["claims", 0, "ci"], [0.4, 0.2]))
case("ci-length", "/claims/0/ci", True, setp(["claims", 0, "ci"], [0.2]))
case("p-value-range", "/claims/0/p_value", True, setp(["claims", 0, "p_value"], 1.5))
case("no-claims", "/claims", True, setp(["claims"], []))
case("too-many-claims", "/claims: has 201 claims; the limit is 200", True, lambda d: d.__setitem__("claims", [
    {"id": f"C{i}", "text": "t", "kind": "association", "from": "c", "to": "d"} for i in range(201)]))
case("corr-not-symmetric", "/data/correlations/1/0", False, lambda d: full_matrix(d, [
    [1, 0.2, 0.1, 0.05], [0.25, 1, 0.4, 0.2], [0.1, 0.4, 1, 0.5], [0.05, 0.2, 0.5, 1]]))
case("corr-diagonal", "/data/correlations/1/1", False, setp(["data", "correlations", 1, 1], 0.9))
case("corr-range", "/data/correlations/2/1", True, setp(["data", "correlations", 2, 1], 1.2))
case("corr-not-positive-definite", "/data/correlations: is not positive definite: its smallest eigenvalue is", False,
     setp(["data", "correlations"], [[1], [0.9, 1], [0.9, -0.9, 1], [0.05, 0.2, 0.5, 1]]))
case("corr-shape", "/data/correlations/2", False, setp(["data", "correlations", 2], [0.1, 0.4]))
case("summary-variable-missing", "/variables/3/name", False, lambda d: d["data"].update(
    {"variables": ["a", "b", "c"], "correlations": [[1], [0.2, 1], [0.1, 0.4, 1]]}))
case("summary-empty-matrix", "/data/correlations: has no rows", False, lambda d: d["data"].update(
    {"variables": [], "correlations": []}), also=['/variables/0/name: "a" has no entry in /data/variables'])
case("summary-sds-length", "/data/sds", False, setp(["data", "sds"], [1, 2]))
case("summary-with-csv", "/data/csv", True, setp(["data", "csv"], rows))
case("rows-without-data", "/data", False, lambda d: d.__setitem__("data", {"kind": "rows"}))
case("csv-not-a-number", "data line 3, column 2", False, lambda d: as_rows(d, rows.replace("1.5", "abc")))
case("csv-unknown-column", "data line 1, column 5", False, lambda d: as_rows(d, "a,b,c,d,e\n1,2.5,3.1,0.2,9\n0,1.5,2.2,,9\n"))
case("csv-field-count", "data line 4", False, lambda d: as_rows(d, rows.replace("1,NA,1.0,4.4", "1,NA,1.0")))
case("csv-binary-code", "data line 2, column 1", False, lambda d: as_rows(d, rows.replace("1,2.5", "2,2.5")))
case("csv-missing-column", "/variables/3/name", False, lambda d: as_rows(d, "a,b,c\n1,2,3\n0,1,2\n"))
case("csv-no-rows", "data line 1", False, lambda d: as_rows(d, "a,b,c,d\n"))
case("csv-bad-quote", "data line 2", False, lambda d: as_rows(d, 'a,b,c,d\n1,"2.5,3,4\n'))

# Several faults at once: each stage reports its own.
case("enum-and-misspelt-edge", "/design", True, both(setp(["design"], "cohort"), setp(["graph", "edges", 2, "to"], "dd")),
     also=['/graph/edges/2/to: "dd" names no declared variable'])
case("claim-kind-and-short-row", "/claims/0/kind", True,
     both(setp(["claims", 0, "kind"], "direct"), setp(["data", "correlations", 2], [0.1, 0.4])),
     also=["/data/correlations/2: has 2 entries; want 3"])
case("data-kind-and-short-row", '/data/kind: must be one of: rows, summary; did you mean "summary"?', True,
     both(setp(["data", "kind"], "sumary"), setp(["data", "correlations", 2], [0.1, 0.4])),
     also=["/data/correlations/2: has 2 entries; want 3"])
case("type-and-cross-reference", "/variables/1/reliability", True,
     both(setp(["variables", 1, "reliability"], "high"), setp(["claims", 0, "from"], "e"), setp(["titel"], "x")),
     also=["/claims/0/from", "/titel"])
case("did-you-mean-variable", '/claims/0/from: "conductivty" names no declared variable; did you mean "conductivity"?', False,
     both(setp(["variables", 1, "name"], "conductivity"), setp(["graph", "edges", 0, "to"], "conductivity"),
          setp(["graph", "edges", 1, "from"], "conductivity"), setp(["data", "variables", 1], "conductivity"),
          setp(["claims", 0, "from"], "conductivty")))
case("did-you-mean-field", '/titel: unknown field "titel"; did you mean "title"?', True,
     lambda d: d.__setitem__("titel", d.pop("title")))
case("p-value-string", '/claims/0/p_value: must be a number, not a string; write the relation apart from the number: "p_value": 0.001, "p_relation": "<"',
     True, setp(["claims", 0, "p_value"], "<.001"))
case("ci-level-percent", "/claims/0/ci_level: is 95, but the level is a proportion: write 0.95", True,
     setp(["claims", 0, "ci_level"], 95))
case("n-over-limit", "/data/n: must be at most 100000000", True, setp(["data", "n"], 10**12))
case("n-out-of-range", "/data/n: number 9223372036854775808 is out of range", True, setp(["data", "n"], 2**63))
case("csv-dot-missing", 'data line 3, column 2: "." in column "b" is not a number; if it marks a missing value, list "." in /data/missing_codes',
     False, lambda d: as_rows(d, rows.replace("1.5", ".")))
case("csv-binary-code-99", 'list "99" in /data/missing_codes', False, lambda d: as_rows(d, rows.replace("1,2.5", "99,2.5")))
# Text the service must refuse rather than store.
case("nul-in-title", "/title: contains a NUL character", False, setp(["title"], "Bad\u0000title"))
case("duplicate-key", '/title: the key "title" appears more than once', False,
     raw=json.dumps(base, indent=1).replace('"title":', '"title": "first",\n "title":', 1))
case("invalid-utf8", "/claims/1/text: is not valid UTF-8 text", False,
     raw=json.dumps(base, indent=1).replace("c goes with d", "c goes with \x00d").encode().replace(b"\x00", b"\xff"))

# Files that are not what they should be, and lists past their limits
# (issue 23): each gets one clear sentence, not a cascade.
case("package-empty", "package: the package is empty", None, raw="")
case("package-utf16", "package: the package is UTF-16 text (little-endian); it should be a JSON text file in UTF-8",
     None, raw=json.dumps(base, indent=1).encode("utf-16"))
case("package-utf16-no-bom", "package: the package is UTF-16 text (big-endian)", None,
     raw=json.dumps(base, indent=1).encode("utf-16-be"))
case("package-zip", "package: the package is a ZIP archive (an .xlsx spreadsheet or a .docx document is one)", None,
     raw=b"PK\x03\x04\x14\x00\x06\x00\x08\x00\x00\x00!\x00" + bytes(range(256)))
case("package-binary", "package: the package is binary data, not text", None, raw=b"\x01\x02\x00\x00\x7f" * 40)
case("json-error-column", "package: not valid JSON: invalid character '1' after object key (line 3, column 10)", None,
     raw='{\n "format_version": 1,\n "title" 1}')
case("json-error-column-multibyte", "package: not valid JSON: invalid character 'x' after object key:value pair (line 2, column 23)",
     None, raw='{\n "title": "Übersicht" x}')
case("json-cut-short", "package: not valid JSON: the document ends before its last value is complete (line 2, column 21)",
     None, raw='{\n "title": "Cut short')
case("csv-semicolons", "data line 1: the data are separated by semicolons (;), not commas", False,
     lambda d: as_rows(d, "a;b;c;d\n1;2,5;3,1;0,2\n0;1,5;2,2;\n"))
case("csv-tabs", "data line 1: the data are separated by tabs, not commas", False,
     lambda d: as_rows(d, "a\tb\tc\td\n1\t2.5\t3.1\t0.2\n"))
case("csv-empty", "data line 1: the data are empty", False, lambda d: as_rows(d, "\n\n"))
def utf16_file(doc):
    doc["data"] = {"kind": "rows", "file": "csv-utf16.csv"}
    with open("csv-utf16.csv", "wb") as f:
        f.write(rows.encode("utf-16"))
case("csv-utf16", "data line 1: the data are UTF-16 text (little-endian); they should be CSV text in UTF-8", False, utf16_file)
case("adjust-for-over-limit", "/claims/0/adjust_for: has 501 entries; the limit is 500, the limit on variables", True,
     setp(["claims", 0, "adjust_for"], ["b"] * 501))
case("problems-cut", "package: the list stops at 500 problems and there are more", False,
     setp(["graph", "edges"], [{"from": f"x{i}", "to": f"y{i}"} for i in range(300)]),
     also=['/graph/edges/0/from: "x0" names no declared variable'])

# indirect effects and tiers (issue 18)
def indirect(through, frm="a", to="d", **kw):
    def m(doc):
        c = {"id": "C3", "text": "a acts on d through its mediators", "kind": "indirect_effect",
             "from": frm, "to": to, "through": through}
        c.update(kw)
        doc["claims"].append(c)
    return m
case("indirect-through-unknown", "/claims/2/through/0", False, indirect(["e"]))
case("indirect-through-is-from", "/claims/2/through/0: \"a\" is the claim's own from or to variable", False,
     indirect(["a"]))
case("indirect-through-twice", "/claims/2/through/1: \"b\" is listed twice", True, indirect(["b", "b"]))
case("indirect-no-path", "/claims/2/through: the declared graph has no directed path from b to d through a", False,
     indirect(["a"], frm="b"))
case("indirect-no-path-total", "/claims/2/through: the declared graph has no directed path of two arrows or more "
     "from c to d, so c has no indirect effect on d", False, indirect([], frm="c"))
case("indirect-scale", "/claims/2/estimate_scale: an indirect effect is a product of path coefficients", True,
     indirect(["b"], estimate_scale="odds_ratio"))
case("through-on-direct-claim", "/claims/0/through: only an indirect_effect claim has mediators", True,
     setp(["claims", 0, "through"], ["d"]))
case("tier-unknown-variable", "/graph/tiers/0/1", False, setp(["graph", "tiers"], [["a", "e"], ["b"]]))
case("tier-twice", "/graph/tiers/1/0: \"b\" is already in /graph/tiers/0", False,
     setp(["graph", "tiers"], [["a", "b"], ["b", "c"]]))
case("tier-empty", "/graph/tiers/1: is an empty tier", True, setp(["graph", "tiers"], [["a"], []]))
case("tier-backward-arrow", "/graph/edges/1: the arrow b → c points from tier 2 (b) back to tier 1 (a, c)", False,
     setp(["graph", "tiers"], [["a", "c"], ["b"]]))
case("tier-backward-alternative", "/alternatives/0/edges/2: the arrow d → c points from tier 4 (d) back to tier 3 (c)",
     False, both(setp(["graph", "tiers"], [["a"], ["b"], ["c"], ["d"]]), setp(["alternatives"], [
         {"name": "d-first", "edges": [{"from": "a", "to": "b"}, {"from": "b", "to": "c"}, {"from": "d", "to": "c"}]}])))

with open("cases.json", "w") as f:
    json.dump(cases, f, indent=1, ensure_ascii=False)
    f.write("\n")

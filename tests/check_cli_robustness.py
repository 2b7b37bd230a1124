#!/usr/bin/python3
"""Mutation test of phaseplan-cli: bad input never crashes and never gives a silent wrong answer.

Usage: check_cli_robustness.py <phaseplan-cli> <source-dir> <build-dir>

Starts from valid documents (the demos in data/demo and a few made here) for every subcommand,
mutates them (fields dropped, wrong types, strings for numbers, zero, negative, -0, 1e308,
nested nulls, empty and huge arrays, unknown ids, deep nesting, truncated JSON, bytes that are
not UTF-8, duplicate keys, gradients with descending times or rows not adding to 100,
0 injections, ...) with a fixed seed, runs the CLI on each and asserts the contract of
README "Command line" for every run:

- the exit status is 0 or 2: never a signal, never 1, 3, 134, 139;
- on 2: nothing on stdout, exactly one line on stderr, "phaseplan-cli: <field>: <message>",
  where <field> is a JSON path into the document (its first segment a key of the document)
  or one of (document), input, -o, --paper;
- on 0: stdout is one JSON document without NaN or Infinity; the result fields (ph,
  ionic_strength_mol_per_l, required_ml, total_min, mass_g, ...) are finite numbers, amounts
  are not negative, no text says "nan" or "inf", and clock times are not empty; solve's
  species satisfy the charge balance and I = 1/2 sum(c z^2); a sequence's lines pump what the
  plan pumps and the waste is pumped + priming;
- sheet and labels: on 2 no PDF (and no temporary file) is left behind; on 0 the PDF exists.

Mutations that make the input invalid in a way the contract names (truncated JSON, bytes that
are not UTF-8, descending gradient times, a row not adding to 100, 0 injections, unknown ids,
duplicate keys, a misspelt optional field such as "temperature" for "temperature_c") must
moreover give status 2. A few cases vary the command line and the environment instead (unknown
paper, no -o, a Qt runtime folder that makes Qt warn on stderr).

Environment: PHASEPLAN_FUZZ_SEED (default 20261201) and PHASEPLAN_FUZZ_ROUNDS (random mutations
per base document, default 24) widen the search when run by hand; CTest uses the defaults.
Prints "N passed, M failed"; each failure prints the command and its input document (and writes
it to <build-dir>/cli-robustness/failure-<n>.json) so it can be reproduced.
"""
import concurrent.futures
import copy
import json
import math
import os
import random
import re
import shutil
import subprocess
import sys
import tempfile
import time

CLI, SRC, BUILD = sys.argv[1], sys.argv[2], sys.argv[3]
SEED = int(os.environ.get("PHASEPLAN_FUZZ_SEED", "20261201"))
ROUNDS = int(os.environ.get("PHASEPLAN_FUZZ_ROUNDS", "24"))
TIMEOUT_S = 20
sys.setrecursionlimit(20000)

OUT_DIR = os.path.join(BUILD, "cli-robustness")
os.makedirs(OUT_DIR, exist_ok=True)
PDF_DIR = tempfile.mkdtemp(prefix="pdf-", dir=OUT_DIR)
XDG = tempfile.mkdtemp(prefix="xdg-", dir=OUT_DIR)  # mkdtemp makes it 0700, as Qt wants
ENV = dict(os.environ)
ENV.setdefault("QT_QPA_PLATFORM", "offscreen")
ENV["XDG_RUNTIME_DIR"] = XDG


def load(name):
    with open(os.path.join(SRC, "data", "demo", name), encoding="utf-8") as f:
        return json.load(f)


# ---- valid documents ----------------------------------------------------------------------------

PHOSPHATE_SOLVE = {"temperature_c": 25, "components": [
    {"reagent": "potassium-dihydrogen-phosphate", "mol_per_l": 0.025},
    {"reagent": "disodium-hydrogen-phosphate", "mol_per_l": 0.025}]}
MIXTURE_SOLVE = {"temperature_c": 37, "components": [
    {"reagent": "acetic-acid", "mol_per_l": 0.01},
    {"reagent": "sodium-acetate", "mol_per_l": 0.012},
    {"reagent": "tris", "mol_per_l": 0.005},
    {"reagent": "hydrochloric-acid", "mol_per_l": 0.001},
    {"reagent": "sodium-chloride", "mol_per_l": 0.05}]}
DEMO_BUFFER = load("buffer-phosphate-ph2.5.json")
MIX_IONIC = {"target_ph": 4.8, "temperature_c": 20, "volume_ml": 500, "route": "mix",
             "acid": "acetic-acid", "base": "sodium-acetate", "ionic_strength_mol_per_l": 0.05}
TITRATE = {"target_ph": 8.1, "temperature_c": 25, "volume_ml": 1000, "route": "titrate",
           "weigh": "tris", "titrant": "hydrochloric-acid", "titrant_mol_per_l": 1.0,
           "concentration_mol_per_l": 0.05}
# LC-MS conventions: the salt at c brought to pH with its own acid, added as supplied; and a
# total-basis titration with the conjugate acid as the titrant.
TITRATE_NEAT_SALT = {"target_ph": 3.0, "temperature_c": 25, "volume_ml": 1000, "route": "titrate",
                     "weigh": "ammonium-formate", "titrant": "formic-acid", "titrant_form": "neat",
                     "concentration_basis": "salt", "concentration_mol_per_l": 0.01}
TITRATE_TOTAL = {"target_ph": 4.75, "temperature_c": 25, "volume_ml": 500, "route": "titrate",
                 "weigh": "ammonium-acetate", "titrant": "acetic-acid", "titrant_mol_per_l": 1.0,
                 "concentration_basis": "total", "ionic_strength_mol_per_l": 0.01}
MIX_SALT = {"target_ph": 3.2, "temperature_c": 25, "volume_ml": 1000, "route": "mix",
            "acid": "formic-acid", "base": "ammonium-formate", "concentration_basis": "salt",
            "concentration_mol_per_l": 0.01}
STOCKS = {"target_ph": 7.0, "temperature_c": 25, "volume_ml": 250, "route": "stocks",
          "acid": "potassium-dihydrogen-phosphate", "base": "dipotassium-hydrogen-phosphate",
          "acid_stock_mol_per_l": 0.5, "base_stock_mol_per_l": 0.5,
          "concentration_mol_per_l": 0.05,
          "purity_percent": {"potassium-dihydrogen-phosphate": 99.5}}
DEMO_LINE = load("line-phosphate-acetonitrile.json")
ADDITIVE_LINE = {"name": "0.1 % formic acid, 5 mM ammonium formate in water/methanol",
                 "volume_ml": 1000, "bottle_ml": 1000,
                 "parts": [{"solvent": "water", "fraction_v": 0.95},
                           {"solvent": "methanol", "fraction_v": 0.05}],
                 "additives": [{"additive": "formic-acid", "percent_v": 0.1},
                               {"additive": "ammonium-formate", "mmol_per_l": 5}],
                 "prepared_at": "2026-12-01T09:00:00", "shelf_life_h": 72,
                 "detector": {"type": "uv-ms", "wavelength_nm": 254, "margin_nm": 10},
                 "column": {"ph_min": 1.5, "ph_max": 10}}
DEMO_SEQUENCE = load("overnight-sequence.json")
DEMO_ELUENT = load("eluent-phosphate-acetonitrile.json")
MIXED_ELUENT = {"lines": {"A": {"parts": [{"solvent": "water", "fraction_v": 0.9},
                                           {"solvent": "methanol", "fraction_v": 0.1}],
                                 "additives": [{"additive": "ammonium-acetate", "mmol_per_l": 10}]},
                           "B": {"parts": [{"solvent": "acetonitrile", "fraction_v": 1}],
                                 "additives": [{"additive": "formic-acid", "percent_v": 0.1}]}},
                 "composition": {"A": 30, "B": 70}, "temperature_c": 45, "activity_model": "sit"}
SMALL_SEQUENCE = {
    "lines": {
        "A": {"name": "water", "bottle_ml": 1000, "residue_ml": 30,
              "parts": [{"solvent": "water", "fraction_v": 1}]},
        "B": {"name": "acetonitrile", "bottle_ml": 500, "residue_ml": 30,
              "parts": [{"solvent": "acetonitrile", "fraction_v": 1}],
              "additives": [{"additive": "trifluoroacetic-acid", "percent_v": 0.05}]}},
    "methods": {"m": {"flow_ml_min": 1.0,
                      "gradient": [{"t_min": 0, "A": 95, "B": 5}, {"t_min": 10, "A": 5, "B": 95}],
                      "run_min": 15, "equilibration_min": 5}},
    "sequence": [{"method": "m", "injections": 30, "label": "samples"}],
    "prime_ml": {"A": 10, "B": 10},
    "start": "2026-12-01T18:00:00+01:00",
    "waste_ml": 4000,
    "safety_margin": 0.1,
    "detector": {"type": "uv", "wavelength_nm": 210},
    "column": {"ph_min": 2, "ph_max": 8},
    "standby": {"flow_ml_min": 0.1, "until": "2026-12-02T07:00:00", "A": 50, "B": 50}}
PLANS = {"plans": [copy.deepcopy(SMALL_SEQUENCE),
                   dict(copy.deepcopy(SMALL_SEQUENCE), start="2026-12-03T18:00:00+01:00")]}
PRESSURE = {
    "lines": copy.deepcopy(SMALL_SEQUENCE["lines"]),
    "method": copy.deepcopy(SMALL_SEQUENCE["methods"]["m"]),
    "column": {"length_mm": 150, "id_mm": 4.6, "particle_um": 3.5, "porosity": 0.4,
               "temperature_c": 30, "max_pressure_bar": 400,
               "reference": {"pressure_bar": 180, "flow_ml_min": 1.0, "A": 50, "B": 50}},
    "instrument": {"max_pressure_bar": 600, "system_pressure_bar": 15, "system_flow_ml_min": 1.0,
                   "dwell_ml": 1.1},
    "step_min": 0.5}
TRANSFER = {
    "method": copy.deepcopy(SMALL_SEQUENCE["methods"]["m"]),
    "from": {"length_mm": 250, "id_mm": 4.6, "particle_um": 5, "dwell_ml": 1.0},
    "to": {"length_mm": 50, "id_mm": 2.1, "particle_um": 1.7, "dwell_ml": 0.1, "max_pressure_bar": 1000},
    "injection_ul": 10, "sequence_injections": 40,
    "lines": copy.deepcopy(SMALL_SEQUENCE["lines"]),
    "instrument": {"max_pressure_bar": 1200}}
SEQUENCE_WITH_COLUMN = dict(copy.deepcopy(SMALL_SEQUENCE),
                            column={"ph_min": 2, "ph_max": 8, "length_mm": 100, "id_mm": 2.1,
                                    "particle_um": 1.8, "temperature_c": 40, "max_pressure_bar": 600},
                            instrument={"max_pressure_bar": 1000, "dwell_ml": 0.4})
BATCH = {"id": "HR-20261201-001", "prepared_by": "A. Analyst", "checked_by": "B. Checker",
         "prepared_at": "2026-12-01T16:30:00", "tolerance_percent": 2,
         "actual": [{"reagent": "sodium-dihydrogen-phosphate-monohydrate", "mass_g": 0.52,
                     "lot": "L-1"}]}
SHEET_RECIPE = dict(copy.deepcopy(DEMO_BUFFER), batch=copy.deepcopy(BATCH))
SHEET_LINE = dict(copy.deepcopy(DEMO_LINE), batch={"id": "HR-20261201-002", "prepared_by": "A. Analyst"})
SHEET_SEQUENCE = dict(copy.deepcopy(SMALL_SEQUENCE), batch={"id": "HR-20261201-003"})

BASES = [  # (command, name, document, extra arguments)
    ("solve", "phosphate", PHOSPHATE_SOLVE, []),
    ("solve", "mixture", MIXTURE_SOLVE, []),
    ("recipe", "demo-buffer", DEMO_BUFFER, []),
    ("recipe", "mix-ionic", MIX_IONIC, []),
    ("recipe", "titrate", TITRATE, []),
    ("recipe", "stocks", STOCKS, []),
    ("recipe", "titrate-neat-salt", TITRATE_NEAT_SALT, []),
    ("recipe", "titrate-total", TITRATE_TOTAL, []),
    ("recipe", "mix-salt", MIX_SALT, []),
    ("reagents", "empty", {}, []),
    ("line", "demo-line", DEMO_LINE, []),
    ("line", "additives", ADDITIVE_LINE, []),
    ("sequence", "demo-overnight", DEMO_SEQUENCE, []),
    ("sequence", "small", SMALL_SEQUENCE, []),
    ("sequence", "plans", PLANS, []),
    ("sequence", "with-column", SEQUENCE_WITH_COLUMN, []),
    ("pressure", "gradient", PRESSURE, []),
    ("transfer", "to-sub-2um", TRANSFER, []),
    ("eluent", "demo-eluent", DEMO_ELUENT, []),
    ("eluent", "mixed", MIXED_ELUENT, []),
    ("sheet", "recipe", SHEET_RECIPE, ["--paper", "a4"]),
    ("sheet", "line", SHEET_LINE, ["--paper", "letter"]),
    ("sheet", "sequence", SHEET_SEQUENCE, []),
    ("labels", "recipe", SHEET_RECIPE, ["--paper", "label62"]),
    ("labels", "line", SHEET_LINE, []),
]
PDF_COMMANDS = {"sheet", "labels"}
# The PDF commands cost more per run: fewer random mutations of them.
ROUNDS_FOR = {"sheet": max(2, ROUNDS // 3), "labels": max(2, ROUNDS // 4)}

# ---- serialising, with duplicate keys on request --------------------------------------------------


class Dup:
    """An object written with its pairs as given, repeated keys included."""

    def __init__(self, pairs):
        self.pairs = pairs


def dumps(x):
    if isinstance(x, Dup):
        return "{" + ",".join(json.dumps(k) + ":" + dumps(v) for k, v in x.pairs) + "}"
    if isinstance(x, dict):
        return "{" + ",".join(json.dumps(k) + ":" + dumps(v) for k, v in x.items()) + "}"
    if isinstance(x, list):
        return "[" + ",".join(dumps(v) for v in x) + "]"
    if isinstance(x, float):
        if x != x or x in (float("inf"), float("-inf")):
            return {"nan": "NaN", "inf": "Infinity", "-inf": "-Infinity"}[repr(x)]
        if x == 0 and math.copysign(1, x) < 0:
            return "-0.0"
        return repr(x)
    return json.dumps(x, ensure_ascii=False)


# ---- walking and editing a document ----------------------------------------------------------------

def paths(doc, prefix=()):
    out = []
    if isinstance(doc, dict):
        for k, v in doc.items():
            out.append(prefix + (k,))
            out += paths(v, prefix + (k,))
    elif isinstance(doc, list):
        for i, v in enumerate(doc):
            out.append(prefix + (i,))
            out += paths(v, prefix + (i,))
    return out


def get(doc, path):
    for p in path:
        doc = doc[p]
    return doc


def put(doc, path, value):
    doc = copy.deepcopy(doc)
    parent = get(doc, path[:-1])
    parent[path[-1]] = value
    return doc


def drop(doc, path):
    doc = copy.deepcopy(doc)
    parent = get(doc, path[:-1])
    del parent[path[-1]]
    return doc


def path_text(path):
    s = ""
    for p in path:
        s += "[%d]" % p if isinstance(p, int) else ("." if s else "") + str(p)
    return s


def number_variants(v):
    out = [0, -0.0, -1, -v, 1e308, -1e308, 1e-308, 5e-324, 1e20, 2 ** 31, -2 ** 31 - 1,
           12345678901234567890, 0.5, 1.5, v * 10, v * 1e6, v / 1e6, v + 1e-9, 99.999, 100.01,
           14.0, 60.0, 60.0001, -0.0001, 1e6, 1e6 + 1]
    return out


STRING_VARIANTS = ["", "   ", "no-such-id", "Tris", "tris ", "A", "E", "a", "x" * 5000,
                   "pH 7 \u00b5 \u2603", "line\nbreak", "\u0000", "2026-02-30T10:00:00",
                   "2026-12-01", "2026-12-01T25:00:00", "99999-12-01T18:00:00", "0.025", "NaN"]
OTHER_VARIANTS = [None, True, False, [], {}, [None], {"x": None}, [[[]]], {"a": {"b": None}}]


def huge_array(v):
    return [copy.deepcopy(v) for _ in range(2000)]


def deep(depth=900):
    x = 0.01
    for _ in range(depth):
        x = [x]
    return x


# ---- cases ---------------------------------------------------------------------------------------

class Case:
    __slots__ = ("command", "base", "what", "data", "args", "must_fail", "doc_keys", "env")

    def __init__(self, command, base, what, data, args, must_fail=False, doc_keys=(), env=None):
        self.command, self.base, self.what = command, base, what
        self.data = data if isinstance(data, bytes) else data.encode("utf-8")
        self.args, self.must_fail, self.doc_keys = args, must_fail, set(doc_keys)
        self.env = env or {}


def keys_of(doc):
    return set(doc.keys()) if isinstance(doc, dict) else set()


def mutate_once(rng, doc):
    """One random edit of doc: (mutated document, description), or None."""
    ps = paths(doc) or [()]
    path = rng.choice(ps)
    try:
        value = get(doc, path)
    except (KeyError, IndexError, TypeError):
        return None
    kind = rng.random()
    if not path:
        return {"unexpected": rng.choice(OTHER_VARIANTS)}, "root replaced"
    if kind < 0.15:
        return drop(doc, path), "drop " + path_text(path)
    if isinstance(value, bool) or value is None:
        nv = rng.choice(OTHER_VARIANTS + [0, "true"])
        return put(doc, path, nv), "%s = %s" % (path_text(path), dumps(nv))
    if isinstance(value, (int, float)):
        pool = number_variants(value) + [str(value), None, [value], {"value": value}, True]
        nv = rng.choice(pool)
        return put(doc, path, nv), "%s = %s" % (path_text(path), dumps(nv))
    if isinstance(value, str):
        nv = rng.choice(STRING_VARIANTS + [None, 0, [value], value.upper(), value[:-1]])
        return put(doc, path, nv), "%s = %s" % (path_text(path), dumps(nv)[:60])
    if isinstance(value, list):
        choice = rng.randrange(5)
        if choice == 0 or not value:
            nv, label = [], "[]"
        elif choice == 1:
            nv, label = huge_array(value[0]), "2000 copies of its first element"
        elif choice == 2:
            nv, label = list(reversed(value)) + [None], "reversed plus null"
        elif choice == 3:
            nv, label = value + value, "doubled"
        else:
            nv, label = deep(), "900-deep nested array"
        return put(doc, path, nv), "%s = %s" % (path_text(path), label)
    choice = rng.randrange(4)  # an object
    if choice == 0:
        nv, label = {}, "{}"
    elif choice == 1:
        nv, label = dict(value, unknown_field=None), "plus unknown_field: null"
    elif choice == 2:
        nv, label = {k: None for k in value}, "every value null"
    else:
        nv, label = [value], "wrapped in an array"
    return put(doc, path, nv), "%s = %s" % (path_text(path), label)


def random_mutations(rng, command, name, doc, args, rounds):
    """rounds random edits of doc; about a third of them stack a second edit on the first."""
    cases = []
    keys = keys_of(doc)
    for _ in range(rounds):
        m = mutate_once(rng, doc)
        if m is None:
            continue
        mutated, what = m
        if rng.random() < 0.35 and isinstance(mutated, dict) and len(dumps(mutated)) < 200000:
            m2 = mutate_once(rng, mutated)
            if m2 is not None:
                mutated, what = m2[0], what + " and " + m2[1]
        cases.append(Case(command, name, what, dumps(mutated), args, doc_keys=keys | keys_of(mutated)))
    return cases


def first_number_token(text):
    """(start, end) of the first number outside a string in a JSON text, or None."""
    i, in_string = 0, False
    while i < len(text):
        c = text[i]
        if in_string:
            if c == "\\":
                i += 1
            elif c == '"':
                in_string = False
        elif c == '"':
            in_string = True
        elif c in "-0123456789":
            m = re.compile(r"-?\d+(\.\d+)?([eE][-+]?\d+)?").match(text, i)
            return m.start(), m.end()
        i += 1
    return None


def text_mutations(rng, command, name, doc, args):
    text = dumps(doc)
    strict = command != "reagents"  # reagents reads no input
    keys = keys_of(doc)
    out = []
    for frac in (0.1, 0.5, 0.9):
        cut = max(1, int(len(text) * frac))
        out.append(Case(command, name, "truncated at %d of %d" % (cut, len(text)), text[:cut], args,
                        must_fail=strict, doc_keys=keys))
    out.append(Case(command, name, "last byte dropped", text[:-1], args, must_fail=strict, doc_keys=keys))
    # Bytes that are not UTF-8, inside a string value.
    at = text.find('"', 2) + 1
    for bad in (b"\xff\xfe", b"\xc3\x28", b"\xed\xa0\x80", b"\xc0\xaf"):
        raw = text.encode("utf-8")
        pos = len(text[:at].encode("utf-8"))
        out.append(Case(command, name, "non-UTF-8 bytes %r in a string" % bad, raw[:pos] + bad + raw[pos:],
                        args, must_fail=strict, doc_keys=keys))
    num = first_number_token(text)
    if num:
        # Qt reads ".5" and "1." as numbers (lenient, not ambiguous): either outcome is fine.
        for literal, refuse in (("NaN", strict), ("Infinity", strict), ("-Infinity", strict),
                                ("1e999", strict), ("-1e999", strict), ("0x10", strict),
                                ("01", strict), ("+1", strict), ("--1", strict), (".5", False),
                                ("1.", False)):
            out.append(Case(command, name, "number literal %s" % literal,
                            text[:num[0]] + literal + text[num[1]:], args,
                            must_fail=refuse, doc_keys=keys))
    out.append(Case(command, name, "UTF-8 byte-order mark", b"\xef\xbb\xbf" + text.encode(), args, doc_keys=keys))
    out.append(Case(command, name, "trailing garbage", text + " }", args, must_fail=strict, doc_keys=keys))
    out.append(Case(command, name, "two documents", text + text, args, must_fail=strict, doc_keys=keys))
    out.append(Case(command, name, "whole document 2000-deep", "[" * 2000 + "]" * 2000, args,
                    must_fail=strict))
    for bare in ("", " \n", "null", "[]", '"text"', "42", "{}"):
        out.append(Case(command, name, "document %r" % bare, bare, args,
                        must_fail=strict, doc_keys=keys))
    # Duplicate keys: at the top level and one level down, with a different value.
    if isinstance(doc, dict) and doc:
        k = rng.choice(list(doc))
        dup = Dup(list(doc.items()) + [(k, doc[k] if not isinstance(doc[k], (int, float)) else doc[k] * 2 + 1)])
        out.append(Case(command, name, "duplicate key %s" % k, dumps(dup), args,
                        must_fail=strict, doc_keys=keys))
    for p in paths(doc):
        v = get(doc, p)
        if isinstance(v, dict) and v and p:
            k = sorted(v)[0]
            inner = Dup(list(v.items()) + [(k, 0.123 if not isinstance(v[k], str) else v[k] + "x")])
            mutated = put(doc, p, inner)
            out.append(Case(command, name, "duplicate key %s.%s" % (path_text(p), k), dumps(mutated), args,
                            must_fail=strict, doc_keys=keys))
            break
    return out


def gradient_of(doc):
    """The (path, gradient) pairs of a sequence document (plans included)."""
    out = []
    for p in paths(doc):
        if p and p[-1] == "gradient" and isinstance(get(doc, p), list):
            out.append((p, get(doc, p)))
    return out


def domain_mutations(command, name, doc, args):
    """Mutations the contract names as errors: must give status 2."""
    out = []
    keys = keys_of(doc)

    def add(what, mutated, must_fail=True):
        out.append(Case(command, name, what, dumps(mutated), args, must_fail=must_fail,
                        doc_keys=keys | keys_of(mutated)))

    if command in ("sequence", "sheet") and ("lines" in doc or "plans" in doc):
        for gp, g in gradient_of(doc)[:2]:
            if len(g) >= 2:
                rows = copy.deepcopy(g)
                rows[0]["t_min"], rows[-1]["t_min"] = rows[-1]["t_min"] + 1, rows[0]["t_min"]
                add("descending gradient times at " + path_text(gp), put(doc, gp, rows))
                rows = copy.deepcopy(g)
                rows[1]["t_min"] = rows[0]["t_min"]
                add("repeated gradient time at " + path_text(gp), put(doc, gp, rows))
            row = copy.deepcopy(g[0])
            letter = next(k for k in row if k != "t_min")
            row[letter] = row[letter] - 1
            add("row adding to 99 at " + path_text(gp), put(doc, gp, [row] + g[1:]))
            row = copy.deepcopy(g[0])
            row[letter] = row[letter] + 0.5
            add("row adding to 100.5 at " + path_text(gp), put(doc, gp, [row] + g[1:]))
            row = copy.deepcopy(g[0])
            others = [k for k in row if k != "t_min" and k != letter]
            if others:
                row[letter], row[others[0]] = 150, -50 - sum(row[k] for k in others[1:])
                add("row 150/-50 at " + path_text(gp), put(doc, gp, [row] + g[1:]))
            row = copy.deepcopy(g[0])
            row["E"] = 0
            add("line E in a row at " + path_text(gp), put(doc, gp, [row] + g[1:]))
            row = copy.deepcopy(g[0])
            row["t_min"] = -1
            add("negative time at " + path_text(gp), put(doc, gp, [row] + g[1:]))
            add("empty gradient at " + path_text(gp), put(doc, gp, []))
            method = gp[:-1]
            m = get(doc, method)
            add("run_min before the last row", put(doc, method + ("run_min",), g[-1]["t_min"] - 0.5)
                if g[-1]["t_min"] > 0.5 else put(doc, method + ("run_min",), -1))
            add("flow 0", put(doc, method + ("flow_ml_min",), 0))
            add("flow 1e308", put(doc, method + ("flow_ml_min",), 1e308))
            add("equilibration -1", put(doc, method + ("equilibration_min",), -1))
            if "run_min" in m:
                add("run_min 1e308", put(doc, method + ("run_min",), 1e308))
        for p in paths(doc):
            if p and p[-1] == "injections":
                add("0 injections at " + path_text(p), put(doc, p, 0))
                add("-3 injections at " + path_text(p), put(doc, p, -3))
                add("2.5 injections at " + path_text(p), put(doc, p, 2.5))
                add("1e308 injections at " + path_text(p), put(doc, p, 1e308))
                add("unknown method at " + path_text(p),
                    put(doc, p[:-1] + ("method",), "no-such-method"))
                break
        for p in paths(doc):
            if p and p[-1] == "sequence" and isinstance(get(doc, p), list):
                rows = get(doc, p)
                # The most each row allows, many rows: the plan must refuse, not overflow.
                many = [dict(rows[0], injections=1000000) for _ in range(2500)]
                add("2500 rows of 1e6 injections", put(doc, p, many))
                add("one row of 1e6 injections", put(doc, p, [dict(rows[0], injections=1000000)]),
                    must_fail=False)
                break
        for p in paths(doc):
            if p and p[-1] == "residue_ml":
                bottle = get(doc, p[:-1] + ("bottle_ml",))
                add("residue = bottle at " + path_text(p), put(doc, p, bottle))
                break
        for p in paths(doc):
            if p and p[-1] == "prime_ml" and isinstance(get(doc, p), dict):
                add("prime_ml for line D (undefined)", put(doc, p + ("D",), 5))
                add("prime_ml -1", put(doc, p + (next(iter(get(doc, p))),), -1))
                break
        for p in paths(doc):
            if p and p[-1] == "start":
                add("start not a date", put(doc, p, "yesterday"))
                add("start 2026-02-30", put(doc, p, "2026-02-30T18:00:00"))
                break
        for p in paths(doc):
            if p and p[-1] == "standby" and isinstance(get(doc, p), dict):
                add("standby with duration and until", put(doc, p, dict(get(doc, p), duration_min=10)))
                break
    if command in ("recipe", "sheet", "labels", "line", "sequence"):
        for p in paths(doc):
            if p and p[-1] in ("acid", "base", "weigh", "titrant", "reagent", "additive", "solvent") \
                    and isinstance(get(doc, p), str):
                add("unknown id at " + path_text(p), put(doc, p, "potasium-dihydrogen-phosphate"))
        for p in paths(doc):
            if p and p[-1] == "concentration_basis":
                add("unknown basis at " + path_text(p), put(doc, p, "weighed"))
            if p and p[-1] == "titrant_form":
                add("unknown titrant form at " + path_text(p), put(doc, p, "dilute"))
                add("neat titrant with a molarity", put(doc, p[:-1] + ("titrant_mol_per_l",), 1.0))
            if p and p[-1] == "titrant" and isinstance(get(doc, p), str):
                add("titrant that fits nothing at " + path_text(p), put(doc, p, "sodium-chloride"))
        for p in paths(doc):
            if p and p[-1] == "target_ph":
                add("target_ph 15", put(doc, p, 15))
                add("target_ph -0.5", put(doc, p, -0.5))
                add("target_ph 12 (unreachable)", put(doc, p, 12.0))
                break
        for p in paths(doc):
            if p and p[-1] == "fraction_v":
                add("fraction 0 at " + path_text(p), put(doc, p, 0))
                add("fraction 1.2 at " + path_text(p), put(doc, p, 1.2))
                break
        for p in paths(doc):
            if p and p[-1] == "parts" and isinstance(get(doc, p), list) and len(get(doc, p)) > 1:
                parts = copy.deepcopy(get(doc, p))
                parts[0]["fraction_v"] = parts[0]["fraction_v"] - 0.05
                add("fractions adding to 0.95 at " + path_text(p), put(doc, p, parts))
                break
        for p in paths(doc):
            if p and p[-1] == "concentration_mol_per_l":
                add("concentration 0", put(doc, p, 0))
                add("concentration 10.5", put(doc, p, 10.5))
                add("concentration and ionic strength",
                    put(doc, p[:-1] + ("ionic_strength_mol_per_l",), 0.05))
                break
    # A misspelt optional field must not fall back to its default without a word.
    near_misses = {"temperature_c": "temperature", "volume_ml": "volume", "equilibration_min": "equilibration",
                   "residue_ml": "residue", "waste_ml": "waste", "safety_margin": "safety_margin_fraction",
                   "additives": "additive", "prepared_at": "prepared", "margin_nm": "margin",
                   "concentration_mol_per_l": "Concentration_mol_per_L", "shelf_life_h": "shelf_life",
                   "ionic_strength_mol_per_l": "ionic_strength", "prime_ml": "prime", "standby": "stand_by",
                   "purity_percent": "purity"}
    done = set()
    for p in paths(doc):
        # (The batch of sheet and labels is read by app/print, which does not check near misses.)
        if p and p[-1] in near_misses and p[-1] not in done and isinstance(get(doc, p[:-1]), dict) \
                and p[0] != "batch":
            done.add(p[-1])
            parent = copy.deepcopy(get(doc, p[:-1]))
            parent[near_misses[p[-1]]] = parent.pop(p[-1])
            add("%s misspelt %s" % (path_text(p), near_misses[p[-1]]),
                put(doc, p[:-1], parent) if p[:-1] else parent)
    if command == "solve":
        add("temperature 61", put(doc, ("temperature_c",), 61))
        add("temperature -0.5", put(doc, ("temperature_c",), -0.5))
        add("temperature 0 (edge, valid)", put(doc, ("temperature_c",), 0), must_fail=False)
        add("temperature 60 (edge, valid)", put(doc, ("temperature_c",), 60), must_fail=False)
        add("temperature -0.0 (valid)", put(doc, ("temperature_c",), -0.0), must_fail=False)
        add("components []", put(doc, ("components",), []))
        add("components [null]", put(doc, ("components",), [None]))
        add("mol_per_l 1e-300 (valid)", put(doc, ("components", 0, "mol_per_l"), 1e-300), must_fail=False)
        add("mol_per_l 10 (edge, valid)", put(doc, ("components", 0, "mol_per_l"), 10), must_fail=False)
        add("mol_per_l 10.000001", put(doc, ("components", 0, "mol_per_l"), 10.000001))
        add("2000 components", put(doc, ("components",), huge_array(doc["components"][0])))
        add("10 mol/L strong acid and base (valid)", {"components": [
            {"reagent": "hydrochloric-acid", "mol_per_l": 10},
            {"reagent": "sodium-hydroxide", "mol_per_l": 10}]}, must_fail=False)
        add("10 mol/L sodium hydroxide (valid or refused)", {"components": [
            {"reagent": "sodium-hydroxide", "mol_per_l": 10}]}, must_fail=False)
    if command in ("sheet", "labels"):
        b = doc["batch"]
        add("batch without id", put(doc, ("batch",), {k: v for k, v in b.items() if k != "id"}))
        add("batch id 100 characters", put(doc, ("batch", "id"), "B" * 100))
        add("batch prepared_at not a date", put(doc, ("batch", "prepared_at"), "2026-13-01T10:00:00"))
        add("batch expires before prepared",
            put(put(doc, ("batch", "prepared_at"), "2026-12-02T10:00:00"), ("batch", "expires_at"),
                "2026-12-01T10:00:00"))
        add("batch tolerance -2", put(doc, ("batch", "tolerance_percent"), -2))
        add("batch copies 0", put(doc, ("batch", "copies"), 0))
        add("batch actual with unknown reagent",
            put(doc, ("batch", "actual"), [{"reagent": "no-such-reagent", "mass_g": 1}]))
        add("batch actual mass -1", put(doc, ("batch", "actual"), [{"reagent": "phosphoric-acid", "mass_g": -1}]))
    return out


def option_cases():
    """Command-line arguments rather than documents."""
    doc = dumps(SHEET_RECIPE)
    out = [Case("sheet", "options", "--paper a5", doc, ["--paper", "a5"], must_fail=True),
           Case("sheet", "options", "--paper label62 for a sheet", doc, ["--paper", "label62"], must_fail=True),
           Case("labels", "options", "no -o", doc, ["--no-output"], must_fail=True),
           Case("sheet", "options", "-o into a missing folder", doc,
                ["-o", os.path.join(PDF_DIR, "missing", "x.pdf")], must_fail=True),
           Case("nosuch", "options", "unknown command", doc, [], must_fail=True),
           Case("solve", "options", "two input paths", dumps(PHOSPHATE_SOLVE), ["extra.json"], must_fail=True)]
    # Qt warns on stderr about a runtime folder open to others: still one line on bad input.
    loose = os.path.join(OUT_DIR, "xdg-0755")
    os.makedirs(loose, exist_ok=True)
    os.chmod(loose, 0o755)
    for command in ("sheet", "labels"):
        out.append(Case(command, "options", "runtime folder 0755, bad input", '{"target_ph": 2.5}', [],
                        must_fail=True, env={"XDG_RUNTIME_DIR": loose}))
        out.append(Case(command, "options", "no runtime folder, bad input", '{"target_ph": 2.5}', [],
                        must_fail=True, env={"XDG_RUNTIME_DIR": None}))
    return out


def all_cases():
    rng = random.Random(SEED)
    cases = []
    for command, name, doc, args in BASES:
        cases.append(Case(command, name, "valid base document", dumps(doc), args, doc_keys=keys_of(doc)))
        cases += random_mutations(rng, command, name, doc, args, ROUNDS_FOR.get(command, ROUNDS))
        cases += domain_mutations(command, name, doc, args)
        if command not in PDF_COMMANDS or name == "recipe":
            cases += text_mutations(rng, command, name, doc, args)
    cases += option_cases()
    return cases


# ---- running and judging --------------------------------------------------------------------------

FIXED_FIELDS = {"(document)", "input", "-o", "--paper", "command"}
NUMBER_SUFFIXES = ("_ml", "_min", "_mol_per_l", "_nm", "_g", "_h", "_c", "_ml_min")
MAY_BE_NULL = {"dry_after_injection", "dry_at", "dry_at_min", "suggested_bottle_ml",
               "flash_point_c", "volume_ml", "mass_g", "ph", "expires_at", "prepared_at",
               "waste_capacity_ml", "actual_mass_g", "actual_volume_ml", "actual_mol_per_l",
               "deviation_fraction", "final_volume_ml", "shelf_life_h"}
NOT_NEGATIVE = {"mass_g", "volume_ml", "mol_per_l", "required_ml", "usable_ml", "waste_ml",
                "total_min", "pumped_ml", "prime_ml", "min_bottle_ml", "ionic_strength_mol_per_l",
                "buffer_capacity_mol_per_l", "mixed_volume_ml", "injection_min", "standby_min",
                "pressure_bar", "max_pressure_bar", "column_pressure_bar", "viscosity_mpa_s",
                "flow_ml_min", "plates_estimate", "column_volume_ml"}
TOP_LEVEL = {  # result fields that must be finite numbers (or true JSON values) when status is 0
    "solve": ["ph", "ionic_strength_mol_per_l", "buffer_capacity_mol_per_l", "temperature_c"],
    "recipe": ["ph", "ionic_strength_mol_per_l", "buffer_capacity_mol_per_l", "volume_ml", "target_ph"],
    "line": ["volume_ml", "uv_cutoff_nm", "mixed_volume_ml", "contraction_ml"],
    "sequence": [],
    "pressure": ["max_pressure_bar", "max_at_t_min", "plates_estimate"],
    "transfer": ["saving_fraction", "l_over_dp_change", "flow_ml_min"],
    "eluent": ["organic_fraction_v", "ph_s_s", "ph_s_w", "delta", "ionic_strength_mol_per_l",
               "buffer_capacity_mol_per_l"],
    "reagents": [],
    "sheet": ["pages"],
    "labels": ["pages", "labels"],
}
BAD_TEXT = re.compile(r"(?<![A-Za-z])(-?nan|-?inf|infinity)(?![A-Za-z])", re.IGNORECASE)


def reject_constant(name):
    raise ValueError("non-JSON number " + name)


def is_number(v):
    return isinstance(v, (int, float)) and not isinstance(v, bool) and math.isfinite(v)


def input_strings(case):
    """Every string (keys too) in the case's document, when it is JSON at all."""
    try:
        doc = json.loads(case.data.decode("utf-8"))
    except (ValueError, UnicodeDecodeError, RecursionError):
        return set()
    out, todo = set(), [doc]
    while todo:
        x = todo.pop()
        if isinstance(x, dict):
            out.update(x.keys())
            todo += x.values()
        elif isinstance(x, list):
            todo += x
        elif isinstance(x, str):
            out.add(x)
    return out


def judge_output(case, out):
    """Problems with a status-0 document, as a list of strings."""
    problems = []
    try:
        doc = json.loads(out.decode("utf-8"), parse_constant=reject_constant)
    except (ValueError, UnicodeDecodeError) as e:
        return ["stdout is not strict JSON: %s" % e]
    if not isinstance(doc, dict):
        return ["stdout is not a JSON object"]
    for key in TOP_LEVEL.get(case.command, []):
        if not is_number(doc.get(key)):
            problems.append("%s is %r, not a finite number" % (key, doc.get(key)))

    def walk(x, where):
        if isinstance(x, dict):
            for k, v in x.items():
                at = where + "." + k if where else k
                if k.endswith(NUMBER_SUFFIXES) and not (k in MAY_BE_NULL and v is None):
                    if not (is_number(v) or isinstance(v, (str, dict, list, bool))):
                        problems.append("%s is %r" % (at, v))
                if k in NOT_NEGATIVE and is_number(v) and v < 0:
                    problems.append("%s is negative (%r)" % (at, v))
                if k == "ph" and is_number(v) and not -3 <= v <= 17:
                    problems.append("%s = %r is outside the solver's bracket" % (at, v))
                if k in ("start", "end", "dry_at", "standby_end", "first_use", "last_use") and v == "":
                    problems.append("%s is an empty clock time" % at)
                walk(v, at)
        elif isinstance(x, list):
            for i, v in enumerate(x):
                walk(v, "%s[%d]" % (where, i))
        elif isinstance(x, str):
            for echoed in echoes:  # the input's own text ("name": "NaN") may come back
                x = x.replace(echoed, "")
            if BAD_TEXT.search(x):
                problems.append("%s says %r" % (where, x[:120]))
    echoes = sorted((t for t in input_strings(case) if BAD_TEXT.search(t)), key=len, reverse=True)
    walk(doc, "")
    if case.command == "sequence":
        for plan in doc.get("plans", [doc]):
            for key in ("total_min", "waste_ml", "pumped_ml", "prime_ml"):
                if not is_number(plan.get(key)):
                    problems.append("%s is %r" % (key, plan.get(key)))
            for letter, line in plan.get("lines", {}).items():
                for key in ("required_ml", "usable_ml", "min_bottle_ml", "spare_ml"):
                    if not is_number(line.get(key)):
                        problems.append("lines.%s.%s is %r" % (letter, key, line.get(key)))
                if line.get("runs_dry") and not (isinstance(line.get("dry_at"), str) and line["dry_at"]):
                    problems.append("lines.%s runs dry without dry_at" % letter)
    if case.command in ("pressure", "transfer", "sequence"):
        # Every pressure is a positive finite number, and the peak is the trace's largest.
        traces = [doc] if case.command == "pressure" else [doc.get("pressure") or {}]
        if case.command == "sequence":
            traces = [m.get("pressure") or {} for plan in doc.get("plans", [doc])
                      for m in plan.get("methods", {}).values()]
        for t in traces:
            points = [p.get("pressure_bar") for p in t.get("trace", [])]
            if any(not is_number(v) or v <= 0 for v in points):
                problems.append("a pressure that is not positive: %r" % [v for v in points if not is_number(v) or v <= 0][:3])
            elif points and abs(max(points) - t.get("max_pressure_bar", -1)) > 1e-9 * max(points):
                problems.append("max_pressure_bar %r is not the trace's peak %r" % (t.get("max_pressure_bar"), max(points)))
    if case.command == "solve" and isinstance(doc.get("species"), list):
        # At the solved pH the charge balance holds and I = 1/2 sum(c z^2) (concentrations).
        species = [x for x in doc["species"] if is_number(x.get("mol_per_l")) and is_number(x.get("charge"))]
        net = sum(x["charge"] * x["mol_per_l"] for x in species)
        scale = sum(abs(x["charge"]) * x["mol_per_l"] for x in species)
        if scale > 0 and abs(net) > 1e-7 * scale + 1e-15:
            problems.append("charge balance off: net %.3g mol/L of %.3g" % (net, scale))
        ionic = 0.5 * sum(x["charge"] ** 2 * x["mol_per_l"] for x in species)
        i_out = doc.get("ionic_strength_mol_per_l")
        if is_number(i_out) and abs(ionic - i_out) > 1e-6 * max(ionic, 1e-12):
            problems.append("ionic strength %r is not 1/2 sum(c z^2) = %r" % (i_out, ionic))
    if case.command == "sequence":
        for plan in doc.get("plans", [doc]):
            lines = plan.get("lines", {}).values()
            pumped = [ln.get("pumped_ml") for ln in lines]
            if all(is_number(v) for v in pumped) and is_number(plan.get("pumped_ml")):
                # Every gradient row and the standby add to 100 %: the lines share the flow.
                if abs(sum(pumped) - plan["pumped_ml"]) > 1e-6 * max(1.0, plan["pumped_ml"]):
                    problems.append("lines pump %r mL in all, the plan %r" % (sum(pumped), plan["pumped_ml"]))
            if all(is_number(plan.get(k)) for k in ("waste_ml", "pumped_ml", "prime_ml")):
                if abs(plan["waste_ml"] - plan["pumped_ml"] - plan["prime_ml"]) > 1e-6 * max(1.0, plan["waste_ml"]):
                    problems.append("waste %r is not pumped + priming" % plan["waste_ml"])
    if case.command == "recipe":
        for i, it in enumerate(doc.get("items", [])):
            if not (is_number(it.get("mass_g")) or is_number(it.get("volume_ml"))):
                problems.append("items[%d] has neither mass_g nor volume_ml" % i)
        if not doc.get("items"):
            problems.append("a recipe without items")
    return problems


def field_ok(field, case):
    if field in FIXED_FIELDS:
        return True
    first = re.split(r"[.\[]", field, maxsplit=1)[0]
    return first in case.doc_keys or (case.command != "reagents" and first in (
        "components", "target_ph", "route", "lines", "methods", "sequence", "start", "batch",
        "parts", "volume_ml", "plans", "bottle_ml", "concentration_mol_per_l", "temperature_c",
        "acid", "base", "weigh", "titrant", "titrant_mol_per_l", "titrant_form",
        "concentration_basis", "composition"))


def run(index, case):
    args = [CLI, case.command, "-"]
    pdf = None
    extra = list(case.args)
    if case.command in PDF_COMMANDS and "-o" not in extra:
        if "--no-output" in extra:
            extra.remove("--no-output")
        else:
            pdf = os.path.join(PDF_DIR, "case-%d.pdf" % index)
            extra += ["-o", pdf]
    args += extra
    started = time.monotonic()
    try:
        env = dict(ENV)
        for k, v in case.env.items():
            if v is None:
                env.pop(k, None)
            else:
                env[k] = v
        p = subprocess.run(args, input=case.data, capture_output=True, timeout=TIMEOUT_S, env=env)
    except subprocess.TimeoutExpired:
        return ["timed out after %d s" % TIMEOUT_S], time.monotonic() - started
    elapsed = time.monotonic() - started
    problems = []
    rc = p.returncode
    if rc not in (0, 2):
        problems.append("exit status %d%s" % (rc, " (signal %d)" % -rc if rc < 0 else ""))
    if rc == 2:
        if p.stdout:
            problems.append("status 2 with %d bytes on stdout" % len(p.stdout))
        err = p.stderr.decode("utf-8", "replace")
        lines = err.splitlines()
        if len(lines) != 1 or not err.endswith("\n"):
            problems.append("stderr has %d lines: %r" % (len(lines), err[:300]))
        m = re.match(r"phaseplan-cli: (.+?): \S", lines[0] if lines else "")
        if not m:
            problems.append("stderr does not read 'phaseplan-cli: <field>: <message>': %r" % err[:300])
        elif not field_ok(m.group(1), case):
            problems.append("stderr names %r, not a field of the document" % m.group(1))
        elif m.group(1).startswith("internal error"):
            problems.append("internal error: %r" % err[:300])
        if pdf and os.path.exists(pdf):
            problems.append("status 2 left %s behind" % pdf)
    if rc == 0:
        if case.must_fail:
            problems.append("accepted: this input must be refused with status 2")
        problems += judge_output(case, p.stdout)
        if p.stderr:
            problems.append("status 0 with stderr %r" % p.stderr.decode("utf-8", "replace")[:200])
        if pdf:
            if not os.path.exists(pdf):
                problems.append("status 0 but no PDF at %s" % pdf)
            else:
                with open(pdf, "rb") as f:
                    if f.read(5) != b"%PDF-":
                        problems.append("%s is not a PDF" % pdf)
    if pdf and os.path.exists(pdf):
        os.remove(pdf)
    return problems, elapsed


def main():
    if not os.access(CLI, os.X_OK):
        print("no CLI at %s" % CLI)
        return 1
    cases = all_cases()
    started = time.monotonic()
    with concurrent.futures.ThreadPoolExecutor(max_workers=3) as pool:
        results = list(pool.map(lambda ic: run(*ic), enumerate(cases)))
    elapsed = time.monotonic() - started
    failed = 0
    slowest = max(range(len(cases)), key=lambda i: results[i][1])
    for i, (case, (problems, _)) in enumerate(zip(cases, results)):
        if not problems:
            continue
        failed += 1
        path = os.path.join(OUT_DIR, "failure-%d.json" % failed)
        with open(path, "wb") as f:
            f.write(case.data)
        shown = case.data.decode("utf-8", "backslashreplace")
        if len(shown) > 1500:
            shown = shown[:1500] + "... (%d bytes in all)" % len(case.data)
        print("FAIL %s %s [%s]: %s" % (case.command, case.base, case.what[:160], "; ".join(problems)))
        print("  reproduce: %s %s %s < %s" % (CLI, case.command, " ".join(["-"] + case.args), path))
        print("  input: %s" % shown)
    leftovers = [f for f in os.listdir(PDF_DIR)]
    if leftovers:
        failed += 1
        print("FAIL files left in %s: %s" % (PDF_DIR, ", ".join(leftovers[:10])))
    else:
        os.rmdir(PDF_DIR)
    shutil.rmtree(XDG, ignore_errors=True)
    print("seed %d, %d runs in %.1f s (slowest %.2f s: %s %s [%s])" % (
        SEED, len(cases), elapsed, results[slowest][1], cases[slowest].command, cases[slowest].base,
        cases[slowest].what[:160]))
    print("%d passed, %d failed" % (len(cases) - failed, failed))
    return 1 if failed else 0


if __name__ == "__main__":
    sys.exit(main())

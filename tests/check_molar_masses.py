#!/usr/bin/python3
"""Every reagent's molar mass, as the program computes it, against python3-periodictable.

Run as: python3 check_molar_masses.py <cli-path> <source-dir> <build-dir>.
Runs `<cli> reagents --data <source-dir>/data`, which lists {"reagents": [{"id", "formula",
"molar_mass_g_per_mol", ...}]}, and recomputes each mass with periodictable
(`periodictable.formula(...).mass`), an independent formula parser and atomic-weight table.

Tolerance 0.02 g/mol: periodictable 1.6 carries older IUPAC atomic weights (H 1.00794, C 12.0107,
O 15.9994, Cl 35.453, B 10.811, Li 6.941, S 32.065), while the program uses the IUPAC 2021
conventional values (H 1.008, C 12.011, O 15.999, Cl 35.45, B 10.81, ...); for the largest
formulas here (borax decahydrate, disodium hydrogen phosphate dodecahydrate) the tables differ
by about 0.01 g/mol. Exit status 1 with one line per mismatch or missing reagent.
"""
import json
import re
import subprocess
import sys

import periodictable

TOLERANCE_G_PER_MOL = 0.02

REQUIRED_IDS = """potassium-dihydrogen-phosphate dipotassium-hydrogen-phosphate sodium-dihydrogen-phosphate
sodium-dihydrogen-phosphate-monohydrate sodium-dihydrogen-phosphate-dihydrate disodium-hydrogen-phosphate
disodium-hydrogen-phosphate-dihydrate disodium-hydrogen-phosphate-heptahydrate
disodium-hydrogen-phosphate-dodecahydrate phosphoric-acid acetic-acid sodium-acetate sodium-acetate-trihydrate
ammonium-acetate formic-acid ammonium-formate sodium-formate citric-acid citric-acid-monohydrate trisodium-citrate
trisodium-citrate-dihydrate potassium-dihydrogen-citrate potassium-hydrogen-phthalate sodium-tetraborate
sodium-tetraborate-decahydrate boric-acid sodium-bicarbonate sodium-carbonate ammonium-bicarbonate tris
tris-hydrochloride glycine hydrochloric-acid sodium-hydroxide potassium-hydroxide ammonia sodium-chloride
potassium-chloride trifluoroacetic-acid triethylamine""".split()


def to_periodictable(formula):
    """The program's notation -> periodictable's: hydrate dots ("·", "•", "⋅", ".", "*") become
    "+", which periodictable reads as an adduct with a leading multiplier ("CuSO4+5H2O"); square
    brackets become parentheses. As in the program, subscripts are integers, so a "." is a
    decimal point only inside a part's leading multiplier ("CaSO4.0.5H2O")."""
    out = []
    i, part_start = 0, True
    f = formula.replace(" ", "")
    while i < len(f):
        if part_start:
            m = re.match(r"\d+(\.\d+)?", f[i:])
            if m:
                out.append(m.group(0))
                i += len(m.group(0))
            part_start = False
            continue
        c = f[i]
        if c in "\u00b7\u2022\u22c5*.":
            out.append("+")
            part_start = True
        else:
            out.append({"[": "(", "]": ")"}.get(c, c))
        i += 1
    return "".join(out)


def main():
    if len(sys.argv) < 3:
        print("usage: check_molar_masses.py <cli> <source-dir> [<build-dir>]")
        return 2
    cli, source_dir = sys.argv[1], sys.argv[2]
    try:
        run = subprocess.run([cli, "reagents", "--data", source_dir + "/data"], capture_output=True,
                             text=True, timeout=120)
    except OSError as e:
        print(f"FAIL cannot run {cli}: {e}")
        return 1
    if run.returncode != 0:
        print(f"FAIL `{cli} reagents` exited with {run.returncode}: {run.stderr.strip()}")
        return 1
    try:
        listed = json.loads(run.stdout)["reagents"]
    except (ValueError, KeyError, TypeError) as e:
        print(f"FAIL `{cli} reagents` printed no {{\"reagents\": [...]}} document: {e}")
        return 1

    problems = []
    seen = set()
    worst = 0.0
    for r in listed:
        rid, formula, mass = r.get("id"), r.get("formula"), r.get("molar_mass_g_per_mol")
        seen.add(rid)
        if not isinstance(mass, (int, float)):
            problems.append(f"{rid}: molar_mass_g_per_mol {mass!r} is not a number")
            continue
        try:
            expected = periodictable.formula(to_periodictable(formula)).mass
        except Exception as e:  # periodictable raises ValueError or pyparsing errors
            problems.append(f"{rid}: periodictable cannot read {formula!r} "
                            f"(as {to_periodictable(formula)!r}): {e}")
            continue
        diff = mass - expected
        worst = max(worst, abs(diff))
        if abs(diff) > TOLERANCE_G_PER_MOL:
            problems.append(f"{rid}: {formula} is {mass:.4f} g/mol by the program, "
                            f"{expected:.4f} by periodictable (difference {diff:+.4f})")
    for rid in REQUIRED_IDS:
        if rid not in seen:
            problems.append(f"{rid}: required reagent missing from `reagents`")

    for p in problems:
        print("FAIL", p)
    print(f"{len(listed)} reagents compared with periodictable {periodictable.__version__}, "
          f"largest difference {worst:.4f} g/mol (tolerance {TOLERANCE_G_PER_MOL}), "
          f"{len(problems)} problem(s)")
    return 1 if problems else 0


if __name__ == "__main__":
    sys.exit(main())

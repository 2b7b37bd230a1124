#!/bin/sh
# phaseplan-cli under a decimal-comma locale (de_DE.UTF-8) prints exactly what it prints under the
# C locale: JSON numbers, the text of steps, cautions and warnings ("2.50", never "2,50"), error
# lines, and the text of the PDF sheets and labels.
#
# Why: Qt's QCoreApplication calls setlocale(LC_ALL, ""), so printf-style %f/%g (and
# std::to_string(double)) write "2,50" once the user's locale has a decimal comma. The chemistry
# core formats with chem::format_number / chem::format_fixed (std::to_chars) instead.
#
# Usage: check_cli_locale.sh <phaseplan-cli> <source-dir> <build-dir>
# The de_DE.UTF-8 locale comes from .ci/install-deps.sh (package "locales", locale-gen).
set -u
cli=$1
src=$2
build=$3
work=$(mktemp -d "$build/cli-locale.XXXXXX")
trap 'rm -rf "$work"' EXIT
export QT_QPA_PLATFORM=offscreen
comma_locale=de_DE.UTF-8
c_locale=C.UTF-8
passed=0
failed=0

# The comparison can only fail if the locale exists and really writes a decimal comma.
if ! locale -a 2>/dev/null | grep -qix 'de_DE\.utf-\?8'; then
  echo "FAIL: the $comma_locale locale is not generated (run .ci/install-deps.sh as root)"
  exit 1
fi
probe=$(LC_ALL=$comma_locale /usr/bin/printf '%.2f' 2.5)
if [ "$probe" != "2,50" ]; then
  echo "FAIL: printf under $comma_locale writes 2.5 as \"$probe\", not \"2,50\": the test would prove nothing"
  exit 1
fi

# ---- inputs: the demos, and documents whose outputs are full of decimals -----------------------
cat > "$work/solve-phosphate.json" <<'EOF'
{"temperature_c": 25, "components": [{"reagent": "potassium-dihydrogen-phosphate", "mol_per_l": 0.025},
 {"reagent": "disodium-hydrogen-phosphate", "mol_per_l": 0.025}]}
EOF
cat > "$work/solve-mixture.json" <<'EOF'
{"temperature_c": 37.5, "components": [{"reagent": "acetic-acid", "mol_per_l": 0.01},
 {"reagent": "sodium-acetate", "mol_per_l": 0.012}, {"reagent": "tris", "mol_per_l": 0.005},
 {"reagent": "sodium-chloride", "mol_per_l": 0.25}]}
EOF
cat > "$work/recipe-titrate.json" <<'EOF'
{"target_ph": 8.15, "temperature_c": 22.5, "volume_ml": 750, "route": "titrate", "weigh": "tris",
 "titrant": "hydrochloric-acid", "titrant_mol_per_l": 1.0, "concentration_mol_per_l": 0.05}
EOF
cat > "$work/recipe-stocks.json" <<'EOF'
{"target_ph": 6.85, "volume_ml": 250, "route": "stocks", "acid": "potassium-dihydrogen-phosphate",
 "base": "dipotassium-hydrogen-phosphate", "acid_stock_mol_per_l": 0.5, "base_stock_mol_per_l": 0.25,
 "concentration_mol_per_l": 0.05}
EOF
cat > "$work/recipe-ionic.json" <<'EOF'
{"target_ph": 4.75, "volume_ml": 500, "route": "mix", "acid": "acetic-acid", "base": "sodium-acetate",
 "ionic_strength_mol_per_l": 0.05, "purity_percent": {"sodium-acetate": 99.5}}
EOF
cat > "$work/recipe-small.json" <<'EOF'
{"target_ph": 3.75, "volume_ml": 10, "route": "mix", "acid": "formic-acid", "base": "ammonium-formate",
 "concentration_mol_per_l": 0.0005}
EOF
cat > "$work/line-additives.json" <<'EOF'
{"name": "0.1 % formic acid in water/methanol 95:5", "volume_ml": 1000,
 "parts": [{"solvent": "water", "fraction_v": 0.95}, {"solvent": "methanol", "fraction_v": 0.05}],
 "additives": [{"additive": "formic-acid", "percent_v": 0.1}, {"additive": "ammonium-formate", "mmol_per_l": 2.5}],
 "detector": {"type": "uv", "wavelength_nm": 205.5}, "column": {"ph_min": 2.5, "ph_max": 7.5}}
EOF
# Bad input: the error line names numbers too.
echo '{"components": [{"reagent": "tris", "mol_per_l": -0.25}]}' > "$work/bad-negative.json"
echo '{"temperature_c": 80.5, "components": [{"reagent": "tris", "mol_per_l": 0.01}]}' > "$work/bad-temperature.json"
echo '{"target_ph": 9.25, "route": "mix", "acid": "acetic-acid", "base": "sodium-acetate", "concentration_mol_per_l": 0.02}' > "$work/bad-unreachable.json"
/usr/bin/python3 - "$src" "$work" <<'EOF'
import json, sys
src, work = sys.argv[1], sys.argv[2]
seq = json.load(open(src + "/tests/data/sequence_bad_input.json"))["base"]
seq["methods"]["m"]["gradient"][0]["A"] = 94.5
json.dump(seq, open(work + "/bad-gradient.json", "w"))
batch = json.load(open(src + "/data/demo/batch-line-a-buffer.json"))
json.dump(batch, open(work + "/batch.json", "w"))
# Amounts out of tolerance: the sheet's checks quote measured, target and range with decimals.
for a in batch["batch"]["actual"]:
    for k in ("mass_g", "volume_ml"):
        if k in a:
            a[k] = round(a[k] * 1.237, 3)
# Out of tolerance prints only with a deviation note.
batch["batch"]["deviation"] = {"note": "Trial batch, 23.7 % over", "by": "R. Okafor", "at": "2026-12-01T17:00:00"}
json.dump(batch, open(work + "/batch-off.json", "w"))
for name in ("line-phosphate-acetonitrile", "overnight-sequence"):
    doc = json.load(open(src + "/data/demo/" + name + ".json"))
    doc["batch"] = {"id": "HR-LOCALE-1", "prepared_by": "R. Okafor", "prepared_at": "2026-12-01T14:45:00"}
    json.dump(doc, open(work + "/" + name + "-batch.json", "w"))
EOF

# ---- one comparison ------------------------------------------------------------------------------
# compare NAME COMMAND INPUT [ARGS...]: runs under both locales; status, stdout and stderr must be
# identical, and the decimal-comma run must not write a decimal comma inside a text.
compare() {
  name=$1
  shift
  for loc in c de; do
    if [ $loc = c ]; then l=$c_locale; else l=$comma_locale; fi
    LC_ALL=$l LANG=$l "$cli" "$@" > "$work/$name.$loc.out" 2> "$work/$name.$loc.err"
    echo $? > "$work/$name.$loc.rc"
  done
  ok=1
  for part in rc out err; do
    if ! cmp -s "$work/$name.c.$part" "$work/$name.de.$part"; then
      ok=0
      echo "FAIL $name: $part differs between $c_locale and $comma_locale:"
      diff "$work/$name.c.$part" "$work/$name.de.$part" | head -20
    fi
  done
  if grep -nE '[0-9],[0-9]' "$work/$name.de.out" "$work/$name.de.err" > "$work/$name.commas"; then
    ok=0
    echo "FAIL $name: a decimal comma under $comma_locale:"
    head -5 "$work/$name.commas"
  fi
  if [ ! -s "$work/$name.c.out" ] && [ ! -s "$work/$name.c.err" ]; then
    ok=0
    echo "FAIL $name: no output at all"
  fi
  if [ $ok = 1 ]; then passed=$((passed + 1)); else failed=$((failed + 1)); fi
}

# compare_pdf NAME COMMAND INPUT [ARGS...]: as compare, and the PDF's text must be identical too
# (the "Printed <date time>" stamp masked: the two runs may fall in different minutes).
compare_pdf() {
  name=$1
  shift
  compare "$name" "$@" -o "$work/$name.pdf"
  LC_ALL=$c_locale "$cli" "$@" -o "$work/$name.c.pdf" > /dev/null 2>&1
  LC_ALL=$comma_locale LANG=$comma_locale "$cli" "$@" -o "$work/$name.de.pdf" > /dev/null 2>&1
  for loc in c de; do
    if [ ! -s "$work/$name.$loc.pdf" ]; then
      echo "FAIL $name: no PDF written under $loc"
      failed=$((failed + 1))
      return
    fi
    LC_ALL=$c_locale pdftotext -layout "$work/$name.$loc.pdf" - |
      sed 's/Printed [0-9][0-9-]* [0-9][0-9:]*/Printed <time>/' > "$work/$name.$loc.txt"
  done
  if cmp -s "$work/$name.c.txt" "$work/$name.de.txt" && ! grep -qE '[0-9],[0-9]' "$work/$name.de.txt"; then
    passed=$((passed + 1))
  else
    echo "FAIL $name: the PDF text differs between $c_locale and $comma_locale (or has a decimal comma):"
    diff "$work/$name.c.txt" "$work/$name.de.txt" | head -20
    failed=$((failed + 1))
  fi
}

compare solve-phosphate solve "$work/solve-phosphate.json"
compare solve-mixture solve "$work/solve-mixture.json"
compare recipe-demo recipe "$src/data/demo/buffer-phosphate-ph2.5.json"
compare recipe-titrate recipe "$work/recipe-titrate.json"
compare recipe-stocks recipe "$work/recipe-stocks.json"
compare recipe-ionic recipe "$work/recipe-ionic.json"
compare recipe-small recipe "$work/recipe-small.json"
compare reagents reagents
compare line-demo line "$src/data/demo/line-phosphate-acetonitrile.json"
compare line-additives line "$work/line-additives.json"
compare sequence-demo sequence "$src/data/demo/overnight-sequence.json"
compare bad-negative solve "$work/bad-negative.json"
compare bad-temperature solve "$work/bad-temperature.json"
compare bad-unreachable recipe "$work/bad-unreachable.json"
compare bad-gradient sequence "$work/bad-gradient.json"
if "$cli" --help | grep -q '^  sheet'; then
  compare_pdf sheet-batch sheet "$work/batch.json"
  compare_pdf sheet-batch-off sheet "$work/batch-off.json"
  compare_pdf labels-batch labels "$work/batch.json" --paper label62
  compare_pdf sheet-line sheet "$work/line-phosphate-acetonitrile-batch.json"
  compare_pdf labels-line labels "$work/line-phosphate-acetonitrile-batch.json"
  compare_pdf sheet-sequence sheet "$work/overnight-sequence-batch.json" --paper letter
fi

echo "$passed passed, $failed failed"
[ $failed = 0 ]

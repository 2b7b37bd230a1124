#!/usr/bin/python3
"""Self-consistency of data/reagents.json.

Run as: python3 check_reagent_data.py <cli-path> <source-dir> <build-dir> (only <source-dir> is used).

Checks, each against the rule it comes from:
- every reagent is electroneutral: sum(spectator charge * count)
  + sum(count * charge_fully_protonated - protons_removed) == 0, except a strong acid or base
  (no system, spectators of one sign only: HCl, NaOH), whose H+ or OH- balances;
- every system a reagent names exists, and protons_removed lies between 0 and count * steps;
- species charges written in the names ("HPO4-2") equal charge_fully_protonated - index, and a
  system has one more species than steps;
- successive pKa values of one system increase (each proton is harder to remove than the last;
  true of every polyprotic acid listed in Goldberg et al., J. Phys. Chem. Ref. Data 31 (2002) 231);
- every step has a pKa, exactly one of enthalpy_kj_per_mol / dpka_per_k, an optional
  heat_capacity_j_per_mol_k (ΔrCp°) in a plausible range, and a source;
- GHS codes have the shapes of Regulation (EC) No 1272/2008 (H2xx/H3xx/H4xx, EUHxxx, GHS01..GHS09),
  and each pictogram is backed by a hazard statement of its class and vice versa (CLP Annex I and V,
  with the precedence rules of Article 26: no GHS07 beside GHS06; no GHS07 for skin or eye irritation
  beside GHS05) (from memory);
- liquids carry a density and a sourced assay; the required reagent ids are all present;
- data/solvents.json's solubility form tables (a "form" with its "system" and "protons_removed")
  name a system of this file, a species it has (1 <= protons_removed <= steps), and every additive
  of the group releases that system (else the eluent's speciation cannot split the group); a
  form table starts at fraction_v 0 (the salt's water solubility), and its source says which
  figures are recalled ("(from memory)") and which are lore ("common practice, no source") unless
  the basis is "published".
Exit status 1 with one line per problem.
"""
import json
import re
import sys

REQUIRED_IDS = """potassium-dihydrogen-phosphate dipotassium-hydrogen-phosphate sodium-dihydrogen-phosphate
sodium-dihydrogen-phosphate-monohydrate sodium-dihydrogen-phosphate-dihydrate disodium-hydrogen-phosphate
disodium-hydrogen-phosphate-dihydrate disodium-hydrogen-phosphate-heptahydrate
disodium-hydrogen-phosphate-dodecahydrate phosphoric-acid acetic-acid sodium-acetate sodium-acetate-trihydrate
ammonium-acetate formic-acid ammonium-formate sodium-formate citric-acid citric-acid-monohydrate trisodium-citrate
trisodium-citrate-dihydrate potassium-dihydrogen-citrate potassium-hydrogen-phthalate sodium-tetraborate
sodium-tetraborate-decahydrate boric-acid sodium-bicarbonate sodium-carbonate ammonium-bicarbonate tris
tris-hydrochloride glycine hydrochloric-acid sodium-hydroxide potassium-hydroxide ammonia sodium-chloride
potassium-chloride trifluoroacetic-acid triethylamine
mes hepes mops bis-tris ammonium-dihydrogen-phosphate diammonium-hydrogen-phosphate perchloric-acid sodium-perchlorate sulfuric-acid methanesulfonic-acid
difluoroacetic-acid heptafluorobutyric-acid hexafluoro-2-propanol diisopropylethylamine diethylamine ammonium-fluoride sodium-hexanesulfonate sodium-octanesulfonate tetrabutylammonium-hydrogen-sulfate""".split()

REQUIRED_SYSTEMS = """phosphate acetate formate citrate phthalate borate carbonate ammonium tris glycine
trifluoroacetate triethylammonium""".split()

HAZARD_RE = re.compile(r"^(H[234]\d\d[A-Za-z]{0,2}|EUH\d{3}[A-Z]?)$")
PICTOGRAM_RE = re.compile(r"^GHS0[1-9]$")


def charge_of_name(name):
    """Charge written last in a species or ion name: "HPO4-2" -> -2, "NH4+" -> 1, "HGly" -> 0."""
    m = re.search(r"([+-])(\d*)$", name)
    if not m:
        return 0
    n = int(m.group(2)) if m.group(2) else 1
    return n if m.group(1) == "+" else -n


def pictograms_implied(hazards):
    """Pictograms the hazard statements call for, after the CLP precedence rules (from memory)."""
    codes = {h[:4] for h in hazards if h.startswith("H")}  # "H360FD" -> "H360"
    need = set()
    if codes & {"H200", "H201", "H202", "H203", "H204", "H240", "H241"}:
        need.add("GHS01")
    if codes & {"H220", "H221", "H222", "H223", "H224", "H225", "H226", "H228", "H241", "H242",
                "H250", "H251", "H252", "H260", "H261"}:
        need.add("GHS02")
    if codes & {"H270", "H271", "H272"}:
        need.add("GHS03")
    if codes & {"H280", "H281"}:
        need.add("GHS04")
    if codes & {"H290", "H314", "H318"}:
        need.add("GHS05")
    if codes & {"H300", "H301", "H310", "H311", "H330", "H331"}:
        need.add("GHS06")
    if codes & {"H304", "H334", "H340", "H341", "H350", "H351", "H360", "H361", "H370", "H371",
                "H372", "H373"}:
        need.add("GHS08")
    if codes & {"H400", "H410", "H411"}:
        need.add("GHS09")
    harmful = codes & {"H302", "H312", "H332", "H317", "H335", "H336"}
    irritant = codes & {"H315", "H319"}
    if "GHS06" not in need and (harmful or (irritant and "GHS05" not in need)):
        need.add("GHS07")
    return need


def main():
    if len(sys.argv) < 3:
        print("usage: check_reagent_data.py <cli> <source-dir> [<build-dir>]")
        return 2
    path = sys.argv[2] + "/data/reagents.json"
    with open(path, encoding="utf-8") as f:
        doc = json.load(f)
    problems = []

    def bad(where, what):
        problems.append(f"{where}: {what}")

    if doc.get("format") != "phaseplan-reagents" or doc.get("version") != 1:
        bad("format/version", "expected \"phaseplan-reagents\" version 1")
    if not doc.get("atomic_weights_source"):
        bad("atomic_weights_source", "missing")

    systems = {}
    for i, s in enumerate(doc.get("systems", [])):
        at = f"systems[{i}] ({s.get('id')})"
        if s.get("id") in systems:
            bad(at, "duplicate id")
        systems[s.get("id")] = s
        steps = s.get("steps", [])
        species = s.get("species", [])
        if not steps:
            bad(at, "no steps")
        if len(species) != len(steps) + 1:
            bad(at, f"{len(species)} species for {len(steps)} steps (need steps + 1)")
        q0 = s.get("charge_fully_protonated")
        if not isinstance(q0, int):
            bad(at, "charge_fully_protonated must be an integer")
            q0 = 0
        for k, name in enumerate(species):
            if charge_of_name(name) != q0 - k:
                bad(at, f"species {name!r} has charge {charge_of_name(name)} by its name, "
                        f"but {q0 - k} by charge_fully_protonated - {k}")
        last = None
        for k, st in enumerate(steps):
            sat = f"{at}.steps[{k}]"
            pka = st.get("pka_25c")
            # (-4: sulfuric acid's first, fully dissociated step is conventionally about -3.)
            if not isinstance(pka, (int, float)) or not -4 < pka < 16:
                bad(sat, f"pka_25c {pka!r} is not a number in (-4, 16)")
                continue
            if last is not None and pka <= last:
                bad(sat, f"pKa {pka} does not exceed the previous step's {last}")
            last = pka
            has_h = "enthalpy_kj_per_mol" in st
            has_d = "dpka_per_k" in st
            if has_h == has_d:
                bad(sat, "needs exactly one of enthalpy_kj_per_mol and dpka_per_k")
            if has_h and not -100 < st["enthalpy_kj_per_mol"] < 100:
                bad(sat, f"enthalpy_kj_per_mol {st['enthalpy_kj_per_mol']} outside (-100, 100)")
            if has_d and not -0.1 <= st["dpka_per_k"] <= 0.1:
                bad(sat, f"dpka_per_k {st['dpka_per_k']} outside [-0.1, 0.1]")
            cp = st.get("heat_capacity_j_per_mol_k")
            if cp is not None and (not isinstance(cp, (int, float)) or not -600 < cp < 600):
                bad(sat, f"heat_capacity_j_per_mol_k {cp!r} outside (-600, 600)")
            src = st.get("source", "")
            if not src.strip():
                bad(sat, "no source")
            elif "(from memory)" not in src and "no source" not in src:
                bad(sat, "source says neither \"(from memory)\" nor \"no source\"")
    for sid in REQUIRED_SYSTEMS:
        if sid not in systems:
            bad("systems", f"required system {sid!r} is missing")

    ids = set()
    for i, r in enumerate(doc.get("reagents", [])):
        at = f"reagents[{i}] ({r.get('id')})"
        rid = r.get("id")
        if rid in ids:
            bad(at, "duplicate id")
        ids.add(rid)
        if not re.fullmatch(r"[a-z0-9]+(-[a-z0-9]+)*", rid or ""):
            bad(at, "id must be lower-case words joined by hyphens")
        if not r.get("formula"):
            bad(at, "no formula")
        if "molar_mass_g_per_mol" in r:
            bad(at, "molar mass must not be stored (the program computes it from the formula)")
        form = r.get("form")
        if form not in ("solid", "liquid"):
            bad(at, f"form {form!r} is neither solid nor liquid")
        assay = r.get("assay_percent")
        if not isinstance(assay, (int, float)) or not 0 < assay <= 100:
            bad(at, f"assay_percent {assay!r} not in (0, 100]")
        density = r.get("density_g_per_ml")
        sources = r.get("sources", [])
        if not sources or not all(isinstance(x, str) and x.strip() for x in sources):
            bad(at, "sources missing or empty")
        if form == "liquid":
            if not isinstance(density, (int, float)) or not 0.5 < density < 2.5:
                bad(at, f"liquid needs density_g_per_ml in (0.5, 2.5), has {density!r}")
            if not any("ensity" in x for x in sources):
                bad(at, "no source names the density")
            if not any("ssay" in x for x in sources):
                bad(at, "no source names the assay")
        elif density is not None:
            bad(at, "a solid carries no density_g_per_ml")

        ghs = r.get("ghs")
        if not isinstance(ghs, dict):
            bad(at, "no ghs object")
        else:
            hz = ghs.get("hazards", [])
            pg = ghs.get("pictograms", [])
            for h in hz:
                if not HAZARD_RE.match(h):
                    bad(at, f"hazard code {h!r} is not H2xx/H3xx/H4xx or EUHxxx")
            for p in pg:
                if not PICTOGRAM_RE.match(p):
                    bad(at, f"pictogram {p!r} is not GHS01..GHS09")
            if len(set(hz)) != len(hz) or len(set(pg)) != len(pg):
                bad(at, "duplicate GHS code")
            need = pictograms_implied(hz)
            if need != set(pg):
                bad(at, f"pictograms {sorted(pg)} do not match the hazard statements, "
                        f"which call for {sorted(need)}")
            if not ghs.get("source"):
                bad(at, "ghs.source missing")

        charge = 0.0
        for k, sp in enumerate(r.get("spectators", [])):
            q = sp.get("charge")
            n = sp.get("count", 1)
            if not isinstance(q, int) or q == 0:
                bad(at, f"spectators[{k}] charge {q!r} must be a non-zero integer")
                continue
            if charge_of_name(sp.get("ion", "")) != q:
                bad(at, f"spectators[{k}] ion {sp.get('ion')!r} is written with charge "
                        f"{charge_of_name(sp.get('ion', ''))}, not {q}")
            if not n > 0:
                bad(at, f"spectators[{k}] count {n} must be positive")
            charge += q * n
        for k, sh in enumerate(r.get("systems", [])):
            sys_ = systems.get(sh.get("system"))
            if sys_ is None:
                bad(at, f"systems[{k}] names unknown system {sh.get('system')!r}")
                continue
            n = sh.get("count", 1)
            removed = sh.get("protons_removed", 0)
            if not n > 0:
                bad(at, f"systems[{k}] count {n} must be positive")
            if not 0 <= removed <= n * len(sys_.get("steps", [])):
                bad(at, f"systems[{k}] protons_removed {removed} outside [0, count * steps]")
            charge += n * sys_.get("charge_fully_protonated", 0) - removed
        spect_signs = {sp.get("charge", 0) > 0 for sp in r.get("spectators", [])}
        if not r.get("systems") and len(spect_signs) == 1:
            # A strong acid (HCl: only anions, the H+ balances) or base (NaOH: only cations, the
            # OH- balances), as Library::add_reagent accepts; its formula must hold that H or OH.
            if "H" not in r.get("formula", ""):
                bad(at, f"strong acid or base (net charge {charge:+g}) without H in its formula")
        elif abs(charge) > 1e-9:
            bad(at, f"not electroneutral: formal charge {charge:+g}")
        if not r.get("spectators") and not r.get("systems"):
            bad(at, "releases neither spectator ions nor an acid-base system")

    for rid in REQUIRED_IDS:
        if rid not in ids:
            bad("reagents", f"required reagent {rid!r} is missing")

    with open(sys.argv[2] + "/data/solvents.json", encoding="utf-8") as f:
        solvents = json.load(f)
    reagent_systems = {r.get("id"): {x.get("system") for x in r.get("systems", [])}
                       for r in doc.get("reagents", [])}
    for i, t in enumerate(solvents.get("solubility", [])):
        if "form" not in t:
            continue
        at = f"solvents.json solubility[{i}] ({t.get('group')}, {t.get('form')})"
        sys_ = systems.get(t.get("system"))
        if sys_ is None:
            bad(at, f"system {t.get('system')!r} is not in reagents.json")
            continue
        removed = t.get("protons_removed")
        if not isinstance(removed, int) or not 1 <= removed <= len(sys_.get("steps", [])):
            bad(at, f"protons_removed {removed!r} is not a salt species of {t.get('system')}")
        for a in solvents.get("additives", []):
            if a.get("solubility_group") == t.get("group") and \
                    t.get("system") not in reagent_systems.get(a.get("id"), set()):
                bad(at, f"additive {a.get('id')!r} of the group does not release {t.get('system')}")
        if not t.get("points") or t["points"][0].get("fraction_v") != 0:
            bad(at, "does not start at fraction_v 0 (the water solubility)")
        src = t.get("source", "")
        if t.get("basis") != "published" and "common practice, no source" not in src:
            bad(at, "a rule of thumb without \"common practice, no source\"")
        if "from memory" not in src and "read" not in src:
            bad(at, "the water solubility's source says neither read nor \"(from memory)\"")

    for p in problems:
        print("FAIL", p)
    print(f"{len(systems)} systems, {len(ids)} reagents checked, {len(problems)} problem(s)")
    return 1 if problems else 0


if __name__ == "__main__":
    sys.exit(main())

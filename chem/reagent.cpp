#include "chem/reagent.h"
#include "chem/guard.h"
#include "chem/text.h"

#include "chem/error.h"
#include "chem/units.h"

#include <algorithm>
#include <cmath>

namespace chem {

double AcidBaseSystem::pka_at(int step, double temperature_k) const {
    const double pka25 = pka_25c.at(step);
    if (step < static_cast<int>(enthalpy_kj_per_mol.size()) && enthalpy_kj_per_mol[step]) {
        // van 't Hoff, constant ΔrH°: d(ln K)/d(1/T) = -ΔH/R, pKa = -log10 K.
        const double dh_j = *enthalpy_kj_per_mol[step] * 1000.0;
        const double dcp = step < static_cast<int>(heat_capacity_j_per_mol_k.size())
                               ? heat_capacity_j_per_mol_k[step]
                               : 0.0;
        const double t0 = reference_temperature_k, t = temperature_k;
        const double r_ln10 = gas_constant_j_per_mol_k * ln10;
        return pka25 + dh_j / r_ln10 * (1.0 / t - 1.0 / t0) -
               dcp / r_ln10 * (std::log(t / t0) + t0 / t - 1.0);
    }
    const double slope = step < static_cast<int>(dpka_per_k.size()) ? dpka_per_k[step] : 0.0;
    return pka25 + slope * (temperature_k - reference_temperature_k);
}

bool Reagent::has_system(const std::string& system_id) const {
    return share(system_id) != nullptr;
}

const SystemShare* Reagent::share(const std::string& system_id) const {
    for (const auto& s : systems)
        if (s.system == system_id)
            return &s;
    return nullptr;
}

double Reagent::formal_charge(const Library& lib) const {
    double q = 0;
    for (const auto& sp : spectators)
        q += sp.charge * sp.count;
    for (const auto& s : systems)
        q += s.count * lib.system(s.system).charge_fully_protonated - s.protons_removed;
    return q;
}

bool Reagent::is_strong_acid() const {
    if (!systems.empty() || spectators.empty())
        return false;
    return std::all_of(spectators.begin(), spectators.end(),
                       [](const SpectatorIon& s) { return s.charge < 0; });
}

bool Reagent::is_strong_base() const {
    if (!systems.empty() || spectators.empty())
        return false;
    return std::all_of(spectators.begin(), spectators.end(),
                       [](const SpectatorIon& s) { return s.charge > 0; });
}

namespace {
bool any_of_codes(const std::vector<std::string>& codes, std::initializer_list<const char*> wanted,
                  bool prefix = false) {
    for (const auto& c : codes)
        for (const char* w : wanted)
            if (prefix ? c.rfind(w, 0) == 0 : c == w)
                return true;
    return false;
}
} // namespace

bool Reagent::is_corrosive() const {
    return any_of_codes(ghs_pictograms, {"GHS05"}) ||
           any_of_codes(ghs_hazards, {"H314", "H290", "H318"});
}

bool Reagent::is_flammable() const {
    return any_of_codes(ghs_pictograms, {"GHS02"}) || any_of_codes(ghs_hazards, {"H22"}, true);
}

bool Reagent::is_toxic() const {
    return any_of_codes(ghs_pictograms, {"GHS06", "GHS08"}) ||
           any_of_codes(ghs_hazards, {"H30", "H31", "H33", "H34", "H35", "H36", "H37"}, true);
}

void Library::add_system(AcidBaseSystem system) {
    if (system.id.empty())
        throw Error("id", "a system needs an id");
    if (system.species.size() != system.pka_25c.size() + 1)
        throw Error("species", "system \"" + system.id + "\" lists " +
                                   std::to_string(system.species.size()) + " species for " +
                                   std::to_string(system.pka_25c.size()) + " pKa steps");
    for (size_t i = 1; i < system.pka_25c.size(); ++i)
        if (!(system.pka_25c[i] > system.pka_25c[i - 1]))
            throw Error("steps", "pKa values of \"" + system.id + "\" must increase step by step");
    auto it = std::find_if(systems_.begin(), systems_.end(),
                           [&](const AcidBaseSystem& s) { return s.id == system.id; });
    if (it != systems_.end())
        *it = std::move(system);
    else
        systems_.push_back(std::move(system));
}

void Library::add_reagent(Reagent reagent) {
    if (reagent.id.empty())
        throw Error("id", "a reagent needs an id");
    if (!(reagent.molar_mass_g_per_mol > 0))
        throw Error("formula", "molar mass of \"" + reagent.id + "\" must be positive");
    if (!(reagent.assay_fraction > 0 && reagent.assay_fraction <= 1))
        throw Error("assay_percent", format_number(reagent.assay_fraction * 100) +
                                         " is outside 0 to 100 % for \"" + reagent.id + "\"");
    if (reagent.form == PhysicalForm::liquid && !(reagent.density_g_per_ml > 0))
        throw Error("density_g_per_ml", "liquid \"" + reagent.id + "\" needs a positive density");
    for (const auto& s : reagent.systems) {
        if (!find_system(s.system))
            throw Error("systems",
                        "\"" + reagent.id + "\" names unknown system \"" + s.system + "\"");
        if (!(s.count > 0))
            throw Error("systems", "count must be positive in \"" + reagent.id + "\"");
        const auto& sys = system(s.system);
        if (s.protons_removed < 0 || s.protons_removed > s.count * sys.steps())
            throw Error("systems", "\"" + reagent.id + "\": protons_removed " +
                                       format_number(s.protons_removed) + " is outside 0 to " +
                                       format_number(s.count * sys.steps()));
    }
    // A reagent with no acid-base system and a net spectator charge is a strong acid (HCl: the
    // H+ balances Cl-) or a strong base (NaOH: OH- balances Na+); any other must be neutral.
    const double q = reagent.formal_charge(*this);
    if (!reagent.systems.empty() && std::abs(q) > 1e-9)
        throw Error("spectators", "\"" + reagent.id + "\" is not electroneutral (net charge " +
                                      format_number(q) + ")");
    auto it = std::find_if(reagents_.begin(), reagents_.end(),
                           [&](const Reagent& r) { return r.id == reagent.id; });
    if (it != reagents_.end())
        *it = std::move(reagent);
    else
        reagents_.push_back(std::move(reagent));
}

void Library::add_sit_epsilon(SitEpsilon e) {
    if (e.cation.empty() || e.anion.empty())
        throw Error("sit_epsilon", "needs a cation and an anion");
    if (!std::isfinite(e.kg_per_mol) || std::abs(e.kg_per_mol) > 2)
        throw Error("sit_epsilon", format_number(e.kg_per_mol) + " kg/mol is outside -2 to 2");
    for (auto& x : sit_)
        if (x.cation == e.cation && x.anion == e.anion) {
            x = std::move(e);
            return;
        }
    sit_.push_back(std::move(e));
}

double Library::sit_epsilon(const std::string& cation, const std::string& anion) const {
    for (const auto& x : sit_)
        if (x.cation == cation && x.anion == anion)
            return x.kg_per_mol;
    return 0.0;
}

void Library::add_ion_size(IonSize s) {
    if (s.species.empty())
        throw Error("species", "needs the species' name");
    if (!std::isfinite(s.size_angstrom) || s.size_angstrom <= 0 || s.size_angstrom > 20)
        throw Error("size_angstrom",
                    format_number(s.size_angstrom) + " Å is outside 0 to 20 Å for an ion's size");
    if (!std::isfinite(s.b_kg_per_mol) || std::abs(s.b_kg_per_mol) > 2)
        throw Error("b_kg_per_mol", format_number(s.b_kg_per_mol) + " kg/mol is outside -2 to 2");
    for (auto& x : ion_sizes_)
        if (x.species == s.species) {
            x = std::move(s);
            return;
        }
    ion_sizes_.push_back(std::move(s));
}

void Library::add_complex(Complex c) {
    if (c.species.empty())
        throw Error("species", "an associated species needs its name");
    if (c.formed_from.empty() || c.formed_from.size() > 4)
        throw Error("formed_from", "an associated species needs one to four members");
    for (const auto& [member, count] : c.formed_from)
        if (member.empty() || count < 1 || count > 4)
            throw Error("formed_from", "each member needs a name and a count from 1 to 4");
    if (!std::isfinite(c.log10_k) || std::abs(c.log10_k) > 30)
        throw Error("log10_k", format_number(c.log10_k) + " is outside -30 to 30");
    for (ActivityModel m : c.models)
        if (m == ActivityModel::davies)
            throw Error("models", "the Davies model has no associated species");
    for (auto& x : complexes_)
        if (x.species == c.species) {
            x = std::move(c);
            return;
        }
    complexes_.push_back(std::move(c));
}

const IonSize* Library::ion_size(const std::string& species) const {
    for (const auto& x : ion_sizes_)
        if (x.species == species)
            return &x;
    return nullptr;
}

double EluentSolvent::delta(double f) const {
    double num = 0, den = 1, power = f;
    for (double a : delta_numerator) {
        num += a * power;
        power *= f;
    }
    power = f;
    for (double b : delta_denominator) {
        den += b * power;
        power *= f;
    }
    return num / den;
}

void Library::add_eluent_solvent(EluentSolvent e) {
    if (!(e.permittivity_25c > 1))
        throw Error("permittivity_25c", "must be above 1");
    if (e.fraction_v.size() != e.dpkw.size() || e.fraction_v.empty())
        throw Error("dpkw_points", "needs at least one row");
    for (size_t i = 1; i < e.fraction_v.size(); ++i)
        if (!(e.fraction_v[i] > e.fraction_v[i - 1]))
            throw Error("dpkw_points", "rows must ascend");
    for (auto& x : eluent_solvents_)
        if (x.organic == e.organic) {
            x = std::move(e);
            return;
        }
    eluent_solvents_.push_back(std::move(e));
}

const EluentSolvent* Library::eluent_solvent(const std::string& organic) const {
    for (const auto& x : eluent_solvents_)
        if (x.organic == organic)
            return &x;
    return nullptr;
}

const Reagent* Library::find_reagent(const std::string& id) const {
    for (const auto& r : reagents_)
        if (r.id == id)
            return &r;
    return nullptr;
}

const AcidBaseSystem* Library::find_system(const std::string& id) const {
    for (const auto& s : systems_)
        if (s.id == id)
            return &s;
    return nullptr;
}

const AcidBaseSystem& Library::system(const std::string& id, const std::string& field) const {
    if (const auto* s = find_system(id))
        return *s;
    throw Error(field, "unknown acid-base system " + guard::quote_id(id));
}

const Reagent& Library::reagent(const std::string& id, const std::string& field) const {
    if (const auto* r = find_reagent(id))
        return *r;
    std::string hint;
    // Suggestions only for an id of sensible length: the edit distance is never run over a
    // megabyte, and no id is longer than guard::max_id_chars.
    if (id.size() <= 4 * guard::max_id_chars)
        for (const auto& n : nearest_reagent_ids(id))
            hint += (hint.empty() ? "" : ", ") + n;
    throw Error(field, "unknown reagent " + guard::quote_id(id) +
                           (hint.empty() ? std::string() : " (nearest: " + hint + ")"));
}

std::vector<std::string> Library::nearest_reagent_ids(const std::string& id, int count) const {
    std::vector<std::pair<size_t, std::string>> scored;
    for (const auto& r : reagents_) {
        size_t d = static_cast<size_t>(edit_distance(id, r.id));
        // A reagent id that contains the query ("phosphate" in "...-phosphate") ranks close.
        if (!id.empty() && r.id.find(id) != std::string::npos)
            d = std::min(d, r.id.size() - id.size());
        scored.emplace_back(d, r.id);
    }
    std::sort(scored.begin(), scored.end());
    std::vector<std::string> out;
    for (int i = 0; i < count && i < static_cast<int>(scored.size()); ++i)
        out.push_back(scored[i].second);
    return out;
}

} // namespace chem

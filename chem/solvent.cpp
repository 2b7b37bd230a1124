#include "chem/solvent.h"
#include "chem/guard.h"
#include "chem/text.h"

#include "chem/error.h"
#include "chem/units.h"
#include "chem/water.h"

#include <algorithm>
#include <cmath>

namespace chem {

const char* miscibility_name(Miscibility m) {
    switch (m) {
    case Miscibility::miscible:
        return "miscible";
    case Miscibility::partly:
        return "partly";
    case Miscibility::immiscible:
        return "immiscible";
    }
    return "?";
}

const char* amount_unit_name(AmountUnit u) {
    switch (u) {
    case AmountUnit::percent_v:
        return "percent_v";
    case AmountUnit::percent_w:
        return "percent_w";
    case AmountUnit::mmol_per_l:
        return "mmol_per_l";
    }
    return "?";
}

bool Solvent::is_flammable() const {
    for (const auto& p : ghs_pictograms)
        if (p == "GHS02")
            return true;
    for (const auto& h : ghs_hazards)
        if (h == "H224" || h == "H225" || h == "H226")
            return true;
    return false;
}

double Solvent::density_at(double temperature_c) const {
    if (density_from_water_model)
        return water_density_g_per_ml(to_kelvin(temperature_c));
    return density_g_per_ml * (1.0 - expansion_per_k * (temperature_c - density_temperature_c));
}

UvTable::Lookup UvTable::at(double amount) const {
    Lookup r;
    if (points.empty())
        return r;
    for (const auto& p : points)
        if (p.amount >= amount * (1 - 1e-9)) {
            r.cutoff_nm = p.cutoff_nm;
            r.point = &p;
            return r;
        }
    r.cutoff_nm = points.back().cutoff_nm;
    r.point = &points.back();
    r.beyond_table = true;
    return r;
}

std::optional<double> SolubilityTable::limit_mmol_per_l(double f) const {
    if (points.empty() || f < points.front().first)
        return std::nullopt;
    if (f == points.front().first)
        return points.front().second;
    for (std::size_t i = 1; i < points.size(); ++i) {
        if (f <= points[i].first) {
            const auto& [f0, c0] = points[i - 1];
            const auto& [f1, c1] = points[i];
            return c0 + (c1 - c0) * (f - f0) / (f1 - f0);
        }
    }
    return points.back().second;
}

double ExcessVolume::at(double x) const {
    // Redlich–Kister: V^E = x(1−x) Σ A_k (2x−1)^k.
    double sum = 0, power = 1;
    for (double a : rk_cm3_per_mol) {
        sum += a * power;
        power *= 2 * x - 1;
    }
    return x * (1 - x) * sum;
}

double ExcessVolume::contraction_ml(double n_water_mol, double n_organic_mol) const {
    const double n = n_water_mol + n_organic_mol;
    if (n <= 0)
        return 0;
    return -n * at(n_organic_mol / n); // V^E in cm³/mol = mL/mol; negative V^E is a contraction
}

namespace {
std::pair<std::string, std::string> ordered(const std::string& a, const std::string& b) {
    return a < b ? std::make_pair(a, b) : std::make_pair(b, a);
}
} // namespace

void SolventLibrary::add_solvent(Solvent s) {
    if (!(s.density_g_per_ml > 0) || !std::isfinite(s.density_g_per_ml))
        throw Error("density_g_per_ml",
                    format_number(s.density_g_per_ml) + " is not a positive density");
    if (!(s.molar_mass_g_per_mol > 0))
        throw Error("formula", "gives no positive molar mass for \"" + s.id + "\"");
    for (auto& existing : solvents_)
        if (existing.id == s.id) {
            existing = std::move(s);
            return;
        }
    solvents_.push_back(std::move(s));
}

void SolventLibrary::set_miscibility(const std::string& a, const std::string& b, Miscibility m) {
    if (!find_solvent(a))
        throw Error("miscibility", "unknown solvent \"" + a + "\"");
    if (!find_solvent(b))
        throw Error("miscibility", "unknown solvent \"" + b + "\"");
    if (a == b)
        throw Error("miscibility", "pair \"" + a + "\" with itself");
    miscibility_[ordered(a, b)] = m;
}

void SolventLibrary::add_additive(Additive a) {
    if (a.uv) {
        std::sort(a.uv->points.begin(), a.uv->points.end(),
                  [](const UvPoint& x, const UvPoint& y) { return x.amount < y.amount; });
    }
    for (auto& existing : additives_)
        if (existing.id == a.id) {
            existing = std::move(a);
            return;
        }
    additives_.push_back(std::move(a));
}

void SolventLibrary::add_solubility(SolubilityTable t) {
    std::sort(t.points.begin(), t.points.end());
    for (std::size_t i = 1; i < t.points.size(); ++i)
        if (t.points[i].first == t.points[i - 1].first)
            throw Error("points",
                        "fraction_v " + format_number(t.points[i].first) + " appears twice");
    if (t.form.empty() && !t.system.empty())
        throw Error("form", "a table with a system (\"" + t.system + "\") needs its form");
    if (!t.form.empty()) {
        if (t.system.empty())
            throw Error("system", "the form \"" + t.form + "\" needs its acid-base system");
        if (t.protons_removed < 1)
            throw Error("protons_removed", std::to_string(t.protons_removed) +
                                               " is below 1 (a salt form has lost a proton)");
        for (const auto& existing : solubility_)
            if (existing.group == t.group && !existing.form.empty() && existing.system != t.system)
                throw Error("system", "\"" + t.system + "\" differs from \"" + existing.system +
                                          "\" of the group's other forms");
    }
    for (auto& existing : solubility_)
        if (existing.group == t.group && existing.organic == t.organic && existing.form == t.form) {
            existing = std::move(t);
            return;
        }
    solubility_.push_back(std::move(t));
}

void SolventLibrary::add_shelf_life(ShelfLife s) {
    for (auto& existing : shelf_)
        if (existing.kind == s.kind) {
            existing = std::move(s);
            return;
        }
    shelf_.push_back(std::move(s));
}

void SolventLibrary::add_excess_volume(ExcessVolume e) {
    for (auto& existing : excess_)
        if (existing.aqueous == e.aqueous && existing.organic == e.organic) {
            existing = std::move(e);
            return;
        }
    excess_.push_back(std::move(e));
}

void SolventLibrary::check_complete() const {
    for (std::size_t i = 0; i < solvents_.size(); ++i)
        for (std::size_t j = i + 1; j < solvents_.size(); ++j)
            if (!miscibility_.count(ordered(solvents_[i].id, solvents_[j].id)))
                throw Error("miscibility", "no entry for the pair \"" + solvents_[i].id +
                                               "\" / \"" + solvents_[j].id + "\"");
}

const Solvent* SolventLibrary::find_solvent(const std::string& id) const {
    for (const auto& s : solvents_)
        if (s.id == id)
            return &s;
    return nullptr;
}

const Solvent& SolventLibrary::solvent(const std::string& id, const std::string& field) const {
    if (const Solvent* s = find_solvent(id))
        return *s;
    std::string msg = "unknown solvent " + guard::quote_id(id);
    const auto near =
        id.size() <= 4 * guard::max_id_chars ? nearest_solvent_ids(id) : std::vector<std::string>{};
    if (!near.empty()) {
        msg += " (nearest: ";
        for (std::size_t i = 0; i < near.size(); ++i)
            msg += (i ? ", " : "") + near[i];
        msg += ")";
    }
    throw Error(field, msg);
}

const Additive* SolventLibrary::find_additive(const std::string& id) const {
    for (const auto& a : additives_)
        if (a.id == id)
            return &a;
    return nullptr;
}

std::optional<Miscibility> SolventLibrary::miscibility(const std::string& a,
                                                       const std::string& b) const {
    if (a == b)
        return Miscibility::miscible;
    auto it = miscibility_.find(ordered(a, b));
    if (it == miscibility_.end())
        return std::nullopt;
    return it->second;
}

const SolubilityTable* SolventLibrary::solubility(const std::string& group,
                                                  const std::string& organic) const {
    for (const auto& t : solubility_)
        if (t.group == group && t.organic == organic && t.form.empty())
            return &t;
    return nullptr;
}

const SolubilityTable* SolventLibrary::solubility_form(const std::string& group,
                                                       const std::string& organic,
                                                       const std::string& form) const {
    for (const auto& t : solubility_)
        if (t.group == group && t.organic == organic && t.form == form)
            return &t;
    return nullptr;
}

std::vector<const SolubilityTable*>
SolventLibrary::solubility_form_tables(const std::string& group) const {
    std::vector<const SolubilityTable*> out;
    for (const auto& t : solubility_)
        if (t.group == group && !t.form.empty())
            out.push_back(&t);
    return out;
}

std::vector<const SolubilityTable*>
SolventLibrary::solubility_tables(const std::string& group) const {
    std::vector<const SolubilityTable*> out;
    for (const auto& t : solubility_)
        if (t.group == group)
            out.push_back(&t);
    return out;
}

const ShelfLife* SolventLibrary::shelf_life(ShelfKind kind) const {
    for (const auto& s : shelf_)
        if (s.kind == kind)
            return &s;
    return nullptr;
}

double SolventLibrary::shelf_life_h(ShelfKind kind, std::string* source) const {
    if (const ShelfLife* s = shelf_life(kind)) {
        if (source)
            *source = s->source;
        return s->hours;
    }
    if (source)
        *source = "built-in default, common practice, no source";
    return builtin_shelf_life_h(kind);
}

namespace {

/// The shelf-life kinds: name, words for a sheet, built-in hours (see builtin_shelf_life_h).
struct ShelfKindRow {
    ShelfKind kind;
    const char* name;
    const char* words;
    double hours;
};
constexpr ShelfKindRow shelf_kind_rows[] = {
    {ShelfKind::water, "water", "water", 48},
    {ShelfKind::aqueous_buffer, "aqueous-buffer", "an aqueous buffer", 48},
    {ShelfKind::aqueous_buffer_volatile, "aqueous-buffer-volatile",
     "an aqueous buffer with a short-lived component", 24},
    {ShelfKind::buffer_with_organic, "buffer-with-organic", "a buffer with 10 % organic or more",
     72},
    {ShelfKind::aqueous_additive, "aqueous-additive", "water with an additive", 168},
    {ShelfKind::organic_additive, "organic-additive", "an organic solvent with an additive", 168},
    {ShelfKind::solvent_mixture, "solvent-mixture", "a solvent mixture", 168},
    {ShelfKind::neat_solvent, "neat-solvent", "a neat solvent", 720},
};

const ShelfKindRow& row_of(ShelfKind kind) {
    for (const ShelfKindRow& r : shelf_kind_rows)
        if (r.kind == kind)
            return r;
    return shelf_kind_rows[1];
}

} // namespace

const char* shelf_kind_name(ShelfKind kind) {
    return row_of(kind).name;
}

std::optional<ShelfKind> shelf_kind_from_name(const std::string& name) {
    for (const ShelfKindRow& r : shelf_kind_rows)
        if (name == r.name)
            return r.kind;
    return std::nullopt;
}

const std::vector<ShelfKind>& shelf_kinds() {
    static const std::vector<ShelfKind> all = [] {
        std::vector<ShelfKind> v;
        for (const ShelfKindRow& r : shelf_kind_rows)
            v.push_back(r.kind);
        return v;
    }();
    return all;
}

const char* shelf_kind_words(ShelfKind kind) {
    return row_of(kind).words;
}

double builtin_shelf_life_h(ShelfKind kind) {
    return row_of(kind).hours;
}

const ExcessVolume* SolventLibrary::excess_volume(const std::string& aqueous,
                                                  const std::string& organic) const {
    for (const auto& e : excess_)
        if (e.aqueous == aqueous && e.organic == organic)
            return &e;
    return nullptr;
}

std::vector<std::string> SolventLibrary::nearest_solvent_ids(const std::string& id,
                                                             int count) const {
    std::vector<std::pair<int, std::string>> scored;
    for (const auto& s : solvents_) {
        int d = edit_distance(id, s.id);
        // A prefix or substring match ("acn" is no prefix, but "aceto" is) counts as close.
        if (!id.empty() && s.id.find(id) != std::string::npos)
            d = std::min(d, 1);
        scored.emplace_back(d, s.id);
    }
    std::sort(scored.begin(), scored.end());
    std::vector<std::string> out;
    for (const auto& [d, sid] : scored) {
        if (static_cast<int>(out.size()) >= count)
            break;
        if (d <= std::max<int>(3, static_cast<int>(id.size()) / 2))
            out.push_back(sid);
    }
    return out;
}

} // namespace chem

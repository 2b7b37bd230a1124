#include "chem/line.h"

#include "chem/error.h"
#include "chem/units.h"
#include "chem/water.h"

#include <algorithm>
#include <cmath>
#include <set>

namespace chem {

namespace {

constexpr double fraction_sum_tolerance = 1e-4;
constexpr double max_percent_additive =
    50.0; // % v/v or % w/v: above that it is a part, not an additive
constexpr double max_mmol_per_l_additive = 5000.0;

std::string fmt(double v, int decimals) {
    // Fixed decimals for steps and notes ("12.5 mL"), locale-independent via format_number.
    const double scale = std::pow(10.0, decimals);
    return format_number(std::round(v * scale) / scale);
}

bool has_code(const std::vector<std::string>& codes, std::initializer_list<const char*> wanted) {
    for (const auto& c : codes)
        for (const char* w : wanted)
            if (c.rfind(w, 0) == 0)
                return true;
    return false;
}

std::string join(const std::vector<std::string>& v, const char* sep = ", ") {
    std::string out;
    for (std::size_t i = 0; i < v.size(); ++i)
        out += (i ? sep : "") + v[i];
    return out;
}

/// "parent.key", or "key" for the document root.
std::string sub(const std::string& parent, const std::string& key) {
    return parent.empty() ? key : parent + "." + key;
}

void add_solute(std::vector<Solute>& solutes, const std::string& id, double mmol,
                SoluteSource from) {
    for (auto& s : solutes)
        if (s.reagent == id) {
            s.mmol_per_l += mmol;
            s.from = combined(s.from, from);
            return;
        }
    solutes.push_back({id, mmol, from});
}

} // namespace

double additive_mmol_per_l(const Reagent& r, AmountUnit unit, double amount) {
    switch (unit) {
    case AmountUnit::mmol_per_l:
        return amount;
    case AmountUnit::percent_v: // mL of liquid as supplied per 100 mL → g/L of material
        return amount * 10.0 * r.density_g_per_ml * r.assay_fraction / r.molar_mass_g_per_mol *
               1000.0;
    case AmountUnit::percent_w: // g of material as supplied per 100 mL
        return amount * 10.0 * r.assay_fraction / r.molar_mass_g_per_mol * 1000.0;
    }
    return 0;
}

double additive_amount(const Reagent& r, AmountUnit unit, double mmol_per_l) {
    switch (unit) {
    case AmountUnit::mmol_per_l:
        return mmol_per_l;
    case AmountUnit::percent_v:
        if (!(r.density_g_per_ml > 0))
            return 0;
        return mmol_per_l / 1000.0 * r.molar_mass_g_per_mol / r.assay_fraction /
               r.density_g_per_ml / 10.0;
    case AmountUnit::percent_w:
        return mmol_per_l / 1000.0 * r.molar_mass_g_per_mol / r.assay_fraction / 10.0;
    }
    return 0;
}

const char* ph_basis_name(PhBasis basis) {
    switch (basis) {
    case PhBasis::none:
        return "";
    case PhBasis::buffer_design:
        return "buffer design";
    case PhBasis::several_buffers:
        return "several buffers: pH not predicted";
    case PhBasis::solved_from_additives:
        return "solved from the additives in water at 25 °C";
    case PhBasis::eluent_s_w:
        return "eluent s_w pH";
    }
    return "";
}

const char* solute_source_name(SoluteSource from) {
    switch (from) {
    case SoluteSource::buffer:
        return "buffer";
    case SoluteSource::additive:
        return "additive";
    case SoluteSource::buffer_and_additive:
        return "buffer+additive";
    }
    return "buffer";
}

const char* line_item_kind_name(LineItemKind kind) {
    switch (kind) {
    case LineItemKind::solvent:
        return "solvent";
    case LineItemKind::buffer:
        return "buffer";
    case LineItemKind::additive:
        return "additive";
    }
    return "solvent";
}

LineProfile profile_line(const SolventLibrary& solvents, const Library& reagents,
                         const LineSpec& line) {
    LineProfile p;
    const std::string& at = line.field;
    if (line.parts.empty()) {
        if (!line.additives.empty())
            throw Error(sub(at, "parts"),
                        "is needed when additives are given (what are they added to?)");
        return p;
    }
    p.described = true;
    double sum = 0;
    int buffers = 0;
    std::vector<UvPart> uv_parts;
    for (std::size_t i = 0; i < line.parts.size(); ++i) {
        const LinePart& part = line.parts[i];
        const std::string pat = sub(at, "parts[" + std::to_string(i) + "]");
        const double f = part.fraction_v;
        if (!std::isfinite(f) || f <= 0 || f > 1)
            throw Error(pat + ".fraction_v", format_number(f) + " is outside (0, 1]");
        sum += f;
        if (part.buffer) {
            ++buffers;
            p.aqueous_fraction_v += f;
            p.solvent_fraction_v["water"] += f;
            for (const Component& c : part.buffer->composition)
                add_solute(p.solutes, c.reagent->id, c.mol_per_l * 1000.0 * f,
                           SoluteSource::buffer);
            if (buffers == 1) {
                p.ph = part.buffer->predicted.ph;
                p.ph_basis = PhBasis::buffer_design;
            } else {
                p.ph.reset();
                p.ph_basis = PhBasis::several_buffers;
            }
        } else {
            if (part.solvent.empty())
                throw Error(pat, "needs a \"solvent\" or a \"buffer\"");
            const Solvent& s = solvents.solvent(part.solvent, pat + ".solvent");
            p.solvent_fraction_v[s.id] += f;
            (s.aqueous ? p.aqueous_fraction_v : p.organic_fraction_v) += f;
            uv_parts.push_back({s.id, s.uv_cutoff_nm, f, s.uv_absorbance});
        }
    }
    if (std::fabs(sum - 1.0) > fraction_sum_tolerance)
        throw Error(sub(at, "parts"), "the fractions add to " + format_number(sum) + ", not 1");

    for (std::size_t j = 0; j < line.additives.size(); ++j) {
        const LineAdditive& a = line.additives[j];
        const std::string aat = sub(at, "additives[" + std::to_string(j) + "]");
        const Reagent& r = reagents.reagent(a.additive, aat + ".additive");
        const std::string unit = amount_unit_name(a.unit);
        const double limit =
            a.unit == AmountUnit::mmol_per_l ? max_mmol_per_l_additive : max_percent_additive;
        if (!std::isfinite(a.amount) || a.amount <= 0)
            throw Error(aat + "." + unit, format_number(a.amount) + " is not a positive amount");
        if (a.amount > limit)
            throw Error(aat + "." + unit, format_number(a.amount) + " is above the limit of " +
                                              format_number(limit) +
                                              " for an additive (make it a part instead)");
        if (a.unit == AmountUnit::percent_v && r.form != PhysicalForm::liquid)
            throw Error(aat + ".percent_v",
                        "\"" + r.id + "\" is a solid: give percent_w or mmol_per_l");
        add_solute(p.solutes, r.id, additive_mmol_per_l(r, a.unit, a.amount),
                   SoluteSource::additive);
    }

    // UV cutoff: each solvent neat (conservative), each solute at its concentration in the line.
    for (const Solute& s : p.solutes) {
        const Additive* add = solvents.find_additive(s.reagent);
        const Reagent& r = reagents.reagent(s.reagent);
        if (!add)
            p.volatility_unknown.push_back(s.reagent);
        else if (!add->ms_volatile)
            p.nonvolatile.push_back(s.reagent);
        if (add && add->short_lived)
            p.short_lived = true;
        if (!add || !add->uv || add->uv->points.empty() ||
            (add->uv->unit == AmountUnit::percent_v && r.form != PhysicalForm::liquid)) {
            p.uv_unknown.push_back(s.reagent);
            continue;
        }
        const double amount = additive_amount(r, add->uv->unit, s.mmol_per_l);
        const auto look = add->uv->at(amount);
        if (look.beyond_table)
            p.uv_beyond_table.push_back(s.reagent);
        // Beer–Lambert: the row's cutoff scaled by the amount over the row's amount.
        uv_parts.push_back({s.reagent, look.cutoff_nm, amount / look.point->amount, {}});
    }
    // The aqueous buffer parts count as water for the UV; water itself is the reference.
    p.uv_cutoff_nm = line_uv_cutoff_nm(uv_parts, &p.uv_limited_by);
    p.uv_parts = std::move(uv_parts);

    // pH of an aqueous line made with additives only: solve the additives in water at 25 °C.
    if (buffers == 0 && p.organic_fraction_v == 0 && !p.solutes.empty()) {
        std::vector<Component> comps;
        for (const Solute& s : p.solutes)
            comps.push_back({&reagents.reagent(s.reagent), s.mmol_per_l / 1000.0});
        try {
            p.ph = solve(reagents, comps, 25.0, line.activity_model).ph;
            p.ph_basis = PhBasis::solved_from_additives;
        } catch (const Error& e) {
            throw e.within(sub(at, "additives"));
        }
    }

    // Shelf-life kind (lab-set defaults, common practice).
    bool salts = false;
    for (const Solute& s : p.solutes)
        if (reagents.reagent(s.reagent).form == PhysicalForm::solid)
            salts = true;
    const bool organic = p.organic_fraction_v >= 0.1 - 1e-12;
    if (buffers > 0 || (salts && p.aqueous_fraction_v > 0)) {
        if (p.short_lived)
            p.shelf_kind = ShelfKind::aqueous_buffer_volatile;
        else
            p.shelf_kind = organic ? ShelfKind::buffer_with_organic : ShelfKind::aqueous_buffer;
    } else if (!p.solutes.empty()) {
        if (p.short_lived && !organic)
            p.shelf_kind = ShelfKind::aqueous_buffer_volatile;
        else
            p.shelf_kind = p.organic_fraction_v > 0 ? ShelfKind::organic_additive
                                                    : ShelfKind::aqueous_additive;
    } else if (p.organic_fraction_v == 0) {
        p.shelf_kind = ShelfKind::water;
    } else {
        p.shelf_kind =
            p.solvent_fraction_v.size() == 1 ? ShelfKind::neat_solvent : ShelfKind::solvent_mixture;
    }
    if (line.shelf_life_h)
        p.shelf_life_h = *line.shelf_life_h;
    else if (const ShelfLife* sl = solvents.shelf_life(*p.shelf_kind))
        p.shelf_life_h = sl->hours;
    return p;
}

double uv_part_absorbance(const UvPart& part, double wavelength_nm) {
    const std::vector<UvAbsorbancePoint>& t = part.table;
    if (t.empty())
        return std::pow(10.0, (part.cutoff_nm - wavelength_nm) / uv_decade_nm);
    // The first row: the cutoff itself when it lies below the table and the table is below 1.
    UvAbsorbancePoint first = t.front();
    std::size_t next = 0; // the first table row above `first`
    if (part.cutoff_nm > 0 && part.cutoff_nm < first.wavelength_nm && first.absorbance < 1)
        first = {part.cutoff_nm, 1.0};
    else
        next = 1;
    if (wavelength_nm <= first.wavelength_nm)
        return first.absorbance *
               std::pow(10.0, (first.wavelength_nm - wavelength_nm) / uv_decade_nm);
    if (wavelength_nm >= t.back().wavelength_nm)
        return t.back().absorbance;
    UvAbsorbancePoint lo = first;
    for (std::size_t i = next; i < t.size(); ++i) {
        const UvAbsorbancePoint& hi = t[i];
        if (wavelength_nm <= hi.wavelength_nm) {
            const double f =
                (wavelength_nm - lo.wavelength_nm) / (hi.wavelength_nm - lo.wavelength_nm);
            return lo.absorbance * std::pow(hi.absorbance / lo.absorbance, f);
        }
        lo = hi;
    }
    return t.back().absorbance;
}

double line_uv_cutoff_nm(const std::vector<UvPart>& parts, std::string* limited_by) {
    double top = 0;
    bool tables = false;
    for (const UvPart& u : parts)
        if (u.scale > 0) {
            top = std::max(top, u.cutoff_nm);
            tables = tables || !u.table.empty();
        }
    if (top <= 0)
        return 0;
    double cutoff = 0;
    if (!tables) {
        // log-sum-exp around the highest cutoff keeps the powers of ten in range.
        double sum = 0;
        for (const UvPart& u : parts)
            if (u.scale > 0)
                sum += u.scale * std::pow(10.0, (u.cutoff_nm - top) / uv_decade_nm);
        cutoff = top + uv_decade_nm * std::log10(sum);
    } else {
        // Σ s_i·A_i(λ) falls (or holds) with λ: bisect for 1 between 50 and 1000 nm.
        double lo = 50, hi = 1000;
        if (uv_absorbance(parts, hi) >= 1) {
            cutoff = hi;
        } else if (uv_absorbance(parts, lo) <= 1) {
            cutoff = lo;
        } else {
            for (int i = 0; i < 64 && hi - lo > 1e-10; ++i) {
                const double mid = 0.5 * (lo + hi);
                (uv_absorbance(parts, mid) >= 1 ? lo : hi) = mid;
            }
            cutoff = 0.5 * (lo + hi);
        }
    }
    if (limited_by) {
        double best = -1;
        for (const UvPart& u : parts) {
            const double a = u.scale * uv_part_absorbance(u, cutoff);
            if (a > best) {
                best = a;
                *limited_by = u.who;
            }
        }
    }
    return cutoff;
}

double uv_absorbance(const std::vector<UvPart>& parts, double wavelength_nm) {
    double a = 0;
    for (const UvPart& u : parts)
        if (u.scale > 0)
            a += u.scale * uv_part_absorbance(u, wavelength_nm);
    return a;
}

std::optional<double> mixing_contraction_ml(const SolventLibrary& solvents, double aqueous_ml,
                                            const std::string& organic, double organic_ml) {
    const ExcessVolume* ev = solvents.excess_volume("water", organic);
    const Solvent* w = solvents.find_solvent("water");
    const Solvent* o = solvents.find_solvent(organic);
    if (!ev || !w || !o || aqueous_ml <= 0 || organic_ml <= 0)
        return std::nullopt;
    const double n_w = aqueous_ml * w->density_g_per_ml / w->molar_mass_g_per_mol;
    const double n_o = organic_ml * o->density_g_per_ml / o->molar_mass_g_per_mol;
    return ev->contraction_ml(n_w, n_o);
}

LineRecipe prepare_line(const SolventLibrary& solvents, const Library& reagents,
                        const LineSpec& line, double volume_ml) {
    if (!std::isfinite(volume_ml) || volume_ml <= 0)
        throw Error("volume_ml", format_number(volume_ml) + " is not a positive volume");
    if (volume_ml > 1.0e6)
        throw Error("volume_ml", format_number(volume_ml) + " mL is above the limit of 1e+06");
    LineRecipe out;
    out.profile = profile_line(solvents, reagents, line);
    if (!out.profile.described)
        throw Error(sub(line.field, "parts"), "is required for a line recipe");
    out.volume_ml = volume_ml;

    const double t_c = line.temperature_c;
    const double rho_water = water_density_g_per_ml(to_kelvin(t_c));
    double aqueous_ml = 0;
    std::vector<std::pair<std::string, double>> organic_ml;
    std::vector<std::string> measured;
    int buffer_parts = 0;
    for (const LinePart& part : line.parts) {
        LineItem it;
        it.fraction_v = part.fraction_v;
        it.volume_ml = part.fraction_v * volume_ml;
        if (part.buffer) {
            ++buffer_parts;
            it.part = buffer_parts == 1 ? "buffer" : "buffer-" + std::to_string(buffer_parts);
            it.kind = LineItemKind::buffer;
            double dissolved_g_per_l = 0;
            for (const Component& c : part.buffer->composition)
                dissolved_g_per_l += c.mol_per_l * c.reagent->molar_mass_g_per_mol;
            it.density_g_per_ml = rho_water + dissolved_g_per_l / 1000.0;
            it.density_temperature_c = t_c;
            it.density_basis = "estimate: water at " + format_number(t_c) +
                               " °C (Tanaka et al., Metrologia 38 (2001) 301) plus " +
                               fmt(dissolved_g_per_l, 2) +
                               " g/L dissolved, the solutes' own volume neglected";
            aqueous_ml += *it.volume_ml;
            if (!out.buffer)
                out.buffer = part.buffer;
        } else {
            const Solvent& s = solvents.solvent(part.solvent);
            it.part = s.id;
            it.kind = LineItemKind::solvent;
            it.density_g_per_ml = s.density_at(t_c);
            it.density_temperature_c = t_c;
            auto src = s.sources.find("density");
            it.density_basis = "density at " + format_number(s.density_temperature_c) + " °C" +
                               (src != s.sources.end() ? " (" + src->second + ")" : "");
            if (t_c != s.density_temperature_c) {
                if (s.density_from_water_model)
                    it.density_basis = "density of water at " + format_number(t_c) +
                                       " °C, Tanaka et al., Metrologia 38 (2001) 301";
                else if (s.expansion_per_k > 0)
                    it.density_basis += ", taken to " + format_number(t_c) +
                                        " °C with the expansion coefficient " +
                                        format_number(s.expansion_per_k) + " 1/K";
                else
                    it.density_basis +=
                        "; no expansion coefficient recorded, so not corrected to " +
                        format_number(t_c) + " °C";
            }
            if (s.aqueous)
                aqueous_ml += *it.volume_ml;
            else
                organic_ml.emplace_back(s.id, *it.volume_ml);
        }
        it.mass_g = *it.volume_ml * it.density_g_per_ml;
        measured.push_back(format_measure(*it.volume_ml, MeasureUnit::ml) + " mL " + it.part +
                           " (or " + format_measure(*it.mass_g, MeasureUnit::g) + " g)");
        out.items.push_back(it);
    }
    std::vector<std::string> additive_steps;
    for (const LineAdditive& a : line.additives) {
        const Reagent& r = reagents.reagent(a.additive);
        const double mmol = additive_mmol_per_l(r, a.unit, a.amount);
        LineItem it;
        it.part = r.id;
        it.kind = LineItemKind::additive;
        const double material_g =
            mmol / 1000.0 * volume_ml / 1000.0 * r.molar_mass_g_per_mol / r.assay_fraction;
        it.mass_g = material_g;
        if (r.form == PhysicalForm::liquid) {
            it.volume_ml = material_g / r.density_g_per_ml;
            it.density_g_per_ml = r.density_g_per_ml;
            it.density_basis = "density of the liquid as supplied (reagent library)";
            additive_steps.push_back(format_measure(*it.volume_ml, MeasureUnit::ml) + " mL " +
                                     r.name + " = " + format_measure(material_g, MeasureUnit::g) +
                                     " g");
        } else {
            it.density_basis = "solid: weigh";
            additive_steps.push_back(format_measure(material_g, MeasureUnit::g) + " g " + r.name);
        }
        out.items.push_back(it);
    }

    // Contraction on mixing, binary estimates against the whole aqueous part.
    std::vector<std::string> contraction_text;
    std::vector<std::pair<std::string, double>> contractions; // solvent id, mL
    for (const auto& [id, ml] : organic_ml) {
        const auto c = mixing_contraction_ml(solvents, aqueous_ml, id, ml);
        if (!c)
            continue;
        out.contraction_ml += *c;
        contraction_text.push_back(solvents.solvent(id).name + " " + fmt(*c, 1) + " mL");
        contractions.emplace_back(id, *c);
        if (const ExcessVolume* ev = solvents.excess_volume("water", id))
            out.contraction_sources.push_back(ev->source);
    }
    out.mixed_volume_ml = volume_ml - out.contraction_ml;

    // Steps, in order.
    auto step = [&](StepKind kind, const std::string& s) { out.steps.push_back(Step{kind, s}); };
    if (out.buffer) {
        step(StepKind::prepare_buffer,
             "Prepare the aqueous buffer (at least " + fmt(aqueous_ml, 0) +
                 " mL, recipe under \"buffer\") and measure and adjust its pH now, in the aqueous "
                 "buffer alone, "
                 "before any organic solvent goes in: the meter reading of the mixed line means "
                 "something else.");
    }
    if (line.parts.size() > 1)
        step(StepKind::combine_parts,
             "Measure each part separately and only then combine them in the bottle: " +
                 join(measured, "; ") + ". Do not make up to a mark after mixing.");
    else
        step(StepKind::fill_bottle, "Fill " + join(measured) + " into the bottle.");
    if (!additive_steps.empty())
        step(StepKind::add_additives, "Add to the combined line: " + join(additive_steps, "; ") +
                                          ". Liquids with a pipette; acids and bases go into the "
                                          "liquid, never the liquid onto "
                                          "the neat reagent.");
    if (out.contraction_ml > 0.05 * volume_ml / 100.0)
        step(StepKind::expect_contraction,
             "Expect about " + fmt(out.mixed_volume_ml, 0) + " mL, not " + fmt(volume_ml, 0) +
                 " mL: the aqueous part and the organic contract on mixing (" +
                 join(contraction_text, ", ") + "; an estimate from excess-volume data).");
    step(StepKind::mix_degas_and_label,
         "Mix, let the line return to room temperature, degas it, and label the bottle with "
         "contents, date "
         "and hazards.");

    out.notes.push_back({LineNoteKind::gravimetric_alternative, {}, 0, 0});
    if (out.profile.aqueous_fraction_v > 0 && out.profile.organic_fraction_v > 0)
        out.notes.push_back({LineNoteKind::ph_in_aqueous_part, {}, 0, 0});
    if (out.contraction_ml > 0)
        out.notes.push_back({LineNoteKind::mixing_contraction, contractions, volume_ml,
                             static_cast<int>(organic_ml.size())});

    // Cautions from the solvents' and reagents' hazards. Nothing here is called safe.
    std::set<std::string> seen;
    for (const LinePart& part : line.parts) {
        if (part.buffer) {
            for (const auto& c : part.buffer->cautions)
                if (seen.insert(c).second)
                    out.cautions.push_back(c);
            continue;
        }
        const Solvent& s = solvents.solvent(part.solvent);
        if (s.ghs_hazards.empty())
            continue;
        std::string c = s.name + " (" + join(s.ghs_hazards) + "; " + join(s.ghs_pictograms) + ")";
        if (s.is_flammable())
            c += ": flammable, keep away from ignition sources and work in a fume hood or with "
                 "local exhaust";
        else
            c += ": work with local exhaust ventilation";
        if (has_code(s.ghs_hazards, {"H30", "H31", "H33", "H34", "H35", "H36", "H37"}))
            c += "; harmful or toxic by inhalation, skin contact or swallowing: gloves suited to "
                 "the solvent (see its SDS)";
        if (seen.insert(c).second)
            out.cautions.push_back(c + ".");
    }
    for (const LineAdditive& a : line.additives) {
        const Reagent& r = reagents.reagent(a.additive);
        if (r.ghs_hazards.empty())
            continue;
        std::string c = r.name + " (" + join(r.ghs_hazards) + "; " + join(r.ghs_pictograms) + ")";
        if (r.is_corrosive())
            c += ": corrosive, eye protection and gloves, dispense in a fume hood";
        if (r.is_flammable())
            c += r.is_corrosive() ? "; flammable" : ": flammable";
        if (seen.insert(c).second)
            out.cautions.push_back(c + ".");
    }
    out.cautions.push_back(
        "Read the safety data sheet of every solvent and reagent before preparing; wear eye "
        "protection, gloves and a lab coat; follow your local rules and your laboratory's "
        "procedures, which take precedence over this sheet.");
    return out;
}

} // namespace chem

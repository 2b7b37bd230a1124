#include "chem/recipe.h"

#include "chem/equilibrium_detail.h"
#include "chem/error.h"
#include "chem/units.h"

#include <boost/math/tools/roots.hpp>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <functional>
#include <limits>
#include <set>

namespace chem {

namespace {

constexpr double max_volume_ml = 1.0e6;         ///< 1000 L: no bench prepares more
constexpr double max_titrant_mol_per_l = 20.0;
constexpr double balance_min_mass_g = 0.010;    ///< common practice, no source: ~10 mg on a 0.1 mg balance
constexpr double pipette_min_volume_ml = 0.010; ///< common practice, no source: 10 µL
constexpr double low_buffer_capacity = 0.002;   ///< mol/L per pH; common practice, no source
constexpr double ph_solve_tolerance = 1e-7;


double purity_of(const RecipeRequest& req, const Reagent& r) {
    for (const auto& [id, p] : req.purity_overrides)
        if (id == r.id) return p;
    return r.assay_fraction;
}

RecipeItem item_for(const RecipeRequest& req, const Reagent& r, double mol_per_l) {
    RecipeItem it;
    it.reagent = r.id;
    it.mol_per_l = mol_per_l;
    const double mol = mol_per_l * req.volume_ml / 1000.0;
    const double material_g = mol * r.molar_mass_g_per_mol / purity_of(req, r);
    it.mass_g = material_g;
    if (r.form == PhysicalForm::liquid) {
        it.volume_ml = material_g / r.density_g_per_ml;
        it.as = "liquid";
    } else {
        it.as = "solid";
    }
    return it;
}

RecipeItem solution_item(const RecipeRequest& req, const Reagent& r, double mol_per_l,
                         double stock_mol_per_l, const std::string& role) {
    RecipeItem it;
    it.reagent = r.id;
    it.mol_per_l = mol_per_l;
    it.volume_ml = mol_per_l * req.volume_ml / stock_mol_per_l;
    it.as = role + " " + format_number(stock_mol_per_l) + " mol/L";
    return it;
}

/// Solves g(x) = 0 on [lo, hi] for a monotone g known to change sign there.
double root_between(const std::function<double(double)>& g, double lo, double hi, double glo,
                    double ghi) {
    if (glo == 0) return lo;
    if (ghi == 0) return hi;
    std::uintmax_t iters = 200;
    auto r = boost::math::tools::toms748_solve(g, lo, hi, glo, ghi,
                                               boost::math::tools::eps_tolerance<double>(34), iters);
    return 0.5 * (r.first + r.second);
}

void validate_common(const RecipeRequest& req) {
    if (!std::isfinite(req.target_ph) || req.target_ph < 0 || req.target_ph > 14)
        throw Error("target_ph", format_number(req.target_ph) + " is outside pH 0 to 14");
    if (!std::isfinite(req.temperature_c) || req.temperature_c < min_temperature_c ||
        req.temperature_c > max_temperature_c)
        throw Error("temperature_c", format_number(req.temperature_c) + " °C is outside " +
                                         format_number(min_temperature_c) + " to " +
                                         format_number(max_temperature_c) + " °C");
    if (!std::isfinite(req.volume_ml) || req.volume_ml <= 0)
        throw Error("volume_ml", format_number(req.volume_ml) + " is not a positive volume");
    if (req.volume_ml > max_volume_ml)
        throw Error("volume_ml", format_number(req.volume_ml) + " mL is above the limit of " +
                                     format_number(max_volume_ml) + " mL");
    if (req.concentration_mol_per_l.has_value() == req.ionic_strength_mol_per_l.has_value())
        throw Error("concentration_mol_per_l",
                    "give exactly one of concentration_mol_per_l and ionic_strength_mol_per_l");
    auto check_amount = [](const char* field, double v) {
        if (!std::isfinite(v) || v <= 0) throw Error(field, format_number(v) + " is not a positive amount");
        if (v > max_concentration_mol_per_l)
            throw Error(field, format_number(v) + " mol/L is above " +
                                   format_number(max_concentration_mol_per_l) + " mol/L");
    };
    if (req.concentration_mol_per_l) check_amount("concentration_mol_per_l", *req.concentration_mol_per_l);
    if (req.ionic_strength_mol_per_l) check_amount("ionic_strength_mol_per_l", *req.ionic_strength_mol_per_l);
    for (const auto& [id, p] : req.purity_overrides)
        if (!std::isfinite(p) || p <= 0 || p > 1)
            throw Error("purity_percent." + id, format_number(p * 100) + " % is outside 0 to 100 %");
}

/// Two-component problem whose amounts vary: component 0 and 1.
/// Each solve starts from the previous solution: the searches move the amounts a little at a time.
struct Pair {
    detail::Problem problem;
    std::optional<detail::State> last;
    std::vector<double> amounts = std::vector<double>(2);
    detail::State state(double c0, double c1) {
        amounts[0] = c0;
        amounts[1] = c1;
        problem.set_amounts(amounts);
        last = detail::solve_state(problem, last ? &*last : nullptr);
        return *last;
    }
    double ph(double c0, double c1) { return state(c0, c1).ph; }
};

std::string ph_text(double ph) { return "pH " + format_fixed(ph, 2); }

/// Outer search over the buffer concentration for a target ionic strength. `solve_at(c)` returns
/// the ionic strength of the recipe designed at buffer concentration c, or NaN when the target
/// pH cannot be reached at c.
double concentration_for_ionic_strength(const std::function<double(double)>& ionic_at,
                                        double target_i, double c_max) {
    double lo = std::max(1e-7, target_i / 100.0);
    double ilo = ionic_at(lo);
    // At very low concentration the reachable pH range shrinks towards neutral: move up.
    while (std::isnan(ilo) && lo < c_max) {
        lo *= 2;
        ilo = ionic_at(lo);
    }
    if (std::isnan(ilo))
        throw Error("target_ph", "the target pH cannot be reached at any concentration up to " +
                                     format_number(c_max) + " mol/L");
    if (ilo > target_i)
        throw Error("ionic_strength_mol_per_l",
                    format_number(target_i) + " mol/L is below the lowest ionic strength (" +
                        format_number(ilo) + " mol/L) at which this buffer reaches the target pH");
    double hi = std::min(c_max, std::max(lo * 2, target_i * 20));
    double ihi = ionic_at(hi);
    while (!std::isnan(ihi) && ihi < target_i && hi < c_max) {
        hi = std::min(c_max, hi * 4);
        ihi = ionic_at(hi);
    }
    if (std::isnan(ihi) || ihi < target_i)
        throw Error("ionic_strength_mol_per_l",
                    format_number(target_i) + " mol/L cannot be reached with this buffer at up to " +
                        format_number(c_max) + " mol/L of it");
    return root_between([&](double c) { return ionic_at(c) - target_i; }, lo, hi, ilo - target_i,
                        ihi - target_i);
}

struct MixDesign {
    const AcidBaseSystem* system = nullptr;
    double c_acid = 0, c_base = 0; ///< formula units per litre
};

MixDesign design_mix(const Library& lib, const RecipeRequest& req, const Reagent& acid,
                     const Reagent& base) {
    if (acid.id == base.id) throw Error("base", "\"" + base.id + "\" is the same as the acid form");
    const SystemShare* sa = nullptr;
    const SystemShare* sb = nullptr;
    for (const auto& s : acid.systems) {
        const SystemShare* other = base.share(s.system);
        if (!other) continue;
        // The shared system in which the base form carries fewer protons per unit.
        if (other->protons_removed / other->count > s.protons_removed / s.count + 1e-9) {
            sa = &s;
            sb = other;
            break;
        }
    }
    if (!sa) {
        bool any_shared = false;
        for (const auto& s : acid.systems) any_shared |= base.has_system(s.system);
        if (!any_shared)
            throw Error("base", "\"" + base.id + "\" and \"" + acid.id +
                                    "\" share no acid-base system, so they are not a conjugate pair");
        throw Error("base", "\"" + base.id + "\" is not a more basic form than \"" + acid.id +
                                "\"; swap acid and base");
    }
    MixDesign d;
    d.system = &lib.system(sa->system);
    Pair pair{detail::build_problem(lib, {{&acid, 1.0}, {&base, 1.0}}, req.temperature_c)};
    // x: fraction of the system's total that comes from the base form.
    auto amounts = [&](double total, double x) {
        return std::pair{(1 - x) * total / sa->count, x * total / sb->count};
    };
    auto reach = [&](double total) -> std::optional<double> {
        auto [a0, b0] = amounts(total, 0.0);
        auto [a1, b1] = amounts(total, 1.0);
        const double ph0 = pair.ph(a0, b0), ph1 = pair.ph(a1, b1);
        if (req.target_ph < ph0 || req.target_ph > ph1) return std::nullopt;
        auto g = [&](double x) {
            auto [a, b] = amounts(total, x);
            return pair.ph(a, b) - req.target_ph;
        };
        return root_between(g, 0.0, 1.0, ph0 - req.target_ph, ph1 - req.target_ph);
    };
    double total;
    std::optional<double> x;
    if (req.concentration_mol_per_l) {
        total = *req.concentration_mol_per_l;
        x = reach(total);
        if (!x) {
            auto [a0, b0] = amounts(total, 0.0);
            auto [a1, b1] = amounts(total, 1.0);
            throw Error("target_ph", ph_text(req.target_ph) + " cannot be reached by mixing " +
                                         acid.id + " and " + base.id + " at " +
                                         format_number(total) + " mol/L and " +
                                         format_number(req.temperature_c) + " °C: the mix spans " +
                                         ph_text(pair.ph(a0, b0)) + " to " + ph_text(pair.ph(a1, b1)));
        }
    } else {
        const double c_max = max_concentration_mol_per_l * std::min(sa->count, sb->count);
        total = concentration_for_ionic_strength(
            [&](double c) {
                auto x = reach(c);
                if (!x) return std::numeric_limits<double>::quiet_NaN();
                auto [a, b] = amounts(c, *x);
                return pair.state(a, b).ionic_strength_mol_per_l;
            },
            *req.ionic_strength_mol_per_l, c_max);
    }
    if (!x) x = reach(total);
    std::tie(d.c_acid, d.c_base) = amounts(total, *x);
    return d;
}

struct TitrationDesign {
    double c_weigh = 0;
    double c_titrant = 0; ///< mol/L of titrant in the final solution
};

TitrationDesign design_titration(const Library& lib, const RecipeRequest& req, const Reagent& weigh,
                                 const Reagent& titrant) {
    if (weigh.id == titrant.id) throw Error("titrant", "\"" + titrant.id + "\" is the weighed reagent itself");
    Pair pair{detail::build_problem(lib, {{&weigh, 1.0}, {&titrant, 1.0}}, req.temperature_c)};
    // The titrant may take up at most 90 % of the final volume.
    const double n_max = std::min(0.9 * req.titrant_mol_per_l, max_concentration_mol_per_l);
    auto reach = [&](double c, std::string* why) -> std::optional<double> {
        const double ph0 = pair.ph(c, 0.0);
        const double ph_max = pair.ph(c, n_max);
        const bool raises = ph_max > ph0;
        const double lo_ph = std::min(ph0, ph_max), hi_ph = std::max(ph0, ph_max);
        if (req.target_ph < lo_ph || req.target_ph > hi_ph) {
            if (why) {
                if ((raises && req.target_ph < ph0) || (!raises && req.target_ph > ph0))
                    *why = "the weighed " + weigh.id + " alone gives " + ph_text(ph0) + ", and " +
                           titrant.id + " can only " + (raises ? "raise" : "lower") + " it";
                else
                    *why = titrant.id + " at " + format_number(req.titrant_mol_per_l) +
                           " mol/L reaches only " + ph_text(ph_max) +
                           " before its volume would fill 90 % of the flask";
            }
            return std::nullopt;
        }
        auto g = [&](double n) { return pair.ph(c, n) - req.target_ph; };
        return root_between(g, 0.0, n_max, ph0 - req.target_ph, ph_max - req.target_ph);
    };
    TitrationDesign d;
    if (req.concentration_mol_per_l) {
        d.c_weigh = *req.concentration_mol_per_l;
    } else {
        d.c_weigh = concentration_for_ionic_strength(
            [&](double c) {
                auto n = reach(c, nullptr);
                if (!n) return std::numeric_limits<double>::quiet_NaN();
                return pair.state(c, *n).ionic_strength_mol_per_l;
            },
            *req.ionic_strength_mol_per_l, max_concentration_mol_per_l);
    }
    std::string why;
    auto n = reach(d.c_weigh, &why);
    if (!n)
        throw Error("target_ph", ph_text(req.target_ph) + " cannot be reached by titrating " +
                                     format_number(d.c_weigh) + " mol/L " + weigh.id + " with " +
                                     titrant.id + " at " + format_number(req.temperature_c) +
                                     " °C: " + why);
    d.c_titrant = *n;
    return d;
}

std::string reagent_label(const Reagent& r) {
    return r.name + " (" + r.formula + ", " + format_fixed(r.molar_mass_g_per_mol, 2) + " g/mol)";
}

void add_amount_steps(const Library& lib, const Recipe& recipe, std::vector<std::string>& steps) {
    for (const auto& it : recipe.items) {
        const Reagent& r = lib.reagent(it.reagent);
        if (it.as.rfind("titrant", 0) == 0) continue;
        if (it.as == "solid") {
            steps.push_back("Weigh " + format_amount(*it.mass_g) + " g of " + reagent_label(r) +
                            " and dissolve it in the water.");
        } else if (it.as == "liquid") {
            std::string s = "Measure " + format_amount(*it.volume_ml) + " mL (" + format_amount(*it.mass_g) +
                            " g) of " + reagent_label(r) + ", " +
                            format_number(r.assay_fraction * 100) + " % w/w, " +
                            format_number(r.density_g_per_ml) + " g/mL, and add it to the water";
            if (r.is_corrosive()) s += " slowly, with stirring (acid or base into water, never water into it)";
            steps.push_back(s + ".");
        } else {
            steps.push_back("Pipette " + format_amount(*it.volume_ml) + " mL of the " + r.name + " " + it.as +
                            " into the flask.");
        }
    }
}

std::vector<std::string> cautions_for(const Library& lib, const std::vector<const Reagent*>& used) {
    std::vector<std::string> out;
    bool corrosive = false, fumes = false, flammable = false;
    for (const Reagent* r : used) {
        if (r->ghs_hazards.empty()) continue;
        std::string codes;
        for (const auto& h : r->ghs_hazards) codes += (codes.empty() ? "" : " ") + h;
        std::string pics;
        for (const auto& p : r->ghs_pictograms) pics += (pics.empty() ? "" : " ") + p;
        out.push_back(r->name + ": " + codes + (pics.empty() ? "" : " (" + pics + ")") + ".");
        corrosive |= r->is_corrosive();
        flammable |= r->is_flammable();
        const bool volatile_liquid = r->form == PhysicalForm::liquid;
        for (const auto& h : r->ghs_hazards)
            fumes |= (volatile_liquid && (h == "H335" || h == "H331" || h == "H332" || h == "H330" ||
                                          h == "H314"));
    }
    (void)lib;
    if (corrosive)
        out.push_back("Corrosive reagents: wear chemical-resistant gloves, eye protection and a lab "
                      "coat; add acid or base to water slowly, never water to it.");
    if (fumes)
        out.push_back("Concentrated corrosive or irritant liquids: open and measure them in a fume hood.");
    if (flammable) out.push_back("Flammable reagents: keep away from heat, sparks and open flames.");
    out.push_back("Read the safety data sheet of every reagent before use and follow your "
                  "laboratory's rules and licensed practice; these notes do not replace them.");
    return out;
}

} // namespace

Recipe design_recipe(const Library& lib, const RecipeRequest& req) {
    validate_common(req);
    Recipe recipe;
    recipe.request = req;
    std::vector<const Reagent*> used;

    switch (req.route) {
    case Route::mix:
    case Route::stocks: {
        if (req.acid.empty()) throw Error("acid", "is required for route \"mix\" and \"stocks\"");
        if (req.base.empty()) throw Error("base", "is required for route \"mix\" and \"stocks\"");
        const Reagent& acid = lib.reagent(req.acid, "acid");
        const Reagent& base = lib.reagent(req.base, "base");
        if (req.route == Route::stocks) {
            auto check_stock = [](const char* field, double m) {
                if (!std::isfinite(m) || m <= 0)
                    throw Error(field, format_number(m) + " is not a positive stock molarity");
                if (m > max_concentration_mol_per_l)
                    throw Error(field, format_number(m) + " mol/L is above " +
                                           format_number(max_concentration_mol_per_l) + " mol/L");
            };
            check_stock("acid_stock_mol_per_l", req.acid_stock_mol_per_l);
            check_stock("base_stock_mol_per_l", req.base_stock_mol_per_l);
        }
        const MixDesign d = design_mix(lib, req, acid, base);
        used = {&acid, &base};
        if (req.route == Route::mix) {
            if (d.c_acid > 0) recipe.items.push_back(item_for(req, acid, d.c_acid));
            if (d.c_base > 0) recipe.items.push_back(item_for(req, base, d.c_base));
        } else {
            if (d.c_acid > 0)
                recipe.items.push_back(solution_item(req, acid, d.c_acid, req.acid_stock_mol_per_l, "stock"));
            if (d.c_base > 0)
                recipe.items.push_back(solution_item(req, base, d.c_base, req.base_stock_mol_per_l, "stock"));
            double total_ml = 0;
            for (const auto& it : recipe.items) total_ml += *it.volume_ml;
            if (total_ml > req.volume_ml)
                throw Error(d.c_acid * req.volume_ml / req.acid_stock_mol_per_l >
                                    d.c_base * req.volume_ml / req.base_stock_mol_per_l
                                ? "acid_stock_mol_per_l"
                                : "base_stock_mol_per_l",
                            "the stocks are too dilute: " + format_amount(total_ml) +
                                " mL of stock exceeds the final volume of " +
                                format_number(req.volume_ml) + " mL");
        }
        if (d.c_acid > 0) recipe.composition.push_back({&acid, d.c_acid});
        if (d.c_base > 0) recipe.composition.push_back({&base, d.c_base});
        break;
    }
    case Route::titrate: {
        if (req.weigh.empty()) throw Error("weigh", "is required for route \"titrate\"");
        if (req.titrant.empty()) throw Error("titrant", "is required for route \"titrate\"");
        if (!std::isfinite(req.titrant_mol_per_l) || req.titrant_mol_per_l <= 0)
            throw Error("titrant_mol_per_l",
                        format_number(req.titrant_mol_per_l) + " is not a positive molarity");
        if (req.titrant_mol_per_l > max_titrant_mol_per_l)
            throw Error("titrant_mol_per_l", format_number(req.titrant_mol_per_l) +
                                                 " mol/L is above " +
                                                 format_number(max_titrant_mol_per_l) + " mol/L");
        const Reagent& weigh = lib.reagent(req.weigh, "weigh");
        const Reagent& titrant = lib.reagent(req.titrant, "titrant");
        const TitrationDesign d = design_titration(lib, req, weigh, titrant);
        used = {&weigh, &titrant};
        recipe.items.push_back(item_for(req, weigh, d.c_weigh));
        if (d.c_titrant > 0)
            recipe.items.push_back(solution_item(req, titrant, d.c_titrant, req.titrant_mol_per_l, "titrant"));
        recipe.composition.push_back({&weigh, d.c_weigh});
        if (d.c_titrant > 0) recipe.composition.push_back({&titrant, d.c_titrant});
        break;
    }
    }

    // A purity for a reagent the recipe does not use would be ignored without a word.
    for (const auto& override_entry : req.purity_overrides) {
        const std::string& id = override_entry.first;
        if (std::none_of(used.begin(), used.end(), [&](const Reagent* r) { return r->id == id; }))
            throw Error("purity_percent." + id, "\"" + id + "\" is not a reagent of this recipe");
    }

    recipe.predicted = solve(lib, recipe.composition, req.temperature_c);
    if (std::abs(recipe.predicted.ph - req.target_ph) > 1e-4)
        throw Error("target_ph", "internal check failed: the designed recipe solves to " +
                                     ph_text(recipe.predicted.ph) + ", not the target");

    // Steps, in bench order.
    auto& steps = recipe.steps;
    const double water_ml = std::round(req.volume_ml * 0.8);
    if (req.route == Route::stocks) {
        steps.push_back("Rinse a " + format_number(req.volume_ml) + " mL volumetric flask with HPLC-grade water.");
        add_amount_steps(lib, recipe, steps);
    } else {
        steps.push_back("Put about " + format_number(water_ml) +
                        " mL of HPLC-grade water (about 80 % of the final volume) in a clean beaker with a stirrer.");
        add_amount_steps(lib, recipe, steps);
    }
    if (req.route == Route::titrate) {
        const Reagent& titrant = lib.reagent(req.titrant);
        const auto& t = recipe.items.back();
        steps.push_back("Bring the solution to " + format_number(req.temperature_c) +
                        " °C and calibrate the pH meter at that temperature.");
        steps.push_back("While stirring, add " + titrant.name + " " + format_number(req.titrant_mol_per_l) +
                        " mol/L in small portions until the meter reads " + ph_text(req.target_ph) +
                        "; about " + format_amount(t.volume_ml.value_or(0)) + " mL is predicted.");
    } else {
        steps.push_back("Check the pH at " + format_number(req.temperature_c) + " °C: " +
                        ph_text(recipe.predicted.ph) +
                        " is predicted. If the meter reads more than 0.05 away, check the meter "
                        "calibration and the weighings before adjusting.");
    }
    if (req.route != Route::stocks)
        steps.push_back("Transfer to a " + format_number(req.volume_ml) +
                        " mL volumetric flask, rinse the beaker into it, and make up to the mark "
                        "with water at " + format_number(req.temperature_c) + " °C; mix well.");
    else
        steps.push_back("Make up to the mark with water at " + format_number(req.temperature_c) +
                        " °C and mix well.");
    steps.push_back("Filter through a 0.45 µm (or 0.2 µm) membrane filter suited to aqueous "
                    "solutions.");
    steps.push_back("Label the bottle: contents, pH, date, preparer, expiry.");

    recipe.cautions = cautions_for(lib, used);

    // Warnings.
    auto& w = recipe.warnings;
    const double t_k = to_kelvin(req.temperature_c);
    double nearest = std::numeric_limits<double>::infinity();
    std::string nearest_text;
    std::set<std::string> seen;
    for (const auto& c : recipe.composition)
        for (const auto& s : c.reagent->systems) {
            if (!seen.insert(s.system).second) continue;
            const auto& sys = lib.system(s.system);
            for (int j = 0; j < sys.steps(); ++j) {
                const double pka = sys.pka_at(j, t_k);
                if (std::abs(pka - req.target_ph) < nearest) {
                    nearest = std::abs(pka - req.target_ph);
                    nearest_text = sys.id + " pKa " + format_fixed(pka, 2);
                }
            }
        }
    if (nearest > 1.0)
        w.push_back({"ph-outside-pka-range", Warning::Severity::warning,
                     ph_text(req.target_ph) + " is " + format_fixed(nearest, 2) +
                         " pH units from the nearest pKa (" + nearest_text + " at " +
                         format_number(req.temperature_c) +
                         " °C); outside pKa ± 1 the solution buffers poorly."});
    if (recipe.predicted.buffer_capacity_mol_per_l < low_buffer_capacity)
        w.push_back({"low-buffer-capacity", Warning::Severity::caution,
                     "Buffer capacity " + format_fixed(recipe.predicted.buffer_capacity_mol_per_l * 1000, 2) +
                         " mmol/L per pH is below 2 mmol/L per pH (common practice, no source): "
                         "the sample or dissolved CO2 can shift the pH."});
    for (const auto& it : recipe.items) {
        const bool weighed = it.as == "solid";
        if (weighed && *it.mass_g < balance_min_mass_g)
            w.push_back({"small-amount", Warning::Severity::caution,
                         it.reagent + ": " + format_fixed(*it.mass_g * 1000, 2) +
                             " mg is below what a lab balance weighs well (10 mg); make a larger "
                             "volume or use a stock solution."});
        if (!weighed && it.volume_ml && *it.volume_ml < pipette_min_volume_ml)
            w.push_back({"small-amount", Warning::Severity::caution,
                         it.reagent + ": " + format_fixed(*it.volume_ml * 1000, 1) +
                             " µL is below what a pipette delivers well (10 µL); make a larger "
                             "volume or dilute the reagent first."});
        if (it.as.rfind("titrant", 0) == 0 && *it.volume_ml > 0.5 * req.volume_ml)
            w.push_back({"titrant-volume-large", Warning::Severity::caution,
                         "The titrant takes " + format_amount(*it.volume_ml) + " mL of the " +
                             format_number(req.volume_ml) +
                             " mL final volume; use a more concentrated titrant."});
    }
    for (const auto& pw : recipe.predicted.warnings) w.push_back(pw);
    return recipe;
}

} // namespace chem

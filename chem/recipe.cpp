#include "chem/recipe.h"
#include "chem/finding_text.h"
#include "chem/guard.h"

#include "chem/equilibrium_detail.h"
#include "chem/error.h"
#include "chem/recipe_roles.h"
#include "chem/units.h"

#include <boost/math/tools/roots.hpp>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <functional>
#include <limits>
#include <set>

namespace chem {

double purity_of(const RecipeRequest& req, const Reagent& r) {
    for (const auto& [id, p] : req.purity_overrides)
        if (id == r.id)
            return p;
    return r.assay_fraction;
}

namespace {

constexpr double max_volume_ml = 1.0e6; ///< 1000 L: no bench prepares more
constexpr double max_titrant_mol_per_l = 20.0;
constexpr double balance_min_mass_g =
    0.010; ///< common practice, no source: ~10 mg on a 0.1 mg balance
constexpr double pipette_min_volume_ml = 0.010; ///< common practice, no source: 10 µL
constexpr double low_buffer_capacity = 0.002;   ///< mol/L per pH; common practice, no source

RecipeItem item_for(const RecipeRequest& req, const Reagent& r, double mol_per_l) {
    RecipeItem it;
    it.reagent = r.id;
    it.mol_per_l = mol_per_l;
    const double mol = mol_per_l * req.volume_ml / 1000.0;
    const double material_g = mol * r.molar_mass_g_per_mol / purity_of(req, r);
    it.mass_g = guard::amount(material_g, "items." + r.id + ".mass_g", "mass");
    if (r.form == PhysicalForm::liquid) {
        it.volume_ml = guard::amount(material_g / r.density_g_per_ml,
                                     "items." + r.id + ".volume_ml", "volume");
        it.kind = ItemKind::liquid;
    } else {
        it.kind = ItemKind::solid;
    }
    return it;
}

/// A stock or titrant solution of stock_mol_per_l, measured by volume.
RecipeItem solution_item(const RecipeRequest& req, const Reagent& r, double mol_per_l,
                         double stock_mol_per_l, ItemKind kind) {
    RecipeItem it;
    it.reagent = r.id;
    it.kind = kind;
    it.mol_per_l = mol_per_l;
    it.volume_ml = guard::amount(mol_per_l * req.volume_ml / stock_mol_per_l,
                                 "items." + r.id + ".volume_ml", "volume");
    it.solution_mol_per_l = stock_mol_per_l;
    return it;
}

/// The titrant as supplied: a volume of the liquid, with its mass.
RecipeItem neat_titrant_item(const RecipeRequest& req, const Reagent& r, double mol_per_l) {
    RecipeItem it = item_for(req, r, mol_per_l);
    it.kind = ItemKind::titrant_neat;
    return it;
}

/// The most of a reagent as supplied that fits in 90 % of the flask, in mol/L of final solution
/// (a liquid: ρ · assay / M; a solid is limited by max_concentration_mol_per_l only).
double most_as_supplied_mol_per_l(const Reagent& r, double purity) {
    if (r.form != PhysicalForm::liquid)
        return max_concentration_mol_per_l;
    return std::min(0.9 * r.density_g_per_ml * purity / r.molar_mass_g_per_mol * 1000.0,
                    max_concentration_mol_per_l);
}

/// Solves g(x) = 0 on [lo, hi] for a monotone g known to change sign there.
double root_between(const std::function<double(double)>& g, double lo, double hi, double glo,
                    double ghi) {
    if (glo == 0)
        return lo;
    if (ghi == 0)
        return hi;
    std::uintmax_t iters = 200;
    auto r = boost::math::tools::toms748_solve(
        g, lo, hi, glo, ghi, boost::math::tools::eps_tolerance<double>(34), iters);
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
        if (!std::isfinite(v) || v <= 0)
            throw Error(field, format_number(v) + " is not a positive amount");
        if (v > max_concentration_mol_per_l)
            throw Error(field, format_number(v) + " mol/L is above " +
                                   format_number(max_concentration_mol_per_l) + " mol/L");
    };
    if (req.concentration_mol_per_l)
        check_amount("concentration_mol_per_l", *req.concentration_mol_per_l);
    if (req.ionic_strength_mol_per_l)
        check_amount("ionic_strength_mol_per_l", *req.ionic_strength_mol_per_l);
    for (const auto& [id, p] : req.purity_overrides)
        if (!std::isfinite(p) || p <= 0 || p > 1)
            throw Error("purity_percent." + id,
                        format_number(p * 100) + " % is outside 0 to 100 %");
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

std::string ph_text(double ph) {
    return "pH " + format_fixed(ph, 2);
}

/// Outer search over the buffer concentration for a target ionic strength. `solve_at(c)` returns
/// the ionic strength of the recipe designed at buffer concentration c, or NaN when the target
/// pH cannot be reached at c.
double concentration_for_ionic_strength(const std::function<double(double)>& ionic_at,
                                        double target_i, double c_max) {
    // The ionic strength is close to proportional to the concentration at a fixed pH (the
    // activity coefficients bend it a little): from c = I, one proportional step and then secant
    // steps usually land within 1e-11 in three to five designs. Anything else (a step out of
    // range, a pH not reached, no convergence in 8) goes to the bracketing search below, which
    // also words the refusals.
    {
        double c = std::min(c_max, target_i), i = ionic_at(c);
        double c_prev = 0, i_prev = 0;
        for (int k = 0; k < 8 && std::isfinite(i) && i > 0; ++k) {
            if (std::abs(i - target_i) <= 1e-11 * target_i)
                return c;
            const double next =
                k == 0 ? c * target_i / i : c + (target_i - i) * (c - c_prev) / (i - i_prev);
            if (!std::isfinite(next) || next <= 0 || next > c_max || next == c)
                break;
            c_prev = c;
            i_prev = i;
            c = next;
            i = ionic_at(c);
        }
    }
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
                    format_number(target_i) +
                        " mol/L cannot be reached with this buffer at up to " +
                        format_number(c_max) + " mol/L of it");
    return root_between([&](double c) { return ionic_at(c) - target_i; }, lo, hi, ilo - target_i,
                        ihi - target_i);
}

struct MixDesign {
    const AcidBaseSystem* system = nullptr;
    double c_acid = 0, c_base = 0; ///< formula units per litre
};

/// The shares of the system a mix pair has in common, in which the base form carries fewer
/// protons per unit. Throws chem::Error("base") when the two are not a conjugate pair.
std::pair<const SystemShare*, const SystemShare*> conjugate_shares(const Reagent& acid,
                                                                   const Reagent& base) {
    if (acid.id == base.id)
        throw Error("base", "\"" + base.name + "\" is the same as the acid form");
    for (const auto& s : acid.systems) {
        const SystemShare* other = base.share(s.system);
        if (!other)
            continue;
        // The shared system in which the base form carries fewer protons per unit.
        if (other->protons_removed / other->count > s.protons_removed / s.count + 1e-9)
            return {&s, other};
    }
    bool any_shared = false;
    for (const auto& s : acid.systems)
        any_shared |= base.has_system(s.system);
    if (!any_shared)
        throw Error("base", "\"" + base.name + "\" and \"" + acid.name +
                                "\" share no acid-base system, so they are not a conjugate pair");
    throw Error("base", "\"" + base.name + "\" is not a more basic form than \"" + acid.name +
                            "\"; swap acid and base");
}

MixDesign design_mix(const Library& lib, const RecipeRequest& req, const Reagent& acid,
                     const Reagent& base) {
    // Plain variables, not a structured binding: clang 14 (the fuzz and sanitizer builds) cannot
    // capture a binding in a lambda.
    const auto shares = conjugate_shares(acid, base);
    const auto sa = shares.first;
    const auto sb = shares.second;
    MixDesign d;
    d.system = &lib.system(sa->system);
    Pair pair{detail::build_problem(lib, {{&acid, 1.0}, {&base, 1.0}}, req.temperature_c,
                                    req.activity_model),
              std::nullopt};
    // x: fraction of the system's total that comes from the base form.
    auto amounts = [&](double total, double x) {
        return std::pair{(1 - x) * total / sa->count, x * total / sb->count};
    };
    auto reach = [&](double total) -> std::optional<double> {
        auto [a0, b0] = amounts(total, 0.0);
        auto [a1, b1] = amounts(total, 1.0);
        const double ph0 = pair.ph(a0, b0), ph1 = pair.ph(a1, b1);
        if (req.target_ph < ph0 || req.target_ph > ph1)
            return std::nullopt;
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
            throw Error("target_ph",
                        ph_text(req.target_ph) + " cannot be reached by mixing " + acid.name +
                            " and " + base.name + " at " + format_number(total) + " mol/L and " +
                            format_number(req.temperature_c) + " °C: the mix spans " +
                            ph_text(pair.ph(a0, b0)) + " to " + ph_text(pair.ph(a1, b1)));
        }
    } else {
        const double c_max = max_concentration_mol_per_l * std::min(sa->count, sb->count);
        total = concentration_for_ionic_strength(
            [&](double c) {
                auto x = reach(c);
                if (!x)
                    return std::numeric_limits<double>::quiet_NaN();
                auto [a, b] = amounts(c, *x);
                return pair.state(a, b).ionic_strength_mol_per_l;
            },
            *req.ionic_strength_mol_per_l, c_max);
    }
    if (!x)
        x = reach(total);
    std::tie(d.c_acid, d.c_base) = amounts(total, *x);
    return d;
}

/// Adding reagent `added` (n, formula units per litre of final solution) to reagent `held`,
/// whose amount is held_per_c · c − held_less_per_n · n for the request's concentration c:
/// salt basis, held at c (1, 0); total basis, the buffer system's total at c
/// (1/count_held, count_added/count_held when the added reagent shares the system, else 0).
/// pH(n) is monotone in n for a reagent that fits (titrant_fit); the search brackets the root
/// between the two ends of [0, n_max] and then narrows the bracket by factors of 4 from the top,
/// so it never solves far beyond the amount needed.
struct Addition {
    double held_per_c = 1;
    double held_less_per_n = 0;
    double n_max = 0; ///< the most that may be added, mol/L of final solution
};

struct AdditionDesign {
    double c_held = 0;  ///< formula units per litre
    double n_added = 0; ///< formula units per litre
};

class AdditionSearch {
  public:
    AdditionSearch(const Library& lib, const RecipeRequest& req, const Reagent& held,
                   const Reagent& added, const Addition& rule)
        : req_(req),
          rule_(rule), pair_{detail::build_problem(lib, {{&held, 1.0}, {&added, 1.0}},
                                                   req.temperature_c, req.activity_model),
                             std::nullopt} {}

    double held_at(double c, double n) const {
        return std::max(0.0, rule_.held_per_c * c - rule_.held_less_per_n * n);
    }
    double n_high(double c) const {
        return rule_.held_less_per_n > 0
                   ? std::min(rule_.n_max, rule_.held_per_c * c / rule_.held_less_per_n)
                   : rule_.n_max;
    }
    double ph(double c, double n) { return pair_.ph(held_at(c, n), n); }
    double ionic_strength(double c, double n) {
        return pair_.state(held_at(c, n), n).ionic_strength_mol_per_l;
    }

    /// The amount to add at concentration c, or nullopt; `ph_start`, `ph_end`: pH with nothing
    /// added and with n_high(c) added.
    std::optional<double> reach(double c, double* ph_start = nullptr, double* ph_end = nullptr) {
        const double target = req_.target_ph;
        const double n_hi = n_high(c);
        const double ph0 = ph(c, 0.0);
        const double ph1 = ph(c, n_hi);
        if (ph_start)
            *ph_start = ph0;
        if (ph_end)
            *ph_end = ph1;
        if (target < std::min(ph0, ph1) || target > std::max(ph0, ph1))
            return std::nullopt;
        auto g = [&](double n) { return ph(c, n) - target; };
        double lo = 0, glo = ph0 - target, hi = n_hi, ghi = ph1 - target;
        if (glo == 0)
            return lo;
        if (ghi == 0)
            return hi;
        for (int k = 0; k < 30; ++k) {
            const double n = hi / 4;
            const double gn = g(n);
            if (gn != 0 && (gn > 0) == (ghi > 0)) {
                hi = n;
                ghi = gn;
            } else {
                lo = n;
                glo = gn;
                break;
            }
        }
        return root_between(g, lo, hi, glo, ghi);
    }

    /// Solves for the addition at the request's concentration, or at the concentration that
    /// meets its ionic strength. Returns nullopt when the target pH cannot be reached at the
    /// concentration given; `c`, `ph_start`, `ph_end` then say where and what was reachable.
    std::optional<AdditionDesign> design(double* c, double* ph_start, double* ph_end) {
        if (req_.concentration_mol_per_l) {
            *c = *req_.concentration_mol_per_l;
        } else {
            *c = concentration_for_ionic_strength(
                [&](double conc) {
                    auto n = reach(conc);
                    if (!n)
                        return std::numeric_limits<double>::quiet_NaN();
                    return ionic_strength(conc, *n);
                },
                *req_.ionic_strength_mol_per_l, max_concentration_mol_per_l);
        }
        auto n = reach(*c, ph_start, ph_end);
        if (!n)
            return std::nullopt;
        return AdditionDesign{held_at(*c, *n), *n};
    }

  private:
    const RecipeRequest& req_;
    Addition rule_;
    Pair pair_;
};

/// Mix and stocks on the salt basis: the salt of the pair at c, its partner form added until the
/// target pH (as supplied for mix, from its stock for stocks).
MixDesign design_mix_on_salt(const Library& lib, const RecipeRequest& req, const Reagent& acid,
                             const Reagent& base) {
    const auto [sa, sb] = conjugate_shares(acid, base);
    const Reagent* salt = salt_of_pair(acid, base, sa->system);
    if (!salt) {
        const bool both = !acid.spectators.empty() || acid.systems.size() > 1;
        throw Error("concentration_basis",
                    "\"salt\" holds the salt of the pair at the concentration, but " +
                        std::string(both ? "both " : "neither of ") + "\"" + acid.name +
                        "\" and \"" + base.name + "\" carr" + (both ? "y" : "ies") +
                        " a counter-ion; use \"total\", or the titrate route to say which reagent "
                        "is weighed");
    }
    const Reagent& partner = salt == &acid ? base : acid;
    Addition rule;
    if (req.route == Route::stocks)
        rule.n_max = std::min(
            0.9 * (&partner == &acid ? req.acid_stock_mol_per_l : req.base_stock_mol_per_l),
            max_concentration_mol_per_l);
    else
        rule.n_max = most_as_supplied_mol_per_l(partner, purity_of(req, partner));
    AdditionSearch search(lib, req, *salt, partner, rule);
    double c = 0, ph0 = 0, ph1 = 0;
    const auto d = search.design(&c, &ph0, &ph1);
    if (!d)
        throw Error("target_ph", ph_text(req.target_ph) + " cannot be reached by adding " +
                                     partner.name + " to " + format_number(c) + " mol/L " +
                                     salt->name + " at " + format_number(req.temperature_c) +
                                     " °C: the mixture spans " + ph_text(ph0) + " (" + salt->name +
                                     " alone) to " + ph_text(ph1) + " (" +
                                     format_number(rule.n_max) + " mol/L of " + partner.name + ")");
    MixDesign m;
    m.system = &lib.system(sa->system);
    (salt == &acid ? m.c_acid : m.c_base) = d->c_held;
    (salt == &acid ? m.c_base : m.c_acid) = d->n_added;
    return m;
}

/// "formic-acid (lowers), ammonia (raises), …": the titrants that fit a weighed reagent.
std::string fitting_titrants(const Library& lib, const Reagent& weighed) {
    std::string out;
    for (const Reagent& r : lib.reagents())
        if (const auto fit = titrant_fit(lib, weighed, r))
            out += (out.empty() ? "" : ", ") + r.name + " (" + r.id + ", " +
                   direction_name(fit->direction) + ")";
    return out.empty() ? "none in the library" : out;
}

std::string reagent_label(const Reagent& r) {
    return r.name + " (" + r.formula + ", " + format_fixed(r.molar_mass_g_per_mol, 2) + " g/mol)";
}

void add_amount_steps(const Library& lib, const Recipe& recipe, std::vector<Step>& steps) {
    for (const auto& it : recipe.items) {
        const Reagent& r = lib.reagent(it.reagent);
        if (is_titrant(it.kind))
            continue;
        if (it.kind == ItemKind::solid) {
            steps.push_back({StepKind::dissolve_solid,
                             "Weigh " + format_measure(*it.mass_g, MeasureUnit::g) + " g of " +
                                 reagent_label(r) + " and dissolve it in the water.",
                             r.id, it.mass_g, std::nullopt});
        } else if (it.kind == ItemKind::liquid) {
            std::string s = "Measure " + format_measure(*it.volume_ml, MeasureUnit::ml) + " mL (" +
                            format_measure(*it.mass_g, MeasureUnit::g) + " g) of " +
                            reagent_label(r) + ", " + format_number(r.assay_fraction * 100) +
                            " % w/w, " + format_number(r.density_g_per_ml) +
                            " g/mL, and add it to the water";
            if (r.is_corrosive())
                s += " slowly, with stirring (acid or base into water, never water into it)";
            steps.push_back({StepKind::add_liquid, s + ".", r.id, it.mass_g, it.volume_ml});
        } else {
            steps.push_back({StepKind::pipette_solution,
                             "Pipette " + format_measure(*it.volume_ml, MeasureUnit::ml) +
                                 " mL of the " + r.name + " " + item_as_text(it) +
                                 " into the flask.",
                             r.id, std::nullopt, it.volume_ml});
        }
    }
}

std::vector<std::string> cautions_for(const Library& lib, const std::vector<const Reagent*>& used) {
    std::vector<std::string> out;
    bool corrosive = false, fumes = false, flammable = false;
    for (const Reagent* r : used) {
        if (r->ghs_hazards.empty())
            continue;
        std::string codes;
        for (const auto& h : r->ghs_hazards)
            codes += (codes.empty() ? "" : " ") + h;
        std::string pics;
        for (const auto& p : r->ghs_pictograms)
            pics += (pics.empty() ? "" : " ") + p;
        out.push_back(r->name + ": " + codes + (pics.empty() ? "" : " (" + pics + ")") + ".");
        corrosive |= r->is_corrosive();
        flammable |= r->is_flammable();
        const bool volatile_liquid = r->form == PhysicalForm::liquid;
        for (const auto& h : r->ghs_hazards)
            fumes |= (volatile_liquid &&
                      (h == "H335" || h == "H331" || h == "H332" || h == "H330" || h == "H314"));
    }
    (void)lib;
    if (corrosive)
        out.push_back(
            "Corrosive reagents: wear chemical-resistant gloves, eye protection and a lab "
            "coat; add acid or base to water slowly, never water to it.");
    if (fumes)
        out.push_back(
            "Concentrated corrosive or irritant liquids: open and measure them in a fume hood.");
    if (flammable)
        out.push_back("Flammable reagents: keep away from heat, sparks and open flames.");
    out.push_back("Read the safety data sheet of every reagent before use and follow your "
                  "laboratory's rules and licensed practice; these notes do not replace them.");
    return out;
}

} // namespace

const char* item_kind_name(ItemKind kind) {
    switch (kind) {
    case ItemKind::solid:
        return "solid";
    case ItemKind::liquid:
        return "liquid";
    case ItemKind::stock:
        return "stock";
    case ItemKind::titrant_solution:
        return "titrant";
    case ItemKind::titrant_neat:
        return "titrant, neat";
    }
    return "solid";
}

std::string item_as_text(const RecipeItem& item) {
    std::string s = item_kind_name(item.kind);
    if (item.kind == ItemKind::stock || item.kind == ItemKind::titrant_solution)
        s += " " + format_number(item.solution_mol_per_l) + " mol/L";
    return s;
}

Recipe design_recipe(const Library& lib, const RecipeRequest& req) {
    validate_common(req);
    Recipe recipe;
    recipe.request = req;
    std::vector<const Reagent*> used;

    switch (req.route) {
    case Route::mix:
    case Route::stocks: {
        if (req.acid.empty())
            throw Error("acid", "is required for route \"mix\" and \"stocks\"");
        if (req.base.empty())
            throw Error("base", "is required for route \"mix\" and \"stocks\"");
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
        const MixDesign d = req.basis.value_or(default_basis(req.route)) == ConcentrationBasis::salt
                                ? design_mix_on_salt(lib, req, acid, base)
                                : design_mix(lib, req, acid, base);
        used = {&acid, &base};
        if (req.route == Route::mix) {
            if (d.c_acid > 0)
                recipe.items.push_back(item_for(req, acid, d.c_acid));
            if (d.c_base > 0)
                recipe.items.push_back(item_for(req, base, d.c_base));
        } else {
            if (d.c_acid > 0)
                recipe.items.push_back(
                    solution_item(req, acid, d.c_acid, req.acid_stock_mol_per_l, ItemKind::stock));
            if (d.c_base > 0)
                recipe.items.push_back(
                    solution_item(req, base, d.c_base, req.base_stock_mol_per_l, ItemKind::stock));
            double total_ml = 0;
            for (const auto& it : recipe.items)
                total_ml += *it.volume_ml;
            if (total_ml > req.volume_ml)
                throw Error(d.c_acid * req.volume_ml / req.acid_stock_mol_per_l >
                                    d.c_base * req.volume_ml / req.base_stock_mol_per_l
                                ? "acid_stock_mol_per_l"
                                : "base_stock_mol_per_l",
                            "the stocks are too dilute: " + format_amount(total_ml) +
                                " mL of stock exceeds the final volume of " +
                                format_number(req.volume_ml) + " mL");
        }
        if (d.c_acid > 0)
            recipe.composition.push_back({&acid, d.c_acid});
        if (d.c_base > 0)
            recipe.composition.push_back({&base, d.c_base});
        break;
    }
    case Route::titrate: {
        if (req.weigh.empty())
            throw Error("weigh", "is required for route \"titrate\"");
        if (req.titrant.empty())
            throw Error("titrant", "is required for route \"titrate\"");
        const Reagent& weigh = lib.reagent(req.weigh, "weigh");
        const Reagent& titrant = lib.reagent(req.titrant, "titrant");
        const bool neat = req.titrant_form == TitrantForm::neat;
        if (neat) {
            if (req.titrant_mol_per_l != 0)
                throw Error("titrant_mol_per_l",
                            format_number(req.titrant_mol_per_l) +
                                " mol/L is given for a neat titrant: remove it, or set "
                                "titrant_form to \"solution\"");
            if (titrant.form != PhysicalForm::liquid)
                throw Error("titrant_form",
                            "\"" + titrant.name +
                                "\" is a solid and cannot be added neat: use titrant_form "
                                "\"solution\" with its titrant_mol_per_l");
        } else {
            if (!std::isfinite(req.titrant_mol_per_l) || req.titrant_mol_per_l <= 0)
                throw Error("titrant_mol_per_l",
                            format_number(req.titrant_mol_per_l) + " is not a positive molarity");
            if (req.titrant_mol_per_l > max_titrant_mol_per_l)
                throw Error("titrant_mol_per_l",
                            format_number(req.titrant_mol_per_l) + " mol/L is above " +
                                format_number(max_titrant_mol_per_l) + " mol/L");
        }
        if (weigh.id == titrant.id)
            throw Error("titrant", "\"" + titrant.name + "\" is the weighed reagent itself");
        const auto fit = titrant_fit(lib, weigh, titrant);
        if (!fit)
            throw Error("titrant",
                        "\"" + titrant.name + "\" cannot bring \"" + weigh.name +
                            "\" to pH: it is neither another form of its acid-base system nor a "
                            "strong acid or base; titrants that fit: " +
                            fitting_titrants(lib, weigh));
        Addition rule;
        rule.n_max = neat ? most_as_supplied_mol_per_l(titrant, purity_of(req, titrant))
                          : std::min(0.9 * req.titrant_mol_per_l, max_concentration_mol_per_l);
        const AcidBaseSystem* sys = buffer_system(lib, req);
        const bool total =
            req.basis.value_or(default_basis(req.route)) == ConcentrationBasis::total;
        if (total) {
            const SystemShare* ws = sys ? weigh.share(sys->id) : nullptr;
            if (!ws)
                throw Error("concentration_basis", "\"total\" counts an acid-base system, and \"" +
                                                       weigh.name + "\" has none; use \"salt\"");
            rule.held_per_c = 1.0 / ws->count;
            if (const SystemShare* ts = titrant.share(sys->id))
                rule.held_less_per_n = ts->count / ws->count;
        }
        AdditionSearch search(lib, req, weigh, titrant, rule);
        double c = 0, ph0 = 0, ph1 = 0;
        const auto d = search.design(&c, &ph0, &ph1);
        if (!d) {
            const bool raises = ph1 > ph0;
            std::string why;
            if ((raises && req.target_ph < ph0) || (!raises && req.target_ph > ph0))
                why = "the weighed " + weigh.name + " alone gives " + ph_text(ph0) + ", and " +
                      titrant.name + " can only " + (raises ? "raise" : "lower") + " it";
            else if (search.n_high(c) < rule.n_max)
                why = titrant.name + " reaches only " + ph_text(ph1) +
                      " when it brings all of the " + format_number(c) + " mol/L total " + sys->id;
            else if (rule.n_max >= max_concentration_mol_per_l)
                why = titrant.name + " reaches only " + ph_text(ph1) + " at " +
                      format_number(max_concentration_mol_per_l) +
                      " mol/L in the final solution, the most the designer adds";
            else
                why = titrant.name +
                      (neat ? " as supplied"
                            : " at " + format_number(req.titrant_mol_per_l) + " mol/L") +
                      " reaches only " + ph_text(ph1) +
                      " before its volume would fill 90 % of the flask";
            throw Error("target_ph",
                        ph_text(req.target_ph) + " cannot be reached by titrating " +
                            (total ? weigh.name + " at " + format_number(c) + " mol/L total " +
                                         (sys ? sys->id : std::string())
                                   : format_number(c) + " mol/L " + weigh.name) +
                            " with " + titrant.name + " at " + format_number(req.temperature_c) +
                            " °C: " + why + " (the titration spans " + ph_text(ph0) + " to " +
                            ph_text(ph1) + ")");
        }
        used = {&weigh, &titrant};
        if (d->c_held > 0)
            recipe.items.push_back(item_for(req, weigh, d->c_held));
        if (d->n_added > 0)
            recipe.items.push_back(neat ? neat_titrant_item(req, titrant, d->n_added)
                                        : solution_item(req, titrant, d->n_added,
                                                        req.titrant_mol_per_l,
                                                        ItemKind::titrant_solution));
        if (d->c_held > 0)
            recipe.composition.push_back({&weigh, d->c_held});
        if (d->n_added > 0)
            recipe.composition.push_back({&titrant, d->n_added});
        break;
    }
    }

    // A purity for a reagent the recipe does not use would be ignored without a word.
    for (const auto& override_entry : req.purity_overrides) {
        const std::string& id = override_entry.first;
        if (std::none_of(used.begin(), used.end(), [&](const Reagent* r) { return r->id == id; }))
            throw Error("purity_percent." + id, "\"" + id + "\" is not a reagent of this recipe");
    }

    recipe.predicted = solve(lib, recipe.composition, req.temperature_c, req.activity_model);
    if (std::abs(recipe.predicted.ph - req.target_ph) > 1e-4)
        throw Error("target_ph", "internal check failed: the designed recipe solves to " +
                                     ph_text(recipe.predicted.ph) + ", not the target");

    // The basis in words, and every family of species as made (both readings of "10 mM").
    {
        const AcidBaseSystem* bsys = buffer_system(lib, req);
        recipe.totals = family_totals(lib, recipe.composition, bsys ? bsys->id : std::string());
        recipe.basis = basis_statement(lib, recipe);
    }

    // Steps, in bench order. The pH is read before making up to volume (mix, titrate: in about
    // 80 % of the water plus what was added), so the meter target is the pH predicted at that
    // volume, stated beside the final one; the stocks route is made up first and read at volume.
    auto& steps = recipe.steps;
    const double water_ml = std::round(req.volume_ml * 0.8);
    double added_ml = 0;
    for (const auto& it : recipe.items)
        if (it.kind != ItemKind::solid && it.volume_ml)
            added_ml += *it.volume_ml;
    const double check_ml = std::min(req.volume_ml, water_ml + added_ml);
    const double check_ph = [&] {
        if (req.route == Route::stocks || check_ml >= req.volume_ml)
            return recipe.predicted.ph;
        std::vector<Component> at_check = recipe.composition;
        for (auto& c : at_check)
            c.mol_per_l *= req.volume_ml / check_ml;
        try {
            return solve(lib, at_check, req.temperature_c, req.activity_model).ph;
        } catch (const Error&) {
            return recipe.predicted.ph; // a concentrated recipe beyond the model: read at volume
        }
    }();
    const std::string at_volume =
        "about " + format_number(std::round(check_ml)) + " mL, before making up to volume";
    if (req.route == Route::stocks) {
        steps.push_back(
            Step{StepKind::rinse_flask, "Rinse a " + format_number(req.volume_ml) +
                                            " mL volumetric flask with HPLC-grade water."});
        add_amount_steps(lib, recipe, steps);
        steps.push_back(Step{StepKind::make_up, "Make up to the mark with water at " +
                                                    format_number(req.temperature_c) +
                                                    " °C and mix well."});
        steps.push_back(
            Step{StepKind::check_ph,
                 "Check the pH at " + format_number(req.temperature_c) +
                     " °C: " + ph_text(recipe.predicted.ph) +
                     " is predicted. If the meter reads more than 0.05 away, check the meter "
                     "calibration and the stock concentrations before adjusting."});
    } else {
        steps.push_back(
            Step{StepKind::water_in_beaker,
                 "Put about " + format_number(water_ml) +
                     " mL of HPLC-grade water (about 80 % of the final volume) in a clean "
                     "beaker with a stirrer."});
        add_amount_steps(lib, recipe, steps);
    }
    if (req.route == Route::titrate) {
        const Reagent& titrant = lib.reagent(req.titrant);
        RecipeItem t;
        for (const auto& it : recipe.items)
            if (it.kind == ItemKind::titrant_solution || it.kind == ItemKind::titrant_neat)
                t = it;
        const bool neat = req.titrant_form == TitrantForm::neat;
        std::string predicted = format_measure(t.volume_ml.value_or(0), MeasureUnit::ml) + " mL";
        if (neat)
            predicted += " (" + format_measure(t.mass_g.value_or(0), MeasureUnit::g) + " g)";
        steps.push_back(Step{StepKind::calibrate_meter,
                             "Bring the solution to " + format_number(req.temperature_c) +
                                 " °C and calibrate the pH meter at that temperature."});
        steps.push_back(Step{
            StepKind::titrate,
            "While stirring, add " + titrant.name +
                (neat ? " as supplied (neat), drop by drop,"
                      : " " + format_number(req.titrant_mol_per_l) + " mol/L in small portions") +
                " until the meter reads " + ph_text(check_ph) + " (the pH predicted at " +
                at_volume + "; " + ph_text(req.target_ph) + " after making up); about " +
                predicted + " is predicted."});
    } else if (req.route == Route::mix) {
        steps.push_back(Step{
            StepKind::check_ph,
            "Check the pH at " + format_number(req.temperature_c) + " °C: " + ph_text(check_ph) +
                " is predicted at " + at_volume + " (" + ph_text(recipe.predicted.ph) +
                " after making up). If the meter reads more than 0.05 away, check the meter "
                "calibration and the weighings before adjusting."});
    }
    if (req.route != Route::stocks)
        steps.push_back(
            Step{StepKind::transfer_and_make_up,
                 "Transfer to a " + format_number(req.volume_ml) +
                     " mL volumetric flask, rinse the beaker into it, and make up to the mark "
                     "with water at " +
                     format_number(req.temperature_c) + " °C; mix well."});
    steps.push_back(Step{StepKind::filter,
                         "Filter through a 0.45 µm (or 0.2 µm) membrane filter suited to aqueous "
                         "solutions."});
    steps.push_back(
        Step{StepKind::label, "Label the bottle: contents, pH, date, preparer, expiry."});

    recipe.cautions = cautions_for(lib, used);

    // Warnings. The buffering range is judged on the conditional pKa′ at the solution's ionic
    // strength, pKa′ = pKa − log10 γ(acid form) + log10 γ(base form) (the ratio of concentrations
    // equals 1 at pH = pKa′): phosphate pK2 7.20 is 6.88 at I = 0.1 mol/L.
    auto& w = recipe.warnings;
    const double t_k = to_kelvin(req.temperature_c);
    auto gamma_of = [&](const std::string& system, const std::string& species) {
        for (const auto& sp : recipe.predicted.species)
            if (sp.system == system && sp.species == species)
                return sp.activity_coefficient;
        return 1.0;
    };
    double nearest = std::numeric_limits<double>::infinity();
    std::string nearest_system; ///< the nearest step's system, its pKa′ and pKa at T
    double nearest_pka_conditional = 0, nearest_pka = 0;
    std::set<std::string> seen;
    for (const auto& c : recipe.composition)
        for (const auto& s : c.reagent->systems) {
            if (!seen.insert(s.system).second)
                continue;
            const auto& sys = lib.system(s.system);
            for (int j = 0; j < sys.steps(); ++j) {
                const double pka = sys.pka_at(j, t_k) -
                                   std::log10(gamma_of(sys.id, sys.species[j])) +
                                   std::log10(gamma_of(sys.id, sys.species[j + 1]));
                if (std::abs(pka - req.target_ph) < nearest) {
                    nearest = std::abs(pka - req.target_ph);
                    nearest_system = sys.id;
                    nearest_pka_conditional = pka;
                    nearest_pka = sys.pka_at(j, t_k);
                }
            }
        }
    auto finding = [](FindingKind kind, Severity severity, Subject subject) {
        Finding f;
        f.kind = kind;
        f.severity = severity;
        f.subject = std::move(subject);
        return f;
    };
    if (nearest > 1.0) {
        Finding f =
            finding(FindingKind::ph_outside_pka_range, Severity::warning,
                    nearest_system.empty() ? Subject{} : Subject::of_system(nearest_system));
        f.number("target_ph", req.target_ph);
        f.number("gap", nearest);
        f.number("pka_conditional", nearest_pka_conditional);
        f.number("pka", nearest_pka);
        f.number("temperature_c", req.temperature_c);
        f.number("ionic_strength_mol_per_l", recipe.predicted.ionic_strength_mol_per_l);
        w.push_back(warning_of(std::move(f)));
    }
    if (recipe.predicted.buffer_capacity_mol_per_l < low_buffer_capacity) {
        Finding f = finding(FindingKind::low_buffer_capacity, Severity::caution, Subject{});
        f.number("buffer_capacity_mol_per_l", recipe.predicted.buffer_capacity_mol_per_l);
        w.push_back(warning_of(std::move(f)));
    }
    // Reagents by the library's name in the sentences.
    RenderContext words;
    words.name_of = [&lib](const std::string& id) { return lib.reagent(id).name; };
    for (const auto& it : recipe.items) {
        const bool weighed = it.kind == ItemKind::solid;
        if (weighed && *it.mass_g < balance_min_mass_g) {
            Finding f = finding(FindingKind::small_amount, Severity::caution,
                                Subject::of_reagent(it.reagent));
            f.number("mass_g", *it.mass_g);
            w.push_back(warning_of(std::move(f), words));
        }
        if (!weighed && it.volume_ml && *it.volume_ml < pipette_min_volume_ml) {
            Finding f = finding(FindingKind::small_amount, Severity::caution,
                                Subject::of_reagent(it.reagent));
            f.number("volume_ml", *it.volume_ml);
            w.push_back(warning_of(std::move(f), words));
        }
        if (is_titrant(it.kind) && *it.volume_ml > 0.5 * req.volume_ml) {
            Finding f = finding(FindingKind::titrant_volume_large, Severity::caution,
                                Subject::of_reagent(it.reagent));
            f.number("volume_ml", *it.volume_ml);
            f.number("final_volume_ml", req.volume_ml);
            w.push_back(warning_of(std::move(f), words));
        }
    }
    for (const auto& pw : recipe.predicted.warnings)
        w.push_back(pw);
    return recipe;
}

} // namespace chem

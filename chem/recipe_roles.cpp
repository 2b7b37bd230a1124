// Roles of reagents in a recipe, route changes, and the words for a buffer (chem/recipe_roles.h).
#include "chem/recipe_roles.h"

#include "chem/error.h"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <limits>

namespace chem {

const char* basis_name(ConcentrationBasis basis) {
    switch (basis) {
    case ConcentrationBasis::total:
        return "total";
    case ConcentrationBasis::salt:
        return "salt";
    }
    return "total";
}

std::optional<ConcentrationBasis> basis_from_name(const std::string& name) {
    if (name == "total")
        return ConcentrationBasis::total;
    if (name == "salt")
        return ConcentrationBasis::salt;
    return std::nullopt;
}

ConcentrationBasis default_basis(Route route) {
    return route == Route::titrate ? ConcentrationBasis::salt : ConcentrationBasis::total;
}

const char* titrant_form_name(TitrantForm form) {
    return form == TitrantForm::neat ? "neat" : "solution";
}

std::optional<TitrantForm> titrant_form_from_name(const std::string& name) {
    if (name == "solution")
        return TitrantForm::solution;
    if (name == "neat")
        return TitrantForm::neat;
    return std::nullopt;
}

const char* direction_name(PhDirection direction) {
    return direction == PhDirection::raises ? "raises" : "lowers";
}

namespace {

/// Below this pKa at 25 °C an acid counts as strong for titration: at pH 2.5 and above it is
/// over 97 % dissociated. Common practice, no source.
constexpr double strong_acid_pka = 1.0;

double per_unit(const SystemShare& s) {
    return s.protons_removed / s.count;
}

bool has_counter_ion(const Reagent& r, const std::string& system) {
    if (!r.spectators.empty())
        return true;
    return std::any_of(r.systems.begin(), r.systems.end(),
                       [&](const SystemShare& s) { return s.system != system; });
}

/// An acid that gives up all its protons across the buffer range: no system (HCl), or only
/// fully protonated systems whose every pKa is below strong_acid_pka (TFA).
bool strong_acid_like(const Library& lib, const Reagent& r) {
    if (r.is_strong_acid())
        return true;
    if (r.systems.empty())
        return false;
    for (const auto& ion : r.spectators)
        if (ion.charge > 0)
            return false;
    for (const auto& s : r.systems) {
        if (s.protons_removed != 0)
            return false;
        const AcidBaseSystem* sys = lib.find_system(s.system);
        if (!sys || sys->pka_25c.empty())
            return false;
        for (double pka : sys->pka_25c)
            if (!(pka < strong_acid_pka))
                return false;
    }
    return true;
}

/// The system a mix pair shares in which `base` carries fewer protons per unit than `acid`.
const std::string* pair_system(const Reagent& acid, const Reagent& base) {
    for (const auto& s : acid.systems)
        if (const SystemShare* other = base.share(s.system))
            if (per_unit(*other) > per_unit(s) + 1e-9)
                return &s.system;
    return nullptr;
}

RoleChoice choice_of(const Reagent& r, const std::string& system) {
    RoleChoice c;
    c.reagent = r.id;
    c.name = r.name;
    c.formula = r.formula;
    c.form = r.form;
    if (const SystemShare* s = r.share(system))
        c.protons_removed_per_unit = per_unit(*s);
    c.salt = has_counter_ion(r, system);
    return c;
}

std::string lower_first(std::string s) {
    // "Formic acid" → "formic acid"; "TFA", "Tris" keep their capitals only when the second
    // letter is a capital too (an abbreviation).
    if (s.size() >= 2 && std::isupper(static_cast<unsigned char>(s[0])) &&
        !std::isupper(static_cast<unsigned char>(s[1])))
        s[0] = static_cast<char>(std::tolower(static_cast<unsigned char>(s[0])));
    return s;
}

/// Three significant figures, trailing zeros dropped: 20, 67.2, 1.48, 0.05.
std::string three_figures(double v) {
    if (!(v > 0) || !std::isfinite(v))
        return format_number(v);
    const int decimals = std::clamp(2 - static_cast<int>(std::floor(std::log10(v))), 0, 6);
    std::string s = format_fixed(v, decimals);
    if (s.find('.') != std::string::npos) {
        while (s.back() == '0')
            s.pop_back();
        if (s.back() == '.')
            s.pop_back();
    }
    return s;
}

/// "20 mM" or "1.5 M" for a buffer name.
std::string short_concentration(double mol_per_l) {
    return mol_per_l >= 1 ? three_figures(mol_per_l) + " M"
                          : three_figures(mol_per_l * 1000) + " mM";
}

/// pH with two decimals, or one when the second is 0: "2.5", "3.0", "6.85".
std::string name_ph(double ph) {
    std::string s = format_fixed(ph, 2);
    if (s.size() > 3 && s.back() == '0')
        s.pop_back();
    return s;
}

const SystemShare* nearest_pka_share(const Library& lib, const Reagent& r, double ph) {
    const SystemShare* best = nullptr;
    double best_gap = std::numeric_limits<double>::infinity();
    for (const auto& s : r.systems) {
        const AcidBaseSystem* sys = lib.find_system(s.system);
        if (!sys)
            continue;
        for (double pka : sys->pka_25c)
            if (std::abs(pka - ph) < best_gap) {
                best_gap = std::abs(pka - ph);
                best = &s;
            }
    }
    return best;
}

/// The reagents of a request that are known, as (held-or-first, other).
struct Participants {
    const Reagent* first = nullptr;  ///< mix/stocks: acid; titrate: weighed
    const Reagent* second = nullptr; ///< mix/stocks: base; titrate: titrant
};
Participants participants(const Library& lib, const RecipeRequest& req) {
    if (req.route == Route::titrate)
        return {lib.find_reagent(req.weigh), lib.find_reagent(req.titrant)};
    return {lib.find_reagent(req.acid), lib.find_reagent(req.base)};
}

/// The reagent held at c on the salt basis, and the one that brings the pH; nullptr when the
/// request does not say.
std::pair<const Reagent*, const Reagent*>
held_and_adjusting(const Library& lib, const RecipeRequest& req, const AcidBaseSystem* sys) {
    const Participants p = participants(lib, req);
    if (req.route == Route::titrate)
        return {p.first, p.second};
    if (!p.first || !p.second || !sys)
        return {nullptr, nullptr};
    const Reagent* salt = salt_of_pair(*p.first, *p.second, sys->id);
    if (!salt)
        return {nullptr, nullptr};
    return {salt, salt == p.first ? p.second : p.first};
}

/// Counter-ion words of the reagents used, beside the buffer system: cations as spectators
/// ("sodium") and cationic acid-base systems ("ammonium"). Anions are left out ("tris", not
/// "tris chloride").
std::string cation_words(const Library& lib, std::initializer_list<const Reagent*> used,
                         const std::string& buffer_system_id) {
    std::vector<std::string> words;
    auto add = [&](const std::string& w) {
        if (std::find(words.begin(), words.end(), w) == words.end())
            words.push_back(w);
    };
    for (const Reagent* r : used) {
        if (!r)
            continue;
        for (const auto& ion : r->spectators)
            if (ion.charge > 0)
                add(ion_words(ion.ion));
        for (const auto& s : r->systems) {
            if (s.system == buffer_system_id)
                continue;
            const AcidBaseSystem* sys = lib.find_system(s.system);
            if (sys && sys->charge_fully_protonated > 0)
                add(system_words(*sys));
        }
    }
    std::string out;
    for (const auto& w : words)
        out += (out.empty() ? "" : " ") + w;
    return out;
}

/// A form of `system` that pairs with `weighed` in the direction the strong `titrant` moved it,
/// and brings no ion that weighed and titrant did not bring (KH2PO4 + KOH → K2HPO4). The form
/// next to the weighed one wins; among equals, the library's first (anhydrous before hydrates).
const Reagent* conjugate_form(const Library& lib, const Reagent& weighed, const Reagent& titrant,
                              const std::string& system, PhDirection direction) {
    const SystemShare* ws = weighed.share(system);
    if (!ws)
        return nullptr;
    auto brought = [&](const std::string& ion) {
        auto has = [&](const Reagent& r) {
            return std::any_of(r.spectators.begin(), r.spectators.end(),
                               [&](const SpectatorIon& s) { return s.ion == ion; });
        };
        return has(weighed) || has(titrant);
    };
    const Reagent* best = nullptr;
    double best_gap = std::numeric_limits<double>::infinity();
    for (const Reagent& r : lib.reagents()) {
        if (r.id == weighed.id)
            continue;
        const SystemShare* rs = r.share(system);
        if (!rs)
            continue;
        const double gap = per_unit(*rs) - per_unit(*ws);
        if (direction == PhDirection::raises ? gap <= 1e-9 : gap >= -1e-9)
            continue;
        if (!std::all_of(r.spectators.begin(), r.spectators.end(),
                         [&](const SpectatorIon& s) { return brought(s.ion); }))
            continue;
        if (!std::all_of(r.systems.begin(), r.systems.end(), [&](const SystemShare& s) {
                return s.system == system || weighed.has_system(s.system);
            }))
            continue;
        if (std::abs(gap) < best_gap - 1e-9) {
            best = &r;
            best_gap = std::abs(gap);
        }
    }
    return best;
}

} // namespace

std::optional<TitrantFit> titrant_fit(const Library& lib, const Reagent& weighed,
                                      const Reagent& titrant) {
    if (weighed.id == titrant.id)
        return std::nullopt;
    int sign = 0;
    std::string shared;
    for (const auto& ts : titrant.systems) {
        const SystemShare* ws = weighed.share(ts.system);
        if (!ws)
            continue;
        const double gap = per_unit(ts) - per_unit(*ws);
        if (std::abs(gap) < 1e-9)
            continue;                   // the same form of this system: moves nothing here
        const int s = gap > 0 ? 1 : -1; // fewer protons than the weighed form: raises the pH
        if (sign != 0 && s != sign)
            return std::nullopt; // raises in one system, lowers in another
        if (sign == 0)
            shared = ts.system;
        sign = s;
    }
    if (sign != 0)
        return TitrantFit{sign > 0 ? PhDirection::raises : PhDirection::lowers, shared};
    if (strong_acid_like(lib, titrant))
        return TitrantFit{PhDirection::lowers, ""};
    if (titrant.is_strong_base())
        return TitrantFit{PhDirection::raises, ""};
    return std::nullopt;
}

const Reagent* salt_of_pair(const Reagent& acid, const Reagent& base, const std::string& system) {
    const bool a = has_counter_ion(acid, system), b = has_counter_ion(base, system);
    if (a == b)
        return nullptr;
    return a ? &acid : &base;
}

const AcidBaseSystem* buffer_system(const Library& lib, const RecipeRequest& req) {
    const Participants p = participants(lib, req);
    if (req.route != Route::titrate) {
        if (!p.first || !p.second)
            return nullptr;
        const std::string* s = pair_system(*p.first, *p.second);
        return s ? lib.find_system(*s) : nullptr;
    }
    if (!p.first)
        return nullptr;
    if (p.second)
        if (auto fit = titrant_fit(lib, *p.first, *p.second); fit && !fit->shared_system.empty())
            return lib.find_system(fit->shared_system);
    const SystemShare* s = nearest_pka_share(lib, *p.first, req.target_ph);
    return s ? lib.find_system(s->system) : nullptr;
}

RoleChoices reagent_choices(const Library& lib, const std::string& system, Route route,
                            const std::string& acid, const std::string& weigh) {
    RoleChoices out;
    if (!lib.find_system(system))
        return out;
    std::vector<RoleChoice> members;
    for (const Reagent& r : lib.reagents())
        if (r.has_system(system))
            members.push_back(choice_of(r, system));
    std::stable_sort(members.begin(), members.end(), [](const RoleChoice& a, const RoleChoice& b) {
        return a.protons_removed_per_unit < b.protons_removed_per_unit;
    });
    if (members.empty())
        return out;
    if (route == Route::titrate) {
        out.weighable = members;
        const Reagent* w = lib.find_reagent(weigh);
        if (!w)
            return out;
        std::vector<RoleChoice> strong;
        for (const Reagent& r : lib.reagents()) {
            const auto fit = titrant_fit(lib, *w, r);
            if (!fit)
                continue;
            RoleChoice c = choice_of(r, fit->shared_system.empty() ? system : fit->shared_system);
            c.direction = fit->direction;
            c.strong = fit->shared_system.empty();
            (c.strong ? strong : out.titrants).push_back(c);
        }
        std::stable_sort(out.titrants.begin(), out.titrants.end(),
                         [](const RoleChoice& a, const RoleChoice& b) {
                             return a.protons_removed_per_unit < b.protons_removed_per_unit;
                         });
        out.titrants.insert(out.titrants.end(), strong.begin(), strong.end());
        return out;
    }
    const double p_min = members.front().protons_removed_per_unit;
    const double p_max = members.back().protons_removed_per_unit;
    std::optional<double> p_acid;
    if (const Reagent* a = lib.find_reagent(acid))
        if (const SystemShare* s = a->share(system))
            p_acid = per_unit(*s);
    for (const RoleChoice& m : members) {
        const double p = m.protons_removed_per_unit;
        if (p < p_max - 1e-9)
            out.acid_forms.push_back(m);
        if (p > p_min + 1e-9 && (!p_acid || p > *p_acid + 1e-9))
            out.base_forms.push_back(m);
        if (m.salt)
            out.salts.push_back(m);
    }
    return out;
}

RouteChange map_reagents_to_route(const Library& lib, const std::string& system, Route from,
                                  Route to, const RouteReagents& current) {
    RouteChange ch;
    ch.reagents = current;
    RouteReagents& r = ch.reagents;
    const bool pair_from = from != Route::titrate, pair_to = to != Route::titrate;

    if (pair_from && !pair_to) {
        const Reagent* a = lib.find_reagent(current.acid);
        const Reagent* b = lib.find_reagent(current.base);
        if (!a || !b) {
            r.weigh = a ? a->id : b ? b->id : std::string();
            r.titrant.clear();
            RouteNote n;
            n.field = r.weigh.empty() ? "weigh" : "titrant";
            n.kind = RouteNoteKind::no_pair_to_carry;
            ch.notes.push_back(std::move(n));
        } else {
            const std::string* sys = pair_system(*a, *b);
            const Reagent* salt = sys ? salt_of_pair(*a, *b, *sys) : nullptr;
            const Reagent& weighed = salt ? *salt : *a;
            const Reagent& partner = &weighed == a ? *b : *a;
            r.weigh = weighed.id;
            if (titrant_fit(lib, weighed, partner)) {
                r.titrant = partner.id;
                r.titrant_form = partner.form == PhysicalForm::liquid ? TitrantForm::neat
                                                                      : TitrantForm::solution;
                RouteNote n;
                n.field = "titrant";
                n.kind = RouteNoteKind::weighed_with_partner;
                n.weighed = weighed.id;
                n.partner = partner.id;
                n.titrant_form = r.titrant_form;
                ch.notes.push_back(std::move(n));
            } else {
                r.titrant.clear();
                RouteNote n;
                n.field = "titrant";
                n.kind = RouteNoteKind::partner_cannot_titrate;
                n.weighed = weighed.id;
                n.partner = partner.id;
                ch.notes.push_back(std::move(n));
            }
        }
        ch.complete = !r.weigh.empty() && !r.titrant.empty();
        return ch;
    }

    if (!pair_from && pair_to) {
        const Reagent* w = lib.find_reagent(current.weigh);
        const Reagent* t = lib.find_reagent(current.titrant);
        r.acid.clear();
        r.base.clear();
        if (!w) {
            RouteNote n;
            n.field = "acid";
            n.kind = RouteNoteKind::no_weighed_reagent;
            ch.notes.push_back(std::move(n));
            return ch;
        }
        const auto fit = t ? titrant_fit(lib, *w, *t) : std::nullopt;
        const std::string sys_id =
            w->has_system(system) || w->systems.empty() ? system : w->systems.front().system;
        auto place = [&](const Reagent& other, PhDirection other_moves) {
            // The partner that raises the pH is the base form.
            (other_moves == PhDirection::raises ? r.base : r.acid) = other.id;
            (other_moves == PhDirection::raises ? r.acid : r.base) = w->id;
        };
        if (fit && !fit->shared_system.empty()) {
            place(*t, fit->direction);
        } else if (fit) {
            if (const Reagent* partner = conjugate_form(lib, *w, *t, sys_id, fit->direction)) {
                place(*partner, fit->direction);
                RouteNote n;
                n.field = fit->direction == PhDirection::raises ? "base" : "acid";
                n.kind = RouteNoteKind::strong_titrant_replaced;
                n.titrant = t->id;
                n.partner = partner->id;
                n.system = sys_id;
                n.to = to;
                ch.notes.push_back(std::move(n));
            } else {
                const bool raises = fit->direction == PhDirection::raises;
                (raises ? r.acid : r.base) = w->id;
                RouteNote n;
                n.field = raises ? "base" : "acid";
                n.kind = RouteNoteKind::no_form_made_with;
                n.titrant = t->id;
                n.system = sys_id;
                n.direction = fit->direction;
                ch.notes.push_back(std::move(n));
            }
        } else {
            // No titrant to pair with: the weighed form goes where the system has room for a
            // partner.
            const RoleChoices roles = reagent_choices(lib, sys_id, to);
            const bool can_be_acid =
                std::any_of(roles.acid_forms.begin(), roles.acid_forms.end(),
                            [&](const RoleChoice& c) { return c.reagent == w->id; });
            (can_be_acid ? r.acid : r.base) = w->id;
            RouteNote n;
            n.field = can_be_acid ? "base" : "acid";
            n.kind = RouteNoteKind::titrant_not_a_form;
            n.system = sys_id;
            ch.notes.push_back(std::move(n));
        }
    }

    if (pair_to) {
        const Reagent* a = lib.find_reagent(r.acid);
        const Reagent* b = lib.find_reagent(r.base);
        ch.complete = a && b;
        if (r.basis == ConcentrationBasis::salt && a && b) {
            const std::string* sys = pair_system(*a, *b);
            if (!sys || !salt_of_pair(*a, *b, *sys)) {
                r.basis = ConcentrationBasis::total;
                RouteNote n;
                n.field = "concentration_basis";
                n.kind = RouteNoteKind::salt_basis_dropped;
                n.acid = a->id;
                n.base = b->id;
                ch.notes.push_back(std::move(n));
            }
        }
    } else {
        ch.complete = lib.find_reagent(r.weigh) && lib.find_reagent(r.titrant);
    }
    return ch;
}

std::string concentration_text(double mol_per_l) {
    return mol_per_l >= 1 ? three_figures(mol_per_l) + " mol/L"
                          : three_figures(mol_per_l * 1000) + " mmol/L";
}

std::string reagent_words(const Reagent& reagent) {
    std::string s = reagent.name;
    for (const char* cut : {", ", " ("}) {
        const auto at = s.find(cut);
        if (at != std::string::npos && at > 0)
            s.erase(at);
    }
    // A trailing grade such as " 98 %" or " 25 %".
    if (s.size() > 2 && s.compare(s.size() - 2, 2, " %") == 0) {
        auto at = s.find_last_not_of("0123456789.", s.size() - 3);
        if (at != std::string::npos && at < s.size() - 3 && s[at] == ' ')
            s.erase(at);
    }
    return lower_first(s);
}

std::string system_words(const AcidBaseSystem& system) {
    std::string s = system.name.empty() ? system.id : system.name;
    const auto at = s.find(" (");
    if (at != std::string::npos && at > 0)
        s.erase(at);
    return lower_first(s);
}

std::string ion_words(const std::string& ion) {
    static const std::pair<const char*, const char*> names[] = {
        {"Na+", "sodium"},     {"K+", "potassium"},     {"Li+", "lithium"}, {"Ca+2", "calcium"},
        {"Mg+2", "magnesium"}, {"Cl-", "chloride"},     {"Br-", "bromide"}, {"NO3-", "nitrate"},
        {"SO4-2", "sulfate"},  {"ClO4-", "perchlorate"}};
    for (const auto& [formula, word] : names)
        if (ion == formula)
            return word;
    return ion;
}

std::vector<FamilyTotal> family_totals(const Library& lib,
                                       const std::vector<Component>& composition,
                                       const std::string& first_system) {
    std::vector<FamilyTotal> systems, ions;
    auto add = [](std::vector<FamilyTotal>& list, FamilyTotal::Kind kind, const std::string& id,
                  const std::string& name, double c) {
        for (auto& f : list)
            if (f.id == id) {
                f.mol_per_l += c;
                return;
            }
        list.push_back({kind, id, name, c});
    };
    for (const auto& comp : composition) {
        if (!comp.reagent)
            continue;
        for (const auto& s : comp.reagent->systems) {
            const AcidBaseSystem* sys = lib.find_system(s.system);
            add(systems, FamilyTotal::Kind::system, s.system, sys ? system_words(*sys) : s.system,
                s.count * comp.mol_per_l);
        }
        for (const auto& ion : comp.reagent->spectators)
            add(ions, FamilyTotal::Kind::ion, ion.ion, ion_words(ion.ion),
                ion.count * comp.mol_per_l);
    }
    std::stable_partition(systems.begin(), systems.end(),
                          [&](const FamilyTotal& f) { return f.id == first_system; });
    systems.insert(systems.end(), ions.begin(), ions.end());
    return systems;
}

BasisStatement basis_statement(const Library& lib, const Recipe& recipe) {
    const RecipeRequest& req = recipe.request;
    BasisStatement b;
    b.basis = req.basis.value_or(default_basis(req.route));
    const AcidBaseSystem* sys = buffer_system(lib, req);
    if (sys)
        b.system = sys->id;
    const auto [held, adjusting] = held_and_adjusting(lib, req, sys);
    // A mix on the total basis has no reagent that "brings" the pH: both forms share the total.
    if (adjusting && (req.route == Route::titrate || b.basis == ConcentrationBasis::salt))
        b.adjusting_reagent = adjusting->id;
    double system_total = 0;
    for (const auto& f : recipe.totals)
        if (f.kind == FamilyTotal::Kind::system && f.id == b.system)
            system_total = f.mol_per_l;
    const std::string sys_words = sys ? system_words(*sys) : std::string("buffer");
    const std::string ph = "pH " + format_fixed(req.target_ph, 2);
    if (b.basis == ConcentrationBasis::salt && held) {
        b.held_reagent = held->id;
        for (const auto& c : recipe.composition)
            if (c.reagent == held)
                b.concentration_mol_per_l += c.mol_per_l;
        b.text = concentration_text(b.concentration_mol_per_l) + " " + reagent_words(*held);
        if (adjusting)
            b.text += ", brought to " + ph + " with " + reagent_words(*adjusting);
        if (sys)
            b.text += ": " + sys_words + " " + concentration_text(system_total) + " in all";
    } else {
        b.concentration_mol_per_l = system_total;
        b.text = concentration_text(system_total) + " total " + sys_words;
        if (req.route == Route::titrate && held && adjusting)
            b.text += ": " + reagent_words(*held) + " brought to " + ph + " with " +
                      reagent_words(*adjusting);
    }
    return b;
}

std::string default_buffer_name(const Library& lib, const RecipeRequest& req) {
    const AcidBaseSystem* sys = buffer_system(lib, req);
    const Participants p = participants(lib, req);
    const ConcentrationBasis basis = req.basis.value_or(default_basis(req.route));
    std::string subject;
    bool salt_differs = false;
    if (basis == ConcentrationBasis::salt && sys) {
        const auto [held, adjusting] = held_and_adjusting(lib, req, sys);
        if (held) {
            const SystemShare* hs = held->share(sys->id);
            // The salt basis reads differently from the total only when the other reagent adds
            // to the buffer system, or the held reagent brings more than one unit of it.
            salt_differs = (adjusting && adjusting->has_system(sys->id)) || !hs || hs->count != 1;
            if (salt_differs)
                subject = reagent_words(*held);
        }
    }
    if (subject.empty()) {
        if (sys) {
            const std::string counter = cation_words(lib, {p.first, p.second}, sys->id);
            subject = (counter.empty() ? "" : counter + " ") + system_words(*sys);
        } else {
            subject = "buffer";
        }
    }
    std::string name;
    if (req.concentration_mol_per_l && *req.concentration_mol_per_l > 0 &&
        std::isfinite(*req.concentration_mol_per_l))
        name = short_concentration(*req.concentration_mol_per_l) + " ";
    name += subject + " pH " +
            (std::isfinite(req.target_ph) ? name_ph(req.target_ph) : std::string("?"));
    if (!req.concentration_mol_per_l && req.ionic_strength_mol_per_l &&
        *req.ionic_strength_mol_per_l > 0 && std::isfinite(*req.ionic_strength_mol_per_l))
        name += ", I = " + short_concentration(*req.ionic_strength_mol_per_l);
    if (salt_differs)
        name += " (salt basis)";
    name[0] = static_cast<char>(std::toupper(static_cast<unsigned char>(name[0])));
    return name;
}

} // namespace chem

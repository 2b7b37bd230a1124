// The sentences of the line recipes' and the route changes' notes, from their data.
#include "chem/note_text.h"

#include "chem/checks_common.h"
#include "chem/measure_band.h"

namespace chem {

using checks_internal::fmt;

std::string describe(const LineNote& note, const SolventLibrary& solvents) {
    switch (note.kind) {
    case LineNoteKind::gravimetric_alternative:
        return "Gravimetric alternative: tare the bottle and weigh each part in turn to the masses "
               "given (volume × density at the temperature stated per item); weighing does not "
               "depend on the liquid's temperature as a volume reading does.";
    case LineNoteKind::ph_in_aqueous_part:
        return "The pH is measured in the aqueous part before the organic is added; it is the "
               "aqueous pH that the method and the column's pH range refer to.";
    case LineNoteKind::mixing_contraction: {
        std::string list;
        for (const auto& [id, ml] : note.contractions) {
            const Solvent* s = solvents.find_solvent(id);
            list += (list.empty() ? "" : ", ") + (s ? s->name : id) + " " + fmt(ml, 1) + " mL";
        }
        return "Mixing contraction: " + list + " for " + fmt(note.volume_ml, 0) +
               " mL measured separately (binary water–organic estimates" +
               (note.organic_parts > 1 ? ", added up: rough for three components" : "") + ").";
    }
    }
    return {};
}

namespace {

std::string reagent_in_words(const Library& lib, const std::string& id) {
    const Reagent* r = lib.find_reagent(id);
    return r ? reagent_words(*r) : id;
}

std::string system_in_words(const Library& lib, const std::string& id) {
    const AcidBaseSystem* s = lib.find_system(id);
    return s ? system_words(*s) : id;
}

} // namespace

std::string describe(const RouteNote& n, const Library& lib) {
    auto words = [&lib](const std::string& id) { return reagent_in_words(lib, id); };
    switch (n.kind) {
    case RouteNoteKind::no_pair_to_carry:
        return "Choose the " + std::string(n.field == "weigh" ? "reagent to weigh" : "titrant") +
               ": the mix had no complete pair to carry over.";
    case RouteNoteKind::weighed_with_partner:
        return words(n.weighed) + " is weighed and " + words(n.partner) + " brings it to pH" +
               (n.titrant_form == TitrantForm::neat ? ", added as supplied (neat)."
                                                    : ", as a solution of the molarity you give.");
    case RouteNoteKind::partner_cannot_titrate:
        return words(n.partner) + " cannot bring " + words(n.weighed) +
               " to pH; choose a titrant: nothing was substituted.";
    case RouteNoteKind::no_weighed_reagent:
        return "Choose the acid and base forms: no weighed reagent to carry over.";
    case RouteNoteKind::strong_titrant_replaced: {
        const Reagent* partner = lib.find_reagent(n.partner);
        return words(n.titrant) + " is not a form of " + system_in_words(lib, n.system) + "; the " +
               (n.to == Route::mix ? "mix" : "stocks") + " route uses " + words(n.partner) + " (" +
               (partner ? partner->formula : n.partner) +
               "), the form it would have made, instead.";
    }
    case RouteNoteKind::no_form_made_with: {
        const bool raises = n.direction == PhDirection::raises;
        return "Nothing in the library is a " + std::string(raises ? "more basic" : "more acidic") +
               " form of " + system_in_words(lib, n.system) + " made with " + words(n.titrant) +
               "; choose the " + (raises ? "base" : "acid") + " form: nothing was substituted.";
    }
    case RouteNoteKind::titrant_not_a_form:
        return "Choose the " + n.field + " form: the titrant is not a form of " +
               system_in_words(lib, n.system) + ".";
    case RouteNoteKind::salt_basis_dropped:
        return "The salt basis holds one salt of the pair at the concentration; " + words(n.acid) +
               " and " + words(n.base) +
               " are not one salt and one free acid or base, so the total basis is used.";
    }
    return {};
}

namespace {

std::string part_name(const NameLookup& name_of, const std::string& id) {
    return name_of ? name_of(id) : id;
}

/// A signed number with fixed decimals, "+1.4", "-0.11"; an exact tie rounds away from zero,
/// as the app's QString::number did when it built these sentences.
std::string signed_fixed(double v, int decimals) {
    std::string s = v >= 0 ? "+" : "";
    s += format_fixed_ties_away(v, decimals);
    return s;
}

} // namespace

std::string describe(const UseByLimit& limit, const NameLookup& name_of) {
    return "lot " + limit.lot + " of " + part_name(name_of, limit.reagent) + ", which expires on " +
           limit.lot_expires_on;
}

std::string describe(const ReleaseReason& r, const NameLookup& name_of) {
    switch (r.kind) {
    case ReleaseReasonKind::amount_out_of_band:
        // The band as the sheet's table prints it: with its target's decimals.
        return part_name(name_of, r.reagent) + ": " + format_amount(r.actual) + " " + r.unit +
               ", " + signed_fixed(r.deviation * 100, 1) + " % (band " +
               format_measure_band(r.low, r.high, r.target,
                                   r.unit == "g" ? MeasureUnit::g : MeasureUnit::ml) +
               " " + r.unit + ")";
    case ReleaseReasonKind::measured_ph_out_of_tolerance:
        return "Measured pH " + format_fixed_ties_away(r.actual, 2) + ", " +
               signed_fixed(r.deviation, 2) + " from the target " +
               format_fixed_ties_away(r.target, 2) + " (± " + format_number(r.tolerance) + ")";
    }
    return {};
}

std::string remake_reason(const Correction& c) {
    if (!c.remake || !c.container_ml)
        return {};
    return "the corrected batch needs " + format_number(c.final_volume_ml) + " mL, more than the " +
           format_number(*c.container_ml) + " mL the container holds";
}

std::vector<std::string> describe(const Correction& c, const NameLookup& name_of, bool made_up) {
    std::vector<std::string> out;
    if (!c.needed)
        return out;
    if (c.remake) {
        out.push_back("Remake the batch: " + remake_reason(c) + ".");
        return out;
    }
    const bool scaled = c.scale > 1;
    for (const CorrectionStep& s : c.steps) {
        const std::string name = part_name(name_of, s.reagent);
        const std::string u = " " + s.unit;
        if (!s.entered)
            out.push_back(
                (s.unit == "g" ? "Weigh " : "Measure ") + format_amount(s.add) + u + " of " + name +
                (scaled ? " (scaled from " + format_amount(s.target) + u + ")" : "") + ".");
        else if (s.add > 0)
            out.push_back("Add " + format_amount(s.add) + u + " of " + name + " (to " +
                          format_amount(s.after) + u + (scaled ? ", the scaled target" : "") +
                          ").");
    }
    if (scaled)
        out.push_back(std::string(made_up ? "Make up to " : "The line then holds ") +
                      format_amount(c.final_volume_ml) + " mL instead of " +
                      format_amount(c.planned_volume_ml) + " mL (all amounts × " +
                      format_fixed_ties_away(c.scale, 4) + "), then relabel the volume.");
    if (out.empty())
        out.push_back("Nothing to add: every amount is within its band after scaling.");
    return out;
}

} // namespace chem

#include "chem/batch.h"
#include "chem/finding_text.h"
#include "chem/guard.h"

#include "chem/error.h"
#include "chem/units.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <set>

namespace chem {

namespace {

constexpr double max_final_volume_ml = 1.0e6;  ///< same bound as the designer's volume_ml
constexpr double max_tolerance_fraction = 0.5; ///< ± 50 %: beyond that a "tolerance" means nothing
constexpr double max_ph_tolerance = 2.0; ///< ± 2 pH units: beyond that a "tolerance" means nothing
/// A predicted pH this far from the target deserves a look before use; common practice, no source.
constexpr double ph_off_target = 0.05;

std::string item_path(int i, const char* key) {
    return "batch.actual[" + std::to_string(i) + "]" + (key[0] ? std::string(".") + key : "");
}

// Days from 1970-01-01 of a proleptic Gregorian date: H. Hinnant, "chrono-Compatible Low-Level
// Date Algorithms" (days_from_civil / civil_from_days), public domain (from memory).
std::int64_t days_from_civil(int y, int m, int d) {
    y -= m <= 2;
    const std::int64_t era = (y >= 0 ? y : y - 399) / 400;
    const unsigned yoe = static_cast<unsigned>(y - era * 400);
    const unsigned doy = (153 * (m + (m > 2 ? -3 : 9)) + 2) / 5 + d - 1;
    const unsigned doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
    return era * 146097 + static_cast<std::int64_t>(doe) - 719468;
}

void civil_from_days(std::int64_t z, int& y, int& m, int& d) {
    z += 719468;
    const std::int64_t era = (z >= 0 ? z : z - 146096) / 146097;
    const unsigned doe = static_cast<unsigned>(z - era * 146097);
    const unsigned yoe = (doe - doe / 1460 + doe / 36524 - doe / 146096) / 365;
    const unsigned doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    const unsigned mp = (5 * doy + 2) / 153;
    d = static_cast<int>(doy - (153 * mp + 2) / 5 + 1);
    m = static_cast<int>(mp < 10 ? mp + 3 : mp - 9);
    y = static_cast<int>(static_cast<std::int64_t>(yoe) + era * 400 + (m <= 2));
}

int days_in_month(int y, int m) {
    static const int days[] = {31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31};
    const bool leap = (y % 4 == 0 && y % 100 != 0) || y % 400 == 0;
    return m == 2 && leap ? 29 : days[m - 1];
}

} // namespace

// ---- date-times -------------------------------------------------------------------------------

LocalDateTime parse_local_datetime(const std::string& text, const std::string& field) {
    auto bad = [&](const std::string& why) -> Error {
        return Error(field, guard::quote_id(text) +
                                " is not a date and time like 2026-12-01T16:30:00" +
                                (why.empty() ? "" : " (" + why + ")"));
    };
    auto digits = [&](size_t pos, size_t n) {
        if (pos + n > text.size())
            throw bad("");
        int v = 0;
        for (size_t i = pos; i < pos + n; ++i) {
            if (text[i] < '0' || text[i] > '9')
                throw bad("");
            v = v * 10 + (text[i] - '0');
        }
        return v;
    };
    LocalDateTime t;
    if (text.size() < 16)
        throw bad("");
    t.year = digits(0, 4);
    if (text[4] != '-' || text[7] != '-' || (text[10] != 'T' && text[10] != ' ') || text[13] != ':')
        throw bad("");
    t.month = digits(5, 2);
    t.day = digits(8, 2);
    t.hour = digits(11, 2);
    t.minute = digits(14, 2);
    size_t pos = 16;
    if (pos < text.size() && text[pos] == ':') {
        t.second = digits(pos + 1, 2);
        pos += 3;
        if (pos < text.size() && text[pos] == '.') { // fractional seconds: accepted, dropped
            ++pos;
            while (pos < text.size() && text[pos] >= '0' && text[pos] <= '9')
                ++pos;
        }
    }
    // A zone suffix is accepted and ignored: the lab's clock is the reference.
    if (pos < text.size()) {
        const std::string rest = text.substr(pos);
        const bool zulu = rest == "Z";
        const bool offset =
            rest.size() == 6 && (rest[0] == '+' || rest[0] == '-') && rest[3] == ':';
        if (!zulu && !offset)
            throw bad("unexpected \"" + rest + "\"");
        if (offset) {
            digits(pos + 1, 2);
            digits(pos + 4, 2);
        }
    }
    if (t.month < 1 || t.month > 12)
        throw bad("month " + std::to_string(t.month));
    if (t.day < 1 || t.day > days_in_month(t.year, t.month))
        throw bad("day " + std::to_string(t.day));
    if (t.hour > 23)
        throw bad("hour " + std::to_string(t.hour));
    if (t.minute > 59)
        throw bad("minute " + std::to_string(t.minute));
    if (t.second > 59)
        throw bad("second " + std::to_string(t.second));
    guard::year(t.year, field, text);
    return t;
}

std::string format_local_datetime(const LocalDateTime& t) {
    char buf[32];
    std::snprintf(buf, sizeof buf, "%04d-%02d-%02dT%02d:%02d:%02d", t.year, t.month, t.day, t.hour,
                  t.minute, t.second);
    return buf;
}

std::int64_t to_minutes(const LocalDateTime& t) {
    return days_from_civil(t.year, t.month, t.day) * 1440 + t.hour * 60 + t.minute;
}

LocalDateTime from_minutes(std::int64_t minutes) {
    std::int64_t days = minutes >= 0 ? minutes / 1440 : -((-minutes + 1439) / 1440);
    std::int64_t rem = minutes - days * 1440;
    LocalDateTime t;
    civil_from_days(days, t.year, t.month, t.day);
    t.hour = static_cast<int>(rem / 60);
    t.minute = static_cast<int>(rem % 60);
    t.second = 0;
    return t;
}

std::string add_hours(const std::string& text, double hours, const std::string& field) {
    const LocalDateTime t = parse_local_datetime(text, field);
    if (!std::isfinite(hours) || std::abs(hours) > 1.0e6)
        throw Error(field, "cannot add a shelf life of " + format_number(hours) + " h");
    LocalDateTime out = from_minutes(to_minutes(t) + std::llround(hours * 60.0));
    out.second = t.second;
    guard::year(out.year, field, format_local_datetime(out));
    return format_local_datetime(out);
}

// ---- amounts ----------------------------------------------------------------------------------

ItemBasis item_basis(const Library& lib, const RecipeRequest& req, const RecipeItem& item) {
    const Reagent& r = lib.reagent(item.reagent);
    ItemBasis b;
    if (item.kind == ItemKind::stock || item.kind == ItemKind::titrant_solution) {
        // A solution of known molarity, measured by volume only. (A neat titrant is material as
        // supplied, below.)
        double molarity = 0;
        if (item.kind == ItemKind::titrant_solution)
            molarity = req.titrant_mol_per_l;
        else if (item.reagent == req.acid)
            molarity = req.acid_stock_mol_per_l;
        else if (item.reagent == req.base)
            molarity = req.base_stock_mol_per_l;
        b.mol_per_ml = molarity / 1000.0;
        return b;
    }
    // Material as supplied: n = m · assay / M; a neat liquid also by volume, m = V · ρ.
    const double purity = purity_of(req, r);
    b.mol_per_g = purity / r.molar_mass_g_per_mol;
    if (r.form == PhysicalForm::liquid && r.density_g_per_ml > 0)
        b.mol_per_ml = r.density_g_per_ml * purity / r.molar_mass_g_per_mol;
    return b;
}

AmountCheck check_amount(const std::string& name, const std::string& unit, double target,
                         std::optional<double> actual, double tolerance_fraction) {
    AmountCheck c;
    c.reagent = name;
    c.unit = unit;
    c.target = target;
    c.low = target * (1 - tolerance_fraction);
    c.high = target * (1 + tolerance_fraction);
    c.entered = actual.has_value();
    c.actual = actual.value_or(target);
    c.deviation_fraction = c.entered && target > 0 ? c.actual / target - 1 : 0;
    // A relative slack of 1e-9 keeps an amount typed exactly at the band's edge inside it.
    c.within_tolerance =
        !c.entered || std::abs(c.deviation_fraction) <= tolerance_fraction * (1 + 1e-9) + 1e-12;
    return c;
}

Warning out_of_tolerance_warning(const AmountCheck& c, double tolerance_fraction) {
    Finding f;
    f.kind = FindingKind::amount_out_of_tolerance;
    f.severity = Severity::warning;
    f.subject = Subject::of_reagent(c.reagent);
    f.number("actual", c.actual);
    f.number("target", c.target);
    f.number("tolerance_fraction", tolerance_fraction);
    f.number("low", c.low);
    f.number("high", c.high);
    f.number("deviation_fraction", c.deviation_fraction);
    f.detail_text("unit", c.unit);
    return warning_of(std::move(f));
}

std::string check_batch_fields(const Batch& batch, double shelf_life_h) {
    return use_by(batch, shelf_life_h).expires_at;
}

LocalDateTime parse_local_date(const std::string& text, const std::string& field) {
    const bool shape = text.size() == 10 && text[4] == '-' && text[7] == '-' &&
                       std::all_of(text.begin(), text.end(),
                                   [](char ch) { return ch == '-' || (ch >= '0' && ch <= '9'); });
    if (!shape)
        throw Error(field, guard::quote_id(text) + " is not a date like 2027-03-31");
    try {
        return parse_local_datetime(text + "T00:00", field);
    } catch (const Error& e) {
        // The same reason (month 13, day 31 of a short month, a year out of range), for the date.
        const std::string m = e.message();
        const auto open = m.find(" (");
        throw Error(field, guard::quote_id(text) + " is not a date like 2027-03-31" +
                               (open == std::string::npos ? "" : m.substr(open)));
    }
}

void check_lot_dates(const std::string& received_on, const std::string& opened_on,
                     const std::string& expires_on, const std::string& at) {
    const std::string p = at.empty() ? "" : at + ".";
    if (received_on.empty())
        throw Error(p + "received_on", "is required: the day the lot came into the lab");
    if (expires_on.empty())
        throw Error(p + "expires_on", "is required: the expiry date on the supplier's label");
    const LocalDateTime received = parse_local_date(received_on, p + "received_on");
    const LocalDateTime expires = parse_local_date(expires_on, p + "expires_on");
    if (to_minutes(expires) <= to_minutes(received))
        throw Error(p + "expires_on", "the lot expires on " + expires_on +
                                          ", which is not after it was received on " + received_on);
    if (!opened_on.empty()) {
        const LocalDateTime opened = parse_local_date(opened_on, p + "opened_on");
        if (to_minutes(opened) < to_minutes(received))
            throw Error(p + "opened_on", "the lot was opened on " + opened_on +
                                             ", before it was received on " + received_on);
    }
}

UseBy use_by(const Batch& batch, double shelf_life_h) {
    const std::string& id = batch.id;
    if (id.find_first_not_of(" \t\r\n") == std::string::npos)
        throw Error("batch.id", "is required: give the batch an id");
    if (guard::char_count(id) > guard::max_id_chars)
        throw Error("batch.id", guard::quote_id(id) + " is longer than " +
                                    std::to_string(guard::max_id_chars) + " characters");
    for (unsigned char ch : id)
        if (ch < 0x20 || ch == 0x7f)
            throw Error("batch.id", "contains a control character");
    const double tol = batch.tolerance_fraction;
    if (!std::isfinite(tol) || tol <= 0 || tol > max_tolerance_fraction)
        throw Error("batch.tolerance_percent", format_number(tol * 100) + " % is outside 0 to " +
                                                   format_number(max_tolerance_fraction * 100) +
                                                   " %");
    if (batch.measured_ph &&
        (!std::isfinite(*batch.measured_ph) || *batch.measured_ph < 0 || *batch.measured_ph > 14))
        throw Error("batch.measured_ph",
                    format_number(*batch.measured_ph) + " is not a pH between 0 and 14");
    if (!std::isfinite(batch.ph_tolerance) || batch.ph_tolerance <= 0 ||
        batch.ph_tolerance > max_ph_tolerance)
        throw Error("batch.ph_tolerance", format_number(batch.ph_tolerance) +
                                              " is not a pH tolerance between 0 and " +
                                              format_number(max_ph_tolerance));
    if (batch.container_ml && (!std::isfinite(*batch.container_ml) || *batch.container_ml <= 0 ||
                               *batch.container_ml > max_final_volume_ml))
        throw Error("batch.container_ml", format_number(*batch.container_ml) +
                                              " is not a volume between 0 and " +
                                              format_number(max_final_volume_ml) + " mL");
    if (!batch.deviation_at.empty())
        parse_local_datetime(batch.deviation_at, "batch.deviation.at");
    if (!std::isfinite(shelf_life_h) || shelf_life_h <= 0)
        throw Error("batch.shelf_life_h",
                    format_number(shelf_life_h) + " is not a positive number of hours");
    std::optional<LocalDateTime> prepared;
    if (!batch.prepared_at.empty())
        prepared = parse_local_datetime(batch.prepared_at, "batch.prepared_at");
    UseBy out;
    if (!batch.expires_at.empty()) {
        const LocalDateTime exp = parse_local_datetime(batch.expires_at, "batch.expires_at");
        if (prepared && to_minutes(exp) <= to_minutes(*prepared))
            throw Error("batch.expires_at", "\"" + batch.expires_at +
                                                "\" is not after prepared_at \"" +
                                                batch.prepared_at + "\"");
        out.expires_at = batch.expires_at;
    } else if (prepared) {
        out.expires_at = add_hours(batch.prepared_at, shelf_life_h, "batch.prepared_at");
    }
    // The lots: an expired one is refused (unless overridden), the others clamp the use-by.
    std::optional<std::int64_t> limit_min;
    if (!out.expires_at.empty())
        limit_min = to_minutes(parse_local_datetime(out.expires_at, "batch.expires_at"));
    for (size_t i = 0; i < batch.actual.size(); ++i) {
        const ActualAmount& a = batch.actual[i];
        if (a.lot_expires_on.empty())
            continue;
        const int ii = static_cast<int>(i);
        LocalDateTime end = parse_local_date(a.lot_expires_on, item_path(ii, "lot_expires_on"));
        if (prepared) {
            LocalDateTime prep_day = *prepared;
            prep_day.hour = prep_day.minute = prep_day.second = 0;
            if (to_minutes(end) < to_minutes(prep_day) && !a.lot_override) {
                char day[16];
                std::snprintf(day, sizeof day, "%04d-%02d-%02d", prepared->year, prepared->month,
                              prepared->day);
                throw Error(item_path(ii, "lot"),
                            "lot " + guard::quote_id(a.lot) + " expired on " + a.lot_expires_on +
                                ", before the batch was prepared on " + day +
                                ": pick another lot, or an approver overrides it with a reason");
            }
        }
        if (a.lot_override)
            continue; // accepted by an approver: it does not shorten the batch's life
        end.hour = 23;
        end.minute = 59;
        end.second = 0;
        if (!limit_min || to_minutes(end) < *limit_min) {
            limit_min = to_minutes(end);
            out.expires_at = format_local_datetime(end);
            out.limited_by = ii;
        }
    }
    return out;
}

ReleaseReason amount_reason(const AmountCheck& c, double tolerance_fraction) {
    return {.kind = ReleaseReasonKind::amount_out_of_band,
            .reagent = c.reagent,
            .unit = c.unit,
            .target = c.target,
            .actual = c.actual,
            .low = c.low,
            .high = c.high,
            .deviation = c.deviation_fraction,
            .tolerance = tolerance_fraction};
}

ReleaseReason measured_ph_reason(double measured_ph, double target_ph, double tolerance_ph) {
    return {.kind = ReleaseReasonKind::measured_ph_out_of_tolerance,
            .reagent = {}, // about the batch as a whole
            .unit = {},    // pH units
            .target = target_ph,
            .actual = measured_ph,
            .low = target_ph - tolerance_ph,
            .high = target_ph + tolerance_ph,
            .deviation = measured_ph - target_ph,
            .tolerance = tolerance_ph};
}

BatchResult evaluate_batch(const Library& lib, const Recipe& recipe, const Batch& batch,
                           double shelf_life_h) {
    BatchResult out;
    const UseBy use = use_by(batch, shelf_life_h);
    out.expires_at = use.expires_at;
    out.expiry_limited_by = use.limited_by;
    out.shelf_life_h = shelf_life_h;
    const double tol = batch.tolerance_fraction;
    out.final_volume_ml = batch.final_volume_ml.value_or(recipe.request.volume_ml);
    if (!std::isfinite(out.final_volume_ml) || out.final_volume_ml <= 0 ||
        out.final_volume_ml > max_final_volume_ml)
        throw Error("batch.final_volume_ml", format_number(out.final_volume_ml) +
                                                 " is not a volume between 0 and " +
                                                 format_number(max_final_volume_ml) + " mL");

    // ---- actual amounts against the items
    std::set<std::string> recipe_ids;
    std::string known;
    for (const auto& it : recipe.items)
        if (recipe_ids.insert(it.reagent).second)
            known += (known.empty() ? "" : ", ") + it.reagent;
    std::vector<int> entry_of(recipe.items.size(), -1);
    std::set<std::string> seen;
    for (size_t i = 0; i < batch.actual.size(); ++i) {
        const auto& a = batch.actual[i];
        const int ii = static_cast<int>(i);
        if (a.reagent.empty())
            throw Error(item_path(ii, "reagent"), "is required");
        if (!recipe_ids.count(a.reagent))
            throw Error(item_path(ii, "reagent"),
                        guard::quote_id(a.reagent) +
                            " is not in the recipe (its reagents: " + known + ")");
        if (!seen.insert(a.reagent).second)
            throw Error(item_path(ii, "reagent"), guard::quote_id(a.reagent) + " is given twice");
        if (a.mass_g.has_value() == a.volume_ml.has_value())
            throw Error(item_path(ii, "mass_g"), "give exactly one of mass_g and volume_ml");
        const double v = a.mass_g ? *a.mass_g : *a.volume_ml;
        const char* key = a.mass_g ? "mass_g" : "volume_ml";
        if (!std::isfinite(v) || v <= 0)
            throw Error(item_path(ii, key), format_number(v) + " is not a positive amount");
        for (size_t k = 0; k < recipe.items.size(); ++k)
            if (recipe.items[k].reagent == a.reagent && entry_of[k] < 0) {
                entry_of[k] = ii;
                break;
            }
    }

    const double volume_l = out.final_volume_ml / 1000.0;
    const double planned_volume_l = recipe.request.volume_ml / 1000.0;
    std::vector<double> actual_mol(recipe.items.size(), 0.0);
    for (size_t k = 0; k < recipe.items.size(); ++k) {
        const RecipeItem& it = recipe.items[k];
        const ItemBasis basis = item_basis(lib, recipe.request, it);
        const double target_mol = it.mol_per_l * planned_volume_l;
        const ActualAmount* a = entry_of[k] >= 0 ? &batch.actual[entry_of[k]] : nullptr;

        // Compare in the quantity the preparer entered; by default the one the recipe measures
        // (a solid by mass, a liquid or a solution by volume).
        bool by_mass = a ? a->mass_g.has_value() : (it.kind == ItemKind::solid);
        if (by_mass && !basis.mol_per_g)
            throw Error(item_path(entry_of[k], "mass_g"),
                        it.reagent + " is used as a " + item_as_text(it) +
                            " solution, measured by volume: give volume_ml");
        if (!by_mass && !basis.mol_per_ml)
            throw Error(item_path(entry_of[k], "volume_ml"),
                        it.reagent + " is a solid, weighed: give mass_g");
        const double per_unit = by_mass ? *basis.mol_per_g : *basis.mol_per_ml;
        const double target_amount = target_mol / per_unit;
        std::optional<double> entered;
        if (a)
            entered = by_mass ? *a->mass_g : *a->volume_ml;

        AmountCheck c = check_amount(it.reagent, by_mass ? "g" : "mL", target_amount, entered, tol);
        if (a) {
            c.lot = a->lot;
            c.lot_expires_on = a->lot_expires_on;
            c.lot_override = a->lot_override;
        }
        actual_mol[k] = a ? *entered * per_unit : target_mol;
        c.target_mol_per_l = it.mol_per_l;
        c.actual_mol_per_l = actual_mol[k] / volume_l;
        if (c.actual_mol_per_l > max_concentration_mol_per_l)
            throw Error(
                item_path(entry_of[k] >= 0 ? entry_of[k] : 0, by_mass ? "mass_g" : "volume_ml"),
                format_amount(c.actual) + " " + c.unit + " of " + it.reagent + " in " +
                    format_number(out.final_volume_ml) + " mL is " +
                    format_number(c.actual_mol_per_l) + " mol/L, above " +
                    format_number(max_concentration_mol_per_l) + " mol/L");
        if (!c.within_tolerance) {
            out.warnings.push_back(out_of_tolerance_warning(c, tol));
            out.out_of_tolerance = true;
        }
        if (!a) {
            Finding f;
            f.kind = FindingKind::amount_not_entered;
            f.severity = Severity::info;
            f.subject = Subject::of_reagent(it.reagent);
            f.number("target", c.target);
            f.detail_text("unit", c.unit);
            out.warnings.push_back(warning_of(std::move(f)));
        }
        out.checks.push_back(std::move(c));
    }

    // ---- the solution as made: each component from the items of its reagent
    for (const Component& planned : recipe.composition) {
        double mol = 0;
        bool from_items = false;
        for (size_t k = 0; k < recipe.items.size(); ++k)
            if (planned.reagent && recipe.items[k].reagent == planned.reagent->id) {
                mol += actual_mol[k];
                from_items = true;
            }
        // A component no item measures (none today) keeps its planned amount of substance.
        if (!from_items)
            mol = planned.mol_per_l * planned_volume_l;
        out.composition.push_back({planned.reagent, mol / volume_l});
    }
    try {
        out.predicted = solve(lib, out.composition, recipe.request.temperature_c);
    } catch (const Error& e) {
        throw Error("batch.actual", "the solution as made cannot be solved: " + e.message());
    }
    const double dph = out.predicted.ph - recipe.request.target_ph;
    if (std::abs(dph) > ph_off_target) {
        Finding f;
        f.kind = FindingKind::ph_off_target;
        f.severity = Severity::caution;
        f.number("predicted_ph", out.predicted.ph);
        f.number("target_ph", recipe.request.target_ph);
        f.number("deviation_ph", dph);
        out.warnings.push_back(warning_of(std::move(f)));
    }
    if (batch.measured_ph) {
        out.measured_ph_deviation = *batch.measured_ph - recipe.request.target_ph;
        if (std::abs(*out.measured_ph_deviation) > batch.ph_tolerance * (1 + 1e-9) + 1e-12) {
            out.measured_ph_out = true;
            out.out_of_tolerance = true;
            out.warnings.push_back(measured_ph_warning(*batch.measured_ph, recipe.request.target_ph,
                                                       batch.ph_tolerance));
        }
    }
    return out;
}

Warning measured_ph_warning(double measured_ph, double target_ph, double ph_tolerance) {
    Finding f;
    f.kind = FindingKind::measured_ph_out_of_tolerance;
    f.severity = Severity::warning;
    f.number("measured_ph", measured_ph);
    f.number("target_ph", target_ph);
    f.number("deviation_ph", measured_ph - target_ph);
    f.number("ph_tolerance", ph_tolerance);
    return warning_of(std::move(f));
}

} // namespace chem

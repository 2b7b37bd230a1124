// The findings of the batch's pH, the eluent, the column transfer and the pressure notes: each
// warning carries its kind, a typed subject and its numbers, and its message is describe() of
// that finding (chem/finding_text.cpp, the one place with the wording).
//
// What these tests hold against: the thresholds each check documents where it is computed
// (chem/batch.h: ± 0.05 pH, common practice, no source; chem/eluent.h: the published range of
// the s_s tables, about 60 % acetonitrile and 80 % methanol, and their 25 °C basis; USP <621>
// (harmonised 2022, from memory): L/dp may change by −25 % to +50 %; chem/pressure.h: the
// Kozeny–Carman estimate when no reference pressure is given). The chemistry behind the numbers
// is tested where it is computed (test_transfer, test_pressure, tst_batch, tst_eluent).
#include "chem/batch.h"
#include "chem/eluent.h"
#include "chem/error.h"
#include "chem/finding.h"
#include "chem/finding_text.h"
#include "chem/line.h"
#include "chem/pressure.h"
#include "chem/recipe.h"
#include "chem/transfer.h"
#include "shipped_library.h"
#include "transfer_example.h"

#include <gtest/gtest.h>

#include <cmath>
#include <set>
#include <string>
#include <vector>

using namespace chem;

using chem::testing::lib;
using chem::testing::solvents;

namespace {
bool contains(const std::string& text, const std::string& part) {
    return text.find(part) != std::string::npos;
}

/// The warning of `code` among `ws`, or null.
const Warning* find_code(const std::vector<Warning>& ws, const std::string& code) {
    for (const Warning& w : ws)
        if (w.code == code)
            return &w;
    return nullptr;
}

/// A warning that carries its finding: the kind's code, the severity, and the message made by
/// describe() from the data alone.
void expect_carried(const Warning& w, FindingKind kind) {
    SCOPED_TRACE(w.code + ": " + w.message);
    ASSERT_TRUE(w.finding.has_value());
    EXPECT_EQ(w.finding->kind, kind);
    EXPECT_EQ(w.code, std::string(code_of(kind)));
    EXPECT_EQ(w.severity, w.finding->severity);
    EXPECT_EQ(w.message, describe(*w.finding, RenderContext{}));
}

// ---- the batch's pH -------------------------------------------------------------------------

/// The demo buffer: 20 mmol/L sodium phosphate pH 2.5 by the mix route
/// (data/demo/buffer-phosphate-ph2.5.json).
Recipe phosphate_25() {
    RecipeRequest q;
    q.target_ph = 2.5;
    q.volume_ml = 1000;
    q.route = Route::mix;
    q.acid = "phosphoric-acid";
    q.base = "sodium-dihydrogen-phosphate-monohydrate";
    q.concentration_mol_per_l = 0.02;
    return design_recipe(lib(), q);
}

/// A batch of `r` with every item as planned, the phosphoric acid times `acid_factor`.
Batch batch_of(const Recipe& r, double acid_factor, std::optional<double> measured_ph) {
    Batch b;
    b.id = "T-1";
    b.prepared_by = "R. Okafor";
    b.prepared_at = "2026-12-01T16:30:00";
    for (const RecipeItem& it : r.items) {
        ActualAmount a;
        a.reagent = it.reagent;
        const double f = it.reagent == "phosphoric-acid" ? acid_factor : 1.0;
        if (it.mass_g)
            a.mass_g = *it.mass_g * f;
        else
            a.volume_ml = *it.volume_ml * f;
        b.actual.push_back(a);
    }
    b.measured_ph = measured_ph;
    return b;
}

// As planned, the pH from the amounts is the target: no ph-off-target. 60 % more phosphoric acid
// lowers it by more than 0.05 (chem/batch.h's threshold): the finding carries the predicted pH,
// the target and their difference.
TEST(FindingsBatch, PhOffTargetCarriesPredictedAndTarget) {
    const Recipe r = phosphate_25();
    const BatchResult planned = evaluate_batch(lib(), r, batch_of(r, 1.0, std::nullopt), 48);
    EXPECT_EQ(find_code(planned.warnings, "ph-off-target"), nullptr);

    const BatchResult off = evaluate_batch(lib(), r, batch_of(r, 1.6, std::nullopt), 48);
    const Warning* w = find_code(off.warnings, "ph-off-target");
    ASSERT_NE(w, nullptr);
    expect_carried(*w, FindingKind::ph_off_target);
    const Finding& f = *w->finding;
    EXPECT_EQ(f.severity, Severity::caution);
    EXPECT_EQ(f.subject.kind, Subject::Kind::none);
    EXPECT_NEAR(f.number_of("predicted_ph"), off.predicted.ph, 1e-12);
    EXPECT_NEAR(f.number_of("target_ph"), 2.5, 1e-12);
    EXPECT_NEAR(f.number_of("deviation_ph"), off.predicted.ph - 2.5, 1e-12);
    EXPECT_LT(f.number_of("deviation_ph"), -0.05);
    EXPECT_TRUE(contains(w->message, "predicted pH is " + format_fixed(off.predicted.ph, 2) + ", " +
                                         format_fixed(off.predicted.ph - 2.5, 2) +
                                         " from the target 2.50"))
        << w->message;
}

// A measured pH 0.11 above the target with ± 0.05 allowed is out of tolerance; 0.04 above is not.
TEST(FindingsBatch, MeasuredPhOutOfToleranceCarriesItsNumbers) {
    const Recipe r = phosphate_25();
    const BatchResult within = evaluate_batch(lib(), r, batch_of(r, 1.0, 2.54), 48);
    EXPECT_EQ(find_code(within.warnings, "measured-ph-out-of-tolerance"), nullptr);

    const BatchResult out = evaluate_batch(lib(), r, batch_of(r, 1.0, 2.61), 48);
    const Warning* w = find_code(out.warnings, "measured-ph-out-of-tolerance");
    ASSERT_NE(w, nullptr);
    expect_carried(*w, FindingKind::measured_ph_out_of_tolerance);
    const Finding& f = *w->finding;
    EXPECT_EQ(f.severity, Severity::warning);
    EXPECT_EQ(f.subject.kind, Subject::Kind::none);
    EXPECT_NEAR(f.number_of("measured_ph"), 2.61, 1e-12);
    EXPECT_NEAR(f.number_of("target_ph"), 2.5, 1e-12);
    EXPECT_NEAR(f.number_of("deviation_ph"), 0.11, 1e-12);
    EXPECT_NEAR(f.number_of("ph_tolerance"), 0.05, 1e-12);
    EXPECT_EQ(w->message, "Measured pH 2.61, +0.11 from the target 2.50, outside ± 0.05.");
}

// ---- the eluent -----------------------------------------------------------------------------

LineProfile buffer_line(double ph, const char* acid, const char* base) {
    RecipeRequest q;
    q.target_ph = ph;
    q.volume_ml = 1000;
    q.route = Route::mix;
    q.acid = acid;
    q.base = base;
    q.concentration_mol_per_l = 0.02;
    LineSpec s;
    s.name = "A";
    LinePart p;
    p.buffer = design_recipe(lib(), q);
    p.fraction_v = 1;
    s.parts.push_back(p);
    return profile_line(solvents(), lib(), s);
}

LineProfile solvent_line(const std::vector<std::pair<std::string, double>>& parts) {
    LineSpec s;
    s.name = "B";
    for (const auto& [id, v] : parts) {
        LinePart p;
        p.solvent = id;
        p.fraction_v = v;
        s.parts.push_back(p);
    }
    return profile_line(solvents(), lib(), s);
}

std::vector<Warning> eluent_warnings(const LineProfile& a, const LineProfile& b, double percent_b,
                                     double temperature_c = 25) {
    return solve_eluent(solvents(), lib(), {&a, &b}, {100 - percent_b, percent_b}, temperature_c)
        .warnings;
}

// 20 mmol/L acetate pH 4.8 (pKa 4.76, a table of its own in the s_s data): 50 % acetonitrile is
// inside the published range, 80 % beyond it (about 60 %): the finding says so, with the
// fraction.
TEST(FindingsEluent, ExtrapolatedBeyondThePublishedRange) {
    const LineProfile acetate = buffer_line(4.8, "acetic-acid", "sodium-acetate");
    const LineProfile acn = solvent_line({{"acetonitrile", 1}});
    EXPECT_EQ(find_code(eluent_warnings(acetate, acn, 50), "eluent-ph-extrapolated"), nullptr);

    const std::vector<Warning> ws = eluent_warnings(acetate, acn, 80);
    const Warning* w = find_code(ws, "eluent-ph-extrapolated");
    ASSERT_NE(w, nullptr);
    expect_carried(*w, FindingKind::eluent_ph_extrapolated);
    const Finding& f = *w->finding;
    EXPECT_EQ(f.severity, Severity::caution);
    EXPECT_EQ(f.subject.kind, Subject::Kind::none);
    EXPECT_NEAR(f.number_of("organic_fraction_v"), 0.8, 1e-9);
    EXPECT_EQ(f.number_of("beyond_published_range"), 1);
    EXPECT_FALSE(f.has_number("mixed_organics"));
    EXPECT_TRUE(f.texts_all("other_organic").empty());
    EXPECT_TRUE(contains(w->message, "the organic fraction 80 % lies beyond")) << w->message;
}

// Ethanol has no s_s tables: it is treated as methanol (the same kind of solvent), named by id.
// Acetonitrile with methanol: each one's shifts are weighted by its share.
TEST(FindingsEluent, ExtrapolatedNamesTheSolventsAndHow) {
    const LineProfile acetate = buffer_line(4.8, "acetic-acid", "sodium-acetate");
    const Warning* w = nullptr;
    const std::vector<Warning> ethanol =
        eluent_warnings(acetate, solvent_line({{"ethanol", 1}}), 30);
    w = find_code(ethanol, "eluent-ph-extrapolated");
    ASSERT_NE(w, nullptr);
    expect_carried(*w, FindingKind::eluent_ph_extrapolated);
    EXPECT_EQ(w->finding->texts_all("other_organic"), std::vector<std::string>{"ethanol"});
    EXPECT_EQ(w->finding->texts_all("other_organic_basis"), std::vector<std::string>{"methanol"});
    EXPECT_TRUE(contains(w->message, "ethanol has no published parameters here: treated as "
                                     "methanol"))
        << w->message;

    const std::vector<Warning> both =
        eluent_warnings(acetate, solvent_line({{"acetonitrile", 0.5}, {"methanol", 0.5}}), 40);
    w = find_code(both, "eluent-ph-extrapolated");
    ASSERT_NE(w, nullptr);
    EXPECT_EQ(w->finding->number_of("mixed_organics"), 1);
    EXPECT_TRUE(contains(w->message, "acetonitrile and methanol together")) << w->message;
}

// Citrate has no s_s pKa table: at pH 4.8 its steps near the pH borrow the shift of a system
// whose acid form has the same charge; each estimated step is listed with its analogue.
TEST(FindingsEluent, ExtrapolatedListsTheEstimatedSteps) {
    const LineProfile citrate = buffer_line(4.8, "citric-acid", "trisodium-citrate");
    const std::vector<Warning> ws =
        eluent_warnings(citrate, solvent_line({{"acetonitrile", 1}}), 30);
    const Warning* w = find_code(ws, "eluent-ph-extrapolated");
    ASSERT_NE(w, nullptr);
    expect_carried(*w, FindingKind::eluent_ph_extrapolated);
    const Finding& f = *w->finding;
    const std::vector<std::string> systems = f.texts_all("estimated_system");
    const std::vector<double> steps = f.numbers_all("estimated_step");
    ASSERT_FALSE(systems.empty());
    EXPECT_EQ(steps.size(), systems.size());
    EXPECT_EQ(f.texts_all("analogue_system").size(), systems.size());
    EXPECT_EQ(f.numbers_all("analogue_step").size(), systems.size());
    for (std::size_t i = 0; i < systems.size(); ++i) {
        EXPECT_EQ(systems[i], "citrate");
        EXPECT_GE(steps[i], 1);
        EXPECT_LE(steps[i], 3); // citric acid has three steps
        EXPECT_TRUE(contains(w->message, "citrate step " + format_number(steps[i]) + " from "))
            << w->message;
    }
}

// The organic's shifts are 25 °C values: at 40 °C with organic, a note with the temperature;
// none at 25 °C, and none without organic.
TEST(FindingsEluent, TemperatureNoteCarriesTheTemperature) {
    const LineProfile acetate = buffer_line(4.8, "acetic-acid", "sodium-acetate");
    const LineProfile meoh = solvent_line({{"methanol", 1}});
    EXPECT_EQ(find_code(eluent_warnings(acetate, meoh, 30, 25), "eluent-temperature"), nullptr);
    EXPECT_EQ(find_code(eluent_warnings(acetate, meoh, 0, 40), "eluent-temperature"), nullptr);
    const std::vector<Warning> ws = eluent_warnings(acetate, meoh, 30, 40);
    const Warning* w = find_code(ws, "eluent-temperature");
    ASSERT_NE(w, nullptr);
    expect_carried(*w, FindingKind::eluent_temperature);
    EXPECT_EQ(w->finding->severity, Severity::info);
    EXPECT_EQ(w->finding->subject.kind, Subject::Kind::none);
    EXPECT_EQ(w->finding->number_of("temperature_c"), 40);
    EXPECT_TRUE(contains(w->message, "taken at 40 °C")) << w->message;
}

// ---- the column transfer --------------------------------------------------------------------

/// The chemistry tests' example move (transfer_example.h).
TransferRequest transfer(double to_particle_um, std::optional<double> to_flow) {
    return chem::testing::transfer_example(to_particle_um, to_flow);
}

/// The transfer's findings are about the moved method: subject method "" (the one method).
void expect_about_method(const Warning& w) {
    ASSERT_TRUE(w.finding.has_value());
    EXPECT_EQ(w.finding->subject, Subject::of_method(""));
}

// L/dp: 250 mm / 5 µm = 50 on the old column, 50 mm / 1.7 µm = 29.4 on the new one: −41 %,
// outside the −25 % to +50 % that USP <621> allows (from memory).
TEST(FindingsTransfer, OutsideAllowedAdjustmentCarriesTheChange) {
    const TransferResult r = transfer_method(transfer(1.7, std::nullopt));
    const Warning* w = find_code(r.warnings, "outside-allowed-adjustment");
    ASSERT_NE(w, nullptr);
    expect_carried(*w, FindingKind::outside_allowed_adjustment);
    expect_about_method(*w);
    EXPECT_EQ(w->finding->severity, Severity::warning);
    const double change = (50.0 / 1.7) / (250.0 / 5.0) - 1;
    EXPECT_NEAR(w->finding->number_of("l_over_dp_change"), change, 1e-12);
    EXPECT_TRUE(contains(w->message,
                         "L/dp changes by " + format_number(std::round(change * 1000) / 10) + " %"))
        << w->message;
    // 150 mm of 3 µm keeps L/dp at 50: within the band, nothing said.
    TransferRequest same = transfer(3, std::nullopt);
    same.to.column.length_mm = 150;
    EXPECT_EQ(find_code(transfer_method(same).warnings, "outside-allowed-adjustment"), nullptr);
}

// A chosen flow 4 % off the scaled one is noted with both flows; the scaled flow itself is not.
// The 10 µL injection scaled by (50 · 2.1²)/(250 · 4.6²) is 0.417 µL, below 0.5 µL (common
// practice, no source).
TEST(FindingsTransfer, FlowAndInjectionCarryTheirNumbers) {
    const TransferResult r = transfer_method(transfer(5, 0.2));
    const Warning* flow = find_code(r.warnings, "flow-not-scaled");
    ASSERT_NE(flow, nullptr);
    expect_carried(*flow, FindingKind::flow_not_scaled);
    expect_about_method(*flow);
    EXPECT_EQ(flow->finding->number_of("flow_ml_min"), 0.2);
    EXPECT_NEAR(flow->finding->number_of("scaled_flow_ml_min"), 4.41 / 21.16, 1e-12);
    EXPECT_NEAR(flow->finding->number_of("deviation_fraction"), 0.2 / (4.41 / 21.16) - 1, 1e-12);
    EXPECT_TRUE(contains(flow->message, "The chosen flow 0.200 mL/min")) << flow->message;
    EXPECT_TRUE(contains(flow->message, "scaled flow 0.208 mL/min")) << flow->message;
    EXPECT_EQ(find_code(transfer_method(transfer(5, std::nullopt)).warnings, "flow-not-scaled"),
              nullptr);

    const Warning* inj = find_code(r.warnings, "small-injection");
    ASSERT_NE(inj, nullptr);
    expect_carried(*inj, FindingKind::small_injection);
    expect_about_method(*inj);
    EXPECT_NEAR(inj->finding->number_of("injection_ul"), 10 * (50 * 4.41) / (250 * 21.16), 1e-9);
    EXPECT_TRUE(contains(inj->message, "The scaled injection is 0.42 µL")) << inj->message;
    TransferRequest big = transfer(5, std::nullopt);
    big.injection_ul = 50; // 2.08 µL on the new column
    EXPECT_EQ(find_code(transfer_method(big).warnings, "small-injection"), nullptr);
}

// The new system's dwell of 1 mL at 0.208 mL/min (4.8 min) exceeds the old one's 1 mL at 1 mL/min
// scaled by k_t = 0.2 (0.2 min): the delay is carried in minutes; a smaller dwell is not noted.
TEST(FindingsTransfer, DwellTooLargeCarriesTheDelay) {
    TransferRequest q = transfer(5, std::nullopt);
    q.from.dwell_ml = 1.0;
    q.to.dwell_ml = 1.0;
    const TransferResult r = transfer_method(q);
    const Warning* w = find_code(r.warnings, "dwell-too-large");
    ASSERT_NE(w, nullptr);
    expect_carried(*w, FindingKind::dwell_too_large);
    expect_about_method(*w);
    const double delay = 1.0 / r.flow_ml_min - (1.0 / 1.0) * r.time_factor;
    EXPECT_NEAR(w->finding->number_of("delay_min"), delay, 1e-9);
    EXPECT_TRUE(contains(w->message, "delays the gradient by " + format_fixed(delay, 2) + " min"))
        << w->message;
    q.to.dwell_ml = 0.02;
    EXPECT_EQ(find_code(transfer_method(q).warnings, "dwell-too-large"), nullptr);
}

// ---- the pressure notes ---------------------------------------------------------------------

// A trace with no reference pressure and no limit gets both notes, about its method; a one-point
// viscosity basis names the organics as items and its basis as a text.
TEST(FindingsPressure, NotesCarryTheirData) {
    PressureTrace t;
    t.calibrated = false;
    t.flow_resistance = 612.4;
    t.viscosity_basis = ViscosityBasis::one_point_estimate;
    t.viscosity_basis_organics = {"ethanol", "acetone"};
    const std::vector<Finding> notes = pressure_notes(t, "assay");
    ASSERT_EQ(notes.size(), 3u);
    EXPECT_EQ(notes[0].kind, FindingKind::viscosity_estimate);
    EXPECT_EQ(notes[1].kind, FindingKind::pressure_uncalibrated);
    EXPECT_EQ(notes[2].kind, FindingKind::pressure_no_limit);
    for (const Finding& f : notes) {
        EXPECT_EQ(f.subject, Subject::of_method("assay"));
        EXPECT_EQ(f.severity, Severity::info);
    }
    EXPECT_EQ(notes[0].text_of("viscosity_basis"),
              viscosity_basis_name(ViscosityBasis::one_point_estimate));
    ASSERT_EQ(notes[0].items.size(), 2u);
    EXPECT_EQ(notes[0].items[0].first, "ethanol");
    EXPECT_EQ(notes[0].items[1].first, "acetone");
    EXPECT_EQ(describe(notes[0], {})
                  .rfind("The viscosity of ethanol, acetone with water is a "
                         "one-point estimate",
                         0),
              0u)
        << describe(notes[0], {});
    // The flow resistance is the sentence's only (not a contract field: not in the output).
    EXPECT_EQ(notes[1].number_of("flow_resistance"), 612.4);
    EXPECT_TRUE(notes[1].numbers.empty());
    EXPECT_TRUE(contains(describe(notes[1], {}), "(flow resistance 612)"))
        << describe(notes[1], {});

    // Calibrated, with a limit and a published correlation: nothing to note.
    PressureTrace good;
    good.calibrated = true;
    good.limit = PressureLimit{400, LimitSource::column};
    good.viscosity_basis = ViscosityBasis::published_correlation;
    EXPECT_TRUE(pressure_notes(good, "assay").empty());
}

// A method that runs lines without parts has no trace: the finding names the method and lists
// the lines, in the order given.
TEST(FindingsPressure, UnknownNamesMethodAndLines) {
    const Finding f = pressure_unknown("wash", {2, 0});
    EXPECT_EQ(f.kind, FindingKind::pressure_unknown);
    EXPECT_EQ(std::string(f.code()), "pressure-unknown");
    EXPECT_EQ(f.subject, Subject::of_method("wash"));
    EXPECT_EQ(f.text_of("method"), "wash");
    ASSERT_EQ(f.items.size(), 2u);
    EXPECT_EQ(f.items[0].first, "C");
    EXPECT_EQ(f.items[1].first, "A");
    EXPECT_EQ(describe(f, {}),
              "No pressure for method wash: line(s) CA have no parts, so the viscosity is "
              "unknown.");
}

// Every new kind has its own code and a sentence (hand-made findings, the numbers each reads).
TEST(FindingsNotes, EveryNewKindHasACodeAndASentence) {
    const FindingKind kinds[] = {
        FindingKind::ph_off_target,          FindingKind::measured_ph_out_of_tolerance,
        FindingKind::eluent_ph_extrapolated, FindingKind::eluent_temperature,
        FindingKind::dwell_too_large,        FindingKind::outside_allowed_adjustment,
        FindingKind::flow_not_scaled,        FindingKind::small_injection,
        FindingKind::viscosity_estimate,     FindingKind::pressure_uncalibrated,
        FindingKind::pressure_no_limit,      FindingKind::pressure_unknown,
        FindingKind::buffer_scaled};
    std::set<std::string> codes;
    for (FindingKind k : kinds) {
        Finding f;
        f.kind = k;
        f.number("needed_ml", 250.2);
        f.number("requested_ml", 200);
        f.detail_text("line_name", "Buffer");
        const std::string s = describe(f, {});
        EXPECT_FALSE(s.empty()) << f.code();
        EXPECT_STRNE(f.code(), "?");
        codes.insert(f.code());
    }
    EXPECT_EQ(codes.size(), std::size(kinds)); // one code per kind, none shared
    Finding scaled;
    scaled.kind = FindingKind::buffer_scaled;
    scaled.number("needed_ml", 250.2);
    scaled.number("requested_ml", 200);
    scaled.detail_text("line_name", "Buffer");
    EXPECT_EQ(describe(scaled, {}), "The buffer of Buffer was designed for 251 mL instead of "
                                    "200 mL: the part needs that much.");
}

} // namespace

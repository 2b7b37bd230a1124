// The notes that are not findings: a line recipe's notes (chem::LineNote) and a route change's
// notes (chem::RouteNote) carry data only (a kind, ids, numbers); chem/note_text.cpp words them.
//
// What these tests hold against: water and acetonitrile (or methanol) contract on mixing (a
// negative excess volume over the whole range; from memory, the reason the library carries
// Redlich–Kister excess volumes for them); KOH on KH2PO4 makes the dipotassium salt K2HPO4, and
// the library has no glycinate salt (from memory of data/reagents.json, checked by tst_recipe).
// The sentences are the wording the notes had when they were built as strings.
//
// A batch's use-by limit and release reasons (chem::UseByLimit, chem::ReleaseReason) are worded
// here too: the sentences are those the app built as strings before (recorded from
// `phaseplan-cli sheet` of that build, Qt 6.4.2); the band is target × (1 ∓ tolerance) (issue 5's
// ± 2 % default), worked by hand beside each row. QString::number rounded an exact binary tie away
// from zero (2.625 → "2.63", −0.125 → "-0.13" at two decimals), so the sentences do too.
#include "chem/batch.h"
#include "chem/batch_correction.h"
#include "chem/error.h"
#include "chem/line.h"
#include "chem/note_text.h"
#include "chem/recipe_roles.h"
#include "shipped_library.h"

#include <gtest/gtest.h>

#include <string>
#include <vector>

using namespace chem;

using chem::testing::lib;
using chem::testing::solvents;

namespace {

LineSpec solvent_line(std::vector<std::pair<std::string, double>> parts) {
    LineSpec spec;
    spec.field = "lines.A";
    spec.name = "Test";
    for (auto& [id, f] : parts)
        spec.parts.push_back({id, std::nullopt, f});
    return spec;
}

TEST(LineNotes, WaterAndAcetonitrileGiveThreeTypedNotes) {
    const LineRecipe r = prepare_line(solvents(), lib(),
                                      solvent_line({{"water", 0.5}, {"acetonitrile", 0.5}}), 1000);
    ASSERT_EQ(r.notes.size(), 3u);
    EXPECT_EQ(r.notes[0].kind, LineNoteKind::gravimetric_alternative);
    EXPECT_EQ(r.notes[1].kind, LineNoteKind::ph_in_aqueous_part);
    const LineNote& c = r.notes[2];
    EXPECT_EQ(c.kind, LineNoteKind::mixing_contraction);
    ASSERT_EQ(c.contractions.size(), 1u);
    EXPECT_EQ(c.contractions[0].first, "acetonitrile"); // an id, not a name
    EXPECT_GT(c.contractions[0].second, 0.0);           // water–acetonitrile contracts
    EXPECT_DOUBLE_EQ(c.contractions[0].second, r.contraction_ml);
    EXPECT_EQ(c.volume_ml, 1000.0);
    EXPECT_EQ(c.organic_parts, 1);
    const std::string text = describe(c, solvents());
    EXPECT_EQ(text.rfind("Mixing contraction: Acetonitrile ", 0), 0u) << text;
    EXPECT_NE(text.find(" mL for 1000 mL measured separately (binary water–organic estimates)."),
              std::string::npos)
        << text;
    EXPECT_EQ(text.find("added up"), std::string::npos) << text;
    EXPECT_EQ(describe(r.notes[1], solvents()),
              "The pH is measured in the aqueous part before the organic is added; it is the "
              "aqueous pH that the method and the column's pH range refer to.");
}

TEST(LineNotes, TwoOrganicsAddUpAndANeatLineHasOnlyTheWeighing) {
    const LineRecipe two = prepare_line(
        solvents(), lib(),
        solvent_line({{"water", 0.5}, {"acetonitrile", 0.25}, {"methanol", 0.25}}), 500);
    ASSERT_EQ(two.notes.size(), 3u);
    EXPECT_EQ(two.notes[2].organic_parts, 2);
    EXPECT_NE(describe(two.notes[2], solvents()).find(", added up: rough for three components)."),
              std::string::npos);
    const LineRecipe neat =
        prepare_line(solvents(), lib(), solvent_line({{"acetonitrile", 1.0}}), 1000);
    ASSERT_EQ(neat.notes.size(), 1u);
    EXPECT_EQ(neat.notes[0].kind, LineNoteKind::gravimetric_alternative);
    EXPECT_EQ(describe(neat.notes[0], solvents()).rfind("Gravimetric alternative: tare", 0), 0u);
}

TEST(LineNotes, AnUnknownSolventIdIsNamedByItsId) {
    LineNote n;
    n.kind = LineNoteKind::mixing_contraction;
    n.contractions = {{"no-such-solvent", 12.34}};
    n.volume_ml = 250;
    EXPECT_EQ(describe(n, solvents()), "Mixing contraction: no-such-solvent 12.3 mL for 250 mL "
                                       "measured separately (binary water–organic estimates).");
}

TEST(RouteNotes, StrongTitrantReplacedNamesItsReagentsById) {
    RouteReagents tit;
    tit.weigh = "potassium-dihydrogen-phosphate";
    tit.titrant = "potassium-hydroxide";
    const RouteChange ch =
        map_reagents_to_route(lib(), "phosphate", Route::titrate, Route::mix, tit);
    ASSERT_EQ(ch.notes.size(), 1u);
    const RouteNote& n = ch.notes[0];
    EXPECT_EQ(n.field, "base");
    EXPECT_EQ(n.kind, RouteNoteKind::strong_titrant_replaced);
    EXPECT_EQ(n.titrant, "potassium-hydroxide");
    EXPECT_EQ(n.partner, "dipotassium-hydrogen-phosphate");
    EXPECT_EQ(n.system, "phosphate");
    EXPECT_EQ(n.to, Route::mix);
    EXPECT_EQ(describe(n, lib()),
              "potassium hydroxide is not a form of phosphate; the mix route uses dipotassium "
              "hydrogen phosphate (K2HPO4), the form it would have made, instead.");
}

TEST(RouteNotes, NothingFitsSaysSoWithTheDirection) {
    RouteReagents tit;
    tit.weigh = "glycine";
    tit.titrant = "sodium-hydroxide";
    const RouteChange ch = map_reagents_to_route(lib(), "glycine", Route::titrate, Route::mix, tit);
    ASSERT_EQ(ch.notes.size(), 1u);
    EXPECT_EQ(ch.notes[0].kind, RouteNoteKind::no_form_made_with);
    EXPECT_EQ(ch.notes[0].direction, PhDirection::raises);
    EXPECT_EQ(describe(ch.notes[0], lib()),
              "Nothing in the library is a more basic form of glycine made with sodium hydroxide; "
              "choose the base form: nothing was substituted.");
}

TEST(RouteNotes, MixToTitrateNamesWeighedAndPartner) {
    RouteReagents mix;
    mix.acid = "formic-acid";
    mix.base = "ammonium-formate";
    const RouteChange ch = map_reagents_to_route(lib(), "formate", Route::mix, Route::titrate, mix);
    ASSERT_EQ(ch.notes.size(), 1u);
    EXPECT_EQ(ch.notes[0].kind, RouteNoteKind::weighed_with_partner);
    EXPECT_EQ(ch.notes[0].weighed, "ammonium-formate");
    EXPECT_EQ(ch.notes[0].partner, "formic-acid");
    EXPECT_EQ(ch.notes[0].titrant_form, TitrantForm::neat); // formic acid is a liquid
    EXPECT_EQ(describe(ch.notes[0], lib()),
              "ammonium formate is weighed and formic acid brings it to pH, added as supplied "
              "(neat).");
    // Without a complete pair nothing is carried over, and the note names the field to choose.
    mix.base = "no-such-reagent";
    const RouteChange none =
        map_reagents_to_route(lib(), "formate", Route::mix, Route::titrate, mix);
    ASSERT_EQ(none.notes.size(), 1u);
    EXPECT_EQ(none.notes[0].kind, RouteNoteKind::no_pair_to_carry);
    EXPECT_EQ(describe(none.notes[0], lib()),
              "Choose the titrant: the mix had no complete pair to carry over.");
}

NameLookup batch_names() {
    return [](const std::string& id) {
        return id == "sodium-dihydrogen-phosphate-monohydrate"
                   ? std::string("Sodium dihydrogen phosphate monohydrate")
                   : id;
    };
}

/// A reason's numbers, as worked by hand: target, actual, low, high, deviation, tolerance.
struct ReasonNumbers {
    double target, actual, low, high, deviation, tolerance;
};
void expect_numbers(const ReleaseReason& r, const ReasonNumbers& n) {
    EXPECT_NEAR(r.target, n.target, 1e-12);
    EXPECT_NEAR(r.actual, n.actual, 1e-12);
    EXPECT_NEAR(r.low, n.low, 1e-12);
    EXPECT_NEAR(r.high, n.high, 1e-12);
    EXPECT_NEAR(r.deviation, n.deviation, 1e-12);
    EXPECT_NEAR(r.tolerance, n.tolerance, 1e-12);
}

TEST(BatchNotes, UseByLimitNamesTheLotThePartAndTheDate) {
    const UseByLimit limit{"sodium-dihydrogen-phosphate-monohydrate", "SP-2", "2026-12-02"};
    EXPECT_EQ(describe(limit, batch_names()),
              "lot SP-2 of Sodium dihydrogen phosphate monohydrate, which expires on 2026-12-02");
    // Without names, the id.
    EXPECT_EQ(describe(UseByLimit{"acetonitrile", "ACN-7", "2026-12-03"}),
              "lot ACN-7 of acetonitrile, which expires on 2026-12-03");
}

TEST(BatchNotes, AnAmountOutOfItsBandCarriesItsNumbers) {
    // 3.075 g against 3.000 g at ± 2 %: band 2.940–3.060 g, 3.075 / 3.000 − 1 = +2.5 % (by hand).
    const AmountCheck c =
        check_amount("sodium-dihydrogen-phosphate-monohydrate", "g", 3.0, 3.075, 0.02);
    ASSERT_FALSE(c.within_tolerance);
    const ReleaseReason r = amount_reason(c, 0.02);
    EXPECT_EQ(r.kind, ReleaseReasonKind::amount_out_of_band);
    EXPECT_EQ(r.reagent, "sodium-dihydrogen-phosphate-monohydrate");
    EXPECT_EQ(r.unit, "g");
    expect_numbers(r, {3.0, 3.075, 2.94, 3.06, 0.025, 0.02});
    EXPECT_EQ(describe(r, batch_names()), "Sodium dihydrogen phosphate monohydrate: 3.075 g, "
                                          "+2.5 % (band 2.940–3.060 g)");
    // Below the band, under 1 mL, named by its id: 0.48 mL against 0.50 mL, band 0.49–0.51 mL,
    // 0.48 / 0.50 − 1 = −4.0 %. The actual has four decimals (format_amount); the band the
    // target's three (1 µL below 1 mL, chem::measure_decimals), as the sheet's table prints it.
    const ReleaseReason low =
        amount_reason(check_amount("phosphoric-acid", "mL", 0.5, 0.48, 0.02), 0.02);
    EXPECT_NEAR(low.deviation, -0.04, 1e-12);
    EXPECT_EQ(describe(low), "phosphoric-acid: 0.4800 mL, -4.0 % (band 0.490–0.510 mL)");
}

TEST(BatchNotes, AMeasuredPhOutOfToleranceCarriesTargetAndBand) {
    // 2.58 against 2.50 ± 0.05 (the check_print.sh case): +0.08, band 2.45–2.55.
    const ReleaseReason r = measured_ph_reason(2.58, 2.5, 0.05);
    EXPECT_EQ(r.kind, ReleaseReasonKind::measured_ph_out_of_tolerance);
    EXPECT_EQ(r.reagent, "");
    EXPECT_EQ(r.unit, "");
    expect_numbers(r, {2.5, 2.58, 2.45, 2.55, 0.08, 0.05});
    EXPECT_EQ(describe(r), "Measured pH 2.58, +0.08 from the target 2.50 (± 0.05)");
    // Exact binary ties round away from zero, as QString::number did: 2.625 − 2.5 = 0.125.
    EXPECT_EQ(describe(measured_ph_reason(2.625, 2.5, 0.05)),
              "Measured pH 2.63, +0.13 from the target 2.50 (± 0.05)");
    EXPECT_EQ(describe(measured_ph_reason(2.375, 2.5, 0.02)),
              "Measured pH 2.38, -0.13 from the target 2.50 (± 0.02)");
}

TEST(BatchNotes, ACorrectionIsWordedFromItsNumbers) {
    // Part A weighed 2.1 g against 2.0 g (+5 %, band ± 2 %), B not weighed yet, 1000 mL planned:
    // the batch is scaled by 2.1 / 2.0 = 1.05, B is weighed at 5.25 g, made up to 1050 mL (the
    // rule of chem/batch_correction.h, worked by hand).
    const std::vector<AmountCheck> over = {check_amount("A", "g", 2.0, 2.1, 0.02),
                                           check_amount("B", "g", 5.0, std::nullopt, 0.02)};
    const Correction c = suggest_correction(over, 0.02, 1000, std::nullopt);
    const std::vector<std::string> made_up = {
        "Weigh 5.250 g of B (scaled from 5.000 g).",
        "Make up to 1050.0 mL instead of 1000.0 mL (all amounts × 1.0500), then relabel the "
        "volume."};
    EXPECT_EQ(describe(c), made_up);
    const std::vector<std::string> line = describe(c, {}, false);
    ASSERT_EQ(line.size(), 2u);
    EXPECT_EQ(line[1], "The line then holds 1050.0 mL instead of 1000.0 mL (all amounts × 1.0500), "
                       "then relabel the volume.");
    EXPECT_EQ(remake_reason(c), "");
    // Named by the lookup.
    EXPECT_EQ(describe(c, [](const std::string& id) { return "part " + id; })[0],
              "Weigh 5.250 g of part B (scaled from 5.000 g).");

    // Only under its band: 1.9 g against 2.0 g, nothing scaled; add the 0.1 g missing.
    const Correction under =
        suggest_correction({check_amount("A", "g", 2.0, 1.9, 0.02)}, 0.02, 1000, std::nullopt);
    EXPECT_EQ(describe(under), std::vector<std::string>{"Add 0.1000 g of A (to 2.000 g)."});

    // The 1050 mL do not fit a 1000 mL vessel: remake.
    const Correction remake = suggest_correction(over, 0.02, 1000, 1000.0);
    ASSERT_TRUE(remake.remake);
    EXPECT_EQ(remake_reason(remake),
              "the corrected batch needs 1050 mL, more than the 1000 mL the container holds");
    EXPECT_EQ(describe(remake),
              std::vector<std::string>{"Remake the batch: the corrected batch needs 1050 mL, more "
                                       "than the 1000 mL the container holds."});

    // Within every band: no correction, no words.
    EXPECT_TRUE(describe(suggest_correction({check_amount("A", "g", 2.0, 2.01, 0.02)}, 0.02, 1000,
                                            std::nullopt))
                    .empty());
    // The scale's exact tie, 33 / 32 = 1.03125, rounds away from zero as QString::number(v, 'f', 4)
    // printed it ("1.0313", checked against Qt 6.4 by hand).
    const Correction tie =
        suggest_correction({check_amount("A", "g", 32.0, 33.0, 0.02)}, 0.02, 1000, std::nullopt);
    EXPECT_NE(describe(tie).back().find("× 1.0313)"), std::string::npos);
}

} // namespace

// The notes that are not findings: a line recipe's notes (chem::LineNote) and a route change's
// notes (chem::RouteNote) carry data only (a kind, ids, numbers); chem/note_text.cpp words them.
//
// What these tests hold against: water and acetonitrile (or methanol) contract on mixing (a
// negative excess volume over the whole range; from memory, the reason the library carries
// Redlich–Kister excess volumes for them); KOH on KH2PO4 makes the dipotassium salt K2HPO4, and
// the library has no glycinate salt (from memory of data/reagents.json, checked by tst_recipe).
// The sentences are the wording the notes had when they were built as strings.
#include "chem/error.h"
#include "chem/line.h"
#include "chem/note_text.h"
#include "chem/recipe_roles.h"
#include "shipped_library.h"

#include <gtest/gtest.h>

#include <string>

using namespace chem;

namespace {

const Library& lib() {
    return chem::testing::shipped_library();
}
const SolventLibrary& solvents() {
    return chem::testing::shipped_solvents();
}

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

} // namespace

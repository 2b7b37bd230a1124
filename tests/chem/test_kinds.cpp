// The typed discriminators of chem/: how a recipe item is measured (ItemKind), what a line item
// is (LineItemKind), where a solute comes from (SoluteSource), where a line's pH comes from
// (PhBasis), the detector (DetectorType) and the one shelf-life vocabulary (ShelfKind), each
// checked on recipes and lines made from the shipped libraries, and each name against the
// contract's words (README.md, the JSON commands' outputs).
#include "chem/checks.h"
#include "chem/line.h"
#include "chem/recipe.h"
#include "shipped_library.h"

#include <gtest/gtest.h>

#include <set>
#include <string>

using namespace chem;

using chem::testing::lib;
using chem::testing::solvents;

namespace {

/// The item for `reagent`; fails the test when the recipe has none.
const RecipeItem& item(const Recipe& r, const std::string& reagent) {
    for (const RecipeItem& it : r.items)
        if (it.reagent == reagent)
            return it;
    ADD_FAILURE() << "no item " << reagent;
    static const RecipeItem none;
    return none;
}

/// The line's demo buffer: 20 mmol/L sodium phosphate pH 2.5 by the mix route
/// (data/demo/buffer-phosphate-ph2.5.json).
Recipe demo_buffer(double volume_ml) {
    RecipeRequest q;
    q.target_ph = 2.5;
    q.volume_ml = volume_ml;
    q.route = Route::mix;
    q.acid = "phosphoric-acid";
    q.base = "sodium-dihydrogen-phosphate-monohydrate";
    q.concentration_mol_per_l = 0.02;
    return design_recipe(lib(), q);
}

const Solute* solute(const LineProfile& p, const std::string& reagent) {
    for (const Solute& s : p.solutes)
        if (s.reagent == reagent)
            return &s;
    return nullptr;
}

// ---- recipe items -------------------------------------------------------------------------

// Phosphoric acid is supplied as a liquid (85 % w/w) and the monohydrate salt as a solid
// (data/reagents.json "form"): the acid is pipetted, the salt weighed.
TEST(ItemKinds, MixRouteMeasuresLiquidsAndWeighsSolids) {
    const Recipe r = demo_buffer(1000);
    EXPECT_EQ(item(r, "phosphoric-acid").kind, ItemKind::liquid);
    EXPECT_EQ(item(r, "sodium-dihydrogen-phosphate-monohydrate").kind, ItemKind::solid);
    // The contract's words for "as" (README.md, recipe items).
    EXPECT_EQ(item_as_text(item(r, "phosphoric-acid")), "liquid");
    EXPECT_EQ(item_as_text(item(r, "sodium-dihydrogen-phosphate-monohydrate")), "solid");
}

// A stock is named with its molarity, as in README.md ("stock 0.2 mol/L").
TEST(ItemKinds, StocksCarryTheirMolarity) {
    RecipeRequest q;
    q.target_ph = 6.8;
    q.route = Route::stocks;
    q.acid = "sodium-dihydrogen-phosphate";
    q.base = "disodium-hydrogen-phosphate";
    q.acid_stock_mol_per_l = 0.2;
    q.base_stock_mol_per_l = 0.5;
    q.concentration_mol_per_l = 0.02;
    const Recipe r = design_recipe(lib(), q);
    const RecipeItem& acid = item(r, q.acid);
    const RecipeItem& base = item(r, q.base);
    EXPECT_EQ(acid.kind, ItemKind::stock);
    EXPECT_DOUBLE_EQ(acid.solution_mol_per_l, 0.2);
    EXPECT_EQ(item_as_text(acid), "stock 0.2 mol/L");
    EXPECT_EQ(item_as_text(base), "stock 0.5 mol/L");
    EXPECT_FALSE(is_titrant(acid.kind));
}

// The titrant as a solution ("titrant 1 mol/L") or as supplied ("titrant, neat"), README.md.
TEST(ItemKinds, TitrantSolutionAndNeat) {
    RecipeRequest q;
    q.target_ph = 6.8;
    q.route = Route::titrate;
    q.weigh = "sodium-dihydrogen-phosphate";
    q.titrant = "sodium-hydroxide";
    q.titrant_mol_per_l = 1.0;
    q.concentration_mol_per_l = 0.02;
    const Recipe solution = design_recipe(lib(), q);
    EXPECT_EQ(item(solution, "sodium-hydroxide").kind, ItemKind::titrant_solution);
    EXPECT_EQ(item_as_text(item(solution, "sodium-hydroxide")), "titrant 1 mol/L");
    EXPECT_TRUE(is_titrant(item(solution, "sodium-hydroxide").kind));

    RecipeRequest n;
    n.target_ph = 3.0;
    n.route = Route::titrate;
    n.weigh = "ammonium-formate";
    n.titrant = "formic-acid";
    n.titrant_form = TitrantForm::neat;
    n.concentration_mol_per_l = 0.01;
    const Recipe neat = design_recipe(lib(), n);
    EXPECT_EQ(item(neat, "formic-acid").kind, ItemKind::titrant_neat);
    EXPECT_EQ(item_as_text(item(neat, "formic-acid")), "titrant, neat");
    EXPECT_EQ(item(neat, "ammonium-formate").kind, ItemKind::solid);
}

// ---- lines --------------------------------------------------------------------------------

// 90 % demo buffer and 10 % acetonitrile: data/solvents.json counts 10 % organic or more as
// "buffer-with-organic" (72 h, lab-set default); the pH is the buffer design's.
TEST(LineKinds, BufferWithOrganic) {
    LineSpec line;
    line.field = "lines.A";
    line.parts.push_back({"", demo_buffer(900), 0.9});
    line.parts.push_back({"acetonitrile", std::nullopt, 0.1});
    const LineRecipe lr = prepare_line(solvents(), lib(), line, 1000);
    ASSERT_EQ(lr.items.size(), std::size_t(2));
    EXPECT_EQ(lr.items[0].kind, LineItemKind::buffer);
    EXPECT_EQ(lr.items[1].kind, LineItemKind::solvent);
    EXPECT_EQ(lr.profile.ph_basis, PhBasis::buffer_design);
    ASSERT_TRUE(lr.profile.shelf_kind.has_value());
    EXPECT_EQ(*lr.profile.shelf_kind, ShelfKind::buffer_with_organic);
    EXPECT_DOUBLE_EQ(lr.profile.shelf_life_h, 72);
    const Solute* phosphate = solute(lr.profile, "phosphoric-acid");
    ASSERT_NE(phosphate, nullptr);
    EXPECT_EQ(phosphate->from, SoluteSource::buffer);
}

// Water with 0.1 % v/v formic acid: no buffer part, so the pH is solved from the additive in
// water; data/solvents.json calls it "aqueous-additive" (168 h, lab-set default).
TEST(LineKinds, WaterWithAnAdditive) {
    LineSpec line;
    line.field = "lines.A";
    line.parts.push_back({"water", std::nullopt, 1.0});
    line.additives.push_back({"formic-acid", AmountUnit::percent_v, 0.1});
    const LineRecipe lr = prepare_line(solvents(), lib(), line, 1000);
    ASSERT_EQ(lr.items.size(), std::size_t(2));
    EXPECT_EQ(lr.items[0].kind, LineItemKind::solvent);
    EXPECT_EQ(lr.items[1].kind, LineItemKind::additive);
    EXPECT_EQ(lr.profile.ph_basis, PhBasis::solved_from_additives);
    EXPECT_EQ(lr.profile.shelf_kind, ShelfKind::aqueous_additive);
    EXPECT_DOUBLE_EQ(lr.profile.shelf_life_h, 168);
    ASSERT_EQ(lr.profile.solutes.size(), std::size_t(1));
    EXPECT_EQ(lr.profile.solutes[0].from, SoluteSource::additive);
}

// The buffer's own acid added again as an additive comes from both.
TEST(LineKinds, ASoluteFromTheBufferAndAnAdditive) {
    LineSpec line;
    line.field = "lines.A";
    line.parts.push_back({"", demo_buffer(1000), 1.0});
    line.additives.push_back({"phosphoric-acid", AmountUnit::mmol_per_l, 1.0});
    const LineProfile p = profile_line(solvents(), lib(), line);
    const Solute* acid = solute(p, "phosphoric-acid");
    ASSERT_NE(acid, nullptr);
    EXPECT_EQ(acid->from, SoluteSource::buffer_and_additive);
    EXPECT_STREQ(solute_source_name(acid->from), "buffer+additive");
}

// Neat acetonitrile: no pH, "neat-solvent" (720 h, data/solvents.json); two organic solvents
// premixed: "solvent-mixture" (168 h); a line without parts has no kind and no shelf life.
TEST(LineKinds, SolventsAndUndescribedLines) {
    LineSpec neat;
    neat.field = "lines.B";
    neat.parts.push_back({"acetonitrile", std::nullopt, 1.0});
    const LineProfile p = profile_line(solvents(), lib(), neat);
    EXPECT_EQ(p.ph_basis, PhBasis::none);
    EXPECT_STREQ(ph_basis_name(p.ph_basis), "");
    EXPECT_EQ(p.shelf_kind, ShelfKind::neat_solvent);
    EXPECT_DOUBLE_EQ(p.shelf_life_h, 720);

    LineSpec mix = neat;
    mix.parts = {{"acetonitrile", std::nullopt, 0.5}, {"methanol", std::nullopt, 0.5}};
    EXPECT_EQ(profile_line(solvents(), lib(), mix).shelf_kind, ShelfKind::solvent_mixture);

    LineSpec empty;
    empty.field = "lines.C";
    const LineProfile none = profile_line(solvents(), lib(), empty);
    EXPECT_FALSE(none.shelf_kind.has_value());
    EXPECT_STREQ(shelf_kind_name(none), "");
}

// ---- names ----------------------------------------------------------------------------------

// Every shelf-life kind of the shipped data/solvents.json reads into the enum, and the built-in
// figures (used when a library has no entry) are the shipped ones, entry by entry.
TEST(ShelfKinds, OneVocabularyWithTheData) {
    EXPECT_EQ(solvents().shelf_lives().size(), shelf_kinds().size());
    std::set<ShelfKind> seen;
    for (const ShelfLife& s : solvents().shelf_lives()) {
        seen.insert(s.kind);
        EXPECT_DOUBLE_EQ(builtin_shelf_life_h(s.kind), s.hours) << shelf_kind_name(s.kind);
        EXPECT_DOUBLE_EQ(solvents().shelf_life_h(s.kind), s.hours);
    }
    EXPECT_EQ(seen.size(), shelf_kinds().size());
    for (ShelfKind k : shelf_kinds())
        EXPECT_EQ(shelf_kind_from_name(shelf_kind_name(k)), k);
    // The spellings of the retired batch-only vocabulary are not kinds.
    EXPECT_FALSE(shelf_kind_from_name("aqueous_buffer").has_value());
    EXPECT_FALSE(shelf_kind_from_name("mixed").has_value());
    // A library without the entry falls back on the built-in figure and says so.
    SolventLibrary bare;
    std::string source;
    EXPECT_DOUBLE_EQ(bare.shelf_life_h(ShelfKind::aqueous_buffer, &source), 48);
    EXPECT_EQ(source, "built-in default, common practice, no source");
    // The sheet's words for the recipe batch, as printed before the vocabulary was merged.
    EXPECT_STREQ(shelf_kind_words(ShelfKind::aqueous_buffer), "an aqueous buffer");
}

// The detector types of the contract (README.md, "detector": {"type": …}), UV-reading ones
// (uv, dad, pda, uv-ms) and the ones that need a volatile eluent (ms, uv-ms, elsd, cad): common
// practice, no source.
TEST(DetectorTypes, NamesAndWhatTheyNeed) {
    const std::vector<std::string> words = {"uv",   "dad", "pda",          "uv-ms", "ms",
                                            "elsd", "cad", "fluorescence", "ri"};
    ASSERT_EQ(detector_types().size(), words.size());
    for (std::size_t i = 0; i < words.size(); ++i) {
        EXPECT_EQ(detector_type_name(detector_types()[i]), words[i]);
        EXPECT_EQ(detector_type_from_name(words[i]), detector_types()[i]);
    }
    EXPECT_FALSE(detector_type_from_name("UV").has_value()); // the JSON edge lower-cases first
    EXPECT_FALSE(detector_type_from_name("uv_ms").has_value());
    EXPECT_TRUE(detector_reads_uv(DetectorType::uv_ms));
    EXPECT_TRUE(detector_needs_volatile(DetectorType::uv_ms));
    EXPECT_FALSE(detector_reads_uv(DetectorType::elsd));
    EXPECT_TRUE(detector_needs_volatile(DetectorType::cad));
    EXPECT_FALSE(detector_reads_uv(DetectorType::ri));
    EXPECT_FALSE(detector_needs_volatile(DetectorType::fluorescence));
}

} // namespace

// The field paths of chem::Error (chem/error.h): the segments read from the text of the
// command-line contract, the text written back unchanged, within(), and the questions the app
// asks (path_within, subscript_of). The path syntax is the README's "Errors" contract (keys
// joined by dots, list entries and reagent ids in brackets); the expected values below are read
// off that contract, not computed.
#include "chem/error.h"
#include "chem/measure_band.h"

#include <gtest/gtest.h>

#include <string>
#include <vector>

namespace {

using chem::Error;
using chem::Path;
using chem::PathSegment;
using Kind = PathSegment::Kind;

std::vector<PathSegment> segs(std::initializer_list<PathSegment> l) {
    return l;
}

// The README's example "components[1].mol_per_l" and the batch history's reagent subscript.
TEST(ErrorPath, ParsesKeysIndicesAndSubscripts) {
    EXPECT_EQ(Path::parse("components[1].mol_per_l").segments(),
              segs({PathSegment::key("components"), PathSegment::index(1),
                    PathSegment::key("mol_per_l")}));
    EXPECT_EQ(Path::parse("actual[phosphoric-acid].lot").segments(),
              segs({PathSegment::key("actual"), PathSegment::subscript("phosphoric-acid"),
                    PathSegment::key("lot")}));
    EXPECT_EQ(Path::parse("actual[phosphoric-acid]").segments()[1].kind, Kind::subscript);
    EXPECT_EQ(Path::parse("gradient[12]").segments()[1].kind, Kind::index);
    EXPECT_EQ(Path::parse("gradient[12]").segments()[1].as_index(), 12);
    EXPECT_EQ(Path::parse("actual[phosphoric-acid]").segments()[1].as_index(), -1);
    EXPECT_TRUE(Path::parse("").empty());
    EXPECT_EQ(Path::parse("lines.A.bottle_ml").size(), 3u);
}

// A reagent id may hold '.' (a lab's own id such as "acme.buffer-7"): inside brackets it is one
// subscript, not two keys.
TEST(ErrorPath, DotsInsideBracketsStayInTheSubscript) {
    const Path p = Path::parse("batch.actual[acme.buffer-7].lot");
    ASSERT_EQ(p.size(), 4u);
    EXPECT_EQ(p.segments()[2], PathSegment::subscript("acme.buffer-7"));
    EXPECT_EQ(p.segments()[3], PathSegment::key("lot"));
    EXPECT_EQ(p.text(), "batch.actual[acme.buffer-7].lot");
}

// field() is the CLI's text: it must come back exactly as thrown, whatever the throw site wrote
// (tests/golden holds these lines), including the odd fields the CLI uses.
TEST(ErrorPath, FieldTextIsKeptExactly) {
    for (const std::string f :
         {"components[1].mol_per_l", "lines.A.parts[0].fraction_v", "-o", "--paper", "(document)",
          "batch.actual[", "database.connection", "a..b", "x[1].", "[3].x", "x[1][2]", ""}) {
        const Error e(f, "msg");
        EXPECT_EQ(e.field(), f);
        EXPECT_EQ(std::string(e.what()), f + ": msg");
        EXPECT_EQ(e.message(), "msg");
        EXPECT_EQ(e.path().text(), f) << "round trip of " << f;
    }
    // "batch.actual[" has no closing bracket: the '[' stays in the key.
    EXPECT_EQ(Path::parse("batch.actual[").segments()[1], PathSegment::key("actual["));
}

TEST(ErrorPath, WithinPrefixesTextAndSegments) {
    const Error e = Error("mol_per_l", "-0.2 is not a positive amount").within("components[2]");
    EXPECT_EQ(e.field(), "components[2].mol_per_l");
    EXPECT_EQ(e.path(), Path::parse("components[2].mol_per_l"));
    // A field that starts with a bracket joins without a dot.
    const Error l = Error("[3].percent_v", "m").within("additives");
    EXPECT_EQ(l.field(), "additives[3].percent_v");
    EXPECT_EQ(l.path(), Path::parse("additives[3].percent_v"));
    // An empty field becomes the parent.
    EXPECT_EQ(Error("", "m").within("lines.A").field(), "lines.A");
    EXPECT_EQ(Error("", "m").within("lines.A").path().size(), 2u);
    // Nested twice, and from segments.
    const Error n = Error("fraction_v", "m").within("parts[0]").within("lines.A");
    EXPECT_EQ(n.field(), "lines.A.parts[0].fraction_v");
    EXPECT_EQ(n.path().size(), 5u);
    const Error s =
        Error("lot", "m")
            .within(Path({PathSegment::key("actual"), PathSegment::subscript("acme.buffer-7")}));
    EXPECT_EQ(s.field(), "actual[acme.buffer-7].lot");
    EXPECT_EQ(s.path().segments()[1].text, "acme.buffer-7");
}

TEST(ErrorPath, BuiltFromSegments) {
    Path p({PathSegment::key("batch"), PathSegment::key("actual")});
    p /= PathSegment::index(2);
    p /= PathSegment::key("mass_g");
    const Error e(p, "-1 g is not positive");
    EXPECT_EQ(e.field(), "batch.actual[2].mass_g");
    EXPECT_EQ(std::string(e.what()), "batch.actual[2].mass_g: -1 g is not positive");
    EXPECT_EQ(e.path(), p);
}

TEST(ErrorPath, WithinIsBySegment) {
    EXPECT_TRUE(chem::path_within("lines.A.parts[0].fraction_v", "lines.A"));
    EXPECT_TRUE(chem::path_within("lines.A.parts[0].fraction_v", "lines.A.parts"));
    EXPECT_TRUE(chem::path_within("lines.A.parts[0].fraction_v", "lines.A.parts[0]"));
    EXPECT_TRUE(chem::path_within("lines.A", "lines.A"));
    EXPECT_FALSE(chem::path_within("lines.AB", "lines.A"));
    EXPECT_FALSE(chem::path_within("lines", "lines.A"));
    EXPECT_FALSE(chem::path_within("lines.A.parts[1]", "lines.A.parts[0]"));
    EXPECT_FALSE(chem::path_within("actual[acme.buffer-7]", "actual[acme]"));
    EXPECT_TRUE(chem::path_within("anything", ""));
    EXPECT_TRUE(Path::parse("batch.actual[acme.buffer-7].lot")
                    .within(Path({PathSegment::key("batch"), PathSegment::key("actual"),
                                  PathSegment::subscript("acme.buffer-7")})));
}

TEST(ErrorPath, SubscriptOf) {
    const auto a = chem::subscript_of("batch.actual[2].mass_g", "batch.actual");
    ASSERT_TRUE(a);
    EXPECT_EQ(a->subscript, "2");
    EXPECT_EQ(a->index(), 2);
    EXPECT_EQ(a->rest, "mass_g");
    EXPECT_EQ(a->rest_path, Path::parse("mass_g"));
    const auto r = chem::subscript_of("actual[acme.buffer-7].lot", "actual");
    ASSERT_TRUE(r);
    EXPECT_EQ(r->subscript, "acme.buffer-7");
    EXPECT_EQ(r->index(), -1);
    EXPECT_EQ(r->rest, "lot");
    EXPECT_TRUE(chem::subscript_of("gradient[12]", "gradient")->rest.empty());
    EXPECT_FALSE(chem::subscript_of("batch.actual", "batch.actual"));
    EXPECT_FALSE(chem::subscript_of("batch.actual[2", "batch.actual"));
    EXPECT_FALSE(chem::subscript_of("batch.actualx[2]", "batch.actual"));
    EXPECT_FALSE(chem::subscript_of("batch.actual.mass_g", "batch.actual"));
    EXPECT_EQ(chem::subscript_of("x[99999999999]", "x")->index(), -1);
    // On an error's segments directly.
    const Error e("batch.actual[1].lot", "m");
    EXPECT_EQ(chem::subscript_of(e.path(), Path::parse("batch.actual"))->index(), 1);
}

} // namespace

// The amounts to weigh and measure are written at the resolution of what measures them
// (chem::measure_decimals). The resolutions are common practice, no source: an analytical balance
// reads 0.1 mg, a milligram balance 1 mg, a precision top-pan balance 0.01 g; an adjustable
// 100–1000 µL pipette is set in 1 µL steps, a 1–10 mL pipette in 10 µL, a graduated pipette or
// burette reads 0.1 mL, a graduated cylinder 1 mL.
TEST(MeasureText, DecimalsFollowTheBalanceAndThePipette) {
    using chem::MeasureUnit;
    EXPECT_EQ(chem::format_measure(0.7556, MeasureUnit::ml), "0.756");
    EXPECT_EQ(chem::format_measure(1.2588, MeasureUnit::ml), "1.26");
    EXPECT_EQ(chem::format_measure(25.04, MeasureUnit::ml), "25.0");
    EXPECT_EQ(chem::format_measure(500.4, MeasureUnit::ml), "500");
    EXPECT_EQ(chem::format_measure(0.04567, MeasureUnit::g), "0.0457");
    EXPECT_EQ(chem::format_measure(2.97483, MeasureUnit::g), "2.975");
    EXPECT_EQ(chem::format_measure(57.1234, MeasureUnit::g), "57.123");
    EXPECT_EQ(chem::format_measure(393.456, MeasureUnit::g), "393.46");
}

TEST(MeasureText, AValueRoundedUpToABoundaryTakesTheNextResolution) {
    using chem::MeasureUnit;
    // 99.9996 g rounds to 100 g, which a top-pan balance weighs to 0.01 g.
    EXPECT_EQ(chem::format_measure(99.9996, MeasureUnit::g), "100.00");
    EXPECT_EQ(chem::format_measure(0.99996, MeasureUnit::g), "1.000");
    EXPECT_EQ(chem::format_measure(9.996, MeasureUnit::ml), "10.0");
    EXPECT_EQ(chem::format_measure(-0.0001, MeasureUnit::ml), "0.000");
    EXPECT_EQ(chem::measure_decimals(0.5, MeasureUnit::g), 4);
    EXPECT_EQ(chem::measure_decimals(0.5, MeasureUnit::ml), 3);
}

// A tolerance band reads with its target's decimals (common practice, no source: the band is
// read on the balance or pipette that measures the target), each end rounded inward.
TEST(MeasureText, ABandHasItsTargetsDecimals) {
    using chem::MeasureUnit;
    // 1.2588 mL ± 2 % (the demo's phosphoric acid): target "1.26", so 10 µL steps;
    // 1.233624–1.283976 holds 1.24 to 1.28 at that resolution.
    EXPECT_EQ(chem::format_measure_band(1.2588 * 0.98, 1.2588 * 1.02, 1.2588, MeasureUnit::ml),
              "1.24–1.28");
    // 2.9748 g ± 2 %: "2.975", 1 mg steps; 2.915304–3.034296.
    EXPECT_EQ(chem::format_measure_band(2.9748 * 0.98, 2.9748 * 1.02, 2.9748, MeasureUnit::g),
              "2.916–3.034");
    // An end on a step stays: 1.23–1.29 exactly (1.23 * 100 is 122.99999… in binary).
    EXPECT_EQ(chem::format_measure_band(1.23, 1.29, 1.26, MeasureUnit::ml), "1.23–1.29");
    // 99.9996 g is written "100.00": its band has 2 decimals, as the top-pan balance reads.
    EXPECT_EQ(chem::format_measure_band(98.0, 102.0, 99.9996, MeasureUnit::g), "98.00–102.00");
    // Too narrow for the resolution (the inward ends cross): the nearest steps.
    EXPECT_EQ(chem::format_measure_band(0.00104, 0.00106, 0.00105, MeasureUnit::g),
              "0.0010–0.0011");
    EXPECT_EQ(chem::shown_measure_decimals(99.9996, MeasureUnit::g), 2);
    // An end rounded to zero from a tiny negative value is written without a sign.
    EXPECT_EQ(chem::format_measure_band(-1e-12, 0.001, 0.0005, MeasureUnit::g), "0.0000–0.0010");
    EXPECT_EQ(chem::format_measure_band(-0.00004, -1e-12, -0.00002, MeasureUnit::g),
              "0.0000–0.0000");
}

// A recorded amount keeps the digits entered and never shows fewer than the target's rule
// (common practice, no source: a batch record shows what was weighed as it was read).
TEST(MeasureText, ARecordedAmountKeepsItsDigits) {
    using chem::MeasureUnit;
    EXPECT_EQ(chem::format_recorded(1.27, MeasureUnit::ml), "1.27");    // not "1.270"
    EXPECT_EQ(chem::format_recorded(2.9813, MeasureUnit::g), "2.9813"); // 0.1 mg balance
    EXPECT_EQ(chem::format_recorded(2.981, MeasureUnit::g), "2.981");
    EXPECT_EQ(chem::format_recorded(2.98, MeasureUnit::g), "2.980");       // the rule's 1 mg
    EXPECT_EQ(chem::format_recorded(0.1 + 0.2, MeasureUnit::ml), "0.300"); // binary noise
    EXPECT_EQ(chem::format_recorded(1.0 / 3.0, MeasureUnit::g), "0.333333");
    EXPECT_EQ(chem::format_recorded(500, MeasureUnit::ml), "500");
}

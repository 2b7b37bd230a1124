// The app's findings: an instrument past its calibration date, a value taken from one, an
// expired lot used by override, and one batch of a line recipe used past its shelf life. The app
// fills the data (the device, the part, the ISO dates, the hours); describe() words them. The
// sentences are the ones the app built as strings before (tst_devices, tst_lots,
// tst_gui_batch_capture and the goldens check them in place).
//
// format_fixed_ties_away is held to what QString::number(v, 'f', d) printed for exact ties
// (measured with Qt 6.4.2: 0.5 → "1", 2.5 → "3", 0.25 → "0.3", 12.25 → "12.3" at one decimal),
// where std::to_chars rounds them to even.
#include "chem/error.h"
#include "chem/finding.h"
#include "chem/finding_text.h"

#include <gtest/gtest.h>

#include <string>

using namespace chem;

namespace {

TEST(FindingsApp, DeviceCalibrationDueNamesTheDeviceAndItsDate) {
    Finding f;
    f.kind = FindingKind::device_calibration_due;
    f.severity = Severity::caution;
    f.subject = Subject::of_device("PHM-01");
    f.text("device", "PHM-01");
    f.text("calibration_due", "2026-11-30");
    f.detail_text("device_kind", "ph_meter");
    EXPECT_STREQ(f.code(), "device-calibration-due");
    EXPECT_STREQ(subject_kind_name(f.subject.kind), "device");
    EXPECT_EQ(describe(f, {}), "pH meter PHM-01 was due for calibration on 2026-11-30: calibrate "
                               "it or use another pH meter");
    f.detail_texts.clear();
    f.detail_text("device_kind", "balance");
    EXPECT_EQ(describe(f, {}), "balance PHM-01 was due for calibration on 2026-11-30: calibrate "
                               "it or use another balance");
}

TEST(FindingsApp, AReadingNamesItsPartByTheScreensNameAndItsDevice) {
    Finding f;
    f.kind = FindingKind::reading_calibration_due;
    f.subject = Subject::of_reagent("phosphoric-acid");
    f.where = Subject::of_device("BAL-03");
    f.text("device", "BAL-03");
    f.text("calibration_due", "2026-12-01");
    f.detail_text("device_kind", "balance");
    RenderContext words;
    words.name_of = [](const std::string& id) {
        return id == "phosphoric-acid" ? std::string("Phosphoric acid 85 %") : id;
    };
    EXPECT_STREQ(f.code(), "device-calibration-due");
    EXPECT_EQ(describe(f, words), "The amount of Phosphoric acid 85 % was taken from balance "
                                  "BAL-03, which was due for calibration on 2026-12-01");
    // The measured pH (no subject), from an instrument whose kind was not recorded.
    f.subject = Subject{};
    f.detail_texts.clear();
    EXPECT_EQ(describe(f, words), "The measured pH was taken from instrument BAL-03, which was "
                                  "due for calibration on 2026-12-01");
}

TEST(FindingsApp, ExpiredLotOverrideSaysWhoWhenAndWhy) {
    Finding f;
    f.kind = FindingKind::expired_lot_override;
    f.severity = Severity::warning;
    f.subject = Subject::of_reagent("sodium-dihydrogen-phosphate");
    f.detail_text("lot", "SP-1987");
    f.detail_text("lot_expires_on", "2026-11-30");
    f.detail_text("by", "demo-approve");
    f.detail_text("name", "Priya Haldane");
    f.detail_text("at", "2026-12-02T14:03:27.120Z");
    f.detail_text("reason", "No other lot");
    EXPECT_STREQ(f.code(), "expired-lot-override");
    EXPECT_EQ(describe(f, {}),
              "Lot SP-1987 of sodium-dihydrogen-phosphate expired on 2026-11-30; used by override "
              "of Priya Haldane (demo-approve) at 2026-12-02 14:03:27 UTC: No other lot");
    // No name, no date of expiry, a local time: the login alone, "(date not recorded)", no UTC.
    Finding g = f;
    g.detail_texts = {{"lot", "SP-1987"}, {"lot_expires_on", ""},        {"by", "appr"},
                      {"name", ""},       {"at", "2026-12-02T14:03:00"}, {"reason", "ok"}};
    EXPECT_EQ(describe(g, {}), "Lot SP-1987 of sodium-dihydrogen-phosphate expired on (date not "
                               "recorded); used by override of appr at 2026-12-02 14:03:00: ok");
    // A time in other characters is cut after 19 of them, never inside one.
    g.detail_texts[4].second = "ÄÖÜ—äöüÄÖÜäöüÄÖÜäöüÄÖÜ";
    EXPECT_EQ(describe(g, {}), "Lot SP-1987 of sodium-dihydrogen-phosphate expired on (date not "
                               "recorded); used by override of appr at ÄÖÜ—äöüÄÖÜäöüÄÖÜäöü: ok");
}

TEST(FindingsApp, BatchShelfLifeCarriesItsHoursAndCounts) {
    Finding f;
    f.kind = FindingKind::batch_shelf_life;
    f.severity = Severity::warning;
    f.subject = Subject::of_batch("Organic");
    f.text("recipe", "Organic");
    f.number("span_h", 14.25);
    f.number("shelf_life_h", 2.5);
    f.number("batches", 6);
    f.detail("bottles", 2);
    f.detail_text("kind", "aqueous-buffer");
    EXPECT_STREQ(f.code(), "shelf-life");
    EXPECT_STREQ(subject_kind_name(f.subject.kind), "batch");
    EXPECT_EQ(describe(f, {}), "One batch of Organic for 2 bottles would be used over 14.3 h, "
                               "longer than its shelf life of 3 h (aqueous-buffer, a lab-set "
                               "default): make at least 6 batches.");
}

TEST(FindingsApp, FixedDecimalsRoundExactTiesAwayFromZeroAsQtDid) {
    EXPECT_EQ(format_fixed_ties_away(0.5, 0), "1");
    EXPECT_EQ(format_fixed_ties_away(2.5, 0), "3");
    EXPECT_EQ(format_fixed_ties_away(-2.5, 0), "-3");
    EXPECT_EQ(format_fixed_ties_away(0.25, 1), "0.3");
    EXPECT_EQ(format_fixed_ties_away(12.25, 1), "12.3");
    EXPECT_EQ(format_fixed_ties_away(0.125, 2), "0.13");
    EXPECT_EQ(format_fixed_ties_away(1.03125, 4), "1.0313"); // Qt 6.4 printed "1.0313"
    // Not ties: as format_fixed (0.35 is just below 0.35 in binary).
    EXPECT_EQ(format_fixed_ties_away(0.35, 1), "0.3");
    EXPECT_EQ(format_fixed_ties_away(3.75, 1), "3.8");
    EXPECT_EQ(format_fixed_ties_away(1234567.8, 0), "1234568");
    EXPECT_EQ(format_fixed(2.5, 0), "2"); // what the contract's text did not print
}

} // namespace

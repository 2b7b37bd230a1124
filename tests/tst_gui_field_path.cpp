// The field paths of the command-line contract (README, "Errors"): chem::path_within and
// chem::subscript_of are the one reading of their syntax, and FieldPath is how the screens ask
// "does this error belong to my field?" (issue 10). Common practice, no source: the syntax is
// this project's own contract.
#include "chem/error.h"
#include "core/failure.h"
#include "field_path.h"
#include "model_util.h"

#include <QTest>

using phaseplan::gui::FieldPath;

class TestFieldPath : public QObject {
    Q_OBJECT
  private slots:
    void pathWithin() {
        QVERIFY(chem::path_within("lines.A.parts[0].fraction_v", "lines.A"));
        QVERIFY(chem::path_within("lines.A.parts[0].fraction_v", "lines.A.parts"));
        QVERIFY(chem::path_within("lines.A", "lines.A"));
        QVERIFY(!chem::path_within("lines.AB", "lines.A"));
        QVERIFY(!chem::path_within("lines", "lines.A"));
        QVERIFY(chem::path_within("anything", ""));
    }
    void subscripts() {
        const auto a = chem::subscript_of("batch.actual[2].mass_g", "batch.actual");
        QVERIFY(a);
        QCOMPARE(a->subscript, std::string("2"));
        QCOMPARE(a->rest, std::string("mass_g"));
        QCOMPARE(a->index(), 2);
        const auto r = chem::subscript_of("actual[phosphoric-acid].lot", "actual");
        QVERIFY(r);
        QCOMPARE(r->subscript, std::string("phosphoric-acid"));
        QCOMPARE(r->rest, std::string("lot"));
        QCOMPARE(r->index(), -1);
        QCOMPARE(chem::subscript_of("gradient[12]", "gradient")->index(), 12);
        QVERIFY(chem::subscript_of("gradient[12]", "gradient")->rest.empty());
        QVERIFY(!chem::subscript_of("batch.actual", "batch.actual"));
        QVERIFY(!chem::subscript_of("batch.actual[2", "batch.actual"));
        QVERIFY(!chem::subscript_of("batch.actualx[2]", "batch.actual"));
        QCOMPARE(chem::subscript_of("x[99999999999]", "x")->index(), -1);
    }
    void screensAskFieldPath() {
        QVERIFY(FieldPath::belongs("batch.actual[2].lot", "batch.actual"));
        QVERIFY(FieldPath::belongs("target_ph", "target_ph"));
        QVERIFY(!FieldPath::belongs("target_ph_max", "target_ph"));
        QVERIFY(!FieldPath::belongs("", "target_ph"));
        QVERIFY(!FieldPath::belongs("target_ph", ""));
        QVERIFY(FieldPath::belongsToAny("standby.until", {"waste_ml", "standby"}));
        QVERIFY(!FieldPath::belongsToAny("spectatorsx", {"spectators", "systems"}));
        QCOMPARE(FieldPath::index("batch.actual[3].mass_g", "batch.actual"), 3);
        QCOMPARE(FieldPath::index("batch.comment", "batch.actual"), -1);
        // A reagent id with a dot is one subscript.
        QVERIFY(
            FieldPath::belongs("batch.actual[acme.buffer-7].lot", "batch.actual[acme.buffer-7]"));
        QVERIFY(!FieldPath::belongs("batch.actual[acme.buffer-7].lot", "batch.actual[acme]"));
    }
    // Issue 10, part 3: guarded() is where the models catch both kinds. An input's error keeps its
    // path; a Failure comes as its subject, which is_failure() tells apart, with no SQL.
    void guardedTellsFailuresFromInputErrors() {
        using phaseplan::Failure;
        using phaseplan::gui::guarded;
        const auto input =
            guarded([] { throw chem::Error("lines.A.bottle_ml", "-1 is not positive"); });
        QCOMPARE(input.field, QString("lines.A.bottle_ml"));
        QVERIFY(!input.is_failure());
        const auto lost = guarded([] {
            throw Failure(Failure::Kind::connection_lost,
                          "the connection to the lab database was lost");
        });
        QCOMPARE(lost.field, QString("database.connection"));
        QCOMPARE(lost.message, QString("the connection to the lab database was lost"));
        QVERIFY(lost.is_failure());
        const auto file =
            guarded([] { throw Failure(Failure::Kind::file, "cannot write \"x.pdf\""); });
        QCOMPARE(file.field, QString("-o"));
        QVERIFY(file.is_failure());
        QCOMPARE(std::string(Failure(Failure::Kind::database, "locked").what()),
                 std::string("database: locked"));
        QVERIFY(guarded([] {}).empty());
    }
};

QTEST_APPLESS_MAIN(TestFieldPath)
#include "tst_gui_field_path.moc"

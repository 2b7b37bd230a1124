// The reagent-lot shelf on the Library screen (gui::LotShelfModel, issue 13 part 7), on a new
// database with the demo (storage/demo.cpp: its accounts and its five lots, dated from today).
// The date rules (opened not before received, expiry after received) are common practice, no
// source; the 30-day warning is the model's own (common practice, no source).
#include "gui_test_support.h"
#include "lot_shelf.h"
#include "storage/audit_trail.h"
#include "storage/database.h"

#include <QCoreApplication>
#include <QSettings>
#include <QSignalSpy>
#include <QTemporaryDir>
#include <QTest>

using phaseplan::gui::LotShelfModel;
using phaseplan::testing::open_workspace;

namespace {

QString role_of(const LotShelfModel& m, const QString& lot, LotShelfModel::Role role) {
    for (int i = 0; i < m.rowCount(); ++i)
        if (m.data(m.index(i), LotShelfModel::LotRole).toString() == lot)
            return m.data(m.index(i), role).toString();
    return QStringLiteral("<not listed>");
}

std::vector<phaseplan::storage::AuditEntry> trail_of(phaseplan::gui::Workspace& ws,
                                                     const QString& record_id) {
    return phaseplan::storage::audit_entries(ws.database()->connection(),
                                             {QStringLiteral("lot"), record_id});
}

} // namespace

class TstGuiLotShelf : public QObject {
    Q_OBJECT

    QTemporaryDir dir_;

  private slots:
    void initTestCase() {
        QVERIFY(dir_.isValid());
        QCoreApplication::setOrganizationName("PhasePlanTest");
        QCoreApplication::setApplicationName("tst_gui_lot_shelf");
        QSettings().clear();
    }

    /// The demo's five lots, each with its state in words, and the filter by reagent.
    void list_and_filter() {
        auto ws = open_workspace(dir_.filePath("list.sqlite"));
        LotShelfModel m;
        m.setWorkspace(ws.get());
        QCOMPARE(m.count(), 5);
        // demo.cpp: SP-1987 expired 5 days ago, SP-2207 expires tomorrow, PA-90417 in 900 days.
        QCOMPARE(role_of(m, "SP-1987", LotShelfModel::StateRole), QString("expired"));
        QCOMPARE(role_of(m, "SP-1987", LotShelfModel::ExpiredRole), QString("true"));
        QCOMPARE(role_of(m, "SP-2207", LotShelfModel::StateRole), QString("expires in 1 day"));
        QCOMPARE(role_of(m, "PA-90417", LotShelfModel::StateRole), QString("in date"));
        QCOMPARE(role_of(m, "PA-90417", LotShelfModel::OpenedOnRole), QString());
        QCOMPARE(role_of(m, "PA-88112", LotShelfModel::SupplierRole), QString("Veldmark Reagents"));
        QCOMPARE(role_of(m, "PA-88112", LotShelfModel::QuantityRole), QString("1 L"));
        QCOMPARE(role_of(m, "SP-2391", LotShelfModel::QuantityRole), QString("1000 g"));
        const QString name =
            QString::fromStdString(ws->data().reagents.find_reagent("phosphoric-acid")->name);
        QCOMPARE(role_of(m, "PA-88112", LotShelfModel::ReagentNameRole), name);

        // The boundaries of the words, on a fixed day.
        const QDate day(2026, 12, 2);
        QCOMPARE(LotShelfModel::state_words("2026-12-01", day), QString("expired"));
        QCOMPARE(LotShelfModel::state_words("2026-12-02", day), QString("expires today"));
        QCOMPARE(LotShelfModel::state_words("2027-01-01", day), QString("expires in 30 days"));
        QCOMPARE(LotShelfModel::state_words("2027-01-02", day), QString("in date"));

        m.setReagentFilter("phosphoric-acid");
        QCOMPARE(m.count(), 2);
        QCOMPARE(role_of(m, "SP-2391", LotShelfModel::LotRole), QString("<not listed>"));
        const QVariantList filters = m.filterChoices();
        QCOMPARE(filters.size(), 3); // all, and the demo's two reagents with lots
        QCOMPARE(filters.at(0).toMap().value("id").toString(), QString());
        // The reagent chooser: the library's reagents and solvents, found by words of the name.
        const QVariantList all = m.reagentChoices();
        QVERIFY(all.size() > 10);
        const QVariantList found = m.reagentChoices("PHOSPHORIC 85");
        QCOMPARE(found.size(), 1);
        QCOMPARE(found.at(0).toMap().value("id").toString(), QString("phosphoric-acid"));
        QVERIFY(!m.reagentChoices("acetonitrile").isEmpty()); // a solvent has lots too
        QVERIFY(m.reagentChoices("no such reagent").isEmpty());
    }

    /// Nobody signed in on a database with accounts: nothing is written.
    void refused_without_sign_in() {
        auto ws = open_workspace(dir_.filePath("gate.sqlite"));
        LotShelfModel m;
        m.setWorkspace(ws.get());
        m.setSignInRequired(true);
        QCOMPARE(m.writeBlock(), QString("Sign in on Prepare & record to add lots"));
        QVERIFY(!m.add("phosphoric-acid", "PA-77002", "", "2026-11-20", "", "2028-11-30", ""));
        QCOMPARE(m.errorField(), QString("session"));
        QVERIFY(!m.markOpenedToday("phosphoric-acid", "PA-90417"));
        QCOMPARE(m.count(), 5);
        QVERIFY(trail_of(*ws, "phosphoric-acid/PA-77002").empty());
        QCOMPARE(role_of(m, "PA-90417", LotShelfModel::OpenedOnRole), QString());
    }

    /// A preparer signed in: mistakes land on the field at fault with the value as typed; a good
    /// lot is listed and audited; "Mark as opened today" records today, once.
    void add_and_open() {
        auto ws = open_workspace(dir_.filePath("add.sqlite"));
        LotShelfModel m;
        m.setWorkspace(ws.get());
        m.setSignInRequired(true);
        m.setSignedInLogin("demo-prep");
        QCOMPARE(m.writeBlock(), QString());

        QVERIFY(!m.add("phosphoric-acid", "PA-77002", "", "2026-11-31", "", "2028-11-30", ""));
        QCOMPARE(m.errorField(), QString("received_on"));
        QVERIFY2(m.errorMessage().contains("2026-11-31"), qPrintable(m.errorMessage()));

        QVERIFY(!m.add("phosphoric-acid", "PA-77002", "", "2026-11-20", "", "2026-11-10", ""));
        QCOMPARE(m.errorField(), QString("expires_on"));
        QVERIFY2(m.errorMessage().contains("2026-11-10") && m.errorMessage().contains("2026-11-20"),
                 qPrintable(m.errorMessage()));

        QVERIFY(!m.add("phosphoric-acid", "PA-77002", "", "2026-11-20", "2026-11-19", "2028-11-30",
                       ""));
        QCOMPARE(m.errorField(), QString("opened_on"));

        QVERIFY(!m.add("phosphoric-acid", "PA-77002", "", "2026-11-20", "", "2028-11-30", "2 lb"));
        QCOMPARE(m.errorField(), QString("quantity_unit"));
        QVERIFY(!m.add("phosphoric-acid", "", "", "2026-11-20", "", "2028-11-30", ""));
        QCOMPARE(m.errorField(), QString("lot"));
        QVERIFY(!m.add("phosphoric-acd", "PA-77002", "", "2026-11-20", "", "2028-11-30", ""));
        QCOMPARE(m.errorField(), QString("reagent"));
        QVERIFY(m.errorMessage().contains("phosphoric-acd"));
        QVERIFY(!m.add("sodium-dihydrogen-phosphate-monohydrate", "SP-1987", "", "2026-11-20", "",
                       "2028-11-30", ""));
        QCOMPARE(m.errorField(), QString("lot"));
        QCOMPARE(m.count(), 5);
        QVERIFY(trail_of(*ws, "phosphoric-acid/PA-77002").empty());

        // A write changes the list in place (the screen keeps its scroll position): one row
        // inserted, no reset of the whole list.
        QSignalSpy inserted(&m, &QAbstractItemModel::rowsInserted);
        QSignalSpy reset(&m, &QAbstractItemModel::modelReset);
        QVERIFY2(m.add("phosphoric-acid", " PA-77002 ", "Veldmark Reagents", "2026-11-20", "",
                       "2028-11-30", "2.5 L"),
                 qPrintable(m.errorField() + ": " + m.errorMessage()));
        QCOMPARE(m.errorField(), QString());
        QCOMPARE(m.count(), 6);
        QCOMPARE(inserted.count(), 1);
        QCOMPARE(reset.count(), 0);
        QCOMPARE(role_of(m, "PA-77002", LotShelfModel::QuantityRole), QString("2.5 L"));
        QCOMPARE(role_of(m, "PA-77002", LotShelfModel::CreatedByRole), QString("demo-prep"));
        auto trail = trail_of(*ws, "phosphoric-acid/PA-77002");
        QCOMPARE(int(trail.size()), 1);
        QCOMPARE(trail[0].action, QString("add-lot"));
        QCOMPARE(trail[0].login, QString("demo-prep"));

        QVERIFY2(m.markOpenedToday("phosphoric-acid", "PA-77002"), qPrintable(m.errorMessage()));
        QCOMPARE(role_of(m, "PA-77002", LotShelfModel::OpenedOnRole),
                 QDate::currentDate().toString(Qt::ISODate));
        QCOMPARE(reset.count(), 0);
        QCOMPARE(m.count(), 6);
        trail = trail_of(*ws, "phosphoric-acid/PA-77002");
        QCOMPARE(int(trail.size()), 2);
        QCOMPARE(trail[1].action, QString("open-lot"));
        QCOMPARE(trail[1].login, QString("demo-prep"));
        // Opened already: refused, not moved to a later day.
        QVERIFY(!m.markOpenedToday("phosphoric-acid", "PA-77002"));
        QCOMPARE(m.errorField(), QString("opened_on"));
        QCOMPARE(int(trail_of(*ws, "phosphoric-acid/PA-77002").size()), 2);
        QVERIFY(!m.markOpenedToday("phosphoric-acid", "PA-00000"));
        QCOMPARE(m.errorField(), QString("lot"));
    }

    /// The administrator manages accounts and records nothing: the shelf's own refusal.
    void administrator_refused() {
        auto ws = open_workspace(dir_.filePath("admin.sqlite"));
        LotShelfModel m;
        m.setWorkspace(ws.get());
        m.setSignInRequired(true);
        m.setSignedInLogin("demo-admin");
        QVERIFY2(m.writeBlock().contains("administrator"), qPrintable(m.writeBlock()));
        QVERIFY(!m.add("phosphoric-acid", "PA-77003", "", "2026-11-20", "", "2028-11-30", ""));
        QCOMPARE(m.errorField(), QString("who"));
        QVERIFY2(m.errorMessage().contains("demo-admin"), qPrintable(m.errorMessage()));
        QVERIFY(!m.markOpenedToday("phosphoric-acid", "PA-90417"));
        QCOMPARE(m.errorField(), QString("who"));
        QCOMPARE(m.count(), 5);
        QVERIFY(trail_of(*ws, "phosphoric-acid/PA-77003").empty());
    }
};

QTEST_MAIN(TstGuiLotShelf)
#include "tst_gui_lot_shelf.moc"

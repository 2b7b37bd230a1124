// Who is at the tablet (gui::Session) and what Prepare & record lets them do (issue 13, part 3):
// sign in with login and password, a wrong one said at the password field and counted towards
// the account's lock; the lab's idle time (kept in the database) locks the session, the same
// person continues with the password, anyone switches user; the administrator records nothing;
// a database without accounts creates its first administrator; and with accounts, a batch is
// recorded under the login signed in, never without one. Rules: 21 CFR 11.10(d) (limited access),
// 11.200(a)(1) (two components), EU GMP Annex 11 §12.1 (access by authorised people), from memory.
#include "batch_model.h"
#include "gui_test_support.h"
#include "session.h"
#include "storage/accounts.h"
#include "storage/batch_store.h"
#include "storage/database.h"
#include "storage/demo.h"
#include "workspace.h"

#include <QCoreApplication>
#include <QFile>
#include <QJsonDocument>
#include <QSettings>
#include <QTemporaryDir>
#include <QTest>

#include <memory>

using namespace phaseplan::gui;
using phaseplan::testing::demo_buffer;
using phaseplan::testing::open_workspace;

class TestGuiSession : public QObject {
    Q_OBJECT
    QTemporaryDir dir_;

  private slots:
    void initTestCase() {
        QCoreApplication::setOrganizationName("PhasePlanTest");
        QCoreApplication::setApplicationName("tst_gui_session");
        QSettings().clear();
    }

    void signInLockContinueAndSwitch() {
        auto ws = open_workspace(dir_.filePath("demo.sqlite")); // a new file: the demo people
        Session s;
        s.setWorkspace(ws.get());
        QVERIFY(s.accountsExist());
        QVERIFY(s.demoAccountsOpen()); // the sign-in card points a newcomer to the README
        QVERIFY(!s.signedIn());
        QVERIFY(!s.canRecord());

        QVERIFY(!s.signIn("demo-prep", "not-the-password"));
        QCOMPARE(s.errorField(), QString("password"));
        QVERIFY(!s.signedIn());
        QVERIFY(!s.signIn("  ", "x"));
        QCOMPARE(s.errorField(), QString("login"));

        QVERIFY2(s.signIn("demo-prep", "demo-prep-2026"), qPrintable(s.errorMessage()));
        QCOMPARE(s.login(), QString("demo-prep"));
        QCOMPARE(s.displayName(), QString("Rosa Okafor"));
        QCOMPARE(s.role(), QString("preparer"));
        QVERIFY(s.canRecord());
        QVERIFY(s.errorMessage().isEmpty());
        // The idle timer runs for the lab's time (default 10 min) from the last input.
        QVERIFY(s.idleTimerActive());
        QCOMPARE(s.idleTimerIntervalMs(), 10 * 60 * 1000);
        s.expireIdleTimer();
        QVERIFY(s.locked());
        QVERIFY(s.lockedByIdle());
        QVERIFY(!s.canRecord());
        QVERIFY(!s.idleTimerActive());
        // The same person continues with the password; a wrong one does not.
        QVERIFY(!s.unlock("wrong"));
        QCOMPARE(s.errorField(), QString("password"));
        QVERIFY(s.locked());
        QVERIFY(s.unlock("demo-prep-2026"));
        QVERIFY(!s.locked());
        QVERIFY(s.canRecord());
        // Locked by hand: not "by idle".
        s.lock();
        QVERIFY(s.locked());
        QVERIFY(!s.lockedByIdle());
        // Anyone switches user from a locked session.
        QVERIFY(s.signIn("demo-review", "demo-review-2026"));
        QCOMPARE(s.login(), QString("demo-review"));
        QVERIFY(!s.locked());
        s.signOut();
        QVERIFY(!s.signedIn());
        QVERIFY(!s.canRecord());
    }

    void administratorSetsTheIdleTimeAndRecordsNothing() {
        auto ws = open_workspace(dir_.filePath("admin.sqlite"));
        Session s;
        s.setWorkspace(ws.get());
        QVERIFY(s.signIn("demo-prep", "demo-prep-2026"));
        QVERIFY(!s.setIdleMinutes(5));
        QCOMPARE(s.errorField(), QString("idle_minutes"));
        QVERIFY(s.signIn("demo-admin", "demo-admin-2026"));
        QCOMPARE(s.role(), QString("administrator"));
        QVERIFY(!s.canRecord());
        QVERIFY(!s.setIdleMinutes(0));
        QVERIFY(!s.setIdleMinutes(241));
        QCOMPARE(s.errorField(), QString("idle_minutes"));
        s.lock();
        QVERIFY(!s.setIdleMinutes(3)); // locked: not until the password is entered again
        QVERIFY(s.unlock("demo-admin-2026"));
        QVERIFY(s.setIdleMinutes(3));
        QCOMPARE(s.idleMinutes(), 3);
        // The lab's setting: another tablet on the same database reads it.
        Session other;
        other.setWorkspace(ws.get());
        QCOMPARE(other.idleMinutes(), 3);
        QVERIFY(other.signIn("demo-prep", "demo-prep-2026"));
        QCOMPARE(other.idleTimerIntervalMs(), 3 * 60 * 1000);
        // Accounts: the administrator adds them, nobody else; the new person then signs in.
        QVERIFY(
            !other.addAccount("t.new", "Tam New", "reviewer", "tam-new-pass-1", "tam-new-pass-1"));
        QCOMPARE(other.errorField(), QString("login"));
        QVERIFY(!s.addAccount("t.new", "Tam New", "reviewer", "tam-new-pass-1", "tam-new-pass-2"));
        QCOMPARE(s.errorField(), QString("repeat"));
        QVERIFY(!s.addAccount("t.new", "  ", "reviewer", "tam-new-pass-1", "tam-new-pass-1"));
        QCOMPARE(s.errorField(), QString("name"));
        QVERIFY(!s.addAccount("t.new", "Tam New", "chemist", "tam-new-pass-1", "tam-new-pass-1"));
        QCOMPARE(s.errorField(), QString("role"));
        QVERIFY2(s.addAccount("t.new", "Tam New", "reviewer", "tam-new-pass-1", "tam-new-pass-1"),
                 qPrintable(s.errorMessage()));
        QVERIFY(other.signIn("t.new", "tam-new-pass-1"));
        QCOMPARE(other.role(), QString("reviewer"));
    }

    void batchesAreRecordedUnderTheSignedInLogin() {
        auto ws = open_workspace(dir_.filePath("record.sqlite"));
        Session s;
        s.setWorkspace(ws.get());
        BatchModel m;
        m.setWorkspace(ws.get());
        m.setIdPrefix("SS");
        m.setSignInRequired(s.accountsExist());
        m.setPreparer("Someone Typed");
        // Nobody signed in: refused, at field "session", and nothing is written.
        const int before = m.batchIds().size();
        QVERIFY(!m.markPrepared(demo_buffer()));
        QCOMPARE(m.errorField(), QString("session"));
        QCOMPARE(m.batchIds().size(), before);
        // Signed in: recorded under the login.
        QVERIFY(s.signIn("demo-prep", "demo-prep-2026"));
        m.setSignedInLogin(s.login());
        m.setPreparer(s.displayName());
        QVERIFY2(m.markPrepared(demo_buffer()), qPrintable(m.errorMessage()));
        QCOMPARE(m.batchIds().size(), before + 1);
        const QVariantList h = m.history();
        QVERIFY(!h.isEmpty());
        QCOMPARE(h.first().toMap().value("who").toString(), QString("demo-prep"));
        // With accounts "Checked by" is not typed: the second person is the review signature.
        const QString checked_before = m.checkedBy();
        m.setCheckedBy("Anyone At All");
        QCOMPARE(m.errorField(), QString("batch.checked_by"));
        QCOMPARE(m.checkedBy(), checked_before);
        QCOMPARE(m.reviewedBy(), QString());
        // Locked (the view then passes no login): changes are refused.
        m.setSignedInLogin({});
        QVERIFY(!m.setActual(0, 1.0));
        QCOMPARE(m.errorField(), QString("session"));
    }

    void theDemoAccountsHintGoesOnceTheyAreLocked() {
        auto ws = open_workspace(dir_.filePath("demo-locked.sqlite"));
        Session s;
        s.setWorkspace(ws.get());
        QVERIFY(s.demoAccountsOpen());
        phaseplan::storage::AccountStore store(ws->database()->connection());
        store.add_with_hash("lab-admin", "Lab Admin", phaseplan::storage::Role::administrator,
                            phaseplan::storage::demo_users().front().argon2id_hash, "demo-admin");
        for (const auto& u : phaseplan::storage::demo_users()) {
            QVERIFY(s.demoAccountsOpen()); // one demo account still open is enough
            store.set_locked(QString::fromLatin1(u.login), true, "lab-admin");
        }
        QVERIFY(!s.demoAccountsOpen());
    }

    void aDatabaseWithoutAccountsCreatesItsAdministrator() {
        const QString path = dir_.filePath("empty.sqlite");
        { phaseplan::storage::Database created(path); } // an existing file: never seeded
        auto ws = open_workspace(path);
        Session s;
        s.setWorkspace(ws.get());
        QVERIFY(!s.accountsExist());
        QVERIFY(!s.demoAccountsOpen());
        QVERIFY(!s.createAdministrator("lab-admin", "Lab Admin", "a-long-pass-1", "a-long-pass-2"));
        QCOMPARE(s.errorField(), QString("repeat"));
        QVERIFY(!s.accountsExist());
        QVERIFY2(s.createAdministrator("lab-admin", "Lab Admin", "a-long-pass-1", "a-long-pass-1"),
                 qPrintable(s.errorMessage()));
        QVERIFY(s.accountsExist());
        QVERIFY(s.signedIn());
        QCOMPARE(s.role(), QString("administrator"));
        // Only once: the next administrator is added by this one.
        QVERIFY(!s.createAdministrator("second", "Second", "another-pass-1", "another-pass-1"));
        QCOMPARE(s.errorField(), QString("login"));
    }
};

QTEST_MAIN(TestGuiSession)
#include "tst_gui_session.moc"

// The views as a user meets them, offscreen: the real main window (Main.qml on a new database with
// the demo), driven by mouse and key events, with what the screen shows asserted from the items
// the user sees. Each test is one fault a newcomer found at the bench (PhasePlan's own trial; no
// outside source).
#include "app_runner.h"
#include "wheel_steps.h"
#include "workspace.h"

#include <QAccessible>
#include <QApplication>
#include <QQmlApplicationEngine>
#include <QQuickItem>
#include <QQuickStyle>
#include <QQuickWindow>
#include <QStandardPaths>
#include <QTemporaryDir>
#include <QTest>
#include <QWheelEvent>
#include <QtQml/qqmlextensionplugin.h>

#include <functional>

Q_IMPORT_QML_PLUGIN(PhasePlanPlugin)

using phaseplan::gui::Workspace;

class TestGuiViews : public QObject {
    Q_OBJECT

    QTemporaryDir dir_;
    std::unique_ptr<Workspace> workspace_;
    std::unique_ptr<QQmlApplicationEngine> engine_;
    QQuickWindow* window_ = nullptr;

    QQuickItem* find(const std::function<bool(QQuickItem*)>& pred, bool visible_only = true,
                     QQuickItem* from = nullptr) const {
        QQuickItem* found = nullptr;
        std::function<void(QQuickItem*)> walk = [&](QQuickItem* item) {
            if (found || (visible_only && !item->isVisible()))
                return;
            if (pred(item)) {
                found = item;
                return;
            }
            for (QQuickItem* c : item->childItems())
                walk(c);
        };
        walk(from ? from : window_->contentItem());
        return found;
    }
    static QString accessible(QQuickItem* item) {
        QAccessibleInterface* a = QAccessible::queryAccessibleInterface(item);
        return a ? a->text(QAccessible::Name) : QString();
    }
    QQuickItem* named(const QString& object_name, QQuickItem* from = nullptr) const {
        return find([&](QQuickItem* i) { return i->objectName() == object_name; }, true, from);
    }
    /// A control by its accessible name, or a button by its text.
    QQuickItem* control(const QString& name) const {
        return find([&](QQuickItem* i) {
            const bool is_control = i->inherits("QQuickAbstractButton") ||
                                    i->inherits("QQuickTextField") ||
                                    i->inherits("QQuickComboBox") || i->inherits("QQuickTumbler");
            return is_control &&
                   (accessible(i) == name || (i->inherits("QQuickAbstractButton") &&
                                              i->property("text").toString() == name));
        });
    }
    /// A text field by its accessible name (a number field's label).
    QQuickItem* field(const QString& name) const {
        return find(
            [&](QQuickItem* i) { return i->inherits("QQuickTextField") && accessible(i) == name; });
    }
    void settle(int frames = 3) {
        for (int i = 0; i < frames; ++i) {
            QCoreApplication::processEvents();
            QTest::qWait(30);
        }
    }
    void bring_into_view(QQuickItem* item) {
        for (QQuickItem* p = item->parentItem(); p; p = p->parentItem()) {
            if (!p->inherits("QQuickFlickable"))
                continue;
            auto* content = qvariant_cast<QQuickItem*>(p->property("contentItem"));
            if (!content)
                break;
            const double y = item->mapToItem(content, QPointF(0, 0)).y();
            const double view_h = p->height();
            const double content_h = p->property("contentHeight").toDouble();
            const double cy = p->property("contentY").toDouble();
            if (y < cy || y + item->height() > cy + view_h)
                p->setProperty("contentY",
                               std::max(0.0, std::min(y - view_h / 3, content_h - view_h)));
            break;
        }
        settle();
    }
    void click(QQuickItem* item) {
        QVERIFY(item);
        bring_into_view(item);
        const QPointF centre = item->mapToScene(QPointF(item->width() / 2, item->height() / 2));
        QVERIFY2(window_->contentItem()->contains(centre), "the control is on screen");
        QTest::mouseClick(window_, Qt::LeftButton, Qt::NoModifier, centre.toPoint());
        settle();
    }
    void type_text(const QString& text) {
        for (QChar c : text)
            QTest::keyClick(window_, c.toLatin1());
        settle();
    }
    /// Replaces the text of a field by typing; stays in it.
    void type_into(QQuickItem* f, const QString& text) {
        QVERIFY(f);
        click(f);
        QVERIFY2(f->hasActiveFocus(), qPrintable(accessible(f)));
        QTest::keyClick(window_, Qt::Key_A, Qt::ControlModifier);
        type_text(text);
    }
    void open_screen(const QString& name) {
        QQuickItem* nav = find([&](QQuickItem* i) {
            return i->inherits("QQuickAbstractButton") && i->property("text").toString() == name &&
                   QString::fromLatin1(i->metaObject()->className()).startsWith("NavButton");
        });
        click(nav);
        settle(5);
    }
    /// Where the item is on the page it scrolls with (independent of the page's scroll), and
    /// its size.
    static QRectF on_page(QQuickItem* item) {
        QPointF at = item->mapToScene(QPointF(0, 0));
        for (QQuickItem* p = item->parentItem(); p; p = p->parentItem())
            if (p->inherits("QQuickFlickable")) {
                at = item->mapToItem(qvariant_cast<QQuickItem*>(p->property("contentItem")),
                                     QPointF(0, 0));
                break;
            }
        return QRectF(at, QSizeF(item->width(), item->height()));
    }
    /// The number field (its ColumnLayout) holding the text field named `name`.
    static QQuickItem* number_field_of(QQuickItem* text_field) {
        return text_field ? text_field->parentItem()->parentItem() : nullptr;
    }
    QString message_of(QQuickItem* number_field) const {
        QQuickItem* m = named("fieldMessage", number_field);
        return m ? m->property("text").toString() : QString();
    }

    /// One notch of a mouse wheel over `item` (120 units; negative: towards the user).
    void wheel_notch(QQuickItem* item, int delta_y) {
        const QPointF at = item->mapToScene(QPointF(item->width() / 2, item->height() / 2));
        QWheelEvent e(at, window_->mapToGlobal(at.toPoint()), QPoint(), QPoint(0, delta_y),
                      Qt::NoButton, Qt::NoModifier, Qt::NoScrollPhase, false);
        QCoreApplication::sendEvent(window_, &e);
        settle();
    }
    QObject* model(const char* name) const {
        return window_->findChild<QObject*>(QString::fromLatin1(name));
    }
    /// The item that has the keyboard focus, and whether `inner` is it or inside it.
    bool focused_within(QQuickItem* inner) const {
        for (QQuickItem* f = window_->activeFocusItem(); f; f = f->parentItem())
            if (f == inner)
                return true;
        return false;
    }

  private slots:
    void initTestCase() {
        qputenv("PHASEPLAN_NOW", "2026-12-02T14:00:00");
        workspace_ = std::make_unique<Workspace>();
        workspace_->setDatabasePath(dir_.filePath("views.sqlite"));
        workspace_->setDataDir(QStringLiteral(SOURCE_DIR "/data"));
        QVERIFY2(workspace_->open(), qPrintable(workspace_->errorMessage()));
        engine_ = std::make_unique<QQmlApplicationEngine>();
        phaseplan::gui::prepare_engine(*engine_);
        engine_->setInitialProperties({{"workspace", QVariant::fromValue(workspace_.get())}});
        engine_->load(QUrl(QStringLiteral("qrc:/PhasePlan/Main.qml")));
        QVERIFY(!engine_->rootObjects().isEmpty());
        window_ = qobject_cast<QQuickWindow*>(engine_->rootObjects().first());
        QVERIFY(window_);
        window_->resize(1280, 800);
        window_->show();
        QVERIFY(QTest::qWaitForWindowExposed(window_));
        settle(5);
    }

    /// A message under a field moves none of the fields beside it: "abc" typed into Run once
    /// moved Flow down by half the message's height (a layout centres its
    /// cells), then (at the top of their cells) the message's unwrapped width still narrowed
    /// Flow and moved Run; a negative count of injections moved the row's method picker.
    void aMessageMovesNoFieldBesideIt() {
        open_screen("Sequence");
        QQuickItem* run = named("runField");
        QQuickItem* flow = named("flowField");
        QQuickItem* equilibration = named("equilibrationField");
        QVERIFY(run && flow && equilibration);
        const QRectF run_at = on_page(run->property("field").value<QQuickItem*>());
        const QRectF flow_at = on_page(flow->property("field").value<QQuickItem*>());
        const QRectF equilibration_at =
            on_page(equilibration->property("field").value<QQuickItem*>());
        type_into(run->property("field").value<QQuickItem*>(), "abc");
        QVERIFY2(!message_of(run).isEmpty(), "Run says why abc is not applied");
        const QRectF flow_now = on_page(flow->property("field").value<QQuickItem*>());
        const QRectF equilibration_now =
            on_page(equilibration->property("field").value<QQuickItem*>());
        const auto words = [](const QRectF& r) {
            return QString("x %1 y %2 w %3").arg(r.x()).arg(r.y()).arg(r.width());
        };
        QVERIFY2(flow_now == flow_at,
                 qPrintable("Flow moved from " + words(flow_at) + " to " + words(flow_now)));
        QVERIFY2(on_page(run->property("field").value<QQuickItem*>()) == run_at,
                 "the Run field itself stays where it was");
        // Re-equilibration is in the grid's next row, below the message: it keeps its column
        // and width (rows below a message move down, as under any field).
        QCOMPARE(equilibration_now.x(), equilibration_at.x());
        QCOMPARE(equilibration_now.width(), equilibration_at.width());
        QTest::keyClick(window_, Qt::Key_Escape);
        settle();
        QVERIFY(message_of(run).isEmpty());

        QQuickItem* injections = field("Injections, row 1");
        QQuickItem* method = control("Method of sequence row 1");
        QVERIFY(injections && method);
        const QRectF method_at = on_page(method);
        type_into(injections, "-3");
        QVERIFY2(!message_of(number_field_of(injections)).isEmpty(),
                 "the injections field says why -3 is refused");
        QCOMPARE(on_page(method), method_at);
        QTest::keyClick(window_, Qt::Key_Escape);
        settle();
    }

    /// The start's minute wheel stops at the quarter hours for a notch of the mouse wheel and
    /// the Up and Down keys, and any minute can still be typed (it moved one minute per notch).
    void theMinuteWheelStopsAtTheQuarterHours() {
        using phaseplan::gui::turn_wheel;
        QCOMPARE(turn_wheel(0, 1, 60, 15), 15);
        QCOMPARE(turn_wheel(7, 1, 60, 15), 15);
        QCOMPARE(turn_wheel(7, -1, 60, 15), 0);
        QCOMPARE(turn_wheel(15, -1, 60, 15), 0);
        QCOMPARE(turn_wheel(45, 1, 60, 15), 0); // round the hour
        QCOMPARE(turn_wheel(0, -2, 60, 15), 30);
        QCOMPARE(turn_wheel(52, 3, 60, 15), 30);
        QCOMPARE(turn_wheel(23, 1, 24, 1), 0); // the hours: every value
        QCOMPARE(turn_wheel(7, 1, 60, 7), 8);  // a stride that does not divide: every value

        open_screen("Sequence");
        QQuickItem* start = named("startField");
        QVERIFY(start);
        click(named("dateTimeButton", start));
        settle(5);
        QQuickItem* minutes = named("minuteTumbler");
        QQuickItem* typed = named("typedMinute");
        QVERIFY2(minutes && typed, "the picker is open, with its minute wheel and typed minute");
        QObject* plan = model("plan");
        const int hour = plan->property("startParts").toMap().value("hour").toInt();
        minutes->setProperty("currentIndex", 0);
        wheel_notch(minutes, -120); // towards the user: later
        QCOMPARE(minutes->property("currentIndex").toInt(), 15);
        wheel_notch(minutes, -120);
        QCOMPARE(minutes->property("currentIndex").toInt(), 30);
        wheel_notch(minutes, 120);
        QCOMPARE(minutes->property("currentIndex").toInt(), 15);
        minutes->forceActiveFocus();
        QTest::keyClick(window_, Qt::Key_Down);
        settle();
        QCOMPARE(minutes->property("currentIndex").toInt(), 30);
        // Any minute, typed: the wheel shows it, and the next notch goes to a quarter hour.
        type_into(typed->property("field").value<QQuickItem*>(), "7");
        QCOMPARE(minutes->property("currentIndex").toInt(), 7);
        wheel_notch(minutes, -120);
        QCOMPARE(minutes->property("currentIndex").toInt(), 15);
        // The typed minute then shows where the wheel stopped, not the 7 typed before.
        QCOMPARE(typed->property("field").value<QQuickItem*>()->property("text").toString(),
                 QStringLiteral("15"));
        type_into(typed->property("field").value<QQuickItem*>(), "52");
        QCOMPARE(minutes->property("currentIndex").toInt(), 52);
        QVERIFY(message_of(typed).isEmpty());
        click(named("dateTimeSet"));
        QCOMPARE(plan->property("startParts").toMap().value("minute").toInt(), 52);
        QCOMPARE(plan->property("startParts").toMap().value("hour").toInt(), hour);
    }

    /// "Open ›" on a check focuses the field the finding names, on its screen and scrolled into
    /// view; "Show ›" for an entry not applied focuses that entry. (Both only opened the screen.)
    void openOnACheckFocusesItsField() {
        // The demo's line B (acetonitrile, 210 mL usable) runs dry tonight: the night's finding
        // names lines.B.bottle_ml. It once opened the Sequence screen and focused the waste.
        open_screen("Checks");
        QQuickItem* open = find([&](QQuickItem* i) {
            return i->inherits("QQuickAbstractButton") &&
                   i->property("text").toString() == QStringLiteral("Open ›") &&
                   accessible(i).contains(QStringLiteral("runs dry"));
        });
        QVERIFY2(open, "the runs-dry check with its Open button");
        click(open);
        settle(5);
        QQuickItem* focused = window_->activeFocusItem();
        QVERIFY(focused);
        QString letter, holder;
        for (QQuickItem* p = focused; p; p = p->parentItem()) {
            if (holder.isEmpty() && !p->objectName().isEmpty())
                holder = p->objectName();
            if (letter.isEmpty() && p->property("letter").isValid())
                letter = p->property("letter").toString();
        }
        QVERIFY2(holder == QStringLiteral("bottleField") && letter == QStringLiteral("B"),
                 qPrintable(QString("the focus is in %1 of line %2 (%3)")
                                .arg(holder, letter, accessible(focused))));
        const QPointF centre =
            focused->mapToScene(QPointF(focused->width() / 2, focused->height() / 2));
        QVERIFY2(window_->contentItem()->contains(centre), "the field is scrolled into view");

        // The detection wavelength of the settings card, named by a uv-cutoff finding's path.
        open_screen("Checks");
        open_screen("Sequence");
        QMetaObject::invokeMethod(window_, "showField", Q_ARG(QVariant, QStringLiteral("sequence")),
                                  Q_ARG(QVariant, QStringLiteral("detector.wavelength_nm")));
        settle(5);
        QQuickItem* wavelength = named("wavelengthField");
        QVERIFY(wavelength);
        QVERIFY(focused_within(wavelength->property("field").value<QQuickItem*>()));

        // An entry not applied: "Show ›" on the checks focuses it.
        QQuickItem* flow_input = named("flowField")->property("field").value<QQuickItem*>();
        type_into(flow_input, "0,");
        QTest::keyClick(window_, Qt::Key_Tab);
        settle(5);
        open_screen("Checks");
        QQuickItem* show = control(QStringLiteral("Show the entry that is not applied"));
        QVERIFY(show);
        click(show);
        settle(5);
        QVERIFY(focused_within(flow_input));
        QTest::keyClick(window_, Qt::Key_Escape);
        settle();
    }
};

int main(int argc, char** argv) {
    QApplication app(argc, argv);
    QStandardPaths::setTestModeEnabled(true);
    QQuickStyle::setStyle(QStringLiteral("Fusion"));
    TestGuiViews t;
    return QTest::qExec(&t, argc, argv);
}

#include "tst_gui_views.moc"

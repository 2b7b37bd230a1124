// The layout audit behind `phaseplan --self-test`: it finds a small target, a control without an
// accessible name and cut-off text, and passes a layout without them. The 9 mm target is common
// practice for touch screens (no single source; platform guidelines ask for 7 to 10 mm).
#include "layout_audit.h"

#include <QAccessible>
#include <QApplication>
#include <QQmlComponent>
#include <QQmlEngine>
#include <QQuickItem>
#include <QQuickWindow>
#include <QTest>

using phaseplan::gui::audit_layout;

class TestLayoutAudit : public QObject {
    Q_OBJECT

    std::unique_ptr<QQuickWindow> window_;
    std::unique_ptr<QQuickItem> root_;
    QQmlEngine engine_;

    QList<phaseplan::gui::LayoutProblem> audit(const QByteArray& qml, double px_per_mm) {
        QQmlComponent c(&engine_);
        c.setData("import QtQuick\nimport QtQuick.Controls\n" + qml, QUrl());
        root_.reset(qobject_cast<QQuickItem*>(c.create()));
        if (!root_)
            qWarning() << c.errors();
        window_ = std::make_unique<QQuickWindow>();
        window_->resize(400, 300);
        root_->setParentItem(window_->contentItem());
        window_->show();
        QCoreApplication::processEvents();
        return audit_layout(window_.get(), px_per_mm);
    }

  private slots:
    void findsSmallTargetsUnnamedControlsAndCutText() {
        // 4 px/mm: a 20 px button is 5 mm; 36 px is 9 mm.
        const auto problems = audit(R"(
Item {
    width: 400; height: 300
    Button { y: 0; width: 120; height: 20; text: "Small" }
    ComboBox { y: 50; width: 120; height: 40; model: ["a"] }
    Label { y: 100; width: 30; text: "A text far wider than its box" }
})",
                                    4.0);
        QStringList kinds;
        for (const auto& p : problems)
            kinds << p.kind + ": " + p.what;
        QVERIFY2(kinds.filter("small target").size() == 1 &&
                     kinds.filter("small target").first().contains("Small"),
                 qPrintable(kinds.join("; ")));
        QVERIFY2(kinds.filter("no accessible name").size() == 1 &&
                     kinds.filter("no accessible name").first().contains("ComboBox"),
                 qPrintable(kinds.join("; ")));
        QVERIFY2(kinds.filter("clipped text").size() == 1, qPrintable(kinds.join("; ")));
        // The same button is large enough on a 2 px/mm screen (20 px = 10 mm).
        const auto coarse = audit(R"(
Item { width: 400; height: 300; Button { width: 120; height: 20; text: "Small" } })",
                                  2.0);
        QVERIFY(coarse.isEmpty());
    }

    void passesAGoodLayoutAndSkipsHiddenOnes() {
        const auto problems = audit(R"(
Item {
    width: 400; height: 300
    Button { width: 120; height: 40; text: "Start" }
    ComboBox { y: 50; width: 120; height: 40; model: ["a"]; Accessible.name: "Detector" }
    Label { y: 100; width: 300; text: "Fits" }
    Button { y: 150; width: 10; height: 10; text: "hidden"; visible: false }
    Label { y: 200; width: 30; text: "wraps over several lines"; wrapMode: Text.Wrap }
})",
                                    4.0);
        QStringList all;
        for (const auto& p : problems)
            all << p.kind + ": " + p.what + " " + p.detail;
        QVERIFY2(problems.isEmpty(), qPrintable(all.join("; ")));
    }
};

int main(int argc, char** argv) {
    QApplication app(argc, argv);
    TestLayoutAudit t;
    return QTest::qExec(&t, argc, argv);
}

#include "tst_gui_layout_audit.moc"

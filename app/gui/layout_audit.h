#pragma once
// The tablet checks a window can run on itself: every visible control at least 9 mm tall and
// wide at the screen's real physical density, every control with an accessible name, and no
// visible text cut off. Used by `phaseplan --self-test` on every screen in both orientations,
// which CTest runs under Xvfb at 100, 150 and 200 dpi.
#include <QString>
#include <QStringList>

class QQuickWindow;
class QQuickItem;

namespace phaseplan::gui {

/// The smallest hit target, in millimetres on the screen (common practice for touch screens, no
/// single source: platform guidelines ask for 7 to 10 mm).
constexpr double min_target_mm = 9.0;

struct LayoutProblem {
    QString kind;   ///< "small target", "no accessible name", "clipped text"
    QString what;   ///< the item in words: its accessible name, text or objectName, and class
    QString detail; ///< sizes in mm, or the text
};

/// Logical pixels per physical millimetre of the window's screen (QScreen::physicalDotsPerInch).
double px_per_mm(const QQuickWindow* window);

/// Audits every visible item of the window's scene.
/// @param px_per_mm logical pixels per physical millimetre (px_per_mm(window) unless testing).
QList<LayoutProblem> audit_layout(QQuickWindow* window, double px_per_mm);

} // namespace phaseplan::gui

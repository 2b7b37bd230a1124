#include "layout_audit.h"

#include <QAccessible>
#include <QQuickItem>
#include <QQuickWindow>
#include <QScreen>

#include <functional>

namespace phaseplan::gui {

namespace {

bool inherits_any(const QObject* o, std::initializer_list<const char*> classes) {
    for (const char* c : classes)
        if (o->inherits(c))
            return true;
    return false;
}

/// A control the user touches: buttons (incl. check boxes, radio, tabs, delegates), pickers,
/// text fields, spin boxes, sliders and switches.
bool is_control(const QQuickItem* item) {
    return inherits_any(item,
                        {"QQuickAbstractButton", "QQuickComboBox", "QQuickTextField",
                         "QQuickTextArea", "QQuickSpinBox", "QQuickSlider", "QQuickRangeSlider"});
}

/// Inside a control: its own label, indicator or editor (judged as part of the control).
bool inside_control(const QQuickItem* item) {
    for (const QQuickItem* p = item->parentItem(); p; p = p->parentItem())
        if (is_control(p))
            return true;
    return false;
}

QString accessible_name(QQuickItem* item) {
    QString name;
    if (QAccessibleInterface* a = QAccessible::queryAccessibleInterface(item))
        name = a->text(QAccessible::Name);
    // A button without an explicit name is named by its text once a screen reader is active (Qt
    // Quick Controls do this themselves; without a platform accessibility bridge, as offscreen,
    // they do not, so the audit does the same here).
    if (name.isEmpty() && item->inherits("QQuickAbstractButton"))
        name = item->property("text").toString();
    return name;
}

QString describe(QQuickItem* item) {
    QString name = accessible_name(item);
    if (name.isEmpty())
        name = item->property("text").toString();
    if (name.isEmpty())
        name = item->objectName();
    QString cls = QString::fromLatin1(item->metaObject()->className());
    cls = cls.section(QLatin1Char('_'), 0, 0);
    return QStringLiteral("%1 \"%2\"").arg(cls, name.left(60));
}

/// Whether the item is on screen at all: visible, not transparent, with a size, and not wholly
/// outside every clipping ancestor (a list's delegates scrolled away are not judged).
bool shown(const QQuickItem* item) {
    if (!item->isVisible() || item->opacity() <= 0 || item->width() <= 0 || item->height() <= 0)
        return false;
    for (const QQuickItem* p = item->parentItem(); p; p = p->parentItem())
        if (p->opacity() <= 0)
            return false;
    return true;
}

} // namespace

double px_per_mm(const QQuickWindow* window) {
    const QScreen* s = window ? window->screen() : nullptr;
    return s && s->physicalDotsPerInch() > 0 ? s->physicalDotsPerInch() / 25.4 : 96.0 / 25.4;
}

QList<LayoutProblem> audit_layout(QQuickWindow* window, double ppmm) {
    QList<LayoutProblem> out;
    if (!window || !(ppmm > 0))
        return out;
    // Half a logical pixel of rounding is not a smaller target.
    const double min_px = min_target_mm * ppmm - 0.5;
    std::function<void(QQuickItem*)> walk = [&](QQuickItem* item) {
        if (!shown(item))
            return;
        if (is_control(item) && item->isEnabled() && !inside_control(item)) {
            if (item->height() < min_px || item->width() < min_px)
                out.push_back({QStringLiteral("small target"), describe(item),
                               QStringLiteral("%1 × %2 mm")
                                   .arg(item->width() / ppmm, 0, 'f', 1)
                                   .arg(item->height() / ppmm, 0, 'f', 1)});
            if (accessible_name(item).trimmed().isEmpty())
                out.push_back({QStringLiteral("no accessible name"), describe(item), QString()});
        }
        if (item->inherits("QQuickText")) {
            const QString text = item->property("text").toString();
            const int wrap = item->property("wrapMode").toInt();
            const bool elided = item->property("truncated").toBool();
            // No wrap and wider than its box: the end is cut off (or elided).
            const bool overflow = wrap == 0 && item->implicitWidth() > item->width() + 1.0;
            if (!text.trimmed().isEmpty() && (elided || overflow))
                out.push_back({QStringLiteral("clipped text"), describe(item),
                               QStringLiteral("\"%1\" needs %2 px, has %3 px")
                                   .arg(text.left(80))
                                   .arg(item->implicitWidth(), 0, 'f', 0)
                                   .arg(item->width(), 0, 'f', 0)});
        }
        for (QQuickItem* child : item->childItems())
            walk(child);
    };
    walk(window->contentItem());
    return out;
}

} // namespace phaseplan::gui

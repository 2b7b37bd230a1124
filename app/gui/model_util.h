#pragma once
// Small helpers shared by the models: the one place chem::Error and Failure are caught on the GUI
// side, JSON to QVariant for QML, and series filling for Qt Charts.
#include "chem/error.h"
#include "chem/recipe.h"
#include "core/failure.h"

#include <QElapsedTimer>
#include <QJsonArray>
#include <QJsonObject>
#include <QPointF>
#include <QString>
#include <QVariant>

#include <exception>
#include <utility>

class QObject;

namespace phaseplan::gui {

/// The error a model shows beside a field: `field` is the JSON path the core names
/// ("target_ph", "lines.A.bottle_ml"), empty when there is none. A Failure (not about an input)
/// comes as its subject ("database", "database.connection", "printer", "-o"), which no input
/// field is; is_failure() tells it apart, and the views show it as a notice.
struct FieldError {
    QString field;
    QString message;
    bool operator==(const FieldError&) const = default;
    bool empty() const { return field.isEmpty() && message.isEmpty(); }
    /// Whether this is a Failure (core/failure.h) rather than an input's error: its field is a
    /// Failure's subject.
    bool is_failure() const { return Failure::is_subject(field.toStdString()); }
};

/// A Failure as the models carry it.
inline FieldError failure_error(const Failure& f) {
    return {QString::fromLatin1(f.subject()), QString::fromStdString(f.sentence())};
}

/// Runs `f`; a chem::Error or a Failure becomes a FieldError. Anything else is unexpected (chem/
/// throws only chem::Error, app/ Failure) but still shown, never a crash.
template <class F> FieldError guarded(F&& f) {
    try {
        std::forward<F>(f)();
        return {};
    } catch (const chem::Error& e) {
        return {QString::fromStdString(e.field()), QString::fromStdString(e.message())};
    } catch (const Failure& f) {
        return failure_error(f);
    } catch (const std::exception& e) {
        return {QString(), QStringLiteral("internal error: ") + QString::fromUtf8(e.what())};
    }
}

/// Milliseconds since `t` started, with sub-millisecond resolution.
inline double elapsed_ms(const QElapsedTimer& t) {
    return t.nsecsElapsed() / 1e6;
}

/// Replaces the points of a Qt Charts XY series (a LineSeries or ScatterSeries from QML) in one
/// call, so a redraw does not go point by point through JavaScript. Ignores anything else.
void replace_series(QObject* series, const QList<QPointF>& points);

/// What to weigh or pipette, as shown: "2.975 g", or for a liquid "1.262 mL (2.126 g)", with the
/// decimals a lab balance or pipette reads, in the user's locale.
QString amount_text(const chem::RecipeItem& item);

} // namespace phaseplan::gui

#pragma once
// The one way a view asks whether an error belongs to its field (issue 10): errors name a field
// path of the contract ("lines.A.parts[0].fraction_v"), and a field shows the error when the
// path is the field or lies inside it. QML: FieldPath.belongs(model.errorField, "lines.A").
// The reading of the path syntax is chem::path_within / chem::subscript_of (chem/error.h).
#include <QObject>
#include <QQmlEngine>
#include <QString>
#include <QStringList>

namespace phaseplan::gui {

class FieldPath : public QObject {
    Q_OBJECT
    QML_ELEMENT
    QML_SINGLETON

  public:
    using QObject::QObject;

    /// `error_field` is `field` or lies inside it ("batch.actual[2].lot" belongs to
    /// "batch.actual"; "" belongs to nothing).
    Q_INVOKABLE static bool belongs(const QString& error_field, const QString& field);
    /// belongs() for any of `fields`.
    Q_INVOKABLE static bool belongsToAny(const QString& error_field, const QStringList& fields);
    /// The list index in `path` right after `list` ("batch.actual[2].mass_g", "batch.actual"
    /// → 2), or -1.
    Q_INVOKABLE static int index(const QString& path, const QString& list);
    /// The path's segments as texts, read by chem::Path::parse: "lines.B.parts[0].fraction_v" →
    /// ["lines", "B", "parts", "0", "fraction_v"]. A screen walks them to the field a check or
    /// an error names ("Open ›").
    Q_INVOKABLE static QStringList segments(const QString& path);
};

} // namespace phaseplan::gui

#include "field_path.h"

#include "chem/error.h"

namespace phaseplan::gui {

bool FieldPath::belongs(const QString& error_field, const QString& field) {
    if (error_field.isEmpty() || field.isEmpty())
        return false;
    return chem::path_within(error_field.toStdString(), field.toStdString());
}

bool FieldPath::belongsToAny(const QString& error_field, const QStringList& fields) {
    for (const QString& f : fields)
        if (belongs(error_field, f))
            return true;
    return false;
}

int FieldPath::index(const QString& path, const QString& list) {
    const auto s = chem::subscript_of(path.toStdString(), list.toStdString());
    return s ? s->index() : -1;
}

QStringList FieldPath::segments(const QString& path) {
    QStringList out;
    const chem::Path parsed = chem::Path::parse(path.toStdString());
    for (const chem::PathSegment& s : parsed.segments())
        out << QString::fromStdString(s.text);
    return out;
}

} // namespace phaseplan::gui

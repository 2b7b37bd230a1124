#include "field_words.h"

#include "chem/error.h"

#include <QObject>

#include <map>

namespace phaseplan::gui {

QString key_words(const QString& key) {
    static const std::map<QString, const char*> words = {
        // recipe
        {"target_ph", QT_TR_NOOP("target pH")},
        {"temperature_c", QT_TR_NOOP("temperature")},
        {"volume_ml", QT_TR_NOOP("final volume")},
        {"concentration_mol_per_l", QT_TR_NOOP("buffer concentration")},
        {"ionic_strength_mol_per_l", QT_TR_NOOP("ionic strength")},
        {"acid", QT_TR_NOOP("acid form")},
        {"base", QT_TR_NOOP("base form")},
        {"weigh", QT_TR_NOOP("reagent weighed")},
        {"titrant", QT_TR_NOOP("titrant")},
        {"titrant_mol_per_l", QT_TR_NOOP("titrant concentration")},
        {"acid_stock_mol_per_l", QT_TR_NOOP("acid stock")},
        {"base_stock_mol_per_l", QT_TR_NOOP("base stock")},
        {"route", QT_TR_NOOP("route")},
        {"system", QT_TR_NOOP("buffer system")},
        // lines
        {"name", QT_TR_NOOP("name on the bottle")},
        {"bottle_ml", QT_TR_NOOP("bottle volume")},
        {"residue_ml", QT_TR_NOOP("residue")},
        {"fraction_v", QT_TR_NOOP("% v/v")},
        {"solvent", QT_TR_NOOP("solvent")},
        {"additive", QT_TR_NOOP("additive")},
        {"percent_v", QT_TR_NOOP("amount (% v/v)")},
        {"percent_w", QT_TR_NOOP("amount (% w/v)")},
        {"mmol_per_l", QT_TR_NOOP("amount (mmol/L)")},
        {"prepared_at", QT_TR_NOOP("prepared at")},
        {"shelf_life_h", QT_TR_NOOP("shelf life")},
        // methods and the sequence
        {"flow_ml_min", QT_TR_NOOP("flow")},
        {"run_min", QT_TR_NOOP("run time")},
        {"equilibration_min", QT_TR_NOOP("equilibration")},
        {"t_min", QT_TR_NOOP("time")},
        {"method", QT_TR_NOOP("method")},
        {"injections", QT_TR_NOOP("injections")},
        {"label", QT_TR_NOOP("label")},
        {"until", QT_TR_NOOP("until")},
        {"duration_min", QT_TR_NOOP("duration")},
        // the night
        {"start", QT_TR_NOOP("Start")},
        {"waste_ml", QT_TR_NOOP("Free volume in the waste container")},
        {"detector", QT_TR_NOOP("Detector")},
        {"wavelength_nm", QT_TR_NOOP("detection wavelength")},
        {"type", QT_TR_NOOP("type")},
        {"column", QT_TR_NOOP("Column")},
        {"ph_min", QT_TR_NOOP("lowest pH")},
        {"ph_max", QT_TR_NOOP("highest pH")},
        {"standby", QT_TR_NOOP("Standby")},
        {"safety_margin", QT_TR_NOOP("Safety margin")},
        {"lines", QT_TR_NOOP("Lines")},
        {"methods", QT_TR_NOOP("Methods")},
        {"sequence", QT_TR_NOOP("Sequence")},
    };
    if (key.size() == 1 && key[0] >= QLatin1Char('A') && key[0] <= QLatin1Char('D'))
        return QObject::tr("% %1").arg(key);
    auto it = words.find(key);
    if (it != words.end())
        return QObject::tr(it->second);
    QString k = key;
    return k.replace(QLatin1Char('_'), QLatin1Char(' '));
}

namespace {

QString indexed(const QString& key, int i) {
    if (key == QLatin1String("gradient"))
        return QObject::tr("gradient row %1").arg(i + 1);
    if (key == QLatin1String("parts"))
        return QObject::tr("part %1").arg(i + 1);
    if (key == QLatin1String("additives"))
        return QObject::tr("additive %1").arg(i + 1);
    if (key == QLatin1String("sequence"))
        return QObject::tr("Sequence row %1").arg(i + 1);
    if (key == QLatin1String("components"))
        return QObject::tr("component %1").arg(i + 1);
    if (key == QLatin1String("plans"))
        return QObject::tr("Plan %1").arg(i + 1);
    if (key == QLatin1String("actual"))
        return QObject::tr("actual amount %1").arg(i + 1);
    return QObject::tr("%1 %2").arg(key_words(key)).arg(i + 1);
}

QString capitalised(QString s) {
    if (!s.isEmpty())
        s[0] = s[0].toUpper();
    return s;
}

} // namespace

QString field_words(const QString& path, const QStringList& method_names) {
    if (path.isEmpty())
        return {};
    QStringList out;
    QString rest = path;
    // A method's name may hold dots and spaces: take the longest known name that fits.
    if (rest.startsWith(QLatin1String("methods."))) {
        QString name;
        for (const QString& n : method_names) {
            const QString prefix = QStringLiteral("methods.") + n;
            if ((rest == prefix || rest.startsWith(prefix + QLatin1Char('.'))) &&
                n.size() > name.size())
                name = n;
        }
        if (name.isEmpty())
            name = rest.mid(8).section(QLatin1Char('.'), 0, 0);
        out << QObject::tr("Method “%1”").arg(name);
        rest = rest.mid(8 + name.size());
        if (rest.startsWith(QLatin1Char('.')))
            rest.remove(0, 1);
    } else if (rest.startsWith(QLatin1String("lines."))) {
        out << QObject::tr("Line %1").arg(rest.mid(6, 1));
        rest = rest.mid(7);
        if (rest.startsWith(QLatin1Char('.')))
            rest.remove(0, 1);
    } else if (rest.startsWith(QLatin1String("prime_ml."))) {
        return QObject::tr("Priming of line %1").arg(rest.mid(9, 1));
    }
    // The rest by segment (chem::Path): a key with the list index after it is one entry
    // ("parts[2]" → "part 3"); a subscript that is not an index stays as written.
    const chem::Path segs = chem::Path::parse(rest.toStdString());
    const auto& v = segs.segments();
    for (std::size_t k = 0; k < v.size(); ++k) {
        const QString key = QString::fromStdString(v[k].text);
        if (v[k].kind != chem::PathSegment::Kind::key) { // a bracket without a key before it
            out << key_words(QLatin1Char('[') + key + QLatin1Char(']'));
            continue;
        }
        const chem::PathSegment* next = k + 1 < v.size() ? &v[k + 1] : nullptr;
        if (key == QLatin1String("buffer")) {
            out << QObject::tr("buffer");
            if (next && next->kind != chem::PathSegment::Kind::key)
                ++k;
            continue;
        }
        if (next && next->kind == chem::PathSegment::Kind::index) {
            out << indexed(key, next->as_index());
            ++k;
        } else if (next && next->kind == chem::PathSegment::Kind::subscript) {
            out << key_words(key + QLatin1Char('[') + QString::fromStdString(next->text) +
                             QLatin1Char(']'));
            ++k;
        } else {
            out << key_words(key);
        }
    }
    return capitalised(out.join(QStringLiteral(", ")));
}

} // namespace phaseplan::gui

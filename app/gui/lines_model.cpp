#include "lines_model.h"

#include "chem/note_text.h"
#include "core/chem_json.h"
#include "core/line_commands.h"
#include "number_text.h"
#include "plan.h"
#include "workspace.h"

#include <QJsonArray>
#include <QLocale>

#include <cmath>

namespace phaseplan::gui {

namespace {

const QStringList letters = {QStringLiteral("A"), QStringLiteral("B"), QStringLiteral("C"),
                             QStringLiteral("D")};
const char* additive_units[] = {"percent_v", "percent_w", "mmol_per_l"};

// The decimals of the line's steps (chem::measure_decimals).
QString volume_text(double ml) {
    return measure_text(ml, chem::MeasureUnit::ml) + QStringLiteral(" mL");
}
QString mass_text(double g) {
    return measure_text(g, chem::MeasureUnit::g) + QStringLiteral(" g");
}

} // namespace

LinesModel::LinesModel(QObject* parent) : QAbstractListModel(parent) {
    recompute_timer_.setSingleShot(true);
    recompute_timer_.setInterval(0);
    connect(&recompute_timer_, &QTimer::timeout, this, &LinesModel::recompute);
}

void LinesModel::recomputeNow() {
    if (recompute_timer_.isActive())
        recompute();
}

void LinesModel::setPlan(Plan* p) {
    if (p == plan_)
        return;
    if (plan_) {
        disconnect(plan_, nullptr, this, nullptr);
        disconnect(plan_, nullptr, &recompute_timer_, nullptr);
    }
    plan_ = p;
    if (p) {
        connect(p, &Plan::documentChanged, &recompute_timer_, qOverload<>(&QTimer::start));
        connect(p, &Plan::workspaceChanged, this, [this] {
            rebuild_choices();
            recompute();
        });
    }
    emit planChanged();
    rebuild_choices();
    recompute();
}

void LinesModel::rebuild_choices() {
    solvent_choices_.clear();
    additive_choices_.clear();
    Workspace* ws = plan_ ? plan_->workspace() : nullptr;
    if (ws && ws->ready()) {
        for (const storage::LibraryEntry& e : ws->entries(QStringLiteral("solvents")))
            solvent_choices_.append(QVariantMap{{"id", e.id}, {"name", ws->displayName(e.id)}});
        for (const storage::LibraryEntry& e : ws->entries(QStringLiteral("additives")))
            additive_choices_.append(QVariantMap{{"id", e.id}, {"name", ws->displayName(e.id)}});
    }
    emit choicesChanged();
}

int LinesModel::rowCount(const QModelIndex& parent) const {
    return parent.isValid() ? 0 : 4;
}

int LinesModel::rowOf(const QString& letter) const {
    return int(letters.indexOf(letter));
}

QHash<int, QByteArray> LinesModel::roleNames() const {
    return {{LetterRole, "letter"},
            {DefinedRole, "defined"},
            {NameRole, "name"},
            {BottleMlRole, "bottleMl"},
            {ResidueMlRole, "residueMl"},
            {PrimeMlRole, "primeMl"},
            {PartsRole, "parts"},
            {AdditivesRole, "additives"},
            {ItemsRole, "items"},
            {UvCutoffNmRole, "uvCutoffNm"},
            {WarningsRole, "warnings"},
            {ErrorFieldRole, "errorField"},
            {ErrorMessageRole, "errorMessage"},
            {HasBufferRole, "hasBuffer"},
            {BufferNameRole, "bufferName"},
            {BufferItemsRole, "bufferItems"},
            {CautionsRole, "cautions"},
            {NotesRole, "notes"}};
}

QVariant LinesModel::data(const QModelIndex& index, int role) const {
    if (!index.isValid() || index.row() < 0 || index.row() >= 4)
        return {};
    auto it = shown_[index.row()].constFind(role);
    if (it != shown_[index.row()].constEnd())
        return it.value();
    return role_value(index.row(), role);
}

QVariant LinesModel::role_value(int row, int role) const {
    const QString letter = letters[row];
    const QJsonObject l = plan_ ? plan_->line(letter) : QJsonObject();
    const Computed& c = computed_[row];
    Workspace* ws = plan_ ? plan_->workspace() : nullptr;
    auto name_of = [ws](const QString& id) { return ws ? ws->displayName(id) : id; };
    switch (role) {
    case LetterRole:
        return letter;
    case DefinedRole:
        return !l.isEmpty();
    case NameRole:
        return l.value("name").toString();
    case BottleMlRole:
        return l.value("bottle_ml").toDouble();
    case ResidueMlRole:
        return l.value("residue_ml").toDouble();
    case PrimeMlRole:
        return plan_ ? plan_->primeMl(letter) : 0.0;
    case PartsRole: {
        QVariantList parts;
        for (const QJsonValue& v : l.value("parts").toArray()) {
            const QJsonObject p = v.toObject();
            const double f = p.value("fraction_v").toDouble();
            if (p.contains("buffer")) {
                const QJsonObject b = p.value("buffer").toObject();
                QString name = b.value("name").toString();
                if (name.isEmpty())
                    name =
                        tr("pH %1 buffer").arg(format_decimal(b.value("target_ph").toDouble(), 2));
                const QString ref = p.value("buffer_ref").toString();
                parts.append(QVariantMap{{"kind", "buffer"},
                                         {"id", ref},
                                         {"ref", ref},
                                         {"name", ref.isEmpty() ? name : ref},
                                         {"fraction_v", f},
                                         {"percent_v", f * 100}});
            } else {
                const QString id = p.value("solvent").toString();
                parts.append(QVariantMap{{"kind", "solvent"},
                                         {"id", id},
                                         {"name", name_of(id)},
                                         {"fraction_v", f},
                                         {"percent_v", f * 100}});
            }
        }
        return parts;
    }
    case AdditivesRole: {
        QVariantList adds;
        for (const QJsonValue& v : l.value("additives").toArray()) {
            const QJsonObject a = v.toObject();
            QString unit = QStringLiteral("percent_v");
            for (const char* u : additive_units)
                if (a.contains(QLatin1String(u)))
                    unit = QLatin1String(u);
            const QString id = a.value("additive").toString();
            adds.append(QVariantMap{{"id", id},
                                    {"name", name_of(id)},
                                    {"amount", a.value(unit).toDouble()},
                                    {"unit", unit}});
        }
        return adds;
    }
    case ItemsRole:
        return c.items;
    case UvCutoffNmRole:
        return c.uv_cutoff_nm;
    case WarningsRole:
        return c.warnings;
    case ErrorFieldRole:
        return c.error.field;
    case ErrorMessageRole:
        return c.error.message;
    case BufferItemsRole:
        return c.buffer_items;
    case CautionsRole:
        return c.cautions;
    case NotesRole:
        return c.notes;
    case HasBufferRole:
        return plan_ && !plan_->lineBuffer(letter).isEmpty();
    case BufferNameRole:
        return plan_ ? plan_->lineBuffer(letter).value("name").toString() : QString();
    }
    return {};
}

QVariantList LinesModel::allWarnings() const {
    QVariantList out;
    for (int i = 0; i < 4; ++i)
        for (const QVariant& w : computed_[i].warnings) {
            QVariantMap m = w.toMap();
            m.insert("line", letters[i]);
            out.append(m);
        }
    return out;
}

void LinesModel::recompute() {
    recompute_timer_.stop();
    QElapsedTimer timer;
    timer.start();
    Workspace* ws = plan_ ? plan_->workspace() : nullptr;
    for (int i = 0; i < 4; ++i) {
        Computed c;
        const QJsonObject l = plan_ ? plan_->line(letters[i]) : QJsonObject();
        if (!l.isEmpty() && ws && ws->ready()) {
            QJsonObject input = l;
            input.insert("volume_ml", l.value("bottle_ml"));
            LineResult r;
            c.error = guarded([&] { r = line_result(ws->data(), input); });
            if (c.error.empty()) {
                for (const chem::LineItem& it : r.recipe.items) {
                    const QString part = QString::fromStdString(it.part);
                    QVariantMap item{{"part", part},
                                     {"kind", QLatin1String(chem::line_item_kind_name(it.kind))},
                                     {"name", it.kind == chem::LineItemKind::buffer
                                                  ? tr("Aqueous buffer (made as below)")
                                                  : ws->displayName(part)}};
                    if (it.volume_ml) {
                        item.insert("volume_ml", *it.volume_ml);
                        item.insert("volume_text", volume_text(*it.volume_ml));
                    }
                    if (it.mass_g) {
                        item.insert("mass_g", *it.mass_g);
                        item.insert("mass_text", mass_text(*it.mass_g));
                    }
                    c.items.append(item);
                }
                // The warnings in the views' form ({code, severity, message, …}), worded once by
                // the core's renderers.
                for (const chem::Warning& w : r.notes)
                    c.warnings.append(warning_to_json(w).toVariantMap());
                for (const chem::Finding& f : r.findings)
                    c.warnings.append(finding_to_json(f, r.words, nullptr).toVariantMap());
                c.uv_cutoff_nm = r.recipe.profile.uv_cutoff_nm;
                if (r.recipe.buffer)
                    for (const chem::RecipeItem& bi : r.recipe.buffer->items)
                        c.buffer_items.append(QVariantMap{
                            {"name", ws->displayName(QString::fromStdString(bi.reagent))},
                            {"amount", amount_text(bi)}});
                for (const std::string& s : r.recipe.cautions)
                    c.cautions.append(QString::fromStdString(s));
                for (const chem::LineNote& n : r.recipe.notes)
                    c.notes.append(QString::fromStdString(chem::describe(n, ws->data().solvents)));
            }
        }
        computed_[i] = c;
    }
    last_recompute_ms_ = elapsed_ms(timer);
    if (views_active_)
        notify_views();
    emit computed();
}

void LinesModel::setViewsActive(bool a) {
    if (a == views_active_)
        return;
    views_active_ = a;
    emit viewsActiveChanged();
    if (a)
        notify_views();
}

void LinesModel::notify_views() {
    const QList<int> roles = roleNames().keys();
    for (int r = 0; r < 4; ++r) {
        QList<int> changed;
        for (int role : roles) {
            QVariant v = role_value(r, role);
            auto it = shown_[r].find(role);
            if (it == shown_[r].end() || it.value() != v) {
                shown_[r].insert(role, v);
                changed << role;
            }
        }
        if (!changed.isEmpty())
            emit dataChanged(index(r), index(r), changed);
    }
}

void LinesModel::edit_line(const QString& letter, const std::function<void(QJsonObject&)>& change) {
    if (!plan_ || rowOf(letter) < 0)
        return;
    QJsonObject l = plan_->line(letter);
    if (l.isEmpty())
        return;
    change(l);
    plan_->setLine(letter, l);
}

void LinesModel::addLine(const QString& letter) {
    if (!plan_ || rowOf(letter) < 0 || !plan_->line(letter).isEmpty())
        return;
    plan_->setLine(
        letter,
        QJsonObject{{"name", tr("Line %1").arg(letter)},
                    {"bottle_ml", 1000},
                    {"residue_ml", 30},
                    {"parts", QJsonArray{QJsonObject{{"solvent", "water"}, {"fraction_v", 1}}}}});
}

void LinesModel::removeLine(const QString& letter) {
    if (plan_ && rowOf(letter) >= 0)
        plan_->setLine(letter, {});
}

void LinesModel::setName(const QString& letter, const QString& name) {
    edit_line(letter, [&](QJsonObject& l) { l.insert("name", name); });
}
void LinesModel::setBottleMl(const QString& letter, double ml) {
    edit_line(letter, [&](QJsonObject& l) { l.insert("bottle_ml", ml); });
}
void LinesModel::setResidueMl(const QString& letter, double ml) {
    edit_line(letter, [&](QJsonObject& l) { l.insert("residue_ml", ml); });
}
void LinesModel::setPrimeMl(const QString& letter, double ml) {
    if (plan_)
        plan_->setPrimeMl(letter, ml);
}

void LinesModel::setPartPercent(const QString& letter, int i, double percent) {
    edit_line(letter, [&](QJsonObject& l) {
        QJsonArray parts = l.value("parts").toArray();
        if (i < 0 || i >= parts.size())
            return;
        QJsonObject p = parts[i].toObject();
        p.insert("fraction_v", percent / 100.0);
        parts[i] = p;
        l.insert("parts", parts);
    });
}

void LinesModel::setPartSolvent(const QString& letter, int i, const QString& solvent) {
    edit_line(letter, [&](QJsonObject& l) {
        QJsonArray parts = l.value("parts").toArray();
        if (i < 0 || i >= parts.size())
            return;
        QJsonObject p = parts[i].toObject();
        p.remove("buffer");
        p.remove("buffer_ref");
        p.insert("solvent", solvent);
        parts[i] = p;
        l.insert("parts", parts);
    });
}

namespace {
/// What the parts leave of the line (0 when they fill it): a new part takes that.
double remaining_fraction(const QJsonArray& parts) {
    double used = 0;
    for (const QJsonValue& p : parts)
        used += p.toObject().value("fraction_v").toDouble();
    return std::max(0.0, std::round((1.0 - used) * 1e6) / 1e6);
}
} // namespace

double LinesModel::remainingPercent(const QString& letter) const {
    return plan_ ? remaining_fraction(plan_->line(letter).value("parts").toArray()) * 100.0 : 0.0;
}

void LinesModel::addSolventPart(const QString& letter, const QString& solvent) {
    edit_line(letter, [&](QJsonObject& l) {
        QJsonArray parts = l.value("parts").toArray();
        const double rest = remaining_fraction(parts);
        if (!(rest > 0))
            return; // the view disables "+ Solvent" and says why
        parts.append(QJsonObject{{"solvent", solvent}, {"fraction_v", rest}});
        l.insert("parts", parts);
    });
}

void LinesModel::addBufferPart(const QString& letter, const QString& bufferName) {
    Workspace* ws = plan_ ? plan_->workspace() : nullptr;
    if (!ws || !ws->database())
        return;
    const auto saved = ws->database()->load(storage::DocumentKind::buffer, bufferName);
    if (!saved)
        return;
    QJsonObject r = *saved;
    r.remove("volume_ml");
    r.remove("auto_name");
    r.remove("name"); // the part's buffer_ref names it
    edit_line(letter, [&](QJsonObject& l) {
        QJsonArray parts = l.value("parts").toArray();
        for (const QJsonValue& p : parts)
            if (p.toObject().contains("buffer"))
                return; // one aqueous buffer per line
        const double rest = remaining_fraction(parts);
        if (!(rest > 0))
            return;
        parts.append(QJsonObject{{"buffer", r}, {"buffer_ref", bufferName}, {"fraction_v", rest}});
        l.insert("parts", parts);
    });
}

void LinesModel::setPartBuffer(const QString& letter, int i, const QString& bufferName) {
    Workspace* ws = plan_ ? plan_->workspace() : nullptr;
    if (!ws || !ws->database())
        return;
    const auto saved = ws->database()->load(storage::DocumentKind::buffer, bufferName);
    if (!saved)
        return;
    QJsonObject r = *saved;
    r.remove("volume_ml");
    r.remove("auto_name");
    r.remove("name"); // the part's buffer_ref names it
    edit_line(letter, [&](QJsonObject& l) {
        QJsonArray parts = l.value("parts").toArray();
        if (i < 0 || i >= parts.size())
            return;
        QJsonObject p = parts[i].toObject();
        p.remove("solvent");
        p.insert("buffer", r);
        p.insert("buffer_ref", bufferName);
        parts[i] = p;
        l.insert("parts", parts);
    });
}

void LinesModel::removePart(const QString& letter, int i) {
    edit_line(letter, [&](QJsonObject& l) {
        QJsonArray parts = l.value("parts").toArray();
        if (i < 0 || i >= parts.size())
            return;
        parts.removeAt(i);
        l.insert("parts", parts);
    });
}

void LinesModel::addAdditive(const QString& letter, const QString& additive) {
    edit_line(letter, [&](QJsonObject& l) {
        QJsonArray a = l.value("additives").toArray();
        a.append(QJsonObject{{"additive", additive}, {"percent_v", 0.1}});
        l.insert("additives", a);
    });
}

void LinesModel::setAdditive(const QString& letter, int i, const QString& additive, double amount,
                             const QString& unit) {
    edit_line(letter, [&](QJsonObject& l) {
        QJsonArray a = l.value("additives").toArray();
        if (i < 0 || i >= a.size())
            return;
        QJsonObject o = a[i].toObject();
        for (const char* u : additive_units)
            o.remove(QLatin1String(u));
        o.insert("additive", additive);
        o.insert(unit, amount);
        a[i] = o;
        l.insert("additives", a);
    });
}

void LinesModel::removeAdditive(const QString& letter, int i) {
    edit_line(letter, [&](QJsonObject& l) {
        QJsonArray a = l.value("additives").toArray();
        if (i < 0 || i >= a.size())
            return;
        a.removeAt(i);
        l.insert("additives", a);
    });
}

} // namespace phaseplan::gui

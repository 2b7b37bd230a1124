#include "saved_model.h"

#include "core/date_time.h"
#include "model_util.h"
#include "number_text.h"
#include "workspace.h"

#include <QJsonArray>
#include <QLocale>

namespace phaseplan::gui {

namespace {

// One line about a saved document, from its own fields (no computing).
QString summary_of(storage::DocumentKind kind, const QJsonObject& d) {
    switch (kind) {
    case storage::DocumentKind::buffer:
        if (!d.contains("volume_ml"))
            return QObject::tr("pH %1, %2")
                .arg(format_decimal(d.value("target_ph").toDouble(), 2),
                     d.value("route").toString());
        return QObject::tr("pH %1, %2 mL, %3")
            .arg(format_decimal(d.value("target_ph").toDouble(), 2),
                 format_decimal(d.value("volume_ml").toDouble(), 0), d.value("route").toString());
    case storage::DocumentKind::line:
        return QObject::tr("%1 mL bottle, %n part(s)", nullptr,
                           int(d.value("parts").toArray().size()))
            .arg(format_decimal(d.value("bottle_ml").toDouble(), 0));
    case storage::DocumentKind::method:
        return QObject::tr("%1 mL/min, run %2 min, %n gradient row(s)", nullptr,
                           int(d.value("gradient").toArray().size()))
            .arg(format_decimal(d.value("flow_ml_min").toDouble(), 2),
                 format_decimal(d.value("run_min").toDouble(), 1));
    case storage::DocumentKind::sequence: {
        int n = 0;
        for (const QJsonValue& r : d.value("sequence").toArray())
            n += r.toObject().value("injections").toInt();
        return QObject::tr("%n injection(s), starts %1", nullptr, n)
            .arg(short_clock(d.value("start").toString()));
    }
    }
    return {};
}

} // namespace

SavedWorkModel::SavedWorkModel(QObject* parent) : QAbstractListModel(parent) {}

void SavedWorkModel::setWorkspace(Workspace* w) {
    if (w == workspace_)
        return;
    if (workspace_)
        disconnect(workspace_, nullptr, this, nullptr);
    workspace_ = w;
    if (w) {
        connect(w, &Workspace::savedChanged, this, &SavedWorkModel::refresh);
        connect(w, &Workspace::readyChanged, this, &SavedWorkModel::refresh);
    }
    emit workspaceChanged();
    refresh();
}

void SavedWorkModel::setSearch(const QString& s) {
    if (s == search_)
        return;
    search_ = s;
    emit searchChanged();
    refresh();
}

void SavedWorkModel::setKind(const QString& k) {
    if (k == kind_)
        return;
    kind_ = k;
    emit searchChanged();
    refresh();
}

void SavedWorkModel::refresh() {
    beginResetModel();
    rows_.clear();
    if (workspace_ && workspace_->database()) {
        const QStringList words = search_.toLower().split(' ', Qt::SkipEmptyParts);
        const QLocale loc;
        QHash<QString, QString> people; // login → words, one look-up each
        for (const storage::DocumentInfo& i : workspace_->database()->list_all()) {
            const QString kind = storage::kind_name(i.kind);
            if (kind_ != QLatin1String("all") && kind != kind_)
                continue;
            const QString hay = (i.name + ' ' + i.note + ' ' + kind).toLower();
            bool ok = true;
            for (const QString& w : words)
                ok = ok && hay.contains(w);
            if (!ok)
                continue;
            const QJsonObject d =
                workspace_->database()->load(i.kind, i.name).value_or(QJsonObject());
            QString changed;
            if (!i.changed_by.trimmed().isEmpty()) {
                auto who = people.find(i.changed_by);
                if (who == people.end())
                    who = people.insert(
                        i.changed_by,
                        storage::person_words(workspace_->database()->connection(), i.changed_by));
                changed = tr("changed by %1, %2").arg(*who, storage::utc_time_words(i.changed_at));
            }
            rows_.push_back({kind, i.name, i.note,
                             loc.toString(i.updated_at.toLocalTime(), QLocale::ShortFormat),
                             summary_of(i.kind, d), changed});
        }
    }
    endResetModel();
    emit countChanged();
}

int SavedWorkModel::rowCount(const QModelIndex& parent) const {
    return parent.isValid() ? 0 : int(rows_.size());
}

QHash<int, QByteArray> SavedWorkModel::roleNames() const {
    return {{KindRole, "kind"},       {NameRole, "name"},       {NoteRole, "note"},
            {UpdatedRole, "updated"}, {SummaryRole, "summary"}, {ChangedRole, "changed"}};
}

QVariant SavedWorkModel::data(const QModelIndex& index, int role) const {
    if (!index.isValid() || index.row() >= int(rows_.size()))
        return {};
    const Row& r = rows_[index.row()];
    switch (role) {
    case KindRole:
        return r.kind;
    case NameRole:
        return r.name;
    case NoteRole:
        return r.note;
    case UpdatedRole:
        return r.updated;
    case SummaryRole:
        return r.summary;
    case ChangedRole:
        return r.changed;
    }
    return {};
}

QVariantMap SavedWorkModel::load(const QString& kind, const QString& name) const {
    const auto k = storage::kind_from_name(kind);
    if (!k || !workspace_ || !workspace_->database())
        return {};
    return workspace_->database()->load(*k, name).value_or(QJsonObject()).toVariantMap();
}

bool SavedWorkModel::remove(const QString& kind, const QString& name) {
    const auto k = storage::kind_from_name(kind);
    if (!k || !workspace_ || !workspace_->database())
        return false;
    bool removed = false;
    guarded([&] { removed = workspace_->database()->remove(*k, name); });
    if (removed)
        refresh();
    return removed;
}

} // namespace phaseplan::gui

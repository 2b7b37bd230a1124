#include "library_models.h"

#include "chem/formula.h"
#include "core/app_data.h"
#include "workspace.h"

#include <QJsonArray>
#include <QLocale>
#include <QRegularExpression>

namespace phaseplan::gui {

namespace {

QString join_strings(const std::vector<std::string>& v, const QString& sep) {
    QStringList out;
    for (const auto& s : v)
        out << QString::fromStdString(s);
    return out.join(sep);
}

QString join_json(const QJsonArray& a, const QString& sep) {
    QStringList out;
    for (const QJsonValue& v : a)
        out << v.toString();
    return out.join(sep);
}

QStringList codes(const QString& text) {
    static const QRegularExpression sep(QStringLiteral("[\\s,;]+"));
    return text.split(sep, Qt::SkipEmptyParts);
}

} // namespace

// ---- LibraryModel -------------------------------------------------------------------------

LibraryModel::LibraryModel(QObject* parent) : QAbstractListModel(parent) {}

void LibraryModel::setWorkspace(Workspace* w) {
    if (w == workspace_)
        return;
    if (workspace_)
        disconnect(workspace_, nullptr, this, nullptr);
    workspace_ = w;
    if (w) {
        connect(w, &Workspace::libraryChanged, this, &LibraryModel::reload);
        connect(w, &Workspace::readyChanged, this, &LibraryModel::reload);
    }
    emit workspaceChanged();
    reload();
}

void LibraryModel::setSearch(const QString& s) {
    if (s == search_)
        return;
    search_ = s;
    emit searchChanged();
    filter();
}

void LibraryModel::setKind(const QString& k) {
    if (k == kind_)
        return;
    kind_ = k;
    emit searchChanged();
    filter();
}

void LibraryModel::reload() {
    all_.clear();
    if (workspace_ && workspace_->ready()) {
        const QLocale loc;
        for (const chem::Reagent& r : workspace_->data().reagents.reagents()) {
            Row row;
            row.id = QString::fromStdString(r.id);
            row.name = QString::fromStdString(r.name);
            row.kind = QStringLiteral("reagents");
            row.formula = QString::fromStdString(r.formula);
            QString detail = tr("%1 g/mol").arg(loc.toString(r.molar_mass_g_per_mol, 'f', 3));
            if (r.form == chem::PhysicalForm::liquid)
                detail += tr(", liquid %1 % w/w, %2 g/mL")
                              .arg(loc.toString(r.assay_fraction * 100, 'g', 4),
                                   loc.toString(r.density_g_per_ml, 'f', 3));
            else
                detail += tr(", solid");
            row.detail = detail;
            row.hazards = join_strings(r.ghs_hazards, QStringLiteral(" "));
            row.pictograms = join_strings(r.ghs_pictograms, QStringLiteral(" "));
            row.sources = join_strings(r.sources, QStringLiteral("\n"));
            row.user = r.user_defined;
            all_.push_back(row);
        }
        const QLocale l;
        for (const storage::LibraryEntry& e : workspace_->entries(QStringLiteral("solvents"))) {
            const QJsonObject d = e.document;
            Row row;
            row.id = e.id;
            row.name = d.value("name").toString(e.id);
            row.kind = QStringLiteral("solvents");
            row.formula = d.value("formula").toString();
            QStringList detail;
            if (d.value("density_g_per_ml").isDouble())
                detail << tr("%1 g/mL").arg(
                    l.toString(d.value("density_g_per_ml").toDouble(), 'f', 4));
            if (d.value("uv_cutoff_nm").isDouble())
                detail << tr("UV cutoff %1 nm").arg(d.value("uv_cutoff_nm").toDouble());
            if (d.value("boiling_point_c").isDouble())
                detail << tr("boils %1 °C")
                              .arg(l.toString(d.value("boiling_point_c").toDouble(), 'f', 0));
            if (d.value("flash_point_c").isDouble())
                detail << tr("flash point %1 °C")
                              .arg(l.toString(d.value("flash_point_c").toDouble(), 'f', 0));
            row.detail = detail.join(QStringLiteral(", "));
            const QJsonObject ghs = d.value("ghs").toObject();
            row.hazards = join_json(ghs.value("hazards").toArray(), QStringLiteral(" "));
            row.pictograms = join_json(ghs.value("pictograms").toArray(), QStringLiteral(" "));
            QStringList src;
            for (auto it = d.begin(); it != d.end(); ++it)
                if (it.key().endsWith(QLatin1String("_source")) && it.value().isString())
                    src << it.key().chopped(7).replace('_', ' ') + QStringLiteral(": ") +
                               it.value().toString();
            row.sources = src.join('\n');
            row.user = e.user_defined;
            all_.push_back(row);
        }
    }
    filter();
}

void LibraryModel::filter() {
    beginResetModel();
    shown_.clear();
    const QStringList words = search_.toLower().split(' ', Qt::SkipEmptyParts);
    for (int i = 0; i < int(all_.size()); ++i) {
        const Row& r = all_[i];
        if (kind_ != QLatin1String("all") && r.kind != kind_)
            continue;
        const QString hay = (r.id + ' ' + r.name + ' ' + r.formula).toLower();
        bool ok = true;
        for (const QString& w : words)
            ok = ok && hay.contains(w);
        if (ok)
            shown_.push_back(i);
    }
    endResetModel();
    emit countChanged();
}

int LibraryModel::rowCount(const QModelIndex& parent) const {
    return parent.isValid() ? 0 : int(shown_.size());
}

QHash<int, QByteArray> LibraryModel::roleNames() const {
    return {{IdRole, "entryId"},
            {NameRole, "name"},
            {KindRole, "kind"},
            {FormulaRole, "formula"},
            {DetailRole, "detail"},
            {HazardsRole, "hazards"},
            {PictogramsRole, "pictograms"},
            {SourcesRole, "sources"},
            {UserDefinedRole, "userDefined"}};
}

QVariant LibraryModel::data(const QModelIndex& index, int role) const {
    if (!index.isValid() || index.row() >= int(shown_.size()))
        return {};
    const Row& r = all_[shown_[index.row()]];
    switch (role) {
    case IdRole:
        return r.id;
    case NameRole:
        return r.name;
    case KindRole:
        return r.kind;
    case FormulaRole:
        return r.formula;
    case DetailRole:
        return r.detail;
    case HazardsRole:
        return r.hazards;
    case PictogramsRole:
        return r.pictograms;
    case SourcesRole:
        return r.sources;
    case UserDefinedRole:
        return r.user;
    }
    return {};
}

// ---- ReagentEditor ------------------------------------------------------------------------

ReagentEditor::ReagentEditor(QObject* parent) : QObject(parent) {}

void ReagentEditor::setWorkspace(Workspace* w) {
    if (w == workspace_)
        return;
    workspace_ = w;
    emit workspaceChanged();
    validate();
}

void ReagentEditor::clear() {
    id_.clear();
    name_.clear();
    formula_.clear();
    form_ = QStringLiteral("solid");
    assay_percent_ = 100;
    density_g_per_ml_ = 0;
    hazards_.clear();
    pictograms_.clear();
    spectator_ion_.clear();
    spectator_charge_ = 1;
    spectator_count_ = 1;
    system_.clear();
    system_count_ = 1;
    protons_removed_ = 0;
    source_.clear();
    extra_ = {};
    editing_shipped_ = false;
    is_lab_entry_ = false;
    show_errors_ = false;
    loaded_version_ = 0;
    emit changed();
    validate();
}

bool ReagentEditor::edit(const QString& id) {
    if (!workspace_ || !workspace_->database())
        return false;
    QJsonObject doc;
    bool lab = false;
    qint64 version = 0;
    for (const storage::LibraryEntry& e : workspace_->entries(QStringLiteral("reagents")))
        if (e.id == id) {
            doc = e.document;
            lab = e.user_defined;
            version = e.version;
            if (lab)
                source_ = e.source;
        }
    if (doc.isEmpty())
        return false;
    id_ = id;
    name_ = doc.value("name").toString();
    formula_ = doc.value("formula").toString();
    form_ = doc.value("form").toString(QStringLiteral("solid"));
    assay_percent_ = doc.value("assay_percent").toDouble(100);
    density_g_per_ml_ = doc.value("density_g_per_ml").toDouble(0);
    const QJsonObject ghs = doc.value("ghs").toObject();
    hazards_ = join_json(ghs.value("hazards").toArray(), QStringLiteral(" "));
    pictograms_ = join_json(ghs.value("pictograms").toArray(), QStringLiteral(" "));
    const QJsonArray spect = doc.value("spectators").toArray();
    const QJsonObject s0 = spect.isEmpty() ? QJsonObject() : spect.first().toObject();
    spectator_ion_ = s0.value("ion").toString();
    spectator_charge_ = s0.value("charge").toInt(1);
    spectator_count_ = s0.value("count").toDouble(1);
    const QJsonArray systems = doc.value("systems").toArray();
    const QJsonObject y0 = systems.isEmpty() ? QJsonObject() : systems.first().toObject();
    system_ = y0.value("system").toString();
    system_count_ = y0.value("count").toDouble(1);
    protons_removed_ = y0.value("protons_removed").toDouble(0);
    if (!lab)
        source_.clear(); // the lab says where its own numbers come from
    extra_ = doc;
    // Entries beyond the first spectator or system stay as they are.
    QJsonArray rest_s = spect, rest_y = systems;
    if (!rest_s.isEmpty())
        rest_s.removeFirst();
    if (!rest_y.isEmpty())
        rest_y.removeFirst();
    extra_.insert("spectators", rest_s);
    extra_.insert("systems", rest_y);
    editing_shipped_ = !lab;
    is_lab_entry_ = lab;
    loaded_version_ = lab ? version : 0;
    show_errors_ = true;
    emit changed();
    validate();
    return true;
}

void ReagentEditor::reload() {
    if (!workspace_ || !workspace_->database())
        return;
    const QString id = id_.trimmed();
    workspace_->reloadLibrary();
    if (!edit(id))
        clear();
}

QJsonObject ReagentEditor::document() const {
    QJsonObject d = extra_;
    d.insert("id", id_.trimmed());
    d.insert("name", name_.trimmed());
    d.insert("formula", formula_.trimmed());
    d.insert("form", form_);
    d.insert("assay_percent", assay_percent_);
    if (form_ == QLatin1String("liquid"))
        d.insert("density_g_per_ml", density_g_per_ml_);
    else
        d.remove("density_g_per_ml");
    QJsonObject ghs = d.value("ghs").toObject();
    ghs.insert("hazards", QJsonArray::fromStringList(codes(hazards_)));
    ghs.insert("pictograms", QJsonArray::fromStringList(codes(pictograms_)));
    ghs.insert("source", source_.trimmed());
    d.insert("ghs", ghs);
    QJsonArray spect = extra_.value("spectators").toArray();
    if (!spectator_ion_.trimmed().isEmpty())
        spect.prepend(QJsonObject{{"ion", spectator_ion_.trimmed()},
                                  {"charge", spectator_charge_},
                                  {"count", spectator_count_}});
    d.insert("spectators", spect);
    QJsonArray systems = extra_.value("systems").toArray();
    if (!system_.isEmpty())
        systems.prepend(QJsonObject{
            {"system", system_}, {"count", system_count_}, {"protons_removed", protons_removed_}});
    d.insert("systems", systems);
    d.insert("sources", QJsonArray{source_.trimmed()});
    d.insert("user_defined", true);
    return d;
}

void ReagentEditor::validate() {
    molar_mass_ = 0;
    FieldError e = guarded([&] {
        static const QRegularExpression id_re(QStringLiteral("^[a-z0-9]+(-[a-z0-9]+)*$"));
        if (!id_re.match(id_.trimmed()).hasMatch())
            throw chem::Error("id", "\"" + id_.toStdString() +
                                        "\" is not an id: use lower-case letters, digits and "
                                        "hyphens (\"lab-tris-maleate\")");
        if (name_.trimmed().isEmpty())
            throw chem::Error("name", "give the reagent a name");
        molar_mass_ = chem::molar_mass_g_per_mol(formula_.trimmed().toStdString());
        static const QRegularExpression h_re(QStringLiteral("^(EU)?H\\d{3}[A-Za-z]*$"));
        for (const QString& h : codes(hazards_))
            if (!h_re.match(h).hasMatch())
                throw chem::Error("ghs.hazards",
                                  "\"" + h.toStdString() +
                                      "\" is not a hazard statement code (H314, EUH071)");
        static const QRegularExpression p_re(QStringLiteral("^GHS0[1-9]$"));
        for (const QString& p : codes(pictograms_))
            if (!p_re.match(p).hasMatch())
                throw chem::Error("ghs.pictograms",
                                  "\"" + p.toStdString() +
                                      "\" is not a GHS pictogram code (GHS01 to GHS09)");
        if (!(assay_percent_ > 0 && assay_percent_ <= 100))
            throw chem::Error("assay_percent",
                              chem::format_number(assay_percent_) + " % is not between 0 and 100");
        // The same loader and checks as the shipped file: unknown system, electroneutrality, …
        chem::Reagent r = reagent_from_json(document(), "");
        if (workspace_ && workspace_->ready()) {
            chem::Library lib = workspace_->data().reagents;
            lib.add_reagent(r);
        }
        if (source_.trimmed().isEmpty())
            throw chem::Error("source",
                              "say where these numbers come from (a citation, the supplier's "
                              "certificate, \"lab measurement\")");
    });
    if (e.field.startsWith('.'))
        e.field.remove(0, 1);
    error_ = e;
    emit validated();
}

QString ReagentEditor::save() {
    show_errors_ = true;
    emit changed();
    validate();
    if (!error_.empty())
        return error_.message;
    if (!workspace_ || !workspace_->database())
        return tr("no database is open");
    qint64 stored = 0;
    const FieldError e = guarded([&] {
        // From the version loaded: 0 (a new entry, or a shipped one corrected) must be new.
        stored = workspace_->database()->save_user_entry(QStringLiteral("reagents"), document(),
                                                         source_, loaded_version_);
        workspace_->reloadLibrary();
    });
    if (!e.empty()) {
        error_ = e;
        emit validated();
        return e.message;
    }
    extra_ = document();
    extra_.insert("spectators", QJsonArray());
    extra_.insert("systems", QJsonArray());
    editing_shipped_ = false;
    is_lab_entry_ = true;
    loaded_version_ = stored;
    emit changed();
    return {};
}

bool ReagentEditor::removeLabEntry() {
    if (!workspace_ || !workspace_->database())
        return false;
    bool removed = false;
    const FieldError e = guarded([&] {
        removed = workspace_->database()->remove_user_entry(
            QStringLiteral("reagents"), id_.trimmed(), loaded_version_ > 0 ? loaded_version_ : -1);
        if (removed)
            workspace_->reloadLibrary();
    });
    if (!e.empty()) {
        error_ = e;
        emit validated();
        return false;
    }
    if (removed && !edit(id_.trimmed()))
        clear();
    return removed;
}

QVariantList ReagentEditor::systemChoices() const {
    QVariantList out{
        QVariantMap{{"id", QString()}, {"name", tr("none (a salt or a strong acid or base)")}}};
    if (workspace_ && workspace_->ready())
        for (const chem::AcidBaseSystem& s : workspace_->data().reagents.systems())
            out.append(QVariantMap{{"id", QString::fromStdString(s.id)},
                                   {"name", QString::fromStdString(s.name)}});
    return out;
}

} // namespace phaseplan::gui

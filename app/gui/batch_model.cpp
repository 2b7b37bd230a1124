#include "batch_model.h"

#include "print/documents.h"
#include "print/print_controller.h"
#include "workspace.h"

#include <QDateTime>
#include <QDir>
#include <QFileInfo>
#include <QJsonArray>
#include <QRegularExpression>
#include <QStandardPaths>

#include <cmath>
#include <limits>

namespace phaseplan::gui {

namespace {

QString now_local() { return QDateTime::currentDateTime().toString(QStringLiteral("yyyy-MM-ddTHH:mm:ss")); }

QVariant json_to_variant(const QJsonValue& v) { return v.isNull() || v.isUndefined() ? QVariant() : v.toVariant(); }

} // namespace

BatchModel::BatchModel(QObject* parent)
    : QAbstractListModel(parent), printer_(std::make_unique<print::PrintController>()) {
    output_dir_ = QStandardPaths::writableLocation(QStandardPaths::DocumentsLocation);
}

BatchModel::~BatchModel() = default;

void BatchModel::setWorkspace(Workspace* w) {
    if (workspace_ == w) return;
    workspace_ = w;
    printer_->setData(w ? &w->data() : nullptr);
    if (w) connect(w, &Workspace::readyChanged, this, [this] {
        if (workspace_) printer_->setData(&workspace_->data());
        emit batchListChanged();
    });
    emit workspaceChanged();
    emit batchListChanged();
}

void BatchModel::setPreparer(const QString& p) {
    if (preparer_ == p) return;
    preparer_ = p;
    emit preparerChanged();
}

void BatchModel::setIdPrefix(const QString& p) {
    if (id_prefix_ == p) return;
    id_prefix_ = p;
    emit preparerChanged();
}

void BatchModel::setOutputDir(const QString& d) {
    if (output_dir_ == d) return;
    output_dir_ = d;
    emit outputDirChanged();
}

void BatchModel::setAmendReason(const QString& r) {
    if (amend_reason_ == r) return;
    amend_reason_ = r;
    emit amendReasonChanged();
}

std::unique_ptr<storage::BatchStore> BatchModel::store() const {
    if (!workspace_ || !workspace_->database()) return nullptr;
    return std::make_unique<storage::BatchStore>(workspace_->database()->connection());
}

QString BatchModel::who() const {
    if (!preparer_.trimmed().isEmpty()) return preparer_.trimmed();
    return draft_ ? draft_->prepared_by : QString();
}

void BatchModel::set_error(const FieldError& e) {
    if (error_ == e) return;
    error_ = e;
    emit errorChanged();
    if (!rows_.empty()) emit dataChanged(index(0), index(int(rows_.size()) - 1), {ErrorRole});
}

int BatchModel::actual_index(const QString& reagent) const {
    if (!draft_) return -1;
    for (int i = 0; i < draft_->actual.size(); ++i)
        if (draft_->actual[i].toObject().value("reagent").toString() == reagent) return i;
    return -1;
}

FieldError BatchModel::evaluate(const storage::BatchRecord& rec) {
    if (!workspace_ || !workspace_->ready()) return {QStringLiteral("database"), tr("no database is open")};
    print::PrintJob job;
    const FieldError e = guarded([&] { job = print::build_print_job(workspace_->data(), rec.to_input(), now_local()); });
    if (!e.empty()) {
        valid_ = false;
        emit resultChanged();
        return e;
    }
    const QJsonObject s = job.summary;
    const QJsonObject b = s.value("batch").toObject();
    std::vector<Row> rows;
    for (const QJsonValue& v : b.value("checks").toArray()) {
        const QJsonObject c = v.toObject();
        Row r;
        r.reagent = c.value("reagent").toString();
        r.name = workspace_->displayName(r.reagent);
        r.unit = c.value("unit").toString();
        r.target = c.value("target").toDouble();
        r.low = c.value("low").toDouble();
        r.high = c.value("high").toDouble();
        r.entered = c.value("entered").toBool();
        r.actual = r.entered ? c.value("actual").toDouble() : std::numeric_limits<double>::quiet_NaN();
        r.deviation_percent = c.value("deviation_percent").toDouble();
        r.within = c.value("within_tolerance").toBool(true);
        rows.push_back(r);
    }
    // The same reagents: update in place, so a field being typed in keeps its focus.
    bool same = rows.size() == rows_.size();
    for (size_t k = 0; same && k < rows.size(); ++k) same = rows[k].reagent == rows_[k].reagent;
    if (same) {
        rows_ = std::move(rows);
        if (!rows_.empty()) emit dataChanged(index(0), index(int(rows_.size()) - 1));
    } else {
        beginResetModel();
        rows_ = std::move(rows);
        endResetModel();
    }
    valid_ = true;
    title_ = s.value("title").toString();
    shelf_life_h_ = b.value("shelf_life_h").toDouble();
    target_ph_ = s.value("target_ph").toDouble(std::numeric_limits<double>::quiet_NaN());
    predicted_ph_ = b.value("ph").toDouble(std::numeric_limits<double>::quiet_NaN());
    ionic_strength_mmol_per_l_ = b.value("ionic_strength_mol_per_l").toDouble(std::numeric_limits<double>::quiet_NaN()) * 1000;
    buffer_capacity_mmol_per_l_ = b.value("buffer_capacity_mol_per_l").toDouble(std::numeric_limits<double>::quiet_NaN()) * 1000;
    composition_.clear();
    for (const QJsonValue& v : b.value("composition").toArray()) {
        const QJsonObject c = v.toObject();
        composition_.append(QVariantMap{{"reagent", c.value("reagent").toString()},
                                        {"name", workspace_->displayName(c.value("reagent").toString())},
                                        {"mmolPerL", c.value("mol_per_l").toDouble() * 1000}});
    }
    warnings_.clear();
    for (const QJsonValue& v : s.value("warnings").toArray()) {
        const QJsonObject w = v.toObject();
        warnings_.append(QVariantMap{{"code", w.value("code").toString()},
                                     {"severity", w.value("severity").toString()},
                                     {"message", w.value("message").toString()}});
    }
    emit resultChanged();
    return {};
}

void BatchModel::reload(const QString& id) {
    auto st = store();
    if (!st) return;
    stored_ = st->load(id);
    history_.clear();
    if (stored_) {
        for (const auto& h : st->history(id))
            history_.append(QVariantMap{{"seq", h.seq},
                                        {"revision", h.revision},
                                        {"at", h.at},
                                        {"who", h.who},
                                        {"action", h.action},
                                        {"field", h.field},
                                        {"oldValue", json_to_variant(h.old_value)},
                                        {"newValue", json_to_variant(h.new_value)},
                                        {"reason", h.reason}});
    }
}

bool BatchModel::markPrepared(const QVariantMap& document) {
    auto st = store();
    if (!st) return set_error({QStringLiteral("database"), tr("no database is open")}), false;
    const QString person = preparer_.trimmed();
    if (person.isEmpty())
        return set_error({QStringLiteral("batch.prepared_by"), tr("enter who prepares the batch")}), false;

    storage::BatchRecord rec;
    FieldError e = guarded([&] {
        QJsonObject doc = QJsonObject::fromVariantMap(document);
        doc.remove(QStringLiteral("batch"));
        doc.insert(QStringLiteral("batch"), QJsonObject{{"id", QStringLiteral("pending")}});
        rec = storage::BatchRecord::from_input(doc);
    });
    if (!e.empty()) return set_error(e), false;
    rec.prepared_by = person;
    rec.prepared_at = now_local();
    e = guarded([&] { rec.id = st->propose_id(id_prefix_, QDate::currentDate()); });
    if (!e.empty()) return set_error(e), false;
    // The expiry from the shelf-life default, written into the batch so it shows and can change.
    e = evaluate(rec);
    if (!e.empty()) return set_error(e), false;
    e = guarded([&] {
        const print::PrintJob job = print::build_print_job(workspace_->data(), rec.to_input(), now_local());
        rec.expires_at = job.summary.value("batch").toObject().value("expires_at").toString();
        st->create(rec, person);
    });
    if (!e.empty()) return set_error(e), false;
    draft_ = rec;
    lots_.clear();
    pending_ = false;
    reload(rec.id);
    set_error({});
    emit batchChanged();
    emit batchListChanged();
    return true;
}

bool BatchModel::open(const QString& id) {
    auto st = store();
    if (!st) return set_error({QStringLiteral("database"), tr("no database is open")}), false;
    std::optional<storage::BatchRecord> rec;
    FieldError e = guarded([&] { rec = st->load(id); });
    if (!e.empty()) return set_error(e), false;
    if (!rec) return set_error({QStringLiteral("batch.id"), tr("no batch \"%1\" in this database").arg(id)}), false;
    draft_ = rec;
    lots_.clear();
    for (const QJsonValue& v : rec->actual)
        lots_[v.toObject().value("reagent").toString()] = v.toObject().value("lot").toString();
    pending_ = false;
    reload(id);
    set_error(evaluate(*draft_));
    emit batchChanged();
    return true;
}

void BatchModel::close() {
    beginResetModel();
    rows_.clear();
    endResetModel();
    draft_.reset();
    stored_.reset();
    pending_ = false;
    valid_ = false;
    history_.clear();
    set_error({});
    emit batchChanged();
    emit resultChanged();
}

bool BatchModel::apply(const QString& field, const storage::BatchRecord& next) {
    auto st = store();
    if (!st || !draft_) return set_error({QStringLiteral("batch"), tr("no batch is open: mark a buffer as prepared first")}), false;
    draft_ = next; // the screen keeps what was typed, even when the core refuses it
    FieldError e = evaluate(next);
    if (!e.empty()) {
        set_error(e);
        emit batchChanged();
        return false;
    }
    bool changed = false;
    e = guarded([&] { changed = st->edit(next.id, next, who()); });
    if (!e.empty()) {
        // A printed batch: the store refuses a plain edit. Keep it pending for an amendment and
        // show the store's message where the change was made.
        pending_ = stored_ && stored_->printed() && e.field == QLatin1String("batch");
        set_error({pending_ ? field : e.field, e.message});
        emit batchChanged();
        return false;
    }
    if (changed) reload(next.id);
    set_error({});
    emit batchChanged();
    return true;
}

void BatchModel::setPreparedBy(const QString& v) {
    if (!draft_ || draft_->prepared_by == v.trimmed()) return;
    auto next = *draft_;
    next.prepared_by = v.trimmed();
    apply(QStringLiteral("batch.prepared_by"), next);
}

void BatchModel::setPreparedAt(const QString& v) {
    if (!draft_ || draft_->prepared_at == v.trimmed()) return;
    auto next = *draft_;
    next.prepared_at = v.trimmed();
    apply(QStringLiteral("batch.prepared_at"), next);
}

void BatchModel::setExpiresAt(const QString& v) {
    if (!draft_ || draft_->expires_at == v.trimmed()) return;
    auto next = *draft_;
    next.expires_at = v.trimmed();
    apply(QStringLiteral("batch.expires_at"), next);
}

void BatchModel::setCheckedBy(const QString& v) {
    if (!draft_ || draft_->checked_by == v.trimmed()) return;
    auto next = *draft_;
    next.checked_by = v.trimmed();
    apply(QStringLiteral("batch.checked_by"), next);
}

void BatchModel::setTolerancePercent(double v) {
    if (!draft_ || draft_->tolerance_percent == v) return;
    auto next = *draft_;
    next.tolerance_percent = v;
    apply(QStringLiteral("batch.tolerance_percent"), next);
}

bool BatchModel::setActual(int row, double amount) {
    if (!draft_ || row < 0 || row >= int(rows_.size())) return false;
    const Row& r = rows_[size_t(row)];
    auto next = *draft_;
    const QString key = r.unit == QLatin1String("g") ? QStringLiteral("mass_g") : QStringLiteral("volume_ml");
    int i = actual_index(r.reagent);
    if (std::isnan(amount)) {
        if (i < 0) return true;
        next.actual.removeAt(i);
    } else {
        QJsonObject entry{{"reagent", r.reagent}, {key, amount}};
        const QString lot = lots_.count(r.reagent) ? lots_[r.reagent] : QString();
        if (!lot.isEmpty()) entry["lot"] = lot;
        if (i < 0) {
            i = int(next.actual.size());
            next.actual.append(entry);
        } else {
            next.actual[i] = entry;
        }
    }
    const QString field = QStringLiteral("batch.actual[%1].%2").arg(i).arg(key);
    return apply(field, next);
}

bool BatchModel::setLot(int row, const QString& lot_in) {
    if (!draft_ || row < 0 || row >= int(rows_.size())) return false;
    const QString lot = lot_in.trimmed();
    const QString reagent = rows_[size_t(row)].reagent;
    lots_[reagent] = lot;
    const int i = actual_index(reagent);
    if (i < 0) { // no amount yet: the lot waits on the screen until one is entered
        emit dataChanged(index(row), index(row), {LotRole});
        return true;
    }
    auto next = *draft_;
    QJsonObject entry = next.actual[i].toObject();
    if (entry.value("lot").toString() == lot) return true;
    if (lot.isEmpty()) entry.remove("lot");
    else entry["lot"] = lot;
    next.actual[i] = entry;
    return apply(QStringLiteral("batch.actual[%1].lot").arg(i), next);
}

bool BatchModel::amend() {
    auto st = store();
    if (!st || !draft_ || !pending_) return false;
    FieldError e = evaluate(*draft_);
    if (e.empty()) e = guarded([&] { st->amend(draft_->id, *draft_, who(), amend_reason_.trimmed()); });
    if (!e.empty()) return set_error(e), false;
    pending_ = false;
    setAmendReason({});
    reload(draft_->id);
    set_error({});
    emit batchChanged();
    return true;
}

void BatchModel::discardPending() {
    if (!draft_) return;
    const QString id = draft_->id;
    open(id);
}

QString BatchModel::defaultPath(const QString& what) const {
    const QString name = printer_->suggestedFileName(input(), what);
    return QDir(output_dir_.isEmpty() ? QDir::currentPath() : output_dir_).filePath(name);
}

bool BatchModel::ready_to_print() {
    if (!draft_) return set_error({QStringLiteral("batch"), tr("no batch is open: mark a buffer as prepared first")}), false;
    if (pending_)
        return set_error({QStringLiteral("reason"),
                          tr("record the change as an amendment (with a reason) or discard it before printing: "
                             "the printed batch must match its record")}),
               false;
    return true;
}

bool BatchModel::after_print(bool ok, const QString& what) {
    if (!ok) {
        set_error({printer_->lastErrorField(), printer_->lastError()});
        return false;
    }
    auto st = store();
    FieldError e = guarded([&] {
        if (st) st->mark_printed(draft_->id, who(), what);
    });
    reload(draft_->id);
    set_error(e);
    emit batchChanged();
    return e.empty();
}

bool BatchModel::saveSheet(const QString& path_in, const QString& paper) {
    if (!ready_to_print()) return false;
    const QString path = path_in.isEmpty() ? defaultPath(QStringLiteral("sheet")) : path_in;
    QDir().mkpath(QFileInfo(path).absolutePath());
    const bool ok = printer_->saveSheet(input(), path, paper);
    if (ok) {
        last_saved_path_ = path;
        emit lastSavedPathChanged();
    }
    return after_print(ok, QStringLiteral("sheet %1 pdf").arg(paper));
}

bool BatchModel::saveLabels(const QString& path_in, const QString& paper) {
    if (!ready_to_print()) return false;
    const QString path = path_in.isEmpty() ? defaultPath(QStringLiteral("labels")) : path_in;
    QDir().mkpath(QFileInfo(path).absolutePath());
    const bool ok = printer_->saveLabels(input(), path, paper);
    if (ok) {
        last_saved_path_ = path;
        emit lastSavedPathChanged();
    }
    return after_print(ok, QStringLiteral("labels %1 pdf").arg(paper));
}

bool BatchModel::printSheet(const QString& printer, const QString& paper) {
    if (!ready_to_print()) return false;
    return after_print(printer_->printSheet(input(), printer, paper), QStringLiteral("sheet %1 printer").arg(paper));
}

bool BatchModel::printLabels(const QString& printer, const QString& paper) {
    if (!ready_to_print()) return false;
    return after_print(printer_->printLabels(input(), printer, paper), QStringLiteral("labels %1 printer").arg(paper));
}

QVariantMap BatchModel::input() const { return draft_ ? draft_->to_input().toVariantMap() : QVariantMap{}; }

QStringList BatchModel::batchIds() const {
    auto st = store();
    if (!st) return {};
    QStringList ids;
    guarded([&] { ids = st->list(); });
    return ids;
}

QStringList BatchModel::printers() const { return printer_->printers(); }

int BatchModel::flaggedCount() const {
    int n = 0;
    for (const Row& r : rows_) n += r.entered && !r.within;
    return n;
}

int BatchModel::missingCount() const {
    int n = 0;
    for (const Row& r : rows_) n += !r.entered;
    return n;
}

int BatchModel::rowCount(const QModelIndex& parent) const { return parent.isValid() ? 0 : int(rows_.size()); }

QVariant BatchModel::data(const QModelIndex& idx, int role) const {
    if (!idx.isValid() || idx.row() >= int(rows_.size())) return {};
    const Row& r = rows_[size_t(idx.row())];
    switch (role) {
    case Qt::DisplayRole:
    case NameRole: return r.name;
    case ReagentRole: return r.reagent;
    case UnitRole: return r.unit;
    case TargetRole: return r.target;
    case LowRole: return r.low;
    case HighRole: return r.high;
    case EnteredRole: return r.entered;
    case ActualRole: return r.actual;
    case DeviationPercentRole: return r.deviation_percent;
    case WithinToleranceRole: return r.within;
    case LotRole: {
        auto it = lots_.find(r.reagent);
        return it == lots_.end() ? QString() : it->second;
    }
    case ErrorRole: {
        static const QRegularExpression re(QStringLiteral("^batch\\.actual\\[(\\d+)\\]"));
        const auto m = re.match(error_.field);
        if (!m.hasMatch() || !draft_) return QString();
        const int i = m.captured(1).toInt();
        if (i < draft_->actual.size() && draft_->actual[i].toObject().value("reagent").toString() == r.reagent)
            return error_.message;
        return QString();
    }
    default: return {};
    }
}

QHash<int, QByteArray> BatchModel::roleNames() const {
    return {{ReagentRole, "reagent"},
            {NameRole, "name"},
            {UnitRole, "unit"},
            {TargetRole, "target"},
            {LowRole, "low"},
            {HighRole, "high"},
            {EnteredRole, "entered"},
            {ActualRole, "actual"},
            {DeviationPercentRole, "deviationPercent"},
            {WithinToleranceRole, "withinTolerance"},
            {LotRole, "lot"},
            {ErrorRole, "error"}};
}

} // namespace phaseplan::gui

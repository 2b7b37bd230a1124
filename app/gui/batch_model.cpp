#include "batch_model.h"

#include "chem/error.h"
#include "core/batch_document.h"
#include "core/date_time.h"
#include "number_text.h"
#include "storage/accounts.h"
#include "storage/audit_trail.h"
#include "storage/lot_store.h"
#include "storage/release.h"
#include "storage/signatures.h"
#include "storage/sql_dialect.h"
#include "workspace.h"

#include <QDateTime>
#include <QDir>
#include <QFileInfo>
#include <QJsonArray>
#include <QSettings>
#include <QStandardPaths>
#include <QUrl>

#include <cmath>
#include <limits>

namespace phaseplan::gui {

namespace {

QString now_local() {
    return wall_clock_iso(QDateTime::currentDateTime());
}

QVariant json_to_variant(const QJsonValue& v) {
    return v.isNull() || v.isUndefined() ? QVariant() : v.toVariant();
}

const QString pdf_folder_key = QStringLiteral("batch/pdfFolder");

/// The message beside a captured field changed without a reason.
QString by_hand_message(const QJsonObject& capture) {
    return QObject::tr(
               "was taken %1: give a reason to change it by hand (it is then recorded as typed)")
        .arg(capture_source_text(capture));
}

/// About four significant figures, as the sheet prints amounts.
QString amount_words(double v) {
    if (v == 0)
        return QStringLiteral("0");
    const double a = std::abs(v);
    return QString::number(v, 'f', a >= 100 ? 1 : a >= 10 ? 2 : a >= 1 ? 3 : 4);
}

/// "sheet a4 pdf" → "Sheet saved as PDF (A4)"; "labels label62 printer" → "Labels printed (62 mm
/// label)".
QString print_words(const QString& what) {
    const QStringList w = what.split(' ');
    if (w.size() != 3)
        return QObject::tr("Printed: %1").arg(what);
    const QString doc =
        w[0] == QLatin1String("labels") ? QObject::tr("Labels") : QObject::tr("Sheet");
    const QString paper = w[1] == QLatin1String("label62")  ? QObject::tr("62 mm label")
                          : w[1] == QLatin1String("letter") ? QObject::tr("US Letter")
                                                            : w[1].toUpper();
    return w[2] == QLatin1String("pdf") ? QObject::tr("%1 saved as PDF (%2)").arg(doc, paper)
                                        : QObject::tr("%1 printed (%2)").arg(doc, paper);
}

QString local_path(const QString& path_or_url) {
    if (path_or_url.startsWith(QStringLiteral("file:")))
        return QUrl(path_or_url).toLocalFile();
    return path_or_url;
}

} // namespace

BatchModel::BatchModel(QObject* parent) : QAbstractListModel(parent) {
    const QString kept = QSettings().value(pdf_folder_key).toString();
    output_dir_ = !kept.isEmpty() && QFileInfo(kept).isDir()
                      ? kept
                      : QStandardPaths::writableLocation(QStandardPaths::DocumentsLocation);
}

BatchModel::~BatchModel() = default;

void BatchModel::setWorkspace(Workspace* w) {
    if (workspace_ == w)
        return;
    if (workspace_)
        disconnect(workspace_, nullptr, this, nullptr);
    workspace_ = w;
    if (w) {
        connect(w, &Workspace::readyChanged, this, [this] { emit batchListChanged(); });
        connect(w, &Workspace::databaseChanged, this, &BatchModel::refreshFromDatabase);
    }
    emit workspaceChanged();
    emit batchListChanged();
}

void BatchModel::setPreparer(const QString& p) {
    if (preparer_ == p)
        return;
    preparer_ = p;
    emit preparerChanged();
}

void BatchModel::setIdPrefix(const QString& p) {
    if (id_prefix_ == p)
        return;
    id_prefix_ = p;
    emit preparerChanged();
}

void BatchModel::setOutputDir(const QString& d_in) {
    const QString d = local_path(d_in);
    if (output_dir_ == d)
        return;
    output_dir_ = d;
    if (!d.isEmpty())
        QSettings().setValue(pdf_folder_key, d);
    emit outputDirChanged();
}

void BatchModel::setOutput(QObject* o) {
    if (output_object_ == o)
        return;
    output_object_ = o;
    emit outputChanged();
}

DocumentOutput* BatchModel::output_iface() const {
    return output_object_ ? qobject_cast<DocumentOutput*>(output_object_.data()) : nullptr;
}

void BatchModel::setAmendReason(const QString& r) {
    if (amend_reason_ == r)
        return;
    amend_reason_ = r;
    emit amendReasonChanged();
}

std::unique_ptr<storage::BatchStore> BatchModel::store() const {
    if (!workspace_ || !workspace_->database())
        return nullptr;
    return std::make_unique<storage::BatchStore>(workspace_->database()->connection());
}

void BatchModel::setSignedInLogin(const QString& login) {
    if (signed_in_login_ == login)
        return;
    signed_in_login_ = login;
    emit preparerChanged();
}

void BatchModel::setSignInRequired(bool on) {
    if (sign_in_required_ == on)
        return;
    sign_in_required_ = on;
    emit preparerChanged();
}

FieldError BatchModel::session_gate() const {
    if (sign_in_required_ && signed_in_login_.isEmpty())
        return {QStringLiteral("session"),
                tr("sign in first: the lab's record notes who made every change")};
    return {};
}

QString BatchModel::who() const {
    if (!signed_in_login_.isEmpty())
        return signed_in_login_;
    if (!preparer_.trimmed().isEmpty())
        return preparer_.trimmed();
    return draft_ ? draft_->prepared_by : QString();
}

void BatchModel::set_error(const FieldError& e) {
    if (e.is_failure() && workspace_)
        workspace_->failureSeen(e.field);
    if (error_ == e)
        return;
    error_ = e;
    emit errorChanged();
    if (!rows_.empty())
        emit dataChanged(index(0), index(int(rows_.size()) - 1), {ErrorRole, LotErrorRole});
}

int BatchModel::actual_index(const QString& reagent) const {
    if (!draft_)
        return -1;
    for (int i = 0; i < draft_->actual.size(); ++i)
        if (draft_->actual[i].toObject().value("reagent").toString() == reagent)
            return i;
    return -1;
}

FieldError BatchModel::evaluate(const storage::BatchRecord& rec) {
    if (!workspace_ || !workspace_->ready())
        return {QStringLiteral("database"), tr("no database is open")};
    BatchDocument doc;
    const FieldError e =
        guarded([&] { doc = read_batch_document(workspace_->data(), rec.to_input()); });
    if (!e.empty()) {
        valid_ = false;
        emit resultChanged();
        return e;
    }
    // The typed evaluation, field by field (the sheet's summary JSON is rendered from it).
    const BatchEvaluation& ev = doc.evaluation;
    use_by_at_ = doc.expires_at;
    use_by_limit_ = expiry_limit_text(workspace_->data(), doc);
    lot_overrides_ = doc.lot_override_text;
    out_of_tolerance_ = doc.out_of_tolerance;
    reasons_ = out_of_tolerance_texts(workspace_->data(), doc);
    correction_ = doc.correction_text;
    correction_remake_ = doc.correction && doc.correction->remake;
    steps_.clear();
    // The sheet's sentences, with the locale's decimal mark as the amounts beside them.
    for (const StepSection& sec : doc.steps) {
        QStringList shown;
        for (const QString& s : sec.steps)
            shown << with_locale_marks(s);
        steps_.append(QVariantMap{{"heading", sec.heading}, {"steps", shown}});
    }
    std::vector<Row> rows;
    rows.reserve(ev.checks.size());
    for (const BatchCheckRow& c : ev.checks) {
        Row r;
        r.reagent = QString::fromStdString(c.check.reagent);
        r.name = c.name;
        r.unit = QString::fromStdString(c.check.unit);
        r.target = c.check.target;
        r.low = c.check.low;
        r.high = c.check.high;
        r.entered = c.check.entered;
        r.actual = r.entered ? c.check.actual : std::numeric_limits<double>::quiet_NaN();
        r.deviation_percent = r.entered ? c.check.deviation_fraction * 100 : 0.0;
        r.within = c.check.within_tolerance;
        rows.push_back(r);
    }
    // The same reagents: update in place, so a field being typed in keeps its focus.
    bool same = rows.size() == rows_.size();
    for (size_t k = 0; same && k < rows.size(); ++k)
        same = rows[k].reagent == rows_[k].reagent;
    if (same) {
        rows_ = std::move(rows);
        if (!rows_.empty())
            emit dataChanged(index(0), index(int(rows_.size()) - 1));
    } else {
        beginResetModel();
        rows_ = std::move(rows);
        endResetModel();
    }
    valid_ = true;
    title_ = doc.title;
    shelf_life_h_ = ev.shelf_life_h;
    constexpr double none = std::numeric_limits<double>::quiet_NaN();
    target_ph_ = ev.target_ph.value_or(none);
    predicted_ph_ = ev.ph.value_or(none);
    ionic_strength_mmol_per_l_ = ev.ionic_strength_mol_per_l.value_or(none) * 1000;
    buffer_capacity_mmol_per_l_ = ev.buffer_capacity_mol_per_l.value_or(none) * 1000;
    composition_.clear();
    // A recipe's composition as made (a line's buffer part is not listed, as before).
    if (!ev.composition_of_buffer)
        for (const BatchEvaluation::Component& c : ev.composition) {
            const QString reagent = QString::fromStdString(c.reagent);
            composition_.append(QVariantMap{{"reagent", reagent},
                                            {"name", workspace_->displayName(reagent)},
                                            {"mmolPerL", c.mol_per_l * 1000}});
        }
    warnings_.clear();
    for (const BatchWarning& w : ev.warnings)
        warnings_.append(
            QVariantMap{{"code", w.code}, {"severity", w.severity}, {"message", w.message}});
    emit resultChanged();
    return {};
}

void BatchModel::reload(const QString& id) {
    auto st = store();
    if (!st)
        return;
    stored_ = st->load(id);
    history_.clear();
    signatures_.clear();
    release_ = {};
    if (stored_ && storage::has_audit_schema(workspace_->database()->connection())) {
        const QSqlDatabase c = workspace_->database()->connection();
        const std::vector<storage::Signature> stored_signatures =
            storage::SignatureStore(c).list(id);
        release_ = storage::release_of(stored_signatures);
        for (const storage::Signature& s : stored_signatures)
            signatures_.append(QVariantMap{{"meaning", s.meaning},
                                           {"name", s.display_name},
                                           {"login", s.login},
                                           {"signedAt", s.signed_at},
                                           {"holds", s.holds},
                                           {"words", storage::SignatureStore::manifestation(s)}});
    }
    if (stored_) {
        for (const auto& h : st->history(id))
            history_.append(QVariantMap{
                {"seq", h.seq},
                {"revision", h.revision},
                {"at", h.at},
                {"who", h.who},
                {"action", h.action},
                {"field", h.field},
                {"oldValue", json_to_variant(h.old_value)},
                {"newValue", json_to_variant(h.new_value)},
                {"reason", h.reason},
                {"label", history_label(h.field)},
                {"text", h.action == QLatin1String("print")
                             ? print_words(h.new_value.toString().section(": ", 1))
                             : tr("%1: %2 → %3")
                                   .arg(history_label(h.field), history_value(h.field, h.old_value),
                                        history_value(h.field, h.new_value))}});
    }
}

void BatchModel::reload_saved(const QString& id) {
    reload(id);
    if (draft_ && stored_ && draft_->id == stored_->id) {
        draft_->version = stored_->version;
        draft_->changed_by = stored_->changed_by;
        draft_->changed_at = stored_->changed_at;
        draft_->revision = stored_->revision;
        draft_->printed_count = stored_->printed_count;
    }
    set_conflict({}, {});
}

void BatchModel::set_conflict(const QString& conflict, const QString& notice) {
    if (conflict_ == conflict && remote_notice_ == notice)
        return;
    conflict_ = conflict;
    remote_notice_ = notice;
    emit conflictChanged();
}

bool BatchModel::take_conflict(const FieldError& e) {
    if (e.field != QLatin1String("version"))
        return false;
    // The refused edits stay in draft_ (on screen); nothing was written.
    set_conflict(e.message, {});
    set_error({});
    emit batchChanged();
    return true;
}

bool BatchModel::reloadTheirs() {
    if (!draft_)
        return false;
    const QString id = draft_->id;
    set_conflict({}, {});
    return open(id);
}

bool BatchModel::saveAsCopy() {
    if (const FieldError g = session_gate(); !g.empty())
        return set_error(g), false;
    auto st = store();
    if (!st || !draft_)
        return false;
    QString copy_id;
    const FieldError e = guarded(
        [&] { copy_id = st->create_copy(*draft_, who(), id_prefix_, QDate::currentDate()); });
    if (!e.empty())
        return set_error(e), false;
    set_conflict({}, {});
    emit batchListChanged();
    return open(copy_id);
}

void BatchModel::refreshFromDatabase() {
    emit batchListChanged();
    auto st = store();
    if (!st || !stored_)
        return;
    std::optional<storage::BatchRecord> now;
    if (!guarded([&] { now = st->load(stored_->id); }).empty() || !now)
        return;
    if (now->version == stored_->version) {
        // A signature given on another bench changes no version: show it.
        const QVariantList before = signatures_;
        reload(stored_->id);
        if (signatures_ != before)
            emit batchChanged();
        return;
    }
    const QString who_when =
        tr("by %1 at %2")
            .arg(storage::person_words(workspace_->database()->connection(), now->changed_by),
                 storage::utc_time_words(now->changed_at));
    if (!conflict_.isEmpty())
        return; // the refusal on screen already names who changed it: nothing to add
    if (pending_) {
        // Unsaved edits here: never overwritten; the next save is refused and offers the choice.
        set_conflict({}, tr("Changed on another bench %1. Your changes here are not saved "
                            "yet: saving them will offer to reload or to save a copy.")
                             .arg(who_when));
        return;
    }
    open(stored_->id);
    set_conflict({}, tr("Changed on another bench %1; shown as saved there.").arg(who_when));
}

bool BatchModel::markPrepared(const QVariantMap& document) {
    if (const FieldError g = session_gate(); !g.empty())
        return set_error(g), false;
    auto st = store();
    if (!st)
        return set_error({QStringLiteral("database"), tr("no database is open")}), false;
    const QString person = preparer_.trimmed();
    if (person.isEmpty())
        return set_error({QStringLiteral("batch.prepared_by"), tr("enter who prepares the batch")}),
               false;

    storage::BatchRecord rec;
    FieldError e = guarded([&] {
        QJsonObject doc = QJsonObject::fromVariantMap(document);
        doc.remove(QStringLiteral("batch"));
        doc.insert(QStringLiteral("batch"), QJsonObject{{"id", QStringLiteral("pending")}});
        rec = storage::BatchRecord::from_input(doc);
    });
    if (!e.empty())
        return set_error(e), false;
    rec.prepared_by = person;
    rec.prepared_at = now_local();
    e = guarded([&] { rec.id = st->propose_id(id_prefix_, QDate::currentDate()); });
    if (!e.empty())
        return set_error(e), false;
    // The expiry from the shelf-life default, written into the batch so it shows and can change.
    e = evaluate(rec);
    if (!e.empty())
        return set_error(e), false;
    e = guarded([&] {
        rec.expires_at = read_batch_document(workspace_->data(), rec.to_input()).expires_at;
        st->create(rec, who());
    });
    if (!e.empty())
        return set_error(e), false;
    draft_ = rec;
    lots_.clear();
    read_shelf();
    pending_ = false;
    reload_saved(rec.id);
    set_error({});
    emit batchChanged();
    emit batchListChanged();
    return true;
}

bool BatchModel::open(const QString& id) {
    auto st = store();
    if (!st)
        return set_error({QStringLiteral("database"), tr("no database is open")}), false;
    std::optional<storage::BatchRecord> rec;
    FieldError e = guarded([&] { rec = st->load(id); });
    if (!e.empty())
        return set_error(e), false;
    if (!rec)
        return set_error(
                   {QStringLiteral("batch.id"), tr("no batch \"%1\" in this database").arg(id)}),
               false;
    draft_ = rec;
    lots_.clear();
    for (const QJsonValue& v : rec->actual)
        lots_[v.toObject().value("reagent").toString()] = v.toObject().value("lot").toString();
    read_shelf();
    pending_ = false;
    reload(id);
    set_conflict({}, {});
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
    set_conflict({}, {});
    valid_ = false;
    out_of_tolerance_ = correction_remake_ = false;
    reasons_.clear();
    correction_.clear();
    steps_.clear();
    history_.clear();
    set_error({});
    emit batchChanged();
    emit resultChanged();
}

bool BatchModel::apply(const QString& field, const storage::BatchRecord& next) {
    if (const FieldError g = session_gate(); !g.empty())
        return set_error(g), false;
    auto st = store();
    if (!st || !draft_)
        return set_error({QStringLiteral("batch"),
                          tr("no batch is open: mark a buffer as prepared first")}),
               false;
    storage::BatchRecord resolved = next;
    if (const FieldError r = resolve_lots(resolved); !r.empty()) {
        draft_ = next; // the screen keeps what was picked, with the refusal beside it
        set_error(r);
        emit batchChanged();
        return false;
    }
    draft_ = resolved; // the screen keeps what was typed, even when the core refuses it
    FieldError e = evaluate(resolved);
    if (!e.empty()) {
        set_error(e);
        emit batchChanged();
        return false;
    }
    if (!conflict_.isEmpty()) {
        // Refused once already: keep collecting the edits on screen until Reload or a copy.
        emit batchChanged();
        return false;
    }
    bool changed = false;
    e = guarded([&] { changed = st->edit(resolved.id, resolved, who()); });
    if (take_conflict(e))
        return false;
    if (!e.empty()) {
        // A printed batch: the store refuses a plain edit. Keep it pending for an amendment and
        // show the store's message where the change was made.
        pending_ = stored_ && stored_->printed() && e.field == QLatin1String("batch");
        set_error({pending_ ? field : e.field, e.message});
        emit batchChanged();
        return false;
    }
    if (changed)
        reload_saved(resolved.id);
    set_error({});
    emit batchChanged();
    return true;
}

void BatchModel::read_shelf() {
    shelf_.clear();
    if (!workspace_ || !workspace_->database())
        return;
    const QSqlDatabase c = workspace_->database()->connection();
    if (!storage::sql::table_exists(c, QStringLiteral("reagent_lots")))
        return;
    guarded([&] {
        for (const storage::ReagentLot& l : storage::LotStore(c).list())
            shelf_[l.reagent].push_back(QVariantMap{{"id", l.lot},
                                                    {"expiresOn", l.expires_on},
                                                    {"openedOn", l.opened_on},
                                                    {"supplier", l.supplier}});
    });
    if (!rows_.empty()) // the rows' lot pickers read the shelf
        emit dataChanged(index(0), index(int(rows_.size()) - 1));
}

QVariantMap BatchModel::shelf_lot(const QString& reagent_in, const QString& lot) const {
    const QString reagent = reagent_in.startsWith("buffer.") ? reagent_in.mid(7) : reagent_in;
    const auto it = shelf_.find(reagent);
    if (it == shelf_.end())
        return {};
    for (const QVariantMap& m : it->second)
        if (m.value("id").toString() == lot)
            return m;
    return {};
}

FieldError BatchModel::resolve_lots(storage::BatchRecord& next) const {
    if (!workspace_ || !workspace_->database())
        return {};
    return guarded([&] {
        storage::resolve_batch_lots(workspace_->database()->connection(),
                                    stored_ ? &*stored_ : nullptr, next);
    });
}

bool BatchModel::overrideExpiredLot(int row, const QString& login, const QString& password,
                                    const QString& reason) {
    if (const FieldError g = session_gate(); !g.empty())
        return set_error(g), false;
    auto st = store();
    if (!st || !draft_ || row < 0 || row >= int(rows_.size()))
        return set_error({QStringLiteral("lot_override"),
                          tr("no batch is open: mark a buffer as prepared first")}),
               false;
    const QString reagent = rows_[size_t(row)].reagent;
    const QString lot = lots_.count(reagent) ? lots_.at(reagent) : QString();
    if (actual_index(reagent) < 0)
        return set_error({QStringLiteral("lot_override"),
                          tr("enter the amount of %1 first: the override is recorded with it")
                              .arg(rows_[size_t(row)].name)}),
               false;
    storage::BatchStore::LotOverrideRequest request{reagent, lot, login.trimmed(), password,
                                                    reason};
    const QString id = draft_->id;
    const storage::BatchRecord next = *draft_;
    FieldError e = guarded([&] { st->override_expired_lot(id, next, who(), request); });
    if (e.field == QLatin1String("login") || e.field == QLatin1String("password"))
        e.field = "lot_override." + e.field; // shown on the override form, not the signature's
    if (!e.empty()) {
        reload(id); // a wrong password is counted; the batch is as it was
        emit batchChanged();
        return set_error(e), false;
    }
    reload(id);
    if (stored_)
        draft_ = stored_;
    pending_ = false;
    set_error(evaluate(*draft_));
    emit batchChanged();
    return true;
}

void BatchModel::setPreparedBy(const QString& v) {
    if (!draft_ || draft_->prepared_by == v.trimmed())
        return;
    auto next = *draft_;
    next.prepared_by = v.trimmed();
    apply(QStringLiteral("batch.prepared_by"), next);
}

void BatchModel::setPreparedAt(const QString& v) {
    if (!draft_ || draft_->prepared_at == v.trimmed())
        return;
    auto next = *draft_;
    next.prepared_at = v.trimmed();
    apply(QStringLiteral("batch.prepared_at"), next);
}

void BatchModel::setExpiresAt(const QString& v) {
    if (!draft_ || draft_->expires_at == v.trimmed())
        return;
    auto next = *draft_;
    next.expires_at = v.trimmed();
    apply(QStringLiteral("batch.expires_at"), next);
}

void BatchModel::setCheckedBy(const QString& v) {
    if (!draft_ || draft_->checked_by == v.trimmed())
        return;
    if (sign_in_required_) {
        // With accounts the second person is the review signature (reviewedBy), never typed.
        set_error({QStringLiteral("batch.checked_by"),
                   tr("Checked by is the person who signs the batch as reviewed; it is not typed "
                      "here")});
        return;
    }
    auto next = *draft_;
    next.checked_by = v.trimmed();
    apply(QStringLiteral("batch.checked_by"), next);
}

void BatchModel::setTolerancePercent(double v) {
    if (!draft_ || draft_->tolerance_percent == v)
        return;
    auto next = *draft_;
    next.tolerance_percent = v;
    apply(QStringLiteral("batch.tolerance_percent"), next);
}

double BatchModel::measuredPh() const {
    return draft_ && draft_->measured_ph ? *draft_->measured_ph
                                         : std::numeric_limits<double>::quiet_NaN();
}

void BatchModel::setMeasuredPh(double v) {
    if (!draft_)
        return;
    const std::optional<double> next_v = std::isnan(v) ? std::nullopt : std::optional<double>(v);
    if (draft_->measured_ph == next_v)
        return;
    if (!draft_->ph_capture.isEmpty()) {
        set_error({QStringLiteral("batch.measured_ph"), by_hand_message(draft_->ph_capture)});
        emit batchChanged(); // the field shows the captured value again
        return;
    }
    auto next = *draft_;
    next.measured_ph = next_v;
    apply(QStringLiteral("batch.measured_ph"), next);
}

void BatchModel::setPhTolerance(double v) {
    if (!draft_ || draft_->ph_tolerance == v)
        return;
    auto next = *draft_;
    next.ph_tolerance = v;
    apply(QStringLiteral("batch.ph_tolerance"), next);
}

void BatchModel::setPhMeterId(const QString& v) {
    if (!draft_ || draft_->ph_meter_id == v.trimmed())
        return;
    auto next = *draft_;
    next.ph_meter_id = v.trimmed();
    apply(QStringLiteral("batch.ph_meter_id"), next);
}

void BatchModel::setBalanceId(const QString& v) {
    if (!draft_ || draft_->balance_id == v.trimmed())
        return;
    auto next = *draft_;
    next.balance_id = v.trimmed();
    apply(QStringLiteral("batch.balance_id"), next);
}

void BatchModel::setComment(const QString& v) {
    if (!draft_ || draft_->comment == v.trimmed())
        return;
    auto next = *draft_;
    next.comment = v.trimmed();
    apply(QStringLiteral("batch.comment"), next);
}

double BatchModel::containerMl() const {
    return draft_ && draft_->container_ml ? *draft_->container_ml
                                          : std::numeric_limits<double>::quiet_NaN();
}

void BatchModel::setContainerMl(double v) {
    if (!draft_)
        return;
    const std::optional<double> next_v = std::isnan(v) ? std::nullopt : std::optional<double>(v);
    if (draft_->container_ml == next_v)
        return;
    auto next = *draft_;
    next.container_ml = next_v;
    apply(QStringLiteral("batch.container_ml"), next);
}

bool BatchModel::recordDeviation(const QString& note_in) {
    if (!draft_)
        return set_error({QStringLiteral("batch"),
                          tr("no batch is open: mark a buffer as prepared first")}),
               false;
    const QString note = note_in.trimmed();
    if (note.isEmpty())
        return set_error({QStringLiteral("batch.deviation.note"),
                          tr("write why the batch is used although it is out of tolerance")}),
               false;
    auto next = *draft_;
    next.deviation_note = note;
    next.deviation_by = who();
    next.deviation_at = now_local();
    return apply(QStringLiteral("batch.deviation.note"), next);
}

QString BatchModel::history_label(const QString& field) const {
    if (const auto a = chem::subscript_of(field.toStdString(), "actual");
        a && !a->subscript.empty() &&
        (a->rest == "mass_g" || a->rest == "volume_ml" || a->rest == "lot" ||
         a->rest == "capture" || a->rest == "lot_expires_on" || a->rest == "lot_override")) {
        const QString name = workspace_ ? part_display_name(workspace_->data(), a->subscript)
                                        : QString::fromStdString(a->subscript);
        if (a->rest == "capture")
            return tr("Source of the actual amount of %1").arg(name);
        if (a->rest == "lot_expires_on")
            return tr("Expiry of the lot of %1").arg(name);
        if (a->rest == "lot_override")
            return tr("Override of the expired lot of %1").arg(name);
        return a->rest == "lot" ? tr("Lot of %1").arg(name) : tr("Actual amount of %1").arg(name);
    }
    static const std::map<QString, const char*> labels = {
        {"document_kind", QT_TR_NOOP("Kind of document")},
        {"document", QT_TR_NOOP("Recipe")},
        {"prepared_by", QT_TR_NOOP("Prepared by")},
        {"prepared_at", QT_TR_NOOP("Prepared at")},
        {"expires_at", QT_TR_NOOP("Expires at")},
        {"checked_by", QT_TR_NOOP("Checked by")},
        {"tolerance_percent", QT_TR_NOOP("Tolerance of each amount")},
        {"measured_ph", QT_TR_NOOP("Measured pH")},
        {"measured_ph_capture", QT_TR_NOOP("Source of the measured pH")},
        {"ph_tolerance", QT_TR_NOOP("pH tolerance")},
        {"ph_meter_id", QT_TR_NOOP("pH meter")},
        {"balance_id", QT_TR_NOOP("Balance")},
        {"comment", QT_TR_NOOP("Comment")},
        {"container_ml", QT_TR_NOOP("Container holds")},
        {"deviation.note", QT_TR_NOOP("Deviation note")},
        {"deviation.by", QT_TR_NOOP("Deviation recorded by")},
        {"deviation.at", QT_TR_NOOP("Deviation recorded at")},
        {"printed_count", QT_TR_NOOP("Printed")},
    };
    const auto it = labels.find(field);
    return it != labels.end() ? tr(it->second) : field;
}

QString BatchModel::history_value(const QString& field, const QJsonValue& v) const {
    if (field.endsWith(QLatin1String("capture"))) {
        if (!v.isObject())
            return tr("typed");
        const QJsonObject c = v.toObject();
        QString text =
            capture_source_text(c) + tr(" (sent \"%1\" at %2)")
                                         .arg(c.value("raw").toString(),
                                              local_second_text(c.value("received_at").toString()));
        if (c.value("accepted_unstable").toBool())
            text += tr(", accepted while not settled");
        return text;
    }
    if (field.endsWith(QLatin1String(".lot_override")) && v.isObject()) {
        const QJsonObject o = v.toObject();
        return tr("accepted by %1 (%2) at %3: %4")
            .arg(o.value("name").toString(), o.value("by").toString(),
                 local_second_text(o.value("at").toString()), o.value("reason").toString());
    }
    if (v.isNull() || v.isUndefined())
        return QStringLiteral("–");
    if (field == QLatin1String("document"))
        return tr("the recipe as marked prepared");
    if (field.endsWith(QLatin1String(".mass_g")))
        return amount_words(v.toDouble()) + " g";
    if (field.endsWith(QLatin1String(".volume_ml")))
        return amount_words(v.toDouble()) + " mL";
    if (field == QLatin1String("tolerance_percent"))
        return "± " + QString::number(v.toDouble()) + " %";
    if (field == QLatin1String("ph_tolerance"))
        return "± " + QString::number(v.toDouble());
    if (field == QLatin1String("measured_ph"))
        return QString::number(v.toDouble(), 'f', 2);
    if (field == QLatin1String("container_ml"))
        return QString::number(v.toDouble()) + " mL";
    if (field.endsWith(QLatin1String("_at")) || field == QLatin1String("deviation.at"))
        return v.toString().left(16).replace('T', ' ');
    if (v.isDouble())
        return QString::number(v.toDouble());
    return v.toString();
}

QString BatchModel::measuredPhSource() const {
    if (!draft_ || !draft_->measured_ph)
        return {};
    return capture_source_text(draft_->ph_capture);
}

QJsonObject BatchModel::actual_entry(int row) const {
    if (!draft_ || row < 0 || row >= int(rows_.size()))
        return {};
    const int i = actual_index(rows_[size_t(row)].reagent);
    return i < 0 ? QJsonObject{} : draft_->actual[i].toObject();
}

bool BatchModel::apply_by_hand(const QString& field, const storage::BatchRecord& next,
                               const QString& reason) {
    if (const FieldError g = session_gate(); !g.empty())
        return set_error(g), false;
    auto st = store();
    if (!st || !draft_)
        return set_error({QStringLiteral("batch"),
                          tr("no batch is open: mark a buffer as prepared first")}),
               false;
    if (reason.trimmed().isEmpty())
        return set_error(
                   {field,
                    tr("give a reason for changing a value taken from an instrument by hand")}),
               false;
    FieldError e = evaluate(next);
    if (e.empty() && !conflict_.isEmpty())
        return draft_ = next, emit batchChanged(), false;
    if (e.empty())
        e = guarded([&] { st->amend(next.id, next, who(), reason.trimmed()); });
    if (e.field == QLatin1String("version")) {
        draft_ = next;
        return !take_conflict(e);
    }
    if (!e.empty()) {
        evaluate(*draft_);
        set_error({e.field == QLatin1String("reason") ? field : e.field, e.message});
        return false;
    }
    draft_ = next;
    pending_ = false;
    reload_saved(next.id);
    set_error({});
    emit batchChanged();
    return true;
}

bool BatchModel::applyCapture(const QVariantMap& c) {
    const QString target = c.value("target").toString();
    const QJsonObject record = QJsonObject::fromVariantMap(c.value("record").toMap());
    const QString kind = c.value("deviceKind").toString();
    const double value = c.value("value").toDouble();
    if (!draft_)
        return set_error({target, tr("no batch is open: mark a buffer as prepared first")}), false;
    if (target == QLatin1String("batch.measured_ph")) {
        if (kind != QLatin1String("ph_meter"))
            return set_error({target, tr("a pH is taken from a pH meter, not from %1")
                                          .arg(capture_source_text(record).mid(5))}),
                   false;
        auto next = *draft_;
        next.measured_ph = value;
        next.ph_capture = record;
        next.ph_meter_id = c.value("deviceId").toString();
        return apply(target, next);
    }
    const auto at = chem::subscript_of(target.toStdString(), "batch.actual");
    const int row = at && at->rest == "mass_g" ? at->index() : -1;
    if (row < 0 || row >= int(rows_.size()))
        return set_error({target, tr("no amount row for this reading")}), false;
    const Row& r = rows_[size_t(row)];
    if (r.unit != QLatin1String("g"))
        return set_error(
                   {target,
                    tr("%1 is measured by volume: take it from the balance only when it is weighed")
                        .arg(r.name)}),
               false;
    if (kind != QLatin1String("balance"))
        return set_error({target, tr("an amount is taken from a balance, not from %1")
                                      .arg(capture_source_text(record).mid(5))}),
               false;
    auto next = *draft_;
    QJsonObject entry{{"reagent", r.reagent}, {"mass_g", value}, {"capture", record}};
    const QString lot = lots_.count(r.reagent) ? lots_[r.reagent] : QString();
    if (!lot.isEmpty())
        entry["lot"] = lot;
    int i = actual_index(r.reagent);
    if (i < 0) {
        i = int(next.actual.size());
        next.actual.append(entry);
    } else {
        next.actual[i] = entry;
    }
    if (next.balance_id.isEmpty())
        next.balance_id = c.value("deviceId").toString();
    return apply(QStringLiteral("batch.actual[%1].mass_g").arg(i), next);
}

bool BatchModel::setActualByHand(int row, double amount, const QString& reason) {
    if (!draft_ || row < 0 || row >= int(rows_.size()))
        return false;
    const Row& r = rows_[size_t(row)];
    const int i = actual_index(r.reagent);
    const QString key =
        r.unit == QLatin1String("g") ? QStringLiteral("mass_g") : QStringLiteral("volume_ml");
    const QString field =
        QStringLiteral("batch.actual[%1].%2").arg(i < 0 ? int(draft_->actual.size()) : i).arg(key);
    if (i < 0 || !draft_->actual[i].toObject().contains("capture"))
        return setActual(row, amount);
    auto next = *draft_;
    if (std::isnan(amount)) {
        next.actual.removeAt(i);
    } else {
        QJsonObject entry = next.actual[i].toObject();
        entry.remove("capture");
        entry[key] = amount;
        next.actual[i] = entry;
    }
    return apply_by_hand(field, next, reason);
}

bool BatchModel::setMeasuredPhByHand(double v, const QString& reason) {
    if (!draft_)
        return false;
    if (draft_->ph_capture.isEmpty()) {
        setMeasuredPh(v);
        return error_.empty();
    }
    auto next = *draft_;
    next.measured_ph = std::isnan(v) ? std::nullopt : std::optional<double>(v);
    next.ph_capture = {};
    return apply_by_hand(QStringLiteral("batch.measured_ph"), next, reason);
}

bool BatchModel::setActual(int row, double amount) {
    if (!draft_ || row < 0 || row >= int(rows_.size()))
        return false;
    const Row& r = rows_[size_t(row)];
    auto next = *draft_;
    const QString key =
        r.unit == QLatin1String("g") ? QStringLiteral("mass_g") : QStringLiteral("volume_ml");
    int i = actual_index(r.reagent);
    if (i >= 0) {
        const QJsonObject cur = draft_->actual[i].toObject();
        const QJsonValue old = cur.value(key);
        const bool same = !std::isnan(amount) && old.isDouble() && old.toDouble() == amount;
        if (cur.contains("capture")) {
            if (same)
                return set_error({}), true;
            set_error({QStringLiteral("batch.actual[%1].%2").arg(i).arg(key),
                       by_hand_message(cur.value("capture").toObject())});
            emit dataChanged(index(row), index(row), {ActualRole});
            return false;
        }
    }
    if (std::isnan(amount)) {
        if (i < 0)
            return true;
        next.actual.removeAt(i);
    } else {
        QJsonObject entry{{"reagent", r.reagent}, {key, amount}};
        const QString lot = lots_.count(r.reagent) ? lots_[r.reagent] : QString();
        if (!lot.isEmpty())
            entry["lot"] = lot;
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
    if (!draft_ || row < 0 || row >= int(rows_.size()))
        return false;
    const QString lot = lot_in.trimmed();
    const QString reagent = rows_[size_t(row)].reagent;
    lots_[reagent] = lot;
    const QList<int> lot_roles = {LotRole, LotExpiresOnRole, LotExpiredRole, LotStatusRole};
    const int i = actual_index(reagent);
    if (i < 0) { // no amount yet: the lot waits on the screen until one is entered
        emit dataChanged(index(row), index(row), lot_roles);
        return true;
    }
    auto next = *draft_;
    QJsonObject entry = next.actual[i].toObject();
    if (entry.value("lot").toString() == lot)
        return true;
    if (lot.isEmpty())
        entry.remove("lot");
    else
        entry["lot"] = lot;
    next.actual[i] = entry;
    const bool ok = apply(QStringLiteral("batch.actual[%1].lot").arg(i), next);
    emit dataChanged(index(row), index(row), lot_roles);
    return ok;
}

bool BatchModel::amend() {
    if (const FieldError g = session_gate(); !g.empty())
        return set_error(g), false;
    auto st = store();
    if (!st || !draft_ || !pending_)
        return false;
    FieldError e = evaluate(*draft_);
    if (e.empty())
        e = guarded([&] { st->amend(draft_->id, *draft_, who(), amend_reason_.trimmed()); });
    if (take_conflict(e))
        return false;
    if (!e.empty())
        return set_error(e), false;
    pending_ = false;
    setAmendReason({});
    reload_saved(draft_->id);
    set_error({});
    emit batchChanged();
    return true;
}

void BatchModel::discardPending() {
    if (!draft_)
        return;
    const QString id = draft_->id;
    open(id);
}

QString BatchModel::defaultPath(const QString& what) const {
    DocumentOutput* out = output_iface();
    QString name = out ? out->fileNameFor(input(), what) : QString();
    if (name.isEmpty())
        name = (draft_ ? draft_->id : QStringLiteral("batch")) + "-" + what + ".pdf";
    return QDir(output_dir_.isEmpty() ? QDir::currentPath() : output_dir_).filePath(name);
}

bool BatchModel::ready_to_print() {
    if (const FieldError g = session_gate(); !g.empty())
        return set_error(g), false;
    if (!draft_)
        return set_error({QStringLiteral("batch"),
                          tr("no batch is open: mark a buffer as prepared first")}),
               false;
    if (!conflict_.isEmpty())
        return set_error({QStringLiteral("version"),
                          tr("reload the batch or save yours as a copy before printing")}),
               false;
    if (auto st = store(); st && stored_) {
        // The sheet must show the batch as stored: refuse when another bench saved it since.
        std::optional<storage::BatchRecord> now;
        guarded([&] { now = st->load(stored_->id); });
        if (now && now->version != stored_->version) {
            refreshFromDatabase();
            if (pending_)
                return set_error({QStringLiteral("reason"), remote_notice_}), false;
            return set_error({QStringLiteral("version"),
                              tr("the batch was just changed on another bench and is shown as "
                                 "saved there now: check it, then print again")}),
                   false;
        }
    }
    if (pending_)
        return set_error({QStringLiteral("reason"), tr("record the change as an amendment (with a "
                                                       "reason) or discard it before printing: "
                                                       "the printed batch must match its record")}),
               false;
    if (!valid_)
        return set_error(
                   {error_.field.isEmpty() ? QStringLiteral("batch") : error_.field,
                    tr("the batch has an invalid entry: correct it before printing") +
                        (error_.message.isEmpty() ? QString() : " (" + error_.message + ")")}),
               false;
    if (needsDeviationNote())
        return set_error({QStringLiteral("batch.deviation.note"),
                          tr("the batch is out of tolerance (%1): record a deviation note before "
                             "printing")
                              .arg(reasons_.join("; "))}),
               false;
    if (!output_iface())
        return set_error({QStringLiteral("output"),
                          tr("no printer or PDF writer is connected to this screen")}),
               false;
    return true;
}

bool BatchModel::after_print(bool ok, const QString& what) {
    if (!ok) {
        DocumentOutput* out = output_iface();
        QString field = out ? out->outputErrorField() : QStringLiteral("output");
        QString message = out ? out->outputError() : tr("no output");
        if (message.startsWith(field + ": "))
            message = message.mid(field.size() + 2);
        if (field == QLatin1String("-o"))
            field = QStringLiteral("path");
        set_error({field.isEmpty() ? QStringLiteral("output") : field, message});
        return false;
    }
    auto st = store();
    FieldError e = guarded([&] {
        if (st)
            st->mark_printed(draft_->id, who(), what, stored_ ? stored_->version : 0);
    });
    if (e.empty())
        reload_saved(draft_->id);
    else
        reload(draft_->id);
    set_error(e);
    emit batchChanged();
    return e.empty();
}

bool BatchModel::save_pdf(const QString& what, const QString& path_in, const QString& paper) {
    if (!ready_to_print())
        return false;
    const QString path = path_in.isEmpty() ? defaultPath(what) : local_path(path_in);
    const QFileInfo info(path);
    if (!QDir().mkpath(info.absolutePath())) {
        // Say why: a file stands where a folder is needed, or the folder cannot be created here.
        QString blocking = info.absolutePath();
        while (!blocking.isEmpty() && !QFileInfo::exists(blocking))
            blocking = QFileInfo(blocking).absolutePath();
        const QString why = QFileInfo(blocking).isFile()
                                ? tr("%1 is a file, not a folder").arg(blocking)
                                : tr("no permission to create folders in %1").arg(blocking);
        return set_error({QStringLiteral("path"),
                          tr("cannot save in %1: %2").arg(info.absolutePath(), why)}),
               false;
    }
    const bool ok = output_iface()->writePdf(what, input(), release_, path, paper);
    if (ok) {
        last_saved_path_ = path;
        emit lastSavedPathChanged();
        if (!path_in.isEmpty())
            setOutputDir(info.absolutePath());
    }
    return after_print(ok, QStringLiteral("%1 %2 pdf").arg(what, paper));
}

bool BatchModel::saveSheet(const QString& path, const QString& paper) {
    return save_pdf(QStringLiteral("sheet"), path, paper);
}

bool BatchModel::saveLabels(const QString& path, const QString& paper) {
    return save_pdf(QStringLiteral("labels"), path, paper);
}

bool BatchModel::printSheet(const QString& printer, const QString& paper) {
    if (!ready_to_print())
        return false;
    return after_print(
        output_iface()->sendToPrinter(QStringLiteral("sheet"), input(), release_, printer, paper),
        QStringLiteral("sheet %1 printer").arg(paper));
}

bool BatchModel::printLabels(const QString& printer, const QString& paper) {
    if (!ready_to_print())
        return false;
    return after_print(
        output_iface()->sendToPrinter(QStringLiteral("labels"), input(), release_, printer, paper),
        QStringLiteral("labels %1 printer").arg(paper));
}

QVariantMap BatchModel::input() const {
    return draft_ ? draft_->to_input().toVariantMap() : QVariantMap{};
}

QStringList BatchModel::batchIds() const {
    auto st = store();
    if (!st)
        return {};
    QStringList ids;
    guarded([&] { ids = st->list(); });
    return ids;
}

QStringList BatchModel::printers() const {
    DocumentOutput* out = output_iface();
    return out ? out->printerNames() : QStringList{};
}

int BatchModel::flaggedCount() const {
    int n = 0;
    for (const Row& r : rows_)
        n += r.entered && !r.within;
    return n;
}

int BatchModel::missingCount() const {
    int n = 0;
    for (const Row& r : rows_)
        n += !r.entered;
    return n;
}

int BatchModel::rowCount(const QModelIndex& parent) const {
    return parent.isValid() ? 0 : int(rows_.size());
}

QVariant BatchModel::data(const QModelIndex& idx, int role) const {
    if (!idx.isValid() || idx.row() >= int(rows_.size()))
        return {};
    const Row& r = rows_[size_t(idx.row())];
    switch (role) {
    case Qt::DisplayRole:
    case NameRole:
        return r.name;
    case ReagentRole:
        return r.reagent;
    case UnitRole:
        return r.unit;
    case TargetRole:
        return r.target;
    case LowRole:
        return r.low;
    case HighRole:
        return r.high;
    case EnteredRole:
        return r.entered;
    case ActualRole:
        return r.actual;
    case DeviationPercentRole:
        return r.deviation_percent;
    case WithinToleranceRole:
        return r.within;
    case LotRole: {
        auto it = lots_.find(r.reagent);
        return it == lots_.end() ? QString() : it->second;
    }
    case CaptureRole: {
        const QJsonObject e = actual_entry(idx.row());
        return e.value("capture").toObject().toVariantMap();
    }
    case SourceRole: {
        if (!r.entered)
            return QString();
        return capture_source_text(actual_entry(idx.row()).value("capture").toObject());
    }
    case CaptureTargetRole:
        return QStringLiteral("batch.actual[%1].mass_g").arg(idx.row());
    case LotChoicesRole: {
        QVariantList out;
        const auto it = shelf_.find(r.reagent.startsWith("buffer.") ? r.reagent.mid(7) : r.reagent);
        if (it == shelf_.end() || !draft_)
            return out;
        const QString day = storage::preparation_day(*draft_);
        for (const QVariantMap& m : it->second) {
            const QString expires = m.value("expiresOn").toString();
            const bool expired = expires < day;
            QString name = m.value("id").toString() + (expired ? tr(" · EXPIRED %1").arg(expires)
                                                               : tr(" · expires %1").arg(expires));
            QVariantMap c = m;
            c["name"] = name;
            c["expired"] = expired;
            out.append(c);
        }
        return out;
    }
    case LotExpiresOnRole: {
        const QJsonObject e = actual_entry(idx.row());
        const QString lot = lots_.count(r.reagent) ? lots_.at(r.reagent) : QString();
        if (e.value("lot").toString() == lot && e.contains("lot_expires_on"))
            return e.value("lot_expires_on").toString();
        return shelf_lot(r.reagent, lot).value("expiresOn").toString();
    }
    case LotExpiredRole: {
        if (!draft_)
            return false;
        const QJsonObject e = actual_entry(idx.row());
        const QString lot = lots_.count(r.reagent) ? lots_.at(r.reagent) : QString();
        if (lot.isEmpty() || (e.value("lot").toString() == lot && e.contains("lot_override")))
            return false;
        const QString expires = data(idx, LotExpiresOnRole).toString();
        return !expires.isEmpty() && expires < storage::preparation_day(*draft_);
    }
    case LotStatusRole: {
        const QJsonObject e = actual_entry(idx.row());
        const QString lot = lots_.count(r.reagent) ? lots_.at(r.reagent) : QString();
        if (lot.isEmpty() || !draft_)
            return QString();
        const QString expires = data(idx, LotExpiresOnRole).toString();
        if (e.value("lot").toString() == lot && e.contains("lot_override")) {
            const QJsonObject o = e.value("lot_override").toObject();
            return tr("expired %1; accepted by %2 (%3): %4")
                .arg(expires, o.value("name").toString(), o.value("by").toString(),
                     o.value("reason").toString());
        }
        if (expires.isEmpty())
            return shelf_.count(r.reagent) ? QString()
                                           : tr("not on the lot shelf: its expiry is not checked");
        if (expires < storage::preparation_day(*draft_))
            return tr("EXPIRED on %1, before the preparation on %2: pick another lot, or an "
                      "approver overrides it with a reason")
                .arg(expires, storage::preparation_day(*draft_));
        const QString opened = shelf_lot(r.reagent, lot).value("openedOn").toString();
        return opened.isEmpty() ? tr("expires %1").arg(expires)
                                : tr("expires %1 · opened %2").arg(expires, opened);
    }
    case LotErrorRole:
    case ErrorRole: {
        // The override form shows its own errors (lot_override.*), beside its fields.
        const auto at = chem::subscript_of(error_.field.toStdString(), "batch.actual");
        const int i = at ? at->index() : -1;
        const bool about_lot = at && at->rest.rfind("lot", 0) == 0;
        if (about_lot != (role == LotErrorRole))
            return QString();
        if (i < 0 || !draft_)
            return QString();
        if (i < draft_->actual.size() &&
            draft_->actual[i].toObject().value("reagent").toString() == r.reagent)
            return error_.message;
        return QString();
    }
    default:
        return {};
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
            {ErrorRole, "error"},
            {CaptureRole, "capture"},
            {SourceRole, "source"},
            {CaptureTargetRole, "captureTarget"},
            {LotChoicesRole, "lotChoices"},
            {LotExpiresOnRole, "lotExpiresOn"},
            {LotExpiredRole, "lotExpired"},
            {LotStatusRole, "lotStatus"},
            {LotErrorRole, "lotError"}};
}

bool BatchModel::signingAvailable() const {
    if (!workspace_ || !workspace_->database() || !stored_)
        return false;
    const QSqlDatabase c = workspace_->database()->connection();
    return storage::has_audit_schema(c) && storage::AccountStore(c).any();
}

bool BatchModel::sign(const QString& login, const QString& password, const QString& meaning) {
    if (!workspace_ || !workspace_->database() || !stored_)
        return set_error({QStringLiteral("signature"), tr("save the batch before signing it")}),
               false;
    if (pending_)
        return set_error({QStringLiteral("signature"),
                          tr("record or discard the pending amendment before signing")}),
               false;
    const QString id = stored_->id;
    std::optional<storage::ConflictError> changed;
    const FieldError e = guarded([&] {
        try {
            storage::SignatureStore(workspace_->database()->connection())
                .sign(id, login.trimmed(), password, meaning, stored_->version);
        } catch (const storage::ConflictError& c) {
            changed = c;
        }
    });
    if (changed) {
        // Changed on another bench since it was shown here: nobody signs what they have not seen.
        refreshFromDatabase();
        return set_error({QStringLiteral("signature"),
                          tr("not signed: %1 changed this batch at %2, after it was shown here. "
                             "Check it as it is now, then sign again.")
                              .arg(changed->person(), changed->time())}),
               false;
    }
    if (!e.field.isEmpty()) {
        reload(id); // a wrong password is counted; the signatures are as they were
        emit batchChanged();
        return set_error(e), false;
    }
    set_error({});
    reload(id);
    emit batchChanged();
    return true;
}

} // namespace phaseplan::gui

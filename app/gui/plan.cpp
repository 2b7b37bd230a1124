#include "plan.h"

#include "chem/checks.h"
#include "core/date_time.h"
#include "core/line_commands.h"
#include "field_words.h"
#include "workspace.h"

#include <QDateTime>
#include <QJsonArray>
#include <QJsonDocument>

#include <algorithm>
#include <cmath>

namespace phaseplan::gui {

namespace {

constexpr int autosave_delay_ms = 300; ///< after the last edit; a kill loses at most this
const QString current_plan_key = QStringLiteral("current_plan");

/// A plan to start from when there is neither an autosave nor the demo.
QJsonObject starter_plan() {
    return QJsonDocument::fromJson(R"({
      "lines": {
        "A": {"name": "Water", "bottle_ml": 1000, "residue_ml": 30,
              "parts": [{"solvent": "water", "fraction_v": 1}]},
        "B": {"name": "Acetonitrile", "bottle_ml": 1000, "residue_ml": 30,
              "parts": [{"solvent": "acetonitrile", "fraction_v": 1}]}
      },
      "methods": {"gradient": {"flow_ml_min": 1.0, "run_min": 15, "equilibration_min": 5,
                  "gradient": [{"t_min": 0, "A": 95, "B": 5}, {"t_min": 10, "A": 5, "B": 95}]}},
      "sequence": [{"method": "gradient", "injections": 10, "label": "samples"}],
      "prime_ml": {"A": 20, "B": 20},
      "start": "2026-12-01T18:00:00",
      "waste_ml": 4000,
      "detector": {"type": "uv", "wavelength_nm": 220},
      "column": {"ph_min": 2, "ph_max": 8}
    })")
        .object();
}

QJsonObject obj(const QJsonObject& o, const char* key) {
    return o.value(QLatin1String(key)).toObject();
}

/// A line's result as the screens' bottle rows take it: the keys of the contract's
/// "lines.<letter>" (a null there is a null here).
QVariantMap bottle_map(const SequenceLineResult& r) {
    const QVariant null = QVariant::fromValue(nullptr);
    const chem::LinePlan& lp = r.plan;
    auto or_null = [&](const auto& v) { return v ? QVariant(double(*v)) : null; };
    QVariantMap b{
        {"name", r.name},
        {"required_ml", lp.required_ml},
        {"usable_ml", lp.usable_ml},
        {"runs_dry", lp.runs_dry},
        {"dry_after_injection", or_null(lp.dry_after_injection)},
        {"dry_at", lp.dry_at_min ? QVariant(r.dry_at) : null},
        {"dry_at_min", or_null(lp.dry_at_min)},
        {"dry_during",
         lp.runs_dry ? QVariant(QString::fromLatin1(chem::dry_phase_name(lp.dry_phase))) : null},
        {"bottle_ml", r.bottle_ml},
        {"residue_ml", r.residue_ml},
        {"prime_ml", lp.prime_ml},
        {"pumped_ml", lp.pumped_ml},
        {"spare_ml", lp.spare_ml},
        {"min_bottle_ml", lp.min_bottle_ml},
        {"suggested_bottle_ml",
         lp.suggested_bottle_ml > 0 ? QVariant(lp.suggested_bottle_ml) : null}};
    if (r.profile) {
        b.insert("uv_cutoff_nm", r.profile->uv_cutoff_nm);
        b.insert("ph", or_null(r.profile->ph));
        b.insert("shelf_kind",
                 QString::fromLatin1(
                     r.profile->shelf_kind ? chem::shelf_kind_name(*r.profile->shelf_kind) : ""));
        b.insert("shelf_life_h", r.profile->shelf_life_h);
    }
    return b;
}

/// Every clock time of a plan document moved by the same amount (start, lines' prepared_at, a
/// dated standby end), so that a plan made for another day keeps its shape when moved to tonight.
void shift_times(QJsonObject& doc, qint64 secs) {
    auto shift = [&](QJsonObject& o, const char* key) {
        const QDateTime t = wall_clock(o.value(QLatin1String(key)).toString());
        if (t.isValid() && o.value(QLatin1String(key)).toString().size() >= 16)
            o.insert(QLatin1String(key), wall_clock_iso(t.addSecs(secs)));
    };
    shift(doc, "start");
    QJsonObject lines = obj(doc, "lines");
    for (auto it = lines.begin(); it != lines.end(); ++it) {
        QJsonObject l = it.value().toObject();
        shift(l, "prepared_at");
        it.value() = l;
    }
    doc.insert("lines", lines);
    if (doc.contains("standby")) {
        QJsonObject sb = obj(doc, "standby");
        shift(sb, "until");
        doc.insert("standby", sb);
    }
}

/// The plan moved so that it starts at the next 18:00 after `now` (a night's run planned today).
/// A bottle is never prepared after `now`: planned in the evening, the start moves to tomorrow
/// 18:00, and a line's prepared_at that would follow it into tomorrow stays at `now` (to the
/// minute), so that the start can still be brought forward to tonight.
QJsonObject starting_tonight(QJsonObject doc, const QDateTime& now) {
    const QDateTime old_start = wall_clock(doc.value("start").toString());
    const QDateTime tonight = next_time_of_day(now, 18, 0);
    if (old_start.isValid())
        shift_times(doc, old_start.secsTo(tonight));
    else
        doc.insert("start", wall_clock_iso(tonight));
    QDateTime now_minute = now;
    now_minute.setTime(QTime(now.time().hour(), now.time().minute()));
    QJsonObject lines = obj(doc, "lines");
    for (auto it = lines.begin(); it != lines.end(); ++it) {
        QJsonObject l = it.value().toObject();
        const QDateTime prepared = wall_clock(l.value("prepared_at").toString());
        if (prepared.isValid() && prepared > now_minute) {
            l.insert("prepared_at", wall_clock_iso(now_minute));
            it.value() = l;
        }
    }
    doc.insert("lines", lines);
    return doc;
}

} // namespace

Plan::Plan(QObject* parent) : QObject(parent) {
    levels_.chart_max_ml = 1000; // until the first result
    autosave_.setSingleShot(true);
    autosave_.setInterval(autosave_delay_ms);
    connect(&autosave_, &QTimer::timeout, this, &Plan::flushAutosave);
    recompute_timer_.setSingleShot(true);
    recompute_timer_.setInterval(0);
    connect(&recompute_timer_, &QTimer::timeout, this, &Plan::recompute);
    doc_ = starter_plan();
    name_ = tr("New plan");
    update_buffer_lines();
    connect(this, &Plan::documentChanged, this, &Plan::notify_document_parts);
    connect(this, &Plan::resultChanged, this, &Plan::notify_result_parts);
}

namespace {
/// Keeps `now` in `shown` and says whether it differs from what was there.
bool differs(QVariantList& shown, QVariantList now) {
    if (now == shown)
        return false;
    shown = std::move(now);
    return true;
}

/// The fields of `bottles` that views show (those plan.h lists): a change only in the rest of a
/// line's result (its pH and UV cut-off, after a buffer edit) sends no bottlesChanged.
QVariantList shown_bottle_fields(const QVariantList& bottles) {
    static const char* const keys[] = {
        "letter",      "name",      "bottle_ml",     "residue_ml",
        "required_ml", "usable_ml", "runs_dry",      "dry_after_injection",
        "dry_at",      "dry_text",  "min_bottle_ml", "suggested_bottle_ml"};
    QVariantList out;
    for (const QVariant& b : bottles) {
        const QVariantMap m = b.toMap();
        for (const char* k : keys)
            out.append(m.value(QLatin1String(k)));
    }
    return out;
}
} // namespace

void Plan::notify_document_parts() {
    if (differs(shown_name_, {name_}))
        emit nameChanged();
    // The words for the start depend on the day as well: compared as shown.
    if (differs(shown_start_, {start(), startParts(), startText(), startNote()}))
        emit startChanged();
    if (differs(shown_standby_,
                {doc_.value("standby").toVariant(), standbyEnabled(), standbyFlowMlMin(),
                 standbyMode(), standbyUntilHour(), standbyUntilMinute(), standbyDurationMin()}))
        emit standbyChanged();
    if (differs(shown_settings_, {columnMap(), wasteCapacityMl(), detectorType(), detectorReadsUv(),
                                  detectorWavelengthNm(), columnPhMin(), columnPhMax()}))
        emit settingsChanged();
}

void Plan::notify_result_parts() {
    if (differs(shown_summary_, {endTime(), endText(), totalMin(), injections(), wasteMl(),
                                 standbyText(), chartHours(), chartMaxMl()}))
        emit summaryChanged();
    if (differs(shown_error_, {valid(), stale(), errorPlace(), errorField(), errorMessage()}))
        emit errorChanged();
}

Plan::~Plan() {
    flushAutosave();
}

void Plan::setWorkspace(Workspace* w) {
    if (w == workspace_)
        return;
    if (workspace_)
        disconnect(workspace_, nullptr, this, nullptr);
    workspace_ = w;
    eluent_memo_.entries.clear();
    if (w) {
        connect(w, &Workspace::libraryChanged, this, &Plan::recompute);
        connect(w, &Workspace::connectionRestored, this, &Plan::flushAutosave);
    }
    emit workspaceChanged();
    if (restore_)
        restore_state();
    recompute();
}

void Plan::restore_state() {
    if (!workspace_ || !workspace_->database())
        return;
    QJsonObject saved = workspace_->database()->setting(current_plan_key).toObject();
    // Edits a lost connection kept on this tablet (this run or the last) win over the
    // database's copy, and are saved there at once.
    const QJsonObject kept = workspace_->keptLocally(QStringLiteral("plan"));
    const bool from_tablet = !kept.value("document").toObject().isEmpty();
    if (from_tablet)
        saved = kept;
    if (!saved.isEmpty()) {
        name_ = saved.value("name").toString();
        doc_ = saved.value("document").toObject();
        seen_ = saved.value("versions").toObject();
        if (from_tablet) {
            dirty_ = true;
            autosave_.start();
        }
    } else if (auto demo = workspace_->database()->load(storage::DocumentKind::sequence,
                                                        Workspace::demoName())) {
        // First run: the demo is tonight's plan, starting at the next 18:00.
        name_ = Workspace::demoName();
        doc_ = starting_tonight(*demo, workspace_->now());
        dirty_ = true;
        autosave_.start();
    } else {
        doc_ = starting_tonight(doc_, workspace_->now());
    }
    adopt_inline_buffers();
    if (seen_.isEmpty())
        take_stamps(); // a plan kept before versions (or the demo's first run): as stored now
    update_buffer_lines();
    emit documentChanged();
    emit documentReplaced();
}

void Plan::flushAutosave() {
    if (!dirty_ || !workspace_ || !workspace_->database())
        return;
    if (!workspace_->canSave())
        return; // read-only or locked: the banner says so
    autosave_.stop();
    const FieldError e = guarded([&] {
        workspace_->database()->set_setting(
            current_plan_key,
            QJsonObject{{"name", name_}, {"document", doc_}, {"versions", seen_}});
    });
    if (e.empty()) {
        workspace_->saveSucceeded(QStringLiteral("plan"));
        dirty_ = false;
        return;
    }
    // Kept on this tablet and saved again when the database is back (lost connection) or with
    // the next change: dirty_ stays.
    workspace_->saveFailed(tr("the plan \"%1\"").arg(name_), e.message, e.field,
                           QStringLiteral("plan"),
                           QJsonObject{{"name", name_}, {"document", doc_}, {"versions", seen_}});
}

void Plan::update_buffer_lines() {
    if (lineLetters() != shown_letters_) {
        shown_letters_ = lineLetters();
        emit lineLettersChanged();
    }
    if (methodNames() != shown_methods_) {
        shown_methods_ = methodNames();
        emit methodNamesChanged();
    }
    QVariantMap use;
    for (const QString& m : methodNames())
        use.insert(m, rowsUsingMethod(m));
    if (use != method_use_) {
        method_use_ = use;
        emit methodUseChanged();
    }
    QVariantList list;
    for (const QString& l : lineLetters())
        if (!lineBuffer(l).isEmpty())
            list.append(
                QVariantMap{{"id", l},
                            {"name", tr("Line %1: %2").arg(l, line(l).value("name").toString())},
                            {"ref", lineBufferRef(l)}});
    if (list == buffer_lines_)
        return;
    buffer_lines_ = list;
    emit bufferLinesChanged();
}

void Plan::edited() {
    dirty_ = true;
    autosave_.start();
    update_buffer_lines();
    emit documentChanged();
    recompute_timer_.start();
}

void Plan::recomputeNow() {
    if (recompute_timer_.isActive())
        recompute();
}

void Plan::setName(const QString& n) {
    if (n == name_)
        return;
    name_ = n;
    edited();
}

QStringList Plan::lineLetters() const {
    QStringList out;
    const QJsonObject lines = obj(doc_, "lines");
    for (const QString& l :
         {QStringLiteral("A"), QStringLiteral("B"), QStringLiteral("C"), QStringLiteral("D")})
        if (lines.contains(l))
            out << l;
    return out;
}

QStringList Plan::methodNames() const {
    return obj(doc_, "methods").keys();
}

QString Plan::start() const {
    return doc_.value("start").toString();
}
void Plan::setStart(const QString& iso) {
    if (iso == start())
        return;
    doc_.insert("start", iso);
    edited();
}

void Plan::shiftStart(int minutes) {
    const QString s = start();
    QDateTime t = QDateTime::fromString(s, Qt::ISODate);
    if (!t.isValid()) {
        t = QDateTime::currentDateTime();
        t.setTimeSpec(Qt::UTC);
    }
    const bool has_offset = t.timeSpec() != Qt::LocalTime;
    if (!has_offset)
        t.setTimeSpec(Qt::UTC);
    t = t.addSecs(60LL * minutes);
    // Keep the form the user wrote: wall-clock time stays without an offset.
    setStart(contract_iso(t, has_offset && s.size() > 19));
}

double Plan::wasteCapacityMl() const {
    return doc_.value("waste_ml").toDouble();
}
void Plan::setWasteCapacityMl(double ml) {
    if (doc_.value("waste_ml").isDouble() && ml == wasteCapacityMl())
        return;
    if (ml > 0)
        doc_.insert("waste_ml", ml);
    else
        doc_.remove("waste_ml");
    edited();
}

QString Plan::detectorType() const {
    return obj(doc_, "detector").value("type").toString(QStringLiteral("uv"));
}
void Plan::setDetectorType(const QString& t) {
    QJsonObject d = obj(doc_, "detector");
    if (d.value("type").toString() == t)
        return;
    d.insert("type", t);
    doc_.insert("detector", d);
    edited();
}

QVariantList Plan::detectorTypes() {
    QVariantList out;
    for (chem::DetectorType t : chem::detector_types()) {
        QString name;
        switch (t) {
        case chem::DetectorType::uv:
            name = tr("UV");
            break;
        case chem::DetectorType::dad:
            name = tr("DAD");
            break;
        case chem::DetectorType::pda:
            name = tr("PDA");
            break;
        case chem::DetectorType::uv_ms:
            name = tr("UV + MS");
            break;
        case chem::DetectorType::ms:
            name = tr("MS");
            break;
        case chem::DetectorType::elsd:
            name = tr("ELSD");
            break;
        case chem::DetectorType::cad:
            name = tr("CAD");
            break;
        case chem::DetectorType::fluorescence:
            name = tr("Fluorescence");
            break;
        case chem::DetectorType::ri:
            name = tr("RI");
            break;
        }
        out.append(
            QVariantMap{{"id", QString::fromLatin1(chem::detector_type_name(t))}, {"name", name}});
    }
    return out;
}

bool Plan::detectorReadsUv() const {
    const auto t = chem::detector_type_from_name(detectorType().toLower().toStdString());
    return t && chem::detector_reads_uv(*t);
}

double Plan::detectorWavelengthNm() const {
    return obj(doc_, "detector").value("wavelength_nm").toDouble();
}
void Plan::setDetectorWavelengthNm(double nm) {
    QJsonObject d = obj(doc_, "detector");
    if (d.value("wavelength_nm").toDouble() == nm && d.contains("wavelength_nm"))
        return;
    d.insert("wavelength_nm", nm);
    doc_.insert("detector", d);
    edited();
}

double Plan::columnPhMin() const {
    return obj(doc_, "column").value("ph_min").toDouble();
}
double Plan::columnPhMax() const {
    return obj(doc_, "column").value("ph_max").toDouble();
}
void Plan::setColumnPhMin(double v) {
    QJsonObject c = obj(doc_, "column");
    if (c.contains("ph_min") && c.value("ph_min").toDouble() == v)
        return;
    c.insert("ph_min", v);
    doc_.insert("column", c);
    edited();
}
void Plan::setColumnPhMax(double v) {
    QJsonObject c = obj(doc_, "column");
    if (c.contains("ph_max") && c.value("ph_max").toDouble() == v)
        return;
    c.insert("ph_max", v);
    doc_.insert("column", c);
    edited();
}

QVariantMap Plan::startParts() const {
    const QDateTime t = wall_clock(start());
    if (!t.isValid())
        return {};
    return {{"year", t.date().year()},
            {"month", t.date().month()},
            {"day", t.date().day()},
            {"hour", t.time().hour()},
            {"minute", t.time().minute()}};
}

QString Plan::startText() const {
    return dayClock(start());
}

QString Plan::startNote() const {
    const QDateTime start = wall_clock(this->start());
    if (!start.isValid() || !workspace_)
        return {};
    const qint64 late_s = start.secsTo(workspace_->now());
    if (late_s < 60)
        return {};
    QString note = tr("%1 was %2 ago: the first injections would already have run. Pick a later "
                      "start unless the sequence has begun.")
                       .arg(startText(), duration_text(static_cast<double>(late_s / 60)));
    note[0] = note[0].toUpper();
    return note;
}

void Plan::setStartAt(int year, int month, int day, int hour, int minute) {
    const QDateTime t(QDate(year, month, day), QTime(hour, minute), Qt::UTC);
    if (!t.isValid())
        return;
    setStart(wall_clock_iso(t));
}

QString Plan::dayClock(const QString& iso) const {
    const QDate today = workspace_ ? workspace_->today() : QDate::currentDate();
    return day_clock_text(wall_clock(iso), today);
}

QJsonObject Plan::standby_doc() const {
    return obj(doc_, "standby");
}

void Plan::set_standby(const QJsonObject& sb) {
    if (sb == standby_doc() && doc_.contains("standby") == !sb.isEmpty())
        return;
    if (sb.isEmpty())
        doc_.remove("standby");
    else
        doc_.insert("standby", sb);
    edited();
}

bool Plan::standbyEnabled() const {
    return doc_.value("standby").isObject();
}
void Plan::setStandbyEnabled(bool on) {
    if (on == standbyEnabled())
        return;
    if (!on) {
        // Kept aside so that switching it back on restores what was set.
        standby_kept_ = standby_doc();
        doc_.remove("standby");
        edited();
        return;
    }
    QJsonObject sb = standby_kept_;
    if (sb.isEmpty()) {
        sb = QJsonObject{{"flow_ml_min", 0.2}, {"until", "07:30"}};
        // Half and half of the first two lines, or all of the only one.
        const QStringList letters = lineLetters();
        if (letters.size() >= 2) {
            sb.insert(letters[0], 50);
            sb.insert(letters[1], 50);
        } else if (!letters.isEmpty()) {
            sb.insert(letters[0], 100);
        }
    }
    set_standby(sb);
}

double Plan::standbyFlowMlMin() const {
    return standby_doc().value("flow_ml_min").toDouble(0.2);
}
void Plan::setStandbyFlowMlMin(double v) {
    QJsonObject sb = standby_doc();
    sb.insert("flow_ml_min", v);
    set_standby(sb);
}

QString Plan::standbyMode() const {
    return standby_doc().contains("duration_min") ? QStringLiteral("duration")
                                                  : QStringLiteral("until");
}
void Plan::setStandbyMode(const QString& mode) {
    if (mode == standbyMode() || !standbyEnabled())
        return;
    QJsonObject sb = standby_doc();
    if (mode == QLatin1String("duration")) {
        sb.remove("until");
        const double shown = planResult() ? planResult()->standby_min : 0.0;
        sb.insert("duration_min", shown > 0 ? std::round(shown) : 240.0);
    } else {
        sb.remove("duration_min");
        sb.insert("until", "07:30");
    }
    set_standby(sb);
}

int Plan::standbyUntilHour() const {
    const QString u = standby_doc().value("until").toString();
    const QDateTime t = wall_clock(u);
    if (t.isValid())
        return t.time().hour();
    return u.section(':', 0, 0).toInt();
}
int Plan::standbyUntilMinute() const {
    const QString u = standby_doc().value("until").toString();
    const QDateTime t = wall_clock(u);
    if (t.isValid())
        return t.time().minute();
    return u.section(':', 1, 1).toInt();
}
void Plan::setStandbyUntil(int hour, int minute) {
    QJsonObject sb = standby_doc();
    sb.remove("duration_min");
    sb.insert("until", QTime(hour, minute).toString(QStringLiteral("HH:mm")));
    set_standby(sb);
}

double Plan::standbyDurationMin() const {
    return standby_doc().value("duration_min").toDouble();
}
void Plan::setStandbyDurationMin(double v) {
    QJsonObject sb = standby_doc();
    sb.remove("until");
    sb.insert("duration_min", v);
    set_standby(sb);
}

double Plan::standbyPercent(const QString& letter) const {
    return standby_doc().value(letter).toDouble();
}
void Plan::setStandbyPercent(const QString& letter, double percent) {
    QJsonObject sb = standby_doc();
    sb.insert(letter, percent);
    // Two lines in use: the other takes the rest, as in the gradient table.
    QStringList used;
    for (const QString& l : lineLetters())
        if (l != letter && sb.contains(l))
            used << l;
    if (used.size() == 1)
        sb.insert(used.first(), std::max(0.0, 100.0 - percent));
    set_standby(sb);
}

QString Plan::standbyText() const {
    const PlanResult* p = planResult();
    const double min = p ? p->standby_min : 0.0;
    if (!standbyEnabled() || !(min > 0))
        return {};
    return tr("until %1 (%2)").arg(dayClock(p->standby_end), duration_text(min));
}

QString Plan::fieldWords(const QString& path) const {
    return field_words(path, methodNames());
}

QString Plan::errorPlace() const {
    if (error_.field.isEmpty())
        return {};
    return field_words(error_.field, methodNames());
}

QString Plan::endTime() const {
    return planResult() ? planResult()->end : QString();
}
QString Plan::endText() const {
    return dayClock(endTime());
}
double Plan::totalMin() const {
    return planResult() ? planResult()->total_min : 0.0;
}
double Plan::wasteMl() const {
    return planResult() ? planResult()->waste_ml : 0.0;
}

bool Plan::errorUnder(const QString& prefix) const {
    const QString& f = error_.field;
    return f == prefix || f.startsWith(prefix + '.') || f.startsWith(prefix + '[');
}

// ---- editing ------------------------------------------------------------------------------

void Plan::load(const QVariantMap& document, const QString& name) {
    loadJson(QJsonObject::fromVariantMap(document), name);
}

void Plan::loadJson(const QJsonObject& document, const QString& name) {
    doc_ = document;
    name_ = name;
    seen_ = {};
    set_clash({}, {});
    adopt_inline_buffers();
    dirty_ = true;
    autosave_.start();
    update_buffer_lines();
    emit documentChanged();
    emit documentReplaced();
    recompute();
}

bool Plan::loadSaved(const QString& name) {
    if (!workspace_ || !workspace_->database())
        return false;
    auto d = workspace_->database()->load(storage::DocumentKind::sequence, name);
    if (!d)
        return false;
    loadJson(*d, name);
    take_stamps(); // as stored now: the versions a later save starts from
    return true;
}

std::vector<storage::SavedDocument> Plan::saved_documents(const QString& n) const {
    std::vector<storage::SavedDocument> docs;
    docs.push_back({storage::DocumentKind::sequence, n, doc_, {}});
    const QJsonObject methods = obj(doc_, "methods");
    for (auto it = methods.begin(); it != methods.end(); ++it)
        docs.push_back({storage::DocumentKind::method, it.key(), it.value().toObject(), {}});
    const QJsonObject lines = obj(doc_, "lines");
    for (auto it = lines.begin(); it != lines.end(); ++it) {
        const QJsonObject l = it.value().toObject();
        const QString line_name = l.value("name").toString(n + ' ' + it.key());
        docs.push_back({storage::DocumentKind::line, line_name, l, {}});
        for (const QJsonValue& v : l.value("parts").toArray()) {
            const QJsonObject part = v.toObject();
            // A part held by reference is a saved buffer of its own (the designer saves it):
            // writing the plan's copy under the name inside it would bring back a buffer that
            // was renamed since.
            if (!part.contains("buffer") || part.contains("buffer_ref"))
                continue;
            const QJsonObject buffer = part.value("buffer").toObject();
            docs.push_back({storage::DocumentKind::buffer,
                            buffer.value("name").toString(line_name + " buffer"),
                            buffer,
                            {}});
            break;
        }
    }
    return docs;
}

namespace {
QString stamp_key(const storage::SavedDocument& d) {
    return storage::kind_name(d.kind) + ':' + d.name.trimmed();
}
} // namespace

QJsonObject Plan::stamps_of(const std::vector<storage::SavedDocument>& docs) const {
    QJsonObject out;
    for (const storage::SavedDocument& d : docs)
        out.insert(stamp_key(d), double(workspace_->database()->stamp(d.kind, d.name).version));
    return out;
}

void Plan::take_stamps() {
    seen_ = {};
    if (!workspace_ || !workspace_->database() || name_.trimmed().isEmpty())
        return;
    guarded([&] { seen_ = stamps_of(saved_documents(name_.trimmed())); });
}

void Plan::set_clash(const QString& message, const QString& name) {
    if (message == clash_ && name == clash_name_)
        return;
    clash_ = message;
    clash_name_ = name;
    if (message.isEmpty())
        offered_ = {};
    emit saveClashChanged();
}

QString Plan::saveAs(const QString& name) {
    return save_documents(name.trimmed(), false);
}

QString Plan::replaceSaved() {
    if (clash_name_.isEmpty())
        return tr("nothing was refused: save the plan first");
    return save_documents(clash_name_, true);
}

QString Plan::saveAsCopy() {
    if (!workspace_ || !workspace_->database())
        return tr("no database is open");
    const QString base =
        (clash_name_.isEmpty() ? name_ : clash_name_).trimmed().left(storage::max_name_chars - 12);
    QString n = base + tr(" (copy)");
    for (int i = 2; workspace_->database()->stamp(storage::DocumentKind::sequence, n).version > 0 ||
                    workspace_->database()->load(storage::DocumentKind::sequence, n);
         ++i)
        n = base + tr(" (copy %1)").arg(i);
    return save_documents(n, false);
}

bool Plan::openClashing() {
    if (clash_name_.isEmpty())
        return false;
    // Renamed on another bench meanwhile: open it under the name it has now.
    QString now_named = clash_name_;
    if (workspace_ && workspace_->database())
        guarded([&] {
            now_named =
                workspace_->database()->current_name(storage::DocumentKind::sequence, clash_name_);
        });
    return !now_named.isEmpty() && loadSaved(now_named);
}

QString Plan::save_documents(const QString& n, bool replace) {
    if (!workspace_ || !workspace_->database())
        return tr("no database is open");
    std::vector<storage::SavedDocument> all;
    std::vector<storage::SavedDocument> docs;
    QStringList kept;
    const FieldError e = guarded([&] {
        all = saved_documents(n);
        storage::Database* db = workspace_->database();
        for (storage::SavedDocument d : all) {
            const QString key = stamp_key(d);
            if (d.kind != storage::DocumentKind::sequence) {
                // A line or method exactly as stored is not written: no clash with another
                // plan that holds the same one.
                if (db->load(d.kind, d.name) == d.document)
                    continue;
                // One saved or changed elsewhere since this plan was loaded is kept as it is
                // (the plan holds its own copy), and the note says so: never overwritten.
                const qint64 seen = seen_.value(key).toInteger(0);
                const storage::RowStamp now = db->stamp(d.kind, d.name);
                if (now.version > 0 && now.version != seen) {
                    kept << tr("%1 “%2” (%3, %4)")
                                .arg(storage::kind_name(d.kind), d.name,
                                     storage::person_words(db->connection(), now.changed_by),
                                     storage::utc_time_words(now.changed_at));
                    continue;
                }
                d.expected_version = now.version; // checked again inside the transaction
            } else if (replace) {
                d.expected_version = offered_.value(key).toInteger(0);
            } else if (n != name_.trimmed()) {
                d.expected_version = 0; // Save as under another name: it must be new
            } else {
                d.expected_version = seen_.value(key).toInteger(0);
            }
            docs.push_back(d);
        }
        db->save_all(docs);
    });
    if (!e.empty()) {
        if (e.field == QLatin1String("version") || e.field == QLatin1String("name")) {
            // What the refusal was told about: a Replace from here overwrites only these.
            QJsonObject offered;
            guarded([&] { offered = stamps_of(all); });
            set_clash(e.message, n);
            offered_ = offered;
        }
        return e.message;
    }
    name_ = n;
    take_stamps();
    set_clash({}, {});
    const QString note = kept.isEmpty()
                             ? QString()
                             : tr("Kept as saved elsewhere (this plan holds its own copy): %1.")
                                   .arg(kept.join(QStringLiteral("; ")));
    if (note != save_note_) {
        save_note_ = note;
        emit saveClashChanged();
    }
    dirty_ = true;
    flushAutosave();
    emit documentChanged();
    workspace_->notifySaved();
    return {};
}

QJsonObject Plan::line(const QString& letter) const {
    return obj(doc_, "lines").value(letter).toObject();
}

void Plan::setLine(const QString& letter, const QJsonObject& l) {
    QJsonObject lines = obj(doc_, "lines");
    if (l.isEmpty()) {
        lines.remove(letter);
        QJsonObject prime = obj(doc_, "prime_ml");
        prime.remove(letter);
        doc_.insert("prime_ml", prime);
    } else {
        if (lines.value(letter).toObject() == l)
            return;
        lines.insert(letter, l);
    }
    doc_.insert("lines", lines);
    edited();
}

void Plan::setLineField(const QString& letter, const QString& key, const QVariant& value) {
    QJsonObject l = line(letter);
    const QJsonValue v = QJsonValue::fromVariant(value);
    if (l.value(key) == v)
        return;
    l.insert(key, v);
    setLine(letter, l);
}

double Plan::primeMl(const QString& letter) const {
    return obj(doc_, "prime_ml").value(letter).toDouble();
}

void Plan::setPrimeMl(const QString& letter, double ml) {
    QJsonObject prime = obj(doc_, "prime_ml");
    if (prime.contains(letter) && prime.value(letter).toDouble() == ml)
        return;
    prime.insert(letter, ml);
    doc_.insert("prime_ml", prime);
    edited();
}

QJsonObject Plan::lineBuffer(const QString& letter) const {
    for (const QJsonValue& p : line(letter).value("parts").toArray())
        if (p.toObject().contains("buffer"))
            return p.toObject().value("buffer").toObject();
    return {};
}

double Plan::lineBufferVolumeMl(const QString& letter) const {
    const QJsonObject l = line(letter);
    for (const QJsonValue& p : l.value("parts").toArray())
        if (p.toObject().contains("buffer"))
            return l.value("bottle_ml").toDouble() * p.toObject().value("fraction_v").toDouble();
    return 0;
}

QString Plan::lineBufferRef(const QString& letter) const {
    for (const QJsonValue& p : line(letter).value("parts").toArray())
        if (p.toObject().contains("buffer"))
            return p.toObject().value("buffer_ref").toString();
    return {};
}

bool Plan::for_each_buffer_part(const std::function<bool(QJsonObject& part)>& change) {
    QJsonObject lines = obj(doc_, "lines");
    bool any = false;
    for (auto it = lines.begin(); it != lines.end(); ++it) {
        QJsonObject l = it.value().toObject();
        QJsonArray parts = l.value("parts").toArray();
        bool line_changed = false;
        for (int i = 0; i < parts.size(); ++i) {
            QJsonObject p = parts[i].toObject();
            if (!p.contains("buffer"))
                continue;
            if (change(p)) {
                parts[i] = p;
                line_changed = true;
            }
        }
        if (!line_changed)
            continue;
        l.insert("parts", parts);
        it.value() = l;
        any = true;
    }
    if (!any)
        return false;
    doc_.insert("lines", lines);
    edited();
    return true;
}

/// The recipe as a line part holds it: the line's own volume is worked out from its share of the
/// bottle, so the saved buffer's batch volume is left out.
static QJsonObject part_recipe(QJsonObject recipe) {
    recipe.remove("volume_ml");
    recipe.remove("auto_name");
    recipe.remove("name"); // the part's buffer_ref names it
    return recipe;
}

void Plan::updateBufferRefs(const QString& name, const QJsonObject& recipe) {
    const QJsonObject r = part_recipe(recipe);
    for_each_buffer_part([&](QJsonObject& p) {
        if (p.value("buffer_ref").toString() != name || p.value("buffer").toObject() == r)
            return false;
        p.insert("buffer", r);
        return true;
    });
}

void Plan::renameBufferRefs(const QString& from, const QString& to, const QJsonObject& recipe) {
    const QJsonObject r = part_recipe(recipe);
    for_each_buffer_part([&](QJsonObject& p) {
        if (p.value("buffer_ref").toString() != from)
            return false;
        p.insert("buffer_ref", to);
        p.insert("buffer", r);
        return true;
    });
}

void Plan::dropBufferRefs(const QString& name) {
    for_each_buffer_part([&](QJsonObject& p) {
        if (p.value("buffer_ref").toString() != name)
            return false;
        p.remove("buffer_ref");
        return true;
    });
}

void Plan::adopt_inline_buffers() {
    if (!workspace_ || !workspace_->database())
        return;
    storage::Database* db = workspace_->database();
    // The saved buffers as line parts hold them, to find one that is the same recipe.
    std::vector<std::pair<QString, QJsonObject>> saved;
    for (const auto& info : db->list(storage::DocumentKind::buffer))
        if (auto d = db->load(storage::DocumentKind::buffer, info.name))
            saved.emplace_back(info.name, part_recipe(*d));
    QJsonObject lines = obj(doc_, "lines");
    bool any = false;
    for (auto it = lines.begin(); it != lines.end(); ++it) {
        QJsonObject l = it.value().toObject();
        QJsonArray parts = l.value("parts").toArray();
        bool changed = false;
        for (int i = 0; i < parts.size(); ++i) {
            QJsonObject p = parts[i].toObject();
            if (!p.contains("buffer"))
                continue;
            const QJsonObject recipe = part_recipe(p.value("buffer").toObject());
            QString ref = p.value("buffer_ref").toString();
            if (!ref.isEmpty()) {
                // A reference: take the saved buffer's current recipe (it follows edits).
                auto hit = std::find_if(saved.begin(), saved.end(),
                                        [&](const auto& s) { return s.first == ref; });
                if (hit == saved.end()) {
                    // Renamed since this plan was kept (on another bench, or by the designer's
                    // rename written after the plan's last save): follow it to its name now.
                    QString now_named;
                    guarded(
                        [&] { now_named = db->current_name(storage::DocumentKind::buffer, ref); });
                    hit = std::find_if(saved.begin(), saved.end(),
                                       [&](const auto& s) { return s.first == now_named; });
                    if (now_named.isEmpty() || hit == saved.end())
                        continue;
                    p.insert("buffer_ref", now_named);
                } else if (hit->second == p.value("buffer").toObject()) {
                    continue;
                }
                p.insert("buffer", hit->second);
            } else {
                auto same = std::find_if(saved.begin(), saved.end(),
                                         [&](const auto& s) { return s.second == recipe; });
                if (same != saved.end()) {
                    ref = same->first;
                } else {
                    const QString own =
                        p.value("buffer").toObject().value("name").toString().trimmed();
                    const QString wanted =
                        (own.isEmpty() ? tr("%1 buffer").arg(l.value("name").toString(it.key()))
                                       : own)
                            .left(56);
                    ref = wanted;
                    for (int n = 2; std::any_of(saved.begin(), saved.end(),
                                                [&](const auto& s) { return s.first == ref; });
                         ++n)
                        ref = QStringLiteral("%1 (%2)").arg(wanted).arg(n);
                    QJsonObject doc = recipe;
                    doc.insert("name", ref);
                    if (!guarded([&] {
                             db->save(storage::DocumentKind::buffer, ref, doc);
                         }).empty())
                        continue;
                    saved.emplace_back(ref, recipe);
                }
                p.insert("buffer_ref", ref);
                p.insert("buffer", recipe);
            }
            parts[i] = p;
            changed = true;
        }
        if (!changed)
            continue;
        l.insert("parts", parts);
        it.value() = l;
        any = true;
    }
    if (!any)
        return;
    doc_.insert("lines", lines);
    dirty_ = true;
    autosave_.start();
}

void Plan::setLineBuffer(const QString& letter, const QJsonObject& recipe) {
    QJsonObject l = line(letter);
    QJsonArray parts = l.value("parts").toArray();
    for (int i = 0; i < parts.size(); ++i) {
        QJsonObject p = parts[i].toObject();
        if (!p.contains("buffer"))
            continue;
        if (p.value("buffer").toObject() == recipe)
            return;
        p.insert("buffer", recipe);
        parts[i] = p;
        l.insert("parts", parts);
        setLine(letter, l);
        return;
    }
}

QJsonObject Plan::method(const QString& name) const {
    return obj(doc_, "methods").value(name).toObject();
}

void Plan::setMethod(const QString& name, const QJsonObject& m) {
    QJsonObject methods = obj(doc_, "methods");
    if (methods.value(name).toObject() == m)
        return;
    methods.insert(name, m);
    doc_.insert("methods", methods);
    edited();
}

QString Plan::addMethod(const QString& like) {
    QJsonObject methods = obj(doc_, "methods");
    QJsonObject m = methods.value(like).toObject();
    if (m.isEmpty()) {
        const QStringList letters = lineLetters();
        QJsonObject r0{{"t_min", 0}}, r1{{"t_min", 10}};
        for (int i = 0; i < letters.size(); ++i) {
            r0.insert(letters[i], i == 0 ? 100 : 0);
            r1.insert(letters[i], i == (letters.size() > 1 ? 1 : 0) ? 100 : 0);
        }
        m = QJsonObject{{"flow_ml_min", 1.0},
                        {"run_min", 12},
                        {"equilibration_min", 5},
                        {"gradient", QJsonArray{r0, r1}}};
    }
    const QString base = like.isEmpty() ? tr("method") : like;
    QString name = base;
    for (int i = 2; methods.contains(name); ++i)
        name = QStringLiteral("%1 %2").arg(base).arg(i);
    methods.insert(name, m);
    doc_.insert("methods", methods);
    edited();
    return name;
}

QVariantMap Plan::methodColumn(const QString& name) const {
    const QJsonObject own = method(name).value("column").toObject();
    const QJsonObject c = own.isEmpty() ? obj(doc_, "column") : own;
    const bool has = c.contains("length_mm") && c.contains("id_mm") && c.contains("particle_um");
    return QVariantMap{{"own", !own.isEmpty()},
                       {"name", c.value("name").toString()},
                       {"document", c.toVariantMap()},
                       {"has", has}};
}

void Plan::setMethodColumn(const QString& name, const QVariantMap& column) {
    QJsonObject m = method(name);
    if (m.isEmpty())
        return;
    if (column.isEmpty())
        m.remove("column");
    else
        m.insert("column", QJsonObject::fromVariantMap(column));
    setMethod(name, m);
}

int Plan::methodInjections(const QString& name) const {
    int n = 0;
    for (const QJsonValue& r : rows())
        if (r.toObject().value("method").toString() == name)
            n += r.toObject().value("injections").toInt();
    return n;
}

QString Plan::removeMethod(const QString& name) {
    for (const QJsonValue& r : rows())
        if (r.toObject().value("method").toString() == name)
            return tr("Method “%1” is run by a sequence row: change or remove the row first")
                .arg(name);
    QJsonObject methods = obj(doc_, "methods");
    methods.remove(name);
    doc_.insert("methods", methods);
    edited();
    return {};
}

int Plan::rowsUsingMethod(const QString& name) const {
    int n = 0;
    for (const QJsonValue& r : rows())
        if (r.toObject().value("method").toString() == name)
            ++n;
    return n;
}

QString Plan::renameMethod(const QString& from, const QString& to_raw) {
    const QString to = to_raw.trimmed();
    if (to == from)
        return {};
    if (to.isEmpty())
        return tr("Method name: type a name");
    if (to.size() > 64)
        return tr("Method name: “%1…” is longer than 64 characters").arg(to.left(20));
    QJsonObject methods = obj(doc_, "methods");
    if (!methods.contains(from))
        return tr("Method “%1” is not in this plan").arg(from);
    if (methods.contains(to))
        return tr("Method name: “%1” is taken by another method").arg(to);
    methods.insert(to, methods.value(from));
    methods.remove(from);
    doc_.insert("methods", methods);
    QJsonArray r = rows();
    for (int i = 0; i < r.size(); ++i) {
        QJsonObject row = r[i].toObject();
        if (row.value("method").toString() != from)
            continue;
        row.insert("method", to);
        r[i] = row;
    }
    doc_.insert("sequence", r);
    edited();
    return {};
}

QJsonArray Plan::rows() const {
    return doc_.value("sequence").toArray();
}

void Plan::setRows(const QJsonArray& r) {
    if (r == rows())
        return;
    doc_.insert("sequence", r);
    edited();
}

// ---- recompute ----------------------------------------------------------------------------

void Plan::recompute() {
    recompute_timer_.stop();
    QElapsedTimer timer;
    timer.start();
    SequenceResult out;
    if (!workspace_ || !workspace_->ready())
        error_ = {QString(), tr("the reference data are not loaded")};
    else
        error_ = guarded([&] {
            CommandOptions opt;
            const QDate today = workspace_->today();
            opt.clock_words = [today](const QDateTime& t) { return day_clock_text(t, today); };
            eluent_memo_.library_revision = workspace_->libraryRevision();
            opt.eluent_memo = &eluent_memo_;
            // The result stays typed: the summary, the bottles and the charts read its fields
            // (writing it as JSON and reading it back by key was most of the recompute).
            out = sequence_result(workspace_->data(), doc_, opt);
        });
    if (!error_.empty()) {
        // Keep the last valid plan on screen, greyed (stale()): one wrong cell does not blank
        // the night's summary while it is being corrected.
        last_recompute_ms_ = elapsed_ms(timer);
        emit resultChanged();
        return;
    }
    result_ = std::move(out);
    has_result_ = true;
    const QVariantList old_warnings = warnings_, old_bottles = bottles_;
    warnings_.clear();
    bottles_.clear();
    injections_ = 0;
    for (const QJsonValue& r : rows())
        injections_ += r.toObject().value("injections").toInt();
    const PlanResult* p = planResult();
    // The warnings as the screens take them (code, severity, message, the numbers); a check's
    // finding adds its typed subject and place, so the screens never read them out of the
    // sentence.
    for (const SequenceWarning& w : p ? p->warnings : result_.warnings) {
        QVariantMap m = w.json.toVariantMap();
        if (w.finding)
            m.insert(finding_references(*w.finding));
        warnings_.append(m);
    }
    for (const QString& letter : lineLetters()) {
        const QJsonObject in = line(letter);
        const SequenceLineResult* r = p ? p->line(chem::line_index(letter.toStdString())) : nullptr;
        QVariantMap b = r ? bottle_map(*r) : QVariantMap{};
        b.insert("letter", letter);
        b.insert("name", in.value("name").toString(letter));
        b.insert("bottle_ml", in.value("bottle_ml").toDouble());
        b.insert("residue_ml", in.value("residue_ml").toDouble());
        b.insert("dry_text", r && !r->dry_at.isEmpty() ? dayClock(r->dry_at) : QString());
        bottles_.append(b);
    }
    compute_levels();
    last_recompute_ms_ = elapsed_ms(timer);
    if (shown_bottle_fields(bottles_) != shown_bottle_fields(old_bottles))
        emit bottlesChanged();
    if (warnings_ != old_warnings)
        emit warningsChanged();
    emit resultChanged();
}

void Plan::compute_levels() {
    levels_ = {};
    if (!workspace_)
        return;
    // The adapter: the core's result (per-row volumes, totals, run-dry times) as the typed input
    // of chem::bottle_levels, clock times turned into hours from the start.
    chem::BottleLevelsInput in;
    const PlanResult* p = planResult();
    for (const QString& l : lineLetters()) {
        const int i = chem::line_index(l.toStdString());
        if (i < 0)
            continue;
        const SequenceLineResult* r = p ? p->line(i) : nullptr;
        chem::BottleLevelLine b;
        b.bottle_ml = line(l).value("bottle_ml").toDouble();
        b.residue_ml = line(l).value("residue_ml").toDouble();
        b.prime_ml = r ? r->plan.prime_ml : primeMl(l);
        b.required_ml = r ? r->plan.required_ml : 0.0;
        if (r && r->plan.runs_dry && r->plan.dry_at_min)
            b.dry_at_hours = *r->plan.dry_at_min / 60.0;
        in.lines[i] = b;
    }
    if (p) {
        in.rows.reserve(p->rows.size());
        for (const chem::RowPlan& row : p->rows) {
            chem::BottleLevelRow r;
            // To the second, as the row's clock time is written.
            r.end_hours = double(std::llround(row.end_min * 60.0)) / 3600.0;
            for (int i = 0; i < chem::max_lines; ++i)
                r.volume_ml[i] = p->defined[std::size_t(i)] ? row.volume_ml[std::size_t(i)] : 0.0;
            in.rows.push_back(r);
        }
        if (p->standby_min > 0)
            in.standby_end_hours = (p->total_min + p->standby_min) / 60.0;
    }
    in.waste_ml = wasteMl();
    in.waste_capacity_ml = wasteCapacityMl();
    levels_ = chem::bottle_levels(in);
}

namespace {
QList<QPointF> points_of(const std::vector<chem::LevelPoint>& pts) {
    QList<QPointF> out;
    out.reserve(qsizetype(pts.size()));
    for (const chem::LevelPoint& p : pts)
        out.append(QPointF(p.hours, p.ml));
    return out;
}
} // namespace

void Plan::fillLevelSeries(QObject* series, const QString& letter) const {
    const int i = chem::line_index(letter.toStdString());
    QList<QPointF> pts = i < 0 ? QList<QPointF>() : points_of(levels_.level[i]);
    for (QPointF& p : pts)
        p.setY(std::max(0.0, p.y())); // a bottle does not go below empty
    replace_series(series, pts);
}

void Plan::fillDrySeries(QObject* series, const QString& letter) const {
    const int i = chem::line_index(letter.toStdString());
    const std::optional<chem::LevelPoint> dry = i < 0 ? std::nullopt : levels_.dry[i];
    replace_series(series, dry ? QList<QPointF>{QPointF(dry->hours, dry->ml)} : QList<QPointF>());
}

void Plan::fillWasteSeries(QObject* series) const {
    replace_series(series, points_of(levels_.waste));
}

QVariantMap Plan::methodConditions(const QString& method) const {
    QVariantMap out{{"hasEluent", false}, {"hasPressure", false}};
    double lo = 14, hi = 0, span = 0;
    bool extrapolated = false;
    const PlanResult* res = planResult();
    const std::string name = method.toStdString();
    const chem::EluentTrace* eluent = res ? res->eluent_of(name) : nullptr;
    if (eluent && !eluent->points.empty()) {
        for (const chem::EluentTracePoint& p : eluent->points) {
            lo = std::min(lo, p.ph_s_s);
            hi = std::max(hi, p.ph_s_s);
            span = std::max(span, p.t_min);
            extrapolated |= p.extrapolated;
        }
        out.insert("hasEluent", true);
        out.insert("phMin", lo);
        out.insert("phMax", hi);
        out.insert("extrapolated", extrapolated);
    }
    const chem::PressureTrace* pressure = res ? res->pressure(name) : nullptr;
    if (pressure && !pressure->points.empty()) {
        for (const chem::PressurePoint& p : pressure->points)
            span = std::max(span, p.t_min);
        out.insert("hasPressure", true);
        out.insert("maxBar", pressure->max_pressure_bar);
        out.insert("maxAtMin", pressure->max_at_t_min);
        out.insert("limitBar", pressure->limit ? pressure->limit->bar : 0.0);
        out.insert("limitedBy",
                   pressure->limit
                       ? QString::fromLatin1(chem::limit_source_name(pressure->limit->source))
                       : QString());
        out.insert("calibrated", pressure->calibrated);
    }
    out.insert("spanMin", span);
    return out;
}

void Plan::fillConditionSeries(QObject* series, const QString& method, const QString& which) const {
    QList<QPointF> pts;
    const PlanResult* res = planResult();
    const std::string name = method.toStdString();
    if (!res) {
    } else if (which == QLatin1String("ph")) {
        if (const chem::EluentTrace* eluent = res->eluent_of(name))
            for (const chem::EluentTracePoint& p : eluent->points)
                pts.append(QPointF(p.t_min, p.ph_s_s));
    } else if (const chem::PressureTrace* pressure = res->pressure(name)) {
        if (which == QLatin1String("pressure")) {
            for (const chem::PressurePoint& p : pressure->points)
                pts.append(QPointF(p.t_min, p.pressure_bar));
        } else if (which == QLatin1String("limit") && pressure->limit && pressure->limit->bar > 0 &&
                   !pressure->points.empty()) {
            const double bar = pressure->limit->bar;
            pts = {QPointF(0, bar), QPointF(pressure->points.back().t_min, bar)};
        }
    }
    replace_series(series, pts);
}

} // namespace phaseplan::gui

#include "plan.h"

#include "core/line_commands.h"
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

QJsonObject obj(const QJsonObject& o, const char* key) { return o.value(QLatin1String(key)).toObject(); }

/// A contract clock time; one without an offset is wall-clock time with no daylight-saving jumps
/// (as the core counts it), so it is read as UTC here.
QDateTime wall_clock(const QString& iso) {
    QDateTime t = QDateTime::fromString(iso, Qt::ISODate);
    if (t.isValid() && t.timeSpec() == Qt::LocalTime) t.setTimeSpec(Qt::UTC);
    return t;
}

double hours_between(const QString& from_iso, const QString& to_iso) {
    const QDateTime a = wall_clock(from_iso);
    const QDateTime b = wall_clock(to_iso);
    if (!a.isValid() || !b.isValid()) return -1;
    return a.secsTo(b) / 3600.0;
}

} // namespace

Plan::Plan(QObject* parent) : QObject(parent) {
    autosave_.setSingleShot(true);
    autosave_.setInterval(autosave_delay_ms);
    connect(&autosave_, &QTimer::timeout, this, &Plan::flushAutosave);
    recompute_timer_.setSingleShot(true);
    recompute_timer_.setInterval(0);
    connect(&recompute_timer_, &QTimer::timeout, this, &Plan::recompute);
    doc_ = starter_plan();
    name_ = tr("New plan");
    update_buffer_lines();
}

Plan::~Plan() { flushAutosave(); }

void Plan::setWorkspace(Workspace* w) {
    if (w == workspace_) return;
    if (workspace_) disconnect(workspace_, nullptr, this, nullptr);
    workspace_ = w;
    if (w) connect(w, &Workspace::libraryChanged, this, &Plan::recompute);
    emit workspaceChanged();
    if (restore_) restore_state();
    recompute();
}

void Plan::restore_state() {
    if (!workspace_ || !workspace_->database()) return;
    const QJsonObject saved = workspace_->database()->setting(current_plan_key).toObject();
    if (!saved.isEmpty()) {
        name_ = saved.value("name").toString();
        doc_ = saved.value("document").toObject();
    } else if (auto demo = workspace_->database()->load(storage::DocumentKind::sequence, Workspace::demoName())) {
        name_ = Workspace::demoName();
        doc_ = *demo;
    }
    update_buffer_lines();
    emit documentChanged();
    emit documentReplaced();
}

void Plan::flushAutosave() {
    if (!dirty_ || !workspace_ || !workspace_->database()) return;
    autosave_.stop();
    const FieldError e = guarded([&] {
        workspace_->database()->set_setting(current_plan_key, QJsonObject{{"name", name_}, {"document", doc_}});
    });
    if (!e.empty()) qWarning("PhasePlan: autosave failed: %s", qPrintable(e.message));
    dirty_ = false;
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
    QVariantList list;
    for (const QString& l : lineLetters())
        if (!lineBuffer(l).isEmpty())
            list.append(QVariantMap{{"id", l}, {"name", tr("Line %1: %2").arg(l, line(l).value("name").toString())}});
    if (list == buffer_lines_) return;
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
    if (recompute_timer_.isActive()) recompute();
}

void Plan::setName(const QString& n) {
    if (n == name_) return;
    name_ = n;
    edited();
}

QStringList Plan::lineLetters() const {
    QStringList out;
    const QJsonObject lines = obj(doc_, "lines");
    for (const QString& l : {QStringLiteral("A"), QStringLiteral("B"), QStringLiteral("C"), QStringLiteral("D")})
        if (lines.contains(l)) out << l;
    return out;
}

QStringList Plan::methodNames() const { return obj(doc_, "methods").keys(); }

QString Plan::start() const { return doc_.value("start").toString(); }
void Plan::setStart(const QString& iso) {
    if (iso == start()) return;
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
    if (!has_offset) t.setTimeSpec(Qt::UTC);
    t = t.addSecs(60LL * minutes);
    // Keep the form the user wrote: wall-clock time stays without an offset.
    setStart(has_offset && s.size() > 19 ? t.toString(Qt::ISODate)
                                         : t.toString(QStringLiteral("yyyy-MM-ddTHH:mm:ss")));
}

double Plan::wasteCapacityMl() const { return doc_.value("waste_ml").toDouble(); }
void Plan::setWasteCapacityMl(double ml) {
    if (doc_.value("waste_ml").isDouble() && ml == wasteCapacityMl()) return;
    if (ml > 0) doc_.insert("waste_ml", ml);
    else doc_.remove("waste_ml");
    edited();
}

QString Plan::detectorType() const { return obj(doc_, "detector").value("type").toString(QStringLiteral("uv")); }
void Plan::setDetectorType(const QString& t) {
    QJsonObject d = obj(doc_, "detector");
    if (d.value("type").toString() == t) return;
    d.insert("type", t);
    doc_.insert("detector", d);
    edited();
}

double Plan::detectorWavelengthNm() const { return obj(doc_, "detector").value("wavelength_nm").toDouble(); }
void Plan::setDetectorWavelengthNm(double nm) {
    QJsonObject d = obj(doc_, "detector");
    if (d.value("wavelength_nm").toDouble() == nm && d.contains("wavelength_nm")) return;
    d.insert("wavelength_nm", nm);
    doc_.insert("detector", d);
    edited();
}

double Plan::columnPhMin() const { return obj(doc_, "column").value("ph_min").toDouble(); }
double Plan::columnPhMax() const { return obj(doc_, "column").value("ph_max").toDouble(); }
void Plan::setColumnPhMin(double v) {
    QJsonObject c = obj(doc_, "column");
    if (c.contains("ph_min") && c.value("ph_min").toDouble() == v) return;
    c.insert("ph_min", v);
    doc_.insert("column", c);
    edited();
}
void Plan::setColumnPhMax(double v) {
    QJsonObject c = obj(doc_, "column");
    if (c.contains("ph_max") && c.value("ph_max").toDouble() == v) return;
    c.insert("ph_max", v);
    doc_.insert("column", c);
    edited();
}

QString Plan::endTime() const { return result_.value("end").toString(); }
QString Plan::endText() const { return short_clock(endTime()); }
double Plan::totalMin() const { return result_.value("total_min").toDouble(); }
double Plan::wasteMl() const { return result_.value("waste_ml").toDouble(); }

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
    dirty_ = true;
    autosave_.start();
    update_buffer_lines();
    emit documentChanged();
    emit documentReplaced();
    recompute();
}

bool Plan::loadSaved(const QString& name) {
    if (!workspace_ || !workspace_->database()) return false;
    auto d = workspace_->database()->load(storage::DocumentKind::sequence, name);
    if (!d) return false;
    loadJson(*d, name);
    return true;
}

QString Plan::saveAs(const QString& name) {
    if (!workspace_ || !workspace_->database()) return tr("no database is open");
    const QString n = name.trimmed();
    const FieldError e = guarded([&] {
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
            const QJsonObject buffer = lineBuffer(it.key());
            if (!buffer.isEmpty())
                docs.push_back({storage::DocumentKind::buffer, buffer.value("name").toString(line_name + " buffer"),
                                buffer, {}});
        }
        workspace_->database()->save_all(docs);
    });
    if (!e.empty()) return e.message;
    name_ = n;
    dirty_ = true;
    flushAutosave();
    emit documentChanged();
    workspace_->notifySaved();
    return {};
}

QJsonObject Plan::line(const QString& letter) const { return obj(doc_, "lines").value(letter).toObject(); }

void Plan::setLine(const QString& letter, const QJsonObject& l) {
    QJsonObject lines = obj(doc_, "lines");
    if (l.isEmpty()) {
        lines.remove(letter);
        QJsonObject prime = obj(doc_, "prime_ml");
        prime.remove(letter);
        doc_.insert("prime_ml", prime);
    } else {
        if (lines.value(letter).toObject() == l) return;
        lines.insert(letter, l);
    }
    doc_.insert("lines", lines);
    edited();
}

void Plan::setLineField(const QString& letter, const QString& key, const QVariant& value) {
    QJsonObject l = line(letter);
    const QJsonValue v = QJsonValue::fromVariant(value);
    if (l.value(key) == v) return;
    l.insert(key, v);
    setLine(letter, l);
}

double Plan::primeMl(const QString& letter) const { return obj(doc_, "prime_ml").value(letter).toDouble(); }

void Plan::setPrimeMl(const QString& letter, double ml) {
    QJsonObject prime = obj(doc_, "prime_ml");
    if (prime.contains(letter) && prime.value(letter).toDouble() == ml) return;
    prime.insert(letter, ml);
    doc_.insert("prime_ml", prime);
    edited();
}

QJsonObject Plan::lineBuffer(const QString& letter) const {
    for (const QJsonValue& p : line(letter).value("parts").toArray())
        if (p.toObject().contains("buffer")) return p.toObject().value("buffer").toObject();
    return {};
}

double Plan::lineBufferVolumeMl(const QString& letter) const {
    const QJsonObject l = line(letter);
    for (const QJsonValue& p : l.value("parts").toArray())
        if (p.toObject().contains("buffer"))
            return l.value("bottle_ml").toDouble() * p.toObject().value("fraction_v").toDouble();
    return 0;
}

void Plan::setLineBuffer(const QString& letter, const QJsonObject& recipe) {
    QJsonObject l = line(letter);
    QJsonArray parts = l.value("parts").toArray();
    for (int i = 0; i < parts.size(); ++i) {
        QJsonObject p = parts[i].toObject();
        if (!p.contains("buffer")) continue;
        if (p.value("buffer").toObject() == recipe) return;
        p.insert("buffer", recipe);
        parts[i] = p;
        l.insert("parts", parts);
        setLine(letter, l);
        return;
    }
}

QJsonObject Plan::method(const QString& name) const { return obj(doc_, "methods").value(name).toObject(); }

void Plan::setMethod(const QString& name, const QJsonObject& m) {
    QJsonObject methods = obj(doc_, "methods");
    if (methods.value(name).toObject() == m) return;
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
        m = QJsonObject{{"flow_ml_min", 1.0}, {"run_min", 12}, {"equilibration_min", 5},
                        {"gradient", QJsonArray{r0, r1}}};
    }
    const QString base = like.isEmpty() ? tr("method") : like;
    QString name = base;
    for (int i = 2; methods.contains(name); ++i) name = QStringLiteral("%1 %2").arg(base).arg(i);
    methods.insert(name, m);
    doc_.insert("methods", methods);
    edited();
    return name;
}

QString Plan::removeMethod(const QString& name) {
    for (const QJsonValue& r : rows())
        if (r.toObject().value("method").toString() == name)
            return tr("\"%1\" is used by a sequence row: change or remove the row first").arg(name);
    QJsonObject methods = obj(doc_, "methods");
    methods.remove(name);
    doc_.insert("methods", methods);
    edited();
    return {};
}

QJsonArray Plan::rows() const { return doc_.value("sequence").toArray(); }

void Plan::setRows(const QJsonArray& r) {
    if (r == rows()) return;
    doc_.insert("sequence", r);
    edited();
}

// ---- recompute ----------------------------------------------------------------------------

void Plan::recompute() {
    recompute_timer_.stop();
    QElapsedTimer timer;
    timer.start();
    QJsonObject out;
    if (!workspace_ || !workspace_->ready())
        error_ = {QString(), tr("the reference data are not loaded")};
    else
        error_ = guarded([&] { out = command_sequence(workspace_->data(), doc_, {}); });
    result_ = error_.empty() ? out : QJsonObject();
    const QVariantList old_warnings = warnings_, old_bottles = bottles_;
    warnings_.clear();
    bottles_.clear();
    injections_ = 0;
    for (const QJsonValue& r : rows()) injections_ += r.toObject().value("injections").toInt();
    if (error_.empty()) {
        for (const QJsonValue& w : out.value("warnings").toArray()) warnings_.append(w.toObject().toVariantMap());
        const QJsonObject lines = obj(out, "lines");
        for (const QString& letter : lineLetters()) {
            const QJsonObject in = line(letter);
            QVariantMap b = obj(lines, letter.toLatin1().constData()).toVariantMap();
            b.insert("letter", letter);
            b.insert("name", in.value("name").toString(letter));
            b.insert("bottle_ml", in.value("bottle_ml").toDouble());
            b.insert("residue_ml", in.value("residue_ml").toDouble());
            b.insert("dry_text", b.value("dry_at").toString().isEmpty() ? QString()
                                                                       : short_clock(b.value("dry_at").toString()));
            bottles_.append(b);
        }
    }
    compute_levels();
    last_recompute_ms_ = elapsed_ms(timer);
    if (bottles_ != old_bottles) emit bottlesChanged();
    if (warnings_ != old_warnings) emit warningsChanged();
    emit resultChanged();
}

void Plan::compute_levels() {
    levels_.clear();
    dry_points_.clear();
    waste_.clear();
    chart_hours_ = 1;
    chart_max_ml_ = 100;
    if (!error_.empty() || !workspace_) return;
    // Each bottle's level at the end of every sequence row, from the core's per-row volumes
    // ("rows[i].volume_ml"): within a row every injection draws the same volume in the same
    // time, so the straight line between row ends is exact at every injection boundary. The
    // standby after the last injection ends at the core's totals (required_ml, waste_ml).
    const QStringList letters = lineLetters();
    const QJsonObject res_lines = obj(result_, "lines");
    std::map<QString, double> level;
    double waste = 0;
    for (const QString& l : letters) {
        const double bottle = line(l).value("bottle_ml").toDouble();
        level[l] = bottle - res_lines.value(l).toObject().value("prime_ml").toDouble(primeMl(l));
        waste += bottle - level[l];
        levels_[l].append(QPointF(0, level[l]));
        chart_max_ml_ = std::max(chart_max_ml_, bottle);
    }
    waste_.append(QPointF(0, waste));
    for (const QJsonValue& v : result_.value("rows").toArray()) {
        const QJsonObject row = v.toObject();
        const double h = hours_between(start(), row.value("end").toString());
        if (h < 0) continue;
        const QJsonObject vol = row.value("volume_ml").toObject();
        for (const QString& l : letters) {
            level[l] -= vol.value(l).toDouble();
            waste += vol.value(l).toDouble();
            levels_[l].append(QPointF(h, level[l]));
        }
        waste_.append(QPointF(h, waste));
    }
    const double standby_min = result_.value("standby_min").toDouble();
    if (standby_min > 0) {
        const double h = (totalMin() + standby_min) / 60.0;
        for (const QString& l : letters)
            levels_[l].append(QPointF(h, line(l).value("bottle_ml").toDouble() -
                                             res_lines.value(l).toObject().value("required_ml").toDouble()));
        waste_.append(QPointF(h, wasteMl()));
    }
    for (const QString& l : letters) {
        const QJsonObject r = res_lines.value(l).toObject();
        if (r.value("runs_dry").toBool()) {
            const double h = r.contains("dry_at_min") ? r.value("dry_at_min").toDouble() / 60.0
                                                      : hours_between(start(), r.value("dry_at").toString());
            if (h >= 0) dry_points_[l] = QPointF(h, line(l).value("residue_ml").toDouble());
        }
    }
    for (const QPointF& p : waste_) chart_max_ml_ = std::max(chart_max_ml_, p.y());
    chart_max_ml_ = std::max(chart_max_ml_, wasteCapacityMl());
    double last = 0;
    for (auto& [l, pts] : levels_)
        if (!pts.isEmpty()) last = std::max(last, pts.back().x());
    chart_hours_ = std::max(1.0, std::ceil(last));
}

void Plan::fillLevelSeries(QObject* series, const QString& letter) const {
    auto it = levels_.find(letter);
    QList<QPointF> pts = it == levels_.end() ? QList<QPointF>() : it->second;
    for (QPointF& p : pts) p.setY(std::max(0.0, p.y())); // a bottle does not go below empty
    replace_series(series, pts);
}

void Plan::fillDrySeries(QObject* series, const QString& letter) const {
    auto it = dry_points_.find(letter);
    replace_series(series, it == dry_points_.end() ? QList<QPointF>() : QList<QPointF>{it->second});
}

void Plan::fillWasteSeries(QObject* series) const { replace_series(series, waste_); }

} // namespace phaseplan::gui

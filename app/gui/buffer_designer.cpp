#include "buffer_designer.h"

#include "chem/note_text.h"
#include "chem/recipe_roles.h"
#include "chem/titration_curve.h"
#include "core/chem_json.h"
#include "core/commands.h"
#include "field_words.h"
#include "number_text.h"
#include "plan.h"
#include "workspace.h"

#include <QJsonArray>
#include <QLocale>

#include <algorithm>
#include <cmath>

namespace phaseplan::gui {

namespace {

constexpr int curve_points = 41; ///< points per curve: enough for a smooth line, < 2 ms of solves

/// The smallest of 1, 2, 2.5, 5 × 10^k at or above v: an axis end that reads well.
double nice_ceiling(double v) {
    if (!(v > 0))
        return 1;
    const double p = std::pow(10.0, std::floor(std::log10(v)));
    for (double m : {1.0, 2.0, 2.5, 5.0, 10.0})
        if (m * p >= v * (1 - 1e-9))
            return m * p;
    return 10 * p;
}

/// A concentration for a name: "20", "12.5", "0.75" (no trailing zeros), locale-independent.
QString format_fixed_text(double v) {
    return QString::fromStdString(chem::format_number(std::round(v * 100) / 100));
}

constexpr int autosave_delay_ms = 300;

} // namespace

BufferDesigner::BufferDesigner(QObject* parent) : QObject(parent) {
    autosave_.setSingleShot(true);
    autosave_.setInterval(autosave_delay_ms);
    connect(&autosave_, &QTimer::timeout, this, &BufferDesigner::flushAutosave);
    connect(this, &BufferDesigner::edited, this, &BufferDesigner::schedule_autosave);
}

BufferDesigner::~BufferDesigner() {
    flushAutosave();
    if (plan_)
        plan_->flushAutosave(); // a rename just written: the lines' new reference with it
}

void BufferDesigner::setAutosaveKey(const QString& k) {
    if (k == autosave_key_)
        return;
    autosave_key_ = k;
    emit workspaceChanged();
    restore_state();
}

void BufferDesigner::schedule_autosave() {
    dirty_ = true;
    autosave_.start();
}

QJsonObject BufferDesigner::saved_document() const {
    QJsonObject doc = requestDocument();
    if (auto_name_)
        doc.insert("auto_name", true);
    else
        doc.remove("auto_name");
    return doc;
}

void BufferDesigner::flushAutosave() {
    if (!dirty_ || buffer_name_.isEmpty() || !workspace_ || !workspace_->database())
        return;
    autosave_.stop();
    if (!workspace_->canSave())
        return; // read-only or locked: the banner says so, and dirty_ stays for a later save
    if (!conflict_.isEmpty())
        return; // refused once: the edits stay on screen until Reload or Save as a copy
    // The automatic name follows the inputs as they settled, in the same pause as the save: a
    // rename is a checked write, too slow for every keystroke (it was over half an edit's time).
    follow_default_name();
    if (!conflict_.isEmpty())
        return; // the rename was refused (changed on another bench): Reload or Save as a copy
    if (save_buffer())
        dirty_ = false; // on a failure the edits stay pending: saved with the next change, or
                        // when a lost connection comes back (Workspace::connectionRestored)
}

bool BufferDesigner::save_buffer() {
    const FieldError e = guarded([&] {
        loaded_version_ = workspace_->database()->save_checked(
            storage::DocumentKind::buffer, buffer_name_, saved_document(), {}, loaded_version_);
    });
    if (e.field == QLatin1String("version")) {
        set_conflict(e.message, {});
        return false;
    }
    const QString key = QStringLiteral("buffer:") + buffer_name_;
    if (e.empty()) {
        set_conflict({}, {}); // saved: an earlier notice of another bench's change is history
        workspace_->saveSucceeded(key);
        return true;
    }
    workspace_->saveFailed(tr("the buffer \"%1\"").arg(buffer_name_), e.message, e.field, key,
                           saved_document());
    return false;
}

void BufferDesigner::set_conflict(const QString& conflict, const QString& notice) {
    if (conflict == conflict_ && notice == remote_notice_)
        return;
    conflict_ = conflict;
    remote_notice_ = notice;
    emit conflictChanged();
}

FieldError BufferDesigner::move_to_name(const QString& old, const QString& name) {
    storage::Database* db = workspace_->database();
    const FieldError e = guarded([&] {
        if (!db->versioned()) {
            if (!db->rename(storage::DocumentKind::buffer, old, name))
                db->save(storage::DocumentKind::buffer, name, saved_document());
            return;
        }
        if (loaded_version_ > 0) {
            loaded_version_ =
                db->rename_checked(storage::DocumentKind::buffer, old, name, loaded_version_);
            return;
        }
        storage::SavedDocument d{storage::DocumentKind::buffer, name, saved_document(), {}};
        d.expected_version = 0;
        db->save_all({d});
        loaded_version_ = db->stamp(storage::DocumentKind::buffer, name).version;
    });
    if (e.field == QLatin1String("version"))
        set_conflict(e.message, {}); // ours changed or went since it was loaded: Reload or copy
    return e;
}

void BufferDesigner::take_stored_version() {
    guarded([&] {
        loaded_version_ =
            workspace_->database()->stamp(storage::DocumentKind::buffer, buffer_name_).version;
    });
}

bool BufferDesigner::reloadBuffer() {
    if (!workspace_ || !workspace_->database() || buffer_name_.isEmpty())
        return false;
    std::optional<QJsonObject> doc;
    QString now_named;
    guarded([&] {
        // Renamed on another bench meanwhile: follow it to the name it has now.
        now_named =
            workspace_->database()->current_name(storage::DocumentKind::buffer, buffer_name_);
        if (!now_named.isEmpty())
            doc = workspace_->database()->load(storage::DocumentKind::buffer, now_named);
    });
    if (!doc)
        return false;
    const bool moved = now_named != buffer_name_;
    buffer_name_ = now_named;
    autosave_.stop();
    dirty_ = false;
    auto_name_ = doc->value("auto_name").toBool(false);
    loadJson(*doc);
    take_stored_version();
    set_conflict({}, {});
    if (moved) {
        rebuild_buffer_list();
        remember_current();
        emit inputsChanged();
    }
    emit bufferChanged();
    return true;
}

QString BufferDesigner::saveBufferAsCopy() {
    if (!workspace_ || !workspace_->database() || buffer_name_.isEmpty())
        return tr("no buffer is open");
    autosave_.stop();
    QString name;
    const FieldError e = guarded([&] {
        name = workspace_->database()->save_copy(storage::DocumentKind::buffer, buffer_name_,
                                                 saved_document(), {});
    });
    if (!e.empty())
        return e.message;
    buffer_name_ = name;
    auto_name_ = false;
    take_stored_version();
    set_conflict({}, {});
    dirty_ = true; // once more, with its own name inside the document
    flushAutosave();
    announce_buffer_change();
    return {};
}

void BufferDesigner::refreshFromDatabase() {
    if (!workspace_ || !workspace_->database() || buffer_name_.isEmpty())
        return;
    storage::RowStamp now;
    if (!guarded([&] {
             now = workspace_->database()->stamp(storage::DocumentKind::buffer, buffer_name_);
         }).empty())
        return;
    if (now.version == loaded_version_ || loaded_version_ == 0)
        return;
    const QSqlDatabase c = workspace_->database()->connection();
    if (now.version == 0) {
        std::optional<storage::Retirement> gone;
        QString now_named;
        guarded([&] {
            gone = workspace_->database()->retirement(storage::DocumentKind::buffer, buffer_name_);
            now_named =
                workspace_->database()->current_name(storage::DocumentKind::buffer, buffer_name_);
        });
        if (!gone) {
            set_conflict({}, tr("This buffer was removed or renamed on another bench; what "
                                "you see is kept here only: save it as a copy to keep it."));
            return;
        }
        const QString by = tr("by %1 at %2")
                               .arg(storage::person_words(c, gone->retired_by),
                                    storage::utc_time_words(gone->retired_at));
        if (gone->renamed_to.isEmpty() || now_named.isEmpty()) {
            set_conflict({}, tr("Removed on another bench %1; what you see is kept here only: "
                                "save it as a copy to keep it.")
                                 .arg(by));
            return;
        }
        if (dirty_) {
            set_conflict({}, tr("Renamed to “%1” on another bench %2. Your changes here are not "
                                "saved yet: saving them will offer to reload it under its new "
                                "name or to save a copy.")
                                 .arg(now_named, by));
            return;
        }
        const QString old = buffer_name_;
        reloadBuffer(); // follows the rename
        set_conflict({}, tr("“%1” was renamed to “%2” on another bench %3; shown under its new "
                            "name.")
                             .arg(old, now_named, by));
        return;
    }
    const QString who_when =
        tr("by %1 at %2")
            .arg(storage::person_words(c, now.changed_by), storage::utc_time_words(now.changed_at));
    if (!conflict_.isEmpty())
        return; // the refusal on screen already names who changed it: nothing to add
    if (dirty_) {
        set_conflict({}, tr("Changed on another bench %1. Your changes here are not saved "
                            "yet: saving them will offer to reload or to save a copy.")
                             .arg(who_when));
        return;
    }
    reloadBuffer();
    set_conflict({}, tr("Changed on another bench %1; shown as saved there.").arg(who_when));
}

void BufferDesigner::remember_current() {
    if (autosave_key_.isEmpty() || !workspace_ || !workspace_->canSave())
        return;
    guarded([&] {
        workspace_->database()->set_setting(autosave_key_, QJsonObject{{"name", buffer_name_}});
    });
}

void BufferDesigner::componentComplete() {
    constructing_ = false;
    restore_state();
}

void BufferDesigner::restore_state() {
    if (constructing_ || restored_ || !workspace_ || !workspace_->database())
        return;
    restored_ = true;
    rebuild_buffer_list();
    QString name;
    if (!autosave_key_.isEmpty()) {
        const QJsonObject saved = workspace_->database()->setting(autosave_key_).toObject();
        name = saved.value("name").toString();
        // Earlier versions kept the designer's own buffer in the setting itself.
        const QJsonObject own = saved.value("buffer").toObject();
        if (name.isEmpty() && !own.isEmpty()) {
            loadJson(own);
            name = free_name(own.value("name").toString(defaultName()));
            guarded(
                [&] { workspace_->database()->save(storage::DocumentKind::buffer, name, own); });
            rebuild_buffer_list();
        }
    }
    if (!name.isEmpty() && openBuffer(name)) {
        // Edits a lost connection kept on this tablet win over the database's copy, and are
        // saved there at once (with the version check: a change made meanwhile on another
        // bench is refused, not overwritten).
        const QJsonObject kept = workspace_->keptLocally(QStringLiteral("buffer:") + name);
        if (!kept.isEmpty() && kept != saved_document()) {
            loadJson(kept);
            schedule_autosave();
        }
        return;
    }
    // First run: the buffer the plan's first line holds (the demo's), else the newest saved one,
    // else a new one.
    if (plan_)
        for (const QString& l : plan_->lineLetters()) {
            const QString ref = plan_->lineBufferRef(l);
            if (!ref.isEmpty() && openBuffer(ref))
                return;
        }
    const auto saved = workspace_->database()->list(storage::DocumentKind::buffer);
    if (!saved.empty() && openBuffer(saved.front().name))
        return;
    newBuffer();
}

void BufferDesigner::rebuild_buffer_list() {
    QVariantList list;
    if (workspace_ && workspace_->database()) {
        auto infos = workspace_->database()->list(storage::DocumentKind::buffer);
        std::sort(infos.begin(), infos.end(), [](const auto& a, const auto& b) {
            return QString::localeAwareCompare(a.name, b.name) < 0;
        });
        for (const auto& i : infos)
            list.append(QVariantMap{{"id", i.name}, {"name", i.name}});
    }
    if (list == buffer_choices_)
        return;
    buffer_choices_ = list;
    emit bufferListChanged();
}

void BufferDesigner::rename_in_buffer_list(const QString& old, const QString& name) {
    // The list as rebuild_buffer_list() would read it back after this bench's own rename, without
    // reading every saved buffer again on each automatic rename. Changes from elsewhere still
    // come through rebuild_buffer_list (Workspace::savedChanged).
    QStringList names;
    for (const QVariant& v : std::as_const(buffer_choices_)) {
        const QString n = v.toMap().value(QStringLiteral("name")).toString();
        if (n != old && n != name)
            names << n;
    }
    names << name;
    std::sort(names.begin(), names.end(), [](const QString& a, const QString& b) {
        return QString::localeAwareCompare(a, b) < 0;
    });
    QVariantList list;
    for (const QString& n : std::as_const(names))
        list.append(QVariantMap{{"id", n}, {"name", n}});
    if (list == buffer_choices_)
        return;
    buffer_choices_ = list;
    emit bufferListChanged();
}

QStringList BufferDesigner::usedByLines() const {
    QStringList out;
    if (!plan_ || buffer_name_.isEmpty())
        return out;
    for (const QString& l : plan_->lineLetters())
        if (plan_->lineBufferRef(l) == buffer_name_)
            out << l;
    return out;
}

bool BufferDesigner::openBuffer(const QString& name) {
    if (!workspace_ || !workspace_->database())
        return false;
    if (name == buffer_name_ && !buffer_name_.isEmpty())
        return true;
    const auto doc = workspace_->database()->load(storage::DocumentKind::buffer, name);
    if (!doc)
        return false;
    flushAutosave();
    buffer_name_ = name;
    auto_name_ = doc->value("auto_name").toBool(false);
    loadJson(*doc);
    take_stored_version();
    set_conflict({}, {});
    remember_current();
    emit bufferChanged();
    return true;
}

QString BufferDesigner::newBuffer() {
    if (!workspace_ || !workspace_->database())
        return {};
    flushAutosave();
    loading_ = true;
    route_ = QStringLiteral("mix");
    system_ = QStringLiteral("phosphate");
    acid_ = QStringLiteral("sodium-dihydrogen-phosphate-monohydrate");
    base_ = QStringLiteral("disodium-hydrogen-phosphate-heptahydrate");
    weigh_ = acid_;
    titrant_ = QStringLiteral("sodium-hydroxide");
    titrant_mol_per_l_ = 1.0;
    target_ph_ = 7.0;
    temperature_c_ = 25.0;
    volume_ml_ = 1000.0;
    strength_basis_ = QStringLiteral("concentration");
    concentration_mmol_per_l_ = 25.0;
    extra_.clear();
    loading_ = false;
    rebuild_choices();
    auto_name_ = true;
    buffer_name_ = free_name(defaultName());
    loaded_version_ = 0;
    set_conflict({}, {});
    if (workspace_->canSave())
        save_buffer();
    emit inputsChanged();
    recompute();
    rebuild_buffer_list();
    remember_current();
    emit bufferChanged();
    workspace_->notifySaved();
    return buffer_name_;
}

QString BufferDesigner::duplicateBuffer(const QString& wanted) {
    if (!workspace_ || !workspace_->database())
        return tr("no database is open");
    const QString name = wanted.trimmed().isEmpty() ? free_name(tr("%1 (copy)").arg(buffer_name_))
                                                    : wanted.trimmed();
    if (name.size() > 64)
        return tr("Buffer name: “%1…” is longer than 64 characters").arg(name.left(20));
    flushAutosave();
    const bool was_auto = auto_name_;
    auto_name_ = false;
    const QString old = buffer_name_;
    buffer_name_ = name;
    // A new record: a name someone saved meanwhile is refused, naming them (never overwritten).
    const FieldError e = guarded([&] {
        storage::SavedDocument d{storage::DocumentKind::buffer, name, saved_document(), {}};
        d.expected_version = 0;
        workspace_->database()->save_all({d});
    });
    if (!e.empty()) {
        buffer_name_ = old;
        auto_name_ = was_auto;
        return e.message;
    }
    take_stored_version();
    set_conflict({}, {});
    announce_buffer_change();
    return {};
}

void BufferDesigner::announce_buffer_change() {
    rebuild_buffer_list();
    remember_current();
    emit inputsChanged();
    emit bufferChanged();
    workspace_->notifySaved();
}

QString BufferDesigner::renameBuffer(const QString& wanted) {
    if (!workspace_ || !workspace_->database())
        return tr("no database is open");
    const QString name = wanted.trimmed();
    if (name.isEmpty())
        return tr("Buffer name: type a name");
    if (name.size() > 64)
        return tr("Buffer name: “%1…” is longer than 64 characters").arg(name.left(20));
    if (name == buffer_name_) {
        if (auto_name_) {
            auto_name_ = false;
            dirty_ = true;
            flushAutosave();
            emit bufferChanged();
        }
        return {};
    }
    flushAutosave();
    if (!conflict_.isEmpty())
        return conflict_; // this buffer's own save was refused: Reload or Save as a copy first
    const QString old = buffer_name_;
    const FieldError e = move_to_name(old, name);
    if (!e.empty())
        return e.message;
    buffer_name_ = name;
    auto_name_ = false;
    dirty_ = true;
    flushAutosave();
    if (plan_)
        plan_->renameBufferRefs(old, name, requestDocument());
    announce_buffer_change();
    return {};
}

QString BufferDesigner::deleteBuffer() {
    if (!workspace_ || !workspace_->database() || buffer_name_.isEmpty())
        return tr("no buffer is open");
    autosave_.stop();
    dirty_ = false;
    const QString gone = buffer_name_;
    const FieldError e =
        guarded([&] { workspace_->database()->remove(storage::DocumentKind::buffer, gone); });
    if (!e.empty())
        return e.message;
    if (plan_)
        plan_->dropBufferRefs(gone);
    buffer_name_.clear();
    rebuild_buffer_list();
    workspace_->notifySaved();
    const auto saved = workspace_->database()->list(storage::DocumentKind::buffer);
    if (saved.empty() || !openBuffer(saved.front().name))
        newBuffer();
    return {};
}

QString BufferDesigner::free_name(const QString& wanted) const {
    const QString base = wanted.trimmed().isEmpty() ? tr("Buffer") : wanted.trimmed().left(56);
    if (!workspace_ || !workspace_->database())
        return base;
    QString name = base;
    for (int i = 2; workspace_->database()->load(storage::DocumentKind::buffer, name); ++i)
        name = QStringLiteral("%1 (%2)").arg(base).arg(i);
    return name;
}

QString BufferDesigner::errorPlace() const {
    if (error_.field.isEmpty())
        return {};
    QString w = field_words(error_.field);
    if (!w.isEmpty())
        w[0] = w[0].toUpper();
    return w;
}

QString BufferDesigner::defaultName() const {
    // What a method's mobile-phase line says: "20 mM sodium phosphate pH 2.5", "10 mM ammonium
    // formate pH 3.0 (salt basis)". Read from the request the core would be given, so the screen,
    // the saved buffer and the sheet name it alike.
    if (workspace_ && workspace_->ready()) {
        const chem::Library& lib = workspace_->data().reagents;
        QJsonObject doc = requestDocument();
        doc.remove("name");
        doc.remove("auto_name");
        std::string name;
        const FieldError e = guarded(
            [&] { name = chem::default_buffer_name(lib, recipe_request_from_json(lib, doc, "")); });
        if (e.empty() && !name.empty())
            return QString::fromStdString(name);
    }
    const QString strength =
        strength_basis_ == QLatin1String("ionic_strength")
            ? tr("I = %1 mM").arg(format_fixed_text(ionic_strength_mmol_per_l_))
            : tr("%1 mM").arg(format_fixed_text(concentration_mmol_per_l_));
    return tr("%1 buffer pH %2")
        .arg(strength, QString::fromStdString(chem::format_fixed(target_ph_, 1)));
}

void BufferDesigner::follow_default_name() {
    if (!auto_name_ || !workspace_ || !workspace_->database() || buffer_name_.isEmpty())
        return;
    const QString wanted = defaultName();
    if (wanted == buffer_name_ || buffer_name_.startsWith(wanted + QStringLiteral(" (")))
        return;
    if (!conflict_.isEmpty())
        return; // a refused save is on screen: the name waits for Reload or Save as a copy
    const QString name = free_name(wanted);
    const QString old = buffer_name_;
    if (!move_to_name(old, name).empty())
        return;
    buffer_name_ = name;
    if (plan_)
        plan_->renameBufferRefs(old, name, requestDocument());
    rename_in_buffer_list(old, name);
    remember_current();
    emit bufferChanged();
}

void BufferDesigner::setWorkspace(Workspace* w) {
    if (w == workspace_)
        return;
    if (workspace_)
        disconnect(workspace_, nullptr, this, nullptr);
    workspace_ = w;
    if (w) {
        connect(w, &Workspace::libraryChanged, this, [this] {
            rebuild_choices();
            recompute();
        });
        connect(w, &Workspace::readyChanged, this, [this] {
            rebuild_choices();
            recompute();
            restore_state();
        });
        connect(w, &Workspace::savedChanged, this, &BufferDesigner::rebuild_buffer_list);
        connect(w, &Workspace::databaseChanged, this, &BufferDesigner::refreshFromDatabase);
        connect(w, &Workspace::connectionRestored, this, &BufferDesigner::flushAutosave);
    }
    emit workspaceChanged();
    rebuild_choices();
    restore_state();
    recompute();
}

void BufferDesigner::setPlan(Plan* p) {
    if (p == plan_)
        return;
    if (plan_)
        disconnect(plan_, nullptr, this, nullptr);
    plan_ = p;
    if (p)
        connect(p, &Plan::bufferLinesChanged, this, &BufferDesigner::bufferChanged);
    emit planChanged();
    restore_state();
}

template <class T> void BufferDesigner::set_input(T& member, const T& value) {
    if (member == value)
        return;
    member = value;
    emit inputsChanged();
    if (loading_)
        return;
    after_edit();
}

void BufferDesigner::after_edit() {
    recompute();
    // The name follows in flushAutosave(), when the edit settles: until then the buffer, and the
    // lines that hold it, keep the name it is stored under.
    if (plan_ && !buffer_name_.isEmpty())
        plan_->updateBufferRefs(buffer_name_, requestDocument());
    emit edited();
}

namespace {
std::optional<chem::Route> route_from(const QString& v) {
    if (v == QLatin1String("mix"))
        return chem::Route::mix;
    if (v == QLatin1String("titrate"))
        return chem::Route::titrate;
    if (v == QLatin1String("stocks"))
        return chem::Route::stocks;
    return std::nullopt;
}
} // namespace

void BufferDesigner::setRoute(const QString& v) {
    if (v == route_)
        return;
    const auto from = route_from(route_), to = route_from(v);
    QVariantList notes;
    if (from && to && workspace_ && workspace_->ready()) {
        // The reagents follow the route without being swapped for unrelated ones; what changed is
        // said beside the fields (chem::map_reagents_to_route).
        chem::RouteReagents cur;
        cur.acid = acid_.toStdString();
        cur.base = base_.toStdString();
        cur.weigh = weigh_.toStdString();
        cur.titrant = titrant_.toStdString();
        cur.titrant_form = titrant_form_ == QLatin1String("neat") ? chem::TitrantForm::neat
                                                                  : chem::TitrantForm::solution;
        cur.basis = concentrationBasis() == QLatin1String("salt") ? chem::ConcentrationBasis::salt
                                                                  : chem::ConcentrationBasis::total;
        chem::RouteChange change;
        const FieldError e = guarded([&] {
            change = chem::map_reagents_to_route(workspace_->data().reagents, system_.toStdString(),
                                                 *from, *to, cur);
        });
        if (e.empty()) {
            const bool was_loading = loading_;
            loading_ = true;
            acid_ = QString::fromStdString(change.reagents.acid);
            base_ = QString::fromStdString(change.reagents.base);
            weigh_ = QString::fromStdString(change.reagents.weigh);
            titrant_ = QString::fromStdString(change.reagents.titrant);
            titrant_form_ =
                QString::fromLatin1(chem::titrant_form_name(change.reagents.titrant_form));
            concentration_basis_ = QString::fromLatin1(chem::basis_name(change.reagents.basis));
            loading_ = was_loading;
            for (const chem::RouteNote& n : change.notes)
                notes.append(QVariantMap{{"field", QString::fromStdString(n.field)},
                                         {"message", QString::fromStdString(chem::describe(
                                                         n, workspace_->data().reagents))}});
        }
    }
    route_ = v;
    if (route_notes_ != notes) {
        route_notes_ = notes;
        emit routeNotesChanged();
    }
    rebuild_choices();
    emit inputsChanged();
    if (loading_)
        return;
    after_edit();
}
void BufferDesigner::setSystem(const QString& v) {
    if (v == system_)
        return;
    const bool was_loading = loading_;
    loading_ = true; // one recompute for the system and its default reagents together
    system_ = v;
    if (!route_notes_.isEmpty()) {
        route_notes_.clear();
        emit routeNotesChanged();
    }
    rebuild_choices();
    // Keep the chosen reagents when they belong to the new system, else take its most acidic and
    // most basic forms (the ends of the list), the usual pair to mix.
    auto in_choices = [this](const QString& id) {
        return std::any_of(
            reagent_choices_.begin(), reagent_choices_.end(),
            [&](const QVariant& c) { return c.toMap().value("id").toString() == id; });
    };
    if (!reagent_choices_.isEmpty()) {
        const QString first = reagent_choices_.first().toMap().value("id").toString();
        const QString last = reagent_choices_.last().toMap().value("id").toString();
        if (!in_choices(acid_))
            acid_ = first;
        if (!in_choices(base_))
            base_ = last;
        if (!in_choices(weigh_))
            weigh_ = first;
    }
    rebuild_choices(); // the titrants follow the weighed reagent
    auto in_list = [](const QVariantList& list, const QString& id) {
        return std::any_of(list.begin(), list.end(), [&](const QVariant& c) {
            return c.toMap().value("id").toString() == id;
        });
    };
    if (!titrant_choices_.isEmpty() && !in_list(titrant_choices_, titrant_))
        titrant_ = titrant_choices_.first().toMap().value("id").toString();
    loading_ = was_loading;
    emit inputsChanged();
    if (loading_)
        return;
    after_edit();
}
void BufferDesigner::setAcid(const QString& v) {
    set_input(acid_, v);
    rebuild_choices(); // the base forms offered are those more basic than the acid
}
void BufferDesigner::setBase(const QString& v) {
    set_input(base_, v);
}
void BufferDesigner::setWeigh(const QString& v) {
    set_input(weigh_, v);
    rebuild_choices(); // the titrants offered are those that fit the weighed reagent
}
void BufferDesigner::setTitrant(const QString& v) {
    // A solid titrant (NaOH pellets, a salt) is added as a solution: the "neat" choice stays only
    // for liquids as supplied (formic acid, ammonia solution).
    if (titrant_form_ == QLatin1String("neat") && workspace_ && workspace_->ready())
        if (const chem::Reagent* r = workspace_->data().reagents.find_reagent(v.toStdString()))
            if (r->form != chem::PhysicalForm::liquid) {
                titrant_form_ = QStringLiteral("solution");
                if (v == titrant_)
                    after_edit();
            }
    set_input(titrant_, v);
}
void BufferDesigner::setTitrantMolPerL(double v) {
    set_input(titrant_mol_per_l_, v);
}
void BufferDesigner::setTitrantForm(const QString& v) {
    set_input(titrant_form_, v);
}
QString BufferDesigner::concentrationBasis() const {
    return concentration_basis_.isEmpty() ? effective_basis_ : concentration_basis_;
}
void BufferDesigner::setConcentrationBasis(const QString& v) {
    set_input(concentration_basis_, v);
}
void BufferDesigner::setAcidStockMolPerL(double v) {
    set_input(acid_stock_mol_per_l_, v);
}
void BufferDesigner::setBaseStockMolPerL(double v) {
    set_input(base_stock_mol_per_l_, v);
}
void BufferDesigner::setTargetPh(double v) {
    set_input(target_ph_, v);
}
void BufferDesigner::setTemperatureC(double v) {
    set_input(temperature_c_, v);
}
void BufferDesigner::setVolumeMl(double v) {
    set_input(volume_ml_, v);
}
void BufferDesigner::setStrengthBasis(const QString& v) {
    set_input(strength_basis_, v);
}
void BufferDesigner::setConcentrationMmolPerL(double v) {
    set_input(concentration_mmol_per_l_, v);
}
void BufferDesigner::setIonicStrengthMmolPerL(double v) {
    set_input(ionic_strength_mmol_per_l_, v);
}

namespace {
/// One picker entry: the library's name with the formula ("Formic acid 98 % · HCOOH"), and for a
/// titrant what it does to the weighed reagent ("lowers pH").
QVariantList role_entries(const std::vector<chem::RoleChoice>& choices) {
    QVariantList list;
    for (const chem::RoleChoice& c : choices) {
        QString detail;
        if (c.direction)
            detail = *c.direction == chem::PhDirection::lowers ? QObject::tr("lowers pH")
                                                               : QObject::tr("raises pH");
        if (c.direction && c.strong)
            detail += QObject::tr(", strong");
        QString shown = QString::fromStdString(c.name);
        if (!c.formula.empty())
            shown += QStringLiteral(" · ") + QString::fromStdString(c.formula);
        if (!detail.isEmpty())
            shown += QStringLiteral(" (") + detail + QLatin1Char(')');
        list.append(QVariantMap{{"id", QString::fromStdString(c.reagent)},
                                {"name", shown},
                                {"formula", QString::fromStdString(c.formula)},
                                {"detail", detail}});
    }
    return list;
}
} // namespace

void BufferDesigner::rebuild_choices() {
    system_choices_.clear();
    reagent_choices_.clear();
    titrant_choices_.clear();
    acid_choices_.clear();
    base_choices_.clear();
    weigh_choices_.clear();
    if (workspace_ && workspace_->ready()) {
        const chem::Library& lib = workspace_->data().reagents;
        for (const chem::AcidBaseSystem& s : lib.systems())
            system_choices_.append(QVariantMap{{"id", QString::fromStdString(s.id)},
                                               {"name", QString::fromStdString(s.name)}});
        struct Choice {
            double protons_per_unit;
            QVariantMap entry;
        };
        std::vector<Choice> forms;
        for (const chem::Reagent& r : lib.reagents()) {
            QVariantMap entry{{"id", QString::fromStdString(r.id)},
                              {"name", QString::fromStdString(r.name)},
                              {"formula", QString::fromStdString(r.formula)}};
            if (const chem::SystemShare* sh = r.share(system_.toStdString()))
                forms.push_back({sh->protons_removed / std::max(sh->count, 1e-9), entry});
        }
        std::stable_sort(forms.begin(), forms.end(), [](const Choice& a, const Choice& b) {
            return a.protons_per_unit < b.protons_per_unit;
        });
        for (Choice& c : forms)
            reagent_choices_.append(c.entry);
        // The role pickers: only the forms that fit (chem::reagent_choices).
        const std::string sys = system_.toStdString();
        const chem::RoleChoices mix =
            chem::reagent_choices(lib, sys, chem::Route::mix, acid_.toStdString());
        acid_choices_ = role_entries(mix.acid_forms);
        base_choices_ = role_entries(mix.base_forms);
        const chem::RoleChoices tit =
            chem::reagent_choices(lib, sys, chem::Route::titrate, {}, weigh_.toStdString());
        weigh_choices_ = role_entries(tit.weighable);
        titrant_choices_ = role_entries(tit.titrants);
    }
    emit choicesChanged();
}

QJsonObject BufferDesigner::requestDocument() const {
    QJsonObject doc = QJsonObject::fromVariantMap(extra_);
    if (!buffer_name_.isEmpty())
        doc.insert("name", buffer_name_);
    else
        doc.remove("name");
    doc.insert("target_ph", target_ph_);
    doc.insert("temperature_c", temperature_c_);
    doc.insert("volume_ml", volume_ml_);
    doc.insert("route", route_);
    doc.insert("system", system_);
    for (const char* k : {"acid", "base", "weigh", "titrant", "titrant_mol_per_l", "titrant_form",
                          "acid_stock_mol_per_l", "base_stock_mol_per_l", "concentration_mol_per_l",
                          "ionic_strength_mol_per_l", "concentration_basis"})
        doc.remove(QLatin1String(k));
    if (route_ == QLatin1String("titrate")) {
        doc.insert("weigh", weigh_);
        doc.insert("titrant", titrant_);
        doc.insert("titrant_form", titrant_form_);
        if (titrant_form_ != QLatin1String("neat"))
            doc.insert("titrant_mol_per_l", titrant_mol_per_l_);
    } else {
        doc.insert("acid", acid_);
        doc.insert("base", base_);
        if (route_ == QLatin1String("stocks")) {
            doc.insert("acid_stock_mol_per_l", acid_stock_mol_per_l_);
            doc.insert("base_stock_mol_per_l", base_stock_mol_per_l_);
        }
    }
    if (strength_basis_ == QLatin1String("ionic_strength")) {
        doc.insert("ionic_strength_mol_per_l", ionic_strength_mmol_per_l_ / 1000.0);
    } else {
        doc.insert("concentration_mol_per_l", concentration_mmol_per_l_ / 1000.0);
        if (!concentration_basis_.isEmpty())
            doc.insert("concentration_basis", concentration_basis_);
    }
    return doc;
}

void BufferDesigner::loadDocument(const QVariantMap& doc) {
    loadJson(QJsonObject::fromVariantMap(doc));
}

void BufferDesigner::loadJson(const QJsonObject& doc) {
    loading_ = true;
    auto str = [&](const char* key, QString& member) {
        if (doc.value(QLatin1String(key)).isString())
            member = doc.value(QLatin1String(key)).toString();
    };
    auto num = [&](const char* key, double& member, double scale = 1.0) {
        if (doc.value(QLatin1String(key)).isDouble())
            member = doc.value(QLatin1String(key)).toDouble() * scale;
    };
    str("route", route_);
    str("acid", acid_);
    str("base", base_);
    str("weigh", weigh_);
    str("titrant", titrant_);
    num("titrant_mol_per_l", titrant_mol_per_l_);
    titrant_form_ = doc.value(QLatin1String("titrant_form")).toString(QStringLiteral("solution"));
    concentration_basis_ = doc.value(QLatin1String("concentration_basis")).toString();
    num("acid_stock_mol_per_l", acid_stock_mol_per_l_);
    num("base_stock_mol_per_l", base_stock_mol_per_l_);
    num("target_ph", target_ph_);
    num("temperature_c", temperature_c_);
    num("volume_ml", volume_ml_);
    if (doc.contains(QLatin1String("ionic_strength_mol_per_l"))) {
        strength_basis_ = QStringLiteral("ionic_strength");
        num("ionic_strength_mol_per_l", ionic_strength_mmol_per_l_, 1000.0);
    } else if (doc.contains(QLatin1String("concentration_mol_per_l"))) {
        strength_basis_ = QStringLiteral("concentration");
        num("concentration_mol_per_l", concentration_mmol_per_l_, 1000.0);
    }
    // The system: as saved, or the one the chosen reagent brings.
    QString sys = doc.value(QLatin1String("system")).toString();
    if (sys.isEmpty() && workspace_ && workspace_->ready()) {
        const QString id = route_ == QLatin1String("titrate") ? weigh_ : acid_;
        if (const chem::Reagent* r = workspace_->data().reagents.find_reagent(id.toStdString()))
            if (!r->systems.empty())
                sys = QString::fromStdString(r->systems.front().system);
    }
    if (!sys.isEmpty())
        system_ = sys;
    QVariantMap extra = doc.toVariantMap();
    for (const char* k :
         {"name", "auto_name", "route", "system", "acid", "base", "weigh", "titrant",
          "titrant_mol_per_l", "titrant_form", "concentration_basis", "acid_stock_mol_per_l",
          "base_stock_mol_per_l", "target_ph", "temperature_c", "volume_ml",
          "concentration_mol_per_l", "ionic_strength_mol_per_l"})
        extra.remove(QLatin1String(k));
    extra_ = extra;
    loading_ = false;
    emit inputsChanged();
    rebuild_choices();
    recompute();
}

void BufferDesigner::recompute() {
    QElapsedTimer timer;
    timer.start();
    std::optional<chem::Recipe> recipe;
    FieldError err;
    if (!workspace_ || !workspace_->ready())
        err = {QString(), QStringLiteral("the reagent library is not loaded")};
    else
        err = guarded([&] {
            const chem::Library& lib = workspace_->data().reagents;
            recipe = chem::design_recipe(lib, recipe_request_from_json(lib, requestDocument(), ""));
        });

    error_ = err;
    const QVariantList old_items = items_, old_warnings = warnings_;
    const QStringList old_steps = steps_, old_cautions = cautions_;
    items_.clear();
    warnings_.clear();
    steps_.clear();
    cautions_.clear();
    if (err.empty()) {
        const chem::Library& lib = workspace_->data().reagents;
        for (const chem::RecipeItem& it : recipe->items) {
            const QString id = QString::fromStdString(it.reagent);
            const chem::Reagent* r = lib.find_reagent(it.reagent);
            QVariantMap item{{"reagent", id},
                             {"mol_per_l", it.mol_per_l},
                             {"as", QString::fromStdString(chem::item_as_text(it))},
                             {"name", r ? QString::fromStdString(r->name) : id},
                             {"amount", amount_text(it)}};
            if (it.mass_g)
                item.insert("mass_g", *it.mass_g);
            if (it.volume_ml)
                item.insert("volume_ml", *it.volume_ml);
            items_.append(item);
        }
        // The warnings in the views' form ({code, severity, message, …}), worded once by the
        // core's renderer.
        for (const chem::Warning& w : recipe->warnings)
            warnings_.append(warning_to_json(w).toVariantMap());
        // With the locale's decimal mark, as the cards show the same amounts.
        for (const chem::Step& s : recipe->steps)
            steps_.append(with_locale_marks(QString::fromStdString(s.text)));
        for (const std::string& s : recipe->cautions)
            cautions_.append(QString::fromStdString(s));
        predicted_ph_ = recipe->predicted.ph;
        basis_text_ = QString::fromStdString(recipe->basis.text);
        effective_basis_ = QString::fromUtf8(chem::basis_name(recipe->basis.basis));
        ionic_strength_result_mmol_per_l_ = recipe->predicted.ionic_strength_mol_per_l * 1000.0;
        buffer_capacity_mmol_per_l_ = recipe->predicted.buffer_capacity_mol_per_l * 1000.0;
        compute_curves(*recipe);
    } else {
        basis_text_.clear();
        ph_curve_.clear();
        beta_curve_.clear();
    }
    last_recompute_ms_ = elapsed_ms(timer);
    if (items_ != old_items)
        emit itemsChanged();
    if (warnings_ != old_warnings)
        emit warningsChanged();
    if (steps_ != old_steps) {
        emit stepsChanged();
        for (qsizetype i = 0; i < std::min(steps_.size(), old_steps.size()); ++i)
            if (steps_[i] != old_steps[i])
                emit stepTextChanged(int(i));
    }
    if (cautions_ != old_cautions)
        emit cautionsChanged();
    emit resultChanged();
}

void BufferDesigner::compute_curves(const chem::Recipe& recipe) {
    ph_curve_.clear();
    beta_curve_.clear();
    // The adapter: the recipe's composition as chem::Components, the x axis's scale from its
    // items; chem::titration_curve solves the points.
    const chem::Library& lib = workspace_->data().reagents;
    const bool titrate = route_ == QLatin1String("titrate");
    chem::TitrationCurveRequest req;
    req.route = titrate ? chem::CurveRoute::titrant : chem::CurveRoute::base_fraction;
    req.rising = lib.find_reagent((titrate ? titrant_ : base_).toStdString());
    req.falling = titrate ? nullptr : lib.find_reagent(acid_.toStdString());
    req.temperature_c = temperature_c_;
    req.points = curve_points;
    double c_titrant = 0;
    for (const chem::Component& c : recipe.composition) {
        req.composition.push_back(c);
        if (c.reagent == req.rising)
            c_titrant += c.mol_per_l;
    }
    if (titrate) {
        // The titrant's own amount per mol/L of final solution, from the recipe's item: mL of the
        // solution, or mL (g for a solid) of the reagent as supplied.
        curve_x_label_ = tr("Titrant added (mL)");
        for (const chem::RecipeItem& it : recipe.items) {
            if (QString::fromStdString(it.reagent) != titrant_ || !(c_titrant > 0))
                continue;
            if (it.volume_ml) {
                req.x_per_mol_per_l = *it.volume_ml / c_titrant;
            } else if (it.mass_g) {
                req.x_per_mol_per_l = *it.mass_g / c_titrant;
                curve_x_label_ = tr("Titrant added (g)");
            }
        }
        if (!(req.x_per_mol_per_l > 0) && titrant_mol_per_l_ > 0)
            req.x_per_mol_per_l = volume_ml_ / titrant_mol_per_l_;
    } else {
        curve_x_label_ = tr("Base form, fraction of the buffer");
    }
    const chem::TitrationCurve curve = chem::titration_curve(lib, req);
    if (!(curve.x_end > 0))
        return;

    double ph_min = 14, ph_max = 0, beta_max = 0;
    for (const chem::TitrationPoint& p : curve.points) {
        const double beta = p.buffer_capacity_mol_per_l * 1000.0;
        ph_curve_.append(QPointF(p.x, p.ph));
        beta_curve_.append(QPointF(p.ph, beta));
        ph_min = std::min(ph_min, p.ph);
        ph_max = std::max(ph_max, p.ph);
        beta_max = std::max(beta_max, beta);
    }
    std::sort(beta_curve_.begin(), beta_curve_.end(),
              [](const QPointF& a, const QPointF& b) { return a.x() < b.x(); });
    curve_x_max_ = curve.x_end;
    recipe_point_ = QPointF(curve.x_recipe, predicted_ph_);
    ph_min = std::min(ph_min, target_ph_);
    ph_max = std::max(ph_max, target_ph_);
    curve_ph_min_ = std::floor(ph_min - 0.25);
    curve_ph_max_ = std::ceil(ph_max + 0.25);
    beta_max_mmol_per_l_ = nice_ceiling(beta_max * 1.05);
}

void BufferDesigner::fillSeries(QObject* series, const QString& which) const {
    if (which == QLatin1String("ph"))
        replace_series(series, ph_curve_);
    else if (which == QLatin1String("beta"))
        replace_series(series, beta_curve_);
    else if (which == QLatin1String("target"))
        replace_series(series, {QPointF(0, target_ph_), QPointF(curve_x_max_, target_ph_)});
    else if (which == QLatin1String("recipe"))
        replace_series(series, {recipe_point_});
    else if (which == QLatin1String("targetBeta"))
        replace_series(series, {QPointF(target_ph_, 0), QPointF(target_ph_, beta_max_mmol_per_l_)});
}

} // namespace phaseplan::gui

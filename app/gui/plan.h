#pragma once
// The night's plan: one `sequence` document of the command-line contract (lines A–D, methods,
// sequence rows, priming, start, waste, detector, column), its result from
// phaseplan::command_sequence recomputed on every edit, and the bottle levels through the night.
// LinesModel, GradientModel and SequenceRowsModel are views onto parts of this document; the
// plan is autosaved (setting "current_plan") a moment after each edit, so closing or killing the
// app loses at most that moment.
#include "chem/bottle_levels.h"
#include "core/line_commands.h"
#include "core/sequence_result.h"
#include "model_util.h"
#include "workspace.h"

#include <QJsonObject>
#include <QObject>
#include <QPointer>
#include <QQmlEngine>
#include <QTimer>
#include <QVariantList>
#include <QVariantMap>

#include <functional>
#include <map>

// Complete types for the pointer properties, for moc only.
Q_MOC_INCLUDE("workspace.h")

namespace phaseplan::gui {

class Workspace;

class Plan : public QObject {
    Q_OBJECT
    QML_ELEMENT
    Q_PROPERTY(phaseplan::gui::Workspace* workspace READ workspace WRITE setWorkspace NOTIFY
                   workspaceChanged)
    /// Restore the autosaved plan (or the demo on first run) when the workspace is set.
    Q_PROPERTY(bool restore READ restore WRITE setRestore NOTIFY workspaceChanged)
    /// The name it is saved under.
    Q_PROPERTY(QString name READ name WRITE setName NOTIFY nameChanged)
    Q_PROPERTY(QVariantMap document READ documentMap NOTIFY documentChanged)
    /// The plan's column (the document's `column`), for views that need only it: `document` read
    /// from QML is a JS copy of the whole plan, made again on every edit.
    Q_PROPERTY(QVariantMap column READ columnMap NOTIFY settingsChanged)
    /// Letters of the defined lines, "A".."D".
    Q_PROPERTY(QStringList lineLetters READ lineLetters NOTIFY lineLettersChanged)
    Q_PROPERTY(QStringList methodNames READ methodNames NOTIFY methodNamesChanged)
    /// Method name → number of sequence rows that run it; signalled only when it changes.
    Q_PROPERTY(QVariantMap methodUse READ methodUse NOTIFY methodUseChanged)
    /// [{id: letter, name}] of the lines that have an aqueous buffer part (the designer's picker);
    /// signalled only when it changes.
    Q_PROPERTY(QVariantList bufferLines READ bufferLines NOTIFY bufferLinesChanged)
    /// Sequence start, ISO 8601 local time ("2026-12-01T18:00:00").
    Q_PROPERTY(QString start READ start WRITE setStart NOTIFY startChanged)
    /// The start as parts for the pickers: {year, month (1–12), day, hour, minute}.
    Q_PROPERTY(QVariantMap startParts READ startParts NOTIFY startChanged)
    /// The start with its day: "today 18:00", "tomorrow 07:30", "Fri 4 Dec 18:00".
    Q_PROPERTY(QString startText READ startText NOTIFY startChanged)
    /// A word under the start when it lies in the past ("today 18:00 was 8 min ago: …"); "" when
    /// it is now or later. Not an error: a sequence already running is planned the same way.
    Q_PROPERTY(QString startNote READ startNote NOTIFY startChanged)

    // ---- standby after the last injection (optional) -------------------------------------------
    /// The pump keeps running at a low flow after the last injection.
    Q_PROPERTY(
        bool standbyEnabled READ standbyEnabled WRITE setStandbyEnabled NOTIFY standbyChanged)
    Q_PROPERTY(double standbyFlowMlMin READ standbyFlowMlMin WRITE setStandbyFlowMlMin NOTIFY
                   standbyChanged)
    /// "until": until a time of day (the first after the last injection, so it moves with the
    /// start); "duration": for a number of minutes.
    Q_PROPERTY(QString standbyMode READ standbyMode WRITE setStandbyMode NOTIFY standbyChanged)
    Q_PROPERTY(int standbyUntilHour READ standbyUntilHour NOTIFY standbyChanged)
    Q_PROPERTY(int standbyUntilMinute READ standbyUntilMinute NOTIFY standbyChanged)
    Q_PROPERTY(double standbyDurationMin READ standbyDurationMin WRITE setStandbyDurationMin NOTIFY
                   standbyChanged)
    /// "until tomorrow 07:30 (4 h 00 min)" from the last result, "" when there is no standby.
    Q_PROPERTY(QString standbyText READ standbyText NOTIFY summaryChanged)
    /// Free volume of the waste container in mL (0: not checked).
    Q_PROPERTY(
        double wasteCapacityMl READ wasteCapacityMl WRITE setWasteCapacityMl NOTIFY settingsChanged)
    /// The contract's word for the detector: "uv", "dad", "pda", "uv-ms", "ms", "elsd", "cad",
    /// "fluorescence", "ri".
    Q_PROPERTY(QString detectorType READ detectorType WRITE setDetectorType NOTIFY settingsChanged)
    /// Every detector type the checks know, [{id, name}] in chem::detector_types() order, for the
    /// picker (so a plan with any valid type shows it picked).
    Q_PROPERTY(QVariantList detectorTypes READ detectorTypes CONSTANT)
    /// True when the detector reads UV (uv, dad, pda, uv-ms): the wavelength applies.
    Q_PROPERTY(bool detectorReadsUv READ detectorReadsUv NOTIFY settingsChanged)
    Q_PROPERTY(double detectorWavelengthNm READ detectorWavelengthNm WRITE setDetectorWavelengthNm
                   NOTIFY settingsChanged)
    Q_PROPERTY(double columnPhMin READ columnPhMin WRITE setColumnPhMin NOTIFY settingsChanged)
    Q_PROPERTY(double columnPhMax READ columnPhMax WRITE setColumnPhMax NOTIFY settingsChanged)

    // ---- results ----------------------------------------------------------------------------
    Q_PROPERTY(bool valid READ valid NOTIFY errorChanged)
    /// The results shown are the last valid plan's: an input is wrong (see errorField) and the
    /// views grey what they show rather than blank it.
    Q_PROPERTY(bool stale READ stale NOTIFY errorChanged)
    /// Where the error lies, in the screen's words ("Method “assay”, gradient row 2, % A").
    Q_PROPERTY(QString errorPlace READ errorPlace NOTIFY errorChanged)
    Q_PROPERTY(QString errorField READ errorField NOTIFY errorChanged)
    Q_PROPERTY(QString errorMessage READ errorMessage NOTIFY errorChanged)
    Q_PROPERTY(QString endTime READ endTime NOTIFY summaryChanged)
    Q_PROPERTY(QString endText READ endText NOTIFY summaryChanged)
    Q_PROPERTY(double totalMin READ totalMin NOTIFY summaryChanged)
    Q_PROPERTY(int injections READ injections NOTIFY summaryChanged)
    Q_PROPERTY(double wasteMl READ wasteMl NOTIFY summaryChanged)
    /// [{letter, name, bottle_ml, residue_ml, required_ml, usable_ml, runs_dry,
    /// dry_after_injection,
    ///   dry_at, dry_text, min_bottle_ml, suggested_bottle_ml}], with the rest of each line's
    /// result; signalled only when one of the fields listed changes.
    Q_PROPERTY(QVariantList bottles READ bottles NOTIFY bottlesChanged)
    /// The number of bottles, for views that show a row per bottle through bottleAt(): a read of
    /// `bottles` from QML makes a JS copy of the whole list, and a list as a Repeater's model
    /// makes its rows again on every change. A row reads the count, which carries the signal.
    Q_PROPERTY(int bottleCount READ bottleCount NOTIFY bottlesChanged)
    /// [{code, severity, message, …}] of the sequence checks.
    Q_PROPERTY(QVariantList warnings READ warnings NOTIFY warningsChanged)
    /// Plot ranges of the bottle chart: hours from the start, mL.
    Q_PROPERTY(double chartHours READ chartHours NOTIFY summaryChanged)
    Q_PROPERTY(double chartMaxMl READ chartMaxMl NOTIFY summaryChanged)
    Q_PROPERTY(double lastRecomputeMs READ lastRecomputeMs NOTIFY resultChanged)

  public:
    explicit Plan(QObject* parent = nullptr);
    ~Plan() override;

    Workspace* workspace() const { return workspace_; }
    void setWorkspace(Workspace* w);
    bool restore() const { return restore_; }
    void setRestore(bool r) { restore_ = r; }

    QString name() const { return name_; }
    void setName(const QString& n);
    const QJsonObject& json() const { return doc_; }
    QVariantMap documentMap() const { return doc_.toVariantMap(); }
    QVariantMap columnMap() const { return doc_.value("column").toObject().toVariantMap(); }
    QStringList lineLetters() const;
    QStringList methodNames() const;
    QVariantMap methodUse() const { return method_use_; }
    QVariantList bufferLines() const { return buffer_lines_; }
    QString start() const;
    void setStart(const QString& iso);
    QVariantMap startParts() const;
    QString startText() const;
    QString startNote() const;
    /// Sets the start from the pickers' parts (wall-clock time).
    Q_INVOKABLE void setStartAt(int year, int month, int day, int hour, int minute);
    /// A contract clock time in the screens' words ("tomorrow 03:30").
    Q_INVOKABLE QString dayClock(const QString& iso) const;

    bool standbyEnabled() const;
    void setStandbyEnabled(bool on);
    double standbyFlowMlMin() const;
    void setStandbyFlowMlMin(double v);
    QString standbyMode() const;
    void setStandbyMode(const QString& mode);
    int standbyUntilHour() const;
    int standbyUntilMinute() const;
    Q_INVOKABLE void setStandbyUntil(int hour, int minute);
    double standbyDurationMin() const;
    void setStandbyDurationMin(double v);
    Q_INVOKABLE double standbyPercent(const QString& letter) const;
    Q_INVOKABLE void setStandbyPercent(const QString& letter, double percent);
    QString standbyText() const;
    double wasteCapacityMl() const;
    void setWasteCapacityMl(double ml);
    QString detectorType() const;
    void setDetectorType(const QString& t);
    static QVariantList detectorTypes();
    bool detectorReadsUv() const;
    double detectorWavelengthNm() const;
    void setDetectorWavelengthNm(double nm);
    double columnPhMin() const;
    void setColumnPhMin(double v);
    double columnPhMax() const;
    void setColumnPhMax(double v);

    bool valid() const { return error_.empty(); }
    bool stale() const { return !error_.empty() && has_result_; }
    QString errorPlace() const;
    QString errorField() const { return error_.field; }
    QString errorMessage() const { return error_.message; }
    /// The last valid plan, typed (kept, greyed, while an input is wrong); null before the first
    /// and for a "plans" document, whose plans this screen does not show.
    const PlanResult* planResult() const {
        return has_result_ && !result_.several && !result_.plans.empty() ? &result_.plans.front()
                                                                         : nullptr;
    }
    QString endTime() const;
    QString endText() const;
    double totalMin() const;
    int injections() const { return injections_; }
    double wasteMl() const;
    QVariantList bottles() const { return bottles_; }
    int bottleCount() const { return int(bottles_.size()); }
    /// Bottle i as in `bottles` ({} out of range).
    Q_INVOKABLE QVariantMap bottleAt(int i) const {
        return i >= 0 && i < bottles_.size() ? bottles_.at(i).toMap() : QVariantMap{};
    }
    QVariantList warnings() const { return warnings_; }
    double chartHours() const { return levels_.chart_hours; }
    double chartMaxMl() const { return levels_.chart_max_ml; }
    double lastRecomputeMs() const { return last_recompute_ms_; }

    // ---- editing (every call recomputes and schedules the autosave) ----------------------------
    /// Replaces the whole document (a saved sequence, the demo).
    Q_INVOKABLE void load(const QVariantMap& document, const QString& name);
    void loadJson(const QJsonObject& document, const QString& name);
    /// Opens a saved sequence by name; false when there is none.
    Q_INVOKABLE bool loadSaved(const QString& name);
    /// Saves the sequence with its methods, lines and their buffers in one transaction. The
    /// sequence from the version it was loaded at (0 under a new name): a name saved by someone
    /// else, or the plan changed on another bench since it was loaded here, is refused (saveClash)
    /// and nothing is written. Lines and methods identical to what is stored are not written;
    /// ones saved or changed elsewhere since this plan was loaded are kept as they are
    /// (saveNote). Returns "" or the error message.
    Q_INVOKABLE QString saveAs(const QString& name);
    /// After a refused saveAs(name): overwrite what was refused, on purpose, from the versions
    /// the refusal named. Refused again if it changed once more since. "" or the message.
    Q_INVOKABLE QString replaceSaved();
    /// After a refused saveAs: save this plan under the first free "<name> (copy)" instead.
    Q_INVOKABLE QString saveAsCopy();
    /// After a refused saveAs: open the stored plan of that name (drops the edits here).
    Q_INVOKABLE bool openClashing();
    /// The last refusal of saveAs ("A plan named … was saved by … at …; choose another name, or
    /// open it", or "Plan …: changed by … after you opened it; …"), empty after a save.
    Q_PROPERTY(QString saveClash READ saveClash NOTIFY saveClashChanged)
    QString saveClash() const { return clash_; }
    /// The name the refusal was about.
    Q_PROPERTY(QString saveClashName READ saveClashName NOTIFY saveClashChanged)
    QString saveClashName() const { return clash_name_; }
    /// After a save: the lines and methods not written because they were saved or changed
    /// elsewhere since this plan was loaded ("Kept as saved elsewhere …: line “Acetonitrile”
    /// (Rosa Okafor (demo-prep), 2026-12-02 19:04 UTC)."); empty when all were written.
    Q_PROPERTY(QString saveNote READ saveNote NOTIFY saveClashChanged)
    QString saveNote() const { return save_note_; }

    QJsonObject line(const QString& letter) const;
    Q_INVOKABLE QVariantMap lineDocument(const QString& letter) const {
        return line(letter).toVariantMap();
    }
    /// Replaces line `letter` (an empty document removes it).
    void setLine(const QString& letter, const QJsonObject& line);
    Q_INVOKABLE void setLineDocument(const QString& letter, const QVariantMap& line) {
        setLine(letter, QJsonObject::fromVariantMap(line));
    }
    /// One field of a line ("bottle_ml", "residue_ml", "name").
    Q_INVOKABLE void setLineField(const QString& letter, const QString& key, const QVariant& value);
    Q_INVOKABLE double primeMl(const QString& letter) const;
    Q_INVOKABLE void setPrimeMl(const QString& letter, double ml);
    /// The recipe document of the line's first aqueous buffer part, empty when it has none.
    QJsonObject lineBuffer(const QString& letter) const;
    void setLineBuffer(const QString& letter, const QJsonObject& recipe);
    /// The buffer part's share of the bottle in mL (bottle_ml × fraction_v), 0 when none.
    double lineBufferVolumeMl(const QString& letter) const;
    /// The saved buffer the line's buffer part holds by reference ("" when none).
    Q_INVOKABLE QString lineBufferRef(const QString& letter) const;
    /// Every buffer part that holds `name` takes `recipe` (an edit in the designer).
    void updateBufferRefs(const QString& name, const QJsonObject& recipe);
    /// A saved buffer was renamed: the parts that held the old name hold the new one.
    void renameBufferRefs(const QString& from, const QString& to, const QJsonObject& recipe);
    /// A saved buffer was deleted: the parts that held it keep their copy, without the reference.
    void dropBufferRefs(const QString& name);

    QJsonObject method(const QString& name) const;
    Q_INVOKABLE QVariantMap methodDocument(const QString& name) const {
        return method(name).toVariantMap();
    }
    void setMethod(const QString& name, const QJsonObject& method);
    /// Adds or replaces a method (a saved one taken into the plan).
    Q_INVOKABLE void setMethodDocument(const QString& name, const QVariantMap& method) {
        setMethod(name, QJsonObject::fromVariantMap(method));
    }
    /// Adds a method (a copy of `like`, or a plain one) under a fresh name; returns the name.
    Q_INVOKABLE QString addMethod(const QString& like = {});
    /// Removes the method when no sequence row uses it; returns "" or why not.
    Q_INVOKABLE QString removeMethod(const QString& name);
    /// Renames a method, and the sequence rows that run it; returns "" or why not (empty, taken).
    Q_INVOKABLE QString renameMethod(const QString& from, const QString& to);
    /// The column `method` runs on: its own copy ("methods.<name>.column", picked from the
    /// library) or else the plan's column: {own (bool), name, document (the column object), has
    /// (it gives the three dimensions)}.
    Q_INVOKABLE QVariantMap methodColumn(const QString& method) const;
    /// Gives `method` a copy of `column` (a library column's document); an empty map goes back to
    /// the plan's column.
    Q_INVOKABLE void setMethodColumn(const QString& method, const QVariantMap& column);
    /// The injections of `method` in tonight's sequence rows.
    Q_INVOKABLE int methodInjections(const QString& method) const;
    /// How many sequence rows run a method (for "delete?" questions).
    Q_INVOKABLE int rowsUsingMethod(const QString& name) const;

    QJsonArray rows() const;
    void setRows(const QJsonArray& rows);

    /// Fills a LineSeries with line `letter`'s bottle level (mL) against hours from the start.
    Q_INVOKABLE void fillLevelSeries(QObject* series, const QString& letter) const;
    /// The run-dry point of line `letter` (hours, residue mL), or no point when it lasts.
    Q_INVOKABLE void fillDrySeries(QObject* series, const QString& letter) const;
    /// The waste container's fill (mL) against hours.
    Q_INVOKABLE void fillWasteSeries(QObject* series) const;
    /// What the column sees during one injection of `method`, from the last valid plan:
    /// {hasEluent, phMin, phMax (s_s pH of the eluent), extrapolated, hasPressure, maxBar,
    /// maxAtMin, limitBar (0: none), limitedBy, calibrated, spanMin (time axis, min)}.
    Q_INVOKABLE QVariantMap methodConditions(const QString& method) const;
    /// Fills a LineSeries over one injection of `method`: "ph" (eluent s_s pH against min),
    /// "pressure" (bar against min) or "limit" (the pressure limit as a line).
    Q_INVOKABLE void fillConditionSeries(QObject* series, const QString& method,
                                         const QString& which) const;
    /// The hour of the sequence end (for a marker).
    Q_INVOKABLE double endHours() const { return totalMin() / 60.0; }
    /// A field path in the screens' words ("lines.A.bottle_ml" → "Line A, bottle volume").
    Q_INVOKABLE QString fieldWords(const QString& path) const;
    /// Whether the error names this field or lies below it ("lines.A" matches "lines.A.bottle_ml").
    Q_INVOKABLE bool errorUnder(const QString& prefix) const;

    /// Moves the start by `minutes` (negative: earlier).
    Q_INVOKABLE void shiftStart(int minutes);

    /// Writes the autosave now (also done on destruction).
    Q_INVOKABLE void flushAutosave();
    /// Runs a pending recompute now. Edits recompute on the next turn of the event loop (several
    /// edits in one turn cost one recompute, and the screen being edited draws first); tests and
    /// callers that need the result at once call this.
    Q_INVOKABLE void recomputeNow();
    /// An edit is waiting for its recompute.
    bool recomputePending() const { return recompute_timer_.isActive(); }

  signals:
    void workspaceChanged();
    /// Any edit of the document. The parts below have their own signals, each sent only when
    /// what it covers differs, so that a view of one part (on a screen shown or not) is not
    /// re-evaluated on every edit elsewhere (a buffer edit changes none of them).
    void documentChanged();
    void nameChanged();
    /// start, startParts, startText, startNote.
    void startChanged();
    /// The standby properties and standbyPercent().
    void standbyChanged();
    /// The instrument settings: column, the column's pH range, the detector, the waste capacity.
    void settingsChanged();
    void saveClashChanged();
    /// The whole document was replaced: views reload what they show.
    void documentReplaced();
    /// Every recompute (`result`, lastRecomputeMs). The parts below are sent only when they
    /// differ.
    void resultChanged();
    /// endTime, endText, totalMin, injections, wasteMl, standbyText, chartHours, chartMaxMl.
    void summaryChanged();
    /// valid, stale, errorPlace, errorField, errorMessage.
    void errorChanged();
    void bufferLinesChanged();
    /// Sent only when the list differs: pickers of lines and methods are not rebuilt on every edit.
    void lineLettersChanged();
    void methodNamesChanged();
    void methodUseChanged();
    /// Sent only when a field of `bottles` that it lists differs (an edit that changes no volume
    /// rebuilds no bottle row).
    void bottlesChanged();
    void warningsChanged();

  private:
    /// After documentChanged and resultChanged: sends the finer signals whose values differ
    /// from what they last announced (shown_name_ …).
    void notify_document_parts();
    void notify_result_parts();
    void edited();
    void recompute();
    void compute_levels();
    void restore_state();
    /// Buffer parts written out in full (a plan from before references, the demo) become saved
    /// buffers held by reference, so that the designer can edit them and the line follows.
    void adopt_inline_buffers();
    /// Applies `change` to every buffer part; edited() when anything changed.
    bool for_each_buffer_part(const std::function<bool(QJsonObject& part)>& change);

    QPointer<Workspace> workspace_;
    /// What each finer signal last announced (notify_document_parts, notify_result_parts).
    QVariantList shown_name_, shown_start_, shown_standby_, shown_settings_, shown_summary_,
        shown_error_;
    bool restore_ = false;
    QString name_;
    QJsonObject doc_;
    /// The stored versions this plan was loaded (or last saved) at, "kind:name" → version (0:
    /// absent then), for the sequence and the lines and methods it saves. Kept with the autosave.
    QJsonObject seen_;
    /// The last refused saveAs: its message, its name, and the stored versions then.
    QString clash_, clash_name_, save_note_;
    QJsonObject offered_;
    std::vector<phaseplan::storage::SavedDocument> saved_documents(const QString& name) const;
    QJsonObject stamps_of(const std::vector<phaseplan::storage::SavedDocument>& docs) const;
    void take_stamps(); ///< seen_ from the database, for name_ and the current document
    void set_clash(const QString& message, const QString& name);
    QString save_documents(const QString& name, bool replace);
    QVariantList buffer_lines_;
    void update_buffer_lines(); ///< and the lists of lines and methods
    QStringList shown_letters_, shown_methods_;
    QVariantMap method_use_;
    QTimer autosave_;
    QTimer recompute_timer_;
    /// The eluent points of the last recomputes, reused while the lines and the column
    /// temperature stay (most edits); cleared with a new workspace.
    EluentMemo eluent_memo_;
    bool dirty_ = false;

    FieldError error_;
    SequenceResult result_; ///< the last valid result (kept, greyed, while an input is wrong)
    bool has_result_ = false;
    QJsonObject standby_doc() const;
    QJsonObject standby_kept_; ///< the standby as it was when switched off, to switch it back on
    void set_standby(const QJsonObject& sb);
    int injections_ = 0;
    QVariantList bottles_, warnings_;
    chem::BottleLevels levels_; ///< the bottle chart (chem/bottle_levels)
    double last_recompute_ms_ = 0;
};

} // namespace phaseplan::gui

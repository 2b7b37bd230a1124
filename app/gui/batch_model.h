#pragma once
// The batch at the bench: "mark as prepared" on the current buffer (or a line) creates a batch in
// the lab's database (storage::BatchStore), the preparer enters what was actually weighed or
// measured, the lots, the measured pH, the instruments and a comment, and the model recomputes
// the solution as made (core/batch_document: read_batch_document, the same evaluation the sheet
// prints from, so the screen shows exactly what the sheet will print: checks, steps, warnings,
// the out-of-tolerance verdict and the suggested correction). It saves the sheet and the labels
// as PDF or prints them through `output` (a DocumentOutput, handed in by the view; this model
// does not depend on app/print) and records each print; after that, a change is refused by the
// store until it is recorded as an amendment with a reason.
//
// An out-of-tolerance batch (an amount outside its band, or the measured pH outside target ±
// phTolerance) is printed only after recordDeviation(note): the note is stored with who and when.
//
// Every edit is stored at once (one transaction, one history row per changed field) when the
// batch has not been printed. A lot number without an amount stays on the screen only: the batch
// contract has no entry without mass_g or volume_ml.
//
// Errors: chem::Error caught here (guarded) and shown beside the field it names: errorField is the
// JSON path of the batch contract ("batch.actual[1].mass_g", "batch.prepared_at", "reason", …).
#include "core/document_output.h"
#include "model_util.h"
#include "storage/batch_store.h"

#include <QAbstractListModel>
#include <QPointer>
#include <QQmlEngine>
#include <QVariantList>
#include <QVariantMap>

#include <map>
#include <memory>
#include <optional>
#include <vector>

Q_MOC_INCLUDE("workspace.h")

namespace phaseplan::gui {

class Workspace;

class BatchModel : public QAbstractListModel {
    Q_OBJECT
    QML_ELEMENT
    // ---- dependencies -----------------------------------------------------------------------
    Q_PROPERTY(phaseplan::gui::Workspace* workspace READ workspace WRITE setWorkspace NOTIFY
                   workspaceChanged)
    /// Who is at the bench: prepared_by of a new batch and "who" of every history row.
    Q_PROPERTY(QString preparer READ preparer WRITE setPreparer NOTIFY preparerChanged)
    /// The login of the person signed in (gui::Session; "" when nobody is, or the session is
    /// locked). When set, every change is recorded under it instead of the preparer's name.
    Q_PROPERTY(
        QString signedInLogin READ signedInLogin WRITE setSignedInLogin NOTIFY preparerChanged)
    /// The database has accounts: creating, changing, amending and printing a batch need
    /// someone signed in (signedInLogin), else they fail with field "session".
    Q_PROPERTY(
        bool signInRequired READ signInRequired WRITE setSignInRequired NOTIFY preparerChanged)
    /// Prefix of proposed batch ids ("<prefix>-YYYYMMDD-NNN").
    Q_PROPERTY(QString idPrefix READ idPrefix WRITE setIdPrefix NOTIFY preparerChanged)
    /// Folder for saved PDFs: the last folder a PDF was saved in (kept in QSettings under
    /// "batch/pdfFolder"), else the Documents location.
    Q_PROPERTY(QString outputDir READ outputDir WRITE setOutputDir NOTIFY outputDirChanged)
    /// Where PDFs and printouts go: an object implementing phaseplan::DocumentOutput (the view
    /// passes a PrintService). Without one, saving and printing fail with field "output".
    Q_PROPERTY(QObject* output READ output WRITE setOutput NOTIFY outputChanged)

    // ---- the open batch ----------------------------------------------------------------------
    /// True once a batch is open (created or loaded).
    Q_PROPERTY(bool active READ active NOTIFY batchChanged)
    Q_PROPERTY(QString batchId READ batchId NOTIFY batchChanged)
    /// "recipe", "line" or "sequence".
    Q_PROPERTY(QString documentKind READ documentKind NOTIFY batchChanged)
    /// The recipe's title as the sheet prints it.
    Q_PROPERTY(QString title READ title NOTIFY resultChanged)
    Q_PROPERTY(QString preparedBy READ preparedBy WRITE setPreparedBy NOTIFY batchChanged)
    /// ISO 8601 local ("2026-12-01T16:30:00").
    Q_PROPERTY(QString preparedAt READ preparedAt WRITE setPreparedAt NOTIFY batchChanged)
    /// ISO 8601 local; set from the shelf-life default when the batch is created, editable.
    Q_PROPERTY(QString expiresAt READ expiresAt WRITE setExpiresAt NOTIFY batchChanged)
    Q_PROPERTY(QString checkedBy READ checkedBy WRITE setCheckedBy NOTIFY batchChanged)
    /// ± tolerance of each amount in percent (default 2).
    Q_PROPERTY(
        double tolerancePercent READ tolerancePercent WRITE setTolerancePercent NOTIFY batchChanged)
    /// The use-by as the sheet and labels print it (ISO 8601 local): expiresAt clamped to the
    /// end of the expiry date of every lot in the batch (chem::use_by); "" when unknown.
    Q_PROPERTY(QString useByAt READ useByAt NOTIFY resultChanged)
    /// The lot that sets useByAt, in words ("lot SP-2207 of Sodium dihydrogen phosphate
    /// monohydrate, which expires on 2026-12-03"); "" when the shelf life or the entered expiry
    /// does.
    Q_PROPERTY(QString useByLimit READ useByLimit NOTIFY resultChanged)
    /// Each expired lot used by an approver's override, in words (as the sheet prints them).
    Q_PROPERTY(QStringList lotOverrides READ lotOverrides NOTIFY resultChanged)
    /// Shelf life applied to the expiry, hours (from data/solvents.json "shelf_life").
    Q_PROPERTY(double shelfLifeH READ shelfLifeH NOTIFY resultChanged)
    /// Printed (sheet or labels, PDF or printer) at least once: changes need an amendment.
    Q_PROPERTY(bool printed READ printed NOTIFY batchChanged)
    Q_PROPERTY(int revision READ revision NOTIFY batchChanged)
    /// A change refused by the store (printed batch) waits here for an amendment with a reason.
    Q_PROPERTY(bool pendingAmendment READ pendingAmendment NOTIFY batchChanged)
    /// Why the pending change is made (required by the store for an amendment).
    Q_PROPERTY(QString amendReason READ amendReason WRITE setAmendReason NOTIFY amendReasonChanged)

    // ---- measured at the bench ----------------------------------------------------------------
    /// The pH read on the meter; NaN = not measured (setting NaN clears it).
    Q_PROPERTY(double measuredPh READ measuredPh WRITE setMeasuredPh NOTIFY batchChanged)
    /// ± pH units allowed between the measured pH and the target (default 0.05).
    Q_PROPERTY(double phTolerance READ phTolerance WRITE setPhTolerance NOTIFY batchChanged)
    Q_PROPERTY(QString phMeterId READ phMeterId WRITE setPhMeterId NOTIFY batchChanged)
    /// The pH meter's record when the measured pH was taken from it ({device_id, raw,
    /// received_at, …}), {} when typed or not measured.
    Q_PROPERTY(QVariantMap measuredPhCapture READ measuredPhCapture NOTIFY batchChanged)
    /// "from pH meter PH-01", "typed", or "" when not measured.
    Q_PROPERTY(QString measuredPhSource READ measuredPhSource NOTIFY batchChanged)
    Q_PROPERTY(QString balanceId READ balanceId WRITE setBalanceId NOTIFY batchChanged)
    Q_PROPERTY(QString comment READ comment WRITE setComment NOTIFY batchChanged)
    /// The largest volume the vessel holds, mL; NaN = not given (the correction then assumes
    /// the volume can grow).
    Q_PROPERTY(double containerMl READ containerMl WRITE setContainerMl NOTIFY batchChanged)
    /// The deviation note of an out-of-tolerance batch, who recorded it and when (ISO local).
    Q_PROPERTY(QString deviationNote READ deviationNote NOTIFY batchChanged)
    Q_PROPERTY(QString deviationBy READ deviationBy NOTIFY batchChanged)
    Q_PROPERTY(QString deviationAt READ deviationAt NOTIFY batchChanged)

    // ---- tolerance verdict and correction (from the core) --------------------------------------
    /// An amount outside its band or the measured pH outside tolerance.
    Q_PROPERTY(bool outOfTolerance READ outOfTolerance NOTIFY resultChanged)
    /// Each reason in the screens' words.
    Q_PROPERTY(QStringList outOfToleranceReasons READ outOfToleranceReasons NOTIFY resultChanged)
    /// Out of tolerance and no deviation note yet: printing is refused until one is recorded.
    Q_PROPERTY(bool needsDeviationNote READ needsDeviationNote NOTIFY resultChanged)
    /// The suggested correction, one instruction a line; empty when every amount is in its band.
    Q_PROPERTY(QStringList correction READ correction NOTIFY resultChanged)
    /// The correction is a remake (the vessel cannot take the scaled volume).
    Q_PROPERTY(bool correctionIsRemake READ correctionIsRemake NOTIFY resultChanged)
    /// The steps, exactly as the sheet prints them: [{heading, steps: [text, …]}].
    Q_PROPERTY(QVariantList steps READ steps NOTIFY resultChanged)

    // ---- the solution as made (from the core) -------------------------------------------------
    Q_PROPERTY(bool valid READ valid NOTIFY resultChanged)
    Q_PROPERTY(double targetPh READ targetPh NOTIFY resultChanged)
    /// pH predicted from the actual amounts.
    Q_PROPERTY(double predictedPh READ predictedPh NOTIFY resultChanged)
    Q_PROPERTY(double ionicStrengthMmolPerL READ ionicStrengthMmolPerL NOTIFY resultChanged)
    /// β in mmol/L per pH unit.
    Q_PROPERTY(double bufferCapacityMmolPerL READ bufferCapacityMmolPerL NOTIFY resultChanged)
    /// Amounts outside their tolerance band.
    Q_PROPERTY(int flaggedCount READ flaggedCount NOTIFY resultChanged)
    /// Amounts not entered yet.
    Q_PROPERTY(int missingCount READ missingCount NOTIFY resultChanged)
    /// [{reagent, name, mmolPerL}] as made.
    Q_PROPERTY(QVariantList composition READ composition NOTIFY resultChanged)
    /// [{code, severity, message}] of the recipe and the batch.
    Q_PROPERTY(QVariantList warnings READ warnings NOTIFY resultChanged)

    // ---- record and print ---------------------------------------------------------------------
    /// [{seq, at, who, action, field, oldValue, newValue, reason, label, text}], oldest first;
    /// `label` is the field as the screen names it ("Actual amount of Potassium dihydrogen
    /// phosphate"), `text` the whole change in words ("…: 3.161 g → 3.205 g").
    Q_PROPERTY(QVariantList history READ history NOTIFY batchChanged)
    /// The batch's electronic signatures, oldest first: {meaning, name, login, signedAt, holds,
    /// words} ("Reviewed by Mats Lindqvist (demo-review) 2026-12-02 13:10:04 UTC", with "— void:
    /// …" once a later change voided it). app/storage/signatures.h.
    Q_PROPERTY(QVariantList signatures READ signatures NOTIFY batchChanged)
    /// Released for use: a second person's "reviewed" signature holds (core/batch_release.h).
    Q_PROPERTY(bool released READ released NOTIFY batchChanged)
    /// "Released for use: reviewed by … UTC", or why the batch is not released.
    Q_PROPERTY(QString releaseText READ releaseText NOTIFY batchChanged)
    /// The second person of the record: "Name (login)" whose review signature releases the
    /// batch; empty while none holds. With accounts it replaces the typed "Checked by".
    Q_PROPERTY(QString reviewedBy READ reviewedBy NOTIFY batchChanged)
    /// The database has accounts, so a saved batch can be signed here.
    Q_PROPERTY(bool signingAvailable READ signingAvailable NOTIFY batchChanged)
    /// Every batch in the database, newest first.
    Q_PROPERTY(QStringList batchIds READ batchIds NOTIFY batchListChanged)
    /// Path of the last PDF written, "" before.
    Q_PROPERTY(QString lastSavedPath READ lastSavedPath NOTIFY lastSavedPathChanged)
    Q_PROPERTY(QStringList printers READ printers CONSTANT)

    Q_PROPERTY(QString errorField READ errorField NOTIFY errorChanged)
    Q_PROPERTY(QString errorMessage READ errorMessage NOTIFY errorChanged)

    // ---- two benches, one batch (app/storage/versioning.h) -----------------------------------
    /// Set when a save was refused because the batch changed on another bench since it was
    /// opened here: "Batch …: changed by <name> (<login>) at <time> UTC after you opened it; …".
    /// The edits refused stay on screen until reloadTheirs() or saveAsCopy().
    Q_PROPERTY(QString conflictMessage READ conflictMessage NOTIFY conflictChanged)
    /// Set when the open batch changed on another bench: "Changed on another bench by <name> at
    /// <time> …". With no unsaved edits here the screen was brought up to date; with a pending
    /// amendment (or a refused save) it was not, and the notice says so.
    Q_PROPERTY(QString remoteNotice READ remoteNotice NOTIFY conflictChanged)
    /// The version of the batch as loaded here (+1 on every save, on any bench).
    Q_PROPERTY(qint64 version READ version NOTIFY batchChanged)

  public:
    enum Role {
        ReagentRole = Qt::UserRole + 1, ///< reagent (or part) id
        NameRole,
        UnitRole,   ///< "g" or "mL"
        TargetRole, ///< in unit
        LowRole,    ///< lower end of the band, in unit
        HighRole,   ///< upper end of the band, in unit
        EnteredRole,
        ActualRole, ///< in unit; NaN when not entered
        DeviationPercentRole,
        WithinToleranceRole,
        LotRole,
        ErrorRole,   ///< the core's message for this row's amount or lot, "" when none
        CaptureRole, ///< the balance's record when the amount was taken from it, {} when typed
        SourceRole,  ///< "from balance BAL-03", "typed", or "" when not entered
        CaptureTargetRole, ///< the target DeviceCapture::takeFromBalance is called with for this
                           ///< row
        /// The lots of this reagent on the shelf, earliest expiry first: [{id (the lot number),
        /// name ("PA-88112 · expires 2028-11-01", or "… · EXPIRED
        /// 2026-11-27"), expiresOn, expired (before the day of preparation)}]; [] when the shelf
        /// holds none, and the lot is then typed.
        LotChoicesRole,
        LotExpiresOnRole, ///< the chosen lot's expiry date (YYYY-MM-DD), "" when not known
        /// The chosen lot expired before the day of preparation and no approver has overridden
        /// it: the override form shows.
        LotExpiredRole,
        LotStatusRole, ///< the chosen lot in words: its expiry, the override, or "not on the shelf"
        LotErrorRole,  ///< the message for this row's lot, "" when none
    };
    Q_ENUM(Role)

    explicit BatchModel(QObject* parent = nullptr);
    ~BatchModel() override;

    Workspace* workspace() const { return workspace_; }
    void setWorkspace(Workspace* w);
    QString signedInLogin() const { return signed_in_login_; }
    void setSignedInLogin(const QString& login);
    bool signInRequired() const { return sign_in_required_; }
    void setSignInRequired(bool on);
    QString preparer() const { return preparer_; }
    void setPreparer(const QString& p);
    QString idPrefix() const { return id_prefix_; }
    void setIdPrefix(const QString& p);
    QString outputDir() const { return output_dir_; }
    void setOutputDir(const QString& d);
    QObject* output() const { return output_object_; }
    void setOutput(QObject* o);

    bool active() const { return draft_.has_value(); }
    QString batchId() const { return draft_ ? draft_->id : QString(); }
    QString documentKind() const { return draft_ ? draft_->document_kind : QString(); }
    QString title() const { return title_; }
    QString preparedBy() const { return draft_ ? draft_->prepared_by : QString(); }
    void setPreparedBy(const QString& v);
    QString preparedAt() const { return draft_ ? draft_->prepared_at : QString(); }
    void setPreparedAt(const QString& v);
    QString expiresAt() const { return draft_ ? draft_->expires_at : QString(); }
    void setExpiresAt(const QString& v);
    QString checkedBy() const { return draft_ ? draft_->checked_by : QString(); }
    void setCheckedBy(const QString& v);
    double tolerancePercent() const { return draft_ ? draft_->tolerance_percent : 2; }
    void setTolerancePercent(double v);
    double shelfLifeH() const { return shelf_life_h_; }
    QString useByAt() const { return use_by_at_; }
    QString useByLimit() const { return use_by_limit_; }
    QStringList lotOverrides() const { return lot_overrides_; }
    bool printed() const { return stored_ && stored_->printed(); }
    int revision() const { return stored_ ? stored_->revision : 0; }
    bool pendingAmendment() const { return pending_; }
    QString amendReason() const { return amend_reason_; }
    void setAmendReason(const QString& r);
    double measuredPh() const;
    void setMeasuredPh(double v);
    double phTolerance() const { return draft_ ? draft_->ph_tolerance : 0.05; }
    void setPhTolerance(double v);
    QString phMeterId() const { return draft_ ? draft_->ph_meter_id : QString(); }
    void setPhMeterId(const QString& v);
    QString balanceId() const { return draft_ ? draft_->balance_id : QString(); }
    QVariantMap measuredPhCapture() const {
        return draft_ ? draft_->ph_capture.toVariantMap() : QVariantMap{};
    }
    QString measuredPhSource() const;
    void setBalanceId(const QString& v);
    QString comment() const { return draft_ ? draft_->comment : QString(); }
    void setComment(const QString& v);
    double containerMl() const;
    void setContainerMl(double v);
    QString deviationNote() const { return draft_ ? draft_->deviation_note : QString(); }
    QString deviationBy() const { return draft_ ? draft_->deviation_by : QString(); }
    QString deviationAt() const { return draft_ ? draft_->deviation_at : QString(); }
    bool outOfTolerance() const { return out_of_tolerance_; }
    QStringList outOfToleranceReasons() const { return reasons_; }
    bool needsDeviationNote() const {
        return out_of_tolerance_ && deviationNote().trimmed().isEmpty();
    }
    QStringList correction() const { return correction_; }
    bool correctionIsRemake() const { return correction_remake_; }
    QVariantList steps() const { return steps_; }

    bool valid() const { return valid_; }
    double targetPh() const { return target_ph_; }
    double predictedPh() const { return predicted_ph_; }
    double ionicStrengthMmolPerL() const { return ionic_strength_mmol_per_l_; }
    double bufferCapacityMmolPerL() const { return buffer_capacity_mmol_per_l_; }
    int flaggedCount() const;
    int missingCount() const;
    QVariantList composition() const { return composition_; }
    QVariantList warnings() const { return warnings_; }
    QVariantList history() const { return history_; }
    QVariantList signatures() const { return signatures_; }
    bool released() const { return release_.released(); }
    QString reviewedBy() const { return release_.reviewed_by; }
    QString releaseText() const {
        return release_.released() ? release_.released_line : BatchRelease::not_released_words();
    }
    bool signingAvailable() const;
    QStringList batchIds() const;
    QString lastSavedPath() const { return last_saved_path_; }
    QStringList printers() const;
    QString errorField() const { return error_.field; }
    QString errorMessage() const { return error_.message; }
    QString conflictMessage() const { return conflict_; }
    QString remoteNotice() const { return remote_notice_; }
    qint64 version() const { return draft_ ? draft_->version : 0; }

    int rowCount(const QModelIndex& parent = {}) const override;
    QVariant data(const QModelIndex& index, int role) const override;
    QHash<int, QByteArray> roleNames() const override;

    /// Creates a batch from a contract document (a `recipe` input — BufferDesigner::document() —
    /// or a line): a proposed id, the preparer, prepared now, the expiry from the shelf-life
    /// default. True on success; false with errorField/errorMessage set.
    Q_INVOKABLE bool markPrepared(const QVariantMap& document);
    /// Opens a stored batch. False (error "batch.id") when unknown.
    Q_INVOKABLE bool open(const QString& id);
    /// Closes the batch on the screen (nothing is lost: every accepted change is stored).
    Q_INVOKABLE void close();

    /// The amount actually weighed or measured for `row`, in the row's unit; NaN clears it.
    Q_INVOKABLE bool setActual(int row, double amount);
    /// Takes a value handed over by DeviceCapture::captured(c): c.target is "batch.measured_ph" or
    /// "batch.actual[<row>].mass_g" (<row> = the row of this model, see CaptureTargetRole);
    /// c.value goes into that field and c.record is stored with it (device, raw line, time,
    /// accepted unsettled, calibration date). The pH meter becomes phMeterId; the balance becomes
    /// balanceId when none is set. False with the error at the target when it does not fit (a
    /// volume row, a pH from a balance, no batch).
    Q_INVOKABLE bool applyCapture(const QVariantMap& capture);
    /// Changes a captured amount by hand: the amount is then typed, and the change is recorded
    /// as an amendment with `reason` (error at the field when the reason is empty). setActual
    /// refuses to change a captured amount.
    Q_INVOKABLE bool setActualByHand(int row, double amount, const QString& reason);
    /// The same for a measured pH taken from the meter.
    Q_INVOKABLE bool setMeasuredPhByHand(double ph, const QString& reason);
    /// The lot of `row`'s reagent.
    Q_INVOKABLE bool setLot(int row, const QString& lot);
    /// An approver accepts the expired lot chosen for `row` with a reason: login and password
    /// again (a wrong password counts towards the lock), the account must be an approver. The
    /// override (who, when, why) is stored with the amount and in the audit trail
    /// (BatchStore::override_expired_lot). Errors name "login", "password",
    /// "lot_override.reason" or "lot_override".
    Q_INVOKABLE bool overrideExpiredLot(int row, const QString& login, const QString& password,
                                        const QString& reason);
    /// Records the pending change as an amendment with amendReason. False (error "reason") when
    /// the reason is empty.
    Q_INVOKABLE bool amend();
    /// Signs the saved batch as it is stored: login and password again (21 CFR 11.200(a)(1)),
    /// meaning "prepared", "reviewed" or "approved". Errors name "login", "password", "meaning"
    /// or "signature" (a pending amendment, no saved batch).
    Q_INVOKABLE bool sign(const QString& login, const QString& password, const QString& meaning);
    /// Drops the pending change and shows the stored batch again.
    Q_INVOKABLE void discardPending();
    /// Records why an out-of-tolerance batch is still used, with the preparer and the time. False
    /// (error "batch.deviation.note") for an empty note.
    Q_INVOKABLE bool recordDeviation(const QString& note);

    /// Where a PDF goes when no path is given: <outputDir>/<batch id>-<what>.pdf. A path or file:
    /// URL given to saveSheet / saveLabels makes its folder the new outputDir.
    Q_INVOKABLE QString defaultPath(const QString& what) const;
    /// Saves the recipe sheet (paper "a4" | "letter") as a PDF; path "" = defaultPath("sheet").
    /// Records the print in the batch's history.
    Q_INVOKABLE bool saveSheet(const QString& path = {},
                               const QString& paper = QStringLiteral("a4"));
    /// Saves the labels (paper "a4" | "letter" | "label62"); path "" = defaultPath("labels").
    Q_INVOKABLE bool saveLabels(const QString& path = {},
                                const QString& paper = QStringLiteral("a4"));
    /// Prints through QPrinter ("" = the default printer).
    Q_INVOKABLE bool printSheet(const QString& printer = {},
                                const QString& paper = QStringLiteral("a4"));
    Q_INVOKABLE bool printLabels(const QString& printer = {},
                                 const QString& paper = QStringLiteral("label62"));

    /// After a refused save: drops the edits refused here and shows the batch as stored now.
    Q_INVOKABLE bool reloadTheirs();
    /// After a refused save: keeps the edits refused here as a new batch (a fresh id with
    /// idPrefix, comment "Copy of <id>: …") and opens it. The other bench's batch is untouched.
    Q_INVOKABLE bool saveAsCopy();
    /// What the change poll calls (Workspace::databaseChanged): the list of batches again, and
    /// the open batch reloaded when it changed elsewhere and has no unsaved edits here.
    Q_INVOKABLE void refreshFromDatabase();

    /// The batch as the `sheet` / `labels` input (tests, the CLI's contract).
    Q_INVOKABLE QVariantMap input() const;

  signals:
    void workspaceChanged();
    void preparerChanged();
    void outputDirChanged();
    void outputChanged();
    void batchChanged();
    void amendReasonChanged();
    void resultChanged();
    void batchListChanged();
    void lastSavedPathChanged();
    void errorChanged();
    void conflictChanged();

  private:
    struct Row {
        QString reagent, name, unit;
        double target = 0, low = 0, high = 0, actual = 0, deviation_percent = 0;
        bool entered = false, within = true;
    };
    std::unique_ptr<storage::BatchStore> store() const;
    /// Runs the core on `rec`; on success takes its rows and results.
    FieldError evaluate(const storage::BatchRecord& rec);
    /// Evaluates `next`, then stores it (edit) or, on a printed batch, keeps it pending and shows
    /// the store's refusal at `field`.
    bool apply(const QString& field, const storage::BatchRecord& next);
    /// Evaluates `next` and stores it as an amendment with `reason` (a captured value changed by
    /// hand).
    bool apply_by_hand(const QString& field, const storage::BatchRecord& next,
                       const QString& reason);
    /// The actual entry of `row` ({} when none).
    QJsonObject actual_entry(int row) const;
    void reload(const QString& id);
    /// After a save of ours succeeded: reload, and the draft takes the stored version.
    void reload_saved(const QString& id);
    /// A refused save (field "version"): keeps the draft, shows the conflict. False otherwise.
    bool take_conflict(const FieldError& e);
    void set_conflict(const QString& conflict, const QString& notice);
    void set_error(const FieldError& e);
    QString who() const;
    bool after_print(bool ok, const QString& what);
    bool save_pdf(const QString& what, const QString& path_in, const QString& paper);
    DocumentOutput* output_iface() const;
    QString history_label(const QString& field) const;
    QString history_value(const QString& field, const QJsonValue& v) const;
    bool ready_to_print();
    int actual_index(const QString& reagent) const;

    QPointer<Workspace> workspace_;
    QString signed_in_login_;
    bool sign_in_required_ = false;
    /// {"session", …} when a signed-in user is required and nobody is; empty otherwise.
    FieldError session_gate() const;
    QPointer<QObject> output_object_;
    QString preparer_;
    QString id_prefix_ = QStringLiteral("B");
    QString output_dir_;
    std::optional<storage::BatchRecord> draft_;  ///< what the screen shows (may be pending)
    std::optional<storage::BatchRecord> stored_; ///< what the database holds
    bool pending_ = false;
    QString amend_reason_;
    std::map<QString, QString> lots_; ///< lots by reagent, including those without an amount
    /// The shelf's lots by reagent id (storage::LotStore), read when a batch opens.
    std::map<QString, std::vector<QVariantMap>> shelf_;
    void read_shelf();
    /// The shelf's entry for `reagent`'s `lot` ({} when not on it).
    QVariantMap shelf_lot(const QString& reagent, const QString& lot) const;
    /// Ties `next`'s lots to the shelf (storage::resolve_batch_lots) so that the screen shows
    /// what the store will keep.
    FieldError resolve_lots(storage::BatchRecord& next) const;
    QString use_by_at_, use_by_limit_;
    QStringList lot_overrides_;

    std::vector<Row> rows_;
    bool valid_ = false;
    QString title_;
    double shelf_life_h_ = 0;
    double target_ph_ = 0, predicted_ph_ = 0, ionic_strength_mmol_per_l_ = 0,
           buffer_capacity_mmol_per_l_ = 0;
    QVariantList composition_, warnings_, history_, steps_;
    QVariantList signatures_;
    BatchRelease release_; ///< from the stored signatures, printed on the sheet and labels
    bool out_of_tolerance_ = false, correction_remake_ = false;
    QStringList reasons_, correction_;
    QString last_saved_path_;
    FieldError error_;
    QString conflict_, remote_notice_;
};

} // namespace phaseplan::gui

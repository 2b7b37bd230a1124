#pragma once
// The buffer designer's model: the inputs of a `recipe` document, the recipe the core designs for
// them (recomputed on every edit), and the curves around it (pH against base fraction or titrant
// volume, β against pH) from chem::titration_curve. Every number comes from the core; this class
// only builds documents, calls phaseplan::command_recipe and chem::titration_curve, and unpacks
// the answers.
#include "model_util.h"
#include "plan.h"

#include <QList>
#include <QObject>
#include <QPointF>
#include <QPointer>
#include <QQmlEngine>
#include <QQmlParserStatus>
#include <QTimer>
#include <QVariantList>
#include <QVariantMap>

// Complete types for the pointer properties, for moc only.
Q_MOC_INCLUDE("workspace.h")
Q_MOC_INCLUDE("plan.h")

namespace phaseplan::gui {

class Workspace;
class Plan;

class BufferDesigner : public QObject, public QQmlParserStatus {
    Q_OBJECT
    QML_ELEMENT
    Q_INTERFACES(QQmlParserStatus)
    // ---- dependencies -----------------------------------------------------------------------
    Q_PROPERTY(phaseplan::gui::Workspace* workspace READ workspace WRITE setWorkspace NOTIFY
                   workspaceChanged)
    /// The plan whose lines may hold this buffer by reference: they follow every edit.
    Q_PROPERTY(phaseplan::gui::Plan* plan READ plan WRITE setPlan NOTIFY planChanged)
    /// Settings key under which the designer keeps the name of the buffer it edits between runs
    /// (empty: not kept). Restored when the workspace is set.
    Q_PROPERTY(QString autosaveKey READ autosaveKey WRITE setAutosaveKey NOTIFY workspaceChanged)

    // ---- the saved buffer edited -------------------------------------------------------------
    /// The saved buffer this designer edits (its name in the lab's database). Every edit is
    /// saved into it a moment later; "" before the workspace is open.
    Q_PROPERTY(QString bufferName READ bufferName NOTIFY bufferChanged)
    /// The name follows the inputs ("20 mM phosphate pH 2.5") until the user names the buffer. It
    /// follows when the edit settles (with the save, flushAutosave), not on every keystroke.
    Q_PROPERTY(bool autoName READ autoName NOTIFY bufferChanged)
    /// [{id: name, name: name}] of every saved buffer, for the picker.
    Q_PROPERTY(QVariantList bufferChoices READ bufferChoices NOTIFY bufferListChanged)
    /// Lines of the plan that hold this buffer ("A", "C"), for "used by line A".
    Q_PROPERTY(QStringList usedByLines READ usedByLines NOTIFY bufferChanged)
    // ---- inputs (the recipe document, units in the names) ------------------------------------
    /// The buffer's name (= bufferName); setting it names the buffer (renameBuffer).
    Q_PROPERTY(QString name READ name WRITE setName NOTIFY bufferChanged)
    /// "mix", "titrate" or "stocks".
    Q_PROPERTY(QString route READ route WRITE setRoute NOTIFY inputsChanged)
    /// Acid-base system id ("phosphate"); narrows the reagent choices.
    Q_PROPERTY(QString system READ system WRITE setSystem NOTIFY inputsChanged)
    Q_PROPERTY(QString acid READ acid WRITE setAcid NOTIFY inputsChanged)
    Q_PROPERTY(QString base READ base WRITE setBase NOTIFY inputsChanged)
    Q_PROPERTY(QString weigh READ weigh WRITE setWeigh NOTIFY inputsChanged)
    Q_PROPERTY(QString titrant READ titrant WRITE setTitrant NOTIFY inputsChanged)
    Q_PROPERTY(
        double titrantMolPerL READ titrantMolPerL WRITE setTitrantMolPerL NOTIFY inputsChanged)
    /// "solution" (a titrant of titrantMolPerL) or "neat" (as supplied, at the library's assay).
    Q_PROPERTY(QString titrantForm READ titrantForm WRITE setTitrantForm NOTIFY inputsChanged)
    /// What the concentration counts: "total" (the system over all its forms) or "salt" (the
    /// salt held at c, brought to pH by its partner). Reads the route's default until chosen.
    Q_PROPERTY(QString concentrationBasis READ concentrationBasis WRITE setConcentrationBasis NOTIFY
                   inputsChanged)
    /// The basis in words, from the designed recipe ("20 mmol/L total phosphate"); "" while
    /// invalid.
    Q_PROPERTY(QString basisText READ basisText NOTIFY resultChanged)
    /// What the last route change did to the reagents, [{field, message}] (e.g. "KOH on KH2PO4
    /// became K2HPO4"); cleared by the next route or system change.
    Q_PROPERTY(QVariantList routeNotes READ routeNotes NOTIFY routeNotesChanged)
    Q_PROPERTY(double acidStockMolPerL READ acidStockMolPerL WRITE setAcidStockMolPerL NOTIFY
                   inputsChanged)
    Q_PROPERTY(double baseStockMolPerL READ baseStockMolPerL WRITE setBaseStockMolPerL NOTIFY
                   inputsChanged)
    Q_PROPERTY(double targetPh READ targetPh WRITE setTargetPh NOTIFY inputsChanged)
    Q_PROPERTY(double temperatureC READ temperatureC WRITE setTemperatureC NOTIFY inputsChanged)
    Q_PROPERTY(double volumeMl READ volumeMl WRITE setVolumeMl NOTIFY inputsChanged)
    /// "concentration" or "ionic_strength": which of the two amounts below is given.
    Q_PROPERTY(QString strengthBasis READ strengthBasis WRITE setStrengthBasis NOTIFY inputsChanged)
    /// Total buffer concentration in mmol/L (the document carries mol/L).
    Q_PROPERTY(double concentrationMmolPerL READ concentrationMmolPerL WRITE
                   setConcentrationMmolPerL NOTIFY inputsChanged)
    /// Ionic strength of the finished buffer in mmol/L.
    Q_PROPERTY(double ionicStrengthMmolPerL READ ionicStrengthMmolPerL WRITE
                   setIonicStrengthMmolPerL NOTIFY inputsChanged)

    // ---- choices for the pickers ------------------------------------------------------------
    /// [{id, name}] of every acid-base system in the library.
    Q_PROPERTY(QVariantList systemChoices READ systemChoices NOTIFY choicesChanged)
    /// [{id, name, formula}] of reagents bringing the chosen system, most acidic form first.
    Q_PROPERTY(QVariantList reagentChoices READ reagentChoices NOTIFY choicesChanged)
    /// Pickers that offer only the forms that fit their role, [{id, name, formula, detail}],
    /// with `name` as shown ("Formic acid 98 % · HCOOH") and `detail` for titrants ("lowers pH").
    Q_PROPERTY(QVariantList acidChoices READ acidChoices NOTIFY choicesChanged)
    Q_PROPERTY(QVariantList baseChoices READ baseChoices NOTIFY choicesChanged)
    Q_PROPERTY(QVariantList weighChoices READ weighChoices NOTIFY choicesChanged)
    /// Titrants that fit the weighed reagent: its system's other forms first (formic acid,
    /// ammonia), then strong acids and bases.
    Q_PROPERTY(QVariantList titrantChoices READ titrantChoices NOTIFY choicesChanged)

    // ---- results ----------------------------------------------------------------------------
    Q_PROPERTY(bool valid READ valid NOTIFY resultChanged)
    /// [{reagent, name, mass_g?, volume_ml?, as, mol_per_l, amount (display text)}]
    Q_PROPERTY(QVariantList items READ items NOTIFY itemsChanged)
    Q_PROPERTY(double predictedPh READ predictedPh NOTIFY resultChanged)
    Q_PROPERTY(
        double ionicStrengthResultMmolPerL READ ionicStrengthResultMmolPerL NOTIFY resultChanged)
    /// β in mmol/L per pH unit.
    Q_PROPERTY(double bufferCapacityMmolPerL READ bufferCapacityMmolPerL NOTIFY resultChanged)
    Q_PROPERTY(QStringList steps READ steps NOTIFY stepsChanged)
    /// The lengths of items and steps, for views that show one row per entry through itemAt() /
    /// stepAt(): each read of `items` or `steps` from QML makes a new JS copy of the whole list
    /// (garbage the JS heap collects in one long pause), so a row reads only its own entry. A
    /// row reads the count too, which carries the list's change signal.
    Q_PROPERTY(int itemCount READ itemCount NOTIFY itemsChanged)
    Q_PROPERTY(int stepCount READ stepCount NOTIFY stepsChanged)
    Q_PROPERTY(QStringList cautions READ cautions NOTIFY cautionsChanged)
    /// [{code, severity, message}]
    Q_PROPERTY(QVariantList warnings READ warnings NOTIFY warningsChanged)
    /// The JSON path of the field at fault ("target_ph"), empty when the recipe is valid.
    /// Two benches, one buffer (app/storage/versioning.h): set when a save was refused because the
    /// buffer changed on another bench since it was opened here ("Buffer "…": changed by <name>
    /// at <time> UTC after you opened it; …"). The edits stay on screen, unsaved, until
    /// reloadBuffer() or saveBufferAsCopy().
    Q_PROPERTY(QString conflictMessage READ conflictMessage NOTIFY conflictChanged)
    /// Set when the open buffer changed on another bench (refreshFromDatabase): reloaded when it
    /// had no unsaved edits here, else left as it is on screen, and the notice says which.
    Q_PROPERTY(QString remoteNotice READ remoteNotice NOTIFY conflictChanged)
    Q_PROPERTY(QString errorField READ errorField NOTIFY resultChanged)
    Q_PROPERTY(QString errorMessage READ errorMessage NOTIFY resultChanged)
    /// The field at fault in the screen's words ("Target pH"), "" when the recipe is valid.
    Q_PROPERTY(QString errorPlace READ errorPlace NOTIFY resultChanged)
    /// Recompute time of the last edit (recipe + curves), in ms.
    Q_PROPERTY(double lastRecomputeMs READ lastRecomputeMs NOTIFY resultChanged)

    // ---- curves -----------------------------------------------------------------------------
    /// "Base form, fraction of total" or "Titrant added (mL)".
    Q_PROPERTY(QString curveXLabel READ curveXLabel NOTIFY resultChanged)
    Q_PROPERTY(double curveXMax READ curveXMax NOTIFY resultChanged)
    /// The recipe's own point on the curve (x, predicted pH).
    Q_PROPERTY(QPointF recipePoint READ recipePoint NOTIFY resultChanged)
    Q_PROPERTY(double curvePhMin READ curvePhMin NOTIFY resultChanged)
    Q_PROPERTY(double curvePhMax READ curvePhMax NOTIFY resultChanged)
    /// Highest β on the β curve in mmol/L per pH (axis range).
    Q_PROPERTY(double betaMaxMmolPerL READ betaMaxMmolPerL NOTIFY resultChanged)
    Q_PROPERTY(int curvePointCount READ curvePointCount NOTIFY resultChanged)

  public:
    explicit BufferDesigner(QObject* parent = nullptr);
    ~BufferDesigner() override;

    Workspace* workspace() const { return workspace_; }
    void setWorkspace(Workspace* w);
    Plan* plan() const { return plan_; }
    void setPlan(Plan* p);
    QString autosaveKey() const { return autosave_key_; }
    void setAutosaveKey(const QString& k);
    /// Writes the pending save of the buffer now (also done on destruction), after the automatic
    /// rename the settled inputs call for.
    Q_INVOKABLE void flushAutosave();

    QString bufferName() const { return buffer_name_; }
    bool autoName() const { return auto_name_; }
    QVariantList bufferChoices() const { return buffer_choices_; }
    QStringList usedByLines() const;
    /// Opens a saved buffer; false when there is none by that name.
    Q_INVOKABLE bool openBuffer(const QString& name);
    QString conflictMessage() const { return conflict_; }
    QString remoteNotice() const { return remote_notice_; }
    /// After a refused save: drops the edits made here and shows the buffer as stored now.
    Q_INVOKABLE bool reloadBuffer();
    /// After a refused save: keeps the edits made here as a new buffer "<name> (copy)" and opens
    /// it; the other bench's buffer is left as saved. Returns "" or why it failed.
    Q_INVOKABLE QString saveBufferAsCopy();
    /// What the change poll calls (Workspace::databaseChanged).
    Q_INVOKABLE void refreshFromDatabase();
    /// A new buffer (phosphate, pH 7.0, 25 mmol/L, 1000 mL), saved at once under a name that
    /// follows its inputs. Returns its name.
    Q_INVOKABLE QString newBuffer();
    /// A copy of this buffer under `name` (the default: "<name> (copy)"), opened. Returns "" or
    /// why not (the name is taken).
    Q_INVOKABLE QString duplicateBuffer(const QString& name = {});
    /// Names the buffer (it stops following its inputs); lines that hold it follow. "" or why not.
    Q_INVOKABLE QString renameBuffer(const QString& name);
    /// Deletes the saved buffer; lines that held it keep their own copy. Opens another buffer.
    /// "" or why not.
    Q_INVOKABLE QString deleteBuffer();
    // Created in QML: restore once every property is set (the plan restored first).
    void classBegin() override { constructing_ = true; }
    void componentComplete() override;

    QString name() const { return buffer_name_; }
    void setName(const QString& v) { renameBuffer(v); }
    QString route() const { return route_; }
    void setRoute(const QString& v);
    QString system() const { return system_; }
    void setSystem(const QString& v);
    QString acid() const { return acid_; }
    void setAcid(const QString& v);
    QString base() const { return base_; }
    void setBase(const QString& v);
    QString weigh() const { return weigh_; }
    void setWeigh(const QString& v);
    QString titrant() const { return titrant_; }
    void setTitrant(const QString& v);
    double titrantMolPerL() const { return titrant_mol_per_l_; }
    void setTitrantMolPerL(double v);
    QString titrantForm() const { return titrant_form_; }
    void setTitrantForm(const QString& v);
    QString concentrationBasis() const;
    void setConcentrationBasis(const QString& v);
    QString basisText() const { return basis_text_; }
    QVariantList routeNotes() const { return route_notes_; }
    double acidStockMolPerL() const { return acid_stock_mol_per_l_; }
    void setAcidStockMolPerL(double v);
    double baseStockMolPerL() const { return base_stock_mol_per_l_; }
    void setBaseStockMolPerL(double v);
    double targetPh() const { return target_ph_; }
    void setTargetPh(double v);
    double temperatureC() const { return temperature_c_; }
    void setTemperatureC(double v);
    double volumeMl() const { return volume_ml_; }
    void setVolumeMl(double v);
    QString strengthBasis() const { return strength_basis_; }
    void setStrengthBasis(const QString& v);
    double concentrationMmolPerL() const { return concentration_mmol_per_l_; }
    void setConcentrationMmolPerL(double v);
    double ionicStrengthMmolPerL() const { return ionic_strength_mmol_per_l_; }
    void setIonicStrengthMmolPerL(double v);

    QVariantList systemChoices() const { return system_choices_; }
    QVariantList reagentChoices() const { return reagent_choices_; }
    QVariantList titrantChoices() const { return titrant_choices_; }
    QVariantList acidChoices() const { return acid_choices_; }
    QVariantList baseChoices() const { return base_choices_; }
    QVariantList weighChoices() const { return weigh_choices_; }

    bool valid() const { return error_.empty(); }
    QVariantList items() const { return items_; }
    double predictedPh() const { return predicted_ph_; }
    double ionicStrengthResultMmolPerL() const { return ionic_strength_result_mmol_per_l_; }
    double bufferCapacityMmolPerL() const { return buffer_capacity_mmol_per_l_; }
    QStringList steps() const { return steps_; }
    int itemCount() const { return int(items_.size()); }
    int stepCount() const { return int(steps_.size()); }
    /// Item i as in `items` ({} out of range).
    Q_INVOKABLE QVariantMap itemAt(int i) const {
        return i >= 0 && i < items_.size() ? items_.at(i).toMap() : QVariantMap{};
    }
    /// Step i as in `steps` ("" out of range).
    Q_INVOKABLE QString stepAt(int i) const { return steps_.value(i); }
    QStringList cautions() const { return cautions_; }
    QVariantList warnings() const { return warnings_; }
    QString errorField() const { return error_.field; }
    QString errorMessage() const { return error_.message; }
    QString errorPlace() const;
    double lastRecomputeMs() const { return last_recompute_ms_; }

    QString curveXLabel() const { return curve_x_label_; }
    double curveXMax() const { return curve_x_max_; }
    QPointF recipePoint() const { return recipe_point_; }
    double curvePhMin() const { return curve_ph_min_; }
    double curvePhMax() const { return curve_ph_max_; }
    double betaMaxMmolPerL() const { return beta_max_mmol_per_l_; }
    int curvePointCount() const { return int(ph_curve_.size()); }
    const QList<QPointF>& phCurve() const { return ph_curve_; }
    const QList<QPointF>& betaCurve() const { return beta_curve_; }

    /// The recipe document of the command-line contract for the current inputs.
    QJsonObject requestDocument() const;
    /// Same, for QML (saving, showing).
    Q_INVOKABLE QVariantMap document() const { return requestDocument().toVariantMap(); }
    /// Takes every input from a recipe document (unknown keys ignored), then recomputes.
    Q_INVOKABLE void loadDocument(const QVariantMap& doc);
    void loadJson(const QJsonObject& doc);
    /// Saves a copy of the inputs under `name` and opens it (duplicateBuffer). "" or why not.
    Q_INVOKABLE QString saveAs(const QString& name) { return duplicateBuffer(name); }
    /// The name the inputs give ("20 mM sodium phosphate pH 2.5", chem::default_buffer_name), as
    /// an unnamed buffer is called.
    Q_INVOKABLE QString defaultName() const;
    /// Fills a LineSeries with the pH curve, the β curve or the target line.
    /// @param which "ph", "beta", "target".
    Q_INVOKABLE void fillSeries(QObject* series, const QString& which) const;
    /// Whether the error names this input ("target_ph", "acid", …); for the fields' inline
    /// messages.
    Q_INVOKABLE bool errorIs(const QString& field) const { return error_.field == field; }
    /// Recomputes now (inputs' setters do it themselves).
    Q_INVOKABLE void recompute();

  signals:
    void workspaceChanged();
    void planChanged();
    void bufferChanged();
    void bufferListChanged();
    void inputsChanged();
    void choicesChanged();
    void routeNotesChanged();
    void resultChanged();
    // The lists have their own signals, sent only when they differ: a view of the steps is not
    // rebuilt when only the amounts changed.
    void itemsChanged();
    void stepsChanged();
    /// Step `index` reads differently (sent for each step that changed, with stepsChanged): a
    /// row of the steps reads its text again only then, not on every edit.
    void stepTextChanged(int index);
    void cautionsChanged();
    void warningsChanged();
    /// An input changed by the user (not by loading): the plan and autosave listen.
    void edited();
    void conflictChanged();

  private:
    template <class T> void set_input(T& member, const T& value);
    /// After an input changed by the user: recompute, update the lines that hold the buffer,
    /// schedule the save (which follows the default name).
    void after_edit();
    void rebuild_choices();
    void rebuild_buffer_list();
    /// After this bench renamed `old` to `name`: the list updated in place.
    void rename_in_buffer_list(const QString& old, const QString& name);
    void compute_curves(const chem::Recipe& recipe);
    void restore_state();
    void schedule_autosave();
    /// The saved document: the inputs plus "name" (and "auto_name" while the name follows them).
    QJsonObject saved_document() const;
    /// Renames the saved buffer to follow the inputs while autoName (from flushAutosave).
    void follow_default_name();
    /// A name not yet taken: `wanted`, else "wanted (2)", "wanted (3)", …
    QString free_name(const QString& wanted) const;
    void remember_current();
    /// After the open buffer was made, renamed or replaced: the list, the remembered name, the
    /// views and the saved-work list hear of it.
    void announce_buffer_change();

    /// Saves the buffer under buffer_name_; a failure goes to the workspace's banner.
    bool save_buffer(); ///< true when saved
    QPointer<Workspace> workspace_;
    QPointer<Plan> plan_;
    bool loading_ = false;
    QString autosave_key_;
    QTimer autosave_;
    bool dirty_ = false;
    qint64 loaded_version_ = 0; ///< the stored version the screen was loaded at (0: new)
    /// Moves the stored buffer `old` to `name` (a rename from loaded_version_, or a new record
    /// when it was never saved). A name taken meanwhile is refused (field "name", naming who saved
    /// it); a buffer changed or removed on another bench sets the conflict (field "version").
    FieldError move_to_name(const QString& old, const QString& name);
    QString conflict_, remote_notice_;
    void set_conflict(const QString& conflict, const QString& notice);
    /// loaded_version_ from the database, after a save or rename of ours.
    void take_stored_version();
    bool restored_ = false;
    bool constructing_ = false;
    QString buffer_name_;
    bool auto_name_ = true;
    QVariantList buffer_choices_;

    QString route_ = QStringLiteral("mix");
    QString system_ = QStringLiteral("phosphate");
    QString acid_ = QStringLiteral("sodium-dihydrogen-phosphate-monohydrate");
    QString base_ = QStringLiteral("disodium-hydrogen-phosphate-heptahydrate");
    QString weigh_ = QStringLiteral("sodium-dihydrogen-phosphate-monohydrate");
    QString titrant_ = QStringLiteral("sodium-hydroxide");
    double titrant_mol_per_l_ = 1.0;
    QString titrant_form_ = QStringLiteral("solution");
    QString concentration_basis_; ///< "" = the route's default (effective_basis_ after a design)
    QString effective_basis_ = QStringLiteral("total");
    QString basis_text_;
    QVariantList route_notes_;
    double acid_stock_mol_per_l_ = 0.2;
    double base_stock_mol_per_l_ = 0.2;
    double target_ph_ = 7.0;
    double temperature_c_ = 25.0;
    double volume_ml_ = 1000.0;
    QString strength_basis_ = QStringLiteral("concentration");
    double concentration_mmol_per_l_ = 25.0;
    double ionic_strength_mmol_per_l_ = 50.0;
    QVariantMap extra_; ///< keys of a loaded document this model does not edit (kept on save)

    QVariantList system_choices_, reagent_choices_, titrant_choices_;
    QVariantList acid_choices_, base_choices_, weigh_choices_;

    FieldError error_;
    QVariantList items_, warnings_;
    QStringList steps_, cautions_;
    double predicted_ph_ = 0, ionic_strength_result_mmol_per_l_ = 0,
           buffer_capacity_mmol_per_l_ = 0;
    double last_recompute_ms_ = 0;
    QString curve_x_label_;
    double curve_x_max_ = 1;
    QPointF recipe_point_;
    double curve_ph_min_ = 0, curve_ph_max_ = 14, beta_max_mmol_per_l_ = 1;
    QList<QPointF> ph_curve_, beta_curve_;
};

} // namespace phaseplan::gui

#pragma once
// The reagent and solvent library as the lab sees it (shipped entries with the lab's own in their
// place), searchable; and the editor for a lab's own reagent, which checks an entry with the same
// loader as data/reagents.json before it is stored.
#include "model_util.h"
#include "workspace.h"

#include <QAbstractListModel>
#include <QJsonObject>
#include <QPointer>
#include <QQmlEngine>

// Complete types for the pointer properties, for moc only.
Q_MOC_INCLUDE("workspace.h")

namespace phaseplan::gui {

class Workspace;

class LibraryModel : public QAbstractListModel {
    Q_OBJECT
    QML_ELEMENT
    Q_PROPERTY(phaseplan::gui::Workspace* workspace READ workspace WRITE setWorkspace NOTIFY
                   workspaceChanged)
    /// Words to find in the id, name or formula (all of them, any case).
    Q_PROPERTY(QString search READ search WRITE setSearch NOTIFY searchChanged)
    /// "all", "reagents" or "solvents".
    Q_PROPERTY(QString kind READ kind WRITE setKind NOTIFY searchChanged)
    Q_PROPERTY(int count READ count NOTIFY countChanged)

  public:
    enum Role {
        IdRole = Qt::UserRole + 1,
        NameRole,
        KindRole, ///< "reagents" or "solvents"
        FormulaRole,
        DetailRole,      ///< one line: molar mass and form, or density and UV cutoff
        HazardsRole,     ///< "H290 H314"
        PictogramsRole,  ///< "GHS05"
        SourcesRole,     ///< the citations, one per line
        UserDefinedRole, ///< a lab's own entry
    };
    Q_ENUM(Role)

    explicit LibraryModel(QObject* parent = nullptr);
    Workspace* workspace() const { return workspace_; }
    void setWorkspace(Workspace* w);
    QString search() const { return search_; }
    void setSearch(const QString& s);
    QString kind() const { return kind_; }
    void setKind(const QString& k);
    int count() const { return int(shown_.size()); }

    int rowCount(const QModelIndex& parent = {}) const override;
    QVariant data(const QModelIndex& index, int role) const override;
    QHash<int, QByteArray> roleNames() const override;

  signals:
    void workspaceChanged();
    void searchChanged();
    void countChanged();

  private:
    struct Row {
        QString id, name, kind, formula, detail, hazards, pictograms, sources;
        bool user = false;
    };
    void reload();
    void filter();
    QPointer<Workspace> workspace_;
    QString search_, kind_ = QStringLiteral("all");
    std::vector<Row> all_;
    std::vector<int> shown_;
};

class ReagentEditor : public QObject {
    Q_OBJECT
    QML_ELEMENT
    Q_PROPERTY(phaseplan::gui::Workspace* workspace READ workspace WRITE setWorkspace NOTIFY
                   workspaceChanged)
    Q_PROPERTY(QString reagentId READ reagentId WRITE setReagentId NOTIFY changed)
    Q_PROPERTY(QString name READ name WRITE setName NOTIFY changed)
    Q_PROPERTY(QString formula READ formula WRITE setFormula NOTIFY changed)
    /// "solid" or "liquid".
    Q_PROPERTY(QString form READ form WRITE setForm NOTIFY changed)
    /// Mass fraction of the substance in the material as supplied, in %.
    Q_PROPERTY(double assayPercent READ assayPercent WRITE setAssayPercent NOTIFY changed)
    /// Liquids only, g/mL at 20–25 °C.
    Q_PROPERTY(double densityGPerMl READ densityGPerMl WRITE setDensityGPerMl NOTIFY changed)
    /// Hazard statement codes, separated by spaces or commas ("H290 H314").
    Q_PROPERTY(QString hazards READ hazards WRITE setHazards NOTIFY changed)
    Q_PROPERTY(QString pictograms READ pictograms WRITE setPictograms NOTIFY changed)
    /// One spectator ion ("Na+") with its charge and count per formula unit; empty for none.
    Q_PROPERTY(QString spectatorIon READ spectatorIon WRITE setSpectatorIon NOTIFY changed)
    Q_PROPERTY(int spectatorCharge READ spectatorCharge WRITE setSpectatorCharge NOTIFY changed)
    Q_PROPERTY(double spectatorCount READ spectatorCount WRITE setSpectatorCount NOTIFY changed)
    /// The acid-base system it brings ("" for none), units per formula unit, protons removed.
    Q_PROPERTY(QString system READ system WRITE setSystem NOTIFY changed)
    Q_PROPERTY(double systemCount READ systemCount WRITE setSystemCount NOTIFY changed)
    Q_PROPERTY(double protonsRemoved READ protonsRemoved WRITE setProtonsRemoved NOTIFY changed)
    /// Where the numbers come from (required): a citation, a certificate, "lab measurement".
    Q_PROPERTY(QString source READ source WRITE setSource NOTIFY changed)

    /// From the formula by the core (IUPAC 2021 weights), 0 when the formula does not parse.
    Q_PROPERTY(double molarMassGPerMol READ molarMassGPerMol NOTIFY validated)
    Q_PROPERTY(bool valid READ valid NOTIFY validated)
    /// The field at fault in the editor's terms ("formula", "source", "spectators[0].charge", …).
    Q_PROPERTY(QString errorField READ errorField NOTIFY validated)
    Q_PROPERTY(QString errorMessage READ errorMessage NOTIFY validated)
    /// Editing a shipped entry (saving makes a lab override of it).
    Q_PROPERTY(bool editingShipped READ editingShipped NOTIFY changed)
    Q_PROPERTY(bool isLabEntry READ isLabEntry NOTIFY changed)
    /// False on a fresh form until the user changes something: no errors shown before that.
    Q_PROPERTY(bool showErrors READ showErrors NOTIFY changed)
    /// The stored version of the lab's entry this form was loaded from (0: a new entry, or a
    /// shipped one being corrected). A save writes only from it; a save refused because another
    /// bench changed the entry sets errorField "version" with the sentence naming who and when.
    Q_PROPERTY(qint64 loadedVersion READ loadedVersion NOTIFY changed)

  public:
    explicit ReagentEditor(QObject* parent = nullptr);
    Workspace* workspace() const { return workspace_; }
    void setWorkspace(Workspace* w);

#define PHASEPLAN_FIELD(type, getter, setter, member)                                              \
    type getter() const {                                                                          \
        return member;                                                                             \
    }                                                                                              \
    void setter(const type& v) {                                                                   \
        if (member == v)                                                                           \
            return;                                                                                \
        member = v;                                                                                \
        show_errors_ = true;                                                                       \
        emit changed();                                                                            \
        validate();                                                                                \
    }
    PHASEPLAN_FIELD(QString, reagentId, setReagentId, id_)
    PHASEPLAN_FIELD(QString, name, setName, name_)
    PHASEPLAN_FIELD(QString, formula, setFormula, formula_)
    PHASEPLAN_FIELD(QString, form, setForm, form_)
    PHASEPLAN_FIELD(double, assayPercent, setAssayPercent, assay_percent_)
    PHASEPLAN_FIELD(double, densityGPerMl, setDensityGPerMl, density_g_per_ml_)
    PHASEPLAN_FIELD(QString, hazards, setHazards, hazards_)
    PHASEPLAN_FIELD(QString, pictograms, setPictograms, pictograms_)
    PHASEPLAN_FIELD(QString, spectatorIon, setSpectatorIon, spectator_ion_)
    PHASEPLAN_FIELD(int, spectatorCharge, setSpectatorCharge, spectator_charge_)
    PHASEPLAN_FIELD(double, spectatorCount, setSpectatorCount, spectator_count_)
    PHASEPLAN_FIELD(QString, system, setSystem, system_)
    PHASEPLAN_FIELD(double, systemCount, setSystemCount, system_count_)
    PHASEPLAN_FIELD(double, protonsRemoved, setProtonsRemoved, protons_removed_)
    PHASEPLAN_FIELD(QString, source, setSource, source_)
#undef PHASEPLAN_FIELD

    double molarMassGPerMol() const {
        return molar_mass_;
    }
    bool valid() const {
        return error_.empty();
    }
    QString errorField() const {
        return error_.field;
    }
    QString errorMessage() const {
        return error_.message;
    }
    bool editingShipped() const {
        return editing_shipped_;
    }
    bool isLabEntry() const {
        return is_lab_entry_;
    }
    bool showErrors() const {
        return show_errors_;
    }
    qint64 loadedVersion() const {
        return loaded_version_;
    }

    /// Clears the form for a new entry.
    Q_INVOKABLE void clear();
    /// Loads a library reagent (shipped or the lab's) for editing. False when unknown.
    Q_INVOKABLE bool edit(const QString& id);
    /// The reagents.json object of the form.
    QJsonObject document() const;
    /// Validates and stores the lab's entry (one transaction), then reloads the library.
    /// Returns "" or the error message (also in errorField/errorMessage).
    Q_INVOKABLE QString save();
    /// Removes the lab's entry of this id (a shipped one of the same id shows again), only from
    /// the loaded version.
    Q_INVOKABLE bool removeLabEntry();
    /// After a refused save: drops the form's edits and loads the entry as stored now (the
    /// shipped one, or a new form, when the lab's entry was removed). Rebuilds the library.
    Q_INVOKABLE void reload();
    /// [{id, name}] of the acid-base systems, with "" (none) first.
    Q_INVOKABLE QVariantList systemChoices() const;
    Q_INVOKABLE bool errorIs(const QString& field) const {
        return error_.field == field;
    }

  signals:
    void workspaceChanged();
    void changed();
    void validated();

  private:
    void validate();
    QPointer<Workspace> workspace_;
    QString id_, name_, formula_, form_ = QStringLiteral("solid");
    double assay_percent_ = 100, density_g_per_ml_ = 0;
    QString hazards_, pictograms_, spectator_ion_;
    int spectator_charge_ = 1;
    double spectator_count_ = 1;
    QString system_;
    double system_count_ = 1, protons_removed_ = 0;
    QString source_;
    QJsonObject extra_; ///< fields of the loaded entry the form does not edit (kept)
    double molar_mass_ = 0;
    FieldError error_;
    bool editing_shipped_ = false, is_lab_entry_ = false, show_errors_ = false;
    qint64 loaded_version_ = 0;
};

} // namespace phaseplan::gui

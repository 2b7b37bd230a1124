#pragma once
// Mobile-phase lines A–D of the plan as a list model: each line's parts and additives as edited,
// and what the core's `line` command makes of them for the line's bottle (amount of each part by
// volume and by mass, UV cutoff, warnings). Edits go into the Plan's document.
#include "model_util.h"
#include "plan.h"

#include <QAbstractListModel>
#include <QPointer>
#include <QQmlEngine>
#include <QTimer>

#include <array>
#include <functional>

// Complete types for the pointer properties, for moc only.
Q_MOC_INCLUDE("plan.h")

namespace phaseplan::gui {

class Plan;

class LinesModel : public QAbstractListModel {
    Q_OBJECT
    QML_ELEMENT
    Q_PROPERTY(phaseplan::gui::Plan* plan READ plan WRITE setPlan NOTIFY planChanged)
    /// [{id, name}] of solvents, and of additives, for the pickers.
    Q_PROPERTY(QVariantList solventChoices READ solventChoices NOTIFY choicesChanged)
    Q_PROPERTY(QVariantList additiveChoices READ additiveChoices NOTIFY choicesChanged)
    /// Time of the last recompute of all four lines, in ms.
    Q_PROPERTY(double lastRecomputeMs READ lastRecomputeMs NOTIFY computed)
    /// False while no view of the lines is on screen: the lines are still computed (the checks
    /// read them) but the views hear of it only when shown again, so an edit on another screen
    /// does not rebuild hidden cards.
    Q_PROPERTY(bool viewsActive READ viewsActive WRITE setViewsActive NOTIFY viewsActiveChanged)
    /// Warnings of every line, each with its "line" letter added.
    Q_PROPERTY(QVariantList allWarnings READ allWarnings NOTIFY computed)

  public:
    enum Role {
        LetterRole = Qt::UserRole + 1, ///< "A"
        DefinedRole,                   ///< the plan has this line
        NameRole,
        BottleMlRole,
        ResidueMlRole,
        PrimeMlRole,
        PartsRole,     ///< [{kind: "solvent"|"buffer", id, ref, name, fraction_v, percent_v}]
        AdditivesRole, ///< [{id, name, amount, unit: "percent_v"|"percent_w"|"mmol_per_l"}]
        ItemsRole,     ///< [{part, name, volume_ml, mass_g, volume_text, mass_text}] from the core
        UvCutoffNmRole,
        WarningsRole,   ///< [{code, severity, message}]
        ErrorFieldRole, ///< the field at fault, relative to the line ("parts[1].fraction_v")
        ErrorMessageRole,
        HasBufferRole,
        BufferNameRole,
        BufferItemsRole, ///< [{name, amount}] of the aqueous buffer, for its share of the bottle
        CautionsRole,    ///< safety notes of the line's parts, from the core
        NotesRole,       ///< how to measure and combine, from the core
    };
    Q_ENUM(Role)

    explicit LinesModel(QObject* parent = nullptr);

    Plan* plan() const { return plan_; }
    void setPlan(Plan* p);
    QVariantList solventChoices() const { return solvent_choices_; }
    QVariantList additiveChoices() const { return additive_choices_; }
    double lastRecomputeMs() const { return last_recompute_ms_; }
    bool viewsActive() const { return views_active_; }
    void setViewsActive(bool a);
    /// The current value of a role, whether or not the views were told (for the checks).
    QVariant current(int row, int role) const { return role_value(row, role); }
    QVariantList allWarnings() const;

    int rowCount(const QModelIndex& parent = {}) const override;
    QVariant data(const QModelIndex& index, int role) const override;
    QHash<int, QByteArray> roleNames() const override;

    /// Adds line `letter` (water, 1 L bottle) or removes it.
    Q_INVOKABLE void addLine(const QString& letter);
    Q_INVOKABLE void removeLine(const QString& letter);
    Q_INVOKABLE void setName(const QString& letter, const QString& name);
    Q_INVOKABLE void setBottleMl(const QString& letter, double ml);
    Q_INVOKABLE void setResidueMl(const QString& letter, double ml);
    Q_INVOKABLE void setPrimeMl(const QString& letter, double ml);
    /// Volume fraction of part `i` as a percentage (the document holds the fraction).
    Q_INVOKABLE void setPartPercent(const QString& letter, int i, double percent);
    Q_INVOKABLE void setPartSolvent(const QString& letter, int i, const QString& solvent);
    Q_INVOKABLE void addSolventPart(const QString& letter, const QString& solvent);
    /// Adds a saved buffer as the line's aqueous part, held by reference (it follows edits in the
    /// designer). Like a new solvent part, it takes the fraction the other parts leave.
    Q_INVOKABLE void addBufferPart(const QString& letter, const QString& bufferName);
    /// Part `i` becomes the saved buffer `bufferName`, held by reference.
    Q_INVOKABLE void setPartBuffer(const QString& letter, int i, const QString& bufferName);
    /// % v/v the line's parts leave free (0 when they add up to 100 %).
    Q_INVOKABLE double remainingPercent(const QString& letter) const;
    Q_INVOKABLE void removePart(const QString& letter, int i);
    Q_INVOKABLE void addAdditive(const QString& letter, const QString& additive);
    /// @param unit "percent_v", "percent_w" or "mmol_per_l".
    Q_INVOKABLE void setAdditive(const QString& letter, int i, const QString& additive,
                                 double amount, const QString& unit);
    Q_INVOKABLE void removeAdditive(const QString& letter, int i);
    /// Row of a letter, −1 for anything else.
    Q_INVOKABLE int rowOf(const QString& letter) const;
    /// Runs a pending recompute now (edits recompute on the next turn of the event loop).
    Q_INVOKABLE void recomputeNow();

  signals:
    void planChanged();
    void choicesChanged();
    void computed();
    void viewsActiveChanged();

  private:
    struct Computed {
        QVariantList items, warnings, buffer_items;
        QStringList cautions, notes;
        double uv_cutoff_nm = 0;
        FieldError error;
    };
    void recompute();
    void rebuild_choices();
    void edit_line(const QString& letter, const std::function<void(QJsonObject&)>& change);

    QVariant role_value(int row, int role) const;
    QPointer<Plan> plan_;
    std::array<Computed, 4> computed_;
    /// What the views were last told, per row and role: only what changed is signalled, so a
    /// line card being edited is not rebuilt by an edit elsewhere.
    std::array<QHash<int, QVariant>, 4> shown_;
    QTimer recompute_timer_;
    bool views_active_ = true;
    void notify_views();
    QVariantList solvent_choices_, additive_choices_;
    double last_recompute_ms_ = 0;
};

} // namespace phaseplan::gui

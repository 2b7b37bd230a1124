#pragma once
// The reagent-lot shelf on the Library screen (issue 13, part 7): the lots of the lab's reagents
// (storage::LotStore) with a state in words, a filter by reagent, putting a lot on the shelf and
// marking one opened today. Writes are made under the person signed in, with the same gate as
// Prepare & record (BatchModel::session_gate): when the database has accounts and nobody who
// may record is signed in, nothing is written and writeBlock says why.
#include "model_util.h"
#include "workspace.h"

#include <QAbstractListModel>
#include <QDate>
#include <QPointer>
#include <QQmlEngine>
#include <QVariantList>

#include <vector>

// Complete types for the pointer properties, for moc only.
Q_MOC_INCLUDE("workspace.h")

namespace phaseplan::gui {

class LotShelfModel : public QAbstractListModel {
    Q_OBJECT
    QML_ELEMENT
    Q_PROPERTY(phaseplan::gui::Workspace* workspace READ workspace WRITE setWorkspace NOTIFY
                   workspaceChanged)
    /// The database has accounts: writing needs someone signed in (Session::accountsExist).
    Q_PROPERTY(
        bool signInRequired READ signInRequired WRITE setSignInRequired NOTIFY sessionChanged)
    /// The login of the person signed in and not locked out ("" when nobody is). The
    /// administrator is passed too: the shelf itself refuses them, and writeBlock says so.
    Q_PROPERTY(
        QString signedInLogin READ signedInLogin WRITE setSignedInLogin NOTIFY sessionChanged)
    /// Why nothing can be written now, in words ("" when the form may be used): nobody signed
    /// in, or the login may not change records (the administrator, a locked account).
    Q_PROPERTY(QString writeBlock READ writeBlock NOTIFY sessionChanged)
    /// The reagent id whose lots are shown; "" shows every reagent's.
    Q_PROPERTY(QString reagentFilter READ reagentFilter WRITE setReagentFilter NOTIFY filterChanged)
    Q_PROPERTY(int count READ count NOTIFY countChanged)
    /// The last failure: the field of the form it belongs to ("reagent", "lot", "supplier",
    /// "received_on", "opened_on", "expires_on", "quantity", "quantity_unit"; "who" or
    /// "session" for the person) and the message naming the value as typed.
    Q_PROPERTY(QString errorField READ errorField NOTIFY errorChanged)
    Q_PROPERTY(QString errorMessage READ errorMessage NOTIFY errorChanged)
    /// Today's date, YYYY-MM-DD (the day "Mark as opened today" records).
    Q_PROPERTY(QString today READ today NOTIFY countChanged)

  public:
    /// A lot that expires within this many days reads "expires in N days" rather than "in
    /// date" (common practice, no source: a month's warning to reorder).
    static constexpr int warn_days = 30;

    enum Role {
        ReagentRole = Qt::UserRole + 1, ///< the library id
        ReagentNameRole,                ///< the library name (the id when not in the library)
        LotRole,
        SupplierRole,
        ReceivedOnRole, ///< YYYY-MM-DD
        OpenedOnRole,   ///< YYYY-MM-DD, "" when not opened
        ExpiresOnRole,  ///< YYYY-MM-DD
        QuantityRole,   ///< "500 g", "" when not recorded
        StateRole,      ///< "in date", "expires in 12 days", "expires today", "expired"
        ExpiredRole,    ///< expired before today
        CreatedByRole,  ///< the login that put it on the shelf
        VersionRole,    ///< the stored version as listed (storage/versioning.h)
        ChangedRole,    ///< "changed by <person> at <time>", "" before versions
    };
    Q_ENUM(Role)

    explicit LotShelfModel(QObject* parent = nullptr);

    Workspace* workspace() const { return workspace_; }
    void setWorkspace(Workspace* w);
    bool signInRequired() const { return sign_in_required_; }
    void setSignInRequired(bool on);
    QString signedInLogin() const { return signed_in_login_; }
    void setSignedInLogin(const QString& login);
    QString writeBlock() const { return write_block_; }
    QString reagentFilter() const { return filter_; }
    void setReagentFilter(const QString& reagent);
    int count() const { return int(rows_.size()); }
    QString errorField() const { return error_.field; }
    QString errorMessage() const { return error_.message; }
    QString today() const { return today_date().toString(Qt::ISODate); }

    int rowCount(const QModelIndex& parent = {}) const override;
    QVariant data(const QModelIndex& index, int role) const override;
    QHash<int, QByteArray> roleNames() const override;

    /// The library's reagents and solvents a lot may be of: [{id, name}], by name; with
    /// `search`, those whose name or id holds every word of it (any case).
    Q_INVOKABLE QVariantList reagentChoices(const QString& search = {}) const;
    /// The filter's choices: every reagent first ({id: "", name: "All reagents"}), then each
    /// reagent with lots on the shelf.
    Q_INVOKABLE QVariantList filterChoices() const;
    /// Puts a lot on the shelf under the person signed in. Dates are YYYY-MM-DD (openedOn ""
    /// when not opened), quantity "500 g" or "" when not recorded. False with errorField /
    /// errorMessage set; true clears them and lists the lot.
    Q_INVOKABLE bool add(const QString& reagent, const QString& lot, const QString& supplier,
                         const QString& receivedOn, const QString& openedOn,
                         const QString& expiresOn, const QString& quantity);
    /// Records today as the day `reagent`'s `lot` was opened (audited), from the version listed:
    /// a lot changed on another bench since is refused with errorField "version" (who and when).
    /// False with the error set.
    Q_INVOKABLE bool markOpenedToday(const QString& reagent, const QString& lot);
    Q_INVOKABLE void clearError() { set_error({}); }
    /// Reload after a refusal: forgets the error and lists the shelf as stored now.
    Q_INVOKABLE void reloadShelf() {
        set_error({});
        reload();
    }

    /// The state of a lot that expires on `expires_on` (YYYY-MM-DD), seen on `today`.
    static QString state_words(const QString& expires_on, const QDate& today);

    /// Test seam: the day taken as today (an invalid date = the clock's).
    void setToday(const QDate& d);

  signals:
    void workspaceChanged();
    void sessionChanged();
    void filterChanged();
    void countChanged();
    void errorChanged();

  private:
    struct Row {
        QString reagent, reagent_name, lot, supplier, received_on, opened_on, expires_on, quantity,
            created_by, changed;
        qint64 version = 0;
    };
    void reload();
    void update_write_block();
    void set_error(const FieldError& e);
    /// {"session", …} when a signed-in user is required and nobody is; empty otherwise.
    FieldError session_gate() const;
    QString who() const;
    QString reagent_name(const QString& id) const;
    QDate today_date() const { return today_.isValid() ? today_ : QDate::currentDate(); }

    QPointer<Workspace> workspace_;
    bool sign_in_required_ = false;
    QString signed_in_login_;
    QString write_block_;
    QString filter_;
    std::vector<Row> rows_;
    FieldError error_;
    QDate today_;
};

} // namespace phaseplan::gui

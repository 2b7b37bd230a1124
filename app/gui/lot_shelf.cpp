#include "lot_shelf.h"

#include "storage/versioning.h"

#include "chem/error.h"
#include "core/app_data.h"
#include "storage/accounts.h"
#include "storage/database.h"
#include "storage/lot_store.h"
#include "storage/sql_util.h"

#include <QLocale>

#include <algorithm>

namespace phaseplan::gui {

namespace {

/// A database is open and has the shelf (schema step storage::lot_schema_version).
bool have_shelf(const Workspace* w) {
    return w && w->ready() && w->database() &&
           storage::sql::table_exists(w->database()->connection(), QStringLiteral("reagent_lots"));
}

} // namespace

LotShelfModel::LotShelfModel(QObject* parent) : QAbstractListModel(parent) {}

void LotShelfModel::setWorkspace(Workspace* w) {
    if (w == workspace_)
        return;
    if (workspace_)
        disconnect(workspace_, nullptr, this, nullptr);
    workspace_ = w;
    if (w) {
        connect(w, &Workspace::readyChanged, this, &LotShelfModel::reload);
        connect(w, &Workspace::libraryChanged, this, &LotShelfModel::reload);
        connect(w, &Workspace::databaseChanged, this, &LotShelfModel::reload);
    }
    emit workspaceChanged();
    reload();
}

void LotShelfModel::setSignInRequired(bool on) {
    if (on == sign_in_required_)
        return;
    sign_in_required_ = on;
    update_write_block();
}

void LotShelfModel::setSignedInLogin(const QString& login) {
    if (login == signed_in_login_)
        return;
    signed_in_login_ = login;
    update_write_block();
}

void LotShelfModel::setReagentFilter(const QString& reagent) {
    if (reagent == filter_)
        return;
    filter_ = reagent;
    emit filterChanged();
    reload();
}

void LotShelfModel::setToday(const QDate& d) {
    today_ = d;
    reload();
}

FieldError LotShelfModel::session_gate() const {
    if (sign_in_required_ && signed_in_login_.isEmpty())
        return {QStringLiteral("session"), tr("Sign in on Prepare & record to add lots")};
    return {};
}

QString LotShelfModel::who() const {
    if (!signed_in_login_.isEmpty())
        return signed_in_login_;
    // A database without accounts (a lab's first run): the name typed at the bench.
    return workspace_ ? workspace_->actor().trimmed() : QString();
}

void LotShelfModel::update_write_block() {
    QString block = session_gate().message;
    if (block.isEmpty() && !signed_in_login_.isEmpty() && have_shelf(workspace_))
        // The shelf's own refusal (the administrator, a locked account), in its words.
        block = guarded([&] {
                    storage::AccountStore::check_may_edit(workspace_->database()->connection(),
                                                          signed_in_login_);
                }).message;
    write_block_ = block;
    emit sessionChanged();
}

void LotShelfModel::set_error(const FieldError& e) {
    if (e.is_failure() && workspace_)
        workspace_->failureSeen(e.field);
    if (e == error_)
        return;
    error_ = e;
    emit errorChanged();
}

QString LotShelfModel::reagent_name(const QString& id) const {
    if (!workspace_ || !workspace_->ready())
        return id;
    const std::string sid = id.toStdString();
    if (const chem::Reagent* r = workspace_->data().reagents.find_reagent(sid))
        return QString::fromStdString(r->name);
    if (const chem::Solvent* s = workspace_->data().solvents.find_solvent(sid))
        return QString::fromStdString(s->name);
    return id;
}

void LotShelfModel::reload() {
    std::vector<Row> next;
    if (have_shelf(workspace_)) {
        const FieldError e = guarded([&] {
            QLocale loc;
            loc.setNumberOptions(QLocale::OmitGroupSeparator); // "1000 g", never "1,000 g"
            QHash<QString, QString> people; // login → person_words, once per reload
            for (const storage::ReagentLot& l :
                 storage::LotStore(workspace_->database()->connection()).list(filter_)) {
                Row r;
                r.reagent = l.reagent;
                r.reagent_name = reagent_name(l.reagent);
                r.lot = l.lot;
                r.supplier = l.supplier;
                r.received_on = l.received_on;
                r.opened_on = l.opened_on;
                r.expires_on = l.expires_on;
                if (l.quantity)
                    r.quantity =
                        loc.toString(*l.quantity, 'g', 6) + QLatin1Char(' ') + l.quantity_unit;
                r.created_by = l.created_by;
                r.version = l.version;
                if (l.version > 0) {
                    auto p = people.find(l.changed_by);
                    if (p == people.end())
                        p = people.insert(l.changed_by,
                                          storage::person_words(
                                              workspace_->database()->connection(), l.changed_by));
                    r.changed =
                        tr("changed by %1, %2").arg(*p, storage::utc_time_words(l.changed_at));
                }
                next.push_back(std::move(r));
            }
        });
        if (!e.empty())
            set_error(e);
    }
    // The same lots (one opened): their rows change in place; one lot more: it is inserted. The
    // view then keeps its place instead of being rebuilt (and scrolled) after each write.
    auto same = [](const Row& a, const Row& b) { return a.reagent == b.reagent && a.lot == b.lot; };
    const size_t n = rows_.size();
    size_t k = 0;
    while (k < n && k < next.size() && same(rows_[k], next[k]))
        ++k;
    if (next.size() == n && k == n) {
        rows_ = std::move(next);
        if (n > 0)
            emit dataChanged(index(0), index(int(n) - 1));
    } else if (next.size() == n + 1 &&
               std::equal(rows_.begin() + long(k), rows_.end(), next.begin() + long(k) + 1, same)) {
        beginInsertRows({}, int(k), int(k));
        rows_ = std::move(next);
        endInsertRows();
        emit dataChanged(index(0), index(int(rows_.size()) - 1));
    } else {
        beginResetModel();
        rows_ = std::move(next);
        endResetModel();
    }
    emit countChanged();
    update_write_block();
}

QString LotShelfModel::state_words(const QString& expires_on, const QDate& today) {
    const QDate expires = QDate::fromString(expires_on, Qt::ISODate);
    if (!expires.isValid())
        return tr("expiry unknown");
    const qint64 days = today.daysTo(expires);
    if (days < 0)
        return tr("expired");
    if (days == 0)
        return tr("expires today");
    if (days == 1)
        return tr("expires in 1 day");
    if (days <= warn_days)
        return tr("expires in %1 days").arg(days);
    return tr("in date");
}

int LotShelfModel::rowCount(const QModelIndex& parent) const {
    return parent.isValid() ? 0 : int(rows_.size());
}

QVariant LotShelfModel::data(const QModelIndex& index, int role) const {
    if (!index.isValid() || index.row() < 0 || index.row() >= int(rows_.size()))
        return {};
    const Row& r = rows_[size_t(index.row())];
    switch (role) {
    case ReagentRole:
        return r.reagent;
    case ReagentNameRole:
        return r.reagent_name;
    case LotRole:
        return r.lot;
    case SupplierRole:
        return r.supplier;
    case ReceivedOnRole:
        return r.received_on;
    case OpenedOnRole:
        return r.opened_on;
    case ExpiresOnRole:
        return r.expires_on;
    case QuantityRole:
        return r.quantity;
    case StateRole:
        return state_words(r.expires_on, today_date());
    case ExpiredRole:
        return r.expires_on < today();
    case CreatedByRole:
        return r.created_by;
    case VersionRole:
        return r.version;
    case ChangedRole:
        return r.changed;
    default:
        return {};
    }
}

QHash<int, QByteArray> LotShelfModel::roleNames() const {
    return {
        {ReagentRole, "reagent"},     {ReagentNameRole, "reagentName"}, {LotRole, "lot"},
        {SupplierRole, "supplier"},   {ReceivedOnRole, "receivedOn"},   {OpenedOnRole, "openedOn"},
        {ExpiresOnRole, "expiresOn"}, {QuantityRole, "quantity"},       {StateRole, "state"},
        {ExpiredRole, "expired"},     {CreatedByRole, "createdBy"},     {VersionRole, "version"},
        {ChangedRole, "changed"}};
}

QVariantList LotShelfModel::reagentChoices(const QString& search) const {
    QVariantList out;
    if (!workspace_ || !workspace_->ready())
        return out;
    std::vector<std::pair<QString, QString>> all; // name, id
    for (const chem::Reagent& r : workspace_->data().reagents.reagents())
        all.emplace_back(QString::fromStdString(r.name), QString::fromStdString(r.id));
    for (const chem::Solvent& s : workspace_->data().solvents.solvents())
        all.emplace_back(QString::fromStdString(s.name), QString::fromStdString(s.id));
    std::sort(all.begin(), all.end(), [](const auto& a, const auto& b) {
        return QString::localeAwareCompare(a.first, b.first) < 0;
    });
    const QStringList words = search.split(QLatin1Char(' '), Qt::SkipEmptyParts);
    for (const auto& [name, id] : all) {
        const bool found = std::all_of(words.begin(), words.end(), [&](const QString& w) {
            return name.contains(w, Qt::CaseInsensitive) || id.contains(w, Qt::CaseInsensitive);
        });
        if (found)
            out.append(QVariantMap{{"id", id}, {"name", name}});
    }
    return out;
}

QVariantList LotShelfModel::filterChoices() const {
    QVariantList out{QVariantMap{{"id", QString()}, {"name", tr("All reagents")}}};
    if (!have_shelf(workspace_))
        return out;
    QStringList seen;
    guarded([&] {
        for (const storage::ReagentLot& l :
             storage::LotStore(workspace_->database()->connection()).list())
            if (!seen.contains(l.reagent))
                seen << l.reagent;
    });
    for (const QString& id : seen)
        out.append(QVariantMap{{"id", id}, {"name", reagent_name(id)}});
    return out;
}

bool LotShelfModel::add(const QString& reagent, const QString& lot, const QString& supplier,
                        const QString& receivedOn, const QString& openedOn,
                        const QString& expiresOn, const QString& quantity) {
    if (const FieldError g = session_gate(); !g.empty()) {
        set_error(g);
        return false;
    }
    if (!have_shelf(workspace_)) {
        set_error({QStringLiteral("database"), tr("no database with a lot shelf is open")});
        return false;
    }
    storage::ReagentLot l;
    l.reagent = reagent.trimmed();
    l.lot = lot.trimmed();
    l.supplier = supplier.trimmed();
    l.received_on = receivedOn.trimmed();
    l.opened_on = openedOn.trimmed();
    l.expires_on = expiresOn.trimmed();
    const FieldError e = guarded([&] {
        storage::read_lot_quantity(quantity, l);
        storage::validate_lot(l);
        const std::string id = l.reagent.toStdString();
        if (!workspace_->data().reagents.find_reagent(id) &&
            !workspace_->data().solvents.find_solvent(id))
            throw chem::Error("reagent", "\"" + id + "\" is not a reagent of the library");
        storage::LotStore(workspace_->database()->connection()).add(l, who());
    });
    if (!e.empty()) {
        set_error(e);
        return false;
    }
    set_error({});
    reload();
    return true;
}

bool LotShelfModel::markOpenedToday(const QString& reagent, const QString& lot) {
    if (const FieldError g = session_gate(); !g.empty()) {
        set_error(g);
        return false;
    }
    if (!have_shelf(workspace_)) {
        set_error({QStringLiteral("database"), tr("no database with a lot shelf is open")});
        return false;
    }
    const FieldError e = guarded([&] {
        storage::LotStore shelf(workspace_->database()->connection());
        // The version this screen lists: a lot changed on another bench since is refused.
        qint64 seen = -1;
        for (const Row& r : rows_)
            if (r.reagent == reagent && r.lot == lot && r.version > 0)
                seen = r.version;
        const std::optional<storage::ReagentLot> cur = shelf.find(reagent, lot);
        if (cur && !cur->opened_on.isEmpty() && (seen <= 0 || cur->version == seen))
            throw chem::Error("opened_on", "lot \"" + lot.toStdString() + "\" was opened on " +
                                               cur->opened_on.toStdString() + " already");
        shelf.set_opened(reagent, lot, today(), who(), seen);
    });
    if (!e.empty()) {
        set_error(e);
        return false;
    }
    set_error({});
    reload();
    return true;
}

} // namespace phaseplan::gui

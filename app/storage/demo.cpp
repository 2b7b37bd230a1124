#include "storage/demo.h"

#include "chem/error.h"
#include "storage/accounts.h"
#include "storage/batch_store.h"
#include "storage/database.h"
#include "storage/lot_store.h"
#include "storage/signatures.h"

#include <QDate>
#include <QFile>
#include <QJsonArray>
#include <QJsonDocument>

namespace phaseplan::storage {

const std::vector<DemoUser>& demo_users() {
    static const std::vector<DemoUser> users = {
        {"demo-admin", "Jonas Ebner", "administrator", "demo-admin-2026",
         "$argon2id$v=19$m=65536,t=2,p=1$MeCklgTdyR1ZKddReOqL+Q$"
         "GntDJldLpCJkIxnttjEQs9fRhbEmGtGl7zv71s7Tz3Q"},
        {"demo-prep", "Rosa Okafor", "preparer", "demo-prep-2026",
         "$argon2id$v=19$m=65536,t=2,p=1$gb9Vb/0lQqkY3RTf9fjcfg$"
         "m/mUqFUzIeELxTjv5Eu/6B8w30p1/AT9W29JqbY98k0"},
        {"demo-review", "Mats Lindqvist", "reviewer", "demo-review-2026",
         "$argon2id$v=19$m=65536,t=2,p=1$UFfkrQOPj2cRH4w6blGWfg$"
         "ATh68OWDyKS/qIYJsLfIgM43rjw4AgVso/NyFV4OYOg"},
        {"demo-approve", "Priya Haldane", "approver", "demo-approve-2026",
         "$argon2id$v=19$m=65536,t=2,p=1$lH6N7jiIuw0thV3jFu45yw$"
         "i8c6ajKOtc/Dyi8/2JC55/1UI+d8TfFTtJxb6pj7ijU"},
    };
    return users;
}

QString demo_sequence_name() {
    return QStringLiteral("Overnight demo");
}

void seed_demo(Database& db, const QString& data_dir) {
    QFile f(data_dir + QStringLiteral("/demo/overnight-sequence.json"));
    const QJsonObject demo =
        f.open(QIODevice::ReadOnly) ? QJsonDocument::fromJson(f.readAll()).object() : QJsonObject{};
    std::vector<SavedDocument> docs;
    if (!demo.isEmpty()) {
        docs.push_back(
            {DocumentKind::sequence, demo_sequence_name(), demo,
             QStringLiteral("an invented lab's overnight sequence, shipped with PhasePlan")});
        const QJsonObject methods = demo.value(QLatin1String("methods")).toObject();
        for (auto it = methods.begin(); it != methods.end(); ++it)
            docs.push_back({DocumentKind::method, it.key(), it.value().toObject(), {}});
        const QJsonObject lines = demo.value(QLatin1String("lines")).toObject();
        for (auto it = lines.begin(); it != lines.end(); ++it) {
            const QJsonObject line = it.value().toObject();
            const QString line_name = line.value(QLatin1String("name")).toString(it.key());
            docs.push_back({DocumentKind::line, line_name, line, {}});
            const QJsonArray parts = line.value(QLatin1String("parts")).toArray();
            for (const QJsonValue& p : parts) {
                const QJsonObject buffer = p.toObject().value(QLatin1String("buffer")).toObject();
                if (buffer.isEmpty())
                    continue;
                const QString name =
                    buffer.value(QLatin1String("name")).toString(line_name + " buffer");
                docs.push_back({DocumentKind::buffer, name, buffer, {}});
            }
        }
    }
    db.save_all(docs);
    db.set_setting(QStringLiteral("demo_seeded"),
                   true); // read by nothing now; older versions look for it
    seed_demo_records(db, data_dir);
}

QString demo_batch_id() {
    return QStringLiteral("HR-QC117-A-0041");
}

void seed_demo_records(Database& db, const QString& data_dir) {
    const QString path = data_dir + QStringLiteral("/demo/batch-line-a-buffer.json");
    QFile f(path);
    const bool with_batch = f.open(QIODevice::ReadOnly); // a trimmed data folder has no batch
    QJsonObject input = with_batch ? QJsonDocument::fromJson(f.readAll()).object() : QJsonObject{};
    QJsonObject b = input.value("batch").toObject();
    b["id"] = demo_batch_id();
    b.remove("checked_by"); // the reviewer's signature says who checked
    input["batch"] = b;

    AccountStore accounts(db.connection());
    QString admin;
    for (const DemoUser& u : demo_users()) {
        accounts.add_with_hash(QString::fromLatin1(u.login), QString::fromUtf8(u.display_name),
                               role_from_name(QString::fromLatin1(u.role)),
                               QString::fromLatin1(u.argon2id_hash), admin);
        if (admin.isEmpty())
            admin = QString::fromLatin1(u.login); // the first is the administrator
    }

    if (!with_batch)
        return;
    const BatchRecord batch = BatchRecord::from_input(input);
    BatchStore batches(db.connection());
    const QString preparer = QStringLiteral("demo-prep");
    batches.create(batch, preparer);
    batches.mark_printed(batch.id, preparer, QStringLiteral("sheet a4"));
    BatchRecord amended = *batches.load(batch.id);
    QJsonArray actual = amended.actual;
    for (int i = 0; i < actual.size(); ++i) {
        QJsonObject e = actual[i].toObject();
        if (e.value("reagent").toString() == QLatin1String("phosphoric-acid")) {
            e["lot"] = QStringLiteral("PA-88112");
            actual[i] = e;
        }
    }
    amended.actual = actual;
    batches.amend(batch.id, amended, preparer,
                  QStringLiteral("lot number mistyped: the bottle's label reads PA-88112"));
    batches.mark_printed(batch.id, preparer, QStringLiteral("sheet a4"));

    // The accounts were stored above from demo_users(), whose passwords match their hashes
    // (the sign-in tests use them): signed as those accounts without hashing the passwords again.
    SignatureStore signatures(db.connection());
    for (const auto& [login, meaning] :
         {std::pair{preparer, QStringLiteral("prepared")},
          std::pair{QStringLiteral("demo-review"), QStringLiteral("reviewed")}}) {
        const std::optional<Account> who = accounts.find(login);
        if (!who)
            throw chem::Error("login", "the demo account " + login.toStdString() + " is missing");
        signatures.sign_as(batch.id, *who, meaning, 0);
    }

    seed_demo_lots(db, QDate::currentDate());
}

const std::vector<DemoLot>& demo_lots() {
    // Invented lot numbers and supplier. SP-1987 expired before today, so that the refusal (and
    // an approver's override) can be seen; SP-2207 expires tomorrow, so that it limits the
    // use-by of a batch made today with it (the buffer's shelf life is 48 h).
    static const std::vector<DemoLot> lots = {
        {"phosphoric-acid", "PA-88112", "Veldmark Reagents", -80, -60, 700, 1, "L"},
        {"phosphoric-acid", "PA-90417", "Veldmark Reagents", -10, 0, 900, 1, "L"},
        {"sodium-dihydrogen-phosphate-monohydrate", "SP-1987", "Veldmark Reagents", -400, -390, -5,
         500, "g"},
        {"sodium-dihydrogen-phosphate-monohydrate", "SP-2207", "Veldmark Reagents", -180, -170, 1,
         500, "g"},
        {"sodium-dihydrogen-phosphate-monohydrate", "SP-2391", "Veldmark Reagents", -5, 0, 1000,
         1000, "g"},
    };
    return lots;
}

void seed_demo_lots(Database& db, const QDate& today) {
    LotStore shelf(db.connection());
    for (const DemoLot& d : demo_lots()) {
        ReagentLot l;
        l.reagent = QString::fromLatin1(d.reagent);
        l.lot = QString::fromLatin1(d.lot);
        l.supplier = QString::fromLatin1(d.supplier);
        l.received_on = today.addDays(d.received_days).toString(Qt::ISODate);
        if (d.opened_days != 0)
            l.opened_on = today.addDays(d.opened_days).toString(Qt::ISODate);
        l.expires_on = today.addDays(d.expires_days).toString(Qt::ISODate);
        l.quantity = d.quantity;
        l.quantity_unit = QString::fromLatin1(d.quantity_unit);
        shelf.add(l, QStringLiteral("demo-prep"));
    }
}

} // namespace phaseplan::storage

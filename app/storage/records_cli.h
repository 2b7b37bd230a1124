#pragma once
// The command-line subcommands on the lab's database (app/cli/main.cpp hands them over):
//
//   audit verify --database FILE                  0 intact, 1 broken (one line naming the first bad
//                                                  entry), 2 bad input
//   audit export --database FILE [--batch ID] [-o OUT.json|OUT.csv] [--format json|csv]
//   user add LOGIN --name NAME --role ROLE [--as ADMIN] --database FILE
//   user list --database FILE
//   user lock|unlock LOGIN --as ADMIN --database FILE
//   user passwd LOGIN [--as ADMIN] --database FILE
//   lot add --reagent ID --lot NUMBER --received-on DATE --expires-on DATE [--opened-on DATE]
//       [--supplier NAME] [--quantity "500 g"] --as LOGIN --database FILE
//                                                  a lot on the shelf (storage/lot_store.h)
//   lot list [--reagent ID] --database FILE
//   db demo --database NEW_FILE                   a new database with the demo and its trail
//   db copy --from FILE --to URI                  a bench's file into an empty lab database (ids
//                                                  and the chain kept; refuses a target holding
//                                                  records)
//
// Every FILE may instead be a PostgreSQL URI, postgresql://user@host:port/dbname (the password
// from ~/.pgpass: storage/sql_dialect.h); audit verify and export then use a read-only session.
//
// Passwords are never arguments: each is one line of standard input, or typed at a prompt
// without echo when standard input is a terminal (`read_secret`). For `user add` with --as, and
// for lock, unlock and an administrator's passwd, the administrator's password comes first.
// `audit verify` and `audit export` open the file read-only and never change it.
//
// Errors throw chem::Error (the CLI's single catch prints one line and exits 2).
#include <QString>
#include <QStringList>

#include <functional>

namespace phaseplan::storage {

/// Reads one password; `prompt` says whose ("password of demo-admin"). Throws chem::Error when
/// there is none.
using SecretReader = std::function<QString(const QString& prompt)>;

struct CliOutput {
    int status = 0;
    QByteArray out; ///< what goes to stdout
};

/// `group` is "audit", "user", "lot" or "db"; `args` are the words after it. `data_dir` is for db
/// demo.
CliOutput records_command(const QString& group, const QStringList& args,
                          const SecretReader& read_secret, const QString& data_dir);

} // namespace phaseplan::storage

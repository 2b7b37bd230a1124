#pragma once
// What the lab's record says about a batch's release, for the sheet, the labels and the batch
// screen. Filled from the database's electronic signatures (storage::release_of); a document
// printed without a database has none and is therefore not released.
//
// A batch is released for use only when someone other than its preparer has signed it as
// reviewed, and that signature still holds (no change since).
#include <QString>
#include <QStringList>

namespace phaseplan {

struct BatchRelease {
    /// One line per electronic signature, oldest first, in the words of
    /// storage::SignatureStore::manifestation ("Reviewed by … 2026-12-02 13:10:04 UTC", with
    /// " — void: …" once a later change voided it).
    QStringList signature_lines;
    /// "Released for use: reviewed by Name (login) 2026-12-02 13:10 UTC"; empty when not released.
    QString released_line;
    /// Who released it: "Name (login)" of that review; empty when not released.
    QString reviewed_by;

    bool released() const { return !released_line.isEmpty(); }
    /// The words that say why the batch is not released (the sheet and the screen).
    static QString not_released_words() {
        return QStringLiteral("Not released for use: nobody other than the preparer has signed "
                              "it as reviewed.");
    }
};

} // namespace phaseplan

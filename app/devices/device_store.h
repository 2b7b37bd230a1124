#pragma once
// The lab's balances and pH meters: one record per instrument (id, name, kind, port settings,
// line format, calibration-due date), kept in the `devices` table (migration step 5 in
// app/storage/migrations.cpp) and loadable from a JSON file such as data/demo/devices.json:
//   {"devices": [{"id": "BAL-03", "name": "…", "kind": "balance", "port": "/dev/ttyUSB0",
//                 "baud": 9600, "data_bits": 8, "parity": "none", "stop_bits": "1",
//                 "flow_control": "none", "format": "flag-number-unit", "unit": "g",
//                 "calibration_due": "2027-03-31"}]}
// Every write is one transaction. Errors are chem::Error naming the field ("devices[1].baud").
#include "chem/finding.h"
#include "devices/serial_reader.h"
#include "storage/database.h"

#include <QDate>
#include <QJsonObject>
#include <QString>

#include <optional>
#include <vector>

namespace phaseplan::devices {

enum class DeviceKind { balance, ph_meter };
/// "balance" or "ph_meter".
const char* kind_name(DeviceKind kind);

struct DeviceRecord {
    QString id;   ///< the lab's own label on the instrument ("BAL-03")
    QString name; ///< "Analytical balance, bench 2"
    DeviceKind kind = DeviceKind::balance;
    PortSettings port;
    QString format;        ///< a preset's name or a regular expression (see line_format.h)
    QString unit;          ///< the unit the instrument is set to send: "g", "mg", "kg" or "pH"
    QDate calibration_due; ///< invalid when not recorded
    /// As stored (storage/versioning.h; not part of the JSON): the version it was loaded at (0 for
    /// a new one), who saved it last and when (UTC ISO 8601).
    qint64 version = 0;
    QString changed_by{};
    QString changed_at{};

    /// What a reading from this instrument must be: a mass in `unit` for a balance, a pH for a
    /// meter.
    Expectation expectation() const;
    QJsonObject to_json() const;
    /// Reads one record; throws chem::Error naming "<at>.<field>" with the bad value. `formats`
    /// checks that a preset name exists (nullptr: not checked).
    static DeviceRecord from_json(const QJsonObject& o, const std::string& at,
                                  const FormatLibrary* formats = nullptr);
};

/// The finding when the calibration is due on or before `today` (chem::FindingKind::
/// device_calibration_due: the device as its subject, the date, the kind; worded by
/// chem::describe); nullopt otherwise (and when no date is recorded).
std::optional<chem::Finding> calibration_finding(const DeviceRecord& device, const QDate& today);
/// calibration_finding as JSON: {"code": "device-calibration-due", "severity": "caution",
/// "device": id, "calibration_due": date, "message": …}; nullopt when there is none.
std::optional<QJsonObject> calibration_caution(const DeviceRecord& device, const QDate& today);

/// {"devices": [ … ]}; ids must be unique.
std::vector<DeviceRecord> devices_from_json(const QByteArray& bytes, const std::string& origin,
                                            const FormatLibrary* formats = nullptr);

class DeviceStore {
  public:
    explicit DeviceStore(storage::Database& db) : db_(db) {}
    /// Inserts or replaces by id (one transaction), whatever is stored (imports, the demo).
    void save(const DeviceRecord& device);
    /// The screen's save (one transaction), recorded under the database's actor(): `device.version`
    /// 0 adds a new instrument (an id that is taken is refused with name_taken_error, field "id");
    /// above 0 writes only if the stored row is still at that version (conflict_error, field
    /// "version", naming who changed it and when). Returns the version now stored.
    qint64 save_checked(const DeviceRecord& device);
    /// Saves every record of a devices file in one transaction: all or none. Returns the count.
    int import_json(const QByteArray& bytes, const std::string& origin,
                    const FormatLibrary* formats = nullptr);
    std::optional<DeviceRecord> load(const QString& id) const;
    /// Ordered by id.
    std::vector<DeviceRecord> list() const;
    /// The records of one kind, ordered by id.
    std::vector<DeviceRecord> list(DeviceKind kind) const;
    /// With `expected_version` above 0, only from that version (conflict_error otherwise).
    bool remove(const QString& id, qint64 expected_version = -1);

  private:
    void upsert(const DeviceRecord& d);
    storage::Database& db_;
};

} // namespace phaseplan::devices

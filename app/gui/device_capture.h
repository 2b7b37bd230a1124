#pragma once
// "Take from balance" and "take from meter" for the screens: waits for the next stable reading of
// the chosen instrument and hands it over with the device id, the raw line and the time.
//
// Use (one DeviceCapture per screen, property `workspace`):
//   capture.takeFromBalance("batch.actual[1].mass_g")   // the target: the field the value is for
//   → captured(c)  c = {target, value, unit, deviceId, deviceKind, deviceName, raw, receivedAt (UTC
//                      ISO), stable, acceptedUnstable, sentValue, sentUnit, temperatureC?,
//                      calibrationCaution ("" or the caution's message), record}
//                  record = the same in the snake_case of the batch contract:
//                      {device_id, device_kind, raw, received_at, stable, accepted_unstable}
//   → failed(target, message)  errorField = target, errorMessage, errorFault ("timeout", …): a
//                  DeviceFailure (port, instrument) or a DeviceError (setting, reading), both
//                  said beside the target field with the instrument's kind and id
//   While waiting, an unsettled reading is shown (`unstable`, unstableSeen) but not taken;
//   acceptUnstable() takes it, recorded as acceptedUnstable = true. cancel() stops the wait.
// The value the caller shows is never touched here: on a fault nothing is captured and
// lastCapture keeps the previous capture.
//
// Instruments come from the workspace's `devices` table (app/devices/device_store.h); on a new
// database the demo instruments of data/demo/devices.json are added once.
#include "devices/device_store.h"
#include "devices/serial_reader.h"

#include <QObject>
#include <QQmlEngine>
#include <QTimer>
#include <QVariantList>
#include <QVariantMap>

#include <memory>
#include <optional>

class QSerialPort;

namespace phaseplan::gui {

class Workspace;

class DeviceCapture : public QObject {
    Q_OBJECT
    QML_ELEMENT
    Q_PROPERTY(phaseplan::gui::Workspace* workspace READ workspace WRITE setWorkspace NOTIFY
                   workspaceChanged)
    /// [{id, name, kind, port, format, unit, calibrationDue, calibrationCaution}], ordered by id.
    Q_PROPERTY(QVariantList balances READ balances NOTIFY devicesChanged)
    Q_PROPERTY(QVariantList meters READ meters NOTIFY devicesChanged)
    /// The instrument takeFromBalance / takeFromMeter read; the first of its kind by default.
    Q_PROPERTY(QString balanceId READ balanceId WRITE setBalanceId NOTIFY selectionChanged)
    Q_PROPERTY(QString meterId READ meterId WRITE setMeterId NOTIFY selectionChanged)
    /// How long a take waits for a stable reading, in seconds (default 60).
    Q_PROPERTY(double timeoutS READ timeoutS WRITE setTimeoutS NOTIFY timeoutSChanged)
    /// True while a take waits.
    Q_PROPERTY(bool busy READ busy NOTIFY stateChanged)
    /// The field the current (or last) take is for.
    Q_PROPERTY(QString target READ target NOTIFY stateChanged)
    /// The last unsettled reading seen during this wait ({value, unit, raw, receivedAt}), {} when
    /// none.
    Q_PROPERTY(QVariantMap unstable READ unstable NOTIFY stateChanged)
    /// The last successful capture (see captured), {} before the first.
    Q_PROPERTY(QVariantMap lastCapture READ lastCapture NOTIFY lastCaptureChanged)
    /// The field at fault (the take's target), the message and the fault's code, empty when none.
    Q_PROPERTY(QString errorField READ errorField NOTIFY errorChanged)
    Q_PROPERTY(QString errorMessage READ errorMessage NOTIFY errorChanged)
    Q_PROPERTY(QString errorFault READ errorFault NOTIFY errorChanged)

  public:
    explicit DeviceCapture(QObject* parent = nullptr);
    ~DeviceCapture() override;

    Workspace* workspace() const { return workspace_; }
    void setWorkspace(Workspace* w);
    QVariantList balances() const { return list_of(devices::DeviceKind::balance); }
    QVariantList meters() const { return list_of(devices::DeviceKind::ph_meter); }
    QString balanceId() const { return balance_id_; }
    void setBalanceId(const QString& id);
    QString meterId() const { return meter_id_; }
    void setMeterId(const QString& id);
    double timeoutS() const { return timeout_s_; }
    void setTimeoutS(double s);
    bool busy() const { return port_ != nullptr; }
    QString target() const { return target_; }
    QVariantMap unstable() const { return unstable_; }
    QVariantMap lastCapture() const { return last_capture_; }
    QString errorField() const { return error_field_; }
    QString errorMessage() const { return error_message_; }
    QString errorFault() const { return error_fault_; }

    /// Starts waiting for the next stable reading of the chosen balance (or meter). False, with
    /// the error set and failed() emitted, when the port cannot be opened or no instrument is set
    /// up.
    Q_INVOKABLE bool takeFromBalance(const QString& target);
    Q_INVOKABLE bool takeFromMeter(const QString& target);
    /// Takes the unsettled reading shown (recorded as accepted). False when there is none.
    Q_INVOKABLE bool acceptUnstable();
    /// Stops waiting; nothing is captured and no error is set.
    Q_INVOKABLE void cancel();
    /// Re-reads the instruments from the database.
    Q_INVOKABLE void reloadDevices();
    /// Forgets the last error (the form was reloaded or closed).
    Q_INVOKABLE void clearError() { set_error({}, {}, {}); }
    /// Adds or changes an instrument: `device` has the fields of a devices.json record (id, name,
    /// kind, port, baud, data_bits, parity, stop_bits, flow_control, format, unit,
    /// calibration_due) and `version`, as the lists give it (absent or 0: a new instrument). False
    /// with errorField ("baud", "format", …) and errorMessage when a field is wrong; nothing is
    /// stored then. An instrument changed on another bench since it was listed here is refused
    /// with errorField "version" (who and when); a new one under a taken id with "id".
    Q_INVOKABLE bool saveDevice(const QVariantMap& device);
    /// True when the instrument was there and is removed. With `version` (as listed) above 0,
    /// only if nobody changed it since (errorField "version" otherwise).
    Q_INVOKABLE bool removeDevice(const QString& id, qint64 version = -1);

  signals:
    void workspaceChanged();
    void devicesChanged();
    void selectionChanged();
    void timeoutSChanged();
    void stateChanged();
    void lastCaptureChanged();
    void errorChanged();
    void captured(const QVariantMap& capture);
    void unstableSeen(const QVariantMap& reading);
    void failed(const QString& target, const QString& message);

  private:
    QVariantList list_of(devices::DeviceKind kind) const;
    bool start(devices::DeviceKind kind, const QString& id, const QString& target);
    void on_ready_read();
    void on_port_error();
    void on_timeout();
    void finish(const devices::Reading& r, bool accepted_unstable);
    /// A setting, the line format or the reading is wrong (a DeviceError), or no instrument is
    /// set up ("no-device").
    void fail(const chem::Error& e);
    /// The port or the instrument failed (the Failure's fault code: "timeout", "port-missing", …).
    void fail(const devices::DeviceFailure& f);
    /// Both shown the same way: beside the target field, after the instrument's kind and id.
    void show_fault(const std::string& message, const QString& fault);
    void stop();
    void set_error(const QString& field, const QString& message, const QString& fault);
    QDate today() const;

    Workspace* workspace_ = nullptr;
    std::vector<devices::DeviceRecord> devices_;
    devices::FormatLibrary formats_;
    QString balance_id_, meter_id_;
    double timeout_s_ = 60;

    // The wait in progress.
    std::unique_ptr<QSerialPort> port_;
    devices::LineAssembler lines_;
    devices::DeviceRecord device_;
    devices::LineFormat format_;
    std::optional<devices::Reading> unstable_reading_;
    QTimer timer_;
    QString target_;
    QVariantMap unstable_;

    QVariantMap last_capture_;
    QString error_field_, error_message_, error_fault_;
};

} // namespace phaseplan::gui

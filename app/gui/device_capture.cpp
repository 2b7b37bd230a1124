#include "device_capture.h"

#include "model_util.h"
#include "workspace.h"

#include <QFile>
#include <QJsonObject>
#include <QSerialPort>

namespace phaseplan::gui {

using devices::DeviceKind;

namespace {

QString kind_words(DeviceKind k) {
    return k == DeviceKind::balance ? QStringLiteral("balance") : QStringLiteral("pH meter");
}

} // namespace

DeviceCapture::DeviceCapture(QObject* parent) : QObject(parent) {
    timer_.setSingleShot(true);
    connect(&timer_, &QTimer::timeout, this, &DeviceCapture::on_timeout);
}

DeviceCapture::~DeviceCapture() = default;

void DeviceCapture::setWorkspace(Workspace* w) {
    if (w == workspace_)
        return;
    stop();
    if (workspace_)
        disconnect(workspace_, nullptr, this, nullptr);
    workspace_ = w;
    if (workspace_) {
        connect(workspace_, &Workspace::readyChanged, this, &DeviceCapture::reloadDevices);
        // Another bench's change (the change counter moved): re-read when the list differs.
        connect(workspace_, &Workspace::databaseChanged, this, [this] {
            if (!workspace_ || !workspace_->database())
                return;
            std::vector<devices::DeviceRecord> now;
            const FieldError e =
                guarded([&] { now = devices::DeviceStore(*workspace_->database()).list(); });
            if (!e.empty())
                return;
            bool same = now.size() == devices_.size();
            for (size_t i = 0; same && i < now.size(); ++i)
                same = now[i].id == devices_[i].id && now[i].version == devices_[i].version;
            if (!same)
                reloadDevices();
        });
    }
    emit workspaceChanged();
    reloadDevices();
}

QDate DeviceCapture::today() const {
    return workspace_ ? workspace_->today() : QDate::currentDate();
}

void DeviceCapture::reloadDevices() {
    devices_.clear();
    const FieldError err = guarded([&] {
        if (!workspace_ || !workspace_->database())
            return;
        const QString dir = workspace_->data().data_dir;
        formats_ = devices::load_format_library_file(dir + QStringLiteral("/device_formats.json"));
        storage::Database& db = *workspace_->database();
        devices::DeviceStore store(db);
        // The demo's instruments, once, on a database that has none.
        if (db.setting(QStringLiteral("demo_devices_seeded")).isNull()) {
            if (store.list().empty()) {
                QFile f(dir + QStringLiteral("/demo/devices.json"));
                if (f.open(QIODevice::ReadOnly))
                    store.import_json(f.readAll(), "demo/devices.json", &formats_);
            }
            db.set_setting(QStringLiteral("demo_devices_seeded"), true);
        }
        devices_ = store.list();
    });
    if (!err.empty())
        set_error(err.field, err.message, QStringLiteral("bad-setting"));
    auto first_of = [&](DeviceKind k, const QString& current) {
        for (const auto& d : devices_)
            if (d.kind == k && d.id == current)
                return current;
        for (const auto& d : devices_)
            if (d.kind == k)
                return d.id;
        return QString();
    };
    balance_id_ = first_of(DeviceKind::balance, balance_id_);
    meter_id_ = first_of(DeviceKind::ph_meter, meter_id_);
    emit devicesChanged();
    emit selectionChanged();
}

bool DeviceCapture::saveDevice(const QVariantMap& device) {
    const FieldError err = guarded([&] {
        if (!workspace_ || !workspace_->database())
            throw Failure(Failure::Kind::database, "the workspace is not open");
        QJsonObject o = QJsonObject::fromVariantMap(device);
        // What the lists add for the screen is not part of the record's JSON (an instrument
        // edited from its listed map comes back with them).
        for (const char* listed :
             {"version", "changedBy", "changedAt", "calibrationDue", "calibrationCaution"})
            o.remove(QLatin1String(listed));
        devices::DeviceRecord d = devices::DeviceRecord::from_json(o, "", &formats_);
        d.version = device.value(QStringLiteral("version")).toLongLong();
        devices::DeviceStore(*workspace_->database()).save_checked(d);
    });
    if (!err.empty()) {
        set_error(err.field, err.message, QStringLiteral("bad-setting"));
        return false;
    }
    set_error({}, {}, {});
    reloadDevices();
    return true;
}

bool DeviceCapture::removeDevice(const QString& id, qint64 version) {
    bool removed = false;
    const FieldError err = guarded([&] {
        if (workspace_ && workspace_->database())
            removed = devices::DeviceStore(*workspace_->database()).remove(id, version);
    });
    if (!err.empty())
        set_error(err.field, err.message, QStringLiteral("bad-setting"));
    if (removed)
        reloadDevices();
    return removed;
}

QVariantList DeviceCapture::list_of(DeviceKind kind) const {
    QVariantList out;
    for (const auto& d : devices_) {
        if (d.kind != kind)
            continue;
        const auto caution = devices::calibration_caution(d, today());
        out.append(QVariantMap{
            {"id", d.id},
            {"name", d.name},
            {"kind", QLatin1String(devices::kind_name(d.kind))},
            {"port", d.port.port},
            {"baud", d.port.baud},
            {"data_bits", d.port.data_bits},
            {"parity", d.port.parity},
            {"stop_bits", d.port.stop_bits},
            {"flow_control", d.port.flow_control},
            {"calibration_due",
             d.calibration_due.isValid() ? d.calibration_due.toString(Qt::ISODate) : QString()},
            {"format", d.format},
            {"unit", d.unit},
            {"calibrationDue",
             d.calibration_due.isValid() ? d.calibration_due.toString(Qt::ISODate) : QString()},
            {"calibrationCaution", caution ? (*caution)["message"].toString() : QString()},
            {"version", d.version},
            {"changedBy", d.changed_by},
            {"changedAt", d.changed_at}});
    }
    return out;
}

void DeviceCapture::setBalanceId(const QString& id) {
    if (id == balance_id_)
        return;
    balance_id_ = id;
    emit selectionChanged();
}

void DeviceCapture::setMeterId(const QString& id) {
    if (id == meter_id_)
        return;
    meter_id_ = id;
    emit selectionChanged();
}

void DeviceCapture::setTimeoutS(double s) {
    if (!(s > 0) || s == timeout_s_)
        return;
    timeout_s_ = s;
    emit timeoutSChanged();
}

bool DeviceCapture::takeFromBalance(const QString& target) {
    return start(DeviceKind::balance, balance_id_, target);
}
bool DeviceCapture::takeFromMeter(const QString& target) {
    return start(DeviceKind::ph_meter, meter_id_, target);
}

bool DeviceCapture::start(DeviceKind kind, const QString& id, const QString& target) {
    stop();
    target_ = target;
    unstable_.clear();
    unstable_reading_.reset();
    lines_.clear();
    set_error({}, {}, {});
    device_ = devices::DeviceRecord{};
    const devices::DeviceRecord* record = nullptr;
    for (const auto& d : devices_)
        if (d.kind == kind && d.id == id)
            record = &d;
    if (!record) {
        fail(chem::Error("device", id.isEmpty()
                                       ? "no " + kind_words(kind).toStdString() + " is set up"
                                       : "no " + kind_words(kind).toStdString() + " \"" +
                                             id.toStdString() + "\""));
        return false;
    }
    device_ = *record;
    try {
        format_ = devices::resolve_format(formats_, device_.format);
        auto port = std::make_unique<QSerialPort>();
        devices::open_port(*port, device_.port);
        port_ = std::move(port);
    } catch (const chem::Error& e) {
        fail(e);
        return false;
    } catch (const devices::DeviceFailure& f) {
        fail(f);
        return false;
    }
    connect(port_.get(), &QSerialPort::readyRead, this, &DeviceCapture::on_ready_read);
    connect(port_.get(), &QSerialPort::errorOccurred, this, [this](QSerialPort::SerialPortError e) {
        if (e != QSerialPort::NoError && e != QSerialPort::TimeoutError)
            on_port_error();
    });
    timer_.start(static_cast<int>(timeout_s_ * 1000));
    emit stateChanged();
    // Bytes that were already waiting on the line.
    if (port_->bytesAvailable() > 0)
        on_ready_read();
    return busy();
}

void DeviceCapture::on_ready_read() {
    if (!port_)
        return;
    lines_.feed(port_->readAll());
    try {
        while (port_) {
            const auto line = lines_.take_line();
            if (!line)
                return;
            devices::Reading r =
                devices::parse_line(*line, format_, formats_, device_.expectation());
            if (r.stable) {
                finish(r, false);
                return;
            }
            unstable_reading_ = r;
            unstable_ = QVariantMap{{"value", r.value},
                                    {"unit", r.unit},
                                    {"raw", r.raw},
                                    {"receivedAt", r.received_at.toString(Qt::ISODateWithMs)}};
            emit stateChanged();
            emit unstableSeen(unstable_);
        }
    } catch (const chem::Error& e) {
        fail(e);
    }
}

void DeviceCapture::on_port_error() {
    if (!port_)
        return;
    // A complete line that came before the fault is still the reading.
    if (port_->bytesAvailable() > 0)
        on_ready_read();
    if (!port_)
        return;
    fail(devices::port_fault(*port_, device_.port, lines_.pending()));
}

void DeviceCapture::on_timeout() {
    if (!port_)
        return;
    fail(devices::timeout_fault(device_.port, static_cast<int>(timeout_s_ * 1000), true,
                                lines_.pending()));
}

bool DeviceCapture::acceptUnstable() {
    if (!port_ || !unstable_reading_)
        return false;
    finish(*unstable_reading_, true);
    return true;
}

void DeviceCapture::cancel() {
    stop();
    emit stateChanged();
}

void DeviceCapture::stop() {
    timer_.stop();
    if (port_) {
        port_->disconnect(this);
        port_->close();
        // Deleted later: stop() may run inside one of the port's own signals.
        port_.release()->deleteLater();
    }
}

void DeviceCapture::finish(const devices::Reading& r, bool accepted_unstable) {
    stop();
    const auto caution = devices::calibration_caution(device_, today());
    const QString at = r.received_at.toString(Qt::ISODateWithMs);
    QVariantMap c{{"target", target_},
                  {"value", r.value},
                  {"unit", r.unit},
                  {"deviceId", device_.id},
                  {"deviceKind", QLatin1String(devices::kind_name(device_.kind))},
                  {"deviceName", device_.name},
                  {"raw", r.raw},
                  {"receivedAt", at},
                  {"stable", r.stable},
                  {"acceptedUnstable", accepted_unstable},
                  {"sentValue", r.sent_value},
                  {"sentUnit", r.sent_unit},
                  {"calibrationCaution", caution ? (*caution)["message"].toString() : QString()}};
    if (r.temperature_c)
        c["temperatureC"] = *r.temperature_c;
    c["record"] = QVariantMap{{"device_id", device_.id},
                              {"device_kind", QLatin1String(devices::kind_name(device_.kind))},
                              {"raw", r.raw},
                              {"received_at", at},
                              {"stable", r.stable},
                              {"accepted_unstable", accepted_unstable}};
    {
        // What the batch record keeps besides: the instrument's name and its calibration date
        // on the day of the reading, so the sheet can say it was overdue.
        QVariantMap rec = c["record"].toMap();
        if (!device_.name.isEmpty())
            rec["device_name"] = device_.name;
        if (device_.calibration_due.isValid())
            rec["calibration_due"] = device_.calibration_due.toString(Qt::ISODate);
        if (caution)
            rec["calibration_caution"] = (*caution)["message"].toString();
        c["record"] = rec;
    }
    unstable_.clear();
    unstable_reading_.reset();
    last_capture_ = c;
    emit stateChanged();
    emit lastCaptureChanged();
    emit captured(c);
}

void DeviceCapture::fail(const chem::Error& e) {
    const auto* de = dynamic_cast<const devices::DeviceError*>(&e);
    // "no-device": no instrument of that kind is set up (or the chosen id is gone).
    show_fault(e.message(),
               de ? QLatin1String(devices::fault_code(de->fault())) : QStringLiteral("no-device"));
}

void DeviceCapture::fail(const devices::DeviceFailure& f) {
    show_fault(f.sentence(), QLatin1String(devices::fault_code(f.fault())));
}

void DeviceCapture::show_fault(const std::string& message, const QString& fault) {
    stop();
    const QString who = device_.id.isEmpty() ? QString()
                                             : kind_words(device_.kind) + QLatin1Char(' ') +
                                                   device_.id + QStringLiteral(": ");
    const QString shown = who + QString::fromStdString(message);
    set_error(target_, shown, fault);
    emit stateChanged();
    emit failed(target_, shown);
}

void DeviceCapture::set_error(const QString& field, const QString& message, const QString& fault) {
    if (field == error_field_ && message == error_message_ && fault == error_fault_)
        return;
    error_field_ = field;
    error_message_ = message;
    error_fault_ = fault;
    emit errorChanged();
}

} // namespace phaseplan::gui

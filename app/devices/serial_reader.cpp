#include "devices/serial_reader.h"

#include <QDeadlineTimer>
#include <QFileInfo>
#include <QSerialPort>

#include <unistd.h>

namespace phaseplan::devices {

namespace {

std::string at(const std::string& parent, const char* key) {
    return parent.empty() ? std::string(key) : parent + "." + key;
}

QSerialPort::Parity parity_of(const QString& s) {
    if (s == QLatin1String("even"))
        return QSerialPort::EvenParity;
    if (s == QLatin1String("odd"))
        return QSerialPort::OddParity;
    if (s == QLatin1String("mark"))
        return QSerialPort::MarkParity;
    if (s == QLatin1String("space"))
        return QSerialPort::SpaceParity;
    return QSerialPort::NoParity;
}

QSerialPort::StopBits stop_bits_of(const QString& s) {
    if (s == QLatin1String("1.5"))
        return QSerialPort::OneAndHalfStop;
    if (s == QLatin1String("2"))
        return QSerialPort::TwoStop;
    return QSerialPort::OneStop;
}

QSerialPort::FlowControl flow_of(const QString& s) {
    if (s == QLatin1String("hardware"))
        return QSerialPort::HardwareControl;
    if (s == QLatin1String("software"))
        return QSerialPort::SoftwareControl;
    return QSerialPort::NoFlowControl;
}

/// The port in the user's words: as given, with the device file after a bare name
/// ("ttyUSB0 (/dev/ttyUSB0)").
std::string port_words(const PortSettings& settings) {
    const QString path = settings.system_path();
    const QString given = settings.port.trimmed();
    if (given.isEmpty() || given == path)
        return path.toStdString();
    return given.toStdString() + " (" + path.toStdString() + ")";
}

std::string received_so_far(const QByteArray& pending) {
    return pending.isEmpty() ? std::string("nothing of a line received")
                             : "received " + quote_line(pending) + " of a line";
}

} // namespace

QString PortSettings::system_path() const {
    return port.startsWith(QLatin1Char('/')) ? port : QStringLiteral("/dev/") + port;
}

void PortSettings::validate(const std::string& parent) const {
    if (port.trimmed().isEmpty())
        throw DeviceError(Fault::bad_setting, at(parent, "port"),
                          "give the serial port, e.g. /dev/ttyUSB0");
    // 50 to 4 000 000 bit/s covers every rate a termios driver takes (common practice, no source).
    if (baud < 50 || baud > 4000000)
        throw DeviceError(Fault::bad_setting, at(parent, "baud"),
                          std::to_string(baud) + " is not a baud rate (50 to 4000000, e.g. 9600)");
    if (data_bits < 5 || data_bits > 8)
        throw DeviceError(Fault::bad_setting, at(parent, "data_bits"),
                          std::to_string(data_bits) + " is not 5, 6, 7 or 8");
    const QStringList parities{"none", "even", "odd", "mark", "space"};
    if (!parities.contains(parity))
        throw DeviceError(Fault::bad_setting, at(parent, "parity"),
                          "\"" + parity.toStdString() + "\" is not none, even, odd, mark or space");
    if (stop_bits != QLatin1String("1") && stop_bits != QLatin1String("1.5") &&
        stop_bits != QLatin1String("2"))
        throw DeviceError(Fault::bad_setting, at(parent, "stop_bits"),
                          "\"" + stop_bits.toStdString() + "\" is not 1, 1.5 or 2");
    if (flow_control != QLatin1String("none") && flow_control != QLatin1String("hardware") &&
        flow_control != QLatin1String("software"))
        throw DeviceError(Fault::bad_setting, at(parent, "flow_control"),
                          "\"" + flow_control.toStdString() +
                              "\" is not none, hardware or software");
}

// ---- LineAssembler ----------------------------------------------------------------------------

void LineAssembler::feed(const QByteArray& bytes) {
    if (pos_ > 4096) { // drop what was taken, now and then
        buf_.remove(0, pos_);
        pos_ = 0;
    }
    buf_.append(bytes);
}

std::optional<QByteArray> LineAssembler::take_line() {
    for (;;) {
        qsizetype end = -1;
        for (qsizetype i = pos_; i < buf_.size(); ++i)
            if (buf_[i] == '\r' || buf_[i] == '\n') {
                end = i;
                break;
            }
        if (end < 0) {
            if (buf_.size() - pos_ > max_) {
                const QByteArray junk = pending();
                clear();
                throw DeviceError(
                    Fault::garbage, "reading",
                    "no line end after " + std::to_string(junk.size()) + " bytes " +
                        quote_line(junk) +
                        ": check the baud rate, data bits and parity against the instrument");
            }
            return std::nullopt;
        }
        QByteArray line = buf_.mid(pos_, end - pos_);
        pos_ = end + 1;
        if (line.isEmpty())
            continue; // the LF of CR LF, or a blank line
        if (line.size() > max_)
            throw DeviceError(
                Fault::garbage, "reading",
                "a line of " + std::to_string(line.size()) + " bytes " + quote_line(line) +
                    " is too long for a reading: check the baud rate and the line format");
        return line;
    }
}

// ---- SerialReader -----------------------------------------------------------------------------

SerialReader::SerialReader() = default;
SerialReader::~SerialReader() = default;

bool SerialReader::is_open() const {
    return port_ && port_->isOpen();
}

void SerialReader::close() {
    if (port_)
        port_->close();
    port_.reset();
    lines_.clear();
    gone_ = false;
}

void open_port(QSerialPort& port, const PortSettings& settings) {
    settings.validate();
    const QString path = settings.system_path();
    const std::string shown = port_words(settings);
    const std::string given = settings.port.toStdString();
    if (!QFileInfo::exists(path))
        throw DeviceFailure(Fault::port_missing, given,
                            shown +
                                " does not exist: is the instrument connected and switched on?");
    port.setPortName(path);
    port.setBaudRate(settings.baud);
    port.setDataBits(static_cast<QSerialPort::DataBits>(settings.data_bits));
    port.setParity(parity_of(settings.parity));
    port.setStopBits(stop_bits_of(settings.stop_bits));
    port.setFlowControl(flow_of(settings.flow_control));
    if (port.open(QIODevice::ReadOnly))
        return;

    const QSerialPort::SerialPortError err = port.error();
    const std::string why = port.errorString().toStdString();
    if (err == QSerialPort::DeviceNotFoundError)
        throw DeviceFailure(Fault::port_missing, given,
                            shown +
                                " does not exist: is the instrument connected and switched on?");
    if (err == QSerialPort::PermissionError) {
        // The lock file or TIOCEXCL of another program, or no rights on the device file.
        if (::access(path.toLocal8Bit().constData(), R_OK) == 0)
            throw DeviceFailure(Fault::port_busy, given,
                                shown + " is in use by another program: close it and try again");
        throw DeviceFailure(Fault::port_failed, given,
                            "no permission to read " + shown +
                                " (is the user in the dialout group?)");
    }
    throw DeviceFailure(
        Fault::port_failed, given,
        shown + " cannot be opened as a serial port" +
            (err == QSerialPort::NoError ? std::string(" (not a terminal device?)") : ": " + why));
}

DeviceFailure port_fault(const QSerialPort& port, const PortSettings& settings,
                         const QByteArray& pending) {
    const QSerialPort::SerialPortError err = port.error();
    const std::string shown = port_words(settings);
    const std::string given = settings.port.toStdString();
    if (err == QSerialPort::ResourceError || err == QSerialPort::ReadError ||
        err == QSerialPort::DeviceNotFoundError)
        return DeviceFailure(Fault::disconnected, given,
                             "the instrument on " + shown + " went away (" +
                                 received_so_far(pending) +
                                 "): check the cable and the instrument");
    return DeviceFailure(Fault::port_failed, given,
                         shown + ": " + port.errorString().toStdString());
}

DeviceFailure timeout_fault(const PortSettings& settings, int timeout_ms, bool stable_only,
                            const QByteArray& pending) {
    return DeviceFailure(Fault::timeout, settings.port.toStdString(),
                         "no " + std::string(stable_only ? "stable " : "") + "reading from " +
                             port_words(settings) + " within " +
                             chem::format_number(timeout_ms / 1000.0) + " s (" +
                             received_so_far(pending) +
                             "): press the print key, or check the cable, baud rate and line end");
}

void SerialReader::open(const PortSettings& settings) {
    close();
    auto port = std::make_unique<QSerialPort>();
    open_port(*port, settings);
    port_ = std::move(port);
    settings_ = settings;
}

QByteArray SerialReader::next_line(int timeout_ms) {
    if (!port_)
        throw DeviceFailure(Fault::port_failed, settings_.port.toStdString(),
                            "the port is not open");
    QDeadlineTimer deadline(timeout_ms);
    for (;;) {
        if (auto line = lines_.take_line())
            return *line;
        if (gone_)
            throw port_fault(*port_, settings_, lines_.pending());
        if (port_->bytesAvailable() > 0) {
            lines_.feed(port_->readAll());
            continue;
        }
        const qint64 left = deadline.remainingTime();
        if (left == 0 || !port_->waitForReadyRead(static_cast<int>(std::max<qint64>(1, left)))) {
            const QSerialPort::SerialPortError err = port_->error();
            if (port_->bytesAvailable() > 0) {
                lines_.feed(port_->readAll());
            }
            if (err == QSerialPort::ResourceError || err == QSerialPort::ReadError ||
                err == QSerialPort::DeviceNotFoundError) {
                gone_ = true;
                continue; // a complete line already read is still taken first
            }
            if (auto line = lines_.take_line())
                return *line;
            if (err != QSerialPort::NoError && err != QSerialPort::TimeoutError)
                throw port_fault(*port_, settings_, lines_.pending());
            if (deadline.hasExpired() || left == 0)
                throw timeout_fault(settings_, timeout_ms, false, lines_.pending());
            port_->clearError();
        }
    }
}

Reading SerialReader::next_reading(const LineFormat& format, const FormatLibrary& lib,
                                   const ReadOptions& options) {
    QDeadlineTimer deadline(options.timeout_ms);
    for (;;) {
        const qint64 left = deadline.remainingTime();
        QByteArray line;
        try {
            line = next_line(static_cast<int>(std::max<qint64>(0, left)));
        } catch (const DeviceFailure& e) {
            // The message should name the whole wait, not what was left of it.
            if (e.fault() != Fault::timeout)
                throw;
            throw timeout_fault(settings_, options.timeout_ms, options.stable_only,
                                lines_.pending());
        }
        Reading r = parse_line(line, format, lib, options.expect);
        if (r.stable || !options.stable_only)
            return r;
        if (options.on_unstable)
            options.on_unstable(r);
    }
}

} // namespace phaseplan::devices

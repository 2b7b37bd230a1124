#pragma once
// Reading lines from a balance or pH meter on a serial port (RS-232 or USB serial, Qt Serial Port).
//
// LineAssembler joins the bytes of successive reads into lines: a line ends at CR, LF or CR LF,
// empty lines are skipped, a line split across reads is joined, and when two lines arrive in one
// read the first is taken first (the second waits for the next call). SerialReader opens the port
// with the record's settings and blocks until one complete line (or reading) arrives; every
// failure is a DeviceError (a setting, the reading) or a DeviceFailure (the port, the
// instrument) with its Fault. Nothing here keeps or replaces a value: the caller's
// field keeps its previous value whenever a call throws.
#include "devices/line_format.h"

#include <QByteArray>
#include <QString>

#include <functional>
#include <memory>
#include <optional>

class QSerialPort;

namespace phaseplan::devices {

/// A port and its line settings.
struct PortSettings {
    QString port;                  ///< "/dev/ttyUSB0" (a bare "ttyUSB0" is looked up under /dev)
    int baud = 9600;               ///< bits per second
    int data_bits = 8;             ///< 5 to 8
    QString parity = "none";       ///< none, even, odd, mark, space
    QString stop_bits = "1";       ///< "1", "1.5", "2"
    QString flow_control = "none"; ///< none, hardware (RTS/CTS), software (XON/XOFF)

    /// The device file: port, or /dev/<port> for a bare name.
    QString system_path() const;
    /// Throws DeviceError(bad_setting, "<parent>.baud", …) and so on for a value out of range.
    void validate(const std::string& parent = {}) const;
};

/// Applies the settings to `port` and opens it read-only. Throws DeviceFailure: port_missing,
/// port_busy, port_failed; DeviceError: bad_setting (field "port", "baud", "data_bits", …). Used by
/// SerialReader (blocking) and by the app's DeviceCapture (signals).
void open_port(QSerialPort& port, const PortSettings& settings);

/// The fault when the port reports `error` while a line was being received (`pending`: the part
/// of a line received so far). Disconnection for a resource, read or not-found error.
DeviceFailure port_fault(const QSerialPort& port, const PortSettings& settings,
                         const QByteArray& pending);

/// The timeout fault after `timeout_ms` of waiting.
DeviceFailure timeout_fault(const PortSettings& settings, int timeout_ms, bool stable_only,
                            const QByteArray& pending);

class LineAssembler {
  public:
    /// A line longer than max_line_bytes without a line end is garbage (a wrong baud rate
    /// rarely produces CR or LF).
    explicit LineAssembler(int max_line_bytes = 256) : max_(max_line_bytes) {}
    void feed(const QByteArray& bytes);
    /// The next complete, non-empty line without its line end; nullopt when none is complete.
    /// Throws DeviceError(garbage, "reading", …) and drops the bytes when the pending part
    /// passes the limit.
    std::optional<QByteArray> take_line();
    /// The bytes of a line not yet ended.
    QByteArray pending() const { return buf_.mid(pos_); }
    void clear() {
        buf_.clear();
        pos_ = 0;
    }

  private:
    QByteArray buf_;
    qsizetype pos_ = 0;
    int max_;
};

struct ReadOptions {
    int timeout_ms = 10000;   ///< for one reading (with stable_only: for the stable one)
    bool stable_only = false; ///< skip unstable readings (each is passed to on_unstable)
    Expectation expect;
    std::function<void(const Reading&)> on_unstable;
};

class SerialReader {
  public:
    SerialReader();
    ~SerialReader();
    SerialReader(const SerialReader&) = delete;
    SerialReader& operator=(const SerialReader&) = delete;

    /// Opens the port read-only. Throws DeviceFailure: port_missing, port_busy, port_failed;
    /// DeviceError: bad_setting (field "port", "baud", "data_bits", …).
    void open(const PortSettings& settings);
    void close();
    bool is_open() const;

    /// Blocks until one complete line arrives. Throws DeviceFailure: timeout (with the part of a
    /// line received so far), disconnected (the instrument went away, with the part of a line
    /// received); DeviceError: garbage (field "reading", no line end).
    QByteArray next_line(int timeout_ms);
    /// next_line, read with the format (parse_line's faults). With stable_only, an unstable
    /// reading is reported through on_unstable and the wait goes on.
    Reading next_reading(const LineFormat& format, const FormatLibrary& lib,
                         const ReadOptions& options);

  private:
    std::unique_ptr<QSerialPort> port_;
    PortSettings settings_;
    LineAssembler lines_;
    bool gone_ = false;
};

} // namespace phaseplan::devices

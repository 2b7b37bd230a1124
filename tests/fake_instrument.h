#pragma once
// A balance or pH meter played by the test itself: a pseudo-terminal pair (openpty). The reader
// under test opens the slave side by its path (/dev/pts/N) exactly as it opens /dev/ttyUSB0;
// the test writes the instrument's bytes into the master side. No hardware, no socat.
#include <QByteArray>
#include <QString>
#include <QtTest>

#include <cerrno>
#include <fcntl.h>
#include <pty.h>
#include <sys/ioctl.h>
#include <termios.h>
#include <unistd.h>

namespace phaseplan::testing {

class FakeInstrument {
  public:
    FakeInstrument() {
        char name[256] = {};
        if (::openpty(&master_, &slave_, name, nullptr, nullptr) != 0)
            qFatal("openpty failed: %d", errno);
        // Not inherited by a child (phaseplan-cli under test): a child holding the master would
        // keep the line up after unplug().
        ::fcntl(master_, F_SETFD, FD_CLOEXEC);
        ::fcntl(slave_, F_SETFD, FD_CLOEXEC);
        // Raw, like a serial line: no echo back to the instrument, no CR/LF translation. The
        // test keeps its slave descriptor open so that bytes written before the reader opens
        // the port wait in the line's queue.
        termios t{};
        ::tcgetattr(slave_, &t);
        ::cfmakeraw(&t);
        ::tcsetattr(slave_, TCSANOW, &t);
        path_ = QString::fromLocal8Bit(name);
    }
    ~FakeInstrument() {
        unplug();
        if (slave_ >= 0)
            ::close(slave_);
    }
    FakeInstrument(const FakeInstrument&) = delete;
    FakeInstrument& operator=(const FakeInstrument&) = delete;

    QString path() const { return path_; }

    /// Writes all of `bytes` (blocking while the line's buffer is full).
    bool send(const QByteArray& bytes) {
        qsizetype done = 0;
        while (done < bytes.size()) {
            const ssize_t n = ::write(master_, bytes.constData() + done,
                                      static_cast<size_t>(bytes.size() - done));
            if (n < 0) {
                if (errno == EINTR)
                    continue;
                return false;
            }
            done += n;
        }
        return true;
    }

    /// The line speed as last set on the port (B9600, B19200, …): a reader that opens the port
    /// sets it, which tells the test that the reader is listening.
    speed_t speed() const {
        termios t{};
        ::tcgetattr(slave_, &t);
        return ::cfgetispeed(&t);
    }

    /// Bytes sent and not yet read by the reader (the port's input queue): 0 once it has them.
    int unread() const {
        int n = 0;
        ::ioctl(slave_, FIONREAD, &n);
        return n;
    }

    /// The instrument goes away: the master side closes, and the reader's next read fails.
    void unplug() {
        if (master_ >= 0)
            ::close(master_);
        master_ = -1;
    }

  private:
    int master_ = -1;
    int slave_ = -1;
    QString path_;
};

} // namespace phaseplan::testing

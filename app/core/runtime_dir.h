#pragma once
// A private runtime folder for Qt when XDG_RUNTIME_DIR is unset (a root shell, a cron job, a
// container), so that Qt does not warn about it on stderr. It is a fresh mkdtemp folder in the
// temporary folder, never a predictable name that someone could plant a link at, checked with
// lstat to be a real folder of this user with mode 0700, and removed when this object goes.
#include <QByteArray>
#include <QDir>
#include <QFile>

#include <stdlib.h>
#include <sys/stat.h>
#include <unistd.h>

namespace phaseplan {

class PrivateRuntimeDir {
  public:
    PrivateRuntimeDir() {
        if (!qEnvironmentVariableIsEmpty("XDG_RUNTIME_DIR"))
            return;
        QByteArray templ = QFile::encodeName(QDir::tempPath()) + "/phaseplan-runtime-XXXXXX";
        if (!::mkdtemp(templ.data()))
            return; // Qt then picks its own and may warn
        struct stat st {};
        if (::lstat(templ.constData(), &st) != 0 || !S_ISDIR(st.st_mode) ||
            st.st_uid != ::getuid() || (st.st_mode & 0777) != 0700)
            return;
        path_ = templ;
        qputenv("XDG_RUNTIME_DIR", path_);
    }
    ~PrivateRuntimeDir() {
        if (path_.isEmpty())
            return;
        QDir(QFile::decodeName(path_)).removeRecursively();
        qunsetenv("XDG_RUNTIME_DIR");
    }
    PrivateRuntimeDir(const PrivateRuntimeDir&) = delete;
    PrivateRuntimeDir& operator=(const PrivateRuntimeDir&) = delete;

  private:
    QByteArray path_;
};

} // namespace phaseplan

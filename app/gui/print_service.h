#pragma once
// The printer and PDF writer as a QML type: print::PrintController with the workspace's reference
// data. The batch screen makes one and hands it to its BatchModel (BatchModel::output), which
// knows only the DocumentOutput interface.
#include "print/print_controller.h"

#include <QPointer>
#include <QQmlEngine>

Q_MOC_INCLUDE("workspace.h")

namespace phaseplan::gui {

class Workspace;

class PrintService : public print::PrintController {
    Q_OBJECT
    QML_ELEMENT
    Q_PROPERTY(phaseplan::gui::Workspace* workspace READ workspace WRITE setWorkspace NOTIFY
                   workspaceChanged)
  public:
    explicit PrintService(QObject* parent = nullptr);
    Workspace* workspace() const { return workspace_; }
    void setWorkspace(Workspace* w);
  signals:
    void workspaceChanged();

  private:
    QPointer<Workspace> workspace_;
};

} // namespace phaseplan::gui

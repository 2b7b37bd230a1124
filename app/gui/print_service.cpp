#include "print_service.h"

#include "workspace.h"

namespace phaseplan::gui {

PrintService::PrintService(QObject* parent) : print::PrintController(parent) {}

void PrintService::setWorkspace(Workspace* w) {
    if (workspace_ == w)
        return;
    workspace_ = w;
    setData(w ? &w->data() : nullptr);
    if (w)
        connect(w, &Workspace::readyChanged, this, [this] {
            if (workspace_)
                setData(&workspace_->data());
        });
    emit workspaceChanged();
}

} // namespace phaseplan::gui

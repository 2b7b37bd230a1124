#pragma once
// What main.cpp runs: command-line options, the QML engine, and the checking seams
// (--screenshot, --self-test, --measure). Kept in the library so that main.cpp stays one call.
class QApplication;
class QQmlEngine;

namespace phaseplan::gui {

/// Marks the moment the process entered main(), for the start-up time.
void start_clock();
/// Milliseconds since start_clock().
double elapsed_since_start_ms();

/// Sets up the engine the way the app and the QML tests both need it (style, import path).
void prepare_engine(QQmlEngine& engine);

int run_app(QApplication& app);

} // namespace phaseplan::gui

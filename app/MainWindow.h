#pragma once

// The editor window lives in the views library (views/EditorWindow.h) so that
// the GUI tests drive exactly the window the application shows; the app only
// chooses the command line or the editor (main.cpp).
#include "EditorWindow.h"

namespace rb {
using MainWindow = EditorWindow;
} // namespace rb

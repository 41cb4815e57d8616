#pragma once

#include <QIcon>

namespace rb {

// Routebook's own icons (resources/icons/*.svg), rendered once per size so
// they stay sharp on high-DPI screens without relying on an icon plugin.
class Icons {
public:
    enum Kind {
        Item,
        Conditional,
        Unreachable,
        Loop,
        Module,
        Error,
        Warning,
        Add,
        Remove,
        Up,
        Down,
        Play,
        Back,
        Application
    };
    static QIcon get(Kind kind);
    // Registers the resources of the views library (a static library needs it).
    static void initResources();
    // The stylesheet from the resources.
    static QString styleSheet();
};

} // namespace rb

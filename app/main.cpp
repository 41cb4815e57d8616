// Routebook: one binary. A subcommand runs on QCoreApplication and never needs
// a display; no subcommand opens the editor.
#include "MainWindow.h"
#include "cli/Cli.h"

#include <QApplication>
#include <QCoreApplication>

#include <cstdio>

namespace {

QStringList argumentsOf(int argc, char** argv) {
    QStringList arguments;
    for (int i = 1; i < argc; ++i)
        arguments.append(QString::fromLocal8Bit(argv[i]));
    return arguments;
}

int runCommand(int argc, char** argv) {
    QCoreApplication app(argc, argv);
    QTextStream out(stdout), err(stderr);
    const int code = rb::cli::run(argumentsOf(argc, argv), out, err);
    out.flush();
    err.flush();
    return code;
}

bool haveDisplay() {
    return !qEnvironmentVariableIsEmpty("DISPLAY") ||
           !qEnvironmentVariableIsEmpty("WAYLAND_DISPLAY") ||
           !qEnvironmentVariableIsEmpty("QT_QPA_PLATFORM");
}

int runEditor(int argc, char** argv) {
    if (!haveDisplay()) {
        std::fputs("routebook: no display for the editor; the commands need none "
                   "(routebook --help)\n",
                   stderr);
        return rb::cli::BadInput;
    }
    QApplication app(argc, argv);
    QApplication::setApplicationName(QStringLiteral("Routebook"));
    QApplication::setOrganizationName(QStringLiteral("Routebook"));
    QApplication::setApplicationVersion(QStringLiteral(ROUTEBOOK_VERSION));
    rb::MainWindow window;
    const QStringList arguments = argumentsOf(argc, argv);
    if (!arguments.isEmpty())
        window.openFile(arguments.first());
    window.show();
    return app.exec();
}

} // namespace

int main(int argc, char** argv) {
    if (rb::cli::isCommand(argumentsOf(argc, argv)))
        return runCommand(argc, argv);
    return runEditor(argc, argv);
}

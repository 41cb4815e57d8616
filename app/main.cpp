// Routebook: one binary. A subcommand runs on QCoreApplication and never needs
// a display; no subcommand opens the editor.
#include "MainWindow.h"
#include "cli/Cli.h"

#include <QApplication>
#include <QCoreApplication>
#include <QGuiApplication>

#include <cstdio>
#include <memory>

namespace {

QStringList argumentsOf(int argc, char** argv) {
    QStringList arguments;
    for (int i = 1; i < argc; ++i)
        arguments.append(QString::fromLocal8Bit(argv[i]));
    return arguments;
}

// Exports that draw (PDF, pictures) need QtGui's fonts and painting: they get
// a QGuiApplication, on the offscreen platform when there is no display.
bool commandDraws(const QStringList& arguments) {
    if (arguments.value(0) != QLatin1String("export"))
        return false;
    const QString format = arguments.value(arguments.indexOf(QStringLiteral("--format")) + 1);
    return format == QLatin1String("pdf") || format == QLatin1String("svg") ||
           format == QLatin1String("png");
}

bool haveDisplay();

int runCommand(int argc, char** argv) {
    const QStringList arguments = argumentsOf(argc, argv);
    std::unique_ptr<QCoreApplication> app;
    if (commandDraws(arguments)) {
        if (!haveDisplay())
            qputenv("QT_QPA_PLATFORM", "offscreen");
        app = std::make_unique<QGuiApplication>(argc, argv);
    } else {
        app = std::make_unique<QCoreApplication>(argc, argv);
    }
    QTextStream out(stdout), err(stderr);
    const int code = rb::cli::run(arguments, out, err);
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

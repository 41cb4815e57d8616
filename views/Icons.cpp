#include "Icons.h"

#include <QFile>
#include <QHash>
#include <QPainter>
#include <QSvgRenderer>

static void initRoutebookResources() {
    Q_INIT_RESOURCE(routebook);
}

namespace rb {

namespace {

QString fileOf(Icons::Kind kind) {
    static const char* const names[] = {"item",  "conditional", "unreachable", "loop",     "module",
                                        "error", "warning",     "add",         "remove",   "up",
                                        "down",  "play",        "back",        "routebook"};
    return QStringLiteral(":/icons/%1.svg").arg(QLatin1String(names[kind]));
}

QIcon render(const QString& file) {
    QSvgRenderer renderer(file);
    QIcon icon;
    if (!renderer.isValid())
        return icon;
    for (int size : {16, 24, 32, 48, 64}) {
        QPixmap pixmap(size, size);
        pixmap.fill(Qt::transparent);
        QPainter painter(&pixmap);
        renderer.render(&painter);
        painter.end();
        icon.addPixmap(pixmap);
    }
    return icon;
}

} // namespace

void Icons::initResources() {
    initRoutebookResources();
}

QIcon Icons::get(Kind kind) {
    static QHash<int, QIcon> cache;
    auto it = cache.find(kind);
    if (it == cache.end()) {
        initResources();
        it = cache.insert(kind, render(fileOf(kind)));
    }
    return *it;
}

QString Icons::styleSheet() {
    initResources();
    QFile file(QStringLiteral(":/style/routebook.qss"));
    if (!file.open(QIODevice::ReadOnly))
        return {};
    return QString::fromUtf8(file.readAll());
}

} // namespace rb

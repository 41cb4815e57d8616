#include "RouteMapView.h"

#include "RouteMapItems.h"
#include "RouteMapScene.h"

#include <QImage>
#include <QPainter>
#include <QSaveFile>
#include <QWheelEvent>

namespace rb {

RouteMapView::RouteMapView(QWidget* parent)
    : QGraphicsView(parent), m_scene(new RouteMapScene(this)) {
    setScene(m_scene);
    setDragMode(QGraphicsView::ScrollHandDrag);
    setRenderHint(QPainter::Antialiasing);
    setTransformationAnchor(QGraphicsView::AnchorUnderMouse);
    setObjectName(QStringLiteral("routeMapView"));
    connect(m_scene, &QGraphicsScene::selectionChanged, this, &RouteMapView::onSelectionChanged);
}

// The scene is our child and is destroyed after this class's part of the
// object: stop its selection signals reaching a half-destroyed view.
RouteMapView::~RouteMapView() {
    m_scene->disconnect(this);
}

void RouteMapView::setRouting(const CompiledRouting& routing, const RoutingAnalysis* analysis) {
    const int keep = selectedPosition();
    m_settingSelection = true;
    m_scene->setRouting(routing, analysis);
    m_settingSelection = false;
    if (keep >= 0 && keep < routing.itemCount())
        selectItem(keep);
}

int RouteMapView::selectedPosition() const {
    for (QGraphicsItem* item : m_scene->selectedItems())
        if (item->type() == RouteNodeItem::Type)
            return static_cast<RouteNodeItem*>(item)->position();
    return -1;
}

double RouteMapView::zoom() const {
    return transform().m11();
}

void RouteMapView::selectItem(int position) {
    RouteNodeItem* item = m_scene->itemAtPosition(position);
    if (!item || position < 0)
        return;
    m_settingSelection = true;
    m_scene->clearSelection();
    item->setSelected(true);
    m_settingSelection = false;
    m_scene->highlightPathsTo(item->node());
    centerOn(item);
}

void RouteMapView::onSelectionChanged() {
    if (m_settingSelection)
        return;
    const int position = selectedPosition();
    RouteNodeItem* item = position >= 0 ? m_scene->itemAtPosition(position) : nullptr;
    m_scene->highlightPathsTo(item ? item->node() : -1);
    if (position >= 0)
        emit itemSelected(position);
}

int RouteMapView::find(const QString& text) {
    const layout::RouteGraph& g = m_scene->graph();
    const int items = int(g.nodes.size()) - 2;
    if (text.isEmpty() || items <= 0)
        return -1;
    const int start = selectedPosition() + 1;
    for (int k = 0; k < items; ++k) {
        const int position = (start + k) % items;
        const layout::RouteNode& node = g.nodes.at(layout::RouteGraph::nodeOfPosition(position));
        if (node.name.contains(text, Qt::CaseInsensitive) ||
            node.label.contains(text, Qt::CaseInsensitive)) {
            selectItem(position);
            emit itemSelected(position);
            return position;
        }
    }
    return -1;
}

void RouteMapView::scaleBy(double factor) {
    const double next = zoom() * factor;
    if (next < 0.05 || next > 8)
        return;
    scale(factor, factor);
}

void RouteMapView::zoomIn() {
    scaleBy(1.25);
}
void RouteMapView::zoomOut() {
    scaleBy(1 / 1.25);
}

void RouteMapView::fitAll() {
    fitInView(m_scene->sceneRect(), Qt::KeepAspectRatio);
}

void RouteMapView::wheelEvent(QWheelEvent* event) {
    if (event->modifiers() & Qt::ControlModifier) {
        scaleBy(event->angleDelta().y() > 0 ? 1.15 : 1 / 1.15);
        event->accept();
        return;
    }
    QGraphicsView::wheelEvent(event);
}

bool RouteMapView::saveSvg(const QString& path, QString* error) const {
    QSaveFile file(path);
    const QByteArray bytes = m_scene->toSvg();
    if (file.open(QIODevice::WriteOnly) && file.write(bytes) == bytes.size() && file.commit())
        return true;
    *error = file.errorString();
    return false;
}

bool RouteMapView::savePng(const QString& path, QString* error) const {
    const QRectF area = m_scene->sceneRect();
    QImage image(area.size().toSize(), QImage::Format_ARGB32);
    image.fill(Qt::white);
    QPainter painter(&image);
    painter.setRenderHint(QPainter::Antialiasing);
    m_scene->render(&painter, QRectF(QPointF(0, 0), area.size()), area);
    painter.end();
    if (image.save(path, "PNG"))
        return true;
    *error = QStringLiteral("cannot write PNG to %1").arg(path);
    return false;
}

} // namespace rb

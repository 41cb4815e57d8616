#pragma once

#include "analysis/RoutingAnalysis.h"
#include "routing/CompiledRouting.h"

#include <QGraphicsView>

namespace rb {

class RouteMapScene;

// The route map widget the editor docks: pan by dragging, zoom with Ctrl+wheel
// or zoomIn()/zoomOut(), fitAll(), find an item by name or label. Selection is
// by flat item position so it can be shared with the outline: selectItem()
// from outside selects without echoing itemSelected(); a click on an item
// emits itemSelected(position). The selected item's universe is shown by
// highlighting every edge that can lead to it.
class RouteMapView : public QGraphicsView {
    Q_OBJECT

public:
    explicit RouteMapView(QWidget* parent = nullptr);
    ~RouteMapView() override;

    // With an analysis (analysis/RoutingAnalysis.h), markers use its exact universes.
    void setRouting(const CompiledRouting& routing, const RoutingAnalysis* analysis = nullptr);
    RouteMapScene* routeScene() const { return m_scene; }
    int selectedPosition() const; // -1 when no item is selected
    double zoom() const;

    // First item (in questionnaire order, after the selected one, wrapping)
    // whose name or label contains text, ignoring case; selects it and
    // returns its position, or -1.
    int find(const QString& text);

    bool saveSvg(const QString& path, QString* error) const;
    bool savePng(const QString& path, QString* error) const;

public slots:
    void selectItem(int position);
    void zoomIn();
    void zoomOut();
    void fitAll();

signals:
    void itemSelected(int position);

protected:
    void wheelEvent(QWheelEvent* event) override;

private:
    void onSelectionChanged();
    void scaleBy(double factor);

    RouteMapScene* m_scene;
    bool m_settingSelection = false;
};

} // namespace rb

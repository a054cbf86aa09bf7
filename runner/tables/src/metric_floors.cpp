#include "upright/runner/tables/metric_floors.hpp"

#include "upright/runner/tables/metric_columns.hpp"

namespace upright::runner {

MetricFloor FloorOf(std::string_view metric) {
  for (const MetricColumn& column : MetricColumns()) {
    if (column.name == metric) return {column.floor, column.unit};
  }
  return {};
}

}  // namespace upright::runner

// <ground>: the terrain kind, its profile segments in file order, and friction regions.
#include <algorithm>
#include <array>
#include <string>
#include <string_view>
#include <vector>

#include "scenario_reading.hpp"

namespace upright::runner::internal {
namespace {

using sim::FrictionRegion;
using sim::ProfileSegment;
using sim::SegmentKind;
using sim::Terrain;
using sim::TerrainKind;

constexpr std::array<TerrainKind, 3> kTerrainKinds = {TerrainKind::kFlat, TerrainKind::kSlope,
                                                      TerrainKind::kProfile};
constexpr std::array<SegmentKind, 4> kSegmentKinds = {SegmentKind::kRamp, SegmentKind::kPlateau,
                                                      SegmentKind::kBump, SegmentKind::kCurb};

struct ReadSegment {
  model::XmlElement element;
  ProfileSegment segment;
  bool complete = true;  // every value it needs was read
};

// One segment's attributes: a curb has only a height, a plateau only a length.
ReadSegment ReadOneSegment(model::XmlElement element, SegmentKind kind) {
  ReadSegment read{element, ProfileSegment{kind, 0, 0}, true};
  if (kind != SegmentKind::kCurb) {
    read.segment.length_m = RequiredNumber(element, "length_m", &read.complete);
  }
  if (kind != SegmentKind::kPlateau) {
    read.segment.height_m = RequiredNumber(element, "height_m", &read.complete);
  }
  return read;
}

// The segments in file order, across the four element names.
std::vector<ReadSegment> ReadSegments(model::XmlElement& ground) {
  std::array<std::string_view, kSegmentKinds.size()> names;
  for (std::size_t i = 0; i < kSegmentKinds.size(); ++i) names[i] = sim::ToString(kSegmentKinds[i]);
  std::vector<ReadSegment> segments;
  for (const model::XmlElement& element : ground.Children(names)) {
    const auto name = std::find(names.begin(), names.end(), element.name());
    segments.push_back(ReadOneSegment(element, kSegmentKinds[name - names.begin()]));
  }
  return segments;
}

// Sim rules, each reported at the line of the element it concerns: the ground's own fields, then
// every complete segment and region alone on default ground (the ones before it replaced by valid
// stand-ins, so the index in the message is the element's own), then the whole terrain.
void CheckTerrain(const Terrain& terrain, model::XmlElement& ground,
                  const std::vector<ReadSegment>& segments,
                  const std::vector<std::pair<model::XmlElement, bool>>& regions,
                  const ReadContext& context) {
  bool all_valid = true;
  Terrain probe = terrain;
  probe.segments.clear();
  probe.friction_regions.clear();
  if (Status valid = probe.Validate(); !valid) {
    context.Error(ground, valid.error());
    all_valid = false;
  }
  probe = Terrain();
  for (std::size_t i = 0; i < segments.size(); ++i) {
    if (!segments[i].complete) {
      all_valid = false;
      continue;
    }
    probe.segments.assign(i, ProfileSegment{SegmentKind::kPlateau, 1, 0});
    probe.segments.push_back(segments[i].segment);
    if (Status valid = probe.Validate(); !valid) {
      context.Error(segments[i].element, valid.error());
      all_valid = false;
    }
  }
  probe = Terrain();
  for (std::size_t i = 0; i < regions.size(); ++i) {
    if (!regions[i].second) {
      all_valid = false;
      continue;
    }
    probe.friction_regions.assign(i, FrictionRegion{0, 1, 0.5});
    probe.friction_regions.push_back(terrain.friction_regions[i]);
    if (Status valid = probe.Validate(); !valid) {
      context.Error(regions[i].first, valid.error());
      all_valid = false;
    }
  }
  if (!all_valid) return;
  if (Status valid = terrain.Validate(); !valid) context.Error(ground, valid.error());
}

}  // namespace

void ReadGround(model::XmlElement root, ReadContext& context, sim::Terrain* terrain) {
  std::optional<model::XmlElement> ground = root.Child("ground", model::Presence::kOptional);
  if (!ground) return;
  bool ok = true;
  std::array<std::string_view, kTerrainKinds.size()> kind_names;
  for (std::size_t i = 0; i < kTerrainKinds.size(); ++i) {
    kind_names[i] = sim::ToString(kTerrainKinds[i]);
  }
  const bool kind_given = ground->Has("kind");
  const std::optional<std::size_t> kind =
      ground->Choice("kind", kind_names, model::Presence::kOptional);
  const bool kind_known = !kind_given || kind.has_value();
  terrain->kind = kind ? kTerrainKinds[*kind] : TerrainKind::kFlat;
  const std::string kind_text = Quote(sim::ToString(terrain->kind));

  // Attributes that belong to one kind: required or allowed with it, an error with any other.
  auto kind_attribute = [&](std::string_view attribute, TerrainKind owner, bool required,
                            double* field) {
    const bool given = ground->Has(attribute);
    const std::optional<double> value = ground->Double(attribute, model::Presence::kOptional);
    if (value) *field = *value;
    if (given && !value) ok = false;
    if (!kind_known) return;
    const std::string owner_text = Quote(sim::ToString(owner));
    if (terrain->kind == owner && required && !given) {
      context.Error(*ground, "missing attribute '" + std::string(attribute) +
                                 "' (required with kind = " + owner_text + ")");
    } else if (terrain->kind != owner && value) {
      context.FieldError(*ground, attribute, Num(*value),
                         "only with kind = " + owner_text + " (kind is " + kind_text + ")");
    }
  };
  kind_attribute("slope_deg", TerrainKind::kSlope, true, &terrain->slope_deg);
  kind_attribute("start_x_m", TerrainKind::kProfile, false, &terrain->start_x_m);
  kind_attribute("width_m", TerrainKind::kProfile, false, &terrain->width_m);

  std::vector<ReadSegment> segments = ReadSegments(*ground);
  for (const ReadSegment& read : segments) terrain->segments.push_back(read.segment);
  if (kind_known && terrain->kind != TerrainKind::kProfile && !segments.empty()) {
    context.Error(segments.front().element,
                  "profile segments need kind = 'profile' on <ground> (kind is " + kind_text + ")");
    ok = false;
  }
  if (kind_known && terrain->kind == TerrainKind::kProfile && segments.empty()) {
    context.Error(*ground,
                  "kind = 'profile' needs at least one segment: <ramp>, <plateau>, <bump> or "
                  "<curb>");
    ok = false;
  }

  std::vector<std::pair<model::XmlElement, bool>> regions;
  for (model::XmlElement element : ground->Children("friction")) {
    bool complete = true;
    FrictionRegion region;
    region.start_x_m = RequiredNumber(element, "start_x_m", &complete);
    region.end_x_m = RequiredNumber(element, "end_x_m", &complete);
    region.friction = RequiredNumber(element, "friction", &complete);
    terrain->friction_regions.push_back(region);
    regions.emplace_back(element, complete);
  }
  if (ok && kind_known) CheckTerrain(*terrain, *ground, segments, regions, context);
}

}  // namespace upright::runner::internal

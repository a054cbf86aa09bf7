#include "upright/sim/terrain.hpp"

#include <algorithm>
#include <cmath>
#include <iomanip>
#include <numbers>
#include <sstream>

#include "upright/model/conventions.hpp"

namespace upright::sim {
namespace {

// Height of a raised-cosine bump of unit peak at fraction u ∈ [0, 1] of its length.
double BumpShape(double u) { return 0.5 * (1.0 - std::cos(2.0 * std::numbers::pi * u)); }

double ProfileEnd(const Terrain& t) {
  double x = t.start_x_m;
  for (const auto& s : t.segments) x += s.length_m;
  return x;
}

// The pieces a stretch `length_m` long is split into so none is longer than `max_piece_m`, and
// at least `at_least`; a double, so a huge stretch cannot overflow.
double PiecesFor(double length_m, double max_piece_m, double at_least) {
  return std::max(at_least, std::ceil(length_m / max_piece_m));
}

}  // namespace

double MeshCellFor(double wheel_radius_m) {
  return std::clamp(4 * wheel_radius_m, kFinestMeshCell_m, 1.0);
}

double ProfileMeshTriangles(const Terrain& t, double mesh_cell_m) {
  const double x_begin = std::min(t.start_x_m, 0.0) - t.extent_m / 4;
  double points = 1 + PiecesFor(t.start_x_m - x_begin, mesh_cell_m, 1);
  for (const auto& s : t.segments) {
    switch (s.kind) {
      case SegmentKind::kCurb:
        points += 1;
        break;
      case SegmentKind::kRamp:
        points += PiecesFor(std::hypot(s.length_m, s.height_m), mesh_cell_m, 1);
        break;
      case SegmentKind::kPlateau:
        points += PiecesFor(s.length_m, mesh_cell_m, 1);
        break;
      case SegmentKind::kBump:
        points += PiecesFor(std::hypot(s.length_m, std::numbers::pi * s.height_m), mesh_cell_m, 16);
        break;
    }
  }
  points += PiecesFor(t.extent_m, mesh_cell_m, 1);
  return 2 * (points - 1) * PiecesFor(t.width_m, mesh_cell_m, 1);
}

double Terrain::HeightAt(double x_m) const {
  switch (kind) {
    case TerrainKind::kFlat: return 0;
    case TerrainKind::kSlope:
      return x_m * std::tan(slope_deg * std::numbers::pi / 180.0);
    case TerrainKind::kProfile: break;
  }
  double x = start_x_m, z = 0;
  if (x_m < x) return 0;
  for (const auto& s : segments) {
    const double end = x + s.length_m;
    if (s.kind == SegmentKind::kCurb) {
      if (x_m >= x) z += s.height_m;
      continue;
    }
    if (x_m < end) {
      const double u = (x_m - x) / s.length_m;
      if (s.kind == SegmentKind::kRamp) return z + u * s.height_m;
      if (s.kind == SegmentKind::kBump) return z + s.height_m * BumpShape(u);
      return z;
    }
    if (s.kind == SegmentKind::kRamp) z += s.height_m;
    x = end;
  }
  return z;
}

double Terrain::SlopeAt(double x_m) const {
  switch (kind) {
    case TerrainKind::kFlat: return 0;
    case TerrainKind::kSlope:
      return std::tan(slope_deg * std::numbers::pi / 180.0);
    case TerrainKind::kProfile: break;
  }
  double x = start_x_m;
  for (const auto& s : segments) {
    const double end = x + s.length_m;
    if (s.kind != SegmentKind::kCurb && x_m >= x && x_m < end) {
      const double u = (x_m - x) / s.length_m;
      if (s.kind == SegmentKind::kRamp) return s.height_m / s.length_m;
      if (s.kind == SegmentKind::kBump) {
        return s.height_m * std::numbers::pi / s.length_m * std::sin(2.0 * std::numbers::pi * u);
      }
      return 0;
    }
    x = end;
  }
  return 0;
}

Status Terrain::Validate() const {
  std::ostringstream why;
  if (kind == TerrainKind::kSlope && !(std::abs(slope_deg) < 45.0)) {
    why << "Terrain::slope_deg = " << slope_deg << ", must be in (-45, 45)";
  } else if (!(width_m > 0) || !std::isfinite(width_m)) {
    why << "Terrain::width_m = " << width_m << ", must be > 0";
  } else if (!(extent_m > 0) || !std::isfinite(extent_m)) {
    why << "Terrain::extent_m = " << extent_m << ", must be > 0";
  } else if (!std::isfinite(start_x_m)) {
    why << "Terrain::start_x_m = " << start_x_m << ", must be finite";
  }
  for (size_t i = 0; why.tellp() == 0 && i < segments.size(); ++i) {
    const auto& s = segments[i];
    const std::string name = "Terrain::segments[" + std::to_string(i) + "]";
    if (!std::isfinite(s.height_m) || std::abs(s.height_m) > 10) {
      why << name << ".height_m = " << s.height_m << ", must be within [-10, 10]";
    } else if (s.kind == SegmentKind::kCurb && s.length_m != 0) {
      why << name << ".length_m = " << s.length_m << ", must be 0 for a curb";
    } else if (s.kind != SegmentKind::kCurb && !(s.length_m > 0 && std::isfinite(s.length_m))) {
      why << name << ".length_m = " << s.length_m << ", must be > 0";
    } else if (s.kind == SegmentKind::kRamp && std::abs(s.height_m) >= s.length_m) {
      why << name << ".height_m = " << s.height_m << ", a ramp must be less steep than 45 degrees";
    }
  }
  for (size_t i = 0; why.tellp() == 0 && i < friction_regions.size(); ++i) {
    const auto& r = friction_regions[i];
    const std::string name = "Terrain::friction_regions[" + std::to_string(i) + "]";
    if (!(r.end_x_m > r.start_x_m) || !std::isfinite(r.start_x_m) || !std::isfinite(r.end_x_m)) {
      why << name << ".end_x_m = " << r.end_x_m << ", must be finite and > start_x_m = "
          << r.start_x_m;
    } else if (!(r.friction >= 0 && r.friction <= 3)) {
      why << name << ".friction = " << r.friction << ", must be in [0, 3]";
    }
  }
  if (why.tellp() == 0 && kind == TerrainKind::kProfile) {
    const double triangles = ProfileMeshTriangles(*this, kFinestMeshCell_m);
    if (!(triangles <= kMaxGroundTriangles)) {
      why << "Terrain: the profile's ground mesh would hold " << std::fixed << std::setprecision(0)
          << triangles << " triangles at " << std::defaultfloat << std::setprecision(6)
          << kFinestMeshCell_m << " m cells (from " << (std::min(start_x_m, 0.0) - extent_m / 4)
          << " m to " << extent_m << " m past its end, " << width_m
          << " m wide); the physics engine holds at most " << std::fixed << std::setprecision(0)
          << kMaxGroundTriangles << " (2^21 - 1): shorten the profile or narrow it";
    }
  }
  if (why.tellp() == 0) return {};
  return Failure(why.str());
}

std::vector<std::pair<double, double>> ProfilePolyline(const Terrain& t, double max_piece_m) {
  std::vector<std::pair<double, double>> pts;
  const double x_begin = std::min(t.start_x_m, 0.0) - t.extent_m / 4;
  const double x_end = ProfileEnd(t) + t.extent_m;
  // Flat lead-in split into pieces no longer than max_piece_m, so triangles stay of similar size.
  auto add_line_to = [&](double x1, double z1) {
    const auto [x0, z0] = pts.back();
    const int n = static_cast<int>(PiecesFor(std::hypot(x1 - x0, z1 - z0), max_piece_m, 1));
    for (int i = 1; i <= n; ++i) pts.emplace_back(x0 + (x1 - x0) * i / n, z0 + (z1 - z0) * i / n);
  };
  pts.emplace_back(x_begin, 0.0);
  add_line_to(t.start_x_m, 0.0);
  double x = t.start_x_m, z = 0;
  for (const auto& s : t.segments) {
    switch (s.kind) {
      case SegmentKind::kCurb:
        z += s.height_m;
        pts.emplace_back(x, z);
        break;
      case SegmentKind::kRamp:
        x += s.length_m;
        z += s.height_m;
        add_line_to(x, z);
        break;
      case SegmentKind::kPlateau:
        x += s.length_m;
        add_line_to(x, z);
        break;
      case SegmentKind::kBump: {
        // The bump's arc is at most L √(1 + (π h / L)²) long (its steepest slope is π h / L).
        const double arc_m = std::hypot(s.length_m, std::numbers::pi * s.height_m);
        const int n = static_cast<int>(PiecesFor(arc_m, max_piece_m, 16));
        for (int i = 1; i <= n; ++i) {
          const double u = static_cast<double>(i) / n;
          pts.emplace_back(x + u * s.length_m, z + s.height_m * BumpShape(u));
        }
        x += s.length_m;
        break;
      }
    }
  }
  add_line_to(x_end, z);
  return pts;
}

const char* ToString(TerrainKind kind) {
  switch (kind) {
    case TerrainKind::kFlat: return "flat";
    case TerrainKind::kSlope: return "slope";
    case TerrainKind::kProfile: return "profile";
  }
  return "?";
}

const char* ToString(SegmentKind kind) {
  switch (kind) {
    case SegmentKind::kRamp: return "ramp";
    case SegmentKind::kPlateau: return "plateau";
    case SegmentKind::kBump: return "bump";
    case SegmentKind::kCurb: return "curb";
  }
  return "?";
}

bool FromString(const std::string& text, TerrainKind* kind) {
  for (auto k : {TerrainKind::kFlat, TerrainKind::kSlope, TerrainKind::kProfile}) {
    if (text == ToString(k)) {
      *kind = k;
      return true;
    }
  }
  return false;
}

bool FromString(const std::string& text, SegmentKind* kind) {
  for (auto k : {SegmentKind::kRamp, SegmentKind::kPlateau, SegmentKind::kBump, SegmentKind::kCurb}) {
    if (text == ToString(k)) {
      *kind = k;
      return true;
    }
  }
  return false;
}

}  // namespace upright::sim

// Terrain: the ground the robot drives on, described along the world x axis, and friction
// regions (wet or icy patches) over x-ranges. The plant turns this description into colliders.
#pragma once

#include <string>
#include <vector>

#include "upright/base/result.hpp"

namespace upright::sim {

enum class TerrainKind {
  kFlat,     // the plane z = 0
  kSlope,    // the plane z = x · tan(slope), uphill toward +x when slope_deg > 0
  kProfile,  // flat until start_x_m, then the segments, then flat again; a triangle mesh
};

enum class SegmentKind {
  kRamp,     // straight rise of `height_m` (negative: descent) over `length_m`
  kPlateau,  // level stretch of `length_m`
  kBump,     // raised-cosine bump of `height_m` over `length_m`, back to the same level
  kCurb,     // vertical step of `height_m` (negative: step down); length_m must be 0
};

struct ProfileSegment {
  SegmentKind kind = SegmentKind::kPlateau;
  double length_m = 0;  // along x
  double height_m = 0;  // rise at its end (ramp, curb) or peak (bump)
};

// A stretch of ground where the tyre–ground friction coefficient is `friction` instead of the
// robot's dry value.
struct FrictionRegion {
  double start_x_m = 0;
  double end_x_m = 0;  // > start_x_m
  double friction = 0.5;
};

struct Terrain {
  TerrainKind kind = TerrainKind::kFlat;
  double slope_deg = 0;                 // kSlope only; in (-45, 45)
  double start_x_m = 1;                 // kProfile: where the first segment begins
  std::vector<ProfileSegment> segments; // kProfile: in order along +x
  double extent_m = 200;                // kProfile: mesh spans [-extent/4, end of profile + extent]
  double width_m = 6;                   // kProfile: mesh spans y in [-width/2, width/2]
  std::vector<FrictionRegion> friction_regions;

  // Ground height at x (the profile is a function of x; at a curb, the height after the step).
  double HeightAt(double x_m) const;
  // Ground slope dz/dx at x (0 at a curb's vertical face).
  double SlopeAt(double x_m) const;
  // The first broken rule, naming the field and value ("Terrain::slope_deg = 50, must be in
  // (-45, 45)"); success when there is none.
  Status Validate() const;
};

// The size of a profile mesh's cells for a wheel of `wheel_radius_m`: four radii, within
// [kFinestMeshCell_m, 1] m, so a wheel spans few triangles at once.
inline constexpr double kFinestMeshCell_m = 0.2;
double MeshCellFor(double wheel_radius_m);

// The physics engine's limit on a triangle mesh: its quantized bounding-volume tree keeps 10 of
// a node's 31 index bits for the mesh part, leaving "at most 2^21 (2097152) (minus one)"
// triangles (Bullet 3.24, BulletCollision/BroadphaseCollision/btQuantizedBvh.h).
inline constexpr double kMaxGroundTriangles = 2097151;  // 2^21 − 1

// The triangles of a profile terrain's mesh at cells of `mesh_cell_m` (two per cell), counted in
// doubles without building it, so a huge profile gives a huge count rather than an overflow.
double ProfileMeshTriangles(const Terrain& terrain, double mesh_cell_m);

// The (x, z) polyline of a profile terrain, from -extent/4 to its end + extent; bumps are
// subdivided so no piece is longer than `max_piece_m`. Exposed for the mesh builder and tests.
std::vector<std::pair<double, double>> ProfilePolyline(const Terrain& terrain, double max_piece_m);

const char* ToString(TerrainKind kind);
const char* ToString(SegmentKind kind);
bool FromString(const std::string& text, TerrainKind* kind);
bool FromString(const std::string& text, SegmentKind* kind);

}  // namespace upright::sim

#include "upright/sim/terrain.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <numbers>
#include <string>
#include <utility>
#include <vector>

#include "succeeded.hpp"
#include "upright/model/conventions.hpp"

namespace upright::sim {
namespace {

double Tan(double deg) { return std::tan(deg * std::numbers::pi / 180.0); }

// Profile from x = 1: ramp up 0.2 over 2 m (to x = 3), plateau 1 m (to 4), bump of 0.1 over 1 m
// (to 5), curb down 0.05 (at 5), plateau 1 m (to 6). Final level 0.2 − 0.05 = 0.15.
Terrain MakeProfile() {
  Terrain t;
  t.kind = TerrainKind::kProfile;
  t.start_x_m = 1;
  t.segments = {{SegmentKind::kRamp, 2, 0.2},
                {SegmentKind::kPlateau, 1, 0},
                {SegmentKind::kBump, 1, 0.1},
                {SegmentKind::kCurb, 0, -0.05},
                {SegmentKind::kPlateau, 1, 0}};
  t.extent_m = 8;
  return t;
}

TEST(Terrain, FlatGroundIsLevelEverywhere) {
  const Terrain t;
  for (double x : {-100.0, 0.0, 3.7, 1e4}) {
    EXPECT_EQ(t.HeightAt(x), 0);
    EXPECT_EQ(t.SlopeAt(x), 0);
  }
}

TEST(Terrain, SlopeRisesByTheTangentOfItsAngle) {
  Terrain t;
  t.kind = TerrainKind::kSlope;
  t.slope_deg = 10;
  // z = x tan θ (plane geometry).
  EXPECT_NEAR(t.HeightAt(0), 0, 1e-15);
  EXPECT_NEAR(t.HeightAt(2), 2 * Tan(10), 1e-12);
  EXPECT_NEAR(t.HeightAt(-3), -3 * Tan(10), 1e-12);
  EXPECT_NEAR(t.SlopeAt(5), Tan(10), 1e-12);
  t.slope_deg = -20;
  EXPECT_NEAR(t.HeightAt(1), -Tan(20), 1e-12);
  EXPECT_NEAR(t.SlopeAt(1), -Tan(20), 1e-12);
}

TEST(Terrain, ProfileIsFlatBeforeItsStart) {
  const Terrain t = MakeProfile();
  EXPECT_EQ(t.HeightAt(-5), 0);
  EXPECT_EQ(t.HeightAt(0.999), 0);
  EXPECT_EQ(t.SlopeAt(0.5), 0);
}

TEST(Terrain, RampRisesLinearly) {
  const Terrain t = MakeProfile();
  EXPECT_NEAR(t.HeightAt(1.0), 0, 1e-12);
  EXPECT_NEAR(t.HeightAt(1.5), 0.05, 1e-12);  // a quarter of the way: 0.2 / 4
  EXPECT_NEAR(t.HeightAt(2.0), 0.1, 1e-12);
  EXPECT_NEAR(t.SlopeAt(1.5), 0.1, 1e-12);  // rise / run = 0.2 / 2
  EXPECT_NEAR(t.SlopeAt(2.9), 0.1, 1e-12);
}

TEST(Terrain, PlateauHoldsTheLevelReached) {
  const Terrain t = MakeProfile();
  EXPECT_NEAR(t.HeightAt(3.0), 0.2, 1e-12);
  EXPECT_NEAR(t.HeightAt(3.5), 0.2, 1e-12);
  EXPECT_EQ(t.SlopeAt(3.5), 0);
}

TEST(Terrain, BumpIsARaisedCosineWithItsPeakAtMidLength) {
  const Terrain t = MakeProfile();
  // z = z0 + h (1 − cos(2π u)) / 2 over u ∈ [0, 1] (raised cosine, from its definition);
  // dz/dx = h π sin(2π u) / L.
  EXPECT_NEAR(t.HeightAt(4.0), 0.2, 1e-12);
  EXPECT_NEAR(t.HeightAt(4.25), 0.2 + 0.05, 1e-12);
  EXPECT_NEAR(t.HeightAt(4.5), 0.3, 1e-12);
  EXPECT_NEAR(t.HeightAt(4.75), 0.25, 1e-12);
  EXPECT_NEAR(t.SlopeAt(4.25), 0.1 * std::numbers::pi, 1e-12);
  EXPECT_NEAR(t.SlopeAt(4.5), 0, 1e-12);
  EXPECT_NEAR(t.SlopeAt(4.75), -0.1 * std::numbers::pi, 1e-12);
  for (double x = 4.0; x < 5.0; x += 0.01) {
    EXPECT_LE(t.HeightAt(x), 0.3 + 1e-12);
    EXPECT_GE(t.HeightAt(x), 0.2 - 1e-12);
  }
}

TEST(Terrain, CurbStepsAtItsPositionAndHasNoSlope) {
  const Terrain t = MakeProfile();
  EXPECT_NEAR(t.HeightAt(4.9999), 0.2, 1e-6);
  EXPECT_NEAR(t.HeightAt(5.0), 0.15, 1e-12);  // the height after the step at the face
  EXPECT_NEAR(t.HeightAt(5.5), 0.15, 1e-12);
  EXPECT_EQ(t.SlopeAt(5.0), 0);
  EXPECT_NEAR(t.HeightAt(100), 0.15, 1e-12);  // flat again after the profile
  EXPECT_EQ(t.SlopeAt(100), 0);
}

TEST(Terrain, DescendingRampAndCurbUp) {
  Terrain t;
  t.kind = TerrainKind::kProfile;
  t.start_x_m = 0;
  t.segments = {{SegmentKind::kCurb, 0, 0.1}, {SegmentKind::kRamp, 1, -0.3}};
  EXPECT_NEAR(t.HeightAt(0.0), 0.1, 1e-12);
  EXPECT_NEAR(t.HeightAt(0.5), 0.1 - 0.15, 1e-12);
  EXPECT_NEAR(t.SlopeAt(0.5), -0.3, 1e-12);
  EXPECT_NEAR(t.HeightAt(2.0), -0.2, 1e-12);
}

// Pieces of a polyline as (dx, length).
std::vector<std::pair<double, double>> Pieces(const std::vector<std::pair<double, double>>& pts) {
  std::vector<std::pair<double, double>> pieces;
  for (size_t i = 1; i < pts.size(); ++i) {
    const double dx = pts[i].first - pts[i - 1].first;
    const double dz = pts[i].second - pts[i - 1].second;
    pieces.emplace_back(dx, std::hypot(dx, dz));
  }
  return pieces;
}

TEST(Terrain, PolylineCoversTheExtentAndEndsAtTheFinalLevel) {
  const Terrain t = MakeProfile();
  const auto pts = ProfilePolyline(t, 0.25);
  ASSERT_GE(pts.size(), 2u);
  // From min(start, 0) − extent/4 = −2 to the profile end 6 + extent 8 = 14 (header contract).
  EXPECT_NEAR(pts.front().first, -2.0, 1e-12);
  EXPECT_NEAR(pts.front().second, 0.0, 1e-12);
  EXPECT_NEAR(pts.back().first, 14.0, 1e-12);
  EXPECT_NEAR(pts.back().second, 0.15, 1e-12);
  for (size_t i = 1; i < pts.size(); ++i) {
    EXPECT_GE(pts[i].first, pts[i - 1].first) << "x goes backwards at vertex " << i;
  }
}

TEST(Terrain, PolylineVerticesLieOnTheGround) {
  const Terrain t = MakeProfile();
  const auto pts = ProfilePolyline(t, 0.25);
  for (size_t i = 0; i < pts.size(); ++i) {
    const auto [x, z] = pts[i];
    if (std::abs(x - 5.0) < 1e-12) continue;  // the curb face has two vertices at one x
    EXPECT_NEAR(z, t.HeightAt(x), 1e-9) << "vertex " << i << " at x = " << x;
  }
}

TEST(Terrain, PolylineOnlyVerticalPieceIsTheCurb) {
  const Terrain t = MakeProfile();
  const auto pts = ProfilePolyline(t, 0.25);
  int vertical = 0;
  for (size_t i = 1; i < pts.size(); ++i) {
    if (pts[i].first == pts[i - 1].first) {
      ++vertical;
      EXPECT_NEAR(pts[i].first, 5.0, 1e-12);
      EXPECT_NEAR(pts[i].second - pts[i - 1].second, -0.05, 1e-12);
    }
  }
  EXPECT_EQ(vertical, 1);
}

TEST(Terrain, PolylinePiecesRunNoFurtherThanAsked) {
  const Terrain t = MakeProfile();
  for (double max_piece : {1.0, 0.25, 0.07}) {
    for (const auto& [dx, length] : Pieces(ProfilePolyline(t, max_piece))) {
      EXPECT_LE(dx, max_piece * (1 + 1e-12)) << "max_piece " << max_piece;
    }
  }
}

TEST(Terrain, PolylinePiecesOfASteepRampAreNoLongerThanAsked) {
  // The header promises no piece longer than max_piece_m. A 40° ramp (rise 0.839 over 1 m) split
  // by its run alone gives pieces 1 / cos 40° = 1.31 times longer than their run (trigonometry).
  Terrain t;
  t.kind = TerrainKind::kProfile;
  t.start_x_m = 0;
  t.segments = {{SegmentKind::kRamp, 1, Tan(40)}};
  t.extent_m = 2;
  for (const auto& [dx, length] : Pieces(ProfilePolyline(t, 0.25))) {
    EXPECT_LE(length, 0.25 * (1 + 1e-12)) << "piece with run " << dx;
  }
}

TEST(Terrain, ValidTerrainsPass) {
  EXPECT_TRUE(Succeeded(Terrain().Validate()));
  EXPECT_TRUE(Succeeded(MakeProfile().Validate()));
  Terrain slope;
  slope.kind = TerrainKind::kSlope;
  slope.slope_deg = -44.9;
  EXPECT_TRUE(Succeeded(slope.Validate()));
}

struct BadTerrain {
  const char* what;
  Terrain terrain;
  const char* expected_text;  // the field and its value as the message must show them
};

TEST(Terrain, ValidateNamesTheBrokenFieldAndItsValue) {
  const double nan = std::numeric_limits<double>::quiet_NaN();
  std::vector<BadTerrain> cases;
  Terrain t;
  t.kind = TerrainKind::kSlope;
  t.slope_deg = 50;
  cases.push_back({"steep slope", t, "Terrain::slope_deg = 50"});
  t.slope_deg = -45;
  cases.push_back({"slope at -45", t, "Terrain::slope_deg = -45"});
  t = MakeProfile();
  t.width_m = 0;
  cases.push_back({"width", t, "Terrain::width_m = 0"});
  t = MakeProfile();
  t.extent_m = -1;
  cases.push_back({"extent", t, "Terrain::extent_m = -1"});
  t = MakeProfile();
  t.start_x_m = nan;
  cases.push_back({"start", t, "Terrain::start_x_m = nan"});
  t = MakeProfile();
  t.segments[3].length_m = 0.1;
  cases.push_back({"curb with length", t, "Terrain::segments[3].length_m = 0.1"});
  t = MakeProfile();
  t.segments[1].length_m = 0;
  cases.push_back({"plateau of no length", t, "Terrain::segments[1].length_m = 0"});
  t = MakeProfile();
  t.segments[2].length_m = -2;
  cases.push_back({"bump of negative length", t, "Terrain::segments[2].length_m = -2"});
  t = MakeProfile();
  t.segments[0].height_m = 2;
  cases.push_back({"ramp steeper than 45 deg", t, "Terrain::segments[0].height_m = 2"});
  t = MakeProfile();
  t.segments[3].height_m = 11;
  cases.push_back({"curb too high", t, "Terrain::segments[3].height_m = 11"});
  t = MakeProfile();
  t.segments[2].height_m = nan;
  cases.push_back({"bump height nan", t, "Terrain::segments[2].height_m = nan"});
  t = Terrain();
  t.friction_regions = {{0, 1, 0.5}, {3, 2, 0.5}};
  cases.push_back({"region backwards", t, "Terrain::friction_regions[1].end_x_m = 2"});
  t.friction_regions = {{2, 2, 0.5}};
  cases.push_back({"region empty", t, "Terrain::friction_regions[0].end_x_m = 2"});
  t.friction_regions = {{0, 1, -0.1}};
  cases.push_back({"negative friction", t, "Terrain::friction_regions[0].friction = -0.1"});
  t.friction_regions = {{0, 1, 3.5}};
  cases.push_back({"friction too high", t, "Terrain::friction_regions[0].friction = 3.5"});
  t.friction_regions = {{0, 1, nan}};
  cases.push_back({"friction nan", t, "Terrain::friction_regions[0].friction = nan"});
  for (const BadTerrain& c : cases) {
    const Status valid = c.terrain.Validate();
    ASSERT_FALSE(valid.has_value()) << c.what;
    const std::string& error = valid.error();
    EXPECT_NE(error.find(c.expected_text), std::string::npos)
        << c.what << ": message '" << error << "' lacks '" << c.expected_text << "'";
  }
}

TEST(Terrain, FrictionRegionOfZeroFrictionIsValid) {
  Terrain t;
  t.friction_regions = {{-1, 1, 0.0}, {1, 2, 3.0}};
  EXPECT_TRUE(Succeeded(t.Validate()));
}

TEST(Terrain, KindNamesRoundTrip) {
  for (TerrainKind kind : {TerrainKind::kFlat, TerrainKind::kSlope, TerrainKind::kProfile}) {
    TerrainKind parsed = kind == TerrainKind::kFlat ? TerrainKind::kSlope : TerrainKind::kFlat;
    ASSERT_TRUE(FromString(ToString(kind), &parsed)) << ToString(kind);
    EXPECT_EQ(parsed, kind);
  }
  for (SegmentKind kind :
       {SegmentKind::kRamp, SegmentKind::kPlateau, SegmentKind::kBump, SegmentKind::kCurb}) {
    SegmentKind parsed = kind == SegmentKind::kRamp ? SegmentKind::kCurb : SegmentKind::kRamp;
    ASSERT_TRUE(FromString(ToString(kind), &parsed)) << ToString(kind);
    EXPECT_EQ(parsed, kind);
  }
  TerrainKind terrain = TerrainKind::kSlope;
  SegmentKind segment = SegmentKind::kBump;
  EXPECT_FALSE(FromString("Flat", &terrain));
  EXPECT_FALSE(FromString("stairs", &segment));
  EXPECT_FALSE(FromString("", &segment));
  EXPECT_EQ(terrain, TerrainKind::kSlope);
  EXPECT_EQ(segment, SegmentKind::kBump);
}

}  // namespace
}  // namespace upright::sim

namespace upright::sim {
namespace {

// A level profile 1 m wide (five 0.2 m cells across) from x = 1 with one plateau `length_m`
// long; extent 200 m, so the mesh runs from −50 m.
Terrain LongPlateau(double length_m) {
  Terrain t;
  t.kind = TerrainKind::kProfile;
  t.start_x_m = 1;
  t.width_m = 1;
  t.segments = {{SegmentKind::kPlateau, length_m, 0}};
  return t;
}

TEST(Terrain, MeshTriangleCountIsTheBuiltMeshs) {
  // Two triangles per cell: (polyline vertices − 1) × cells across, for every kind of segment.
  for (const double cell : {1.0, 0.25, 0.07}) {
    const Terrain t = MakeProfile();
    const double across = std::ceil(t.width_m / cell);
    EXPECT_EQ(ProfileMeshTriangles(t, cell),
              2 * static_cast<double>(ProfilePolyline(t, cell).size() - 1) * across)
        << "cell " << cell;
  }
  EXPECT_EQ(MeshCellFor(0.02), kFinestMeshCell_m);  // a small wheel: the finest cell
  EXPECT_EQ(MeshCellFor(0.1), 0.4);
  EXPECT_EQ(MeshCellFor(0.5), 1.0);
}

TEST(Terrain, RefusesAGroundBeyondThePhysicsEnginesMeshLimit) {
  // Vertices at 0.2 m: 255 over the 51 m lead-in, 208460 over the plateau, 1000 over the 200 m
  // extent, so 2 × 209715 × 5 = 2097150 triangles, the most below 2^21 − 1 = 2097151
  // (btQuantizedBvh.h); a plateau one cell longer makes 2097160.
  const Terrain at_limit = LongPlateau(41691.99);
  EXPECT_EQ(ProfileMeshTriangles(at_limit, kFinestMeshCell_m), 2097150);
  EXPECT_TRUE(Succeeded(at_limit.Validate()));
  const Terrain over = LongPlateau(41692.19);
  EXPECT_EQ(ProfileMeshTriangles(over, kFinestMeshCell_m), 2097160);
  const std::string why = FailureOf(over.Validate());
  EXPECT_NE(why.find("would hold 2097160 triangles at 0.2 m cells"), std::string::npos) << why;
  EXPECT_NE(why.find("at most 2097151 (2^21 - 1)"), std::string::npos) << why;
  // Far beyond: no overflow on the way to the count, and refused.
  EXPECT_FALSE(LongPlateau(70000).Validate());
  Terrain wide = LongPlateau(1);
  wide.width_m = 2000;
  EXPECT_FALSE(wide.Validate());
  EXPECT_FALSE(LongPlateau(1e300).Validate());
}

}  // namespace
}  // namespace upright::sim

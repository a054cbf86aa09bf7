#include "world.hpp"

#include <BulletCollision/CollisionDispatch/btInternalEdgeUtility.h>
#include <BulletCollision/CollisionShapes/btTriangleInfoMap.h>
#include <BulletDynamics/Featherstone/btMultiBody.h>
#include <BulletDynamics/Featherstone/btMultiBodyConstraintSolver.h>
#include <BulletDynamics/Featherstone/btMultiBodyDynamicsWorld.h>
#include <BulletDynamics/Featherstone/btMultiBodyLinkCollider.h>
#include <btBulletDynamicsCommon.h>

#include <cmath>
#include <mutex>
#include <numbers>

#include "upright/model/check.hpp"
#include "upright/model/conventions.hpp"

namespace upright::sim::internal {
namespace {

constexpr int kGroundTag = 0x6a0d;  // user index marking our ground object

const GroundData* GroundOf(const btCollisionObject* object) {
  if (object->getUserIndex() != kGroundTag) return nullptr;
  return static_cast<const GroundData*>(object->getUserPointer());
}

// The one process-wide contact callback: friction regions and mesh internal-edge correction.
// Only the ground carries CF_CUSTOM_MATERIAL_CALLBACK, so every call involves a ground.
bool OnContactAdded(btManifoldPoint& cp, const btCollisionObjectWrapper* wrap0, int part0,
                    int index0, const btCollisionObjectWrapper* wrap1, int part1, int index1) {
  const GroundData* ground = GroundOf(wrap0->getCollisionObject());
  const bool ground_first = ground != nullptr;
  if (!ground_first) ground = GroundOf(wrap1->getCollisionObject());
  if (ground == nullptr) return false;
  if (ground->is_mesh) {
    if (ground_first) {
      btAdjustInternalEdgeContacts(cp, wrap0, wrap1, part0, index0);
    } else {
      btAdjustInternalEdgeContacts(cp, wrap1, wrap0, part1, index1);
    }
  }
  if (!ground->regions.empty()) {
    const btCollisionObject* other =
        ground_first ? wrap1->getCollisionObject() : wrap0->getCollisionObject();
    const double x = 0.5 * (cp.m_positionWorldOnA.x() + cp.m_positionWorldOnB.x());
    cp.m_combinedFriction = ground->FrictionAt(x, other->getFriction());
  }
  return true;
}

// Bullet's process-wide settings, set once before the first world: no sleeping anywhere, and our
// contact callback. Nothing else in the core keeps mutable simulation state, so one world per
// thread is safe afterwards.
void InitBulletGlobals() {
  static std::once_flag once;
  std::call_once(once, [] {
    gDisableDeactivation = true;
    gContactAddedCallback = &OnContactAdded;
  });
}

}  // namespace

double GroundData::FrictionAt(double x_m, double body_friction) const {
  for (const auto& r : regions) {
    if (x_m >= r.start_x_m && x_m < r.end_x_m) return r.friction;
  }
  return body_friction;
}

World::World(double dt_s, int solver_iterations) : dt_s_(dt_s) {
  InitBulletGlobals();
  // Small object pools: one robot meets one ground in a handful of manifolds, and a pool that
  // runs out falls back to the heap (checked: pools of 2 carry 23 manifolds). Bullet's defaults
  // (4096 of each) cost a 7 MB allocation and its clearing on every world: 90 % of building one.
  btDefaultCollisionConstructionInfo pools;
  pools.m_defaultMaxPersistentManifoldPoolSize = 64;
  pools.m_defaultMaxCollisionAlgorithmPoolSize = 64;
  config_ = std::make_unique<btDefaultCollisionConfiguration>(pools);
  dispatcher_ = std::make_unique<btCollisionDispatcher>(config_.get());
  broadphase_ = std::make_unique<btDbvtBroadphase>();
  solver_ = std::make_unique<btMultiBodyConstraintSolver>();
  world_ = std::make_unique<btMultiBodyDynamicsWorld>(dispatcher_.get(), broadphase_.get(),
                                                      solver_.get(), config_.get());
  world_->setGravity(btVector3(0, 0, -model::kStandardGravity_m_s2));
  world_->getSolverInfo().m_numIterations = solver_iterations;
  world_->getDispatchInfo().m_deterministicOverlappingPairs = true;
}

World::~World() {
  for (int i = world_->getNumMultiBodyConstraints() - 1; i >= 0; --i) {
    world_->removeMultiBodyConstraint(world_->getMultiBodyConstraint(i));
  }
  for (int i = world_->getNumMultibodies() - 1; i >= 0; --i) {
    world_->removeMultiBody(world_->getMultiBody(i));
  }
  for (int i = world_->getNumCollisionObjects() - 1; i >= 0; --i) {
    world_->removeCollisionObject(world_->getCollisionObjectArray()[i]);
  }
  world_.reset();
}

void World::AddGround(const Terrain& terrain, double mesh_cell_m) {
  ground_data_.regions = terrain.friction_regions;
  ground_data_.is_mesh = terrain.kind == TerrainKind::kProfile;
  if (terrain.kind == TerrainKind::kProfile) {
    // A strip of quads along the profile polyline, split across y into cells of about the
    // same size as along x, two triangles each.
    const auto line = ProfilePolyline(terrain, mesh_cell_m);
    const int ny = std::max(1, static_cast<int>(std::ceil(terrain.width_m / mesh_cell_m)));
    const int nx = static_cast<int>(line.size());
    mesh_vertices_.clear();
    mesh_indices_.clear();
    for (const auto& [x, z] : line) {
      for (int j = 0; j <= ny; ++j) {
        mesh_vertices_.insert(mesh_vertices_.end(),
                              {x, -terrain.width_m / 2 + terrain.width_m * j / ny, z});
      }
    }
    for (int i = 0; i + 1 < nx; ++i) {
      for (int j = 0; j < ny; ++j) {
        const int a = i * (ny + 1) + j, b = a + 1, c = a + (ny + 1), d = c + 1;
        // Counter-clockwise seen from above: normals point up (+z) on level ground.
        mesh_indices_.insert(mesh_indices_.end(), {a, c, d, a, d, b});
      }
    }
    auto* arrays = new btTriangleIndexVertexArray(
        static_cast<int>(mesh_indices_.size() / 3), mesh_indices_.data(), 3 * sizeof(int),
        nx * (ny + 1), mesh_vertices_.data(), 3 * sizeof(double));
    mesh_arrays_.reset(arrays);
    auto mesh = std::make_unique<btBvhTriangleMeshShape>(arrays, true);
    // A small margin lets a wheel resting exactly on the mesh touch it from the first step
    // (sphere–triangle contacts otherwise appear only once the sphere penetrates).
    mesh->setMargin(1e-4);
    triangle_info_ = std::make_unique<btTriangleInfoMap>();
    btGenerateInternalEdgeInfo(mesh.get(), triangle_info_.get());
    ground_shape_ = std::move(mesh);
  } else {
    const double slope =
        terrain.kind == TerrainKind::kSlope ? terrain.slope_deg * std::numbers::pi / 180 : 0;
    // The plane z = x tan(slope): unit normal (−sin, 0, cos) through the origin.
    ground_shape_ = std::make_unique<btStaticPlaneShape>(
        btVector3(-std::sin(slope), 0, std::cos(slope)), 0.0);
  }
  ground_object_ = std::make_unique<btCollisionObject>();
  ground_object_->setCollisionShape(ground_shape_.get());
  ground_object_->setFriction(1.0);
  ground_object_->setRestitution(0.0);
  ground_object_->setRollingFriction(0.0);
  ground_object_->setSpinningFriction(0.0);
  ground_object_->setUserIndex(kGroundTag);
  ground_object_->setUserPointer(&ground_data_);
  ground_object_->setCollisionFlags(ground_object_->getCollisionFlags() |
                                    btCollisionObject::CF_STATIC_OBJECT |
                                    btCollisionObject::CF_CUSTOM_MATERIAL_CALLBACK);
  world_->addCollisionObject(ground_object_.get(), btBroadphaseProxy::StaticFilter,
                             btBroadphaseProxy::AllFilter ^ btBroadphaseProxy::StaticFilter);
}

void World::Step() {
  // Exactly one internal step of dt: no sub-stepping, no interpolation.
  const int steps = world_->stepSimulation(dt_s_, 0, dt_s_);
  UPRIGHT_CHECK(steps == 1, "Bullet took %d internal steps instead of 1", steps);
}

}  // namespace upright::sim::internal

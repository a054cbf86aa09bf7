// World (internal): one headless Bullet multibody world configured the way every run needs it —
// fixed step, deterministic pair order, no sleeping — plus the ground built from a Terrain with
// its friction regions. The plant and the physics validation tests build on this.
#pragma once

#include <memory>
#include <vector>

#include "upright/sim/terrain.hpp"

class btBroadphaseInterface;
class btCollisionDispatcher;
class btCollisionObject;
class btCollisionShape;
class btDefaultCollisionConfiguration;
class btMultiBodyConstraintSolver;
class btMultiBodyDynamicsWorld;
class btTriangleIndexVertexArray;
struct btTriangleInfoMap;

namespace upright::sim::internal {

// What the contact callback needs to know about the ground; stored on its user pointer.
struct GroundData {
  std::vector<FrictionRegion> regions;
  bool is_mesh = false;
  // The friction coefficient at world x for a body whose own coefficient is `body_friction`.
  double FrictionAt(double x_m, double body_friction) const;
};

class World {
 public:
  World(double dt_s, int solver_iterations);
  ~World();
  World(const World&) = delete;
  World& operator=(const World&) = delete;

  // Adds the ground for `terrain` (friction 1, so a body's own friction coefficient is the
  // effective one, except inside friction regions). `mesh_cell_m` sizes the mesh triangles.
  void AddGround(const Terrain& terrain, double mesh_cell_m);
  // One fixed step of dt_s.
  void Step();

  btMultiBodyDynamicsWorld& bt() { return *world_; }
  const btCollisionObject* ground() const { return ground_object_.get(); }
  double dt_s() const { return dt_s_; }

  // Keeps an object (shape, collider, multibody) alive until the world is gone; the destructor
  // removes everything from the world before freeing it.
  template <typename T>
  T* Own(std::unique_ptr<T> object) {
    T* raw = object.get();
    owned_.push_back(std::shared_ptr<void>(std::move(object)));
    return raw;
  }

 private:
  double dt_s_;
  std::unique_ptr<btDefaultCollisionConfiguration> config_;
  std::unique_ptr<btCollisionDispatcher> dispatcher_;
  std::unique_ptr<btBroadphaseInterface> broadphase_;
  std::unique_ptr<btMultiBodyConstraintSolver> solver_;
  std::unique_ptr<btMultiBodyDynamicsWorld> world_;
  // Ground storage (kept alive as long as the world).
  GroundData ground_data_;
  std::vector<double> mesh_vertices_;
  std::vector<int> mesh_indices_;
  std::unique_ptr<btTriangleIndexVertexArray> mesh_arrays_;
  std::unique_ptr<btTriangleInfoMap> triangle_info_;
  std::unique_ptr<btCollisionShape> ground_shape_;
  std::unique_ptr<btCollisionObject> ground_object_;
  std::vector<std::shared_ptr<void>> owned_;
};

}  // namespace upright::sim::internal

// Linear elasticity on 4-node and 10-node tetrahedra: materials, stiffness, constraints, loads,
// the CHOLMOD solver, stress recovery and superposition of unit load cases.
//
// Units: mm, N, MPa (= N/mm^2). Displacement vectors are 3 * n_nodes long, node-major
// (u[3*i + c], c = 0,1,2 for x,y,z). Voigt order for stress and strain: xx yy zz yz xz xy;
// strain shear components are engineering strains (gamma = 2 eps).
#pragma once

#include <Eigen/Core>
#include <Eigen/SparseCore>
#include <map>
#include <vector>

#include "sharpey/mesh/volume_mesh.h"

namespace sharpey::fem {

using Vector6d = Eigen::Matrix<double, 6, 1>;
using Matrix6d = Eigen::Matrix<double, 6, 6>;

struct Material {
  double young_modulus_mpa = 0;
  double poisson_ratio = 0;
};
// Region id -> material. Every region present in the mesh needs an entry (else InputError).
using MaterialTable = std::map<int, Material>;

// D: 6 x 6 isotropic elasticity matrix, MPa. Throws InputError for E <= 0 or nu outside (-1, 0.5).
Matrix6d elasticity_matrix(const Material& m);

// Element stiffness (3k x 3k, N/mm, k = 4 or 10) of element `e` of `mesh`.
Eigen::MatrixXd element_stiffness(const mesh::VolumeMesh& mesh, int e, const Matrix6d& D);

// Global stiffness K (3n x 3n, N/mm, full symmetric storage), assembled on all cores.
Eigen::SparseMatrix<double> assemble_stiffness(const mesh::VolumeMesh& mesh,
                                               const MaterialTable& materials);

// Prescribed displacement of one degree of freedom (component 0,1,2 = x,y,z), mm. Eliminated
// from the system, no penalty factors.
struct DofConstraint {
  int node = 0;
  int component = 0;
  double value_mm = 0;
};
// Fixes all three components of every node on faces carrying `marker`.
std::vector<DofConstraint> fix_faces(const mesh::VolumeMesh& mesh, int marker);

// ---- loads (all return a 3n nodal force vector, N) -------------------------------------------

// Force and moment (about `reference_point`) distributed over the faces with `marker` as statically
// equivalent nodal forces: a distributing coupling weighted by the consistent nodal areas.
// The resultant of the returned forces equals force_n and their moment about reference_point
// equals moment_nmm to round-off.
Eigen::VectorXd patch_load(const mesh::VolumeMesh& mesh, int marker,
                           const Eigen::Vector3d& force_n, const Eigen::Vector3d& moment_nmm,
                           const Eigen::Vector3d& reference_point);
// Uniform traction (MPa, a vector) on the faces with `marker`, consistently integrated.
Eigen::VectorXd traction_load(const mesh::VolumeMesh& mesh, int marker,
                              const Eigen::Vector3d& traction_mpa);
// Uniform pressure (MPa, positive pushes against the face normal given by the right-hand rule of the
// face's node order) on the faces with `marker`.
Eigen::VectorXd pressure_load(const mesh::VolumeMesh& mesh, int marker, double pressure_mpa);

// ---- solver ------------------------------------------------------------------------------------

struct SolverStatistics {
  int n_dofs = 0;            // free degrees of freedom
  long long n_nonzeros = 0;  // in the free-free block (upper triangle)
  double assembly_s = 0, analyse_s = 0, factorise_s = 0;
  double factorisation_gflop = 0;  // floating-point work of the numeric factorisation
  double last_solve_s = 0;
  double last_relative_residual = 0;  // ||K u - f|| / ||f|| over the free dofs
  std::string ordering;               // fill-reducing ordering CHOLMOD chose
};

// Assembles, eliminates the constraints and factorises once (CHOLMOD supernodal Cholesky);
// solve() then reuses the factorisation for any number of right-hand sides.
// Throws SolverError if the matrix is not positive definite (a region without material, a model
// not held against rigid motion), with the likely cause in the message.
class LinearElasticSolver {
 public:
  LinearElasticSolver(const mesh::VolumeMesh& mesh, const MaterialTable& materials,
                      std::vector<DofConstraint> constraints);
  ~LinearElasticSolver();
  LinearElasticSolver(const LinearElasticSolver&) = delete;
  LinearElasticSolver& operator=(const LinearElasticSolver&) = delete;

  // f: 3n nodal forces (N). Returns the 3n displacement (mm), constrained values included.
  Eigen::VectorXd solve(const Eigen::VectorXd& f) const;
  // Several right-hand sides at once (3n x m).
  Eigen::MatrixXd solve(const Eigen::MatrixXd& F) const;
  // Reactions r = K u - f (3n), nonzero only at constrained dofs for an exact solve.
  Eigen::VectorXd reactions(const Eigen::VectorXd& u, const Eigen::VectorXd& f) const;

  const SolverStatistics& statistics() const;
  const Eigen::SparseMatrix<double>& stiffness() const;  // full K, N/mm

 private:
  struct Impl;
  Impl* impl_;
};

// ---- recovery ----------------------------------------------------------------------------------

// Stress and strain per node of one region, from that region's elements only (no averaging
// across material interfaces). Nodal values are the average over the region's elements of the
// element field extrapolated from its quadrature points to the node.
struct RegionField {
  int region = 0;
  std::vector<int> nodes;                         // global node ids of the region
  Eigen::Matrix<double, 6, Eigen::Dynamic> stress_mpa;  // 6 x nodes.size(), Voigt
  Eigen::Matrix<double, 6, Eigen::Dynamic> strain;      // 6 x nodes.size(), Voigt, engineering shear
};
RegionField recover_region(const mesh::VolumeMesh& mesh, const MaterialTable& materials,
                           const Eigen::VectorXd& u, int region);

// Stress at the quadrature points of element e (6 x n_qp) and their physical positions (3 x n_qp).
void element_quadrature_stress(const mesh::VolumeMesh& mesh, int e, const Matrix6d& D,
                               const Eigen::VectorXd& u,
                               Eigen::Matrix<double, 6, Eigen::Dynamic>* stress_mpa,
                               Eigen::Matrix3Xd* points_mm);

// Scalar measures. Hydrostatic pressure p = -trace(sigma)/3, compression positive.
double hydrostatic_pressure_kpa(const Vector6d& stress_mpa);
double von_mises_mpa(const Vector6d& stress_mpa);
Eigen::Vector3d principal_stresses_mpa(const Vector6d& stress_mpa);  // descending
Eigen::Vector3d principal_strains(const Vector6d& strain);           // descending (tensor strains)
// Von Mises equivalent strain: sqrt(2/3 e_dev : e_dev) with tensor deviatoric strain.
double equivalent_strain(const Vector6d& strain);

// ---- superposition -----------------------------------------------------------------------------

// Six unit load cases at a bracket pad (unit forces along x, y, z in N and unit moments about
// x, y, z in N.mm, about `reference_point`), solved with one factorisation. Any other force
// system at the pad is their linear combination: displacement and region fields in milliseconds.
class UnitLoadBasis {
 public:
  UnitLoadBasis(const mesh::VolumeMesh& mesh, const MaterialTable& materials,
                const LinearElasticSolver& solver, int pad_marker,
                const Eigen::Vector3d& reference_point, int field_region);

  Eigen::VectorXd displacement(const Eigen::Vector3d& force_n, const Eigen::Vector3d& moment_nmm) const;
  RegionField region_field(const Eigen::Vector3d& force_n, const Eigen::Vector3d& moment_nmm) const;
  // Per-case displacement (3n x 6) and fields, for analyses that need the basis itself.
  const Eigen::MatrixXd& unit_displacements() const { return u_; }
  const std::vector<RegionField>& unit_fields() const { return fields_; }
  const Eigen::Vector3d& reference_point() const { return reference_point_; }

 private:
  Eigen::Vector3d reference_point_;
  Eigen::MatrixXd u_;
  std::vector<RegionField> fields_;
};

}  // namespace sharpey::fem

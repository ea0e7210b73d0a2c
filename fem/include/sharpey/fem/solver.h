// The linear-elastic solver: assembly, elimination of prescribed displacements and one CHOLMOD
// supernodal Cholesky factorisation reused for any number of right-hand sides.
#pragma once

#include <Eigen/Core>
#include <Eigen/SparseCore>
#include <memory>
#include <string>
#include <vector>

#include "sharpey/fem/assembly.h"
#include "sharpey/fem/material.h"
#include "sharpey/mesh/volume_mesh.h"

namespace sharpey::fem {

// Fill-reducing ordering of the free-free stiffness block.
enum class Ordering {
  kAuto,        // CHOLMOD's default: AMD, and METIS as well when AMD's fill is high; the better one
  kAmd,         // approximate minimum degree
  kMetis,       // METIS nested dissection
  kNesdis,      // CHOLMOD's own nested dissection (METIS partitions, constrained minimum degree)
  kMetisNodes,  // METIS nested dissection of the node graph (a third of the size of the dof
                // graph), each node's free dofs kept together; CHOLMOD postorders it
};
std::string to_string(Ordering ordering);  // "auto", "amd", "metis", "nesdis", "metis-nodes"

class SymbolicFactorisation;

struct SolverOptions {
  // Chosen by measurement on 10-node tooth and block meshes (docs/fem-solver.md).
  Ordering ordering = Ordering::kMetisNodes;
  // With kMetisNodes: the node ordering computed ahead by order_nodes() on the same mesh and
  // constraints (node ids in elimination order), used instead of ordering the nodes again; the
  // result is the same to the last bit. Empty: the solver orders the nodes itself.
  std::vector<int> node_order;
  // With kMetisNodes and no node_order: the ordering and symbolic factorisation computed ahead on
  // the same mesh and constraints (SymbolicFactorisation); the solver copies it and only assembles
  // and factorises numerically. The same bits as without it.
  std::shared_ptr<const SymbolicFactorisation> symbolic;
  AssemblyOptions assembly;
  // A solve whose relative residual exceeds this throws SolverError.
  double max_relative_residual = 1e-6;
  // A pivot of the Cholesky factor below this fraction of its matrix diagonal (L_kk^2 / A_kk) marks
  // a singular matrix (a mechanism, a free rigid-body motion) even when round-off kept it positive.
  double min_pivot_ratio = 1e-10;
};

struct SolverStatistics {
  int n_dofs = 0;            // free degrees of freedom
  long long n_nonzeros = 0;  // in the free-free block (upper triangle)
  double assembly_s = 0, analyse_s = 0, factorise_s = 0;
  double factorisation_gflop = 0;  // floating-point work of the numeric factorisation
  double last_solve_s = 0;
  double last_relative_residual = 0;  // ||K u - f|| / ||f|| over the free dofs
  std::string ordering;               // fill-reducing ordering CHOLMOD chose
  // Additions beyond the agreed interface:
  int n_constrained_dofs = 0;
  int n_unused_nodes = 0;          // nodes of no element: held at zero, not part of the system
  long long factor_nonzeros = 0;   // entries of L
  double factor_mb = 0;            // memory of L, MB
  double min_pivot_ratio = 0;      // min over k of L_kk^2 / A_kk (1 for a diagonal matrix)
  std::string requested_ordering;  // SolverOptions::ordering
  int n_threads_assembly = 0;
  // Calls of solve() that went through the factor (one per call, whatever the number of
  // right-hand sides): lets a test prove that a result needed no new solve.
  int n_solves = 0;
  // Numeric factorisations: 1 after construction, one more per refactorise(); the ordering and
  // symbolic analysis (analyse_s) are done once. assembly_s and factorise_s are the last ones.
  int n_numeric_factorisations = 0;
};

// Assembles, eliminates the constraints and factorises once (CHOLMOD supernodal Cholesky);
// solve() then reuses the factorisation for any number of right-hand sides.
// Throws InputError for a region without material or an invalid constraint, MeshError for an
// inverted element, SolverError if the matrix is not positive definite (a region without stiffness,
// a model not held against rigid motion), with the equation, node and likely cause in the message.
// solve() may be called from several threads; calls are serialised internally.
class LinearElasticSolver {
 public:
  LinearElasticSolver(const mesh::VolumeMesh& mesh, const MaterialTable& materials,
                      std::vector<DofConstraint> constraints);
  LinearElasticSolver(const mesh::VolumeMesh& mesh, const MaterialTable& materials,
                      std::vector<DofConstraint> constraints, const SolverOptions& options);
  ~LinearElasticSolver();
  LinearElasticSolver(const LinearElasticSolver&) = delete;
  LinearElasticSolver& operator=(const LinearElasticSolver&) = delete;

  // New materials on the same mesh and constraints (a material-only sample of a study): assembles K
  // again and repeats the numeric factorisation only. The stiffness pattern depends on the
  // connectivity alone, so the ordering and CHOLMOD's symbolic analysis are reused, and the result
  // is the one a new solver would give (bit for bit: same pattern, same ordering, same arithmetic).
  // `mesh` must be the mesh the solver was built with (same nodes and elements; only the node count
  // is checked). Throws like the constructor for bad materials (InputError) or a matrix that is
  // not positive definite (SolverError); after such a failure solve() throws SolverError until a
  // refactorise() succeeds. Not to be called while other threads solve.
  void refactorise(const mesh::VolumeMesh& mesh, const MaterialTable& materials);
  // The materials K was last assembled with.
  const MaterialTable& materials() const;

  // f: 3n nodal forces (N). Returns the 3n displacement (mm), constrained values included.
  // (Pass a VectorXd, not an Eigen expression, or the call is ambiguous with the matrix overload.)
  // Throws SolverError when the relative residual exceeds SolverOptions::max_relative_residual.
  Eigen::VectorXd solve(const Eigen::VectorXd& f) const;
  // Several right-hand sides at once (3n x m), one pass through the factor.
  Eigen::MatrixXd solve(const Eigen::MatrixXd& F) const;
  // Reactions r = K u - f (3n), nonzero only at constrained dofs for an exact solve.
  Eigen::VectorXd reactions(const Eigen::VectorXd& u, const Eigen::VectorXd& f) const;

  // Statistics; last_solve_s and last_relative_residual change with each solve (copy them under
  // your own synchronisation if other threads solve at the same time).
  const SolverStatistics& statistics() const;
  const Eigen::SparseMatrix<double>& stiffness() const;  // full K, N/mm
  const std::vector<DofConstraint>& constraints() const;
  int n_nodes() const;

 private:
  struct Impl;
  Impl* impl_;
};

// The fill-reducing node ordering the solver computes for kMetisNodes (METIS nested dissection of
// the graph of the nodes with a free dof, two nodes adjacent when they share an element): node ids
// in elimination order. Needs the mesh and the constraints only, not the stiffness matrix, so it
// can be computed ahead (a study orders the next scenario's mesh while this one factorises) and
// passed in SolverOptions::node_order. Throws InputError for a constraint outside the mesh,
// SolverError when METIS fails. One ordering runs at a time in the process (METIS keeps global
// state); a call waits for another thread's ordering to finish.
std::vector<int> order_nodes(const mesh::VolumeMesh& mesh,
                             const std::vector<DofConstraint>& constraints);

// The ordering and CHOLMOD's symbolic factorisation of a model's free-free stiffness block from
// the mesh and the constraints alone (the stiffness pattern is the node pairs sharing an element):
// what the solver computes for kMetisNodes before the numeric factorisation, computed ahead (a
// study analyses the next scenario while this one factorises) and passed in
// SolverOptions::symbolic. Runs on the calling thread alone. Holds the symbolic factor (tens of MB
// for the standard incisor), not K. Throws InputError for a constraint outside the mesh,
// SolverError when the ordering or the analysis fails.
class SymbolicFactorisation {
 public:
  SymbolicFactorisation(const mesh::VolumeMesh& mesh,
                        const std::vector<DofConstraint>& constraints);
  ~SymbolicFactorisation();
  SymbolicFactorisation(const SymbolicFactorisation&) = delete;
  SymbolicFactorisation& operator=(const SymbolicFactorisation&) = delete;
  double factorisation_gflop() const;  // work of the numeric factorisation
  long long factor_nonzeros() const;   // entries of L
  double analyse_s() const;            // time this took

  struct Impl;  // the solver's view (solver.cpp)
  const Impl& impl() const { return *impl_; }

 private:
  std::unique_ptr<Impl> impl_;
};

// Fill and work of the factorisation under one ordering, from CHOLMOD's symbolic analysis only (no
// numeric factorisation): for choosing an ordering by measurement (bench_assembly).
struct OrderingEstimate {
  std::string ordering;  // the ordering CHOLMOD used
  double analyse_s = 0;
  double factorisation_gflop = 0;
  long long factor_nonzeros = 0;
};
// K: full 3n x 3n stiffness; the dofs named in `constraints` are removed first.
OrderingEstimate estimate_ordering(const Eigen::SparseMatrix<double>& K,
                                   const std::vector<DofConstraint>& constraints,
                                   Ordering ordering);

}  // namespace sharpey::fem

// Consistent nodal forces of surface loads on 3-node and 6-node boundary faces.
#pragma once

#include <Eigen/Core>

#include "sharpey/mesh/volume_mesh.h"

namespace sharpey::fem {

// All return a 3n nodal force vector, N (node-major). Throw InputError when no face carries
// `marker`.

// Force and moment (about `reference_point`) distributed over the faces with `marker` as statically
// equivalent nodal forces: a distributing coupling weighted by the consistent nodal areas
// w_i = integral(N_i dA) / A. With c = sum w_i x_i, r_i = x_i - c, the inertia-like tensor
// J = sum w_i (|r_i|^2 I - r_i r_i^T) and M_c = M + (reference_point - c) x F,
// f_i = w_i (F + (J^-1 M_c) x r_i). The resultant of the returned forces equals force_n and their
// moment about reference_point equals moment_nmm to round-off. Throws InputError when the patch is
// (nearly) a line, so a moment cannot be spread over it.
Eigen::VectorXd patch_load(const mesh::VolumeMesh& mesh, int marker, const Eigen::Vector3d& force_n,
                           const Eigen::Vector3d& moment_nmm,
                           const Eigen::Vector3d& reference_point);
// Uniform traction (MPa, a vector) on the faces with `marker`, consistently integrated
// f_i = t integral(N_i dA) with the 7-point degree-5 triangle rule: exact for flat faces and for
// curved faces whose area element is a polynomial of degree <= 3 (e.g. in-plane curved edges);
// otherwise a high-order quadrature of the curved face's area element.
Eigen::VectorXd traction_load(const mesh::VolumeMesh& mesh, int marker,
                              const Eigen::Vector3d& traction_mpa);
// Uniform pressure (MPa, positive pushes against the face normal given by the right-hand rule of
// the face's node order) on the faces with `marker`: f_i = -p integral(N_i n dA), integrated
// exactly on flat and curved (6-node) faces (n dA is a polynomial of degree 2; degree-5 rule).
Eigen::VectorXd pressure_load(const mesh::VolumeMesh& mesh, int marker, double pressure_mpa);

// Consistent nodal areas integral(N_i dA), mm^2, of the faces with `marker`: one value per mesh
// node (n), zero off the patch. Their sum is the patch area. Corner values of flat 6-node faces are
// zero (a property of the quadratic triangle); curved faces can give small negative corner values.
Eigen::VectorXd consistent_nodal_areas(const mesh::VolumeMesh& mesh, int marker);

// Sum over the faces with `marker` of integral(n dA), mm^2 (the vector area of the patch).
Eigen::Vector3d vector_area(const mesh::VolumeMesh& mesh, int marker);

}  // namespace sharpey::fem

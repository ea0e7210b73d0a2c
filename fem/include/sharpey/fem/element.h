// Element kernels of the 4-node and 10-node tetrahedra: strain-displacement matrix, stiffness and
// the quadrature rule each element needs.
#pragma once

#include <Eigen/Core>

#include "sharpey/core/reference_tetrahedron.h"
#include "sharpey/fem/material.h"
#include "sharpey/mesh/volume_mesh.h"

namespace sharpey::fem {

// True when element e has straight edges: a 4-node element, or a 10-node element whose midside
// nodes sit on their edge midpoints (within 1e-9 of the edge length). Such an element has a
// constant Jacobian.
bool element_is_straight(const mesh::VolumeMesh& mesh, int e);

// Quadrature rule used for the stiffness of element e: 1 point (4-node, exact), the 4-point
// degree-2 rule (straight 10-node, exact), the 14-point degree-5 rule (curved 10-node).
core::QuadratureRule stiffness_quadrature(const mesh::VolumeMesh& mesh, int e);

// Element stiffness (3k x 3k, N/mm, k = 4 or 10, dof order node-major x y z) of element `e` of
// `mesh`: sum over quadrature points of w det(J) B^T D B. D: 6 x 6, MPa.
// Throws MeshError when the Jacobian determinant is not positive at a quadrature point (an inverted
// or degenerate element), naming the element.
Eigen::MatrixXd element_stiffness(const mesh::VolumeMesh& mesh, int e, const Matrix6d& D);

// Strain-displacement matrix B (6 x 3k) of element e at reference point p (Voigt order
// xx yy zz yz xz xy, engineering shear), and det(J) there (mm^3 per reference volume).
// Does not check the sign of det(J).
Eigen::MatrixXd strain_displacement(const mesh::VolumeMesh& mesh, int e, const Eigen::Vector3d& p,
                                    double* det_jacobian = nullptr);

}  // namespace sharpey::fem

// Linear elasticity on 4-node and 10-node tetrahedra: materials, stiffness, constraints, loads,
// the CHOLMOD solver, stress recovery and superposition of unit load cases.
//
// Units: mm, N, MPa (= N/mm^2). Displacement vectors are 3 * n_nodes long, node-major
// (u[3*i + c], c = 0,1,2 for x,y,z). Voigt order for stress and strain: xx yy zz yz xz xy;
// strain shear components are engineering strains (gamma = 2 eps).
//
// Umbrella header of the fem library; each part has its own header, included here in dependency
// order. The maths is in docs/fem-solver.md.
#pragma once

#include "sharpey/fem/assembly.h"
#include "sharpey/fem/element.h"
#include "sharpey/fem/loads.h"
#include "sharpey/fem/material.h"
#include "sharpey/fem/recovery.h"
#include "sharpey/fem/solver.h"
#include "sharpey/fem/superposition.h"

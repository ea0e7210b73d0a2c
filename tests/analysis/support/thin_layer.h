// Thin-layer (Winkler) centre of resistance of a rigid root, the independent estimate the CRes
// tests compare the finite-element model with (derived, check-values.md section 7).
#pragma once

#include "sharpey/fem/material.h"
#include "sharpey/mesh/tooth_model.h"

namespace sharpey::test {

// CRes below the crest over the embedded length, for a force along x (labiolingual) and along y
// (mesiodistal).
struct CresFractions {
  double x = 0, y = 0;
};

// A rigid root with the horizontal elliptical sections the mesher builds (half-widths from
// mesh::root_section), embedded from crest_z down to the apex at apex_z, on springs over its
// surface: normal stiffness (lambda + 2 mu) / w and shear stiffness mu / w per unit area (a thin
// layer of width w). K (6 x 6, about the origin) = sum over the surface of
// B^T (k_n N N^T + k_s (I - N N^T)) B dA with B = [I, -[p]x]; the CRes is the axis height where a
// force along x (y) causes no rotation about y (x).
CresFractions thin_layer_fractions(const mesh::ModelSpec& model, const fem::Material& pdl,
                                   double crest_z, double apex_z);

}  // namespace sharpey::test

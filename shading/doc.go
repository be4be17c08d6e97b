// Package shading owns the light a module loses to its surroundings: per-cell beam shading
// at every time step, the diffuse view fractions (sky, horizon band, ground) of every module,
// a far horizon read from a profile, and the outlines of obstructions for a sun-path chart.
// It knows the site's geometry (package geo) and sun directions; it knows nothing of
// electricity, weather or files by path.
//
// # Scene
//
// NewScene turns the site into solids a ray can be tested against exactly:
//   - roof faces: planar polygons, the plan outline lifted with Face.HeightAt; every face,
//     the module's own included, is an obstruction. Ray origins sit 1 cm off the module
//     along its normal, so the face under a module never counts.
//   - blocks: vertical prisms from BaseM to HeightM; a gable-roofed block is the prism cut by
//     the two planes of Block.TopAt (ridge through the footprint's vertex centroid).
//   - trees: the crown only, a solid of revolution about the trunk: an ellipsoid filling
//     CrownBaseM..HeightM with radius CrownRadiusM, or a cone with its base circle at
//     CrownBaseM and its apex at HeightM. The trunk is ignored: it is narrow next to a
//     module and a surveyor rarely draws it. A crown passes Tree.Transmittance(month) of the
//     beam (0 for an evergreen or in leaf); crowns along one ray multiply.
//
// # Beam
//
// A cell's beam transmittance at a step is 0 when the sun is at or below the horizontal,
// below the far horizon, or behind the module's plane; otherwise the product of the
// transmittances of every object the ray from the cell toward the sun meets (0 for any
// opaque one). It is stored as 0..255 (rounding error ≤ 0.2 %), and only for module-steps
// that are neither fully lit nor fully dark, so a year of 120 modules of 60 cells takes a few
// megabytes.
//
// Fast path. Every object gets a bounding sphere. Per module, the directions from the
// module's bounding ball to the sphere form a cone; objects whose cone lies wholly below the
// horizontal or behind the module are dropped once and for all. At each step the sun is
// tested against the remaining cones (one dot product each); when none contains it the
// module is fully lit. Otherwise each cell tests its own (narrower) cones, and only then the
// exact ray test. A face whose plane the whole module lies in front of is skipped when the
// sun is on its front side too. All culling is conservative and the exact test is the one
// the brute-force path uses (Options.BruteForce: every ray against every object), so both
// paths give the same transmittances; the tests check per-module annual beam agreement
// within 0.5 % on seeded random scenes anyway, to catch a culling bug.
//
// Cost (BenchmarkComputeBenchScene: 120 modules of 6×20 cells on four faces, 40 blocks, 15
// trees, 4 380 sun-up hours): about 1.1 CPU-seconds on the fast path against 32 on the
// brute-force path (28×), 12 MB of results, under 60 MB of process memory.
//
// # Diffuse
//
// Diffuse traces, from the module's centre, a grid of directions over the sphere (2° of
// azimuth; 0.5° of elevation within 15° of the horizontal, 3° beyond), each weighted by the
// exact solid angle of its bin times the cosine to the module's normal. SkyView is the
// visible share of the weight above the horizontal and above the far horizon (isotropic sky);
// HorizonView the same for the band between elevation 0 and HorizonBandDeg (6°, our choice
// for the band that diffuse models brighten); GroundView the share below the horizontal that
// no object hides (the ground, for reflected light). Tree crowns pass their mean transmittance
// over the year. Accuracy (tests): the weights reproduce the isotropic (1+cos β)/2 to 1e-3,
// a long wall's view factor and a uniform far horizon's sin²ε to about 1 %.
// The circumsolar part of the diffuse light follows the beam: the caller applies the
// module-step's LitFraction to it.
//
// # Far horizon
//
// ReadHorizon reads a CSV profile "azimuth_deg,elevation_deg"; elevation between points is
// linear in azimuth and wraps across north. The profile applies to every point of the site
// alike (terrain far away compared with the roof).
//
// # Methods
//
// The ray tests and view factors are exact geometry, no published model. The tests hold them
// against closed forms: the isotropic sky view (1+cos β)/2 of a tilted plane (Liu & Jordan
// 1963), the share sin²ε that a uniform far horizon hides, and analytic shadows; the tests'
// sun paths use the declination of Cooper, P. I. (1969), "The absorption of radiation in
// solar stills", Solar Energy 12(3):333–346.
package shading

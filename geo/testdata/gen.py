#!/usr/bin/env python3
"""Writes the invented test maps in this folder (run from geo/: python3 testdata/gen.py).

Everything here is made up: a house at an invented spot (longitude 15.4, latitude 47.1), its
roof faces, a chimney, trees and a neighbouring building. Positions are laid out in local metres
and turned into longitude/latitude with the WGS 84 radii of curvature at the origin
(NIMA TR8350.2: a = 6378137 m, f = 1/298.257223563), good to a few parts per million over a
site, so tests can use tight tolerances.
"""
import json, math, os

LON0, LAT0 = 15.4, 47.1
A, F = 6378137.0, 1 / 298.257223563
E2 = F * (2 - F)
_s = math.sin(math.radians(LAT0))
N_RAD = A / math.sqrt(1 - E2 * _s * _s)            # prime vertical
M_RAD = A * (1 - E2) / (1 - E2 * _s * _s) ** 1.5   # meridian

GROUND = 0.0  # ellipsoidal height of the ground the metres are measured on

def ll(e, n, h=None):
    lat = LAT0 + math.degrees(n / (M_RAD + GROUND))
    lon = LON0 + math.degrees(e / ((N_RAD + GROUND) * math.cos(math.radians(LAT0))))
    p = [round(lon, 10), round(lat, 10)]
    if h is not None:
        p.append(round(h, 4))
    return p

def rect(x0, y0, x1, y1, cw=False):
    pts = [(x0, y0), (x1, y0), (x1, y1), (x0, y1), (x0, y0)]
    if cw:
        pts.reverse()
    return [[ll(x, y) for x, y in pts]]

def feat(props, geom):
    return {"type": "Feature", "properties": props, "geometry": geom}

def poly(r): return {"type": "Polygon", "coordinates": r}
def pt(e, n): return {"type": "Point", "coordinates": ll(e, n)}

def dump(path, feats):
    # One feature per line, so that a problem's line number is its feature index + 2.
    with open(path, "w") as f:
        f.write('{"type": "FeatureCollection", "features": [\n')
        f.write(",\n".join("  " + json.dumps(x) for x in feats))
        f.write("\n]}\n")

S = feat({"kind": "roof", "id": "S", "pitch_deg": 30, "aspect_deg": 180, "eave_height_m": 3}, poly(rect(-5, -4, 5, 0)))
N = feat({"kind": "roof", "id": "N", "pitch_deg": 30, "aspect_deg": 0, "eave_height_m": 3}, poly(rect(-5, 0, 5, 4, cw=True)))
site = [
    S, N,
    feat({"kind": "block", "id": "chimney", "height_m": 7}, poly(rect(1, -2, 1.6, -1.4))),
    feat({"kind": "tree", "id": "oak", "height_m": 12, "crown_radius_m": 3, "crown_base_m": 4, "leaf_off_transmittance": 0.3}, pt(8, -12)),
    feat({"kind": "avoid", "id": "vent"}, poly(rect(-3, -1.2, -2.5, -0.7))),
    feat({"kind": "block", "id": "neighbour", "height_m": 6, "ridge_m": 9, "ridge_azimuth_deg": 90, "base_m": -0.5}, poly(rect(15, -20, 25, -10))),
    feat({"kind": "tree", "id": "spruce", "height_m": 15, "crown_radius_m": 2.5, "crown_base_m": 1, "crown_shape": "cone"}, pt(-10, -8)),
]
os.makedirs("testdata/bad", exist_ok=True)
dump("testdata/site.geojson", site)

# 3-D: ground at 420 m above the ellipsoid; a gable 8 m wide, eaves at 3 m, ridge at 5 m along
# x = 0: each face has pitch atan(2/4) = 26.565°.
E = 420.0
GROUND = E
w = [ll(-4, -3, E + 3), ll(0, -3, E + 5), ll(0, 3, E + 5), ll(-4, 3, E + 3), ll(-4, -3, E + 3)]
e = [ll(0, -3, E + 5), ll(4, -3, E + 3), ll(4, 3, E + 3), ll(0, 3, E + 5), ll(0, -3, E + 5)]
dump("testdata/site3d.geojson", [
    feat({"kind": "roof", "id": "W"}, poly([w])),
    feat({"kind": "roof", "id": "E", "pitch_deg": 26.6, "aspect_deg": 90}, poly([e])),
    feat({"kind": "tree", "id": "birch", "height_m": 9, "crown_radius_m": 2, "crown_shape": "sphere", "leaf_off_transmittance": 0.4, "leaf_off_months": [11, 12, 1, 2, 3]}, pt(0, -10)),
    feat({"kind": "panel", "id": "p1"}, poly(rect(1, -2, 1 + 1.13 * 0.894427, -0.28))),
])

GROUND = 0.0

# Benchmark: two faces 18.5 m × 8 m at 20°; with 1.72 × 1.13 m modules, 0.4 m setback and
# 0.02 m gaps each takes 15 columns × 4 rows = 60 modules, 120 in all.
dump("testdata/bench.geojson", [
    feat({"kind": "roof", "id": "S", "pitch_deg": 20, "aspect_deg": 180, "eave_height_m": 4}, poly(rect(-9.25, -8, 9.25, 0))),
    feat({"kind": "roof", "id": "N", "pitch_deg": 20, "aspect_deg": 0, "eave_height_m": 4}, poly(rect(-9.25, 0, 9.25, 8))),
    feat({"kind": "tree", "id": "ash", "height_m": 14, "crown_radius_m": 4, "crown_base_m": 3}, pt(0, -20)),
])

def bad(name, feats):
    dump(f"testdata/bad/{name}.geojson", feats)

def roof(**kw):
    p = {"kind": "roof", "id": "S", "pitch_deg": 30, "aspect_deg": 180, "eave_height_m": 3}
    p.update(kw)
    return {k: v for k, v in p.items() if v is not None}

R = poly(rect(-5, -4, 5, 0))
bad("missing-pitch", [feat(roof(pitch_deg=None), R)])
bad("pitch-string", [feat(roof(pitch_deg="30"), R)])
bad("pitch-steep", [feat(roof(pitch_deg=75), R)])
bad("aspect-360", [feat(roof(aspect_deg=360), R)])
bad("missing-kind", [feat({"id": "S", "pitch_deg": 30}, R)])
bad("unknown-kind", [S, feat({"kind": "chimney", "id": "c"}, poly(rect(1, -2, 1.6, -1.4)))])
bad("open-ring", [feat(roof(), poly([rect(-5, -4, 5, 0)[0][:4] + [ll(-5, -3.9)]]))])
bad("short-ring", [feat(roof(), poly([[ll(-5, -4), ll(5, -4), ll(-5, -4)]]))])
bad("self-crossing", [feat(roof(), poly([[ll(-5, -4), ll(5, -4), ll(-5, 0), ll(5, 0), ll(-5, -4)]]))])
bad("hole", [feat(roof(), poly(rect(-5, -4, 5, 0) + rect(-1, -2, 1, -1)))])
bad("duplicate-id", [S, feat(roof(aspect_deg=0), poly(rect(-5, 0, 5, 4)))])
sw = [[[p[1], p[0]] for p in rect(-5, 0, 5, 4)[0]]]
bad("swapped", [S, feat(roof(id="N", aspect_deg=0), poly(sw)), site[2]])
bad("far", [S, site[2], feat({"kind": "block", "id": "mast", "height_m": 20}, poly([[ll(x + 2000, y) for x, y in [(0, 0), (1, 0), (1, 1), (0, 1), (0, 0)]]]))])
bad("overlap", [S, feat(roof(id="S2", aspect_deg=0), poly(rect(-4, -3, 4, 2)))])
bad("tree-crown-base", [S, feat({"kind": "tree", "id": "elm", "height_m": 10, "crown_radius_m": 3, "crown_base_m": 12}, pt(0, -10))])
bad("tree-too-tall", [S, feat({"kind": "tree", "id": "elm", "height_m": 400, "crown_radius_m": 3, "crown_base_m": 2}, pt(0, -10))])
bad("tree-polygon", [S, feat({"kind": "tree", "id": "elm", "height_m": 10, "crown_radius_m": 3, "crown_base_m": 2}, poly(rect(0, -10, 1, -9)))])
bad("leaf-month", [S, feat({"kind": "tree", "id": "elm", "height_m": 10, "crown_radius_m": 3, "crown_base_m": 2, "leaf_off_transmittance": 0.3, "leaf_off_months": [11, 13]}, pt(0, -10))])
bad("block-inverted", [S, feat({"kind": "block", "id": "shed", "height_m": 2, "base_m": 3}, poly(rect(8, -3, 10, -1)))])
bad("ridge-no-azimuth", [S, feat({"kind": "block", "id": "barn", "height_m": 4, "ridge_m": 7}, poly(rect(20, -3, 30, 5)))])
bad("panel-off-roof", [S, feat({"kind": "panel", "id": "p"}, poly(rect(7, -3, 8.13, -1.28)))])
bad("latitude-range", [feat(roof(), poly([[[47.1, 200.0], [47.2, 200.0], [47.2, 200.1], [47.1, 200.0]]]))])
bad("dotted-id", [feat(roof(id="S.1"), R)])
bad("three-d-no-elevation", [feat({"kind": "roof", "id": "W"}, poly([w]))])
GROUND = E
wb = [list(p) for p in w]
wb[1] = ll(0, -3, E + 5.6)
bad("three-d-not-flat", [feat({"kind": "roof", "id": "W"}, poly([wb]))])
bad("three-d-pitch-disagrees", [feat({"kind": "roof", "id": "W", "pitch_deg": 35}, poly([w]))])
wg = [ll(-4, -3, 3), ll(0, -3, 5), ll(0, 3, 5), ll(-4, 3, 3), ll(-4, -3, 3)]
bad("three-d-above-ground", [feat({"kind": "roof", "id": "W"}, poly([wg]))])
GROUND = 0.0
bad("multipolygon", [feat(roof(), {"type": "MultiPolygon", "coordinates": [rect(-5, -4, 5, 0)]})])
with open("testdata/bad/truncated.geojson", "w") as f:
    f.write('{"type": "FeatureCollection", "features": [\n  {"type": "Feature", "properties": {"kind": "roof"')
with open("testdata/bad/duplicate-member.geojson", "w") as f:
    f.write('{"type": "FeatureCollection", "features": [\n  {"type": "Feature", "properties": {"kind": "roof", "id": "S", "pitch_deg": 30, "pitch_deg": 35}, "geometry": null}\n]}\n')
with open("testdata/bad/not-collection.geojson", "w") as f:
    f.write('{"type": "Feature", "properties": {}, "geometry": null}\n')
with open("testdata/bad/crs.geojson", "w") as f:
    f.write('{"type": "FeatureCollection", "crs": {"type": "name", "properties": {"name": "EPSG:3857"}}, "features": []}\n')

# Buildings drawn by footprint and roof shape (a gabled house, the same roof drawn as two faces,
# hipped, skillion, flat, L-shaped gabled with wings of one width and of two widths, and a
# near-rectangle turned 30° with one corner 5 cm off square).
def ring(pts):
    pts = list(pts) + [pts[0]]
    return [[ll(x, y) for x, y in pts]]

def bld(id, shape, pts, **kw):
    p = {"kind": "building", "id": id, "roof_shape": shape}
    p.update(kw)
    return feat(p, poly(ring(pts)))

def turned(pts, deg, dx=0, dy=0):
    c, s = math.cos(math.radians(deg)), math.sin(math.radians(deg))
    return [(dx + x * c + y * s, dy - x * s + y * c) for x, y in pts]

dump("testdata/buildings.geojson", [
    bld("gable", "gabled", [(-5, -4), (5, -4), (5, 4), (-5, 4)], pitch_deg=35, eave_height_m=3, ridge_azimuth_deg=90),
    bld("hip", "hipped", [(20, -4), (32, -4), (32, 4), (20, 4)], pitch_deg=30, eave_height_m=3),
    bld("lean", "skillion", [(40, -3), (46, -3), (46, 3), (40, 3)], pitch_deg=10, eave_height_m=2.5, ridge_azimuth_deg=200),
    bld("box", "flat", [(55, -5), (65, -5), (65, 2), (55, 2)], eave_height_m=6),
    bld("ell", "gabled", [(-5, 20), (7, 20), (7, 26), (1, 26), (1, 34), (-5, 34)], pitch_deg=40, eave_height_m=4),
    bld("wide", "gabled", [(20, 20), (34, 20), (34, 28), (24, 28), (24, 36), (20, 36)], pitch_deg=35, eave_height_m=3),
    bld("skew", "gabled", turned([(0, 0), (10, 0), (10, 6.05), (0, 6)], -30, 45, 25), pitch_deg=30, eave_height_m=3),
])
dump("testdata/gable-drawn.geojson", [
    feat({"kind": "roof", "id": "gable-S", "pitch_deg": 35, "aspect_deg": 180, "eave_height_m": 3}, poly(rect(-5, -4, 5, 0))),
    feat({"kind": "roof", "id": "gable-N", "pitch_deg": 35, "aspect_deg": 0, "eave_height_m": 3}, poly(rect(-5, 0, 5, 4))),
    feat({"kind": "block", "id": "gable", "height_m": 3}, poly(rect(-5, -4, 5, 4))),
])
bad("building-pentagon", [bld("house", "gabled", [(0, 0), (10, 0), (10, 6), (5, 9), (0, 6)], pitch_deg=35, eave_height_m=3)])
bad("building-hipped-ell", [bld("house", "hipped", [(-5, 20), (7, 20), (7, 26), (1, 26), (1, 34), (-5, 34)], pitch_deg=35, eave_height_m=3)])
bad("building-shape", [bld("house", "mansard", [(0, 0), (10, 0), (10, 6), (0, 6)], pitch_deg=35, eave_height_m=3)])
bad("building-skillion-no-direction", [bld("shed", "skillion", [(0, 0), (4, 0), (4, 3), (0, 3)], pitch_deg=10, eave_height_m=2)])
bad("building-ridge-askew", [bld("house", "gabled", [(0, 0), (10, 0), (10, 6), (0, 6)], pitch_deg=35, eave_height_m=3, ridge_azimuth_deg=45)])
bad("building-face-id", [bld("house", "gabled", [(0, 0), (10, 0), (10, 6), (0, 6)], pitch_deg=35, eave_height_m=3, ridge_azimuth_deg=90),
                         feat({"kind": "roof", "id": "house-S", "pitch_deg": 20, "aspect_deg": 180, "eave_height_m": 2}, poly(rect(0, -5, 10, -1)))])

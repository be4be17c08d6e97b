#!/usr/bin/env python3
"""Writes the invented OpenStreetMap extracts in this folder (run from geo/osm: python3 testdata/gen.py).

Everything is made up: a street around an invented spot (longitude 15.4, latitude 47.1), the same
spot as geo/testdata, laid out in local metres and turned into longitude/latitude with the WGS 84
radii of curvature at the origin (NIMA TR8350.2), good to a few parts per million over a site.
"""
import math, os

LON0, LAT0 = 15.4, 47.1
A, F = 6378137.0, 1 / 298.257223563
E2 = F * (2 - F)
_s = math.sin(math.radians(LAT0))
N_RAD = A / math.sqrt(1 - E2 * _s * _s)
M_RAD = A * (1 - E2) / (1 - E2 * _s * _s) ** 1.5

def ll(e, n):
    return (round(LON0 + math.degrees(e / (N_RAD * math.cos(math.radians(LAT0)))), 10),
            round(LAT0 + math.degrees(n / M_RAD), 10))

class Extract:
    def __init__(self):
        self.nodes, self.ways, self.next = [], [], 1000

    def node(self, e, n, tags=None, id=None):
        if id is None:
            self.next += 1
            id = self.next
        lon, lat = ll(e, n)
        self.nodes.append((id, lat, lon, tags or {}))
        return id

    def rect(self, id, x0, y0, x1, y1, tags):
        ids = [self.node(x, y) for x, y in [(x0, y0), (x1, y0), (x1, y1), (x0, y1)]]
        self.ways.append((id, ids + [ids[0]], tags))

    def write(self, path, extra=""):
        with open(path, "w") as f:
            f.write('<?xml version="1.0" encoding="UTF-8"?>\n<osm version="0.6" generator="hand">\n')
            for id, lat, lon, tags in self.nodes:
                if tags:
                    f.write(f'  <node id="{id}" lat="{lat}" lon="{lon}">\n')
                    for k, v in tags.items():
                        f.write(f'    <tag k="{k}" v="{v}"/>\n')
                    f.write('  </node>\n')
                else:
                    f.write(f'  <node id="{id}" lat="{lat}" lon="{lon}"/>\n')
            for id, nds, tags in self.ways:
                f.write(f'  <way id="{id}">\n')
                for n in nds:
                    f.write(f'    <nd ref="{n}"/>\n')
                for k, v in tags.items():
                    f.write(f'    <tag k="{k}" v="{v}"/>\n')
                f.write('  </way>\n')
            f.write(extra)
            f.write('</osm>\n')

# The street: the site's own house (faces S and N of geo/testdata/site.geojson, x ∈ [−5, 5],
# y ∈ [−4, 4]) mapped a little large, a gabled neighbour, an oak, a garage without any height,
# a hipped house with levels only, a building far down the road and a road.
x = Extract()
x.rect(100, -5.2, -4.2, 5.2, 4.2, {"building": "house", "height": "8"})
x.rect(200, 15, -20, 25, -10, {"building": "house", "height": "9", "roof:height": "3", "roof:shape": "gabled", "roof:direction": "N"})
x.node(8, -12, {"natural": "tree", "height": "12", "diameter_crown": "6"}, id=300)
x.rect(400, -15, -12, -10, -8, {"building": "garage"})
x.rect(600, -25, 5, -15, 12, {"building": "house", "building:levels": "2", "roof:shape": "hipped", "roof:height": "2.5 m"})
x.rect(700, 300, 0, 310, 10, {"building": "yes"})
x.node(-30, 20, {"natural": "tree"}, id=301)
r1, r2 = x.node(-40, -30), x.node(40, -30)
x.ways.append((800, [r1, r2], {"highway": "residential", "name": "Invented Lane"}))
x.write("testdata/street.osm")

def bad(name, text):
    with open(f"testdata/bad/{name}.osm", "w") as f:
        f.write(text)

head = '<?xml version="1.0" encoding="UTF-8"?>\n<osm version="0.6" generator="hand">\n'
bad("syntax", head + '  <node id="1" lat="47.1" lon="15.4"/>\n  <node id="2" lat="47.1" lon="15.4"\n</osm>\n')
bad("node-lat", head + '  <node id="1" lat="47.1" lon="15.4"/>\n  <node id="2" lat="north" lon="15.4"/>\n</osm>\n')
bad("node-no-lat", head + '  <node id="1" lat="47.1" lon="15.4"/>\n  <node id="2" lon="15.4"/>\n</osm>\n')
bad("missing-node", head + '  <node id="1" lat="47.1" lon="15.4"/>\n  <node id="2" lat="47.1001" lon="15.4"/>\n  <node id="3" lat="47.1001" lon="15.4001"/>\n'
    '  <way id="9">\n    <nd ref="1"/>\n    <nd ref="2"/>\n    <nd ref="4"/>\n    <nd ref="1"/>\n    <tag k="building" v="yes"/>\n  </way>\n</osm>\n')
bad("open-building", head + '  <node id="1" lat="47.1" lon="15.4"/>\n  <node id="2" lat="47.1001" lon="15.4"/>\n  <node id="3" lat="47.1001" lon="15.4001"/>\n'
    '  <way id="9">\n    <nd ref="1"/>\n    <nd ref="2"/>\n    <nd ref="3"/>\n    <tag k="building" v="yes"/>\n  </way>\n</osm>\n')
bad("height-word", head + '  <node id="1" lat="47.1" lon="15.4"/>\n  <node id="2" lat="47.1001" lon="15.4"/>\n  <node id="3" lat="47.1001" lon="15.4001"/>\n'
    '  <way id="9">\n    <nd ref="1"/>\n    <nd ref="2"/>\n    <nd ref="3"/>\n    <nd ref="1"/>\n    <tag k="building" v="yes"/>\n    <tag k="height" v="tall"/>\n  </way>\n</osm>\n')
bad("roof-direction", head + '  <node id="1" lat="47.1" lon="15.4"/>\n  <node id="2" lat="47.1001" lon="15.4"/>\n  <node id="3" lat="47.1001" lon="15.4001"/>\n'
    '  <way id="9">\n    <nd ref="1"/>\n    <nd ref="2"/>\n    <nd ref="3"/>\n    <nd ref="1"/>\n    <tag k="building" v="yes"/>\n    <tag k="roof:shape" v="gabled"/>\n    <tag k="roof:direction" v="up"/>\n  </way>\n</osm>\n')
bad("not-osm", '{"type": "FeatureCollection", "features": []}\n')
with open("testdata/bad/pbf.osm", "wb") as f:
    f.write(b"\x00\x00\x00\x0e\n\tOSMHeader\x18\x00\x00\x00\x00")

# The neighbour and the oak again, as a converter of OpenStreetMap data writes them in GeoJSON
# (tags as properties, the element's id as the feature's id), with a road to pass over.
import json
def gj_ring(x0, y0, x1, y1):
    pts = [(x0, y0), (x1, y0), (x1, y1), (x0, y1), (x0, y0)]
    return [[list(ll(x, y)) for x, y in pts]]
feats = [
    {"type": "Feature", "id": "way/200", "properties": {"building": "house", "height": "9", "roof:height": 3, "roof:shape": "gabled", "roof:direction": "N"},
     "geometry": {"type": "Polygon", "coordinates": gj_ring(15, -20, 25, -10)}},
    {"type": "Feature", "id": "node/300", "properties": {"natural": "tree", "height": 12, "diameter_crown": "6"},
     "geometry": {"type": "Point", "coordinates": list(ll(8, -12))}},
    {"type": "Feature", "id": "way/800", "properties": {"highway": "residential"},
     "geometry": {"type": "LineString", "coordinates": [list(ll(-40, -30)), list(ll(40, -30))]}},
]
with open("testdata/street.geojson", "w") as f:
    f.write('{"type": "FeatureCollection", "features": [\n' + ",\n".join("  " + json.dumps(x) for x in feats) + "\n]}\n")
with open("testdata/bad/building-point.geojson", "w") as f:
    f.write('{"type": "FeatureCollection", "features": [\n  {"type": "Feature", "id": "way/5", "properties": {"building": "yes"}, "geometry": {"type": "Point", "coordinates": [15.4, 47.1]}}\n]}\n')
with open("testdata/bad/open-ring.geojson", "w") as f:
    f.write('{"type": "FeatureCollection", "features": [\n  {"type": "Feature", "properties": {"building": "yes"}, "geometry": {"type": "Polygon", "coordinates": [[[15.4, 47.1], [15.4001, 47.1], [15.4001, 47.1001], [15.4, 47.1002]]]}}\n]}\n')

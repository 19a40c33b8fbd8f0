"""
Independent shortest path on an OpenStreetMap XML file with networkx (Debian's python3-networkx)
and geodesic lengths from GeographicLib (python3-geographiclib): the reference the road-graph
specs compare pgRouting's paths with.

The rules for buses are written here again from the OpenStreetMap wiki, not taken from the
product: highways a bus may use by default (motor roads, service roads, busways; no tracks,
paths or pedestrian streets), the access hierarchy access > vehicle > motor_vehicle > psv > bus
(the most specific tag present decides; yes/designated/permissive/destination/official/
discouraged allow), one-way from oneway=yes/1/true/-1/reverse, junction=roundabout/circular and
highway=motorway, overridden by oneway:psv then oneway:bus.

Usage: networkx-shortest-path.py FILE.osm [FROM_NODE TO_NODE | --one-way]
Without node ids it picks the pair of junctions, each reachable from the other, with the
longest shortest path (ties: smallest ids) and prints that path; with --one-way, the pair whose
two directions differ most in length (one-way streets); with ids, the path between those nodes.
Prints JSON: { from, to, fromNode, toNode, lengthM, coordinates, nodeCount, edgeCount }.
"""
import json
import sys
import xml.etree.ElementTree as ET

import networkx as nx
from geographiclib.geodesic import Geodesic

BUS_ROADS = {
    'motorway', 'motorway_link', 'trunk', 'trunk_link', 'primary', 'primary_link', 'secondary',
    'secondary_link', 'tertiary', 'tertiary_link', 'unclassified', 'residential', 'living_street',
    'road', 'service', 'busway', 'bus_guideway',
}
OTHER_HIGHWAYS = {'track', 'pedestrian', 'footway', 'cycleway', 'path', 'bridleway', 'steps'}
ALLOWED = {'yes', 'designated', 'permissive', 'destination', 'official', 'discouraged'}


def bus_allowed(tags):
    highway = tags.get('highway')
    allowed = highway in BUS_ROADS
    for key in ('access', 'vehicle', 'motor_vehicle', 'psv', 'bus'):
        if key in tags:
            allowed = tags[key] in ALLOWED
    return allowed


def direction(tags):
    value = tags.get('oneway')
    result = 0
    if value is None:
        if tags.get('junction') in ('roundabout', 'circular') or tags.get('highway') == 'motorway':
            result = 1
    elif value in ('yes', 'true', '1'):
        result = 1
    elif value in ('-1', 'reverse'):
        result = -1
    for key in ('oneway:psv', 'oneway:bus'):
        override = tags.get(key)
        if override == 'no':
            result = 0
        elif override in ('yes', 'true', '1'):
            result = 1
        elif override == '-1':
            result = -1
    return result


def main():
    root = ET.parse(sys.argv[1]).getroot()
    positions = {}
    for node in root.iter('node'):
        positions[int(node.get('id'))] = (float(node.get('lon')), float(node.get('lat')))
    graph = nx.DiGraph()
    uses = {}
    for way in root.iter('way'):
        tags = {tag.get('k'): tag.get('v') for tag in way.iter('tag')}
        highway = tags.get('highway')
        if highway not in BUS_ROADS and highway not in OTHER_HIGHWAYS:
            continue
        if way.find("tag[@k='area'][@v='yes']") is not None:
            continue
        if not bus_allowed(tags):
            continue
        nodes = [int(nd.get('ref')) for nd in way.iter('nd') if int(nd.get('ref')) in positions]
        oneway = direction(tags)
        for node in nodes:
            uses[node] = uses.get(node, 0) + 1
        for a, b in zip(nodes, nodes[1:]):
            if a == b:
                continue
            (lon1, lat1), (lon2, lat2) = positions[a], positions[b]
            metres = Geodesic.WGS84.Inverse(lat1, lon1, lat2, lon2)['s12']
            for u, v, ok in ((a, b, oneway >= 0), (b, a, oneway <= 0)):
                if ok and (not graph.has_edge(u, v) or graph[u][v]['weight'] > metres):
                    graph.add_edge(u, v, weight=metres)
    one_way = len(sys.argv) == 3 and sys.argv[2] == '--one-way'
    if len(sys.argv) >= 4:
        source, target = int(sys.argv[2]), int(sys.argv[3])
        length = nx.dijkstra_path_length(graph, source, target)
    else:
        junctions = sorted(node for node, count in uses.items() if count > 1 and node in graph)
        lengths = {source: nx.single_source_dijkstra_path_length(graph, source) for source in junctions}
        best = (-1.0, 0, 0)
        for source in junctions:
            for target in junctions:
                if target == source or target not in lengths[source] or source not in lengths[target]:
                    continue
                score = lengths[source][target] - lengths[target][source] if one_way else lengths[source][target]
                if score > best[0]:
                    best = (score, source, target)
        _, source, target = best
        length = lengths[source][target]
    path = nx.dijkstra_path(graph, source, target)
    print(json.dumps({
        'from': list(positions[source]), 'to': list(positions[target]), 'fromNode': source, 'toNode': target,
        'lengthM': length, 'coordinates': [list(positions[node]) for node in path],
        'nodeCount': graph.number_of_nodes(), 'edgeCount': graph.number_of_edges(),
    }))


main()

-- How an OpenStreetMap extract becomes Descentry's base map: osm2pgsql (flex output) runs this
-- style and writes five tables into the import's own schema (DESCENTRY_BASEMAP_SCHEMA):
--
--   roads     highways and railways: a road class, name, ref, bridge/tunnel/layer, and what a
--             bus may do there (bus_access, bus_oneway), read from the access and one-way tags
--   waterways rivers, streams, canals and drains (lines)
--   water     lakes, reservoirs, ponds and river areas (polygons)
--   landuse   forest, fields, meadows, built-up areas, rock, glaciers… (polygons, our own classes)
--   places    named settlements, islands, peaks and passes (points; areas become their centroid)
--
-- Geometries are in Web Mercator (EPSG:3857), the projection the vector tiles are cut in.
-- The tag rules follow the OpenStreetMap wiki's pages "Key:highway", "Key:access" (the
-- transport-mode hierarchy access > vehicle > motor_vehicle > psv > bus, the most specific
-- tag winning) and "Key:oneway" (oneway=yes/-1, junction=roundabout and motorways implying
-- one way, oneway:bus / oneway:psv overriding it for buses).

local schema = os.getenv('DESCENTRY_BASEMAP_SCHEMA')
if schema == nil or schema == '' then
  error('DESCENTRY_BASEMAP_SCHEMA must name the schema to import into')
end

local tables = {}

tables.roads = osm2pgsql.define_way_table('roads', {
  { column = 'class', type = 'text', not_null = true },
  { column = 'kind', type = 'text', not_null = true },
  { column = 'name', type = 'text' },
  { column = 'ref', type = 'text' },
  { column = 'is_link', type = 'bool', not_null = true },
  { column = 'bridge', type = 'bool', not_null = true },
  { column = 'tunnel', type = 'bool', not_null = true },
  { column = 'layer', type = 'int2', not_null = true },
  -- Whether a bus may drive here at all, and in which directions: 1 only along the way's
  -- drawing direction, -1 only against it, 0 both.
  { column = 'bus_access', type = 'bool', not_null = true },
  { column = 'bus_oneway', type = 'int2', not_null = true },
  { column = 'geom', type = 'linestring', projection = 3857, not_null = true },
}, { schema = schema })

tables.waterways = osm2pgsql.define_way_table('waterways', {
  { column = 'kind', type = 'text', not_null = true },
  { column = 'name', type = 'text' },
  { column = 'geom', type = 'linestring', projection = 3857, not_null = true },
}, { schema = schema })

tables.water = osm2pgsql.define_area_table('water', {
  { column = 'kind', type = 'text', not_null = true },
  { column = 'name', type = 'text' },
  { column = 'geom', type = 'multipolygon', projection = 3857, not_null = true },
}, { schema = schema })

tables.landuse = osm2pgsql.define_area_table('landuse', {
  { column = 'class', type = 'text', not_null = true },
  { column = 'kind', type = 'text', not_null = true },
  { column = 'name', type = 'text' },
  { column = 'geom', type = 'multipolygon', projection = 3857, not_null = true },
}, { schema = schema })

tables.places = osm2pgsql.define_table({
  name = 'places',
  schema = schema,
  ids = { type = 'any', id_column = 'osm_id', type_column = 'osm_type' },
  columns = {
    { column = 'kind', type = 'text', not_null = true },
    { column = 'name', type = 'text', not_null = true },
    { column = 'population', type = 'int8' },
    { column = 'elevation_m', type = 'real' },
    { column = 'geom', type = 'point', projection = 3857, not_null = true },
  },
})

-- Road classes shown on the map; `kind` keeps the highway value itself.
local ROAD_CLASSES = {
  motorway = 'motorway', motorway_link = 'motorway',
  trunk = 'trunk', trunk_link = 'trunk',
  primary = 'primary', primary_link = 'primary',
  secondary = 'secondary', secondary_link = 'secondary',
  tertiary = 'tertiary', tertiary_link = 'tertiary',
  unclassified = 'minor', residential = 'minor', living_street = 'minor', road = 'minor',
  service = 'service',
  busway = 'busway', bus_guideway = 'busway',
  track = 'track',
  pedestrian = 'path', footway = 'path', cycleway = 'path', path = 'path',
  bridleway = 'path', steps = 'path',
}

-- Whether a bus may use a highway when no access tag says otherwise (the OpenStreetMap wiki's
-- default access table: motor roads yes; tracks, paths and pedestrian streets no; busways yes).
local BUS_BY_DEFAULT = {
  motorway = true, trunk = true, primary = true, secondary = true, tertiary = true,
  minor = true, service = true, busway = true, track = false, path = false,
}

-- Access values that let a scheduled bus through; anything else (no, private, agricultural,
-- delivery, customers, permit…) keeps it out.
local BUS_ALLOWED_VALUES = {
  yes = true, designated = true, permissive = true, destination = true, official = true,
  discouraged = true,
}

local RAILWAY_KINDS = { rail = 'rail', light_rail = 'rail', narrow_gauge = 'rail', funicular = 'rail', tram = 'tram' }

local WATERWAY_KINDS = { river = true, stream = true, canal = true, drain = true, ditch = true }

-- Our landuse classes (the tiles carry `class`; `kind` keeps the tag's own value).
local LANDUSE_CLASSES = {
  landuse = {
    forest = 'forest',
    residential = 'residential',
    commercial = 'commercial', retail = 'commercial',
    industrial = 'industrial', railway = 'industrial', quarry = 'industrial', construction = 'industrial',
    brownfield = 'industrial', landfill = 'industrial',
    farmland = 'farmland', farmyard = 'farmland', orchard = 'farmland', vineyard = 'farmland',
    allotments = 'farmland', greenhouse_horticulture = 'farmland',
    meadow = 'grass', grass = 'grass', greenfield = 'grass', recreation_ground = 'grass',
    village_green = 'grass',
    cemetery = 'cemetery', religious = 'cemetery',
    winter_sports = 'winter_sports',
    military = 'military',
  },
  natural = {
    wood = 'forest', scrub = 'scrub', heath = 'scrub', grassland = 'grass', fell = 'grass',
    bare_rock = 'rock', scree = 'rock', shingle = 'rock', glacier = 'glacier', wetland = 'wetland',
    beach = 'sand', sand = 'sand',
  },
  leisure = { park = 'grass', garden = 'grass', pitch = 'grass', golf_course = 'grass', nature_reserve = nil },
}

local WATER_AREA_KINDS = {
  lake = 'lake', reservoir = 'reservoir', pond = 'pond', river = 'river', canal = 'canal',
  oxbow = 'lake', lagoon = 'lake', basin = 'basin', stream = 'river',
}

local PLACE_KINDS = {
  city = true, town = true, village = true, hamlet = true, suburb = true, quarter = true,
  neighbourhood = true, locality = true, isolated_dwelling = true, island = true, islet = true,
}

local function is_yes(value)
  return value == 'yes' or value == 'true' or value == '1'
end

local function to_layer(value)
  local number = tonumber(value)
  if number == nil then return 0 end
  return math.max(-5, math.min(5, math.floor(number)))
end

local function to_number(value)
  if value == nil then return nil end
  return tonumber((value:gsub(',', '.'):match('^%s*(-?[%d.]+)')))
end

--- Whether a bus may use the way: the most specific access tag present decides.
local function bus_access(tags, class)
  local allowed = BUS_BY_DEFAULT[class] or false
  for _, key in ipairs({ 'access', 'vehicle', 'motor_vehicle', 'psv', 'bus' }) do
    local value = tags[key]
    if value ~= nil then allowed = BUS_ALLOWED_VALUES[value] == true end
  end
  return allowed
end

--- One-way for buses: 1 along the drawing direction, -1 against it, 0 both ways.
local function bus_oneway(tags)
  local oneway = 0
  local value = tags.oneway
  if value == nil then
    if tags.junction == 'roundabout' or tags.junction == 'circular' or tags.highway == 'motorway' then
      oneway = 1
    end
  elseif is_yes(value) then
    oneway = 1
  elseif value == '-1' or value == 'reverse' then
    oneway = -1
  end
  for _, key in ipairs({ 'oneway:psv', 'oneway:bus' }) do
    local override = tags[key]
    if override == 'no' then oneway = 0
    elseif is_yes(override) then oneway = 1
    elseif override == '-1' then oneway = -1 end
  end
  return oneway
end

local function insert_road(object, class, kind, is_link)
  local tags = object.tags
  local is_railway = class == 'rail' or class == 'tram'
  local access = (not is_railway) and bus_access(tags, class)
  tables.roads:insert({
    class = class,
    kind = kind,
    name = tags.name,
    ref = tags.ref,
    is_link = is_link,
    bridge = tags.bridge ~= nil and tags.bridge ~= 'no',
    tunnel = tags.tunnel ~= nil and tags.tunnel ~= 'no',
    layer = to_layer(tags.layer),
    bus_access = access,
    bus_oneway = access and bus_oneway(tags) or 0,
    geom = object:as_linestring(),
  })
end

local function landuse_class(tags)
  for key, classes in pairs(LANDUSE_CLASSES) do
    local value = tags[key]
    if value ~= nil and classes[value] ~= nil then return classes[value], value end
  end
  return nil, nil
end

local function water_area_kind(tags)
  if tags.natural == 'water' then return WATER_AREA_KINDS[tags.water] or 'water' end
  if tags.waterway == 'riverbank' then return 'river' end
  if tags.landuse == 'reservoir' or tags.landuse == 'basin' then return tags.landuse end
  return nil
end

function osm2pgsql.process_node(object)
  local tags = object.tags
  if tags.name == nil then return end
  local kind = nil
  if PLACE_KINDS[tags.place] then kind = tags.place
  elseif tags.natural == 'peak' or tags.natural == 'volcano' then kind = 'peak'
  elseif tags.mountain_pass == 'yes' or tags.natural == 'saddle' then kind = 'pass' end
  if kind == nil then return end
  tables.places:insert({
    kind = kind,
    name = tags.name,
    population = to_number(tags.population),
    elevation_m = to_number(tags.ele),
    geom = object:as_point(),
  })
end

local function process_area(object, geom)
  local tags = object.tags
  local water = water_area_kind(tags)
  if water ~= nil then
    tables.water:insert({ kind = water, name = tags.name, geom = geom })
  else
    local class, kind = landuse_class(tags)
    if class ~= nil then
      tables.landuse:insert({ class = class, kind = kind, name = tags.name, geom = geom })
    end
  end
  if tags.name ~= nil and PLACE_KINDS[tags.place] then
    tables.places:insert({
      kind = tags.place,
      name = tags.name,
      population = to_number(tags.population),
      elevation_m = to_number(tags.ele),
      geom = geom:centroid(),
    })
  end
end

function osm2pgsql.process_way(object)
  local tags = object.tags
  local highway = tags.highway
  local class = highway and ROAD_CLASSES[highway]
  -- A closed way with area=yes is a square or a plaza, not a road.
  if class ~= nil and not (object.is_closed and tags.area == 'yes') then
    insert_road(object, class, highway, highway:find('_link$') ~= nil)
  elseif tags.railway ~= nil and RAILWAY_KINDS[tags.railway] ~= nil then
    insert_road(object, RAILWAY_KINDS[tags.railway], tags.railway, false)
  end
  if tags.waterway ~= nil and WATERWAY_KINDS[tags.waterway] then
    tables.waterways:insert({ kind = tags.waterway, name = tags.name, geom = object:as_linestring() })
  end
  if object.is_closed and tags.area ~= 'no' then
    process_area(object, object:as_polygon())
  end
end

function osm2pgsql.process_relation(object)
  local tags = object.tags
  if tags.type == 'multipolygon' then
    process_area(object, object:as_multipolygon())
  end
end

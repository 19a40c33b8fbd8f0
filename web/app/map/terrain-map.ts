import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  ElementRef,
  afterNextRender,
  effect,
  inject,
  input,
  output,
  signal,
  untracked,
  ViewEncapsulation,
} from '@angular/core';
import * as L from 'leaflet';
import { leafletLayer } from 'protomaps-leaflet';
import { BASE_TILE_MAX_DATA_ZOOM } from '@shared/domain/basemap';
import { BASE_MAP_BACKGROUND, baseMapLabelRules, baseMapPaintRules } from './base-map-style';
import { BasemapTilesVersion, basemapTileUrl } from './basemap-tiles-version';
import { MapLayerPreference, type MapLayers } from './map-layer-preference';
import { TerrainTilesVersion, terrainTileUrl } from './terrain-tiles-version';

/** GeoJSON order: [longitude, latitude]. */
export type MapPosition = readonly [number, number];

/** Our own self-hosted terrain tiles (hillshade with elevation tint); nothing external. */
export const TERRAIN_TILE_URL = terrainTileUrl(null);

/** How long the base map waits, at most, for the terrain's first tiles (see `holdBaseForTerrain`). */
const BASE_WAITS_FOR_TERRAIN_MS = 400;

/** Where the map looks before it has anything to show (overridden by `fitTo`). */
const FALLBACK_VIEW = { center: L.latLng(46.6, 10.4), zoom: 10 };

/** Something drawn over the terrain. Overlays are data: the map redraws them when they change. */
export type MapOverlay =
  | {
      kind: 'line';
      id: string;
      positions: readonly MapPosition[];
      color: string;
      weight?: number;
      opacity?: number;
      dashed?: boolean;
      /** Whether clicks on the line are reported (`overlayClicked`) instead of reaching the map. */
      interactive?: boolean;
      /** Tooltip text. */
      label?: string;
    }
  | {
      /** A square handle: a route vertex (draggable) or a segment midpoint (click to insert). */
      kind: 'handle';
      id: string;
      at: MapPosition;
      variant: 'vertex' | 'midpoint' | 'selected';
      draggable: boolean;
      label: string;
    }
  | {
      /** A round marker with a short text, e.g. a stop. */
      kind: 'pin';
      id: string;
      at: MapPosition;
      color: string;
      label: string;
      draggable?: boolean;
    };

export interface MapOverlayEvent {
  id: string;
  at: MapPosition;
}

/**
 * The one Leaflet wrapper: the base map (vector tiles of the imported OpenStreetMap extract,
 * drawn by protomaps-leaflet in our own style), our terrain tiles (hillshade with elevation
 * tint) and vector overlays given as data. A switch in the map's corner shows the base map, the
 * terrain or both (the hillshade multiplied over the base map, labels on top). Created after the
 * first render (Leaflet needs a sized element), removed on destroy; effects push input changes
 * to the layers. Feature screens stay Leaflet-free.
 */
@Component({
  selector: 'app-terrain-map',
  template: '',
  // Leaflet's stylesheet must reach the elements Leaflet creates: no encapsulation, and it is
  // loaded only with the screens that show a map (never in the initial bundle).
  styleUrls: ['../../../node_modules/leaflet/dist/leaflet.css', './terrain-map.scss'],
  encapsulation: ViewEncapsulation.None,
  host: { class: 'app-terrain-map', role: 'region', '[attr.aria-label]': 'ariaLabel()' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TerrainMap {
  private readonly host = inject<ElementRef<HTMLElement>>(ElementRef);

  /** What the map shows, for screen readers. */
  readonly ariaLabel = input('Map');
  /** Lines, handles and pins to draw. */
  readonly overlays = input<readonly MapOverlay[]>([]);
  /** A position to mark (e.g. the point under the pointer on a chart); null hides the marker. */
  readonly highlight = input<MapPosition | null>(null);
  /** Positions the view fits to whenever this array changes (not on every overlay change). */
  readonly fitTo = input<readonly MapPosition[] | null>(null);
  /** Map cursor, e.g. 'crosshair' while drawing. */
  readonly cursor = input<string>('');
  /**
   * Whether the page is still finding out where the map is to look (e.g. the route is being
   * read): no tiles are asked for until then, so none are fetched or shown for a view that is
   * left at once.
   */
  readonly placing = input(false);

  /** Emits where a person clicked on the map (not on an interactive overlay). */
  readonly mapClicked = output<MapPosition>();
  /** Emits when an interactive overlay (a line, a handle, a pin) is clicked. */
  readonly overlayClicked = output<MapOverlayEvent>();
  /** Emits when a draggable handle or pin is dropped somewhere else. */
  readonly overlayMoved = output<MapOverlayEvent>();

  private readonly map = signal<L.Map | null>(null);
  private readonly tilesVersion = inject(TerrainTilesVersion);
  private readonly tileLayer = L.tileLayer(TERRAIN_TILE_URL, {
    maxZoom: 18,
    attribution: 'Terrain: elevation models uploaded to Descentry',
  });
  private readonly basemapVersion = inject(BasemapTilesVersion);
  private readonly layerPreference = inject(MapLayerPreference);
  /** What the map shows: the base map, the terrain or both. */
  readonly layers = this.layerPreference.layers;

  constructor() {
    this.tilesVersion.ensureLoaded();
    this.basemapVersion.ensureLoaded();
    afterNextRender(() => this.createMap());

    // The view first: when the page's place and the layers' versions arrive together, the tiles are
    // asked for where the map is to look.
    effect(() => {
      const map = this.map();
      const positions = this.fitTo();
      // Until tiles are on show there is nothing to animate: the view jumps to its place, and the
      // first tiles are asked for there rather than at the end of a zoom animation.
      if (map && positions) fitView(map, positions, this.hasTiles(map));
    });
    // The layers follow the catalogues' versions (new terrain models or another active extract
    // change the tile addresses) and the layer switch. The terrain's effect comes first: when both
    // versions arrive together its tiles are asked for before the base map's, so the relief (the
    // biggest thing the map paints) does not queue behind the base tiles for a connection.
    effect(() => {
      const map = this.map();
      this.tilesVersion.settled();
      this.tilesVersion.version();
      this.basemapVersion.state();
      this.layers();
      this.placing();
      if (map) untracked(() => this.showTerrain(map));
    });
    effect(() => {
      const map = this.map();
      this.basemapVersion.state();
      this.tilesVersion.settled();
      this.layers();
      this.placing();
      if (map) untracked(() => this.showBase(map));
    });
    inject(DestroyRef).onDestroy(() => {
      this.destroyed = true;
      this.map()?.remove();
    });

    const overlayLayer = L.layerGroup();
    effect(() => {
      const map = this.map();
      if (!map) return;
      const overlays = this.overlays();
      untracked(() => this.drawOverlays(overlayLayer, overlays));
      if (!map.hasLayer(overlayLayer)) overlayLayer.addTo(map);
    });

    const highlightMarker = L.circleMarker([0, 0], {
      radius: 8,
      color: '#ffffff',
      weight: 3,
      fillColor: '#b3261e',
      fillOpacity: 1,
      interactive: false,
    });
    effect(() => {
      const map = this.map();
      const at = this.highlight();
      if (!map) return;
      if (at) {
        highlightMarker.setLatLng(toLatLng(at));
        if (!map.hasLayer(highlightMarker)) highlightMarker.addTo(map);
      } else {
        highlightMarker.remove();
      }
    });

    effect(() => {
      const map = this.map();
      if (map) map.getContainer().style.cursor = this.cursor();
    });
  }

  /** The centre of the current view (null before the map exists), e.g. to place a first point from the keyboard. */
  centre(): MapPosition | null {
    const map = this.map();
    return map ? fromLatLng(map.getCenter()) : null;
  }

  private layerControl: LayerSwitch | null = null;
  /** Whether the element's size has been reported once (no tiles before, see `createMap`). */
  private sized = false;
  /** Whether the terrain has been on the map (the base map waits for it the first time only). */
  private terrainShownOnce = false;
  /** Whether the base map waits for the terrain's first tiles (see `holdBaseForTerrain`). */
  private baseHeld = false;
  private destroyed = false;
  private baseLayers: L.Layer[] = [];
  private shownBaseVersion: string | null = null;
  private shownTerrainUrl: string | null = null;

  /**
   * The terrain layer: on the map when the layer switch wants it, and only once the catalogue
   * version is known, with it in the tile URL (so a first batch is never fetched unversioned and
   * then again); new or removed terrain models change the version and the tiles on show are
   * fetched again.
   */
  private showTerrain(map: L.Map): void {
    if (!this.sized || !this.tilesVersion.settled() || this.placing()) return;
    const url = terrainTileUrl(this.tilesVersion.version());
    if (!this.layersShown().terrain) {
      this.tileLayer.remove();
      return;
    }
    const onMap = map.hasLayer(this.tileLayer);
    if (url !== this.shownTerrainUrl) {
      this.tileLayer.setUrl(url, !onMap);
      this.shownTerrainUrl = url;
    }
    if (!onMap) {
      this.tileLayer.addTo(map);
      if (!this.terrainShownOnce) this.holdBaseForTerrain(map);
    }
  }

  /**
   * The first time the terrain goes on, the base map waits until its tiles have loaded (at most
   * `BASE_WAITS_FOR_TERRAIN_MS`): drawing the vector tiles is main-thread work that would
   * otherwise delay the painting of the relief, the largest thing on the map.
   */
  private holdBaseForTerrain(map: L.Map): void {
    this.terrainShownOnce = true;
    if (!this.tileLayer.isLoading()) return;
    this.baseHeld = true;
    const release = () => {
      clearTimeout(timer);
      this.tileLayer.off('load', release);
      if (!this.baseHeld) return;
      this.baseHeld = false;
      if (!this.destroyed) untracked(() => this.showBase(map));
    };
    const timer = setTimeout(release, BASE_WAITS_FOR_TERRAIN_MS);
    this.tileLayer.on('load', release);
  }

  /**
   * Which layers the map shows: the layer switch's choice where there is a base map (an active
   * extract), the terrain alone where there is none.
   */
  private layersShown(): { base: boolean; terrain: boolean } {
    const hasBaseMap = (this.basemapVersion.state()?.version ?? null) !== null;
    const layers = this.layers();
    return { base: hasBaseMap && layers !== 'terrain', terrain: !hasBaseMap || layers !== 'base' };
  }

  /** Whether any tiles are on the map (a change of view is then animated). */
  private hasTiles(map: L.Map): boolean {
    return map.hasLayer(this.tileLayer) || this.baseLayers.some((layer) => map.hasLayer(layer));
  }

  /**
   * The base map's two layers, for the active extract (its version is in the tile URL) and the layer
   * switch. The first time, the layers wait for the terrain when it is to be shown: its catalogue
   * (so its tiles are asked for before the base map's), then its first tiles
   * (`holdBaseForTerrain`). The switch and the blending follow the choice at once meanwhile, so the
   * relief does not change its look when the base map comes in under it.
   */
  private showBase(map: L.Map): void {
    if (!this.sized || this.placing()) return;
    const state = this.basemapVersion.state();
    const version = state?.version ?? null;
    const { base: showBase, terrain: showTerrain } = this.layersShown();
    map.getContainer().classList.toggle('app-map-blended', showBase && showTerrain);
    this.layerControl?.update(version !== null, this.layers());
    // Only while the terrain is to be shown: a switch to the base map alone shows it at once.
    if (showTerrain && (this.baseHeld || (!this.terrainShownOnce && !this.tilesVersion.settled()))) return;
    if (version !== this.shownBaseVersion) {
      for (const layer of this.baseLayers) layer.remove();
      this.baseLayers = version ? createBaseLayers(version, state?.attribution ?? null) : [];
      this.shownBaseVersion = version;
    }
    for (const layer of this.baseLayers) {
      if (showBase && !map.hasLayer(layer)) layer.addTo(map);
      if (!showBase) layer.remove();
    }
  }

  private createMap(): void {
    const element = this.host.nativeElement;
    const map = L.map(element, { zoomControl: true });
    // The first view is where the map is to look if that is known already (the page had its data
    // before the map's code arrived), so no tiles are fetched for a view that is left at once.
    const positions = untracked(this.fitTo);
    if (!positions || !fitView(map, positions, false)) map.setView(FALLBACK_VIEW.center, FALLBACK_VIEW.zoom);
    // Base map below the terrain's tile pane (200), its labels above the terrain and below the overlays (400).
    map.createPane('app-basemap').style.zIndex = '150';
    map.createPane('app-basemap-labels').style.zIndex = '350';
    map.getPane('app-basemap-labels')!.style.pointerEvents = 'none';
    L.control.scale({ imperial: true, metric: true }).addTo(map);
    this.layerControl = new LayerSwitch((layers) => this.layerPreference.set(layers));
    this.layerControl.addTo(map);
    map.on('click', (event: L.LeafletMouseEvent) => this.mapClicked.emit(fromLatLng(event.latlng)));
    // The element may be sized by a layout that settles after the first frame (the page's shell
    // and grid). Tiles are asked for from the observer's first report on, when the size is the
    // element's own: the first view is fitted again at that size, then the layers go on at once,
    // terrain first, instead of a change detection later.
    const resizeObserver = new ResizeObserver(() => {
      map.invalidateSize();
      if (this.sized) return;
      this.sized = true;
      untracked(() => {
        const first = this.fitTo();
        if (first) fitView(map, first, false);
        this.showTerrain(map);
        this.showBase(map);
      });
    });
    resizeObserver.observe(element);
    map.on('unload', () => resizeObserver.disconnect());
    this.map.set(map);
  }

  private drawOverlays(group: L.LayerGroup, overlays: readonly MapOverlay[]): void {
    group.clearLayers();
    for (const overlay of overlays) {
      const layer = this.layerFor(overlay);
      layer.addTo(group);
    }
  }

  private layerFor(overlay: MapOverlay): L.Layer {
    switch (overlay.kind) {
      case 'line': {
        const line = L.polyline(overlay.positions.map(toLatLng), {
          color: overlay.color,
          weight: overlay.weight ?? 4,
          opacity: overlay.opacity ?? 0.95,
          dashArray: overlay.dashed ? '8 6' : undefined,
          interactive: overlay.interactive ?? false,
          bubblingMouseEvents: false,
        });
        if (overlay.label) line.bindTooltip(overlay.label, { sticky: true });
        if (overlay.interactive) {
          line.on('click', (event: L.LeafletMouseEvent) => this.overlayClicked.emit({ id: overlay.id, at: fromLatLng(event.latlng) }));
        }
        return line;
      }
      case 'handle':
      case 'pin': {
        const isHandle = overlay.kind === 'handle';
        const className = isHandle ? `app-map-handle app-map-handle-${overlay.variant}` : 'app-map-pin';
        const size = isHandle ? (overlay.variant === 'midpoint' ? 12 : 16) : 22;
        // Div icons carry no image: nothing to break once the build hashes file names. The pin's
        // colour is set on the element (not as a style attribute in markup, which the
        // Content-Security-Policy refuses).
        const icon = L.divIcon({ className, iconSize: [size, size], html: isHandle ? '' : pinDot(overlay.color) });
        const marker = L.marker(toLatLng(overlay.at), {
          icon,
          draggable: overlay.draggable ?? false,
          keyboard: true,
          title: overlay.label,
          alt: overlay.label,
          bubblingMouseEvents: false,
          riseOnHover: true,
        });
        marker.on('click', () => this.overlayClicked.emit({ id: overlay.id, at: overlay.at }));
        marker.on('keypress', (event: L.LeafletKeyboardEvent) => {
          if (event.originalEvent.key === 'Enter') this.overlayClicked.emit({ id: overlay.id, at: overlay.at });
        });
        marker.on('dragend', () => this.overlayMoved.emit({ id: overlay.id, at: fromLatLng(marker.getLatLng()) }));
        return marker;
      }
    }
  }
}

/** Fonts the labels use, loaded before the first tile is drawn (the canvas cannot wait for them). */
const LABEL_FONTS = ['500 11px "Noto Sans"', '700 15px "Noto Sans"', 'italic 400 11px "Noto Sans"'];

/** The base map as two layers: the painted map under the terrain, its labels above it. */
function createBaseLayers(version: string, attribution: string | null): L.Layer[] {
  const url = basemapTileUrl(version);
  const fontsLoaded = LABEL_FONTS.map((font) => document.fonts.load(font).then(() => ({ status: 'loaded', reason: new Error() })));
  const common = { url, maxDataZoom: BASE_TILE_MAX_DATA_ZOOM, maxZoom: 19 };
  const painted = leafletLayer({
    ...common,
    pane: 'app-basemap',
    paintRules: baseMapPaintRules(),
    labelRules: [],
    backgroundColor: BASE_MAP_BACKGROUND,
    attribution: `Base map: ${escapeHtml(attribution ?? 'imported OpenStreetMap extract')}`,
  }) as unknown as L.Layer;
  const labels = leafletLayer({
    ...common,
    pane: 'app-basemap-labels',
    paintRules: [],
    labelRules: baseMapLabelRules(),
    tasks: fontsLoaded,
    attribution: '',
  }) as unknown as L.Layer;
  // A label tile of another zoom, stretched while the new ones are drawn, shows letters many
  // times their size: the labels layer keeps no tiles of other zooms (Leaflet's GridLayer hooks).
  // Both layers draw the same vector tiles: the labels read them through the painted layer's tile
  // cache (`views`, which merges requests in flight and keeps the parsed tiles), so each tile is
  // fetched and parsed once instead of once per layer.
  Object.assign(labels, {
    _retainParent: () => false,
    _retainChildren: () => undefined,
    views: (painted as unknown as { views: unknown }).views,
  });
  return [painted, labels];
}

function escapeHtml(text: string): string {
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');
}

const LAYER_CHOICES: ReadonlyArray<{ value: MapLayers; label: string }> = [
  { value: 'both', label: 'Base map and terrain' },
  { value: 'base', label: 'Base map' },
  { value: 'terrain', label: 'Terrain' },
];

/** The map's layer switch: three radio buttons in a Leaflet control (keyboard and screen-reader friendly). */
class LayerSwitch extends L.Control {
  private readonly inputs = new Map<MapLayers, HTMLInputElement>();
  private readonly element: HTMLFieldSetElement;

  constructor(private readonly changed: (layers: MapLayers) => void) {
    super({ position: 'topright' });
    this.element = L.DomUtil.create('fieldset', 'app-map-layers leaflet-bar') as HTMLFieldSetElement;
    const legend = L.DomUtil.create('legend', 'app-visually-hidden', this.element);
    legend.textContent = 'Map layers';
    const name = `app-map-layers-${Math.random().toString(36).slice(2, 8)}`;
    for (const choice of LAYER_CHOICES) {
      const label = L.DomUtil.create('label', '', this.element);
      const input = L.DomUtil.create('input', '', label) as HTMLInputElement;
      input.type = 'radio';
      input.name = name;
      input.value = choice.value;
      input.addEventListener('change', () => input.checked && this.changed(choice.value));
      label.append(choice.label);
      this.inputs.set(choice.value, input);
    }
    L.DomEvent.disableClickPropagation(this.element);
    L.DomEvent.disableScrollPropagation(this.element);
  }

  override onAdd(): HTMLElement {
    return this.element;
  }

  /** Shows the switch only when there is a base map to switch to, with `layers` checked. */
  update(hasBaseMap: boolean, layers: MapLayers): void {
    this.element.hidden = !hasBaseMap;
    for (const [value, input] of this.inputs) input.checked = value === layers;
  }
}

function toLatLng(position: MapPosition): L.LatLng {
  return L.latLng(position[1], position[0]);
}

function fromLatLng(latLng: L.LatLng): MapPosition {
  return [round7(latLng.lng), round7(latLng.lat)];
}

/** 7 decimals ≈ 1 cm: enough for a route, and GeoJSON stays readable. */
function round7(value: number): number {
  return Math.round(value * 1e7) / 1e7;
}

/** The coloured dot inside a map pin. */
function pinDot(color: string): HTMLElement {
  const dot = document.createElement('span');
  dot.style.background = color;
  return dot;
}

/**
 * Shows `positions`: one at (at least) street zoom, several with all of them in view, animated
 * or not. False when there is nothing to show.
 */
function fitView(map: L.Map, positions: readonly MapPosition[], animate: boolean): boolean {
  if (positions.length === 0) return false;
  if (positions.length === 1) {
    map.setView(toLatLng(positions[0]!), Math.max(map.getZoom() || 0, 14), { animate });
  } else {
    map.fitBounds(L.latLngBounds(positions.map(toLatLng)), { padding: [24, 24], maxZoom: 16, animate });
  }
  return true;
}

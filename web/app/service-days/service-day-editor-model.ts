import type { Block, BlockTrip, Charger, ChargerKind, ServiceDay, ServiceDayDraft } from '@shared/domain/service-days';
import { estimatedArrivalS } from './service-day-timeline-model';

/** A new service day before anything is chosen. */
export function emptyDraft(): ServiceDayDraft {
  return {
    name: '',
    dayType: 'weekday',
    season: 'winter',
    batteryAge: 'beginning-of-life',
    reserveSoc: 0.15,
    inService: false,
    chargers: [],
    blocks: [],
  };
}

/** The editable part of a saved service day. */
export function draftOf(day: ServiceDay): ServiceDayDraft {
  const { name, dayType, season, batteryAge, reserveSoc, inService, chargers, blocks } = day;
  return structuredClone({ name, dayType, season, batteryAge, reserveSoc, inService, chargers, blocks });
}

/**
 * Defaults for a charger placed on the map: a pantograph or plug charger of the size terminus
 * and depot chargers for buses are commonly built at (150 kW at a terminus, 100 kW per depot
 * bay), 92 % from grid to battery and charging to 90 % SOC (common practice; the charger's data
 * sheet and the vehicle maker's charging limits decide).
 */
export const CHARGER_DEFAULTS: Readonly<Record<ChargerKind, Pick<Charger, 'powerW' | 'efficiency' | 'targetSoc' | 'connectS'>>> = {
  terminus: { powerW: 150_000, efficiency: 0.92, targetSoc: 0.9, connectS: 30 },
  depot: { powerW: 100_000, efficiency: 0.92, targetSoc: 0.95, connectS: 60 },
};

/** A charger at `position`, with a key and a name no other charger of the day has. */
export function newCharger(existing: readonly Charger[], position: [number, number], kind: ChargerKind): Charger {
  let n = existing.length + 1;
  while (existing.some((charger) => charger.key === `charger-${n}`)) n++;
  const name = kind === 'depot' ? `Depot charger ${n}` : `Terminus charger ${n}`;
  return { key: `charger-${n}`, name, kind, position, ...CHARGER_DEFAULTS[kind] };
}

/** A new block after the others: its own name, the first vehicle, a depot charger if there is one. */
export function newBlock(existing: readonly Block[], vehicleProfileId: string, chargers: readonly Charger[]): Block {
  let n = existing.length + 1;
  while (existing.some((block) => block.blockId === `Block ${n}`)) n++;
  const depot = chargers.find((charger) => charger.kind === 'depot');
  return {
    blockId: `Block ${n}`,
    vehicleProfileId,
    ...(depot ? { depotChargerKey: depot.key } : {}),
    pullOutS: 6 * 3600,
    pullInS: 20 * 3600,
    startSoc: 0.95,
    trips: [],
  };
}

/** Shortest layover the editor proposes between trips, s (common practice: recovery time at a terminus). */
export const DEFAULT_LAYOVER_S = 10 * 60;

/**
 * The next trip of a block on `routeId`: after the last trip's estimated arrival and a layover,
 * on a five-minute mark, in the opposite direction (a vehicle shuttles along its route).
 */
export function nextTrip(block: Block, routeId: string, lengthOf: (routeId: string) => number | undefined): BlockTrip {
  const last = block.trips.at(-1);
  if (!last)
    return { routeId, direction: 'outbound', departureS: Math.max(block.pullOutS + 10 * 60, 0), load: { kind: 'case', case: 'seated' } };
  const arrivalS = estimatedArrivalS(last.departureS, lengthOf(last.routeId) ?? 0);
  const departureS = Math.min(36 * 3600, Math.ceil((arrivalS + DEFAULT_LAYOVER_S) / 300) * 300);
  const direction = last.routeId === routeId ? (last.direction === 'outbound' ? 'inbound' : 'outbound') : 'outbound';
  return { routeId, direction, departureS, load: last.load };
}

/** Checks the editor can make before saving; messages by the field path they concern (as the API's). */
export function checkDraft(draft: ServiceDayDraft): Map<string, string> {
  const problems = new Map<string, string>();
  if (!draft.name.trim()) problems.set('name', 'Give the service day a name.');
  if (draft.blocks.length === 0) problems.set('blocks', 'Add at least one block.');
  const seenBlocks = new Set<string>();
  draft.blocks.forEach((block, index) => {
    if (!block.blockId.trim()) problems.set(`blocks.${index}.blockId`, 'Give the block a name.');
    else if (seenBlocks.has(block.blockId)) problems.set(`blocks.${index}.blockId`, `Another block is already called “${block.blockId}”.`);
    seenBlocks.add(block.blockId);
    if (block.trips.length === 0) problems.set(`blocks.${index}.trips`, 'Add at least one trip to the block.');
    if (block.pullInS <= block.pullOutS) problems.set(`blocks.${index}.pullInS`, 'Pull-in must be after pull-out.');
  });
  const seenChargers = new Set<string>();
  draft.chargers.forEach((charger, index) => {
    if (!charger.name.trim()) problems.set(`chargers.${index}.name`, 'Give the charger a name.');
    if (seenChargers.has(charger.key)) problems.set(`chargers.${index}.name`, 'Two chargers share a key.');
    seenChargers.add(charger.key);
  });
  return problems;
}

/**
 * The field problems of a 4xx answer, by field path (`blocks.2.trips.0.departureS`): the
 * validation issues the API lists in `details.issues`, or the one field it names in `details`
 * (`field` or `path`, within the block `blockIndex` and trip `tripIndex` when given), which then
 * carries the answer's `message`.
 */
export function fieldErrors(details: unknown, message: string): Map<string, string> {
  const errors = new Map<string, string>();
  if (!details || typeof details !== 'object') return errors;
  const { issues, field, path } = details as { issues?: unknown; field?: unknown; path?: unknown };
  if (Array.isArray(issues)) {
    for (const issue of issues) {
      if (!issue || typeof issue !== 'object') continue;
      const { path: issuePath, message } = issue as { path?: unknown; message?: unknown };
      if (Array.isArray(issuePath) && typeof message === 'string') errors.set(issuePath.join('.'), message);
    }
  }
  const { blockIndex, tripIndex } = details as { blockIndex?: unknown; tripIndex?: unknown };
  let named =
    typeof field === 'string'
      ? field.replace(/\[(\d+)\]/g, '.$1')
      : Array.isArray(path)
        ? path.join('.')
        : typeof path === 'string'
          ? path
          : null;
  if (named && typeof blockIndex === 'number') {
    named = `blocks.${blockIndex}${typeof tripIndex === 'number' ? `.trips.${tripIndex}` : ''}.${named}`;
  } else if (!named && typeof blockIndex === 'number') {
    named = `blocks.${blockIndex}`;
  }
  // A charger's key is not shown: its problem is shown beside the charger's name.
  if (named) named = named.replace(/^(chargers\.\d+)\.key$/, '$1.name');
  if (named && !errors.has(named)) errors.set(named, message);
  return errors;
}

/** Whether any error lies inside `prefix` (e.g. a block the person has not opened). */
export function hasErrorWithin(errors: ReadonlyMap<string, string>, prefix: string): boolean {
  for (const key of errors.keys()) if (key === prefix || key.startsWith(`${prefix}.`)) return true;
  return false;
}

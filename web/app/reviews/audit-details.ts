import { riskLevelSchema } from '@shared/domain/analysis';
import { mitigationSchema } from '@shared/domain/reviews';
import { RISK_STYLES } from '@shared/presentation/index';

/** One line of an audit event's details, as a person reads it. */
export interface AuditDetailLine {
  label: string;
  value: string;
}

/** Keys that are for machines (ids, event kinds) and say nothing to a reader. */
const HIDDEN_KEYS = new Set(['kind', 'applied', 'scenarioId', 'reviewId', 'routeId', 'vehicleProfileId', 'jobId']);

const KNOWN_LABELS: Readonly<Record<string, string>> = {
  risk: 'Risk',
  riskBefore: 'Risk before',
  riskAfter: 'Risk after',
  previousRisk: 'Risk before',
  mitigatedRisk: 'Risk with the mitigation',
  newRisk: 'Risk after',
  peakBrakeTempC: 'Peak brake temperature',
  previousPeakBrakeTempC: 'Peak brake temperature before',
  mitigatedPeakBrakeTempC: 'Peak brake temperature with the mitigation',
  scenarioName: 'Scenario',
  rerun: 'Re-run with the measure',
  proposedBy: 'Proposed by',
  signedOffBy: 'Signed off by',
  declinedReason: 'Reason sent back',
  awaiting: 'Waiting for',
  maxSafeSpeedAfterKph: 'Highest safe descent speed after',
  belowElevated: 'Below elevated risk after the re-run',
  rerunStatus: 'Re-run',
  reason: 'Reason',
  error: 'Problem',
};

/** Keys shown first, in this order; the rest follow as the server sent them. */
const KEY_ORDER = [
  'mitigation',
  'reason',
  'risk',
  'riskBefore',
  'previousRisk',
  'riskAfter',
  'newRisk',
  'mitigatedRisk',
  'peakBrakeTempC',
  'previousPeakBrakeTempC',
  'mitigatedPeakBrakeTempC',
  'maxSafeSpeedAfterKph',
];

/**
 * Turns an audit event's free-form details into labelled lines: risk levels in our words,
 * temperatures with °C, mitigation measures spelled out, unknown keys humanised.
 */
export function describeAuditDetails(details: Record<string, unknown> | null): AuditDetailLine[] {
  if (!details) return [];
  const lines: AuditDetailLine[] = [];
  const entries = Object.entries(details).sort(([a], [b]) => orderOf(a) - orderOf(b));
  for (const [key, value] of entries) {
    if (HIDDEN_KEYS.has(key) || value === null || value === undefined) continue;
    if (key === 'mitigation') {
      lines.push(...describeMitigation(value));
      continue;
    }
    lines.push({ label: KNOWN_LABELS[key] ?? humanise(key), value: describeValue(key, value) });
  }
  return lines;
}

/** The measures of a mitigation, one line each. */
export function describeMitigation(value: unknown): AuditDetailLine[] {
  const parsed = mitigationSchema.safeParse(value);
  if (!parsed.success) return [{ label: 'Mitigation', value: JSON.stringify(value) }];
  const measures = parsed.data;
  const lines: AuditDetailLine[] = [];
  if (measures.descentSpeedCapKph !== undefined) {
    lines.push({ label: 'Descent speed cap', value: `${formatNumber(measures.descentSpeedCapKph)} km/h` });
  }
  if (measures.socCeiling !== undefined) {
    lines.push({ label: 'SOC ceiling at the top', value: `${formatNumber(measures.socCeiling * 100)} %` });
  }
  if (measures.vehicleRestriction) lines.push({ label: 'Vehicle restriction', value: measures.vehicleRestriction });
  if (measures.mandatoryRetarder) lines.push({ label: 'Retarder or regeneration mode', value: 'mandatory' });
  return lines;
}

function orderOf(key: string): number {
  const index = KEY_ORDER.indexOf(key);
  return index === -1 ? KEY_ORDER.length : index;
}

function describeValue(key: string, value: unknown): string {
  const risk = riskLevelSchema.safeParse(value);
  if (risk.success) return RISK_STYLES[risk.data].label;
  if (typeof value === 'number') {
    if (key.endsWith('TempC') || key.endsWith('C')) return `${formatNumber(value)} °C`;
    if (key.endsWith('Kph')) return `${formatNumber(value)} km/h`;
    return formatNumber(value);
  }
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  if (typeof value === 'string') return value;
  return JSON.stringify(value);
}

function formatNumber(value: number): string {
  return value.toLocaleString('en-GB', { maximumFractionDigits: 1 });
}

/** "peakBrakeTempC" → "Peak brake temp c": better than a raw key. */
function humanise(key: string): string {
  const words = key.replace(/([a-z0-9])([A-Z])/g, '$1 $2').toLowerCase();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

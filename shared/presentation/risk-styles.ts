/**
 * How each brake-fade risk level looks, everywhere: the chips, the map lines, the chart bands, the
 * review screens and the PDF report. Descentry's own palette (moss, ochre, rust, plum); one set of
 * colours per level so "critical" is the same colour on every screen and page.
 */
import type { RiskLevel } from '../domain/analysis';
import { RISK_LABELS, RISK_MEANINGS, RISK_ORDER } from './labels';

export interface RiskStyle {
  label: string;
  /** One sentence a non-engineer understands. */
  meaning: string;
  /** Chip background and text; the pair meets WCAG AA contrast (≥ 4.5:1). */
  surface: string;
  text: string;
  /** Strong colour for lines, bars and chart bands. */
  accent: string;
  /** Colour for text printed on white (the PDF's descent rows); ≥ 4.5:1 on white. */
  ink: string;
}

const COLOURS: Readonly<Record<RiskLevel, Pick<RiskStyle, 'surface' | 'text' | 'accent' | 'ink'>>> = {
  low: { surface: '#dcebe0', text: '#1f3d2b', accent: '#4f7d5c', ink: '#2f6b43' },
  elevated: { surface: '#f4e6b8', text: '#4d3a00', accent: '#b08900', ink: '#7a5c00' },
  high: { surface: '#f8d5c2', text: '#5e2408', accent: '#c2570c', ink: '#a23b12' },
  critical: { surface: '#5c1634', text: '#ffffff', accent: '#8a1c4a', ink: '#8a1c4a' },
};

export const RISK_STYLES: Readonly<Record<RiskLevel, RiskStyle>> = Object.fromEntries(
  RISK_ORDER.map((level) => [level, { label: RISK_LABELS[level], meaning: RISK_MEANINGS[level], ...COLOURS[level] }]),
) as Record<RiskLevel, RiskStyle>;

/** Higher number, worse risk (0 low … 3 critical): for sorting, storing and "did it get worse". */
export function riskRank(risk: RiskLevel): number {
  return RISK_ORDER.indexOf(risk);
}

/** Whether a risk level calls for the engineering caution beside it and a review item (elevated or worse). */
export function needsCaution(risk: RiskLevel): boolean {
  return riskRank(risk) >= riskRank('elevated');
}

/** Whether a risk level is urgent: high or critical. */
export function isHighRisk(risk: RiskLevel): boolean {
  return riskRank(risk) >= riskRank('high');
}

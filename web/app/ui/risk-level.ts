import type { RiskLevel } from '@shared/domain/analysis';

/** How each risk level looks and reads. Descentry's own palette: moss, ochre, rust, plum. */
export interface RiskStyle {
  label: string;
  /** One sentence a non-engineer understands. */
  meaning: string;
  /** Chip background and text; the pair meets WCAG AA contrast (≥ 4.5:1). */
  surface: string;
  text: string;
  /** Strong colour for lines, bars and chart bands. */
  accent: string;
}

export const RISK_LEVELS: readonly RiskLevel[] = ['low', 'elevated', 'high', 'critical'];

export const RISK_STYLES: Readonly<Record<RiskLevel, RiskStyle>> = {
  low: {
    label: 'Low',
    meaning: 'The brakes stay well below the temperature at which they start to lose grip.',
    surface: '#dcebe0',
    text: '#1f3d2b',
    accent: '#4f7d5c',
  },
  elevated: {
    label: 'Elevated',
    meaning: 'The brakes get hot; worth watching, especially with a full vehicle or a full battery.',
    surface: '#f4e6b8',
    text: '#4d3a00',
    accent: '#b08900',
  },
  high: {
    label: 'High',
    meaning: 'The brakes reach the temperature at which they start to fade (lose stopping power).',
    surface: '#f8d5c2',
    text: '#5e2408',
    accent: '#c2570c',
  },
  critical: {
    label: 'Critical',
    meaning: 'The brakes go well past the fade temperature; the descent needs a measure before service.',
    surface: '#5c1634',
    text: '#ffffff',
    accent: '#8a1c4a',
  },
};

/** Higher number, worse risk: for sorting and for "did it get better". */
export function riskRank(risk: RiskLevel): number {
  return RISK_LEVELS.indexOf(risk);
}

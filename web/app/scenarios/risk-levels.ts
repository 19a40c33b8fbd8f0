import type { RiskLevel } from '@shared/domain/analysis';

export interface RiskStyle {
  label: string;
  /** Chip background and text: each pair keeps at least 4.5:1 contrast. */
  background: string;
  text: string;
  /** Line colour on the map and in charts. */
  stroke: string;
}

/** Descentry's own risk colours: calm sage, ochre, burnt orange, deep crimson. */
export const RISK_STYLES: Readonly<Record<RiskLevel, RiskStyle>> = {
  low: { label: 'Low', background: '#dcebdc', text: '#1f4d2b', stroke: '#3f7f4f' },
  elevated: { label: 'Elevated', background: '#f6e3b0', text: '#5a4100', stroke: '#b58900' },
  high: { label: 'High', background: '#f7cfb4', text: '#6b2400', stroke: '#d0601a' },
  critical: { label: 'Critical', background: '#8e1b2c', text: '#ffffff', stroke: '#8e1b2c' },
};

export const RISK_ORDER: readonly RiskLevel[] = ['low', 'elevated', 'high', 'critical'];

/** Whether a risk level calls for the engineering caution beside it (elevated or worse). */
export function needsCaution(risk: RiskLevel): boolean {
  return risk !== 'low';
}

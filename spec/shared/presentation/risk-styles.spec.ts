import { describe, expect, it } from 'vitest';
import { RISK_LABELS, RISK_MEANINGS, RISK_ORDER, RISK_STYLES, isHighRisk, needsCaution, riskRank } from '@shared/presentation/index';

/** WCAG 2.1 relative luminance and contrast ratio (W3C, "Web Content Accessibility Guidelines 2.1", §1.4.3 definitions). */
function luminance(hex: string): number {
  const value = Number.parseInt(hex.slice(1), 16);
  const [r, g, b] = [(value >> 16) & 255, (value >> 8) & 255, value & 255].map((c) => {
    const s = c / 255;
    return s <= 0.03928 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
  });
  return 0.2126 * r! + 0.7152 * g! + 0.0722 * b!;
}
function contrast(a: string, b: string): number {
  const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x);
  return (hi! + 0.05) / (lo! + 0.05);
}

describe('risk styles', () => {
  it('ranks the levels low < elevated < high < critical', () => {
    expect(RISK_ORDER.map(riskRank)).toEqual([0, 1, 2, 3]);
  });

  it('takes label and meaning from the shared labels, so a level reads the same everywhere', () => {
    for (const level of RISK_ORDER) {
      expect(RISK_STYLES[level].label).toBe(RISK_LABELS[level]);
      expect(RISK_STYLES[level].meaning).toBe(RISK_MEANINGS[level]);
    }
  });

  it('gives every chip and every printed row at least 4.5:1 contrast (WCAG 2.1 AA)', () => {
    for (const level of RISK_ORDER) {
      expect(contrast(RISK_STYLES[level].surface, RISK_STYLES[level].text)).toBeGreaterThanOrEqual(4.5);
      expect(contrast(RISK_STYLES[level].ink, '#ffffff')).toBeGreaterThanOrEqual(4.5);
    }
  });

  it('uses a different line colour for each level', () => {
    expect(new Set(RISK_ORDER.map((level) => RISK_STYLES[level].accent)).size).toBe(4);
  });

  it('asks for the caution from elevated up and calls high and critical urgent', () => {
    expect(RISK_ORDER.filter(needsCaution)).toEqual(['elevated', 'high', 'critical']);
    expect(RISK_ORDER.filter(isHighRisk)).toEqual(['high', 'critical']);
  });
});

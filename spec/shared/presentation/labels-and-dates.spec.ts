import { describe, expect, it } from 'vitest';
import { formatDate, formatDateTime } from '../../../shared/presentation/dates';
import { DIRECTION_LABELS, describeLoad, describeSeason } from '../../../shared/presentation/labels';
import { formatNumber } from '../../../shared/presentation/units';

describe('labels', () => {
  it('names stored codes in words', () => {
    expect(DIRECTION_LABELS.outbound).toBe('Outbound');
    expect(describeLoad({ kind: 'case', case: 'full-standing' })).toBe('Full standing load');
    expect(describeSeason({ kind: 'custom', ambientC: -5, auxPowerW: 18_000 })).toBe('Custom: −5 °C, 18 kW auxiliary');
  });
});

describe('dates', () => {
  it('prints a stored timestamp as a date a person reads', () => {
    expect(formatDate('2026-12-02T12:00:00.000Z')).toMatch(/^[123] December 2026$/);
    expect(formatDateTime('2026-12-02T12:00:00.000Z')).toMatch(/^[123] December 2026, \d\d:\d\d$/);
  });
});

describe('formatNumber', () => {
  it('never prints minus zero', () => {
    expect(formatNumber(-0.004, 1)).toBe('0.0');
    expect(formatNumber(-3.2, 1)).toBe('−3.2');
  });
});

import { formatQuantity, fromDisplay, toDisplay, unitLabel } from '../../../web/app/units/unit-format';

describe('formatQuantity', () => {
  it('shows metres as kilometres with two decimals', () => {
    expect(formatQuantity('distance', 12_345, 'metric')).toBe('12.35 km');
  });

  it('shows metres as miles in imperial', () => {
    expect(formatQuantity('distance', 1_609.344, 'imperial')).toBe('1.00 mi');
  });

  it('shows m/s as km/h and mph', () => {
    expect(formatQuantity('speed', 10, 'metric')).toBe('36 km/h');
    expect(formatQuantity('speed', 10, 'imperial')).toBe('22 mph');
  });

  it('converts °C to °F with the offset', () => {
    expect(formatQuantity('temperature', 100, 'imperial')).toBe('212 °F');
    expect(formatQuantity('temperature', 450, 'metric')).toBe('450 °C');
  });

  it('shows Wh as kWh in both systems', () => {
    expect(formatQuantity('energy', 12_340, 'metric')).toBe('12.3 kWh');
    expect(formatQuantity('energy', 12_340, 'imperial')).toBe('12.3 kWh');
  });

  it('shows energy per kilometre as per mile in imperial', () => {
    expect(formatQuantity('energyPerDistance', 1, 'imperial')).toBe('1.61 kWh/mi');
  });

  it('shows kg as tonnes and SOC as a percentage', () => {
    expect(formatQuantity('mass', 13_500, 'metric')).toBe('13.5 t');
    expect(formatQuantity('soc', 0.805, 'metric')).toBe('81 %');
  });

  it('shows areas in m² or ft² and a thermal mass in kJ/K or BTU/°F', () => {
    // 8 m² ÷ 0.09290304 m²/ft²; 92 000 J/K ÷ (1 055.05585262 J/BTU × 1.8 °F/K).
    expect(formatQuantity('area', 8, 'metric')).toBe('8.0 m²');
    expect(formatQuantity('area', 8, 'imperial')).toBe('86 ft²');
    expect(formatQuantity('heatCapacity', 92_000, 'metric')).toBe('92 kJ/K');
    expect(formatQuantity('heatCapacity', 92_000, 'imperial')).toBe('48 BTU/°F');
  });

  it('writes negative grades with a true minus sign', () => {
    expect(formatQuantity('grade', -7.25, 'metric')).toBe('−7.3 %');
  });

  it('writes a dash for a missing value instead of NaN', () => {
    expect(formatQuantity('energy', null, 'metric')).toBe('—');
    expect(formatQuantity('energy', Number.NaN, 'metric')).toBe('—');
  });

  it('groups thousands for long figures', () => {
    expect(formatQuantity('elevation', 1_234.4, 'metric')).toBe('1,234 m');
  });
});

describe('display conversions', () => {
  it('round-trips a typed speed back to SI', () => {
    expect(fromDisplay('speed', toDisplay('speed', 13.4, 'imperial'), 'imperial')).toBeCloseTo(13.4, 9);
  });

  it('round-trips a typed temperature back to °C', () => {
    expect(fromDisplay('temperature', 14, 'imperial')).toBeCloseTo(-10, 9);
  });

  it('shows light masses in kg or pounds (1 lb = 0.45359237 kg exactly)', () => {
    expect(formatQuantity('lightMass', 0.45359237 * 150, 'imperial')).toBe('150 lb');
    expect(formatQuantity('lightMass', 70, 'metric')).toBe('70 kg');
    expect(fromDisplay('mass', 1, 'imperial')).toBeCloseTo(2_000 * 0.45359237, 9);
  });

  it('names the unit of each system', () => {
    expect(unitLabel('elevation', 'imperial')).toBe('ft');
    expect(unitLabel('force', 'metric')).toBe('kN');
  });
});

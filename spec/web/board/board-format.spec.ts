import {
  formatBoardCo2,
  formatBoardEnergy,
  formatBoardMoney,
  formatBoardNumber,
  formatTariff,
} from '../../../shared/presentation/board-format';

describe('board number formatting', () => {
  it('writes whole numbers with thousands separators and rounds large ones to three significant digits', () => {
    expect(formatBoardNumber(8_450)).toBe('8,450');
    expect(formatBoardNumber(412_345)).toBe('412,000');
    expect(formatBoardNumber(12.34)).toBe('12.3');
  });

  it('spells out millions', () => {
    expect(formatBoardNumber(1_234_567)).toBe('1.23 million');
    expect(formatBoardEnergy(2_500_000)).toBe('2.5 million kWh');
  });

  it('shows a dash, never NaN, for missing values', () => {
    expect(formatBoardNumber(Number.NaN)).toBe('—');
    expect(formatBoardEnergy(null)).toBe('—');
    expect(formatBoardMoney(undefined, 'EUR')).toBe('—');
    expect(formatBoardCo2(Number.POSITIVE_INFINITY)).toBe('—');
  });

  it('writes money in the network currency without cents', () => {
    expect(formatBoardMoney(48_234.5, 'EUR')).toBe('€48,200');
    expect(formatBoardMoney(512.4, 'CHF')).toBe('CHF\u00a0512');
    expect(formatBoardMoney(1_234_567, 'EUR')).toBe('€1.23 million');
    expect(formatBoardMoney(3_400_000, 'CHF')).toBe('CHF\u00a03.4 million');
  });

  it('turns kilograms of CO₂ into tonnes', () => {
    expect(formatBoardCo2(312_400)).toBe('312 t');
    expect(formatBoardCo2(840)).toBe('0.8 t');
  });

  it('keeps the tariff precise, with its unit', () => {
    expect(formatTariff(0.2135, 'EUR')).toBe('0.2135 EUR per kWh');
  });
});

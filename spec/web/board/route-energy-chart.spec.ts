import { wrapLabel } from '../../../web/app/board/route-energy-chart';

describe('wrapLabel', () => {
  it('wraps a long route name onto short lines at spaces, so a phone shows it whole (issue 10)', () => {
    expect(wrapLabel('S Ski shuttle: Korvel Pass (Skarnfeld lifts) – Orren', 22)).toEqual([
      'S Ski shuttle: Korvel',
      'Pass (Skarnfeld lifts)',
      '– Orren',
    ]);
  });

  it('keeps a short name on one line and a single long word whole', () => {
    expect(wrapLabel('Pass road', 22)).toEqual(['Pass road']);
    expect(wrapLabel('Überlandstraßenbahnverbindung', 10)).toEqual(['Überlandstraßenbahnverbindung']);
  });
});

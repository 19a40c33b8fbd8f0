import { describeAuditDetails } from '../../../web/app/reviews/audit-details';

describe('describeAuditDetails', () => {
  it('spells out a mitigation re-run: measures first, then risk before and after, without ids', () => {
    const lines = describeAuditDetails({
      scenarioId: '00000000-0000-4000-8000-000000000001',
      riskAfter: 'elevated',
      rerun: true,
      riskBefore: 'high',
      mitigation: { descentSpeedCapKph: 20, socCeiling: 0.6 },
      mitigatedPeakBrakeTempC: 402.44,
    });

    expect(lines).toEqual([
      { label: 'Descent speed cap', value: '20 km/h' },
      { label: 'SOC ceiling at the top', value: '60 %' },
      { label: 'Risk before', value: 'High' },
      { label: 'Risk after', value: 'Elevated' },
      { label: 'Peak brake temperature with the mitigation', value: '402.4 °C' },
      { label: 'Re-run with the measure', value: 'yes' },
    ]);
  });

  it('names both safety officers of a signed-off acceptance', () => {
    expect(describeAuditDetails({ reason: 'Drivers trained', proposedBy: 'Ada Officer', signedOffBy: 'Ben Officer' })).toEqual([
      { label: 'Reason', value: 'Drivers trained' },
      { label: 'Proposed by', value: 'Ada Officer' },
      { label: 'Signed off by', value: 'Ben Officer' },
    ]);
  });

  it('has nothing to say without details', () => {
    expect(describeAuditDetails(null)).toEqual([]);
  });

  it('humanises keys it does not know', () => {
    expect(describeAuditDetails({ depotName: 'Orren' })).toEqual([{ label: 'Depot name', value: 'Orren' }]);
  });
});

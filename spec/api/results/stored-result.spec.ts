import { describe, expect, it } from 'vitest';
import type { Descent } from '@shared/domain/analysis';
import {
  readStoredDescent,
  readStoredReviewItem,
  readStoredScenarioResult,
  STORED_RESULT_VERSION,
  StoredResultError,
} from '../../../api/results/stored-result';
import { aDescent, aDirectionResult, aSummary } from '../../support/scenario-fixtures';

/** A descent as rows written before the worst case kept it: no `nominalRisk`, nor any safety field. */
function aVersion1Descent(risk: 'low' | 'elevated' | 'high' | 'critical'): Descent {
  const { nominalRisk: _nominalRisk, ...descent } = aDescent({ risk });
  return descent;
}

describe('stored scenario results', () => {
  it('upgrades a version-1 result: each descent’s risk becomes its nominal risk and missing risk counts are counted', () => {
    const stored = {
      version: 1,
      summary: aSummary(),
      riskCounts: null,
      directionResults: [
        aDirectionResult('outbound', [aVersion1Descent('high'), aVersion1Descent('low')]),
        aDirectionResult('inbound', [aVersion1Descent('high')]),
      ],
    };

    const result = readStoredScenarioResult('Scenario s1', stored);

    expect(result.directions.flatMap((direction) => direction.descents.map((descent) => [descent.risk, descent.nominalRisk]))).toEqual([
      ['high', 'high'],
      ['low', 'low'],
      ['high', 'high'],
    ]);
    expect(result.riskCounts).toEqual({ low: 1, elevated: 0, high: 2, critical: 0 });
  });

  it('keeps a current result’s nominal risk, which may differ from the worst case’s risk', () => {
    const descent = aDescent({ risk: 'critical', nominalRisk: 'elevated' });

    const result = readStoredScenarioResult('Scenario s2', {
      version: STORED_RESULT_VERSION,
      summary: aSummary(),
      riskCounts: { low: 0, elevated: 0, high: 0, critical: 1 },
      directionResults: [aDirectionResult('outbound', [descent])],
    });

    expect(result.directions[0]!.descents[0]!.nominalRisk).toBe('elevated');
  });

  it('refuses a stored result whose content is not the contract’s, naming the scenario and the field', () => {
    const broken = aDirectionResult('outbound', [aDescent()]);
    (broken.descents[0] as unknown as Record<string, unknown>)['peakBrakeTempC'] = 'hot';

    const read = () =>
      readStoredScenarioResult('Scenario s3', { version: 2, summary: aSummary(), riskCounts: null, directionResults: [broken] });

    expect(read).toThrow(StoredResultError);
    expect(read).toThrow(/Scenario s3: .*directions\.0\.descents\.0\.peakBrakeTempC/);
  });

  it('refuses a schema version this server does not know', () => {
    expect(() =>
      readStoredScenarioResult('Scenario s4', {
        version: STORED_RESULT_VERSION + 1,
        summary: aSummary(),
        riskCounts: null,
        directionResults: [],
      }),
    ).toThrow(/schema version 3 is not one this server reads/);
  });
});

describe('stored review descents', () => {
  it('upgrades the shown descent and every source’s descent, and marks the row current', () => {
    const row = {
      id: 'r1',
      resultVersion: 1,
      descent: aVersion1Descent('critical'),
      sources: {
        s1: { scenarioId: 's1', descent: aVersion1Descent('critical') },
        s2: { scenarioId: 's2', descent: aVersion1Descent('high') },
      },
    };

    const read = readStoredReviewItem(row);

    expect(read.resultVersion).toBe(STORED_RESULT_VERSION);
    expect(read.descent.nominalRisk).toBe('critical');
    expect(read.sources['s2']!.descent.nominalRisk).toBe('high');
    expect(read.sources['s1']!.scenarioId).toBe('s1');
  });

  it('names the item and the source whose descent cannot be read', () => {
    expect(() => readStoredDescent('Review item r2, source s9', 2, { risk: 'grim' })).toThrow(
      /Review item r2, source s9: the stored result cannot be read/,
    );
  });
});

import { staleSentence } from '../../../web/app/ui/stale-reasons';

describe('staleSentence', () => {
  it('joins the reasons into one sentence with a capital and a full stop', () => {
    expect(staleSentence(['the calculation engine changed (1.1.0 → 1.2.0)', 'the vehicle profile changed after the run'], 'x')).toBe(
      'The calculation engine changed (1.1.0 → 1.2.0); the vehicle profile changed after the run.',
    );
  });

  it('says the fallback when no reason was given, without doubling its full stop', () => {
    expect(staleSentence([], 'a route or a vehicle profile changed after this run.')).toBe(
      'A route or a vehicle profile changed after this run.',
    );
  });
});

/**
 * The API's reasons a stored result is out of date (lower-case clauses such as "the vehicle
 * profile changed after the run") as one sentence: "The vehicle profile changed after the run;
 * the calculation engine changed (1.1.0 → 1.2.0)." `fallback` is said when no reason was given.
 */
export function staleSentence(reasons: readonly string[], fallback: string): string {
  const text = reasons.length > 0 ? reasons.join('; ') : fallback;
  const sentence = text.charAt(0).toUpperCase() + text.slice(1);
  return /[.!?]$/.test(sentence) ? sentence : `${sentence}.`;
}

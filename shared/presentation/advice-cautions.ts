/**
 * The cautions that stand beside every piece of descent advice (a safe speed, an SOC limit, a
 * risk level, a descent card): on the screens, in both PDFs and in the e-mails. Written once here
 * so every output says the same thing in the same words.
 *
 * Why each one:
 * - regeneration can drop out at any moment (a full battery, a battery-management or inverter
 *   trip, line over-voltage, a dewirement), so advice that leans on it can fail exactly when it is
 *   needed (common practice in brake-system design: the service and endurance brakes must hold the
 *   vehicle without it);
 * - the endurance-braking tests of vehicle type approval, UN ECE Regulation No. 13, Annex 4
 *   (Type-II: a fade test on a long descent; Type-IIA: the endurance-braking system alone holding
 *   a heavy vehicle on a 7 % descent, required of many buses and coaches; the regulation names
 *   which, from memory), and the operator's own procedures set what a vehicle must be able to do
 *   on a descent;
 * - the figures are engineering estimates, so local codes, the vehicle maker's limits and a
 *   licensed engineer decide.
 */

/** The heading the cautions stand under. */
export const ADVICE_CAUTIONS_TITLE = 'Before anyone acts on this advice';

/** The cautions, each a whole sentence or two, in the order they are shown. */
export const ADVICE_CAUTIONS = [
  'Regeneration is not a fail-safe brake. It can be lost at any moment (a full battery, a battery-management or ' +
    'inverter trip, an overvoltage on the line, a dewirement); the friction brakes and any retarder must be able to hold the ' +
    'descent without it.',
  'The endurance-braking requirements of vehicle type approval (UN ECE Regulation No. 13, Type-II and Type-IIA ' +
    'tests) and the operator\u2019s own procedures govern how vehicles are driven on descents.',
  'These figures are engineering estimates. Local codes, the vehicle maker\u2019s limits and a licensed engineer ' +
    'decide what is safe in service.',
] as const;

/** The cautions as one block of plain text (e-mails, CSV comments): the title, then one line each. */
export function adviceCautionsText(): string {
  return [`${ADVICE_CAUTIONS_TITLE}:`, ...ADVICE_CAUTIONS.map((caution) => `- ${caution}`)].join('\n');
}

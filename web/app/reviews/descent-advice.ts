/**
 * The engine's advice for one descent, as sentences a safety officer can pass on to drivers: the
 * same wording and safety rounding as the PDF report and the e-mails (shared/presentation).
 */
export { describeDescentAdvice, type DescentAdvice } from '@shared/presentation/descent-advice';

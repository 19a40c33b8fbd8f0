/**
 * How Descentry shows what it computes: labels, units, rounding (toward safety for advice), the
 * figure catalogue, advice sentences and dates. Pure TypeScript for the browser and the server;
 * the screens, both PDFs, the e-mails and the CSV headers all read from here.
 */
export * from './units';
export * from './field-limits';
export * from './safety-rounding';
export * from './labels';
export * from './risk-styles';
export * from './figures';
export * from './descent-advice';
export * from './dates';
export * from './worst-descent';
export * from './board-format';
export * from './board-figures';
export * from './profile-columns';
export * from './advice-cautions';
export * from './worst-case';
export * from './service-day-labels';
export * from './service-day-columns';

/**
 * The interface's units come from the shared presentation module, so the screens, the PDFs, the
 * e-mails and the CSV headers convert and round the same way.
 */
export * from '@shared/presentation/units';

/** The board's number formats live in the shared presentation module (the board PDF uses them too). */
export * from '@shared/presentation/board-format';

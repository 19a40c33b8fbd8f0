// Types of scripts/icon-font.mjs for the TypeScript that imports it (its test).
export const FULL_FONT: string;
export const SUBSET_DIR: string;
export const SUBSET_FONT: string;
export const SUBSET_NAMES: string;
export interface ShapingFont {
  /** The glyph a word becomes when it is one icon's ligature, else null. */
  iconGlyph(word: string): number | null;
  /** Code point → glyph for every character the font maps. */
  characterGlyphs(): Map<number, number>;
}
export function candidateWords(dirs?: string[]): Set<string>;
export function openFont(bytes: Uint8Array): Promise<ShapingFont>;
export function iconsAmong(font: ShapingFont, words: Iterable<string>): Map<string, number>;
export function missingIcons(fontBytes: Uint8Array, words?: Iterable<string>): Promise<string[]>;
export function subsetIconFont(names: string[]): Promise<Uint8Array>;

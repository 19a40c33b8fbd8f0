// The icon font the app ships: Material Symbols (Outlined, weight 400) cut down to the icons the
// app names. The full font holds every icon, about 316 kB as woff2, and every first visit paid for
// it; the app uses a few dozen.
//
//   node scripts/icon-font.mjs          writes web/icon-font/ (run by `npm run build:web`)
//   node scripts/icon-font.mjs --check  exits 1 when the font there lacks an icon the app names
//
// Which icons: icons are named in templates (`<mat-icon>route</mat-icon>`), in code (`icon:
// 'route'`) and in lookup tables (`{ done: 'check_circle' }`), some picked at run time, so the
// names cannot be read from the templates alone. Every word inside a string or a template in
// web/app and shared/ is a candidate, and a candidate is an icon when the full font turns it into
// one glyph (Material Symbols draws an icon as a ligature of its name). Words that happen to be
// icon names too ("search", "map") are kept as well: a few glyphs more, never one missing.
//
// How: HarfBuzz (harfbuzzjs) shapes each candidate with the full font; subset-font (HarfBuzz's
// subsetter) keeps the letters, digits and underscore the names are typed with and the icons'
// own code points, without layout closure, so the ligature table keeps only the icons asked for.
import { readFileSync, readdirSync, statSync, writeFileSync, mkdirSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, extname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const require = createRequire(import.meta.url);
const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..');

/** The full font as the npm package ships it. */
export const FULL_FONT = require.resolve('@fontsource/material-symbols-outlined/files/material-symbols-outlined-latin-400-normal.woff2');
/** The cut-down font and the list of its icons, both committed; styles.scss loads the font. */
export const SUBSET_DIR = join(ROOT, 'web', 'icon-font');
export const SUBSET_FONT = join(SUBSET_DIR, 'material-symbols-outlined-app.woff2');
export const SUBSET_NAMES = join(SUBSET_DIR, 'icon-names.json');
/** Where icon names can appear. */
const SOURCE_DIRS = [join(ROOT, 'web', 'app'), join(ROOT, 'shared')];
const SOURCE_EXTENSIONS = new Set(['.ts', '.html']);
/** The characters icon names are typed with: the ligatures are made of these. */
const NAME_CHARACTERS = 'abcdefghijklmnopqrstuvwxyz0123456789_';

/** Every word that could be an icon name in the app's sources (lower case, digits, underscore). */
export function candidateWords(dirs = SOURCE_DIRS) {
  const words = new Set();
  for (const dir of dirs) {
    for (const path of walk(dir)) {
      const text = readFileSync(path, 'utf8');
      // An HTML template is all text; in TypeScript only strings and templates name icons.
      const parts = extname(path) === '.html' ? [text] : stringsIn(text);
      for (const part of parts) for (const word of part.match(/[a-z0-9_]{2,}/g) ?? []) words.add(word);
    }
  }
  return words;
}

/** The contents of the string and template literals of a TypeScript file (near enough: no parser). */
function stringsIn(source) {
  const parts = [];
  const literal = /'((?:[^'\\\n]|\\.)*)'|"((?:[^"\\\n]|\\.)*)"|`((?:[^`\\]|\\.)*)`/g;
  for (const match of source.matchAll(literal)) parts.push(match[1] ?? match[2] ?? match[3] ?? '');
  return parts;
}

function* walk(dir) {
  for (const entry of readdirSync(dir)) {
    const path = join(dir, entry);
    if (statSync(path).isDirectory()) yield* walk(path);
    else if (SOURCE_EXTENSIONS.has(extname(path)) && !entry.endsWith('.spec.ts')) yield path;
  }
}

/** Opens a font (woff2 or sfnt) for shaping. */
export async function openFont(bytes) {
  const [{ default: fontverter }, hb] = await Promise.all([import('fontverter'), import('harfbuzzjs')]);
  const sfnt = await fontverter.convert(Buffer.from(bytes), 'truetype');
  const blob = new hb.Blob(new Uint8Array(sfnt).buffer);
  const face = new hb.Face(blob, 0);
  const font = new hb.Font(face);
  return {
    /** The glyph a word becomes when it is one icon's ligature, else null. */
    iconGlyph(word) {
      const buffer = new hb.Buffer();
      buffer.addText(word);
      buffer.guessSegmentProperties();
      hb.shape(font, buffer);
      const glyphs = buffer.getGlyphInfos();
      return glyphs.length === 1 && glyphs[0].codepoint !== 0 ? glyphs[0].codepoint : null;
    },
    /** Code point → glyph for every character the font maps. */
    characterGlyphs() {
      const map = new Map();
      for (const codePoint of face.collectUnicodes()) map.set(codePoint, font.glyph(codePoint));
      return map;
    },
  };
}

/** The icon names among the candidates, sorted, with the glyph each becomes in `font`. */
export function iconsAmong(font, words) {
  const icons = new Map();
  for (const word of [...words].sort()) {
    const glyph = font.iconGlyph(word);
    if (glyph !== null) icons.set(word, glyph);
  }
  return icons;
}

/** The names the app uses that `fontBytes` cannot draw (empty when the font is complete). */
export async function missingIcons(fontBytes, words = candidateWords()) {
  const full = await openFont(readFileSync(FULL_FONT));
  const used = iconsAmong(full, words);
  const font = await openFont(fontBytes);
  return [...used.keys()].filter((name) => font.iconGlyph(name) === null);
}

/** Cuts the full font down to `names`; returns the woff2 bytes. */
export async function subsetIconFont(names) {
  const { default: subsetFont } = await import('subset-font');
  const fullBytes = readFileSync(FULL_FONT);
  const full = await openFont(fullBytes);
  const codePointOfGlyph = new Map();
  for (const [codePoint, glyph] of full.characterGlyphs()) if (!codePointOfGlyph.has(glyph)) codePointOfGlyph.set(glyph, codePoint);
  let text = NAME_CHARACTERS;
  for (const name of names) {
    const glyph = full.iconGlyph(name);
    const codePoint = glyph === null ? undefined : codePointOfGlyph.get(glyph);
    if (codePoint === undefined) throw new Error(`icon "${name}" has no code point of its own in ${FULL_FONT}`);
    text += String.fromCodePoint(codePoint);
  }
  return subsetFont(fullBytes, text, { targetFormat: 'woff2', noLayoutClosure: true });
}

async function main() {
  const check = process.argv.includes('--check');
  if (check) {
    const missing = await missingIcons(readFileSync(SUBSET_FONT));
    if (missing.length > 0) {
      console.error(`${SUBSET_FONT} lacks ${missing.length} icon(s) the app names: ${missing.join(', ')}; run node scripts/icon-font.mjs`);
      process.exit(1);
    }
    console.log('the icon font holds every icon the app names');
    return;
  }
  const full = await openFont(readFileSync(FULL_FONT));
  const names = [...iconsAmong(full, candidateWords()).keys()];
  const bytes = await subsetIconFont(names);
  mkdirSync(SUBSET_DIR, { recursive: true });
  writeFileSync(SUBSET_FONT, bytes);
  writeFileSync(SUBSET_NAMES, `${JSON.stringify(names, null, 1)}\n`);
  const fullKb = statSync(FULL_FONT).size / 1024;
  console.log(`icon font: ${names.length} icons, ${(bytes.length / 1024).toFixed(1)} kB (full font ${fullKb.toFixed(0)} kB)`);
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) await main();

// Adds `<link rel="modulepreload">` hints to the built index.html for every script the app needs
// before its first page can render (`node scripts/preload-web.mjs [folder]`, run by
// `npm run build:web` before the compressed copies are written).
//
// Why: main.ts configures zod and then loads the application with a dynamic import (see the
// comment there). Angular's build preloads only main's own static imports, so the browser
// learns of the application's scripts (Angular, the router, Material's common parts…) only
// after main has run, and of their imports only after those have arrived: one round trip and one
// parse per level of the import graph before the first page can render. Listing the static
// import closure of what main loads lets the browser fetch it all at once, while main is still
// arriving. Pages' own scripts stay lazy: the router loads them when a page is opened.
import { readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';

const PRELOAD = /<link rel="modulepreload" href="([^"]+)">/g;

/** Relative module names a built chunk imports statically (`import … from"./x.js"`, `import"./x.js"`). */
export function staticImports(code) {
  return [...code.matchAll(/\bimport\s*(?:[\w*{}\s,$]*?\s*from\s*)?["']\.\/([\w.-]+\.js)["']/g)].map((match) => match[1]);
}

/** Relative module names a built chunk imports dynamically (`import("./x.js")`). */
export function dynamicImports(code) {
  return [...code.matchAll(/\bimport\(\s*["']\.\/([\w.-]+\.js)["']\s*\)/g)].map((match) => match[1]);
}

/**
 * Adds the preload links to `root`/index.html; returns the names added (none when they are
 * there already, so running it twice changes nothing).
 */
export function addPreloads(root) {
  const indexPath = join(root, 'index.html');
  const html = readFileSync(indexPath, 'utf8');
  const read = (name) => readFileSync(join(root, name), 'utf8');
  const mainName = readdirSync(root).find((name) => /^main-[A-Z0-9]+\.js$/.test(name));
  if (!mainName) throw new Error(`no main-*.js in ${root}`);
  const links = [...html.matchAll(PRELOAD)];
  if (links.length === 0) throw new Error('index.html has no modulepreload links to add to: has the Angular build changed?');
  const fromMain = dynamicImports(read(mainName));
  if (fromMain.length === 0) throw new Error(`${mainName} imports nothing dynamically: has main.ts changed?`);

  // What main loads dynamically (the application), and everything that imports statically.
  const added = [];
  const seen = new Set([mainName, ...links.map((match) => match[1])]);
  if (links.some((match) => match[1] === mainName)) return [];
  const queue = [...fromMain];
  while (queue.length > 0) {
    const name = queue.shift();
    if (seen.has(name)) continue;
    seen.add(name);
    added.push(name);
    queue.push(...staticImports(read(name)));
  }
  if (added.length === 0) return added;
  // main itself first: the loader script at the end of the page asks for it last, and over
  // HTTP/1.1 (six connections) it then waits behind every preload, while it is the script that
  // starts the session read and the application's import. Then main's own imports, then the rest.
  const first = links[0];
  const last = links.at(-1);
  const at = last.index + last[0].length;
  const extra = added.map((name) => `<link rel="modulepreload" href="${name}">`).join('');
  const withMain = `<link rel="modulepreload" href="${mainName}">`;
  writeFileSync(indexPath, html.slice(0, first.index) + withMain + html.slice(first.index, at) + extra + html.slice(at));
  return added;
}

const FONT_PRELOAD = /<link rel="preload" as="font"/;

/**
 * The text fonts every page draws with: the woff2 files of the global stylesheet's `@font-face`
 * rules for `family` that have no `unicode-range` (the Latin sets, one per weight; the extended
 * sets are only fetched for a character outside Latin).
 */
export function textFonts(css, family = 'Noto Sans') {
  return [...css.matchAll(/@font-face\s*\{([^}]*)\}/g)]
    .map((match) => match[1])
    .filter((rule) => new RegExp(`font-family:\\s*["']?${family}["']?\\s*;`).test(rule) && !/unicode-range/.test(rule))
    .map((rule) => /url\(["']?\.?\/?([^"')]+\.woff2)["']?\)/.exec(rule)?.[1])
    .filter((name) => name !== undefined);
}

/**
 * Adds `<link rel="preload" as="font">` for the text fonts to `root`/index.html, after the
 * script preloads; returns the files added (none when they are there already).
 *
 * Why: a font is asked for only once a text in its weight has been laid out, that is once
 * Angular has rendered the page; the text then waits for it (font-display: swap still holds the
 * paint for a short block period) and is laid out again when it comes. Asked for with the
 * scripts, the three weights are there before the first render.
 */
export function addFontPreloads(root) {
  const indexPath = join(root, 'index.html');
  const html = readFileSync(indexPath, 'utf8');
  if (FONT_PRELOAD.test(html)) return [];
  const stylesName = readdirSync(root).find((name) => /^styles-[A-Z0-9]+\.css$/.test(name));
  if (!stylesName) throw new Error(`no styles-*.css in ${root}`);
  const fonts = textFonts(readFileSync(join(root, stylesName), 'utf8'));
  if (fonts.length === 0) throw new Error(`${stylesName} declares no text font: has the font package changed?`);
  const links = [...html.matchAll(PRELOAD)];
  const last = links.at(-1);
  if (!last) throw new Error('index.html has no modulepreload links to add to: has the Angular build changed?');
  const at = last.index + last[0].length;
  const extra = fonts.map((name) => `<link rel="preload" as="font" type="font/woff2" href="${name}" crossorigin>`).join('');
  writeFileSync(indexPath, html.slice(0, at) + extra + html.slice(at));
  return fonts;
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const root = resolve(process.argv[2] ?? 'dist/web/browser');
  const added = addPreloads(root);
  console.log(`index.html: ${added.length} more scripts preloaded (the static imports of what main loads at once)`);
  const fonts = addFontPreloads(root);
  console.log(`index.html: ${fonts.length} text fonts preloaded (${fonts.join(', ')})`);
}

import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { addFontPreloads, addPreloads, dynamicImports, staticImports, textFonts } from '../../scripts/preload-web.mjs';

let dir = '';
afterEach(() => rmSync(dir, { recursive: true, force: true }));

/** A built app shaped like Angular's output: main preloads its static imports and loads the app dynamically. */
function builtApp(): string {
  dir = mkdtempSync(join(tmpdir(), 'descentry-preload-'));
  const files: Record<string, string> = {
    'index.html':
      '<html><head></head><body><app-root></app-root><link rel="modulepreload" href="chunk-ZOD.js"><script>load("main-AAA.js")</script></body></html>',
    'main-AAA.js': 'import{a as i}from"./chunk-ZOD.js";i({jitless:!0});import("./chunk-START.js").then(({start:o})=>o());',
    'chunk-ZOD.js': 'var a=1;export{a};',
    'chunk-START.js':
      'import{a as P,b as t}from"./chunk-CORE.js";import"./chunk-STYLE.js";import{a}from"./chunk-ZOD.js";var s=()=>import("./chunk-PAGE.js");export{s as start};',
    'chunk-CORE.js': 'import{x}from"./chunk-RX.js";var P=1,t=2;export{P as a,t as b};',
    'chunk-RX.js': 'var x=1;export{x};',
    'chunk-STYLE.js': 'document.title="x";',
    'chunk-PAGE.js': 'import{a}from"./chunk-FORM.js";export default 1;',
    'chunk-FORM.js': 'var a=1;export{a};',
  };
  for (const [name, content] of Object.entries(files)) writeFileSync(join(dir, name), content);
  return dir;
}

describe('preload links for the scripts the first page needs', () => {
  it('reads static and dynamic imports from minified chunks', () => {
    const code = 'import{a as P,b as t}from"./chunk-CORE.js";import"./chunk-STYLE.js";var s=()=>import("./chunk-PAGE.js");';
    expect(staticImports(code)).toEqual(['chunk-CORE.js', 'chunk-STYLE.js']);
    expect(dynamicImports(code)).toEqual(['chunk-PAGE.js']);
  });

  it('preloads main first, then its own imports, then what it loads at once with all their static imports, not the lazy pages', () => {
    const root = builtApp();
    expect(addPreloads(root)).toEqual(['chunk-START.js', 'chunk-CORE.js', 'chunk-STYLE.js', 'chunk-RX.js']);
    const html = readFileSync(join(root, 'index.html'), 'utf8');
    const links = [...html.matchAll(/<link rel="modulepreload" href="([^"]+)">/g)].map((match) => match[1]);
    expect(links).toEqual(['main-AAA.js', 'chunk-ZOD.js', 'chunk-START.js', 'chunk-CORE.js', 'chunk-STYLE.js', 'chunk-RX.js']);
    expect(html).not.toContain('chunk-PAGE.js');
    expect(html).not.toContain('chunk-FORM.js');
    // The loader script is left as it was (the server's CSP hashes it).
    expect(html).toContain('<script>load("main-AAA.js")</script>');
  });

  it('changes nothing when run a second time', () => {
    const root = builtApp();
    addPreloads(root);
    const once = readFileSync(join(root, 'index.html'), 'utf8');
    expect(addPreloads(root)).toEqual([]);
    expect(readFileSync(join(root, 'index.html'), 'utf8')).toBe(once);
  });

  it('refuses a build it does not recognise rather than writing a wrong page', () => {
    const root = builtApp();
    writeFileSync(join(root, 'main-AAA.js'), 'import"./chunk-ZOD.js";start();');
    expect(() => addPreloads(root)).toThrow(/imports nothing dynamically/);
  });
});

/** The global stylesheet's font rules as the build writes them (fontsource's Latin and extended sets, the icon font). */
const STYLES =
  '@font-face{font-family:Noto Sans;font-style:normal;font-display:swap;font-weight:400;src:url("./media/noto-sans-latin-400-normal-AAAAAAAA.woff2") format("woff2"),url("./media/noto-sans-latin-400-normal-BBBBBBBB.woff") format("woff")}' +
  '@font-face{font-family:Noto Sans;font-style:normal;font-display:swap;font-weight:700;src:url("./media/noto-sans-latin-700-normal-CCCCCCCC.woff2") format("woff2")}' +
  '@font-face{font-family:Noto Sans;font-style:normal;font-display:swap;font-weight:400;src:url("./media/noto-sans-latin-ext-400-normal-DDDDDDDD.woff2") format("woff2");unicode-range:U+0100-02BA}' +
  '@font-face{font-family:Material Symbols Outlined;font-style:normal;font-display:block;font-weight:400;src:url("./media/material-symbols-outlined-app-EEEEEEEE.woff2") format("woff2")}' +
  'body{font-family:Noto Sans,sans-serif}';

describe('preload links for the text fonts', () => {
  it('names the Latin woff2 file of each text weight, not the extended sets, the woff fallbacks or the icon font', () => {
    expect(textFonts(STYLES)).toEqual([
      'media/noto-sans-latin-400-normal-AAAAAAAA.woff2',
      'media/noto-sans-latin-700-normal-CCCCCCCC.woff2',
    ]);
  });

  it('adds them after the script preloads, as fonts fetched the way the stylesheet will ask for them, once', () => {
    const root = builtApp();
    writeFileSync(join(root, 'styles-ABCDEFGH.css'), STYLES);
    addPreloads(root);
    expect(addFontPreloads(root)).toHaveLength(2);
    const html = readFileSync(join(root, 'index.html'), 'utf8');
    expect(html).toContain(
      '<link rel="modulepreload" href="chunk-RX.js"><link rel="preload" as="font" type="font/woff2" href="media/noto-sans-latin-400-normal-AAAAAAAA.woff2" crossorigin><link rel="preload" as="font" type="font/woff2" href="media/noto-sans-latin-700-normal-CCCCCCCC.woff2" crossorigin>',
    );
    expect(addFontPreloads(root)).toEqual([]);
    expect(readFileSync(join(root, 'index.html'), 'utf8')).toBe(html);
  });

  it('refuses a stylesheet without the text font rather than writing a page without them', () => {
    const root = builtApp();
    writeFileSync(join(root, 'styles-ABCDEFGH.css'), 'body{font-family:sans-serif}');
    expect(() => addFontPreloads(root)).toThrow(/declares no text font/);
  });
});

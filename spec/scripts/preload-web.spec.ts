import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { addPreloads, dynamicImports, staticImports } from '../../scripts/preload-web.mjs';

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

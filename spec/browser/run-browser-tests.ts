/**
 * Headless-browser tests against a running Descentry (BASE_URL, default http://127.0.0.1:4300).
 *
 *   node --import tsx spec/browser/run-browser-tests.ts [filter]
 *
 * Every `spec/browser/**\/*.browser.ts` file is loaded; each uses node:test's describe/it, so the
 * run prints a pass/fail summary and exits non-zero when a test fails. A feature adds its own
 * `<feature>.browser.ts` file; nothing here needs to change. An optional argument keeps only
 * the files whose path contains it. Screenshots go to spec-artifacts/screenshots/.
 */
import { readdirSync } from 'node:fs';
import { join, relative } from 'node:path';
import { pathToFileURL } from 'node:url';

const browserSpecDir = import.meta.dirname;
const filter = process.argv[2];

const files = findBrowserSpecs(browserSpecDir).filter((file) => !filter || file.includes(filter));
if (files.length === 0) {
  console.error(`No browser test files${filter ? ` matching "${filter}"` : ''} in ${browserSpecDir}`);
  process.exit(1);
}
console.log(`Browser tests: ${files.map((file) => relative(process.cwd(), file)).join(', ')}`);

// Importing registers each file's describe/it with node:test, which runs them in this order
// (one browser at a time: the API's sign-in rate limit and the demo data are shared).
for (const file of files) {
  await import(pathToFileURL(file).href);
}

function findBrowserSpecs(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true })
    .flatMap((entry) => {
      const path = join(dir, entry.name);
      if (entry.isDirectory()) return entry.name === 'support' ? [] : findBrowserSpecs(path);
      return entry.name.endsWith('.browser.ts') ? [path] : [];
    })
    .sort();
}

import { mkdirSync, mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import {
  FULL_FONT,
  SUBSET_FONT,
  SUBSET_NAMES,
  candidateWords,
  iconsAmong,
  missingIcons,
  openFont,
  subsetIconFont,
} from '../../scripts/icon-font.mjs';

const work = mkdtempSync(join(tmpdir(), 'descentry-icons-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

/** A small app source tree naming icons in the three ways the app does. */
function sourcesNaming(): string {
  const dir = join(work, 'app');
  mkdirSync(join(dir, 'feature'), { recursive: true });
  writeFileSync(join(dir, 'feature', 'page.html'), '<button mat-button><mat-icon>rocket_launch</mat-icon> Launch</button>\n');
  writeFileSync(join(dir, 'feature', 'areas.ts'), "export const area = { label: 'Parking', icon: 'local_parking' };\n");
  writeFileSync(
    join(dir, 'feature', 'states.ts'),
    'export const stateIcons = { done: "check_circle", late: `alarm` } as const;\n// a comment naming favorite is not code\n',
  );
  return dir;
}

describe('icon font cut down to the icons the app names', () => {
  it('draws every icon named anywhere in web/app and shared/', async () => {
    expect(await missingIcons(readFileSync(SUBSET_FONT))).toEqual([]);
  });

  it('finds icons named in templates, in route data and in lookup tables, but not in comments', async () => {
    const full = await openFont(readFileSync(FULL_FONT));
    const icons = [...iconsAmong(full, candidateWords([sourcesNaming()])).keys()];
    expect(icons).toEqual(expect.arrayContaining(['alarm', 'check_circle', 'local_parking', 'rocket_launch']));
    // Words in comments are not collected, and words the font does not turn into an icon are not icons.
    expect(icons).not.toContain('favorite');
    expect(icons).not.toContain('parking');
  });

  it('reports a newly named icon that the committed font lacks', async () => {
    const words = candidateWords([sourcesNaming()]);
    const missing = await missingIcons(readFileSync(SUBSET_FONT), words);
    // None of these four is used by the app today, so the committed font does not carry them.
    expect(missing).toEqual(expect.arrayContaining(['alarm', 'local_parking', 'rocket_launch']));
    expect(missing).not.toContain('check_circle');
  });

  it('keeps the named icons and drops the others', async () => {
    const bytes = await subsetIconFont(['route', 'warning']);
    const font = await openFont(bytes);
    expect(font.iconGlyph('route')).not.toBeNull();
    expect(font.iconGlyph('warning')).not.toBeNull();
    expect(font.iconGlyph('home')).toBeNull();
    expect(font.iconGlyph('directions_bus')).toBeNull();
    expect(bytes.length).toBeLessThan(statSync(FULL_FONT).size / 20);
  });

  it('lists the icons the committed font holds', async () => {
    const names = JSON.parse(readFileSync(SUBSET_NAMES, 'utf8')) as string[];
    const font = await openFont(readFileSync(SUBSET_FONT));
    expect(names.length).toBeGreaterThan(50);
    expect(names.filter((name) => font.iconGlyph(name) === null)).toEqual([]);
  });
});

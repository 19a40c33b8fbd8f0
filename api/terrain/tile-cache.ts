import { randomUUID } from 'node:crypto';
import { mkdir, readFile, readdir, rename, rm, writeFile } from 'node:fs/promises';
import { dirname, join } from 'node:path';

/**
 * Rendered tiles on disk, one folder per version of the ready catalogue: when a model is added
 * or removed the version changes, new tiles go to a new folder and the old folders are removed.
 */
export class TileCache {
  private currentVersion: string | null = null;

  constructor(private readonly tilesDir: string) {}

  private pathOf(version: string, z: number, x: number, y: number): string {
    return join(this.tilesDir, version, String(z), String(x), `${y}.png`);
  }

  async read(version: string, z: number, x: number, y: number): Promise<Buffer | null> {
    this.noteVersion(version);
    // Expected failure: the tile has not been rendered yet (ENOENT).
    return readFile(this.pathOf(version, z, x, y)).catch(() => null);
  }

  /**
   * Writes atomically (temp file + rename), so a reader never sees half a PNG. The folder is made
   * only when the write finds it missing (once per folder rather than once per tile).
   */
  async write(version: string, z: number, x: number, y: number, png: Buffer): Promise<void> {
    const path = this.pathOf(version, z, x, y);
    const temp = `${path}.${randomUUID()}.tmp`;
    try {
      await writeFile(temp, png);
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== 'ENOENT') throw error;
      await mkdir(dirname(path), { recursive: true });
      await writeFile(temp, png);
    }
    await rename(temp, path);
  }

  /** On the first request of a new version, older versions' folders go (in the background). */
  private noteVersion(version: string): void {
    if (this.currentVersion === version) return;
    this.currentVersion = version;
    void this.removeAllBut(version);
  }

  async removeAllBut(version: string): Promise<void> {
    const names = await readdir(this.tilesDir).catch(() => [] as string[]);
    await Promise.all(names.filter((name) => name !== version).map((name) => rm(join(this.tilesDir, name), { recursive: true, force: true })));
  }
}

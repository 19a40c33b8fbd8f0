import { randomUUID } from 'node:crypto';
import { mkdir, readFile, readdir, rename, rm, stat, unlink, writeFile } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import { LRUCache } from 'lru-cache';

/**
 * Rendered tiles on disk, one folder per version of the ready catalogue: when a model is added
 * or removed the version changes, new tiles go to a new folder and the old folders are removed.
 *
 * Within a version the cache holds at most `maxBytes`: the least recently used tiles are deleted
 * when a write would pass it (an index of the current version's files and their sizes is kept
 * in memory, filled from the folder on the first request of a version, so tiles written before a
 * restart count too). Empty tiles are never written (the caller serves one shared empty tile).
 */
export class TileCache {
  private currentVersion: string | null = null;
  private readonly index: LRUCache<string, number>;

  constructor(
    private readonly tilesDir: string,
    maxBytes: number,
  ) {
    this.index = new LRUCache<string, number>({
      maxSize: maxBytes,
      sizeCalculation: (size) => Math.max(1, size),
      // A tile pushed out of the index is pushed off the disk. Expected failure: it is already
      // gone (its version's folder was removed).
      dispose: (_size, path, reason) => {
        if (reason === 'evict') void unlink(path).catch(() => undefined);
      },
    });
  }

  private pathOf(version: string, z: number, x: number, y: number): string {
    return join(this.tilesDir, version, String(z), String(x), `${y}.png`);
  }

  async read(version: string, z: number, x: number, y: number): Promise<Buffer | null> {
    this.noteVersion(version);
    const path = this.pathOf(version, z, x, y);
    // Expected failure: the tile has not been rendered yet (ENOENT).
    const png = await readFile(path).catch(() => null);
    // A hit makes the tile the most recently used one.
    if (png && !this.index.has(path)) this.index.set(path, png.length);
    else if (png) this.index.get(path);
    return png;
  }

  /**
   * Writes atomically (temp file + rename), so a reader never sees half a PNG. The folder is made
   * only when the write finds it missing (once per folder rather than once per tile).
   */
  async write(version: string, z: number, x: number, y: number, png: Buffer): Promise<void> {
    this.noteVersion(version);
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
    this.index.set(path, png.length);
  }

  /** Bytes of the current version's tiles the cache knows of. */
  get bytes(): number {
    return this.index.calculatedSize;
  }

  /** On the first request of a new version, older versions' folders go (in the background). */
  private noteVersion(version: string): void {
    if (this.currentVersion === version) return;
    this.currentVersion = version;
    this.index.clear();
    void this.removeAllBut(version);
    void this.indexExisting(version);
  }

  async removeAllBut(version: string): Promise<void> {
    const names = await readdir(this.tilesDir).catch(() => [] as string[]);
    await Promise.all(
      names.filter((name) => name !== version).map((name) => rm(join(this.tilesDir, name), { recursive: true, force: true })),
    );
  }

  /** Adds the version's tiles already on disk to the index, oldest first (so they go first). */
  private async indexExisting(version: string): Promise<void> {
    const root = join(this.tilesDir, version);
    // Expected failure: no tile of this version on disk yet (ENOENT).
    const names = await readdir(root, { recursive: true }).catch(() => [] as string[]);
    const found: { path: string; size: number; mtimeMs: number }[] = [];
    for (const name of names) {
      if (!name.endsWith('.png')) continue;
      const path = join(root, name);
      const info = await stat(path).catch(() => null);
      if (info?.isFile()) found.push({ path, size: info.size, mtimeMs: info.mtimeMs });
    }
    found.sort((a, b) => a.mtimeMs - b.mtimeMs);
    for (const tile of found) {
      if (this.currentVersion !== version) return;
      if (!this.index.has(tile.path)) this.index.set(tile.path, tile.size);
    }
  }
}

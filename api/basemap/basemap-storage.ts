import { randomUUID } from 'node:crypto';
import { mkdir, readdir, rm } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import multer from 'multer';

/**
 * Uploaded extracts on disk, under DATA_DIR:
 *
 *   basemap/uploads/<uuid>.part   an upload being received
 *   basemap/<import id>.osm       an accepted extract waiting for (or in) its import; removed after
 *
 * The process's one is `runtimeOf(deps).basemapStorage` (api/app-runtime.ts).
 */
export class BasemapStorage {
  readonly root: string;

  constructor(dataDir: string) {
    this.root = resolve(dataDir);
  }

  get dir(): string {
    return join(this.root, 'basemap');
  }

  get uploadsDir(): string {
    return join(this.dir, 'uploads');
  }

  relativeExtractPath(importId: string): string {
    return join('basemap', `${importId}.osm`);
  }

  absolute(relativePath: string): string {
    return join(this.root, relativePath);
  }

  async ensureFolders(): Promise<void> {
    await mkdir(this.uploadsDir, { recursive: true });
  }

  /** Multer storage writing each upload straight to disk (an extract can be gigabytes). */
  multerStorage(): multer.StorageEngine {
    return multer.diskStorage({
      destination: (_req, _file, done) => {
        this.ensureFolders().then(
          () => done(null, this.uploadsDir),
          (error: Error) => done(error, this.uploadsDir),
        );
      },
      filename: (_req, _file, done) => done(null, `${randomUUID()}.part`),
    });
  }

  /** Start-up sweep: half-received uploads and extracts no waiting import owns. */
  async sweep(waitingIds: ReadonlySet<string>): Promise<void> {
    await this.ensureFolders();
    for (const name of await readdir(this.uploadsDir)) await rm(join(this.uploadsDir, name), { force: true });
    for (const name of await readdir(this.dir)) {
      const match = /^(.+)\.osm$/.exec(name);
      if (match && !waitingIds.has(match[1]!)) await rm(join(this.dir, name), { force: true });
    }
  }
}

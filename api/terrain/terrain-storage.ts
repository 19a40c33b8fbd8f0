import { createHash, randomUUID } from 'node:crypto';
import { createWriteStream, mkdirSync } from 'node:fs';
import { mkdir, readdir, rm, unlink } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import { Transform } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import type { Request } from 'express';
import type { StorageEngine } from 'multer';

/**
 * Where terrain lives on disk, all under DATA_DIR:
 *
 *   uploads/<uuid>.part      an upload being received (removed on failure and at start-up)
 *   terrain/<id>/model.tif   an accepted model, named by its catalogue id
 *   terrain/<id>/overview-<factor>.f32   its reduced pyramid (raw Float32, 256 × 256 blocks)
 *   tiles/<version>/<z>/<x>/<y>.png      rendered map tiles for one version of the catalogue
 */
export class TerrainStorage {
  readonly root: string;

  constructor(dataDir: string) {
    this.root = resolve(dataDir);
  }

  get uploadsDir(): string {
    return join(this.root, 'uploads');
  }

  get modelsDir(): string {
    return join(this.root, 'terrain');
  }

  get tilesDir(): string {
    return join(this.root, 'tiles');
  }

  modelDir(id: string): string {
    return join(this.modelsDir, id);
  }

  /** Path stored in the catalogue (relative, so DATA_DIR can move). */
  relativeModelPath(id: string): string {
    return join('terrain', id, 'model.tif');
  }

  absolute(relativePath: string): string {
    return join(this.root, relativePath);
  }

  async ensureFolders(): Promise<void> {
    await Promise.all([this.uploadsDir, this.modelsDir, this.tilesDir].map((dir) => mkdir(dir, { recursive: true })));
  }

  newUploadPath(): string {
    return join(this.uploadsDir, `${randomUUID()}.part`);
  }

  async removeModelFiles(id: string): Promise<void> {
    await rm(this.modelDir(id), { recursive: true, force: true });
  }

  /**
   * Start-up sweep: removes half-received uploads and model folders that no catalogue row owns
   * (a crash between moving the file and committing the row). Returns what it removed.
   */
  async sweep(knownIds: ReadonlySet<string>): Promise<string[]> {
    await this.ensureFolders();
    const removed: string[] = [];
    for (const name of await readdir(this.uploadsDir)) {
      await rm(join(this.uploadsDir, name), { recursive: true, force: true });
      removed.push(join('uploads', name));
    }
    for (const name of await readdir(this.modelsDir)) {
      if (!knownIds.has(name)) {
        await rm(join(this.modelsDir, name), { recursive: true, force: true });
        removed.push(join('terrain', name));
      }
    }
    return removed;
  }
}

/** What the hashing storage engine adds to multer's file object. */
export interface HashedUpload {
  path: string;
  size: number;
  sha256: string;
}

/**
 * multer storage that streams the upload straight to disk and hashes it on the way, so a 2 GB
 * file is never held in memory and is read only once. multer's size limit aborts the stream and
 * calls `_removeFile`, so a refused upload leaves nothing behind.
 */
export function hashingDiskStorage(storage: TerrainStorage): StorageEngine {
  return {
    _handleFile(_req: Request, file, callback) {
      const path = storage.newUploadPath();
      const hash = createHash('sha256');
      let size = 0;
      // The hash sees each chunk on its way to disk; the pipeline is wired before any data flows.
      const hashing = new Transform({
        transform(chunk: Buffer, _encoding, done) {
          hash.update(chunk);
          size += chunk.length;
          done(null, chunk);
        },
      });
      mkdirSync(storage.uploadsDir, { recursive: true });
      pipeline(file.stream, hashing, createWriteStream(path))
        .then(() => callback(null, { path, size, sha256: hash.digest('hex') } as Partial<Express.Multer.File>))
        .catch(async (error: unknown) => {
          await unlink(path).catch(() => undefined);
          callback(error as Error);
        });
    },
    _removeFile(_req, file, callback) {
      unlink(file.path).then(
        () => callback(null),
        () => callback(null),
      );
    },
  };
}

import { readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import type { Express } from 'express';
import type request from 'supertest';
import type { TerrainModel } from '@shared/domain/terrain';

type Agent = ReturnType<typeof request.agent>;

/** Uploads a file through the real endpoint, as the browser does. */
export function uploadTerrain(agent: Agent, path: string, name: string) {
  return agent.post('/api/terrain').field('name', name).attach('file', path);
}

/** Polls GET /api/terrain/:id until the model leaves "processing". */
export async function waitUntilIngested(agent: Agent, id: string, timeoutMs = 60_000): Promise<TerrainModel> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const response = await agent.get(`/api/terrain/${id}`);
    if (response.status !== 200) throw new Error(`GET /api/terrain/${id} answered ${response.status}`);
    const model = response.body as TerrainModel;
    if (model.status !== 'processing') return model;
    if (Date.now() > deadline) throw new Error(`terrain ${id} still processing after ${timeoutMs} ms`);
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

/** Every file under a folder (relative paths), to prove that refused uploads leave nothing. */
export function filesUnder(dir: string): string[] {
  const found: string[] = [];
  const walk = (current: string) => {
    let names: string[];
    try {
      names = readdirSync(current);
    } catch {
      return;
    }
    for (const name of names) {
      const path = join(current, name);
      if (statSync(path).isDirectory()) walk(path);
      else found.push(path.slice(dir.length + 1));
    }
  };
  walk(dir);
  return found.sort();
}

export type { Agent, Express };

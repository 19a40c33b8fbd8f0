/**
 * What an analysis worker thread runs (piscina): the calculation engine on one request, off the
 * API's event loop. Elevations for routes without their own come from the API thread, which owns
 * the terrain (decoded-block cache, decoder threads): the worker asks for them over the message
 * port it was given and waits for the answer.
 *
 * Results and refusals go back as plain data: an engine refusal is described (`refusal`) for the
 * API thread to raise again as the same error class; anything else rejects the task.
 */
import { setPriority } from 'node:os';
import type { MessagePort } from 'node:worker_threads';
import { Piscina } from 'piscina';
import type { PreviewRequestInput, PreviewResponse, ProfileView } from '@shared/domain/analysis';
import { analyseRoute } from '@shared/engine/analyse-route';
import { runServiceDay, type ServiceDayEngineInput, type ServiceDayEngineResult } from '@shared/engine/service-day';
import { viewProfile } from '@shared/engine/profile-view';
import { EngineInputError, RouteTooLargeError, UncoveredTerrainError } from '@shared/engine/validation';

export interface AnalysisTask {
  request: PreviewRequestInput;
  /** Port to the API thread's elevation sampler; absent when no terrain is available. */
  elevationPort?: MessagePort;
  /** Answer the response as UTF-8 JSON bytes, serialised here and handed over without a copy. */
  asJson: boolean;
  /** With asJson: the profile as the client asked for it (all of it when absent). */
  profileView?: ProfileView;
}

/** A whole service day (every block) on one thread; its routes carry their elevations already. */
export interface ServiceDayTask {
  serviceDay: ServiceDayEngineInput;
}
export type ServiceDayTaskResult = { ok: true; result: ServiceDayEngineResult } | { ok: false; refusal: EngineRefusal };

/** An engine refusal as data, enough to raise the same error again on the API thread. */
export type EngineRefusal =
  | { kind: 'input'; field: string; message: string }
  | { kind: 'uncovered'; field: string; message: string; stretches: UncoveredTerrainError['stretches'] }
  | {
      kind: 'too-large';
      field: string;
      message: string;
      lengthM: number;
      pointCount: number;
      spacingM: number;
      maxLengthM: number;
      maxPoints: number;
    };

/** The answer: the response, or (asJson) its UTF-8 JSON bytes moved to the API thread, or a refusal. */
export type AnalysisTaskResult = { ok: true; response: PreviewResponse } | Uint8Array | { ok: false; refusal: EngineRefusal };

// On Linux a nice value belongs to one thread: this analysis thread yields the CPU to the API
// thread (which answers everyone else) whenever both want it, instead of sharing it evenly.
// Nice 10 is the usual background-work setting (common practice).
if (process.platform === 'linux') setPriority(0, 10);

/** Elevation request on the port: points as [lon, lat] pairs flattened into one array. */
export interface ElevationQuestion {
  lonLat: Float64Array;
}
/** Elevation answer: NaN where no terrain covers the point, or why sampling failed. */
export type ElevationAnswer = { ok: true; elevationsM: Float64Array } | { ok: false; message: string };

export default async function analyse(
  task: AnalysisTask | ServiceDayTask,
): Promise<AnalysisTaskResult | ServiceDayTaskResult | ReturnType<typeof Piscina.move>> {
  if ('serviceDay' in task) return serviceDay(task);
  const port = task.elevationPort;
  try {
    const sampleElevations = port ? (points: [number, number][]) => askForElevations(port, points) : undefined;
    const response = await analyseRoute(task.request, { sampleElevations });
    if (!task.asJson) return { ok: true, response };
    // Moved, not copied: the bytes change owner without the API thread cloning megabytes.
    const answer = task.profileView ? { ...response, profile: viewProfile(response.profile, task.profileView) } : response;
    return Piscina.move(new TextEncoder().encode(JSON.stringify(answer)));
  } catch (error) {
    // Expected: the engine refuses the input (field named) or the terrain leaves gaps. Anything
    // else is a fault and rejects the task.
    if (error instanceof EngineInputError) return { ok: false, refusal: describeRefusal(error) };
    throw error;
  } finally {
    port?.close();
  }
}

function serviceDay(task: ServiceDayTask): ServiceDayTaskResult {
  try {
    return { ok: true, result: runServiceDay(task.serviceDay) };
  } catch (error) {
    if (error instanceof EngineInputError) return { ok: false, refusal: describeRefusal(error) };
    throw error;
  }
}

function askForElevations(port: MessagePort, points: [number, number][]): Promise<(number | null)[]> {
  const lonLat = new Float64Array(points.length * 2);
  points.forEach(([lon, lat], i) => {
    lonLat[2 * i] = lon;
    lonLat[2 * i + 1] = lat;
  });
  return new Promise((resolve, reject) => {
    port.once('message', (answer: ElevationAnswer) => {
      if (!answer.ok) {
        reject(new Error(answer.message));
        return;
      }
      resolve(Array.from(answer.elevationsM, (z) => (Number.isFinite(z) ? z : null)));
    });
    port.postMessage({ lonLat } satisfies ElevationQuestion, [lonLat.buffer as ArrayBuffer]);
  });
}

function describeRefusal(error: EngineInputError): EngineRefusal {
  if (error instanceof UncoveredTerrainError) {
    return { kind: 'uncovered', field: error.field, message: error.message, stretches: error.stretches };
  }
  if (error instanceof RouteTooLargeError) {
    return {
      kind: 'too-large',
      field: error.field,
      message: error.message,
      lengthM: error.lengthM,
      pointCount: error.pointCount,
      spacingM: error.spacingM,
      maxLengthM: error.maxLengthM,
      maxPoints: error.maxPoints,
    };
  }
  return { kind: 'input', field: error.field, message: error.message };
}

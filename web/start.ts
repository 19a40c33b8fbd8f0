import { bootstrapApplication } from '@angular/platform-browser';
import { App } from './app/app';
import { appConfig } from './app/app.config';

/** Starts the Angular application (main.ts loads this once zod is configured). */
export function start(): void {
  bootstrapApplication(App, appConfig).catch((error: unknown) => console.error(error));
}

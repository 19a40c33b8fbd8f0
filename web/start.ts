import { bootstrapApplication } from '@angular/platform-browser';
import { App } from './app/app';
import { appConfig } from './app/app.config';
import { routes } from './app/app.routes';
import { preloadFirstPage } from './app/core/first-page';

/** Starts the Angular application (main.ts loads this once zod is configured). */
export function start(): void {
  // The page's own scripts load while Angular starts; the router finds them loaded.
  preloadFirstPage(routes, location.pathname).catch(() => undefined);
  bootstrapApplication(App, appConfig).catch((error: unknown) => console.error(error));
}

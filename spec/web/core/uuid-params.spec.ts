import { UrlSegment, type Route } from '@angular/router';
import { describe, expect, it } from 'vitest';
import { uuidParams } from '../../../web/app/core/uuid-params';

describe('uuidParams', () => {
  const id = '3a5d4046-48a5-4a78-ac98-8552c9ff0ac7';

  it('matches when every :parameter is a UUID', () => {
    expect(matches({ path: ':scenarioId/edit' }, [id, 'edit'])).toBe(true);
  });

  it('refuses a word where an id belongs, so /vehicles/new never asks the API for vehicle "new" (issue 10)', () => {
    expect(matches({ path: ':vehicleProfileId' }, ['new'])).toBe(false);
    expect(matches({ path: ':scenarioId/edit' }, ['newest', 'edit'])).toBe(false);
  });

  it('matches a route without parameters', () => {
    expect(matches({ path: 'compare' }, ['compare'])).toBe(true);
  });

  function matches(route: Route, paths: string[]): unknown {
    return uuidParams(
      route,
      paths.map((path) => new UrlSegment(path, {})),
    );
  }
});

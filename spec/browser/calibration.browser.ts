import assert from 'node:assert/strict';
import { join } from 'node:path';
import { describe, it } from 'node:test';
import { DEMO_LOGGED_TRIPS_DIR } from '../../api/demo/demo-logged-trips';
import { BASE_URL, screenshot, settleAnimations } from './support/browser';
import { signedInBrowser } from './support/demo-people';

/**
 * An analyst uploads logged trips of a bus, sees measured against modelled, fits the profile
 * and accepts the fit as a new version; the scenario using the profile is re-run. Works on a
 * copy of the demo mountain bus made for the check, so the demo's own figures stay as they are.
 */
describe('calibration against measured runs', () => {
  const browser = signedInBrowser('analyst', { width: 1400, height: 950 });
  const stamp = Date.now();
  let profileId = '';

  it('uploads a logged trip with progress and shows it among the measured runs', async () => {
    const { page } = browser;
    profileId = await page.evaluate(async (name) => {
      const profiles = (await (await fetch('/api/vehicles')).json()) as { items: { id: string; name: string; isPreset: boolean }[] };
      const demo = profiles.items.find((p) => p.name.startsWith('Highpass 12 m mountain bus'))!;
      const full = await (await fetch(`/api/vehicles/${demo.id}`)).json();
      const draft = {
        name,
        description: 'Copy for the calibration check',
        vehicleClass: full.vehicleClass,
        vehicle: full.vehicle,
        loadsKg: full.loadsKg,
        passengerMassKg: full.passengerMassKg,
        seasons: full.seasons,
      };
      const created = await (
        await fetch('/api/vehicles', { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: JSON.stringify(draft) })
      ).json();
      const routes = (await (await fetch('/api/routes')).json()) as { items: { id: string; name: string }[] };
      const valley = routes.items.find((r) => r.name.startsWith('1 Valley line'))!;
      await fetch('/api/scenarios', {
        method: 'POST',
        headers: { 'Content-Type': 'application/json' },
        body: JSON.stringify({
          name: `${name}, valley, mild`,
          routeId: valley.id,
          direction: 'outbound',
          vehicleProfileId: created.id,
          load: { kind: 'case', case: 'seated' },
          season: { kind: 'season', season: 'mild' },
          startSoc: 0.7,
        }),
      });
      return created.id as string;
    }, `Mountain bus, calibration check ${stamp}`);

    await page.goto(`${BASE_URL}/vehicles/${profileId}`);
    await page.getByTestId('profile-version').getByText('Version 1').waitFor();
    await page.getByTestId('measured-runs-link').click();
    await page.getByRole('heading', { level: 1, name: 'Measured runs' }).waitFor();
    for (const file of ['valley-line-westgate-lindmoor-2026-03-11.csv', 'pass-line-orren-korvel-2026-03-10.csv']) {
      await page.getByTestId('trip-file-input').setInputFiles(join(DEMO_LOGGED_TRIPS_DIR, file));
      await page.getByTestId('trip-upload').click();
      await page.getByTestId('trip-stored').waitFor({ timeout: 60_000 });
    }
    const table = page.getByTestId('trips-table');
    await table.getByRole('row').filter({ hasText: 'valley-line-westgate-lindmoor-2026-03-11' }).waitFor();
    assert.match((await page.getByTestId('trip-stored').textContent()) ?? '', /2,045 samples on 4 Pass line/);
    await settleAnimations(page);
    await screenshot(page, 'calibration-measured-runs');
  });

  it('refuses a malformed file naming the row and column, and stores nothing', async () => {
    const { page } = browser;
    const rowsBefore = await page.getByTestId('trips-table').getByRole('row').count();

    await page.getByTestId('trip-file-input').setInputFiles({
      name: 'broken.csv',
      mimeType: 'text/csv',
      buffer: Buffer.from('time_s,lat,lon,speed_mps\n0,46.61,10.49,0\n1,46.61,10.49,1\n0.5,46.61,10.49,2\n'),
    });
    await page.getByTestId('trip-upload').click();

    const refusal = page.getByTestId('trip-refused');
    await refusal.waitFor();
    assert.match((await refusal.textContent()) ?? '', /row 4, column time_s: the time \(0\.5 s\) is earlier than the previous row/);
    assert.equal(await page.getByTestId('trips-table').getByRole('row').count(), rowsBefore);
  });

  it('shows measured against modelled along distance and time, linked to the map', async () => {
    const { page } = browser;

    await page
      .getByTestId('trips-table')
      .getByRole('row')
      .filter({ hasText: 'pass-line-orren-korvel' })
      .getByRole('link', { name: 'Compare' })
      .click();
    await page.getByTestId('energy-error').waitFor({ timeout: 30_000 });
    await page.getByText('Battery power: measured and modelled').waitFor();
    await page.getByTestId('comparison-map').locator('.leaflet-interactive').first().waitFor();
    const energyError = Number(((await page.getByTestId('energy-error').textContent()) ?? '').replace(/[^\d.−-]/g, '').replace('−', '-'));
    // The demo trips were logged on a bus that loses more than its profile says.
    assert.ok(Math.abs(energyError) > 3, `energy difference ${energyError} %`);
    const chart = page.locator('app-distance-chart canvas').first();
    const box = (await chart.boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.5, box.y + box.height * 0.5);
    await page.locator('.leaflet-overlay-pane path.leaflet-interactive, .leaflet-marker-pane, path[fill="#b3261e"]').first().waitFor();
    await settleAnimations(page);
    await screenshot(page, 'calibration-trip-comparison');
    await page.getByText('Along time').click();
    await page.locator('mat-button-toggle.mat-button-toggle-checked', { hasText: 'Along time' }).waitFor();
    await screenshot(page, 'calibration-trip-comparison-time');
  });

  it('fits the profile to the trips and shows intervals, warnings and residuals', async () => {
    const { page } = browser;

    await page.goto(`${BASE_URL}/vehicles/${profileId}/logged-trips`);
    await page.getByTestId('trips-table').locator('tbody tr').first().waitFor();
    for (const box of await page.getByTestId('trips-table').locator('tbody mat-checkbox input').all()) await box.click();
    await page.getByTestId('start-fit').getByText('Fit to 2 trips').waitFor();
    await page.getByTestId('start-fit').click();
    await page.getByTestId('fit-parameters').waitFor({ timeout: 90_000 });
    await page.getByTestId('residual-plot').waitFor();
    const parameters = (await page.getByTestId('fit-parameters').textContent()) ?? '';
    assert.match(parameters, /Rolling resistance coefficient/);
    assert.match(parameters, /Brake thermal mass/);
    const energyAfter = ((await page.getByTestId('energy-after').textContent()) ?? '').split('→')[1]!;
    assert.ok(
      Math.abs(Number(energyAfter.replace(/[^\d.−-]/g, '').replace('−', '-'))) < 2,
      `energy difference after the fit: ${energyAfter}`,
    );
    await settleAnimations(page);
    await screenshot(page, 'calibration-fit');
  });

  it('accepts the fit as version 2 of the profile, naming the trips, and re-runs its scenario', async () => {
    const { page } = browser;
    page.once('dialog', (dialog) => void dialog.accept());

    await page.getByTestId('accept-fit').click();
    await page.getByTestId('fit-accepted').waitFor();
    assert.match((await page.getByTestId('fit-accepted').textContent()) ?? '', /version 2 of the profile.*being re-run/s);
    await page.getByTestId('fit-accepted').getByRole('link', { name: 'follow the run' }).click();
    await page.getByText(/done/i).first().waitFor({ timeout: 60_000 });

    await page.goto(`${BASE_URL}/vehicles/${profileId}`);
    const version = page.getByTestId('profile-version');
    await version.getByText('Version 2').waitFor();
    assert.match((await version.textContent()) ?? '', /fitted to measured runs.*valley-line-westgate-lindmoor-2026-03-11/s);
    await settleAnimations(page);
    await screenshot(page, 'calibration-accepted-profile');
  });
});

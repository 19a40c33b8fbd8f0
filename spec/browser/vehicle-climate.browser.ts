import assert from 'node:assert/strict';
import { describe, it } from 'node:test';
import type { ServiceDay, ServiceDayResult } from '../../shared/domain/service-days';
import type { VehicleProfile } from '../../shared/domain/vehicle-profiles';
import { auxiliaryBreakdown } from '../../shared/engine/auxiliary-power';
import { DEFAULT_CLIMATE } from '../../shared/engine/constants';
import { BASE_URL, screenshot, settleAnimations } from './support/browser';
import { signedInBrowser } from './support/demo-people';

/**
 * An analyst copies the vehicle of the demo's winter end-of-life day, states its battery ageing
 * and cabin climate on the vehicle form, saves, reloads and finds them again; a service day run
 * with that profile then reports the usable battery and the heating power they give.
 */
describe('vehicle form: battery ageing and cabin climate', () => {
  const browser = signedInBrowser('analyst', { width: 1400, height: 900 });
  let demoDay: ServiceDay;
  let profileId = '';

  it('copies the demo vehicle and states its ageing and climate', async () => {
    const { page } = browser;
    const list = (await (await page.request.get(`${BASE_URL}/api/service-days`)).json()) as {
      items: { id: string; season: string; batteryAge: string; dayType: string }[];
    };
    const winter = list.items.find((day) => day.season === 'winter' && day.batteryAge === 'end-of-life' && day.dayType === 'weekday');
    assert.ok(winter, 'the demo has a winter weekday at end of battery life');
    demoDay = (await (await page.request.get(`${BASE_URL}/api/service-days/${winter.id}`)).json()) as ServiceDay;
    const sourceId = demoDay.blocks[0]!.vehicleProfileId;

    await page.goto(`${BASE_URL}/vehicles/new?copyOf=${sourceId}`);
    const name = page.getByLabel('Name');
    await name.waitFor();
    await page.waitForFunction(() =>
      (document.querySelector('input[formcontrolname="name"]') as HTMLInputElement).value.endsWith('(copy)'),
    );
    await name.fill('Aged bus with heat pump');
    await page.locator('[data-field="endOfLifeCapacity"]').fill('70');
    await page.locator('[data-field="endOfLifeChargePower"]').fill('85');

    const climateSwitch = page.getByTestId('climate-enabled').getByRole('checkbox');
    if (await climateSwitch.isChecked()) {
      // The demo vehicle already models its cabin: state a climate of our own from scratch.
      await climateSwitch.uncheck();
    }
    await climateSwitch.check();
    await page.locator('[data-field="heatingSetpoint"]').fill('20');
    await page.locator('[data-field="bodyUa"]').fill('420');
    await page.locator('[data-field="heatPumpHeat"]').fill('16');
    await page.locator('[data-field="heatPumpMinAmbient"]').fill('-25');
    // An out-of-range value is refused on the spot, with the range from the contract.
    await page.locator('[data-field="freshAir"]').fill('20000');
    await page.locator('[data-field="freshAir"]').blur();
    await page.getByText('At most 10000 m³/h.').waitFor();
    await page.locator('[data-field="freshAir"]').fill('');
    // The COP curve: start from the typical one and change its coldest point.
    if ((await page.getByTestId('cop-row').count()) > 0) {
      while ((await page.getByTestId('cop-row').count()) > 0) await page.getByRole('button', { name: /^Remove test point 1$/ }).click();
    }
    await page.getByRole('button', { name: 'Start from the typical curve' }).click();
    assert.equal(await page.getByTestId('cop-row').count(), DEFAULT_CLIMATE.heatPumpCop.length);
    await page.getByLabel('Test point 1 COP').fill('1.6');
    await screenshot(page, 'vehicle-climate-form-1400');

    await page.getByRole('button', { name: 'Create profile' }).click();
    await page.waitForURL(/\/vehicles\/[0-9a-f-]{36}$/);
    profileId = new URL(page.url()).pathname.split('/').at(-1)!;

    const saved = (await (await page.request.get(`${BASE_URL}/api/vehicles/${profileId}`)).json()) as VehicleProfile;
    assert.equal(saved.vehicle.endOfLifeCapacityFraction, 0.7);
    assert.equal(saved.vehicle.endOfLifeChargePowerFraction, 0.85);
    assert.deepEqual(saved.climate, {
      heatingSetpointC: 20,
      bodyUaWPerK: 420,
      heatPumpHeatW: 16_000,
      heatPumpMinAmbientC: -25,
      heatPumpCop: DEFAULT_CLIMATE.heatPumpCop.map((point, index) => (index === 0 ? { ...point, cop: 1.6 } : point)),
    });
  });

  it('finds the same values after a reload', async () => {
    const { page } = browser;
    await page.reload();
    await page.locator('[data-field="endOfLifeCapacity"]').waitFor();
    await page.waitForFunction(
      () => (document.querySelector('[data-field="endOfLifeCapacity"]') as HTMLInputElement | null)?.value === '70',
    );
    assert.equal(await page.locator('[data-field="endOfLifeChargePower"]').inputValue(), '85');
    assert.ok(await page.getByTestId('climate-enabled').getByRole('checkbox').isChecked());
    assert.equal(await page.locator('[data-field="heatingSetpoint"]').inputValue(), '20');
    assert.equal(await page.locator('[data-field="bodyUa"]').inputValue(), '420');
    assert.equal(await page.locator('[data-field="freshAir"]').inputValue(), '');
    assert.equal(await page.getByLabel('Test point 1 COP').inputValue(), '1.6');
    // An empty field says what it stands for.
    assert.match(
      await page
        .locator('mat-form-field')
        .filter({ has: page.locator('[data-field="freshAir"]') })
        .innerText(),
      /Empty: 800 m³\/h/,
    );
    const size = page.viewportSize()!;
    await page.setViewportSize({ width: size.width, height: 3200 });
    await settleAnimations(page);
    await screenshot(page, 'vehicle-climate-saved-1400');
    await page.setViewportSize({ width: 390, height: 3200 });
    await settleAnimations(page);
    await screenshot(page, 'vehicle-climate-saved-390');
    await page.setViewportSize(size);
  });

  it('runs a service day with that profile, which reports its aged battery and its heating power', async () => {
    const { page } = browser;
    const profile = (await (await page.request.get(`${BASE_URL}/api/vehicles/${profileId}`)).json()) as VehicleProfile;
    const block = { ...demoDay.blocks[0]!, vehicleProfileId: profileId };
    const created = await page.request.post(`${BASE_URL}/api/service-days`, {
      data: {
        name: 'Winter check of the aged bus',
        dayType: demoDay.dayType,
        season: 'winter',
        batteryAge: 'end-of-life',
        reserveSoc: demoDay.reserveSoc,
        chargers: demoDay.chargers,
        blocks: [block],
      },
    });
    assert.equal(created.status(), 201, await created.text());
    const day = (await created.json()) as ServiceDay;
    await page.goto(`${BASE_URL}/service-days/${day.id}`);
    await page.getByTestId('run-button').click();
    await page.getByTestId('block-table').waitFor({ timeout: 120_000 });

    const result = (await (await page.request.get(`${BASE_URL}/api/service-days/${day.id}/result`)).json()) as ServiceDayResult;
    const vehicle = result.blocks[0]!.vehicle!;
    // The battery at end of life: 70 % of the usable energy, 85 % of the charge power.
    assert.ok(Math.abs(vehicle.usableCapacityWh - profile.vehicle.batteryCapacityWh * 0.7) < 1e-6);
    assert.ok(Math.abs(vehicle.maxChargePowerW - profile.vehicle.maxChargePowerW * 0.85) < 1e-6);
    assert.equal(vehicle.auxiliarySource, 'climate');
    // Heating at a stop from the stated climate at the winter ambient (the rest at their defaults).
    const standing = auxiliaryBreakdown(
      { ...DEFAULT_CLIMATE, ...profile.climate },
      { ambientC: profile.seasons.winter.ambientC, passengers: 0, doorOpenings: 0, durationS: 3_600 },
    );
    assert.ok(Math.abs(vehicle.standingHeatingPowerW - (standing.heatPumpElectricW + standing.resistiveElectricW)) < 1e-6);
    assert.ok(vehicle.standingHeatingPowerW > 0);

    const row = page.getByTestId('block-table').locator('tbody tr').first();
    const heatingKw = Number((await row.getByTestId('standing-heating').innerText()).replace(/[^0-9.]/g, ''));
    assert.ok(Math.abs(heatingKw - vehicle.standingHeatingPowerW / 1_000) < 0.051, `${heatingKw} kW on screen`);
    const usableKwh = Number((await row.getByTestId('usable-capacity').innerText()).replace(/[^0-9.]/g, ''));
    assert.ok(Math.abs(usableKwh - vehicle.usableCapacityWh / 1_000) < 0.51, `${usableKwh} kWh on screen`);
    await screenshot(page, 'vehicle-climate-service-day-1400');

    // Tidy up: the day and the profile leave the demo as they found it.
    assert.equal((await page.request.delete(`${BASE_URL}/api/service-days/${day.id}`)).status(), 204);
    assert.equal((await page.request.delete(`${BASE_URL}/api/vehicles/${profileId}`)).status(), 204);
  });
});

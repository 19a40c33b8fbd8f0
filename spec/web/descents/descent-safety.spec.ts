import { TestBed } from '@angular/core/testing';
import type { Descent } from '@shared/domain/analysis';
import { DescentSafety } from '../../../web/app/descents/descent-safety';
import { aDescent } from './descent-fixture';

function render(descent: Descent): HTMLElement {
  const fixture = TestBed.createComponent(DescentSafety);
  fixture.componentRef.setInput('descent', descent);
  fixture.componentRef.setInput('units', 'metric');
  fixture.detectChanges();
  return fixture.nativeElement as HTMLElement;
}

function text(host: HTMLElement, testId: string): string {
  return host.querySelector(`[data-testid="${testId}"]`)?.textContent?.replace(/\s+/g, ' ').trim() ?? '';
}

describe('DescentSafety', () => {
  it('shows the worst case beside the nominal run, each with its risk, peak and front/rear brakes', () => {
    const host = render(aDescent());

    expect(text(host, 'worst-case')).toContain('Critical');
    expect(text(host, 'worst-case')).toContain('402 °C');
    expect(text(host, 'worst-case')).toContain('402 °C / 356 °C');
    expect(text(host, 'worst-case')).toContain('Highest safe descent speed: 17 km/h');
    expect(text(host, 'nominal-case')).toContain('Elevated');
    expect(text(host, 'nominal-case')).toContain('213 °C / 181 °C');
    expect(text(host, 'nominal-case')).toContain('Highest safe descent speed: 28 km/h');
  });

  it('says in plain words what the worst case takes together', () => {
    const conditions = text(render(aDescent()), 'worst-case-conditions');

    expect(conditions).toContain('regeneration lost; the friction brakes take all the braking');
    expect(conditions).toContain('battery at 95 % at the top');
    expect(conditions).toContain('19.0 t: the permissible gross mass');
    expect(conditions).toContain('35 °C ambient');
    expect(conditions).toContain('brakes already at 97 °C at the top');
    expect(conditions).toContain('wet surface');
  });

  it('gives the highest SOC at the top, or the reason there is none', () => {
    expect(text(render(aDescent()), 'top-soc')).toContain('Highest battery charge (SOC) at the top: 87 %');
    expect(text(render(aDescent({ maxTopSoc: null, maxTopSocReason: 'no-battery' })), 'top-soc')).not.toContain('87 %');
  });

  it('flags a descent that is not drivable as drawn and gives no speed for it', () => {
    const host = render(
      aDescent({
        speedAdvice: 'not-drivable',
        maxSafeSpeedKph: null,
        worstCase: { ...aDescent().worstCase!, speedAdvice: 'not-drivable', maxSafeSpeedKph: null },
        drivability: {
          drivable: false,
          stretches: [{ fromM: 3_000, toM: 3_200, reason: 'steeper-than-road-limit', detail: '22 % against a 15 % limit.' }],
        },
        adhesion: {
          surface: 'ice',
          availableMu: 0.1,
          requiredMu: 0.24,
          requiredAtM: 3_100,
          sufficient: false,
          regenLimitedByAdhesion: true,
        },
      }),
    );

    expect(text(host, 'worst-case')).toContain('No speed advice: not drivable as drawn');
    expect(text(host, 'worst-case')).not.toContain('km/h');
    expect(text(host, 'safety-flags')).toContain('Not drivable as drawn from 3.00 km to 3.20 km: 22 % against a 15 % limit.');
    expect(text(host, 'safety-flags')).toContain('needs an adhesion of 0.24');
    expect(text(host, 'safety-flags')).toContain('Grip on the driven axle limits regeneration');
  });

  it('says the worst case is missing on a result stored before it existed, and draws no chart', () => {
    const host = render(aDescent({ worstCase: undefined, sensitivity: undefined, nominalRisk: undefined, risk: 'high' }));

    expect(text(host, 'worst-case')).toContain('re-run the scenario');
    expect(text(host, 'nominal-case')).toContain('High');
    expect(host.querySelector('app-sensitivity-chart')).toBeNull();
  });

  it('draws the sensitivity chart and keeps the engineering caution beside the figures', () => {
    const host = render(aDescent());

    expect(host.querySelector('[data-testid="sensitivity-chart"]')).not.toBeNull();
    expect(host.textContent).toContain('licensed engineer');
  });
});

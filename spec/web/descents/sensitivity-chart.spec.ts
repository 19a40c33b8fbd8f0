import { TestBed } from '@angular/core/testing';
import { SensitivityChart } from '../../../web/app/descents/sensitivity-chart';
import { aDescent } from './descent-fixture';

function render(inputs: Record<string, unknown>) {
  const fixture = TestBed.createComponent(SensitivityChart);
  for (const [name, value] of Object.entries(inputs)) fixture.componentRef.setInput(name, value);
  fixture.detectChanges();
  return fixture.nativeElement as HTMLElement;
}

const descent = aDescent();
const BASE = { entries: descent.sensitivity, dominant: 'brake-cooling', fadeThresholdC: 350, fadeMarginK: 50, units: 'metric' };

function x(element: Element | null): number {
  return Number(element!.getAttribute('x'));
}

describe('SensitivityChart', () => {
  it('draws one bar per input from the lower to the higher peak, whichever way the input moves it', () => {
    const host = render(BASE);
    const cooling = host.querySelector('[data-testid="sensitivity-bar-brake-cooling"]')!;
    const soc = host.querySelector('[data-testid="sensitivity-bar-soc"]')!;

    expect(host.querySelectorAll('rect')).toHaveLength(3);
    // Cooling spans 181–262 °C, SOC 200–231 °C: cooling starts further left and is wider.
    expect(x(cooling)).toBeLessThan(x(soc));
    expect(Number(cooling.getAttribute('width'))).toBeGreaterThan(Number(soc.getAttribute('width')));
  });

  it('draws the fade line right of the advisory limit line and marks the dominant input', () => {
    const host = render(BASE);
    const fade = Number(host.querySelector('[data-testid="sensitivity-fade-line"]')!.getAttribute('x1'));
    const limit = Number(host.querySelector('[data-testid="sensitivity-limit-line"]')!.getAttribute('x1'));

    expect(fade).toBeGreaterThan(limit);
    expect(host.querySelector('.label.dominant')!.textContent).toContain('Brake cooling');
    expect(host.querySelector('[data-testid="sensitivity-bar-brake-cooling"]')!.getAttribute('stroke')).not.toBe('none');
    expect(host.querySelector('[data-testid="sensitivity-bar-soc"]')!.getAttribute('stroke')).toBe('none');
  });

  it('gives the same figures as a table and a summary the chart is described by', () => {
    const host = render(BASE);
    const rows = [...host.querySelectorAll('[data-testid="sensitivity-table"] tbody tr')].map((row) =>
      row.textContent!.replace(/\s+/g, ' ').trim(),
    );
    const svg = host.querySelector('svg')!;

    expect(rows[2]).toContain('Brake cooling');
    expect(rows[2]).toContain('widest spread');
    expect(rows[2]).toContain('262 °C');
    expect(rows[2]).toContain('181 °C');
    expect(host.querySelector('#' + svg.getAttribute('aria-describedby'))!.textContent).toContain(
      'Brake cooling moves the peak most (262 °C to 181 °C). Fade starts near 350 °C; the advice keeps the brakes at or below 300 °C.',
    );
  });

  it('leaves out the limit line when no margin is known, and shows °F in imperial units', () => {
    const host = render({ ...BASE, fadeMarginK: undefined, units: 'imperial' });

    expect(host.querySelector('[data-testid="sensitivity-limit-line"]')).toBeNull();
    expect(host.textContent).toContain('fade 662 °F');
  });
});

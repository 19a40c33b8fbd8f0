import { TestBed } from '@angular/core/testing';
import { RISK_STYLES } from '@shared/presentation/index';
import { RiskTag } from '../../../web/app/ui/risk-tag';

/** The browser reports colours as rgb(); the styles hold them as #rrggbb. */
function rgb(hex: string): string {
  const [r, g, b] = [1, 3, 5].map((at) => parseInt(hex.slice(at, at + 2), 16));
  return `rgb(${r}, ${g}, ${b})`;
}

describe('RiskTag', () => {
  it('shows the level word on its surface colour in its text colour when given no count', async () => {
    const fixture = TestBed.createComponent(RiskTag);
    fixture.componentRef.setInput('risk', 'critical');
    await fixture.whenStable();

    const host: HTMLElement = fixture.nativeElement;
    expect(host.textContent?.trim()).toBe(RISK_STYLES.critical.label);
    expect(host.style.background).toContain(rgb(RISK_STYLES.critical.surface));
    expect(host.style.color).toBe(rgb(RISK_STYLES.critical.text));
  });

  it('reads "<count> <level>" in lower case when given a count, including a count of zero', async () => {
    const fixture = TestBed.createComponent(RiskTag);
    fixture.componentRef.setInput('risk', 'elevated');
    fixture.componentRef.setInput('count', 3);
    await fixture.whenStable();
    expect(fixture.nativeElement.textContent.trim()).toBe(`3 ${RISK_STYLES.elevated.label.toLowerCase()}`);

    fixture.componentRef.setInput('count', 0);
    await fixture.whenStable();
    expect(fixture.nativeElement.textContent.trim()).toBe(`0 ${RISK_STYLES.elevated.label.toLowerCase()}`);
  });

  it('follows a new level with its word and colours', async () => {
    const fixture = TestBed.createComponent(RiskTag);
    fixture.componentRef.setInput('risk', 'low');
    await fixture.whenStable();
    fixture.componentRef.setInput('risk', 'high');
    await fixture.whenStable();

    const host: HTMLElement = fixture.nativeElement;
    expect(host.textContent?.trim()).toBe(RISK_STYLES.high.label);
    expect(host.style.color).toBe(rgb(RISK_STYLES.high.text));
  });
});

import { TestBed } from '@angular/core/testing';
import { ADVICE_CAUTIONS } from '@shared/presentation/index';
import { AdviceCautions } from '../../../web/app/ui/advice-cautions';

describe('AdviceCautions', () => {
  it('lists every shared caution under its title, starting with regeneration not being a fail-safe brake', async () => {
    const fixture = TestBed.createComponent(AdviceCautions);
    await fixture.whenStable();

    const aside: HTMLElement = fixture.nativeElement.querySelector('[data-testid="advice-cautions"]');
    const items = [...aside.querySelectorAll('li')].map((item) => item.textContent?.trim());
    expect(aside.getAttribute('aria-label')).toBe('Before anyone acts on this advice');
    expect(items).toEqual([...ADVICE_CAUTIONS]);
    expect(items[0]).toMatch(/^Regeneration is not a fail-safe brake/);
    expect(items[1]).toContain('UN ECE Regulation No. 13, Type-II and Type-IIA');
  });
});

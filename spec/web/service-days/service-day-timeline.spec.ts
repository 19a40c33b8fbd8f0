import { TestBed } from '@angular/core/testing';
import { ServiceDayTimeline } from '../../../web/app/service-days/service-day-timeline';
import { timelineRows } from '../../../web/app/service-days/service-day-timeline-model';
import { ROUTE_A, block, lookup } from './fixtures';

const h = (hours: number, minutes = 0) => hours * 3600 + minutes * 60;

describe('ServiceDayTimeline', () => {
  it('draws one row per block with its trips placed by time of day, and reports the block clicked', async () => {
    const fixture = TestBed.createComponent(ServiceDayTimeline);
    const rows = timelineRows(
      [
        block(
          'B1',
          [
            [ROUTE_A, h(7), 'outbound'],
            [ROUTE_A, h(8), 'inbound'],
          ],
          { pullOutS: h(6), pullInS: h(10) },
        ),
        block('B2', [[ROUTE_A, h(9), 'outbound']], { pullOutS: h(8, 30), pullInS: h(10) }),
      ],
      lookup,
    );
    fixture.componentRef.setInput('rows', rows);
    fixture.componentRef.setInput('selectable', true);
    const picked: string[] = [];
    fixture.componentInstance.blockSelected.subscribe((blockId) => picked.push(blockId));
    await fixture.whenStable();

    const element = fixture.nativeElement as HTMLElement;
    const rowElements = [...element.querySelectorAll<HTMLElement>('.row')];
    expect(rowElements.map((row) => row.dataset['block'])).toEqual(['B1', 'B2']);
    const trips = [...rowElements[0]!.querySelectorAll<HTMLElement>('.bar.trip')];
    expect(trips).toHaveLength(2);
    // The day spans 06:00–10:00: a trip at 07:00–07:30 starts a quarter in and is 12.5 % wide.
    expect(Number.parseFloat(trips[0]!.style.left)).toBeCloseTo(25, 6);
    expect(Number.parseFloat(trips[0]!.style.width)).toBeCloseTo(12.5, 6);
    expect(trips[1]!.title).toBe('Trip 2: Brackenfold – Upper Tarn inbound, 08:00–08:30');
    expect([...element.querySelectorAll('.tick')].map((tick) => tick.textContent?.trim())).toEqual([
      '06:00',
      '07:00',
      '08:00',
      '09:00',
      '10:00',
    ]);

    rowElements[1]!.querySelector<HTMLButtonElement>('button.name')!.click();
    expect(picked).toEqual(['B2']);
  });
});

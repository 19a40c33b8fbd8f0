import { ChangeDetectionStrategy, Component, signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { FileDrop } from '../../../web/app/ui/file-drop';
import { settle } from '../support/settle';

@Component({
  imports: [FileDrop],
  template: `<div class="drop-zone" appFileDrop (fileDropped)="dropped.set($event.name)"></div>`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
class DropHost {
  readonly dropped = signal<string | null>(null);
}

/** A drag event carrying files (jsdom has no DataTransfer to build one with). */
function dragEvent(type: string, files: File[] = []): Event {
  const event = new Event(type, { bubbles: true, cancelable: true });
  Object.defineProperty(event, 'dataTransfer', { value: { files } });
  return event;
}

describe('FileDrop', () => {
  it('marks the zone while a file is held over it and reports the first file dropped', async () => {
    const fixture = TestBed.createComponent(DropHost);
    await settle(fixture);
    const zone = (fixture.nativeElement as HTMLElement).querySelector('.drop-zone')!;

    const over = dragEvent('dragover');
    zone.dispatchEvent(over);
    await settle(fixture);
    expect(over.defaultPrevented).toBe(true);
    expect(zone.classList.contains('dragging')).toBe(true);

    const drop = dragEvent('drop', [new File(['x'], 'upper-valley.tif'), new File(['y'], 'second.tif')]);
    zone.dispatchEvent(drop);
    await settle(fixture);
    expect(drop.defaultPrevented).toBe(true);
    expect(zone.classList.contains('dragging')).toBe(false);
    expect(fixture.componentInstance.dropped()).toBe('upper-valley.tif');
  });

  it('stops marking the zone when the file leaves it, and ignores a drop without files', async () => {
    const fixture = TestBed.createComponent(DropHost);
    await settle(fixture);
    const zone = (fixture.nativeElement as HTMLElement).querySelector('.drop-zone')!;

    zone.dispatchEvent(dragEvent('dragover'));
    zone.dispatchEvent(dragEvent('dragleave'));
    await settle(fixture);
    expect(zone.classList.contains('dragging')).toBe(false);

    zone.dispatchEvent(dragEvent('drop'));
    await settle(fixture);
    expect(fixture.componentInstance.dropped()).toBeNull();
  });
});

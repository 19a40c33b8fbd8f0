import { Directive, output, signal } from '@angular/core';

/**
 * Makes an element a drop zone for one file: it takes the `dragging` class while a file is held
 * over it and reports the first dropped file. The page still offers a file picker beside it for
 * keyboard users.
 */
@Directive({
  selector: '[appFileDrop]',
  host: {
    '[class.dragging]': 'isDragging()',
    '(dragover)': 'dragOver($event)',
    '(dragleave)': 'isDragging.set(false)',
    '(drop)': 'drop($event)',
  },
})
export class FileDrop {
  /** The first file dropped on the zone. */
  readonly fileDropped = output<File>();
  protected readonly isDragging = signal(false);

  protected dragOver(event: DragEvent): void {
    event.preventDefault();
    this.isDragging.set(true);
  }

  protected drop(event: DragEvent): void {
    event.preventDefault();
    this.isDragging.set(false);
    const dropped = event.dataTransfer?.files?.[0];
    if (dropped) this.fileDropped.emit(dropped);
  }
}

import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, output, signal } from '@angular/core';
import { FormControl, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import type { TerrainModel } from '@shared/domain/terrain';
import type { Subscription } from 'rxjs';
import { describeApiError } from '../core/api-error-message';
import { TerrainApi } from './terrain-api';
import { formatFileSize } from './terrain-format';
import { FileDrop } from '../ui/file-drop';

/** Where an upload stands, as the panel shows it. */
export type UploadState =
  | { status: 'idle' }
  | { status: 'uploading'; sentBytes: number; totalBytes: number }
  | { status: 'processing'; id: string }
  | { status: 'done'; model: TerrainModel }
  | { status: 'error'; message: string };

/** How often the panel asks whether ingestion has finished. */
const POLL_INTERVAL_MS = 1500;

/**
 * Upload panel for analysts and administrators: pick or drop a GeoTIFF, name it, watch the bytes
 * go up, then the server's processing until the model is ready (or why it failed).
 */
@Component({
  selector: 'app-terrain-upload',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatProgressBarModule, FileDrop],
  templateUrl: './terrain-upload.html',
  styleUrl: './terrain-upload.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TerrainUpload {
  private readonly terrainApi = inject(TerrainApi);

  /** Emits once the server has accepted a file (the catalogue shows it as processing). */
  readonly uploadAccepted = output<string>();
  /** Emits when ingestion has finished, ready or failed. */
  readonly ingestionFinished = output<TerrainModel>();

  protected readonly file = signal<File | null>(null);
  protected readonly state = signal<UploadState>({ status: 'idle' });
  protected readonly name = new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.maxLength(120)] });
  protected readonly percent = computed(() => {
    const state = this.state();
    return state.status === 'uploading' && state.totalBytes > 0 ? Math.round((100 * state.sentBytes) / state.totalBytes) : 0;
  });
  protected readonly isBusy = computed(() => ['uploading', 'processing'].includes(this.state().status));
  /** A chosen file not yet sent: after a model is in, the same file is not offered twice ("Upload another" starts over). */
  protected readonly canUpload = computed(() => this.file() !== null && !this.isBusy() && this.state().status !== 'done');
  protected readonly formatFileSize = formatFileSize;

  private upload: Subscription | null = null;
  private pollTimer: ReturnType<typeof setTimeout> | null = null;

  constructor() {
    inject(DestroyRef).onDestroy(() => this.stop());
  }

  protected chooseFile(event: Event): void {
    const input = event.target as HTMLInputElement;
    const chosen = input.files?.[0];
    if (chosen) this.takeFile(chosen);
    input.value = '';
  }

  protected startUpload(): void {
    const file = this.file();
    if (!file || this.name.invalid || !this.canUpload()) {
      this.name.markAsTouched();
      return;
    }
    this.state.set({ status: 'uploading', sentBytes: 0, totalBytes: file.size });
    this.upload = this.terrainApi.upload(file, this.name.value.trim()).subscribe({
      next: (progress) => {
        if (progress.kind === 'progress') {
          this.state.set({ status: 'uploading', sentBytes: progress.sentBytes, totalBytes: progress.totalBytes });
        } else {
          this.state.set({ status: 'processing', id: progress.accepted.id });
          this.uploadAccepted.emit(progress.accepted.id);
          this.schedulePoll(progress.accepted.id);
        }
      },
      error: (error: unknown) => this.state.set({ status: 'error', message: describeApiError(error) }),
    });
  }

  protected cancel(): void {
    this.stop();
    this.state.set({ status: 'idle' });
  }

  protected reset(): void {
    this.stop();
    this.file.set(null);
    this.name.reset('');
    this.state.set({ status: 'idle' });
  }

  protected takeFile(file: File): void {
    this.file.set(file);
    if (!this.name.value) this.name.setValue(file.name.replace(/\.(tiff?|gtiff?)$/i, ''));
    if (this.state().status !== 'uploading') this.state.set({ status: 'idle' });
  }

  private schedulePoll(id: string): void {
    this.pollTimer = setTimeout(() => void this.poll(id), POLL_INTERVAL_MS);
  }

  private async poll(id: string): Promise<void> {
    try {
      const model = await this.terrainApi.get(id);
      if (model.status === 'processing') {
        this.schedulePoll(id);
        return;
      }
      this.state.set({ status: 'done', model });
      this.ingestionFinished.emit(model);
    } catch (error: unknown) {
      // Expected: the connection dropped; the model keeps processing on the server.
      this.state.set({ status: 'error', message: describeApiError(error) });
    }
  }

  private stop(): void {
    this.upload?.unsubscribe();
    this.upload = null;
    if (this.pollTimer) clearTimeout(this.pollTimer);
    this.pollTimer = null;
  }
}

import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatExpansionModule } from '@angular/material/expansion';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatTableModule } from '@angular/material/table';
import { MatTabsModule } from '@angular/material/tabs';
import type { CapturedMail, OutgoingMail } from '@shared/domain/mail';
import { describeApiError } from '../../core/api-error-message';
import { MailApi } from './mail-api';

type ListState<T> = { status: 'loading'; items: T[] } | { status: 'error'; items: T[]; message: string } | { status: 'ready'; items: T[] };

const OUTBOX_STATUS_LABELS: Readonly<Record<OutgoingMail['status'], string>> = {
  queued: 'Queued',
  sent: 'Sent',
  failed: 'Failed',
};

/** Administrators' view of outgoing mail: the outbox and the local mail catcher. */
@Component({
  selector: 'app-outgoing-mail',
  imports: [DatePipe, MatTabsModule, MatTableModule, MatExpansionModule, MatButtonModule, MatIconModule, MatProgressBarModule],
  templateUrl: './outgoing-mail.html',
  styleUrl: './outgoing-mail.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class OutgoingMailPage {
  private readonly mailApi = inject(MailApi);

  protected readonly outboxColumns = ['to', 'subject', 'status', 'attempts', 'lastError', 'createdAt', 'sentAt'];
  protected readonly outbox = signal<ListState<OutgoingMail>>({ status: 'loading', items: [] });
  protected readonly captured = signal<ListState<CapturedMail>>({ status: 'loading', items: [] });

  constructor() {
    void this.refresh();
  }

  protected statusLabel(status: OutgoingMail['status']): string {
    return OUTBOX_STATUS_LABELS[status];
  }

  protected async refresh(): Promise<void> {
    await Promise.all([load(this.outbox, () => this.mailApi.outbox()), load(this.captured, () => this.mailApi.captured())]);
  }
}

async function load<T>(state: ReturnType<typeof signal<ListState<T>>>, fetch: () => Promise<T[]>): Promise<void> {
  state.update((current) => ({ status: 'loading', items: current.items }));
  try {
    state.set({ status: 'ready', items: await fetch() });
  } catch (error: unknown) {
    // Expected: server unreachable, or the mail catcher is not running (production).
    state.update((current) => ({ status: 'error', items: current.items, message: describeApiError(error) }));
  }
}

import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { BATTERY_AGE_LABELS, DAY_TYPE_LABELS, SCENARIO_STATUS_LABELS, SEASON_LABELS } from '@shared/presentation/index';
import { describeApiError } from '../core/api-error-message';
import { Session } from '../core/session';
import { ServiceDaysApi, type ServiceDaySummary } from './service-days-api';

type LoadState = { status: 'loading' } | { status: 'error'; message: string } | { status: 'ready' };

/** Every service day: kind of day, season, battery age, size, run status and whether it is out of date. */
@Component({
  selector: 'app-service-day-list',
  imports: [DatePipe, RouterLink, MatButtonModule, MatIconModule, MatProgressBarModule],
  templateUrl: './service-day-list.html',
  styleUrl: './service-day-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class ServiceDayList {
  private readonly api = inject(ServiceDaysApi);
  private readonly session = inject(Session);

  protected readonly dayTypeLabels = DAY_TYPE_LABELS;
  protected readonly seasonLabels = SEASON_LABELS;
  protected readonly batteryAgeLabels = BATTERY_AGE_LABELS;
  protected readonly loadState = signal<LoadState>({ status: 'loading' });
  protected readonly items = signal<ServiceDaySummary[]>([]);
  protected readonly canCreate = computed(() => this.session.can('service-days.edit'));

  constructor() {
    void this.load();
  }

  protected statusLabel(item: ServiceDaySummary): string {
    return item.status ? SCENARIO_STATUS_LABELS[item.status] : 'Not run yet';
  }

  private async load(): Promise<void> {
    this.loadState.set({ status: 'loading' });
    try {
      const items = await this.api.list();
      this.items.set([...items].sort((a, b) => a.name.localeCompare(b.name, 'en', { numeric: true })));
      this.loadState.set({ status: 'ready' });
    } catch (error: unknown) {
      this.loadState.set({ status: 'error', message: describeApiError(error) });
    }
  }
}

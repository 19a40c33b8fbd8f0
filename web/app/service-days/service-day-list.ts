import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, resource } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { BATTERY_AGE_LABELS, DAY_TYPE_LABELS, SCENARIO_STATUS_LABELS, SEASON_LABELS } from '@shared/presentation/index';
import { Session } from '../core/session';
import { LoadStatus } from '../ui/load-status';
import { loadStateOf } from '../ui/load-state';
import { ServiceDaysApi, type ServiceDaySummary } from './service-days-api';

/** Every service day: kind of day, season, battery age, size, run status and whether it is out of date. */
@Component({
  selector: 'app-service-day-list',
  imports: [DatePipe, RouterLink, MatButtonModule, MatIconModule, LoadStatus],
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
  /** Every service day, by name (numbers in names in their order: "Day 2" before "Day 10"). */
  protected readonly list = resource({
    loader: async () => [...(await this.api.list())].sort((a, b) => a.name.localeCompare(b.name, 'en', { numeric: true })),
  });
  protected readonly loadState = loadStateOf(this.list);
  protected readonly items = computed<ServiceDaySummary[]>(() => (this.list.hasValue() ? this.list.value() : []));
  protected readonly canCreate = computed(() => this.session.can('service-days.edit'));

  protected statusLabel(item: ServiceDaySummary): string {
    return item.status ? SCENARIO_STATUS_LABELS[item.status] : 'Not run yet';
  }
}

import { ChangeDetectionStrategy, Component, computed, effect, inject, input, resource, signal, viewChild } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatIconModule } from '@angular/material/icon';
import { MatPaginator, MatPaginatorModule } from '@angular/material/paginator';
import { MatSort, MatSortModule } from '@angular/material/sort';
import { MatTableDataSource, MatTableModule } from '@angular/material/table';
import { Router, RouterLink } from '@angular/router';
import type { RiskLevel } from '@shared/domain/analysis';
import type { Scenario } from '@shared/domain/scenarios';
import { Session } from '../core/session';
import { QuantityPipe } from '../units/quantity-pipe';
import { UnitPreference } from '../units/unit-preference';
import { RISK_ORDER } from '@shared/presentation/index';
import { DIRECTION_LABELS, SCENARIO_STATUS_LABELS, describeLoad, describeSeason } from '@shared/presentation/index';
import { loadStateOf } from '../ui/load-state';
import { LoadStatus } from '../ui/load-status';
import { RiskTag } from '../ui/risk-tag';
import { ScenariosApi } from './scenarios-api';

/** Most scenarios compared side by side. */
export const MAX_COMPARED = 4;

/** Every scenario: status, headline figures, risk; pick two to four to compare. */
@Component({
  selector: 'app-scenario-list',
  imports: [
    RouterLink,
    MatTableModule,
    MatSortModule,
    MatPaginatorModule,
    MatCheckboxModule,
    MatButtonModule,
    MatIconModule,
    QuantityPipe,
    LoadStatus,
    RiskTag,
  ],
  templateUrl: './scenario-list.html',
  styleUrl: './scenario-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class ScenarioList {
  private readonly api = inject(ScenariosApi);
  private readonly session = inject(Session);
  private readonly router = inject(Router);

  /** Optional filter from `?routeId=`. */
  readonly routeId = input<string | undefined>();

  private readonly sort = viewChild(MatSort);
  private readonly paginator = viewChild(MatPaginator);

  protected readonly units = inject(UnitPreference).system;
  protected readonly describeLoad = describeLoad;
  protected readonly describeSeason = describeSeason;
  protected readonly columns = ['select', 'name', 'route', 'vehicle', 'conditions', 'status', 'net', 'regen', 'risk'];
  protected readonly dataSource = new MatTableDataSource<Scenario>([]);
  /** The scenarios, of one route when `routeId` is given; a new route id drops the answer for the old one. */
  private readonly scenarios = resource({
    params: () => ({ routeId: this.routeId() }),
    loader: ({ params }) => this.api.list(params),
  });
  protected readonly loadState = loadStateOf(this.scenarios);
  protected readonly selected = signal<readonly string[]>([]);
  protected readonly canCreate = computed(() => this.session.can('scenarios.edit'));
  protected readonly canCompare = computed(() => this.selected().length >= 2 && this.selected().length <= MAX_COMPARED);

  constructor() {
    this.dataSource.sortingDataAccessor = (scenario, column) => {
      switch (column) {
        case 'route':
          return scenario.routeName.toLowerCase();
        case 'vehicle':
          return scenario.vehicleProfileName.toLowerCase();
        case 'net':
          return scenario.summary?.batteryNetEnergyWh ?? -Infinity;
        case 'regen':
          return scenario.summary?.regenEnergyWh ?? -Infinity;
        case 'risk':
          return worstRiskRank(scenario);
        default:
          return scenario.name.toLowerCase();
      }
    };
    effect(() => {
      this.dataSource.sort = this.sort() ?? null;
      this.dataSource.paginator = this.paginator() ?? null;
    });
    effect(() => {
      this.dataSource.data = this.scenarios.value() ?? [];
    });
  }

  protected directionLabel(scenario: Scenario): string {
    return DIRECTION_LABELS[scenario.direction];
  }

  protected statusLabel(scenario: Scenario): string {
    return SCENARIO_STATUS_LABELS[scenario.status];
  }

  protected isSelected(id: string): boolean {
    return this.selected().includes(id);
  }

  protected toggle(id: string): void {
    this.selected.update((ids) =>
      ids.includes(id) ? ids.filter((other) => other !== id) : ids.length < MAX_COMPARED ? [...ids, id] : ids,
    );
  }

  protected compare(): void {
    void this.router.navigate(['/scenarios/compare'], { queryParams: { ids: this.selected().join(',') } });
  }

  protected worstRisk(scenario: Scenario): RiskLevel | null {
    const counts = scenario.riskCounts;
    if (!counts) return null;
    return [...RISK_ORDER].reverse().find((level) => counts[level] > 0) ?? 'low';
  }

  protected reload(): void {
    this.scenarios.reload();
  }
}

function worstRiskRank(scenario: Scenario): number {
  const counts = scenario.riskCounts;
  if (!counts) return -1;
  return Math.max(...RISK_ORDER.map((level, rank) => (counts[level] > 0 ? rank : 0)));
}

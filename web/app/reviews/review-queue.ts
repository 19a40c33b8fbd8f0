import { BreakpointObserver } from '@angular/cdk/layout';
import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, viewChild } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatPaginator, MatPaginatorModule } from '@angular/material/paginator';
import { MatSelectModule } from '@angular/material/select';
import { MatSort, MatSortModule } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { ActivatedRoute, Router, RouterLink } from '@angular/router';
import { map } from 'rxjs';
import type { RiskLevel } from '@shared/domain/analysis';
import { REVIEW_STATES, REVIEW_STATE_LABELS, currentRisk, type ReviewItem, type ReviewState } from '@shared/domain/reviews';
import { Session } from '../core/session';
import { EngineeringCaution } from '../ui/engineering-caution';
import { RiskChip } from '../ui/risk-chip';
import { RISK_ORDER, RISK_STYLES, riskRank } from '@shared/presentation/index';
import { ReachedTemperaturePipe } from '../units/reached-temperature-pipe';
import { QuantityPipe } from '../units/quantity-pipe';
import { UnitPreference } from '../units/unit-preference';
import { countByState, filterFromQuery, matchesReviewFilter, NO_REVIEW_FILTER, routeOptions, vehicleOptions } from './review-filter';
import { DIRECTION_LABELS } from './direction-labels';
import { ReviewStateChip } from './review-state-chip';
import { ReviewsApi } from './reviews-api';
import { filterOf, listTable } from '../ui/list-table';
import { LoadStatus } from '../ui/load-status';

const ALL_COLUMNS = ['risk', 'route', 'vehicle', 'stretch', 'drop', 'grade', 'peakBrakeTemp', 'state', 'updatedAt'];
const NARROW_COLUMNS = ['risk', 'route', 'vehicle', 'grade', 'peakBrakeTemp', 'state'];
const NARROW_QUERY = '(max-width: 1099.98px)';

/** Every descent at "elevated" risk or worse, to review; safety officers act, others read. */
@Component({
  selector: 'app-review-queue',
  imports: [
    LoadStatus,
    ReachedTemperaturePipe,
    DatePipe,
    RouterLink,
    ReactiveFormsModule,
    MatTableModule,
    MatSortModule,
    MatPaginatorModule,
    MatFormFieldModule,
    MatSelectModule,
    MatButtonModule,
    MatIconModule,

    EngineeringCaution,
    RiskChip,
    ReviewStateChip,
    QuantityPipe,
  ],
  templateUrl: './review-queue.html',
  styleUrl: './review-queue.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class ReviewQueue {
  private readonly reviewsApi = inject(ReviewsApi);
  private readonly router = inject(Router);
  private readonly activatedRoute = inject(ActivatedRoute);
  private readonly session = inject(Session);

  private readonly sort = viewChild.required(MatSort);
  private readonly paginator = viewChild.required(MatPaginator);

  protected readonly units = inject(UnitPreference).system;
  protected readonly riskLevels = RISK_ORDER;
  protected readonly riskStyles = RISK_STYLES;
  protected readonly states = REVIEW_STATES;
  protected readonly stateLabels = REVIEW_STATE_LABELS;
  /** On a tablet the table keeps what a decision needs; stretch, drop and date are on the detail page. */
  private readonly isNarrow = toSignal(
    inject(BreakpointObserver)
      .observe(NARROW_QUERY)
      .pipe(map((state) => state.matches)),
    { initialValue: false },
  );
  protected readonly columns = computed(() => (this.isNarrow() ? NARROW_COLUMNS : ALL_COLUMNS));
  protected readonly isSafetyOfficer = computed(() => this.session.can('reviews.act'));

  protected readonly filterForm = new FormGroup({
    risk: new FormControl<RiskLevel | ''>('', { nonNullable: true }),
    state: new FormControl<ReviewState | ''>('', { nonNullable: true }),
    routeId: new FormControl('', { nonNullable: true }),
    vehicleProfileId: new FormControl('', { nonNullable: true }),
  });
  private readonly filter = filterOf(this.filterForm, NO_REVIEW_FILTER);
  protected readonly table = listTable({
    load: () => this.reviewsApi.list(),
    filter: this.filter,
    matches: matchesReviewFilter,
    sort: this.sort,
    paginator: this.paginator,
    sortValue,
  });
  protected readonly stateCounts = computed(() => countByState(this.table.rows(), this.filter()));
  protected readonly routes = computed(() => routeOptions(this.table.rows()));
  protected readonly vehicles = computed(() => vehicleOptions(this.table.rows()));

  constructor() {
    const initial = filterFromQuery(this.activatedRoute.snapshot.queryParams as Record<string, string>);
    this.filterForm.setValue(initial);

    this.filterForm.valueChanges.subscribe((filter) => {
      // Keep the filter in the address so a filtered queue can be bookmarked or shared.
      const queryParams = Object.fromEntries(Object.entries(filter).map(([key, value]) => [key, value || null]));
      void this.router.navigate([], { queryParams, replaceUrl: true });
    });
  }

  protected showState(state: ReviewState | ''): void {
    this.filterForm.controls.state.setValue(this.filterForm.controls.state.value === state ? '' : state);
  }

  /** The risk that stands now: a mitigated item shows its re-run's risk (see currentRisk). */
  protected current(item: ReviewItem): ReviewItem['risk'] {
    return currentRisk(item);
  }

  protected raisedLabel(item: ReviewItem): string {
    return `raised as ${RISK_STYLES[item.raisedRisk].label.toLowerCase()}`;
  }

  protected directionLabel(item: ReviewItem): string {
    return DIRECTION_LABELS[item.direction];
  }

  protected open(item: ReviewItem): void {
    void this.router.navigate(['/reviews', item.id]);
  }

  protected clearFilter(): void {
    this.filterForm.reset();
  }
}

function sortValue(item: ReviewItem, column: string): string | number {
  switch (column) {
    case 'risk':
      return riskRank(currentRisk(item));
    case 'route':
      return item.routeName.toLowerCase();
    case 'vehicle':
      return item.vehicleProfileName.toLowerCase();
    case 'stretch':
      return item.startM;
    case 'drop':
      return item.dropM;
    case 'grade':
      // Steepest first when descending: grades are negative downhill.
      return -item.meanGradePercent;
    case 'peakBrakeTemp':
      return item.peakBrakeTempC;
    case 'state':
      return REVIEW_STATES.indexOf(item.state);
    case 'updatedAt':
      return Date.parse(item.updatedAt);
    default:
      return '';
  }
}

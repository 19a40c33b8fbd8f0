import { speedLimitRange } from '@shared/presentation/index';
import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import {
  allowedReviewActions,
  type ReviewAction,
  type ReviewItem,
  type ReviewTransitionRequest,
  type ReviewTransitionResult,
} from '@shared/domain/reviews';
import { describeApiError } from '../core/api-error-message';
import { Session } from '../core/session';
import {
  ACCEPT_REASON_MIN_LENGTH,
  acceptForm,
  acceptRequest,
  declineForm,
  declineRequest,
  mitigateRequest,
  mitigationForm,
  reopenForm,
  reopenRequest,
} from './review-transition-forms';
import { ReviewsApi } from './reviews-api';

/** What a button does, in the words the safety officer reads. */
const ACTION_LABELS: Readonly<Record<ReviewAction, { label: string; icon: string; hint: string }>> = {
  acknowledge: {
    label: 'Acknowledge',
    icon: 'visibility',
    hint: 'You have seen this descent and are looking into it.',
  },
  mitigate: {
    label: 'Record mitigation',
    icon: 'shield',
    hint: 'A descent speed cap or an SOC ceiling, re-run by Descentry; it is recorded only when the re-run gives elevated risk or lower.',
  },
  accept: {
    label: 'Propose risk acceptance',
    icon: 'task_alt',
    hint: 'The risk stays as it is, for a reason you give; a second safety officer must sign it off. Use this for measures the model does not represent (a vehicle restriction, a mandatory retarder).',
  },
  'sign-off': {
    label: 'Sign off acceptance',
    icon: 'verified',
    hint: 'As the second safety officer, you agree that this risk is accepted for the reason given.',
  },
  decline: {
    label: 'Send back',
    icon: 'undo',
    hint: 'The proposed acceptance goes back to review, with your note.',
  },
  reopen: {
    label: 'Reopen',
    icon: 'replay',
    hint: 'The decision needs another look.',
  },
};

/** The safety officer's moves on one review item; shown only to safety officers. */
@Component({
  selector: 'app-review-actions',
  imports: [
    ReactiveFormsModule,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatSlideToggleModule,
  ],
  templateUrl: './review-actions.html',
  styleUrl: './review-actions.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReviewActions {
  private readonly reviewsApi = inject(ReviewsApi);
  private readonly session = inject(Session);

  readonly item = input.required<ReviewItem>();
  /** Emits the server's answer after a move: the updated item and the audit event written. */
  readonly transitioned = output<{ result: ReviewTransitionResult; rerunRequested: boolean }>();

  protected readonly actionLabels = ACTION_LABELS;
  protected readonly acceptMinLength = ACCEPT_REASON_MIN_LENGTH;
  /** The speed cap is typed in km/h here, within the contract's range. */
  protected readonly speedRange = speedLimitRange('metric');
  /** Whether the signed-in officer proposed the acceptance waiting here (and so may not sign it off). */
  protected readonly isProposer = computed(() => {
    const proposer = this.item().acceptanceProposedById;
    return proposer !== null && proposer === this.session.user()?.id;
  });
  protected readonly allowed = computed(() =>
    allowedReviewActions(this.item().state).filter((action) => action !== 'sign-off' || !this.isProposer()),
  );
  /** The form open below the buttons, if any. */
  protected readonly openForm = signal<Exclude<ReviewAction, 'acknowledge' | 'sign-off'> | null>(null);
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);

  protected readonly mitigation = mitigationForm();
  protected readonly accept = acceptForm();
  protected readonly reopen = reopenForm();
  protected readonly decline = declineForm();
  /** Whether the mitigation form has been submitted once (show the "name a measure" message). */
  protected readonly mitigationTried = signal(false);
  private readonly mitigationStatus = toSignal(this.mitigation.statusChanges, { initialValue: this.mitigation.status });
  protected readonly showNoMeasure = computed(
    () => this.mitigationTried() && this.mitigationStatus() === 'INVALID' && this.mitigation.hasError('noModelledMeasure'),
  );

  protected choose(action: ReviewAction): void {
    this.error.set(null);
    if (action === 'acknowledge' || action === 'sign-off') {
      void this.send({ action });
      return;
    }
    this.openForm.set(this.openForm() === action ? null : action);
  }

  protected cancel(): void {
    this.openForm.set(null);
    this.error.set(null);
  }

  protected submitMitigation(): void {
    this.mitigationTried.set(true);
    this.mitigation.markAllAsTouched();
    if (this.mitigation.invalid) return;
    void this.send(mitigateRequest(this.mitigation));
  }

  protected submitAccept(): void {
    this.accept.markAllAsTouched();
    if (this.accept.invalid) return;
    void this.send(acceptRequest(this.accept));
  }

  protected submitDecline(): void {
    this.decline.markAllAsTouched();
    if (this.decline.invalid) return;
    void this.send(declineRequest(this.decline));
  }

  protected submitReopen(): void {
    this.reopen.markAllAsTouched();
    if (this.reopen.invalid) return;
    void this.send(reopenRequest(this.reopen));
  }

  private async send(request: ReviewTransitionRequest): Promise<void> {
    this.busy.set(true);
    this.error.set(null);
    try {
      const result = await this.reviewsApi.transition(this.item().id, request);
      this.transitioned.emit({ result, rerunRequested: request.action === 'mitigate' && request.rerun });
      this.openForm.set(null);
      this.mitigation.reset();
      this.mitigationTried.set(false);
      this.accept.reset();
      this.decline.reset();
      this.reopen.reset();
    } catch (error: unknown) {
      // Expected: 409 when someone else moved the item first, 400 on a refused form, 422 when a
      // mitigation's re-run leaves the risk above elevated, 403 for a proposer's own sign-off.
      this.error.set(describeApiError(error));
    } finally {
      this.busy.set(false);
    }
  }
}

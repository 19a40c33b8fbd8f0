import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatCardModule } from '@angular/material/card';
import { MatIconModule } from '@angular/material/icon';
import { Router, RouterLink } from '@angular/router';
import type { Role } from '@shared/domain/roles';
import { areasFor } from '../core/areas';
import { Session } from '../core/session';
import { EngineeringCaution } from '../ui/engineering-caution';

interface RoleIntro {
  heading: string;
  paragraphs: readonly string[];
  showsCaution: boolean;
}

/** What each role does in Descentry, in plain words. */
export const ROLE_INTROS: Readonly<Record<Role, RoleIntro>> = {
  planner: {
    heading: 'Routes and scenarios',
    paragraphs: [
      'As a transit planner you lay out routes with their stops and speed limits, choose a vehicle, its load and the season, and run scenarios.',
      'Each scenario shows how much braking energy the vehicle recovers on the descents, how much the friction brakes still absorb, and how variants of a route compare.',
    ],
    showsCaution: true,
  },
  analyst: {
    heading: 'Terrain and vehicle profiles',
    paragraphs: [
      'As an energy and terrain analyst you upload elevation models, check their coverage and quality, and keep the vehicle profiles true to the fleet.',
      'The quality of every scenario result rests on this data: grades come from the terrain, forces and regeneration limits from the vehicle profiles.',
    ],
    showsCaution: false,
  },
  safety: {
    heading: 'Descent review',
    paragraphs: [
      'As a safety officer you review every long, steep descent where the friction brakes may overheat and fade.',
      'For each warning you acknowledge it, record a mitigation such as a lower descent speed, a mandatory retarder or regeneration mode, or a vehicle restriction, or accept the risk with a reason. New high-risk descents are e-mailed to you.',
    ],
    showsCaution: true,
  },
  board: {
    heading: 'Network summary',
    paragraphs: [
      'As a board member you read one page about the whole network: the braking energy recovered per year, the money and CO₂ it represents, and the safety items still open.',
      'The summary is printable, for meetings and for the record.',
    ],
    showsCaution: false,
  },
  admin: {
    heading: 'People and outgoing mail',
    paragraphs: [
      'As an administrator you invite people to Descentry, give each one the role that fits their work, and disable accounts that should no longer sign in.',
      'You also keep an eye on the mail Descentry sends: invitations, password resets and safety notices.',
    ],
    showsCaution: false,
  },
};

/** The signed-in home page: who you are here, what you do, and where to go. */
@Component({
  selector: 'app-home',
  imports: [RouterLink, MatCardModule, MatIconModule, EngineeringCaution],
  templateUrl: './home.html',
  styleUrl: './home.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class Home {
  private readonly session = inject(Session);
  private readonly router = inject(Router);

  protected readonly user = this.session.user;
  protected readonly roleLabel = this.session.roleLabel;
  protected readonly intro = computed(() => {
    const role = this.session.role();
    return role ? ROLE_INTROS[role] : null;
  });
  protected readonly firstName = computed(() => this.user()?.name.split(/\s+/)[0] ?? '');
  protected readonly areas = computed(() => areasFor(this.router.config, this.session.role()));
}

import type { Person } from '@shared/domain/people';
import type { Role } from '@shared/domain/roles';

/** What the administrator has typed or chosen above the people table. */
export interface PeopleFilter {
  text: string;
  role: Role | '';
  status: Person['status'] | '';
}

export const NO_PEOPLE_FILTER: PeopleFilter = { text: '', role: '', status: '' };

/** Whether `person` passes the filter: text in name or e-mail, and the exact role and status. */
export function matchesPeopleFilter(person: Person, filter: PeopleFilter): boolean {
  const text = filter.text.trim().toLowerCase();
  if (text && !person.name.toLowerCase().includes(text) && !person.email.toLowerCase().includes(text)) {
    return false;
  }
  if (filter.role && person.role !== filter.role) return false;
  if (filter.status && person.status !== filter.status) return false;
  return true;
}

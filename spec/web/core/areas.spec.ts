import type { Routes } from '@angular/router';
import { areaData, areasFor } from '../../../web/app/core/areas';
import { routes } from '../../../web/app/app.routes';

describe('areasFor', () => {
  const config: Routes = [
    { path: 'sign-in' },
    {
      path: '',
      children: [
        { path: '' },
        {
          path: 'routes',
          data: areaData({ label: 'Routes', icon: 'route', summary: 'Draw routes', roles: ['planner', 'analyst'] }),
        },
        {
          path: 'admin/people',
          data: areaData({ label: 'People', icon: 'group', summary: 'Invite', roles: ['admin'], group: 'Administration' }),
        },
      ],
    },
  ];

  it('lists only the areas the role may open, with absolute links', () => {
    expect(areasFor(config, 'planner').map((area) => [area.label, area.path])).toEqual([['Routes', '/routes']]);
    expect(areasFor(config, 'admin').map((area) => area.path)).toEqual(['/admin/people']);
  });

  it('lists a path once when two routes declare it', () => {
    const terrain = areaData({ label: 'Terrain', icon: 'landscape', summary: 'Terrain', roles: ['analyst'] });
    const twice: Routes = [
      { path: 'terrain', data: terrain },
      { path: 'terrain', data: terrain },
    ];

    expect(areasFor(twice, 'analyst').map((area) => area.path)).toEqual(['/terrain']);
  });

  it('lists nothing when nobody is signed in', () => {
    expect(areasFor(config, null)).toEqual([]);
  });

  it('gives administrators People and Outgoing mail from the real router table, and planners neither', () => {
    const adminLabels = areasFor(routes, 'admin').map((area) => area.label);
    const plannerLabels = areasFor(routes, 'planner').map((area) => area.label);

    expect(adminLabels).toEqual(expect.arrayContaining(['People', 'Outgoing mail']));
    expect(plannerLabels).not.toContain('People');
    expect(plannerLabels).not.toContain('Outgoing mail');
  });
});

import { rolesWith } from '@shared/domain/permissions';
import { z } from 'zod';
import {
  inviteRequestSchema,
  personIdParamsSchema,
  personListSchema,
  personSchema,
  updatePersonRequestSchema,
} from '@shared/domain/people';
import type { AppDeps } from '../app-deps';
import { endpoint } from '../http/endpoint';
import * as peopleService from './people-service';

export function peopleEndpoints(deps: AppDeps) {
  return [
    endpoint({
      method: 'get',
      path: '/api/people',
      summary: 'Everyone with an account',
      tag: 'People',
      access: rolesWith('people.manage'),
      responses: { 200: { description: 'People', schema: personListSchema } },
      handler: async ({ res }) => {
        res.json({ items: await peopleService.listPeople(deps) });
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/people',
      summary: 'Invite a person by e-mail with a role',
      tag: 'People',
      access: rolesWith('people.manage'),
      body: inviteRequestSchema,
      responses: {
        201: { description: 'Invited; the e-mail is queued', schema: personSchema },
        409: { description: 'The e-mail already has an account' },
      },
      handler: async ({ body, user, res }) => {
        const person = await peopleService.invitePerson(deps, user!, body);
        res.status(201).location(`/api/people/${person.id}`).json(person);
      },
    }),
    endpoint({
      method: 'patch',
      path: '/api/people/:personId',
      summary: 'Change a person’s role, name or status (disable / enable)',
      tag: 'People',
      access: rolesWith('people.manage'),
      params: personIdParamsSchema,
      body: updatePersonRequestSchema,
      responses: { 200: { description: 'Updated', schema: personSchema } },
      handler: async ({ params, body, user, res }) => {
        res.json(await peopleService.updatePerson(deps, user!.id, params.personId, body));
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/people/:personId/unblock-sign-in',
      summary: 'Lift the slow-down that failed sign-ins put on an account (and its reset-request count)',
      tag: 'People',
      access: rolesWith('people.manage'),
      params: personIdParamsSchema,
      responses: { 200: { description: 'The person, no longer slowed down', schema: personSchema } },
      handler: async ({ params, res }) => {
        res.json(await peopleService.liftSignInLimit(deps, params.personId));
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/people/:personId/password-reset',
      summary: 'E-mail the person a password-reset link',
      tag: 'People',
      access: rolesWith('people.manage'),
      params: personIdParamsSchema,
      responses: { 202: { description: 'Queued', schema: z.object({}) } },
      handler: async ({ params, res }) => {
        await peopleService.sendPasswordReset(deps, params.personId);
        res.status(202).json({});
      },
    }),
  ];
}

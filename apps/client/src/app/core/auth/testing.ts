import type { Role } from '@trabeate/contracts';
import type { MeGranted, MeNoAccess } from './session';

// Answers of /api/me as the server sends them, for specs.

const ORG = { id: '00000000-0000-4000-8000-000000000101', name: 'Quillon Terrace Homes' };

export function grantedMe(role: Role, name = 'Aster Pellow'): MeGranted {
  return {
    access: 'granted',
    user: {
      id: '00000000-0000-4000-8000-000000000201',
      email: 'aster@example.test',
      displayName: name,
      role,
      clientOrganisation: role === 'client' ? ORG : null,
    },
    firm: {
      id: '00000000-0000-4000-8000-000000000001',
      name: 'Lintel & Pier Consulting',
      dateLocale: 'en-GB',
      timeZone: 'Europe/London',
    },
    session: { signedInAt: '2026-03-02T08:00:00.000Z', expiresAt: '2026-03-02T20:00:00.000Z' },
  };
}

export const noAccessMe: MeNoAccess = {
  access: 'none',
  identity: { email: 'wren.okafor@example.test', name: 'Wren Okafor' },
  message: 'Nobody at the firm has invited wren.okafor@example.test yet.',
};

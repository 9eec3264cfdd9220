// A second organization with one account per role, for the tests that check one organization
// never reaches another's records. Invented people; `.example` addresses (RFC 2606).
import type { SeedAccount } from '../../../server/seed/seed-organization';

export const farCounty = { name: 'Far County', slug: 'far-county' };

export const farCountyAccounts: SeedAccount[] = [
  { role: 'admin', email: 'admin@far.example', displayName: 'Orla Vennick', password: 'far-admin-2026' },
  { role: 'planner', email: 'planner@far.example', displayName: 'Desmond Harrow', password: 'far-planner-2026' },
  { role: 'official', email: 'official@far.example', displayName: 'Ilse Marchbank', password: 'far-official-2026' },
  { role: 'viewer', email: 'viewer@far.example', displayName: 'Pim Castellane', password: 'far-viewer-2026' },
];

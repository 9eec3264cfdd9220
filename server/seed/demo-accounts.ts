// The demo organization's accounts, one per role. Invented people; `.example` addresses are
// reserved for examples (RFC 2606), so no message to them can reach anyone.
import type { Role } from '../../shared/api/roles';

export const demoOrganization = { name: 'Veltmoor Emergency Management', slug: 'veltmoor' };

export const demoAccounts: { role: Role; email: string; displayName: string; password: string }[] = [
  { role: 'admin', email: 'admin@cutline.example', displayName: 'Rosa Quillfeather', password: 'admin-demo-2026' },
  { role: 'planner', email: 'planner@cutline.example', displayName: 'Tomas Everly', password: 'planner-demo-2026' },
  { role: 'official', email: 'official@cutline.example', displayName: 'Mina Ashcombe', password: 'official-demo-2026' },
  { role: 'viewer', email: 'viewer@cutline.example', displayName: 'Jonah Pell', password: 'viewer-demo-2026' },
];

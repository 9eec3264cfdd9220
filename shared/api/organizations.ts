// A new organization and its first administrator, as the `npm run org:create` command takes them.
import { z } from 'zod';
import { passwordSchema } from './users';

export const organizationSlugSchema = z
  .string()
  .trim()
  .toLowerCase()
  .regex(/^[a-z0-9](?:[a-z0-9-]{0,38}[a-z0-9])?$/, 'Use 1 to 40 lower-case letters, digits and hyphens, starting and ending with a letter or digit.');

export const organizationCreateSchema = z.object({
  organization: z.object({ name: z.string().trim().min(1, 'Enter the organization’s name.').max(200), slug: organizationSlugSchema }),
  administrator: z.object({
    email: z.string().trim().toLowerCase().email('Enter an e-mail address.').max(254),
    displayName: z.string().trim().min(1, 'Enter a name.').max(120),
    password: passwordSchema,
  }),
});
export type OrganizationCreate = z.infer<typeof organizationCreateSchema>;

/** A slug from a name: "Veltmoor Emergency Management" → "veltmoor-emergency-management". */
export function slugOf(name: string): string {
  return name
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 40)
    .replace(/-+$/g, '');
}

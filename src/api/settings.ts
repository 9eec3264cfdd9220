// Settings of the organisation: the basemap tile URL ('' = no basemap, a neutral background that
// works offline) and its attribution; the unit system and time zone. Everyone reads them; admins
// change them.
import { mapSettingsSchema, organizationSettingsSchema, type MapSettings, type OrganizationSettingsInput } from '@shared/api/settings';
import { request } from './http';

export const getMapSettings = () => request('GET', '/settings/map', mapSettingsSchema);
export const putMapSettings = (input: MapSettings) => request('PUT', '/settings/map', mapSettingsSchema, input);
export const getOrganizationSettings = () => request('GET', '/settings/organization', organizationSettingsSchema);
export const putOrganizationSettings = (input: OrganizationSettingsInput) => request('PUT', '/settings/organization', organizationSettingsSchema, input);

// Map settings of the installation: the basemap tile URL ('' = no basemap, a neutral
// background that works offline) and its attribution. Everyone reads them; admins change them.
import { mapSettingsSchema, type MapSettings } from '@shared/api/settings';
import { request } from './http';

export const getMapSettings = () => request('GET', '/settings/map', mapSettingsSchema);
export const putMapSettings = (input: MapSettings) => request('PUT', '/settings/map', mapSettingsSchema, input);

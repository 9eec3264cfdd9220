// The organisation's field-mapping presets: listed for the upload dialog, saved, deleted.
import { z } from 'zod';
import { mappingPresetListSchema, mappingPresetSchema, type MappingPresetCreate } from '@shared/api/mapping-presets';
import { request } from './http';

export const listMappingPresets = async () => (await request('GET', '/mapping-presets', mappingPresetListSchema)).presets;
export const saveMappingPreset = (input: MappingPresetCreate) => request('POST', '/mapping-presets', mappingPresetSchema, input);
export const deleteMappingPreset = (presetId: string) => request('DELETE', `/mapping-presets/${presetId}`, z.undefined());

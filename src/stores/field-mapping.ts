// The field-mapping step between choosing a file and importing it: the server's read of the file
// (fields, samples, counts, CRS, extent, first features), the planner's choices (which column holds
// the road class, with a table from the file's own codes to our classes; lanes, speed and its unit,
// one-way and its convention, name, bridge/tunnel/level; a zone's population, participation and
// persons per vehicle; a shelter's capacity), and the preview of what each feature will become.
// `ask` opens the step and settles with the import options, or null when the planner cancels.
import { defineStore } from 'pinia';
import { computed, reactive, ref, shallowRef } from 'vue';
import type { CapacityTable } from '@shared/api/capacity-table';
import {
  propertyMappingSchema,
  type FieldMapping,
  type FileSchema,
  type ImportOptionsInput,
  type PropertyMapping,
  type ShelterUploadOptions,
  type SourceReadOptions,
  type ZoneUploadOptions,
} from '@shared/api/road-import';
import type { RoadClass } from '@shared/api/road-attributes';
import { distinctValues, guessColumns, previewMapping, previewSummary, type PreviewKind } from '@shared/geo/preview-mapping';
import { presetsForFile, type MappingPreset } from '@shared/api/mapping-presets';
import { readFileSchema } from '@/api/file-schema';
import * as presetsApi from '@/api/mapping-presets';
import { ApiError } from '@/api/api-error';
import { messageOf } from '../format/error-message';

export type MappingKind = PreviewKind;
/** What the step answers: the options the import job of that kind takes. */
export type MappingAnswer = { kind: 'roads'; options: ImportOptionsInput } | { kind: 'zones'; options: ZoneUploadOptions } | { kind: 'shelters'; options: ShelterUploadOptions };

/** The road columns as the form holds them ('' = not in the file). */
export type RoadDraft = {
  roadClass: string;
  lanes: string;
  /** Lanes along and against the drawing direction, where the file counts them apart. */
  lanesForward: string;
  lanesBackward: string;
  speed: string;
  speedUnit: 'kmh' | 'mph';
  oneway: string;
  name: string;
  bridge: string;
  tunnel: string;
  layer: string;
  /** A closure flag and a per-lane capacity that replaces the class value (a file Cutline wrote has both). */
  closed: string;
  capacityPerLane: string;
  /** The file's class codes → our class, or 'drop'; '' = read as an OSM class name, else left out. */
  classValues: Record<string, RoadClass | 'drop' | ''>;
  onewayValues: Record<string, 'forward' | 'backward' | 'both' | ''>;
};

const emptyRoads = (): RoadDraft => ({
  roadClass: '', lanes: '', lanesForward: '', lanesBackward: '', speed: '', speedUnit: 'kmh', oneway: '', name: '', bridge: '', tunnel: '', layer: '', closed: '', capacityPerLane: '', classValues: {}, onewayValues: {},
});
/** The road columns a guess or a preset fills, by the mapping's own names. */
const ROAD_COLUMNS = ['roadClass', 'lanes', 'lanesForward', 'lanesBackward', 'speed', 'oneway', 'name', 'bridge', 'tunnel', 'layer', 'closed', 'capacityPerLane'] as const;

const pick = (v: string) => (v.trim() === '' ? undefined : v);
const filled = <T extends string>(r: Record<string, T | ''>) => Object.fromEntries(Object.entries(r).filter(([, v]) => v !== '')) as Record<string, T>;

export const useFieldMappingStore = defineStore('field-mapping', () => {
  const planId = ref('');
  const kind = ref<MappingKind>('roads');
  const file = shallowRef<File | null>(null);
  const open = ref(false);
  const reading = ref(false);
  const error = ref('');
  const schema = ref<FileSchema | null>(null);
  const capacityTable = ref<CapacityTable | null>(null);
  const source = reactive<{ layer: string; crs: string; xColumn: string; yColumn: string }>({ layer: '', crs: '', xColumn: '', yColumn: '' });
  const roads = reactive<RoadDraft>(emptyRoads());
  const zones = reactive({ name: '', population: '', participationRate: '', personsPerVehicle: '' });
  const shelters = reactive({ name: '', capacityPersons: '' });
  let settle: ((answer: MappingAnswer | null) => void) | null = null;
  // The organisation's presets; those that fit this file are offered, one made for exactly
  // these columns is applied at once.
  const presets = ref<MappingPreset[]>([]);
  const appliedPreset = ref('');
  const presetMessage = ref('');

  const sourceOptions = computed<SourceReadOptions>(() => ({
    layer: pick(source.layer),
    crs: pick(source.crs),
    xColumn: pick(source.xColumn),
    yColumn: pick(source.yColumn),
  }));

  /** No class column: the file's properties are read as OpenStreetMap tags. */
  const roadMapping = computed<PropertyMapping | null>(() => {
    if (!roads.roadClass) return null;
    return propertyMappingSchema.parse({
      roadClass: roads.roadClass,
      classValues: filled(roads.classValues),
      lanes: pick(roads.lanes),
      lanesForward: pick(roads.lanesForward),
      lanesBackward: pick(roads.lanesBackward),
      speed: pick(roads.speed),
      speedUnit: roads.speedUnit,
      oneway: pick(roads.oneway),
      onewayValues: filled(roads.onewayValues),
      name: pick(roads.name),
      bridge: pick(roads.bridge),
      tunnel: pick(roads.tunnel),
      layer: pick(roads.layer),
      closed: pick(roads.closed),
      capacityPerLane: pick(roads.capacityPerLane),
    });
  });
  const zoneFields = computed(() => ({ name: pick(zones.name), population: pick(zones.population), participationRate: pick(zones.participationRate), personsPerVehicle: pick(zones.personsPerVehicle) }));
  const shelterFields = computed(() => ({ name: pick(shelters.name), capacityPersons: pick(shelters.capacityPersons) }));

  /** The whole of the planner's choices, as a preset stores them. */
  const mapping = computed<FieldMapping>(() => ({ roads: roadMapping.value, source: sourceOptions.value, zones: zoneFields.value, shelters: shelterFields.value }));

  const fieldNames = computed(() => schema.value?.fields.map((f) => f.name) ?? []);
  const fieldOf = (name: string) => schema.value?.fields.find((f) => f.name === name);
  /** The rows of the value tables: the file's own values in the chosen column. */
  const classCodes = computed(() => (schema.value && roads.roadClass ? distinctValues(schema.value.preview, fieldOf(roads.roadClass)) : []));
  const onewayCodes = computed(() => (schema.value && roads.oneway ? distinctValues(schema.value.preview, fieldOf(roads.oneway), 20) : []));

  const preview = computed(() =>
    schema.value ? previewMapping(kind.value, schema.value.preview, { roads: roadMapping.value, zones: zoneFields.value, shelters: shelterFields.value }, schema.value.format, capacityTable.value ?? undefined) : [],
  );
  const summary = computed(() => previewSummary(preview.value));
  /** A bad feature refuses the whole zone or shelter file: say so before the import. */
  const refuses = computed(() => summary.value.reasons.some((r) => r.refuses));

  const offered = computed(() => presetsForFile(presets.value, kind.value, fieldNames.value));

  function applyPreset(p: MappingPreset) {
    const m = p.mapping;
    if (p.kind === 'roads') {
      const r = m.roads;
      Object.assign(roads, emptyRoads());
      if (r) {
        for (const key of ROAD_COLUMNS) roads[key] = r[key] ?? '';
        Object.assign(roads, { speedUnit: r.speedUnit, classValues: { ...r.classValues }, onewayValues: { ...(r.onewayValues ?? {}) } });
      }
    }
    if (p.kind === 'zones') Object.assign(zones, { name: '', population: '', participationRate: '', personsPerVehicle: '', ...m.zones });
    if (p.kind === 'shelters') Object.assign(shelters, { name: '', capacityPersons: '', ...m.shelters });
    if (m.source?.xColumn) source.xColumn = m.source.xColumn;
    if (m.source?.yColumn) source.yColumn = m.source.yColumn;
    if (m.source?.crs && !source.crs) source.crs = m.source.crs;
    appliedPreset.value = p.name;
  }

  async function savePreset(name: string) {
    presetMessage.value = '';
    try {
      const saved = await presetsApi.saveMappingPreset({ name, kind: kind.value, fieldNames: fieldNames.value, mapping: mapping.value });
      presets.value = [...presets.value.filter((p) => p.id !== saved.id), saved];
      appliedPreset.value = saved.name;
      presetMessage.value = `Saved as "${saved.name}".`;
    } catch (e) {
      presetMessage.value = messageOf(e);
    }
  }

  async function removePreset(id: string) {
    presetMessage.value = '';
    try {
      await presetsApi.deleteMappingPreset(id);
      presets.value = presets.value.filter((p) => p.id !== id);
    } catch (e) {
      presetMessage.value = messageOf(e);
    }
  }

  function guess() {
    const fields = schema.value?.fields ?? [];
    const g = guessColumns(fields);
    const has = (n: string) => fields.some((f) => f.name === n);
    Object.assign(roads, emptyRoads());
    // A file with OSM tags needs no mapping: its tags are read as they are.
    if (!has('highway') && !has('tags')) {
      for (const key of ROAD_COLUMNS) roads[key] = g[key] ?? '';
      if (/mph/i.test(roads.speed)) roads.speedUnit = 'mph';
    }
    zones.name = g['name'] ?? '';
    zones.population = g['population'] ?? '';
    zones.participationRate = g['participationRate'] ?? '';
    zones.personsPerVehicle = g['personsPerVehicle'] ?? '';
    shelters.name = g['name'] ?? '';
    shelters.capacityPersons = g['capacityPersons'] ?? '';
  }

  async function readSchema() {
    if (!file.value) return;
    reading.value = true;
    error.value = '';
    try {
      const previous = schema.value?.fields.map((f) => f.name).join('\u0000');
      schema.value = await readFileSchema(planId.value, file.value, sourceOptions.value);
      if (schema.value.layer && !source.layer) source.layer = schema.value.layer;
      // Keep the planner's choices when only the layer or CRS changed the read, not the columns.
      if (schema.value.fields.map((f) => f.name).join('\u0000') !== previous) {
        guess();
        appliedPreset.value = '';
        const best = offered.value[0];
        const names = new Set(fieldNames.value);
        if (best && best.fieldNames.length === names.size && best.fieldNames.every((n) => names.has(n))) applyPreset(best);
      }
    } catch (e) {
      schema.value = null;
      error.value = e instanceof ApiError && e.importFailure ? e.importFailure.message : messageOf(e);
    } finally {
      reading.value = false;
    }
  }

  /** Opens the step for a chosen file; settles with the import options, or null when cancelled. */
  function ask(forPlan: string, what: MappingKind, chosen: File, table: CapacityTable | null = null): Promise<MappingAnswer | null> {
    settle?.(null);
    planId.value = forPlan;
    kind.value = what;
    file.value = chosen;
    capacityTable.value = table;
    schema.value = null;
    Object.assign(source, { layer: '', crs: '', xColumn: '', yColumn: '' });
    open.value = true;
    appliedPreset.value = '';
    presetMessage.value = '';
    // Presets first, so that one made for these very columns applies when the schema arrives.
    void presetsApi
      .listMappingPresets()
      .then((list) => (presets.value = list))
      .catch(() => (presets.value = []))
      .finally(() => void readSchema());
    return new Promise((resolve) => (settle = resolve));
  }

  function finish(answer: MappingAnswer | null) {
    open.value = false;
    const s = settle;
    settle = null;
    s?.(answer);
  }

  function confirm() {
    const src = sourceOptions.value;
    if (kind.value === 'roads') finish({ kind: 'roads', options: { propertyMapping: roadMapping.value, source: src } });
    else if (kind.value === 'zones') finish({ kind: 'zones', options: { source: src, fields: zoneFields.value } });
    else finish({ kind: 'shelters', options: { source: src, fields: shelterFields.value } });
  }

  const cancel = () => finish(null);

  return {
    planId, kind, file, open, reading, error, schema, source, roads, zones, shelters,
    mapping, roadMapping, fieldNames, classCodes, onewayCodes, preview, summary, refuses,
    presets, offered, appliedPreset, presetMessage,
    ask, readSchema, confirm, cancel, guess, applyPreset, savePreset, removePreset,
  };
});

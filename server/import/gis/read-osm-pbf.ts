// OpenStreetMap PBF (the binary extract format: a sequence of zlib-compressed protocol-buffer
// blocks, https://wiki.openstreetmap.org/wiki/PBF_Format) → the OSM JSON shape the XML reader
// also produces, so both go through osmToRoadFeatures. Protocol buffers are decoded with `pbf`;
// blocks are inflated with node:zlib within the format's own size limits and the import's.
// Only nodes and ways are kept; relations are counted as such (turn restrictions are not modelled).
import { inflateSync } from 'node:zlib';
import Pbf from 'pbf';
import { RoadImportError } from '../../../shared/geo/road-import-error';
import type { OsmElement, OsmJson } from '../osm-json';

// The format's limits: a BlobHeader under 64 KiB, a Blob under 32 MiB.
const MAX_HEADER_BYTES = 64 * 1024;
const MAX_BLOB_BYTES = 32 * 1024 * 1024;
const SUPPORTED_FEATURES = new Set(['OsmSchema-V0.6', 'DenseNodes']);

export const PBF_FIRST_BLOCK = 'OSMHeader';

function fail(label: string, message: string): never {
  throw new RoadImportError('unreadableFile', `${label}: ${message}`);
}

interface Blob {
  raw?: Uint8Array;
  rawSize: number;
  zlib?: Uint8Array;
  other?: string;
}

function readBlob(bytes: Uint8Array): Blob {
  return new Pbf(bytes).readFields<Blob>(
    (tag, b, pbf) => {
      if (tag === 1) b.raw = pbf.readBytes();
      else if (tag === 2) b.rawSize = pbf.readVarint();
      else if (tag === 3) b.zlib = pbf.readBytes();
      else if (tag === 4) b.other = 'LZMA';
      else if (tag === 6) b.other = 'LZ4';
      else if (tag === 7) b.other = 'Zstandard';
    },
    { rawSize: 0 },
  );
}

function blobData(blob: Blob, label: string, budget: { left: number }): Uint8Array {
  if (blob.raw) return blob.raw;
  if (!blob.zlib) fail(label, blob.other ? `a block is ${blob.other}-compressed; only zlib-compressed PBF can be read (osmium cat -o out.pbf rewrites it)` : 'a block holds no data');
  if (blob.rawSize > MAX_BLOB_BYTES) fail(label, `a block declares ${blob.rawSize} bytes, more than the format allows`);
  if (blob.rawSize > budget.left) fail(label, 'the file expands to more than an import can read; split the area into smaller files');
  let out: Buffer;
  try {
    out = inflateSync(blob.zlib, { maxOutputLength: Math.max(1, blob.rawSize) });
  } catch (error) {
    fail(label, `a block is corrupt (${String((error as Error).message ?? error)})`);
  }
  budget.left -= out.length;
  return out;
}

function readHeaderBlock(data: Uint8Array, label: string): void {
  const required: string[] = [];
  new Pbf(data).readFields((tag, _r, pbf) => {
    if (tag === 4) required.push(pbf.readString());
  }, null);
  const unsupported = required.filter((f) => !SUPPORTED_FEATURES.has(f));
  if (unsupported.length > 0) fail(label, `the file needs features this reader does not have (${unsupported.join(', ')}); export a plain extract`);
}

interface Block {
  strings: string[];
  groups: { start: number; end: number }[];
  granularity: number;
  latOffset: number;
  lonOffset: number;
}

function readPrimitiveBlock(data: Uint8Array, elements: OsmElement[], maxElements: number, label: string): void {
  const pbf = new Pbf(data);
  const block = pbf.readFields<Block>(
    (tag, b, p) => {
      if (tag === 1) {
        const end = p.readVarint() + p.pos;
        while (p.pos < end) {
          const val = p.readVarint();
          p.type = val & 0x7;
          if (val >> 3 === 1) b.strings.push(new TextDecoder().decode(p.readBytes()));
          else p.skip(val);
        }
      } else if (tag === 2) {
        const len = p.readVarint();
        b.groups.push({ start: p.pos, end: p.pos + len });
        p.pos += len;
      } else if (tag === 17) b.granularity = p.readVarint();
      else if (tag === 19) b.latOffset = p.readVarint(true);
      else if (tag === 20) b.lonOffset = p.readVarint(true);
    },
    { strings: [], groups: [], granularity: 100, latOffset: 0, lonOffset: 0 },
  );
  const s = (i: number) => {
    const v = block.strings[i];
    if (v === undefined) fail(label, `a string index ${i} is outside the block's string table`);
    return v;
  };
  // Nanodegrees divided (not multiplied by 1e-9) give the double nearest the decimal value, as
  // parsing the same coordinate from OSM XML does.
  const lat = (v: number) => (block.latOffset + block.granularity * v) / 1e9;
  const lon = (v: number) => (block.lonOffset + block.granularity * v) / 1e9;
  const push = (e: OsmElement) => {
    if (elements.length >= maxElements) fail(label, `more than ${maxElements} elements, more than an import can read; split the area into smaller files`);
    elements.push(e);
  };
  const tagsOf = (keys: number[], vals: number[]) => {
    if (keys.length === 0) return undefined;
    const tags: Record<string, string> = {};
    keys.forEach((k, i) => {
      tags[s(k)] = s(vals[i] ?? -1);
    });
    return tags;
  };

  for (const g of block.groups) {
    pbf.pos = g.start;
    pbf.readFields(
      (tag, _r, p) => {
        if (tag === 1) {
          // A plain node.
          const n = { id: 0, keys: [] as number[], vals: [] as number[], lat: 0, lon: 0 };
          const end = p.readVarint() + p.pos;
          while (p.pos < end) {
            const val = p.readVarint();
            const t = val >> 3;
            p.type = val & 0x7;
            if (t === 1) n.id = p.readSVarint();
            else if (t === 2) p.readPackedVarint(n.keys);
            else if (t === 3) p.readPackedVarint(n.vals);
            else if (t === 8) n.lat = p.readSVarint();
            else if (t === 9) n.lon = p.readSVarint();
            else p.skip(val);
          }
          const tags = tagsOf(n.keys, n.vals);
          push({ type: 'node', id: n.id, lat: lat(n.lat), lon: lon(n.lon), ...(tags ? { tags } : {}) });
        } else if (tag === 2) {
          const ids: number[] = [];
          const lats: number[] = [];
          const lons: number[] = [];
          const keysVals: number[] = [];
          const end = p.readVarint() + p.pos;
          while (p.pos < end) {
            const val = p.readVarint();
            const t = val >> 3;
            p.type = val & 0x7;
            if (t === 1) p.readPackedSVarint(ids);
            else if (t === 8) p.readPackedSVarint(lats);
            else if (t === 9) p.readPackedSVarint(lons);
            else if (t === 10) p.readPackedVarint(keysVals);
            else p.skip(val);
          }
          if (lats.length !== ids.length || lons.length !== ids.length) fail(label, 'a block of dense nodes has ids and positions of different lengths');
          let id = 0;
          let la = 0;
          let lo = 0;
          let kv = 0;
          for (let i = 0; i < ids.length; i += 1) {
            id += ids[i]!;
            la += lats[i]!;
            lo += lons[i]!;
            let tags: Record<string, string> | undefined;
            while (kv < keysVals.length && keysVals[kv] !== 0) {
              tags ??= {};
              tags[s(keysVals[kv]!)] = s(keysVals[kv + 1] ?? -1);
              kv += 2;
            }
            kv += 1;
            push({ type: 'node', id, lat: lat(la), lon: lon(lo), ...(tags ? { tags } : {}) });
          }
        } else if (tag === 3) {
          const w = { id: 0, keys: [] as number[], vals: [] as number[], refs: [] as number[] };
          const end = p.readVarint() + p.pos;
          while (p.pos < end) {
            const val = p.readVarint();
            const t = val >> 3;
            p.type = val & 0x7;
            if (t === 1) w.id = p.readVarint();
            else if (t === 2) p.readPackedVarint(w.keys);
            else if (t === 3) p.readPackedVarint(w.vals);
            else if (t === 8) p.readPackedSVarint(w.refs);
            else p.skip(val);
          }
          let ref = 0;
          const nodes = w.refs.map((d) => (ref += d));
          const tags = tagsOf(w.keys, w.vals);
          push({ type: 'way', id: w.id, nodes, ...(tags ? { tags } : {}) });
        } else if (tag === 4) {
          const len = p.readVarint();
          p.pos += len;
          push({ type: 'relation', id: 0 });
        }
      },
      null,
      g.end,
    );
  }
}

/** @throws RoadImportError `unreadableFile` naming what is wrong (cut short, corrupt, unsupported). */
export function readOsmPbf(bytes: Uint8Array, label: string, maxExpandedBytes: number, maxElements: number): OsmJson {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const elements: OsmElement[] = [];
  const budget = { left: maxExpandedBytes };
  let pos = 0;
  let sawHeader = false;
  while (pos < bytes.length) {
    if (pos + 4 > bytes.length) fail(label, 'the file ends inside a block length: it looks cut short');
    const headerLength = view.getUint32(pos, false);
    pos += 4;
    if (headerLength > MAX_HEADER_BYTES) fail(label, sawHeader ? 'a block header is too large: the file is corrupt' : 'not an OpenStreetMap PBF file');
    if (pos + headerLength > bytes.length) fail(label, 'the file ends inside a block header: it looks cut short');
    let type = '';
    let dataSize = -1;
    try {
      new Pbf(bytes.subarray(pos, pos + headerLength)).readFields((tag, _r, pbf) => {
        if (tag === 1) type = pbf.readString();
        else if (tag === 3) dataSize = pbf.readVarint();
      }, null);
    } catch {
      fail(label, 'a block header is corrupt');
    }
    pos += headerLength;
    if (!sawHeader && type !== PBF_FIRST_BLOCK) fail(label, 'not an OpenStreetMap PBF file (it does not begin with an OSMHeader block)');
    if (dataSize < 0 || dataSize > MAX_BLOB_BYTES) fail(label, 'a block has no size or one larger than the format allows: the file is corrupt');
    if (pos + dataSize > bytes.length) fail(label, 'the file ends inside a block: it looks cut short');
    let data: Uint8Array;
    try {
      data = blobData(readBlob(bytes.subarray(pos, pos + dataSize)), label, budget);
    } catch (error) {
      if (error instanceof RoadImportError) throw error;
      fail(label, `a block is corrupt (${String((error as Error).message ?? error)})`);
    }
    pos += dataSize;
    try {
      if (type === PBF_FIRST_BLOCK) {
        readHeaderBlock(data, label);
        sawHeader = true;
      } else if (type === 'OSMData') readPrimitiveBlock(data, elements, maxElements, label);
    } catch (error) {
      if (error instanceof RoadImportError) throw error;
      fail(label, `a data block is corrupt (${String((error as Error).message ?? error)})`);
    }
  }
  if (!sawHeader) fail(label, 'the file is empty');
  return { elements };
}

// Zip archives (zipped Shapefiles, KMZ) unpacked with fflate, within a bound on what they
// expand to. fflate writes each entry into a buffer of the size the archive declares for it,
// so a declared size that lies cannot grow memory past the sum checked here: a zip bomb is
// refused before anything is inflated.
import { unzipSync } from 'fflate';
import { RoadImportError } from '../../../shared/geo/road-import-error';

export const ZIP_MAGIC = [0x50, 0x4b, 0x03, 0x04];

export interface ZipEntries {
  /** Lower-cased base name → bytes (folders inside the archive are flattened). */
  files: Map<string, { name: string; bytes: Uint8Array }>;
}

/**
 * @param wanted which entries to inflate (by lower-cased base name); others are skipped unread.
 * @throws RoadImportError `unreadableFile` for a corrupt archive or one that expands past the limit.
 */
export function unzipBounded(bytes: Uint8Array, label: string, maxExpandedBytes: number, wanted: (baseName: string) => boolean): ZipEntries {
  let declared = 0;
  let tooLarge = false;
  let entries: Record<string, Uint8Array>;
  try {
    entries = unzipSync(bytes, {
      filter: (file) => {
        const base = file.name.split('/').pop()!.toLowerCase();
        // macOS archives carry resource forks as ._name under __MACOSX/: not data.
        if (file.name.startsWith('__MACOSX/') || base.startsWith('._') || !wanted(base)) return false;
        declared += file.originalSize;
        if (declared > maxExpandedBytes) tooLarge = true;
        return !tooLarge;
      },
    });
  } catch (error) {
    throw new RoadImportError('unreadableFile', `${label}: the zip archive is corrupt or cut short (${String((error as Error).message ?? error)})`);
  }
  if (tooLarge) {
    throw new RoadImportError('unreadableFile', `${label}: the zip archive expands to more than ${Math.round(maxExpandedBytes / 1024 / 1024)} MB, more than an import can read; split the area into smaller files`);
  }
  const files: ZipEntries['files'] = new Map();
  for (const [name, data] of Object.entries(entries)) {
    const base = name.split('/').pop()!.toLowerCase();
    if (files.has(base)) throw new RoadImportError('unreadableFile', `${label}: the zip archive holds two files named ${base}; upload one layer per archive`);
    files.set(base, { name, bytes: data });
  }
  return { files };
}

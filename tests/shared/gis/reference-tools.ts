// Runs Debian's reference tools (gdal-bin's ogr2ogr, proj-bin's cs2cs, osmium-tool's osmium;
// docker-free-scripts/install-system-packages.sh --tests installs them) on the West Oakland
// OpenStreetMap extract, in a temporary folder per test file.
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { zipSync } from 'fflate';
import { decodeUpload } from '../../../server/import/decode-upload';

export const westOaklandBz2 = readFileSync(new URL('../../fixtures/osm/West-Oakland.osm.bz2', import.meta.url));

export function tool(command: string, args: string[], options: { env?: Record<string, string>; input?: string } = {}): string {
  try {
    return execFileSync(command, args, { encoding: 'utf8', env: { ...process.env, ...options.env }, input: options.input, stdio: ['pipe', 'pipe', 'pipe'] });
  } catch (error) {
    const e = error as { code?: string; stderr?: string; message: string };
    if (e.code === 'ENOENT') throw new Error(`${command} is not installed: run docker-free-scripts/install-system-packages.sh --tests`);
    throw new Error(`${command} ${args.join(' ')} failed: ${e.stderr ?? e.message}`);
  }
}

/** A temporary folder holding West-Oakland.osm (uncompressed, as GDAL's OSM driver reads it) and an osmconf.ini
 *  that reports the tags roads need as fields (GDAL's default reports only name and highway). */
export function westOaklandWorkspace(): { dir: string; osm: string; env: Record<string, string> } {
  const dir = mkdtempSync(join(tmpdir(), 'cutline-gis-'));
  const osm = join(dir, 'West-Oakland.osm');
  writeFileSync(osm, decodeUpload(westOaklandBz2).bytes);
  const conf = readFileSync('/usr/share/gdal/osmconf.ini', 'utf8').replace(/^(\[lines\][\s\S]*?)^attributes=.*$/m, '$1attributes=name,highway,lanes,oneway,maxspeed,bridge,tunnel,layer,access,area,junction,motor_vehicle,vehicle,motorcar');
  writeFileSync(join(dir, 'osmconf.ini'), conf);
  return { dir, osm, env: { OSM_CONFIG_FILE: join(dir, 'osmconf.ini') } };
}

/** Every file of a folder in one zip, as a county would send a Shapefile. */
export function zipFolder(dir: string): Uint8Array {
  const files: Record<string, Uint8Array> = {};
  for (const name of readdirSync(dir)) files[name] = readFileSync(join(dir, name));
  return zipSync(files);
}

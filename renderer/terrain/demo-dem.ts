/**
 * The bundled demo DEM (assets/demo/terrain/demo-site.tif, an INVENTED site from core/terrain's generator).
 * Vite emits it as a file next to the page (assets are never inlined: the CSP refuses data: URLs), and the
 * app fetches it from 'self' at start.
 */
import demoDemUrl from '../../assets/demo/terrain/demo-site.tif?url';
import demoDemInfo from '../../assets/demo/terrain/demo-site.json';

export const DEMO_DEM_FILE = 'demo-site.tif';
/** "Orvessa Plain (invented)" (core/terrain DEMO_SITE_NAME, written into demo-site.json). */
export const DEMO_DEM_NAME: string = demoDemInfo.name;

export async function fetchDemoDem(): Promise<Uint8Array> {
  const response = await fetch(demoDemUrl);
  if (!response.ok) throw new Error(`the bundled demo DEM could not be loaded (${response.status} ${response.statusText})`);
  return new Uint8Array(await response.arrayBuffer());
}

/** The terrain label the scene and the Terrain group show; invented terrain always says so. */
export function terrainLabel(name: string, invented: boolean): string {
  return invented ? `INVENTED demo DEM: ${DEMO_DEM_NAME}` : name;
}

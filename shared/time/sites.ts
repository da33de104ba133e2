import type { Site } from './types.ts'

/** An observatory of the site table: an id (our own short slug), a display name, its position and where it comes from. */
export interface NamedSite extends Site { id: string; name: string; source: string }

const IRAF = 'IRAF observatory database, as listed in astropy-data coordinates/sites.json'

/**
 * Observatories that host precision radial-velocity spectrographs (our own short list; add a
 * custom site for anything else). Longitudes east-positive in −180…180, geodetic latitudes,
 * heights in metres. Positions are good to a few hundred metres, which moves a barycentric time by
 * about a microsecond (1 km of position is 3.3 µs of light time) — far below any RV need.
 */
export const SITES: readonly NamedSite[] = [
  { id: 'la-silla', name: 'La Silla', lonDeg: -70.73, latDeg: -29.256667, heightM: 2347, source: IRAF },
  { id: 'paranal', name: 'Cerro Paranal', lonDeg: -70.404987, latDeg: -24.627439, heightM: 2669, source: 'astropy-data sites.json (ESO VLTI data products)' },
  { id: 'las-campanas', name: 'Las Campanas', lonDeg: -70.701667, latDeg: -29.003333, heightM: 2282, source: IRAF },
  { id: 'cerro-tololo', name: 'Cerro Tololo', lonDeg: -70.815, latDeg: -30.165278, heightM: 2215, source: IRAF },
  { id: 'cerro-pachon', name: 'Cerro Pachón', lonDeg: -70.736683, latDeg: -30.240742, heightM: 2750, source: 'astropy-data sites.json (observatory web site)' },
  { id: 'la-palma', name: 'Roque de los Muchachos (La Palma)', lonDeg: -17.88, latDeg: 28.758333, heightM: 2327, source: IRAF },
  { id: 'teide', name: 'Teide (Tenerife)', lonDeg: -16.509722, latDeg: 28.3, heightM: 2390, source: 'astropy-data sites.json (observatory web site)' },
  { id: 'calar-alto', name: 'Calar Alto (Spain)', lonDeg: -2.546111, latDeg: 37.223611, heightM: 2168, source: 'astropy-data sites.json (encyclopaedia page)' },
  { id: 'haute-provence', name: 'Haute-Provence (France)', lonDeg: 5.713333, latDeg: 43.930833, heightM: 650, source: 'astropy-data sites.json (observatory web site)' },
  { id: 'mauna-kea', name: 'Mauna Kea (Hawaii)', lonDeg: -155.478333, latDeg: 19.828333, heightM: 4160, source: IRAF },
  { id: 'lick', name: 'Mount Hamilton (California)', lonDeg: -121.636667, latDeg: 37.343333, heightM: 1290, source: IRAF },
  { id: 'mcdonald', name: 'Mount Locke (Texas)', lonDeg: -104.021667, latDeg: 30.671667, heightM: 2075, source: IRAF },
  { id: 'kitt-peak', name: 'Kitt Peak (Arizona)', lonDeg: -111.6, latDeg: 31.963333, heightM: 2120, source: IRAF },
  { id: 'mount-hopkins', name: 'Mount Hopkins (Arizona)', lonDeg: -110.8775, latDeg: 31.680944, heightM: 2320, source: IRAF },
  { id: 'apache-point', name: 'Apache Point (New Mexico)', lonDeg: -105.82, latDeg: 32.78, heightM: 2798, source: IRAF },
  { id: 'siding-spring', name: 'Siding Spring (Australia)', lonDeg: 149.066086, latDeg: -31.277039, heightM: 1164, source: IRAF },
  { id: 'sutherland', name: 'Sutherland (South Africa)', lonDeg: 20.810808, latDeg: -32.375823, heightM: 1798, source: 'astropy-data sites.json (observatory web site)' },
  { id: 'okayama', name: 'Okayama (Japan)', lonDeg: 133.593956, latDeg: 34.577075, heightM: 370, source: 'astropy-data sites.json (observatory web site)' },
  { id: 'xinglong', name: 'Xinglong (China)', lonDeg: 117.575, latDeg: 40.393333, heightM: 950, source: IRAF },
]

/** The site with this id, or undefined. */
export function findSite(id: string): NamedSite | undefined {
  return SITES.find((s) => s.id === id)
}

/**
 * Common tensile specimen geometries with their nominal sizes and tolerances, in mm,
 * each row naming its published source. Values are decimal strings so that checks
 * against them stay exact.
 *
 * Provenance: every value below was read in a secondary copy of ASTM E8/E8M (a
 * table citing the figure), not in the standard itself [copy]. Where that copy gave
 * no value (e.g. the plate-type thickness limit), the field is null rather than
 * recalled; a lab should confirm against its own copy of the standard.
 */
import { z } from 'zod';

/** A nominal size with a symmetric tolerance, in mm. */
export interface ToleratedSize {
  /** Nominal size, mm, as a decimal string. */
  readonly nominal: string;
  /** Permitted deviation either way, mm; null where the source copy gave none. */
  readonly tolerance: string | null;
}

interface GeometryBase {
  /** Stable key stored with a specimen. */
  readonly key: string;
  /** Short name for lists and labels. */
  readonly label: string;
  /** The standard the row comes from. */
  readonly standard: string;
  /** Where in the standard, e.g. "Fig. 1, sheet-type". */
  readonly source: string;
  /** How the values were read: 'copy' = in a secondary copy citing the clause. */
  readonly provenance: 'doc' | 'copy';
  /** Gauge length G. */
  readonly gaugeLength: ToleratedSize;
  /** Anything a user should know about the row. */
  readonly notes?: string;
}

/** A flat (rectangular) specimen: width is toleranced, thickness is the product's own, up to a limit. */
export interface FlatGeometry extends GeometryBase {
  readonly shape: 'flat';
  /** Width W of the reduced section. */
  readonly width: ToleratedSize;
  /** Largest thickness T the geometry allows, mm; null where the source copy gave none. */
  readonly maxThickness: string | null;
}

/** A round specimen. */
export interface RoundGeometry extends GeometryBase {
  readonly shape: 'round';
  /** Diameter D of the reduced section. */
  readonly diameter: ToleratedSize;
}

/** One row of the geometry table. */
export type SpecimenGeometry = FlatGeometry | RoundGeometry;

const E8 = 'ASTM E8/E8M';

function round(
  key: string,
  diameter: ToleratedSize,
  gauge: ToleratedSize,
  ratio: '4D' | '5D',
  size: string,
): RoundGeometry {
  const edition = ratio === '4D' ? 'E8' : 'E8M';
  return {
    key,
    label: `Round ${diameter.nominal} mm, G ${gauge.nominal} mm (${edition}, ${ratio})`,
    shape: 'round',
    standard: E8,
    source: `Fig. 8, ${size} round specimen, gauge length ${ratio} (${edition})`,
    provenance: 'copy',
    diameter,
    gaugeLength: gauge,
    ...(gauge.tolerance === null
      ? { notes: 'The gauge-length tolerance was not given in the copy read; see the standard.' }
      : {}),
  };
}

/** The geometry table, keyed by {@link SpecimenGeometry.key}. */
export const SPECIMEN_GEOMETRIES: readonly SpecimenGeometry[] = [
  {
    key: 'astm-e8-flat-plate-40',
    label: 'Plate-type, 40 mm wide',
    shape: 'flat',
    standard: E8,
    source: 'Fig. 1, rectangular tension test specimen, plate-type 40 mm',
    provenance: 'copy',
    width: { nominal: '40.0', tolerance: '2.0' },
    maxThickness: null,
    gaugeLength: { nominal: '200.0', tolerance: '0.2' },
    notes: 'The thickness limit was not given in the copy read; see the standard.',
  },
  {
    key: 'astm-e8-flat-sheet-12.5',
    label: 'Sheet-type, 12.5 mm wide',
    shape: 'flat',
    standard: E8,
    source: 'Fig. 1, rectangular tension test specimen, sheet-type 12.5 mm',
    provenance: 'copy',
    width: { nominal: '12.5', tolerance: '0.2' },
    maxThickness: '19',
    gaugeLength: { nominal: '50.0', tolerance: '0.1' },
  },
  {
    key: 'astm-e8-flat-subsize-6',
    label: 'Subsize, 6 mm wide',
    shape: 'flat',
    standard: E8,
    source: 'Fig. 1, rectangular tension test specimen, subsize 6 mm',
    provenance: 'copy',
    width: { nominal: '6.0', tolerance: '0.1' },
    maxThickness: '6',
    gaugeLength: { nominal: '25.0', tolerance: '0.1' },
  },
  round('astm-e8-round-12.5-4d', { nominal: '12.5', tolerance: '0.2' }, { nominal: '50.0', tolerance: '0.1' }, '4D', 'standard 12.5 mm'),
  round('astm-e8m-round-12.5-5d', { nominal: '12.5', tolerance: '0.2' }, { nominal: '62.5', tolerance: '0.1' }, '5D', 'standard 12.5 mm'),
  round('astm-e8-round-9-4d', { nominal: '9.0', tolerance: '0.1' }, { nominal: '36', tolerance: null }, '4D', 'small-size 9 mm'),
  round('astm-e8m-round-9-5d', { nominal: '9.0', tolerance: '0.1' }, { nominal: '45', tolerance: null }, '5D', 'small-size 9 mm'),
  round('astm-e8-round-6-4d', { nominal: '6.0', tolerance: '0.1' }, { nominal: '24', tolerance: null }, '4D', 'small-size 6 mm'),
  round('astm-e8m-round-6-5d', { nominal: '6.0', tolerance: '0.1' }, { nominal: '30', tolerance: null }, '5D', 'small-size 6 mm'),
  round('astm-e8-round-4-4d', { nominal: '4.0', tolerance: '0.1' }, { nominal: '16', tolerance: null }, '4D', 'small-size 4 mm'),
  round('astm-e8m-round-4-5d', { nominal: '4.0', tolerance: '0.1' }, { nominal: '20', tolerance: null }, '5D', 'small-size 4 mm'),
  round('astm-e8-round-2.5-4d', { nominal: '2.5', tolerance: '0.1' }, { nominal: '10', tolerance: null }, '4D', 'small-size 2.5 mm'),
  round('astm-e8m-round-2.5-5d', { nominal: '2.5', tolerance: '0.1' }, { nominal: '12.5', tolerance: null }, '5D', 'small-size 2.5 mm'),
];

/** Every key in {@link SPECIMEN_GEOMETRIES}. */
export const GEOMETRY_KEYS: readonly string[] = SPECIMEN_GEOMETRIES.map((g) => g.key);

const BY_KEY = new Map(SPECIMEN_GEOMETRIES.map((g) => [g.key, g]));

/**
 * Looks up a geometry by key.
 *
 * @param key - e.g. "astm-e8-flat-sheet-12.5".
 * @returns The row, or undefined when no geometry has that key.
 */
export function getGeometry(key: string): SpecimenGeometry | undefined {
  return BY_KEY.get(key);
}

/** A geometry key from the table; the message tells a person what to do. */
export const GeometryKeySchema = z.string().refine((key) => BY_KEY.has(key), {
  message: 'Choose a specimen geometry from the list.',
});

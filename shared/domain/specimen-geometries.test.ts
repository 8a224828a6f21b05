import { describe, expect, it } from 'vitest';
import Decimal from 'decimal.js';
import {
  GEOMETRY_KEYS,
  GeometryKeySchema,
  SPECIMEN_GEOMETRIES,
  getGeometry,
  type FlatGeometry,
  type RoundGeometry,
} from './specimen-geometries';

function flat(key: string): FlatGeometry {
  const g = getGeometry(key);
  if (g?.shape !== 'flat') throw new Error(`${key} is not a flat geometry`);
  return g;
}

function round(key: string): RoundGeometry {
  const g = getGeometry(key);
  if (g?.shape !== 'round') throw new Error(`${key} is not a round geometry`);
  return g;
}

describe('SPECIMEN_GEOMETRIES', () => {
  it('holds the ASTM E8/E8M Fig. 1 rectangular specimens', () => {
    // ASTM E8/E8M Fig. 1, as read in a secondary copy citing the figure [copy].
    expect(flat('astm-e8-flat-plate-40')).toMatchObject({
      width: { nominal: '40.0', tolerance: '2.0' },
      gaugeLength: { nominal: '200.0', tolerance: '0.2' },
      maxThickness: null,
    });
    expect(flat('astm-e8-flat-sheet-12.5')).toMatchObject({
      width: { nominal: '12.5', tolerance: '0.2' },
      gaugeLength: { nominal: '50.0', tolerance: '0.1' },
      maxThickness: '19',
    });
    expect(flat('astm-e8-flat-subsize-6')).toMatchObject({
      width: { nominal: '6.0', tolerance: '0.1' },
      gaugeLength: { nominal: '25.0', tolerance: '0.1' },
      maxThickness: '6',
    });
  });

  it('holds the ASTM E8/E8M Fig. 8 round specimens', () => {
    // ASTM E8/E8M Fig. 8, as read in a secondary copy citing the figure [copy]:
    // D 12.5 ± 0.2 with G 50.0 ± 0.1 (E8, 4D) or 62.5 ± 0.1 (E8M, 5D).
    expect(round('astm-e8-round-12.5-4d')).toMatchObject({
      diameter: { nominal: '12.5', tolerance: '0.2' },
      gaugeLength: { nominal: '50.0', tolerance: '0.1' },
    });
    expect(round('astm-e8m-round-12.5-5d')).toMatchObject({
      diameter: { nominal: '12.5', tolerance: '0.2' },
      gaugeLength: { nominal: '62.5', tolerance: '0.1' },
    });
    // D 9.0/6.0/4.0/2.5 ± 0.1 with G 36/24/16/10 (E8) or 45/30/20/12.5 (E8M) [copy].
    const small: Array<[string, string, string, string]> = [
      ['9', '9.0', '36', '45'],
      ['6', '6.0', '24', '30'],
      ['4', '4.0', '16', '20'],
      ['2.5', '2.5', '10', '12.5'],
    ];
    for (const [size, d, g4, g5] of small) {
      expect(round(`astm-e8-round-${size}-4d`)).toMatchObject({
        diameter: { nominal: d, tolerance: '0.1' },
        gaugeLength: { nominal: g4 },
      });
      expect(round(`astm-e8m-round-${size}-5d`)).toMatchObject({
        diameter: { nominal: d, tolerance: '0.1' },
        gaugeLength: { nominal: g5 },
      });
    }
  });

  it('has round gauge lengths of exactly 4D or 5D, as their names say', () => {
    for (const g of SPECIMEN_GEOMETRIES) {
      if (g.shape !== 'round') continue;
      const ratio = g.key.endsWith('-4d') ? 4 : 5;
      expect(new Decimal(g.gaugeLength.nominal).eq(new Decimal(g.diameter.nominal).mul(ratio)), g.key).toBe(true);
    }
  });

  it('names a source for every row and uses decimal strings throughout', () => {
    expect(new Set(GEOMETRY_KEYS).size).toBe(SPECIMEN_GEOMETRIES.length);
    const decimal = /^\d+(\.\d+)?$/;
    for (const g of SPECIMEN_GEOMETRIES) {
      expect(g.standard).toBe('ASTM E8/E8M');
      expect(g.source).toMatch(/^Fig\. (1|8), /);
      expect(g.provenance).toBe('copy');
      expect(g.key).toMatch(/^[a-z0-9.-]+$/);
      const sizes = g.shape === 'flat' ? [g.width, g.gaugeLength] : [g.diameter, g.gaugeLength];
      for (const s of sizes) {
        expect(s.nominal).toMatch(decimal);
        if (s.tolerance !== null) expect(s.tolerance).toMatch(decimal);
      }
      if (g.shape === 'flat' && g.maxThickness !== null) expect(g.maxThickness).toMatch(decimal);
      // A missing value is explained rather than recalled.
      const hasGap = g.gaugeLength.tolerance === null || (g.shape === 'flat' && g.maxThickness === null);
      if (hasGap) expect(g.notes).toMatch(/not given in the copy read/);
    }
  });

  it('looks rows up by key and validates keys', () => {
    expect(getGeometry('no-such-geometry')).toBeUndefined();
    expect(GeometryKeySchema.parse('astm-e8-flat-sheet-12.5')).toBe('astm-e8-flat-sheet-12.5');
    expect(GeometryKeySchema.safeParse('round-13').error?.issues[0]?.message).toBe(
      'Choose a specimen geometry from the list.',
    );
  });
});

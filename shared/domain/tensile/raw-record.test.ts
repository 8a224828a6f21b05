import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parse as csvParse } from 'csv-parse/sync';
import { MAX_LISTED_PROBLEMS, MIN_RECORD_POINTS, detectDelimiter, inspectCsv, mapRecord, parseCsv, type RecordOutcome } from './raw-record';

function ok<T>(outcome: RecordOutcome<T>): T {
  if (!outcome.ok) throw new Error(`expected success, got ${JSON.stringify(outcome.problems)}`);
  return outcome.value;
}

function problems<T>(outcome: RecordOutcome<T>) {
  if (outcome.ok) throw new Error('expected problems, got a value');
  return outcome.problems;
}

function csv(rows: (string | number)[][]): string {
  return rows.map((r) => r.join(',')).join('\n');
}

const simple = csv([
  ['Time (s)', 'Force (kN)', 'Extension (mm)'],
  ...Array.from({ length: 12 }, (_, i) => [i * 0.1, (i * 1.5).toFixed(3), (i * 0.01).toFixed(4)]),
]);

describe('parseCsv (RFC 4180)', () => {
  it('reads the RFC 4180 section 2 examples', () => {
    // RFC 4180 §2 rules 1–7: CRLF line ends, optional final line break, quoted fields holding
    // separators, line breaks and doubled quotes.
    const text = 'aaa,bbb,ccc\r\nzzz,yyy,xxx\r\n';
    expect(parseCsv(text).map((r) => r.cells)).toEqual([
      ['aaa', 'bbb', 'ccc'],
      ['zzz', 'yyy', 'xxx'],
    ]);
    expect(parseCsv('"aaa","b\r\nbb","ccc"\r\nzzz,yyy,xxx').map((r) => r.cells)).toEqual([
      ['aaa', 'b\r\nbb', 'ccc'],
      ['zzz', 'yyy', 'xxx'],
    ]);
    expect(parseCsv('"aaa","b""bb","ccc"').map((r) => r.cells)).toEqual([['aaa', 'b"bb', 'ccc']]);
  });

  it('numbers rows as a spreadsheet does, a quoted line break staying in its row', () => {
    const rows = parseCsv('a,b\n"x\ny",1\n\nlast,2');
    expect(rows.map((r) => r.row)).toEqual([1, 2, 3, 4]);
    expect(rows[2]?.cells).toEqual(['']);
  });

  it('agrees with csv-parse on awkward inputs', () => {
    // Reference: the csv-parse npm package (sync API), with relax_column_count so ragged rows
    // are allowed as ours allows them.
    const samples = [
      'a,b,c\n1,2,3\n',
      'a;b\r\n"1;5";2\r\n3;4',
      '\ufeffx,y\n1,\n,2',
      '"q""uoted",plain\n"",""\n',
      'one\rtwo\rthree',
      'a,"multi\nline",c\n1,2,3',
    ];
    for (const text of samples) {
      const delimiter = detectDelimiter(text);
      const reference = csvParse(text, { delimiter, bom: true, relax_column_count: true }) as string[][];
      expect(parseCsv(text, delimiter).map((r) => r.cells)).toEqual(reference);
    }
  });

  it('agrees with csv-parse on random quoted tables', () => {
    // Reference: csv-parse sync, over fields that need quoting (separators, quotes, line breaks).
    const field = fc.string({ unit: fc.constantFrom('a', '1', ',', '"', '\n', ' ', '.', 'é'), maxLength: 6 });
    fc.assert(
      fc.property(fc.array(fc.array(field, { minLength: 2, maxLength: 2 }), { minLength: 1, maxLength: 5 }), (table) => {
        const text = table.map((r) => r.map((c) => `"${c.replaceAll('"', '""')}"`).join(',')).join('\r\n');
        const reference = csvParse(text, { delimiter: ',' }) as string[][];
        expect(parseCsv(text).map((r) => r.cells)).toEqual(reference);
        expect(reference).toEqual(table);
      }),
    );
  });

  it('refuses a quoted cell that is never closed, naming its row', () => {
    expect(() => parseCsv('a,b\n1,"2\n3,4')).toThrow(/row 2/);
  });
});

describe('detectDelimiter', () => {
  it('picks comma, semicolon or tab from the header row', () => {
    expect(detectDelimiter('a,b,c\n1,2,3')).toBe(',');
    expect(detectDelimiter('a;b;c\n1,5;2,5;3')).toBe(';');
    expect(detectDelimiter('a\tb\n1\t2')).toBe('\t');
    expect(detectDelimiter('"x,y";z;w\n1;2;3')).toBe(';');
    expect(detectDelimiter('skip me\na;b\n1;2', 2)).toBe(';');
  });
});

describe('inspectCsv', () => {
  it('gives the headers, the first rows and the row count', () => {
    const seen = ok(inspectCsv(simple));
    expect(seen.headers).toEqual(['Time (s)', 'Force (kN)', 'Extension (mm)']);
    expect(seen.sampleRows).toHaveLength(10);
    expect(seen.sampleRows[1]).toEqual(['0.1', '1.500', '0.0100']);
    expect(seen.rowCount).toBe(12);
    expect(seen.delimiter).toBe(',');
  });

  it('starts at a later header row when the file opens with notes', () => {
    const text = `Specimen notes\n\nF;s\n1,0;0,1\n2,0;0,2\n`;
    const seen = ok(inspectCsv(text, { headerRow: 3 }));
    expect(seen.headers).toEqual(['F', 's']);
    expect(seen.rowCount).toBe(2);
    expect(seen.delimiter).toBe(';');
  });

  it('says why an empty file, a missing header or an open quote cannot be read', () => {
    expect(problems(inspectCsv('  \n')).map((p) => p.code)).toEqual(['empty']);
    expect(problems(inspectCsv('a,b\n1,2', { headerRow: 5 }))[0]?.code).toBe('no-header');
    expect(problems(inspectCsv('a,b\n"1,2'))[0]?.message).toMatch(/never closed/);
  });
});

describe('mapRecord', () => {
  it('converts kN and mm by shifting the decimal exponent, exactly', () => {
    const text = csv([['F', 'e'], ...Array.from({ length: 10 }, () => ['1.005', '0.5'])]);
    const record = ok(mapRecord(text, { force: 'F', extension: 'e' }, { force: 'kN', extension: 'mm' }, '50'));
    // 1.005 × 1000 in binary floating point is 1004.9999999999999 (run in Node); the shifted text is exact.
    expect(1.005 * 1000).toBe(1004.9999999999999);
    expect(record.points[0]).toEqual({ forceN: 1005, extensionMm: 0.5 });
    expect(record.extensometerGaugeLengthMm).toBe('50');
  });

  it('converts lbf, kip and inches by the exact factors', () => {
    // NIST SP 811 Appendix B: 1 lbf = 4.4482216152605 N and 1 in = 25.4 mm, both exact.
    const text = csv([['lbf', 'kip', 'in'], ...Array.from({ length: 10 }, () => ['1000', '1', '2'])]);
    const a = ok(mapRecord(text, { force: 'lbf', extension: 'in' }, { force: 'lbf', extension: 'in' }, { value: '2', unit: 'in' }));
    const b = ok(mapRecord(text, { force: 'kip', extension: 'in' }, { force: 'kip', extension: 'in' }, '50.8'));
    expect(a.points[0]?.forceN).toBeCloseTo(4448.2216152605, 9);
    expect(b.points[0]?.forceN).toBeCloseTo(4448.2216152605, 9);
    expect(a.points[0]?.extensionMm).toBe(50.8);
    expect(a.extensometerGaugeLengthMm).toBe('50.8');
  });

  it('maps by header (ignoring case), by position, and keeps time', () => {
    const byName = ok(mapRecord(simple, { time: 'time (s)', force: 'Force (kN)', extension: 'Extension (mm)' }, { force: 'kN', extension: 'mm' }, 50));
    const byIndex = ok(mapRecord(simple, { time: 0, force: 1, extension: 2 }, { force: 'kN', extension: 'mm' }, 50));
    expect(byName.points).toEqual(byIndex.points);
    expect(byName.points[2]).toEqual({ forceN: 3000, extensionMm: 0.02, timeS: 0.2 });
    expect(byName.columns).toEqual({ time: 'Time (s)', force: 'Force (kN)', extension: 'Extension (mm)' });
  });

  it('reads files whose lines end in CR alone, and skips notes above the header', () => {
    const text = ['Test of 2026', 'F;e', ...Array.from({ length: 10 }, (_, i) => `${i};${i / 10}`)].join('\r');
    const record = ok(mapRecord(text, { force: 'F', extension: 'e' }, { force: 'N', extension: 'mm' }, 50, { headerRow: 2 }));
    expect(record.delimiter).toBe(';');
    expect(record.points[9]).toEqual({ forceN: 9, extensionMm: 0.9 });
  });

  it('reads decimal commas with a semicolon separator', () => {
    const text = ['Kraft;Weg', ...Array.from({ length: 10 }, (_, i) => `${i},5;0,0${i}`)].join('\n');
    const record = ok(mapRecord(text, { force: 'Kraft', extension: 'Weg' }, { force: 'N', extension: 'mm' }, 50, { decimalMark: ',' }));
    expect(record.points[3]).toEqual({ forceN: 3.5, extensionMm: 0.03 });
  });

  it('names the missing force column and lists the columns there are', () => {
    const [first] = problems(mapRecord(simple, { force: 'Load', extension: 'Extension (mm)' }, { force: 'N', extension: 'mm' }, 50));
    expect(first?.code).toBe('no-force-column');
    expect(first?.message).toContain('"Time (s)", "Force (kN)", "Extension (mm)"');
    expect(problems(mapRecord(simple, { extension: 2 }, { force: 'N', extension: 'mm' }, 50))[0]?.code).toBe('no-force-column');
  });

  it('names the row and column of each non-numeric or empty cell', () => {
    const text = csv([
      ['Force', 'Ext'],
      ...Array.from({ length: 12 }, (_, i) => (i === 3 ? ['"12,5"', '0.1'] : i === 7 ? ['n/a', ''] : [String(i), '0.1'])),
    ]);
    const found = problems(mapRecord(text, { force: 'Force', extension: 'Ext' }, { force: 'N', extension: 'mm' }, 50));
    // The header is row 1, so the fourth data row is row 5.
    expect(found[0]).toMatchObject({ code: 'non-numeric', row: 5, column: 'Force' });
    expect(found[0]?.message).toMatch(/decimal comma/);
    expect(found[1]).toMatchObject({ code: 'non-numeric', row: 9, column: 'Force' });
    expect(found[1]?.message).toBe('Row 9, column "Force": "n/a" is not a number.');
    expect(found[2]).toMatchObject({ code: 'missing-cell', row: 9, column: 'Ext' });
  });

  it('lists the first cell problems and counts the rest', () => {
    const text = csv([['F', 'e'], ...Array.from({ length: 30 }, () => ['x', '1'])]);
    const found = problems(mapRecord(text, { force: 'F', extension: 'e' }, { force: 'N', extension: 'mm' }, 50));
    expect(found).toHaveLength(MAX_LISTED_PROBLEMS + 1);
    expect(found.at(-1)?.message).toBe('…and 20 more cells like these.');
  });

  it('refuses units it cannot read and a gauge length that is not positive', () => {
    const units = { force: 'kgf', extension: 'furlong' } as unknown as { force: 'N'; extension: 'mm' };
    const found = problems(mapRecord(simple, { force: 1, extension: 2 }, units, '0'));
    expect(found.map((p) => p.code)).toEqual(['unknown-unit', 'unknown-unit', 'bad-gauge-length']);
    expect(found[0]?.message).toContain('"kgf"');
    expect(problems(mapRecord(simple, { force: 1, extension: 2 }, { force: 'N', extension: 'mm' }, '-5'))[0]?.code).toBe('bad-gauge-length');
  });

  it('refuses a record with too few points', () => {
    const text = csv([['F', 'e'], ...Array.from({ length: MIN_RECORD_POINTS - 1 }, (_, i) => [i, i])]);
    const [first] = problems(mapRecord(text, { force: 'F', extension: 'e' }, { force: 'N', extension: 'mm' }, 50));
    expect(first?.code).toBe('too-few-points');
    expect(first?.message).toBe(`The record has ${MIN_RECORD_POINTS - 1} data points; at least ${MIN_RECORD_POINTS} are needed.`);
  });

  it('refuses the same column for two quantities, and duplicate headers by name', () => {
    expect(problems(mapRecord(simple, { force: 1, extension: 1 }, { force: 'N', extension: 'mm' }, 50))[0]?.code).toBe('bad-option');
    const text = csv([['F', 'F', 'e'], ...Array.from({ length: 10 }, () => [1, 2, 3])]);
    expect(problems(mapRecord(text, { force: 'F', extension: 'e' }, { force: 'N', extension: 'mm' }, 50))[0]?.code).toBe('duplicate-column');
  });

  it('maps 100,000 rows quickly', () => {
    const rows = ['Time,Force,Extension'];
    for (let i = 0; i < 100_000; i++) rows.push(`${(i * 0.01).toFixed(2)},${(i * 0.123).toFixed(3)},${(i * 0.0001).toFixed(5)}`);
    const text = rows.join('\r\n');
    const started = performance.now();
    const cpu = process.cpuUsage();
    const record = ok(mapRecord(text, { time: 'Time', force: 'Force', extension: 'Extension' }, { force: 'kN', extension: 'mm' }, 50));
    const { user, system } = process.cpuUsage(cpu);
    const ms = performance.now() - started;
    // Wall time depends on what else the machine runs; CPU time is this process's own share.
    console.log(
      `mapRecord: 100,000 rows (${(text.length / 1e6).toFixed(1)} MB) in ${ms.toFixed(0)} ms wall, ${((user + system) / 1000).toFixed(0)} ms CPU`,
    );
    expect(record.points).toHaveLength(100_000);
    expect(record.points[99_999]?.forceN).toBe(12299877);
  });
});

describe('mapRecord number reading', () => {
  it('reads every decimal literal as Number() reads it, scaled by the exact power of ten', () => {
    // Reference: JavaScript's Number() on the literal (correctly rounded, ECMA-262), and on the
    // literal with its exponent raised by 3 for kN.
    const literal = fc
      .tuple(
        fc.constantFrom('', '-', '+'),
        fc.stringMatching(/^\d{1,18}$/),
        fc.option(fc.stringMatching(/^\d{0,18}$/), { nil: undefined }),
        fc.option(fc.integer({ min: -30, max: 30 }), { nil: undefined }),
      )
      .map(([sign, int, frac, exp]) => `${sign}${int}${frac === undefined ? '' : `.${frac}`}${exp === undefined ? '' : `e${exp}`}`);
    fc.assert(
      fc.property(fc.array(literal, { minLength: MIN_RECORD_POINTS, maxLength: MIN_RECORD_POINTS }), (cells) => {
        const text = ['F,e', ...cells.map((c) => `${c},${c}`)].join('\n');
        const inN = ok(mapRecord(text, { force: 'F', extension: 'e' }, { force: 'N', extension: 'mm' }, 50));
        const inKn = ok(mapRecord(text, { force: 'F', extension: 'e' }, { force: 'kN', extension: 'mm' }, 50));
        cells.forEach((c, i) => {
          const [mantissa = '', exp = '0'] = c.split('e');
          expect(inN.points[i]?.forceN).toBe(Number(c));
          expect(inN.points[i]?.extensionMm).toBe(Number(c));
          expect(inKn.points[i]?.forceN).toBe(Number(`${mantissa}e${Number(exp) + 3}`));
        });
      }),
    );
  });

  it('refuses what is not a plain decimal literal', () => {
    for (const bad of ['0x10', 'Infinity', '1.2.3', '1e', '.', '1,000.5', '12 N', '--1']) {
      const text = ['F,e', ...Array.from({ length: 10 }, () => `"${bad}",1`)].join('\n');
      const found = problems(mapRecord(text, { force: 'F', extension: 'e' }, { force: 'N', extension: 'mm' }, 50));
      expect(found[0]?.code).toBe('non-numeric');
    }
  });
});

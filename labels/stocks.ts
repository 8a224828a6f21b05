/**
 * Label stocks: the rolls and sheets Halfmark can print on.
 *
 * Every dimension is in millimetres, measured from the top-left corner of the page, the way a
 * person measures a sheet with a ruler. Keys and names are our own; they describe the stock by
 * its dimensions only.
 */

/** How the stock is fed: one label per page on a roll, or a grid of labels on an office sheet. */
export type StockKind = 'roll' | 'sheet';

/** One printable stock. */
export interface Stock {
  /** Our own stable key, used in requests and in the UI. */
  readonly key: string;
  /** A plain description with the dimensions. */
  readonly name: string;
  readonly kind: StockKind;
  /** Page size in mm. For a roll the page is one label. */
  readonly pageWidthMm: number;
  readonly pageHeightMm: number;
  /** Size of one label in mm. */
  readonly labelWidthMm: number;
  readonly labelHeightMm: number;
  readonly columns: number;
  readonly rows: number;
  /** Distance from the page's left and top edges to the first label. */
  readonly marginLeftMm: number;
  readonly marginTopMm: number;
  /** Space between neighbouring labels. */
  readonly gapXMm: number;
  readonly gapYMm: number;
  /**
   * Blank border kept inside each label: thermal printers do not print to the very edge of the
   * label and office printers may shift a sheet by a millimetre or so (common practice).
   */
  readonly paddingMm: number;
  /**
   * The printer dot the symbols' modules are snapped to, so every module is a whole number of
   * dots: 8 dots/mm for 203 dpi thermal printers, 600 dpi for office laser printers (common practice).
   */
  readonly dotMm: number;
}

const THERMAL_DOT_MM = 0.125;
const LASER_DOT_MM = 25.4 / 600;

const A4 = { pageWidthMm: 210, pageHeightMm: 297 } as const;
// US Letter is 8.5 × 11 in; 1 in = 25.4 mm exactly (NIST SP 811).
const LETTER = { pageWidthMm: 8.5 * 25.4, pageHeightMm: 11 * 25.4 } as const;

function roll(key: string, name: string, widthMm: number, heightMm: number): Stock {
  return {
    key,
    name,
    kind: 'roll',
    pageWidthMm: widthMm,
    pageHeightMm: heightMm,
    labelWidthMm: widthMm,
    labelHeightMm: heightMm,
    columns: 1,
    rows: 1,
    marginLeftMm: 0,
    marginTopMm: 0,
    gapXMm: 0,
    gapYMm: 0,
    paddingMm: 1.5,
    dotMm: THERMAL_DOT_MM,
  };
}

const STOCKS: readonly Stock[] = [
  roll('roll-51x25', 'Thermal roll, 50.8 × 25.4 mm (2 × 1 in)', 50.8, 25.4),
  roll('roll-57x32', 'Thermal roll, 57 × 32 mm', 57, 32),
  roll('roll-102x51', 'Thermal roll, 101.6 × 50.8 mm (4 × 2 in)', 101.6, 50.8),
  {
    key: 'a4-3x8',
    name: 'A4 sheet, 3 × 8 labels of 70 × 37 mm',
    kind: 'sheet',
    ...A4,
    labelWidthMm: 70,
    labelHeightMm: 37,
    columns: 3,
    rows: 8,
    // 3 × 70 mm fills the width; 8 × 37 = 296 mm leaves 0.5 mm above and below.
    marginLeftMm: 0,
    marginTopMm: 0.5,
    gapXMm: 0,
    gapYMm: 0,
    paddingMm: 3,
    dotMm: LASER_DOT_MM,
  },
  {
    key: 'letter-3x10',
    name: 'US Letter sheet, 3 × 10 labels of 66.7 × 25.4 mm (2⅝ × 1 in)',
    kind: 'sheet',
    ...LETTER,
    labelWidthMm: 2.625 * 25.4,
    labelHeightMm: 25.4,
    columns: 3,
    rows: 10,
    // 3/16 in side margins, 1/8 in between columns, 1/2 in top margin: the usual layout of a
    // 30-label letter sheet (common practice); 2 × 3/16 + 3 × 2⅝ + 2 × 1/8 = 8.5 in.
    marginLeftMm: (3 / 16) * 25.4,
    marginTopMm: 0.5 * 25.4,
    gapXMm: 0.125 * 25.4,
    gapYMm: 0,
    paddingMm: 2,
    dotMm: LASER_DOT_MM,
  },
];

/** All stocks, in the order a UI should offer them. */
export function listStocks(): readonly Stock[] {
  return STOCKS;
}

/** The stock with this key, or undefined. */
export function findStock(key: string): Stock | undefined {
  return STOCKS.find((s) => s.key === key);
}

/** Number of label positions on one page of the stock. */
export function positionsPerPage(stock: Stock): number {
  return stock.columns * stock.rows;
}

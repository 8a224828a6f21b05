import type { LabelStockView } from '../../../../shared/schemas/labels';

/**
 * Where on a partly used sheet the first label goes: a small map of the sheet, positions counted
 * left to right, then down; the ones before the start are shown as already used.
 */
export function StartPositionPicker({
  stock,
  value,
  onChange,
  error,
}: {
  stock: LabelStockView;
  value: number;
  onChange: (position: number) => void;
  error?: string;
}) {
  const positions = Array.from({ length: stock.positionsPerPage }, (_, i) => i + 1);
  return (
    <fieldset className="flex flex-col gap-1">
      <legend className="text-body font-semibold text-ink-800">First label at position {value}</legend>
      <p className="text-caption text-ink-500">On a partly used sheet, choose the first free label. Grey ones are taken.</p>
      <div
        className="mt-1 grid max-w-56 gap-1 rounded-md bg-ink-100 p-2"
        style={{ gridTemplateColumns: `repeat(${stock.columns}, minmax(0, 1fr))`, aspectRatio: `${stock.pageWidthMm} / ${stock.pageHeightMm}` }}
      >
        {positions.map((p) => (
          <button
            key={p}
            type="button"
            onClick={() => onChange(p)}
            aria-pressed={p === value}
            aria-label={`Start at position ${p}`}
            className={`min-h-5 rounded-sm text-[0.6rem] font-semibold leading-none ${p < value ? 'bg-ink-300 text-ink-500' : p === value ? 'bg-temper-500 text-white ring-2 ring-temper-700' : 'bg-white text-ink-600 hover:bg-temper-100'}`}
          >
            {p}
          </button>
        ))}
      </div>
      {error ? (
        <p className="text-caption font-semibold text-stop-700">
          <span aria-hidden>▲ </span>
          {error}
        </p>
      ) : null}
    </fieldset>
  );
}

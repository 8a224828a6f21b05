import type { Outcome } from '../feedback';

/** Each outcome's own shape, so it reads without colour: a check in a circle, a double ring, a triangle with a bang, an hourglass, a square with an i. */
export const OUTCOME_SHAPES: Record<Outcome, string> = {
  accepted: 'check-circle',
  already: 'double-ring',
  refused: 'triangle-bang',
  kept: 'hourglass',
  info: 'square-i',
};

/** The large shape of a scan's outcome. */
export function OutcomeMark({ outcome, size = 72 }: { outcome: Outcome; size?: number }) {
  const common = { width: size, height: size, viewBox: '0 0 48 48', 'aria-hidden': true, 'data-shape': OUTCOME_SHAPES[outcome] } as const;
  switch (outcome) {
    case 'accepted':
      return (
        <svg {...common}>
          <circle cx="24" cy="24" r="21" fill="currentColor" />
          <path d="M13 25 21 33 36 16" fill="none" stroke="white" strokeWidth="5" strokeLinecap="round" strokeLinejoin="round" />
        </svg>
      );
    case 'already':
      return (
        <svg {...common}>
          <circle cx="24" cy="24" r="20.5" fill="none" stroke="currentColor" strokeWidth="4" />
          <circle cx="24" cy="24" r="11" fill="none" stroke="currentColor" strokeWidth="4" />
        </svg>
      );
    case 'refused':
      return (
        <svg {...common}>
          <path d="M24 3 46 43H2Z" fill="currentColor" strokeLinejoin="round" />
          <rect x="21.5" y="16" width="5" height="15" rx="2" fill="white" />
          <circle cx="24" cy="36.5" r="2.8" fill="white" />
        </svg>
      );
    case 'kept':
      return (
        <svg {...common}>
          <path d="M10 4h28M10 44h28M13 4c0 12 11 14 11 20S13 32 13 44M35 4c0 12-11 14-11 20s11 8 11 20" fill="none" stroke="currentColor" strokeWidth="4" strokeLinecap="round" />
        </svg>
      );
    case 'info':
      return (
        <svg {...common}>
          <rect x="4" y="4" width="40" height="40" rx="6" fill="none" stroke="currentColor" strokeWidth="4" />
          <circle cx="24" cy="14" r="3" fill="currentColor" />
          <rect x="21" y="20" width="6" height="16" rx="2" fill="currentColor" />
        </svg>
      );
  }
}

/**
 * The hand-offs a person can scan, in the words used at the bench, with what each needs:
 * a container scanned first, a reason, a safety reminder.
 */
import { TRANSITIONS, ITEM_KINDS, type EventType, type ItemKind } from '../../../shared/domain/ledger/state-machine';

/** Which reminder a hazardous action shows beside it. */
export type SafetyNote = 'saw' | 'frame' | 'chamber';

/** One action the scanner offers. */
export interface ScanAction {
  type: EventType;
  /** The button's words. */
  label: string;
  /** How a recorded scan reads: "Cut", "Binned". */
  done: string;
  /** One line under the button. */
  hint: string;
  /** The item is put into a container, scanned first (batch scanning). */
  needsContainer: boolean;
  /** A reason is asked once and sent with every scan. */
  needsReason: boolean;
  safety?: SafetyNote;
  glyph: string;
}

const a = (
  type: EventType,
  label: string,
  done: string,
  hint: string,
  glyph: string,
  extra: Partial<Pick<ScanAction, 'safety' | 'needsReason'>> = {},
): ScanAction => ({
  type,
  label,
  done,
  hint,
  glyph,
  needsContainer: ITEM_KINDS.some((kind) => TRANSITIONS[kind][type]?.needsContainer === true),
  needsReason: extra.needsReason ?? false,
  ...(extra.safety ? { safety: extra.safety } : {}),
});

/** The actions on the scanner, in the order of a specimen's life. */
export const SCAN_ACTIONS: readonly ScanAction[] = [
  a('cut', 'Cut', 'Cut', 'Cut from the sample at the saw', '✂', { safety: 'saw' }),
  a('conditioning_started', 'Into conditioning', 'Into conditioning', 'Placed in the conditioning chamber', '◔', { safety: 'chamber' }),
  a('conditioned', 'Out of conditioning', 'Conditioned', 'Taken out after its conditioning time', '◕', { safety: 'chamber' }),
  a('measured', 'Measure', 'Measured', 'Three readings per dimension; area computed', '⌀'),
  a('tested', 'Tested', 'Tested', 'Pulled on the frame: broken or not', '⇅', { safety: 'frame' }),
  a('binned', 'Into a bin', 'Binned', 'Scan the bin, then the pieces', '▭'),
  a('retained', 'Into storage', 'Retained', 'Scan the bag, box or shelf, then the pieces', '▣'),
  a('moved', 'Move', 'Moved', 'Scan where it goes, then what moves', '⇢'),
  a('held', 'Hold', 'Held', 'Stop all work on it until released', '⏸', { needsReason: true }),
  a('released', 'Release hold', 'Released', 'Back to where it was before the hold', '▶'),
  a('rejected', 'Reject before test', 'Rejected', 'Set aside, with a reason', '⊘', { needsReason: true }),
];

/** The scanner action of an event type, if it has one. */
export function scanAction(type: string): ScanAction | undefined {
  return SCAN_ACTIONS.find((action) => action.type === type);
}

/** Plain words for any event type, for "what may come next" lists. */
export function eventWords(type: string): string {
  return scanAction(type)?.label.toLowerCase() ?? type.replace(/_/g, ' ');
}

/** The kinds of item an action applies to. */
export function kindsFor(type: EventType): ItemKind[] {
  return ITEM_KINDS.filter((kind) => TRANSITIONS[kind][type] !== undefined);
}

/** The safety reminder shown beside saw, frame and chamber actions; it defers to the lab's own procedures. */
export const SAFETY_TEXT: Record<SafetyNote, string> = {
  saw: "Follow your lab's procedures for the saw; Halfmark does not control machines.",
  frame: "Follow your lab's procedures for the frame; Halfmark does not control machines.",
  chamber: "Follow your lab's procedures for the conditioning chamber; Halfmark does not control machines.",
};

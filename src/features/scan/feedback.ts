/**
 * What a scan sounds and feels like. Tones are generated with Web Audio (no audio files), and each
 * outcome has its own rhythm and pitch so that it can be told apart without looking, and its own
 * vibration pattern for a noisy floor.
 */

/** The outcomes a scan can have, as the person hears and feels them. */
export type Outcome = 'accepted' | 'already' | 'refused' | 'kept' | 'info';

interface Tone {
  /** Hz. */
  freq: number;
  /** Seconds. */
  length: number;
  wave: OscillatorType;
}

/** Each outcome's tones (played one after another with a short gap) and vibration, ms on/off. */
export const FEEDBACK: Record<Outcome, { tones: readonly Tone[]; vibrate: readonly number[]; name: string }> = {
  // One bright short chirp.
  accepted: { tones: [{ freq: 1568, length: 0.09, wave: 'sine' }], vibrate: [60], name: 'chirp' },
  // Two even mid tones: "seen it".
  already: {
    tones: [
      { freq: 988, length: 0.07, wave: 'sine' },
      { freq: 988, length: 0.07, wave: 'sine' },
    ],
    vibrate: [40, 60, 40],
    name: 'double',
  },
  // A long low falling buzz.
  refused: {
    tones: [
      { freq: 330, length: 0.18, wave: 'square' },
      { freq: 220, length: 0.26, wave: 'square' },
    ],
    vibrate: [220, 90, 220],
    name: 'buzz',
  },
  // A soft rising pair: kept on the device, not yet in the ledger.
  kept: {
    tones: [
      { freq: 659, length: 0.08, wave: 'triangle' },
      { freq: 880, length: 0.1, wave: 'triangle' },
    ],
    vibrate: [30, 40, 30, 40, 30],
    name: 'rising',
  },
  info: { tones: [{ freq: 784, length: 0.05, wave: 'triangle' }], vibrate: [25], name: 'tick' },
};

let audio: AudioContext | null = null;

function context(): AudioContext | null {
  if (typeof AudioContext === 'undefined') return null;
  audio ??= new AudioContext();
  // Browsers start audio suspended until a user gesture; a scan's keystroke or tap is one.
  if (audio.state === 'suspended') void audio.resume();
  return audio;
}

function play(tones: readonly Tone[]): void {
  const ctx = context();
  if (!ctx) return;
  let at = ctx.currentTime + 0.01;
  for (const tone of tones) {
    const osc = ctx.createOscillator();
    const gain = ctx.createGain();
    osc.type = tone.wave;
    osc.frequency.value = tone.freq;
    // A quick fade in and out avoids clicks at the edges.
    gain.gain.setValueAtTime(0, at);
    gain.gain.linearRampToValueAtTime(0.25, at + 0.01);
    gain.gain.setValueAtTime(0.25, at + tone.length - 0.02);
    gain.gain.linearRampToValueAtTime(0, at + tone.length);
    osc.connect(gain).connect(ctx.destination);
    osc.start(at);
    osc.stop(at + tone.length + 0.01);
    at += tone.length + 0.06;
  }
}

/**
 * Sounds and vibrates for an outcome, as far as the device allows; silent where it cannot.
 *
 * @param outcome - What happened to the scan.
 * @param sound - False to stay silent (the person turned sound off).
 * @returns The name of the pattern used, for the screen to state.
 */
export function signal(outcome: Outcome, sound = true): string {
  const spec = FEEDBACK[outcome];
  try {
    if (sound) play(spec.tones);
  } catch {
    // Audio is a courtesy; the screen still says what happened.
  }
  if (typeof navigator !== 'undefined' && typeof navigator.vibrate === 'function') {
    navigator.vibrate([...spec.vibrate]);
  }
  return spec.name;
}

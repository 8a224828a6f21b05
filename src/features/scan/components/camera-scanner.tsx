/**
 * The camera way in, loaded only when someone opens it: the rear camera, Data Matrix and Code 128
 * only (faster than trying every symbology), and the torch where the device offers one.
 */
import { useEffect, useRef, useState } from 'react';
import { BrowserMultiFormatReader, type IScannerControls } from '@zxing/browser';
import { BarcodeFormat, DecodeHintType } from '@zxing/library';

/** A code seen again within this time is the same label still in view, not a new scan. */
const SAME_LABEL_MS = 2500;

/** The live camera view; calls onCode once per label that comes into view. */
export function CameraScanner({ onCode, onClose }: { onCode: (text: string, at: number) => void; onClose: () => void }) {
  const video = useRef<HTMLVideoElement>(null);
  const [torch, setTorch] = useState<boolean | null>(null);
  const [error, setError] = useState<string | null>(null);
  const controls = useRef<IScannerControls | null>(null);
  const onCodeRef = useRef(onCode);
  onCodeRef.current = onCode;

  useEffect(() => {
    let stopped = false;
    const seen = { text: '', at: 0 };
    const hints = new Map<DecodeHintType, unknown>([[DecodeHintType.POSSIBLE_FORMATS, [BarcodeFormat.DATA_MATRIX, BarcodeFormat.CODE_128]]]);
    const reader = new BrowserMultiFormatReader(hints, { delayBetweenScanAttempts: 120 });
    const element = video.current;
    if (!element) return;
    if (!window.isSecureContext || !navigator.mediaDevices) {
      setError('The camera needs a secure (https) connection. Use a wedge scanner or type the code.');
      return;
    }
    reader
      .decodeFromConstraints({ video: { facingMode: { ideal: 'environment' } }, audio: false }, element, (found) => {
        if (!found) return;
        const text = found.getText();
        const now = performance.now();
        if (text === seen.text && now - seen.at < SAME_LABEL_MS) return;
        seen.text = text;
        seen.at = now;
        onCodeRef.current(text, now);
      })
      .then((c) => {
        if (stopped) {
          c.stop();
          return;
        }
        controls.current = c;
        if (c.switchTorch) setTorch(false);
      })
      .catch((e: unknown) => {
        const name = e instanceof Error ? e.name : '';
        setError(
          name === 'NotAllowedError'
            ? 'The camera is not allowed for this page. Allow it in the browser settings, or use a wedge scanner or typing.'
            : 'No camera could be opened. Use a wedge scanner or type the code.',
        );
      });
    return () => {
      stopped = true;
      controls.current?.stop();
      controls.current = null;
    };
  }, []);

  const toggleTorch = async () => {
    const c = controls.current;
    if (!c?.switchTorch || torch === null) return;
    await c.switchTorch(!torch);
    setTorch(!torch);
  };

  return (
    <section aria-label="Camera" className="flex flex-col gap-2 rounded-card bg-ink-950 p-2 text-white" data-testid="camera">
      <video ref={video} muted playsInline className="aspect-[4/3] w-full rounded-md bg-black object-cover" />
      {error ? (
        <p role="alert" className="px-2 text-body">
          <span aria-hidden>▲ </span>
          {error}
        </p>
      ) : null}
      <div className="flex gap-2">
        {torch !== null ? (
          <button type="button" aria-pressed={torch} onClick={() => void toggleTorch()} className="h-12 flex-1 rounded-md ring-1 ring-white/60">
            {torch ? 'Torch off' : 'Torch on'}
          </button>
        ) : null}
        <button type="button" onClick={onClose} className="h-12 flex-1 rounded-md bg-white text-ink-900 font-semibold">
          Close camera
        </button>
      </div>
    </section>
  );
}

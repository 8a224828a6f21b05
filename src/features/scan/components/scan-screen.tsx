import { lazy, Suspense, useEffect, useState } from 'react';
import { ROLE_LABELS } from '../../../../shared/permissions';
import { PageHeader } from '../../../components/ui/page-header';
import { useCan, useMe } from '../../auth/api/queries';
import { OPERATOR_IDLE_MS, loadOperator } from '../station';
import { useScanner } from '../use-scanner';
import { listenForWedge } from '../wedge';
import { ActionPicker } from './action-picker';
import { CodeEntry } from './code-entry';
import { PendingPanel } from './pending-panel';
import { PinPrompt } from './pin-prompt';
import { ResultPanel } from './result-panel';
import { SafetyNote } from './safety-note';
import { StationSetup } from './station-setup';
import { TestPrompt } from './test-prompt';

// The camera decoder and the measurement arithmetic load only when used, so the scanner opens fast.
const CameraScanner = lazy(() => import('./camera-scanner').then((m) => ({ default: m.CameraScanner })));
const MeasureForm = lazy(() => import('./measure-form').then((m) => ({ default: m.MeasureForm })));

/** Online or not, and how many scans wait on this device. */
function Connection({ online, pending }: { online: boolean; pending: number }) {
  return (
    <p className="flex items-center gap-2 text-body" data-testid="connection" data-online={online}>
      <svg width="14" height="14" viewBox="0 0 10 10" aria-hidden>
        {online ? <circle cx="5" cy="5" r="4" fill="currentColor" /> : <circle cx="5" cy="5" r="3.6" fill="none" stroke="currentColor" strokeWidth="1.6" />}
      </svg>
      {online ? 'Online' : 'Offline: scans are kept on this device'}
      {pending > 0 ? ` · ${pending} waiting` : ''}
    </p>
  );
}

/**
 * The scan screen: choose the action (or run a fixed station), then scan with a wedge scanner
 * anywhere on the page, the camera, or by typing. Every scan answers at once with a sound, a
 * vibration and a large result.
 */
export function ScanScreen() {
  const me = useMe();
  const may = useCan('events.record');
  if (me.data && !may) {
    return (
      <>
        <PageHeader title="Scan" />
        <p role="alert" className="rounded-card bg-ink-50 p-4 text-lead" data-testid="scan-not-allowed">
          <span aria-hidden>▲ </span>
          Your role may look things up but not record hand-offs. Use Trace to follow an item.
        </p>
      </>
    );
  }
  return <Scanner />;
}

/** The scanner itself, for people who may record events. */
function Scanner() {
  const s = useScanner();
  const me = useMe();
  const [camera, setCamera] = useState(false);

  const { handleCode } = s;
  useEffect(() => listenForWedge((text, at) => void handleCode(text, 'wedge', at)), [handleCode]);

  // A shared station forgets its operator after a quiet spell, so the next person badges in.
  const { operator, setOperator } = s;
  useEffect(() => {
    if (!operator) return;
    const timer = window.setInterval(() => {
      if (!loadOperator()) setOperator(null);
    }, Math.min(OPERATOR_IDLE_MS, 30_000));
    return () => window.clearInterval(timer);
  }, [operator, setOperator]);

  const action = s.action;
  const prompt = s.prompt;
  const who = s.operator ? s.operator.operator : me.data ? { name: me.data.user.name, role: me.data.user.role } : null;

  return (
    <div className="flex flex-col gap-4" data-testid="scan-screen">
      <PageHeader
        title="Scan"
        subtitle={<Connection online={s.online} pending={s.pending.length} />}
        actions={
          <button type="button" aria-pressed={!s.sound} onClick={() => s.setSound(!s.sound)} className="h-11 rounded-md px-3 text-body ring-1 ring-ink-300">
            {s.sound ? 'Sound on' : 'Sound off'}
          </button>
        }
      />

      <div className="flex flex-wrap items-center justify-between gap-2 rounded-md bg-ink-50 px-3 py-2 text-body" data-testid="operator">
        <span>
          Recording as <span className="font-semibold">{who?.name ?? '…'}</span>
          {who ? ` · ${ROLE_LABELS[who.role]}` : ''}
        </span>
        {s.operator ? (
          <button type="button" onClick={() => s.setOperator(null)} className="h-10 rounded-md px-3 ring-1 ring-ink-300">
            End shift here
          </button>
        ) : (
          <span className="text-caption text-ink-500">Shared station? Scan your badge to switch.</span>
        )}
      </div>

      {s.station ? (
        <div className="flex flex-wrap items-center justify-between gap-2 rounded-card bg-ink-900 px-4 py-3 text-white" data-testid="station-mode">
          <span className="text-lead">
            Station <span className="font-mono font-semibold">{s.station.stationCode}</span> · {action?.label}
          </span>
          <button type="button" onClick={() => s.setStation(null)} className="h-10 rounded-md px-3 ring-1 ring-white/60">
            Leave station mode
          </button>
        </div>
      ) : action ? (
        <div className="flex flex-wrap items-center justify-between gap-2 rounded-card bg-ink-900 px-4 py-3 text-white" data-testid="chosen-action">
          <span className="text-lead font-semibold">
            <span aria-hidden className="mr-1.5">{action.glyph}</span>
            {action.label}
          </span>
          <button type="button" onClick={() => s.chooseAction(null)} className="h-10 rounded-md px-3 ring-1 ring-white/60">
            Change action
          </button>
        </div>
      ) : (
        <ActionPicker value={null} onChoose={s.chooseAction} />
      )}

      {action?.safety ? <SafetyNote note={action.safety} /> : null}

      {action?.needsReason ? (
        <label className="flex flex-col gap-1">
          <span className="text-body font-semibold">Reason ({action.label.toLowerCase()}), sent with each scan</span>
          <input value={s.reason} onChange={(e) => s.setReason(e.target.value)} className="h-12 rounded-md border border-ink-300 px-3" aria-label="Reason" />
        </label>
      ) : null}

      {action?.needsContainer ? (
        <div className="flex flex-wrap items-center justify-between gap-2 rounded-md px-3 py-2 ring-2 ring-inset ring-temper-300" data-testid="target-container">
          {s.container ? (
            <>
              <span className="text-lead">
                Into <span className="font-mono font-semibold">{s.container.code}</span>
                {s.container.name ? ` · ${s.container.name}` : ''}
              </span>
              <button type="button" onClick={s.clearContainer} className="h-10 rounded-md px-3 ring-1 ring-ink-300">
                Other container
              </button>
            </>
          ) : (
            <span className="text-lead font-semibold">
              <span aria-hidden>▭ </span>Scan the container first
            </span>
          )}
        </div>
      ) : null}

      {prompt?.kind === 'pin' ? (
        <PinPrompt badge={prompt.badge} holder={prompt.holder} onDone={s.setOperator} onCancel={s.cancelPrompt} />
      ) : prompt?.kind === 'test' ? (
        <TestPrompt code={prompt.code} onAnswer={(fractured) => void s.answerPrompt({ fractured })} onCancel={s.cancelPrompt} />
      ) : prompt?.kind === 'measure' ? (
        <Suspense fallback={<p className="text-body">Opening the measurement …</p>}>
          <MeasureForm code={prompt.code} item={prompt.item} areaPolicy={prompt.areaPolicy} onRecord={(payload) => void s.answerPrompt(payload)} onCancel={s.cancelPrompt} />
        </Suspense>
      ) : (
        <ResultPanel result={s.last} details={s.details} feedbackName={s.last?.feedback} />
      )}

      <CodeEntry onCode={(code) => void s.handleCode(code, 'typed', performance.now())} />

      {camera ? (
        <Suspense fallback={<p className="text-body">Starting the camera …</p>}>
          <CameraScanner onCode={(text, at) => void s.handleCode(text, 'camera', at)} onClose={() => setCamera(false)} />
        </Suspense>
      ) : (
        <button type="button" onClick={() => setCamera(true)} className="h-14 rounded-md text-lead font-semibold ring-2 ring-ink-900">
          <span aria-hidden>◉ </span>Scan with the camera
        </button>
      )}

      <PendingPanel pending={s.pending} report={s.report} online={s.online} syncing={s.syncing} onSync={() => void s.sync()} onDismiss={s.dismissReport} />

      {!s.station ? <StationSetup onSave={s.setStation} /> : null}
    </div>
  );
}

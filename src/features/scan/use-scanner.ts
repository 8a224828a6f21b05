/**
 * The scanner's brain: takes a code from any way in (wedge, camera, typing), checks it, decides
 * what the chosen action needs (a container first, readings, broken or not), records the event
 * (kept on the device while it is sent, so nothing is lost offline) and says what happened.
 */
import { useCallback, useEffect, useRef, useState } from 'react';
import { parseCode, type ParsedCodeOk } from '../../../shared/domain/codes';
import { describeState, type EventType } from '../../../shared/domain/ledger/state-machine';
import type { StationOperatorResponse } from '../../../shared/schemas/scan';
import { kindsFor, scanAction, type ScanAction } from './actions';
import { call } from './api/http';
import type { BadgeView, ItemView, RecordedEvent } from './api/types';
import { signal, type Outcome } from './feedback';
import { keepScan, forgetScan, pendingScans, type QueuedScan } from './queue';
import { result, resultOfAnswer, type ScanResult } from './results';
import { loadOperator, loadStation, newKey, saveOperator, saveStation, type FixedStation, type StationOperator } from './station';
import { inFlight, syncKeptScans, type SyncReport } from './sync';

/** A second scan of the same code within this time is the scanner firing twice: counted once. */
export const DOUBLE_SCAN_MS = 1000;

/** A container the batch is filling. */
export interface TargetContainer {
  code: string;
  name: string | null;
}

/** A question the scanner is waiting on before it can record. */
export type Prompt =
  | { kind: 'measure'; code: string; item: ItemView | null; areaPolicy: string | null }
  | { kind: 'test'; code: string }
  | { kind: 'pin'; badge: string; holder: string | null };

/** Where a code came from. */
export type Source = 'wedge' | 'camera' | 'typed';

function kindWords(kind: string): string {
  return kind === 'half' ? 'a half' : `a ${kind}`;
}

/** Everything the scan screen shows and can do. */
export function useScanner() {
  const [station, setStationState] = useState<FixedStation | null>(() => loadStation());
  const [chosen, setChosen] = useState<EventType | null>(null);
  const [reason, setReason] = useState('');
  const [container, setContainer] = useState<TargetContainer | null>(null);
  const [prompt, setPrompt] = useState<Prompt | null>(null);
  const [last, setLast] = useState<ScanResult | null>(null);
  const [details, setDetails] = useState<ItemView | null>(null);
  const [pending, setPending] = useState<QueuedScan[]>([]);
  const [report, setReport] = useState<SyncReport | null>(null);
  const [syncing, setSyncing] = useState(false);
  const [operator, setOperatorState] = useState<StationOperator | null>(() => loadOperator());
  const [sound, setSound] = useState(true);
  const [online, setOnline] = useState(() => navigator.onLine);
  const lastScan = useRef<{ code: string; at: number } | null>(null);
  // Codes whose scan is still on its way, and those scanned again meanwhile (told with the first's answer).
  const sending = useRef(new Set<string>());
  const doubled = useRef(new Set<string>());

  const actionType = station?.action ?? chosen;
  const action: ScanAction | null = actionType ? (scanAction(actionType) ?? null) : null;

  // Refs give the scan handler the current setup without re-creating the wedge listener.
  const live = useRef({ action, station, container, reason, operator, prompt, sound });
  live.current = { action, station, container, reason, operator, prompt, sound };

  const refreshPending = useCallback(async () => setPending(await pendingScans()), []);

  const show = useCallback((r: ScanResult) => {
    const twice = r.code !== null && doubled.current.delete(r.code);
    const message = twice ? `${r.message} It was scanned twice within a second and counts once.` : r.message;
    setLast({ ...r, message, feedback: signal(r.outcome, live.current.sound) });
  }, []);

  const info = useCallback(
    (outcome: Outcome, title: string, message: string, code: string | null = null, scannedAt: number | null = null) =>
      show(result({ outcome, title, code, message, scannedAt })),
    [show],
  );

  // What the item is (heat, order, where): fetched after the result is on screen, never before.
  const describe = useCallback(async (code: string) => {
    const answer = await call<ItemView>(`/items/${encodeURIComponent(code)}`);
    if (!answer.ok) return;
    let view = answer.body;
    if (view.kind === 'half' && view.half?.specimen) {
      const parent = await call<ItemView>(`/items/${encodeURIComponent(view.half.specimen)}`);
      if (parent.ok && parent.body.specimen) view = { ...view, specimen: parent.body.specimen };
    }
    setDetails(view);
  }, []);

  const operatorToken = () => {
    const current = live.current.operator;
    if (!current) return null;
    const fresh = { ...current, lastActive: Date.now() };
    saveOperator(fresh);
    return fresh;
  };

  /** Records one event: kept on the device, then sent; the answer (or the lack of one) is shown. */
  const record = useCallback(
    async (type: EventType, parsed: ParsedCodeOk, payload: Record<string, unknown>, scannedAt: number | null) => {
      const setup = live.current;
      const op = operatorToken();
      const event = {
        idempotencyKey: newKey(),
        type,
        itemCode: parsed.code,
        occurredAt: new Date().toISOString(),
        payload,
        ...(setup.station ? { stationCode: setup.station.stationCode } : {}),
        ...(setup.action?.needsContainer && setup.container ? { containerCode: setup.container.code } : {}),
      };
      const scan: QueuedScan = { key: event.idempotencyKey, event, operatorToken: op?.token ?? null, operatorName: op?.operator.name ?? null, label: scanAction(type)?.label ?? type };
      // Kept on the device while it is sent: the write is started first and always finishes before
      // the device forgets the scan, or before it says "kept".
      const kept = keepScan(scan);
      const keptResult = () =>
        result({
          outcome: 'kept',
          title: 'Kept on this device',
          code: parsed.code,
          message: `No connection: ${scan.label.toLowerCase()} is saved here and will be sent when the network returns.`,
          scannedAt,
        });
      if (!navigator.onLine) {
        await kept;
        show(keptResult());
        void refreshPending();
        return;
      }
      inFlight.add(scan.key);
      const answer = await call<RecordedEvent>('/events', { json: event, operatorToken: scan.operatorToken });
      if (answer.status === 0) {
        await kept;
        inFlight.delete(scan.key);
        show(keptResult());
        void refreshPending();
        return;
      }
      // The ledger has judged it; the device lets it go once the answer is on screen.
      const forget = () =>
        void kept.then(() => forgetScan(scan.key)).then(() => {
          inFlight.delete(scan.key);
          return refreshPending();
        });
      if (!answer.ok && answer.status === 401 && scan.operatorToken) {
        saveOperator(null);
        setOperatorState(null);
        show(result({ outcome: 'refused', title: 'Badge in again', code: parsed.code, message: `${answer.error.message} Nothing was recorded.`, scannedAt }));
        forget();
        return;
      }
      show(resultOfAnswer(type, parsed.code, parsed.kind === 'badge' ? 'specimen' : parsed.kind, answer, scannedAt));
      forget();
      if (answer.ok || answer.status === 409) void describe(parsed.code);
    },
    [describe, refreshPending, show],
  );

  const openMeasure = useCallback(async (parsed: ParsedCodeOk, scannedAt: number | null) => {
    const answer = await call<ItemView>(`/items/${encodeURIComponent(parsed.code)}`);
    if (!answer.ok && answer.status !== 0) {
      show(result({ outcome: 'refused', title: answer.status === 404 ? 'Unknown code' : 'Refused', code: parsed.code, message: answer.error.message, scannedAt }));
      return;
    }
    const item = answer.ok ? answer.body : null;
    if (item && !item.allowed.includes('measured')) {
      show(
        result({
          outcome: 'refused',
          title: 'Refused',
          code: parsed.code,
          message: `${parsed.code} is ${describeState(item.state)}, so it cannot be measured now. Nothing was recorded.`,
          item: { kind: item.kind, state: item.state },
          next: item.allowed.map((t) => scanAction(t)?.label.toLowerCase() ?? t.replace(/_/g, ' ')),
          scannedAt,
        }),
      );
      setDetails(item);
      return;
    }
    let areaPolicy: string | null = null;
    const order = item?.specimen?.order;
    if (order) {
      const orders = await call<{ items: { number: string; areaPolicy: string }[] }>(`/orders?q=${encodeURIComponent(order)}`);
      if (orders.ok) areaPolicy = orders.body.items.find((o) => o.number === order)?.areaPolicy ?? null;
    }
    if (item) setDetails(item);
    signal('info', live.current.sound);
    setPrompt({ kind: 'measure', code: parsed.code, item, areaPolicy });
  }, [show]);

  /** Handles one scanned or typed code, whatever the way in. */
  const handleCode = useCallback(
    async (raw: string, source: Source, scannedAt: number | null = null) => {
      const parsed = parseCode(raw);
      if (!parsed.ok) {
        const title = parsed.reason === 'check' ? 'Check character wrong' : 'Not a code';
        info('refused', title, `${parsed.message} Nothing was recorded.`, raw.trim().toUpperCase() || null, scannedAt);
        return;
      }
      const now = performance.now();
      const previous = lastScan.current;
      lastScan.current = { code: parsed.code, at: now };
      if (previous && previous.code === parsed.code && now - previous.at < DOUBLE_SCAN_MS && source !== 'typed') {
        if (sending.current.has(parsed.code)) {
          doubled.current.add(parsed.code);
          return;
        }
        info('already', 'Scanned twice', `${parsed.code} was scanned twice within a second; it counts once.`, parsed.code, scannedAt);
        return;
      }

      if (parsed.kind === 'badge') {
        const holder = await call<BadgeView>(`/items/${encodeURIComponent(parsed.code)}`);
        if (!holder.ok && holder.status === 404) {
          info('refused', 'Unknown badge', `${holder.error.message} Ask a lab manager for your badge.`, parsed.code, scannedAt);
          return;
        }
        signal('info', live.current.sound);
        setPrompt({ kind: 'pin', badge: parsed.code, holder: holder.ok ? holder.body.user.name : null });
        return;
      }

      const setup = live.current;
      if (setup.prompt && setup.prompt.kind !== 'pin') {
        // A new item while a question is open: the earlier one is dropped, nothing recorded for it.
        setPrompt(null);
      }
      const current = setup.action;
      if (!current) {
        info('refused', 'Choose an action first', `Pick what you are doing (cut, measure, bin …), then scan ${parsed.code} again.`, parsed.code, scannedAt);
        return;
      }

      if (current.needsContainer && parsed.kind === 'container' && (!setup.container || current.type !== 'moved')) {
        const answer = await call<ItemView>(`/items/${encodeURIComponent(parsed.code)}`);
        if (!answer.ok && answer.status !== 0) {
          info('refused', answer.status === 404 ? 'Unknown container' : 'Refused', answer.error.message, parsed.code, scannedAt);
          return;
        }
        if (answer.ok && answer.body.state !== 'active') {
          info('refused', 'Container not in use', `${parsed.code} is ${describeState(answer.body.state)}; nothing can go into it.`, parsed.code, scannedAt);
          return;
        }
        const name = answer.ok ? (answer.body.container?.name ?? null) : null;
        setContainer({ code: parsed.code, name });
        info('info', 'Container set', `Now scan each piece going into ${name ? `${name} (${parsed.code})` : parsed.code}.`, parsed.code, scannedAt);
        return;
      }
      if (current.needsContainer && !setup.container) {
        info('refused', 'Scan the container first', `${current.label}: scan the bin, bag, box or shelf first, then ${parsed.code}. Nothing was recorded.`, parsed.code, scannedAt);
        return;
      }
      if (!kindsFor(current.type).includes(parsed.kind)) {
        const expected = kindsFor(current.type).map(kindWords).join(' or ');
        info('refused', 'Wrong kind of code', `${parsed.code} is ${kindWords(parsed.kind)}; “${current.label}” needs ${expected}. Nothing was recorded.`, parsed.code, scannedAt);
        return;
      }
      if (current.needsReason && setup.reason.trim() === '') {
        info('refused', 'Reason needed', `Type the reason for “${current.label}” above, then scan ${parsed.code} again. Nothing was recorded.`, parsed.code, scannedAt);
        return;
      }
      if (current.type === 'measured') {
        await openMeasure(parsed, scannedAt);
        return;
      }
      if (current.type === 'tested') {
        signal('info', setup.sound);
        setPrompt({ kind: 'test', code: parsed.code });
        return;
      }
      sending.current.add(parsed.code);
      try {
        await record(current.type, parsed, current.needsReason ? { reason: setup.reason.trim() } : {}, scannedAt);
      } finally {
        sending.current.delete(parsed.code);
      }
    },
    [info, openMeasure, record],
  );

  /** Finishes a measurement or a test prompt with its payload. */
  const answerPrompt = useCallback(
    async (payload: Record<string, unknown>) => {
      const open = live.current.prompt;
      const current = live.current.action;
      if (!open || open.kind === 'pin' || !current) return;
      const parsed = parseCode(open.code);
      if (!parsed.ok) return;
      setPrompt(null);
      await record(current.type, parsed, payload, null);
    },
    [record],
  );

  const sync = useCallback(async () => {
    setSyncing(true);
    try {
      const r = await syncKeptScans();
      setReport(r);
      if (r.sent > 0 || r.problem) {
        const outcome = r.refused.length > 0 || r.problem ? 'refused' : 'accepted';
        const title = r.sent > 0 ? 'Synced' : 'Not synced';
        const summary = `${r.recorded} recorded, ${r.replayed} already there, ${r.refused.length} refused${r.stillKept > 0 ? `, ${r.stillKept} still waiting` : ''}. See the sync report below.`;
        show(result({ outcome, title, code: null, message: summary }));
      }
    } finally {
      setSyncing(false);
      await refreshPending();
    }
  }, [refreshPending, show]);

  useEffect(() => {
    void refreshPending().then(async () => {
      if (navigator.onLine && (await pendingScans()).length > 0) void sync();
    });
    const goOnline = () => {
      setOnline(true);
      void sync();
    };
    const goOffline = () => setOnline(false);
    window.addEventListener('online', goOnline);
    window.addEventListener('offline', goOffline);
    return () => {
      window.removeEventListener('online', goOnline);
      window.removeEventListener('offline', goOffline);
    };
  }, [refreshPending, sync]);

  const setOperator = useCallback((answer: StationOperatorResponse | null) => {
    const next = answer ? { ...answer, lastActive: Date.now() } : null;
    saveOperator(next);
    setOperatorState(next);
    setPrompt(null);
    if (answer) info('accepted', 'Operator switched', `Scans here are now recorded as ${answer.operator.name}.`);
  }, [info]);

  const setStation = useCallback((next: FixedStation | null) => {
    saveStation(next);
    setStationState(next);
    setContainer(null);
    setPrompt(null);
  }, []);

  const chooseAction = useCallback((type: EventType | null) => {
    setChosen(type);
    setContainer(null);
    setPrompt(null);
    setReason('');
  }, []);

  return {
    action,
    station,
    setStation,
    chooseAction,
    reason,
    setReason,
    container,
    clearContainer: () => setContainer(null),
    prompt,
    cancelPrompt: () => setPrompt(null),
    answerPrompt,
    handleCode,
    last,
    details: last?.code && details?.code === last.code ? details : null,
    pending,
    report,
    dismissReport: () => setReport(null),
    sync,
    syncing,
    online,
    operator,
    setOperator,
    sound,
    setSound,
  };
}

/** What useScanner gives the screen. */
export type Scanner = ReturnType<typeof useScanner>;

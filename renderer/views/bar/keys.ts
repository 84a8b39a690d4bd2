// Single-letter keys for the monitor, away from the browser's own shortcuts (none needs a
// modifier), shown beside each control. One table, read by the controls and the handler.
import { clampVolumeDb } from '../../audio/engine';
import type { MonitorChoice } from '../../audio/worklet/messages';
import type { DrawerName, Store } from '../../settings/store';

export type KeyAction =
  | { kind: 'monitor'; choice: MonitorChoice }
  | { kind: 'new-draw' }
  | { kind: 'mute' }
  | { kind: 'volume'; stepDb: number }
  | { kind: 'drawer'; drawer: DrawerName };

export interface KeyBinding {
  key: string;
  what: string;
  action: KeyAction;
}

/** Volume step of the - and = keys, dB (common practice, no source). */
export const VOLUME_STEP_DB = 3;

export const KEYS: readonly KeyBinding[] = [
  { key: 'r', what: 'Ref', action: { kind: 'monitor', choice: 'ref' } },
  { key: 'a', what: 'A', action: { kind: 'monitor', choice: 'a' } },
  { key: 'b', what: 'B', action: { kind: 'monitor', choice: 'b' } },
  { key: 'h', what: 'Hidden', action: { kind: 'monitor', choice: 'hidden' } },
  { key: 'e', what: 'Error', action: { kind: 'monitor', choice: 'error' } },
  { key: 'n', what: 'New Hidden draw', action: { kind: 'new-draw' } },
  { key: 'm', what: 'Mute / unmute', action: { kind: 'mute' } },
  { key: '-', what: `Volume −${VOLUME_STEP_DB} dB`, action: { kind: 'volume', stepDb: -VOLUME_STEP_DB } },
  { key: '=', what: `Volume +${VOLUME_STEP_DB} dB`, action: { kind: 'volume', stepDb: VOLUME_STEP_DB } },
  { key: 'c', what: 'Channels', action: { kind: 'drawer', drawer: 'channels' } },
  { key: 'i', what: 'Input and level', action: { kind: 'drawer', drawer: 'input' } },
];

export const keyOf = (pred: (a: KeyAction) => boolean): string =>
  (KEYS.find((k) => pred(k.action))?.key ?? '').toUpperCase();

/** Inputs that take typed text keep their keys; a slider or a button does not need ours. */
const TEXT_INPUTS = new Set(['text', 'number', 'search', 'email', 'url', 'tel', 'password']);
const typing = (t: EventTarget | null) =>
  (t instanceof HTMLInputElement && TEXT_INPUTS.has(t.type)) ||
  t instanceof HTMLSelectElement ||
  t instanceof HTMLTextAreaElement;

export function run(action: KeyAction, store: Store): void {
  const { engine } = store;
  const s = store.audio;
  switch (action.kind) {
    case 'monitor':
      engine.setMonitor(action.choice);
      return;
    case 'new-draw':
      engine.newDraw();
      return;
    case 'mute':
      if (s.running) engine.setMuted(!s.muted);
      return;
    case 'volume':
      if (s.running) engine.setVolumeDb(clampVolumeDb(s.volumeDb + action.stepDb));
      return;
    case 'drawer':
      store.setPage({ drawer: store.page.drawer === action.drawer ? 'none' : action.drawer });
      return;
  }
}

export function listenForKeys(store: Store): void {
  document.addEventListener('keydown', (e) => {
    if (e.key === 'Escape' && store.page.drawer !== 'none') {
      store.setPage({ drawer: 'none' });
      return;
    }
    if (e.ctrlKey || e.metaKey || e.altKey || typing(e.target)) return;
    const k = KEYS.find((x) => x.key === e.key.toLowerCase());
    if (!k) return;
    run(k.action, store);
    e.preventDefault();
  });
}

// The listening bar above the charts: monitor selector and output controls with our
// own keyboard shortcuts, shown beside each control, and the caution by the volume.
import {
  clampVolumeDb,
  OUTPUT_CAP_DB,
  OUTPUT_MIN_DB,
  type AudioEngine,
  type EngineState,
} from '../../audio/engine';
import type { MonitorChoice } from '../../audio/worklet/messages';
import { h } from '../../dom';

/** Keys: single letters away from the browser's own shortcuts (none needs a modifier). */
export const LISTEN_KEYS: readonly { key: string; what: string; choice?: MonitorChoice }[] = [
  { key: 'r', what: 'Ref', choice: 'ref' },
  { key: 'a', what: 'A', choice: 'a' },
  { key: 'b', what: 'B', choice: 'b' },
  { key: 'h', what: 'Hidden', choice: 'hidden' },
  { key: 'e', what: 'Error', choice: 'error' },
  { key: 'm', what: 'Mute / unmute' },
  { key: '-', what: 'Volume −3 dB' },
  { key: '=', what: 'Volume +3 dB' },
];

const typing = (t: EventTarget | null) =>
  t instanceof HTMLInputElement || t instanceof HTMLSelectElement || t instanceof HTMLTextAreaElement;

export function listenBar(engine: AudioEngine): HTMLElement {
  const buttons = LISTEN_KEYS.filter((k) => k.choice).map((k) =>
    h(
      'button',
      {
        type: 'button',
        class: 'monitor',
        'data-listen': k.choice,
        'aria-keyshortcuts': k.key.toUpperCase(),
        title: `Listen to ${k.what} (${k.key.toUpperCase()})`,
      },
      k.what,
      h('kbd', {}, k.key.toUpperCase()),
    ),
  );
  const mute = h(
    'button',
    { type: 'button', 'data-testid': 'listen-mute', 'aria-keyshortcuts': 'M' },
    'Unmute',
    h('kbd', {}, 'M'),
  );
  const volume = h('input', {
    type: 'range',
    min: OUTPUT_MIN_DB,
    max: OUTPUT_CAP_DB,
    step: 1,
    'data-testid': 'listen-volume',
    'aria-label': 'Monitor volume (dB), keys - and =',
  });
  const volText = h('span', { class: 'num' }, '');
  const caution = h(
    'span',
    { class: 'caution-line', role: 'note' },
    'Start low; headphones near a live microphone. Capped at −12 dB.',
  );
  const show = (s: EngineState) => {
    for (const b of buttons) b.setAttribute('aria-pressed', String(b.dataset.listen === s.monitor));
    mute.firstChild!.textContent = s.muted ? 'Unmute' : 'Mute';
    mute.disabled = !s.running;
    volume.disabled = !s.running;
    volume.value = String(s.volumeDb);
    volText.textContent = `${s.volumeDb} dB`;
  };
  engine.onChange(show);
  show(engine.state());
  for (const b of buttons)
    b.addEventListener('click', () => engine.setMonitor(b.dataset.listen as MonitorChoice));
  mute.addEventListener('click', () => engine.setMuted(!engine.state().muted));
  volume.addEventListener('input', () => engine.setVolumeDb(clampVolumeDb(Number(volume.value))));
  document.addEventListener('keydown', (e) => {
    if (e.ctrlKey || e.metaKey || e.altKey || typing(e.target)) return;
    const k = LISTEN_KEYS.find((x) => x.key === e.key.toLowerCase());
    if (!k) return;
    const s = engine.state();
    if (k.choice) engine.setMonitor(k.choice);
    else if (k.key === 'm') {
      if (s.running) engine.setMuted(!s.muted);
    } else if (s.running) engine.setVolumeDb(clampVolumeDb(s.volumeDb + (k.key === '=' ? 3 : -3)));
    e.preventDefault();
  });
  return h(
    'div',
    { class: 'listen-bar', 'data-testid': 'listen-bar', role: 'toolbar', 'aria-label': 'Monitor and output' },
    h('span', { class: 'bar-label' }, 'Listen'),
    ...buttons,
    mute,
    h('label', { class: 'field' }, h('span', {}, 'Volume'), volume, h('kbd', {}, '−'), h('kbd', {}, '=')),
    volText,
    caution,
  );
}

// The bar that stays on top: engine, source, monitor selector with the Hidden draw,
// mute and volume with the caution beside them, and the output meter (peak and limiter
// reduction, both measured on the audio thread). Every control renders from the store.
import { OUTPUT_CAP_DB, OUTPUT_MIN_DB, clampVolumeDb, type SourceKind } from '../../audio/engine';
import { SOURCE_KINDS } from '../../audio/sources';
import {
  MONITOR_CHOICES,
  OUTPUT_CEILING_DBFS,
  type ChannelSlot,
  type MonitorChoice,
} from '../../audio/worklet/messages';
import { h } from '../../dom';
import type { Store } from '../../settings/store';
import type { FrameClock } from '../frame-clock';
import { keyOf, run } from './keys';

export const SOURCE_LABELS: Record<SourceKind, string> = {
  demo: 'Demo talker',
  microphone: 'Microphone',
  file: 'Audio file',
  tone: 'Test tone',
  noise: 'Gaussian noise',
  sweep: 'Level sweep',
};

const MONITOR_LABELS: Record<MonitorChoice, string> = {
  ref: 'Ref',
  a: 'A',
  b: 'B',
  hidden: 'Hidden',
  error: 'Error',
};

const MONITOR_TITLES: Record<MonitorChoice, string> = {
  ref: 'Listen to the Reference: the voice band with no quantizer',
  a: 'Listen to channel A',
  b: 'Listen to channel B',
  hidden: 'Listen blind: A or B by the current draw, told only on Reveal',
  error: 'Listen to the quantization error alone',
};

const kbd = (k: string) => (k ? h('kbd', {}, k) : null);

export interface SourceActions {
  /** Opens the file picker of the Input drawer. */
  pickFile(): void;
}

export interface TransportGroups {
  engine: HTMLElement;
  source: HTMLElement;
  monitor: HTMLElement;
  hidden: HTMLElement;
  output: HTMLElement;
  meter: HTMLElement;
}

export function transportBar(store: Store, clock: FrameClock, actions: SourceActions): TransportGroups {
  const { engine } = store;
  // Engine
  const start = h(
    'button',
    { type: 'button', class: 'primary', 'data-testid': 'engine-start' },
    'Start audio',
  );
  const engineState = h('span', { class: 'engine-state', 'data-testid': 'engine-state' }, 'stopped');
  start.addEventListener('click', () => {
    if (store.audio.running) void engine.stop();
    else void engine.start();
  });

  // Source
  const sourceKind = h(
    'select',
    { 'data-testid': 'source-kind', 'aria-label': 'Source' },
    ...SOURCE_KINDS.map((k) => h('option', { value: k }, SOURCE_LABELS[k])),
  );
  const sourceLabel = h('span', { class: 'source-label', 'data-testid': 'source-label' }, '');
  const inputButton = h(
    'button',
    {
      type: 'button',
      'data-testid': 'open-input',
      'aria-keyshortcuts': keyOf((a) => a.kind === 'drawer' && a.drawer === 'input'),
    },
    'Input…',
    kbd(keyOf((a) => a.kind === 'drawer' && a.drawer === 'input')),
  );
  inputButton.addEventListener('click', () => run({ kind: 'drawer', drawer: 'input' }, store));
  sourceKind.addEventListener('change', () => {
    const kind = sourceKind.value as SourceKind;
    if (kind === 'microphone') void engine.useMicrophone(store.audio.source.deviceId ?? undefined);
    else if (kind === 'file') {
      actions.pickFile();
      sourceKind.value = store.audio.source.kind;
    } else void engine.useBuiltIn(kind, store.audio.testSignal);
  });

  // Monitor
  const monitorButtons = MONITOR_CHOICES.map((c) => {
    const key = keyOf((a) => a.kind === 'monitor' && a.choice === c);
    const b = h(
      'button',
      {
        type: 'button',
        class: 'monitor',
        'data-testid': `monitor-${c}`,
        'data-choice': c,
        'aria-keyshortcuts': key,
        title: `${MONITOR_TITLES[c]} (${key})`,
      },
      MONITOR_LABELS[c],
      kbd(key),
    );
    b.addEventListener('click', () => engine.setMonitor(c));
    return b;
  });
  const monitorState = h(
    'span',
    { class: 'monitor-state quiet', 'data-testid': 'monitor-state', role: 'status' },
    '',
  );
  const errorOf = h(
    'select',
    {
      'data-testid': 'error-of',
      'aria-label': 'Error of channel',
      title: 'Whose quantization error Error plays',
    },
    h('option', { value: 'a' }, 'of A'),
    h('option', { value: 'b' }, 'of B'),
  );
  errorOf.addEventListener('change', () => engine.setErrorOf(errorOf.value as ChannelSlot));
  const errorGain = h('input', {
    type: 'number',
    step: 1,
    min: -40,
    max: 40,
    'data-testid': 'error-gain',
    'aria-label': 'Error gain (dB)',
    title: 'Gain on the error alone, dB (the volume cap still holds)',
    size: 3,
  });
  errorGain.addEventListener('change', () => engine.setErrorGainDb(Number(errorGain.value)));
  const newDrawKey = keyOf((a) => a.kind === 'new-draw');
  const newDraw = h(
    'button',
    {
      type: 'button',
      'data-testid': 'hidden-new-draw',
      'aria-keyshortcuts': newDrawKey,
      title: `New Hidden draw (${newDrawKey})`,
    },
    'New draw',
    kbd(newDrawKey),
  );
  newDraw.addEventListener('click', () => engine.newDraw());
  const reveal = h(
    'button',
    { type: 'button', 'data-testid': 'hidden-reveal', title: 'Tell which channel this draw hides' },
    'Reveal',
  );
  reveal.addEventListener('click', () => engine.reveal());
  const drawNumber = h('span', { class: 'num', 'data-testid': 'hidden-draw' }, '');
  const hiddenAnswer = h(
    'span',
    { class: 'hidden-answer', 'data-testid': 'hidden-answer', role: 'status' },
    '',
  );

  // Output
  const outputState = h(
    'span',
    { class: 'output-state', 'data-testid': 'output-state', 'data-muted': 'true' },
    'Output muted',
  );
  const muteKey = keyOf((a) => a.kind === 'mute');
  const toggle = h(
    'button',
    { type: 'button', 'data-testid': 'output-toggle', 'aria-keyshortcuts': muteKey, disabled: true },
    'Unmute',
  );
  const toggleLabel = document.createTextNode('Unmute');
  toggle.replaceChildren(toggleLabel, kbd(muteKey) ?? '');
  toggle.addEventListener('click', () => engine.setMuted(!store.audio.muted));
  const volume = h('input', {
    type: 'range',
    min: OUTPUT_MIN_DB,
    max: OUTPUT_CAP_DB,
    step: 1,
    'data-testid': 'output-volume',
    'aria-label': 'Monitor volume (dB), keys - and =',
    disabled: true,
  });
  volume.addEventListener('input', () => engine.setVolumeDb(clampVolumeDb(Number(volume.value))));
  const volumeText = h('span', { class: 'num', 'data-testid': 'output-volume-text' }, '');
  const caution = h(
    'span',
    { class: 'caution-short', role: 'note', 'data-testid': 'volume-caution' },
    'Start low · headphones with a live mic',
  );
  const peakBar = h('span', { class: 'meter-fill' });
  const peakText = h('span', { class: 'num', 'data-testid': 'output-peak' }, '');
  const limiterText = h('span', { class: 'num', 'data-testid': 'output-limiter' }, '');
  const outMeter = h(
    'span',
    {
      class: 'out-meter',
      'data-testid': 'output-meter',
      title: `Output peak before the ${OUTPUT_CEILING_DBFS} dBFS ceiling, and how far the limiter pulled it down`,
    },
    h('span', { class: 'meter-track' }, peakBar),
    peakText,
    h('span', {}, ' · lim '),
    limiterText,
  );

  const show = () => {
    const s = store.audio;
    start.textContent = s.running ? 'Stop audio' : s.phase === 'starting' ? 'Starting…' : 'Start audio';
    start.disabled = s.phase === 'starting';
    start.setAttribute('aria-pressed', String(s.running));
    engineState.textContent = s.running
      ? s.phase === 'running'
        ? `${(s.sampleRate ?? 0) / 1000} kHz`
        : s.phase
      : s.phase;
    engineState.dataset.running = String(s.running);
    engineState.dataset.phase = s.phase;
    if (sourceKind.value !== s.source.kind) sourceKind.value = s.source.kind;
    sourceLabel.textContent = s.source.label;
    sourceLabel.title = s.source.label;
    // The demo talker and the test signals are named by the source list itself.
    sourceLabel.hidden = s.source.kind !== 'microphone' && s.source.kind !== 'file';
    for (const b of monitorButtons) b.setAttribute('aria-pressed', String(b.dataset.choice === s.monitor));
    monitorState.textContent = // read by screen readers; the pressed button shows it on screen
      s.monitor === 'error'
        ? `Error of ${s.errorOf.toUpperCase()}`
        : `Listening: ${MONITOR_LABELS[s.monitor]}`;
    monitorState.dataset.choice = s.monitor;
    errorOf.value = s.errorOf;
    if (document.activeElement !== errorGain) errorGain.value = String(s.errorGainDb);
    drawNumber.textContent = `draw ${s.hidden.draw}`;
    const r = s.hidden.revealed;
    hiddenAnswer.textContent = r ? `Hidden is ${r.slot.toUpperCase()} (draw ${r.draw}, seed ${r.seed})` : '';
    reveal.disabled = !s.running || r !== null;
    newDraw.disabled = !s.running;
    outputState.textContent = s.muted ? 'Output muted' : 'Output live';
    outputState.dataset.muted = String(s.muted);
    toggleLabel.textContent = s.muted ? 'Unmute' : 'Mute';
    toggle.disabled = !s.running;
    volume.disabled = !s.running;
    volume.value = String(s.volumeDb);
    volumeText.textContent = `${s.volumeDb} dB (max ${OUTPUT_CAP_DB})`;
  };
  store.subscribe(show);
  show();

  // The output meter follows the snapshots, drawn by the frame clock.
  let peak = 0;
  let limiterDb = 0;
  const meter = {
    el: outMeter,
    draw: () => {
      const dbfs = peak > 0 ? 20 * Math.log10(peak) : null;
      peakText.textContent = dbfs === null ? 'silent' : `${dbfs.toFixed(1)} dBFS`;
      limiterText.textContent = `${limiterDb.toFixed(1)} dB`;
      outMeter.dataset.limiting = String(limiterDb < -0.05);
      // 60 dB of meter below full scale (common practice, no source).
      const pct = dbfs === null ? 0 : Math.max(0, Math.min(100, ((dbfs + 60) / 60) * 100));
      peakBar.style.width = `${pct.toFixed(1)}%`;
    },
  };
  const drawing = clock.add(meter, 80);
  engine.subscribe((e) => {
    peak = e.outputPeak;
    limiterDb = Number.isFinite(e.limiterDb) ? e.limiterDb : 0;
    drawing.invalidate();
  });

  return {
    engine: h('div', { class: 'group' }, start, engineState),
    source: h('div', { class: 'group' }, sourceKind, sourceLabel, inputButton),
    monitor: h(
      'div',
      { class: 'group monitor-group', role: 'group', 'aria-label': 'Monitor' },
      ...monitorButtons,
      errorOf,
      errorGain,
      monitorState,
    ),
    hidden: h(
      'div',
      { class: 'group', role: 'group', 'aria-label': 'Hidden draw' },
      newDraw,
      drawNumber,
      reveal,
      hiddenAnswer,
    ),
    output: h(
      'div',
      { class: 'group output-group', role: 'group', 'aria-label': 'Output' },
      toggle,
      outputState,
      volume,
      volumeText,
      caution,
    ),
    meter: outMeter,
  };
}

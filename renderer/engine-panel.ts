// The live engine's controls and readouts, plainly laid out (the views issue brings
// the charts). Every control and message has a stable data-testid.
import { h } from './dom';
import {
  ALIGN_TARGET_DBOV,
  AudioEngine,
  OUTPUT_CAP_DB,
  OUTPUT_MIN_DB,
  clampVolumeDb,
  type EngineState,
  type SourceKind,
} from './audio/engine';
import { MONITOR_CHOICES, type ChannelSlot, type MonitorChoice } from './audio/worklet/messages';
import { SOURCE_KINDS } from './audio/sources';
import { PAGE_PRESETS } from './presets';

const fmt = (v: number | null, digits: number, unit: string) =>
  v === null ? '—' : `${v.toFixed(digits)} ${unit}`;

const SOURCE_LABELS: Record<SourceKind, string> = {
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

function labelled(text: string, control: HTMLElement): HTMLLabelElement {
  return h('label', { class: 'field' }, h('span', {}, text), control);
}

function readout(testId: string, label: string): [HTMLElement, HTMLElement] {
  const value = h('span', { class: 'num', 'data-testid': testId }, '—');
  return [h('div', { class: 'readout' }, h('span', { class: 'readout-label' }, label), value), value];
}

export function enginePanel(engine: AudioEngine): HTMLElement {
  // Engine and faults
  const start = h('button', { type: 'button', 'data-testid': 'engine-start' }, 'Start audio');
  const engineState = h('span', { class: 'engine-state', 'data-testid': 'engine-state' }, 'engine stopped');
  const faultBox = h('p', { class: 'fault', role: 'alert', 'data-testid': 'engine-fault', hidden: true });
  const resume = h('button', { type: 'button', 'data-testid': 'engine-resume', hidden: true }, 'Resume');
  const notice = h('p', { class: 'hint', 'data-testid': 'engine-notice' });

  // Source
  const sourceKind = h(
    'select',
    { 'data-testid': 'source-kind', 'aria-label': 'Source' },
    ...SOURCE_KINDS.map((k) => h('option', { value: k }, SOURCE_LABELS[k])),
  );
  const device = h(
    'select',
    { 'data-testid': 'source-device', 'aria-label': 'Input device' },
    h('option', { value: '' }, 'default input'),
  );
  const inputChannel = h(
    'select',
    { 'data-testid': 'source-channel', 'aria-label': 'Input channel' },
    h('option', { value: '0' }, '1'),
  );
  const fileInput = h('input', {
    type: 'file',
    accept: 'audio/*,.wav',
    'data-testid': 'source-file',
    'aria-label': 'Audio file',
  });
  const drop = h('div', { class: 'drop', 'data-testid': 'source-drop' }, 'Drop an audio file here');
  const toneDbm0 = h('input', {
    type: 'number',
    step: 1,
    min: -60,
    max: 3,
    value: -10,
    'data-testid': 'tone-dbm0',
  });
  const toneHz = h('input', {
    type: 'number',
    step: 1,
    min: 50,
    max: 3900,
    value: 1020,
    'data-testid': 'tone-hz',
  });
  const sourceLabel = h('span', { 'data-testid': 'source-label' }, '—');

  // Channels
  const channelA = h('input', {
    type: 'text',
    value: 'g711-mu',
    list: 'channel-presets',
    'data-testid': 'channel-a',
    'aria-label': 'Channel A',
  });
  const channelB = h('input', {
    type: 'text',
    value: 'g711-a',
    list: 'channel-presets',
    'data-testid': 'channel-b',
    'aria-label': 'Channel B',
  });
  const presets = h(
    'datalist',
    { id: 'channel-presets' },
    ...PAGE_PRESETS.map((p) => h('option', { value: p })),
  );
  const apply = h('button', { type: 'button', 'data-testid': 'channels-apply' }, 'Apply channels');
  const channelsNow = h('span', { 'data-testid': 'channels-state' }, '—');

  // Monitor
  const monitorButtons = MONITOR_CHOICES.map((c) =>
    h(
      'button',
      { type: 'button', class: 'monitor', 'data-testid': `monitor-${c}`, 'data-choice': c },
      MONITOR_LABELS[c],
    ),
  );
  const monitorState = h('span', { 'data-testid': 'monitor-state' }, '—');
  const errorOf = h(
    'select',
    { 'data-testid': 'error-of', 'aria-label': 'Error of' },
    h('option', { value: 'a' }, 'A'),
    h('option', { value: 'b' }, 'B'),
  );
  const errorGain = h('input', {
    type: 'number',
    step: 1,
    min: -40,
    max: 40,
    value: 0,
    'data-testid': 'error-gain',
  });
  const reveal = h('button', { type: 'button', 'data-testid': 'hidden-reveal' }, 'Reveal Hidden');
  const hiddenAnswer = h('span', { 'data-testid': 'hidden-answer' }, '');

  // Output
  const outputState = h(
    'span',
    { class: 'output-state', 'data-testid': 'output-state', 'data-muted': 'true' },
    'Output muted',
  );
  const toggle = h('button', { type: 'button', 'data-testid': 'output-toggle', disabled: true }, 'Unmute');
  const volume = h('input', {
    type: 'range',
    min: OUTPUT_MIN_DB,
    max: OUTPUT_CAP_DB,
    step: 1,
    'data-testid': 'output-volume',
    'aria-label': 'Monitor volume (dB)',
    disabled: true,
  });
  const volumeText = h('span', { 'data-testid': 'output-volume-text' });
  const howl = h('p', { class: 'fault', role: 'alert', 'data-testid': 'howl-warning', hidden: true });

  // Gain, alignment, calibration
  const gain = h('input', {
    type: 'number',
    step: 0.5,
    min: -60,
    max: 60,
    value: 0,
    'data-testid': 'input-gain',
    'aria-label': 'Input gain (dB)',
  });
  const alignTarget = h('input', {
    type: 'number',
    step: 1,
    min: -60,
    max: 0,
    value: ALIGN_TARGET_DBOV,
    'data-testid': 'align-target',
  });
  const align = h(
    'button',
    { type: 'button', 'data-testid': 'align-button' },
    'Align active level to target',
  );
  const calibKnown = h('input', {
    type: 'number',
    step: 0.1,
    value: -10,
    'data-testid': 'calib-known',
    'aria-label': 'Known tone level (dBm0)',
  });
  const calibrate = h('button', { type: 'button', 'data-testid': 'calib-button' }, 'Calibrate with tone');

  const [rActiveDbov, vActiveDbov] = readout('readout-active-dbov', 'Active level (A)');
  const [rActiveDbm0, vActiveDbm0] = readout('readout-active-dbm0', 'Active level (A)');
  const [rSnrA, vSnrA] = readout('readout-snr-a', 'SNR A');
  const [rSnrB, vSnrB] = readout('readout-snr-b', 'SNR B');
  const [rLatency, vLatency] = readout('readout-latency', 'Latency');
  const [rInput, vInput] = readout('readout-input-level', 'Input level');
  const [rOffset, vOffset] = readout('calib-offset', 'Calibration offset');

  let devicesListed = false;
  const listDevices = async () => {
    const inputs = await engine.listInputs();
    device.replaceChildren(
      h('option', { value: '' }, 'default input'),
      ...inputs.map((d) => h('option', { value: d.deviceId }, d.label)),
    );
    devicesListed = true;
  };

  const show = (s: EngineState) => {
    engineState.textContent = s.running
      ? `${s.phase} at ${s.sampleRate} Hz: A ${s.channels.a}, B ${s.channels.b}`
      : s.phase === 'starting'
        ? 'starting…'
        : 'engine stopped';
    engineState.dataset.running = String(s.running);
    engineState.dataset.phase = s.phase;
    start.disabled = s.running || s.phase === 'starting';
    faultBox.hidden = s.fault === null;
    faultBox.textContent = s.fault?.message ?? '';
    faultBox.dataset.code = s.fault?.code ?? '';
    resume.hidden = s.fault?.code !== 'context-suspended';
    notice.textContent = s.notice ?? '';
    sourceKind.value = s.source.kind;
    sourceLabel.textContent = s.source.label;
    inputChannel.replaceChildren(
      ...Array.from({ length: Math.max(1, s.source.channelCount) }, (_, i) =>
        h('option', { value: i }, String(i + 1)),
      ),
    );
    inputChannel.value = String(s.source.inputChannel);
    channelsNow.textContent = `A ${s.channels.a} · B ${s.channels.b}`;
    for (const b of monitorButtons) b.setAttribute('aria-pressed', String(b.dataset.choice === s.monitor));
    monitorState.textContent =
      MONITOR_LABELS[s.monitor] + (s.monitor === 'error' ? ` of ${s.errorOf.toUpperCase()}` : '');
    monitorState.dataset.choice = s.monitor;
    hiddenAnswer.textContent =
      s.monitor === 'hidden' && s.hiddenRevealed ? `Hidden is ${s.hiddenRevealed.toUpperCase()}` : '';
    outputState.textContent = s.muted ? 'Output muted' : 'Output live';
    outputState.dataset.muted = String(s.muted);
    toggle.textContent = s.muted ? 'Unmute' : 'Mute';
    toggle.disabled = !s.running;
    volume.disabled = !s.running;
    volume.value = String(s.volumeDb);
    volumeText.textContent = `${s.volumeDb} dB (cap ${OUTPUT_CAP_DB} dB, ceiling -1 dBFS)`;
    howl.hidden = !s.howl.howling;
    howl.textContent = s.howl.howling
      ? `Feedback howl${s.howl.frequencyHz === null ? '' : ` near ${s.howl.frequencyHz.toFixed(0)} Hz`}: mute, or use headphones.`
      : '';
    if (document.activeElement !== gain) gain.value = String(Math.round(s.inputGainDb * 100) / 100);
    vActiveDbov.textContent = fmt(s.alignment.activeDbov, 1, 'dBov');
    vActiveDbm0.textContent = fmt(s.alignment.activeDbm0, 1, 'dBm0');
    vSnrA.textContent = fmt(s.snr.a, 1, 'dB');
    vSnrB.textContent = fmt(s.snr.b, 1, 'dB');
    vLatency.textContent = `path ${fmt(s.latency.pathMs, 2, 'ms')} · base ${fmt(s.latency.baseMs, 1, 'ms')} · output ${fmt(s.latency.outputMs, 1, 'ms')}`;
    vInput.textContent =
      `${fmt(s.calibration.inputDbfs, 1, 'dBFS')}` +
      (s.calibration.inputDbm0 === null ? '' : ` · ${fmt(s.calibration.inputDbm0, 1, 'dBm0')}`);
    vOffset.textContent =
      s.calibration.offsetDb === null ? 'not calibrated' : `${s.calibration.offsetDb.toFixed(2)} dB`;
  };
  engine.onChange(show);
  show(engine.state());

  start.addEventListener('click', () => void engine.start());
  resume.addEventListener('click', () => void engine.resume());
  const chooseSource = async () => {
    const kind = sourceKind.value as SourceKind;
    if (kind === 'microphone') {
      const ok = await engine.useMicrophone(device.value || undefined);
      if (ok && !devicesListed) await listDevices();
    } else if (kind === 'file') fileInput.click();
    else await engine.useBuiltIn(kind, { dbm0: Number(toneDbm0.value), frequencyHz: Number(toneHz.value) });
  };
  sourceKind.addEventListener('change', () => void chooseSource());
  device.addEventListener('change', () => void engine.useMicrophone(device.value || undefined));
  inputChannel.addEventListener('change', () => engine.setInputChannel(Number(inputChannel.value)));
  fileInput.addEventListener('change', () => {
    const f = fileInput.files?.[0];
    if (f) void engine.useFile(f, f.name);
  });
  drop.addEventListener('dragover', (e) => {
    e.preventDefault();
    drop.classList.add('over');
  });
  drop.addEventListener('dragleave', () => drop.classList.remove('over'));
  drop.addEventListener('drop', (e) => {
    e.preventDefault();
    drop.classList.remove('over');
    const f = e.dataTransfer?.files[0];
    if (f) void engine.useFile(f, f.name);
  });
  const retune = () =>
    void engine.setTestSignal({ dbm0: Number(toneDbm0.value), frequencyHz: Number(toneHz.value) });
  toneDbm0.addEventListener('change', retune);
  toneHz.addEventListener('change', retune);
  apply.addEventListener('click', () => engine.setChannels(channelA.value, channelB.value));
  for (const b of monitorButtons)
    b.addEventListener('click', () => engine.setMonitor(b.dataset.choice as MonitorChoice));
  errorOf.addEventListener('change', () => engine.setErrorOf(errorOf.value as ChannelSlot));
  errorGain.addEventListener('change', () => engine.setErrorGainDb(Number(errorGain.value)));
  reveal.addEventListener('click', () => engine.reveal());
  toggle.addEventListener('click', () => engine.setMuted(!engine.state().muted));
  volume.addEventListener('input', () => engine.setVolumeDb(clampVolumeDb(Number(volume.value))));
  gain.addEventListener('change', () => engine.setInputGainDb(Number(gain.value)));
  align.addEventListener('click', () => engine.alignToTarget(Number(alignTarget.value)));
  calibrate.addEventListener('click', () => engine.calibrate(Number(calibKnown.value)));

  return h(
    'section',
    { class: 'panel', 'data-testid': 'engine-panel' },
    h('h2', {}, 'Live engine'),
    h('div', { class: 'output-row' }, start, engineState, resume),
    faultBox,
    howl,
    notice,
    h('h3', {}, 'Source'),
    h(
      'div',
      { class: 'output-row' },
      labelled('Source', sourceKind),
      sourceLabel,
      labelled('Device', device),
      labelled('Input channel', inputChannel),
    ),
    h('div', { class: 'output-row' }, fileInput, drop),
    h(
      'div',
      { class: 'output-row' },
      labelled('Test level (dBm0)', toneDbm0),
      labelled('Test frequency (Hz)', toneHz),
    ),
    h('h3', {}, 'Channels'),
    h(
      'div',
      { class: 'output-row' },
      labelled('A', channelA),
      labelled('B', channelB),
      presets,
      apply,
      channelsNow,
    ),
    h('h3', {}, 'Monitor'),
    h('div', { class: 'output-row' }, ...monitorButtons, monitorState),
    h(
      'div',
      { class: 'output-row' },
      labelled('Error of', errorOf),
      labelled('Error gain (dB)', errorGain),
      reveal,
      hiddenAnswer,
    ),
    h('h3', {}, 'Output'),
    h('div', { class: 'output-row' }, outputState, toggle, volume, volumeText),
    h('h3', {}, 'Level'),
    h(
      'div',
      { class: 'output-row' },
      labelled('Input gain (dB)', gain),
      labelled('Target (dBov)', alignTarget),
      align,
    ),
    h('div', { class: 'output-row' }, labelled('Known tone (dBm0)', calibKnown), calibrate),
    h('div', { class: 'readouts' }, rActiveDbov, rActiveDbm0, rSnrA, rSnrB, rInput, rOffset, rLatency),
    h(
      'p',
      { class: 'hint' },
      'Levels: dBov at channel A’s quantizer (after the input gain); dBm0 through its load capacity. The input reads dBFS (a full-scale sine is 0 dBFS) and dBm0 once calibrated.',
    ),
  );
}

// The Input drawer: the source's details (device and channel of a microphone, a file to
// open or drop, the test signal's level and frequency), the alignment target, the
// calibration of the input, and the readouts that go with them.
import { h } from '../../dom';
import type { Store } from '../../settings/store';
import { drawer } from '../drawer';
import type { FrameClock } from '../frame-clock';

const fmt = (v: number | null, digits: number, unit: string) =>
  v === null ? '—' : `${v.toFixed(digits)} ${unit}`;

function labelled(text: string, control: HTMLElement): HTMLLabelElement {
  return h('label', { class: 'field' }, h('span', {}, text), control);
}

function readout(testId: string, label: string): [HTMLElement, HTMLElement] {
  const value = h('span', { class: 'num', 'data-testid': testId }, '—');
  return [h('div', { class: 'readout' }, h('span', { class: 'readout-label' }, label), value), value];
}

export interface InputDrawer {
  el: HTMLElement;
  pickFile(): void;
}

export function inputDrawer(store: Store, clock: FrameClock): InputDrawer {
  const { engine } = store;
  const d = drawer(store, 'input', 'Input and level');
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
    class: 'file-input',
    'data-testid': 'source-file',
    'aria-label': 'Audio file',
  });
  const drop = h(
    'div',
    { class: 'drop', 'data-testid': 'source-drop' },
    'or drop an audio file here (anywhere on the page works too)',
  );
  const toneDbm0 = h('input', {
    type: 'number',
    step: 1,
    min: -60,
    max: 3,
    'data-testid': 'tone-dbm0',
    size: 4,
  });
  const toneHz = h('input', {
    type: 'number',
    step: 1,
    min: 50,
    max: 3900,
    'data-testid': 'tone-hz',
    size: 5,
  });
  const alignTarget = h('input', {
    type: 'number',
    step: 1,
    min: -60,
    max: 0,
    'data-testid': 'align-target',
    size: 4,
  });
  const calibKnown = h('input', {
    type: 'number',
    step: 0.1,
    value: -10,
    'data-testid': 'calib-known',
    'aria-label': 'Known tone level (dBm0)',
    size: 5,
  });
  const calibrate = h(
    'button',
    { type: 'button', 'data-testid': 'calib-button' },
    'Calibrate with the tone at the input',
  );
  const [rInput, vInput] = readout('readout-input-level', 'Input level');
  const [rOffset, vOffset] = readout('calib-offset', 'Calibration offset');
  const [rActiveDbov, vActiveDbov] = readout('readout-active-dbov', 'Active level at A');
  const [rActiveDbm0, vActiveDbm0] = readout('readout-active-dbm0', 'Active level at A');
  const [rSnrA, vSnrA] = readout('readout-snr-a', 'SNR A (whole run)');
  const [rSnrB, vSnrB] = readout('readout-snr-b', 'SNR B (whole run)');
  const [rLatency, vLatency] = readout('readout-latency', 'Latency');

  let devicesListed = false;
  const listDevices = async () => {
    const inputs = await engine.listInputs();
    device.replaceChildren(
      h('option', { value: '' }, 'default input'),
      ...inputs.map((i) => h('option', { value: i.deviceId }, i.label)),
    );
    devicesListed = true;
    device.value = store.audio.source.deviceId ?? '';
  };
  device.addEventListener('change', () => {
    void engine.useMicrophone(device.value || undefined).then((ok) => {
      if (ok && !devicesListed) void listDevices();
    });
  });
  inputChannel.addEventListener('change', () => engine.setInputChannel(Number(inputChannel.value)));
  const useFile = (f: File | undefined) => {
    if (f) void engine.useFile(f, f.name);
  };
  fileInput.addEventListener('change', () => useFile(fileInput.files?.[0]));
  const dragOver = (e: DragEvent) => {
    e.preventDefault();
    drop.classList.add('over');
  };
  const dropped = (e: DragEvent) => {
    e.preventDefault();
    drop.classList.remove('over');
    useFile(e.dataTransfer?.files[0]);
  };
  drop.addEventListener('dragover', dragOver);
  drop.addEventListener('dragleave', () => drop.classList.remove('over'));
  drop.addEventListener('drop', (e) => {
    e.stopPropagation();
    dropped(e);
  });
  document.addEventListener('dragover', (e) => e.preventDefault());
  document.addEventListener('drop', dropped);
  const retune = () =>
    void engine.setTestSignal({ dbm0: Number(toneDbm0.value), frequencyHz: Number(toneHz.value) });
  toneDbm0.addEventListener('change', retune);
  toneHz.addEventListener('change', retune);
  alignTarget.addEventListener('change', () => {
    const t = Number(alignTarget.value);
    if (Number.isFinite(t)) engine.setAlignTarget(t);
  });
  calibrate.addEventListener('click', () => engine.calibrate(Number(calibKnown.value)));

  let lastKind = '';
  const show = () => {
    const s = store.audio;
    if (s.source.kind === 'microphone' && lastKind !== 'microphone' && !devicesListed) void listDevices();
    lastKind = s.source.kind;
    if (devicesListed) device.value = s.source.deviceId ?? '';
    const n = Math.max(1, s.source.channelCount);
    if (inputChannel.options.length !== n)
      inputChannel.replaceChildren(
        ...Array.from({ length: n }, (_, i) => h('option', { value: i }, String(i + 1))),
      );
    inputChannel.value = String(s.source.inputChannel);
    if (document.activeElement !== toneDbm0) toneDbm0.value = String(s.testSignal.dbm0);
    if (document.activeElement !== toneHz) toneHz.value = String(s.testSignal.frequencyHz);
    if (document.activeElement !== alignTarget) alignTarget.value = String(s.alignment.targetDbov);
    readouts.draw();
  };
  // The figures move with every snapshot: drawn by the clock while the drawer is open.
  const readouts = {
    el: d.body,
    draw: () => {
      const s = engine.state();
      vInput.textContent =
        fmt(s.calibration.inputDbfs, 1, 'dBFS') +
        (s.calibration.inputDbm0 === null ? '' : ` · ${fmt(s.calibration.inputDbm0, 1, 'dBm0')}`);
      vOffset.textContent =
        s.calibration.offsetDb === null ? 'not calibrated' : `${s.calibration.offsetDb.toFixed(2)} dB`;
      vActiveDbov.textContent = fmt(s.alignment.activeDbov, 1, 'dBov');
      vActiveDbm0.textContent = fmt(s.alignment.activeDbm0, 1, 'dBm0');
      vSnrA.textContent = fmt(s.snr.a, 1, 'dB');
      vSnrB.textContent = fmt(s.snr.b, 1, 'dB');
      vLatency.textContent = `path ${fmt(s.latency.pathMs, 2, 'ms')} · base ${fmt(s.latency.baseMs, 1, 'ms')} · output ${fmt(s.latency.outputMs, 1, 'ms')}`;
    },
  };
  const drawing = clock.add(readouts, 200);
  engine.subscribe(() => drawing.invalidate());
  store.subscribe(show);
  show();

  d.body.append(
    h('h3', {}, 'Microphone'),
    h('div', { class: 'row' }, labelled('Device', device), labelled('Channel', inputChannel)),
    h(
      'p',
      { class: 'hint' },
      'Echo cancellation, noise suppression and automatic gain stay off: the channel hears the talker as picked up.',
    ),
    h('h3', {}, 'File'),
    h('div', { class: 'row' }, fileInput),
    drop,
    h('h3', {}, 'Test signal'),
    h('div', { class: 'row' }, labelled('Level (dBm0 at A)', toneDbm0), labelled('Frequency (Hz)', toneHz)),
    h('h3', {}, 'Level'),
    h('div', { class: 'row' }, labelled('Alignment target (dBov)', alignTarget)),
    h('div', { class: 'readouts' }, rActiveDbov, rActiveDbm0, rSnrA, rSnrB),
    h('h3', {}, 'Calibration'),
    h('div', { class: 'row' }, labelled('Known tone (dBm0)', calibKnown), calibrate),
    h('div', { class: 'readouts' }, rInput, rOffset, rLatency),
    h(
      'p',
      { class: 'hint' },
      'Levels: dBov at channel A’s quantizer after the input gain, dBm0 through its load capacity. The input reads dBFS (a full-scale sine is 0 dBFS), and dBm0 once calibrated with a tone of known level.',
    ),
  );
  return { el: d.el, pickFile: () => fileInput.click() };
}

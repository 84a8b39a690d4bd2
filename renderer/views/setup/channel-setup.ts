// Channel setup for A and B: law, parameter, bits, rate and segments per channel, the
// presets, the bit rate and the channel text they make. Applying goes through the
// engine's setChannels, as the engine panel's text fields do.
import { CHANNEL_PRESETS } from '../../../core/spec/index';
import type { AudioEngine, EngineState } from '../../audio/engine';
import type { ChannelSlot } from '../../audio/worklet/messages';
import { h } from '../../dom';
import { ComputeClient } from '../../workers/client';
import {
  LAW_CHOICES,
  LAW_LABELS,
  PARAM_LABELS,
  composeChannel,
  composeText,
  defaultsFor,
  fieldsFromText,
  fieldsOf,
  type ChannelFields,
  type Composed,
  type FieldName,
  type LawChoice,
} from './channel-fields';
import { watchTalkerFrames, type TalkerFrames } from './talker-frames';

export interface ChannelSetupOptions {
  engine: AudioEngine;
  /** Shared compute worker; one of its own when absent. */
  compute?: ComputeClient;
}

const RATE_CHOICES = ['8k', '16k', '48k', 'native'];
const FIELD_LABELS: Record<FieldName, string> = {
  param: 'Parameter',
  bits: 'Bits',
  rate: 'Channel rate',
  segments: 'Segments',
};

interface SlotView {
  root: HTMLElement;
  composed(): Composed;
  show(state: EngineState): void;
}

function slotView(
  slot: ChannelSlot,
  initial: string,
  compute: ComputeClient,
  talker: TalkerFrames,
  changed: () => void,
): SlotView {
  const id = (what: string) => `setup-${slot}-${what}`;
  let fields: ChannelFields =
    fieldsFromText(initial) ?? defaultsFor('g711-mu', { rate: '8k' } as ChannelFields);
  /** A tandem preset's text, used as it is until a field is edited. */
  let override: string | null = null;
  let table: string | undefined;

  const law = h(
    'select',
    { 'data-testid': id('law'), 'aria-label': `Channel ${slot.toUpperCase()} law` },
    ...LAW_CHOICES.map((l) => h('option', { value: l }, LAW_LABELS[l])),
  );
  const preset = h(
    'select',
    { 'data-testid': id('preset'), 'aria-label': `Channel ${slot.toUpperCase()} preset` },
    h('option', { value: '' }, 'Preset…'),
    ...CHANNEL_PRESETS.map((p) => h('option', { value: p.text }, p.title)),
  );
  const inputs = {} as Record<FieldName, HTMLInputElement>;
  const errors = {} as Record<FieldName, HTMLElement>;
  const labels = {} as Record<FieldName, HTMLElement>;
  const cells: HTMLElement[] = [];
  for (const name of ['param', 'bits', 'rate', 'segments'] as const) {
    const input = h('input', {
      type: 'text',
      'data-testid': id(name),
      'aria-describedby': id(`${name}-error`),
      inputmode: name === 'param' || name === 'rate' ? undefined : 'numeric',
      list: name === 'rate' ? id('rates') : undefined,
      size: 6,
    });
    input.id = id(name);
    const label = h('span', {}, FIELD_LABELS[name]);
    const error = h('span', {
      class: 'field-error',
      role: 'alert',
      id: id(`${name}-error`),
      'data-testid': id(`${name}-error`),
    });
    inputs[name] = input;
    errors[name] = error;
    labels[name] = label;
    cells.push(h('label', { class: 'field' }, label, input, error));
  }
  const rates = h('datalist', { id: id('rates') }, ...RATE_CHOICES.map((r) => h('option', { value: r })));
  const design = h('button', { type: 'button', 'data-testid': id('design') }, 'Design from talker');
  const text = h('code', { 'data-testid': id('text') }, '');
  const textError = h('p', { class: 'field-error', role: 'alert', 'data-testid': id('text-error') });
  const bitRate = h('span', { class: 'num', 'data-testid': id('bitrate') }, '—');
  const note = h('p', { class: 'hint', 'data-testid': id('design-note') }, '');
  const inUse = h('code', { 'data-testid': id('in-use') }, '—');
  // A designed table's text is one long word: let it wrap rather than widen the page.
  for (const c of [text, inUse]) c.style.overflowWrap = 'anywhere';

  const fill = () => {
    law.value = fields.law;
    for (const name of ['param', 'bits', 'rate', 'segments'] as const) inputs[name].value = fields[name];
  };

  let composed: Composed = { ok: false, field: 'text', message: '' };
  const refresh = () => {
    const c = override !== null ? composeText(override) : composeChannel(fields, table);
    composed = c;
    const used = fieldsOf(fields.law);
    labels.param.textContent = PARAM_LABELS[fields.law];
    for (const name of ['param', 'bits', 'rate', 'segments'] as const) {
      inputs[name].disabled = override !== null || !used[name];
      const bad = !c.ok && c.field === name;
      inputs[name].setAttribute('aria-invalid', String(bad));
      errors[name].textContent = bad ? c.message : '';
    }
    design.hidden = fields.law !== 'designed' || override !== null;
    if (c.ok) {
      text.textContent = c.text;
      text.title = c.text;
      textError.textContent = '';
      const br = c.figures.bitRate;
      bitRate.textContent =
        br === null
          ? `${c.figures.bits} bits × input rate`
          : `${c.figures.bits} bits × ${c.figures.rateHz} Hz = ${(br / 1000).toFixed(1)} kbit/s`;
    } else {
      text.textContent = '—';
      textError.textContent = c.field === 'text' ? c.message : '';
      bitRate.textContent = '—';
    }
    changed();
  };

  law.addEventListener('change', () => {
    override = null;
    table = undefined;
    fields = defaultsFor(law.value as LawChoice, fields);
    fill();
    refresh();
  });
  for (const name of ['param', 'bits', 'rate', 'segments'] as const) {
    inputs[name].addEventListener('input', () => {
      fields = { ...fields, [name]: inputs[name].value };
      if (name === 'bits') table = undefined;
      refresh();
    });
  }
  preset.addEventListener('change', () => {
    const t = preset.value;
    if (!t) return;
    const f = fieldsFromText(t);
    table = undefined;
    if (f) {
      fields = f;
      override = null;
    } else override = t;
    fill();
    refresh();
    preset.value = '';
  });
  design.addEventListener('click', () => {
    const frames = talker.levels();
    if (!frames) {
      composed = { ok: false, field: 'text', message: 'no talker measured yet: start audio and let it talk' };
      textError.textContent = composed.message;
      return;
    }
    const bits = Number(fields.bits);
    design.disabled = true;
    textError.textContent = '';
    note.textContent = 'designing…';
    compute
      .run({ kind: 'design', frames, bits })
      .then((r) => {
        table = r.stage;
        note.textContent = `designed for ${talker.frames} active frames, predicted ${r.predictedSnrDb.toFixed(1)} dB`;
        refresh();
      })
      .catch((err: Error) => {
        textError.textContent = err.message;
        note.textContent = '';
      })
      .finally(() => (design.disabled = false));
  });

  fill();
  refresh();

  return {
    root: h(
      'fieldset',
      { class: 'channel-setup-slot', 'data-testid': id('slot') },
      h('legend', {}, `Channel ${slot.toUpperCase()}`),
      h(
        'div',
        { class: 'output-row' },
        h('label', { class: 'field' }, h('span', {}, 'Law'), law),
        h('label', { class: 'field' }, h('span', {}, 'Preset'), preset),
      ),
      h('div', { class: 'output-row' }, ...cells, rates, design),
      h('div', { class: 'output-row' }, h('span', {}, 'Bit rate: '), bitRate),
      h('div', { class: 'output-row' }, h('span', {}, 'Channel text: '), text),
      h('div', { class: 'output-row' }, h('span', {}, 'In use: '), inUse),
      textError,
      note,
    ),
    composed: () => composed,
    show: (s) => {
      inUse.textContent = s.channels[slot];
    },
  };
}

export function mountChannelSetup(container: HTMLElement, options: ChannelSetupOptions): { destroy(): void } {
  const { engine } = options;
  const compute = options.compute ?? new ComputeClient();
  const ownCompute = options.compute === undefined;
  const talker = watchTalkerFrames(engine);
  const apply = h('button', { type: 'button', 'data-testid': 'setup-apply' }, 'Apply A and B');
  const status = h('p', { class: 'hint', role: 'status', 'data-testid': 'setup-status' });
  status.style.overflowWrap = 'anywhere';
  const fault = h('p', { class: 'fault', role: 'alert', 'data-testid': 'setup-fault', hidden: true });
  let slots: SlotView[] = [];
  const changed = () => {
    apply.disabled = slots.length === 2 && !slots.every((s) => s.composed().ok);
  };
  const start = engine.state();
  slots = [
    slotView('a', start.channels.a, compute, talker, changed),
    slotView('b', start.channels.b, compute, talker, changed),
  ];
  changed();

  apply.addEventListener('click', () => {
    const [a, b] = slots.map((s) => s.composed());
    if (!a.ok || !b.ok) {
      status.textContent = 'Fix the marked fields first.';
      return;
    }
    const ok = engine.setChannels(a.text, b.text);
    status.textContent = ok ? `Applied: A ${a.text} · B ${b.text}` : 'Refused by the engine.';
  });
  const show = (s: EngineState) => {
    for (const v of slots) v.show(s);
    const bad = s.fault?.code === 'channel-invalid';
    fault.hidden = !bad;
    fault.textContent = bad ? (s.fault?.message ?? '') : '';
  };
  const off = engine.onChange(show);
  show(start);

  const root = h(
    'section',
    { class: 'panel channel-setup', 'data-testid': 'channel-setup' },
    h('h2', {}, 'Channel setup'),
    h('div', { class: 'channel-setup-slots' }, ...slots.map((s) => s.root)),
    h('div', { class: 'output-row' }, apply),
    status,
    fault,
  );
  container.append(root);
  return {
    destroy: () => {
      off();
      talker.destroy();
      if (ownCompute) compute.destroy();
      root.remove();
    },
  };
}

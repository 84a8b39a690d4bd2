// One channel's form: law, preset, parameter, bits, rate and segments, and the channel's
// text form beside them. Fields and text edit one value: typing in either shows the
// other at once; Enter or leaving the field applies it (the engine crossfades to it);
// a refused value stays where it was typed, with the parser's message beside it.
import { CHANNEL_PRESETS } from '../../../core/spec/presets';
import { parseChannel } from '../../../core/spec/parse';
import type { ChannelSlot } from '../../audio/worklet/messages';
import { h } from '../../dom';
import { shortText, type Store } from '../../settings/store';
import { channelLine } from '../bar/channel-strip';
import {
  FIELD_NAMES,
  LAW_CHOICES,
  LAW_LABELS,
  PARAM_LABELS,
  composeChannel,
  defaultsFor,
  fieldsFromSpec,
  fieldsOf,
  type ChannelFields,
  type FieldName,
  type LawChoice,
} from './channel-fields';

const RATE_CHOICES = ['8k', '16k', '48k', 'native'];
const FIELD_LABELS: Record<FieldName, string> = {
  param: 'Parameter',
  bits: 'Bits',
  rate: 'Channel rate',
  segments: 'Segments',
};

export interface ChannelForm {
  el: HTMLElement;
  focusText(): void;
}

export function channelForm(store: Store, slot: ChannelSlot): ChannelForm {
  const id = (what: string) => `setup-${slot}-${what}`;
  const parse = (text: string) => parseChannel(text, { tables: store.tables.lookup });
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
  const tableChoice = h('select', {
    'data-testid': id('table'),
    'aria-label': `Channel ${slot.toUpperCase()} stored table`,
  });
  const cells: HTMLElement[] = [];
  const rates = h('datalist', { id: id('rates') }, ...RATE_CHOICES.map((r) => h('option', { value: r })));
  for (const name of FIELD_NAMES) {
    const input = h('input', {
      type: 'text',
      'data-testid': id(name),
      'aria-describedby': id(`${name}-error`),
      inputmode: name === 'param' || name === 'rate' ? undefined : 'numeric',
      list: name === 'rate' ? id('rates') : undefined,
      size: 5,
    });
    input.id = id(name);
    labels[name] = h('span', {}, FIELD_LABELS[name]);
    errors[name] = h('span', {
      class: 'field-error',
      role: 'alert',
      id: id(`${name}-error`),
      'data-testid': id(`${name}-error`),
    });
    inputs[name] = input;
    const extra = name === 'param' ? tableChoice : name === 'rate' ? rates : null;
    cells.push(h('label', { class: 'field' }, labels[name], input, extra, errors[name]));
  }
  const text = h('input', {
    type: 'text',
    class: 'channel-text-input',
    'data-testid': `channel-${slot}`,
    'aria-label': `Channel ${slot.toUpperCase()} text form`,
    spellcheck: 'false',
    autocomplete: 'off',
  });
  const textError = h('p', { class: 'field-error', role: 'alert', 'data-testid': id('text-error') });
  const bitRate = h('p', { class: 'hint', 'data-testid': id('bitrate') }, '');
  const note = h('p', { class: 'hint', 'data-testid': id('note') }, '');

  let fields: ChannelFields = { law: 'g711-mu', param: '', bits: '8', rate: '8k', segments: '' };
  let shown = '';

  const apply = (full: string) => {
    const v = store.setChannel(slot, full);
    textError.textContent = v.ok ? '' : v.message;
  };
  const fill = () => {
    law.value = fields.law;
    for (const name of FIELD_NAMES) inputs[name].value = fields[name];
    tableChoice.value = fields.law === 'table' ? fields.param : '';
  };
  const markFields = (c: ReturnType<typeof composeChannel> | null, textOnly: boolean) => {
    const used = fieldsOf(fields.law);
    labels.param.textContent = PARAM_LABELS[fields.law];
    const isTable = fields.law === 'table';
    inputs.param.hidden = isTable;
    tableChoice.hidden = !isTable;
    for (const name of FIELD_NAMES) {
      inputs[name].disabled = textOnly || !used[name];
      const bad = c !== null && !c.ok && c.field === name;
      inputs[name].setAttribute('aria-invalid', String(bad));
      errors[name].textContent = bad && !c.ok ? c.message : '';
    }
    tableChoice.disabled = textOnly;
    law.disabled = textOnly;
    note.textContent = textOnly
      ? 'The form cannot show this channel (a tandem, or options only the text form has): edit the text form.'
      : '';
  };
  const showFigures = (full: string | null) => {
    bitRate.textContent = full === null ? '' : channelLine(full);
  };

  /** From the store: the channel in use for this slot, unless the user is typing in this form. */
  const render = () => {
    const tables = store.tables.list();
    const names = tables.map((t) => t.name);
    const current = Array.from(tableChoice.options, (o) => o.value);
    if (current.join('|') !== names.join('|'))
      tableChoice.replaceChildren(
        ...(names.length
          ? names.map((n) => h('option', { value: n }, n))
          : [h('option', { value: '' }, 'no stored tables yet')]),
      );
    const full = store.audio.channels[slot];
    if (full === shown) return;
    shown = full;
    const spec = parse(full);
    const f = fieldsFromSpec(spec, store.tables.lookup);
    if (f) fields = f;
    fill();
    text.value = shortText(full);
    text.setAttribute('aria-invalid', 'false');
    textError.textContent = '';
    markFields(null, f === null);
    showFigures(full);
  };

  // Fields -> text: shown while typing, applied on change.
  const fromFields = (commit: boolean) => {
    const c = composeChannel(fields, parse);
    markFields(c, false);
    if (c.ok) {
      text.value = shortText(c.text);
      textError.textContent = '';
      showFigures(c.text);
      if (commit) apply(c.text);
    } else if (c.field === 'text') textError.textContent = c.message;
  };
  for (const name of FIELD_NAMES) {
    inputs[name].addEventListener('input', () => {
      fields = { ...fields, [name]: inputs[name].value };
      fromFields(false);
    });
    inputs[name].addEventListener('change', () => fromFields(true));
  }
  tableChoice.addEventListener('change', () => {
    fields = { ...fields, param: tableChoice.value };
    inputs.param.value = tableChoice.value;
    fromFields(true);
  });
  law.addEventListener('change', () => {
    fields = defaultsFor(law.value as LawChoice, fields, store.tables.list()[0]?.name ?? '');
    fill();
    fromFields(true);
  });
  preset.addEventListener('change', () => {
    if (preset.value) apply(preset.value);
    preset.value = '';
  });

  // Text -> fields: shown while typing when the text reads, applied on change.
  const fromText = (commit: boolean) => {
    const v = store.judge(text.value);
    text.setAttribute('aria-invalid', String(!v.ok));
    if (!v.ok) {
      textError.textContent = v.message;
      return;
    }
    textError.textContent = '';
    const f = fieldsFromSpec(parse(v.text), store.tables.lookup);
    if (f) fields = f;
    fill();
    markFields(null, f === null);
    showFigures(v.text);
    if (commit) apply(v.text);
  };
  text.addEventListener('input', () => fromText(false));
  text.addEventListener('change', () => fromText(true));

  store.subscribe(render);
  render();

  const el = h(
    'fieldset',
    { class: `channel-form slot-${slot}`, 'data-testid': id('slot') },
    h(
      'legend',
      {},
      h('span', { class: `slot-badge slot-${slot}` }, slot.toUpperCase()),
      ` Channel ${slot.toUpperCase()}`,
    ),
    h('label', { class: 'field wide' }, h('span', {}, 'Text form'), text),
    textError,
    h(
      'div',
      { class: 'row' },
      h('label', { class: 'field' }, h('span', {}, 'Law'), law),
      h('label', { class: 'field' }, h('span', {}, 'Preset'), preset),
    ),
    h('div', { class: 'row' }, ...cells),
    bitRate,
    note,
  );
  return { el, focusText: () => text.focus() };
}

// The presets with the figures core gives them (bits, rate, bit rate, overload point,
// load capacity), one click from A or B.
import { channelFigures, type ChannelFigures } from '../../../core/spec/describe';
import { CHANNEL_PRESETS } from '../../../core/spec/presets';
import type { ChannelSlot } from '../../audio/worklet/messages';
import { h } from '../../dom';
import type { Store } from '../../settings/store';

const fixed = (n: number, digits: number) => n.toFixed(digits);
const signed = (n: number, digits: number) => (n >= 0 ? '+' : '') + n.toFixed(digits);

function row(store: Store, p: ChannelFigures): HTMLTableRowElement {
  const use = (slot: ChannelSlot) => {
    const b = h(
      'button',
      { type: 'button', 'data-testid': `preset-use-${slot}`, title: `Use as channel ${slot.toUpperCase()}` },
      slot.toUpperCase(),
    );
    b.addEventListener('click', () => store.setChannel(slot, p.canonical));
    return b;
  };
  return h(
    'tr',
    { 'data-testid': 'preset-row', 'data-preset': p.canonical },
    h('td', {}, p.title),
    h('td', { 'data-testid': 'preset-canonical' }, h('code', {}, p.canonical)),
    h('td', { class: 'num', 'data-testid': 'preset-bits' }, p.bits),
    h('td', { class: 'num', 'data-testid': 'preset-rate' }, p.rateHz === null ? 'native' : p.rateHz),
    h(
      'td',
      { class: 'num', 'data-testid': 'preset-bitrate' },
      p.bitRate === null ? '—' : `${fixed(p.bitRate / 1000, 0)} kbit/s`,
    ),
    h('td', { class: 'num', 'data-testid': 'preset-overload-pcm16' }, fixed(p.overloadPcm16, 0)),
    h('td', { class: 'num', 'data-testid': 'preset-load-capacity' }, `${signed(p.loadCapacityDbm0, 2)} dBm0`),
    h('td', { class: 'actions' }, use('a'), use('b')),
  );
}

export function presetList(store: Store): HTMLElement {
  const rows = CHANNEL_PRESETS.map((p) => row(store, channelFigures(p.text)));
  return h(
    'section',
    { class: 'drawer-section', 'data-testid': 'preset-panel' },
    h('h3', {}, 'Presets'),
    h(
      'table',
      { class: 'presets', 'data-testid': 'preset-table' },
      h(
        'thead',
        {},
        h(
          'tr',
          {},
          h('th', {}, 'Channel'),
          h('th', {}, 'Text form'),
          h('th', { class: 'num' }, 'Bits'),
          h('th', { class: 'num' }, 'Rate (Hz)'),
          h('th', { class: 'num' }, 'Bit rate'),
          h('th', { class: 'num', title: 'Overload point in 16-bit PCM units' }, 'Overload'),
          h('th', { class: 'num' }, 'Load capacity'),
          h('th', {}, 'Use'),
        ),
      ),
      h('tbody', {}, ...rows),
    ),
    h(
      'p',
      { class: 'hint' },
      'Overload point in 16-bit PCM units (float scale × 32768); load capacity: the power of a sine whose peak sits at the overload point.',
    ),
  );
}

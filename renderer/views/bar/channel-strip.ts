// The second bar: each channel in one line (text form, bits, rate, bit rate) with the way
// to change it, the input gain and the alignment, the views, and the theme.
import { channelFigures } from '../../../core/spec/describe';
import type { ChannelSlot } from '../../audio/worklet/messages';
import { h } from '../../dom';
import type { Store, ViewName } from '../../settings/store';
import { keyOf } from './keys';

/** bits · rate · bit rate of a channel text, or why it has none. */
export function channelLine(full: string): string {
  try {
    const f = channelFigures(full);
    const rate = f.rateHz === null ? 'input rate' : `${f.rateHz / 1000} kHz`;
    const bitRate =
      f.bitRate === null ? '' : ` · ${(f.bitRate / 1000).toFixed(f.bitRate % 1000 ? 1 : 0)} kbit/s`;
    return `${f.bits} bits · ${rate}${bitRate}`;
  } catch (err) {
    return err instanceof Error ? err.message : String(err);
  }
}

const VIEWS: readonly [ViewName, string][] = [
  ['live', 'Live'],
  ['sweep', 'Sweep'],
];

export interface StripGroups {
  channels: HTMLElement;
  level: HTMLElement;
  views: HTMLElement;
  theme: HTMLElement;
}

export function channelStrip(store: Store, focusChannel: (slot: ChannelSlot) => void): StripGroups {
  const { engine } = store;
  const summaries = (['a', 'b'] as const).map((slot) => {
    const text = h('code', { class: 'channel-text', 'data-testid': `channel-summary-${slot}-text` }, '');
    const figures = h(
      'span',
      { class: 'channel-figures', 'data-testid': `channel-summary-${slot}-figures` },
      '',
    );
    // The summary is the way in: a click opens the channel's form.
    const el = h(
      'button',
      {
        type: 'button',
        class: `channel-summary slot-${slot}`,
        'data-testid': `channel-summary-${slot}`,
        title: `Change channel ${slot.toUpperCase()}`,
      },
      h('span', { class: `slot-badge slot-${slot}` }, slot.toUpperCase()),
      text,
      figures,
    );
    el.addEventListener('click', () => focusChannel(slot));
    return { slot, el, text, figures };
  });
  const gain = h('input', {
    type: 'number',
    step: 0.5,
    min: -60,
    max: 60,
    'data-testid': 'input-gain',
    'aria-label': 'Input gain (dB)',
    size: 4,
  });
  gain.addEventListener('change', () => engine.setInputGainDb(Number(gain.value)));
  const align = h(
    'button',
    {
      type: 'button',
      'data-testid': 'align-button',
      title: 'Set the gain so the talker’s active level (P.56) at A reaches the target',
    },
    'Align',
  );
  align.addEventListener('click', () => engine.alignToTarget(store.audio.alignment.targetDbov));
  const channelsKey = keyOf((a) => a.kind === 'drawer' && a.drawer === 'channels');
  const openChannels = h(
    'button',
    { type: 'button', 'data-testid': 'open-channels', 'aria-keyshortcuts': channelsKey },
    'Channels…',
    h('kbd', {}, channelsKey),
  );
  openChannels.addEventListener('click', () =>
    store.setPage({ drawer: store.page.drawer === 'channels' ? 'none' : 'channels' }),
  );
  const tabs = VIEWS.map(([name, label]) => {
    const b = h('button', { type: 'button', class: 'view-tab', 'data-testid': `view-tab-${name}` }, label);
    b.addEventListener('click', () => store.setPage({ view: name }));
    return b;
  });
  const theme = h('button', { type: 'button', class: 'theme-toggle', 'data-testid': 'theme-toggle' }, '');
  theme.addEventListener('click', () =>
    store.setPage({ theme: store.page.theme === 'dark' ? 'light' : 'dark' }),
  );

  const show = () => {
    const s = store.audio;
    for (const v of summaries) {
      const short = store.channelText(v.slot);
      v.text.textContent = short;
      v.text.title = short;
      v.figures.textContent = channelLine(s.channels[v.slot]);
      v.el.dataset.pending = String(s.channels[v.slot] !== s.inUse[v.slot]);
    }
    if (document.activeElement !== gain) gain.value = String(Math.round(s.inputGainDb * 100) / 100);
    align.textContent = `Align to ${s.alignment.targetDbov} dBov`;
    for (const [i, b] of tabs.entries())
      b.setAttribute('aria-pressed', String(VIEWS[i][0] === store.page.view));
    const dark = store.page.theme === 'dark';
    theme.textContent = dark ? 'Light theme' : 'Dark theme';
    theme.setAttribute('aria-pressed', String(dark));
    openChannels.setAttribute('aria-expanded', String(store.page.drawer === 'channels'));
  };
  store.subscribe(show);
  show();

  return {
    channels: h('div', { class: 'group channels-group' }, ...summaries.map((v) => v.el), openChannels),
    level: h(
      'div',
      { class: 'group' },
      h('label', { class: 'field inline' }, h('span', {}, 'Gain (dB)'), gain),
      align,
    ),
    views: h('nav', { class: 'group view-tabs', 'aria-label': 'Views' }, ...tabs),
    theme,
  };
}

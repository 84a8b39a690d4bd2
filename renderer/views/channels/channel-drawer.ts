// The Channels drawer: the forms of A and B (each with its text form), designing a
// quantizer from the talker, the stored tables and the presets.
import type { ChannelSlot } from '../../audio/worklet/messages';
import { h } from '../../dom';
import type { Store } from '../../settings/store';
import type { ComputeClient } from '../../workers/client';
import { drawer } from '../drawer';
import type { TalkerTally } from '../talker/talker-tally';
import { channelForm } from './channel-form';
import { presetList } from './preset-list';
import { tableList } from './table-list';
import { talkerDesign } from './talker-design';

export interface ChannelDrawer {
  el: HTMLElement;
  focus(slot: ChannelSlot): void;
}

export function channelDrawer(store: Store, compute: ComputeClient, tally: TalkerTally): ChannelDrawer {
  const d = drawer(store, 'channels', 'Channels A and B');
  const forms = { a: channelForm(store, 'a'), b: channelForm(store, 'b') };
  d.body.append(
    h('div', { class: 'channel-forms' }, forms.a.el, forms.b.el),
    h(
      'p',
      { class: 'hint' },
      'Type in the form or in the text form: each follows the other. Enter, or leaving the field, applies the change; the monitor crossfades to it.',
    ),
    talkerDesign(store, compute, tally),
    tableList(store),
    presetList(store),
  );
  return {
    el: d.el,
    focus: (slot) => {
      store.setPage({ drawer: 'channels' });
      forms[slot].focusText();
    },
  };
}

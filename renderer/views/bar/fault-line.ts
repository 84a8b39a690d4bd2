// Faults and cautions that need the user now: the engine's fault with its remedy, the
// Resume button after the system suspended audio, passing notices and the howl warning.
import { h } from '../../dom';
import type { Store } from '../../settings/store';

export function faultLine(store: Store): HTMLElement {
  const { engine } = store;
  const fault = h('p', { class: 'fault', role: 'alert', 'data-testid': 'engine-fault', hidden: true });
  const resume = h('button', { type: 'button', 'data-testid': 'engine-resume', hidden: true }, 'Resume');
  const notice = h('p', { class: 'notice', role: 'status', 'data-testid': 'engine-notice', hidden: true });
  const howl = h('p', { class: 'fault', role: 'alert', 'data-testid': 'howl-warning', hidden: true });
  resume.addEventListener('click', () => void engine.resume());
  const show = () => {
    const s = store.audio;
    fault.hidden = s.fault === null;
    fault.textContent = s.fault?.message ?? '';
    fault.dataset.code = s.fault?.code ?? '';
    resume.hidden = s.fault?.code !== 'context-suspended';
    notice.hidden = s.notice === null;
    notice.textContent = s.notice ?? '';
    howl.hidden = !s.howl.howling;
    howl.textContent = s.howl.howling
      ? `Feedback howl${s.howl.frequencyHz === null ? '' : ` near ${s.howl.frequencyHz.toFixed(0)} Hz`}: mute, or use headphones.`
      : '';
  };
  store.subscribe(show);
  show();
  return h('div', { class: 'fault-line', 'data-testid': 'fault-line' }, fault, resume, howl, notice);
}

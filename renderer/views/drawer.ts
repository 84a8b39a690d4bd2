// A drawer over the right of the page, for settings changed now and then (the channels,
// the input); one open at a time, Escape or its close button shuts it. The measurements
// stay where they are beside it.
import { h } from '../dom';
import type { DrawerName, Store } from '../settings/store';

export interface Drawer {
  el: HTMLElement;
  body: HTMLElement;
}

export function drawer(store: Store, name: Exclude<DrawerName, 'none'>, title: string): Drawer {
  const close = h(
    'button',
    { type: 'button', class: 'close', 'aria-label': `Close ${title}`, 'data-testid': `drawer-${name}-close` },
    '×',
  );
  close.addEventListener('click', () => store.setPage({ drawer: 'none' }));
  const body = h('div', { class: 'drawer-body' });
  const el = h(
    'aside',
    { class: 'drawer', 'data-testid': `drawer-${name}`, 'aria-label': title, hidden: true },
    h('header', { class: 'drawer-head' }, h('h2', {}, title), close),
    body,
  );
  let open = false;
  store.subscribe(() => {
    const now = store.page.drawer === name;
    if (now === open) return;
    open = now;
    el.hidden = !now;
  });
  return { el, body };
}

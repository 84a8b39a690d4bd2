// Stored tables: every designed quantizer the app keeps, by name, with its bits and where
// it came from; used as A or B by name, exported and imported as a tables file.
import { parseChannel } from '../../../core/spec/parse';
import { formatRate } from '../../../core/spec/format';
import { DEFAULT_RATE } from '../../../core/spec/types';
import type { ChannelSlot } from '../../audio/worklet/messages';
import { h } from '../../dom';
import { downloadText } from '../../settings/download';
import type { Store } from '../../settings/store';

/** Uses stored table `name` on `slot`, keeping the slot's rate. */
export function useTable(store: Store, slot: ChannelSlot, name: string): void {
  const rate = parseChannel(store.audio.channels[slot]).rate;
  store.setChannel(slot, `table:${name}${rate === DEFAULT_RATE ? '' : `@${formatRate(rate)}`}`);
}

export function tableList(store: Store): HTMLElement {
  const shelf = store.tables;
  const body = h('tbody', {});
  const empty = h(
    'p',
    { class: 'hint', 'data-testid': 'table-empty' },
    'No stored tables yet: design one from the talker, or import a tables file.',
  );
  const importer = h('input', {
    type: 'file',
    accept: '.json,application/json',
    class: 'file-input',
    'data-testid': 'table-import',
    'aria-label': 'Import a tables file',
  });
  const importNote = h('p', { class: 'hint', role: 'status', 'data-testid': 'table-import-status' });
  const exportAll = h('button', { type: 'button', 'data-testid': 'table-export' }, 'Export all');
  importer.addEventListener('change', () => {
    const f = importer.files?.[0];
    if (!f) return;
    void f.text().then(
      (text) => {
        try {
          const got = shelf.importText(text, f.name);
          importNote.dataset.state = 'done';
          importNote.textContent = `Imported ${got.length} table${got.length === 1 ? '' : 's'} from ${f.name}: ${got.map((t) => t.name).join(', ')}.`;
        } catch (err) {
          importNote.dataset.state = 'error';
          importNote.textContent = err instanceof Error ? err.message : String(err);
        }
        importer.value = '';
      },
      (err: unknown) => {
        importNote.dataset.state = 'error';
        importNote.textContent = `${f.name}: could not be read (${String(err)})`;
      },
    );
  });
  exportAll.addEventListener('click', () => downloadText('quantiscope-tables.json', shelf.exportText()));

  const render = () => {
    const tables = shelf.list();
    empty.hidden = tables.length > 0;
    exportAll.disabled = tables.length === 0;
    body.replaceChildren(
      ...tables.map((t) => {
        const use = (slot: ChannelSlot) => {
          const b = h(
            'button',
            {
              type: 'button',
              'data-testid': `table-use-${slot}`,
              title: `Use ${t.name} as channel ${slot.toUpperCase()}`,
            },
            slot.toUpperCase(),
          );
          b.addEventListener('click', () => useTable(store, slot, t.name));
          return b;
        };
        const save = h('button', { type: 'button', 'data-testid': 'table-save' }, 'Export');
        save.addEventListener('click', () => downloadText(`${t.name}.json`, shelf.exportText([t.name])));
        const remove = h('button', { type: 'button', 'data-testid': 'table-remove' }, 'Delete');
        remove.addEventListener('click', () => shelf.remove(t.name));
        return h(
          'tr',
          { 'data-table': t.name },
          h('td', {}, h('code', {}, `table:${t.name}`)),
          h('td', { class: 'num' }, t.bits),
          h('td', { class: 'num' }, t.outputs.length),
          h('td', { class: 'note' }, t.note ?? ''),
          h('td', { class: 'actions' }, use('a'), use('b'), save, remove),
        );
      }),
    );
  };
  shelf.onChange(render);
  render();
  return h(
    'section',
    { class: 'drawer-section', 'data-testid': 'table-list' },
    h('h3', {}, 'Stored tables'),
    h(
      'table',
      { class: 'tables' },
      h(
        'thead',
        {},
        h(
          'tr',
          {},
          h('th', {}, 'Name'),
          h('th', { class: 'num' }, 'Bits'),
          h('th', { class: 'num' }, 'Levels'),
          h('th', {}, 'Made from'),
          h('th', {}, 'Use'),
        ),
      ),
      body,
    ),
    empty,
    h(
      'div',
      { class: 'row' },
      h('label', { class: 'field' }, h('span', {}, 'Import a tables file'), importer),
      exportAll,
    ),
    importNote,
  );
}

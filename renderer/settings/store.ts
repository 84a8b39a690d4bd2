// The one place every setting is read from. Audio settings (channels, source, gain,
// monitor, mute, volume, error gain) are held by the engine, which the worklet answers
// to; the page's own settings (theme, theory model, spans, targets, open drawer) are held
// here. Every control renders from store.audio or store.page whenever subscribe() calls,
// and changes go back through the store's methods or the engine's, so two controls of
// one setting cannot drift apart.
import { DEFAULT_TALKER_TARGET } from '../../core/design/index';
import { ChannelSpecError } from '../../core/spec/errors';
import { formatChannel } from '../../core/spec/format';
import { parseChannel } from '../../core/spec/parse';
import type { TableLookup } from '../../core/spec/tables';
import type { AudioEngine, EngineState } from '../audio/engine';
import type { ChannelSlot } from '../audio/worklet/messages';
import { applyTheme, initialTheme, type ThemeName } from '../charts/theme';
import type { TableShelf } from './table-shelf';

/** Signal model of the Level/SNR curve's theory lines. */
export type TheoryModel = 'sine' | 'gaussian' | 'laplacian';
export type ViewName = 'live' | 'sweep';
export type DrawerName = 'none' | 'channels' | 'input';

export interface PageSettings {
  theme: ThemeName;
  model: TheoryModel;
  /** Level spread over the last few seconds or since the figures last restarted. */
  spread: 'moment' | 'whole';
  /** Trade-off: the SNR a frame must reach and the share of active frames that must reach it. */
  targetSnrDb: number;
  sharePct: number;
  view: ViewName;
  drawer: DrawerName;
}

export type ChannelVerdict = { ok: true; text: string } | { ok: false; message: string; part: string };

export class Store {
  private state: EngineState;
  private settings: PageSettings;
  private readonly listeners = new Set<() => void>();

  constructor(
    readonly engine: AudioEngine,
    readonly tables: TableShelf,
    page: Partial<PageSettings> = {},
  ) {
    this.state = engine.state();
    shownTables = tables.lookup;
    this.settings = {
      theme: initialTheme(),
      model: 'sine',
      spread: 'moment',
      // The command line's defaults too, so both recommend the same channel for one recording.
      targetSnrDb: DEFAULT_TALKER_TARGET.targetSnrDb,
      sharePct: DEFAULT_TALKER_TARGET.share * 100,
      view: 'live',
      drawer: 'none',
      ...page,
    };
    applyTheme(this.settings.theme);
    engine.onChange((s) => {
      this.state = s;
      this.notify();
    });
    tables.onChange(() => this.notify());
  }

  /** The engine's settings and status as it last told them. */
  get audio(): EngineState {
    return this.state;
  }

  get page(): PageSettings {
    return this.settings;
  }

  setPage(patch: Partial<PageSettings>): void {
    const next = { ...this.settings, ...patch };
    if (next.theme !== this.settings.theme) applyTheme(next.theme);
    this.settings = next;
    this.notify();
  }

  subscribe(listener: () => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  /** The channel as the user reads and types it: a stored table by its name. */
  channelText(slot: ChannelSlot): string {
    return shortText(this.state.channels[slot]);
  }

  /** Judges a channel text (stored tables resolved) without applying it. */
  judge(text: string): ChannelVerdict {
    try {
      return { ok: true, text: formatChannel(parseChannel(text, { tables: this.tables.lookup })) };
    } catch (err) {
      if (err instanceof ChannelSpecError) return { ok: false, message: err.message, part: err.part };
      return { ok: false, message: err instanceof Error ? err.message : String(err), part: '' };
    }
  }

  /** Applies one channel; the other stays. Returns the verdict (a refusal changes nothing). */
  setChannel(slot: ChannelSlot, text: string): ChannelVerdict {
    const v = this.judge(text);
    if (!v.ok) return v;
    const { a, b } = this.state.channels;
    this.engine.setChannels(slot === 'a' ? v.text : a, slot === 'b' ? v.text : b);
    return v;
  }

  private notify(): void {
    for (const l of this.listeners) l();
  }
}

/** The page's stored tables, for showing channels short (one shelf per page). */
let shownTables: TableLookup | undefined;

/**
 * A channel text as the user reads it: every named table by its name only (and without
 * the overload point and load capacity stored with it).
 */
export function shortText(full: string): string {
  try {
    return formatChannel(parseChannel(full), { short: true, tables: shownTables });
  } catch {
    return full;
  }
}

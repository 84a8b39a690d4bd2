// Light and dark palettes of our own. CSS reads the custom properties set on <html>;
// charts read the same values through palette() so a theme switch repaints both.
export type ThemeName = 'light' | 'dark';

export interface Palette {
  ink: string;
  mutedInk: string;
  grid: string;
  paper: string;
  /** Channel A and B, the Reference, marks (edges, levels) and warnings. */
  a: string;
  b: string;
  reference: string;
  mark: string;
  warn: string;
  mask: string;
}

const PALETTES: Record<ThemeName, Palette> = {
  light: {
    ink: '#1f2a2e',
    mutedInk: '#5b6669',
    grid: 'rgba(31, 42, 46, 0.12)',
    paper: '#fbf9f4',
    a: '#0f6f74',
    b: '#b0561c',
    reference: '#6d6a8f',
    mark: '#8a2d6b',
    warn: '#b3261e',
    mask: '#7a7a20',
  },
  dark: {
    ink: '#e4e1d8',
    mutedInk: '#a3a9a6',
    grid: 'rgba(228, 225, 216, 0.14)',
    paper: '#1c2326',
    a: '#4fc2c4',
    b: '#f0a060',
    reference: '#a9a6d6',
    mark: '#e07ec0',
    warn: '#ff7b6e',
    mask: '#d6d36a',
  },
};

const STORE_KEY = 'quantiscope.theme';
let current: ThemeName = 'light';
const listeners = new Set<() => void>();

export function palette(): Palette {
  return PALETTES[current];
}

export function themeName(): ThemeName {
  return current;
}

export function setTheme(name: ThemeName): void {
  current = name;
  document.documentElement.dataset.theme = name;
  try {
    localStorage.setItem(STORE_KEY, name);
  } catch {
    // Storage may be off (private windows): the theme then lasts for the page only.
  }
  for (const l of listeners) l();
}

export function onThemeChange(listener: () => void): () => void {
  listeners.add(listener);
  return () => listeners.delete(listener);
}

/** The stored choice, else the system's preference. */
export function initialTheme(): ThemeName {
  try {
    const stored = localStorage.getItem(STORE_KEY);
    if (stored === 'light' || stored === 'dark') return stored;
  } catch {
    // fall through to the system preference
  }
  return matchMedia('(prefers-color-scheme: dark)').matches ? 'dark' : 'light';
}

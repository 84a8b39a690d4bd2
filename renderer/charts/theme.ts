// The page's two themes live in styles.css as custom properties on <html data-theme>.
// Charts draw on canvas, so they read the same properties here once per theme change:
// one palette for the page and every chart, and a theme switch repaints both.
export type ThemeName = 'light' | 'dark';

/** The roles a chart draws with; each maps to the custom property `--c-<role>` (kebab case). */
export interface Palette {
  ink: string;
  /** Axis labels, tick labels and legends. */
  axisInk: string;
  grid: string;
  /** Background of the panels the charts sit on. */
  panel: string;
  a: string;
  b: string;
  reference: string;
  mark: string;
  mask: string;
  warn: string;
  fill: string;
  familyUniform: string;
  familyMu: string;
  familyA: string;
  familyG711: string;
  familyDesigned: string;
}

const ROLES: readonly (keyof Palette)[] = [
  'ink',
  'axisInk',
  'grid',
  'panel',
  'a',
  'b',
  'reference',
  'mark',
  'mask',
  'warn',
  'fill',
  'familyUniform',
  'familyMu',
  'familyA',
  'familyG711',
  'familyDesigned',
];

const cssName = (role: string) => `--c-${role.replace(/[A-Z0-9]+/g, (m) => `-${m.toLowerCase()}`)}`;

const STORE_KEY = 'quantiscope.theme';
let current: ThemeName = 'light';
let cached: Palette | null = null;
const listeners = new Set<() => void>();

function readPalette(): Palette {
  const style = getComputedStyle(document.documentElement);
  const out = {} as Palette;
  for (const role of ROLES) out[role] = style.getPropertyValue(cssName(role)).trim() || '#808080';
  return out;
}

/** The current theme's chart colours (read from the style sheet once per theme). */
export function palette(): Palette {
  return (cached ??= readPalette());
}

export function themeName(): ThemeName {
  return current;
}

export function applyTheme(name: ThemeName): void {
  current = name;
  document.documentElement.dataset.theme = name;
  cached = null;
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

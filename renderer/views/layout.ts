// Page layout: a resizable sidebar (engine, source, channels) beside the views, and a
// theme toggle in the masthead.
import { h } from '../dom';
import { initialTheme, setTheme, themeName } from './theme';

export interface PageLayout {
  sidebar: HTMLElement;
  main: HTMLElement;
}

export function pageLayout(root: HTMLElement): PageLayout {
  setTheme(initialTheme());
  const toggle = h('button', { type: 'button', class: 'theme-toggle', 'data-testid': 'theme-toggle' });
  const label = () => {
    const dark = themeName() === 'dark';
    toggle.textContent = dark ? 'Light theme' : 'Dark theme';
    toggle.setAttribute('aria-pressed', String(dark));
  };
  label();
  toggle.addEventListener('click', () => {
    setTheme(themeName() === 'dark' ? 'light' : 'dark');
    label();
  });
  document.querySelector('.masthead')?.append(toggle);
  const sidebar = h('aside', {
    class: 'sidebar',
    'data-testid': 'sidebar',
    'aria-label': 'Engine and channels',
  });
  const main = h('div', { class: 'views' });
  root.classList.add('workspace');
  root.append(sidebar, main);
  return { sidebar, main };
}

// What the page tests measure on the real page: boxes that overflow, text contrast
// (WCAG 2.1 relative luminance and contrast ratio, success criterion 1.4.3: 4.5:1 for
// normal text), canvas fingerprints, and the saved screenshots' own size.
import { readFile } from 'node:fs/promises';
import type { Page } from 'playwright-core';

/** Every element of a panel (or bar) whose box leaves its panel, and panels that scroll. */
export function overflowing(page: Page, selector: string): Promise<string[]> {
  return page.evaluate((sel) => {
    const out: string[] = [];
    for (const p of Array.from(document.querySelectorAll<HTMLElement>(sel))) {
      const r = p.getBoundingClientRect();
      if (r.width === 0 || r.height === 0) continue;
      const id = p.dataset.testid ?? p.className;
      if (p.scrollWidth > p.clientWidth + 1 || p.scrollHeight > p.clientHeight + 1)
        out.push(`${id} scrolls: ${p.scrollWidth}x${p.scrollHeight} in ${p.clientWidth}x${p.clientHeight}`);
      for (const el of Array.from(p.querySelectorAll<HTMLElement>('*'))) {
        const e = el.getBoundingClientRect();
        if (e.width === 0 || e.height === 0) continue;
        // Inside a box of its own that scrolls on purpose (long tables), the box is what counts.
        const scroller = el.parentElement?.closest('.candidates-box, .sweep-table-host, .drawer-body');
        if (scroller && p.contains(scroller)) continue;
        if (e.left < r.left - 1 || e.right > r.right + 1 || e.top < r.top - 1 || e.bottom > r.bottom + 1)
          out.push(
            `${id}: <${el.tagName.toLowerCase()} class="${el.className}"> "${(el.textContent ?? '').slice(0, 24)}"`,
          );
      }
    }
    return out;
  }, selector);
}

/** Parses `#rgb`, `#rrggbb`, `rgb(...)` and `rgba(...)` into 0..255 channels and alpha. */
export function parseColour(text: string): [number, number, number, number] {
  const t = text.trim();
  const hex = /^#([0-9a-f]{3}|[0-9a-f]{6})$/i.exec(t);
  if (hex) {
    const v = hex[1].length === 3 ? hex[1].replace(/./g, (c) => c + c) : hex[1];
    return [parseInt(v.slice(0, 2), 16), parseInt(v.slice(2, 4), 16), parseInt(v.slice(4, 6), 16), 1];
  }
  const m = /^rgba?\(([^)]+)\)$/.exec(t);
  if (!m) throw new Error(`not a colour: ${text}`);
  const parts = m[1]
    .split(/[ ,/]+/)
    .filter(Boolean)
    .map(Number);
  return [parts[0], parts[1], parts[2], parts.length > 3 ? parts[3] : 1];
}

/** WCAG 2.1 relative luminance of an sRGB colour. */
export function luminance([r, g, b]: readonly number[]): number {
  const lin = (c: number) => {
    const s = c / 255;
    return s <= 0.03928 ? s / 12.92 : Math.pow((s + 0.055) / 1.055, 2.4);
  };
  return 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b);
}

/** WCAG 2.1 contrast ratio, (L1 + 0.05) / (L2 + 0.05), of an opaque foreground over a background. */
export function contrast(fg: string, bg: string): number {
  const f = parseColour(fg);
  const b = parseColour(bg);
  // A translucent foreground is seen blended over the background.
  const mixed = [0, 1, 2].map((i) => f[i] * f[3] + b[i] * (1 - f[3]));
  const l1 = luminance(mixed);
  const l2 = luminance(b);
  return (Math.max(l1, l2) + 0.05) / (Math.min(l1, l2) + 0.05);
}

export interface TextColour {
  where: string;
  text: string;
  colour: string;
  background: string;
}

/** The colour of every piece of visible text under `selector`, with the background it sits on. */
export function textColours(page: Page, selector: string): Promise<TextColour[]> {
  return page.evaluate((sel) => {
    const out: { where: string; text: string; colour: string; background: string }[] = [];
    const rgba = (t: string): number[] => {
      const m = /rgba?\(([^)]+)\)/.exec(t);
      if (!m) return [0, 0, 0, 0];
      const p = m[1]
        .split(/[ ,/]+/)
        .filter(Boolean)
        .map(Number);
      return [p[0], p[1], p[2], p.length > 3 ? p[3] : 1];
    };
    // Translucent backgrounds (bars, highlights) are seen composited over what is beneath.
    const backgroundOf = (el: Element | null): string => {
      const layers: number[][] = [];
      for (let e = el; e; e = e.parentElement) {
        const c = rgba(getComputedStyle(e).backgroundColor);
        if (c[3] > 0) layers.push(c);
        if (c[3] >= 1) break;
      }
      let base = layers.length && layers[layers.length - 1][3] >= 1 ? layers.pop()! : [255, 255, 255, 1];
      while (layers.length) {
        const top = layers.pop()!;
        base = [0, 1, 2].map((i) => top[i] * top[3] + base[i] * (1 - top[3])).concat(1);
      }
      return `rgb(${base
        .slice(0, 3)
        .map((v) => Math.round(v))
        .join(', ')})`;
    };
    for (const root of Array.from(document.querySelectorAll(sel))) {
      const walker = document.createTreeWalker(root, NodeFilter.SHOW_TEXT);
      for (let n = walker.nextNode(); n; n = walker.nextNode()) {
        const el = n.parentElement;
        const text = (n.textContent ?? '').trim();
        if (!el || text === '') continue;
        const box = el.getBoundingClientRect();
        const style = getComputedStyle(el);
        if (box.width === 0 || style.visibility === 'hidden' || el.closest('[hidden]')) continue;
        // A disabled control is exempt from the contrast rule (WCAG 2.1, 1.4.3: inactive components).
        if (el.closest('button:disabled, select:disabled, input:disabled')) continue;
        out.push({
          where: (el.closest('[data-testid]') as HTMLElement | null)?.dataset.testid ?? el.tagName,
          text: text.slice(0, 30),
          colour: style.color,
          background: backgroundOf(el),
        });
      }
    }
    return out;
  }, selector);
}

/** A short fingerprint of every canvas under `selector` (its pixels), in document order. */
export function canvasPrints(page: Page, selector: string): Promise<string[]> {
  return page.evaluate((sel) => {
    return Array.from(document.querySelectorAll<HTMLCanvasElement>(`${sel} canvas`)).map((c) => {
      const ctx = c.getContext('2d');
      if (!ctx || c.width === 0 || c.height === 0) return 'empty';
      const d = ctx.getImageData(0, 0, c.width, c.height).data;
      let h = 2166136261;
      for (let i = 0; i < d.length; i += 7) h = Math.imul(h ^ d[i], 16777619) >>> 0;
      return h.toString(16);
    });
  }, selector);
}

/** Width and height from a PNG file's IHDR chunk (PNG specification, section 11.2.2). */
export async function pngSize(file: string): Promise<{ width: number; height: number; bytes: number }> {
  const b = await readFile(file);
  if (b.toString('latin1', 1, 4) !== 'PNG') throw new Error(`${file} is not a PNG`);
  return { width: b.readUInt32BE(16), height: b.readUInt32BE(20), bytes: b.length };
}

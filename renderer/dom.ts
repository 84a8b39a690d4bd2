// A tiny element builder: no framework, no innerHTML (the CSP and plain safety both
// prefer text nodes).

type Attrs = Record<string, string | number | boolean | undefined>;
type Child = Node | string | number | null | undefined;

export function h<K extends keyof HTMLElementTagNameMap>(
  tag: K,
  attrs: Attrs = {},
  ...children: Child[]
): HTMLElementTagNameMap[K] {
  const el = document.createElement(tag);
  for (const [name, value] of Object.entries(attrs)) {
    if (value === undefined || value === false) continue;
    el.setAttribute(name, value === true ? '' : String(value));
  }
  for (const child of children) {
    if (child === null || child === undefined) continue;
    el.append(typeof child === 'object' ? child : String(child));
  }
  return el;
}

/** Minimal string-based SVG/XML building: no DOM, so charts render in plain Node. */
export type AttrValue = string | number | undefined | null | false;
export type Attrs = Record<string, AttrValue>;

const XML_ESCAPES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&apos;' };

/** Escape text or attribute content for XML (and HTML). */
export function escapeXml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => XML_ESCAPES[c]);
}

/** Coordinates rounded to 0.01 px keep files small without visible error. */
export function px(x: number): string {
  return String(Math.round(x * 100) / 100);
}

export function attrs(a: Attrs): string {
  let s = '';
  for (const [k, v] of Object.entries(a)) {
    if (v === undefined || v === null || v === false) continue;
    s += ` ${k}="${escapeXml(typeof v === 'number' ? px(v) : v)}"`;
  }
  return s;
}

/** An element; `children` is already-serialised markup. No children -> self-closing. */
export function el(name: string, a: Attrs = {}, children?: string | string[]): string {
  const inner = Array.isArray(children) ? children.join('') : children;
  if (inner === undefined || inner === '') return `<${name}${attrs(a)}/>`;
  return `<${name}${attrs(a)}>${inner}</${name}>`;
}

/** A text element with escaped content. */
export function text(content: string, a: Attrs = {}): string {
  return `<text${attrs(a)}>${escapeXml(content)}</text>`;
}

/**
 * Id base of one result in a report: the stack or stage name, and for an alternative also its topology, since
 * every topology tried for one stack (or load tried for one stage) gets its own section and charts.
 */
export function resultSlug(kind: 'stack' | 'stage', name: string, topology: string, chosen?: boolean): string {
  return slug(`${kind}-${name}${chosen === false ? `-${topology}` : ''}`);
}

/** Ids usable in XML and CSS, derived from free text. */
export function slug(textIn: string): string {
  const s = textIn.toLowerCase().normalize('NFKD').replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '');
  return /^[a-z]/.test(s) ? s : `c-${s || 'chart'}`;
}

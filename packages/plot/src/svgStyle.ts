/**
 * The visual language of hexsalvage plots: a quiet style, the Okabe–Ito colour-blind-safe
 * palette, one font stack that exists on a plain Linux machine, and sizes that stay readable on
 * A4 (plots are drawn about 160 mm wide: 11 px text is ≈ 8 pt there).
 */
export const STYLE = {
  font: "'DejaVu Sans', 'Liberation Sans', Arial, sans-serif",
  fontSize: 11,
  smallFont: 9,
  titleFont: 13,
  ink: '#222222',
  faint: '#c8c8c8',
  grid: '#e6e6e6',
  // Okabe & Ito (2008) palette, safe for the common forms of colour blindness
  blue: '#0072B2',
  orange: '#E69F00',
  sky: '#56B4E9',
  green: '#009E73',
  vermillion: '#D55E00',
  purple: '#CC79A7',
  yellow: '#F0E442',
} as const;

/**
 * A number for SVG output at fixed precision (byte-stable output, no `-0`).
 *
 * @param x - value
 * @param digits - decimals (default 2)
 * @returns the text
 * @example
 * ```ts
 * n(1 / 3); // '0.33'
 * ```
 */
export function n(x: number, digits = 2): string {
  const s = x.toFixed(digits);
  return /^-0\.?0*$/.test(s) ? s.slice(1) : s;
}

/**
 * A phase level as drawn: P, O, N for +1, 0, −1 (units of Vdc/2), else the number.
 *
 * @deprecated mixes letters and numbers on legs with more levels; the plots use `levelNotation`
 * from `@hexsalvage/core` (one notation per leg).
 *
 * @param level - potential in units of Vdc/2
 * @param digits - decimals for levels other than ±1 and 0
 * @returns the label
 * @example
 * ```ts
 * levelLetter(-1); // 'N'
 * ```
 */
export function levelLetter(level: number, digits = 1): string {
  return level === 1 ? 'P' : level === 0 ? 'O' : level === -1 ? 'N' : n(level, digits);
}

/**
 * Escapes text for SVG/XML content and attribute values.
 *
 * @param s - raw text
 * @returns escaped text
 * @example
 * ```ts
 * esc('a < b'); // 'a &lt; b'
 * ```
 */
export function esc(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

/** Options shared by every plot. */
export interface SvgFrameOptions {
  readonly width: number;
  readonly height: number;
  /** Accessible title (`<title>`), also drawn at the top. */
  readonly title: string;
  /** Accessible description (`<desc>`): what the picture shows, in words. */
  readonly desc: string;
}

/**
 * Wraps plot content in an SVG document with title, description and the common styles.
 *
 * @param frame - size, title, description
 * @param body - SVG elements
 * @returns a standalone SVG document
 * @example
 * ```ts
 * svgFrame({ width: 100, height: 50, title: 't', desc: 'd' }, '<circle r="3"/>');
 * ```
 */
export function svgFrame(frame: SvgFrameOptions, body: string): string {
  const { width, height } = frame;
  // ids must stay unique when several plots are inlined in one HTML page, and byte-stable: derive
  // them from the plot's own title and description
  const id = `hs${fnv1a(`${frame.title}\n${frame.desc}`)}`;
  return [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" font-family="${esc(STYLE.font)}" font-size="${STYLE.fontSize}" role="img" aria-labelledby="${id}-t ${id}-d">`,
    `<title id="${id}-t">${esc(frame.title)}</title>`,
    `<desc id="${id}-d">${esc(frame.desc)}</desc>`,
    `<rect x="0" y="0" width="${width}" height="${height}" fill="#ffffff"/>`,
    `<text x="12" y="20" font-size="${STYLE.titleFont}" font-weight="bold" fill="${STYLE.ink}">${esc(frame.title)}</text>`,
    body,
    '</svg>',
  ].join('\n');
}

function fnv1a(s: string): string {
  let h = 0x811c9dc5;
  for (let i = 0; i < s.length; i++) {
    h ^= s.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h.toString(16).padStart(8, '0');
}

/**
 * Splits text into lines of at most `width` characters at spaces (a word longer than the width
 * gets a line of its own). SVG text does not wrap by itself; plots call this for captions that
 * name devices and reasons, whose length depends on the leg.
 *
 * @param text - the text
 * @param width - the most characters per line
 * @returns the lines, at least one
 * @example
 * ```ts
 * wrapWords('one two three', 7); // ['one two', 'three']
 * ```
 */
export function wrapWords(text: string, width: number): string[] {
  const lines: string[] = [];
  let line = '';
  for (const word of text.split(/\s+/).filter(Boolean)) {
    if (line && line.length + 1 + word.length > width) {
      lines.push(line);
      line = word;
    } else line = line ? `${line} ${word}` : word;
  }
  lines.push(line);
  return lines;
}

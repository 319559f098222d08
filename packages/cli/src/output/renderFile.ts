import { HexsalvageInputError } from '@hexsalvage/core';
import { writeFileAtomic } from './output.js';

/**
 * Writes an SVG document as `.svg`, or rasterised as `.png` with resvg (a general-purpose SVG
 * renderer from the npm registry, loaded only when a PNG is asked for) using the machine's fonts.
 *
 * @param path - output path ending in .svg or .png
 * @param svg - the SVG document
 * @returns bytes written
 * @throws HexsalvageInputError on another extension or an unwritable path
 * @example
 * ```ts
 * await writeSvgOrPng('diagram.png', svg);
 * ```
 */
export async function writeSvgOrPng(path: string, svg: string): Promise<number> {
  if (path.endsWith('.svg')) {
    await writeFileAtomic(path, svg);
    return Buffer.byteLength(svg);
  }
  if (path.endsWith('.png')) {
    const png = await svgToPng(svg);
    await writeFileAtomic(path, png);
    return png.length;
  }
  throw new HexsalvageInputError('usage', '--out', '--out', 'a file name ending in .svg or .png', path);
}

/**
 * Rasterises an SVG document at twice its size.
 *
 * @param svg - the SVG document
 * @returns PNG bytes
 * @example
 * ```ts
 * const png = await svgToPng(svg);
 * ```
 */
export async function svgToPng(svg: string): Promise<Uint8Array> {
  const { Resvg } = await import('@resvg/resvg-js');
  const r = new Resvg(svg, { fitTo: { mode: 'zoom', value: 2 }, font: { loadSystemFonts: true, defaultFontFamily: 'DejaVu Sans' } });
  return r.render().asPng();
}

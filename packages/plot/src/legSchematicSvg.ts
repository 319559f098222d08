import type { LegNetlist } from '@hexsalvage/core';
import { legLayout } from './legLayout.js';
import { esc, n, STYLE, svgFrame, wrapWords } from './svgStyle.js';

/** What to highlight on a leg schematic. */
export interface LegSchematicOptions {
  /** Elements failed open (`outerUpper`, `outerUpper.diode`, …): crossed out, labelled OPEN. */
  readonly failed?: readonly string[];
  /** Elements failed short: bridged by a thick bar, labelled SHORT (they conduct both ways). */
  readonly shorted?: readonly string[];
  /** A gate pattern to show: its switches are drawn on. */
  readonly pattern?: { readonly name: string; readonly gates: readonly string[] };
  /** Current sign the conduction path is drawn for. */
  readonly sign?: '+' | '-';
  /** Elements carrying the current (from the leg table); empty with `level: null` = interrupted. */
  readonly path?: readonly string[];
  /** Output level for that pattern and sign; `null` = current interrupted. */
  readonly level?: number | null;
  /**
   * What the pattern does for the sign: `path` (the default: the current flows as drawn),
   * `interrupted` (no path), `shoot-through` (the path drawn runs from one DC node to a lower one),
   * `unsafe` (the current flows as drawn but a device would block more than its rating: not used).
   */
  readonly state?: 'path' | 'interrupted' | 'shoot-through' | 'unsafe';
  /** Why, for `unsafe` and `shoot-through` (e.g. `outerUpper would block 2 × Vdc/2 (rating 1 × Vdc/2)`). */
  readonly reason?: string;
  readonly title?: string;
  /**
   * Make every element a control for phase `phase` (the explorer page): each switch and each
   * diode is its own group with `data-device="PHASE.ID"` (an antiparallel diode `PHASE.ID.diode`),
   * a hit area, `role="button"`, a keyboard stop and a tooltip naming its state. Default none: a
   * static drawing.
   */
  readonly phase?: string;
  /** Draw the caption and the two legend lines under the leg. Default true. */
  readonly legend?: boolean;
}

/**
 * A schematic of a leg drawn from its netlist: DC nodes with their potentials, every device with
 * its forward direction (arrow), antiparallel diodes beside their switch, failed elements crossed
 * out and labelled OPEN, gated-on switches filled, and the conduction path of a pattern and current
 * sign drawn thick; an interrupted path is written out as such.
 *
 * @param leg - the leg netlist
 * @param options - failed elements, pattern, sign, path
 * @returns an SVG document
 * @example
 * ```ts
 * legSchematicSvg(builtinLeg('npc'), { failed: ['outerUpper'], pattern: { name: 'P', gates: ['outerUpper', 'innerUpper'] }, sign: '+', path: ['innerUpper', 'clampUpper'], level: 0 });
 * ```
 */
export function legSchematicSvg(leg: LegNetlist, options: LegSchematicOptions = {}): string {
  const layout = legLayout(leg);
  const pots = Object.values(leg.dcNodes);
  const span = Math.max(...pots) - Math.min(...pots) || 1;
  const W = 600;
  // the caption names devices and reasons: wrapped to the width of the drawing (bold 11 px text
  // is about 7 px a character), and the drawing grows by its extra lines
  const captionLines = wrapWords(captionText(options), 82);
  const extra = (captionLines.length - 1) * 15;
  const H = Math.max(374, 120 * Object.keys(leg.dcNodes).length + 94) + extra;
  const L = 80;
  const R = W - 90;
  const T = 56;
  const B = H - 118 - extra;
  const P = (node: string): [number, number] => {
    const [x, y] = layout.get(node) ?? [0.5, 0];
    return [L + x * (R - L), T + ((Math.max(...pots) - y) / span) * (B - T)];
  };
  const failed = new Set(options.failed ?? []);
  const shorted = new Set(options.shorted ?? []);
  const gates = new Set(options.pattern?.gates ?? []);
  const path = new Set(options.path ?? []);
  const body: string[] = [];
  // DC rail labels
  for (const [node, v] of Object.entries(leg.dcNodes)) {
    const [x, y] = P(node);
    body.push(
      `<g class="dc-node"><rect x="${n(x - 46)}" y="${n(y - 10)}" width="40" height="20" fill="#f2f2f2" stroke="${STYLE.ink}"/><text x="${n(x - 26)}" y="${n(y + 4)}" text-anchor="middle" font-weight="bold">${esc(node)}</text><text x="${n(x - 26)}" y="${n(y + 22)}" text-anchor="middle" font-size="${STYLE.smallFont}">${n(v, 2)}·Vdc/2</text></g>`,
    );
  }
  // devices: sort pairs so that two devices on the same node pair get distinct offsets
  const pairCount = new Map<string, number>();
  for (const d of leg.devices) {
    const key = [d.from, d.to].sort().join('|');
    const k = pairCount.get(key) ?? 0;
    pairCount.set(key, k + 1);
    const [x1, y1] = P(d.from);
    const [x2, y2] = P(d.to);
    const len = Math.hypot(x2 - x1, y2 - y1) || 1;
    const ux = (x2 - x1) / len;
    const uy = (y2 - y1) / len;
    const off = k * 22;
    const [ox, oy] = [-uy * off, ux * off];
    const mx = (x1 + x2) / 2 + ox;
    const my = (y1 + y2) / 2 + oy;
    const angle = (Math.atan2(uy, ux) * 180) / Math.PI;
    // antiparallel diodes and labels go to the side away from the drawing's centre line (label
    // outermost), so that mirror-image devices (upper/lower) never crowd into the middle
    const centre = (T + B) / 2;
    const away = Math.abs(ux) > 1e-9 ? (my < centre ? -Math.sign(ux) : Math.sign(ux)) : mx < (L + R) / 2 ? Math.sign(uy) : -Math.sign(uy);
    const side = away === 0 ? 1 : away;
    // the current through the switch itself, or past it through its antiparallel diode (drawn
    // through the diode, beside a failed switch it never crosses)
    const viaDiode = path.has(`${d.id}.diode`) && !path.has(d.id);
    const [px, py] = viaDiode ? [mx - uy * side * 17, my + ux * side * 17] : [mx, my];
    const stroke = options.state === 'shoot-through' || options.state === 'unsafe' ? STYLE.vermillion : STYLE.green;
    if (path.has(d.id) || viaDiode)
      body.push(
        `<path class="conduction" d="M${n(x1)},${n(y1)} L${n(px)},${n(py)} L${n(x2)},${n(y2)}" stroke="${stroke}" stroke-width="7" stroke-linecap="round" fill="none" opacity="${stroke === STYLE.green ? 0.55 : 0.8}"/>`,
      );
    body.push(`<path class="wire" d="M${n(x1)},${n(y1)} L${n(mx)},${n(my)} L${n(x2)},${n(y2)}" stroke="${STYLE.ink}" stroke-width="1.3" fill="none"/>`);
    const place = `translate(${n(mx)} ${n(my)}) rotate(${n(angle, 1)})`;
    const g: string[] = [openGroup(`device ${d.kind}`, d.id, place, options.phase, failed, shorted)];
    if (d.kind === 'diode') {
      g.push(diodeSymbol(0, path.has(d.id), stroke));
      if (options.phase !== undefined)
        g.push(...[failed.has(d.id) ? crossMark(0, 0) : '', shorted.has(d.id) ? shortMark(0) : '', hitArea(0, 10)].filter(Boolean));
    } else {
      const on = gates.has(d.id);
      g.push(`<rect x="-13" y="-8" width="26" height="16" rx="2" fill="${on ? STYLE.blue : '#ffffff'}" stroke="${STYLE.ink}" stroke-width="1.2"/>`);
      g.push(`<path d="M-6,0 L5,0 M1,-3.5 L5,0 L1,3.5" stroke="${on ? '#ffffff' : STYLE.ink}" stroke-width="1.3" fill="none"/>`);
      if (d.kind === 'mosfet') g.push(`<circle class="mosfet-mark" cx="0" cy="${-side * 11}" r="2" fill="${STYLE.ink}"/>`);
      if (options.phase !== undefined)
        g.push(...[failed.has(d.id) ? crossMark(0, 0) : '', shorted.has(d.id) ? shortMark(0) : '', hitArea(0, 11)].filter(Boolean));
      // a control is one group per element, so that a click on the diode never reaches its switch
      if (d.antiparallelDiode && options.phase !== undefined)
        g.push(`</g>${openGroup('device diode antiparallel', `${d.id}.diode`, place, options.phase, failed, shorted)}`);
      if (d.antiparallelDiode) g.push(`<g transform="translate(0 ${side * 17}) rotate(180)">${diodeSymbol(0, path.has(`${d.id}.diode`), stroke)}</g>`);
    }
    if (failed.has(d.id) && options.phase === undefined) g.push(crossMark(0, 0));
    if (d.antiparallelDiode && failed.has(`${d.id}.diode`)) g.push(crossMark(0, side * 17));
    if (shorted.has(d.id) && options.phase === undefined) g.push(shortMark(0));
    if (d.antiparallelDiode && shorted.has(`${d.id}.diode`)) g.push(shortMark(side * 17));
    if (d.antiparallelDiode && options.phase !== undefined) g.push(hitArea(side * 17, 8));
    g.push('</g>');
    body.push(g.join(''));
    const tag = [
      d.id,
      failed.has(d.id) ? 'OPEN' : '',
      shorted.has(d.id) ? 'SHORT' : '',
      failed.has(`${d.id}.diode`) ? 'diode OPEN' : '',
      shorted.has(`${d.id}.diode`) ? 'diode SHORT' : '',
    ]
      .filter(Boolean)
      .join(' · ');
    const bad = /OPEN|SHORT/.test(tag);
    body.push(
      `<text class="device-label${bad ? ' failed' : ''}" x="${n(mx - uy * (d.antiparallelDiode ? 36 : 22) * side)}" y="${n(my + ux * (d.antiparallelDiode ? 36 : 22) * side + 4)}" text-anchor="middle" font-size="${STYLE.smallFont}" fill="${bad ? STYLE.vermillion : STYLE.ink}"${bad ? ' font-weight="bold"' : ''}>${esc(tag)}</text>`,
    );
  }
  const [ox, oy] = P(leg.output);
  body.push(
    `<g class="output"><circle cx="${n(ox)}" cy="${n(oy)}" r="5" fill="${STYLE.ink}"/><line x1="${n(ox)}" y1="${n(oy)}" x2="${n(ox + 40)}" y2="${n(oy)}" stroke="${STYLE.ink}" stroke-width="1.3"/><text x="${n(ox + 44)}" y="${n(oy + 4)}" font-weight="bold">${esc(leg.output)}</text></g>`,
  );
  for (const [node, [x, y]] of [...layout].map(([k]) => [k, P(k)] as const)) {
    if (node in leg.dcNodes || node === leg.output) continue;
    body.push(
      `<circle class="node" cx="${n(x)}" cy="${n(y)}" r="3" fill="${STYLE.ink}"/><text x="${n(x + 5)}" y="${n(y - 6)}" font-size="${STYLE.smallFont}" fill="#666666">${esc(node)}</text>`,
    );
  }
  const caption = captionText(options);
  const warn =
    options.state === 'interrupted' ||
    options.state === 'shoot-through' ||
    options.state === 'unsafe' ||
    (options.state === undefined && options.level === null);
  const cls = options.state && options.state !== 'path' ? ` ${options.state}` : options.level === null ? ' interrupted' : '';
  const spans = captionLines.map((line, i) => `<tspan x="12" dy="${i === 0 ? 0 : 15}">${esc(line)}</tspan>`).join('');
  if (options.legend !== false) {
    body.push(
      `<text class="caption${cls}" x="12" y="${H - 54 - extra}" fill="${warn ? STYLE.vermillion : STYLE.ink}"${warn ? ' font-weight="bold"' : ''}>${spans}</text>`,
    );
    body.push(
      `<text x="12" y="${H - 34}" font-size="${STYLE.smallFont}" fill="${STYLE.ink}">Arrow: forward direction. Filled box: switch gated on. Dot: MOSFET (conducts both ways when on).</text>`,
    );
    body.push(
      `<text x="12" y="${H - 20}" font-size="${STYLE.smallFont}" fill="${STYLE.ink}">Thick green: conducting path; thick orange-red: a path never used. × and OPEN: failed open; bar and SHORT: failed short.</text>`,
    );
  }
  const failedText = [failed.size ? ` Failed open: ${[...failed].join(', ')}.` : '', shorted.size ? ` Failed short: ${[...shorted].join(', ')}.` : ''].join('');
  return svgFrame(
    {
      width: W,
      height: options.legend === false ? B + 40 : H,
      title: options.title ?? `Leg ${leg.name}`,
      desc: `Schematic of leg ${leg.name} with ${leg.devices.length} devices.${failedText} ${caption}`,
    },
    body.join('\n'),
  );
}

function captionText(o: LegSchematicOptions): string {
  if (!o.pattern || !o.sign) return 'No pattern selected.';
  const s = o.sign === '+' ? 'i > 0' : 'i < 0';
  const dir = o.sign === '+' ? 'i > 0 (out of the leg)' : 'i < 0 (into the leg)';
  const through = (o.path ?? []).join(', ') || '(none)';
  if (o.state === 'shoot-through') return `Pattern ${o.pattern.name}: shoot-through${o.reason ? ` ${o.reason}` : ''}: never used.`;
  if (o.state === 'unsafe')
    return `Pattern ${o.pattern.name}, ${s}: the current flows through ${through}, but ${o.reason ?? 'a device would block more than its rating'}: not used for this sign.`;
  if (o.state === 'interrupted' || o.level === null) return `Pattern ${o.pattern.name}, ${s}: current interrupted (no path), forbidden for this sign.`;
  return `Pattern ${o.pattern.name}, ${dir}: output at ${n(o.level ?? 0, 2)}·Vdc/2 through ${through}.`;
}

// The opening tag of an element's group; on the explorer page (a phase given) also what makes it a
// control: its address, its state in words (tooltip and screen reader) and a keyboard stop.
function openGroup(cls: string, id: string, place: string, phase: string | undefined, failed: ReadonlySet<string>, shorted: ReadonlySet<string>): string {
  if (phase === undefined) return `<g class="${cls}" data-id="${esc(id)}" transform="${place}">`;
  const state = failed.has(id) ? 'open' : shorted.has(id) ? 'short' : 'healthy';
  const next = state === 'healthy' ? 'open' : state === 'open' ? 'short' : 'healthy';
  const label = `${phase}.${id}: ${state} (activate: ${next})`;
  return `<g class="${cls}" data-id="${esc(id)}" data-device="${esc(`${phase}.${id}`)}" data-state="${state}" role="button" tabindex="0" aria-label="${esc(label)}" transform="${place}"><title>${esc(`${phase}.${id}: ${state}`)}</title>`;
}

// An invisible target around an element, so that a click anywhere on its symbol reaches it.
function hitArea(y: number, half: number): string {
  return `<rect class="hit" x="${-half - 4}" y="${y - half}" width="${2 * half + 8}" height="${2 * half}" fill="#ffffff" fill-opacity="0" pointer-events="all"/>`;
}

// A failed-short element: a thick bar bridging it (it conducts both ways whatever its gate).
function shortMark(y: number): string {
  return `<path class="short-mark" d="M-15,${y} L15,${y}" stroke="${STYLE.vermillion}" stroke-width="4" stroke-linecap="round"/>`;
}

function diodeSymbol(y: number, lit: boolean, colour: string): string {
  const c = lit ? colour : STYLE.ink;
  return `<path d="M-5,${y - 6} L5,${y} L-5,${y + 6} Z" fill="${lit ? colour : '#ffffff'}" stroke="${c}" stroke-width="1.2"/><line x1="5" y1="${y - 6}" x2="5" y2="${y + 6}" stroke="${c}" stroke-width="1.6"/>`;
}

function crossMark(x: number, y: number): string {
  return `<path class="failed-mark" d="M${x - 9},${y - 9} L${x + 9},${y + 9} M${x - 9},${y + 9} L${x + 9},${y - 9}" stroke="${STYLE.vermillion}" stroke-width="2.6" stroke-linecap="round"/>`;
}

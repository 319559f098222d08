/**
 * The explorer page: a leg drawn three times (phases a, b, c), every element a control, and at
 * once what the converter can still do. Runs in the browser from one inline script; it never
 * fetches anything. The computing runs in a worker made from this same script (or on the page
 * where no worker can be made): the limit comes first, the pictures after it, and a heavy case
 * never stalls the page.
 */
import {
  BUILTIN_TOPOLOGIES,
  CAUTIONS,
  HexsalvageInputError,
  LEVEL_STEP_RULES,
  parseFault,
  parseJsonText,
  parseNetlist,
  PHASES,
  type LegNetlist,
  type LevelStepRule,
  type Phase,
} from '@hexsalvage/core';
import { MAX_INPUT_BYTES } from '@hexsalvage/core/internal';
import { esc } from '@hexsalvage/plot';
import { errorLine, legOf } from './explorerModel.js';
import { toWire, type ExplorerReply, type ExplorerRequest } from './explorerProtocol.js';
import { answer } from './explorerWorker.js';
import { commandLineOf, cycleDevice, initialState, type ExplorerState } from './explorerState.js';
import { EXPLORER_CSS } from './explorerStyles.js';
import { faultListHtml, legsHtml } from './explorerView.js';

/** What the CLI puts into the page (`<script type="application/json" id="hs-config">`). */
interface PageConfig {
  readonly version: string;
  readonly topology: string;
  readonly netlist?: LegNetlist;
  /** The netlist file's text and name, for the report's input list. */
  readonly netlistFile?: { readonly name: string; readonly text: string };
  readonly faults?: readonly string[];
  readonly vdc?: number;
}

// In the worker this same script only answers requests (it has no document).
const inWorker = typeof document === 'undefined';
if (inWorker) {
  const scope = globalThis as unknown as { onmessage: ((e: MessageEvent<ExplorerRequest>) => void) | null; postMessage: (r: ExplorerReply) => void };
  scope.onmessage = (e) => answer(e.data, (r) => scope.postMessage(r));
}
const ownCode = inWorker ? '' : ((document.currentScript as HTMLScriptElement | null)?.textContent ?? '');
const config = (inWorker ? {} : JSON.parse(document.getElementById('hs-config')?.textContent ?? '{}')) as PageConfig;
let fileLeg: { name: string; netlist: LegNetlist; text: string } | null =
  config.netlist && config.netlistFile ? { name: config.netlistFile.name, netlist: config.netlist, text: config.netlistFile.text } : null;
/** The state on screen (its limit shown) and the latest one asked for (changes build on it). */
let state: ExplorerState = inWorker ? initialState('npc') : startState();
let candidate: ExplorerState = state;
let polarityChoice = '';

const $ = <T extends Element>(sel: string): T => {
  const el = document.querySelector<T>(sel);
  if (!el) throw new Error(`page element ${sel} missing`);
  return el;
};

function startState(): ExplorerState {
  const s = fileLeg ? initialState(`file:${fileLeg.name}`, fileLeg.netlist, config.vdc ?? 750) : initialState(config.topology, undefined, config.vdc ?? 750);
  const faults = new Map<string, 'open' | 'short'>();
  const leg = s.netlist ?? legOf(s);
  for (const text of config.faults ?? []) {
    const f = parseFault(text, leg, '--fault');
    faults.set(`${f.phase}.${f.element}`, f.mode);
  }
  return { ...s, faults };
}

function skeleton(): string {
  const legOptions = BUILTIN_TOPOLOGIES.map((t) => `<option value="${t}">${t}</option>`).join('');
  return `<header><h1>hexsalvage explorer</h1><p>Fail an element with a click and see what the converter can still do. Version ${esc(config.version)}.</p></header>
<section class="leg-row" aria-label="Leg"><h2>The leg, per phase: click an element (or Tab to it and press Enter) to fail it — healthy → open → short → healthy. <span class="muted">Arrow: forward direction; dot: MOSFET; × OPEN: failed open; bar SHORT: failed short.</span></h2><div class="legs" id="legs"></div></section>
<div class="layout">
<aside aria-label="Inputs">
  <h2>Leg</h2>
  <label>Topology <select name="topology">${legOptions}</select></label>
  <label>Netlist file <input type="file" name="netlist" accept=".json,application/json"></label>
  <p class="error" id="leg-error" role="alert"></p>
  <h2>Operating point</h2>
  <label>Load angle φ (°, currents lag) <input type="number" name="load-angle" min="-180" max="180" step="any" value="0"></label>
  <input type="range" name="load-angle-slider" min="-90" max="90" step="1" value="0" aria-label="Load angle slider, degrees">
  <label>Polarity margin δ (°) <input type="number" name="polarity-margin" min="0" max="59.9" step="any" value="0"></label>
  <label>Level steps <select name="level-steps">${LEVEL_STEP_RULES.map((r) => `<option value="${r}">${r}</option>`).join('')}</select></label>
  <label>DC link Vdc (V, empty: per unit only) <input type="number" name="vdc" min="0" step="any"></label>
  <p class="error" id="input-error" role="alert"></p>
  <h2>Faults</h2>
  <div id="fault-list"></div>
  <label>Bypass <select name="bypass"><option value="">none</option>${PHASES.map((p) => `<option value="${p}">phase ${p} tied to the midpoint</option>`).join('')}</select></label>
  <button type="button" name="clear">Clear all faults</button>
  <h2>Take it away</h2>
  <code id="command-line"></code>
  <button type="button" name="copy">Copy the command line</button>
  <button type="button" name="download-plan">Download plan JSON</button>
  <button type="button" name="download-report">Download report HTML</button>
  <p class="muted" id="copy-status" aria-live="polite"></p>
</aside>
<main>
  <section aria-label="Result"><div class="result-head"><span>Safe maximum modulation index m<sub>max</sub> (units of Vdc/2):</span><output data-result="m-max" data-value="" data-faults="" data-load-angle=""></output></div><div id="result"></div></section>
  <section aria-label="Vectors and derating"><h2>Vectors and derating</h2>
  <label class="inline">Polarity drawn <select name="polarity"></select></label>
  <div class="plots"><figure id="diagram"></figure><figure id="derating"></figure></div></section>
  <section aria-label="Remedies"><h2>Remedies</h2><div id="remedies"></div></section>
  <section aria-label="Level table"><h2>What each faulted phase can still do</h2><div id="levels"></div></section>
</main>
</div>
<footer class="cautions" role="note"><strong>Caution.</strong> ${CAUTIONS.map((c) => esc(c)).join(' ')}</footer>`;
}

// The computing side: a worker made from this very script, so that a heavy case (a triple fault of
// a many-level leg takes seconds) never stalls the page; on the page itself where none can be made.
interface Waiting {
  readonly t0: number;
  readonly onResult?: () => void;
  readonly onError?: (message: string) => void;
  readonly onFile?: (text: string) => void;
}
const waiting = new Map<number, Waiting>();
let sequence = 0;
let latest = 0;
let send: (req: ExplorerRequest) => void = () => undefined;

function makeChannel(code: string, onReply: (reply: ExplorerReply) => void): (req: ExplorerRequest) => void {
  try {
    if (code === '' || typeof Worker === 'undefined') throw new Error('no worker');
    const worker = new Worker(URL.createObjectURL(new Blob([code], { type: 'text/javascript' })));
    worker.onmessage = (e: MessageEvent<ExplorerReply>) => onReply(e.data);
    document.body.dataset.computing = 'worker';
    return (req) => worker.postMessage(req);
  } catch {
    document.body.dataset.computing = 'page';
    return (req) => setTimeout(() => answer(req, onReply), 0);
  }
}

// A change: the drawing of the legs follows the click at once; the limit and the pictures follow
// from the worker. Later changes build on this one; if it fails, the last good state comes back.
function update(next: ExplorerState, hooks: { onResult?: () => void; onError?: (message: string) => void } = {}): void {
  candidate = next;
  const id = ++sequence;
  latest = id;
  waiting.set(id, { t0: performance.now(), ...hooks });
  showState(next);
  document.body.dataset.pending = 'result';
  send({ kind: 'update', id, state: toWire(next), polarity: polarityChoice });
}

function showState(s: ExplorerState): void {
  const focused = (document.activeElement as HTMLElement | null)?.dataset?.device;
  $('#legs').innerHTML = legsHtml(legOf(s), s);
  if (focused) document.querySelector<HTMLElement>(`[data-device="${CSS.escape(focused)}"]`)?.focus();
  $('#fault-list').innerHTML = faultListHtml(legOf(s), s);
  $('#command-line').textContent = commandLineOf('plan', s, legOf(s));
  syncControls(s);
}

function receive(reply: ExplorerReply): void {
  const w = waiting.get(reply.id);
  if (!w) return;
  if (reply.kind === 'file') {
    waiting.delete(reply.id);
    w.onFile?.(reply.text);
    return;
  }
  if (reply.kind === 'error') {
    waiting.delete(reply.id);
    if (w.onFile) {
      $('#input-error').textContent = reply.message;
      return;
    }
    if (reply.id !== latest) return;
    candidate = state;
    showState(state);
    if (w.onError) w.onError(reply.message);
    else $('#input-error').textContent = reply.message;
    delete document.body.dataset.pending;
    return;
  }
  if (reply.id !== latest) {
    if (reply.kind === 'pictures') waiting.delete(reply.id);
    return;
  }
  if (reply.kind === 'result') {
    state = candidate;
    w.onResult?.();
    $('#input-error').textContent = '';
    const out = $<HTMLOutputElement>('[data-result="m-max"]');
    out.dataset.value = String(reply.mMax);
    out.dataset.faults = reply.faults;
    out.dataset.loadAngle = String(reply.loadAngleDeg);
    out.textContent = reply.mMax.toFixed(6);
    $('#result').innerHTML = reply.html;
    document.body.dataset.resultMs = (performance.now() - w.t0).toFixed(2);
    document.body.dataset.pending = 'pictures';
    return;
  }
  waiting.delete(reply.id);
  $('select[name="polarity"]').innerHTML = reply.polarities
    .map((p) => `<option value="${esc(p.value)}"${p.value === reply.polarity ? ' selected' : ''}>${p.label}</option>`)
    .join('');
  $('#diagram').innerHTML =
    `${reply.diagram}<figcaption class="muted">Polarity ${esc(reply.polarity)}: filled dots survive, hollow squares are lost; grey: the admissible triangles; green circle: mMax.</figcaption>`;
  $('#derating').innerHTML =
    `${reply.derating}<figcaption class="muted">Exact safe mMax over the load angle; the operating angle ${state.loadAngleDeg}° is marked.</figcaption>`;
  $('#remedies').innerHTML = reply.remedies;
  $('#levels').innerHTML = reply.levels;
  document.body.dataset.picturesMs = (performance.now() - w.t0).toFixed(2);
  delete document.body.dataset.pending;
}

function fetchFile(kind: 'plan-json' | 'report', onFile: (text: string) => void, inputs: readonly { path: string; sha256: string }[] = []): void {
  const id = ++sequence;
  waiting.set(id, { t0: performance.now(), onFile });
  const s = toWire(state);
  send(kind === 'plan-json' ? { kind, id, state: s } : { kind, id, state: s, version: config.version, inputs });
}

// Controls show the state (after an error too: the previous values come back).
function syncControls(s: ExplorerState = state): void {
  $<HTMLSelectElement>('select[name="topology"]').value = s.topology;
  const angle = $<HTMLInputElement>('input[name="load-angle"]');
  if (document.activeElement !== angle) angle.value = String(s.loadAngleDeg);
  const slider = $<HTMLInputElement>('input[name="load-angle-slider"]');
  if (document.activeElement !== slider) slider.value = String(Math.max(-90, Math.min(90, s.loadAngleDeg)));
  $<HTMLInputElement>('input[name="polarity-margin"]').value = String(s.polarityMarginDeg);
  $<HTMLSelectElement>('select[name="level-steps"]').value = s.levelSteps;
  $<HTMLInputElement>('input[name="vdc"]').value = s.vdc === null ? '' : String(s.vdc);
  $<HTMLSelectElement>('select[name="bypass"]').value = s.bypass ?? '';
}

// A number field: blank is refused (except where blank means none), anything else goes to the
// library, which checks its range and names the key.
function numberOf(input: HTMLInputElement, key: string): number {
  if (input.value.trim() === '' || !Number.isFinite(Number(input.value))) throw new HexsalvageInputError('option', 'explorer', key, 'a number', input.value);
  return Number(input.value);
}

function onInput(fn: () => ExplorerState): void {
  try {
    update(fn());
  } catch (e) {
    $('#input-error').textContent = errorLine(e);
    syncControls(candidate);
  }
}

function chooseLeg(value: string): void {
  $('#leg-error').textContent = '';
  if (value.startsWith('file:') && fileLeg) update(initialState(`file:${fileLeg.name}`, fileLeg.netlist, candidate.vdc));
  else update(initialState(value, undefined, candidate.vdc));
}

async function openNetlist(file: File): Promise<void> {
  const shown = file.name;
  try {
    if (file.size > MAX_INPUT_BYTES)
      throw new HexsalvageInputError('netlist', shown, '(file)', `a file of at most ${MAX_INPUT_BYTES} bytes (it has ${file.size})`);
    let text: string;
    try {
      text = new TextDecoder('utf-8', { fatal: true }).decode(await file.arrayBuffer());
    } catch {
      throw new HexsalvageInputError('netlist', shown, '(file)', 'text in UTF-8 (the file holds bytes that are not)');
    }
    const netlist = parseNetlist(parseJsonText(text, shown, 'netlist'), shown);
    const previous = fileLeg;
    fileLeg = { name: shown, netlist, text };
    addFileOption();
    update(initialState(`file:${shown}`, netlist, candidate.vdc), {
      onResult: () => {
        $('#leg-error').textContent = '';
      },
      onError: (message) => {
        fileLeg = previous;
        addFileOption();
        syncControls(state);
        $('#leg-error').textContent = message;
      },
    });
  } catch (e) {
    $('#leg-error').textContent = errorLine(e);
  }
}

function addFileOption(): void {
  const select = $<HTMLSelectElement>('select[name="topology"]');
  select.querySelector('option[data-file]')?.remove();
  if (!fileLeg) return;
  const o = document.createElement('option');
  o.value = `file:${fileLeg.name}`;
  o.dataset.file = 'true';
  o.textContent = `${fileLeg.netlist.name} (${fileLeg.name})`;
  select.append(o);
}

function download(name: string, type: string, text: string): void {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

async function sha256(text: string): Promise<string | null> {
  if (!globalThis.crypto?.subtle) return null;
  const d = await crypto.subtle.digest('SHA-256', new TextEncoder().encode(text));
  return [...new Uint8Array(d)].map((b) => b.toString(16).padStart(2, '0')).join('');
}

function baseName(): string {
  const t = state.topology.startsWith('file:') ? state.topology.slice(5).replace(/\.json$/i, '') : state.topology;
  const f = [...state.faults.keys()].join('_').replace(/[^\w.-]+/g, '_');
  return `${t}${f ? `_${f}` : ''}_phi${state.loadAngleDeg}`.replace(/[^\w.-]+/g, '_');
}

function wire(): void {
  const legs = $<HTMLElement>('#legs');
  const act = (el: Element | null) => {
    const address = (el?.closest('[data-device]') as HTMLElement | null)?.dataset.device;
    if (address) update(cycleDevice(candidate, address));
  };
  legs.addEventListener('click', (e) => act(e.target as Element));
  legs.addEventListener('keydown', (e) => {
    if (e.key !== 'Enter' && e.key !== ' ') return;
    e.preventDefault();
    act(e.target as Element);
  });
  $('select[name="topology"]').addEventListener('change', (e) => chooseLeg((e.target as HTMLSelectElement).value));
  $('input[name="netlist"]').addEventListener('change', (e) => {
    const f = (e.target as HTMLInputElement).files?.[0];
    if (f) void openNetlist(f);
  });
  const angle = $<HTMLInputElement>('input[name="load-angle"]');
  angle.addEventListener('change', () => onInput(() => ({ ...candidate, loadAngleDeg: numberOf(angle, 'load-angle') })));
  const slider = $<HTMLInputElement>('input[name="load-angle-slider"]');
  slider.addEventListener('input', () => onInput(() => ({ ...candidate, loadAngleDeg: Number(slider.value) })));
  const margin = $<HTMLInputElement>('input[name="polarity-margin"]');
  margin.addEventListener('change', () => onInput(() => ({ ...candidate, polarityMarginDeg: numberOf(margin, 'polarity-margin') })));
  const steps = $<HTMLSelectElement>('select[name="level-steps"]');
  steps.addEventListener('change', () => onInput(() => ({ ...candidate, levelSteps: steps.value as LevelStepRule })));
  const vdc = $<HTMLInputElement>('input[name="vdc"]');
  vdc.addEventListener('change', () => onInput(() => ({ ...candidate, vdc: vdc.value.trim() === '' ? null : numberOf(vdc, 'vdc') })));
  const bypass = $<HTMLSelectElement>('select[name="bypass"]');
  bypass.addEventListener('change', () => onInput(() => ({ ...candidate, bypass: bypass.value === '' ? null : (bypass.value as Phase) })));
  $('#fault-list').addEventListener('change', (e) => {
    const box = e.target as HTMLInputElement;
    if (box.name !== 'ambiguous') return;
    const ambiguous = new Set(candidate.ambiguous);
    if (box.checked) ambiguous.add(box.value);
    else ambiguous.delete(box.value);
    onInput(() => ({ ...candidate, ambiguous }));
  });
  $('button[name="clear"]').addEventListener('click', () => onInput(() => ({ ...candidate, faults: new Map(), ambiguous: new Set(), bypass: null })));
  $('select[name="polarity"]').addEventListener('change', (e) => {
    polarityChoice = (e.target as HTMLSelectElement).value;
    update(candidate);
  });
  $('button[name="copy"]').addEventListener('click', () => {
    const line = commandLineOf('plan', state, legOf(state));
    const done = (how: string) => {
      $('#copy-status').textContent = how;
    };
    if (navigator.clipboard)
      void navigator.clipboard.writeText(line).then(
        () => done('Copied.'),
        () => done('Select the line above and copy it (the browser refused the clipboard).'),
      );
    else done('Select the line above and copy it.');
  });
  $('button[name="download-plan"]').addEventListener('click', () => {
    fetchFile('plan-json', (text) => download(`${baseName()}_plan.json`, 'application/json', text));
  });
  $('button[name="download-report"]').addEventListener('click', () => {
    void (async () => {
      const inputs =
        state.topology.startsWith('file:') && fileLeg ? [{ path: fileLeg.name, sha256: (await sha256(fileLeg.text)) ?? 'not computed (no Web Crypto)' }] : [];
      fetchFile('report', (text) => download(`${baseName()}_review.html`, 'text/html', text), inputs);
    })();
  });
}

if (!inWorker) start();

function start(): void {
  document.body.innerHTML = skeleton();
  send = makeChannel(ownCode, receive);
  const style = document.createElement('style');
  style.textContent = EXPLORER_CSS;
  document.head.append(style);
  addFileOption();
  wire();
  update(state);
  document.body.dataset.ready = 'true';
}

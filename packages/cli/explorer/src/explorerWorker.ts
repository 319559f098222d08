import { esc } from '@hexsalvage/plot';
import { computePictures, computeResult, errorLine, planJson, reportHtml } from './explorerModel.js';
import { fromWire, type ExplorerReply, type ExplorerRequest } from './explorerProtocol.js';
import { levelTableHtml, plotsHtml, remediesHtml, resultHtml } from './explorerView.js';

/**
 * Answers one request of the page: for an update, first the limit (posted at once), then the
 * pictures; for a download, the file's text; for bad input, the one-line message. Runs in the
 * worker, or on the page itself where no worker can be made.
 *
 * @param req - the request
 * @param post - where answers go
 * @example
 * ```ts
 * answer({ kind: 'update', id: 1, state: toWire(initialState('npc')), polarity: '' }, console.log);
 * ```
 */
export function answer(req: ExplorerRequest, post: (reply: ExplorerReply) => void): void {
  const t0 = performance.now();
  try {
    const state = fromWire(req.state);
    if (req.kind === 'plan-json') return post({ kind: 'file', id: req.id, text: planJson(state) });
    if (req.kind === 'report') return post({ kind: 'file', id: req.id, text: reportHtml(state, req.version, req.inputs) });
    const result = computeResult(state);
    const plan = result.plan;
    post({
      kind: 'result',
      id: req.id,
      mMax: plan.mMax,
      faults: plan.faults.join(','),
      loadAngleDeg: plan.loadAngleDeg,
      html: resultHtml(result, state),
      ms: performance.now() - t0,
    });
    const pictures = computePictures(state, result);
    const listed = [...new Set([plan.limitingPolarity, ...plan.sectors.map((s) => s.polarity)])];
    const polarity = listed.includes(req.polarity) ? req.polarity : plan.limitingPolarity;
    const plots = plotsHtml(plan, polarity, pictures, state);
    post({
      kind: 'pictures',
      id: req.id,
      polarities: listed.map((p) => ({ value: p, label: `${esc(p)}${p === plan.limitingPolarity ? ' (binds)' : ''}` })),
      polarity,
      diagram: plots.diagram,
      derating: plots.derating,
      remedies: remediesHtml(pictures.remedies, state),
      levels: levelTableHtml(result),
      ms: performance.now() - t0,
    });
  } catch (e) {
    post({ kind: 'error', id: req.id, message: errorLine(e) });
  }
}

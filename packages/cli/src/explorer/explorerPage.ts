import type { LegNetlist } from '@hexsalvage/core';

/** What the explorer page starts from. */
export interface ExplorerPageConfig {
  /** Tool version, shown in the page and in the reports it writes. */
  readonly version: string;
  /** A built-in leg id; ignored when `netlist` is given. */
  readonly topology: string;
  /** A leg from a netlist file, with the file's name (as given) and text. */
  readonly netlist?: LegNetlist;
  readonly netlistFile?: { readonly name: string; readonly text: string };
  /** Initial faults, as the CLI writes them. */
  readonly faults?: readonly string[];
}

// Nothing may leave the page: no connection, no frame, no form target, scripts and styles only
// from the page itself.
const POLICY =
  "default-src 'none'; script-src 'unsafe-inline'; style-src 'unsafe-inline'; img-src data: blob:; worker-src blob:; connect-src 'none'; form-action 'none'; base-uri 'none'";

/**
 * The self-contained explorer page: the bundled script and its starting point in one HTML file
 * that opens from disk and never fetches anything (a content security policy forbids it).
 *
 * @param bundle - the explorer script (built by `scripts/build-explorer.mjs`)
 * @param config - the starting point
 * @returns the HTML document
 * @example
 * ```ts
 * explorerPage(readFileSync('dist/explorer/explorer.js', 'utf8'), { version: '0.1.0', topology: 'npc' });
 * ```
 */
export function explorerPage(bundle: string, config: ExplorerPageConfig): string {
  // JSON inside a script element: '<' escaped so that no text of a netlist can end the element
  const json = JSON.stringify(config)
    .replace(/</g, '\\u003c')
    .replace(/\u2028/g, '\\u2028')
    .replace(/\u2029/g, '\\u2029');
  const script = bundle.replace(/<\/(script)/gi, '<\\/$1').replace(/<!--/g, '<\\!--');
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta http-equiv="Content-Security-Policy" content="${POLICY}">
<title>hexsalvage explorer</title>
</head>
<body>
<noscript>The explorer computes in the browser: it needs JavaScript. The command line gives the same figures (hexsalvage plan, hexsalvage report).</noscript>
<script type="application/json" id="hs-config">${json}</script>
<script>${script}</script>
</body>
</html>
`;
}

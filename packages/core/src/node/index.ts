/**
 * Node-only helpers of `@hexsalvage/core` (`@hexsalvage/core/node`): reading input files. The main
 * entry never touches the file system, so that it also runs in a browser.
 *
 * @packageDocumentation
 */
export { loadNetlistFile } from './loadNetlistFile.js';
export { MAX_INPUT_BYTES, MAX_INPUT_DEPTH, readJsonFile } from './readJsonFile.js';

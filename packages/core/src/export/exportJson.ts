import type { RemedialPlan } from '../limits/planRemedial.js';
import type { SwitchingTable } from '../table/switchingTable.js';

/** Version of the export document; the JSON Schema in docs/schema describes this version. */
export const EXPORT_SCHEMA_VERSION = 2;

/** The export document: the plan at one load angle and the full switching table. */
export interface ExportDocument {
  readonly kind: 'hexsalvage-export';
  readonly schemaVersion: number;
  readonly plan: RemedialPlan;
  readonly table: SwitchingTable;
}

/**
 * Bundles a plan and its switching table for simulation scripts and firmware tooling.
 *
 * @param plan - from `planRemedial`
 * @param table - from `switchingTable` (same topology and faults)
 * @returns the export document (validate it against docs/schema/export.schema.json)
 * @example
 * ```ts
 * JSON.stringify(exportDocument(plan, table));
 * ```
 */
export function exportDocument(plan: RemedialPlan, table: SwitchingTable): ExportDocument {
  return { kind: 'hexsalvage-export', schemaVersion: EXPORT_SCHEMA_VERSION, plan, table };
}

/**
 * The derivation's document and the solver's claim file, both ways.
 *
 * The editor keeps a derivation as ProseMirror-shaped JSON (Tiptap nodes in a Yjs document); the
 * solver reads claim files (one flow, its claims). This module is the one translation between
 * them: the editor's check worker, the server's background re-check and the lock read a document
 * through `readDocument`, and imports and the demo data build blocks through `claimFileToBlocks`,
 * `flowBlockNode` and `claimBlockNode`. Pure data in, pure data out.
 *
 * Layout (each block is a top-level node, i.e. a step with a `stepId`):
 *
 *   flowBlock  { stepId }                content: blockField | blockRow, any order
 *     blockField { field: "name" | "couplings" | "convention" }          text
 *     blockRow   { row: "parameter" | "beta" | "rate" }                   two fields
 *       blockField { field: "name" }   the parameter / coupling / rate name
 *       blockField { field: "value" }  its value or expression
 *   claimBlock { stepId, kind, flow }    content: blockField
 *     blockField { field: "name" | a claim-file field of the kind | "tolerance" | "settings" | "note" }
 *
 * Every field is text, so co-authors merge per character. `flow` of a claim block is null (bound
 * to the nearest flow block above), "none" (no flow) or the stepId of a flow block.
 */
export * from './document/layout';
export * from './document/syntax';
export * from './document/read';
export * from './document/build';


/**
 * Rich display in notebook cells: MIME bundles, `withDisplay`, HTML and text tables,
 * number formatting and HTML escaping.
 *
 * @module
 */
export * from "./display.ts";
export * from "./table.ts";

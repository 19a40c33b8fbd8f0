// Types of scripts/preload-web.mjs for the TypeScript that imports it (its test).
export function staticImports(code: string): string[];
export function dynamicImports(code: string): string[];
export function addPreloads(root: string): string[];
